/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * verdict.c - what a result says once its rows are ranked: the device that leads besides the
 * added carriers, the carriers' ratio to the rest, and the notes that close the run.
 */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "analysis_int.h"
#include "schrot/physics.h"
#include "schrot/si.h"

/*
 * A band end this many times past the transfer's -3 dB point (a decade) counts as well past it:
 * our choice (common practice, no source).
 */
#define SCH_BAND_PAST_FACTOR 10.0

/* From this many resistor instances on, a report without --lump says that --lump exists. */
#define SCH_LUMP_HINT_RESISTORS 2000

/*
 * The device that leads the noise besides the added carrier shot noise: rows netted per device
 * (a correction row counts against the row it corrects), the device's largest row named.
 */
static enum sch_err lead_other(struct sch_result *res, double total)
{
	struct sch_strmap devices;
	double *sum = sch_arena_alloc(&res->arena, (res->n_contributions + 1) * sizeof(double));
	int *first = sch_arena_alloc(&res->arena, (res->n_contributions + 1) * sizeof(int));
	int n_dev = 0, best = -1;
	enum sch_err ret = SCH_ERR_NOMEM;

	sch_strmap_init(&devices);
	res->dominant_other = NULL;
	res->dominant_other_share = NAN;
	if (!sum || !first)
		goto out;
	for (size_t c = 0; c < res->n_contributions; c++) {
		const struct sch_contribution *ct = &res->contributions[c];
		int k;
		if (ct->origin == SCH_ORIGIN_ADDED)
			continue;
		k = sch_strmap_get(&devices, ct->device, strlen(ct->device));
		if (k < 0) {
			k = n_dev++;
			if (sch_strmap_put(&devices, ct->device, strlen(ct->device), k) != SCH_OK)
				goto out;
			first[k] = (int)c; /* sorted by band power: the device's largest row */
			sum[k] = 0;
		}
		sum[k] += ct->band_power;
	}
	for (int k = 0; k < n_dev; k++) {
		if (sum[k] > 0 && (best < 0 || sum[k] > sum[best]))
			best = k;
	}
	if (best >= 0) {
		res->dominant_other = &res->contributions[first[best]];
		res->dominant_other_share = total != 0 ? sum[best] / total : NAN;
	}
	ret = SCH_OK;
out:
	sch_strmap_release(&devices);
	return ret;
}

enum sch_err sch_analysis_verdict(struct sch_result *res)
{
	double total = res->total_power_v2;

	if (lead_other(res, total) != SCH_OK)
		return SCH_ERR_NOMEM;
	res->shot_to_rest = NAN;
	if (res->set.n_carriers && total - res->carrier_power_v2 > 0)
		res->shot_to_rest = res->carrier_power_v2 / (total - res->carrier_power_v2);
	return SCH_OK;
}

/* A single report without --lump over many resistors says that --lump exists. */
static enum sch_err note_lump_hint(struct sch_analysis *an)
{
	struct sch_result *res = an->res;
	size_t n_res = 0;

	if (an->opt->mode != SCH_RUN_REPORT || an->vary || an->lump.quiet)
		return SCH_OK;
	for (size_t k = 0; k < res->set.n_instances; k++)
		n_res += res->deck.elements[res->set.instances[k].element].letter == 'r';
	if (n_res < SCH_LUMP_HINT_RESISTORS)
		return SCH_OK;
	return sch_analysis_note(an, sch_arena_printf(&res->arena, "%zu resistors, one row each: --lump REGEX reports "
								   "matching ones (extracted parasitics) as one row, "
								   "and much faster",
						      n_res));
}

/* The DC current sources given no shot noise, the first few by name and current. */
static enum sch_err note_noiseless(struct sch_analysis *an)
{
	const struct sch_carrier_set *set = &an->res->set;
	char list[400] = "", amps[48];
	size_t shown = 0;

	if (!set->n_noiseless)
		return SCH_OK;
	for (size_t k = 0; k < set->n_noiseless && strlen(list) < sizeof(list) - 80; k++, shown++)
		snprintf(list + strlen(list), sizeof(list) - strlen(list), "%s%s (%s)", k ? ", " : "", set->noiseless[k].name,
			 sch_si_format(amps, sizeof(amps), set->noiseless[k].dc_current_a, 3, "A"));
	return sch_analysis_note(an, sch_arena_printf(&an->res->arena,
						      "noiseless DC current sources, given no shot noise: %s%s "
						      "(name them with --carrier if they carry shot noise)",
						      list, shown < set->n_noiseless ? ", ..." : ""));
}

