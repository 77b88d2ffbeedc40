/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * checks.c - the checks that need the whole deck (subcircuit and model names, .noise nodes),
 * then moving the finished deck into the arena.
 */
#include <limits.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "deck_int.h"

/* ---- whole-deck checks -------------------------------------------------------------------- */

/* A plain model name: not an expression, a number or a parameter assignment. */
static bool model_name_checkable(const char *t)
{
	return t && is_alpha(t[0]) && !strpbrk(t, "={}'\"()");
}

/* Instance keywords that end the node list (the simulator's own words). */
static bool is_instance_keyword(const char *t)
{
	return strcmp(t, "off") == 0 || strcmp(t, "thermal") == 0 || strcmp(t, "tnodeout") == 0;
}

/*
 * The node counts the simulator allows an element of this letter with model m (ngspice 39
 * INP2D, INP2Q, INP2M, INP2J): a diode 2, or 3 with a thermal node; a bipolar transistor 3 or 4
 * (with substrate), 5 (substrate and thermal node) for VBIC (levels 4, 9) and HICUM (level 8);
 * a MOSFET 4, a vdmos model 3 to 5 (drain, gate, source, two thermal nodes), the SOI levels up to
 * 7 and SOI3 and HiSIM HV up to 6; a JFET 3.
 */
static void node_range(char letter, const struct sch_model *m, int *min, int *max)
{
	int lv = m->level;

	switch (letter) {
	case 'd':
		*min = 2, *max = 3;
		break;
	case 'q':
		*min = 3, *max = (lv == 4 || lv == 8 || lv == 9) ? 5 : 4;
		break;
	case 'm':
		if (strncmp(m->type, "vdmos", 5) == 0)
			*min = 3, *max = 5;
		else
			*min = 4, *max = (lv == 10 || (lv >= 55 && lv <= 58)) ? 7 : (lv == 60 || lv == 73) ? 6 : 4;
		break;
	default:
		*min = *max = 3;
	}
}

/*
 * Decides the node count of a D, Q, M or J element the way the simulator does: its model is the
 * first token, from the fewest nodes the letter allows on, that names a model; the tokens before
 * it are the nodes, and the model's type and level bound their number (node_range). Sets
 * e->n_nodes. SCH_ERR_INPUT with a message at the element's line when no model is named there
 * ("model 'x' is not defined", naming the last plain word before the instance's keywords and
 * assignments) or the count is outside the bounds; unchanged when the model cannot be told (a
 * name from an expression).
 */
static enum sch_err decide_nodes(struct sch_deck_load *ld, const struct sch_names *mx, struct sch_element *e)
{
	const struct sch_card *c = &ld->cards[e->card];
	const struct sch_model *m = NULL;
	char q[SCH_DECK_QUOTE_MAX + 8];
	int first, last, slot = -1, named = -1, min, max;

	switch (e->letter) {
	case 'd':
		first = 2, last = 3;
		break;
	case 'q':
		first = 3, last = 5;
		break;
	case 'm':
		first = 3, last = 7;
		break;
	case 'j':
		first = last = 3;
		break;
	default:
		return SCH_OK;
	}
	for (int i = first; i <= last && i < e->n_tok && !m; i++) {
		const char *t = e->tok[i];
		int k;

		if (strchr(t, '=') || is_instance_keyword(t))
			break;
		if (!model_name_checkable(t))
			continue; /* a numbered node */
		if ((k = sch_names_next(mx, t, strlen(t), -1)) >= 0) {
			slot = i;
			m = &ld->models[mx->e[k].value];
		}
		named = i;
	}
	if (!m) {
		if (named < 0)
			return SCH_OK;
		return sch_diag_error(ld->d, SCH_ERR_INPUT, c->file, c->line, "model%s is not defined",
				      sch_deck_quote(ld->deck, c->file, e->tok[named], "", q, sizeof(q)));
	}
	node_range(e->letter, m, &min, &max);
	if (slot < min)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, c->file, c->line, "too few fields for%s: needs %d nodes and a model",
				      sch_deck_quote(ld->deck, c->file, e->name, " an element", q, sizeof(q)), min);
	if (slot > max)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, c->file, c->line,
				      "'%s' connects %d nodes but its %s model (level %d) takes at most %d", e->name, slot,
				      m->type, m->level, max);
	e->n_nodes = slot;
	return SCH_OK;
}

static enum sch_err check_names(struct sch_deck_load *ld)
{
	struct sch_names sx, mx;
	enum sch_err ret = SCH_ERR_NOMEM;

