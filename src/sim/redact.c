/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * redact.c - keeps text of included files out of what the simulator says: words only the deck's
 * private lines (request->private_lines) hold are replaced before any message leaves the session.
 */
#include <ctype.h>
#include <stdbool.h>
#include <stdlib.h>
#include <string.h>

#include "sim_int.h"

#define SCH_REDACT_MARK "\xe2\x80\xa6" /* U+2026, "…" */

static bool is_word_byte(unsigned char c)
{
	return isalnum(c) || c == '_' || c >= 0x80;
}

/* Words the session reads in the simulator's text itself ("Error on line 4"), never replaced. */
static bool is_kept_word(const char *w, size_t n)
{
	static const char *const kept[] = { "error", "warning", "on", "line" };
	bool digits = true;

	for (size_t i = 0; i < n; i++)
		digits = digits && isdigit((unsigned char)w[i]);
	if (digits)
		return true;
	for (size_t i = 0; i < sizeof(kept) / sizeof(kept[0]); i++)
		if (strlen(kept[i]) == n && strncmp(kept[i], w, n) == 0)
			return true;
	return false;
}

/* Adds the words of line (lower-cased into r->text at *used) as private (1) or public (2). */
static enum sch_err add_words(struct sch_redact *r, const char *line, bool private_line, size_t *used)
{
	for (const char *p = line; *p;) {
		const char *start;
		size_t n;
		int old;

		if (!is_word_byte((unsigned char)*p)) {
			p++;
			continue;
		}
		start = p;
		while (is_word_byte((unsigned char)*p))
			p++;
		n = (size_t)(p - start);
		for (size_t i = 0; i < n; i++)
			r->text[*used + i] = (char)tolower((unsigned char)start[i]);
		old = sch_strmap_get(&r->words, r->text + *used, n);
		if (old == 2 || (old == 1 && private_line))
			continue;
		if (sch_strmap_put(&r->words, r->text + *used, n, private_line ? 1 : 2) != SCH_OK)
			return SCH_ERR_NOMEM;
		*used += n;
	}
	return SCH_OK;
}

enum sch_err sch_redact_init(struct sch_redact *r, const struct sch_sim_request *req)
{
	size_t total = 0, used = 0;
	bool any = false;

	memset(r, 0, sizeof(*r));
	sch_strmap_init(&r->words);
	for (size_t i = 0; req->private_lines && i < req->n_lines; i++)
		any = any || req->private_lines[i];
	any = any || req->n_private_texts;
	if (!any)
		return SCH_OK;
	for (size_t i = 0; i < req->n_lines; i++)
		total += req->lines[i] ? strlen(req->lines[i]) : 0;
	for (size_t i = 0; i < req->n_private_texts; i++)
		total += strlen(req->private_texts[i]);
	r->text = malloc(total + 1);
	if (!r->text)
		return SCH_ERR_NOMEM;
	r->active = true;
	for (size_t i = 0; i < req->n_lines; i++)
		if (req->lines[i] && add_words(r, req->lines[i], req->private_lines && req->private_lines[i], &used) != SCH_OK)
			return SCH_ERR_NOMEM;
	for (size_t i = 0; i < req->n_private_texts; i++)
		if (add_words(r, req->private_texts[i], true, &used) != SCH_OK)
			return SCH_ERR_NOMEM;
	return SCH_OK;
}

void sch_redact_release(struct sch_redact *r)
{
	sch_strmap_release(&r->words);
	free(r->text);
	memset(r, 0, sizeof(*r));
}

/* Whether the word at w (n bytes, any case) is one only private lines hold. */
static bool is_private_word(const struct sch_redact *r, const char *w, size_t n)
{
	char low[256];

	if (n >= sizeof(low))
		return true; /* no deck word is that long outside an included file's expression: leave it out */
	for (size_t i = 0; i < n; i++)
		low[i] = (char)tolower((unsigned char)w[i]);
	return !is_kept_word(low, n) && sch_strmap_get(&r->words, low, n) == 1;
}

char *sch_redact_text(const struct sch_redact *r, const char *text, bool *changed)
{
	size_t len = strlen(text), cap = len + 1, k = 0;
	char *out;

	*changed = false;
	if (!r->active)
		return NULL;
	for (const char *p = text; *p;) {
		const char *start = p;

		while (*p && !is_word_byte((unsigned char)*p))
			p++;
		if (p == start) {
			while (is_word_byte((unsigned char)*p))
				p++;
			if (is_private_word(r, start, (size_t)(p - start))) {
				*changed = true;
				cap += sizeof(SCH_REDACT_MARK);
			}
		}
	}
	if (!*changed)
		return NULL;
	out = malloc(cap);
	if (!out)
		return NULL;
	for (const char *p = text; *p;) {
		const char *start = p;
		size_t n;

		if (!is_word_byte((unsigned char)*p)) {
			out[k++] = *p++;
			continue;
		}
		while (is_word_byte((unsigned char)*p))
			p++;
		n = (size_t)(p - start);
		if (is_private_word(r, start, n)) {
			memcpy(out + k, SCH_REDACT_MARK, sizeof(SCH_REDACT_MARK) - 1);
			k += sizeof(SCH_REDACT_MARK) - 1;
		} else {
			memcpy(out + k, start, n);
			k += n;
		}
	}
	out[k] = '\0';
	return out;
}
