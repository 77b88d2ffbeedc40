/* SPDX-License-Identifier: BSD-3-Clause */
/* augment.c - builds the simulated deck: the netlist's cards plus generators of known density. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <strings.h>
#include "schrot/augment.h"
#include "schrot/physics.h"

/* Analysis and output cards the tool replaces with its own commands. */
static bool dropped_keyword(const char *kw)
{
	static const char *const dropped[] = { ".noise", ".op", ".ac", ".dc", ".tran", ".pz", ".sens", ".tf",
					       ".disto", ".four", ".fourier", ".meas", ".measure", ".print",
					       ".plot", ".save", ".probe", ".width", ".end", ".endl" };
	for (size_t k = 0; k < sizeof(dropped) / sizeof(dropped[0]); k++) {
		if (strcmp(kw, dropped[k]) == 0)
			return true;
	}
	return false;
}

static bool has_ac_value(const struct sch_element *e)
{
	for (int k = 0; k < e->n_tok; k++) {
		if (strcmp(e->tok[k], "ac") == 0 || strncmp(e->tok[k], "ac=", 3) == 0)
			return true;
	}
	return false;
}

struct line_list {
	const char **v;
	size_t n, cap;
	struct sch_arena *arena;
	int *card;      /* deck card of each line, -1 for generated ones */
	int cur_card;   /* what push records */
	bool quiet_probes;
};

static enum sch_err push(struct line_list *l, const char *s)
{
	if (!s)
		return SCH_ERR_NOMEM;
	if (l->n == l->cap) {
		size_t cap = l->cap ? l->cap * 2 : 256;
		const char **v = sch_arena_alloc(l->arena, cap * sizeof(*v));
		int *card = sch_arena_alloc(l->arena, cap * sizeof(*card));
		if (!v || !card)
			return SCH_ERR_NOMEM;
		if (l->n) {
			memcpy(v, l->v, l->n * sizeof(*v));
			memcpy(card, l->card, l->n * sizeof(*card));
		}
		l->v = v;
		l->card = card;
		l->cap = cap;
	}
	l->card[l->n] = l->cur_card;
	l->v[l->n++] = s;
	return SCH_OK;
}

/*
 * Appends the lines of probe k (definition-local names) across nodes a, b: a 1 ohm resistor alone
 * on its own node, whose thermal noise voltage a unity VCCS turns into a current across a, b. No
 * branch equation and no zero on the matrix diagonal: a 0 V source with an F element (the first
 * form) made the simulator's pivot search quadratic in the number of instances (docs/performance.md).
 * The node carries no DC voltage, so the G element carries no DC current.
 */
static enum sch_err push_probe(struct line_list *l, int k, const char *a, const char *b, const char *what)
{
	enum sch_err ret = push(l, sch_arena_printf(l->arena, "* schrot: generator of known density across %s", what));
	if (ret == SCH_OK)
		ret = push(l, sch_arena_printf(l->arena, "rschg%d nschg%d 0 %g%s", k, k, SCH_PROBE_OHMS,
					       l->quiet_probes ? " noisy=0" : ""));
	if (ret == SCH_OK)
		ret = push(l, sch_arena_printf(l->arena, "gschg%d %s %s nschg%d 0 1", k, a, b, k));
	return ret;
}

static enum sch_err push_probes_of(struct line_list *l, const struct sch_deck *deck, const struct sch_augmented *aug,
				   int subckt)
{
	for (size_t k = 0; k < aug->n_probes; k++) {
		const struct sch_element *e = &deck->elements[aug->probes[k].element];
		const char *const *nodes;
		enum sch_err ret;
		if (e->subckt != subckt)
			continue;
		if (sch_deck_element_nodes(deck, e, &nodes) < 2)
			continue;
		ret = push_probe(l, (int)k, nodes[0], nodes[1], e->name);
		if (ret != SCH_OK)
			return ret;
	}
	return SCH_OK;
}

const char *sch_augment_probe_sim_name(struct sch_arena *arena, const struct sch_probe *p, const char *instance_path)
{
	const char *dot = strrchr(instance_path, '.');
	if (!dot)
		return p->res_name;
	return sch_arena_printf(arena, "r.%.*s.%s", (int)(dot - instance_path), instance_path, p->res_name);
}