	memset(&sx, 0, sizeof(sx));
	memset(&mx, 0, sizeof(mx));
	if (sch_names_init(&sx, ld->n_subckts) != SCH_OK || sch_names_init(&mx, 2 * ld->n_models) != SCH_OK)
		goto out;
	for (size_t i = 0; i < ld->n_subckts; i++)
		if (sch_names_add(&sx, ld->subckts[i].name, strlen(ld->subckts[i].name), (int)i) != SCH_OK)
			goto out;
	for (size_t i = 0; i < ld->n_models; i++) {
		const char *name = ld->models[i].name;
		size_t base = sch_deck_binned_base(name);

		if (sch_names_add(&mx, name, strlen(name), (int)i) != SCH_OK ||
		    (base && sch_names_add(&mx, name, base, (int)i) != SCH_OK))
			goto out;
	}
	for (size_t i = 0; i < ld->n_elements; i++) {
		struct sch_element *e = &ld->elements[i];
		const struct sch_card *c = &ld->cards[e->card];

		if (e->letter == 'x') {
			const char *sub = e->tok[sch_deck_x_name_index(e)];

			int def = sch_deck_resolve_subckt(ld->subckts, &sx, sub, e->subckt);
			int n_nodes = sch_deck_x_name_index(e);
			char q[SCH_DECK_QUOTE_MAX + 8];

			if (def < 0) {
				ret = sch_diag_error(ld->d, SCH_ERR_INPUT, c->file, c->line, "unknown subcircuit%s",
						     sch_deck_quote(ld->deck, c->file, sub, "", q, sizeof(q)));
				goto out;
			}
			/* the simulator would only say that no circuit is loaded */
			if (n_nodes != ld->subckts[def].n_ports) {
				ret = sch_diag_error(ld->d, SCH_ERR_INPUT, c->file, c->line,
						     "'%s' connects %d node%s but subcircuit%s has %d port%s", e->name, n_nodes,
						     n_nodes == 1 ? "" : "s",
						     sch_deck_quote(ld->deck, c->file, sub, "", q, sizeof(q)),
						     ld->subckts[def].n_ports, ld->subckts[def].n_ports == 1 ? "" : "s");
				goto out;
			}
		} else if (decide_nodes(ld, &mx, e) != SCH_OK) {
			ret = SCH_ERR_INPUT;
			goto out;
		}
	}
	ret = SCH_OK;
out:
	sch_names_release(&sx);
	sch_names_release(&mx);
	return ret;
}

/*
 * Code models that start a program or load a library the netlist names (ngspice's d_process,
 * d_cosim). The worker loads the standard code-model libraries, so A devices run; these stay out,
 * because netlist text must never make the simulator run what the netlist names. Code models that
 * read a data file get it checked and as an absolute path instead (datafile.c).
 */
static const char *const program_code_models[] = { "d_process", "d_cosim" };

static enum sch_err check_code_models(struct sch_deck_load *ld)
{
	for (size_t i = 0; i < ld->n_models; i++) {
		const struct sch_card *c = &ld->cards[ld->models[i].card];

		for (size_t k = 0; k < sizeof(program_code_models) / sizeof(program_code_models[0]); k++)
			if (strcasecmp(ld->models[i].type, program_code_models[k]) == 0)
				return sch_diag_error(ld->d, SCH_ERR_INPUT, c->file, c->line,
						      "code model '%s' starts a program or loads a library the netlist names; "
						      "schrot never lets the simulator do that", program_code_models[k]);
	}
	return SCH_OK;
}

/* Whether node is a node of some top-level element; true as well when that cannot be told. */
static bool top_node_exists(const struct sch_deck_load *ld, const char *node, size_t len)
{
	struct sch_deck view = *ld->deck;

	if ((len == 1 && node[0] == '0') || (len == 3 && strncmp(node, "gnd", 3) == 0) || memchr(node, '.', len))
		return true; /* ground, or a subcircuit's internal node "x1.n" */
	view.models = ld->models;
	view.n_models = ld->n_models;
	for (size_t i = 0; i < ld->n_elements; i++) {
		const struct sch_element *e = &ld->elements[i];
		const char *const *nodes;
		int n;

		if (e->subckt >= 0)
			continue;
		n = sch_deck_element_nodes(&view, e, &nodes);
		if (n == 0 && e->letter != 'k')
			return true; /* an element whose nodes the reader does not know */
		for (int k = 0; k < n; k++)
			if (strlen(nodes[k]) == len && strncmp(nodes[k], node, len) == 0)
				return true;
	}
	return false;
}

