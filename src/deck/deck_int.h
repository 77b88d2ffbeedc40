/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * deck_int.h - internals shared by the deck reader's files: the load state that deck.c (files,
 * lines, includes) fills through cards.c (tokens.c below it; checks.c, dcpaths.c at the end),
 * and the name index of lookup.c.
 */
#ifndef SCH_DECK_INT_H
#define SCH_DECK_INT_H

#include <stdbool.h>
#include <stddef.h>
#include <string.h>
#include "schrot/buf.h"
#include "schrot/deck.h"
#include "schrot/pattern.h"

/* Hierarchies that expand to more instances than this are refused (exponential fan-out). */
#define DECK_MAX_FILE ((size_t)1 << 30)  /* a netlist (or code-model data) file larger than this is refused */
#define DECK_MAX_TOTAL ((size_t)1 << 30) /* bytes of all files read for one netlist together */
#define SCH_MAX_INSTANCES ((size_t)1 << 22)

/* Name -> int multimap with separate chaining; keys are borrowed, never copied. */
struct sch_name_entry {
	const char *key;
	size_t len;
	int value;
	int next;
};

struct sch_names {
	int *bucket;
	size_t mask;
	struct sch_name_entry *e;
	size_t n, alloc;
};

/* Prepares an index for about n keys. SCH_ERR_NOMEM on failure (then releasable). */
enum sch_err sch_names_init(struct sch_names *ix, size_t n);

/* Adds key -> value. SCH_ERR_NOMEM on failure (index unchanged). */
enum sch_err sch_names_add(struct sch_names *ix, const char *key, size_t len, int value);

/*
 * Next entry with this key after entry `after` (-1 to start); returns the entry index or -1.
 * Values are ix->e[i].value.
 */
int sch_names_next(const struct sch_names *ix, const char *key, size_t len, int after);

/* Frees the index; it is then empty (no-op on a zeroed index). */
void sch_names_release(struct sch_names *ix);

/*
 * The definition named `name` visible from scope (a subckt index or -1): a definition whose parent
 * is scope or one of its ancestors, the nearest one winning. -1 when none.
 */
int sch_deck_resolve_subckt(const struct sch_subckt *subckts, const struct sch_names *ix,
			    const char *name, int scope);

/* Index of the token holding an X element's subcircuit name, or -1. */
int sch_deck_x_name_index(const struct sch_element *e);

/* Grows a malloc'd array so that it holds at least n + 1 items of size bytes. */
enum sch_err sch_deck_grow(void **data, size_t *alloc, size_t n, size_t size);

/*
 * Same for an array living in the arena (the old copy stays there unused). The card and element
 * arrays are reserved from the top file's line count, so for one large file they never move and
 * are never copied: that copy and its page faults were a third of the reader's time.
 */
enum sch_err sch_deck_arena_grow(struct sch_arena *a, void **data, size_t *alloc, size_t n, size_t size);

/* A command of a .control block that is not honoured, for the note that lists them. */
struct sch_control_skip {
	const char *word;    /* the command word as a message may show it: " 'alter'", or " a command" */
	const char *file;
	long line;
	bool after_noise;    /* after the noise command that was taken */
};

/*
 * What the reader takes from .control blocks as data (control.c); the blocks themselves never
 * run and none of their text reaches the simulator except cards rebuilt from checked tokens.
 */
struct sch_control_scan {
	int depth;                /* open loops and ifs in the current block */
	const char *noise_card;   /* ".noise ..." rebuilt from the first usable noise command; NULL none */
	const char *noise_file;
	long noise_line;
	const char *temp_card;    /* ".temp X" rebuilt from the last set/option temp= before it; NULL none */
	const char *temp_file;
	long temp_line;
	long op_line;             /* an op before the noise command (schrot runs its own); 0 none */
	struct sch_control_skip *skipped;
	size_t n_skipped, a_skipped;
};

