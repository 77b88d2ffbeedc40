/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * report_table.c - the terminal views of a result: the noise report (headline figures, then the
 * ranked contributions) and the carrier list; plus the small helpers the other writers share.
 */
#include <math.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/arena.h"
#include "schrot/physics.h"
#include "schrot/report.h"
#include "schrot/si.h"
#include "report_int.h"

#define GAP "  "

void sch_report_label(const struct sch_contribution *c, char *out, size_t size)
{
	const char *dev = c->device ? c->device : "?";

	if (c->generator && *c->generator)
		snprintf(out, size, "%s %s", dev, c->generator);
	else
		snprintf(out, size, "%s", dev);
}

size_t sch_report_top_count(const struct sch_result *r, int n)
{
	if (n < 0 || (size_t)n > r->n_contributions)
		return r->n_contributions;
	return (size_t)n;
}

double sch_report_db(double ratio)
{
	if (!(ratio > 0) || isinf(ratio))
		return NAN;
	return 10.0 * log10(ratio);
}

size_t sch_report_width(const char *s)
{
	size_t w = 0;

	for (; *s; s++)
		if (((unsigned char)*s & 0xC0) != 0x80)
			w++;
	return w;
}

/* A grid of text cells in an arena; row 0 is the heading. */
struct grid {
	struct sch_arena arena;
	size_t n_rows, n_cols;
	const char **cell;
	bool *right;
};

static enum sch_err grid_init(struct grid *g, size_t n_rows, size_t n_cols)
{
	sch_arena_init(&g->arena);
	g->n_rows = n_rows;
	g->n_cols = n_cols;
	g->cell = sch_arena_alloc(&g->arena, n_rows * n_cols * sizeof(*g->cell) + 1);
	g->right = sch_arena_alloc(&g->arena, n_cols * sizeof(*g->right) + 1);
	return g->cell && g->right ? SCH_OK : SCH_ERR_NOMEM;
}

static void grid_set(struct grid *g, size_t row, size_t col, const char *text)
{
	const char *copy = sch_arena_strdup(&g->arena, text ? text : "");

	g->cell[row * g->n_cols + col] = copy ? copy : "?";
}

static void put_pad(FILE *out, size_t n)
{
	while (n--)
		fputc(' ', out);
}

/* Prints the grid with every column as wide as its widest cell; a rule under the heading. */
static enum sch_err grid_print(struct grid *g, FILE *out, const char *indent)
{
	size_t *width = sch_arena_alloc(&g->arena, g->n_cols * sizeof(*width) + 1);
	size_t total = 0;

	if (!width)
		return SCH_ERR_NOMEM;
	for (size_t row = 0; row < g->n_rows; row++)
		for (size_t col = 0; col < g->n_cols; col++) {
			const char *s = g->cell[row * g->n_cols + col];
			size_t w = s ? sch_report_width(s) : 0;
			if (w > width[col])
				width[col] = w;
		}
	for (size_t col = 0; col < g->n_cols; col++)
		total += width[col] + (col ? strlen(GAP) : 0);
	for (size_t row = 0; row < g->n_rows; row++) {
		fputs(indent, out);
		for (size_t col = 0; col < g->n_cols; col++) {
			const char *s = g->cell[row * g->n_cols + col];
			size_t w;
			bool last = col + 1 == g->n_cols;
			if (!s)
				s = "";
			w = sch_report_width(s);
			if (col)
				fputs(GAP, out);
			if (g->right[col])
				put_pad(out, width[col] - w);
			fputs(s, out);
			if (!g->right[col] && !last)
				put_pad(out, width[col] - w);
		}
		fputc('\n', out);
		if (row == 0) {
			fputs(indent, out);
			for (size_t i = 0; i < total; i++)
				fputs("─", out);
			fputc('\n', out);
		}
	}
	return SCH_OK;
}

static void grid_release(struct grid *g)
{
	sch_arena_release(&g->arena);
}

