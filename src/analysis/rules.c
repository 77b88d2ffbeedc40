/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * rules.c - what the gain rules (--avalanche, --fano) did, stated: a rule that names an APD's
 * diode instead of its photocurrent source is refused with the carrier to use, every rule's
 * M, k, F(M) or Fano factor goes into the notes, and the input carrier's gain M divides NEP.
 */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <strings.h>
#include "analysis_int.h"
#include "schrot/pattern.h"

/* The rules of one kind, as the options hold them. */
struct rule_kind {
	const char *option;     /* "--avalanche" */
	const struct sch_gain_rule *rules;
	size_t n;
	bool avalanche;
};

static const struct sch_element *element_of(const struct sch_result *res, const struct sch_instance *in)
{
	return &res->deck.elements[in->element];
}

/* True when the two elements' first two nodes are the same pair, in either order. */
static bool same_nodes(const struct sch_deck *deck, const struct sch_element *e, const struct sch_element *f)
{
	const char *const *a, *const *b;

	if (sch_deck_element_nodes(deck, e, &a) < 2 || sch_deck_element_nodes(deck, f, &b) < 2)
		return false;
	return (strcmp(a[0], b[0]) == 0 && strcmp(a[1], b[1]) == 0) || (strcmp(a[0], b[1]) == 0 && strcmp(a[1], b[0]) == 0);
}

/* The carrier across diode instance k (same nodes, same subcircuit instance), or NULL. */
static const struct sch_carrier *carrier_across(const struct sch_result *res, size_t k)
{
	const struct sch_instance *diode = &res->set.instances[k];

	for (size_t c = 0; c < res->set.n_carriers; c++) {
		const struct sch_instance *in = &res->set.instances[res->set.carriers[c].instance];
		if (in->parent == diode->parent && same_nodes(&res->deck, element_of(res, in), element_of(res, diode)))
			return &res->set.carriers[c];
	}
	return NULL;
}

/* "iapd=50:0.02" or "itunnel=0.5": the rule as typed. */
static void rule_text(const struct rule_kind *kind, const struct sch_gain_rule *r, const char *regex, char *out,
		      size_t size)
{
	if (kind->avalanche)
		snprintf(out, size, "%s=%g:%g", regex, r->gain_m, r->k_ratio);
	else
		snprintf(out, size, "%s=%g", regex, r->fano);
}

/*
 * A rule that matches no carrier but a diode: refused (SCH_ERR_USAGE) with the carrier across
 * that diode to name instead. SCH_OK when the rule matches a carrier or no diode.
 */
static enum sch_err refuse_diode_rule(const struct sch_result *res, const struct rule_kind *kind,
				      const struct sch_gain_rule *r, const struct sch_pattern *p, struct sch_diag *d)
{
	char typed[300], fix[300];

	for (size_t c = 0; c < res->set.n_carriers; c++) {
		const char *name = res->set.carriers[c].name;
		if (sch_pattern_match(p, name, strlen(name)))
			return SCH_OK;
	}
	for (size_t k = 0; k < res->set.n_instances; k++) {
		const struct sch_instance *in = &res->set.instances[k];
		const struct sch_carrier *c;
		if (element_of(res, in)->letter != 'd' || !sch_pattern_match(p, in->path, strlen(in->path)))
			continue;
		rule_text(kind, r, r->regex, typed, sizeof(typed));
		c = carrier_across(res, k);
		if (!c)
			return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
					      "%s '%s' names the diode '%s', not a current: give the rule to the current "
					      "source that carries its photocurrent (across the diode, or --carrier)",
					      kind->option, typed, in->path);
		rule_text(kind, r, c->name, fix, sizeof(fix));
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "%s '%s' names the diode '%s', not a current: the gain belongs to the "
				      "photocurrent source across it, '%s' (use %s '%s')",
				      kind->option, typed, in->path, c->name, kind->option, fix);
	}
	return SCH_OK;
}

/*
 * One note per rule: what it set and on which carriers, the first few by name. Only carriers the
 * rule decided (the first matching rule counts) are listed.
 */
static enum sch_err note_rule(struct sch_analysis *an, const struct rule_kind *kind, const struct sch_gain_rule *r,
			      const struct sch_pattern *p)
{
	struct sch_result *res = an->res;
	char list[400] = "", what[200];
	size_t n = 0;

	for (size_t c = 0; c < res->set.n_carriers; c++) {
		const struct sch_carrier *ca = &res->set.carriers[c];
		bool decided = kind->avalanche ? ca->gain_m == r->gain_m : ca->excess_f == r->fano;
		if (!decided || !sch_pattern_match(p, ca->name, strlen(ca->name)))
			continue;
		if (n < 4)
			snprintf(list + strlen(list), sizeof(list) - strlen(list), "%s'%s'", n ? ", " : "", ca->name);
		n++;
	}
	if (n > 4)
		snprintf(list + strlen(list), sizeof(list) - strlen(list), " and %zu more", n - 4);
	if (n == 0)
		return SCH_OK;
	if (kind->avalanche)
		snprintf(what, sizeof(what),
			 "avalanche gain M = %g, ionisation ratio k = %g, excess noise F(M) = %.4g (McIntyre), density "
			 "2q*I*M*F(M) with I the netlist's terminal (multiplied) current",
			 r->gain_m, r->k_ratio, r->gain_m * r->k_ratio + (1 - r->k_ratio) * (2 - 1 / r->gain_m));
	else
		snprintf(what, sizeof(what), "Fano factor F = %g, density 2q*I*F (for frequencies well below I/q)", r->fano);
	return sch_analysis_note(an, sch_arena_printf(&res->arena, "%s '%s' on %s: %s", kind->option, r->regex, list,
						      what));
}

/* Runs check (refusal) or note over every rule of one kind. */
static enum sch_err each_rule(struct sch_analysis *an, const struct rule_kind *kind, bool notes)
{
	enum sch_err ret = SCH_OK;

	for (size_t k = 0; k < kind->n && ret == SCH_OK; k++) {
		struct sch_pattern *p = NULL;
		const struct sch_gain_rule *r = &kind->rules[k];
		if ((ret = sch_pattern_compile(&p, r->regex, SCH_PAT_CASELESS | SCH_PAT_WHOLE, kind->option, an->d)) !=
		    SCH_OK)
			break;
		ret = notes ? note_rule(an, kind, r, p) : refuse_diode_rule(an->res, kind, r, p, an->d);
		sch_pattern_free(p);
	}
	return ret;
}

static enum sch_err all_rules(struct sch_analysis *an, bool notes)
{
	const struct sch_carrier_options *co = &an->opt->carriers;
	struct rule_kind avalanche = { "--avalanche", co->avalanche, co->n_avalanche, true };
	struct rule_kind fano = { "--fano", co->fano, co->n_fano, false };
	enum sch_err ret;

	if ((ret = each_rule(an, &avalanche, notes)) != SCH_OK)
		return ret;
	return each_rule(an, &fano, notes);
}

enum sch_err sch_analysis_check_rules(struct sch_analysis *an)
{
	return all_rules(an, false);
}

enum sch_err sch_analysis_note_rules(struct sch_analysis *an)
{
	return all_rules(an, true);
}

double sch_analysis_input_gain(const struct sch_result *res)
{
	for (size_t c = 0; res->input && c < res->set.n_carriers; c++) {
		const struct sch_carrier *ca = &res->set.carriers[c];
		if (strcasecmp(ca->name, res->input) == 0)
			return ca->gain_m > 0 ? ca->gain_m : 1;
	}
	return 1;
}
