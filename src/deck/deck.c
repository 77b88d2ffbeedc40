/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * deck.c - the deck reader's file level: reading files, physical lines into logical cards
 * (comments, '+' continuations), the title, .include/.lib resolution and the dropping of
 * .control blocks and '*#' lines, in the top file and in every file it pulls in.
 */
#include <errno.h>
#include <fcntl.h>
#include <limits.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <sys/stat.h>
#include <unistd.h>
#include "deck_int.h"

#define DECK_MAX_OPENS 10000            /* include/library reads per deck: bounds fan-out, not depth */

enum src_mode { SRC_TOP, SRC_INCLUDE, SRC_LIB };

/* Where a file's reader is: reading cards, or skipping text that must never reach the simulator. */
enum src_state {
	ST_CARDS,    /* ordinary reading */
	ST_CONTROL,  /* inside .control ... .endc */
	ST_DEF_SKIP, /* inside a .lib NAME ... .endl section definition that nobody asked for */
	ST_OUTSIDE   /* library file read for one section: not inside it (yet) */
};

struct src {
	const char *path;    /* as opened, in the arena */
	const char *id;      /* canonical identity, in the arena */
	const char *section; /* SRC_LIB: the section wanted (as written) */
	enum src_mode mode;
	enum src_state state;
	bool found;          /* SRC_LIB: the section was seen */
	bool stop;           /* .end in the top file, .endl closing the wanted section */
	long def_line;       /* ST_DEF_SKIP: line of the .lib NAME card that opened the definition */
	const char *def_name; /* ST_DEF_SKIP: its NAME (arena) */
};

struct reader {
	struct sch_deck_load ld;
	const struct src *stack[SCH_MAX_INCLUDE_DEPTH + 1];
	int depth;
	int n_opens;
	long script_line; /* line of a '*ng_script' title marker in the top file, 0 without one */
	size_t total_bytes;  /* read so far, top file included: at most DECK_MAX_TOTAL */
};

static enum sch_err read_source(struct reader *r, struct src *src, const char *text, size_t len);

static bool ci_prefix(const char *s, size_t n, const char *prefix)
{
	size_t k = strlen(prefix);

	return n >= k && strncasecmp(s, prefix, k) == 0;
}

/* A byte no netlist text may hold: C0 controls other than the blanks, and DEL. */
static inline bool is_control(unsigned char c)
{
	return (c < 0x20 && c != '\t' && c != '\f' && c != '\v') || c == 0x7f;
}


/* Bytes that send a line to check_text: controls other than tab, DEL and everything not ASCII. */
#define ODD(c) ((c) < 0x20 ? (c) != '\t' : (c) >= 0x7f)
#define ODD_ROW(b)                                                                                          \
	ODD(b + 0), ODD(b + 1), ODD(b + 2), ODD(b + 3), ODD(b + 4), ODD(b + 5), ODD(b + 6), ODD(b + 7),      \
	ODD(b + 8), ODD(b + 9), ODD(b + 10), ODD(b + 11), ODD(b + 12), ODD(b + 13), ODD(b + 14), ODD(b + 15)
static const unsigned char odd_byte[256] = {
	ODD_ROW(0x00), ODD_ROW(0x10), ODD_ROW(0x20), ODD_ROW(0x30), ODD_ROW(0x40), ODD_ROW(0x50),
	ODD_ROW(0x60), ODD_ROW(0x70), ODD_ROW(0x80), ODD_ROW(0x90), ODD_ROW(0xa0), ODD_ROW(0xb0),
	ODD_ROW(0xc0), ODD_ROW(0xd0), ODD_ROW(0xe0), ODD_ROW(0xf0),
};
#undef ODD_ROW
#undef ODD

/*
 * Length of s[0..n) without its inline comment (';' anywhere, '$' at the start or after a
 * blank) and trailing blanks. *odd tells whether a kept byte is not ASCII or is a control byte,
 * so that check_text looks at the line.
 */
