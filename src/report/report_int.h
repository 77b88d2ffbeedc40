/* SPDX-License-Identifier: BSD-3-Clause */
/* report_int.h - helpers shared by the report writers (labels, counts, the in-memory SVG plot). */
#ifndef SCH_REPORT_INT_H
#define SCH_REPORT_INT_H

#include <cairo.h>
#include <stddef.h>
#include <stdio.h>
#include "schrot/analysis.h"
#include "schrot/buf.h"

/* Largest report file we build in memory (HTML page, inline SVG). */
#define SCH_REPORT_MAX_BYTES ((size_t)256 << 20)

/* Number of curves the plot draws besides the total. */
#define SCH_PLOT_TOP 6

/* "x1.iph shot": device and generator, the name a contribution goes by in legends and headers. */
void sch_report_label(const struct sch_contribution *c, char *out, size_t size);

/* min(n, number of contributions); n < 0 means all. */
size_t sch_report_top_count(const struct sch_result *r, int n);

/*
 * A share as a percentage: "45.2 %", "0.042 %", "-0.7 %"; the sign always shows; below 0.001 %
 * "< 0.001 %" or "> -0.001 %" (never "-0.000 %"); NaN is "-".
 */
void sch_report_format_share(char *out, size_t size, double share);

/* The unit of the transfer's magnitude: "V/A" for a current input, "V/V" for a voltage input. */
const char *sch_report_transfer_unit(const struct sch_result *r);

/*
 * The transfer's mid-band value as a designer reads it: "1.00 MΩ" (a transimpedance) for a
 * current input, "100 V/V (40.0 dB)" for a voltage input; "-" without one. Returns out.
 */
const char *sch_report_transfer_value(const struct sch_result *r, char *out, size_t size);

/*
 * The transfer's bandwidth in words: "-3 dB at 1.00 kHz; noise-equivalent 1.57 kHz over the
 * band" (both -3 dB points where both exist). Returns out.
 */
const char *sch_report_bandwidth_text(const struct sch_result *r, char *out, size_t size);

/* A ratio to 3 significant digits, large and small ones as "4.92 × 10⁴" rather than "4.92e+04". */
const char *sch_report_ratio(char *out, size_t n, double x);

/* 10*log10(ratio), NaN for a ratio that is not positive and finite. */
double sch_report_db(double ratio);

/* Terminal display width of UTF-8 text (one column per code point). */
size_t sch_report_width(const char *s);

/*
 * Renders the plot of r as SVG text appended to out (no XML prolog removed). Returns SCH_ERR_IO
 * when cairo fails, SCH_ERR_NOMEM, SCH_ERR_USAGE when r has no noise spectrum; out keeps what was
 * appended so far on failure and is the caller's to release.
 */
enum sch_err sch_report_plot_svg(const struct sch_result *r, struct sch_buf *out);

/*
 * Shows s at the current point like cairo_show_text; on a context drawing an SVG figure (through
 * sch_report_figure or sch_report_plot_svg) the words become an SVG <text> element instead of
 * glyph outlines, so they stay searchable and editable. This function can't fail.
 */
void sch_report_show_text(cairo_t *cr, const char *s);

/*
 * Writes a figure of width x height that draw_fn paints (given ctx) as SVG or PNG, chosen by the
 * extension of path, atomically. SCH_ERR_USAGE for another extension or when draw_fn finds nothing
 * to draw (it returns SCH_ERR_USAGE), SCH_ERR_IO when cairo or the file fails; messages name path.
 */
enum sch_err sch_report_figure(const char *path, double width, double height,
			       enum sch_err (*draw_fn)(cairo_t *cr, const void *ctx), const void *ctx, struct sch_diag *d);

/* Writes s (NULL: empty) as one CSV field, quoted when it holds a comma, quote or line break (RFC 4180). */
void sch_report_csv_field(FILE *fp, const char *s);

#endif
