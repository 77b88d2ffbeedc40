/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * deck.h - the deck reader: the SPICE dialect ngspice reads, kept as structure (cards, elements,
 * subcircuits, models) with every card's file and line. Includes and library sections are inlined
 * here, so the simulator never reads a file itself. Expressions are never evaluated.
 */
#ifndef SCH_DECK_H
#define SCH_DECK_H

#include <stdbool.h>
#include <stddef.h>
#include "schrot/arena.h"
#include "schrot/diag.h"

#define SCH_MAX_LINE ((size_t)1 << 20)  /* longest logical line accepted, bytes */
#define SCH_MAX_INCLUDE_DEPTH 32

/*
 * One logical line: '+' continuations joined with one space, '*' comment lines dropped, inline
 * ';' and ' $' comments removed, leading/trailing blanks trimmed. Original case is kept in text.
 * .include/.lib lines are replaced by the cards of the file (section) they name; .control blocks
 * and '*#' lines are dropped (with a warning); the title line is not a card.
 */
struct sch_card {
	const char *text;    /* never NULL */
	const char *file;    /* path of the file the card came from, as opened */
	long line;           /* first physical line of the card, 1-based */
	int subckt;          /* index into deck->subckts of the enclosing definition, -1 at top level */
	int element;         /* index into deck->elements, -1 for dot cards */
	const char *keyword; /* dot cards: lower-case first token (".model", ".subckt", ".ends", ...); NULL for elements */
};

/*
 * An element card. Tokens are lower-cased; bracket groups "(...)", "{...}" and quoted '...' are one
 * token each; "a = 1" is joined to "a=1". tok[0] is the first token after the name.
 */
struct sch_element {
	const char *name;    /* lower case, letter included: "iph" */
	char letter;         /* lower-case first letter */
	const char **tok;
	int n_tok;
	int card;            /* index into deck->cards */
	int subckt;          /* enclosing definition, -1 at top level */
	int n_nodes;         /* D, Q, M, J: the node tokens before the model name, decided at load from the
			      * model's type and level as the simulator decides them; 0 for other letters */
};

struct sch_subckt {
	const char *name;    /* lower case */
	const char **ports;  /* lower case */
	int n_ports;
	const char *params;  /* "a=1 b=2" text of the defaults (after params: or the first name=value), "" if none */
	int card_begin;      /* the .subckt card */
	int card_end;        /* the matching .ends card */
	int parent;          /* enclosing definition for nested .subckt, -1 at top level */
};

struct sch_model {
	const char *name;    /* lower case */
	const char *type;    /* lower case: "d", "npn", "pnp", "nmos", ... */
	int level;           /* the card's level, read as the simulator reads it; 1 without one */
	int card;
	int subckt;          /* definition it is local to, -1 global */
};

/*
 * The deck's own .noise line, tokens as written (lower case). present is false without one. When
 * the deck has no .noise line but a .control block holds a noise command, the reader rebuilds a
 * .noise card from that command's checked tokens (from_control; the card's file and line are the
 * command's) and the block itself is still never run.
 */
struct sch_noise_spec {
	bool present;
	const char *output;          /* "v(out)" or "v(out,ref)" */
	const char *input;           /* source name, "iph" */
	const char *sweep;           /* "dec", "oct" or "lin" */
	const char *n_points;
	const char *f_start;
	const char *f_stop;
	const char *pts_per_summary; /* NULL when absent */
	int card;
	bool from_control;           /* read from a .control block's noise command */
};

/*
 * A parsed deck. Everything lives in arena; the deck is read-only after loading.
 * Invariant: every card, element, subckt and model index stored in it is valid.
 */
struct sch_deck {
	struct sch_arena arena;
	const char *path;            /* the top file as given */
	const char *title;           /* first line of the top file, verbatim (never sent to the simulator) */
	struct sch_card *cards;
	size_t n_cards;
	struct sch_element *elements;
	size_t n_elements;
	struct sch_subckt *subckts;
	size_t n_subckts;
	struct sch_model *models;
	size_t n_models;
	const char **files;          /* every file read, top first, each once (for make depfiles) */
	size_t n_files;
	/*
	 * Text of the data files code models read (table2d, d_source, ...; their .model cards carry the
	 * absolute path): never quoted, kept so that the simulator's messages can leave it out.
	 */
	const char **data_texts;
	size_t n_data_texts;
	struct sch_noise_spec noise;
	int n_dropped_control;       /* .control blocks skipped */
	int n_dropped_script;        /* '*#' lines skipped */
	/*
	 * What the reader took from .control blocks as data and what it left out, one sentence each,
	 * for reports (the same text also goes to the diagnostics as notes); n_notes 0 when none.
	 */
	const char **notes;
	size_t n_notes;
};

/* One leaf element instance of the expanded hierarchy. */
struct sch_instance {
	const char *path;     /* lower-case hierarchical name joined by '.': "x1.iph", "xrx.xpd.d1", "rf" */
	const char *sim_name; /* the simulator's name: "i.x1.iph" inside subcircuits, "rf" at top level */
	int element;          /* index into deck->elements */
	int parent;           /* a number naming the enclosing X instance (shared by its leaves; not an index), -1 at top level */
};

/* Initialises an empty deck. This function can't fail. */
void sch_deck_init(struct sch_deck *deck);

/*
 * Reads the netlist at path and everything it includes. On failure returns SCH_ERR_INPUT (bad or
 * binary input, missing include or section, include cycle) or SCH_ERR_NOMEM with a located
 * diagnostic ("FILE:LINE: error: ..."); the deck is then in a releasable state.
 */
enum sch_err sch_deck_load(struct sch_deck *deck, const char *path, struct sch_diag *d);

/*
 * Same as sch_deck_load, but the top file's text is given (len bytes, need not be NUL-terminated);
 * name is used in messages and its directory resolves relative includes.
 */
enum sch_err sch_deck_load_text(struct sch_deck *deck, const char *name, const char *text, size_t len,
				struct sch_diag *d);

/* Frees everything; the deck is empty and reusable. No-op on NULL. */
void sch_deck_release(struct sch_deck *deck);

/* Index of the subcircuit definition called name (lower case), or -1. */
int sch_deck_find_subckt(const struct sch_deck *deck, const char *name);

/* Index of the model called name visible from definition scope (-1 top level), or -1. */
int sch_deck_find_model(const struct sch_deck *deck, const char *name, int scope);

/*
 * Sets *nodes to the element's node tokens and returns their number (0 when the element has none
 * or is malformed). X: the ports before the subcircuit name; D, Q, M, J: the tokens before the
 * model name (D 2, or 3 with a thermal node; Q 3 to 5, the fourth a substrate and the fifth a
 * thermal node; M 4, a vdmos model 3 to 5, SOI levels up to 7; J 3); behavioural G/E (value=,
 * cur=, vol=): 2; R C L I V B F H: 2.
 */
int sch_deck_element_nodes(const struct sch_deck *deck, const struct sch_element *e, const char *const **nodes);

/* The subcircuit name of an X element, or NULL for other elements. */
const char *sch_deck_x_subckt(const struct sch_deck *deck, const struct sch_element *e);

/*
 * Expands the hierarchy from the top level: every leaf (non-X) element instance, in card order,
 * allocated in arena. Returns SCH_ERR_INPUT with a located message for an unknown subcircuit or a
 * recursive instantiation.
 */
enum sch_err sch_deck_instances(const struct sch_deck *deck, struct sch_arena *arena,
				struct sch_instance **out, size_t *n, struct sch_diag *d);

#endif
