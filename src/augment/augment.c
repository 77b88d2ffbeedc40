/* SPDX-License-Identifier: BSD-3-Clause */
/* augment.c - builds the simulated deck: the netlist's cards plus generators of known density. */
#include <math.h>
#include <stdio.h>
#include <string.h>
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
	for (size_t k = 0; k < set->n_carriers; k++) {
		int e = set->carriers[k].element;
		if (aug->probe_of_element[e] < 0 && add_probe(aug, arena, SCH_PROBE_CARRIER, e) != SCH_OK)
			return SCH_ERR_NOMEM;
	}
	if (!(opt && opt->junction_probes))
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

/* Whether the augmented deck leaves this card out (analyses and control cards, unless kept). */
static bool card_dropped(const struct sch_card *card, const struct sch_augment_options *opt)
{
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

/*
 * Whether a noise command as the analysis builds it ("noise OUT IN SWEEP N F1 F2 [PTS]", numbers
 * printed the same way) has equal start and stop frequencies: a spot run.
 */
static bool spot_command(const char *cmd)
{
	const char *tok[8];
	size_t n = 0, len[8];

	for (const char *p = cmd; *p && n < 8;) {
		while (*p == ' ')
			p++;
		if (!*p)
			break;
		tok[n] = p;
		while (*p && *p != ' ')
			p++;
		len[n] = (size_t)(p - tok[n]);
		n++;
	}
	return n >= 7 && len[5] == len[6] && strncmp(tok[5], tok[6], len[5]) == 0;
}

enum sch_err sch_augment_write(const struct sch_augmented *aug, const struct sch_carrier_set *set, double temp_k,
			       const char *noise_command, struct sch_arena *arena, FILE *out, struct sch_diag *d)
{
	const struct sch_carrier **carrier_of_inst;
	enum sch_err ret = SCH_ERR_NOMEM;

	carrier_of_inst = sch_arena_alloc(arena, (set->n_instances + 1) * sizeof(*carrier_of_inst));
	if (!carrier_of_inst)
		goto out;
	for (size_t k = 0; k < set->n_instances; k++)
		carrier_of_inst[k] = NULL;
	for (size_t k = 0; k < set->n_carriers; k++)
		carrier_of_inst[set->carriers[k].instance] = &set->carriers[k];
	for (size_t k = 0; k + 1 < aug->n_lines; k++)
		fprintf(out, "%s\n", aug->lines[k]);
	fprintf(out, "* schrot: sizes each instance's generator for 2q|I|G with its operating-point current\n"
		     "* (q = %.10g C exact; R = S/4kT with the simulator's k = %.9g J/K at T = %.6f K)\n"
		     ".control\n",
		SCH_Q, SCH_SIM_K, temp_k);
	for (size_t k = 0; k < set->n_instances; k++) {
		const struct sch_instance *in = &set->instances[k];
		const struct sch_carrier *c = carrier_of_inst[k];
		int p = aug->probe_of_element[in->element];
		const char *name;
		if (p < 0)
			continue;
		if (!(name = sch_augment_probe_sim_name(arena, &aug->probes[p], in->path)))
			goto out;
		if (c)
			fprintf(out, "* schrot: %s carries %.9g A, gain %.9g\n", in->path, c->dc_current_a,
				sch_carrier_gain(c));
		else
			fprintf(out, "* schrot: %s is no carrier here: no generator\n", in->path);
		fprintf(out, "alter @%s[resistance]=%.17g\n", name, probe_ohms(c, temp_k));
	}
	if (has_code_model_device(aug))
		fprintf(out, "* schrot: code models' small-signal state for the noise run (ngspice 39)\nac lin 1 1 1\n");
	/* batch ngspice exits 1 on a deck without .print lines; exit 0 only when the totals exist */
	if (spot_command(noise_command))
		fprintf(out,
			"%s\nprint onoise_spectrum inoise_spectrum\n"
			"* schrot: a single-frequency run has no totals (no noise2 plot): exit status 0 only when\n"
			"* it produced its one density\n"
			"if length(onoise_spectrum) = 1\n  quit 0\nend\nquit 1\n.endc\n.end\n",
			noise_command);
	else
		fprintf(out,
			"%s\nprint onoise_total inoise_total\n"
			"* schrot: exit status 0 only when the noise run produced its totals\n"
			"if length(onoise_total) = 1\n  quit 0\nend\nquit 1\n.endc\n.end\n",
			noise_command);
	if (ferror(out)) {
		ret = sch_diag_error(d, SCH_ERR_IO, NULL, 0, "could not write the augmented deck");
		goto out;
	}
	ret = SCH_OK;
out:
	return ret;
}
