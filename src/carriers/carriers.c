/* SPDX-License-Identifier: BSD-3-Clause */
/* carriers.c - the carrier finder: diode pairing, the name rule and the user's regexes, per instance. */
#include <ctype.h>
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <string.h>
#include "schrot/carriers.h"
#include "schrot/physics.h"
#include "schrot/si.h"
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

/* The time-dependent source function token t starts ("pulse(...)", "sin", ...), upper case; NULL for none. */
static const char *time_function(const char *t)
{
	static const char *const fns[] = { "pulse", "sin", "exp", "pwl", "sffm", "am", "trrandom", "trnoise" };
	static const char *const names[] = { "PULSE", "SIN", "EXP", "PWL", "SFFM", "AM", "TRRANDOM", "TRNOISE" };
	for (size_t k = 0; k < sizeof(fns) / sizeof(fns[0]); k++) {
		size_t n = strlen(fns[k]);
		if (strncmp(t, fns[k], n) == 0 && (t[n] == '\0' || t[n] == '('))
			return names[k];
	}
	return NULL;
}

static bool is_time_function(const char *t)
{
	return time_function(t) != NULL;
}

/* The time function of an I element's value, NULL when it has none. */
static const char *element_time_function(const struct sch_element *e)
{
	for (int j = 2; e->letter == 'i' && j < e->n_tok; j++) {
		const char *fn = time_function(e->tok[j]);
		if (fn)
			return fn;
	}
	return NULL;
}

/*
 * True for an I element whose netlist value carries no DC current: no value, "dc 0", a bare 0, or
 * only an AC value ("itest 0 in ac 1"), and no time function (PULSE, SIN, ...: their DC value is
 * the function's value at the operating point). An expression ("{ip}") may be anything: false.
 */
static bool without_dc(const struct sch_element *e)
{
	const char *const *t = e->tok + 2;
	int n = e->n_tok - 2, k = 0;
	double v = 0;

	if (e->letter != 'i')
		return false;
	for (int j = 0; j < n; j++) {
		if (is_time_function(t[j]))
			return false;
		if (strcmp(t[j], "dc") == 0)
			k = j + 1; /* "ac 1 dc 2n": the DC value may come anywhere */
	}
	if (k >= n || strcmp(t[k], "ac") == 0 || strncmp(t[k], "ac=", 3) == 0)
		return true;
	return sch_si_parse(t[k], &v) == SCH_OK && v == 0;
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
	const struct sch_element *self;
	const struct sch_element *diode;
	bool name_rule;
	bool current;
	bool without_dc;  /* an I element whose netlist value has no DC current */
};

/* Which definitions are amplifier-shaped, and how to follow an instance path through X elements. */
struct amp_index {
	const struct sch_deck *deck;
	int *n_controlled;          /* per definition: its own E F G H B elements */
	bool *amp;                  /* per definition: amplifier-shaped */
	bool any;                   /* some definition is */
	int *xdef;                  /* per element: the definition an X element instantiates, -1 */
	struct sch_strmap scoped;   /* "scope name" of every X element -> element index (only when any) */
};

static bool is_controlled_source(char letter)
{
	return letter == 'e' || letter == 'f' || letter == 'g' || letter == 'h' || letter == 'b';
}

/* The definition each X element instantiates (-1 for other elements), names looked up once each. */
static int *x_definitions(const struct sch_deck *deck, struct sch_arena *arena)
{
	int *def = sch_arena_alloc(arena, (deck->n_elements + 1) * sizeof(int));
	struct sch_strmap seen;

	if (!def)
		return NULL;
	sch_strmap_init(&seen);
	for (size_t k = 0; k < deck->n_elements; k++) {
		const char *sub = deck->elements[k].letter == 'x' ? sch_deck_x_subckt(deck, &deck->elements[k]) : NULL;
		int got;

		def[k] = -1;
		if (!sub)
			continue;
		got = sch_strmap_get(&seen, sub, strlen(sub));
		if (got == -1) {
			got = sch_deck_find_subckt(deck, sub);
			if (sch_strmap_put(&seen, sub, strlen(sub), got < 0 ? -2 : got) != SCH_OK) {
				def = NULL;
				break;
			}
		}
		def[k] = got < 0 ? -1 : got;
	}
	sch_strmap_release(&seen);
	return def;
}

/* Fills ix (its map initialised by the caller). SCH_ERR_NOMEM on failure. */
static enum sch_err amp_index_build(const struct sch_deck *deck, struct sch_arena *arena, struct amp_index *ix)
{
	size_t n = deck->n_subckts;

