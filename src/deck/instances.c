/* SPDX-License-Identifier: BSD-3-Clause */
/* deck_instances.c - expansion of the subcircuit hierarchy into leaf instances with their names. */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "deck_int.h"

/* One open X instance during the walk (or the top level, def -1). */
struct frame {
	int def;             /* subcircuit being walked, -1 top level */
	size_t pos;          /* next element of its body */
	const char *path;    /* hierarchical path of the X instance, NULL at top */
	int x_id;            /* number of the X instance, -1 at top */
};

struct walk {
	const struct sch_deck *deck;
	struct sch_arena *arena;
	struct sch_diag *d;
	size_t *body_start;  /* elements of definition s are body[body_start[s+1] .. body_start[s+2]) */
	int *body;
	int *target;         /* per element: the definition an X element instantiates */
	unsigned char *active;
	struct frame *stack;
	size_t n_stack, a_stack;
	struct sch_instance *out;
	size_t n_out, a_out;
	size_t visits;
	int n_x;
};

/* Groups element indices by enclosing definition, keeping card order (a counting sort). */
static enum sch_err group_bodies(struct walk *w)
{
	const struct sch_deck *deck = w->deck;
	size_t n_groups = deck->n_subckts + 1;
	size_t *fill = calloc(n_groups, sizeof(*fill));
	enum sch_err ret = SCH_ERR_NOMEM;

	w->body_start = calloc(n_groups + 1, sizeof(*w->body_start));
	w->body = malloc((deck->n_elements + 1) * sizeof(*w->body));
	if (!w->body_start || !w->body || !fill)
		goto out;
	for (size_t i = 0; i < deck->n_elements; i++)
		w->body_start[(size_t)(deck->elements[i].subckt + 1) + 1]++;
	for (size_t g = 1; g <= n_groups; g++)
		w->body_start[g] += w->body_start[g - 1];
	for (size_t i = 0; i < deck->n_elements; i++) {
		size_t g = (size_t)(deck->elements[i].subckt + 1);
		w->body[w->body_start[g] + fill[g]++] = (int)i;
	}
	ret = SCH_OK;
out:
	free(fill);
	return ret;
}

static enum sch_err resolve_targets(struct walk *w)
{
	const struct sch_deck *deck = w->deck;
	struct sch_names ix;
	enum sch_err ret = SCH_ERR_NOMEM;

	w->target = malloc((deck->n_elements + 1) * sizeof(*w->target));
	if (!w->target || sch_names_init(&ix, deck->n_subckts) != SCH_OK)
		goto out;
	for (size_t i = 0; i < deck->n_subckts; i++)
		if (sch_names_add(&ix, deck->subckts[i].name, strlen(deck->subckts[i].name), (int)i) != SCH_OK)
			goto out;
	for (size_t i = 0; i < deck->n_elements; i++) {
		const struct sch_element *e = &deck->elements[i];
		const struct sch_card *c = &deck->cards[e->card];
		int k;

		w->target[i] = -1;
		if (e->letter != 'x')
			continue;
		k = sch_deck_x_name_index(e);
		w->target[i] = k < 0 ? -1 : sch_deck_resolve_subckt(deck->subckts, &ix, e->tok[k], e->subckt);
		if (w->target[i] < 0) {
			char q[SCH_DECK_QUOTE_MAX + 8];

			ret = sch_diag_error(w->d, SCH_ERR_INPUT, c->file, c->line, "unknown subcircuit%s",
					     sch_deck_quote(deck, c->file, k < 0 ? "" : e->tok[k], "", q, sizeof(q)));
			goto out;
		}
	}
	ret = SCH_OK;
out:
	sch_names_release(&ix);
	return ret;
}

static enum sch_err push_frame(struct walk *w, int def, const char *path, int x_id)
{
	if (sch_deck_grow((void **)&w->stack, &w->a_stack, w->n_stack, sizeof(*w->stack)) != SCH_OK)
		return SCH_ERR_NOMEM;
	w->stack[w->n_stack++] = (struct frame){ def, 0, path, x_id };
	if (def >= 0)
		w->active[def] = 1;
	return SCH_OK;
}