static size_t strip_inline(const char *s, size_t n, bool *odd)
{
	unsigned char any = 0;
	size_t i;

	for (i = 0; i < n; i++) {
		unsigned char c = (unsigned char)s[i];

		if (c == ';' || (c == '$' && (i == 0 || is_blank(s[i - 1]))))
			break;
		any |= odd_byte[c];
	}
	while (i > 0 && is_blank(s[i - 1]))
		i--;
	*odd = any != 0;
	return i;
}

/*
 * Netlist text is UTF-8 without control bytes: a carriage return inside a line or a terminal
 * escape must never reach the simulator or a message.
 */
static enum sch_err check_text(struct reader *r, const struct src *src, long line, const char *s, size_t n)
{
	size_t bad = sch_deck_utf8_bad(s, n);

	for (size_t i = 0; i < bad; i++)
		if (is_control((unsigned char)s[i]))
			return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, line,
					      "control character 0x%02x in the text", (unsigned char)s[i]);
	if (bad == n)
		return SCH_OK;
	return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, line, "invalid utf-8 (byte 0x%02x)",
			      (unsigned char)s[bad]);
}

static enum sch_err note_file(struct reader *r, const char *path, const char *id)
{
	struct sch_deck_load *ld = &r->ld;

	for (size_t i = 0; i < ld->n_files; i++)
		if (strcmp(ld->file_ids[i], id) == 0)
			return SCH_OK;
	if (sch_deck_grow((void **)&ld->files, &ld->a_files, ld->n_files, sizeof(*ld->files)) != SCH_OK ||
	    sch_deck_grow((void **)&ld->file_ids, &ld->a_file_ids, ld->n_files, sizeof(*ld->file_ids)) != SCH_OK)
		return SCH_ERR_NOMEM;
	ld->files[ld->n_files] = path;
	ld->file_ids[ld->n_files] = id;
	ld->n_files++;
	return SCH_OK;
}

static const char *identity(struct sch_arena *a, const char *path)
{
	char *real = realpath(path, NULL);
	const char *id = sch_arena_strdup(a, real ? real : path);

	free(real);
	return id;
}

/*
 * Length of an included file's text without the DOS end-of-file byte (0x1A, control-Z) that old
 * vendor model files carry after their last line, with a note; len when there is none. Only blanks
 * and line ends may follow it. Anywhere else 0x1A stays a control character, which check_text
 * refuses (in the top netlist too).
 */
static size_t without_dos_eof(struct reader *r, const char *path, const char *text, size_t len)
{
	size_t n = len;
	long line = 1;

	while (n && (is_blank(text[n - 1]) || text[n - 1] == '\n'))
		n--;
	if (!n || text[n - 1] != 0x1a)
		return len;
	while (n && text[n - 1] == 0x1a)
		n--;
	for (const char *p = text; (p = memchr(p, '\n', (size_t)(text + n - p))); p++)
		line++;
	sch_diag_report(r->ld.d, SCH_NOTE, path, line, "DOS end-of-file byte (0x1a) after the last line: ignored");
	return n;
}

/*
 * Reads an include or library file into *text (malloc'd) within what is left of the cap on all
 * text read for the netlist; a failure is reported at the including card inc_file:inc_line.
 */
static enum sch_err read_included(struct reader *r, const char *path, bool lib, const char *inc_file,
				  long inc_line, char **text, size_t *len)
{
	size_t left = DECK_MAX_TOTAL - r->total_bytes;
	size_t limit = left < DECK_MAX_FILE ? left : DECK_MAX_FILE;
	int err_no;
	char why[128];
	enum sch_err ret = sch_deck_slurp(path, true, limit, text, len, &err_no);

	if (ret == SCH_ERR_INPUT && err_no == EFBIG && limit < DECK_MAX_FILE)
		/* many includes of a large file: the cap is on all text read, not only per file */
		return sch_diag_error(r->ld.d, SCH_ERR_INPUT, inc_file, inc_line,
				      "the netlist and its includes hold more than %zu bytes in all (at '%s')",
				      DECK_MAX_TOTAL, path);
	if (ret == SCH_ERR_INPUT)
		return sch_diag_error(r->ld.d, SCH_ERR_INPUT, inc_file, inc_line, err_no == EISDIR ?
				      "%s file '%s' is a directory%s" : "cannot open %s file '%s': %s",
				      lib ? "library" : "include", path,
				      err_no == EISDIR ? "" : sch_deck_errno_text(err_no, why, sizeof(why)));
	if (ret == SCH_OK)
		r->total_bytes += *len;
	return ret;
}

