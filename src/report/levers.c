/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * levers.c (report) - the outputs of schrot levers: the ranked table, the JSON document, one CSV
 * row per lever and the plot of SNR against avalanche gain.
 */
#include <jansson.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "schrot/levers.h"
#include "schrot/outfile.h"
#include "schrot/si.h"
#include "report_int.h"

#ifndef SCH_VERSION
#define SCH_VERSION "unknown"
#endif

#define FIG_W 760.0
#define FIG_H 480.0
#define FIG_L 78.0
#define FIG_R (FIG_W - 24.0)
#define FIG_T 40.0
#define FIG_B (FIG_H - 56.0)

static const char *value_unit(enum sch_lever_kind k)
{
	switch (k) {
	case SCH_LEVER_RESISTANCE:
		return "ohm";
	case SCH_LEVER_CAPACITANCE:
		return "F";
	case SCH_LEVER_CURRENT:
		return "A";
	case SCH_LEVER_TEMPERATURE:
		return "K";
	default:
		return "";
	}
}

static const char *in_unit(const struct sch_result *r)
{
	return r->input_unit && strcmp(r->input_unit, "A") == 0 ? "A" : "V";
}

/* "23.4 kHz", or "beyond the run" where |H| does not fall 3 dB within the simulated range. */
static const char *edge_text(char *out, size_t size, double f)
{
	if (!isfinite(f))
		return "beyond the run";
	return sch_si_format(out, size, f, 3, "Hz");
}

static void gain_lines(const struct sch_levers *lv, FILE *out)
{
	for (size_t i = 0; i < lv->n_curves; i++) {
		const struct sch_gain_curve *g = &lv->curves[i];
		fprintf(out, "\n  avalanche '%s' (%s%s, k = %.3g, M = %.4g, %.1f %% of the band power):\n", g->rule,
			g->carrier, g->n_carriers > 1 ? " and others" : "", g->k_ratio, g->gain_m, 100 * g->carrier_share);
		if (isnan(g->gain_opt))
			fprintf(out, "    no finite gain maximises SNR (it rises with M up to %g)\n", 1e4);
		else
			fprintf(out, "    SNR is largest at M = %.4g: %+.2f dB against M = %.4g%s\n", g->gain_opt,
				g->snr_change_opt_db, g->gain_m,
				fabs(g->gain_opt / g->gain_m - 1) < 0.02 ? " (already there)" : "");
	}
}

enum sch_err sch_report_levers_table(const struct sch_result *r, const struct sch_levers *lv, FILE *out)
{
	char lo[32], hi[32], in[32], edge[32];
	bool snr = !isnan(r->snr);

	fprintf(out, "schrot levers: %s, band %s to %s\n", r->netlist, sch_si_format(lo, sizeof(lo), r->band_lo_hz, 3, "Hz"),
		sch_si_format(hi, sizeof(hi), r->band_hi_hz, 3, "Hz"));
	fprintf(out, "unchanged: input-referred %s rms, led by %s (%.0f %%), -3 dB edge %s\n",
		sch_si_format(in, sizeof(in), lv->base_input_rms, 4, in_unit(r)),
		r->n_contributions ? r->contributions[0].device : "-",
		r->n_contributions ? 100 * r->contributions[0].share : 0.0, edge_text(edge, sizeof(edge), lv->base_f_high_hz));
	fprintf(out, "%zu devices considered (%.1f %% of the band power), %zu noise runs, factor %g, temperature +-%g K\n\n",
		lv->n_devices, 100 * lv->coverage, lv->n_runs, lv->factor, lv->temp_step_k);
	fprintf(out, "  %4s  %-30s  %14s  %8s  %8s  %-24s  %s\n", "rank", "change", "input-referred", "ratio",
		snr ? "SNR dB" : "", "leader after", "-3 dB edge");
	for (size_t k = 0; k < lv->n_levers; k++) {
		const struct sch_lever *l = &lv->levers[k];
		char leader[64], snr_text[16] = "";
		snprintf(leader, sizeof(leader), "%s (%.0f %%)", l->leader ? l->leader : "-", 100 * l->leader_share);
		if (snr)
			snprintf(snr_text, sizeof(snr_text), "%+.2f", l->snr_change_db);
		sch_si_format(in, sizeof(in), l->input_rms, 4, in_unit(r));
		fprintf(out, "  %4zu  %-30s  %14s  %8.4f  %8s  %-24s  %s%s\n", k + 1, l->change, in, l->input_rms_ratio,
			snr_text, leader, edge_text(edge, sizeof(edge), l->f_high_hz),
			l->bandwidth_warning ? "  below the band's top!" : "");
	}
	gain_lines(lv, out);
	for (size_t k = 0; k < lv->n_notes; k++)
		fprintf(out, "%s  note: %s\n", k == 0 ? "\n" : "", lv->notes[k]);
	return ferror(out) ? SCH_ERR_IO : SCH_OK;
}

