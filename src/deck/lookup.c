/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * lookup.c - finding things by name: the name index, subcircuit resolution by scope, binned
 * model names and the lookups of deck.h (models, subcircuits, element nodes).
 */
#include <limits.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "deck_int.h"

/* ---- name index ------------------------------------------------------------------------- */

static size_t hash_name(const char *s, size_t n)
{
	uint64_t h = 1469598103934665603ull;

	for (size_t i = 0; i < n; i++) {
		h ^= (unsigned char)s[i];
		h *= 1099511628211ull;
	}
	return (size_t)(h ^ (h >> 29));
}

enum sch_err sch_names_init(struct sch_names *ix, size_t n)
{
	size_t buckets = 16;

	memset(ix, 0, sizeof(*ix));
	while (buckets < 2 * n && buckets < ((size_t)1 << 30))
		buckets *= 2;
	ix->bucket = malloc(buckets * sizeof(*ix->bucket));
	if (!ix->bucket)
		return SCH_ERR_NOMEM;
	for (size_t i = 0; i < buckets; i++)
		ix->bucket[i] = -1;
	ix->mask = buckets - 1;
	return SCH_OK;
}

enum sch_err sch_names_add(struct sch_names *ix, const char *key, size_t len, int value)
{
	size_t b = hash_name(key, len) & ix->mask;

	if (GROW(ix->e, ix->n, ix->alloc) != SCH_OK)
		return SCH_ERR_NOMEM;
	ix->e[ix->n] = (struct sch_name_entry){ key, len, value, ix->bucket[b] };
	ix->bucket[b] = (int)ix->n;
	ix->n++;
	return SCH_OK;
}

int sch_names_next(const struct sch_names *ix, const char *key, size_t len, int after)
{
	int i;

	if (!ix->bucket)
		return -1;
	i = after < 0 ? ix->bucket[hash_name(key, len) & ix->mask] : ix->e[after].next;
	for (; i >= 0; i = ix->e[i].next)
		if (ix->e[i].len == len && memcmp(ix->e[i].key, key, len) == 0)
			return i;
	return -1;
}

void sch_names_release(struct sch_names *ix)
{
	free(ix->bucket);
	free(ix->e);
	memset(ix, 0, sizeof(*ix));
}

int sch_deck_resolve_subckt(const struct sch_subckt *subckts, const struct sch_names *ix,
			    const char *name, int scope)
{
	size_t len = strlen(name);

	for (int s = scope;; s = subckts[s].parent) {
		int best = -1;

		for (int i = sch_names_next(ix, name, len, -1); i >= 0; i = sch_names_next(ix, name, len, i)) {
			int v = ix->e[i].value;
			if (subckts[v].parent == s && (best < 0 || v < best))
				best = v;
		}
		if (best >= 0)
			return best;
		if (s < 0)
			return -1;
	}
}

/* Length of name without a binning suffix ".<digits>", or 0 when it has none. */
size_t sch_deck_binned_base(const char *name)
{
	const char *dot = strrchr(name, '.');
	const char *p;

	if (!dot || dot == name || !dot[1])
		return 0;
	for (p = dot + 1; *p; p++)
		if (*p < '0' || *p > '9')
			return 0;
	return (size_t)(dot - name);
}

/* ---- lookups of deck.h ---------------------------------------------------------------------- */

int sch_deck_find_subckt(const struct sch_deck *deck, const char *name)
{
	int any = -1;

	if (!deck || !name)
		return -1;
	for (size_t i = 0; i < deck->n_subckts; i++) {
		if (strcmp(deck->subckts[i].name, name) != 0)
			continue;
		if (deck->subckts[i].parent < 0)
			return (int)i;
		if (any < 0)
			any = (int)i;
	}
	return any;
}

int sch_deck_find_model(const struct sch_deck *deck, const char *name, int scope)
{
	if (!deck || !name)
		return -1;
	for (int s = scope;; s = deck->subckts[s].parent) {
		for (size_t i = 0; i < deck->n_models; i++)
			if (deck->models[i].subckt == s && strcmp(deck->models[i].name, name) == 0)
				return (int)i;
		if (s < 0 || (size_t)s >= deck->n_subckts)
			return -1;
	}
}

/* Some model (any scope, binned names included) is called name. */
static bool model_exists(const struct sch_deck *deck, const char *name)
{
	size_t len = strlen(name);

	for (size_t i = 0; i < deck->n_models; i++) {
		const char *m = deck->models[i].name;
		if (strcmp(m, name) == 0 || (sch_deck_binned_base(m) == len && strncmp(m, name, len) == 0))
			return true;
	}
	return false;
}

int sch_deck_element_nodes(const struct sch_deck *deck, const struct sch_element *e, const char *const **nodes)
{
	int want;

	*nodes = (const char *const *)e->tok;
	switch (e->letter) {
	case 'r': case 'c': case 'l': case 'i': case 'v': case 'b': case 'f': case 'h': case 'w':
		want = 2;
		break;
	case 'd': /* decided at load (decide_nodes); the defaults when the model could not be told */
		want = e->n_nodes > 0 ? e->n_nodes : 2;
		break;
	case 'j':
		want = e->n_nodes > 0 ? e->n_nodes : 3;
		break;
	case 'z': case 'u':
		want = 3;
		break;
	case 'm':
		want = e->n_nodes > 0 ? e->n_nodes : 4;
		break;
	case 't': case 's': case 'o':
		want = 4;
		break;
	case 'q':
		want = e->n_nodes > 0 ? e->n_nodes : (e->n_tok >= 5 && !model_exists(deck, e->tok[3])) ? 4 : 3;
		break;
	case 'e':
	case 'g':
		want = (e->n_tok >= 3 && sch_deck_is_behavioural(e->tok[2])) ? 2 : 4;
		break;
	case 'x':
		want = sch_deck_x_name_index(e);
		break;
	default:
		want = 0;
	}
	if (want <= 0 || e->n_tok < want) {
		*nodes = NULL;
		return 0;
	}
	return want;
}

const char *sch_deck_x_subckt(const struct sch_deck *deck, const struct sch_element *e)
{
	int i;

	if (!e || e->letter != 'x')
		return NULL;
	i = sch_deck_x_name_index(e);
	return i >= 0 ? e->tok[i] : NULL;
}
