/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * report_plot.c - the noise density plot (cairo, the only file that draws): log-log output density
 * of the total and the largest contributions, decade grid, band shaded; as SVG or PNG.
 */
#include <cairo-svg.h>
#include <cairo.h>
#include <ctype.h>
#include <math.h>
#include <stdbool.h>
#include <stdio.h>
#include <string.h>
#include "schrot/outfile.h"
#include "schrot/report.h"
#include "schrot/si.h"
#include "report_int.h"

#define PLOT_W 960.0
#define AREA_L 104.0
#define AREA_T 70.0
#define AREA_R (PLOT_W - 262.0)
#define AREA_B 498.0
/* the transfer's panel under the noise panel, on the same frequency axis */
#define TF_T (AREA_B + 52.0)
#define TF_B (TF_T + 150.0)
#define PLOT_H (TF_B + 62.0)
#define TF_DECADES 6
#define MAX_DECADES_Y 7
#define FONT "DejaVu Sans"

struct rgb {
	double r, g, b;
};

/* Colour-blind-safe hues, distinct on white and in greyscale print order. */
static const struct rgb palette[SCH_PLOT_TOP] = {
	{ 0.00, 0.45, 0.70 }, { 0.84, 0.37, 0.00 }, { 0.00, 0.62, 0.45 },
	{ 0.80, 0.47, 0.65 }, { 0.90, 0.62, 0.00 }, { 0.34, 0.71, 0.91 },
};

/* Axis mapping, decades as plotted. */
struct axes {
	double x_lo, x_hi; /* log10 Hz */
	double y_lo, y_hi; /* log10 V/√Hz */
};

static double map_x(const struct axes *ax, double f)
{
	return AREA_L + (log10(f) - ax->x_lo) / (ax->x_hi - ax->x_lo) * (AREA_R - AREA_L);
}

static double map_y(const struct axes *ax, double v)
{
	return AREA_B - (log10(v) - ax->y_lo) / (ax->y_hi - ax->y_lo) * (AREA_B - AREA_T);
}

static double density(const double *psd, size_t k)
{
	return psd ? sqrt(fabs(psd[k])) : NAN;
}

static void widen(double v, double *lo, double *hi)
{
	if (!(v > 0) || !isfinite(v))
		return;
	if (v < *lo)
		*lo = v;
	if (v > *hi)
		*hi = v;
}

/* log10 of v raised to the next half decade, leaving a tenth of a decade for the total's wide stroke. */
static double half_decade_above(double v)
{
	return ceil(2 * (log10(v) + 0.1)) / 2;
}

/* log10 of v lowered to the next half decade, leaving 5 % of a decade. */

static double half_decade_below(double v)
{
	return floor(2 * (log10(v) - 0.05)) / 2;
}

static bool pick_axes(const struct sch_result *r, size_t top, struct axes *ax)
{
	double f_lo = INFINITY, f_hi = 0, v_lo = INFINITY, v_hi = 0, t_lo = INFINITY, t_hi = 0;

	for (size_t k = 0; k < r->n_freq; k++) {
		widen(r->freq_hz[k], &f_lo, &f_hi);
		widen(density(r->total_psd, k), &t_lo, &t_hi);
		for (size_t i = 0; i < top; i++)
			widen(density(r->contributions[i].psd, k), &v_lo, &v_hi);
	}
	if (!(f_hi > 0) || !(t_hi > 0 || v_hi > 0))
		return false;
	widen(t_lo, &v_lo, &v_hi);
	widen(t_hi, &v_lo, &v_hi);
	ax->x_lo = floor(log10(f_lo) + 1e-9);
	ax->x_hi = ceil(log10(f_hi) - 1e-9);
	if (r->n_freq == 1) /* a spot run: its frequency inside two decades, not on the frame */
		ax->x_lo -= 1, ax->x_hi = ax->x_lo + 2;
	if (ax->x_hi <= ax->x_lo)
		ax->x_hi = ax->x_lo + 1;
	/* half-decade ends: a curve just above a decade does not cost the plot a whole empty decade */
	ax->y_hi = half_decade_above(v_hi);
	ax->y_lo = half_decade_below(v_lo);
	/* A contribution far below the total carries no information worth the vertical space. */
	if (ax->y_lo < ax->y_hi - MAX_DECADES_Y)
		ax->y_lo = ax->y_hi - MAX_DECADES_Y;
	if (t_lo < INFINITY && ax->y_lo > half_decade_below(t_lo))
		ax->y_lo = half_decade_below(t_lo);
	if (ax->y_hi - ax->y_lo < 2)
		ax->y_lo = ax->y_hi - 2;
	return true;
}

