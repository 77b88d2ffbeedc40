/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * deck_cards.c - the deck reader's card level: tokens, elements, .subckt/.ends, .model, .noise,
 * the whole-deck checks, and the lookups of deck.h (models, subcircuits, element nodes).
 */
#include <limits.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "deck_int.h"
#include "schrot/si.h"

/* ---- small helpers ---------------------------------------------------------------------- */

/* The capacity that holds entry n (doubling from 16), or 0 when it would overflow. */
static size_t grown_capacity(size_t alloc, size_t n, size_t size)
{
	size_t want = alloc ? alloc * 2 : 16;

	if (want <= n)
		want = n + 1;
	return want > SIZE_MAX / size || want > (size_t)INT_MAX ? 0 : want;
}

enum sch_err sch_deck_grow(void **data, size_t *alloc, size_t n, size_t size)
{
	size_t want;
	void *p;

	if (n < *alloc)
		return SCH_OK;
	if (!(want = grown_capacity(*alloc, n, size)) || !(p = realloc(*data, want * size)))
		return SCH_ERR_NOMEM;
	*data = p;
	*alloc = want;
	return SCH_OK;
}

enum sch_err sch_deck_arena_grow(struct sch_arena *a, void **data, size_t *alloc, size_t n, size_t size)
{
	size_t want;
	void *p;

	if (n < *alloc)
		return SCH_OK;
	if (!(want = grown_capacity(*alloc, n, size)) || !(p = sch_arena_alloc(a, want * size)))
		return SCH_ERR_NOMEM;
	if (*alloc)
		memcpy(p, *data, *alloc * size);
	*data = p;
	*alloc = want;
	return SCH_OK;
}

#define GROW(arr, n, a) sch_deck_grow((void **)&(arr), &(a), (n), sizeof(*(arr)))
#define ARENA_GROW(ld, arr, n, a) \
	sch_deck_arena_grow(&(ld)->deck->arena, (void **)&(arr), &(a), (n), sizeof(*(arr)))

static inline bool is_blank(char c)
{
	return c == ' ' || c == '\t' || c == '\r' || c == '\f' || c == '\v';
}

static inline char lower(char c)
{
	return (c >= 'A' && c <= 'Z') ? (char)(c + ('a' - 'A')) : c;
}

static inline bool is_alpha(char c)
{
	return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');
}

static bool has_prefix(const char *s, const char *prefix)
{
	return strncmp(s, prefix, strlen(prefix)) == 0;
}

const char *sch_deck_quote(const struct sch_deck *deck, const char *file, const char *tok, const char *fallback,
			   char *buf, size_t size)
{
	size_t n, cut;

	if (!size)
		return buf;
	if (!tok || !deck || file != deck->path) {
		snprintf(buf, size, "%s", fallback);
		return buf;
	}
	n = strlen(tok);
	cut = n > SCH_DECK_QUOTE_MAX ? SCH_DECK_QUOTE_MAX : n;
	while (cut < n && cut > 0 && ((unsigned char)tok[cut] & 0xc0) == 0x80)
		cut--; /* never split a UTF-8 sequence */
	snprintf(buf, size, " '%.*s%s'", (int)cut, tok, cut < n ? "..." : "");
	return buf;
}

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

/* ---- tokens ------------------------------------------------------------------------------ */

static enum sch_err push_token_start(struct sch_deck_load *ld, size_t at)
{
	if (GROW(ld->tok_off, ld->n_tok, ld->a_tok) != SCH_OK)
		return SCH_ERR_NOMEM;
	ld->tok_off[ld->n_tok++] = at;
	return SCH_OK;
}

/* Character classes for the tokenizer's inner loop. */
enum { CH_PLAIN = 0, CH_BLANK = 1, CH_COMMA = 2, CH_OPEN = 3, CH_CLOSE = 4, CH_QUOTE = 5, CH_EQUALS = 6 };

static const unsigned char char_class[256] = {
	[' '] = CH_BLANK, ['\t'] = CH_BLANK, ['\r'] = CH_BLANK, ['\f'] = CH_BLANK, ['\v'] = CH_BLANK,
	[','] = CH_COMMA, ['('] = CH_OPEN, ['{'] = CH_OPEN, ['['] = CH_OPEN, [')'] = CH_CLOSE,
	['}'] = CH_CLOSE, [']'] = CH_CLOSE, ['\''] = CH_QUOTE, ['"'] = CH_QUOTE, ['='] = CH_EQUALS,
};