static json_t *num(double x)
{
	return isfinite(x) ? json_real(x) : json_null();
}

static json_t *str(const char *s)
{
	return s ? json_string(s) : json_null();
}

static void put(json_t *o, const char *key, json_t *v, int *bad)
{
	if (!v || json_object_set_new(o, key, v) != 0)
		*bad = 1;
}

static json_t *lever_json(const struct sch_lever *l, int *bad)
{
	json_t *o = json_object();

	if (!o) {
		*bad = 1;
		return NULL;
	}
	put(o, "device", str(l->device), bad);
	put(o, "kind", str(sch_lever_kind_name(l->kind)), bad);
	put(o, "change", str(l->change), bad);
	put(o, "factor", num(l->factor), bad);
	put(o, "old_value", num(l->old_value), bad);
	put(o, "new_value", num(l->new_value), bad);
	put(o, "value_unit", str(value_unit(l->kind)), bad);
	put(o, "input_rms", num(l->input_rms), bad);
	put(o, "input_rms_ratio", num(l->input_rms_ratio), bad);
	put(o, "output_rms_v", num(l->output_rms_v), bad);
	put(o, "snr_change_db", num(l->snr_change_db), bad);
	put(o, "snr", num(l->snr), bad);
	put(o, "leader", str(l->leader), bad);
	put(o, "leader_share", num(l->leader_share), bad);
	put(o, "f_high_hz", num(l->f_high_hz), bad);
	put(o, "bandwidth_warning", json_boolean(l->bandwidth_warning), bad);
	return o;
}

static json_t *curve_json(const struct sch_gain_curve *g, int *bad)
{
	json_t *o = json_object(), *pts = json_array();

	if (!o || !pts) {
		json_decref(o);
		json_decref(pts);
		*bad = 1;
		return NULL;
	}
	put(o, "rule", str(g->rule), bad);
	put(o, "carrier", str(g->carrier), bad);
	put(o, "carriers", json_integer((json_int_t)g->n_carriers), bad);
	put(o, "gain", num(g->gain_m), bad);
	put(o, "k_ratio", num(g->k_ratio), bad);
	put(o, "carrier_share", num(g->carrier_share), bad);
	put(o, "gain_best", num(g->gain_opt), bad);
	put(o, "snr_change_db_at_best", num(g->snr_change_opt_db), bad);
	put(o, "snr_at_gain", num(g->snr_at_rule), bad);
	put(o, "snr_at_best", num(g->snr_at_opt), bad);
	for (size_t i = 0; i < g->n; i++) {
		json_t *p = json_object();
		if (!p || json_array_append_new(pts, p) != 0) {
			*bad = 1;
			break;
		}
		put(p, "gain", num(g->gain[i]), bad);
		put(p, "snr_change_db", num(g->snr_change_db[i]), bad);
	}
	put(o, "curve", pts, bad);
	return o;
}