/*
 * Reads path (named by the card at inc_file:inc_line) as an include file or, when section is
 * given, for that library section.
 */
static enum sch_err open_source(struct reader *r, const char *path, const char *section, const char *inc_file,
				long inc_line)
{
	struct sch_deck_load *ld = &r->ld;
	struct src src = { 0 };
	char *text = NULL;
	size_t len;
	enum sch_err ret;

	if (r->depth > SCH_MAX_INCLUDE_DEPTH) {
		ret = sch_diag_error(ld->d, SCH_ERR_INPUT, inc_file, inc_line,
				     "includes nested more than %d levels deep at '%s'", SCH_MAX_INCLUDE_DEPTH, path);
		goto out;
	}
	if (++r->n_opens > DECK_MAX_OPENS) {
		ret = sch_diag_error(ld->d, SCH_ERR_INPUT, inc_file, inc_line,
				     "more than %d include and library reads at '%s'", DECK_MAX_OPENS, path);
		goto out;
	}
	ret = SCH_ERR_NOMEM;
	src.path = path;
	src.id = identity(&ld->deck->arena, path);
	src.section = section;
	src.mode = section ? SRC_LIB : SRC_INCLUDE;
	src.state = section ? ST_OUTSIDE : ST_CARDS;
	if (!src.id)
		goto out;
	for (int i = 0; i < r->depth; i++) {
		const struct src *o = r->stack[i];
		bool same_section = (!o->section && !section) ||
				    (o->section && section && strcasecmp(o->section, section) == 0);

		if (strcmp(o->id, src.id) == 0 && same_section) {
			ret = sch_diag_error(ld->d, SCH_ERR_INPUT, inc_file, inc_line,
					     "include cycle: '%s'%s%s%s is already being read", path,
					     section ? " section '" : "", section ? section : "", section ? "'" : "");
			goto out;
		}
	}
	ret = read_included(r, path, section != NULL, inc_file, inc_line, &text, &len);
	if (ret != SCH_OK)
		goto out;
	len = without_dos_eof(r, path, text, len);
	ret = SCH_ERR_NOMEM;
	if (note_file(r, path, src.id) != SCH_OK)
		goto out;
	r->stack[r->depth++] = &src;
	ret = read_source(r, &src, text, len);
	r->depth--;
	if (ret == SCH_OK && section && !src.found)
		ret = sch_diag_error(ld->d, SCH_ERR_INPUT, inc_file, inc_line,
				     "library section '%s' not found in '%s'", section, path);
out:
	free(text);
	return ret;
}

/* Argument i (1-based) of an .include/.lib card matched by re, quotes removed; NULL if absent. */
static const char *card_arg(struct reader *r, const struct sch_pattern *re, const char *text, size_t len,
			    int i, size_t *n)
{
	size_t ov[6];
	const char *s;

	if (!sch_pattern_search(re, text, len, 0, ov, 3) || ov[2 * i] == SIZE_MAX)
		return NULL;
	s = text + ov[2 * i];
	*n = ov[2 * i + 1] - ov[2 * i];
	if (*n >= 2 && (s[0] == '"' || s[0] == '\'') && s[*n - 1] == s[0]) {
		s++;
		*n -= 2;
	}
	return s;
}

/*
 * An argument that still starts with a quote after card_arg: its closing quote is missing, most
 * often because a ';' inside the quotes started a comment (ngspice cuts there too).
 */