	ix->deck = deck;
	ix->n_controlled = sch_arena_alloc(arena, (n + 1) * sizeof(int));
	ix->amp = sch_arena_alloc(arena, (n + 1) * sizeof(bool));
	if (!ix->n_controlled || !ix->amp)
		return SCH_ERR_NOMEM;
	memset(ix->n_controlled, 0, (n + 1) * sizeof(int));
	for (size_t k = 0; k < deck->n_elements; k++)
		if (deck->elements[k].subckt >= 0 && is_controlled_source(deck->elements[k].letter))
			ix->n_controlled[deck->elements[k].subckt]++;
	for (size_t s = 0; s < n; s++) {
		ix->amp[s] = deck->subckts[s].n_ports >= SCH_AMP_SHAPE_MIN_PORTS &&
			     ix->n_controlled[s] >= SCH_AMP_SHAPE_MIN_CONTROLLED;
		ix->any = ix->any || ix->amp[s];
	}
	if (!ix->any)
		return SCH_OK;
	if (!(ix->xdef = x_definitions(deck, arena)))
		return SCH_ERR_NOMEM;
	for (size_t k = 0; k < deck->n_elements; k++) {
		const char *key;

		if (ix->xdef[k] < 0)
			continue;
		key = sch_arena_printf(arena, "%d %s", deck->elements[k].subckt, deck->elements[k].name);
		if (!key || sch_strmap_put(&ix->scoped, key, strlen(key), (int)k) != SCH_OK)
			return SCH_ERR_NOMEM;
	}
	return SCH_OK;
}

/*
 * The outermost amplifier-shaped definition on an instance's path ("xop.x1.iclp": the
 * definitions of xop, then of xop's x1), or -1.
 */
static int instance_amp(const struct amp_index *ix, const char *path)
{
	int scope = -1;
	const char *dot;

	if (!ix->any)
		return -1;
	while ((dot = strchr(path, '.')) != NULL) {
		char key[512];
		int n = snprintf(key, sizeof(key), "%d %.*s", scope, (int)(dot - path), path), k;

		if (n < 0 || (size_t)n >= sizeof(key) || (k = sch_strmap_get(&ix->scoped, key, (size_t)n)) < 0)
			return -1;
		scope = ix->xdef[k];
		if (scope < 0)
			return -1;
		if (ix->amp[scope])
			return scope;
		path = dot + 1;
	}
	return -1;
}

/* Most --avalanche and --fano rules one run takes, each. */
#define MAX_GAIN_RULES 64

/* The compiled rules of one sch_carriers_find call; every pattern NULL until compiled. */
struct rules {
	const struct sch_carrier_options *opt;
	struct sch_pattern *name_rule, *add, *ignore;
	struct sch_pattern *aval[MAX_GAIN_RULES], *fano[MAX_GAIN_RULES];
	size_t n_aval, n_fano;
	struct amp_index amp;
};

/* Compiles the default name rule and the user's regexes, in the order their errors are reported. */
static enum sch_err rules_compile(struct rules *ru, const struct sch_carrier_options *opt, struct sch_diag *d)
{
	enum sch_err ret;

	memset(ru, 0, sizeof(*ru));
	sch_strmap_init(&ru->amp.scoped);
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
	sch_strmap_release(&ru->amp.scoped);
}