/* The carrier probe across the same two nodes as element e in the same definition, or -1. */
static int paired_carrier_probe(const struct sch_deck *deck, const struct sch_augmented *aug, int e)
{
	const struct sch_element *d = &deck->elements[e];
	const char *const *dn, *const *cn;

	if (sch_deck_element_nodes(deck, d, &dn) < 2)
		return -1;
	for (size_t p = 0; p < aug->n_probes; p++) {
		const struct sch_element *c = &deck->elements[aug->probes[p].element];
		if (aug->probes[p].kind != SCH_PROBE_CARRIER || c->subckt != d->subckt ||
		    sch_deck_element_nodes(deck, c, &cn) < 2)
			continue;
		if ((strcmp(cn[0], dn[0]) == 0 && strcmp(cn[1], dn[1]) == 0) ||
		    (strcmp(cn[0], dn[1]) == 0 && strcmp(cn[1], dn[0]) == 0))
			return (int)p;
	}
	return -1;
}

/* SCH_ERR_INPUT, located at the card, when an element takes a name schrot's generators use. */
static enum sch_err refuse_reserved_names(const struct sch_deck *deck, struct sch_diag *d)
{
	for (size_t k = 0; k < deck->n_elements; k++) {
		if (strncmp(deck->elements[k].name + 1, "schg", 4) == 0 || strcmp(deck->elements[k].name, "rschtemp") == 0)
			return sch_diag_error(d, SCH_ERR_INPUT, deck->cards[deck->elements[k].card].file,
					      deck->cards[deck->elements[k].card].line,
					      "element name '%s' is reserved for schrot's generators", deck->elements[k].name);
	}
	return SCH_OK;
}

/* Gives element e the next probe, of this kind. SCH_ERR_NOMEM on failure. */
static enum sch_err add_probe(struct sch_augmented *aug, struct sch_arena *arena, enum sch_probe_kind kind, int e)
{
	struct sch_probe *p = &aug->probes[aug->n_probes];

	p->kind = kind;
	p->element = e;
	p->res_name = sch_arena_printf(arena, "rschg%zu", aug->n_probes);
	if (!p->res_name)
		return SCH_ERR_NOMEM;
	aug->probe_of_element[e] = (int)aug->n_probes++;
	return SCH_OK;
}

/*
 * One probe per definition element that is a carrier in at least one instance, then (when asked)
 * one per other diode, or the paired carrier's probe when junctions share it. SCH_ERR_NOMEM on failure.
 */
static enum sch_err assign_probes(const struct sch_deck *deck, const struct sch_carrier_set *set,
				  const struct sch_augment_options *opt, struct sch_arena *arena,
				  struct sch_augmented *aug)
{
	aug->probe_of_element = sch_arena_alloc(arena, (deck->n_elements + 1) * sizeof(int));
	aug->probes = sch_arena_alloc(arena, (deck->n_elements + 1) * sizeof(*aug->probes));
	if (!aug->probe_of_element || !aug->probes)
		return SCH_ERR_NOMEM;
	for (size_t k = 0; k < deck->n_elements; k++)
		aug->probe_of_element[k] = -1;
	for (size_t k = 0; k < set->n_carriers && !(opt && opt->plain); k++) {
		int e = set->carriers[k].element;
		if (aug->probe_of_element[e] < 0 && add_probe(aug, arena, SCH_PROBE_CARRIER, e) != SCH_OK)
			return SCH_ERR_NOMEM;
	}
	if (!(opt && opt->junction_probes) || (opt && opt->plain))
		return SCH_OK;
	for (size_t k = 0; k < deck->n_elements; k++) {
		int shared;
		if (deck->elements[k].letter != 'd' || aug->probe_of_element[k] >= 0)
			continue;
		if (opt->share_paired_junctions && (shared = paired_carrier_probe(deck, aug, (int)k)) >= 0) {
			aug->probe_of_element[k] = shared;
			continue;
		}
		if (add_probe(aug, arena, SCH_PROBE_JUNCTION, (int)k) != SCH_OK)
			return SCH_ERR_NOMEM;
	}
	return SCH_OK;
}

/*
 * Whether the augmented deck leaves this card out (analyses and control cards, unless kept; a
 * plain deck's .noise card, which sch_augment_write puts back as the run schrot plans).
 */
