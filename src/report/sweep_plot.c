/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * sweep_plot.c - the plot of a sweep: output rms, the carriers' shot noise and the rest against
 * the varied level, with the shot-noise-limited crossover marked; .svg or .png.
 */
#include <cairo.h>
#include <math.h>
#include <stdbool.h>
#include <stdio.h>
#include <string.h>
#include "schrot/report.h"
#include "schrot/si.h"
#include "report_int.h"

#define W 960.0
#define H 560.0
#define L 100.0
#define R 730.0
#define T 60.0
#define B 470.0
#define FONT "DejaVu Sans"

/* The data ranges and how they map onto the page. */
struct axes {
	bool log_x;
	double x0, x1;  /* value, or log10 of it */
	double y0, y1;  /* log10 of volts, whole decades */
};

static double px(const struct axes *a, double v)
{
	double x = a->log_x ? log10(v) : v;
	return L + (x - a->x0) / (a->x1 - a->x0) * (R - L);
}

static double py(const struct axes *a, double v)
{
	return B - (log10(v) - a->y0) / (a->y1 - a->y0) * (B - T);
}

static void text_at(cairo_t *cr, double x, double y, const char *s, double align_x)
{
	cairo_text_extents_t te;

	cairo_text_extents(cr, s, &te);
	cairo_move_to(cr, x - te.x_advance * align_x, y);
	cairo_show_text(cr, s);
}

/* The three rms values of point p: 0 total, 1 the carriers' shot noise, 2 the rest. */
static double rms_of(const struct sch_sweep_point *p, int which)
{
	return which == 0 ? p->output_rms_v : sqrt(which == 1 ? p->carrier_power_v2 : p->other_power_v2);
}

/* Ranges over every positive value; false when there is none to draw. */
static bool pick_axes(const struct sch_sweep *s, struct axes *a)
{
	double vmin = INFINITY, vmax = -INFINITY, ymin = INFINITY, ymax = -INFINITY;
	bool all_positive = true;

	for (size_t k = 0; k < s->n_points; k++) {
		const struct sch_sweep_point *p = &s->points[k];
		vmin = fmin(vmin, p->value);
		vmax = fmax(vmax, p->value);
		all_positive = all_positive && p->value > 0;
		for (int w = 0; w < 3; w++) {
			double y = rms_of(p, w);
			if (y > 0 && isfinite(y)) {
				ymin = fmin(ymin, y);
				ymax = fmax(ymax, y);
			}
		}
	}
	if (!(vmax > vmin) || !(ymax >= ymin))
		return false;
	/* the sweep's own spacing rule: logarithmic over more than a decade of positive values */
	a->log_x = all_positive && strcmp(s->unit, "C") != 0 && vmax / vmin > 10;
	a->x0 = a->log_x ? log10(vmin) : vmin;
	a->x1 = a->log_x ? log10(vmax) : vmax;
	a->y0 = floor(log10(ymin));
	a->y1 = ceil(log10(ymax));
	if (a->y1 <= a->y0)
		a->y1 = a->y0 + 1;
	return true;
}

/* "ileak (A)", "temp (°C)", "rfb" under the x axis. */
static void x_label(const struct sch_sweep *s, char *out, size_t size)
{
	if (strcmp(s->unit, "C") == 0)
		snprintf(out, size, "temp (°C)");
	else if (*s->unit)
		snprintf(out, size, "%s (%s)", s->name, s->unit);
	else
		snprintf(out, size, "%s", s->name);
}

/* A value as the x axis and the crossover label show it. */
static void value_text(const struct sch_sweep *s, double v, int digits, char *out, size_t size)
{
	if (strcmp(s->unit, "C") == 0)
		snprintf(out, size, "%.*f °C", digits > 3 ? 2 : 1, v);
	else
		sch_si_format(out, size, v, digits, s->unit);
}

static void draw_grid(cairo_t *cr, const struct sch_sweep *s, const struct axes *a)
{
	char buf[64];

	cairo_set_line_width(cr, 1.0);
	for (double e = a->y0; e <= a->y1 + 1e-9; e++) {
		double y = py(a, pow(10, e));
		cairo_set_source_rgb(cr, 0.88, 0.88, 0.88);
		cairo_move_to(cr, L, y);
		cairo_line_to(cr, R, y);
		cairo_stroke(cr);
		cairo_set_source_rgb(cr, 0.2, 0.2, 0.2);
		text_at(cr, L - 8, y + 4, sch_si_format(buf, sizeof(buf), pow(10, e), 3, "V"), 1);
	}
	for (int i = 0; i <= 4; i++) {
		double x = a->x0 + (a->x1 - a->x0) * i / 4.0, v = a->log_x ? pow(10, x) : x;
		double xp = L + (R - L) * i / 4.0;
		cairo_set_source_rgb(cr, 0.88, 0.88, 0.88);
		cairo_move_to(cr, xp, T);
		cairo_line_to(cr, xp, B);
		cairo_stroke(cr);
		cairo_set_source_rgb(cr, 0.2, 0.2, 0.2);
		value_text(s, v, 3, buf, sizeof(buf));
		text_at(cr, xp, B + 18, buf, i == 0 ? 0 : i == 4 ? 1 : 0.5);
	}
	cairo_rectangle(cr, L, T, R - L, B - T);
	cairo_stroke(cr);
	x_label(s, buf, sizeof(buf));
	text_at(cr, (L + R) / 2, B + 42, buf, 0.5);
	cairo_save(cr);
	cairo_translate(cr, 24, (T + B) / 2);
	cairo_rotate(cr, -M_PI / 2);
	text_at(cr, 0, 0, "rms over the band (V)", 0.5);
	cairo_restore(cr);
}

