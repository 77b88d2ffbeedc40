/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * cards.c - one card at a time: classifies it (element or dot card) and applies each kind's
 * rules (element field counts, .subckt/.ends nesting, .model, .noise).
 */
#include <limits.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "deck_int.h"

/* ---- element cards ----------------------------------------------------------------------- */

/* A token that can only be a value expression or keyword, not a plain node name. */
bool sch_deck_is_behavioural(const char *t)
{
	static const char *const words[] = { "value", "vol", "cur", "poly", "table", "laplace",
					     "freq", "tablefile", "pwl", "ch", "and", "or", "nand",
					     "nor", NULL };

	if (strpbrk(t, "=({'\""))
		return true;
	for (int i = 0; words[i]; i++)
		if (strcmp(t, words[i]) == 0)
			return true;
	return false;
}

int sch_deck_x_name_index(const struct sch_element *e)
{
	int i;

	for (i = 0; i < e->n_tok; i++)
		if (strchr(e->tok[i], '=') || has_prefix(e->tok[i], "params:"))
			break;
	return i - 1;
}

static enum sch_err too_few(struct sch_deck_load *ld, const char *file, long line, const char *name,
			    const char *needs)
{
	char q[SCH_DECK_QUOTE_MAX + 8];

	return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "too few fields for%s: needs %s",
			      sch_deck_quote(ld->deck, file, name, " an element", q, sizeof(q)), needs);
}

static enum sch_err check_element(struct sch_deck_load *ld, const char *file, long line,
				  const struct sch_element *e)
{
	const char **t = e->tok;
	int n = e->n_tok;

	switch (e->letter) {
	case 'r':
	case 'c':
	case 'l':
		if (n < 3)
			return too_few(ld, file, line, e->name, "2 nodes and a value");
		return sch_deck_check_number(ld, file, line, t[2]);
	case 'd':
		if (n < 3)
			return too_few(ld, file, line, e->name, "2 nodes and a model");
		return sch_deck_check_number(ld, file, line, n > 3 ? t[3] : NULL);
	case 'q':
		return n < 4 ? too_few(ld, file, line, e->name, "3 nodes and a model") : SCH_OK;
	case 'j':
		return n < 4 ? too_few(ld, file, line, e->name, "3 nodes and a model") : SCH_OK;
	case 'm': /* 3 nodes only with a vdmos model: decided once every model is known */
		return n < 4 ? too_few(ld, file, line, e->name, "4 nodes and a model") : SCH_OK;
	case 'i':
	case 'v':
		if (n < 2)
			return too_few(ld, file, line, e->name, "2 nodes");
		if (n > 2 && (sch_deck_check_number(ld, file, line, t[2]) != SCH_OK ||
			      sch_deck_check_source_value(ld, file, line, t[2]) != SCH_OK))
			return SCH_ERR_INPUT;
		for (int i = 2; i + 1 < n; i++)
			if ((strcmp(t[i], "dc") == 0 || strcmp(t[i], "ac") == 0) &&
			    (sch_deck_check_number(ld, file, line, t[i + 1]) != SCH_OK ||
			     sch_deck_check_source_value(ld, file, line, t[i + 1]) != SCH_OK))
				return SCH_ERR_INPUT;
		return SCH_OK;
	case 'b':
		return n < 2 ? too_few(ld, file, line, e->name, "2 nodes") : SCH_OK;
	case 'e':
	case 'g':
		if (n < 3 || (!sch_deck_is_behavioural(t[2]) && n < 5))
			return too_few(ld, file, line, e->name, "2 nodes and a control (2 nodes and a gain, or an expression)");
		return sch_deck_is_behavioural(t[2]) ? SCH_OK : sch_deck_check_number(ld, file, line, t[4]);
	case 'f':
	case 'h':
		if (n < 3 || (!sch_deck_is_behavioural(t[2]) && n < 4))
			return too_few(ld, file, line, e->name, "2 nodes and a control (a source and a gain)");
		return sch_deck_is_behavioural(t[2]) ? SCH_OK : sch_deck_check_number(ld, file, line, t[3]);
	case 'x':
		if (sch_deck_x_name_index(e) < 0)
			return too_few(ld, file, line, e->name, "a subcircuit name");
		return SCH_OK;
	default:
		return SCH_OK;
	}
}

static enum sch_err add_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
			     const char *keyword, int element)
{
	int scope = ld->n_open ? ld->open[ld->n_open - 1] : -1;

	if (ARENA_GROW(ld, ld->cards, ld->n_cards, ld->a_cards) != SCH_OK)
		return SCH_ERR_NOMEM;
	ld->cards[ld->n_cards++] = (struct sch_card){ text, file, line, scope, element, keyword };
	return SCH_OK;
}

