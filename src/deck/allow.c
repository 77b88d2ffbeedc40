/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * allow.c - the dot cards and options the simulator gets: an allow-list matched the way ngspice 39
 * matches them (prefixes where its front end uses prefixes), everything else dropped with a
 * located note or refused where dropping would change the circuit (docs/security.md).
 */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <string.h>
#include "deck_int.h"
#include "schrot/si.h"

/* Most frequency points one .noise or .ac card may ask for (a noise run streams every one to disk). */
#define ALLOW_MAX_POINTS 100000.0
/* Largest source value accepted, amperes or volts: 1e308 A gave a report of '-' totals. */
#define ALLOW_MAX_SOURCE 1e6
#define ZERO_CELSIUS (-273.15)

enum dot_action {
	DOT_KEEP,     /* a circuit card the reader knows, or an analysis card the tool replaces */
	DOT_OPTIONS,  /* filtered entry by entry */
	DOT_TEMP,     /* one temperature, checked */
	DOT_SWEEP,    /* .noise and .ac: point count capped */
	DOT_TITLE,    /* dropped; refused when it would make a script title */
	DOT_NOTE,     /* dropped with a note: the simulator does not need it */
	DOT_WARN,     /* dropped with a warning: it would make the simulator run or write something */
	DOT_REFUSE    /* refused: the simulator reads it as a circuit card the reader does not */
};

struct dot_rule {
	const char *word;     /* lower case */
	bool prefix;          /* the simulator matches any card starting with word */
	enum dot_action action;
	const char *why;      /* DOT_WARN and DOT_REFUSE: the rest of the message */
};

/*
 * First match wins, so longer words come before their prefixes. Prefix rules are those where
 * ngspice 39's front end uses ciprefix() (inpcom.c, inp.c, options.c, subckt.c); exact rules are
 * INP2dot's strcmp() on the first token (inp2dot.c). A word not matched here is dropped with a note.
 */
static const struct dot_rule rules[] = {
	/* circuit cards */
	{ ".subckt", false, DOT_KEEP, NULL },
	{ ".ends", true, DOT_KEEP, NULL },   /* '.ENDS* OPA-X': cards.c keeps it as a plain .ends */
	{ ".model", false, DOT_KEEP, NULL },
	{ ".para", true, DOT_KEEP, NULL },   /* the front end reads every '.para...' as .param */
	{ ".func", false, DOT_KEEP, NULL },
	{ ".global", false, DOT_KEEP, NULL },
	{ ".ic", false, DOT_KEEP, NULL },
	{ ".nodeset", false, DOT_KEEP, NULL },
	/* conditional netlists: numparam picks the branch, the simulator reads only that one */
	{ ".if", false, DOT_KEEP, NULL },
	{ ".elseif", false, DOT_KEEP, NULL },
	{ ".else", false, DOT_KEEP, NULL },
	{ ".endif", false, DOT_KEEP, NULL },
	{ ".temp", false, DOT_TEMP, NULL },
	{ ".opt", true, DOT_OPTIONS, NULL },  /* inp_getopts: every '.opt...' card */
	/* analyses and outputs: the tool runs its own, augment keeps them for plain ngspice */
	{ ".noise", false, DOT_SWEEP, NULL },
	{ ".ac", false, DOT_SWEEP, NULL },
	{ ".op", false, DOT_KEEP, NULL },
	{ ".dc", false, DOT_KEEP, NULL },
	{ ".tran", false, DOT_KEEP, NULL },
	{ ".tf", false, DOT_KEEP, NULL },
	{ ".sens", false, DOT_KEEP, NULL },
	{ ".pz", false, DOT_KEEP, NULL },
	{ ".disto", false, DOT_KEEP, NULL },
	{ ".four", false, DOT_KEEP, NULL },
	{ ".fourier", false, DOT_KEEP, NULL },
	{ ".print", false, DOT_KEEP, NULL },
	{ ".plot", false, DOT_KEEP, NULL },
	{ ".probe", false, DOT_KEEP, NULL },
	{ ".save", false, DOT_KEEP, NULL },
	{ ".width", false, DOT_KEEP, NULL },
	/* dropped with a warning */
	{ ".title", true, DOT_TITLE, NULL },
	{ ".meas", true, DOT_WARN, "measurements are never run (the simulator can write their results to any file)" },
	{ ".csparam", true, DOT_WARN, "it sets variables of the simulator's command language" },
	/* refused: dropping would change the circuit the simulator would have read */
	{ ".subckt", true, DOT_REFUSE, "is read by the simulator as '.subckt': write '.subckt'" },
	{ ".model", true, DOT_REFUSE, "is read by the simulator as '.model': write '.model'" },
	{ ".cmodel", true, DOT_REFUSE, "is read by the simulator as '.model': write '.model'" },
	{ ".func", true, DOT_REFUSE, "is read by the simulator as '.func': write '.func'" },
	{ ".temp", true, DOT_REFUSE, "is read by the simulator as '.temp': write '.temp'" },
	{ ".macro", true, DOT_REFUSE, "is read by the simulator as '.subckt': write '.subckt'" },
	{ ".eom", true, DOT_REFUSE, "is read by the simulator as '.ends': write '.ends'" },
	{ ".if", true, DOT_REFUSE, "is read by the simulator as '.if': write '.if'" },
	{ ".elseif", true, DOT_REFUSE, "is read by the simulator as '.elseif': write '.elseif'" },
	{ ".else", true, DOT_REFUSE, "is read by the simulator as '.else': write '.else'" },
	{ ".endif", true, DOT_REFUSE, "is read by the simulator as '.endif': write '.endif'" },
};

