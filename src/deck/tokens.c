/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * tokens.c - the deck reader's token level: growable arrays, splitting a card into lower-case
 * tokens, packing them into the arena, checking numbers and quoting a token in a message.
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
enum sch_err sch_deck_tokenize(struct sch_deck_load *ld, const char *text, size_t len, size_t max_tok)
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
enum sch_err sch_deck_pack(struct sch_deck_load *ld, const char *text, size_t len, const char **text_out,
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

enum sch_err sch_deck_check_number(struct sch_deck_load *ld, const char *file, long line, const char *tok)
{
	double v;
	char q[SCH_DECK_QUOTE_MAX + 8];

	if (tok && sch_si_looks_numeric(tok) && sch_si_parse(tok, &v) != SCH_OK)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "malformed number%s",
				      sch_deck_quote(ld->deck, file, tok, "", q, sizeof(q)));
	return SCH_OK;
}
