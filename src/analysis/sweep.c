/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * sweep.c - a sweep's steps: the command that sets the varied quantity at each point, each point
 * taken into its sweep as the simulator hands it over (on_step), and the crossover.
 */
#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <strings.h>
#include "analysis_int.h"
#include "schrot/physics.h"

/* True when a top-level .param card defines name (lower case). */
static bool deck_defines_param(const struct sch_deck *deck, const char *name)
{
	size_t n = strlen(name);
	for (size_t c = 0; c < deck->n_cards; c++) {
		const struct sch_card *card = &deck->cards[c];
		const char *p;
		if (!card->keyword || strcmp(card->keyword, ".param") != 0 || card->subckt >= 0)
			continue;
		for (p = card->text + 6; *p; p++) {
			if ((p == card->text + 6 || isspace((unsigned char)p[-1])) && strncasecmp(p, name, n) == 0) {
				const char *q = p + n;
				while (isspace((unsigned char)*q))
					q++;
				if (*q == '=')
					return true;
			}
		}
	}
	return false;
}

/* The commands of one sweep step that set name to value: one or two (a .param needs a reset). */
static enum sch_err vary_command(const struct sch_result *res, const char *name, double value, char *out, size_t size,
				 bool *needs_reset, struct sch_diag *d)
{
	*needs_reset = false;
	if (strcmp(name, "temp") == 0) {
		snprintf(out, size, "option temp=%.17g", value);
		return SCH_OK;
	}
	if (sch_sim_name_is_safe(name) && !strchr(name, '.') && deck_defines_param(&res->deck, name)) {
		snprintf(out, size, "alterparam %s=%.17g", name, value);
		*needs_reset = true;
		return SCH_OK;
	}
	for (size_t k = 0; k < res->set.n_instances; k++) {
		const struct sch_instance *in = &res->set.instances[k];
		char letter = res->deck.elements[in->element].letter;
		if (strcmp(in->path, name) != 0)
			continue;
		if (letter != 'i' || !sch_sim_name_is_safe(in->sim_name))
			break;
		snprintf(out, size, "alter @%s[dc]=%.17g", in->sim_name, value);
		return SCH_OK;
	}
	return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
			      "--vary '%s' is neither 'temp', a top-level .param nor a current source of the netlist "
			      "(hierarchical name)",
			      name);
}

/*
 * The crossover with every value read as value + shift (273.15 puts degrees C on the kelvin scale,
 * where the shot-to-thermal ratio goes as 1/T), handed back on the values' own scale.
 */
static double crossover_shifted(const struct sch_sweep_point *p, size_t n, double shift)
{
	for (size_t i = 0; i + 1 < n; i++) {
		double r0 = p[i].carrier_power_v2 / p[i].other_power_v2;
		double r1 = p[i + 1].carrier_power_v2 / p[i + 1].other_power_v2;
		double v0 = p[i].value + shift, v1 = p[i + 1].value + shift;
		if (!(r0 > 0) || !(r1 > 0) || !isfinite(r0) || !isfinite(r1) || (r0 - 1) * (r1 - 1) > 0 || r0 == r1)
			continue;
		if (v0 > 0 && v1 > 0) {
			double t = -log(r0) / (log(r1) - log(r0));
			return exp(log(v0) + t * (log(v1) - log(v0))) - shift;
		}
		return v0 + (1 - r0) / (r1 - r0) * (v1 - v0) - shift;
	}
	return NAN;
}

double sch_sweep_crossover(const struct sch_sweep_point *p, size_t n)
{
	return crossover_shifted(p, n, 0);
}

double sch_sweep_crossover_of(const struct sch_sweep *s)
{
	return crossover_shifted(s->points, s->n_points, strcmp(s->unit, "C") == 0 ? SCH_ZERO_C_K : 0);
}

/* A batch point's step: its own commands, then an->commands. */
static enum sch_err batch_step(struct sch_analysis *an, size_t k, struct sch_sim_step *step)
{
	const struct sch_batch_point *bp = &an->vary->batch->points[k];
	const char **cmds = sch_arena_alloc(&an->res->arena, (bp->n_commands + an->n_commands + 1) * sizeof(*cmds));
	size_t nc = 0;

	if (!cmds)
		return SCH_ERR_NOMEM;
	for (size_t c = 0; c < bp->n_commands; c++)
		cmds[nc++] = bp->commands[c];
	for (size_t c = 0; c < an->n_commands; c++)
		cmds[nc++] = an->commands[c];
	step->commands = cmds;
	step->n_commands = nc;
	return SCH_OK;
}

enum sch_err sch_analysis_batch_quantities(struct sch_analysis *an)
{
	const struct sch_batch *b = an->vary ? an->vary->batch : NULL;
	enum sch_err ret;

	an->q.extra = an->q.names.n;
	for (size_t k = 0; b && k < b->n_quantities; k++) {
		if ((ret = sch_strlist_push(&an->res->arena, &an->q.names, b->quantities[k])) != SCH_OK)
			return ret;
	}
	return SCH_OK;
}

/* Point k's step: the command that sets the quantity, a reset for a .param, then an->commands. */
static enum sch_err point_step(struct sch_analysis *an, size_t k, struct sch_sim_step *step)
{
	struct sch_arena *a = &an->res->arena;
	const struct sch_vary_plan *vary = an->vary;
	const char **cmds = sch_arena_alloc(a, 4 * sizeof(*cmds));
	char buf[512];
	bool reset;
	size_t nc = 0;
	enum sch_err ret;

