/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * plan.c - what an analysis will ask of the simulator: the noise run from the deck's .noise card
 * and the options, the deck's GMIN, and the quantities read after each step.
 */
#include <ctype.h>
#include <stdio.h>
#include <string.h>
#include <strings.h>
#include "analysis_int.h"
#include "schrot/si.h"

static bool node_is_safe(const char *s, size_t n)
{
	if (n == 0 || n > 200)
		return false;
	for (size_t i = 0; i < n; i++) {
		unsigned char c = (unsigned char)s[i];
		if (!(isalnum(c) || c == '_' || c == '.' || c == '#' || c == '+' || c == '-' || c == '[' || c == ']'))
			return false;
	}
	return true;
}

bool sch_analysis_output_nodes(const char *expr, char *a, char *b, size_t size)
{
	char tmp[512];
	size_t n = 0;
	char *comma;

	for (const char *p = expr; *p && n + 1 < sizeof(tmp); p++)
		if (!isspace((unsigned char)*p))
			tmp[n++] = (char)tolower((unsigned char)*p);
	tmp[n] = '\0';
	if (n < 4 || strncmp(tmp, "v(", 2) != 0 || tmp[n - 1] != ')')
		return false;
	tmp[n - 1] = '\0';
	comma = strchr(tmp + 2, ',');
	if (comma)
		*comma = '\0';
	if (!node_is_safe(tmp + 2, strlen(tmp + 2)) || (comma && !node_is_safe(comma + 1, strlen(comma + 1))))
		return false;
	snprintf(a, size, "%s", tmp + 2);
	snprintf(b, size, "%s", comma ? comma + 1 : "");
	return true;
}

/* Normalises "v(out)" / "V( out , ref )" into out (lower case); false when it is not such a form. */
static bool normalise_output(const char *expr, char *out, size_t size)
{
	char a[256], b[256];

	if (!sch_analysis_output_nodes(expr, a, b, sizeof(a)))
		return false;
	if (b[0])
		snprintf(out, size, "v(%.200s,%.200s)", a, b);
	else
		snprintf(out, size, "v(%.200s)", a);
	return true;
}

static enum sch_err parse_freq_token(const struct sch_deck *deck, const char *tok, double *v, struct sch_diag *d)
{
	const struct sch_card *c = &deck->cards[deck->noise.card];
	if (!tok || sch_si_parse(tok, v) != SCH_OK || !(*v > 0))
		return sch_diag_error(d, SCH_ERR_INPUT, c->file, c->line, "'.noise' needs a positive number, not '%s'",
				      tok ? tok : "");
	return SCH_OK;
}

static const struct sch_element *top_element(const struct sch_deck *deck, const char *name)
{
	for (size_t k = 0; k < deck->n_elements; k++) {
		if (deck->elements[k].subckt < 0 && strcmp(deck->elements[k].name, name) == 0)
			return &deck->elements[k];
	}
	return NULL;
}

static bool element_has_ac(const struct sch_element *e)
{
	for (int k = 0; k < e->n_tok; k++) {
		if (strcmp(e->tok[k], "ac") == 0 || strncmp(e->tok[k], "ac=", 3) == 0)
			return true;
	}
	return false;
}

/* The sweep from the .noise card: start, stop, points and kind ("dec", "oct", "lin"). */
static enum sch_err card_sweep(const struct sch_deck *deck, struct sch_noise_plan *plan, long *n_points,
			       const char **sweep, struct sch_diag *d)
{
	const struct sch_noise_spec *ns = &deck->noise;
	double np;
	enum sch_err ret;

	if ((ret = parse_freq_token(deck, ns->f_start, &plan->f_start, d)) != SCH_OK ||
	    (ret = parse_freq_token(deck, ns->f_stop, &plan->f_stop, d)) != SCH_OK ||
	    (ret = parse_freq_token(deck, ns->n_points, &np, d)) != SCH_OK)
		return ret;
	*n_points = (long)np;
	*sweep = ns->sweep;
	if (!*sweep || (strcmp(*sweep, "dec") && strcmp(*sweep, "oct") && strcmp(*sweep, "lin")))
		return sch_diag_error(d, SCH_ERR_INPUT, deck->cards[ns->card].file, deck->cards[ns->card].line,
				      "'.noise' sweep must be dec, oct or lin, not '%s'", *sweep ? *sweep : "");
	return SCH_OK;
}

enum sch_err sch_analysis_plan_noise(const struct sch_deck *deck, const struct sch_run_options *opt,
				     struct sch_arena *a, struct sch_noise_plan *plan, struct sch_diag *d)
{
	const struct sch_noise_spec *ns = &deck->noise;
	const char *where_file = ns->present ? deck->cards[ns->card].file : deck->path;
	long where_line = ns->present ? deck->cards[ns->card].line : 0;
	const char *output = opt->output_expr ? opt->output_expr : (ns->present ? ns->output : NULL);
	const char *input = opt->input_src ? opt->input_src : (ns->present ? ns->input : NULL);
	char out_norm[512], in_lower[256];
	const struct sch_element *src;
	const char *sweep = "dec";
	long n_points = 20;
	enum sch_err ret;