/* "100 nV/√Hz", "1 kHz", "10 MΩ": a decade's value with an SI prefix and the unit. */
static void decade_label(char *out, size_t size, int e, const char *unit)
{
	static const char *const prefix[] = { "a", "f", "p", "n", "µ", "m", "", "k", "M", "G", "T" };
	int p = (int)floor(e / 3.0);
	int m = e - 3 * p;

	if (p < -6 || p > 4) {
		snprintf(out, size, "1e%d %s", e, unit);
		return;
	}
	snprintf(out, size, "%d %s%s", m == 0 ? 1 : m == 1 ? 10 : 100, prefix[p + 6], unit);
}

/* The key under which a cairo context carries the SVG text sink (struct sch_buf *). */
static const cairo_user_data_key_t text_sink_key;

/* Appends s to b with the characters that mean something in XML escaped; false when out of memory. */
static bool add_xml_text(struct sch_buf *b, const char *s)
{
	bool ok = true;

	for (; *s && ok; s++) {
		switch (*s) {
		case '&':
			ok = sch_buf_add(b, "&amp;", 5) == SCH_OK;
			break;
		case '<':
			ok = sch_buf_add(b, "&lt;", 4) == SCH_OK;
			break;
		case '>':
			ok = sch_buf_add(b, "&gt;", 4) == SCH_OK;
			break;
		default:
			ok = sch_buf_add(b, s, 1) == SCH_OK;
		}
	}
	return ok;
}

/*
 * An SVG <text> element for s at the current point, in the current font size, weight, colour and
 * rotation, appended to sink; the current point advances as cairo_show_text would move it.
 */
static void sink_text(cairo_t *cr, struct sch_buf *sink, const char *s)
{
	double x, y, r = 0, g = 0, b = 0, a = 1;
	cairo_matrix_t fm, um;
	cairo_text_extents_t te;
	char head[400];
	double angle;
	bool bold = cairo_toy_font_face_get_weight(cairo_get_font_face(cr)) == CAIRO_FONT_WEIGHT_BOLD;

	cairo_get_current_point(cr, &x, &y);
	cairo_text_extents(cr, s, &te);
	cairo_user_to_device(cr, &x, &y);
	cairo_get_font_matrix(cr, &fm);
	cairo_get_matrix(cr, &um);
	cairo_pattern_get_rgba(cairo_get_source(cr), &r, &g, &b, &a);
	angle = atan2(um.yx, um.xx) * 180.0 / M_PI;
	snprintf(head, sizeof(head),
		 "<text x=\"%.2f\" y=\"%.2f\" font-family=\"%s, sans-serif\" font-size=\"%.2f\"%s fill=\"rgb(%d,%d,%d)\"",
		 x, y, FONT, sqrt(fm.xx * fm.xx + fm.yx * fm.yx), bold ? " font-weight=\"bold\"" : "", (int)lround(255 * r),
		 (int)lround(255 * g), (int)lround(255 * b));
	if (sch_buf_add(sink, head, strlen(head)) != SCH_OK)
		return;
	if (fabs(angle) > 1e-6) {
		snprintf(head, sizeof(head), " transform=\"rotate(%.2f %.2f %.2f)\"", angle, x, y);
		if (sch_buf_add(sink, head, strlen(head)) != SCH_OK)
			return;
	}
	if (sch_buf_add(sink, ">", 1) == SCH_OK && add_xml_text(sink, s))
		(void)sch_buf_add(sink, "</text>\n", 8);
	cairo_rel_move_to(cr, te.x_advance, te.y_advance);
}

void sch_report_show_text(cairo_t *cr, const char *s)
{
	struct sch_buf *sink = cairo_get_user_data(cr, &text_sink_key);

	if (sink)
		sink_text(cr, sink, s);
	else
		cairo_show_text(cr, s);
}

static void set_colour(cairo_t *cr, double r, double g, double b)
{
	cairo_set_source_rgb(cr, r, g, b);
}

static void text_at(cairo_t *cr, double x, double y, const char *s, double align_x, double align_y)
{
	cairo_text_extents_t te;

	cairo_text_extents(cr, s, &te);
	cairo_move_to(cr, x - te.x_advance * align_x, y + te.height * align_y);
	sch_report_show_text(cr, s);
}