/* Per element: whether it forces a current, its paired diode, the name rule's verdict. NULL when out of memory. */
static struct elem_info *classify_elements(const struct sch_deck *deck, struct sch_arena *arena,
					   const struct rules *ru, struct sch_strmap *pairs)
{
	struct elem_info *info = sch_arena_alloc(arena, (deck->n_elements + 1) * sizeof(*info));

	if (!info || index_diodes(deck, arena, pairs) != SCH_OK)
		return NULL;
	for (size_t k = 0; k < deck->n_elements; k++) {
		const struct sch_element *e = &deck->elements[k];
		info[k].self = e;
		info[k].current = is_current_element(e);
		if (!info[k].current)
			continue;
		info[k].diode = paired_diode(deck, arena, pairs, e);
		info[k].without_dc = without_dc(e);
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
static unsigned instance_why(const struct rules *ru, const struct elem_info *ei, const char *path, int amp,
			     const struct sch_gain_rule **aval, const struct sch_gain_rule **fano)
{
	size_t plen = strlen(path);
	unsigned why = 0;

	if (ei->diode && amp < 0)
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
	/* a source with no DC current (an AC test source across a diode) carries no shot noise unless named */
	if (ei->without_dc && !(ru->opt && ru->opt->swept && strcmp(ru->opt->swept, path) == 0))
		why &= ~(unsigned)(SCH_WHY_DIODE | SCH_WHY_NAME);
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
				     const struct elem_info *ei, const struct amp_index *ix, int amp)
{
	const char *dot = strrchr(in->path, '.');

	s->reason = sch_arena_printf(arena,
		"across diode %.*s%s%s in amplifier-shaped '%s' (%d ports, %d controlled sources): "
		"a bias, clamp or offset construct",
		dot ? (int)(dot - in->path) : 0, in->path, dot ? "." : "", ei->diode->name, ix->deck->subckts[amp].name,
		ix->deck->subckts[amp].n_ports, ix->n_controlled[amp]);
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
	int amp = ei->diode ? instance_amp(&ru->amp, in->path) : -1;

	why = instance_why(ru, ei, in->path, amp, &aval, &fano);
	if (!why) {
		struct sch_source *s = &set->noiseless[set->n_noiseless++];
		s->name = in->path;
		s->sim_name = in->sim_name;
		s->element = in->element;
		s->dc_current_a = NAN;
		s->reason = NULL;
		if (amp >= 0 && !(ru->ignore && sch_pattern_match(ru->ignore, in->path, strlen(in->path))))
			return construct_reason(s, arena, in, ei, &ru->amp, amp);
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
	c->time_function = element_time_function(ei->self);
	return c->reason ? SCH_OK : SCH_ERR_NOMEM;
}

/* Edit distance between a and b (lower case, at most 63 characters of each counted). */
static size_t edit_distance(const char *a, const char *b)
{
	size_t la = strlen(a), lb = strlen(b);
	size_t row[64];

	la = la > 63 ? 63 : la;
	lb = lb > 63 ? 63 : lb;
	for (size_t j = 0; j <= lb; j++)
		row[j] = j;
	for (size_t i = 1; i <= la; i++) {
		size_t diag = row[0];
		row[0] = i;
		for (size_t j = 1; j <= lb; j++) {
			size_t up = row[j];
			size_t cost = tolower((unsigned char)a[i - 1]) != tolower((unsigned char)b[j - 1]);
			size_t best = diag + cost;
			if (up + 1 < best)
				best = up + 1;
			if (row[j - 1] + 1 < best)
				best = row[j - 1] + 1;
			row[j] = best;
			diag = up;
		}
	}
	return row[lb];
}

/* The rule's text as a name: regex escapes and anchors dropped ("x1\.iph$" reads "x1.iph"). */
static void plain_text(const char *regex, char *out, size_t size)
{
	size_t n = 0;
	for (const char *p = regex; *p && n + 1 < size; p++) {
		if (*p != '\\' && *p != '^' && *p != '$')
			out[n++] = *p;
	}
	out[n] = '\0';
}

/* How far a current element's name is from what the user typed: its whole name or its own name. */
static size_t name_distance(const char *typed, const char *path)
{
	size_t whole = edit_distance(typed, path), leaf = edit_distance(typed, leaf_name(path));
	return leaf < whole ? leaf : whole;
}

/* Up to three current-element names closest to the typed pattern, "'a', 'b' or 'c'" into out. */
static void closest_names(const struct sch_carrier_set *set, const struct elem_info *info, const char *regex,
			  char *out, size_t size)
{
	const char *best[3] = { NULL, NULL, NULL };
	size_t best_d[3] = { SIZE_MAX, SIZE_MAX, SIZE_MAX };
	char typed[128];
	size_t n = 0;

	plain_text(regex, typed, sizeof(typed));
	for (size_t k = 0; k < set->n_instances; k++) {
		const char *path = set->instances[k].path;
		size_t dist;
		if (!info[set->instances[k].element].current)
			continue;
		dist = name_distance(typed, path);
		for (size_t b = 0; b < 3; b++) {
			if (dist < best_d[b]) {
				for (size_t m = 2; m > b; m--) {
					best[m] = best[m - 1];
					best_d[m] = best_d[m - 1];
				}
				best[b] = path;
				best_d[b] = dist;
				break;
			}
		}
	}
	out[0] = '\0';
	for (size_t b = 0; b < 3 && best[b]; b++)
		n++;
	for (size_t b = 0; b < n; b++)
		snprintf(out + strlen(out), size - strlen(out), "%s'%s'", b == 0 ? "" : b + 1 == n ? " or " : ", ",
			 best[b]);
}

/*
 * The current element across diode instance k (same enclosing instance), for a rule that names the
 * diode rather than its current; NULL if none.
 */
static const char *current_across(const struct sch_carrier_set *set, const struct elem_info *info, size_t k)
{
	const struct sch_instance *dio = &set->instances[k];
	for (size_t j = 0; j < set->n_instances; j++) {
		const struct sch_instance *in = &set->instances[j];
		const struct elem_info *ei = &info[in->element];
		if (ei->current && ei->diode && in->parent == dio->parent && ei->diode == info[dio->element].self)
			return in->path;
	}
	return NULL;
}

/*
 * A rule whose pattern matches no current element would do nothing: SCH_ERR_USAGE naming the
 * pattern and what to write instead (the current across a diode it names, or the closest names).
 */
static enum sch_err check_matches(const struct sch_carrier_set *set, const struct elem_info *info,
				  const struct sch_pattern *pat, const char *what, const char *regex, const char *value,
				  struct sch_diag *d)
{
	char names[512];
	long other = -1, leaf = -1;

	for (size_t k = 0; k < set->n_instances; k++) {
		const char *path = set->instances[k].path;
		if (!info[set->instances[k].element].current) {
			if (other < 0 && sch_pattern_match(pat, path, strlen(path)))
				other = (long)k;
			continue;
		}
		if (sch_pattern_match(pat, path, strlen(path)))
			return SCH_OK;
		if (leaf < 0 && sch_pattern_match(pat, leaf_name(path), strlen(leaf_name(path))))
			leaf = (long)k;
	}
	if (other >= 0) {
		const char *across = current_across(set, info, (size_t)other);
		const struct sch_instance *in = &set->instances[other];
		if (across)
			return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
					      "%s pattern '%s' names the diode '%s', not a current: the rule belongs to "
					      "the current source across it, '%s' (use %s '%s%s')",
					      what, regex, in->path, across, what, across, value);
		snprintf(names, sizeof(names), ", only %s", in->path);
	} else {
		names[0] = '\0';
	}
	if (leaf >= 0)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "%s pattern '%s' matches no current element: patterns match the whole "
				      "hierarchical name, such as '%s' (try 'schrot carriers NETLIST')",
				      what, regex, set->instances[leaf].path);
	{
		char closest[400];
		closest_names(set, info, regex, closest, sizeof(closest));
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "%s pattern '%s' matches no current element (I, G, F or B with i=)%s; %s%s "
				      "(try 'schrot carriers NETLIST')",
				      what, regex, names, *closest ? "closest: " : "the netlist has none", closest);
	}
}

