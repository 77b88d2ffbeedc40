/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * run.c - the simulator steps of an analysis: the decks and commands it runs, the request, the
 * run with its failure placed at the netlist line, and each step's outcome taken into the result.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "analysis_int.h"
#include "schrot/physics.h"

enum sch_err sch_analysis_build_decks(struct sch_analysis *an)
{
	struct sch_result *res = an->res;
	struct sch_arena *a = &res->arena;
	enum sch_err ret;

	if (an->lump.quiet) {
		/*
		 * The circuit's own noise, every resistor noisy and our generators quiet: their unit
		 * density is far above any real one, and a difference next to it would lose digits.
		 */
		an->aopt.quiet_probes = true;
		an->aopt.analysis_card = sch_arena_printf(a, ".%s", an->plan.bare_command);
		if (!an->aopt.analysis_card)
			return SCH_ERR_NOMEM;
		if ((ret = sch_augment_build(&res->deck, &res->set, &an->aopt, a, &an->aug_full, an->d)) != SCH_OK)
			return ret;
		an->aopt.quiet_probes = false;
		an->aopt.quiet_elements = an->lump.quiet;
	}
	/* the noise run is the deck's own card, so the simulator can write its data to a file (sim.h) */
	if (an->opt->mode == SCH_RUN_REPORT && !(an->aopt.analysis_card = sch_arena_printf(a, ".%s", an->plan.command)))
		return SCH_ERR_NOMEM;
	return sch_augment_build(&res->deck, &res->set, &an->aopt, a, &an->aug, an->d);
}

/* True when a carrier or listed source is a G, F or B element, whose current is read from the solution. */
static bool needs_dc_solution(const struct sch_result *res)
{
	for (size_t k = 0; k < res->set.n_carriers; k++) {
		char l = res->deck.elements[res->set.carriers[k].element].letter;
		if (l == 'g' || l == 'f' || l == 'b')
			return true;
	}
	for (size_t k = 0; k < res->set.n_noiseless; k++) {
		char l = res->deck.elements[res->set.noiseless[k].element].letter;
		if (l == 'g' || l == 'f' || l == 'b')
			return true;
	}
	return false;
}

void sch_analysis_plan_steps(struct sch_analysis *an)
{
	bool report = an->opt->mode == SCH_RUN_REPORT;

	an->n_commands = 0;
	an->commands[an->n_commands++] = report ? "run" : "op";
	/*
	 * G, F and B elements compute their current from the last solution, which after a noise run is
	 * the small-signal one: an operating point after the noise run puts the DC solution back.
	 */
	if (report && needs_dc_solution(an->res))
		an->commands[an->n_commands++] = "op";
	an->one_step.commands = an->commands;
	an->one_step.n_commands = an->n_commands;
	an->steps = &an->one_step;
	an->n_steps = 1;
}

/* --lump: step 1, the full circuit's total alone, runs in a second worker beside step 0. */
static enum sch_err add_lump_step(struct sch_analysis *an)
{
	struct sch_sim_step *steps = sch_arena_alloc(&an->res->arena, 2 * sizeof(*steps));

	if (!steps)
		return SCH_ERR_NOMEM;
	steps[0] = an->one_step;
	an->bare_commands[0] = "run";
	steps[1].commands = an->bare_commands;
	steps[1].n_commands = 1;
	steps[1].lines = an->aug_full.lines;
	steps[1].n_lines = an->aug_full.n_lines;
	an->req.steps = steps;
	an->req.n_steps = 2;
	return SCH_OK;
}

/* Which deck lines come from an included or library file (the simulator keeps their words out of messages); NULL when out of memory. */
static const bool *private_lines_of(struct sch_result *res, const struct sch_augmented *aug)
{
	bool *priv = sch_arena_alloc(&res->arena, (aug->n_lines + 1) * sizeof(*priv));

	for (size_t i = 0; priv && i < aug->n_lines; i++) {
		int card = aug->line_card[i];

		priv[i] = card >= 0 && (size_t)card < res->deck.n_cards && res->deck.cards[card].file != res->deck.path;
	}
	return priv;
}