static bool open_quote(const char *arg)
{
	return arg[0] == '"' || arg[0] == '\'';
}

#define OPEN_QUOTE_MSG "unterminated quote in '%s' file name (';' starts a comment, even inside quotes)"

static enum sch_err include_card(struct reader *r, struct src *src, long line, const char *text, size_t len)
{
	struct sch_arena *a = &r->ld.deck->arena;
	size_t n = 0;
	const char *name = card_arg(r, r->ld.re_include, text, len, 1, &n);
	const char *path;

	if (!name || n == 0)
		return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, line, "'.include' needs a file name");
	if (open_quote(name))
		return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, line, OPEN_QUOTE_MSG, ".include");
	path = sch_deck_resolve(a, src->path, name, n);
	if (!path)
		return SCH_ERR_NOMEM;
	return open_source(r, path, NULL, src->path, line);
}

static enum sch_err lib_card(struct reader *r, struct src *src, long line, const char *text, size_t len)
{
	struct sch_arena *a = &r->ld.deck->arena;
	size_t n1 = 0, n2 = 0;
	const char *file = card_arg(r, r->ld.re_lib, text, len, 1, &n1);
	const char *sec = card_arg(r, r->ld.re_lib, text, len, 2, &n2);
	const char *path, *section;

	if (!file || n1 == 0)
		return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, line,
				      "'.lib' needs a file name and a section");
	if (open_quote(file) || (sec && open_quote(sec)))
		return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, line, OPEN_QUOTE_MSG, ".lib");
	if (!sec) {
		/* ".lib NAME" opens a section definition; it is read only when a .lib FILE NAME asks. */
		src->state = ST_DEF_SKIP;
		src->def_line = line;
		src->def_name = sch_arena_strndup(a, file, n1);
		return src->def_name ? SCH_OK : SCH_ERR_NOMEM;
	}
	path = sch_deck_resolve(a, src->path, file, n1);
	section = sch_arena_strndup(a, sec, n2);
	if (!path || !section)
		return SCH_ERR_NOMEM;
	return open_source(r, path, section, src->path, line);
}

/* One complete logical line of src. */
static enum sch_err flush_card(struct reader *r, struct src *src, long line, const char *text, size_t len)
{
	char kw[16];
	size_t k = 0;

	if (text[0] != '.')
		return sch_deck_load_card(&r->ld, src->path, line, text, len);
	while (k < len && k + 1 < sizeof(kw) && !is_blank(text[k]) && text[k] != '(' && text[k] != '"' &&
	       text[k] != '\'') {
		kw[k] = (char)((text[k] >= 'A' && text[k] <= 'Z') ? text[k] - 'A' + 'a' : text[k]);
		k++;
	}
	kw[k] = '\0';
	/* ngspice takes any card starting ".inc" as an include and ".lib" as a library call. */
	if (strncmp(kw, ".inc", 4) == 0)
		return include_card(r, src, line, text, len);
	if (strncmp(kw, ".endl", 5) == 0) {
		if (src->mode == SRC_LIB)
			src->stop = true;
		return SCH_OK;
	}
	if (strncmp(kw, ".lib", 4) == 0)
		return lib_card(r, src, line, text, len);
	if (strncmp(kw, ".endc", 5) == 0)
		return SCH_OK;
	if (strcmp(kw, ".end") == 0) {
		/* ngspice ignores .end in included files; in the top file it ends the deck. */
		if (src->mode == SRC_TOP)
			src->stop = true;
		return SCH_OK;
	}
	return sch_deck_load_card(&r->ld, src->path, line, text, len);
}

/* In a library file outside the wanted section: does this line open it? */
static bool opens_section(struct reader *r, const struct src *src, const char *s, size_t n)
{
	size_t n1 = 0, n2 = 0;
	const char *name;

	if (!ci_prefix(s, n, ".lib"))
		return false;
	name = card_arg(r, r->ld.re_lib, s, n, 1, &n1);
	if (!name || card_arg(r, r->ld.re_lib, s, n, 2, &n2))
		return false;
	return n1 == strlen(src->section) && strncasecmp(name, src->section, n1) == 0;
}