/* Shortens s (UTF-8) with "…" until it fits max_w at the current font. */
static void fit_text(cairo_t *cr, const char *s, double max_w, char *out, size_t size)
{
	cairo_text_extents_t te;
	size_t len;

	snprintf(out, size, "%s", s);
	cairo_text_extents(cr, out, &te);
	if (te.x_advance <= max_w)
		return;
	len = strlen(out);
	while (len > 0) {
		do
			len--;
		while (len > 0 && ((unsigned char)out[len] & 0xC0) == 0x80);
		if (len + 4 > size)
			continue;
		memcpy(out + len, "…", sizeof("…"));
		cairo_text_extents(cr, out, &te);
		if (te.x_advance <= max_w)
			return;
	}
}

/* Greys out the frequencies outside the band (they are not integrated) and marks its edges. */
static void draw_band(cairo_t *cr, const struct sch_result *r, const struct axes *ax)
{
	static const double dash[] = { 4.0, 3.0 };
	double lo = r->band_lo_hz, hi = r->band_hi_hz;
	double x0, x1;

	if (!(lo > 0) || !(hi > lo))
		return;
	x0 = fmin(fmax(map_x(ax, lo), AREA_L), AREA_R);
	x1 = fmax(fmin(map_x(ax, hi), AREA_R), AREA_L);
	set_colour(cr, 0.93, 0.93, 0.93);
	if (x0 > AREA_L + 0.5)
		cairo_rectangle(cr, AREA_L, AREA_T, x0 - AREA_L, AREA_B - AREA_T);
	if (x1 < AREA_R - 0.5)
		cairo_rectangle(cr, x1, AREA_T, AREA_R - x1, AREA_B - AREA_T);
	cairo_fill(cr);
	cairo_set_line_width(cr, 1.0);
	cairo_set_dash(cr, dash, 2, 0);
	set_colour(cr, 0.45, 0.45, 0.45);
	for (int k = 0; k < 2; k++) {
		double x = k ? x1 : x0;
		if (x > AREA_L + 0.5 && x < AREA_R - 0.5) {
			cairo_move_to(cr, x, AREA_T);
			cairo_line_to(cr, x, AREA_B);
		}
	}
	cairo_stroke(cr);
	cairo_set_dash(cr, NULL, 0, 0);
	if (x0 > AREA_L + 0.5 || x1 < AREA_R - 0.5) {
		cairo_set_font_size(cr, 11);
		set_colour(cr, 0.35, 0.35, 0.35);
		text_at(cr, (x0 + x1) / 2, AREA_T - 6, "integration band", 0.5, 0);
	}
}

static void draw_grid(cairo_t *cr, const struct axes *ax)
{
	char s[48];
	/* x ends are whole decades, y ends may be half decades: y decades labelled are those inside */
	int ey_lo = (int)ceil(ax->y_lo - 1e-9), ey_hi = (int)floor(ax->y_hi + 1e-9);
	int nx = (int)(ax->x_hi - ax->x_lo), ny = ey_hi - ey_lo;
	int x_step = nx > 9 ? 2 : 1, y_step = ny > 9 ? 2 : 1;

	cairo_set_line_width(cr, 0.6);
	set_colour(cr, 0.90, 0.90, 0.90);
	for (int e = (int)ax->x_lo; e < (int)ax->x_hi; e++)
		for (int m = 2; m <= 9; m++) {
			double x = map_x(ax, m * pow(10, e));
			cairo_move_to(cr, x, AREA_T);
			cairo_line_to(cr, x, AREA_B);
		}
	for (int e = ey_lo - 1; e <= ey_hi; e++)
		for (int m = 2; m <= 9; m++) {
			double lg = e + log10(m);
			if (lg <= ax->y_lo || lg >= ax->y_hi)
				continue;
			cairo_move_to(cr, AREA_L, map_y(ax, pow(10, lg)));
			cairo_line_to(cr, AREA_R, map_y(ax, pow(10, lg)));
		}
	cairo_stroke(cr);
	cairo_set_line_width(cr, 1.0);
	set_colour(cr, 0.70, 0.70, 0.70);
	for (int e = (int)ax->x_lo + 1; e < (int)ax->x_hi; e++) {
		double x = map_x(ax, pow(10, e));
		cairo_move_to(cr, x, AREA_T);
		cairo_line_to(cr, x, AREA_B);
	}
	for (int e = ey_lo; e <= ey_hi; e++) {
		double y = map_y(ax, pow(10, e));
		if (e <= ax->y_lo + 1e-9 || e >= ax->y_hi - 1e-9)
			continue; /* the frame is there */
		cairo_move_to(cr, AREA_L, y);
		cairo_line_to(cr, AREA_R, y);
	}
	cairo_stroke(cr);
	cairo_set_font_size(cr, 12);
	set_colour(cr, 0.15, 0.15, 0.15);
	for (int e = (int)ax->x_lo; e <= (int)ax->x_hi; e += x_step) {
		decade_label(s, sizeof(s), e, "Hz");
		text_at(cr, map_x(ax, pow(10, e)), AREA_B + 8, s, 0.5, 1.0);
	}
	for (int e = ey_lo; e <= ey_hi; e += y_step) {
		cairo_text_extents_t te;
		decade_label(s, sizeof(s), e, "V/√Hz");
		cairo_text_extents(cr, s, &te);
		cairo_move_to(cr, AREA_L - 8 - te.x_advance, map_y(ax, pow(10, e)) + 4.5);
		sch_report_show_text(cr, s);
	}
}

