/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * report_arrivals.c - the outputs of schrot arrivals: terminal table, JSON, and the histogram plot
 * (cairo) of output values against the Gaussian and of counts against Poisson.
 */
#include <cairo-svg.h>
#include <cairo.h>
#include <ctype.h>
#include <jansson.h>
#include <math.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/arrivals.h"
#include "schrot/outfile.h"
#include "schrot/si.h"
#include "report_int.h"

#define HIST_MAX_BINS 60
#define OUTPUT_BINS 40

/* One histogram: bins [lo, hi), observed windows, and the two models' expected windows. */
struct hist {
	size_t n;
	double lo[HIST_MAX_BINS + 1], hi[HIST_MAX_BINS + 1];
	double observed[HIST_MAX_BINS + 1];
	double poisson[HIST_MAX_BINS + 1];  /* NaN for the output histogram */
	double gauss[HIST_MAX_BINS + 1];
	bool integer;                        /* count bins: [lo, hi] inclusive integers */
};

static void count_hist(const struct sch_arrival_counts *c, struct hist *h)
{
	uint32_t lo = UINT32_MAX, hi = 0;
	double width, sd = sqrt(c->var_count);

	memset(h, 0, sizeof(*h));
	h->integer = true;
	for (size_t w = 0; w < c->windows; w++) {
		if (c->per_window[w] < lo)
			lo = c->per_window[w];
		if (c->per_window[w] > hi)
			hi = c->per_window[w];
	}
	if (c->windows == 0)
		return;
	width = ceil(((double)hi - lo + 1) / HIST_MAX_BINS);
	h->n = (size_t)ceil(((double)hi - lo + 1) / width);
	for (size_t b = 0; b < h->n; b++) {
		h->lo[b] = lo + b * width;
		h->hi[b] = h->lo[b] + width - 1;
	}
	for (size_t w = 0; w < c->windows; w++)
		h->observed[(size_t)((c->per_window[w] - lo) / width)] += 1;
	for (size_t b = 0; b < h->n; b++) {
		double p = 0;
		if (width <= 64) {
			for (double k = h->lo[b]; k <= h->hi[b]; k++)
				p += sch_poisson_pmf(c->expected_count, (uint64_t)k);
		} else {
			p = sch_gauss_interval(c->expected_count, sqrt(c->expected_count), h->lo[b] - 0.5, h->hi[b] + 0.5);
		}
		h->poisson[b] = p * (double)c->windows;
		h->gauss[b] = sch_gauss_interval(c->mean_count, sd, h->lo[b] - 0.5, h->hi[b] + 0.5) * (double)c->windows;
	}
}

static void output_hist(const struct sch_arrivals *a, struct hist *h)
{
	double lo = INFINITY, hi = -INFINITY, width;

	memset(h, 0, sizeof(*h));
	for (size_t w = 0; w < a->n_windows; w++) {
		lo = fmin(lo, a->output_v[w]);
		hi = fmax(hi, a->output_v[w]);
	}
	if (!(hi >= lo))
		return;
	if (hi == lo)
		hi = lo + fmax(fabs(lo) * 1e-9, 1e-30);
	h->n = OUTPUT_BINS;
	width = (hi - lo) / OUTPUT_BINS;
	for (size_t b = 0; b < h->n; b++) {
		h->lo[b] = lo + b * width;
		h->hi[b] = lo + (b + 1) * width;
		h->poisson[b] = NAN;
		h->gauss[b] = sch_gauss_interval(a->output_mean_v, a->output_std_v, h->lo[b], h->hi[b]) * (double)a->n_windows;
	}
	for (size_t w = 0; w < a->n_windows; w++) {
		size_t b = (size_t)((a->output_v[w] - lo) / width);
		h->observed[b < h->n ? b : h->n - 1] += 1;
	}
}

/* Normal-approximation P(0 counts): continuity-corrected, as CHECK-VALUES.md N5 states it. */
static double gauss_p_zero(double mean, double var)
{
	return var > 0 ? 0.5 * erfc(-(0.5 - mean) / sqrt(2 * var)) : (mean < 0.5 ? 1.0 : 0.0);
}

/* ---- table ------------------------------------------------------------------------------ */

enum sch_err sch_report_arrivals_table(const struct sch_arrivals *a, FILE *out)
{
	char s1[64], s2[64], s3[64], s4[64];