static void warn_dropped(struct reader *r, const struct src *src, long line, bool control)
{
	if (control) {
		r->ld.deck->n_dropped_control++;
		sch_diag_report(r->ld.d, SCH_WARNING, src->path, line,
				"'.control' block dropped: netlist commands are never run");
	} else {
		r->ld.deck->n_dropped_script++;
		sch_diag_report(r->ld.d, SCH_WARNING, src->path, line,
				"'*#' command line dropped: netlist commands are never run");
	}
}

static enum sch_err take_title(struct reader *r, struct src *src, const char *s, size_t n)
{
	size_t b = 0;

	if (n > SCH_MAX_LINE)
		return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, 1, "title line longer than %zu bytes",
				      SCH_MAX_LINE);
	if (check_text(r, src, 1, s, n) != SCH_OK)
		return SCH_ERR_INPUT;
	r->ld.deck->title = sch_arena_strndup(&r->ld.deck->arena, s, n);
	if (!r->ld.deck->title)
		return SCH_ERR_NOMEM;
	while (b < n && is_blank(s[b]))
		b++;
	if (ci_prefix(s + b, n - b, "*ng_script")) {
		r->script_line = 1;
		sch_diag_report(r->ld.d, SCH_WARNING, src->path, 1,
				"title starts with '*ng_script': it is kept as a title and never run as a script");
	}
	return SCH_OK;
}

/* Where read_source stands in one file: the line being read and the card being joined. */
struct lines {
	struct sch_buf card; /* the pending card, continuation lines joined with one blank */
	long card_line;      /* line the pending card started on */
	bool pending;        /* card holds a card not yet handed on */
	bool in_control;     /* ... a line of a .control block, read as data only */
	bool control_odd;    /* ... which holds bytes other than printable ASCII */
	bool need_title;     /* the next line is the top file's title */
	bool title_blank;    /* the title was blank and the first line after it is still to come */
	long lineno;
};

/* SCH_ERR_INPUT, located at the line of the first NUL byte, when text holds one. */
static enum sch_err refuse_binary(struct reader *r, const struct src *src, const char *text, size_t len)
{
	const char *nul = memchr(text, '\0', len);
	long at = 1;

	if (!nul)
		return SCH_OK;
	for (const char *p = text; p < nul; p++)
		at += *p == '\n';
	return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, at, "binary file");
}

static enum sch_err title_line(struct reader *r, struct src *src, struct lines *ls, const char *s, size_t n)
{
	enum sch_err ret = take_title(r, src, s, n);

	ls->need_title = false;
	if (ret == SCH_OK)
		ls->title_blank = r->ld.deck->title[strspn(r->ld.deck->title, " \t\r\f\v")] == '\0';
	return ret;
}

/* Hands on the pending card: a .control block's line to the block's reader, any other to flush_card. */
static enum sch_err flush_pending(struct reader *r, struct src *src, struct lines *ls)
{
	ls->pending = false;
	if (ls->in_control)
		return sch_deck_control_line(&r->ld, src->path, ls->card_line, ls->card.data, ls->card.len,
					     ls->control_odd);
	return flush_card(r, src, ls->card_line, ls->card.data, ls->card.len);
}

/* A '+' line: its text joins the pending card. */
static enum sch_err continuation_line(struct reader *r, struct src *src, struct lines *ls, const char *s, size_t n)
{
	size_t kept;
	bool odd;