/* State of one sch_deck_load call. cards and elements live in the arena; the other vectors are
 * malloc'd and copied into it at the end. */
struct sch_deck_load {
	struct sch_deck *deck;
	struct sch_diag *d;
	struct sch_card *cards;
	size_t n_cards, a_cards;
	struct sch_element *elements;
	size_t n_elements, a_elements;
	struct sch_subckt *subckts;
	size_t n_subckts, a_subckts;
	struct sch_model *models;
	size_t n_models, a_models;
	const char **files;
	const char **file_ids; /* canonical identity of files[i] (realpath, or the name as given) */
	size_t n_files, a_files, a_file_ids;
	int *open;             /* .subckt definitions not yet closed, innermost last */
	size_t n_open, a_open;
	char *scratch;          /* lower-case tokens of the card being read, NUL-separated */
	size_t scratch_len, a_scratch;
	size_t *tok_off;
	size_t n_tok, a_tok;
	bool noise_seen;
	size_t *total_bytes;   /* the reader's count of bytes read (all files, data files of code models too) */
	const char **data_texts; /* text of the data files code models read (malloc'd vector, texts in the arena) */
	size_t n_data_texts, a_data_texts;
	struct sch_control_scan control;
	struct sch_pattern *re_control, *re_include, *re_lib;
};

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

static inline bool has_prefix(const char *s, const char *prefix)
{
	return strncmp(s, prefix, strlen(prefix)) == 0;
}

/*
 * A .model card of a code model that reads a data file the netlist names (filesource, d_source,
 * d_state, table2d, table3d, xfer): resolves the file parameter relative to file (the netlist file
 * holding the card, as .include does), checks that it is a readable regular file within the size
 * caps (its bytes count against the cap on all text read) and that its absolute path passes the
 * simulator's path whitelist, and replaces *text (in the arena) by the card with that absolute
 * path in double quotes. Any other type: unchanged, SCH_OK. SCH_ERR_INPUT with a message at
 * file:line naming the path but never the file's text; SCH_ERR_NOMEM.
 */
enum sch_err sch_deck_code_model_file(struct sch_deck_load *ld, const char *file, long line, const char *type,
				      const char **text);

/* Longest piece of a netlist token quoted in a message, bytes (a 1 MB token gives a short message). */
#define SCH_DECK_QUOTE_MAX 64

/*
 * The words a message puts in place of a token: " 'tok'" (at most SCH_DECK_QUOTE_MAX bytes, cut at
 * a UTF-8 boundary and marked "...") when the card came from the top netlist (file == deck->path),
 * else fallback: text of included and library files is never quoted, so that an .include of a
 * file that is no netlist (/etc/passwd) shows none of it. Returns buf, always NUL-terminated.
 */
const char *sch_deck_quote(const struct sch_deck *deck, const char *file, const char *tok, const char *fallback,
			   char *buf, size_t size);

/*
 * Splits text into lower-case tokens in ld->scratch (NUL-separated, starts in ld->tok_off), at
 * most max_tok of them. SCH_ERR_NOMEM on failure.
 */
enum sch_err sch_deck_tokenize(struct sch_deck_load *ld, const char *text, size_t len, size_t max_tok);

/*
 * Moves the card text and the scratch tokens into the arena. Sets *text_out and *toks (n_tok
 * pointers, NULL when there are none). SCH_ERR_NOMEM on failure (outputs then unset).
 */
enum sch_err sch_deck_pack(struct sch_deck_load *ld, const char *text, size_t len, const char **text_out,
			   const char ***toks);

/* SCH_ERR_INPUT with a message in ld->d when tok looks numeric but is no number; NULL is fine. */
enum sch_err sch_deck_check_number(struct sch_deck_load *ld, const char *file, long line, const char *tok);

/* A token that can only be a value expression or keyword, not a plain node name. */
bool sch_deck_is_behavioural(const char *t);

/* Length of name without a binning suffix ".<digits>", or 0 when it has none. */
size_t sch_deck_binned_base(const char *name);