static void draw_frame_and_titles(cairo_t *cr, const struct sch_result *r)
{
	char a[48], s[600];
	const char *name = r->netlist ? r->netlist : "";
	const char *slash = strrchr(name, '/');

	cairo_set_line_width(cr, 1.2);
	set_colour(cr, 0.2, 0.2, 0.2);
	cairo_rectangle(cr, AREA_L, AREA_T, AREA_R - AREA_L, AREA_B - AREA_T);
	cairo_stroke(cr);
	cairo_set_font_size(cr, 13);
	text_at(cr, (AREA_L + AREA_R) / 2, PLOT_H - 18, "frequency", 0.5, 0);
	cairo_save(cr);
	cairo_move_to(cr, 20, (AREA_T + AREA_B) / 2);
	cairo_rotate(cr, -M_PI / 2);
	{
		cairo_text_extents_t te;
		const char *t = "output noise density";
		cairo_text_extents(cr, t, &te);
		cairo_rel_move_to(cr, -te.x_advance / 2, 0);
		sch_report_show_text(cr, t);
	}
	cairo_restore(cr);
	cairo_select_font_face(cr, FONT, CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_BOLD);
	cairo_set_font_size(cr, 15);
	set_colour(cr, 0.05, 0.05, 0.05);
	fit_text(cr, slash ? slash + 1 : name, AREA_R - AREA_L, s, sizeof(s));
	cairo_move_to(cr, AREA_L, 24);
	sch_report_show_text(cr, s);
	cairo_select_font_face(cr, FONT, CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_NORMAL);
	cairo_set_font_size(cr, 12);
	set_colour(cr, 0.30, 0.30, 0.30);
	{
		char line[700];
		char lo[48], hi[48];
		if (r->spot_run)
			snprintf(line, sizeof(line), "noise at %s: a single-frequency run at %s (no band)",
				 r->output ? r->output : "the output", sch_si_format(lo, sizeof(lo), r->band_lo_hz, 3, "Hz"));
		else
			snprintf(line, sizeof(line), "noise at %s: %s rms over the band %s – %s",
				 r->output ? r->output : "the output", sch_si_format(a, sizeof(a), r->output_rms_v, 3, "V"),
				 sch_si_format(lo, sizeof(lo), r->band_lo_hz, 3, "Hz"),
				 sch_si_format(hi, sizeof(hi), r->band_hi_hz, 3, "Hz"));
		fit_text(cr, line, PLOT_W - AREA_L - 20, s, sizeof(s));
	}
	cairo_move_to(cr, AREA_L, 42);
	sch_report_show_text(cr, s);
}

static void curve(cairo_t *cr, const struct sch_result *r, const struct axes *ax, const double *psd)
{
	bool pen = false;

	for (size_t k = 0; k < r->n_freq; k++) {
		double f = r->freq_hz[k], v = density(psd, k);
		if (!(f > 0) || !(v > 0) || !isfinite(v)) {
			pen = false;
			continue;
		}
		if (pen)
			cairo_line_to(cr, map_x(ax, f), map_y(ax, v));
		else
			cairo_move_to(cr, map_x(ax, f), map_y(ax, v));
		if (r->n_freq == 1) { /* a spot run: a short level mark at its one frequency */
			cairo_move_to(cr, map_x(ax, f) - 14, map_y(ax, v));
			cairo_rel_line_to(cr, 28, 0);
		}
		pen = true;
	}
	cairo_stroke(cr);
}