	if (src->state != ST_CARDS && !(src->state == ST_CONTROL && ls->pending))
		return SCH_OK;
	s++;
	n--;
	while (n && is_blank(*s))
		s++, n--;
	kept = strip_inline(s, n, &odd);
	if (!kept)
		return SCH_OK;
	if (src->state == ST_CONTROL)
		ls->control_odd |= odd; /* block text is never checked: it is only read, never sent */
	else if (odd && check_text(r, src, ls->lineno, s, kept) != SCH_OK)
		return SCH_ERR_INPUT;
	if (!ls->pending) {
		sch_diag_report(r->ld.d, SCH_WARNING, src->path, ls->lineno,
				"continuation line with no card to continue: ignored");
		return SCH_OK;
	}
	if (ls->card.len + 1 + kept > SCH_MAX_LINE)
		return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, ls->card_line, "line longer than %zu bytes",
				      SCH_MAX_LINE);
	if (sch_buf_add(&ls->card, " ", 1) != SCH_OK || sch_buf_add(&ls->card, s, kept) != SCH_OK)
		return SCH_ERR_NOMEM;
	return SCH_OK;
}

/* Whether the file's state takes this line (inside .control, a skipped .lib section, or outside it). */
static bool taken_by_state(struct reader *r, struct src *src, const char *s, size_t kept)
{
	if (src->state == ST_CONTROL) {
		if (ci_prefix(s, kept, ".endc"))
			src->state = ST_CARDS;
		return true;
	}
	if (src->state == ST_DEF_SKIP) {
		if (ci_prefix(s, kept, ".endl"))
			src->state = ST_CARDS;
		return true;
	}
	if (src->state == ST_OUTSIDE) {
		if (opens_section(r, src, s, kept)) {
			src->state = ST_CARDS;
			src->found = true;
		}
		return true;
	}
	return false;
}

/* A line of a .control block: held (for its continuations) to be read as data, never run. */
static enum sch_err control_start(struct reader *r, const struct src *src, struct lines *ls, const char *s,
				  size_t kept, bool odd)
{
	if (kept > SCH_MAX_LINE)
		return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, ls->lineno,
				      "line longer than %zu bytes", SCH_MAX_LINE);
	sch_buf_reset(&ls->card);
	if (sch_buf_add(&ls->card, s, kept) != SCH_OK)
		return SCH_ERR_NOMEM;
	ls->card_line = ls->lineno;
	ls->pending = true;
	ls->in_control = true;
	ls->control_odd = odd;
	return SCH_OK;
}

/* A line that is no comment and no continuation: hands on the pending card, then holds this one. */
static enum sch_err card_start(struct reader *r, struct src *src, struct lines *ls, const char *s, size_t n)
{
	bool odd;
	size_t kept = strip_inline(s, n, &odd);
	enum sch_err ret;

	if (!kept)
		return SCH_OK; /* a line holding only an inline comment does not end the card above */
	if (ls->pending) {
		ret = flush_pending(r, src, ls);
		if (ret != SCH_OK || src->stop)
			return ret;
	}
	if (src->state == ST_CONTROL && !ci_prefix(s, kept, ".endc"))
		return control_start(r, src, ls, s, kept, odd);
	if (src->state == ST_CONTROL)
		sch_deck_control_end(&r->ld);
	if (taken_by_state(r, src, s, kept))
		return SCH_OK;
	if (s[0] == '.' && sch_pattern_match(r->ld.re_control, s, kept)) {
		src->state = ST_CONTROL;
		warn_dropped(r, src, ls->lineno, true);
		return SCH_OK;
	}
	if (odd && check_text(r, src, ls->lineno, s, kept) != SCH_OK)
		return SCH_ERR_INPUT;
	if (kept > SCH_MAX_LINE)
		return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, ls->lineno, "line longer than %zu bytes",
				      SCH_MAX_LINE);
	sch_buf_reset(&ls->card);
	if (sch_buf_add(&ls->card, s, kept) != SCH_OK)
		return SCH_ERR_NOMEM;
	ls->card_line = ls->lineno;
	ls->pending = true;
	ls->in_control = false;
	return SCH_OK;
}

/*
 * ngspice continues a line that ends in two backslashes (comments included) on the next one, so
 * the card after it would become part of this one for the simulator and not for the reader.
 */
static bool ends_in_double_backslash(const char *s, size_t n)
{
	while (n > 0 && is_blank(s[n - 1]))
		n--;
	return n >= 2 && s[n - 1] == '\\' && s[n - 2] == '\\';
}

