/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * light.c - a voltage input that stands for optical power: the noise run's input source drives the
 * node a carrier's TABLE (or VALUE) expression reads, as a photodiode macro-model's light pin does.
 */
#include <stdio.h>
#include <string.h>
#include "analysis_int.h"
#include "schrot/augment.h"

#define SCH_LIGHT_MAX_DEPTH 32

static bool is_ground(const char *n)
{
	return strcmp(n, "0") == 0 || strcmp(n, "gnd") == 0;
}

/* The element called name (lower case) in definition scope (-1: top level), or NULL. */
static const struct sch_element *element_in(const struct sch_deck *deck, int scope, const char *name, size_t len)
{
	for (size_t k = 0; k < deck->n_elements; k++) {
		const struct sch_element *e = &deck->elements[k];

		if (e->subckt == scope && strlen(e->name) == len && strncmp(e->name, name, len) == 0)
			return e;
	}
	return NULL;
}

/*
 * The top-level net that node (local to the definition the carrier at path sits in) is wired to,
 * copied into out; false when the node is internal to a definition or the path cannot be followed.
 */
static bool top_net(const struct sch_deck *deck, const char *path, const char *node, char *out, size_t size)
{
	const struct sch_element *chain[SCH_LIGHT_MAX_DEPTH];
	int depth = 0, scope = -1;
	const char *p = path, *dot;
	char cur[256];

	while ((dot = strchr(p, '.')) != NULL) {
		const struct sch_element *x = element_in(deck, scope, p, (size_t)(dot - p));
		const char *sub;

		if (!x || x->letter != 'x' || depth == SCH_LIGHT_MAX_DEPTH || !(sub = sch_deck_x_subckt(deck, x)))
			return false;
		chain[depth++] = x;
		scope = sch_deck_find_subckt(deck, sub);
		if (scope < 0)
			return false;
		p = dot + 1;
	}
	snprintf(cur, sizeof(cur), "%s", node);
	while (depth > 0) {
		const struct sch_element *x = chain[--depth];
		const struct sch_subckt *s = &deck->subckts[sch_deck_find_subckt(deck, sch_deck_x_subckt(deck, x))];
		const char *const *nodes;
		int n = sch_deck_element_nodes(deck, x, &nodes), port = -1;

		if (is_ground(cur))
			break;
		for (int k = 0; k < s->n_ports && k < n; k++)
			if (strcmp(s->ports[k], cur) == 0)
				port = k;
		if (port < 0)
			return false;
		snprintf(cur, sizeof(cur), "%s", nodes[port]);
	}
	snprintf(out, size, "%s", cur);
	return true;
}

/* Whether the expression reads v(net) or v(net, ...) / v(..., net) for a node wired to the input's net. */
static bool expression_reads(const struct sch_deck *deck, const char *path, const char *expr, const char *net)
{
	for (const char *q = expr; (q = strstr(q, "v(")) != NULL; q += 2) {
		const char *s = q + 2;

		if (q > expr && (q[-1] == '_' || (q[-1] >= 'a' && q[-1] <= 'z') || (q[-1] >= '0' && q[-1] <= '9')))
			continue;
		while (*s && *s != ')') {
			char node[128], top[256];
			size_t n = 0;

			while (*s == ' ' || *s == ',')
				s++;
			while (*s && *s != ',' && *s != ')' && *s != ' ' && n + 1 < sizeof(node))
				node[n++] = *s++;
			node[n] = '\0';
			if (n && top_net(deck, path, node, top, sizeof(top)) && strcmp(top, net) == 0)
				return true;
		}
	}
	return false;
}

/* The carrier's controlling expression: the token after "table" or "value"/"cur" (tokens are lower case). */
static const char *control_expression(const struct sch_element *e)
{
	for (int k = 0; k + 1 < e->n_tok; k++) {
		if (strcmp(e->tok[k], "table") == 0)
			return e->tok[k + 1];
		if (strncmp(e->tok[k], "value=", 6) == 0 || strncmp(e->tok[k], "cur=", 4) == 0)
			return e->tok[k];
	}
	return NULL;
}

enum sch_err sch_analysis_note_light_input(struct sch_analysis *an)
{
	struct sch_result *res = an->res;
	const struct sch_element *src = NULL;
	const char *const *nodes;
	const char *net;

	if (an->plan.letter != 'v' || !an->plan.input)
		return SCH_OK;
	src = element_in(&res->deck, -1, an->plan.input, strlen(an->plan.input));
	if (!src || sch_deck_element_nodes(&res->deck, src, &nodes) < 2)
		return SCH_OK;
	net = is_ground(nodes[0]) ? nodes[1] : nodes[0];
	if (is_ground(net))
		return SCH_OK;
	for (size_t k = 0; k < res->set.n_carriers; k++) {
		const struct sch_carrier *c = &res->set.carriers[k];
		const struct sch_element *e = &res->deck.elements[c->element];
		const char *expr = control_expression(e);

		if (!expr || !expression_reads(&res->deck, c->name, expr, net))
			continue;
		return sch_analysis_note(an, sch_arena_printf(&res->arena,
			"input '%s' drives the light input that carrier '%s' reads (its volts stand for optical "
			"power): the input-referred figures are already NEP, in W/√Hz when 1 V stands for 1 W",
			an->plan.input, c->name));
	}
	return SCH_OK;
}

enum sch_err sch_analysis_note_tables(struct sch_analysis *an)
{
	struct sch_result *res = an->res;
	size_t n = 0, n_a = 0;

	for (size_t k = 0; k < res->deck.n_elements; k++) {
		const struct sch_element *e = &res->deck.elements[k];

		n_a += e->letter == 'a';
		if ((e->letter == 'e' || e->letter == 'g') &&
		    sch_augment_table_as_value(&res->arena, res->deck.cards[e->card].text))
			n++;
	}
	if (n_a && sch_analysis_note(an, sch_arena_printf(&res->arena,
		"%zu code-model (A) device%s: a one-point AC analysis runs before the noise run, without which "
		"the simulator gets their small-signal response wrong in a noise run (ngspice 39, measured); "
		"the run's first frequency point can still be off for a frequency-dependent one",
		n_a, n_a == 1 ? "" : "s")) != SCH_OK)
		return SCH_ERR_NOMEM;
	if (!n)
		return SCH_OK;
	return sch_analysis_note(an, sch_arena_printf(&res->arena,
		"%zu E/G TABLE source%s run as a behavioural pwl() of the same points: the simulator's TABLE "
		"code model takes its small-signal gain at the AC solution in a noise run (ngspice 39, measured); "
		"pwl() keeps the operating point's slope but does not round the table's corners",
		n, n == 1 ? "" : "s"));
}