	fprintf(out, "schrot arrivals: %s, output %s\n", a->op.netlist ? a->op.netlist : "", a->output);
	fprintf(out, "%zu windows of %s (source step %s, settle %s), seed %llu, xoshiro256**\n\n", a->n_windows,
		sch_si_format(s1, sizeof(s1), a->window_s, 4, "s"), sch_si_format(s2, sizeof(s2), a->step_s, 3, "s"),
		sch_si_format(s3, sizeof(s3), a->settle_s, 3, "s"), (unsigned long long)a->seed);
	fprintf(out, "output at the end of each window\n");
	fprintf(out, "  mean       %s\n", sch_si_format(s1, sizeof(s1), a->output_mean_v, 5, "V"));
	fprintf(out, "  std        %s rms\n", sch_si_format(s1, sizeof(s1), a->output_std_v, 4, "V"));
	fprintf(out, "  skewness   %.4f   (a Gaussian of the same mean and variance: 0)\n", a->output_skewness);
	fprintf(out, "  lag-1      %.4f   (correlation with the next window; independent windows: 0)\n\n",
		a->output_lag1_correlation);
	fprintf(out, "counts per window         %10s %10s %10s %8s %8s %10s %10s\n", "expected N", "mean", "variance",
		"skewness", "P(0)", "Poisson", "Gaussian");
	for (size_t k = 0; k < a->n_counts; k++) {
		const struct sch_arrival_counts *c = &a->counts[k];
		fprintf(out, "  %-22.22s  %10.4g %10.4g %10.4g %8.3f %8.4f %10.4g %10.4g\n", c->carrier, c->expected_count,
			c->mean_count, c->var_count, c->skew_count, c->p_zero, exp(-c->expected_count),
			gauss_p_zero(c->mean_count, c->var_count));
		fprintf(out, "    %s, %s, %s events/s", sch_arrival_kind_name(c->kind),
			sch_si_format(s1, sizeof(s1), c->current_a, 4, "A"), sch_si_format(s4, sizeof(s4), c->rate_hz, 4, ""));
		if (c->kind == SCH_ARRIVAL_AVALANCHE)
			fprintf(out, ", gain %g, F %.4g: %.4g electrons per window, variance %.4g", c->gain_m, c->excess_f,
				c->mean_electrons, c->var_electrons);
		fprintf(out, "\n");
	}
	fprintf(out, "  (Poisson: e^-N at the expected N; Gaussian: normal P(count < 0.5) with the counted mean and variance)\n");
	for (size_t k = 0; k < a->n_counts; k++) {
		struct hist h;
		count_hist(&a->counts[k], &h);
		if (h.n > 24)
			continue;
		fprintf(out, "\n  %s: windows with each count\n  %8s %10s %10s %10s\n", a->counts[k].carrier, "count", "counted",
			"Poisson", "Gaussian");
		for (size_t b = 0; b < h.n; b++)
			fprintf(out, "  %8.0f %10.0f %10.1f %10.1f\n", h.lo[b], h.observed[b], h.poisson[b], h.gauss[b]);
	}
	fprintf(out, "\nnote: the transient realises only the carriers' arrivals; thermal, flicker and the simulator's own\n"
		     "      device noise are not in it (schrot report gives their share)\n");
	if (a->settle_s == 0)
		fprintf(out, "note: sampling starts at the operating point; --settle skips the circuit's start-up\n");
	return ferror(out) ? SCH_ERR_IO : SCH_OK;
}

/* ---- JSON ------------------------------------------------------------------------------- */

static json_t *real_or_null(double x)
{
	return isfinite(x) ? json_real(x) : json_null();
}

static json_t *hist_json(const struct hist *h)
{
	json_t *o = json_object(), *from = json_array(), *to = json_array(), *obs = json_array(), *poi = json_array(),
	       *gau = json_array();

	for (size_t b = 0; b < h->n; b++) {
		json_array_append_new(from, h->integer ? json_integer((json_int_t)h->lo[b]) : json_real(h->lo[b]));
		json_array_append_new(to, h->integer ? json_integer((json_int_t)h->hi[b]) : json_real(h->hi[b]));
		json_array_append_new(obs, json_integer((json_int_t)h->observed[b]));
		if (h->integer)
			json_array_append_new(poi, real_or_null(h->poisson[b]));
		json_array_append_new(gau, real_or_null(h->gauss[b]));
	}
	json_object_set_new(o, h->integer ? "count_from" : "from_v", from);
	json_object_set_new(o, h->integer ? "count_to" : "to_v", to);
	json_object_set_new(o, "windows", obs);
	if (h->integer)
		json_object_set_new(o, "poisson_windows", poi);
	else
		json_decref(poi);
	json_object_set_new(o, "gaussian_windows", gau);
	return o;
}