static void line_style(cairo_t *cr, size_t i, bool total, bool dashed)
{
	static const double dash[] = { 6.0, 3.5 };

	if (total) {
		/* a wide light stroke under the contributions, so the one that dominates stays visible on it */
		set_colour(cr, 0.74, 0.74, 0.74);
		cairo_set_line_width(cr, 7.0);
	} else {
		set_colour(cr, palette[i].r, palette[i].g, palette[i].b);
		cairo_set_line_width(cr, 1.7);
	}
	cairo_set_dash(cr, dash, dashed ? 2 : 0, 0);
}

static void draw_curves(cairo_t *cr, const struct sch_result *r, const struct axes *ax, size_t top)
{
	cairo_save(cr);
	cairo_rectangle(cr, AREA_L, AREA_T, AREA_R - AREA_L, AREA_B - AREA_T);
	cairo_clip(cr);
	cairo_set_line_join(cr, CAIRO_LINE_JOIN_ROUND);
	cairo_set_line_cap(cr, CAIRO_LINE_CAP_ROUND);
	line_style(cr, 0, true, false);
	curve(cr, r, ax, r->total_psd);
	/* largest on top; corrections last, dashed, since they often trace the row they correct */
	for (int pass = 0; pass < 2; pass++)
		for (size_t i = top; i-- > 0;) {
			bool correction = r->contributions[i].origin == SCH_ORIGIN_CORRECTION;
			if (correction != (pass == 1))
				continue;
			line_style(cr, i, false, correction);
			curve(cr, r, ax, r->contributions[i].psd);
		}
	cairo_restore(cr);
}

static void legend_entry(cairo_t *cr, double y, const char *name, const char *detail)
{
	const double x = AREA_R + 18;
	char s[600];

	cairo_move_to(cr, x, y);
	cairo_line_to(cr, x + 26, y);
	cairo_stroke(cr);
	cairo_set_dash(cr, NULL, 0, 0);
	set_colour(cr, 0.08, 0.08, 0.08);
	cairo_set_font_size(cr, 12);
	fit_text(cr, name, PLOT_W - x - 40, s, sizeof(s));
	cairo_move_to(cr, x + 34, y + 4);
	sch_report_show_text(cr, s);
	set_colour(cr, 0.40, 0.40, 0.40);
	cairo_set_font_size(cr, 10.5);
	cairo_move_to(cr, x + 34, y + 18);
	sch_report_show_text(cr, detail);
}

static void draw_legend(cairo_t *cr, const struct sch_result *r, size_t top)
{
	char name[512], detail[160], rms[48], pct[32];
	double y = AREA_T + 10;

	line_style(cr, 0, true, false);
	snprintf(detail, sizeof(detail), "%s %s", sch_si_format(rms, sizeof(rms), r->spot_run ? sqrt(r->total_psd[0]) :
									 r->output_rms_v, 3, r->spot_run ? "V/√Hz" : "V"),
		 r->spot_run ? "at the spot" : "rms");
	legend_entry(cr, y, "total", detail);
	for (size_t i = 0; i < top; i++) {
		const struct sch_contribution *c = &r->contributions[i];
		y += 40;
		line_style(cr, i, false, c->origin == SCH_ORIGIN_CORRECTION);
		sch_report_label(c, name, sizeof(name));
		sch_report_format_share(pct, sizeof(pct), c->share);
		if (r->spot_run)
			snprintf(detail, sizeof(detail), "%s%s", pct,
				 c->band_power < 0 ? " (removes)" : c->origin == SCH_ORIGIN_CORRECTION ? " (correction)" : "");
		else
			snprintf(detail, sizeof(detail), "%s · %s rms%s", pct,
				 sch_si_format(rms, sizeof(rms), c->output_rms_v, 3, "V"),
				 c->band_power < 0 ? " (removes)" : c->origin == SCH_ORIGIN_CORRECTION ? " (correction)" : "");
		legend_entry(cr, y, name, detail);
	}
	if (r->n_contributions > top) {
		set_colour(cr, 0.40, 0.40, 0.40);
		cairo_set_font_size(cr, 10.5);
		snprintf(detail, sizeof(detail), "%zu smaller contributions not drawn", r->n_contributions - top);
		cairo_move_to(cr, AREA_R + 18, y + 42);
		sch_report_show_text(cr, detail);
	}
}