/* One physical line s[0..n), without its newline and carriage return. */
static enum sch_err read_line(struct reader *r, struct src *src, struct lines *ls, const char *s, size_t n)
{
	size_t b = 0;

	if (ls->need_title)
		return title_line(r, src, ls, s, n);
	while (b < n && is_blank(s[b]))
		b++;
	if (b == n)
		return SCH_OK;
	if (ls->title_blank) {
		/* ngspice looks for the script marker past a blank first line too. */
		ls->title_blank = false;
		if (ci_prefix(s + b, n - b, "*ng_script")) {
			r->script_line = ls->lineno;
			sch_diag_report(r->ld.d, SCH_WARNING, src->path, ls->lineno,
					"'*ng_script' after a blank title is a comment here and never run");
		}
	}
	s += b;
	n -= b;
	if (s[0] == '*') {
		if (n > 1 && s[1] == '#' && src->state == ST_CARDS)
			warn_dropped(r, src, ls->lineno, false);
		return SCH_OK;
	}
	if (src->state == ST_CARDS && ends_in_double_backslash(s, n))
		return sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, ls->lineno,
				      "line ends in '\\\\', which the simulator joins to the next card: "
				      "continue it with a '+' line");
	if (s[0] == '+')
		return continuation_line(r, src, ls, s, n);
	return card_start(r, src, ls, s, n);
}

static enum sch_err read_source(struct reader *r, struct src *src, const char *text, size_t len)
{
	struct lines ls = { .need_title = src->mode == SRC_TOP };
	enum sch_err ret = refuse_binary(r, src, text, len);
	size_t pos = 0;

	sch_buf_init(&ls.card, SCH_MAX_LINE);
	while (ret == SCH_OK && pos < len && !src->stop) {
		const char *s = text + pos;
		const char *nl = memchr(s, '\n', len - pos);
		size_t n = nl ? (size_t)(nl - s) : len - pos;

		pos += n + 1;
		ls.lineno++;
		if (n && s[n - 1] == '\r')
			n--;
		ret = read_line(r, src, &ls, s, n);
	}
	if (ret == SCH_OK && ls.pending && !src->stop)
		ret = flush_pending(r, src, &ls);
	if (src->state == ST_CONTROL)
		sch_deck_control_end(&r->ld);
	if (ret == SCH_OK && src->state == ST_DEF_SKIP) {
		char q[SCH_DECK_QUOTE_MAX + 8];

		/* silently skipping to the end of the file hid the rest of the netlist */
		ret = sch_diag_error(r->ld.d, SCH_ERR_INPUT, src->path, src->def_line,
				     "library section%s has no '.endl': the rest of the file would be skipped",
				     sch_deck_quote(r->ld.deck, src->path, src->def_name, "", q, sizeof(q)));
	}
	sch_buf_release(&ls.card);
	return ret;
}

static enum sch_err compile(struct sch_pattern **p, const char *re, struct sch_diag *d)
{
	/* Our own fixed patterns: a failure here is a bug, reported without a location. */
	return sch_pattern_compile(p, re, SCH_PAT_CASELESS, "the deck reader", d);
}

#define ARG_RE "(\"[^\"]*\"|'[^']*'|[^ \\t]+)"

void sch_deck_init(struct sch_deck *deck)
{
	memset(deck, 0, sizeof(*deck));
	sch_arena_init(&deck->arena);
	deck->noise.card = -1;
}

void sch_deck_release(struct sch_deck *deck)
{
	if (!deck)
		return;
	sch_arena_release(&deck->arena);
	sch_deck_init(deck);
}

static bool all_blank(const char *text, size_t len)
{
	for (size_t i = 0; i < len; i++)
		if (!is_blank(text[i]) && text[i] != '\n')
			return false;
	return true;
}

enum sch_err sch_deck_load_text(struct sch_deck *deck, const char *name, const char *text, size_t len,
				struct sch_diag *d)
{
	struct reader r;
	struct src top = { 0 };
	enum sch_err ret = SCH_ERR_NOMEM;