	if (!output || !input || (!ns->present && !opt->have_freq))
		return sch_diag_error(d, SCH_ERR_USAGE, deck->path, 0,
				      "no '.noise' line: give --output, --input and --freq");
	if (!normalise_output(output, out_norm, sizeof(out_norm)))
		return sch_diag_error(d, SCH_ERR_INPUT, opt->output_expr ? NULL : where_file, where_line,
				      "noise output must be v(node) or v(node,ref), not '%s'", output);
	snprintf(in_lower, sizeof(in_lower), "%s", input);
	for (char *p = in_lower; *p; p++)
		*p = (char)tolower((unsigned char)*p);
	src = top_element(deck, in_lower);
	if (!src || (src->letter != 'v' && src->letter != 'i') || !node_is_safe(in_lower, strlen(in_lower)))
		return sch_diag_error(d, SCH_ERR_INPUT, opt->input_src ? NULL : where_file, where_line,
				      "noise input '%s' is not a voltage or current source at the netlist's top level", input);
	if (opt->have_freq) {
		plan->f_start = opt->freq.f_start;
		plan->f_stop = opt->freq.f_stop;
		n_points = opt->freq.points_per_decade;
	} else if ((ret = card_sweep(deck, plan, &n_points, &sweep, d)) != SCH_OK) {
		return ret;
	}
	/* start == stop is a spot run: one frequency, no band (the simulator then makes no noise2 plot) */
	if (!(plan->f_stop >= plan->f_start) || n_points < 1)
		return sch_diag_error(d, SCH_ERR_INPUT, opt->have_freq ? NULL : where_file, where_line,
				      "noise sweep needs a stop frequency at or above its start and at least one point");
	plan->output = sch_arena_strdup(a, out_norm);
	plan->input = sch_arena_strdup(a, in_lower);
	plan->letter = src->letter;
	plan->needs_ac = !element_has_ac(src);
	snprintf(plan->bare_command, sizeof(plan->bare_command), "noise %s %s %s %ld %.17g %.17g", out_norm, in_lower,
		 sweep, n_points, plan->f_start, plan->f_stop);
	snprintf(plan->command, sizeof(plan->command), "%s 1", plan->bare_command);
	return plan->output && plan->input ? SCH_OK : SCH_ERR_NOMEM;
}

enum sch_err sch_analysis_noise_command(const struct sch_deck *deck, const struct sch_run_options *opt,
					struct sch_arena *arena, const char **command, const char **ac_source,
					struct sch_diag *d)
{
	struct sch_noise_plan plan;
	const char *text;
	enum sch_err ret;

	memset(&plan, 0, sizeof(plan));
	if ((ret = sch_analysis_plan_noise(deck, opt, arena, &plan, d)) != SCH_OK)
		return ret;
	if (!(text = sch_arena_strdup(arena, plan.command)))
		return SCH_ERR_NOMEM;
	*command = text;
	*ac_source = plan.needs_ac ? plan.input : NULL;
	return SCH_OK;
}

enum sch_err sch_analysis_plan_report(struct sch_analysis *an)
{
	struct sch_result *res = an->res;
	struct sch_noise_plan *plan = &an->plan;
	enum sch_err ret;

	if (an->opt->mode != SCH_RUN_REPORT)
		return SCH_OK;
	if ((ret = sch_analysis_plan_noise(&res->deck, an->opt, &res->arena, plan, an->d)) != SCH_OK)
		return ret;
	if (an->vary && plan->f_start == plan->f_stop)
		return sch_diag_error(an->d, SCH_ERR_USAGE, res->deck.path, 0,
				      "a sweep needs a band: the noise run is a single-frequency spot run at %g Hz",
				      plan->f_start);
	res->output = plan->output;
	res->input = plan->input;
	res->input_unit = plan->letter == 'i' ? "A" : "V";
	res->run_lo_hz = plan->f_start;
	res->run_hi_hz = plan->f_stop;
	for (size_t i = 0; i < res->deck.n_notes; i++) {
		if ((ret = sch_analysis_note(an, res->deck.notes[i])) != SCH_OK)
			return ret;
	}
	if (plan->needs_ac) {
		an->aopt.ac_source = plan->input;
		ret = sch_analysis_note(an, sch_arena_printf(&res->arena, "input source '%s' has no AC value: AC 1 supplied "
									  "for the run (the netlist file is unchanged)",
							     plan->input));
		if (ret != SCH_OK)
			return ret;
	}
	if ((ret = sch_analysis_note_light_input(an)) != SCH_OK || (ret = sch_analysis_note_tables(an)) != SCH_OK)
		return ret;
	an->aopt.junction_probes = an->opt->junction_correction;
	an->aopt.share_paired_junctions = true;
	return SCH_OK;
}

/* The X of "gmin = X" from q, just past "gmin"; false when no "= number" follows. */
static bool gmin_value(const char *q, double *v)
{
	char num[64];
	size_t n = 0;

	while (isspace((unsigned char)*q))
		q++;
	if (*q != '=')
		return false;
	q++;
	while (isspace((unsigned char)*q))
		q++;
	while (q[n] && !isspace((unsigned char)q[n]) && n + 1 < sizeof(num)) {
		num[n] = q[n];
		n++;
	}
	num[n] = '\0';
	return sch_si_parse(num, v) == SCH_OK;
}