/* A power ratio to 3 significant digits, large and small ones as "4.92 × 10⁴" rather than "4.92e+04". */
const char *sch_report_ratio(char *out, size_t n, double x)
{
	static const char *const sup[] = { "⁰", "¹", "²", "³", "⁴", "⁵", "⁶", "⁷", "⁸", "⁹" };
	char digits[16], exp_text[64] = "";
	int e;

	if (fabs(x) >= 1000 && fabs(x) < 1e4) { /* "1860", not "1.86e+03" */
		snprintf(out, n, "%.0f", round(x / 10) * 10);
		return out;
	}
	if (!isfinite(x) || x == 0 || (fabs(x) >= 0.01 && fabs(x) < 1e4)) {
		snprintf(out, n, "%.3g", x);
		return out;
	}
	e = (int)floor(log10(fabs(x)));
	if (fabs(x / pow(10, e)) >= 9.995) /* rounds up to the next decade */
		e++;
	snprintf(digits, sizeof(digits), "%d", abs(e));
	if (e < 0)
		snprintf(exp_text, sizeof(exp_text), "⁻");
	for (const char *p = digits; *p; p++)
		snprintf(exp_text + strlen(exp_text), sizeof(exp_text) - strlen(exp_text), "%s", sup[*p - '0']);
	snprintf(out, n, "%.3g × 10%s", x / pow(10, e), exp_text);
	return out;
}

void sch_report_format_share(char *out, size_t size, double share)
{
	double pct = share * 100.0;

	if (isnan(pct))
		snprintf(out, size, "-");
	else if (pct == 0 || fabs(pct) >= 0.1)
		snprintf(out, size, "%.1f %%", pct);
	else if (fabs(pct) >= 0.001)
		snprintf(out, size, "%.3f %%", pct);
	else /* not "-0.000 %": below the last digit shown, say which side of zero */
		snprintf(out, size, "%s", pct < 0 ? "> -0.001 %" : "< 0.001 %");
}

static const char *or_dash(const char *s)
{
	return s && *s ? s : "-";
}

static bool current_input(const struct sch_result *r)
{
	return r->input_unit && strcmp(r->input_unit, "A") == 0;
}

const char *sch_report_transfer_unit(const struct sch_result *r)
{
	return current_input(r) ? "V/A" : "V/V";
}

const char *sch_report_transfer_value(const struct sch_result *r, char *out, size_t size)
{
	double h = r->transfer.mid_band;

	if (!isfinite(h))
		snprintf(out, size, "-");
	else if (current_input(r))
		sch_si_format(out, size, h, 3, "Ω");
	else
		snprintf(out, size, "%.3g V/V (%.1f dB)", h, 20.0 * log10(h));
	return out;
}

const char *sch_report_bandwidth_text(const struct sch_result *r, char *out, size_t size)
{
	const struct sch_transfer *t = &r->transfer;
	char lo[48], hi[48], nb[48], edges[128];

	if (!isnan(t->f_low_hz) && !isnan(t->f_high_hz))
		snprintf(edges, sizeof(edges), "-3 dB from %s to %s", sch_si_format(lo, sizeof(lo), t->f_low_hz, 3, "Hz"),
			 sch_si_format(hi, sizeof(hi), t->f_high_hz, 3, "Hz"));
	else if (!isnan(t->f_high_hz))
		snprintf(edges, sizeof(edges), "-3 dB at %s", sch_si_format(hi, sizeof(hi), t->f_high_hz, 3, "Hz"));
	else if (!isnan(t->f_low_hz))
		snprintf(edges, sizeof(edges), "-3 dB at %s (a lower edge; none above it in the run)",
			 sch_si_format(lo, sizeof(lo), t->f_low_hz, 3, "Hz"));
	else
		snprintf(edges, sizeof(edges), "no -3 dB point in the simulated range");
	snprintf(out, size, "%s; noise-equivalent %s over the band", edges,
		 sch_si_format(nb, sizeof(nb), t->enbw_hz, 3, "Hz"));
	return out;
}