/* A CSV header field: "NAME count", quoted when the name holds a comma or a quote. */
static void put_count_head(FILE *fp, const char *name)
{
	if (!strpbrk(name, ",\"\r\n")) {
		fprintf(fp, ",%s count", name);
		return;
	}
	fputs(",\"", fp);
	for (const char *p = name; *p; p++) {
		if (*p == '"')
			fputc('"', fp);
		fputc(*p, fp);
	}
	fputs(" count\"", fp);
}

enum sch_err sch_report_arrivals_csv(const struct sch_arrivals *a, const char *path, struct sch_diag *d)
{
	struct sch_outfile o;
	enum sch_err ret = sch_outfile_open(&o, path, d);

	if (ret != SCH_OK)
		return ret;
	fputs("window,end_s,output_v", o.fp);
	for (size_t c = 0; c < a->n_counts; c++)
		put_count_head(o.fp, a->counts[c].carrier);
	fputc('\n', o.fp);
	for (size_t w = 0; w < a->n_windows; w++) {
		fprintf(o.fp, "%zu,%.12g,%.12g", w + 1, a->settle_s + (double)(w + 1) * a->window_s, a->output_v[w]);
		for (size_t c = 0; c < a->n_counts; c++)
			fprintf(o.fp, ",%lu", a->counts[c].per_window ? (unsigned long)a->counts[c].per_window[w] : 0UL);
		fputc('\n', o.fp);
	}
	if (ferror(o.fp)) {
		sch_outfile_abort(&o);
		return sch_diag_error(d, SCH_ERR_IO, path, 0, "cannot write the arrivals CSV");
	}
	return sch_outfile_commit(&o, d);
}

enum sch_err sch_report_arrivals_json(const struct sch_arrivals *a, const char *path, struct sch_diag *d)
{
	struct sch_outfile o;
	json_t *doc = json_object(), *counts = json_array();
	struct hist *h = malloc(sizeof(*h));
	enum sch_err ret = SCH_ERR_NOMEM;