double sch_analysis_deck_gmin(const struct sch_deck *deck)
{
	double gmin = 1e-12;
	for (size_t c = 0; c < deck->n_cards; c++) {
		const char *kw = deck->cards[c].keyword;
		const char *t = deck->cards[c].text;
		if (!kw || strncmp(kw, ".opt", 4) != 0)
			continue;
		for (const char *p = t; *p; p++) {
			double v;
			if (strncasecmp(p, "gmin", 4) == 0 && (p == t || isspace((unsigned char)p[-1])) && gmin_value(p + 4, &v))
				gmin = v;
		}
	}
	return gmin;
}

/* One quantity per carrier, then one per noiseless source: their DC currents. */
static enum sch_err plan_currents(struct sch_result *res, struct sch_quantity_plan *q)
{
	struct sch_arena *a = &res->arena;
	const struct sch_carrier_set *set = &res->set;
	enum sch_err ret;

	q->carriers = q->names.n;
	for (size_t k = 0; k < set->n_carriers; k++) {
		const struct sch_carrier *c = &set->carriers[k];
		ret = sch_strlist_push(a, &q->names,
				       sch_carriers_current_quantity(a, res->deck.elements[c->element].letter, c->sim_name));
		if (ret != SCH_OK)
			return ret;
	}
	q->noiseless = q->names.n;
	for (size_t k = 0; k < set->n_noiseless; k++) {
		const struct sch_source *s = &set->noiseless[k];
		ret = sch_strlist_push(a, &q->names,
				       sch_carriers_current_quantity(a, res->deck.elements[s->element].letter, s->sim_name));
		if (ret != SCH_OK)
			return ret;
	}
	return SCH_OK;
}

/* Pushes "@<sim_name>[<param>]" for each of params. */
static enum sch_err push_params(struct sch_arena *a, struct sch_strlist *names, const char *sim_name,
				const char *const *params, size_t n_params)
{
	enum sch_err ret;

	for (size_t i = 0; i < n_params; i++) {
		if ((ret = sch_strlist_push(a, names, sch_arena_printf(a, "@%s[%s]", sim_name, params[i]))) != SCH_OK)
			return ret;
	}
	return SCH_OK;
}

/* Three quantities (id, vd, gd) per diode instance, for the junction correction. */
static enum sch_err plan_diodes(struct sch_result *res, struct sch_quantity_plan *q)
{
	static const char *const params[] = { "id", "vd", "gd" };
	struct sch_arena *a = &res->arena;
	const struct sch_carrier_set *set = &res->set;
	enum sch_err ret;

	q->diodes = q->names.n;
	q->diode_inst = sch_arena_alloc(a, (set->n_instances + 1) * sizeof(int));
	if (!q->diode_inst)
		return SCH_ERR_NOMEM;
	for (size_t k = 0; k < set->n_instances; k++) {
		const struct sch_instance *in = &set->instances[k];
		if (res->deck.elements[in->element].letter != 'd')
			continue;
		q->diode_inst[q->n_diodes++] = (int)k;
		if ((ret = push_params(a, &q->names, in->sim_name, params, 3)) != SCH_OK)
			return ret;
	}
	return SCH_OK;
}

/* Four quantities (ic, ib, vbe, vbc) per bipolar instance, for the bipolar correction. */
static enum sch_err plan_bipolars(struct sch_result *res, struct sch_quantity_plan *q)
{
	static const char *const params[] = { "ic", "ib", "vbe", "vbc" };
	struct sch_arena *a = &res->arena;
	const struct sch_carrier_set *set = &res->set;
	enum sch_err ret;

	q->bjts = q->names.n;
	q->bjt_of_inst = sch_arena_alloc(a, (set->n_instances + 1) * sizeof(int));
	if (!q->bjt_of_inst)
		return SCH_ERR_NOMEM;
	for (size_t k = 0, nb = 0; k < set->n_instances; k++) {
		const struct sch_instance *in = &set->instances[k];
		q->bjt_of_inst[k] = -1;
		if (res->deck.elements[in->element].letter != 'q')
			continue;
		q->bjt_of_inst[k] = (int)nb++;
		if ((ret = push_params(a, &q->names, in->sim_name, params, 4)) != SCH_OK)
			return ret;
	}
	return SCH_OK;
}

enum sch_err sch_analysis_plan_quantities(struct sch_result *res, const struct sch_augmented *aug,
					  struct sch_quantity_plan *q)
{
	enum sch_err ret;

	memset(q, 0, sizeof(*q));
	if ((ret = sch_strlist_push(&res->arena, &q->names, aug->temp_quantity)) != SCH_OK ||
	    (ret = plan_currents(res, q)) != SCH_OK || (ret = plan_diodes(res, q)) != SCH_OK ||
	    (ret = plan_bipolars(res, q)) != SCH_OK)
		return ret;
	return SCH_OK;
}