const char *sch_report_verdict(const struct sch_result *r, char *out, size_t size)
{
	char other[160] = "nothing else", factor[48];
	const struct sch_contribution *d = r->dominant_other;

	if (d)
		snprintf(other, sizeof(other), "%s (%.1f %% of the output noise power%s, mostly %s)", d->device,
			 100.0 * r->dominant_other_share, r->spot_run ? " density" : "", d->generator);
	if (r->set.n_carriers == 0)
		snprintf(out, size, "no shot-noise carriers found; the noise is led by %s", other);
	else if (!(r->carrier_power_v2 > 0))
		snprintf(out, size, "the carriers' shot noise does not reach the output; the noise is led by %s", other);
	else if (isnan(r->shot_to_rest))
		snprintf(out, size, "shot-noise limited: the carriers' shot noise is all the noise");
	else if (r->shot_to_rest >= 1)
		snprintf(out, size, "shot-noise limited by %s x in power%s; of the rest, %s leads",
			 sch_report_ratio(factor, sizeof(factor), r->shot_to_rest), r->spot_run ? " density" : "", other);
	else
		snprintf(out, size, "not shot-noise limited: the rest is %s x the carriers' shot-noise power%s, led by %s",
			 sch_report_ratio(factor, sizeof(factor), 1.0 / r->shot_to_rest), r->spot_run ? " density" : "", other);
	return out;
}

static void print_item(FILE *out, const char *key, const char *value)
{
	fprintf(out, "  %-17s %s\n", key, value);
}

static void print_headline(const struct sch_result *r, FILE *out)
{
	char a[64], b[64], line[512];
	const char *unit = or_dash(r->input_unit);

	fprintf(out, "schrot noise report: %s\n", or_dash(r->netlist));
	snprintf(line, sizeof(line), "%.2f K (%.2f °C)", r->temp_k, r->temp_k - SCH_ZERO_C_K);
	print_item(out, "temperature", line);
	print_item(out, "output", or_dash(r->output));
	snprintf(line, sizeof(line), "%s (%s source)", or_dash(r->input),
		 r->input_unit && strcmp(r->input_unit, "A") == 0   ? "current"
		 : r->input_unit && strcmp(r->input_unit, "V") == 0 ? "voltage"
								    : "unknown");
	print_item(out, "input", line);
	if (r->spot_run) {
		snprintf(line, sizeof(line), "%s only (a single-frequency run: spot figures, no band figures)",
			 sch_si_format(a, sizeof(a), r->band_lo_hz, 3, "Hz"));
		print_item(out, "spot", line);
		snprintf(line, sizeof(line), "%s%s at %s", sch_report_transfer_value(r, a, sizeof(a)),
			 current_input(r) ? " (transimpedance)" : "", sch_si_format(b, sizeof(b), r->transfer.ref_hz, 3, "Hz"));
		print_item(out, "transfer", line);
	} else {
		snprintf(line, sizeof(line), "%s to %s", sch_si_format(a, sizeof(a), r->band_lo_hz, 3, "Hz"),
			 sch_si_format(b, sizeof(b), r->band_hi_hz, 3, "Hz"));
		print_item(out, "band", line);
		snprintf(line, sizeof(line), "%s rms", sch_si_format(a, sizeof(a), r->output_rms_v, 3, "V"));
		print_item(out, "output noise", line);
		snprintf(line, sizeof(line), "%s rms (output rms / mid-band transfer)",
			 sch_si_format(a, sizeof(a), r->input_rms, 3, unit));
		print_item(out, "input-referred", line);
		snprintf(line, sizeof(line), "%s%s at %s", sch_report_transfer_value(r, a, sizeof(a)),
			 current_input(r) ? " (transimpedance)" : "", sch_si_format(b, sizeof(b), r->transfer.ref_hz, 3, "Hz"));
		print_item(out, "transfer", line);
		print_item(out, "bandwidth", sch_report_bandwidth_text(r, line, sizeof(line)));
	}
	if (!isnan(r->signal) && !r->spot_run) {
		double db = sch_report_db(r->snr);
		char c[64], d[64];
		snprintf(line, sizeof(line), "%s (%.1f dB) at the output: %s of signal for a %s input",
			 sch_report_ratio(d, sizeof(d), r->snr), db,
			 sch_si_format(c, sizeof(c), fabs(r->signal * r->transfer.mid_band), 3, "V"),
			 sch_si_format(a, sizeof(a), r->signal, 3, unit));
		print_item(out, "SNR", line);
	}
	if (!isnan(r->nep_band_w_per_rthz)) {
		snprintf(line, sizeof(line), "%s (band average over the noise bandwidth, at %g A/W)",
			 sch_si_format(a, sizeof(a), r->nep_band_w_per_rthz, 3, "W/√Hz"), r->responsivity_a_per_w);
		print_item(out, "NEP", line);
	}
	if (r->total_power_v2 > 0 && isfinite(r->carrier_power_v2)) {
		snprintf(line, sizeof(line), "%.1f %% of the output noise power",
			 100.0 * r->carrier_power_v2 / r->total_power_v2);
		print_item(out, "added shot noise", line);
	}
	print_item(out, "verdict", sch_report_verdict(r, line, sizeof(line)));
}