	if (!doc || !counts || !h)
		goto out;
	json_object_set_new(doc, "schema", json_integer(1));
	json_object_set_new(doc, "netlist", json_string(a->op.netlist ? a->op.netlist : ""));
	json_object_set_new(doc, "temperature_k", real_or_null(a->op.temp_k));
	json_object_set_new(doc, "output", json_string(a->output));
	json_object_set_new(doc, "window_s", json_real(a->window_s));
	json_object_set_new(doc, "windows", json_integer((json_int_t)a->n_windows));
	json_object_set_new(doc, "step_s", json_real(a->step_s));
	json_object_set_new(doc, "settle_s", json_real(a->settle_s));
	json_object_set_new(doc, "seed", json_integer((json_int_t)a->seed));
	json_object_set_new(doc, "generator", json_string("xoshiro256** 1.0, state from splitmix64(seed ^ stream * 0x9e3779b97f4a7c15), stream = carrier index"));
	json_object_set_new(doc, "notes", json_pack("[s]", "the transient realises only the carriers' arrivals; thermal, "
							  "flicker and the simulator's own device noise are not in it"));
	json_object_set_new(doc, "output_mean_v", real_or_null(a->output_mean_v));
	json_object_set_new(doc, "output_std_v", real_or_null(a->output_std_v));
	json_object_set_new(doc, "output_skewness", real_or_null(a->output_skewness));
	json_object_set_new(doc, "output_lag1_correlation", real_or_null(a->output_lag1_correlation));
	json_object_set_new(doc, "shortest_rc_s", real_or_null(a->shortest_rc_s));
	output_hist(a, h);
	json_object_set_new(doc, "output_histogram", hist_json(h));
	for (size_t k = 0; k < a->n_counts; k++) {
		const struct sch_arrival_counts *c = &a->counts[k];
		json_t *ct = json_object();
		json_object_set_new(ct, "carrier", json_string(c->carrier));
		json_object_set_new(ct, "process", json_string(sch_arrival_kind_name(c->kind)));
		json_object_set_new(ct, "dc_current_a", real_or_null(c->current_a));
		json_object_set_new(ct, "gain", real_or_null(c->gain_m));
		json_object_set_new(ct, "excess_factor", real_or_null(c->excess_f));
		json_object_set_new(ct, "rate_hz", real_or_null(c->rate_hz));
		json_object_set_new(ct, "expected_count", real_or_null(c->expected_count));
		json_object_set_new(ct, "windows", json_integer((json_int_t)c->windows));
		json_object_set_new(ct, "mean_count", real_or_null(c->mean_count));
		json_object_set_new(ct, "var_count", real_or_null(c->var_count));
		json_object_set_new(ct, "skewness_count", real_or_null(c->skew_count));
		json_object_set_new(ct, "p_zero", real_or_null(c->p_zero));
		json_object_set_new(ct, "p_zero_poisson", real_or_null(exp(-c->expected_count)));
		json_object_set_new(ct, "p_zero_gaussian", real_or_null(gauss_p_zero(c->mean_count, c->var_count)));
		json_object_set_new(ct, "mean_electrons", real_or_null(c->mean_electrons));
		json_object_set_new(ct, "var_electrons", real_or_null(c->var_electrons));
		count_hist(c, h);
		json_object_set_new(ct, "histogram", hist_json(h));
		json_array_append_new(counts, ct);
	}
	json_object_set_new(doc, "counts", counts);
	counts = NULL;
	if ((ret = sch_outfile_open(&o, path, d)) != SCH_OK)
		goto out;
	if (json_dumpf(doc, o.fp, JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(17)) != 0 ||
	    fputc('\n', o.fp) == EOF) {
		sch_outfile_abort(&o);
		ret = sch_diag_error(d, SCH_ERR_IO, path, 0, "could not write the arrivals JSON");
		goto out;
	}
	ret = sch_outfile_commit(&o, d);
out:
	free(h);
	json_decref(doc);
	json_decref(counts);
	return ret;
}

/* ---- plot ------------------------------------------------------------------------------- */

#define PLOT_W 960.0
#define PANEL_H 250.0
#define PLOT_TOP 40.0
#define PANEL_L 80.0
#define PANEL_R (PLOT_W - 200.0)
#define MAX_COUNT_PANELS 3
#define FONT "DejaVu Sans"

static void text_at(cairo_t *cr, double x, double y, const char *s, double align_x)
{
	cairo_text_extents_t te;

	cairo_text_extents(cr, s, &te);
	cairo_move_to(cr, x - te.x_advance * align_x, y);
	sch_report_show_text(cr, s);
}

/* One histogram panel: bars counted, dots Poisson (counts only), line Gaussian. */
/* One panel's plot area: the box on the page (t to bottom) and the data range it shows. */
struct frame {
	double bottom, t;
	double y_max, x0, x1, bw;
};

static double frame_x(const struct frame *f, double x)
{
	return PANEL_L + (x - f->x0) * f->bw;
}

static double frame_y(const struct frame *f, double y)
{
	return f->bottom - y / f->y_max * (f->bottom - f->t);
}

/* The frame of the panel at top: every bar and curve fits, with 8 % headroom. */
static struct frame frame_of(const struct hist *h, double top)
{
	struct frame f = { .bottom = top + PANEL_H - 60, .t = top + 24, .y_max = 1 };

	for (size_t b = 0; b < h->n; b++) {
		f.y_max = fmax(f.y_max, h->observed[b]);
		if (isfinite(h->poisson[b]))
			f.y_max = fmax(f.y_max, h->poisson[b]);
		f.y_max = fmax(f.y_max, h->gauss[b]);
	}
	f.y_max *= 1.08;
	f.x0 = h->integer ? h->lo[0] - 0.5 : h->lo[0];
	f.x1 = h->n ? (h->integer ? h->hi[h->n - 1] + 0.5 : h->hi[h->n - 1]) : f.x0 + 1;
	if (!(f.x1 > f.x0))
		f.x1 = f.x0 + 1;
	f.bw = (PANEL_R - PANEL_L) / (f.x1 - f.x0);
	return f;
}

