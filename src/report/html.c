/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * report_html.c - one self-contained HTML page for a design review: headline figures, ranked
 * contributions, the plot as inline SVG, and every assumption behind the numbers.
 */
#include <math.h>
#include <stdarg.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/buf.h"
#include "schrot/outfile.h"
#include "schrot/physics.h"
#include "schrot/report.h"
#include "schrot/si.h"
#include "report_int.h"

#ifndef SCH_VERSION
#define SCH_VERSION "unknown"
#endif

static const char page_style[] =
	"body{font:15px/1.45 system-ui,'DejaVu Sans',sans-serif;color:#1b1b1b;margin:2em auto;"
	"max-width:1200px;padding:0 1.2em}"
	"h1{font-size:1.5em;margin:0 0 .2em}h2{font-size:1.15em;margin:1.8em 0 .5em;"
	"border-bottom:1px solid #ddd;padding-bottom:.2em}"
	".sub{color:#555;margin:0 0 1.2em}"
	".figures{display:grid;grid-template-columns:repeat(auto-fit,minmax(11.5em,1fr));gap:.8em}"
	".fig{border:1px solid #d8d8d8;border-radius:6px;padding:.6em .9em}"
	".fig b{display:block;font-size:1.35em;font-variant-numeric:tabular-nums;white-space:nowrap}"
	".fig span{color:#555;font-size:.85em}"
	".verdict{margin:1em 0 0;padding:.55em .9em;background:#f3f7fa;border-left:4px solid #0072b2}"
	"table{border-collapse:collapse;font-variant-numeric:tabular-nums;font-size:14px}"
	"th,td{padding:.25em .55em;border-bottom:1px solid #eee;text-align:left;vertical-align:top}"
	"th{background:#f4f4f4;font-weight:600}td.n,th.n{text-align:right;white-space:nowrap}"
	"td.neg{color:#a33}.wide{overflow-x:auto}td.share{white-space:nowrap}"
	".pct{display:inline-block;min-width:4.6em;text-align:right}"
	".track{display:inline-block;width:80px;height:.7em;background:#eef2f5;margin-right:.5em;"
	"vertical-align:baseline}.bar{display:block;height:100%;background:#0072b2}td.neg .bar{background:#c66}"
	"figure{margin:0}figure svg{width:100%;height:auto;max-width:960px}"
	"ul{padding-left:1.3em}code{font-family:'DejaVu Sans Mono',monospace;font-size:.92em}"
	"footer{margin-top:2.5em;color:#666;font-size:.85em}"
	"@media print{body{margin:0;max-width:none}h2{break-after:avoid}figure,tr{break-inside:avoid}}";

/* The page being built; bad records any append that failed (memory or the size cap). */
struct page {
	struct sch_buf buf;
	bool bad;
};

static void addn(struct page *b, const char *s, size_t n)
{
	if (sch_buf_add(&b->buf, s, n) != SCH_OK)
		b->bad = true;
}

static void adds(struct page *b, const char *s)
{
	addn(b, s, strlen(s));
}

static void addf(struct page *b, const char *fmt, ...) __attribute__((format(printf, 2, 3)));

static void addf(struct page *b, const char *fmt, ...)
{
	char tmp[512];
	va_list ap;
	int n;

	va_start(ap, fmt);
	n = vsnprintf(tmp, sizeof(tmp), fmt, ap);
	va_end(ap);
	if (n < 0 || (size_t)n >= sizeof(tmp))
		b->bad = true;
	else
		addn(b, tmp, (size_t)n);
}

/* Appends s with the five characters that mean something in HTML escaped. */
static void esc(struct page *b, const char *s)
{
	if (!s)
		s = "-";
	for (; *s; s++) {
		switch (*s) {
		case '&':
			adds(b, "&amp;");
			break;
		case '<':
			adds(b, "&lt;");
			break;
		case '>':
			adds(b, "&gt;");
			break;
		case '"':
			adds(b, "&quot;");
			break;
		case '\'':
			adds(b, "&#39;");
			break;
		default:
			addn(b, s, 1);
		}
	}
}