static json_t *levers_doc(const struct sch_result *r, const struct sch_levers *lv)
{
	json_t *doc = json_object(), *levers = json_array(), *curves = json_array(), *notes = json_array(),
	       *band = json_array(), *base = json_object();
	int bad = !doc || !levers || !curves || !notes || !band || !base;

	if (bad) {
		json_decref(doc);
		json_decref(levers);
		json_decref(curves);
		json_decref(notes);
		json_decref(band);
		json_decref(base);
		return NULL;
	}
	put(doc, "schema", json_integer(1), &bad);
	put(doc, "netlist", str(r->netlist), &bad);
	put(doc, "temperature_k", num(r->temp_k), &bad);
	put(doc, "simulator", str(r->sim_version), &bad);
	put(doc, "schrot_version", str(SCH_VERSION), &bad);
	put(doc, "output", str(r->output), &bad);
	put(doc, "input", str(r->input), &bad);
	put(doc, "input_unit", str(r->input_unit), &bad);
	bad |= json_array_append_new(band, num(r->band_lo_hz)) || json_array_append_new(band, num(r->band_hi_hz));
	put(doc, "band_hz", band, &bad);
	put(doc, "factor", num(lv->factor), &bad);
	put(doc, "temperature_step_k", num(lv->temp_step_k), &bad);
	put(base, "input_rms", num(lv->base_input_rms), &bad);
	put(base, "output_rms_v", num(r->output_rms_v), &bad);
	put(base, "snr", num(r->snr), &bad);
	put(base, "f_high_hz", num(lv->base_f_high_hz), &bad);
	put(base, "leader", str(r->n_contributions ? r->contributions[0].device : NULL), &bad);
	put(base, "leader_share", num(r->n_contributions ? r->contributions[0].share : NAN), &bad);
	put(doc, "unchanged", base, &bad);
	put(doc, "devices_considered", json_integer((json_int_t)lv->n_devices), &bad);
	put(doc, "share_considered", num(lv->coverage), &bad);
	put(doc, "runs", json_integer((json_int_t)lv->n_runs), &bad);
	for (size_t k = 0; k < lv->n_levers; k++)
		bad |= json_array_append_new(levers, lever_json(&lv->levers[k], &bad)) != 0;
	put(doc, "levers", levers, &bad);
	for (size_t k = 0; k < lv->n_curves; k++)
		bad |= json_array_append_new(curves, curve_json(&lv->curves[k], &bad)) != 0;
	put(doc, "gain_optimum", curves, &bad);
	for (size_t k = 0; k < lv->n_notes; k++)
		bad |= json_array_append_new(notes, str(lv->notes[k])) != 0;
	put(doc, "notes", notes, &bad);
	if (bad) {
		json_decref(doc);
		return NULL;
	}
	return doc;
}

enum sch_err sch_report_levers_json(const struct sch_result *r, const struct sch_levers *lv, const char *path,
				    struct sch_diag *d)
{
	struct sch_outfile o;
	json_t *doc = levers_doc(r, lv);
	enum sch_err ret;

	if (!doc)
		return sch_diag_error(d, SCH_ERR_NOMEM, path, 0, "out of memory building the JSON document");
	if ((ret = sch_outfile_open(&o, path, d)) != SCH_OK)
		goto out;
	if (json_dumpf(doc, o.fp, JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(17)) != 0 ||
	    fputc('\n', o.fp) == EOF) {
		sch_outfile_abort(&o);
		ret = sch_diag_error(d, SCH_ERR_IO, path, 0, "cannot write the JSON document");
		goto out;
	}
	ret = sch_outfile_commit(&o, d);
out:
	json_decref(doc);
	return ret;
}

static void csv_num(FILE *fp, double x, char sep)
{
	if (isfinite(x))
		fprintf(fp, "%.12g", x);
	fputc(sep, fp);
}