static enum sch_err print_spots(const struct sch_result *r, FILE *out)
{
	struct grid g;
	enum sch_err ret;
	bool nep = false;
	char unit[32], buf[64];

	if (r->n_spots == 0)
		return SCH_OK;
	for (size_t i = 0; i < r->n_spots; i++)
		if (!isnan(r->spots[i].nep_w_per_rthz))
			nep = true;
	snprintf(unit, sizeof(unit), "%s/√Hz", or_dash(r->input_unit));
	ret = grid_init(&g, r->n_spots + 1, nep ? 4 : 3);
	if (ret != SCH_OK)
		goto out;
	grid_set(&g, 0, 0, "spot frequency");
	grid_set(&g, 0, 1, "output density");
	grid_set(&g, 0, 2, "input-referred");
	if (nep)
		grid_set(&g, 0, 3, "NEP");
	for (size_t col = 0; col < g.n_cols; col++)
		g.right[col] = true;
	for (size_t i = 0; i < r->n_spots; i++) {
		const struct sch_spot *s = &r->spots[i];
		grid_set(&g, i + 1, 0, sch_si_format(buf, sizeof(buf), s->freq_hz, 3, "Hz"));
		grid_set(&g, i + 1, 1, sch_si_format(buf, sizeof(buf), s->output_v_per_rthz, 3, "V/√Hz"));
		grid_set(&g, i + 1, 2, sch_si_format(buf, sizeof(buf), s->input_per_rthz, 3, unit));
		if (nep)
			grid_set(&g, i + 1, 3, sch_si_format(buf, sizeof(buf), s->nep_w_per_rthz, 3, "W/√Hz"));
	}
	fputc('\n', out);
	ret = grid_print(&g, out, "  ");
out:
	grid_release(&g);
	return ret;
}

/* One row of the terminal's contribution table: a contribution, or one with its corrections folded in. */
struct table_row {
	const struct sch_contribution *c; /* the row itself, or the simulator row a correction folds into */
	const char *origin;               /* "corrected" when a correction was folded in */
	enum sch_mechanism mechanism;     /* thermal when a zero-bias junction's correction was folded in */
	double dc_current_a;
	double power, share;              /* signed band power and share, corrections included */
	double *spot_power;               /* signed spot powers, corrections included */
	bool gone;                        /* folded into another row */
};

/* The simulator generator a correction row corrects: "id" for a junction, "ic", "ib"; NULL for none. */
static const char *corrected_generator(const struct sch_contribution *c)
{
	if (c->origin != SCH_ORIGIN_CORRECTION || !c->generator)
		return NULL;
	if (strcmp(c->generator, "junction") == 0)
		return "id";
	if (strcmp(c->generator, "collector") == 0)
		return "ic";
	if (strcmp(c->generator, "base") == 0)
		return "ib";
	return NULL;
}