	if (!cmds)
		return SCH_ERR_NOMEM;
	if ((ret = vary_command(an->res, vary->name, vary->values[k], buf, sizeof(buf), &reset, an->d)) != SCH_OK)
		return ret;
	cmds[nc++] = sch_arena_strdup(a, buf);
	if (reset) {
		cmds[nc++] = "reset";
		vary->sweep->unit = ""; /* a .param: the netlist gives its meaning */
	}
	for (size_t c = 0; c < an->n_commands; c++)
		cmds[nc++] = an->commands[c];
	step->commands = cmds;
	step->n_commands = nc;
	return SCH_OK;
}

enum sch_err sch_analysis_sweep_steps(struct sch_analysis *an)
{
	struct sch_sim_step *steps;
	enum sch_err ret;

	if (!an->vary)
		return SCH_OK;
	if (!(steps = sch_arena_alloc(&an->res->arena, (an->vary->n + 1) * sizeof(*steps))))
		return SCH_ERR_NOMEM;
	for (size_t k = 0; k < an->vary->n; k++) {
		if ((ret = (an->vary->batch ? batch_step : point_step)(an, k, &steps[k])) != SCH_OK)
			return ret;
	}
	an->steps = steps;
	an->n_steps = an->vary->n;
	return SCH_OK;
}

/*
 * A point's rows go to an arena of their own, freed once the point's values are taken, so a
 * sweep's memory does not grow with its points; every point starts from the full list of sources.
 */
static enum sch_err point_begin(struct sch_analysis *an)
{
	struct sch_result *res = an->res;

	sch_arena_init(&res->arena);
	memset(&an->notes, 0, sizeof(an->notes));
	res->set.noiseless = sch_arena_alloc(&res->arena, (an->n_noiseless_all + 1) * sizeof(*res->set.noiseless));
	if (!res->set.noiseless)
		return SCH_ERR_NOMEM;
	memcpy(res->set.noiseless, an->noiseless_all, an->n_noiseless_all * sizeof(*res->set.noiseless));
	res->set.n_noiseless = an->n_noiseless_all;
	return SCH_OK;
}

/* Point k's values into the sweep, and the progress. */
static void point_record(struct sch_analysis *an, size_t k)
{
	const struct sch_result *res = an->res;
	struct sch_sweep_point *p = &an->vary->sweep->points[k];

	p->value = an->vary->values ? an->vary->values[k] : (double)k;
	p->output_rms_v = res->output_rms_v;
	p->input_rms = res->input_rms;
	p->carrier_power_v2 = res->carrier_power_v2;
	p->other_power_v2 = res->total_power_v2 - res->carrier_power_v2;
	an->n_done++;
	if (an->opt->progress)
		an->opt->progress(an->opt->progress_ctx, an->n_done, an->n_steps);
}

/*
 * Frees the point's arena and puts kept back: the result then holds no rows, only the values every
 * point shares (band, names).
 */
static void point_end(struct sch_analysis *an, struct sch_arena kept)
{
	struct sch_result *res = an->res;

	sch_arena_release(&res->arena);
	res->arena = kept;
	res->set.noiseless = an->noiseless_all;
	res->set.n_noiseless = an->n_noiseless_all;
	memset(&an->notes, 0, sizeof(an->notes));
	res->contributions = NULL;
	res->n_contributions = 0;
	res->dominant_other = NULL;
	res->freq_hz = res->gain2 = res->total_psd = NULL;
	res->n_freq = 0;
	res->spots = NULL;
	res->n_spots = 0;
}

/* The simulator session hands over each sweep point as it finishes (sim.h, on_step). */
static enum sch_err sweep_point_done(void *ctx, size_t step, const struct sch_sim_outcome *o)
{
	struct sch_analysis *an = ctx;
	struct sch_arena kept = an->res->arena;
	const struct sch_batch *b = an->vary->batch;
	enum sch_err ret;

	if ((ret = point_begin(an)) == SCH_OK && (!b || !b->prepare || (ret = b->prepare(b->ctx, step, an->res)) == SCH_OK) &&
	    (ret = sch_analysis_take_step(an, o)) == SCH_OK &&
	    (!b || !b->take || (ret = b->take(b->ctx, step, an->res, o->quantities + an->q.extra)) == SCH_OK))
		point_record(an, step);
	if (b && b->undo)
		b->undo(b->ctx, step, an->res);
	point_end(an, kept);
	return ret;
}

enum sch_err sch_analysis_sweep_prepare(struct sch_analysis *an)
{
	struct sch_result *res = an->res;

	if (!an->vary)
		return SCH_OK;
	if (an->opt->progress)
		an->opt->progress(an->opt->progress_ctx, 0, an->n_steps);
	an->n_noiseless_all = res->set.n_noiseless;
	an->noiseless_all = sch_arena_alloc(&res->arena, (an->n_noiseless_all + 1) * sizeof(*an->noiseless_all));
	if (!an->noiseless_all)
		return SCH_ERR_NOMEM;
	memcpy(an->noiseless_all, res->set.noiseless, an->n_noiseless_all * sizeof(*an->noiseless_all));
	an->req.on_step = sweep_point_done;
	an->req.on_step_ctx = an;
	return SCH_OK;
}

enum sch_err sch_analysis_sweep_finish(struct sch_analysis *an)
{
	for (size_t k = 0; k < an->n_steps; k++) {
		if (!an->sim.steps[k].consumed)
			return sch_diag_error(an->d, SCH_ERR_SIM, NULL, 0, "simulator: sweep point %zu gave no result", k + 1);
	}
	an->vary->sweep->n_points = an->n_steps;
	an->vary->sweep->crossover = sch_sweep_crossover_of(an->vary->sweep);
	return SCH_OK;
}