/*
 * Splits text into lower-case tokens in ld->scratch (NUL-separated, starts in ld->tok_off).
 * Blanks and commas separate; "(...)", "{...}", "[...]" and quotes stay inside one token;
 * "a = 1" becomes "a=1". At most max_tok tokens are read. This is the reader's hot loop.
 */
static enum sch_err tokenize(struct sch_deck_load *ld, const char *text, size_t len, size_t max_tok)
{
	size_t i = 0;
	char *out;
	size_t k = 0;

	/* Every byte is copied at most once, plus one NUL per token (at most one per byte). */
	if (len > (SIZE_MAX - 1) / 2 || sch_deck_grow((void **)&ld->scratch, &ld->a_scratch, 2 * len + 1, 1) != SCH_OK)
		return SCH_ERR_NOMEM;
	out = ld->scratch;
	ld->n_tok = 0;
	while (ld->n_tok < max_tok) {
		int depth = 0;

		while (i < len && (char_class[(unsigned char)text[i]] == CH_BLANK ||
				   char_class[(unsigned char)text[i]] == CH_COMMA))
			i++;
		if (i >= len)
			break;
		if (push_token_start(ld, k) != SCH_OK)
			return SCH_ERR_NOMEM;
		while (i < len) {
			char c = text[i];
			unsigned cls = char_class[(unsigned char)c];

			if (cls == CH_PLAIN) {
				out[k++] = lower(c);
				i++;
				continue;
			}
			if (depth == 0 && (cls == CH_BLANK || cls == CH_COMMA)) {
				size_t j = i;

				while (j < len && is_blank(text[j]))
					j++;
				if (j < len && text[j] == '=') {
					i = j; /* "a =1": the '=' joins the token */
					continue;
				}
				break;
			}
			if (cls == CH_QUOTE) {
				size_t end = i + 1;

				while (end < len && text[end] != c)
					end++;
				if (end < len)
					end++;
				for (; i < end; i++)
					out[k++] = lower(text[i]);
				continue;
			}
			if (cls == CH_OPEN)
				depth++;
			else if (cls == CH_CLOSE && depth > 0)
				depth--;
			out[k++] = c;
			i++;
			if (cls == CH_EQUALS) /* "a= 1" */
				while (i < len && is_blank(text[i]))
					i++;
		}
		out[k++] = '\0';
	}
	ld->scratch_len = k;
	return SCH_OK;
}

/*
 * Moves the card text and the scratch tokens into the arena. Sets *text_out and *toks (n_tok
 * pointers, NULL when there are none).
 */
static enum sch_err pack(struct sch_deck_load *ld, const char *text, size_t len, const char **text_out,
			 const char ***toks)
{
	/* One arena block per card: the token pointers first (aligned), then the text and tokens. */
	size_t ptrs = ld->n_tok * sizeof(const char *);
	char *block = sch_arena_alloc(&ld->deck->arena, ptrs + len + 1 + ld->scratch_len);
	const char **t = (const char **)(void *)block;
	char *chars = block + ptrs;

	if (!block)
		return SCH_ERR_NOMEM;
	memcpy(chars, text, len);
	chars[len] = '\0';
	if (ld->scratch_len)
		memcpy(chars + len + 1, ld->scratch, ld->scratch_len);
	for (size_t i = 0; i < ld->n_tok; i++)
		t[i] = chars + len + 1 + ld->tok_off[i];
	*text_out = chars;
	*toks = ld->n_tok ? t : NULL;
	return SCH_OK;
}

static enum sch_err check_number(struct sch_deck_load *ld, const char *file, long line, const char *tok)
{
	double v;
	char q[SCH_DECK_QUOTE_MAX + 8];

	if (tok && sch_si_looks_numeric(tok) && sch_si_parse(tok, &v) != SCH_OK)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "malformed number%s",
				      sch_deck_quote(ld->deck, file, tok, "", q, sizeof(q)));
	return SCH_OK;
}

/* ---- element cards ----------------------------------------------------------------------- */