/*
 * SCH_ERR_INPUT with a message in ld->d when some current source's node has no DC path,
 * SCH_ERR_NOMEM when out of memory, else SCH_OK.
 */
enum sch_err sch_deck_check_dc_paths(struct sch_deck_load *ld);

/*
 * The allow-list of dot cards (allow.c; docs/security.md lists it with its reasons), matched the
 * way the simulator matches them. *keep is false when the card is dropped (a located note or
 * warning was reported). A kept options card comes back rewritten to its kept entries in *text and
 * *len (arena). SCH_ERR_INPUT with a located message when the card is refused (it would change the
 * circuit if dropped, would make a script title, or holds a value out of range); SCH_ERR_NOMEM.
 */
enum sch_err sch_deck_screen_dot(struct sch_deck_load *ld, const char *file, long line, const char **text,
				 size_t *len, bool *keep);

/* SCH_ERR_INPUT with a located message when an element name (text up to the first blank) holds a
 * character the simulator's parser ends a name at ('=', '(', ')', ',') or numparam reads ('{', '}', quotes). */
enum sch_err sch_deck_check_element_name(struct sch_deck_load *ld, const char *file, long line,
					 const char *text, size_t len);

/* SCH_ERR_INPUT with a located message when tok is a number above the source range (1e6 A or V). */
enum sch_err sch_deck_check_source_value(struct sch_deck_load *ld, const char *file, long line, const char *tok);

/* Adds one ordinary card (an element or a dot card other than include/lib/control/end). */
enum sch_err sch_deck_load_card(struct sch_deck_load *ld, const char *file, long line,
				const char *text, size_t len);

/* control.c */

/*
 * One logical line of a .control block (continuations joined, comments removed), read as data:
 * a noise command, op and set/option temp= are kept, every other command is listed as not
 * honoured. odd: the line holds bytes other than printable ASCII (then it is only listed).
 * SCH_ERR_NOMEM on failure.
 */
enum sch_err sch_deck_control_line(struct sch_deck_load *ld, const char *file, long line, const char *text,
				   size_t len, bool odd);

/* A .control block ends (or its file does): loops left open are closed. This function can't fail. */
void sch_deck_control_end(struct sch_deck_load *ld);

/*
 * At the end of reading, before sch_deck_load_finish: when the deck has no .noise card, adds the
 * .noise (and .temp) card rebuilt from a block and the notes saying what was and was not
 * honoured. Errors as sch_deck_load_card, SCH_ERR_NOMEM.
 */
enum sch_err sch_deck_control_finish(struct sch_deck_load *ld);

/* Checks what needs the whole deck (balance, subckt and model names), then moves it into the arena. */
enum sch_err sch_deck_load_finish(struct sch_deck_load *ld);

/* Frees the load state's own storage (not the deck). */
void sch_deck_load_release(struct sch_deck_load *ld);

/*
 * Reads a whole file into *out (malloc'd, NUL-terminated; the caller frees it) and its length.
 * On failure *out is NULL and *err_no is set (EISDIR for a directory, EFBIG over limit, ENODEV for
 * a device or pipe when regular_only: an include must never block on /dev/stdin); SCH_ERR_INPUT,
 * or SCH_ERR_NOMEM.
 */
enum sch_err sch_deck_slurp(const char *path, bool regular_only, size_t limit, char **out, size_t *out_len,
			    int *err_no);

/* A lower-case description of err_no in buf (the errors sch_deck_slurp sets included); returns buf. */
const char *sch_deck_errno_text(int err_no, char *buf, size_t size);

/* The directory part of including joined with name[0..n) in a; name itself when absolute. NULL on NOMEM. */
const char *sch_deck_resolve(struct sch_arena *a, const char *including, const char *name, size_t n);

/* Offset of the first byte that is not valid UTF-8 in s[0..n), or n. */
size_t sch_deck_utf8_bad(const char *s, size_t n);

#endif
