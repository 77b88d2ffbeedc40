/* SPDX-License-Identifier: BSD-3-Clause */
/* carriers.c - the carrier finder: diode pairing, the name rule and the user's regexes, per instance. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "schrot/carriers.h"
#include "schrot/physics.h"
#include "schrot/strmap.h"

/* True for elements that force a current: I; G; F; B with i=. */
static bool is_current_element(const struct sch_element *e)
{
	if (e->letter == 'i' || e->letter == 'g' || e->letter == 'f')
		return true;
	if (e->letter == 'b') {
		for (int k = 0; k < e->n_tok; k++) {
			if (strncmp(e->tok[k], "i=", 2) == 0)
				return true;
		}
	}
	return false;
}

static const char *leaf_name(const char *path)
{
	const char *dot = strrchr(path, '.');
	return dot ? dot + 1 : path;
}

/*
 * The key of an unordered node pair in one definition: "scope a b" with the two nodes sorted, so
 * that a diode and a current element across the same nodes (either order) meet. NULL when out of
 * memory or when the element has fewer than two nodes.
 */
static const char *pair_key(struct sch_arena *arena, const struct sch_deck *deck, const struct sch_element *e)
{
	const char *const *n;
	int swap;

	if (sch_deck_element_nodes(deck, e, &n) < 2)
		return NULL;
	swap = strcmp(n[0], n[1]) > 0;
	return sch_arena_printf(arena, "%d %s %s", e->subckt, n[swap], n[!swap]);
}

/* Maps each diode's node pair to the diode (the first one across a pair wins). */
static enum sch_err index_diodes(const struct sch_deck *deck, struct sch_arena *arena, struct sch_strmap *pairs)
{
	for (size_t k = 0; k < deck->n_elements; k++) {
		const char *key;
		if (deck->elements[k].letter != 'd' || !(key = pair_key(arena, deck, &deck->elements[k])))
			continue;
		if (sch_strmap_get(pairs, key, strlen(key)) < 0 &&
		    sch_strmap_put(pairs, key, strlen(key), (int)k) != SCH_OK)
			return SCH_ERR_NOMEM;
	}
	return SCH_OK;
}

/* A diode in the same definition whose two nodes are the element's two nodes; NULL if none. */
static const struct sch_element *paired_diode(const struct sch_deck *deck, struct sch_arena *arena,
					      const struct sch_strmap *pairs, const struct sch_element *e)
{
	const char *key = pair_key(arena, deck, e);
	int d = key ? sch_strmap_get(pairs, key, strlen(key)) : -1;

	return d >= 0 ? &deck->elements[d] : NULL;
}

/* Compiles each rule's regex (whole name, caseless) into pats[]. */
static enum sch_err compile_rules(const struct sch_gain_rule *rules, size_t n, struct sch_pattern **pats,
				  const char *what, struct sch_diag *d)
{
	for (size_t k = 0; k < n; k++) {
		enum sch_err ret = sch_pattern_compile(&pats[k], rules[k].regex, SCH_PAT_CASELESS | SCH_PAT_WHOLE, what, d);
		if (ret != SCH_OK)
			return ret;
	}
	return SCH_OK;
}

static void free_rules(struct sch_pattern **pats, size_t n)
{
	for (size_t k = 0; k < n; k++)
		sch_pattern_free(pats[k]);
}

const char *sch_carriers_current_quantity(struct sch_arena *arena, char letter, const char *sim_name)
{
	return sch_arena_printf(arena, "@%s[%s]", sim_name, letter == 'i' ? "current" : "i");
}

double sch_carrier_gain(const struct sch_carrier *c)
{
	return c->gain_m * c->excess_f;
}

/* The diode-pairing result per element, computed once per definition rather than per instance. */
struct elem_info {
	const struct sch_element *diode;
	bool name_rule;
	bool current;
};

enum sch_err sch_carriers_find(const struct sch_deck *deck, const struct sch_carrier_options *opt,
			       struct sch_arena *arena, struct sch_carrier_set *set, struct sch_diag *d)
{
	enum sch_err ret;
	struct sch_pattern *name_rule = NULL, *add = NULL, *ignore = NULL;
	struct elem_info *info = NULL;
	struct sch_strmap pairs;
	struct sch_pattern *aval_pat[64] = { NULL }, *fano_pat[64] = { NULL };
	size_t n_aval = opt ? opt->n_avalanche : 0, n_fano = opt ? opt->n_fano : 0;
	size_t n_cur = 0;