static enum sch_err visit(struct walk *w, int el, const struct frame *f)
{
	const struct sch_element *e = &w->deck->elements[el];
	const struct sch_card *c = &w->deck->cards[e->card];
	const char *path;
	char *sim;

	if (++w->visits > SCH_MAX_INSTANCES)
		return sch_diag_error(w->d, SCH_ERR_INPUT, c->file, c->line,
				      "the hierarchy expands to more than %zu instances", SCH_MAX_INSTANCES);
	if (e->letter == 'x') {
		int t = w->target[el];

		if (w->active[t]) {
			char q[SCH_DECK_QUOTE_MAX + 8];

			return sch_diag_error(w->d, SCH_ERR_INPUT, c->file, c->line, "recursive instantiation of subcircuit%s",
					      sch_deck_quote(w->deck, c->file, w->deck->subckts[t].name, "", q, sizeof(q)));
		}
		path = f->path ? sch_arena_printf(w->arena, "%s.%s", f->path, e->name) : e->name;
		if (!path)
			return SCH_ERR_NOMEM;
		return push_frame(w, t, path, w->n_x++);
	}
	if (sch_deck_grow((void **)&w->out, &w->a_out, w->n_out, sizeof(*w->out)) != SCH_OK)
		return SCH_ERR_NOMEM;
	if (f->path) {
		/* "i.x1.iph": the path is the tail of the simulator's name, so one string serves both. */
		sim = sch_arena_printf(w->arena, "%c.%s.%s", e->letter, f->path, e->name);
		if (!sim)
			return SCH_ERR_NOMEM;
		path = sim + 2;
	} else {
		sim = (char *)e->name;
		path = e->name;
	}
	w->out[w->n_out++] = (struct sch_instance){ path, sim, el, f->x_id };
	return SCH_OK;
}

static enum sch_err walk_all(struct walk *w)
{
	enum sch_err ret = push_frame(w, -1, NULL, -1);

	while (ret == SCH_OK && w->n_stack) {
		struct frame *f = &w->stack[w->n_stack - 1];
		size_t g = (size_t)(f->def + 1);
		size_t begin = w->body_start[g], end = w->body_start[g + 1];
		struct frame copy;

		if (begin + f->pos >= end) {
			if (f->def >= 0)
				w->active[f->def] = 0;
			w->n_stack--;
			continue;
		}
		copy = *f; /* visit may grow (and move) the stack */
		f->pos++;
		ret = visit(w, w->body[begin + copy.pos], &copy);
	}
	return ret;
}

enum sch_err sch_deck_instances(const struct sch_deck *deck, struct sch_arena *arena,
				struct sch_instance **out, size_t *n, struct sch_diag *d)
{
	struct walk w;
	enum sch_err ret = SCH_ERR_NOMEM;

	memset(&w, 0, sizeof(w));
	w.deck = deck;
	w.arena = arena;
	w.d = d;
	*out = NULL;
	*n = 0;
	w.active = calloc(deck->n_subckts + 1, 1);
	if (!w.active || group_bodies(&w) != SCH_OK)
		goto out;
	ret = resolve_targets(&w);
	if (ret != SCH_OK)
		goto out;
	ret = walk_all(&w);
	if (ret != SCH_OK)
		goto out;
	ret = SCH_ERR_NOMEM;
	*out = sch_arena_alloc(arena, (w.n_out + 1) * sizeof(**out));
	if (!*out)
		goto out;
	if (w.n_out)
		memcpy(*out, w.out, w.n_out * sizeof(**out));
	*n = w.n_out;
	ret = SCH_OK;
out:
	free(w.body_start);
	free(w.body);
	free(w.target);
	free(w.active);
	free(w.stack);
	free(w.out);
	return ret;
}
