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
	int amp_def;      /* the amplifier-shaped definition the element sits in (any depth), -1 for none */
	const char *amp_name;
	int amp_ports, amp_controlled;
};

/* Per definition: its own ports and controlled sources, and the amplifier-shaped one it sits in. */
struct amp_shapes {
	int *n_controlled;
	int *within;      /* -1, or the amplifier-shaped definition every use of this one is inside */
};

static bool is_controlled_source(char letter)
{
	return letter == 'e' || letter == 'f' || letter == 'g' || letter == 'h' || letter == 'b';
}

/*
 * Fills shapes: a definition of amplifier shape is within itself; one used only inside such
 * definitions (all its X instances) is within the first of them. Fixed point over the X
 * elements, one nesting level per pass. SCH_ERR_NOMEM on failure.
 */
static enum sch_err find_amp_shapes(const struct sch_deck *deck, struct sch_arena *arena, struct amp_shapes *sh)
{
	size_t n = deck->n_subckts;

	sh->n_controlled = sch_arena_alloc(arena, (n + 1) * sizeof(int));
	sh->within = sch_arena_alloc(arena, (n + 1) * sizeof(int));
	if (!sh->n_controlled || !sh->within)
		return SCH_ERR_NOMEM;
	memset(sh->n_controlled, 0, (n + 1) * sizeof(int));
	for (size_t k = 0; k < deck->n_elements; k++)
		if (deck->elements[k].subckt >= 0 && is_controlled_source(deck->elements[k].letter))
			sh->n_controlled[deck->elements[k].subckt]++;
	for (size_t s = 0; s < n; s++)
		sh->within[s] = deck->subckts[s].n_ports >= SCH_AMP_SHAPE_MIN_PORTS &&
						sh->n_controlled[s] >= SCH_AMP_SHAPE_MIN_CONTROLLED
					? (int)s
					: -1;
	for (size_t pass = 0; pass <= n; pass++) {
		bool changed = false;

		for (size_t s = 0; s < n; s++) {
			int first = -1;
			bool all = true, any = false;

			if (sh->within[s] >= 0)
				continue;
			for (size_t k = 0; k < deck->n_elements && all; k++) {
				const struct sch_element *x = &deck->elements[k];
				const char *sub = x->letter == 'x' ? sch_deck_x_subckt(deck, x) : NULL;

				if (!sub || sch_deck_find_subckt(deck, sub) != (int)s)
					continue;
				any = true;
				all = x->subckt >= 0 && sh->within[x->subckt] >= 0;
				if (all && first < 0)
					first = sh->within[x->subckt];
			}
			if (any && all) {
				sh->within[s] = first;
				changed = true;
			}
		}
		if (!changed)
			break;
	}
	return SCH_OK;
}

/* Most --avalanche and --fano rules one run takes, each. */
#define MAX_GAIN_RULES 64

/* The compiled rules of one sch_carriers_find call; every pattern NULL until compiled. */
struct rules {
	const struct sch_carrier_options *opt;
	struct sch_pattern *name_rule, *add, *ignore;
	struct sch_pattern *aval[MAX_GAIN_RULES], *fano[MAX_GAIN_RULES];
	size_t n_aval, n_fano;
};

/* Compiles the default name rule and the user's regexes, in the order their errors are reported. */
static enum sch_err rules_compile(struct rules *ru, const struct sch_carrier_options *opt, struct sch_diag *d)
{
	enum sch_err ret;

	memset(ru, 0, sizeof(*ru));
	ru->opt = opt;
	ru->n_aval = opt ? opt->n_avalanche : 0;
	ru->n_fano = opt ? opt->n_fano : 0;
	ret = sch_pattern_compile(&ru->name_rule, SCH_DEFAULT_CARRIER_REGEX, SCH_PAT_CASELESS | SCH_PAT_WHOLE,
				  "default carrier rule", d);
	if (ret == SCH_OK && opt && opt->carrier_regex)
		ret = sch_pattern_compile(&ru->add, opt->carrier_regex, SCH_PAT_CASELESS | SCH_PAT_WHOLE, "--carrier", d);
	if (ret == SCH_OK && opt && opt->ignore_regex)
		ret = sch_pattern_compile(&ru->ignore, opt->ignore_regex, SCH_PAT_CASELESS | SCH_PAT_WHOLE, "--ignore", d);
	if (ret == SCH_OK && (ru->n_aval > MAX_GAIN_RULES || ru->n_fano > MAX_GAIN_RULES))
		ret = sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "too many --avalanche or --fano rules");
	if (ret == SCH_OK)
		ret = compile_rules(opt ? opt->avalanche : NULL, ru->n_aval, ru->aval, "--avalanche", d);
	if (ret == SCH_OK)
		ret = compile_rules(opt ? opt->fano : NULL, ru->n_fano, ru->fano, "--fano", d);
	return ret;
}