static const double colours[3][3] = { { 0.10, 0.10, 0.10 }, { 0.00, 0.45, 0.70 }, { 0.84, 0.37, 0.00 } };
static const char *const names[3] = { "output noise", "carriers' shot noise", "all other noise" };

static void draw_curves(cairo_t *cr, const struct sch_sweep *s, const struct axes *a)
{
	for (int w = 0; w < 3; w++) {
		bool pen = false;
		cairo_set_source_rgb(cr, colours[w][0], colours[w][1], colours[w][2]);
		cairo_set_line_width(cr, w == 0 ? 2.5 : 1.8);
		for (size_t k = 0; k < s->n_points; k++) {
			double y = rms_of(&s->points[k], w);
			if (!(y > 0) || !isfinite(y)) {
				pen = false;
				continue;
			}
			if (pen)
				cairo_line_to(cr, px(a, s->points[k].value), py(a, y));
			else
				cairo_move_to(cr, px(a, s->points[k].value), py(a, y));
			pen = true;
		}
		cairo_stroke(cr);
		for (size_t k = 0; k < s->n_points; k++) {
			double y = rms_of(&s->points[k], w);
			if (y > 0 && isfinite(y)) {
				cairo_arc(cr, px(a, s->points[k].value), py(a, y), 3.0, 0, 2 * M_PI);
				cairo_fill(cr);
			}
		}
	}
}

/* The crossover as a dashed vertical line with its value, and the legend. */
static void draw_crossover_and_legend(cairo_t *cr, const struct sch_sweep *s, const struct axes *a)
{
	char v[64], line[128];

	if (isfinite(s->crossover) && (!a->log_x || s->crossover > 0)) {
		double x = px(a, s->crossover);
		const double dash[] = { 6.0, 4.0 };
		cairo_set_source_rgb(cr, 0.0, 0.45, 0.25);
		cairo_set_line_width(cr, 1.5);
		cairo_set_dash(cr, dash, 2, 0);
		cairo_move_to(cr, x, T);
		cairo_line_to(cr, x, B);
		cairo_stroke(cr);
		cairo_set_dash(cr, NULL, 0, 0);
		value_text(s, s->crossover, 4, v, sizeof(v));
		snprintf(line, sizeof(line), "shot-noise limited from %s", v);
		text_at(cr, x > (L + R) / 2 ? x - 6 : x + 6, T + 16, line, x > (L + R) / 2 ? 1 : 0);
	}
	for (int w = 0; w < 3; w++) {
		double y = T + 20 + 24 * w;
		cairo_set_source_rgb(cr, colours[w][0], colours[w][1], colours[w][2]);
		cairo_set_line_width(cr, 2.0);
		cairo_move_to(cr, R + 20, y - 4);
		cairo_line_to(cr, R + 44, y - 4);
		cairo_stroke(cr);
		cairo_set_source_rgb(cr, 0.1, 0.1, 0.1);
		text_at(cr, R + 52, y, names[w], 0);
	}
}

static enum sch_err draw(cairo_t *cr, const void *ctx)
{
	const struct sch_sweep *s = ctx;
	struct axes a;
	char title[512];

	if (!pick_axes(s, &a))
		return SCH_ERR_USAGE;
	cairo_set_source_rgb(cr, 1, 1, 1);
	cairo_paint(cr);
	cairo_select_font_face(cr, FONT, CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_BOLD);
	cairo_set_font_size(cr, 14);
	cairo_set_source_rgb(cr, 0.05, 0.05, 0.05);
	snprintf(title, sizeof(title), "noise over the band against %s", strcmp(s->unit, "C") == 0 ? "temperature" : s->name);
	text_at(cr, L, T - 20, title, 0);
	cairo_select_font_face(cr, FONT, CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_NORMAL);
	cairo_set_font_size(cr, 11);
	draw_grid(cr, s, &a);
	draw_curves(cr, s, &a);
	draw_crossover_and_legend(cr, s, &a);
	return SCH_OK;
}

enum sch_err sch_report_sweep_plot(const struct sch_sweep *s, const char *path, struct sch_diag *d)
{
	return sch_report_figure(path, W, H, draw, s, d);
}
