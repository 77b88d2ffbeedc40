/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * analysis.c - the one analysis entry point: reads the deck, finds carriers, plans and runs the
 * simulator, and turns its outcome into a result, one named step after another.
 */
#include <math.h>
#include <string.h>
#include "analysis_int.h"

const char *sch_mechanism_name(enum sch_mechanism m)
{
	switch (m) {
	case SCH_MECH_SHOT:
		return "shot";
	case SCH_MECH_THERMAL:
		return "thermal";
	case SCH_MECH_FLICKER:
		return "flicker";
	default:
		return "other";
	}
}

const char *sch_origin_name(enum sch_origin o)
{
	switch (o) {
	case SCH_ORIGIN_ADDED:
		return "added";
	case SCH_ORIGIN_CORRECTION:
		return "correction";
	default:
		return "simulator";
	}
}

void sch_run_options_init(struct sch_run_options *opt)
{
	memset(opt, 0, sizeof(*opt));
	opt->mode = SCH_RUN_REPORT;
	opt->band_lo_hz = NAN;
	opt->band_hi_hz = NAN;
	opt->junction_correction = true;
	opt->responsivity_a_per_w = NAN;
	opt->signal = NAN;
	opt->signal_freq_hz = NAN;
	opt->n_workers = 1;
}

void sch_result_init(struct sch_result *res)
{
	memset(res, 0, sizeof(*res));
	sch_arena_init(&res->arena);
	sch_deck_init(&res->deck);
	res->temp_k = NAN;
	res->band_lo_hz = NAN;
	res->band_hi_hz = NAN;
	res->responsivity_a_per_w = NAN;
	res->signal = NAN;
	res->snr = NAN;
	res->shot_to_rest = NAN;
	res->nep_band_w_per_rthz = NAN;
	res->dominant_other_share = NAN;
	res->output_rms_v = NAN;
	res->input_rms = NAN;
	res->transfer.mid_band = NAN;
	res->transfer.ref_hz = NAN;
	res->transfer.f_low_hz = NAN;
	res->transfer.f_high_hz = NAN;
	res->transfer.enbw_hz = NAN;
	res->input_gain_m = 1;
}

void sch_result_release(struct sch_result *res)
{
	if (!res)
		return;
	sch_deck_release(&res->deck);
	sch_arena_release(&res->arena);
}

enum sch_err sch_strlist_push(struct sch_arena *a, struct sch_strlist *l, const char *s)
{
	if (!s)
		return SCH_ERR_NOMEM;
	if (l->n == l->cap) {
		size_t cap = l->cap ? l->cap * 2 : 64;
		const char **v = sch_arena_alloc(a, cap * sizeof(*v));
		if (!v)
			return SCH_ERR_NOMEM;
		if (l->n)
			memcpy(v, l->v, l->n * sizeof(*v));
		l->v = v;
		l->cap = cap;
	}
	l->v[l->n++] = s;
	return SCH_OK;
}

enum sch_err sch_analysis_note(struct sch_analysis *an, const char *s)
{
	return sch_strlist_push(&an->res->arena, &an->notes, s);
}

/*
 * The pipeline: deck, carriers, the noise plan, the decks and steps the simulator runs, the run,
 * and its outcome into res (for a sweep, each point as it arrives).
 */
static enum sch_err analysis_core(const char *path, const struct sch_run_options *opt,
				  const struct sch_vary_plan *vary, struct sch_result *res, struct sch_diag *d)
{
	struct sch_analysis an;
	enum sch_err ret;

	memset(&an, 0, sizeof(an));
	an.res = res;
	an.opt = opt;
	an.vary = vary;
	an.d = d;
	res->netlist = sch_arena_strdup(&res->arena, path);
	if ((ret = sch_deck_load(&res->deck, path, d)) != SCH_OK ||
	    (ret = sch_analysis_plan_dialect(&an)) != SCH_OK ||
	    (ret = sch_carriers_find(&res->deck, &opt->carriers, &res->arena, &res->set, d)) != SCH_OK ||
	    (ret = sch_analysis_check_rules(&an)) != SCH_OK ||
	    (ret = sch_analysis_plan_report(&an)) != SCH_OK ||
	    (ret = sch_analysis_plan_lump(&an)) != SCH_OK ||
	    (ret = sch_analysis_build_decks(&an)) != SCH_OK ||
	    (ret = sch_analysis_plan_quantities(res, &an.aug, &an.q)) != SCH_OK ||
	    (ret = sch_analysis_batch_quantities(&an)) != SCH_OK ||
	    (ret = sch_analysis_value_quantities(&an)) != SCH_OK)
		goto out;
	sch_analysis_plan_steps(&an);
	if ((ret = sch_analysis_sweep_steps(&an)) != SCH_OK ||
	    (ret = sch_analysis_build_request(&an)) != SCH_OK ||
	    (ret = sch_analysis_sweep_prepare(&an)) != SCH_OK ||
	    (ret = sch_analysis_simulate(&an)) != SCH_OK ||
	    (ret = sch_analysis_take_outcome(&an)) != SCH_OK ||
	    (ret = sch_analysis_closing_notes(&an)) != SCH_OK)
		goto out;
	res->notes = an.notes.v;
	res->n_notes = an.notes.n;
out:
	sch_strmap_release(&an.m.devices);
	sch_strmap_release(&an.m.probes);
	sch_sim_result_release(&an.sim);
	return ret;
}

enum sch_err sch_analysis_run(const char *path, const struct sch_run_options *opt, struct sch_result *res,
			      struct sch_diag *d)
{
	return analysis_core(path, opt, NULL, res, d);
}

enum sch_err sch_analysis_sweep(const char *path, const struct sch_run_options *opt, const char *name,
				const double *values, size_t n_values, struct sch_result *res, struct sch_sweep *sweep,
				struct sch_diag *d)
{
	struct sch_vary_plan vary = { name, values, n_values, sweep, NULL };
	struct sch_run_options swept = *opt; /* the swept source is a carrier even at "dc 0" in the netlist */

	memset(sweep, 0, sizeof(*sweep));
	sweep->crossover = NAN;
	sweep->name = sch_arena_strdup(&res->arena, name);
	sweep->unit = strcmp(name, "temp") == 0 ? "C" : "A";
	sweep->points = sch_arena_alloc(&res->arena, (n_values + 1) * sizeof(*sweep->points));
	if (!sweep->points || !sweep->name)
		return SCH_ERR_NOMEM;
	if (opt->mode != SCH_RUN_REPORT || n_values < 2)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "a sweep needs a noise run and at least two points");
	swept.carriers.swept = name;
	return analysis_core(path, &swept, &vary, res, d);
}

enum sch_err sch_analysis_batch(const char *path, const struct sch_run_options *opt, const struct sch_batch *batch,
				struct sch_result *res, struct sch_diag *d)
{
	struct sch_sweep sweep;
	struct sch_vary_plan vary = { NULL, NULL, batch->n_points, &sweep, batch };

	memset(&sweep, 0, sizeof(sweep));
	sweep.crossover = NAN;
	sweep.name = "batch";
	sweep.unit = "";
	if (opt->mode != SCH_RUN_REPORT || batch->n_points < 1)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "a batch needs a noise run and at least one point");
	sweep.points = sch_arena_alloc(&res->arena, (batch->n_points + 1) * sizeof(*sweep.points));
	if (!sweep.points)
		return SCH_ERR_NOMEM;
	return analysis_core(path, opt, &vary, res, d);
}