static bool card_dropped(const struct sch_card *card, const struct sch_augment_options *opt)
{
	if (card->keyword && opt && opt->plain && strcmp(card->keyword, ".noise") == 0)
		return true;
	return card->keyword && !(opt && opt->keep_analyses && strcmp(card->keyword, ".end") != 0 &&
				  strcmp(card->keyword, ".endl") != 0) &&
	       dropped_keyword(card->keyword);
}

/*
 * The card's text as the augmented deck holds it (" ac 1" on the AC source, " noisy=0" on quiet
 * elements); NULL when out of memory.
 */
static const char *card_text(const struct sch_deck *deck, const struct sch_card *card,
			     const struct sch_augment_options *opt, struct sch_arena *arena)
{
	const char *text = card->text;

	if (card->element >= 0 && (deck->elements[card->element].letter == 'e' ||
				   deck->elements[card->element].letter == 'g')) {
		const char *pwl = sch_augment_table_as_value(arena, text);

		text = pwl ? pwl : text;
	}
	if (card->element >= 0 && opt && opt->ac_source && card->subckt < 0 &&
	    strcmp(deck->elements[card->element].name, opt->ac_source) == 0 &&
	    !has_ac_value(&deck->elements[card->element]))
		text = sch_arena_printf(arena, "%s ac 1", text);
	if (card->element >= 0 && opt && opt->quiet_elements && opt->quiet_elements[card->element])
		text = sch_arena_printf(arena, "%s noisy=0", text);
	return text;
}

/* The deck's cards in order, each .subckt followed by the probes inside that definition. */
static enum sch_err push_cards(struct line_list *l, const struct sch_deck *deck, const struct sch_augmented *aug,
			       const struct sch_augment_options *opt)
{
	enum sch_err ret;

	for (size_t c = 0; c < deck->n_cards; c++) {
		const struct sch_card *card = &deck->cards[c];
		const char *text;
		if (card_dropped(card, opt))
			continue;
		if (!(text = card_text(deck, card, opt, l->arena)))
			return SCH_ERR_NOMEM;
		l->cur_card = (int)c;
		ret = push(l, text);
		l->cur_card = -1;
		if (ret != SCH_OK)
			return ret;
		if (!card->keyword || strcmp(card->keyword, ".subckt") != 0)
			continue;
		for (size_t s = 0; s < deck->n_subckts; s++) {
			if (deck->subckts[s].card_begin == (int)c && (ret = push_probes_of(l, deck, aug, (int)s)) != SCH_OK)
				return ret;
		}
	}
	return SCH_OK;
}

/* After the cards: the top-level probes, the temperature reader, the analysis card and .end. */
static enum sch_err push_tail(struct line_list *l, const struct sch_deck *deck, const struct sch_augmented *aug,
			      const struct sch_augment_options *opt)
{
	enum sch_err ret;

	if ((ret = push_probes_of(l, deck, aug, -1)) != SCH_OK)
		return ret;
	if (opt && opt->plain)
		return push(l, ".end");
	if ((ret = push(l, "* schrot: reads the circuit temperature")) != SCH_OK ||
	    (ret = push(l, "rschtemp nschtemp 0 1 noisy=0")) != SCH_OK)
		return ret;
	if (opt && opt->analysis_card && (ret = push(l, opt->analysis_card)) != SCH_OK)
		return ret;
	return push(l, ".end");
}

enum sch_err sch_augment_build(const struct sch_deck *deck, const struct sch_carrier_set *set,
			       const struct sch_augment_options *opt, struct sch_arena *arena,
			       struct sch_augmented *aug, struct sch_diag *d)
{
	struct line_list l = { NULL, 0, 0, arena, NULL, -1, opt && opt->quiet_probes };
	enum sch_err ret;

	memset(aug, 0, sizeof(*aug));
	if ((ret = refuse_reserved_names(deck, d)) != SCH_OK)
		return ret;
	if ((ret = assign_probes(deck, set, opt, arena, aug)) != SCH_OK ||
	    (ret = push(&l, "* schrot augmented deck")) != SCH_OK ||
	    (ret = push_cards(&l, deck, aug, opt)) != SCH_OK ||
	    (ret = push_tail(&l, deck, aug, opt)) != SCH_OK)
		return ret;
	aug->lines = l.v;
	aug->line_card = l.card;
	aug->n_lines = l.n;
	aug->temp_quantity = "@rschtemp[temp]";
	return SCH_OK;
}