static void rules_release(struct rules *ru)
{
	free_rules(ru->aval, ru->n_aval <= MAX_GAIN_RULES ? ru->n_aval : 0);
	free_rules(ru->fano, ru->n_fano <= MAX_GAIN_RULES ? ru->n_fano : 0);
	sch_pattern_free(ru->name_rule);
	sch_pattern_free(ru->add);
	sch_pattern_free(ru->ignore);
}

/* Per element: whether it forces a current, its paired diode, the name rule's verdict. NULL when out of memory. */
static struct elem_info *classify_elements(const struct sch_deck *deck, struct sch_arena *arena,
					   const struct rules *ru, struct sch_strmap *pairs)
{
	struct elem_info *info = sch_arena_alloc(arena, (deck->n_elements + 1) * sizeof(*info));
	struct amp_shapes sh;

	if (!info || index_diodes(deck, arena, pairs) != SCH_OK || find_amp_shapes(deck, arena, &sh) != SCH_OK)
		return NULL;
	for (size_t k = 0; k < deck->n_elements; k++) {
		const struct sch_element *e = &deck->elements[k];
		info[k].current = is_current_element(e);
		info[k].amp_def = e->subckt >= 0 ? sh.within[e->subckt] : -1;
		if (info[k].amp_def >= 0) {
			info[k].amp_name = deck->subckts[info[k].amp_def].name;
			info[k].amp_ports = deck->subckts[info[k].amp_def].n_ports;
			info[k].amp_controlled = sh.n_controlled[info[k].amp_def];
		}
		if (!info[k].current)
			continue;
		info[k].diode = paired_diode(deck, arena, pairs, e);
		info[k].name_rule = sch_pattern_match(ru->name_rule, e->name, strlen(e->name));
	}
	return info;
}

/* Room for every current-forcing instance in both lists. SCH_ERR_NOMEM on failure. */
static enum sch_err alloc_lists(struct sch_carrier_set *set, const struct elem_info *info, struct sch_arena *arena)
{
	size_t n_cur = 0;

	for (size_t k = 0; k < set->n_instances; k++) {
		if (info[set->instances[k].element].current)
			n_cur++;
	}
	set->carriers = sch_arena_alloc(arena, (n_cur + 1) * sizeof(*set->carriers));
	set->noiseless = sch_arena_alloc(arena, (n_cur + 1) * sizeof(*set->noiseless));
	return set->carriers && set->noiseless ? SCH_OK : SCH_ERR_NOMEM;
}

/* The first gain rule whose regex matches path, or NULL. */
static const struct sch_gain_rule *first_rule(struct sch_pattern *const *pats, const struct sch_gain_rule *rules,
					      size_t n, const char *path, size_t plen)
{
	for (size_t r = 0; r < n; r++) {
		if (sch_pattern_match(pats[r], path, plen))
			return &rules[r];
	}
	return NULL;
}

/* Why an instance is a carrier (SCH_WHY_* bits, 0 when it is none or --ignore names it); the gain rules it takes. */
static unsigned instance_why(const struct rules *ru, const struct elem_info *ei, const char *path,
			     const struct sch_gain_rule **aval, const struct sch_gain_rule **fano)
{
	size_t plen = strlen(path);
	unsigned why = 0;

	if (ei->diode && ei->amp_def < 0)
		why |= SCH_WHY_DIODE;
	if (ei->name_rule)
		why |= SCH_WHY_NAME;
	if (ru->add && sch_pattern_match(ru->add, path, plen))
		why |= SCH_WHY_OPTION;
	*aval = first_rule(ru->aval, ru->n_aval ? ru->opt->avalanche : NULL, ru->n_aval, path, plen);
	*fano = first_rule(ru->fano, ru->n_fano ? ru->opt->fano : NULL, ru->n_fano, path, plen);
	if (*aval)
		why |= SCH_WHY_AVALANCHE;
	if (*fano)
		why |= SCH_WHY_FANO;
	if (ru->ignore && sch_pattern_match(ru->ignore, path, plen))
		why = 0;
	return why;
}

