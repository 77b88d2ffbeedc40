/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * dcpaths.c - the whole-deck check that every current source's nodes have a DC path.
 */
#include <limits.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "deck_int.h"

/* ---- DC paths ------------------------------------------------------------------------------ */

static bool is_ground(const char *node)
{
	return strcmp(node, "0") == 0 || strcmp(node, "gnd") == 0;
}

/* Whether node is a port of definition scope (ports reach outside, where the path may be). */
static bool is_port(const struct sch_deck_load *ld, int scope, const char *node)
{
	if (scope < 0)
		return false;
	for (int k = 0; k < ld->subckts[scope].n_ports; k++)
		if (strcmp(ld->subckts[scope].ports[k], node) == 0)
			return true;
	return false;
}

/*
 * A current source's node has a DC path when it is ground, a port (the path may be outside), an
 * expression, a hierarchical node, or touched by anything but capacitors and current sources in
 * the source's definition. Without one the simulator settles the node through GMIN at a voltage
 * that means nothing (a nanoampere into 1e-12 S is a kilovolt) and reports success.
 */
static bool trivially_connected(const struct sch_deck_load *ld, int scope, const char *node)
{
	return is_ground(node) || is_port(ld, scope, node) || strpbrk(node, "{}=(.") != NULL;
}

/*
 * One pass over the elements against an index of the current sources' nodes only (usually a
 * handful), so that a large netlist costs one hash lookup per node and no allocation per node.
 */
enum sch_err sch_deck_check_dc_paths(struct sch_deck_load *ld)
{
	struct sch_deck view = *ld->deck;
	struct sch_names ix;
	enum sch_err ret = SCH_ERR_NOMEM;
	bool *unknown = NULL; /* scope s at [s + 1]: holds an element whose nodes the reader cannot tell */
	bool *path = NULL;    /* per index entry */
	size_t n_sources = 0;

	memset(&ix, 0, sizeof(ix));
	for (size_t i = 0; i < ld->n_elements; i++)
		n_sources += ld->elements[i].letter == 'i';
	if (n_sources == 0)
		return SCH_OK;
	for (size_t c = 0; c < ld->n_cards; c++)
		if (ld->cards[c].keyword && strcmp(ld->cards[c].keyword, ".global") == 0)
			return SCH_OK; /* a global node may be driven from anywhere */
	view.models = ld->models;
	view.n_models = ld->n_models;
	unknown = calloc(ld->n_subckts + 1, sizeof(*unknown));
	if (!unknown || sch_names_init(&ix, 2 * n_sources) != SCH_OK)
		goto out;
	for (size_t i = 0; i < ld->n_elements; i++) {
		const struct sch_element *e = &ld->elements[i];

		if (e->letter != 'i' || e->n_tok < 2)
			continue;
		for (int k = 0; k < 2; k++)
			if (!trivially_connected(ld, e->subckt, e->tok[k]) &&
			    sch_names_add(&ix, e->tok[k], strlen(e->tok[k]), (int)i) != SCH_OK)
				goto out;
	}
	path = calloc(ix.n + 1, sizeof(*path));
	if (!path)
		goto out;
	for (size_t i = 0; i < ld->n_elements && ix.n; i++) {
		const struct sch_element *e = &ld->elements[i];
		const char *const *nodes;
		int n;

		if (e->letter == 'c' || e->letter == 'i')
			continue;
		n = sch_deck_element_nodes(&view, e, &nodes);
		if (n == 0 && e->letter != 'k')
			unknown[e->subckt + 1] = true;
		for (int k = 0; k < n; k++) {
			size_t len = strlen(nodes[k]);

			for (int j = sch_names_next(&ix, nodes[k], len, -1); j >= 0; j = sch_names_next(&ix, nodes[k], len, j))
				if (ld->elements[ix.e[j].value].subckt == e->subckt)
					path[j] = true;
		}
	}
	for (size_t j = 0; j < ix.n; j++) {
		const struct sch_element *e = &ld->elements[ix.e[j].value];
		const struct sch_card *c = &ld->cards[e->card];
		char q[SCH_DECK_QUOTE_MAX + 8], qn[SCH_DECK_QUOTE_MAX + 8];

		if (path[j] || unknown[e->subckt + 1])
			continue;
		/* entries are in source order, the first node before the second */
		ret = sch_diag_error(ld->d, SCH_ERR_INPUT, c->file, c->line,
				     "current source%s drives node%s, which only capacitors and current sources "
				     "touch: it has no DC path",
				     sch_deck_quote(ld->deck, c->file, e->name, "", q, sizeof(q)),
				     sch_deck_quote(ld->deck, c->file, ix.e[j].key, "", qn, sizeof(qn)));
		goto out;
	}
	ret = SCH_OK;
out:
	sch_names_release(&ix);
	free(unknown);
	free(path);
	return ret;
}