/* <tag attrs>escaped text</tag> */
static void elem(struct page *b, const char *open, const char *text, const char *close)
{
	adds(b, open);
	esc(b, text);
	adds(b, close);
}

static const char *si(char *out, size_t n, double v, const char *unit)
{
	return sch_si_format(out, n, v, 3, unit);
}

static void figure(struct page *b, const char *value, const char *what)
{
	elem(b, "<div class=\"fig\"><b>", value, "</b>");
	elem(b, "<span>", what, "</span></div>\n");
}

/*
 * At most eight figures: the totals, the transfer and its bandwidth, NEP and SNR, the first spot
 * (the spot table has the rest), the shot share.
 */
static void headline(struct page *b, const struct sch_result *r)
{
	char v[96], u[32], x[48], q[64], y[160];
	const char *unit = r->input_unit ? r->input_unit : "";

	snprintf(u, sizeof(u), "%s/√Hz", unit);
	adds(b, "<div class=\"figures\">\n");
	if (r->spot_run && r->n_spots > 0) {
		snprintf(y, sizeof(y), "output noise at %s (a single-frequency run: no band)",
			 si(x, sizeof(x), r->spots[0].freq_hz, "Hz"));
		figure(b, si(v, sizeof(v), r->spots[0].output_v_per_rthz, "V/√Hz"), y);
	} else {
		snprintf(v, sizeof(v), "%s rms", si(x, sizeof(x), r->output_rms_v, "V"));
		figure(b, v, "output noise in the band");
		snprintf(v, sizeof(v), "%s rms", si(x, sizeof(x), r->input_rms, unit));
		figure(b, v, "input-referred noise");
		{
			char t[96];
			snprintf(y, sizeof(y), "%s at %s", r->input_unit && strcmp(r->input_unit, "A") == 0 ? "transimpedance" : "transfer",
				 si(x, sizeof(x), r->transfer.ref_hz, "Hz"));
			figure(b, sch_report_transfer_value(r, t, sizeof(t)), y);
			snprintf(y, sizeof(y), "-3 dB bandwidth; noise-equivalent %s over the band",
				 si(x, sizeof(x), r->transfer.enbw_hz, "Hz"));
			figure(b, si(v, sizeof(v), r->transfer.f_high_hz, "Hz"), y);
		}
	}
	if (!isnan(r->nep_band_w_per_rthz)) {
		snprintf(y, sizeof(y), "band-average NEP at %.4g A/W", r->responsivity_a_per_w);
		figure(b, si(v, sizeof(v), r->nep_band_w_per_rthz, "W/√Hz"), y);
	}
	if (!isnan(r->signal) && !isnan(r->snr)) {
		snprintf(v, sizeof(v), "%.1f dB", sch_report_db(r->snr));
		snprintf(y, sizeof(y), "SNR %s for %s", sch_report_ratio(q, sizeof(q), r->snr), si(x, sizeof(x), r->signal, unit));
		figure(b, v, y);
	}
	if (r->n_spots > 0) {
		const struct sch_spot *s = &r->spots[0];
		int n = snprintf(y, sizeof(y), "input-referred at %s", si(x, sizeof(x), s->freq_hz, "Hz"));
		if (!isnan(s->nep_w_per_rthz) && n > 0 && (size_t)n < sizeof(y))
			snprintf(y + n, sizeof(y) - (size_t)n, "; NEP %s", si(q, sizeof(q), s->nep_w_per_rthz, "W/√Hz"));
		figure(b, si(v, sizeof(v), s->input_per_rthz, u), y);
	}
	if (r->total_power_v2 > 0 && r->set.n_carriers > 0) {
		snprintf(v, sizeof(v), "%.1f %%", 100.0 * r->carrier_power_v2 / r->total_power_v2);
		figure(b, v, "share of added shot noise");
	}
	adds(b, "</div>\n");
}