/* A token that can only be a value expression or keyword, not a plain node name. */
static bool is_behavioural(const char *t)
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
		return check_number(ld, file, line, t[2]);
	case 'd':
		if (n < 3)
			return too_few(ld, file, line, e->name, "2 nodes and a model");
		return check_number(ld, file, line, n > 3 ? t[3] : NULL);
	case 'q':
		return n < 4 ? too_few(ld, file, line, e->name, "3 nodes and a model") : SCH_OK;
	case 'j':
		return n < 4 ? too_few(ld, file, line, e->name, "3 nodes and a model") : SCH_OK;
	case 'm':
		return n < 5 ? too_few(ld, file, line, e->name, "4 nodes and a model") : SCH_OK;
	case 'i':
	case 'v':
		if (n < 2)
			return too_few(ld, file, line, e->name, "2 nodes");
		if (n > 2 && check_number(ld, file, line, t[2]) != SCH_OK)
			return SCH_ERR_INPUT;
		for (int i = 2; i + 1 < n; i++)
			if ((strcmp(t[i], "dc") == 0 || strcmp(t[i], "ac") == 0) &&
			    check_number(ld, file, line, t[i + 1]) != SCH_OK)
				return SCH_ERR_INPUT;
		return SCH_OK;
	case 'b':
		return n < 2 ? too_few(ld, file, line, e->name, "2 nodes") : SCH_OK;
	case 'e':
	case 'g':
		if (n < 3 || (!is_behavioural(t[2]) && n < 5))
			return too_few(ld, file, line, e->name, "2 nodes and a control (2 nodes and a gain, or an expression)");
		return is_behavioural(t[2]) ? SCH_OK : check_number(ld, file, line, t[4]);
	case 'f':
	case 'h':
		if (n < 3 || (!is_behavioural(t[2]) && n < 4))
			return too_few(ld, file, line, e->name, "2 nodes and a control (a source and a gain)");
		return is_behavioural(t[2]) ? SCH_OK : check_number(ld, file, line, t[3]);
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
	if (tokenize(ld, text, len, SIZE_MAX) != SCH_OK || pack(ld, text, len, &stored, &toks) != SCH_OK ||
	    ARENA_GROW(ld, ld->elements, ld->n_elements, ld->a_elements) != SCH_OK)
		return SCH_ERR_NOMEM;
	e = &ld->elements[ld->n_elements];
	e->name = toks[0];
	e->letter = e->name[0];
	e->tok = toks + 1;
	e->n_tok = (int)ld->n_tok - 1;
	e->card = (int)ld->n_cards;
	e->subckt = ld->n_open ? ld->open[ld->n_open - 1] : -1;
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

static enum sch_err ends_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
			      const char **t)
{
	enum sch_err ret;

	if (ld->n_open == 0)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "'.ends' without '.subckt'");
	/* The card belongs to the definition it closes, so [card_begin, card_end] share the index. */
	ret = add_card(ld, file, line, text, t[0], -1);
	if (ret != SCH_OK)
		return ret;
	ld->subckts[ld->open[ld->n_open - 1]].card_end = (int)ld->n_cards - 1;
	ld->n_open--;
	return SCH_OK;
}

static enum sch_err model_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
			       const char **t, size_t n)
{
	struct sch_model *m;
	size_t type_len;

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
		if (check_number(ld, file, line, t[i]) != SCH_OK)
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

	if (tokenize(ld, text, len, dot_needs_tokens(text, len) ? SIZE_MAX : 1) != SCH_OK ||
	    pack(ld, text, len, &stored, &t) != SCH_OK)
		return SCH_ERR_NOMEM;
	n = ld->n_tok;
	kw = t[0];
	if (strcmp(kw, ".subckt") == 0)
		return subckt_card(ld, file, line, stored, t, n);
	if (strcmp(kw, ".ends") == 0)
		return ends_card(ld, file, line, stored, t);
	if (strcmp(kw, ".model") == 0)
		return model_card(ld, file, line, stored, t, n);
	if (strcmp(kw, ".noise") == 0)
		return noise_card(ld, file, line, stored, t, n);
	if (strcmp(kw, ".temp") == 0)
		for (size_t i = 1; i < n; i++)
			if (check_number(ld, file, line, t[i]) != SCH_OK)
				return SCH_ERR_INPUT;
	return add_card(ld, file, line, stored, kw, -1);
}

enum sch_err sch_deck_load_card(struct sch_deck_load *ld, const char *file, long line,
				const char *text, size_t len)
{
	if (len == 0)
		return SCH_OK;
	if (text[0] == '.')
		return dot_card(ld, file, line, text, len);
	return element_card(ld, file, line, text, len);
}

/* ---- whole-deck checks -------------------------------------------------------------------- */

/* Length of name without a binning suffix ".<digits>", or 0 when it has none. */
static size_t binned_base(const char *name)
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