/* Whether node is ground or named by a .global card (the same node in every instance). */
static bool global_node(const struct sch_deck *deck, const char *node)
{
	size_t n = strlen(node);

	if (strcmp(node, "0") == 0 || strcmp(node, "gnd") == 0)
		return true;
	for (size_t c = 0; c < deck->n_cards; c++) {
		const char *p = deck->cards[c].text;
		if (!deck->cards[c].keyword || strcmp(deck->cards[c].keyword, ".global") != 0)
			continue;
		for (p += strlen(".global"); *p;) {
			size_t len;
			while (*p == ' ' || *p == '\t' || *p == ',')
				p++;
			len = strcspn(p, " \t,");
			if (len == n && strncasecmp(p, node, n) == 0)
				return true;
			p += len;
		}
	}
	return false;
}

/* The index of port node of definition s, or -1. */
static int port_index(const struct sch_deck *deck, int s, const char *node)
{
	for (int k = 0; s >= 0 && k < deck->subckts[s].n_ports; k++) {
		if (strcmp(deck->subckts[s].ports[k], node) == 0)
			return k;
	}
	return -1;
}

/* The X element called name (lower case, len bytes) in definition scope, or -1. */
static int x_element(const struct sch_deck *deck, int scope, const char *name, size_t len)
{
	for (size_t k = 0; k < deck->n_elements; k++) {
		const struct sch_element *e = &deck->elements[k];
		if (e->letter == 'x' && e->subckt == scope && strlen(e->name) == len && strncmp(e->name, name, len) == 0)
			return (int)k;
	}
	return -1;
}

#define MAX_DEPTH 64

/*
 * The simulator's flat name of node of the element of instance path ("x1.x2.iph"): a port is the
 * calling X element's node, one level up; an internal node is "x1.x2.node"; ground and .global
 * nodes stay. NULL when out of memory or when the hierarchy cannot be followed.
 */
static const char *flat_node(const struct sch_deck *deck, struct sch_arena *arena, const char *path,
			     const char *node)
{
	int calls[MAX_DEPTH];
	size_t ends[MAX_DEPTH]; /* path length up to and including each call's name */
	int depth = 0, scope = -1;
	const char *p = path, *dot;

	while ((dot = strchr(p, '.')) && depth < MAX_DEPTH) {
		int x = x_element(deck, scope, p, (size_t)(dot - p));
		const char *sub = x >= 0 ? sch_deck_x_subckt(deck, &deck->elements[x]) : NULL;
		if (!sub || (scope = sch_deck_find_subckt(deck, sub)) < 0)
			return NULL;
		calls[depth] = x;
		ends[depth++] = (size_t)(dot - path);
		p = dot + 1;
	}
	if (dot)
		return NULL;
	while (depth > 0 && !global_node(deck, node)) {
		const struct sch_element *x = &deck->elements[calls[depth - 1]];
		const char *const *xn;
		int j = port_index(deck, sch_deck_find_subckt(deck, sch_deck_x_subckt(deck, x)), node);
		if (j < 0)
			return sch_arena_printf(arena, "%.*s.%s", (int)ends[depth - 1], path, node);
		if (sch_deck_element_nodes(deck, x, &xn) <= j)
			return NULL;
		node = xn[j];
		depth--;
	}
	return node;
}

/*
 * The probe resistance whose simulated output density 4 k_sim T R (its noise voltage through the
 * unity VCCS) is exactly 2q|I|G; SCH_PROBE_OFF_OHMS when the instance gets no generator.
 */
static double probe_ohms(const struct sch_carrier *c, double temp_k)
{
	double s = c ? sch_shot_density(c->dc_current_a, sch_carrier_gain(c)) : 0.0;
	if (!(s > 0) || !isfinite(s))
		return SCH_PROBE_OFF_OHMS;
	return s / (4.0 * SCH_SIM_K * temp_k);
}

/* Whether the deck holds a code-model (A) element: a card line starting with its letter. */
static bool has_code_model_device(const struct sch_augmented *aug)
{
	for (size_t k = 1; k < aug->n_lines; k++)
		if (aug->line_card[k] >= 0 && (aug->lines[k][0] == 'a' || aug->lines[k][0] == 'A'))
			return true;
	return false;
}