enum sch_err sch_report_levers_csv(const struct sch_result *r, const struct sch_levers *lv, const char *path,
				   struct sch_diag *d)
{
	struct sch_outfile o;
	enum sch_err ret;

	(void)r;
	if ((ret = sch_outfile_open(&o, path, d)) != SCH_OK)
		return ret;
	fputs("rank,device,kind,change,factor,old_value,new_value,value_unit,input_rms,input_rms_ratio,output_rms_v,"
	      "snr_change_db,leader,leader_share,f_high_hz,bandwidth_warning\n",
	      o.fp);
	for (size_t k = 0; k < lv->n_levers; k++) {
		const struct sch_lever *l = &lv->levers[k];
		fprintf(o.fp, "%zu,", k + 1);
		sch_report_csv_field(o.fp, l->device);
		fprintf(o.fp, ",%s,", sch_lever_kind_name(l->kind));
		sch_report_csv_field(o.fp, l->change);
		fputc(',', o.fp);
		csv_num(o.fp, l->factor, ',');
		csv_num(o.fp, l->old_value, ',');
		csv_num(o.fp, l->new_value, ',');
		fprintf(o.fp, "%s,", value_unit(l->kind));
		csv_num(o.fp, l->input_rms, ',');
		csv_num(o.fp, l->input_rms_ratio, ',');
		csv_num(o.fp, l->output_rms_v, ',');
		csv_num(o.fp, l->snr_change_db, ',');
		sch_report_csv_field(o.fp, l->leader);
		fputc(',', o.fp);
		csv_num(o.fp, l->leader_share, ',');
		csv_num(o.fp, l->f_high_hz, ',');
		fputs(l->bandwidth_warning ? "yes\n" : "no\n", o.fp);
	}
	if (ferror(o.fp)) {
		sch_outfile_abort(&o);
		return sch_diag_error(d, SCH_ERR_IO, path, 0, "cannot write the levers CSV");
	}
	return sch_outfile_commit(&o, d);
}

/* The plot's value range: the curves' dB values, padded, at least 1 dB tall. */
static void db_range(const struct sch_levers *lv, double *lo, double *hi)
{
	*lo = INFINITY;
	*hi = -INFINITY;
	for (size_t i = 0; i < lv->n_curves; i++) {
		for (size_t k = 0; k < lv->curves[i].n; k++) {
			double v = lv->curves[i].snr_change_db[k];
			if (isfinite(v)) {
				*lo = fmin(*lo, v);
				*hi = fmax(*hi, v);
			}
		}
	}
	*lo = floor(*lo) - 1;
	*hi = ceil(*hi) + 1;
}

static void fig_text(cairo_t *cr, double x, double y, const char *s, double align_x)
{
	cairo_text_extents_t te;

	cairo_text_extents(cr, s, &te);
	cairo_move_to(cr, x - te.x_advance * align_x, y);
	cairo_show_text(cr, s);
}

static void draw_axes(cairo_t *cr, double m_top, double lo, double hi)
{
	char buf[32];

	cairo_set_source_rgb(cr, 1, 1, 1);
	cairo_paint(cr);
	cairo_set_source_rgb(cr, 0.85, 0.85, 0.85);
	cairo_set_line_width(cr, 0.6);
	for (double m = 1; m <= m_top * 1.0001; m *= 10) {
		double x = FIG_L + (FIG_R - FIG_L) * log(m) / log(m_top);
		cairo_move_to(cr, x, FIG_T);
		cairo_line_to(cr, x, FIG_B);
	}
	for (double v = ceil(lo); v <= hi; v += ceil((hi - lo) / 8)) {
		double y = FIG_B - (FIG_B - FIG_T) * (v - lo) / (hi - lo);
		cairo_move_to(cr, FIG_L, y);
		cairo_line_to(cr, FIG_R, y);
	}
	cairo_stroke(cr);
	cairo_set_source_rgb(cr, 0.1, 0.1, 0.1);
	cairo_set_font_size(cr, 12);
	for (double m = 1; m <= m_top * 1.0001; m *= 10) {
		snprintf(buf, sizeof(buf), "%g", m);
		fig_text(cr, FIG_L + (FIG_R - FIG_L) * log(m) / log(m_top), FIG_B + 16, buf, 0.5);
	}
	for (double v = ceil(lo); v <= hi; v += ceil((hi - lo) / 8)) {
		snprintf(buf, sizeof(buf), "%+g", v);
		fig_text(cr, FIG_L - 6, FIG_B - (FIG_B - FIG_T) * (v - lo) / (hi - lo) + 4, buf, 1);
	}
	fig_text(cr, (FIG_L + FIG_R) / 2, FIG_H - 16, "avalanche gain M (primary photocurrent held)", 0.5);
	fig_text(cr, FIG_L, FIG_T - 14, "SNR against SNR at the rule's gain, dB", 0);
	cairo_rectangle(cr, FIG_L, FIG_T, FIG_R - FIG_L, FIG_B - FIG_T);
	cairo_stroke(cr);
}