/* A plain model name: not an expression, a number or a parameter assignment. */
static bool model_name_checkable(const char *t)
{
	return t && is_alpha(t[0]) && !strpbrk(t, "={}'\"()");
}

static bool model_known_ix(const struct sch_names *ix, const char *name)
{
	return sch_names_next(ix, name, strlen(name), -1) >= 0;
}

static enum sch_err check_model_use(struct sch_deck_load *ld, const struct sch_names *mx,
				    const struct sch_element *e)
{
	const struct sch_card *c = &ld->cards[e->card];
	char q[SCH_DECK_QUOTE_MAX + 8];
	int first, last;

	switch (e->letter) {
	case 'd':
		first = last = 2;
		break;
	case 'q':
		first = 3, last = 4;
		break;
	case 'j':
		first = last = 3;
		break;
	case 'm':
		first = 4, last = 7;
		break;
	default:
		return SCH_OK;
	}
	if (!model_name_checkable(e->tok[first]))
		return SCH_OK;
	for (int i = first; i <= last && i < e->n_tok; i++)
		if (model_known_ix(mx, e->tok[i]))
			return SCH_OK;
	return sch_diag_error(ld->d, SCH_ERR_INPUT, c->file, c->line, "model%s is not defined",
			      sch_deck_quote(ld->deck, c->file, e->tok[first], "", q, sizeof(q)));
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
		size_t base = binned_base(name);

		if (sch_names_add(&mx, name, strlen(name), (int)i) != SCH_OK ||
		    (base && sch_names_add(&mx, name, base, (int)i) != SCH_OK))
			goto out;
	}
	for (size_t i = 0; i < ld->n_elements; i++) {
		const struct sch_element *e = &ld->elements[i];
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
		} else if (check_model_use(ld, &mx, e) != SCH_OK) {
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
					      "'.noise' output node%s is not a node of any element at the top level",
					      sch_deck_quote(ld->deck, c->file, name, "", q, sizeof(q)));
		}
		p += len + (p[len] == ',');
	}
	return SCH_OK;
}

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
static enum sch_err check_dc_paths(struct sch_deck_load *ld)
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
		ret = check_noise_nodes(ld);
	if (ret == SCH_OK)
		ret = check_dc_paths(ld);
	if (ret != SCH_OK)
		return ret;
	deck->cards = ld->n_cards ? ld->cards : NULL;
	deck->elements = ld->n_elements ? ld->elements : NULL;
	if (move_to_arena(a, (void **)&deck->subckts, ld->subckts, ld->n_subckts, sizeof(*ld->subckts)) != SCH_OK ||
	    move_to_arena(a, (void **)&deck->models, ld->models, ld->n_models, sizeof(*ld->models)) != SCH_OK ||
	    move_to_arena(a, (void **)&deck->files, ld->files, ld->n_files, sizeof(*ld->files)) != SCH_OK)
		return SCH_ERR_NOMEM;
	deck->n_cards = ld->n_cards;
	deck->n_elements = ld->n_elements;
	deck->n_subckts = ld->n_subckts;
	deck->n_models = ld->n_models;
	deck->n_files = ld->n_files;
	return SCH_OK;
}

void sch_deck_load_release(struct sch_deck_load *ld)
{
	free(ld->subckts);
	free(ld->models);
	free(ld->files);
	free(ld->file_ids);
	free(ld->open);
	free(ld->tok_off);
	free(ld->scratch);
	sch_pattern_free(ld->re_control);
	sch_pattern_free(ld->re_include);
	sch_pattern_free(ld->re_lib);
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
		if (strcmp(m, name) == 0 || (binned_base(m) == len && strncmp(m, name, len) == 0))
			return true;
	}
	return false;
}

int sch_deck_element_nodes(const struct sch_deck *deck, const struct sch_element *e, const char *const **nodes)
{
	int want;

	*nodes = (const char *const *)e->tok;
	switch (e->letter) {
	case 'r': case 'c': case 'l': case 'd': case 'i': case 'v': case 'b': case 'f': case 'h': case 'w':
		want = 2;
		break;
	case 'j': case 'z': case 'u':
		want = 3;
		break;
	case 'm': case 't': case 's': case 'o':
		want = 4;
		break;
	case 'q':
		want = (e->n_tok >= 5 && !model_exists(deck, e->tok[3])) ? 4 : 3;
		break;
	case 'e':
	case 'g':
		want = (e->n_tok >= 3 && is_behavioural(e->tok[2])) ? 2 : 4;
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