/* What NEP divides by: the unity-gain responsivity and the input carrier's gain. */
static enum sch_err note_nep(struct sch_analysis *an)
{
	struct sch_result *res = an->res;

	if (an->opt->mode != SCH_RUN_REPORT || isnan(res->responsivity_a_per_w) || !res->input_unit ||
	    strcmp(res->input_unit, "A") != 0)
		return SCH_OK;
	if (res->input_gain_m == 1)
		return sch_analysis_note(an, sch_arena_printf(&res->arena,
							      "NEP = input-referred current / R0 with R0 = %g A/W the "
							      "responsivity; the band's NEP is over the noise-equivalent bandwidth",
							      res->responsivity_a_per_w));
	return sch_analysis_note(an, sch_arena_printf(&res->arena,
						      "NEP = input-referred current / (R0*M) with R0 = %g A/W the "
						      "unity-gain responsivity and M = %g the avalanche gain of the input "
						      "carrier '%s', whose netlist current is the multiplied terminal current",
						      res->responsivity_a_per_w, res->input_gain_m, res->input));
}

/* How the added generators were sized. */
static enum sch_err note_constants(struct sch_analysis *an)
{
	struct sch_result *res = an->res;

	if (!res->set.n_carriers)
		return SCH_OK;
	return sch_analysis_note(an, sch_arena_printf(&res->arena,
						      "added generators sized 2q|I|G with the exact SI 2019 q = %.10g C "
						      "at the circuit temperature %.2f K",
						      SCH_Q, res->temp_k));
}

/*
 * One side of the band against the transfer's -3 dB point on that side: a warning and a note when
 * the band runs well past it, where the signal is attenuated but the noise counts in full.
 */
static enum sch_err warn_band_edge(struct sch_analysis *an, double band_end, double edge_hz, bool high)
{
	struct sch_result *res = an->res;
	char be[48], ed[48], times[32];
	const char *text;
	double ratio = high ? band_end / edge_hz : edge_hz / band_end;

	if (isnan(edge_hz) || !(ratio > SCH_BAND_PAST_FACTOR))
		return SCH_OK;
	sch_si_format(be, sizeof(be), band_end, 3, "Hz");
	sch_si_format(ed, sizeof(ed), edge_hz, 3, "Hz");
	snprintf(times, sizeof(times), ratio >= 100 ? "%.0f" : "%.2g", ratio);
	text = sch_arena_printf(&res->arena,
				"the band %s at %s, %s x %s the transfer's -3 dB point (%s): noise there counts in "
				"full while the signal is attenuated (narrow --band to the signal's band)",
				high ? "ends" : "starts", be, times, high ? "above" : "below", ed);
	if (!text)
		return SCH_ERR_NOMEM;
	sch_diag_report(an->d, SCH_WARNING, NULL, 0, "%s", text);
	return sch_analysis_note(an, text);
}

/* A single report whose band runs well past the transfer's bandwidth says so. */
static enum sch_err note_band_past_transfer(struct sch_analysis *an)
{
	const struct sch_result *res = an->res;
	enum sch_err ret;

	if (an->opt->mode != SCH_RUN_REPORT || an->vary || res->n_freq == 0)
		return SCH_OK;
	if ((ret = warn_band_edge(an, res->band_hi_hz, res->transfer.f_high_hz, true)) != SCH_OK)
		return ret;
	return warn_band_edge(an, res->band_lo_hz, res->transfer.f_low_hz, false);
}

enum sch_err sch_analysis_closing_notes(struct sch_analysis *an)
{
	enum sch_err ret;

	if ((ret = note_band_past_transfer(an)) != SCH_OK || (ret = sch_analysis_note_rules(an)) != SCH_OK ||
	    (ret = note_nep(an)) != SCH_OK || (ret = note_lump_hint(an)) != SCH_OK ||
	    (ret = note_noiseless(an)) != SCH_OK ||
	    (ret = note_constants(an)) != SCH_OK)
		return ret;
	return SCH_OK;
}