static int by_row_power(const void *pa, const void *pb)
{
	const struct table_row *a = pa, *b = pb;

	return a->power > b->power ? -1 : a->power < b->power ? 1 : 0;
}

/*
 * The table's rows: every contribution, or with fold each correction added into the simulator row
 * of the same device it corrects (one row per device and generator), ranked by band power again.
 * *n_rows gets the count. NULL when out of memory (storage in a).
 */
static struct table_row *table_rows(const struct sch_result *r, bool fold, struct sch_arena *a, size_t *n_rows)
{
	size_t n = r->n_contributions, keep = 0;
	struct table_row *rows = sch_arena_alloc(a, (n + 1) * sizeof(*rows));

	if (!rows)
		return NULL;
	for (size_t i = 0; i < n; i++) {
		const struct sch_contribution *c = &r->contributions[i];
		rows[i] = (struct table_row){ c, sch_origin_name(c->origin), c->mechanism, c->dc_current_a, c->band_power,
					      c->share,
					      sch_arena_alloc(a, (r->n_spots + 1) * sizeof(double)), false };
		if (!rows[i].spot_power)
			return NULL;
		for (size_t j = 0; j < r->n_spots; j++) {
			double v = c->spot_density ? c->spot_density[j] : NAN;
			rows[i].spot_power[j] = copysign(v * v, v);
		}
	}
	for (size_t i = 0; fold && i < n; i++) {
		const char *target = corrected_generator(rows[i].c);
		for (size_t t = 0; target && t < n; t++) {
			const struct sch_contribution *o = &r->contributions[t];
			if (t == i || rows[t].gone || o->origin != SCH_ORIGIN_SIMULATOR || strcmp(o->device, rows[i].c->device) != 0 ||
			    !o->generator || strcmp(o->generator, target) != 0)
				continue;
			rows[t].power += rows[i].power;
			rows[t].share += rows[i].share;
			for (size_t j = 0; j < r->n_spots; j++)
				rows[t].spot_power[j] += rows[i].spot_power[j];
			rows[t].origin = "corrected";
			rows[t].dc_current_a = rows[i].dc_current_a; /* the junction's own current, GMIN's kept out */
			if (rows[i].c->mechanism == SCH_MECH_THERMAL)
				rows[t].mechanism = SCH_MECH_THERMAL; /* zero bias: the Nyquist noise of g_j */
			rows[i].gone = true;
			break;
		}
	}
	for (size_t i = 0; i < n; i++)
		if (!rows[i].gone)
			rows[keep++] = rows[i];
	if (fold)
		qsort(rows, keep, sizeof(*rows), by_row_power);
	*n_rows = keep;
	return rows;
}

static double signed_root(double power)
{
	return copysign(sqrt(fabs(power)), power);
}

static enum sch_err print_contributions(const struct sch_result *r, FILE *out, bool split)
{
	struct grid g;
	enum sch_err ret;
	const size_t fixed = 6; /* rank device generator mechanism origin dc */
	size_t tail = r->spot_run ? 2 : 3; /* [band rms] share cumulative */
	size_t n_cols = fixed + r->n_spots + tail, n_rows = 0, n_folded = 0;
	double cumulative = 0;
	char buf[128];
	struct sch_arena rows_arena;
	struct table_row *rows;