static enum sch_err draw_gain(cairo_t *cr, const void *ctx)
{
	static const double colour[][3] = { { 0.12, 0.35, 0.7 }, { 0.8, 0.35, 0.1 }, { 0.2, 0.6, 0.3 } };
	const struct sch_levers *lv = ctx;
	double lo, hi, m_top = 10;

	if (lv->n_curves == 0)
		return SCH_ERR_USAGE;
	for (size_t i = 0; i < lv->n_curves; i++)
		m_top = fmax(m_top, lv->curves[i].gain[lv->curves[i].n - 1]);
	m_top = pow(10, ceil(log10(m_top) - 1e-9));
	db_range(lv, &lo, &hi);
	draw_axes(cr, m_top, lo, hi);
	for (size_t i = 0; i < lv->n_curves; i++) {
		const struct sch_gain_curve *g = &lv->curves[i];
		const double *c = colour[i % 3];
		cairo_set_source_rgb(cr, c[0], c[1], c[2]);
		cairo_set_line_width(cr, 2);
		for (size_t k = 0; k < g->n; k++) {
			double x = FIG_L + (FIG_R - FIG_L) * log(g->gain[k]) / log(m_top);
			double y = FIG_B - (FIG_B - FIG_T) * (g->snr_change_db[k] - lo) / (hi - lo);
			if (k == 0)
				cairo_move_to(cr, x, y);
			else
				cairo_line_to(cr, x, y);
		}
		cairo_stroke(cr);
		/* the rule's own gain: 0 dB by definition, an open circle */
		cairo_arc(cr, FIG_L + (FIG_R - FIG_L) * log(g->gain_m) / log(m_top),
			  FIG_B - (FIG_B - FIG_T) * (0 - lo) / (hi - lo), 4, 0, 2 * M_PI);
		cairo_stroke(cr);
		if (!isnan(g->gain_opt)) {
			double x = FIG_L + (FIG_R - FIG_L) * log(g->gain_opt) / log(m_top);
			double y = FIG_B - (FIG_B - FIG_T) * (g->snr_change_opt_db - lo) / (hi - lo);
			char buf[64];
			cairo_arc(cr, x, y, 4, 0, 2 * M_PI);
			cairo_fill(cr);
			snprintf(buf, sizeof(buf), "%s: best M = %.3g", g->carrier, g->gain_opt);
			fig_text(cr, x, y - 10, buf, 0.5);
		}
	}
	return SCH_OK;
}

enum sch_err sch_report_levers_plot(const struct sch_levers *lv, const char *path, struct sch_diag *d)
{
	if (lv->n_curves == 0)
		return sch_diag_error(d, SCH_ERR_USAGE, path, 0,
				      "the levers plot shows SNR against avalanche gain: give an --avalanche rule");
	return sch_report_figure(path, FIG_W, FIG_H, draw_gain, lv, d);
}