/*
 * Options kept (all others are dropped): they set the operating point, its convergence or noise,
 * or the transient run of 'schrot arrivals'. All are simulator numbers, none a front-end path.
 */
enum opt_kind { OPT_NUMBER, OPT_TEMP, OPT_FLAG, OPT_SEED, OPT_METHOD };

static const struct {
	const char *name;
	enum opt_kind kind;
} options[] = {
	{ "temp", OPT_TEMP }, { "tnom", OPT_TEMP },
	{ "gmin", OPT_NUMBER }, { "gshunt", OPT_NUMBER }, { "rshunt", OPT_NUMBER }, { "cshunt", OPT_NUMBER },
	{ "reltol", OPT_NUMBER }, { "abstol", OPT_NUMBER }, { "vntol", OPT_NUMBER }, { "chgtol", OPT_NUMBER },
	{ "pivtol", OPT_NUMBER }, { "pivrel", OPT_NUMBER },
	{ "itl1", OPT_NUMBER }, { "itl2", OPT_NUMBER }, { "itl6", OPT_NUMBER }, { "srcsteps", OPT_NUMBER },
	{ "gminsteps", OPT_NUMBER }, { "gminfactor", OPT_NUMBER }, { "noopiter", OPT_FLAG },
	{ "oldlimit", OPT_FLAG }, { "bypass", OPT_NUMBER },
	{ "defm", OPT_NUMBER }, { "defl", OPT_NUMBER }, { "defw", OPT_NUMBER }, { "defad", OPT_NUMBER },
	{ "defas", OPT_NUMBER }, { "scale", OPT_NUMBER }, { "seed", OPT_SEED },
	{ "method", OPT_METHOD }, { "maxord", OPT_NUMBER }, { "trtol", OPT_NUMBER }, { "xmu", OPT_NUMBER },
	{ "itl3", OPT_NUMBER }, { "itl4", OPT_NUMBER }, { "itl5", OPT_NUMBER }, { "minbreak", OPT_NUMBER },
};

/* Front-end variables that name a file, a directory or a command: dropped with a warning. */
static const char *const file_options[] = {
	"measoutfile", "rawfile", "sourcepath", "inputdir", "editor", "helppath", "spicepath", "rprogram",
	"rhost", "remote_shell", "lprplot5", "lprps", "hcopydev", "hcopydevtype", "filetype",
	"addcontrol", /* with rawfile: a control section that writes it, when the next circuit loads */
	"ngdebug",    /* debug-out*.txt in the working directory */
};

static bool word_char(char c)
{
	return c && !is_blank(c) && !strchr("=(),'\"", c);
}

/* The card's word as the simulator's parser cuts it, lower case, into buf (cut at size - 1). */
static size_t card_word(const char *text, size_t len, char *buf, size_t size)
{
	size_t k = 0, n = 0;

	while (n < len && word_char(text[n])) {
		if (k + 1 < size)
			buf[k++] = lower(text[n]);
		n++;
	}
	buf[k] = '\0';
	return n;
}

static const struct dot_rule *find_rule(const char *word)
{
	for (size_t i = 0; i < sizeof(rules) / sizeof(rules[0]); i++) {
		const struct dot_rule *r = &rules[i];

		if (r->prefix ? has_prefix(word, r->word) : strcmp(word, r->word) == 0)
			return r;
	}
	return NULL;
}