/* The observed bars, the Gaussian line and the Poisson dots. */
static void draw_data(cairo_t *cr, const struct frame *f, const struct hist *h)
{
	for (size_t b = 0; b < h->n; b++) {
		double l = h->integer ? h->lo[b] - 0.5 : h->lo[b], r = h->integer ? h->hi[b] + 0.5 : h->hi[b];
		cairo_rectangle(cr, frame_x(f, l) + 0.5, frame_y(f, h->observed[b]),
				fmax(frame_x(f, r) - frame_x(f, l) - 1, 0.5), f->bottom - frame_y(f, h->observed[b]));
	}
	cairo_set_source_rgb(cr, 0.62, 0.76, 0.88);
	cairo_fill(cr);
	cairo_set_source_rgb(cr, 0.84, 0.37, 0.00);
	cairo_set_line_width(cr, 2.0);
	for (size_t b = 0; b < h->n; b++) {
		double xc = frame_x(f, h->integer ? (h->lo[b] + h->hi[b]) / 2 : (h->lo[b] + h->hi[b]) / 2);
		if (b == 0)
			cairo_move_to(cr, xc, frame_y(f, h->gauss[b]));
		else
			cairo_line_to(cr, xc, frame_y(f, h->gauss[b]));
	}
	cairo_stroke(cr);
	cairo_set_source_rgb(cr, 0.0, 0.45, 0.25);
	for (size_t b = 0; b < h->n; b++) {
		if (!isfinite(h->poisson[b]))
			continue;
		cairo_arc(cr, frame_x(f, (h->lo[b] + h->hi[b]) / 2), frame_y(f, h->poisson[b]), 3.5, 0, 2 * M_PI);
		cairo_fill(cr);
	}
}

/* The box, the x ticks (whole counts at bar centres, or five voltages), the y extremes and the x label. */
static void draw_axes(cairo_t *cr, const struct frame *f, const struct hist *h, const char *x_label)
{
	char s[64];

	cairo_set_source_rgb(cr, 0.2, 0.2, 0.2);
	cairo_set_line_width(cr, 1.0);
	cairo_rectangle(cr, PANEL_L, f->t, PANEL_R - PANEL_L, f->bottom - f->t);
	cairo_stroke(cr);
	if (h->integer) {
		double first = f->x0 + 0.5, last = f->x1 - 0.5, tick = fmax(1, ceil((last - first) / 6));
		for (double k = first; k <= last + 1e-9; k += tick) {
			snprintf(s, sizeof(s), "%.0f", k);
			cairo_move_to(cr, frame_x(f, k), f->bottom);
			cairo_line_to(cr, frame_x(f, k), f->bottom + 4);
			cairo_stroke(cr);
			text_at(cr, frame_x(f, k), f->bottom + 16, s, 0.5);
		}
	} else {
		for (int i = 0; i <= 4; i++) {
			double x = f->x0 + (f->x1 - f->x0) * i / 4.0;
			sch_si_format(s, sizeof(s), x, 4, "V");
			text_at(cr, frame_x(f, x), f->bottom + 16, s, i == 0 ? 0 : i == 4 ? 1 : 0.5);
		}
	}
	snprintf(s, sizeof(s), "%.0f", f->y_max / 1.08);
	text_at(cr, PANEL_L - 6, frame_y(f, f->y_max / 1.08) + 4, s, 1);
	text_at(cr, PANEL_L - 6, f->bottom + 4, "0", 1);
	text_at(cr, (PANEL_L + PANEL_R) / 2, f->bottom + 34, x_label, 0.5);
}