	sch_deck_release(deck);
	memset(&r, 0, sizeof(r));
	r.ld.deck = deck;
	r.ld.d = d;
	if (!name)
		name = "<netlist>";
	if (compile(&r.ld.re_control, "^[ \\t]*\\.control", d) != SCH_OK ||
	    compile(&r.ld.re_include, "^[ \\t]*\\.inc[^ \\t]*(?:[ \\t]+" ARG_RE ")?", d) != SCH_OK ||
	    compile(&r.ld.re_lib, "^[ \\t]*\\.lib[^ \\t]*(?:[ \\t]+" ARG_RE ")?(?:[ \\t]+" ARG_RE ")?", d) != SCH_OK)
		goto out;
	deck->path = sch_arena_strdup(&deck->arena, name);
	top.path = deck->path;
	top.id = deck->path ? identity(&deck->arena, name) : NULL;
	if (!top.id)
		goto out;
	if (!text || all_blank(text, len)) {
		ret = sch_diag_error(d, SCH_ERR_INPUT, name, 0, "empty netlist");
		goto out;
	}
	{
		/* Reserve one card per line of the top file so that the card arrays never move. */
		size_t lines = 1;
		for (const char *p = text, *end = text + len; (p = memchr(p, '\n', (size_t)(end - p))); p++)
			lines++;
		if (sch_deck_arena_grow(&deck->arena, (void **)&r.ld.cards, &r.ld.a_cards, lines, sizeof(*r.ld.cards)) != SCH_OK ||
		    sch_deck_arena_grow(&deck->arena, (void **)&r.ld.elements, &r.ld.a_elements, lines,
					sizeof(*r.ld.elements)) != SCH_OK)
			goto out;
	}
	top.mode = SRC_TOP;
	top.state = ST_CARDS;
	r.total_bytes = len < DECK_MAX_TOTAL ? len : DECK_MAX_TOTAL;
	r.ld.total_bytes = &r.total_bytes;
	if (note_file(&r, top.path, top.id) != SCH_OK)
		goto out;
	r.stack[r.depth++] = &top;
	ret = read_source(&r, &top, text, len);
	/* The simulator would run such a file as commands: it is a script, not a netlist to report on. */
	if (ret == SCH_OK && r.script_line && r.ld.n_elements == 0)
		ret = sch_diag_error(d, SCH_ERR_INPUT, name, r.script_line,
				     "a '*ng_script' title and no circuit: the file is a simulator script, not a netlist");
	if (ret == SCH_OK)
		ret = sch_deck_control_finish(&r.ld);
	if (ret == SCH_OK)
		ret = sch_deck_load_finish(&r.ld);
out:
	sch_deck_load_release(&r.ld);
	return ret;
}

enum sch_err sch_deck_load(struct sch_deck *deck, const char *path, struct sch_diag *d)
{
	enum sch_err ret;
	char *text = NULL;
	size_t len = 0;
	int err_no = 0;
	char why[128];

	if (!path) {
		sch_deck_release(deck);
		return sch_diag_error(d, SCH_ERR_INPUT, NULL, 0, "no netlist given");
	}
	ret = sch_deck_slurp(path, false, DECK_MAX_FILE, &text, &len, &err_no);
	if (ret == SCH_ERR_INPUT) {
		sch_deck_release(deck);
		if (err_no == EISDIR)
			ret = sch_diag_error(d, SCH_ERR_INPUT, NULL, 0, "netlist '%s' is a directory", path);
		else
			ret = sch_diag_error(d, SCH_ERR_INPUT, NULL, 0, "cannot open netlist '%s': %s", path,
					     sch_deck_errno_text(err_no, why, sizeof(why)));
	} else if (ret == SCH_OK) {
		ret = sch_deck_load_text(deck, path, text, len, d);
	} else {
		sch_deck_release(deck);
	}
	free(text);
	return ret;
}