enum sch_err sch_augment_flat_nodes(struct sch_arena *arena, const struct sch_deck *deck, int element,
				    const char *path, const char **n_plus, const char **n_minus)
{
	const char *const *nodes;

	if (sch_deck_element_nodes(deck, &deck->elements[element], &nodes) < 2)
		return SCH_ERR_INPUT;
	*n_plus = flat_node(deck, arena, path, nodes[0]);
	*n_minus = flat_node(deck, arena, path, nodes[1]);
	return *n_plus && *n_minus ? SCH_OK : SCH_ERR_INPUT;
}

/* Carrier k's generator at the top level, across its instance's flat nodes, sized as a literal. */
static enum sch_err write_generator(const struct sch_deck *deck, const struct sch_carrier *c, size_t k, double temp_k,
				    struct sch_arena *arena, FILE *out, struct sch_diag *d)
{
	const struct sch_card *card = &deck->cards[deck->elements[c->element].card];
	const char *a, *b;

	if (sch_augment_flat_nodes(arena, deck, c->element, c->name, &a, &b) != SCH_OK)
		return sch_diag_error(d, SCH_ERR_INPUT, card->file, card->line,
				      "cannot name the nodes of '%s' at the top level of the augmented deck", c->name);
	fprintf(out, "* schrot: %s carries %.9g A, gain %.9g: 2q|I|G = %.9g A^2/Hz\n", c->name, c->dc_current_a,
		sch_carrier_gain(c), sch_shot_density(c->dc_current_a, sch_carrier_gain(c)));
	fprintf(out, "rschg%zu nschg%zu 0 %.17g\ngschg%zu %s %s nschg%zu 0 1\n", k, k, probe_ohms(c, temp_k), k, a, b, k);
	return SCH_OK;
}

enum sch_err sch_augment_write(const struct sch_augmented *aug, const struct sch_deck *deck,
			       const struct sch_carrier_set *set, double temp_k, const char *noise_command,
			       const char *compat_mode, struct sch_arena *arena, FILE *out, struct sch_diag *d)
{
	enum sch_err ret;

	for (size_t k = 0; k + 1 < aug->n_lines; k++)
		fprintf(out, "%s\n", aug->lines[k]);
	if (compat_mode)
		fprintf(out, "* schrot: read in the simulator's compatibility mode '%s'; plain ngspice needs\n"
			     "* 'set ngbehavior=%s' in a .spiceinit beside this deck to read it the same way\n",
			compat_mode, compat_mode);
	fprintf(out, "* schrot: one generator per carrier instance, a resistor of R = S/(4kT) alone on its own\n"
		     "* node whose thermal noise a unity VCCS puts across the carrier: S = 2q|I|G with its\n"
		     "* operating-point current (q = %.10g C exact; the simulator's k = %.9g J/K, T = %.6f K)\n",
		SCH_Q, SCH_SIM_K, temp_k);
	for (size_t k = 0; k < deck->n_elements; k++) {
		if (deck->elements[k].letter == 'd') {
			fputs("* schrot: not in this deck: the junction correction of 'schrot report' (a diode's noise as\n"
			      "* 2q I_j coth(qV_j/2kT) in place of the simulator's 2q|I_D|, which counts the GMIN current);\n"
			      "* compare its totals with 'schrot report --no-junction-correction'\n",
			      out);
			break;
		}
	}
	for (size_t k = 0; k < set->n_carriers; k++) {
		if ((ret = write_generator(deck, &set->carriers[k], k, temp_k, arena, out, d)) != SCH_OK)
			return ret;
	}
	if (has_code_model_device(aug))
		fprintf(out, "* schrot: a one-point AC analysis first sets the code models' small-signal state for\n"
			     "* the noise run (ngspice 39)\n.ac lin 1 1 1\n");
	fprintf(out, "* schrot: the noise analysis (pts_per_summary 1 keeps each device's spectrum)\n.%s\n.end\n",
		noise_command);
	if (ferror(out))
		return sch_diag_error(d, SCH_ERR_IO, NULL, 0, "could not write the augmented deck");
	return SCH_OK;
}