static void spot_table(struct page *b, const struct sch_result *r)
{
	char x[64], u[32];
	bool nep = false;

	if (r->n_spots == 0)
		return;
	for (size_t i = 0; i < r->n_spots; i++)
		nep |= !isnan(r->spots[i].nep_w_per_rthz);
	snprintf(u, sizeof(u), "%s/√Hz", r->input_unit ? r->input_unit : "");
	adds(b, "<h2>Spot densities</h2>\n<table><tr><th class=\"n\">frequency</th>"
			"<th class=\"n\">output</th><th class=\"n\">input-referred</th>");
	adds(b, nep ? "<th class=\"n\">NEP</th></tr>\n" : "</tr>\n");
	for (size_t i = 0; i < r->n_spots; i++) {
		const struct sch_spot *s = &r->spots[i];
		elem(b, "<tr><td class=\"n\">", si(x, sizeof(x), s->freq_hz, "Hz"), "</td>");
		elem(b, "<td class=\"n\">", si(x, sizeof(x), s->output_v_per_rthz, "V/√Hz"), "</td>");
		elem(b, "<td class=\"n\">", si(x, sizeof(x), s->input_per_rthz, u), "</td>");
		if (nep)
			elem(b, "<td class=\"n\">", si(x, sizeof(x), s->nep_w_per_rthz, "W/√Hz"), "</td>");
		adds(b, "</tr>\n");
	}
	adds(b, "</table>\n");
}

static void contribution_table(struct page *b, const struct sch_result *r)
{
	char x[64], share[32];
	double cumulative = 0;

	adds(b, "<h2>Contributions, largest share first</h2>\n<div class=\"wide\"><table><tr><th class=\"n\">#</th>"
			"<th>device</th><th>generator</th><th>mechanism</th><th>origin</th>"
			"<th class=\"n\">DC current</th>");
	for (size_t j = 0; j < r->n_spots; j++)
		elem(b, "<th class=\"n\">at ", si(x, sizeof(x), r->spots[j].freq_hz, "Hz"), "</th>");
	adds(b, "<th class=\"n\">band rms</th><th>share</th><th class=\"n\">cumulative</th></tr>\n");
	for (size_t i = 0; i < r->n_contributions; i++) {
		const struct sch_contribution *c = &r->contributions[i];
		double pct = 100.0 * c->share;
		cumulative += c->share;
		addf(b, "<tr><td class=\"n\">%zu</td>", i + 1);
		elem(b, "<td><code>", c->device, "</code></td>");
		elem(b, "<td>", c->generator, "</td>");
		elem(b, "<td>", sch_mechanism_name(c->mechanism), "</td>");
		elem(b, "<td>", sch_origin_name(c->origin), "</td>");
		elem(b, "<td class=\"n\">", si(x, sizeof(x), c->dc_current_a, "A"), "</td>");
		for (size_t j = 0; j < r->n_spots; j++)
			elem(b, "<td class=\"n\">", si(x, sizeof(x), c->spot_density ? c->spot_density[j] : NAN, "V/√Hz"),
			     "</td>");
		elem(b, "<td class=\"n\">", si(x, sizeof(x), c->output_rms_v, "V"), "</td>");
		sch_report_format_share(share, sizeof(share), c->share);
		addf(b, "<td class=\"share%s\"><span class=\"track\"><span class=\"bar\" style=\"width:%.1f%%\">"
			"</span></span><span class=\"pct\">%s</span></td>",
		     pct < 0 ? " neg" : "", isfinite(pct) ? fmin(fabs(pct), 100.0) : 0.0, share);
		sch_report_format_share(share, sizeof(share), cumulative);
		addf(b, "<td class=\"n\">%s</td></tr>\n", share);
	}
	adds(b, "</table></div>\n");
}

static void plot(struct page *b, const struct sch_result *r)
{
	struct sch_buf svg;
	const char *start;

	sch_buf_init(&svg, SCH_REPORT_MAX_BYTES);
	adds(b, "<h2>Output noise density and transfer</h2>\n");
	if (sch_report_plot_svg(r, &svg) != SCH_OK || !svg.data || !(start = strstr(svg.data, "<svg"))) {
		adds(b, "<p>No plot: the spectrum has no positive density to draw.</p>\n");
		goto out;
	}
	adds(b, "<figure>\n");
	adds(b, start);
	adds(b, "</figure>\n");
out:
	sch_buf_release(&svg);
}