static bool ci_starts(const char *s, size_t n, const char *prefix)
{
	size_t k = strlen(prefix);

	if (n < k)
		return false;
	for (size_t i = 0; i < k; i++)
		if (lower(s[i]) != prefix[i])
			return false;
	return true;
}

/* " 'word'" from the top netlist, else " 'canonical'" (text of included files is never quoted). */
static const char *name_of(struct sch_deck_load *ld, const char *file, const char *word, const char *canonical,
			   char *buf, size_t size)
{
	char fallback[48] = " a dot";

	if (canonical)
		snprintf(fallback, sizeof(fallback), " '%s'", canonical);
	return sch_deck_quote(ld->deck, file, word, fallback, buf, size);
}

static enum sch_err check_temperature(struct sch_deck_load *ld, const char *file, long line, double celsius)
{
	if (celsius < ZERO_CELSIUS)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line,
				      "temperature %g °C is below absolute zero (-273.15 °C)", celsius);
	return SCH_OK;
}

/* ".temp 27", ".temp=27", ".temp {t}": one value (the simulator runs a list at 27 °C, saying nothing). */
static enum sch_err temp_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
			      size_t len, size_t word_len)
{
	size_t i = word_len, start, n;
	double v;
	char value[64];

	while (i < len && is_blank(text[i]))
		i++;
	if (i < len && text[i] == '=')
		i++;
	while (i < len && is_blank(text[i]))
		i++;
	start = i;
	while (i < len && !is_blank(text[i]))
		i++;
	n = i - start;
	while (i < len && is_blank(text[i]))
		i++;
	if (n == 0)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "'.temp' needs a temperature");
	if (i < len)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line,
				      "'.temp' takes one temperature: the simulator would ignore a list and run at 27 °C");
	if (text[start] == '{')
		return SCH_OK; /* an expression: the simulator evaluates it */
	snprintf(value, sizeof(value), "%.*s", (int)(n < sizeof(value) ? n : sizeof(value) - 1), text + start);
	if (n < sizeof(value) && sch_deck_check_number(ld, file, line, value) != SCH_OK)
		return SCH_ERR_INPUT; /* "malformed number '2-7'" */
	if (n >= sizeof(value) || sch_si_parse(value, &v) != SCH_OK)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "'.temp' needs a number");
	return check_temperature(ld, file, line, v);
}

/* Frequency points of a sweep: lin n; dec n per decade; oct n per octave. <0 when not computable. */
static double sweep_points(const char *sweep, const char *n_tok, const char *f1_tok, const char *f2_tok)
{
	double n, f1, f2;

	if (sch_si_parse(n_tok, &n) != SCH_OK)
		return -1;
	if (strcmp(sweep, "lin") == 0)
		return floor(n);
	if (sch_si_parse(f1_tok, &f1) != SCH_OK || sch_si_parse(f2_tok, &f2) != SCH_OK || !(f1 > 0) || !(f2 > 0))
		return n > ALLOW_MAX_POINTS ? n : -1; /* at least n points whatever the range */
	if (strcmp(sweep, "dec") == 0)
		return floor(n * fabs(log10(f2 / f1)) + 0.5) + 1;
	if (strcmp(sweep, "oct") == 0)
		return floor(n * fabs(log2(f2 / f1)) + 0.5) + 1;
	return -1;
}

/* .noise OUT SRC SWEEP N F1 F2 [PTS], .ac SWEEP N F1 F2: refuses a sweep of more than the cap. */
static enum sch_err sweep_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
			       size_t len, bool noise)
{
	size_t first = noise ? 3 : 1;
	double points;
	const char *name = noise ? ".noise" : ".ac";

	if (sch_deck_tokenize(ld, text, len, first + 4) != SCH_OK)
		return SCH_ERR_NOMEM;
	if (ld->n_tok < first + 4)
		return SCH_OK; /* the card's own checks say what is missing */
#define TOK(i) (ld->scratch + ld->tok_off[(i)])
	points = sweep_points(TOK(first), TOK(first + 1), TOK(first + 2), TOK(first + 3));
#undef TOK
	if (points > ALLOW_MAX_POINTS || isinf(points))
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line,
				      "'%s' asks for %.15g frequency points: at most %.0f are allowed", name, points,
				      ALLOW_MAX_POINTS);
	return SCH_OK;
}