	memset(set, 0, sizeof(*set));
	sch_strmap_init(&pairs);
	ret = sch_pattern_compile(&name_rule, SCH_DEFAULT_CARRIER_REGEX, SCH_PAT_CASELESS | SCH_PAT_WHOLE,
				  "default carrier rule", d);
	if (ret != SCH_OK)
		goto out;
	if (opt && opt->carrier_regex) {
		ret = sch_pattern_compile(&add, opt->carrier_regex, SCH_PAT_CASELESS | SCH_PAT_WHOLE, "--carrier", d);
		if (ret != SCH_OK)
			goto out;
	}
	if (opt && opt->ignore_regex) {
		ret = sch_pattern_compile(&ignore, opt->ignore_regex, SCH_PAT_CASELESS | SCH_PAT_WHOLE, "--ignore", d);
		if (ret != SCH_OK)
			goto out;
	}
	if (n_aval > 64 || n_fano > 64) {
		ret = sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "too many --avalanche or --fano rules");
		goto out;
	}
	if ((ret = compile_rules(opt ? opt->avalanche : NULL, n_aval, aval_pat, "--avalanche", d)) != SCH_OK ||
	    (ret = compile_rules(opt ? opt->fano : NULL, n_fano, fano_pat, "--fano", d)) != SCH_OK)
		goto out;
	ret = sch_deck_instances(deck, arena, &set->instances, &set->n_instances, d);
	if (ret != SCH_OK)
		goto out;

	ret = SCH_ERR_NOMEM;
	info = sch_arena_alloc(arena, (deck->n_elements + 1) * sizeof(*info));
	if (!info)
		goto out;
	if (index_diodes(deck, arena, &pairs) != SCH_OK)
		goto out;
	for (size_t k = 0; k < deck->n_elements; k++) {
		const struct sch_element *e = &deck->elements[k];
		info[k].current = is_current_element(e);
		if (!info[k].current)
			continue;
		info[k].diode = paired_diode(deck, arena, &pairs, e);
		info[k].name_rule = sch_pattern_match(name_rule, e->name, strlen(e->name));
	}
	for (size_t k = 0; k < set->n_instances; k++) {
		if (info[set->instances[k].element].current)
			n_cur++;
	}
	set->carriers = sch_arena_alloc(arena, (n_cur + 1) * sizeof(*set->carriers));
	set->noiseless = sch_arena_alloc(arena, (n_cur + 1) * sizeof(*set->noiseless));
	if (!set->carriers || !set->noiseless)
		goto out;

	for (size_t k = 0; k < set->n_instances; k++) {
		const struct sch_instance *in = &set->instances[k];
		const struct elem_info *ei = &info[in->element];
		size_t plen = strlen(in->path);
		unsigned why = 0;
		char reason[512] = "";
		const struct sch_gain_rule *aval = NULL, *fano = NULL;

		if (!ei->current)
			continue;
		if (ei->diode)
			why |= SCH_WHY_DIODE;
		if (ei->name_rule)
			why |= SCH_WHY_NAME;
		if (add && sch_pattern_match(add, in->path, plen))
			why |= SCH_WHY_OPTION;
		for (size_t r = 0; r < n_aval && !aval; r++) {
			if (sch_pattern_match(aval_pat[r], in->path, plen))
				aval = &opt->avalanche[r];
		}
		for (size_t r = 0; r < n_fano && !fano; r++) {
			if (sch_pattern_match(fano_pat[r], in->path, plen))
				fano = &opt->fano[r];
		}
		if (aval)
			why |= SCH_WHY_AVALANCHE;
		if (fano)
			why |= SCH_WHY_FANO;
		if (ignore && sch_pattern_match(ignore, in->path, plen))
			why = 0;
		if (!why) {
			struct sch_source *s = &set->noiseless[set->n_noiseless++];
			s->name = in->path;
			s->sim_name = in->sim_name;
			s->element = in->element;
			s->dc_current_a = NAN;
			continue;
		}
		if (why & SCH_WHY_DIODE) {
			/* the diode's hierarchical name: this instance's prefix plus the diode's own name */
			const char *dot = strrchr(in->path, '.');
			snprintf(reason + strlen(reason), sizeof(reason) - strlen(reason), "%sacross diode %.*s%s%s",
				 *reason ? "; " : "", dot ? (int)(dot - in->path) : 0, in->path, dot ? "." : "",
				 ei->diode->name);
		}
		if (why & SCH_WHY_NAME)
			snprintf(reason + strlen(reason), sizeof(reason) - strlen(reason), "%sname '%s' reads as a detector current",
				 *reason ? "; " : "", leaf_name(in->path));
		if (why & SCH_WHY_OPTION)
			snprintf(reason + strlen(reason), sizeof(reason) - strlen(reason), "%s--carrier '%s'",
				 *reason ? "; " : "", opt->carrier_regex);
		if (why & SCH_WHY_AVALANCHE)
			snprintf(reason + strlen(reason), sizeof(reason) - strlen(reason), "%s--avalanche '%s'",
				 *reason ? "; " : "", aval->regex);
		if (why & SCH_WHY_FANO)
			snprintf(reason + strlen(reason), sizeof(reason) - strlen(reason), "%s--fano '%s'",
				 *reason ? "; " : "", fano->regex);
		{
			struct sch_carrier *c = &set->carriers[set->n_carriers++];
			c->name = in->path;
			c->sim_name = in->sim_name;
			c->element = in->element;
			c->instance = (int)k;
			c->why = why;
			c->reason = sch_arena_strdup(arena, reason);
			c->gain_m = aval ? aval->gain_m : 1.0;
			c->excess_f = (aval ? sch_mcintyre_f(aval->gain_m, aval->k_ratio) : 1.0) * (fano ? fano->fano : 1.0);
			c->dc_current_a = NAN;
			if (!c->reason)
				goto out;
		}
	}
	ret = SCH_OK;
out:
	sch_strmap_release(&pairs);
	free_rules(aval_pat, n_aval <= 64 ? n_aval : 0);
	free_rules(fano_pat, n_fano <= 64 ? n_fano : 0);
	sch_pattern_free(name_rule);
	sch_pattern_free(add);
	sch_pattern_free(ignore);
	return ret;
}
