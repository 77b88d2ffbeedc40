/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * table.c - E/G TABLE sources as the simulated deck holds them: a behavioural pwl() of the same
 * points, because the simulator's TABLE code model gives a wrong small-signal gain in a noise run.
 */
#include <ctype.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include "schrot/augment.h"
#include "schrot/si.h"

#define SCH_TABLE_MAX_POINTS 512

/* The word "table" as its own token in text (any case), or NULL. */
static const char *find_table_word(const char *text)
{
	for (const char *p = text; *p; p++) {
		if (strncasecmp(p, "table", 5) != 0)
			continue;
		if ((p == text || isspace((unsigned char)p[-1])) && (p[5] == '{' || isspace((unsigned char)p[5])))
			return p;
	}
	return NULL;
}

/* The end of the brace group starting at p ('{'), just past its closing brace; NULL when unbalanced. */
static const char *brace_end(const char *p)
{
	int depth = 0;

	for (; *p; p++) {
		if (*p == '{')
			depth++;
		else if (*p == '}' && --depth == 0)
			return p + 1;
	}
	return NULL;
}

/* Splits the points text into number tokens at blanks, commas, '=' and parentheses. */
static int split_points(const char *s, char tok[][64], int max)
{
	int n = 0;

	while (*s) {
		size_t len = 0;

		while (*s && (isspace((unsigned char)*s) || *s == ',' || *s == '(' || *s == ')' || *s == '='))
			s++;
		if (!*s)
			break;
		if (n == max)
			return -1;
		while (s[len] && !isspace((unsigned char)s[len]) && s[len] != ',' && s[len] != '(' && s[len] != ')' &&
		       s[len] != '=')
			len++;
		if (len >= 64)
			return -1;
		memcpy(tok[n], s, len);
		tok[n][len] = '\0';
		n++;
		s += len;
	}
	return n;
}

/* Whether the n tokens are x, y pairs with numeric, rising x and plain y (a number or a name). */
static bool points_are_plain(char tok[][64], int n)
{
	double x, x_prev = 0;

	if (n < 4 || n % 2 != 0)
		return false;
	for (int k = 0; k < n; k += 2) {
		if (sch_si_parse(tok[k], &x) != SCH_OK || (k > 0 && !(x > x_prev)))
			return false;
		for (const char *c = tok[k + 1]; *c; c++)
			if (!(isalnum((unsigned char)*c) || *c == '.' || *c == '-' || *c == '+' || *c == '_'))
				return false;
		x_prev = x;
	}
	return true;
}

/* The rewritten card from its parts, in arena; NULL when out of memory. */
static const char *write_pwl(struct sch_arena *arena, const char *text, const char *word, const char *open,
			     const char *close, char tok[][64], int n)
{
	double x_first, x_last, d;
	size_t cap = (size_t)(word - text) + (size_t)(close - open) + (size_t)n * 66 + 160, len;
	char *out = sch_arena_alloc(arena, cap);

	if (!out)
		return NULL;
	sch_si_parse(tok[0], &x_first);
	sch_si_parse(tok[n - 2], &x_last);
	/* flat beyond the ends, as the TABLE holds its end values */
	d = (x_last - x_first) / 2;
	len = (size_t)snprintf(out, cap, "%.*svalue={pwl(%.*s, %.15g, %s", (int)(word - text), text,
			       (int)(close - open - 2), open + 1, x_first - d, tok[1]);
	for (int k = 0; k < n && len < cap; k += 2)
		len += (size_t)snprintf(out + len, cap - len, ", %s, %s", tok[k], tok[k + 1]);
	if (len < cap)
		len += (size_t)snprintf(out + len, cap - len, ", %.15g, %s)}", x_last + d, tok[n - 1]);
	return len < cap ? out : NULL;
}

const char *sch_augment_table_as_value(struct sch_arena *arena, const char *text)
{
	const char *word = find_table_word(text), *open, *close, *ret = NULL;
	char (*tok)[64] = NULL;
	int n;

	if (!word)
		goto out;
	open = word + 5;
	while (isspace((unsigned char)*open))
		open++;
	if (*open != '{' || !(close = brace_end(open)))
		goto out;
	tok = malloc((2 * SCH_TABLE_MAX_POINTS + 1) * sizeof(*tok));
	if (!tok)
		goto out;
	n = split_points(close, tok, 2 * SCH_TABLE_MAX_POINTS + 1);
	if (points_are_plain(tok, n))
		ret = write_pwl(arena, text, word, open, close, tok, n);
out:
	free(tok);
	return ret;
}