static int find_option(const char *name, size_t n)
{
	for (size_t i = 0; i < sizeof(options) / sizeof(options[0]); i++)
		if (strlen(options[i].name) == n && strncmp(options[i].name, name, n) == 0)
			return (int)i;
	return -1;
}

static bool names_a_file(const char *name, size_t n)
{
	for (size_t i = 0; i < sizeof(file_options) / sizeof(file_options[0]); i++)
		if (strlen(file_options[i]) == n && strncmp(file_options[i], name, n) == 0)
			return true;
	return false;
}

static void drop_option(struct sch_deck_load *ld, const char *file, long line, const char *name, size_t n)
{
	char tok[SCH_DECK_QUOTE_MAX + 4], q[SCH_DECK_QUOTE_MAX + 8];
	bool danger = names_a_file(name, n);

	snprintf(tok, sizeof(tok), "%.*s", (int)(n < SCH_DECK_QUOTE_MAX + 1 ? n : SCH_DECK_QUOTE_MAX + 1), name);
	sch_diag_report(ld->d, danger ? SCH_WARNING : SCH_NOTE, file, line, "option%s dropped: %s",
			sch_deck_quote(ld->deck, file, tok, "", q, sizeof(q)),
			danger ? "it names a file, a directory or a command of the simulator"
			       : "the simulator does not need it for the operating point and noise");
}

/* A kept option's value: a number (its range checked), an expression, 'random' for seed, a method name. */
static enum sch_err check_option_value(struct sch_deck_load *ld, const char *file, long line, int opt,
				       const char *value)
{
	double v;

	if (value[0] == '{')
		return SCH_OK;
	if (options[opt].kind == OPT_SEED && strcmp(value, "random") == 0)
		return SCH_OK;
	if (options[opt].kind == OPT_METHOD)
		return strcmp(value, "gear") == 0 || strcmp(value, "trap") == 0 || strcmp(value, "trapezoidal") == 0 ?
		       SCH_OK : sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "option 'method' needs 'gear' or 'trap'");
	if (sch_si_parse(value, &v) != SCH_OK)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "option '%s' needs a number", options[opt].name);
	return options[opt].kind == OPT_TEMP ? check_temperature(ld, file, line, v) : SCH_OK;
}

/*
 * An options card: each entry is kept when the allow-list has it, else dropped with a note. The
 * kept entries come back as one ".options a=1 b" card in *out (arena), NULL when none is left.
 */
static enum sch_err options_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
				 size_t len, size_t word_len, const char **out)
{
	struct sch_buf kept;
	enum sch_err ret = SCH_ERR_NOMEM;
	size_t n_tok;

	*out = NULL;
	sch_buf_init(&kept, SCH_MAX_LINE);
	if (sch_deck_tokenize(ld, text + word_len, len - word_len, SIZE_MAX) != SCH_OK)
		goto out;
	n_tok = ld->n_tok;
	for (size_t i = 0; i < n_tok; i++) {
		const char *t = ld->scratch + ld->tok_off[i];
		const char *eq = strchr(t, '=');
		size_t n = eq ? (size_t)(eq - t) : strlen(t);
		const char *value = eq ? eq + 1 : NULL;
		int opt = find_option(t, n);

		if (opt < 0) {
			drop_option(ld, file, line, t, n);
			continue;
		}
		if (!value && options[opt].kind != OPT_FLAG && i + 1 < n_tok &&
		    !strchr(ld->scratch + ld->tok_off[i + 1], '='))
			value = ld->scratch + ld->tok_off[++i]; /* "temp 50": the simulator's parser takes it too */
		if (options[opt].kind == OPT_FLAG ? value != NULL : (!value || !*value)) {
			ret = sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, options[opt].kind == OPT_FLAG ?
					     "option '%s' takes no value" : "option '%s' needs a number", options[opt].name);
			goto out;
		}
		if (value && (ret = check_option_value(ld, file, line, opt, value)) != SCH_OK)
			goto out;
		ret = SCH_ERR_NOMEM;
		if (sch_buf_adds(&kept, kept.len ? " " : ".options ") != SCH_OK ||
		    sch_buf_adds(&kept, options[opt].name) != SCH_OK ||
		    (value && (sch_buf_adds(&kept, "=") != SCH_OK || sch_buf_adds(&kept, value) != SCH_OK)))
			goto out;
	}
	if (kept.len && !(*out = sch_arena_strndup(&ld->deck->arena, kept.data, kept.len)))
		goto out;
	ret = SCH_OK;