/* Every --carrier, --ignore, --avalanche and --fano pattern names at least one current element. */
static enum sch_err check_rules(const struct sch_carrier_set *set, const struct elem_info *info,
				const struct rules *ru, struct sch_diag *d)
{
	enum sch_err ret = SCH_OK;

	char value[96];

	if (ru->add)
		ret = check_matches(set, info, ru->add, "--carrier", ru->opt->carrier_regex, "", d);
	if (ret == SCH_OK && ru->ignore)
		ret = check_matches(set, info, ru->ignore, "--ignore", ru->opt->ignore_regex, "", d);
	for (size_t r = 0; ret == SCH_OK && r < ru->n_aval; r++) {
		snprintf(value, sizeof(value), "=%g:%g", ru->opt->avalanche[r].gain_m, ru->opt->avalanche[r].k_ratio);
		ret = check_matches(set, info, ru->aval[r], "--avalanche", ru->opt->avalanche[r].regex, value, d);
	}
	for (size_t r = 0; ret == SCH_OK && r < ru->n_fano; r++) {
		snprintf(value, sizeof(value), "=%g", ru->opt->fano[r].fano);
		ret = check_matches(set, info, ru->fano[r], "--fano", ru->opt->fano[r].regex, value, d);
	}
	return ret;
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
	if (!info || amp_index_build(deck, arena, &ru.amp) != SCH_OK || alloc_lists(set, info, arena) != SCH_OK)
		goto out;
	for (size_t k = 0; k < set->n_instances; k++) {
		if (sort_instance(set, arena, &ru, info, k) != SCH_OK)
			goto out;
	}
	ret = check_rules(set, info, &ru, d);
out:
	sch_strmap_release(&pairs);
	rules_release(&ru);
	return ret;
}