static void draw_legend(cairo_t *cr, double t, bool integer)
{
	cairo_set_source_rgb(cr, 0.62, 0.76, 0.88);
	cairo_rectangle(cr, PANEL_R + 20, t + 4, 18, 10);
	cairo_fill(cr);
	cairo_set_source_rgb(cr, 0.1, 0.1, 0.1);
	text_at(cr, PANEL_R + 46, t + 14, "windows (simulated)", 0);
	cairo_set_source_rgb(cr, 0.84, 0.37, 0.00);
	cairo_move_to(cr, PANEL_R + 20, t + 33);
	cairo_line_to(cr, PANEL_R + 38, t + 33);
	cairo_stroke(cr);
	cairo_set_source_rgb(cr, 0.1, 0.1, 0.1);
	text_at(cr, PANEL_R + 46, t + 37, "Gaussian, same", 0);
	text_at(cr, PANEL_R + 46, t + 51, "mean and variance", 0);
	if (integer) {
		cairo_set_source_rgb(cr, 0.0, 0.45, 0.25);
		cairo_arc(cr, PANEL_R + 29, t + 70, 3.5, 0, 2 * M_PI);
		cairo_fill(cr);
		cairo_set_source_rgb(cr, 0.1, 0.1, 0.1);
		text_at(cr, PANEL_R + 46, t + 74, "Poisson, N = rate * T", 0);
	}
}

static void draw_panel(cairo_t *cr, double top, const char *title, const char *x_label, const struct hist *h)
{
	const struct frame f = frame_of(h, top);

	cairo_set_source_rgb(cr, 0.05, 0.05, 0.05);
	cairo_select_font_face(cr, FONT, CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_BOLD);
	cairo_set_font_size(cr, 13);
	text_at(cr, PANEL_L, top + 14, title, 0);
	cairo_select_font_face(cr, FONT, CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_NORMAL);
	cairo_set_font_size(cr, 11);
	draw_data(cr, &f, h);
	draw_axes(cr, &f, h, x_label);
	draw_legend(cr, f.t, h->integer);
}

static enum sch_err draw(cairo_t *cr, const struct sch_arrivals *a)
{
	struct hist *h = malloc(sizeof(*h));
	size_t n_panels = a->n_counts < MAX_COUNT_PANELS ? a->n_counts : MAX_COUNT_PANELS;
	char title[600], s1[48], s2[48];

	if (!h)
		return SCH_ERR_NOMEM;
	cairo_set_source_rgb(cr, 1, 1, 1);
	cairo_paint(cr);
	cairo_select_font_face(cr, FONT, CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_BOLD);
	cairo_set_font_size(cr, 15);
	cairo_set_source_rgb(cr, 0.05, 0.05, 0.05);
	snprintf(title, sizeof(title), "%s: %zu windows of %s", a->op.netlist ? a->op.netlist : "", a->n_windows,
		 sch_si_format(s1, sizeof(s1), a->window_s, 4, "s"));
	text_at(cr, PANEL_L, 24, title, 0);
	output_hist(a, h);
	snprintf(title, sizeof(title), "output %s at window ends: mean %s, std %s, skewness %.3f", a->output,
		 sch_si_format(s1, sizeof(s1), a->output_mean_v, 4, "V"), sch_si_format(s2, sizeof(s2), a->output_std_v, 3, "V"),
		 a->output_skewness);
	draw_panel(cr, PLOT_TOP, title, "output (V)", h);
	for (size_t k = 0; k < n_panels; k++) {
		const struct sch_arrival_counts *c = &a->counts[k];
		count_hist(c, h);
		char n[48], m[48], v[48];
		snprintf(title, sizeof(title), "%s: N = %s expected, mean %s, variance %s, P(0) %.4f (Poisson %.4f)",
			 c->carrier, sch_report_ratio(n, sizeof(n), c->expected_count),
			 sch_report_ratio(m, sizeof(m), c->mean_count), sch_report_ratio(v, sizeof(v), c->var_count), c->p_zero,
			 exp(-c->expected_count));
		draw_panel(cr, PLOT_TOP + PANEL_H * (double)(k + 1), title, "primary electrons per window", h);
	}
	free(h);
	return cairo_status(cr) == CAIRO_STATUS_SUCCESS ? SCH_OK : SCH_ERR_IO;
}

static enum sch_err draw_arrivals(cairo_t *cr, const void *ctx)
{
	return draw(cr, ctx);
}

enum sch_err sch_report_arrivals_plot(const struct sch_arrivals *a, const char *path, struct sch_diag *d)
{
	size_t n_panels = 1 + (a->n_counts < MAX_COUNT_PANELS ? a->n_counts : MAX_COUNT_PANELS);

	return sch_report_figure(path, PLOT_W, PLOT_TOP + PANEL_H * (double)n_panels, draw_arrivals, a, d);
}