static void carriers(struct page *b, const struct sch_result *r)
{
	char x[64];

	adds(b, "<h2>Shot-noise carriers</h2>\n");
	if (r->set.n_carriers == 0) {
		adds(b, "<p>None found.</p>\n");
	} else {
		adds(b, "<table><tr><th>carrier</th><th class=\"n\">DC current</th>"
				"<th class=\"n\">shot density</th><th class=\"n\">gain M</th>"
				"<th class=\"n\">excess F</th><th>chosen because</th></tr>\n");
		for (size_t i = 0; i < r->set.n_carriers; i++) {
			const struct sch_carrier *c = &r->set.carriers[i];
			double dens = sqrt(sch_shot_density(c->dc_current_a, sch_carrier_gain(c)));
			elem(b, "<tr><td><code>", c->name, "</code></td>");
			elem(b, "<td class=\"n\">", si(x, sizeof(x), c->dc_current_a, "A"), "</td>");
			elem(b, "<td class=\"n\">", si(x, sizeof(x), dens, "A/√Hz"), "</td>");
			addf(b, "<td class=\"n\">%.4g</td><td class=\"n\">%.4g</td>", c->gain_m, c->excess_f);
			elem(b, "<td>", c->reason, "</td></tr>\n");
		}
		adds(b, "</table>\n");
	}
	adds(b, "<h2>Noiseless DC current sources</h2>\n");
	if (r->set.n_noiseless == 0) {
		adds(b, "<p>None.</p>\n");
		return;
	}
	adds(b, "<p>These carry DC current but were given no shot noise; name them with "
			"<code>--carrier</code> if they should.</p>\n<table><tr><th>source</th>"
			"<th class=\"n\">DC current</th></tr>\n");
	for (size_t i = 0; i < r->set.n_noiseless; i++) {
		elem(b, "<tr><td><code>", r->set.noiseless[i].name, "</code></td>");
		elem(b, "<td class=\"n\">", si(x, sizeof(x), r->set.noiseless[i].dc_current_a, "A"), "</td></tr>\n");
	}
	adds(b, "</table>\n");
}

static void assumptions(struct page *b, const struct sch_result *r)
{
	char x[64], y[64], line[256];

	adds(b, "<h2>Assumptions</h2>\n<ul>\n");
	snprintf(line, sizeof(line), "circuit temperature %.2f K (%.2f °C)", r->temp_k, r->temp_k - SCH_ZERO_C_K);
	elem(b, "<li>", line, "</li>\n");
	if (r->n_freq) {
		snprintf(line, sizeof(line), "band %s to %s; spectrum of %zu points from %s to %s",
			 si(x, sizeof(x), r->band_lo_hz, "Hz"), si(y, sizeof(y), r->band_hi_hz, "Hz"), r->n_freq,
			 si(x, sizeof(x), r->freq_hz[0], "Hz"), si(y, sizeof(y), r->freq_hz[r->n_freq - 1], "Hz"));
		elem(b, "<li>", line, "</li>\n");
		elem(b, "<li>output <code>", r->output, "</code>, ");
		elem(b, "input source <code>", r->input, "</code>");
		elem(b, " (", r->input_unit, ")</li>\n");
	}
	if (isfinite(r->responsivity_a_per_w)) {
		snprintf(line, sizeof(line), "responsivity %.4g A/W for NEP", r->responsivity_a_per_w);
		elem(b, "<li>", line, "</li>\n");
	}
	if (!isnan(r->signal)) {
		snprintf(line, sizeof(line), "signal %s for SNR", si(x, sizeof(x), r->signal, r->input_unit));
		elem(b, "<li>", line, "</li>\n");
	}
	adds(b, "<li>densities are single-sided; added shot noise is 2q·|I|·G per carrier</li>\n");
	if (r->set.n_carriers == 0)
		adds(b, "<li>no shot-noise carriers found (name rule, diode nodes, <code>--carrier</code>): "
			"no shot noise was added</li>\n");
	for (size_t i = 0; i < r->set.n_carriers; i++) {
		const struct sch_carrier *c = &r->set.carriers[i];
		elem(b, "<li>carrier <code>", c->name, "</code>");
		snprintf(line, sizeof(line), " (%s", si(x, sizeof(x), c->dc_current_a, "A"));
		esc(b, line);
		if (c->gain_m != 1 || c->excess_f != 1) {
			snprintf(line, sizeof(line), ", gain M %.4g, excess F %.4g", c->gain_m, c->excess_f);
			esc(b, line);
		}
		elem(b, "): ", c->reason, "</li>\n");
	}
	for (size_t i = 0; i < r->n_notes; i++)
		elem(b, "<li>", r->notes[i], "</li>\n");
	elem(b, "<li>simulator: ", r->sim_version, "</li>\n");
	elem(b, "<li>schrot ", SCH_VERSION, "</li>\n");
	adds(b, "</ul>\n");
}