	sch_arena_init(&rows_arena);
	rows = table_rows(r, !split, &rows_arena, &n_rows);
	ret = rows ? grid_init(&g, n_rows + 1, n_cols) : SCH_ERR_NOMEM;
	if (ret != SCH_OK)
		goto out;
	grid_set(&g, 0, 0, "#");
	grid_set(&g, 0, 1, "device");
	grid_set(&g, 0, 2, "generator");
	grid_set(&g, 0, 3, "mechanism");
	grid_set(&g, 0, 4, "origin");
	grid_set(&g, 0, 5, "DC current");
	for (size_t j = 0; j < r->n_spots; j++) {
		char f[64];
		snprintf(buf, sizeof(buf), "at %s", sch_si_format(f, sizeof(f), r->spots[j].freq_hz, 3, "Hz"));
		grid_set(&g, 0, fixed + j, buf);
	}
	if (!r->spot_run)
		grid_set(&g, 0, n_cols - 3, "band rms");
	grid_set(&g, 0, n_cols - 2, "share");
	grid_set(&g, 0, n_cols - 1, "cumulative");
	g.right[0] = true;
	for (size_t col = 5; col < n_cols; col++)
		g.right[col] = true;
	for (size_t i = 0; i < n_rows; i++) {
		const struct table_row *tr = &rows[i];
		const struct sch_contribution *c = tr->c;
		size_t row = i + 1;
		n_folded += strcmp(tr->origin, "corrected") == 0;
		snprintf(buf, sizeof(buf), "%zu", row);
		grid_set(&g, row, 0, buf);
		grid_set(&g, row, 1, or_dash(c->device));
		grid_set(&g, row, 2, or_dash(c->generator));
		grid_set(&g, row, 3, sch_mechanism_name(tr->mechanism));
		grid_set(&g, row, 4, tr->origin);
		grid_set(&g, row, 5, sch_si_format(buf, sizeof(buf), tr->dc_current_a, 3, "A"));
		for (size_t j = 0; j < r->n_spots; j++)
			grid_set(&g, row, fixed + j, sch_si_format(buf, sizeof(buf), signed_root(tr->spot_power[j]), 3, "V/√Hz"));
		if (!r->spot_run)
			grid_set(&g, row, n_cols - 3, sch_si_format(buf, sizeof(buf), signed_root(tr->power), 3, "V"));
		sch_report_format_share(buf, sizeof(buf), tr->share);
		grid_set(&g, row, n_cols - 2, buf);
		cumulative += tr->share;
		sch_report_format_share(buf, sizeof(buf), cumulative);
		grid_set(&g, row, n_cols - 1, buf);
	}
	fputc('\n', out);
	fprintf(out, "  noise contributions, largest share of the %s first\n",
		r->spot_run ? "output noise power density at the spot frequency" : "band's output noise power");
	ret = grid_print(&g, out, "  ");
	if (ret == SCH_OK && n_folded)
		fprintf(out, "  %zu row%s 'corrected': the simulator's noise with its correction added "
			     "(--show-corrections lists them apart)\n",
			n_folded, n_folded == 1 ? "" : "s");
out:
	if (rows)
		grid_release(&g);
	sch_arena_release(&rows_arena);
	return ret;
}

static void print_footer(const struct sch_result *r, FILE *out)
{
	if (r->n_notes) {
		fputc('\n', out);
		fprintf(out, "  assumptions and corrections\n");
		for (size_t i = 0; i < r->n_notes; i++)
			fprintf(out, "    - %s\n", or_dash(r->notes[i]));
	}
	if (r->sim_version)
		fprintf(out, "\n  simulator: %s\n", r->sim_version);
}

enum sch_err sch_report_table(const struct sch_result *r, FILE *out)
{
	return sch_report_table_split(r, out, false);
}

enum sch_err sch_report_table_split(const struct sch_result *r, FILE *out, bool split_corrections)
{
	enum sch_err ret;

	if (r->n_freq == 0) {
		fprintf(out, "schrot noise report: %s\n  no noise analysis in this result\n", or_dash(r->netlist));
		ret = SCH_OK;
		goto out;
	}
	print_headline(r, out);
	ret = print_spots(r, out);
	if (ret != SCH_OK)
		goto out;
	ret = print_contributions(r, out, split_corrections);
	if (ret != SCH_OK)
		goto out;
	print_footer(r, out);
	ret = SCH_OK;
out:
	if (ret == SCH_OK && (fflush(out) != 0 || ferror(out)))
		ret = SCH_ERR_IO;
	return ret;
}