enum sch_err sch_analysis_build_request(struct sch_analysis *an)
{
	struct sch_sim_request *req = &an->req;
	bool report = an->opt->mode == SCH_RUN_REPORT;
	enum sch_err ret;

	memset(req, 0, sizeof(*req));
	req->lines = an->aug.lines;
	req->n_lines = an->aug.n_lines;
	req->private_lines = private_lines_of(an->res, &an->aug);
	if (!req->private_lines)
		return SCH_ERR_NOMEM;
	req->private_texts = an->res->deck.data_texts;
	req->n_private_texts = an->res->deck.n_data_texts;
	req->steps = an->steps;
	req->n_steps = an->n_steps;
	if (an->lump.quiet && (ret = add_lump_step(an)) != SCH_OK)
		return ret;
	req->quantities = an->q.names.v;
	req->n_quantities = an->q.names.n;
	req->collect_noise = report;
	req->noise_via_file = report;
	if (report) {
		if ((ret = sch_analysis_map_vectors(an)) != SCH_OK)
			return ret;
		req->keep_vector = sch_analysis_keep_vector;
		req->keep_vector_ctx = &an->m;
	}
	req->squared_noise = true;
	req->compat_mode = an->res->compat_mode;
	for (size_t k = 0; report && k < an->res->deck.n_elements; k++)
		req->prime_ac = req->prime_ac || an->res->deck.elements[k].letter == 'a';
	req->n_workers = an->vary ? an->opt->n_workers : 1;
	return SCH_OK;
}

/*
 * The netlist card behind a simulator failure, or -1. The simulator numbers the lines of the deck
 * it was given ("Error on line 4 ...", our title is line 1), which aug->line_card maps back, and
 * names expanded subcircuit elements ("Error on line: n.x1.n7 ..."), which the instances map back.
 */
static int card_of_failure(const struct sch_result *res, const struct sch_augmented *aug, const char *reason)
{
	static const char key[] = "rror on line";
	const char *at = strstr(reason, key);

	if (!at)
		return -1;
	at += strlen(key);
	if (at[0] == ' ' && at[1] >= '0' && at[1] <= '9') {
		long n = strtol(at + 1, NULL, 10);
		return n >= 1 && (size_t)n <= aug->n_lines ? aug->line_card[n - 1] : -1;
	}
	if (at[0] == ':' && at[1] == ' ') {
		size_t len = strcspn(at + 2, " :");
		for (size_t k = 0; k < res->set.n_instances; k++) {
			const char *sim = res->set.instances[k].sim_name;
			if (strlen(sim) == len && strncmp(sim, at + 2, len) == 0)
				return res->deck.elements[res->set.instances[k].element].card;
		}
	}
	return -1;
}

/*
 * Reports a simulator failure at the netlist line it concerns: "input.cir:4: error: simulator:
 * n1 a 0 foo: unknown device type - error". The simulator's own line reference goes; so does its
 * echo of the card when the card comes from an included file (text of included files is never
 * quoted, docs/security.md). Without a known card the reason is reported as it came.
 */
static void report_failure(const struct sch_result *res, const struct sch_augmented *aug, const char *reason,
			   struct sch_diag *d)
{
	int card = card_of_failure(res, aug, reason);
	const struct sch_card *c;
	const char *rest;

	if (card < 0 || (size_t)card >= res->deck.n_cards) {
		sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: %s", reason);
		return;
	}
	c = &res->deck.cards[card];
	rest = strstr(reason, "rror on line");
	rest = strstr(rest, ": ");
	rest = rest ? rest + 2 : reason;
	if (c->file != res->deck.path && strstr(rest, ": "))
		for (const char *p = strstr(rest, ": "); p; p = strstr(p + 2, ": "))
			rest = p + 2;
	sch_diag_error(d, SCH_ERR_SIM, c->file, c->line, "simulator: %s", rest);
}

/*
 * sch_sim_run with its failure line held back and reported again at the netlist's FILE:LINE; every
 * other message passes through unchanged and in order.
 */