/* The reason text of a carrier: one clause per bit of why, "; " between them. */
static void write_reason(char *reason, size_t size, unsigned why, const struct sch_instance *in,
			 const struct elem_info *ei, const struct rules *ru, const struct sch_gain_rule *aval,
			 const struct sch_gain_rule *fano)
{
	if (why & SCH_WHY_DIODE) {
		/* the diode's hierarchical name: this instance's prefix plus the diode's own name */
		const char *dot = strrchr(in->path, '.');
		snprintf(reason + strlen(reason), size - strlen(reason), "%sacross diode %.*s%s%s",
			 *reason ? "; " : "", dot ? (int)(dot - in->path) : 0, in->path, dot ? "." : "",
			 ei->diode->name);
	}
	if (why & SCH_WHY_NAME)
		snprintf(reason + strlen(reason), size - strlen(reason), "%sname '%s' reads as a detector current",
			 *reason ? "; " : "", leaf_name(in->path));
	if (why & SCH_WHY_OPTION)
		snprintf(reason + strlen(reason), size - strlen(reason), "%s--carrier '%s'",
			 *reason ? "; " : "", ru->opt->carrier_regex);
	if (why & SCH_WHY_AVALANCHE)
		snprintf(reason + strlen(reason), size - strlen(reason), "%s--avalanche '%s'",
			 *reason ? "; " : "", aval->regex);
	if (why & SCH_WHY_FANO)
		snprintf(reason + strlen(reason), size - strlen(reason), "%s--fano '%s'",
			 *reason ? "; " : "", fano->regex);
}

/* Why a current element across a diode inside an amplifier-shaped subcircuit is no carrier. */
static enum sch_err construct_reason(struct sch_source *s, struct sch_arena *arena, const struct sch_instance *in,
				     const struct elem_info *ei)
{
	const char *dot = strrchr(in->path, '.');

	s->reason = sch_arena_printf(arena,
		"across diode %.*s%s%s in amplifier-shaped '%s' (%d ports, %d controlled sources): "
		"a bias, clamp or offset construct",
		dot ? (int)(dot - in->path) : 0, in->path, dot ? "." : "", ei->diode->name, ei->amp_name, ei->amp_ports,
		ei->amp_controlled);
	return s->reason ? SCH_OK : SCH_ERR_NOMEM;
}

/* Files instance k as a carrier or as noiseless (current-forcing instances only). SCH_ERR_NOMEM on failure. */
static enum sch_err sort_instance(struct sch_carrier_set *set, struct sch_arena *arena, const struct rules *ru,
				  const struct elem_info *info, size_t k)
{
	const struct sch_instance *in = &set->instances[k];
	const struct elem_info *ei = &info[in->element];
	const struct sch_gain_rule *aval, *fano;
	char reason[512] = "";
	struct sch_carrier *c;
	unsigned why;

	if (!ei->current)
		return SCH_OK;
	why = instance_why(ru, ei, in->path, &aval, &fano);
	if (!why) {
		struct sch_source *s = &set->noiseless[set->n_noiseless++];
		s->name = in->path;
		s->sim_name = in->sim_name;
		s->element = in->element;
		s->dc_current_a = NAN;
		s->reason = NULL;
		if (ei->diode && ei->amp_def >= 0 && !(ru->ignore && sch_pattern_match(ru->ignore, in->path, strlen(in->path))))
			return construct_reason(s, arena, in, ei);
		return SCH_OK;
	}
	write_reason(reason, sizeof(reason), why, in, ei, ru, aval, fano);
	c = &set->carriers[set->n_carriers++];
	c->name = in->path;
	c->sim_name = in->sim_name;
	c->element = in->element;
	c->instance = (int)k;
	c->why = why;
	c->reason = sch_arena_strdup(arena, reason);
	c->gain_m = aval ? aval->gain_m : 1.0;
	c->excess_f = (aval ? sch_mcintyre_f(aval->gain_m, aval->k_ratio) : 1.0) * (fano ? fano->fano : 1.0);
	c->dc_current_a = NAN;
	return c->reason ? SCH_OK : SCH_ERR_NOMEM;
}

enum sch_err sch_carriers_find(const struct sch_deck *deck, const struct sch_carrier_options *opt,
			       struct sch_arena *arena, struct sch_carrier_set *set, struct sch_diag *d)
{
	enum sch_err ret;
	struct rules ru;
	struct elem_info *info;
	struct sch_strmap pairs;

	memset(set, 0, sizeof(*set));
	sch_strmap_init(&pairs);
	ret = rules_compile(&ru, opt, d);
	if (ret != SCH_OK)
		goto out;
	ret = sch_deck_instances(deck, arena, &set->instances, &set->n_instances, d);
	if (ret != SCH_OK)
		goto out;
	ret = SCH_ERR_NOMEM;
	info = classify_elements(deck, arena, &ru, &pairs);
	if (!info || alloc_lists(set, info, arena) != SCH_OK)
		goto out;
	for (size_t k = 0; k < set->n_instances; k++) {
		if (sort_instance(set, arena, &ru, info, k) != SCH_OK)
			goto out;
	}
	ret = SCH_OK;
out:
	sch_strmap_release(&pairs);
	rules_release(&ru);
	return ret;
}