/* The transfer's vertical range in decades of |H|: whole decades around it, at most TF_DECADES. */
static bool transfer_axis(const struct sch_result *r, double *lo, double *hi)
{
	double g_lo = INFINITY, g_hi = 0;

	for (size_t k = 0; r->gain2 && k < r->n_freq; k++)
		widen(sqrt(r->gain2[k]), &g_lo, &g_hi);
	if (!(g_hi > 0))
		return false;
	*hi = ceil(log10(g_hi) + 0.05);
	*lo = floor(log10(g_lo) - 0.05);
	if (*lo < *hi - TF_DECADES)
		*lo = *hi - TF_DECADES;
	if (*hi - *lo < 1)
		*lo = *hi - 1;
	return true;
}

static double map_tf(double lo, double hi, double h)
{
	return TF_B - (log10(h) - lo) / (hi - lo) * (TF_B - TF_T);
}

/* The transfer panel's grid and its axis labels: decades of |H| in unit, decades of frequency. */
static void transfer_grid(cairo_t *cr, const struct axes *ax, double lo, double hi, const char *unit)
{
	char s[64];

	cairo_set_line_width(cr, 1.0);
	set_colour(cr, 0.70, 0.70, 0.70);
	for (int e = (int)ax->x_lo + 1; e < (int)ax->x_hi; e++) {
		cairo_move_to(cr, map_x(ax, pow(10, e)), TF_T);
		cairo_line_to(cr, map_x(ax, pow(10, e)), TF_B);
	}
	for (int e = (int)lo + 1; e < (int)hi; e++) {
		cairo_move_to(cr, AREA_L, map_tf(lo, hi, pow(10, e)));
		cairo_line_to(cr, AREA_R, map_tf(lo, hi, pow(10, e)));
	}
	cairo_stroke(cr);
	cairo_set_font_size(cr, 12);
	set_colour(cr, 0.15, 0.15, 0.15);
	for (int e = (int)lo; e <= (int)hi; e += hi - lo > 4 ? 2 : 1) {
		cairo_text_extents_t te;
		decade_label(s, sizeof(s), e, unit);
		cairo_text_extents(cr, s, &te);
		cairo_move_to(cr, AREA_L - 8 - te.x_advance, map_tf(lo, hi, pow(10, e)) + 4.5);
		sch_report_show_text(cr, s);
	}
	for (int e = (int)ax->x_lo; e <= (int)ax->x_hi; e += ax->x_hi - ax->x_lo > 9 ? 2 : 1) {
		decade_label(s, sizeof(s), e, "Hz");
		text_at(cr, map_x(ax, pow(10, e)), TF_B + 8, s, 0.5, 1.0);
	}
}

/* |H| over frequency inside the panel, its -3 dB points dashed. */
static void transfer_curve(cairo_t *cr, const struct sch_result *r, const struct axes *ax, double lo, double hi)
{
	static const double dash[] = { 4.0, 3.0 };
	double edges[2] = { r->transfer.f_low_hz, r->transfer.f_high_hz };
	bool pen = false;

	cairo_save(cr);
	cairo_rectangle(cr, AREA_L, TF_T, AREA_R - AREA_L, TF_B - TF_T);
	cairo_clip(cr);
	cairo_set_dash(cr, dash, 2, 0);
	set_colour(cr, 0.45, 0.45, 0.45);
	for (int k = 0; k < 2; k++) {
		if (!(edges[k] > 0))
			continue;
		cairo_move_to(cr, map_x(ax, edges[k]), TF_T);
		cairo_line_to(cr, map_x(ax, edges[k]), TF_B);
	}
	cairo_stroke(cr);
	cairo_set_dash(cr, NULL, 0, 0);
	set_colour(cr, 0.10, 0.10, 0.10);
	cairo_set_line_width(cr, 2.0);
	for (size_t k = 0; k < r->n_freq; k++) {
		double f = r->freq_hz[k], h = sqrt(r->gain2[k]);
		if (!(f > 0) || !(h > 0) || !isfinite(h)) {
			pen = false;
			continue;
		}
		if (pen)
			cairo_line_to(cr, map_x(ax, f), map_tf(lo, hi, h));
		else
			cairo_move_to(cr, map_x(ax, f), map_tf(lo, hi, h));
		pen = true;
	}
	cairo_stroke(cr);
	cairo_restore(cr);
}

/*
 * The lower panel: |transfer| over frequency on the noise panel's frequency axis, its decades
 * labelled in the transfer's unit (Ω for a current input), the mid-band value and -3 dB points marked.
 */