static enum sch_err build_page(struct page *b, const struct sch_result *r)
{
	char x[48], y[48], line[512];

	adds(b, "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n");
	elem(b, "<title>schrot noise report: ", r->netlist, "</title>\n");
	adds(b, "<style>");
	adds(b, page_style);
	adds(b, "</style>\n</head>\n<body>\n");
	elem(b, "<h1>Noise report: <code>", r->netlist, "</code></h1>\n");
	if (r->n_freq) {
		if (r->spot_run)
			snprintf(line, sizeof(line), "output %s, input %s, spot %s only, %.2f K (%.2f °C)",
				 r->output ? r->output : "-", r->input ? r->input : "-",
				 si(x, sizeof(x), r->band_lo_hz, "Hz"), r->temp_k, r->temp_k - SCH_ZERO_C_K);
		else
			snprintf(line, sizeof(line), "output %s, input %s, band %s to %s, %.2f K (%.2f °C)",
				 r->output ? r->output : "-", r->input ? r->input : "-",
				 si(x, sizeof(x), r->band_lo_hz, "Hz"), si(y, sizeof(y), r->band_hi_hz, "Hz"), r->temp_k,
				 r->temp_k - SCH_ZERO_C_K);
		elem(b, "<p class=\"sub\">", line, "</p>\n");
		headline(b, r);
		elem(b, "<p class=\"verdict\"><b>Verdict:</b> ", sch_report_verdict(r, line, sizeof(line)), "</p>\n");
		elem(b, "<p>Transfer: ", sch_report_bandwidth_text(r, line, sizeof(line)), "</p>\n");
		spot_table(b, r);
		contribution_table(b, r);
		plot(b, r);
	} else {
		adds(b, "<p class=\"sub\">Operating point only: no noise analysis in this result.</p>\n");
	}
	carriers(b, r);
	assumptions(b, r);
	adds(b, "<footer>Estimated from device models by simulation; it does not replace measurement. "
			"Generated by schrot.</footer>\n</body>\n</html>\n");
	return b->bad ? SCH_ERR_NOMEM : SCH_OK;
}

enum sch_err sch_report_html(const struct sch_result *r, const char *path, struct sch_diag *d)
{
	enum sch_err ret;
	struct page page = { .bad = false };
	struct sch_outfile o;
	bool open = false;

	sch_buf_init(&page.buf, SCH_REPORT_MAX_BYTES);
	ret = build_page(&page, r);
	if (ret != SCH_OK) {
		ret = sch_diag_error(d, ret, path, 0, "out of memory building the HTML report");
		goto out;
	}
	ret = sch_outfile_open(&o, path, d);
	if (ret != SCH_OK)
		goto out;
	open = true;
	if (fwrite(page.buf.data, 1, page.buf.len, o.fp) != page.buf.len) {
		ret = sch_diag_error(d, SCH_ERR_IO, path, 0, "cannot write the HTML report");
		goto out;
	}
	open = false;
	ret = sch_outfile_commit(&o, d);
out:
	if (open)
		sch_outfile_abort(&o);
	sch_buf_release(&page.buf);
	return ret;
}