static enum sch_err element_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
				 size_t len)
{
	struct sch_element *e;
	const char *stored;
	const char **toks;

	if (!is_alpha(text[0])) {
		char name[SCH_DECK_QUOTE_MAX + 4], q[SCH_DECK_QUOTE_MAX + 8];

		snprintf(name, sizeof(name), "%.*s", (int)strcspn(text, " \t"), text);
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "element name%s does not start with a letter",
				      sch_deck_quote(ld->deck, file, name, "", q, sizeof(q)));
	}
	if (sch_deck_check_element_name(ld, file, line, text, len) != SCH_OK)
		return SCH_ERR_INPUT;
	if (sch_deck_tokenize(ld, text, len, SIZE_MAX) != SCH_OK || sch_deck_pack(ld, text, len, &stored, &toks) != SCH_OK ||
	    ARENA_GROW(ld, ld->elements, ld->n_elements, ld->a_elements) != SCH_OK)
		return SCH_ERR_NOMEM;
	e = &ld->elements[ld->n_elements];
	e->name = toks[0];
	e->letter = e->name[0];
	e->tok = toks + 1;
	e->n_tok = (int)ld->n_tok - 1;
	e->card = (int)ld->n_cards;
	e->subckt = ld->n_open ? ld->open[ld->n_open - 1] : -1;
	e->n_nodes = 0;
	if (check_element(ld, file, line, e) != SCH_OK)
		return SCH_ERR_INPUT;
	ld->n_elements++;
	return add_card(ld, file, line, stored, NULL, (int)ld->n_elements - 1);
}

/* ---- dot cards --------------------------------------------------------------------------- */

static enum sch_err subckt_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
				const char **t, size_t n)
{
	struct sch_subckt *s;
	struct sch_buf params;
	size_t i;
	enum sch_err ret = SCH_ERR_NOMEM;

	sch_buf_init(&params, SCH_MAX_LINE);
	if (n < 2 || strchr(t[1], '=')) {
		ret = sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "'.subckt' needs a name");
		goto out;
	}
	if (GROW(ld->subckts, ld->n_subckts, ld->a_subckts) != SCH_OK ||
	    GROW(ld->open, ld->n_open, ld->a_open) != SCH_OK)
		goto out;
	for (i = 2; i < n; i++)
		if (strchr(t[i], '=') || has_prefix(t[i], "params:"))
			break;
	s = &ld->subckts[ld->n_subckts];
	s->name = t[1];
	s->ports = t + 2;
	s->n_ports = (int)(i - 2);
	for (; i < n; i++) {
		const char *p = has_prefix(t[i], "params:") ? t[i] + strlen("params:") : t[i];

		if (!*p)
			continue;
		if ((params.len && sch_buf_add(&params, " ", 1) != SCH_OK) || sch_buf_adds(&params, p) != SCH_OK)
			goto out;
	}
	s->params = sch_arena_strdup(&ld->deck->arena, params.data ? params.data : "");
	if (!s->params)
		goto out;
	s->card_begin = (int)ld->n_cards;
	s->card_end = -1;
	s->parent = ld->n_open ? ld->open[ld->n_open - 1] : -1;
	ld->open[ld->n_open++] = (int)ld->n_subckts++;
	ret = add_card(ld, file, line, text, t[0], -1);
out:
	sch_buf_release(&params);
	return ret;
}

/*
 * Any card whose keyword starts with ".ends" closes the innermost definition, as in the simulator:
 * vendor libraries write ".ENDS* OPA-X \"Enhanced\"" or ".ends*". What follows the keyword (a name,
 * glued text) is never checked, and the card is kept as a plain ".ends", so none of it reaches
 * the simulator.
 */
static enum sch_err ends_card(struct sch_deck_load *ld, const char *file, long line)
{
	enum sch_err ret;

	if (ld->n_open == 0)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "'.ends' without '.subckt'");
	/* The card belongs to the definition it closes, so [card_begin, card_end] share the index. */
	ret = add_card(ld, file, line, ".ends", ".ends", -1);
	if (ret != SCH_OK)
		return ret;
	ld->subckts[ld->open[ld->n_open - 1]].card_end = (int)ld->n_cards - 1;
	ld->n_open--;
	return SCH_OK;
}

/*
 * The level of a .model card as the simulator reads it (ngspice 39 INPfindLev): the first "level"
 * after the model's name, then blanks, '=', ',', '(', ')' or '+', then a number rounded to the
 * nearest integer; 1 without one or when it is out of 0..99.
 */
static int model_level(const char **t, size_t n)
{
	for (size_t i = 2; i < n; i++) {
		const char *p = strstr(t[i], "level");
		double v;
		char *end;

		if (!p)
			continue;
		p += strlen("level");
		p += strspn(p, " \t=,()+");
		if (!*p && i + 1 < n)
			p = t[i + 1] + strspn(t[i + 1], " \t=,()+");
		v = strtod(p, &end);
		return end == p || !(v >= -0.5 && v < 99.5) ? 1 : (int)(v + 0.5);
	}
	return 1;
}