static void draw_transfer(cairo_t *cr, const struct sch_result *r, const struct axes *ax)
{
	bool current = r->input_unit && strcmp(r->input_unit, "A") == 0;
	double lo, hi;
	char s[200], v[64], f[48];

	if (!transfer_axis(r, &lo, &hi))
		return;
	transfer_grid(cr, ax, lo, hi, current ? "Ω" : "V/V");
	transfer_curve(cr, r, ax, lo, hi);
	cairo_set_line_width(cr, 1.2);
	set_colour(cr, 0.2, 0.2, 0.2);
	cairo_rectangle(cr, AREA_L, TF_T, AREA_R - AREA_L, TF_B - TF_T);
	cairo_stroke(cr);
	cairo_set_font_size(cr, 12);
	set_colour(cr, 0.30, 0.30, 0.30);
	snprintf(s, sizeof(s), "|transfer| from %s to %s: %s at %s", r->input ? r->input : "the input",
		 r->output ? r->output : "the output", sch_report_transfer_value(r, v, sizeof(v)),
		 sch_si_format(f, sizeof(f), r->transfer.ref_hz, 3, "Hz"));
	cairo_move_to(cr, AREA_L, TF_T - 8);
	sch_report_show_text(cr, s);
	set_colour(cr, 0.40, 0.40, 0.40);
	cairo_set_font_size(cr, 10.5);
	cairo_move_to(cr, AREA_R + 18, TF_T + 14);
	sch_report_show_text(cr, "dashed: -3 dB points");
	snprintf(s, sizeof(s), "noise bandwidth %s", sch_si_format(v, sizeof(v), r->transfer.enbw_hz, 3, "Hz"));
	cairo_move_to(cr, AREA_R + 18, TF_T + 30);
	sch_report_show_text(cr, s);
}

/* Draws the whole figure; SCH_ERR_USAGE when there is nothing to plot. */
static enum sch_err draw(cairo_t *cr, const struct sch_result *r)
{
	struct axes ax;
	size_t top = sch_report_top_count(r, SCH_PLOT_TOP);

	if (r->n_freq == 0 || !pick_axes(r, top, &ax))
		return SCH_ERR_USAGE;
	cairo_set_source_rgb(cr, 1, 1, 1);
	cairo_paint(cr);
	cairo_select_font_face(cr, FONT, CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_NORMAL);
	draw_band(cr, r, &ax);
	draw_grid(cr, &ax);
	draw_curves(cr, r, &ax, top);
	draw_frame_and_titles(cr, r);
	draw_legend(cr, r, top);
	draw_transfer(cr, r, &ax);
	return cairo_status(cr) == CAIRO_STATUS_SUCCESS ? SCH_OK : SCH_ERR_IO;
}

static cairo_status_t write_file(void *closure, const unsigned char *data, unsigned int length)
{
	return fwrite(data, 1, length, closure) == length ? CAIRO_STATUS_SUCCESS : CAIRO_STATUS_WRITE_ERROR;
}

static cairo_status_t write_buf(void *closure, const unsigned char *data, unsigned int length)
{
	return sch_buf_add(closure, (const char *)data, length) == SCH_OK ? CAIRO_STATUS_SUCCESS
									   : CAIRO_STATUS_NO_MEMORY;
}

/*
 * Appends the SVG document svg to out with the text elements of texts placed just before its
 * closing </svg>, so the figure's words stay text (searchable, editable) rather than outlines.
 */
static enum sch_err svg_with_text(const struct sch_buf *svg, const struct sch_buf *texts, struct sch_buf *out)
{
	const char *end = NULL;
	size_t head;
	enum sch_err ret;

	for (const char *p = svg->data; p && (p = strstr(p, "</svg>")); p++)
		end = p;
	if (!end)
		return SCH_ERR_IO;
	head = (size_t)(end - svg->data);
	if ((ret = sch_buf_add(out, svg->data, head)) != SCH_OK ||
	    (texts->len && (ret = sch_buf_add(out, texts->data, texts->len)) != SCH_OK))
		return ret;
	return sch_buf_add(out, end, svg->len - head);
}