out:
	sch_buf_release(&kept);
	return ret;
}

static enum sch_err title_card(struct sch_deck_load *ld, const char *file, long line, const char *text,
			       size_t len, size_t word_len, const char *word)
{
	size_t i = word_len;
	char q[SCH_DECK_QUOTE_MAX + 8];

	while (i < len && is_blank(text[i]))
		i++;
	/* ngspice copies the card's text over the title line, and a '*ng_script' title runs the deck */
	if (ci_starts(text + i, len - i, "*ng_script"))
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line,
				      "'.title' card would make the deck a command script ('*ng_script'): "
				      "nothing in a netlist runs");
	sch_diag_report(ld->d, SCH_NOTE, file, line, "%s card dropped: the title sent to the simulator is schrot's own",
			name_of(ld, file, word, ".title", q, sizeof(q)) + 1);
	return SCH_OK;
}

enum sch_err sch_deck_screen_dot(struct sch_deck_load *ld, const char *file, long line, const char **text,
				 size_t *len, bool *keep)
{
	char word[SCH_DECK_QUOTE_MAX + 2], q[SCH_DECK_QUOTE_MAX + 8];
	size_t word_len = card_word(*text, *len, word, sizeof(word));
	const struct dot_rule *r = find_rule(word);
	enum sch_err ret;
	const char *opts;

	*keep = false;
	switch (r ? r->action : DOT_NOTE) {
	case DOT_KEEP:
		*keep = true;
		return SCH_OK;
	case DOT_TEMP:
		ret = temp_card(ld, file, line, *text, *len, word_len);
		*keep = ret == SCH_OK;
		return ret;
	case DOT_SWEEP:
		ret = sweep_card(ld, file, line, *text, *len, strcmp(word, ".noise") == 0);
		*keep = ret == SCH_OK;
		return ret;
	case DOT_OPTIONS:
		ret = options_card(ld, file, line, *text, *len, word_len, &opts);
		if (ret == SCH_OK && opts) {
			*text = opts;
			*len = strlen(opts);
			*keep = true;
		}
		return ret;
	case DOT_TITLE:
		return title_card(ld, file, line, *text, *len, word_len, word);
	case DOT_WARN:
		sch_diag_report(ld->d, SCH_WARNING, file, line, "%s card dropped: %s",
				name_of(ld, file, word, r->word, q, sizeof(q)) + 1, r->why);
		return SCH_OK;
	case DOT_REFUSE:
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "%s %s",
				      name_of(ld, file, word, r->word, q, sizeof(q)) + 1, r->why);
	case DOT_NOTE:
	default:
		sch_diag_report(ld->d, SCH_NOTE, file, line,
				"%s card dropped: the simulator does not need it for the operating point and noise",
				name_of(ld, file, word, NULL, q, sizeof(q)) + 1);
		return SCH_OK;
	}
}

enum sch_err sch_deck_check_element_name(struct sch_deck_load *ld, const char *file, long line,
					 const char *text, size_t len)
{
	size_t n = 0;
	char name[SCH_DECK_QUOTE_MAX + 4], q[SCH_DECK_QUOTE_MAX + 8];

	while (n < len && !is_blank(text[n]))
		n++;
	for (size_t i = 0; i < n; i++) {
		/* INPgetTok ends a name at = ( ) ,; braces and quotes belong to numparam */
		if (!strchr("=(),{}'\"", text[i]))
			continue;
		snprintf(name, sizeof(name), "%.*s", (int)(n < SCH_DECK_QUOTE_MAX + 1 ? n : SCH_DECK_QUOTE_MAX + 1), text);
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line,
				      "element name%s holds '%c', which the simulator reads as a separator",
				      sch_deck_quote(ld->deck, file, name, "", q, sizeof(q)), text[i]);
	}
	return SCH_OK;
}

enum sch_err sch_deck_check_source_value(struct sch_deck_load *ld, const char *file, long line, const char *tok)
{
	double v;
	char q[SCH_DECK_QUOTE_MAX + 8];

	if (!tok || !sch_si_looks_numeric(tok) || sch_si_parse(tok, &v) != SCH_OK || fabs(v) <= ALLOW_MAX_SOURCE)
		return SCH_OK;
	return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "source value%s is out of range: at most %g A or V",
			      sch_deck_quote(ld->deck, file, tok, "", q, sizeof(q)), ALLOW_MAX_SOURCE);
}
