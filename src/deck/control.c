/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * control.c - .control blocks read as data, never run: the noise command (with an op and a
 * set/option temp= before it) becomes the deck's noise analysis when it has no .noise card.
 */
#include <stdio.h>
#include <string.h>
#include "deck_int.h"
#include "schrot/si.h"

/* Most not-honoured commands a note names one by one per group; the rest are counted. */
#define CONTROL_LIST_MAX 8

/* A node or source name that may reach a simulator command: the characters plan.c accepts too. */
static bool safe_name(const char *s, size_t n)
{
	if (n == 0 || n > 200)
		return false;
	for (size_t i = 0; i < n; i++) {
		char c = s[i];
		if (!((c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '_' || c == '.' || c == '#' ||
		      c == '+' || c == '-' || c == '[' || c == ']'))
			return false;
	}
	return true;
}

/* "v(out)" or "v(out,ref)" (blanks inside already allowed, lower case) rebuilt into buf; false otherwise. */
static bool output_expr(const char *tok, char *buf, size_t size)
{
	char squeezed[256];
	size_t n = 0;
	const char *a, *comma;

	for (const char *p = tok; *p; p++) {
		if (is_blank(*p))
			continue;
		if (n + 1 >= sizeof(squeezed))
			return false;
		squeezed[n++] = *p;
	}
	squeezed[n] = '\0';
	if (n < 4 || strncmp(squeezed, "v(", 2) != 0 || squeezed[n - 1] != ')')
		return false;
	a = squeezed + 2;
	comma = memchr(a, ',', n - 3);
	if (!comma)
		return safe_name(a, n - 3) && snprintf(buf, size, "v(%.*s)", (int)(n - 3), a) < (int)size;
	return safe_name(a, (size_t)(comma - a)) && safe_name(comma + 1, (size_t)(squeezed + n - 1 - comma - 1)) &&
	       snprintf(buf, size, "v(%.*s,%.*s)", (int)(comma - a), a, (int)(squeezed + n - 2 - comma), comma + 1) <
		       (int)size;
}

/* A number the simulator reads as we do, rebuilt from its value into buf; false otherwise. */
static bool number(const char *tok, char *buf, size_t size)
{
	double v;

	double back;

	if (!tok || sch_si_parse(tok, &v) != SCH_OK)
		return false;
	/* the shortest of %.15g..%.17g that reads back as the same double */
	for (int digits = 15; digits <= 17; digits++) {
		snprintf(buf, size, "%.*g", digits, v);
		if (sch_si_parse(buf, &back) == SCH_OK && back == v)
			break;
	}
	return true;
}

/*
 * The noise command in t[0..n) as a .noise card rebuilt from its checked tokens, in the arena;
 * NULL when it is not "noise v(out[,ref]) src dec|oct|lin N F1 F2 [pts]" with plain names and numbers.
 */
static const char *rebuild_noise(struct sch_deck_load *ld, const char *const *t, size_t n)
{
	char out[300], np[40], f1[40], f2[40], pts[40] = "";

	if (n < 7 || n > 8 || !output_expr(t[1], out, sizeof(out)) || !safe_name(t[2], strlen(t[2])) ||
	    (t[2][0] != 'v' && t[2][0] != 'i') ||
	    (strcmp(t[3], "dec") != 0 && strcmp(t[3], "oct") != 0 && strcmp(t[3], "lin") != 0) ||
	    !number(t[4], np, sizeof(np)) || !number(t[5], f1, sizeof(f1)) || !number(t[6], f2, sizeof(f2)) ||
	    (n == 8 && !number(t[7], pts + 1, sizeof(pts) - 1)))
		return NULL;
	if (n == 8)
		pts[0] = ' ';
	return sch_arena_printf(&ld->deck->arena, ".noise %s %s %s %s %s %s%s", out, t[2], t[3], np, f1, f2, pts);
}

/* Lists a command that is not honoured. SCH_ERR_NOMEM on failure. */
static enum sch_err skip(struct sch_deck_load *ld, const char *file, long line, const char *word)
{
	struct sch_control_scan *cs = &ld->control;
	char q[SCH_DECK_QUOTE_MAX + 8];
	const char *shown = " a command";

	if (word && safe_name(word, strlen(word)))
		shown = sch_deck_quote(ld->deck, file, word, " a command", q, sizeof(q));
	if (ARENA_GROW(ld, cs->skipped, cs->n_skipped, cs->a_skipped) != SCH_OK)
		return SCH_ERR_NOMEM;
	cs->skipped[cs->n_skipped].word = sch_arena_strdup(&ld->deck->arena, shown);
	cs->skipped[cs->n_skipped].file = file;
	cs->skipped[cs->n_skipped].line = line;
	cs->skipped[cs->n_skipped].after_noise = cs->noise_card != NULL;
	return cs->skipped[cs->n_skipped++].word ? SCH_OK : SCH_ERR_NOMEM;
}

/* "set temp=X" / "option temp=X": the rebuilt ".temp X" when every token after the word is temp=X. */
static const char *temp_setting(struct sch_deck_load *ld, const char *const *t, size_t n)
{
	char v[40];

	if (n != 2 || strncmp(t[1], "temp=", 5) != 0 || !number(t[1] + 5, v, sizeof(v)))
		return NULL;
	return sch_arena_printf(&ld->deck->arena, ".temp %s", v);
}

static bool opens_loop(const char *w)
{
	return strcmp(w, "foreach") == 0 || strcmp(w, "while") == 0 || strcmp(w, "repeat") == 0 ||
	       strcmp(w, "dowhile") == 0 || strcmp(w, "if") == 0;
}

/* A noise command: the first one outside loops is taken, every other one listed. */
static enum sch_err noise_command(struct sch_deck_load *ld, const char *file, long line, const char *const *t,
				  size_t n)
{
	struct sch_control_scan *cs = &ld->control;
	const char *card;

	if (cs->depth > 0 || cs->noise_card)
		return skip(ld, file, line, t[0]);
	if (!(card = rebuild_noise(ld, t, n))) {
		sch_diag_report(ld->d, SCH_NOTE, file, line,
				"noise command in '.control' not read: it is not 'noise v(out[,ref]) src dec|oct|lin "
				"N F1 F2 [pts]' with plain names and numbers");
		return skip(ld, file, line, t[0]);
	}
	cs->noise_card = card;
	cs->noise_file = file;
	cs->noise_line = line;
	return SCH_OK;
}

enum sch_err sch_deck_control_line(struct sch_deck_load *ld, const char *file, long line, const char *text,
				   size_t len, bool odd)
{
	struct sch_control_scan *cs = &ld->control;
	const char *t[9];
	const char *w, *temp;
	size_t n;

	if (odd)
		return skip(ld, file, line, NULL);
	if (sch_deck_tokenize(ld, text, len, sizeof(t) / sizeof(t[0])) != SCH_OK)
		return SCH_ERR_NOMEM;
	n = ld->n_tok;
	if (n == 0)
		return SCH_OK;
	for (size_t i = 0; i < n; i++)
		t[i] = ld->scratch + ld->tok_off[i]; /* valid until the next tokenize */
	w = t[0];
	if (strcmp(w, "end") == 0) {
		if (cs->depth > 0)
			cs->depth--;
		return SCH_OK;
	}
	if (strcmp(w, "else") == 0 || strcmp(w, "break") == 0 || strcmp(w, "continue") == 0)
		return SCH_OK;
	if (opens_loop(w)) {
		cs->depth++;
		return skip(ld, file, line, w);
	}
	if (strcmp(w, "noise") == 0)
		return noise_command(ld, file, line, t, n);
	if (cs->depth == 0 && !cs->noise_card && strcmp(w, "op") == 0 && n == 1) {
		cs->op_line = line;
		return SCH_OK;
	}
	if (cs->depth == 0 && !cs->noise_card &&
	    (strcmp(w, "set") == 0 || strcmp(w, "option") == 0 || strcmp(w, "options") == 0) &&
	    (temp = temp_setting(ld, t, n))) {
		cs->temp_card = temp;
		cs->temp_file = file;
		cs->temp_line = line;
		return SCH_OK;
	}
	return skip(ld, file, line, w);
}

void sch_deck_control_end(struct sch_deck_load *ld)
{
	ld->control.depth = 0;
}

/* "where" for an item: "line N" in the noise command's file, "FILE:N" elsewhere. */
static void where(char *buf, size_t size, const struct sch_control_scan *cs, const char *file, long line)
{
	if (file == cs->noise_file)
		snprintf(buf, size, "line %ld", line);
	else
		snprintf(buf, size, "%s:%ld", file, line);
}

/* Lines of one command word a note shows; the rest are counted. */
#define CONTROL_LINES_MAX 4

/* Whether skipped item j is the first of its word and file within its group. */
static bool first_of_word(const struct sch_control_scan *cs, size_t j)
{
	const struct sch_control_skip *s = &cs->skipped[j];

	for (size_t i = 0; i < j; i++) {
		const struct sch_control_skip *o = &cs->skipped[i];
		if (o->after_noise == s->after_noise && o->file == s->file && strcmp(o->word, s->word) == 0)
			return false;
	}
	return true;
}

/* Appends "'word' (lines a, b)" for the word and file of skipped item j, all its lines in the group. */
static enum sch_err list_word(struct sch_buf *b, const struct sch_control_scan *cs, size_t j)
{
	const struct sch_control_skip *s = &cs->skipped[j];
	size_t n = 0;
	enum sch_err ret = SCH_OK;

	for (size_t i = j; i < cs->n_skipped; i++)
		n += cs->skipped[i].after_noise == s->after_noise && cs->skipped[i].file == s->file &&
		     strcmp(cs->skipped[i].word, s->word) == 0;
	if (s->file == cs->noise_file)
		ret = sch_buf_printf(b, "%s (line%s", s->word, n > 1 ? "s" : "");
	else
		ret = sch_buf_printf(b, "%s (%s:", s->word, s->file);
	for (size_t i = j, k = 0; ret == SCH_OK && i < cs->n_skipped && k < CONTROL_LINES_MAX; i++) {
		const struct sch_control_skip *o = &cs->skipped[i];
		if (o->after_noise == s->after_noise && o->file == s->file && strcmp(o->word, s->word) == 0)
			ret = sch_buf_printf(b, "%s%ld", k++ ? ", " : (s->file == cs->noise_file ? " " : ""), o->line);
	}
	if (ret == SCH_OK && n > CONTROL_LINES_MAX)
		ret = sch_buf_printf(b, ", ... %zu in all", n);
	return ret == SCH_OK ? sch_buf_adds(b, ")") : ret;
}

/*
 * Appends the skipped commands before (after_noise false) or after the noise command to b, one
 * entry per command word with its lines, the first CONTROL_LIST_MAX words by first appearance.
 */
static enum sch_err list_group(struct sch_buf *b, const struct sch_control_scan *cs, bool after_noise)
{
	size_t shown = 0, words = 0;

	for (size_t i = 0; i < cs->n_skipped; i++) {
		if (cs->skipped[i].after_noise != after_noise || !first_of_word(cs, i))
			continue;
		if (words++ >= CONTROL_LIST_MAX)
			continue;
		if ((shown++ && sch_buf_adds(b, ",") != SCH_OK) || list_word(b, cs, i) != SCH_OK)
			return SCH_ERR_NOMEM;
	}
	if (words > shown && sch_buf_printf(b, " and %zu other command%s", words - shown, words - shown > 1 ? "s" : "") != SCH_OK)
		return SCH_ERR_NOMEM;
	return SCH_OK;
}

static size_t count_group(const struct sch_control_scan *cs, bool after_noise)
{
	size_t k = 0;

	for (size_t i = 0; i < cs->n_skipped; i++)
		k += cs->skipped[i].after_noise == after_noise;
	return k;
}

/* The note that lists what the blocks hold and schrot does not do; NULL (no error) when nothing. */
static enum sch_err skipped_note(struct sch_deck_load *ld, const char **note)
{
	const struct sch_control_scan *cs = &ld->control;
	size_t before = count_group(cs, false), after = count_group(cs, true);
	struct sch_buf b;
	enum sch_err ret = SCH_ERR_NOMEM;
	static const char head[] = "not honoured from '.control' (never run):";

	*note = NULL;
	if (!before && !after)
		return SCH_OK;
	sch_buf_init(&b, 1 << 16);
	if (sch_buf_add(&b, head, strlen(head)) != SCH_OK)
		goto out;
	if (before && (sch_buf_adds(&b, " before the noise command, where they may change its result:") != SCH_OK ||
		       list_group(&b, cs, false) != SCH_OK))
		goto out;
	if (before && after && sch_buf_adds(&b, ";") != SCH_OK)
		goto out;
	if (after && (sch_buf_adds(&b, before ? " after it:" : " after the noise command:") != SCH_OK ||
		      list_group(&b, cs, true) != SCH_OK))
		goto out;
	if (!(*note = sch_arena_strndup(&ld->deck->arena, b.data, b.len)))
		goto out;
	ret = SCH_OK;
out:
	sch_buf_release(&b);
	return ret;
}

/* The note naming where the noise analysis came from and what else was honoured. */
static const char *taken_note(struct sch_deck_load *ld)
{
	const struct sch_control_scan *cs = &ld->control;
	char op[128] = "", temp[400] = "", at[300];

	if (cs->op_line)
		snprintf(op, sizeof(op), "; its op (line %ld) is the operating point schrot computes anyway",
			 cs->op_line);
	if (cs->temp_card) {
		where(at, sizeof(at), cs, cs->temp_file, cs->temp_line);
		snprintf(temp, sizeof(temp), "; its temperature setting (%s) is applied as '%s'", at, cs->temp_card);
	}
	return sch_arena_printf(&ld->deck->arena,
				"noise analysis read from the '.control' block at %s:%ld as data (the block is never "
				"run): '%s'%s%s",
				cs->noise_file, cs->noise_line, cs->noise_card + 1, op, temp);
}

enum sch_err sch_deck_control_finish(struct sch_deck_load *ld)
{
	struct sch_control_scan *cs = &ld->control;
	struct sch_deck *deck = ld->deck;
	const char *skipped;
	enum sch_err ret;

	if (!cs->noise_card)
		return SCH_OK;
	if (ld->noise_seen) {
		sch_diag_report(ld->d, SCH_NOTE, cs->noise_file, cs->noise_line,
				"noise command in '.control' not used: the deck's '.noise' line is");
		return SCH_OK;
	}
	if ((ret = sch_deck_load_card(ld, cs->noise_file, cs->noise_line, cs->noise_card, strlen(cs->noise_card))) !=
	    SCH_OK)
		return ret;
	deck->noise.from_control = true;
	if (cs->temp_card &&
	    (ret = sch_deck_load_card(ld, cs->temp_file, cs->temp_line, cs->temp_card, strlen(cs->temp_card))) != SCH_OK)
		return ret;
	if (skipped_note(ld, &skipped) != SCH_OK)
		return SCH_ERR_NOMEM;
	deck->notes = sch_arena_alloc(&deck->arena, 2 * sizeof(*deck->notes));
	if (!deck->notes || !(deck->notes[0] = taken_note(ld)))
		return SCH_ERR_NOMEM;
	deck->n_notes = 1;
	if (skipped)
		deck->notes[deck->n_notes++] = skipped;
	for (size_t i = 0; i < deck->n_notes; i++)
		sch_diag_report(ld->d, SCH_NOTE, cs->noise_file, cs->noise_line, "%s", deck->notes[i]);
	return SCH_OK;
}