/* Draws with draw_fn on an SVG surface of width x height and appends the document, text kept as text, to out. */
static enum sch_err svg_document(double width, double height, enum sch_err (*draw_fn)(cairo_t *cr, const void *ctx),
				 const void *ctx, struct sch_buf *out)
{
	struct sch_buf svg, texts;
	cairo_surface_t *surface;
	cairo_t *cr;
	enum sch_err ret;

	sch_buf_init(&svg, SCH_REPORT_MAX_BYTES);
	sch_buf_init(&texts, SCH_REPORT_MAX_BYTES);
	surface = cairo_svg_surface_create_for_stream(write_buf, &svg, width, height);
	cr = cairo_create(surface);
	cairo_set_user_data(cr, &text_sink_key, &texts, NULL);
	ret = draw_fn(cr, ctx);
	cairo_destroy(cr);
	cairo_surface_finish(surface);
	if (ret == SCH_OK && cairo_surface_status(surface) != CAIRO_STATUS_SUCCESS)
		ret = cairo_surface_status(surface) == CAIRO_STATUS_NO_MEMORY ? SCH_ERR_NOMEM : SCH_ERR_IO;
	cairo_surface_destroy(surface);
	if (ret == SCH_OK)
		ret = svg_with_text(&svg, &texts, out);
	sch_buf_release(&svg);
	sch_buf_release(&texts);
	return ret;
}

static enum sch_err draw_result(cairo_t *cr, const void *ctx)
{
	return draw(cr, ctx);
}

enum sch_err sch_report_plot_svg(const struct sch_result *r, struct sch_buf *out)
{
	return svg_document(PLOT_W, PLOT_H, draw_result, r, out);
}

static bool has_ext(const char *path, const char *ext)
{
	size_t n = strlen(path), e = strlen(ext);

	if (n <= e)
		return false;
	for (size_t i = 0; i < e; i++)
		if (tolower((unsigned char)path[n - e + i]) != ext[i])
			return false;
	return true;
}

/* The SVG figure into the open file o; SCH_ERR_USAGE when draw_fn finds nothing to draw. */
static enum sch_err figure_svg(struct sch_outfile *o, double width, double height,
			       enum sch_err (*draw_fn)(cairo_t *cr, const void *ctx), const void *ctx)
{
	struct sch_buf doc;
	enum sch_err ret;

	sch_buf_init(&doc, SCH_REPORT_MAX_BYTES);
	ret = svg_document(width, height, draw_fn, ctx, &doc);
	if (ret == SCH_OK && fwrite(doc.data, 1, doc.len, o->fp) != doc.len)
		ret = SCH_ERR_IO;
	sch_buf_release(&doc);
	return ret;
}

enum sch_err sch_report_figure(const char *path, double width, double height,
			       enum sch_err (*draw_fn)(cairo_t *cr, const void *ctx), const void *ctx, struct sch_diag *d)
{
	enum sch_err ret = SCH_ERR_USAGE;
	struct sch_outfile o;
	cairo_surface_t *surface = NULL;
	cairo_t *cr;
	bool svg = has_ext(path, ".svg"), open = false;

	if (!svg && !has_ext(path, ".png")) {
		ret = sch_diag_error(d, SCH_ERR_USAGE, path, 0, "plot file name must end in .svg or .png");
		goto out;
	}
	if ((ret = sch_outfile_open(&o, path, d)) != SCH_OK)
		goto out;
	open = true;
	if (svg) {
		ret = figure_svg(&o, width, height, draw_fn, ctx);
	} else {
		surface = cairo_image_surface_create(CAIRO_FORMAT_RGB24, (int)width, (int)height);
		cr = cairo_create(surface);
		ret = draw_fn(cr, ctx);
		cairo_destroy(cr);
		cairo_surface_flush(surface);
		if (ret == SCH_OK && cairo_surface_write_to_png_stream(surface, write_file, o.fp) != CAIRO_STATUS_SUCCESS)
			ret = SCH_ERR_IO;
		cairo_surface_finish(surface);
		if (ret == SCH_OK && cairo_surface_status(surface) != CAIRO_STATUS_SUCCESS)
			ret = SCH_ERR_IO;
	}
	if (ret == SCH_ERR_USAGE) {
		ret = sch_diag_error(d, ret, path, 0, "nothing to plot: no positive value to draw");
		goto out;
	}
	if (ret != SCH_OK) {
		ret = sch_diag_error(d, ret, path, 0, "cannot draw the plot: %s",
				     surface ? cairo_status_to_string(cairo_surface_status(surface)) : "SVG output failed");
		goto out;
	}
	open = false;
	ret = sch_outfile_commit(&o, d);
out:
	if (surface)
		cairo_surface_destroy(surface);
	if (open)
		sch_outfile_abort(&o);
	return ret;
}

enum sch_err sch_report_plot(const struct sch_result *r, const char *path, struct sch_diag *d)
{
	if (r->n_freq == 0)
		return sch_diag_error(d, SCH_ERR_USAGE, path, 0, "the plot needs a noise analysis");
	return sch_report_figure(path, PLOT_W, PLOT_H, draw_result, r, d);
}