static enum sch_err print_carriers(const struct sch_result *r, FILE *out)
{
	const struct sch_carrier_set *set = &r->set;
	struct grid g;
	enum sch_err ret;
	char buf[128];

	if (set->n_carriers == 0) {
		fprintf(out, "  no shot-noise carriers found (name rule, diode nodes, --carrier)\n");
		return SCH_OK;
	}
	ret = grid_init(&g, set->n_carriers + 1, 6);
	if (ret != SCH_OK)
		goto out;
	grid_set(&g, 0, 0, "carrier");
	grid_set(&g, 0, 1, "DC current");
	grid_set(&g, 0, 2, "shot density");
	grid_set(&g, 0, 3, "gain M");
	grid_set(&g, 0, 4, "excess F");
	grid_set(&g, 0, 5, "chosen because");
	g.right[1] = g.right[2] = g.right[3] = g.right[4] = true;
	for (size_t i = 0; i < set->n_carriers; i++) {
		const struct sch_carrier *c = &set->carriers[i];
		double density = sqrt(sch_shot_density(c->dc_current_a, sch_carrier_gain(c)));
		grid_set(&g, i + 1, 0, or_dash(c->name));
		grid_set(&g, i + 1, 1, sch_si_format(buf, sizeof(buf), c->dc_current_a, 3, "A"));
		grid_set(&g, i + 1, 2, sch_si_format(buf, sizeof(buf), density, 3, "A/√Hz"));
		snprintf(buf, sizeof(buf), "%.4g", c->gain_m);
		grid_set(&g, i + 1, 3, buf);
		snprintf(buf, sizeof(buf), "%.4g", c->excess_f);
		grid_set(&g, i + 1, 4, buf);
		grid_set(&g, i + 1, 5, or_dash(c->reason));
	}
	ret = grid_print(&g, out, "  ");
out:
	grid_release(&g);
	return ret;
}

static enum sch_err print_noiseless(const struct sch_result *r, FILE *out)
{
	const struct sch_carrier_set *set = &r->set;
	struct grid g;
	enum sch_err ret;
	char buf[128];
	bool any_reason = false;

	fputc('\n', out);
	if (set->n_noiseless == 0) {
		fprintf(out, "  no noiseless DC current sources\n");
		return SCH_OK;
	}
	fprintf(out, "  noiseless DC current sources (no shot noise added; --carrier REGEX adds one)\n");
	for (size_t i = 0; i < set->n_noiseless; i++)
		any_reason = any_reason || set->noiseless[i].reason;
	ret = grid_init(&g, set->n_noiseless + 1, any_reason ? 3 : 2);
	if (ret != SCH_OK)
		goto out;
	grid_set(&g, 0, 0, "source");
	grid_set(&g, 0, 1, "DC current");
	if (any_reason)
		grid_set(&g, 0, 2, "not a carrier because");
	g.right[1] = true;
	for (size_t i = 0; i < set->n_noiseless; i++) {
		grid_set(&g, i + 1, 0, or_dash(set->noiseless[i].name));
		grid_set(&g, i + 1, 1, sch_si_format(buf, sizeof(buf), set->noiseless[i].dc_current_a, 3, "A"));
		if (any_reason)
			grid_set(&g, i + 1, 2, or_dash(set->noiseless[i].reason));
	}
	ret = grid_print(&g, out, "  ");
out:
	grid_release(&g);
	return ret;
}

enum sch_err sch_report_carriers_table(const struct sch_result *r, FILE *out)
{
	enum sch_err ret;

	fprintf(out, "schrot carriers: %s at %.2f K (%.2f °C)\n", or_dash(r->netlist), r->temp_k,
		r->temp_k - SCH_ZERO_C_K);
	ret = print_carriers(r, out);
	if (ret != SCH_OK)
		goto out;
	ret = print_noiseless(r, out);
out:
	if (ret == SCH_OK && (fflush(out) != 0 || ferror(out)))
		ret = SCH_ERR_IO;
	return ret;
}