static enum sch_err run_simulator(const struct sch_result *res, const struct sch_augmented *aug,
				  const struct sch_sim_request *req, struct sch_sim_result *sim, struct sch_diag *d)
{
	struct sch_diag held;
	char *text = NULL, *line, *next;
	size_t len = 0;
	FILE *mem = open_memstream(&text, &len);
	enum sch_err ret;
	bool relocate;

	if (!mem)
		return sch_sim_run(req, sim, d);
	sch_diag_init(&held, mem, d->verbosity);
	ret = sch_sim_run(req, sim, &held);
	fclose(mem);
	relocate = ret == SCH_ERR_SIM && sim->failure && held.n_errors == 1;
	for (line = text; line && *line; line = next) {
		next = strchr(line, '\n');
		next = next ? next + 1 : line + strlen(line);
		if (relocate && strncmp(line, "schrot: error: simulator: ", 26) == 0)
			continue;
		if (d->sink)
			fwrite(line, 1, (size_t)(next - line), d->sink);
	}
	free(text);
	d->n_warnings += held.n_warnings;
	if (relocate) {
		report_failure(res, aug, sim->failure, d);
	} else if (held.n_errors) {
		if (d->n_errors == 0)
			memcpy(d->first_error, held.first_error, sizeof(d->first_error));
		d->n_errors += held.n_errors;
	}
	return ret;
}

enum sch_err sch_analysis_simulate(struct sch_analysis *an)
{
	struct sch_result *res = an->res;
	enum sch_err ret;

	if ((ret = run_simulator(res, &an->aug, &an->req, &an->sim, an->d)) != SCH_OK)
		return ret;
	res->sim_version = sch_arena_strdup(&res->arena, an->sim.version ? an->sim.version : "ngspice");
	return SCH_OK;
}

/* Sets the currents and temperature read from the simulator into the result. */
static enum sch_err take_operating_point(struct sch_result *res, const struct sch_quantity_plan *q,
					 const struct sch_sim_outcome *o, struct sch_diag *d)
{
	struct sch_carrier_set *set = &res->set;
	size_t keep = 0;
	double t_c = o->quantities[q->temp];

	if (!isfinite(t_c))
		return sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: could not read the circuit temperature");
	res->temp_k = t_c + SCH_ZERO_C_K;
	for (size_t k = 0; k < set->n_carriers; k++) {
		set->carriers[k].dc_current_a = o->quantities[q->carriers + k];
		if (!isfinite(set->carriers[k].dc_current_a))
			return sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: no operating-point current for '%s'",
					      set->carriers[k].name);
	}
	/* only sources that carry DC current are listed: a zero-current test source is no concern */
	for (size_t k = 0; k < set->n_noiseless; k++) {
		struct sch_source s = set->noiseless[k];
		s.dc_current_a = o->quantities[q->noiseless + k];
		if (isfinite(s.dc_current_a) && s.dc_current_a != 0)
			set->noiseless[keep++] = s;
	}
	set->n_noiseless = keep;
	return SCH_OK;
}

enum sch_err sch_analysis_take_step(struct sch_analysis *an, const struct sch_sim_outcome *o)
{
	enum sch_err ret;

	if ((ret = take_operating_point(an->res, &an->q, o, an->d)) != SCH_OK ||
	    (ret = sch_analysis_take_values(an, o)) != SCH_OK ||
	    (ret = sch_analysis_time_source_notes(an)) != SCH_OK)
		return ret;
	if (an->opt->mode != SCH_RUN_REPORT)
		return SCH_OK;
	if ((ret = sch_analysis_take_noise(an, o)) != SCH_OK ||
	    (ret = sch_analysis_integrate(an->res, an->opt, an->d)) != SCH_OK)
		return ret;
	if ((ret = sch_analysis_junction_note_recount(an)) != SCH_OK)
		return ret;
	return sch_analysis_fano_notes(an);
}

enum sch_err sch_analysis_take_outcome(struct sch_analysis *an)
{
	if (an->vary)
		return sch_analysis_sweep_finish(an);
	an->full = an->lump.quiet ? &an->sim.steps[1] : NULL;
	return sch_analysis_take_step(an, &an->sim.steps[0]);
}