static enum sch_err model_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
			       const char **t, size_t n)
{
	struct sch_model *m;
	size_t type_len;
	enum sch_err ret;

	if (n < 3 || t[2][0] == '(')
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "'.model' needs a name and a type");
	if (GROW(ld->models, ld->n_models, ld->a_models) != SCH_OK)
		return SCH_ERR_NOMEM;
	type_len = strcspn(t[2], "(");
	m = &ld->models[ld->n_models];
	m->name = t[1];
	m->type = sch_arena_strndup(&ld->deck->arena, t[2], type_len);
	if (!m->type)
		return SCH_ERR_NOMEM;
	m->level = model_level(t, n);
	if ((ret = sch_deck_code_model_file(ld, file, line, m->type, &text)) != SCH_OK)
		return ret;
	m->card = (int)ld->n_cards;
	m->subckt = ld->n_open ? ld->open[ld->n_open - 1] : -1;
	ld->n_models++;
	return add_card(ld, file, line, text, t[0], -1);
}

/* "v( out , ref )" -> "v(out,ref)" */
static const char *squeeze(struct sch_arena *a, const char *s)
{
	size_t n = strlen(s), k = 0;
	char *out = sch_arena_alloc(a, n + 1);

	if (!out)
		return NULL;
	for (size_t i = 0; i < n; i++)
		if (!is_blank(s[i]))
			out[k++] = s[i];
	out[k] = '\0';
	return out;
}

static enum sch_err noise_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
			       const char **t, size_t n)
{
	struct sch_noise_spec *ns = &ld->deck->noise;
	char q[SCH_DECK_QUOTE_MAX + 8];

	if (n < 7)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line,
				      "'.noise' needs an output, an input source, a sweep type, a point count and two frequencies");
	if (strcmp(t[3], "dec") != 0 && strcmp(t[3], "oct") != 0 && strcmp(t[3], "lin") != 0)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "unknown sweep type%s in '.noise'",
				      sch_deck_quote(ld->deck, file, t[3], "", q, sizeof(q)));
	for (size_t i = 4; i < n && i < 8; i++)
		if (sch_deck_check_number(ld, file, line, t[i]) != SCH_OK)
			return SCH_ERR_INPUT;
	if (ld->noise_seen || ld->n_open) {
		sch_diag_report(ld->d, SCH_NOTE, file, line, "'.noise' line not used for the report defaults%s",
				ld->n_open ? " (inside a subcircuit)" : " (not the first one)");
	} else {
		ld->noise_seen = true;
		ns->present = true;
		ns->output = squeeze(&ld->deck->arena, t[1]);
		if (!ns->output)
			return SCH_ERR_NOMEM;
		ns->input = t[2];
		ns->sweep = t[3];
		ns->n_points = t[4];
		ns->f_start = t[5];
		ns->f_stop = t[6];
		ns->pts_per_summary = n > 7 ? t[7] : NULL;
		ns->card = (int)ld->n_cards;
	}
	return add_card(ld, file, line, text, t[0], -1);
}

static bool dot_needs_tokens(const char *text, size_t len)
{
	static const char *const words[] = { ".subckt", ".ends", ".model", ".noise", ".temp", NULL };

	for (int i = 0; words[i]; i++) {
		size_t k = strlen(words[i]);
		if (len >= k) {
			size_t j;
			for (j = 0; j < k && lower(text[j]) == words[i][j]; j++)
				;
			if (j == k && (len == k || is_blank(text[k]) || text[k] == '(' || text[k] == ','))
				return true;
		}
	}
	return false;
}

static enum sch_err dot_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
			     size_t len)
{
	const char *stored;
	const char **t;
	const char *kw;
	size_t n;

	if (sch_deck_tokenize(ld, text, len, dot_needs_tokens(text, len) ? SIZE_MAX : 1) != SCH_OK ||
	    sch_deck_pack(ld, text, len, &stored, &t) != SCH_OK)
		return SCH_ERR_NOMEM;
	n = ld->n_tok;
	kw = t[0];
	if (strcmp(kw, ".subckt") == 0)
		return subckt_card(ld, file, line, stored, t, n);
	if (strncmp(kw, ".ends", 5) == 0)
		return ends_card(ld, file, line);
	if (strcmp(kw, ".model") == 0)
		return model_card(ld, file, line, stored, t, n);
	if (strcmp(kw, ".noise") == 0)
		return noise_card(ld, file, line, stored, t, n);
	if (strcmp(kw, ".temp") == 0)
		for (size_t i = 1; i < n; i++)
			if (sch_deck_check_number(ld, file, line, t[i]) != SCH_OK)
				return SCH_ERR_INPUT;
	return add_card(ld, file, line, stored, kw, -1);
}

enum sch_err sch_deck_load_card(struct sch_deck_load *ld, const char *file, long line,
				const char *text, size_t len)
{
	bool keep;
	enum sch_err ret;

	if (len == 0)
		return SCH_OK;
	if (text[0] != '.')
		return element_card(ld, file, line, text, len);
	/* the allow-list: a dropped card never reaches the deck, an options card may come back rewritten */
	ret = sch_deck_screen_dot(ld, file, line, &text, &len, &keep);
	if (ret != SCH_OK || !keep)
		return ret;
	return dot_card(ld, file, line, text, len);
}