/*
 * The simulator answers a .noise output at a node no element touches with zero noise, a
 * report that looks fine; the reader says so instead.
 */
static enum sch_err check_noise_nodes(struct sch_deck_load *ld)
{
	const struct sch_noise_spec *ns = &ld->deck->noise;
	const struct sch_card *c;
	const char *p, *end;

	if (!ns->present || strncmp(ns->output, "v(", 2) != 0)
		return SCH_OK;
	c = &ld->cards[ns->card];
	p = ns->output + 2;
	end = strchr(p, ')');
	if (!end || end[1])
		return SCH_OK; /* not v(node) or v(node,ref): the analysis says what is wrong */
	while (p < end) {
		size_t len = strcspn(p, ",)");

		if (len && !top_node_exists(ld, p, len)) {
			char name[SCH_DECK_QUOTE_MAX + 4], q[SCH_DECK_QUOTE_MAX + 8];

			snprintf(name, sizeof(name), "%.*s", (int)len, p);
			return sch_diag_error(ld->d, SCH_ERR_INPUT, c->file, c->line,
					      "%s output node%s is not a node of any element at the top level",
					      ns->from_control ? "the '.control' noise command's" : "'.noise'",
					      sch_deck_quote(ld->deck, c->file, name, "", q, sizeof(q)));
		}
		p += len + (p[len] == ',');
	}
	return SCH_OK;
}

static enum sch_err move_to_arena(struct sch_arena *a, void **dst, const void *src, size_t n, size_t size)
{
	*dst = NULL;
	if (n == 0)
		return SCH_OK;
	*dst = sch_arena_alloc(a, n * size);
	if (!*dst)
		return SCH_ERR_NOMEM;
	memcpy(*dst, src, n * size);
	return SCH_OK;
}

enum sch_err sch_deck_load_finish(struct sch_deck_load *ld)
{
	struct sch_deck *deck = ld->deck;
	struct sch_arena *a = &deck->arena;
	enum sch_err ret;

	if (ld->n_open) {
		const struct sch_subckt *s = &ld->subckts[ld->open[ld->n_open - 1]];
		const struct sch_card *c = &ld->cards[s->card_begin];
		char q[SCH_DECK_QUOTE_MAX + 8];

		/* " 'cell'" becomes " cell": "'.subckt cell' has no matching '.ends'" */
		sch_deck_quote(ld->deck, c->file, s->name, "", q, sizeof(q));
		if (q[0]) {
			memmove(q + 1, q + 2, strlen(q + 2) - 1);
			q[strlen(q) - 2] = '\0';
		}
		return sch_diag_error(ld->d, SCH_ERR_INPUT, c->file, c->line, "'.subckt%s' has no matching '.ends'", q);
	}
	ret = check_names(ld);
	if (ret == SCH_OK)
		ret = check_code_models(ld);
	if (ret == SCH_OK)
		ret = check_noise_nodes(ld);
	if (ret == SCH_OK)
		ret = sch_deck_check_dc_paths(ld);
	if (ret != SCH_OK)
		return ret;
	deck->cards = ld->n_cards ? ld->cards : NULL;
	deck->elements = ld->n_elements ? ld->elements : NULL;
	if (move_to_arena(a, (void **)&deck->subckts, ld->subckts, ld->n_subckts, sizeof(*ld->subckts)) != SCH_OK ||
	    move_to_arena(a, (void **)&deck->models, ld->models, ld->n_models, sizeof(*ld->models)) != SCH_OK ||
	    move_to_arena(a, (void **)&deck->files, ld->files, ld->n_files, sizeof(*ld->files)) != SCH_OK ||
	    move_to_arena(a, (void **)&deck->data_texts, ld->data_texts, ld->n_data_texts, sizeof(*ld->data_texts)) != SCH_OK)
		return SCH_ERR_NOMEM;
	deck->n_cards = ld->n_cards;
	deck->n_elements = ld->n_elements;
	deck->n_subckts = ld->n_subckts;
	deck->n_models = ld->n_models;
	deck->n_files = ld->n_files;
	deck->n_data_texts = ld->n_data_texts;
	return SCH_OK;
}

void sch_deck_load_release(struct sch_deck_load *ld)
{
	free(ld->subckts);
	free(ld->models);
	free(ld->files);
	free(ld->file_ids);
	free(ld->data_texts);
	free(ld->open);
	free(ld->tok_off);
	free(ld->scratch);
	sch_pattern_free(ld->re_control);
	sch_pattern_free(ld->re_include);
	sch_pattern_free(ld->re_lib);
}
