/* SPDX-License-Identifier: BSD-3-Clause */
/* test_deck.c - unit tests of the deck reader: dialect, includes, libraries, safety, errors, hierarchy. */
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>
#include "check.h"
#include "schrot/buf.h"
#include "schrot/deck.h"

#define INLINE_NAME "data/deck/inline.cir"

static struct sch_diag diag;

/* Every index the deck stores is valid, and cards point back at their elements. */
static void assert_sane_deck(const struct sch_deck *deck)
{
	CHECK(deck->title != NULL);
	for (size_t i = 0; i < deck->n_cards; i++) {
		const struct sch_card *c = &deck->cards[i];
		CHECK(c->text && c->file && c->line >= 1);
		CHECK(c->subckt >= -1 && c->subckt < (int)deck->n_subckts);
		CHECK(c->element >= -1 && c->element < (int)deck->n_elements);
		CHECK((c->element >= 0) == (c->keyword == NULL));
		if (c->element >= 0)
			CHECK(deck->elements[c->element].card == (int)i);
	}
	for (size_t i = 0; i < deck->n_elements; i++) {
		const struct sch_element *e = &deck->elements[i];
		CHECK(e->name && e->letter == e->name[0] && e->n_tok >= 0);
		CHECK(e->card >= 0 && e->card < (int)deck->n_cards);
		CHECK(e->subckt == deck->cards[e->card].subckt);
	}
	for (size_t i = 0; i < deck->n_subckts; i++) {
		const struct sch_subckt *s = &deck->subckts[i];
		CHECK(s->card_begin >= 0 && s->card_begin < s->card_end && s->card_end < (int)deck->n_cards);
		CHECK(s->parent >= -1 && s->parent < (int)i);
		CHECK(s->params != NULL);
	}
	for (size_t i = 0; i < deck->n_models; i++)
		CHECK(deck->models[i].card >= 0 && deck->models[i].card < (int)deck->n_cards);
	CHECK(deck->n_files >= 1);
}

static enum sch_err load_text(struct sch_deck *deck, const char *text)
{
	sch_deck_init(deck);
	sch_diag_init(&diag, NULL, 0);
	return sch_deck_load_text(deck, INLINE_NAME, text, strlen(text), &diag);
}

/* Loads text expecting SCH_ERR_INPUT with exactly this first error. */
static void expect_error(const char *text, const char *message)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, text) == SCH_ERR_INPUT);
	CHECK_STR(diag.first_error, message);
	sch_deck_release(&deck);
}

static const struct sch_element *element(const struct sch_deck *deck, const char *name)
{
	for (size_t i = 0; i < deck->n_elements; i++)
		if (strcmp(deck->elements[i].name, name) == 0)
			return &deck->elements[i];
	return NULL;
}

static const char *card_of(const struct sch_deck *deck, const char *name)
{
	const struct sch_element *e = element(deck, name);
	return e ? deck->cards[e->card].text : NULL;
}

/* ---- dialect ------------------------------------------------------------------------------ */

static void test_deck__joins_plus_continuation_lines(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "picoammeter input\n"
				"rin in\n"
				"* a comment line between continuation lines\n"
				"\n"
				"+ guard\n"
				"+   100MEG ; inline comment on a continuation\n"
				"cin guard 0 1p\n") == SCH_OK);
	assert_sane_deck(&deck);
	CHECK(deck.n_elements == 2);
	CHECK_STR(card_of(&deck, "rin"), "rin in guard 100MEG");
	CHECK(deck.cards[0].line == 2);
	CHECK(deck.cards[1].line == 7);
	CHECK(element(&deck, "rin")->n_tok == 3);
	sch_deck_release(&deck);
}

static void test_deck__drops_star_comment_lines(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "turbidity sensor\n* comment\n   * indented comment\nr1 a 0 1k\n") == SCH_OK);
	CHECK(deck.n_cards == 1);
	CHECK(deck.cards[0].line == 4);
	sch_deck_release(&deck);
}

static void test_deck__strips_semicolon_and_dollar_comments(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "hydrophone preamp\n"
				"r1 a b 4.7k ; bias resistor\n"
				"r2 b 0 10k $ to ground\n"
				"r3 b$x 0 1k\n"
				"; a whole-line semicolon comment\n"
				"c1 a 0 10n\n") == SCH_OK);
	CHECK_STR(card_of(&deck, "r1"), "r1 a b 4.7k");
	CHECK_STR(card_of(&deck, "r2"), "r2 b 0 10k");
	CHECK_STR(card_of(&deck, "r3"), "r3 b$x 0 1k");
	CHECK(deck.n_cards == 4);
	sch_deck_release(&deck);
}

static void test_deck__comment_only_line_does_not_end_a_card(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "t\nr1 a\n; note\n+ b 1k\n") == SCH_OK);
	CHECK_STR(card_of(&deck, "r1"), "r1 a b 1k");
	sch_deck_release(&deck);
}

static void test_deck__title_is_never_a_card(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "r1 a b 1k\nr2 a b 2k\n") == SCH_OK);
	CHECK_STR(deck.title, "r1 a b 1k");
	CHECK(deck.n_elements == 1);
	CHECK_STR(deck.elements[0].name, "r2");
	sch_deck_release(&deck);
}

static void test_deck__lowercases_tokens_and_keeps_card_text(void)
{
	struct sch_deck deck;
	const struct sch_element *e;

	CHECK(load_text(&deck, "Case\r\nRLoad OUT Gnd 10K\r\n") == SCH_OK);
	CHECK_STR(deck.title, "Case");
	e = element(&deck, "rload");
	CHECK(e && e->letter == 'r' && e->n_tok == 3);
	if (e) {
		CHECK_STR(e->tok[0], "out");
		CHECK_STR(e->tok[1], "gnd");
		CHECK_STR(e->tok[2], "10k");
	}
	CHECK_STR(deck.cards[0].text, "RLoad OUT Gnd 10K");
	sch_deck_release(&deck);
}

static void test_deck__accepts_engineering_suffixes(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "suffixes\n"
				"rf in out 1MEG\n"
				"cf in out 10pF\n"
				"rg in 0 2.2k\n"
				"lw a 0 5mil\n"
				"cx a 0 1.5e-12\n"
				"ib a 0 dc 3.3uA ac 1\n"
				"vs b 0 -2.5\n") == SCH_OK);
	CHECK(deck.n_elements == 7);
	sch_deck_release(&deck);
}

static void test_deck__rejects_malformed_number(void)
{
	expect_error("t\nr1 a b 1k\nr2 a b 1.2.3\n", INLINE_NAME ":3: malformed number '1.2.3'");
	expect_error("t\nc1 a b 1e\n", INLINE_NAME ":2: malformed number '1e'");
	expect_error("t\nv1 a 0 dc 5x.3\n", INLINE_NAME ":2: malformed number '5x.3'");
	expect_error("t\n.temp 2-7\n", INLINE_NAME ":2: malformed number '2-7'");
}

static void test_deck__keeps_param_and_braces_as_text(void)
{
	struct sch_deck deck;
	const struct sch_element *e;

	CHECK(load_text(&deck, "params\n.param rval = 10k gain={2*pi}\nr1 a b {rval*2}\n") == SCH_OK);
	CHECK(deck.n_cards == 2);
	CHECK_STR(deck.cards[0].keyword, ".param");
	CHECK_STR(deck.cards[0].text, ".param rval = 10k gain={2*pi}");
	e = element(&deck, "r1");
	CHECK(e && e->n_tok == 3);
	if (e)
		CHECK_STR(e->tok[2], "{rval*2}");
	sch_deck_release(&deck);
}

static void test_deck__groups_brackets_quotes_and_assignments(void)
{
	struct sch_deck deck;
	const struct sch_element *e;

	CHECK(load_text(&deck, "groups\n"
				"vin a 0 dc 0 sin(0 1m 1k) ac 1\n"
				"bsense b 0 i = 'v(a) * 2'\n"
				"xu1 a b amp params: gain = {g1 * 2}\n"
				".subckt amp p q params: gain=1\nrq p q 1k\n.ends\n") == SCH_OK);
	e = element(&deck, "vin");
	CHECK(e && e->n_tok == 7);
	if (e)
		CHECK_STR(e->tok[4], "sin(0 1m 1k)");
	e = element(&deck, "bsense");
	CHECK(e && e->n_tok == 3);
	if (e)
		CHECK_STR(e->tok[2], "i='v(a) * 2'");
	e = element(&deck, "xu1");
	CHECK(e && e->n_tok == 5);
	if (e)
		CHECK_STR(e->tok[4], "gain={g1 * 2}");
	sch_deck_release(&deck);
}

static void test_deck__reads_models_in_each_form(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "models\n"
				".model dleak D(IS=10f N=1)\n"
				".model QPRE NPN (BF=300 IS=1e-16)\n"
				".model nfet nmos level=1 vto=0.7\n") == SCH_OK);
	CHECK(deck.n_models == 3);
	CHECK_STR(deck.models[0].name, "dleak");
	CHECK_STR(deck.models[0].type, "d");
	CHECK_STR(deck.models[1].name, "qpre");
	CHECK_STR(deck.models[1].type, "npn");
	CHECK_STR(deck.models[2].type, "nmos");
	CHECK(deck.models[2].subckt == -1);
	CHECK_STR(deck.cards[1].keyword, ".model");
	CHECK(sch_deck_find_model(&deck, "qpre", -1) == 1);
	CHECK(sch_deck_find_model(&deck, "nothere", -1) == -1);
	sch_deck_release(&deck);
}

static void test_deck__fills_noise_temp_and_options(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "noise\n"
				"iph 0 in dc 1n ac 1\nrf in out 1meg\n"
				".temp 27\n.options reltol=1e-4\n"
				".NOISE V( out , 0 ) IPH dec 20 1 1MEG 5\n") == SCH_OK);
	CHECK(deck.noise.present);
	CHECK_STR(deck.noise.output, "v(out,0)");
	CHECK_STR(deck.noise.input, "iph");
	CHECK_STR(deck.noise.sweep, "dec");
	CHECK_STR(deck.noise.n_points, "20");
	CHECK_STR(deck.noise.f_start, "1");
	CHECK_STR(deck.noise.f_stop, "1meg");
	CHECK_STR(deck.noise.pts_per_summary, "5");
	CHECK(deck.noise.card == 4);
	CHECK_STR(deck.cards[2].keyword, ".temp");
	CHECK_STR(deck.cards[3].keyword, ".options");
	sch_deck_release(&deck);

	CHECK(load_text(&deck, "no noise line\nr1 a 0 1k\n") == SCH_OK);
	CHECK(!deck.noise.present);
	CHECK(deck.noise.pts_per_summary == NULL);
	sch_deck_release(&deck);
}

static void test_deck__end_stops_reading_the_top_file(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "t\nr1 a 0 1k\n.END\nthis is not read 1.2.3\n") == SCH_OK);
	CHECK(deck.n_cards == 1);
	sch_deck_release(&deck);
}

static void test_deck__subckt_with_params(void)
{
	struct sch_deck deck;
	const struct sch_subckt *s;

	CHECK(load_text(&deck, "sensor\n"
				".subckt leak_cell top guard bot params: rleak=1t cpar = 2p\n"
				"ileak top bot dc {1/rleak}\n"
				".ends leak_cell\n"
				".subckt plain a b rser=10\nr1 a b {rser}\n.ends\n"
				"x1 n1 n2 0 leak_cell rleak=500g\n"
				"x2 n1 n2 plain\n") == SCH_OK);
	assert_sane_deck(&deck);
	CHECK(deck.n_subckts == 2);
	s = &deck.subckts[0];
	CHECK_STR(s->name, "leak_cell");
	CHECK(s->n_ports == 3);
	CHECK_STR(s->ports[2], "bot");
	CHECK_STR(s->params, "rleak=1t cpar=2p");
	CHECK(s->parent == -1 && s->card_begin == 0 && s->card_end == 2);
	CHECK_STR(deck.subckts[1].params, "rser=10");
	CHECK(deck.subckts[1].n_ports == 2);
	CHECK(sch_deck_find_subckt(&deck, "plain") == 1);
	CHECK(sch_deck_find_subckt(&deck, "nothing") == -1);
	CHECK(element(&deck, "ileak")->subckt == 0);
	CHECK(element(&deck, "x1")->subckt == -1);
	CHECK_STR(sch_deck_x_subckt(&deck, element(&deck, "x1")), "leak_cell");
	CHECK_STR(sch_deck_x_subckt(&deck, element(&deck, "x2")), "plain");
	CHECK(sch_deck_x_subckt(&deck, element(&deck, "ileak")) == NULL);
	sch_deck_release(&deck);
}

static void test_deck__nested_subckt_definitions_have_parents(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "nested\n"
				".subckt outer a b\n"
				".subckt inner p q\n.model dloc d is=1f\ndj p q dloc\n.ends inner\n"
				"xi a b inner\n"
				".ends outer\n"
				"xo 1 0 outer\n") == SCH_OK);
	assert_sane_deck(&deck);
	CHECK(deck.n_subckts == 2);
	CHECK(deck.subckts[1].parent == 0);
	CHECK(deck.models[0].subckt == 1);
	CHECK(sch_deck_find_model(&deck, "dloc", 1) == 0);
	CHECK(sch_deck_find_model(&deck, "dloc", -1) == -1);
	CHECK(element(&deck, "dj")->subckt == 1);
	CHECK(element(&deck, "xi")->subckt == 0);
	sch_deck_release(&deck);
}

static void test_deck__reads_an_upper_case_export_with_continuations(void)
{
	struct sch_deck deck;
	const struct sch_element *e;

	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load(&deck, "data/deck/upper.cir", &diag) == SCH_OK);
	assert_sane_deck(&deck);
	CHECK(deck.n_subckts == 1);
	CHECK_STR(deck.subckts[0].name, "apd_rx");
	CHECK(deck.subckts[0].n_ports == 3);
	CHECK_STR(deck.subckts[0].ports[2], "vref");
	e = element(&deck, "iphoto");
	CHECK(e && e->n_tok == 6);
	CHECK_STR(card_of(&deck, "iphoto"), "IPHOTO IN 0 DC 12N AC 1");
	e = element(&deck, "x1");
	CHECK(e && e->n_tok == 4);
	CHECK_STR(sch_deck_x_subckt(&deck, e), "apd_rx");
	CHECK(deck.cards[element(&deck, "x1")->card].line == 10);
	CHECK_STR(deck.models[0].name, "dapd_model");
	CHECK(deck.noise.present);
	CHECK_STR(deck.noise.output, "v(b)");
	CHECK_STR(deck.noise.f_stop, "10meg");
	sch_deck_release(&deck);
}

/* ---- files -------------------------------------------------------------------------------- */

static void check_probe_deck(const struct sch_deck *deck)
{
	const struct sch_element *e;

	assert_sane_deck(deck);
	CHECK(deck->n_files == 4);
	if (deck->n_files == 4) {
		CHECK(strstr(deck->files[0], "probe_top.cir") != NULL);
		CHECK(strstr(deck->files[1], "sub/pd.inc") != NULL);
		CHECK(strstr(deck->files[2], "sub/models/pin.mod") != NULL);
		CHECK(strstr(deck->files[3], "lib/parts.lib") != NULL);
	}
	CHECK(deck->n_models == 1);
	CHECK(deck->n_subckts == 2);
	e = element(deck, "dpin");
	CHECK(e != NULL);
	if (e) {
		CHECK(strstr(deck->cards[e->card].file, "sub/pd.inc") != NULL);
		CHECK(deck->cards[e->card].line == 9);
	}
	CHECK(element(deck, "rf") != NULL);
	CHECK(element(deck, "rafter") == NULL);
	CHECK(deck->n_dropped_control == 2);
	CHECK(deck->n_dropped_script == 2);
	for (size_t i = 0; i < deck->n_cards; i++)
		CHECK(strstr(deck->cards[i].text, "pwn") == NULL && strstr(deck->cards[i].text, "would be") == NULL);
	CHECK(deck->noise.present);
}

static void test_deck__reads_nested_includes_relative_to_the_including_file(void)
{
	struct sch_deck deck;

	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load(&deck, "data/deck/probe_top.cir", &diag) == SCH_OK);
	check_probe_deck(&deck);
	CHECK(diag.n_warnings == 4);
	sch_deck_release(&deck);
}

static void test_deck__resolves_includes_from_another_working_directory(void)
{
	struct sch_deck deck;
	char here[4096];

	CHECK(getcwd(here, sizeof(here)) != NULL);
	CHECK(chdir("data/deck/sub/models") == 0);
	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load(&deck, "../../probe_top.cir", &diag) == SCH_OK);
	check_probe_deck(&deck);
	sch_deck_release(&deck);
	CHECK(chdir(here) == 0);
}

static void test_deck__reads_only_the_named_lib_section(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "lib\n.LIB 'lib/parts.lib' OPAMP\nxa 1 2 0 tia_amp\n") == SCH_OK);
	CHECK(deck.n_subckts == 1);
	CHECK_STR(deck.subckts[0].name, "tia_amp");
	CHECK(strstr(deck.cards[0].file, "lib/parts.lib") != NULL);
	CHECK(deck.n_dropped_control == 1 && deck.n_dropped_script == 1);
	sch_deck_release(&deck);
}

static void test_deck__skips_lib_definitions_in_a_normally_read_file(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "lib def\n.lib corner_a\nr1 a 0 1.2.3\n.endl corner_a\nr2 a 0 1k\n") == SCH_OK);
	CHECK(deck.n_elements == 1);
	CHECK_STR(deck.elements[0].name, "r2");
	sch_deck_release(&deck);

	CHECK(load_text(&deck, "include of a library\n.include lib/parts.lib\nr2 a 0 1k\n") == SCH_OK);
	CHECK(deck.n_elements == 1 && deck.n_subckts == 0);
	CHECK(deck.n_dropped_control == 0);
	sch_deck_release(&deck);
}

static void test_deck__lists_each_file_once(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "twice\n.include sub/models/pin.mod\n.inc \"sub/models/pin.mod\"\n"
				".lib lib/parts.lib opamp\n") == SCH_OK);
	CHECK(deck.n_files == 3);
	CHECK(deck.n_models == 2);
	sch_deck_release(&deck);
}

/* ---- .control blocks read as data ------------------------------------------------------------ */

/* The card with this keyword whose text is text, or NULL. */
static const struct sch_card *card_with(const struct sch_deck *deck, const char *keyword)
{
	for (size_t i = 0; i < deck->n_cards; i++)
		if (deck->cards[i].keyword && strcmp(deck->cards[i].keyword, keyword) == 0)
			return &deck->cards[i];
	return NULL;
}

/* Whether some deck note contains s. */
static bool note_has(const struct sch_deck *deck, const char *s)
{
	for (size_t i = 0; i < deck->n_notes; i++)
		if (strstr(deck->notes[i], s))
			return true;
	return false;
}

static void test_deck__reads_the_noise_command_of_a_control_block(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "ctl noise\nvin in 0 dc 0 ac 1\nr1 in out 1k\nr2 out ref 1k\nr3 ref 0 1\n"
			       ".control\n"
			       "NOISE V( Out , Ref ) Vin\n"
			       "+ DEC 10 1 1MEG 1 ; the summary points\n"
			       ".endc\n") == SCH_OK);
	assert_sane_deck(&deck);
	CHECK(deck.noise.present && deck.noise.from_control);
	CHECK_STR(deck.noise.output, "v(out,ref)");
	CHECK_STR(deck.noise.input, "vin");
	CHECK_STR(deck.noise.sweep, "dec");
	CHECK_STR(deck.noise.n_points, "10");
	CHECK_STR(deck.noise.f_start, "1");
	CHECK_STR(deck.noise.f_stop, "1000000");
	CHECK_STR(deck.noise.pts_per_summary, "1");
	/* the card is rebuilt from the checked tokens and located at the command's first line */
	CHECK_STR(deck.cards[deck.noise.card].text, ".noise v(out,ref) vin dec 10 1 1000000 1");
	CHECK(deck.cards[deck.noise.card].line == 7);
	CHECK(deck.n_dropped_control == 1);
	CHECK(deck.n_notes == 1 && note_has(&deck, INLINE_NAME ":7"));
	sch_deck_release(&deck);
}

static void test_deck__a_noise_card_wins_over_the_control_block(void)
{
	struct sch_deck deck;

	/* the block comes first, the card after it: the card is the deck's noise analysis */
	CHECK(load_text(&deck, "t\niph a 0 dc 1n\nr1 a 0 1k\n.control\nnoise v(a) iph dec 5 1 10\n.endc\n"
			       ".noise v(a) iph dec 10 1 1k\n") == SCH_OK);
	CHECK(deck.noise.present && !deck.noise.from_control);
	CHECK_STR(deck.noise.f_stop, "1k");
	CHECK(deck.n_notes == 0 && card_with(&deck, ".temp") == NULL);
	sch_deck_release(&deck);
}

static void test_deck__honours_op_and_temperature_before_the_noise_command(void)
{
	struct sch_deck deck;
	const struct sch_card *temp;

	CHECK(load_text(&deck, "t\niph a 0 dc 1n\nr1 a 0 1k\n.temp 10\n.control\nset temp = 50\nop\n"
			       "option temp=60\nnoise v(a) iph lin 3 1k 3k\nset temp=70\n.endc\n") == SCH_OK);
	CHECK(deck.noise.from_control);
	/* the last setting before the noise command, as a .temp card after the deck's own */
	temp = &deck.cards[deck.n_cards - 1];
	CHECK_STR(temp->keyword, ".temp");
	CHECK_STR(temp->text, ".temp 60");
	CHECK(temp->line == 8);
	CHECK(note_has(&deck, "its op (line 7)"));
	CHECK(note_has(&deck, "applied as '.temp 60'"));
	CHECK(note_has(&deck, "after the noise command: 'set' (line 10)"));
	sch_deck_release(&deck);

	/* '.temp' inside a block is no command of the simulator: not honoured */
	CHECK(load_text(&deck, "t\niph a 0 dc 1n\nr1 a 0 1k\n.control\n.temp 80\nnoise v(a) iph dec 1 1k 1k\n.endc\n") ==
	      SCH_OK);
	CHECK(card_with(&deck, ".temp") == NULL);
	CHECK(note_has(&deck, "before the noise command, where they may change its result: '.temp' (line 5)"));
	sch_deck_release(&deck);
}

static void test_deck__lists_what_the_block_does_not_honour(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "t\niph a 0 dc 1n\nr1 a 0 1k\n.control\nalter r1 2k\nlet x = 3\n"
			       "foreach v 1 2\nnoise v(a) iph dec 10 1 1k\nend\nac dec 10 1 1k\n"
			       "noise v(a) iph dec 10 1 1k\nnoise v(a) iph dec 20 1 10k\nshell touch pwn\nplot onoise_spectrum\n"
			       "print a\nprint b\n.endc\n") == SCH_OK);
	/* the noise command inside the loop is not the analysis: the first one outside it is */
	CHECK(deck.noise.from_control);
	CHECK(deck.cards[deck.noise.card].line == 11);
	CHECK(deck.n_notes == 2);
	CHECK_STR(deck.notes[1], "not honoured from '.control' (never run): before the noise command, where they may "
				 "change its result: 'alter' (line 5), 'let' (line 6), 'foreach' (line 7), 'noise' (line 8), "
				 "'ac' (line 10); after it: 'noise' (line 12), 'shell' (line 13), 'plot' (line 14), "
				 "'print' (lines 15, 16)");
	sch_deck_release(&deck);
}

static void test_deck__never_takes_a_noise_command_with_odd_tokens(void)
{
	static const char *const bad[] = {
		"noise v(a) iph dec 10 1 $fmax",      /* a variable: the simulator expands it */
		"noise v(a) `touch pwn` dec 10 1 1k", /* a backquote runs a shell */
		"noise v(a;shell) iph dec 10 1 1k",   /* ';' would end the command */
		"noise v(a) iph dec 10 1 1k>out",     /* a redirection */
		"noise v(a) iph dec 4k7 1 1k",        /* read differently by the simulator */
		"noise v(a) iph dec 10 1 {fmax}",     /* an expression */
		"noise i(a) iph dec 10 1 1k",         /* not a node voltage */
		"noise v(a) r1 dec 10 1 1k",          /* not a source name */
		"noise v(a) iph log 10 1 1k",         /* no sweep type */
		"noise v(a) iph dec 10 1",            /* too few */
		"noise v(a) iph dec 10 1 1k 1 2",     /* too many */
		"noise v(a) iph dec 10 1 1k \xc3\xa9", /* not ASCII */
	};
	struct sch_deck deck;
	char text[256];

	for (size_t i = 0; i < sizeof(bad) / sizeof(bad[0]); i++) {
		snprintf(text, sizeof(text), "t\niph a 0 dc 1n\nr1 a 0 1k\n.control\n%s\n.endc\n", bad[i]);
		CHECK(load_text(&deck, text) == SCH_OK);
		CHECK(!deck.noise.present);
		for (size_t c = 0; c < deck.n_cards; c++)
			CHECK(deck.cards[c].keyword == NULL || strcmp(deck.cards[c].keyword, ".noise") != 0);
		sch_deck_release(&deck);
	}
}

static void test_deck__reads_a_control_noise_command_from_an_included_file(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "t\niph a 0 dc 1n\n.include sub/ctl_noise.inc\n") == SCH_OK);
	CHECK(deck.noise.from_control);
	CHECK(strstr(deck.cards[deck.noise.card].file, "ctl_noise.inc") != NULL);
	CHECK(deck.cards[deck.noise.card].line == 6);
	CHECK_STR(card_with(&deck, ".temp")->text, ".temp 40");
	/* text of an included file is never quoted in a message: the unknown command is " a command" */
	CHECK(!note_has(&deck, "mycommand_from_include"));
	CHECK(note_has(&deck, "a command ("));
	sch_deck_release(&deck);
}

static void test_deck__a_control_noise_output_must_be_a_node(void)
{
	expect_error("t\niph a 0 dc 1n\nr1 a 0 1k\n.control\nnoise v(nonode) iph dec 10 1 1k\n.endc\n",
		     INLINE_NAME ":5: the '.control' noise command's output node 'nonode' is not a node of any element "
				 "at the top level");
}

static void test_deck__a_spot_noise_command_is_read(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "t\niph a 0 dc 1n\nr1 a 0 1k\n.control\nnoise v(a) iph dec 1 1k 1k\n.endc\n") == SCH_OK);
	CHECK(deck.noise.from_control);
	CHECK_STR(deck.noise.f_start, "1000");
	CHECK_STR(deck.noise.f_stop, "1000");
	CHECK(deck.noise.pts_per_summary == NULL);
	sch_deck_release(&deck);
}

/* ---- safety ------------------------------------------------------------------------------- */

static void test_deck__drops_control_blocks(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "ctl\n"
				"r1 a 0 1k\n"
				"   .CONTROL\nshell touch pwn1\n+ more\n.endc\n"
				".controlX\nshell touch pwn2\n.ENDC\n"
				"r2 a 0 2k\n") == SCH_OK);
	CHECK(deck.n_elements == 2);
	CHECK(deck.n_cards == 2);
	CHECK(deck.n_dropped_control == 2);
	CHECK(diag.n_warnings == 2);
	sch_deck_release(&deck);
}

static void test_deck__drops_script_lines(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "script\n*#shell touch pwn\n   *# echo hi\nr1 a 0 1k\n") == SCH_OK);
	CHECK(deck.n_cards == 1);
	CHECK(deck.n_dropped_script == 2);
	CHECK(diag.n_warnings == 2);
	sch_deck_release(&deck);
}

static void test_deck__drops_control_and_script_in_included_files(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "inc\n.include sub/pd.inc\n") == SCH_OK);
	CHECK(deck.n_dropped_control == 1);
	CHECK(deck.n_dropped_script == 1);
	for (size_t i = 0; i < deck.n_cards; i++)
		CHECK(strstr(deck.cards[i].text, "pwn") == NULL);
	sch_deck_release(&deck);
}

static void test_deck__warns_about_a_script_title(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "*NG_SCRIPT harmless looking title\nr1 a 0 1k\n") == SCH_OK);
	CHECK_STR(deck.title, "*NG_SCRIPT harmless looking title");
	CHECK(deck.n_cards == 1);
	CHECK(diag.n_warnings == 1);
	sch_deck_release(&deck);

	CHECK(load_text(&deck, "\n*ng_script after a blank title\nr1 a 0 1k\n") == SCH_OK);
	CHECK(deck.n_cards == 1);
	CHECK(diag.n_warnings == 1);
	sch_deck_release(&deck);
}

static void test_deck__survives_odd_shapes(void)
{
	struct sch_deck deck;

	/* unterminated quote and brackets stay one token to the end of the card */
	CHECK(load_text(&deck, "odd\nb1 a 0 v='v(x)*2\nr1 a 0 {((1k\n") == SCH_OK);
	CHECK(element(&deck, "b1")->n_tok == 3);
	CHECK(element(&deck, "r1")->n_tok == 3);
	sch_deck_release(&deck);
	/* a continuation with nothing to continue is ignored with a warning */
	CHECK(load_text(&deck, "odd\n+ r1 a 0 1k\nr2 a 0 1k\n") == SCH_OK);
	CHECK(deck.n_elements == 1 && diag.n_warnings == 1);
	sch_deck_release(&deck);
	/* a .control block without .endc swallows the rest of the file */
	CHECK(load_text(&deck, "odd\nr1 a 0 1k\n.control\nr2 a 0 1k\n") == SCH_OK);
	CHECK(deck.n_elements == 1 && deck.n_dropped_control == 1);
	sch_deck_release(&deck);
	/* '.con' + 'trol' over a continuation is not a control block (ngspice does not run it); the
	 * card '.con trol' is not on the allow-list, so it is dropped with a note */
	CHECK(load_text(&deck, "odd\n.con\n+trol\n") == SCH_OK);
	CHECK(deck.n_cards == 0 && deck.n_dropped_control == 0);
	sch_deck_release(&deck);
	expect_error("odd\n.include\n", INLINE_NAME ":2: '.include' needs a file name");
	expect_error("odd\n.lib\n", INLINE_NAME ":2: '.lib' needs a file name and a section");
	expect_error("odd\n.model\n", INLINE_NAME ":2: '.model' needs a name and a type");
	expect_error("odd\n.noise v(out)\n", INLINE_NAME
		     ":2: '.noise' needs an output, an input source, a sweep type, a point count and two frequencies");
	expect_error("odd\n.noise v(o) i1 log 10 1 1k\n", INLINE_NAME ":2: unknown sweep type 'log' in '.noise'");
}

/* ---- errors ------------------------------------------------------------------------------- */

static void test_deck__reports_missing_include_file(void)
{
	expect_error("t\nr1 a 0 1k\n.include \"no/such.inc\"\n",
		     INLINE_NAME ":3: cannot open include file 'data/deck/no/such.inc': no such file or directory");
}

static void test_deck__reports_include_cycle(void)
{
	expect_error("t\n.include cycle/a.inc\n",
		     "data/deck/cycle/b.inc:2: include cycle: 'data/deck/cycle/a.inc' is already being read");
	expect_error("t\n.include inline.cir\n",
		     INLINE_NAME ":2: include cycle: 'data/deck/inline.cir' is already being read");
}

static void test_deck__reports_include_depth(void)
{
	char dir[] = "/tmp/schrot-deck-depthXXXXXX";
	char path[256], top[256];
	struct sch_deck deck;
	FILE *f;

	CHECK(mkdtemp(dir) != NULL);
	for (int i = 0; i <= SCH_MAX_INCLUDE_DEPTH + 1; i++) {
		snprintf(path, sizeof(path), "%s/f%d.inc", dir, i);
		f = fopen(path, "w");
		CHECK(f != NULL);
		if (!f)
			return;
		fprintf(f, "r%d a 0 1k\n.include f%d.inc\n", i, i + 1);
		fclose(f);
	}
	snprintf(top, sizeof(top), "%s/top.cir", dir);
	f = fopen(top, "w");
	if (f) {
		fprintf(f, "deep\n.include f0.inc\n");
		fclose(f);
	}
	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load(&deck, top, &diag) == SCH_ERR_INPUT);
	snprintf(path, sizeof(path), "%s/f%d.inc:2: includes nested more than %d levels deep at '%s/f%d.inc'", dir,
		 SCH_MAX_INCLUDE_DEPTH - 1, SCH_MAX_INCLUDE_DEPTH, dir, SCH_MAX_INCLUDE_DEPTH);
	CHECK_STR(diag.first_error, path);
	sch_deck_release(&deck);
	for (int i = 0; i <= SCH_MAX_INCLUDE_DEPTH + 1; i++) {
		snprintf(path, sizeof(path), "%s/f%d.inc", dir, i);
		unlink(path);
	}
	unlink(top);
	rmdir(dir);
}

/* Each level includes the next one twice: 2^15 reads, stopped by the read cap, not by depth. */
static void test_deck__limits_include_fan_out(void)
{
	char dir[] = "/tmp/schrot-deck-fanXXXXXX";
	char path[256];
	struct sch_deck deck;
	FILE *f;

	CHECK(mkdtemp(dir) != NULL);
	for (int i = 0; i <= 16; i++) {
		snprintf(path, sizeof(path), "%s/f%d.inc", dir, i);
		f = fopen(path, "w");
		CHECK(f != NULL);
		if (!f)
			return;
		if (i == 0)
			fprintf(f, "fan-out\n");
		if (i < 16)
			fprintf(f, ".include f%d.inc\n.include f%d.inc\n", i + 1, i + 1);
		else
			fprintf(f, "r1 a 0 1k\n");
		fclose(f);
	}
	snprintf(path, sizeof(path), "%s/f0.inc", dir);
	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load(&deck, path, &diag) == SCH_ERR_INPUT);
	CHECK(strstr(diag.first_error, "more than 10000 include and library reads") != NULL);
	sch_deck_release(&deck);
	for (int i = 0; i <= 16; i++) {
		snprintf(path, sizeof(path), "%s/f%d.inc", dir, i);
		unlink(path);
	}
	rmdir(dir);
}

static void test_deck__reports_missing_lib_section(void)
{
	expect_error("t\n\n.lib lib/parts.lib fast_corner\n",
		     INLINE_NAME ":3: library section 'fast_corner' not found in 'data/deck/lib/parts.lib'");
	expect_error("t\n.lib lib/nothere.lib tt\n",
		     INLINE_NAME ":2: cannot open library file 'data/deck/lib/nothere.lib': no such file or directory");
}

static void test_deck__rejects_binary_input(void)
{
	static const char bin[] = "title\nr1 a 0 1k\nr2 \0 0 1k\n";
	struct sch_deck deck;

	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load_text(&deck, INLINE_NAME, bin, sizeof(bin) - 1, &diag) == SCH_ERR_INPUT);
	CHECK_STR(diag.first_error, INLINE_NAME ":3: binary file");
	sch_deck_release(&deck);
}

static void test_deck__rejects_invalid_utf8_outside_comments(void)
{
	struct sch_deck deck;

	expect_error("t\nr1 a 0 1k\nr\xe9sistor a 0 1k\n", INLINE_NAME ":3: invalid utf-8 (byte 0xe9)");
	expect_error("t\nr1 a 0 1k\n+ \xc0\xaf\n", INLINE_NAME ":3: invalid utf-8 (byte 0xc0)");
	CHECK(load_text(&deck, "Lichtsonde f\xc3\xbcr Gew\xc3\xa4" "chshaus\n* gr\xfc\xdf" "e\n"
				"r1 a 0 1k ; \xff\xfe\nr2 a 0 1k $ \x80\n") == SCH_OK);
	CHECK(deck.n_elements == 2);
	sch_deck_release(&deck);
}

static void test_deck__rejects_overlong_line(void)
{
	size_t n = 2 * SCH_MAX_LINE;
	char *text = malloc(n + 64);
	struct sch_deck deck;

	CHECK(text != NULL);
	if (!text)
		return;
	strcpy(text, "long\nr1 a 0 1k\nr2 a 0\n");
	for (size_t len = strlen(text); len < n;) {
		memcpy(text + len, "+ 1k\n", 5);
		len += 5;
		text[len] = '\0';
	}
	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load_text(&deck, INLINE_NAME, text, strlen(text), &diag) == SCH_ERR_INPUT);
	CHECK_STR(diag.first_error, INLINE_NAME ":3: line longer than 1048576 bytes");
	sch_deck_release(&deck);
	free(text);
}

static void test_deck__rejects_element_not_starting_with_a_letter(void)
{
	expect_error("t\nr1 a 0 1k\n1r a 0 1k\n", INLINE_NAME ":3: element name '1r' does not start with a letter");
	expect_error("t\n-q 1 2 3\n", INLINE_NAME ":2: element name '-q' does not start with a letter");
}

static void test_deck__rejects_too_few_fields_per_letter(void)
{
	static const struct {
		const char *line;
		const char *needs;
	} cases[] = {
		{ "r1 a b", "'r1': needs 2 nodes and a value" },
		{ "c1 a", "'c1': needs 2 nodes and a value" },
		{ "l1 a b", "'l1': needs 2 nodes and a value" },
		{ "d1 a b", "'d1': needs 2 nodes and a model" },
		{ "q1 c b e", "'q1': needs 3 nodes and a model" },
		{ "m1 d g s", "'m1': needs 4 nodes and a model" },
		{ "j1 d g", "'j1': needs 3 nodes and a model" },
		{ "i1 a", "'i1': needs 2 nodes" },
		{ "v1", "'v1': needs 2 nodes" },
		{ "e1 a b c", "'e1': needs 2 nodes and a control (2 nodes and a gain, or an expression)" },
		{ "g1 a b", "'g1': needs 2 nodes and a control (2 nodes and a gain, or an expression)" },
		{ "f1 a b vsense", "'f1': needs 2 nodes and a control (a source and a gain)" },
		{ "h1 a b", "'h1': needs 2 nodes and a control (a source and a gain)" },
		{ "x1", "'x1': needs a subcircuit name" },
		{ "x2 gain=3", "'x2': needs a subcircuit name" },
	};
	char text[128], message[256];

	for (size_t i = 0; i < sizeof(cases) / sizeof(cases[0]); i++) {
		snprintf(text, sizeof(text), "fields\n.model m d\n%s\n", cases[i].line);
		snprintf(message, sizeof(message), INLINE_NAME ":3: too few fields for %s", cases[i].needs);
		expect_error(text, message);
	}
}

static void test_deck__accepts_behavioural_controlled_sources(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "behavioural\nvs s 0 0\n"
				"e1 a 0 vol='v(b)*2'\ng1 a 0 value={v(b)/1k}\ng2 a 0 cur = 'v(c)'\n"
				"f1 a 0 vs 2\nh1 a 0 poly(1) vs 0 1\ne2 a 0 b 0 10\n") == SCH_OK);
	CHECK(deck.n_elements == 7);
	sch_deck_release(&deck);
}

static void test_deck__rejects_unbalanced_subckt(void)
{
	expect_error("t\n.subckt cell a b\nr1 a b 1k\n", INLINE_NAME ":2: '.subckt cell' has no matching '.ends'");
	expect_error("t\nr1 a b 1k\n.ends\n", INLINE_NAME ":3: '.ends' without '.subckt'");
	expect_error("t\n.subckt\n.ends\n", INLINE_NAME ":2: '.subckt' needs a name");
}

static void test_deck__rejects_unknown_subckt_at_the_x_line(void)
{
	expect_error("t\nx1 a b sensor_cell\n.subckt other a b\nr1 a b 1k\n.ends\n",
		     INLINE_NAME ":2: unknown subcircuit 'sensor_cell'");
	/* a definition nested in another one is not visible from the top level */
	expect_error("t\n.subckt outer a\n.subckt inner p\nr1 p 0 1k\n.ends\n.ends\nx1 a inner\n",
		     INLINE_NAME ":7: unknown subcircuit 'inner'");
}

static void test_deck__rejects_undefined_model_at_the_line(void)
{
	struct sch_deck deck;

	expect_error("t\n.model dpin d is=1f\nd1 a b dpin\nd2 a b dpn\n", INLINE_NAME ":4: model 'dpn' is not defined");
	expect_error("t\nq1 c b e qnpn\n", INLINE_NAME ":2: model 'qnpn' is not defined");
	expect_error("t\nm1 d g s b nch w=1u\n", INLINE_NAME ":2: model 'nch' is not defined");
	expect_error("t\nj1 d g s jfet1\n", INLINE_NAME ":2: model 'jfet1' is not defined");
	/* defined later, four-terminal BJT, binned MOS models, models in a subcircuit */
	CHECK(load_text(&deck, "t\nd1 a b dlate\nq1 c b e sub qnpn 2\nm1 d g s b nch l=1u\n"
				".subckt s1 a\nd9 a 0 dloc\n.model dloc d\n.ends\n"
				".model dlate d\n.model qnpn npn\n.model nch.1 nmos\n.model nch.2 nmos\n") == SCH_OK);
	sch_deck_release(&deck);
}

static void test_deck__rejects_empty_netlist(void)
{
	struct sch_deck deck;

	expect_error("", INLINE_NAME ": empty netlist");
	expect_error(" \n\n\t\n", INLINE_NAME ": empty netlist");
	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load(&deck, "data/deck/empty.cir", &diag) == SCH_ERR_INPUT);
	CHECK_STR(diag.first_error, "data/deck/empty.cir: empty netlist");
	sch_deck_release(&deck);
}

static void test_deck__loads_a_title_only_file(void)
{
	struct sch_deck deck;

	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load(&deck, "data/deck/title_only.cir", &diag) == SCH_OK);
	CHECK_STR(deck.title, "Only a title, nothing else");
	CHECK(deck.n_cards == 0 && deck.n_elements == 0);
	CHECK(deck.n_files == 1);
	sch_deck_release(&deck);
}

static void test_deck__rejects_directories_and_missing_files(void)
{
	struct sch_deck deck;

	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load(&deck, "data/deck", &diag) == SCH_ERR_INPUT);
	CHECK_STR(diag.first_error, "schrot: netlist 'data/deck' is a directory");
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load(&deck, "data/deck/absent.cir", &diag) == SCH_ERR_INPUT);
	CHECK_STR(diag.first_error, "schrot: cannot open netlist 'data/deck/absent.cir': no such file or directory");
	sch_deck_release(&deck);
	expect_error("t\n.include sub\n", INLINE_NAME ":2: include file 'data/deck/sub' is a directory");
	expect_error("t\n.include /dev/null\n",
		     INLINE_NAME ":2: cannot open include file '/dev/null': not a regular file");
}

/* ---- hierarchy ---------------------------------------------------------------------------- */

static void test_deck__expands_two_level_subcircuit_instances(void)
{
	struct sch_deck deck;
	struct sch_arena arena;
	struct sch_instance *in = NULL;
	size_t n = 0;

	CHECK(load_text(&deck, "two channel turbidity sensor\n"
				".subckt pd a k\niph k a dc 2n\nd5 a k dpd\n.ends\n"
				".subckt channel in out\nxpd in 0 pd\nrf in out 1meg\n.ends\n"
				".model dpd d is=1p\n"
				"x1 a1 o1 channel\nX2 a2 o2 channel\nrload o1 0 10k\n") == SCH_OK);
	sch_arena_init(&arena);
	CHECK(sch_deck_instances(&deck, &arena, &in, &n, &diag) == SCH_OK);
	CHECK(n == 7);
	if (n == 7) {
		CHECK_STR(in[0].path, "x1.xpd.iph");
		CHECK_STR(in[0].sim_name, "i.x1.xpd.iph");
		CHECK_STR(in[1].path, "x1.xpd.d5");
		CHECK_STR(in[1].sim_name, "d.x1.xpd.d5");
		CHECK_STR(in[2].path, "x1.rf");
		CHECK_STR(in[2].sim_name, "r.x1.rf");
		CHECK_STR(in[3].path, "x2.xpd.iph");
		CHECK_STR(in[5].sim_name, "r.x2.rf");
		CHECK_STR(in[6].path, "rload");
		CHECK_STR(in[6].sim_name, "rload");
		CHECK(in[6].parent == -1);
		CHECK(in[0].parent == in[1].parent && in[0].parent != in[2].parent);
		CHECK(in[2].parent != in[5].parent && in[0].parent != in[3].parent);
		CHECK(deck.elements[in[4].element].letter == 'd');
	}
	sch_arena_release(&arena);
	sch_deck_release(&deck);
}

static void test_deck__rejects_recursive_instantiation(void)
{
	struct sch_deck deck;
	struct sch_arena arena;
	struct sch_instance *in = NULL;
	size_t n = 0;

	CHECK(load_text(&deck, "loop\n.subckt a p\nxb p b\n.ends\n.subckt b p\nxa p a\n.ends\nx1 n a\n") == SCH_OK);
	sch_arena_init(&arena);
	CHECK(sch_deck_instances(&deck, &arena, &in, &n, &diag) == SCH_ERR_INPUT);
	CHECK_STR(diag.first_error, INLINE_NAME ":6: recursive instantiation of subcircuit 'a'");
	sch_arena_release(&arena);
	sch_deck_release(&deck);
}

static void test_deck__expands_8000_instances_quickly(void)
{
	struct sch_buf text;
	struct sch_deck deck;
	struct sch_arena arena;
	struct sch_instance *in = NULL;
	size_t n = 0;
	bool ok = true;
	clock_t t0 = clock();

	sch_buf_init(&text, (size_t)64 << 20);
	CHECK(sch_buf_adds(&text, "8000 leakage sensors\n.subckt cell a\nileak a 0 1p\ndl a 0 dl\nrl a 0 1g\n.ends\n"
				  ".model dl d\n") == SCH_OK);
	for (int i = 0; i < 8000; i++)
		ok &= sch_buf_printf(&text, "x%d n%d cell\n", i, i) == SCH_OK;
	for (int i = 0; i < 100000; i++)
		ok &= sch_buf_printf(&text, "r%d n%d n%d 1k\n", i, i % 8000, (i + 1) % 8000) == SCH_OK;
	CHECK(ok);
	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load_text(&deck, INLINE_NAME, text.data, text.len, &diag) == SCH_OK);
	sch_arena_init(&arena);
	CHECK(sch_deck_instances(&deck, &arena, &in, &n, &diag) == SCH_OK);
	CHECK(n == 8000 * 3 + 100000);
	if (n > 8000 * 3)
		CHECK_STR(in[3 * 7999 + 1].sim_name, "d.x7999.dl");
	CHECK((double)(clock() - t0) / CLOCKS_PER_SEC < 2.0);
	sch_arena_release(&arena);
	sch_deck_release(&deck);
	sch_buf_release(&text);
}

static void test_deck__reports_element_nodes(void)
{
	static const struct {
		const char *name;
		int n;
		const char *first;
	} want[] = {
		{ "r1", 2, "a" }, { "d1", 2, "a" }, { "i1", 2, "0" }, { "q1", 3, "c" }, { "q2", 4, "c" },
		{ "m1", 4, "d" }, { "j1", 3, "d" }, { "g1", 2, "a" }, { "g2", 4, "a" }, { "e1", 2, "o" },
		{ "f1", 2, "a" }, { "b1", 2, "a" }, { "x1", 3, "p" }, { "x2", 0, NULL }, { "k1", 0, NULL },
	};
	struct sch_deck deck;
	const char *const *nodes;

	CHECK(load_text(&deck, "nodes\n.model dm d\n.model qm npn\n.model nm nmos\n.model jm njf\n"
				".subckt s a b c\n.ends\n.subckt empty\n.ends\n"
				"r1 a b 1k\nd1 a b dm\ni1 0 a 1n\nq1 c b e qm\nq2 c b e sub qm\nm1 d g s b nm\n"
				"j1 d g s jm\ng1 a b cur='v(x)'\ng2 a b c d 1m\ne1 o 0 vol={v(i)}\nvs a 0 0\n"
				"f1 a b vs 1\nb1 a b i=1u\nx1 p q r s g=1\nx2 empty\nl1 a 0 1u\nl2 b 0 1u\nk1 l1 l2 0.9\n") == SCH_OK);
	for (size_t i = 0; i < sizeof(want) / sizeof(want[0]); i++) {
		const struct sch_element *e = element(&deck, want[i].name);
		int got;

		CHECK(e != NULL);
		if (!e)
			continue;
		got = sch_deck_element_nodes(&deck, e, &nodes);
		if (got != want[i].n)
			fprintf(stderr, "  %s: %d nodes, want %d\n", want[i].name, got, want[i].n);
		CHECK(got == want[i].n);
		if (want[i].first && got > 0)
			CHECK_STR(nodes[0], want[i].first);
	}
	sch_deck_release(&deck);
}

static void test_deck__release_is_safe_on_null_and_twice(void)
{
	struct sch_deck deck;

	sch_deck_release(NULL);
	CHECK(load_text(&deck, "t\nr1 a 0 1k\n") == SCH_OK);
	sch_deck_release(&deck);
	sch_deck_release(&deck);
	CHECK(deck.n_cards == 0 && deck.cards == NULL);
}

/* ---- hostile input --------------------------------------------------------------------------- */

static void test_deck__rejects_control_characters_in_card_text(void)
{
	expect_error("t\nr1 a 0 1k\r*#shell touch x\n", INLINE_NAME ":2: control character 0x0d in the text");
	expect_error("t\nr\033[31mred a 0 1k\n", INLINE_NAME ":2: control character 0x1b in the text");
	expect_error("t\nr1 a 0 1k\n+ 2\x7f\n", INLINE_NAME ":3: control character 0x7f in the text");
	expect_error("t\x07\nr1 a 0 1k\n", INLINE_NAME ":1: control character 0x07 in the text");
}

static void test_deck__keeps_crlf_tabs_and_control_bytes_in_comments(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "t\r\nr1\ta 0 1k\r\n* bell \a here\r\nr2 a 0 2k ; esc \033\r\n") == SCH_OK);
	CHECK(deck.n_elements == 2);
	CHECK_STR(deck.cards[1].text, "r2 a 0 2k");
	sch_deck_release(&deck);
}

/*
 * A code model's data file is found beside the file holding its .model card (as .include finds
 * files), its card carries the absolute path afterwards, its text is kept for the simulator's
 * redaction, and a FIFO, a missing name or a missing parameter is refused at the line.
 */
static void test_deck__code_model_data_file_becomes_an_absolute_path(void)
{
	char dir[] = "/tmp/schrot-test-deck-XXXXXX";
	char sub[64], table[64], fifo[64], top[64], want[128];
	const char *card = NULL;
	struct sch_deck deck;
	FILE *f;

	CHECK(mkdtemp(dir) != NULL);
	snprintf(sub, sizeof(sub), "%s/lib", dir);
	snprintf(table, sizeof(table), "%s/lib/resp.table", dir);
	snprintf(fifo, sizeof(fifo), "%s/lib/pipe.table", dir);
	snprintf(top, sizeof(top), "%s/lib/top.cir", dir);
	CHECK(mkdir(sub, 0700) == 0);
	CHECK(mkfifo(fifo, 0600) == 0);
	f = fopen(table, "w");
	CHECK(f != NULL);
	if (f) {
		fputs("* invented\n2\n2\n0 1\n0 1\n0 1\n0 1\n", f);
		fclose(f);
	}
	f = fopen(top, "w");
	CHECK(f != NULL);
	if (f) {
		fputs("t\na1 x y %id(k 0) resp\nr1 x 0 1k\nr2 y 0 1k\nr3 k 0 1k\n"
		      ".model resp table2d (order=2 FILE = resp.table gain=1)\n", f);
		fclose(f);
	}
	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load(&deck, top, &diag) == SCH_OK);
	for (size_t i = 0; i < deck.n_cards; i++)
		if (deck.cards[i].keyword && strcmp(deck.cards[i].keyword, ".model") == 0)
			card = deck.cards[i].text;
	snprintf(want, sizeof(want), ".model resp table2d (order=2 FILE = \"%s\" gain=1)", table);
	CHECK(card && strcmp(card, want) == 0);
	CHECK(deck.n_data_texts == 1 && strstr(deck.data_texts[0], "invented") != NULL);
	sch_deck_release(&deck);
	/* resolved beside the netlist (INLINE_NAME is data/deck/inline.cir), not in the working directory */
	expect_error("t\n.model m d_source (input_file=\"no-such-stimulus.txt\")\n",
		     INLINE_NAME ":2: cannot open code model 'd_source' data file 'data/deck/no-such-stimulus.txt': no such file or directory");
	expect_error("t\n.model m filesource (amploffset=[0])\n",
		     INLINE_NAME ":2: code model 'filesource' needs its 'file' parameter: without it the simulator would read a file of a "
		     "default name from wherever it runs");
	expect_error("t\n.model m table3d (file=\"a\" file=\"b\")\n",
		     INLINE_NAME ":2: code model 'table3d' gives its 'file' parameter more than once");
	expect_error("t\n.model m table2d (file={name})\n",
		     INLINE_NAME ":2: code model 'table2d': its 'file' parameter must be a plain file name, not an expression");
	f = fopen(top, "w");
	CHECK(f != NULL);
	if (f) {
		fputs("t\nr1 a 0 1k\n.model resp table2d (file=\"pipe.table\")\n", f);
		fclose(f);
	}
	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	/* opened non-blocking: a FIFO nobody writes is an error at once, not a hang */
	CHECK(sch_deck_load(&deck, top, &diag) == SCH_ERR_INPUT);
	CHECK(strstr(diag.first_error, ":3: cannot open code model 'table2d' data file '") != NULL);
	CHECK(strstr(diag.first_error, "pipe.table': not a regular file") != NULL);
	sch_deck_release(&deck);
	remove(fifo);
	remove(table);
	remove(top);
	rmdir(sub);
	rmdir(dir);
}

static void test_deck__include_of_a_fifo_fails_at_once(void)
{
	char dir[] = "/tmp/schrot-test-deck-XXXXXX";
	char fifo[64], top[64];
	struct sch_deck deck;
	FILE *f;

	CHECK(mkdtemp(dir) != NULL);
	snprintf(fifo, sizeof(fifo), "%s/pipe.inc", dir);
	snprintf(top, sizeof(top), "%s/top.cir", dir);
	CHECK(mkfifo(fifo, 0600) == 0);
	f = fopen(top, "w");
	CHECK(f != NULL);
	if (f) {
		fputs("t\nr1 a 0 1k\n.include pipe.inc\n", f);
		fclose(f);
	}
	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	/* Without O_NONBLOCK the open itself would wait for a writer forever. */
	CHECK(sch_deck_load(&deck, top, &diag) == SCH_ERR_INPUT);
	CHECK(strstr(diag.first_error, ":3: cannot open include file '") != NULL);
	CHECK(strstr(diag.first_error, "pipe.inc': not a regular file") != NULL);
	sch_deck_release(&deck);
	expect_error("t\n.include /dev/stdin\n",
		     INLINE_NAME ":2: cannot open include file '/dev/stdin': not a regular file");
	remove(fifo);
	remove(top);
	rmdir(dir);
}

static void test_deck__rejects_noise_output_at_a_node_nothing_touches(void)
{
	struct sch_deck deck;

	expect_error("t\niph 0 a dc 1n\nr1 a 0 1k\n.noise v(nonode) iph dec 10 1 1k\n",
		     INLINE_NAME ":4: '.noise' output node 'nonode' is not a node of any element at the top level");
	expect_error("t\niph 0 a dc 1n\nr1 a 0 1k\n.noise v(a,ref) iph dec 10 1 1k\n",
		     INLINE_NAME ":4: '.noise' output node 'ref' is not a node of any element at the top level");
	/* ground, subcircuit nodes, subcircuit ports and nodes of devices the reader cannot read pass */
	CHECK(load_text(&deck, "t\n.subckt s p\nr1 p q 1k\n.ends\niph 0 a dc 1n\nx1 a s\n"
			       ".noise v(x1.q,0) iph dec 10 1 1k\n") == SCH_OK);
	sch_deck_release(&deck);
	CHECK(load_text(&deck, "t\niph 0 a dc 1n\nx1 a b s\n.subckt s p r\nr1 p r 1k\n.ends\n"
			       ".noise v(b,gnd) iph dec 10 1 1k\n") == SCH_OK);
	sch_deck_release(&deck);
	CHECK(load_text(&deck, "t\niph 0 a dc 1n\nr1 a 0 1k\na1 [a] [o] amod\n.model amod gain\n"
			       ".noise v(o) iph dec 10 1 1k\n") == SCH_OK);
	sch_deck_release(&deck);
}

static void test_deck__rejects_current_source_without_dc_path(void)
{
	struct sch_deck deck;

	expect_error("t\niph 0 a dc 1n\nc1 a 0 1p\n", INLINE_NAME ":2: current source 'iph' drives node 'a', which only "
						      "capacitors and current sources touch: it has no DC path");
	expect_error("t\n.subckt s p\nib q p dc 1u\nc1 q 0 1p\n.ends\nx1 a s\nr1 a 0 1k\n",
		     INLINE_NAME ":3: current source 'ib' drives node 'q', which only capacitors and current sources "
				 "touch: it has no DC path");
	/* a resistor, a diode, a port, a hierarchical node or a device the reader cannot read is a path */
	CHECK(load_text(&deck, "t\niph 0 a dc 1n\nc1 a 0 1p\nr1 a 0 1g\n") == SCH_OK);
	sch_deck_release(&deck);
	CHECK(load_text(&deck, "t\niph 0 a dc 1n\nd1 a 0 dm\n.model dm d\n") == SCH_OK);
	sch_deck_release(&deck);
	CHECK(load_text(&deck, "t\n.subckt s p\nib 0 p dc 1u\n.ends\nx1 a s\nr1 a 0 1k\n") == SCH_OK);
	sch_deck_release(&deck);
	CHECK(load_text(&deck, "t\n.subckt s p\nr1 p 0 1k\n.ends\nx1 a s\niinj 0 x1.p dc 1n\n") == SCH_OK);
	sch_deck_release(&deck);
	CHECK(load_text(&deck, "t\niph 0 a dc 1n\na1 [a] [o] amod\n.model amod gain\n") == SCH_OK);
	sch_deck_release(&deck);
	CHECK(load_text(&deck, "t\n.global vdd\niph 0 vdd dc 1n\n") == SCH_OK);
	sch_deck_release(&deck);
}

static void test_deck__quotes_are_short_and_never_from_included_files(void)
{
	static char text[4096];
	struct sch_deck deck;

	snprintf(text, sizeof(text), "t\nr%0200d a\n", 7);
	expect_error(text, INLINE_NAME ":2: too few fields for 'r0000000000000000000000000000000000000000000000000000000000000"
			   "00...': needs 2 nodes and a value");
	/* a multi-byte character at the cut is kept whole or left out, never split */
	snprintf(text, sizeof(text), "t\nr%062d\xc3\xa9\xc3\xa9 a\n", 0);
	expect_error(text, INLINE_NAME ":2: too few fields for 'r00000000000000000000000000000000000000000000000000000000000000"
			   "...': needs 2 nodes and a value");
	CHECK(load_text(&deck, "t\n.include /etc/passwd\n") == SCH_ERR_INPUT);
	CHECK(strncmp(diag.first_error, "/etc/passwd:1: ", 15) == 0);
	CHECK(strstr(diag.first_error, "root") == NULL);
	CHECK(strchr(diag.first_error, '\'') == NULL);
	sch_deck_release(&deck);
}

/* ---- vendor library syntax (issue 12) ----------------------------------------------------------- */

static void test_deck__ends_with_glued_text_closes_the_subckt(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "t\n.subckt amp a b\nr1 a b 1k\n.ENDS* AMP-X \"enhanced\"\n"
				".subckt clamp a\nr1 a 0 1k\n.ends*\nx1 p q amp\nx2 p clamp\nr2 p 0 1k\n") == SCH_OK);
	CHECK(deck.n_subckts == 2);
	if (deck.n_subckts == 2) {
		CHECK(deck.subckts[0].card_end >= 0 && deck.subckts[1].card_end >= 0);
		/* the simulator is handed a plain '.ends', none of the glued text */
		CHECK_STR(deck.cards[deck.subckts[0].card_end].text, ".ends");
		CHECK_STR(deck.cards[deck.subckts[0].card_end].keyword, ".ends");
		CHECK_STR(deck.cards[deck.subckts[1].card_end].text, ".ends");
	}
	sch_deck_release(&deck);
	expect_error("t\nr1 a 0 1k\n.ENDS* AMP-X\n", INLINE_NAME ":3: '.ends' without '.subckt'");
}

/* Writes text (len bytes) to dir/name; false when it cannot. */
static bool put_file(const char *dir, const char *name, const char *text, size_t len)
{
	char path[512];
	FILE *f;
	bool ok;

	snprintf(path, sizeof(path), "%s/%s", dir, name);
	if (!(f = fopen(path, "wb")))
		return false;
	ok = fwrite(text, 1, len, f) == len;
	return fclose(f) == 0 && ok;
}

static void test_deck__dos_eof_byte_ends_an_included_file_only(void)
{
	static const char model[] = "* old model file\r\n.model dsense d is=20p\r\n\x1a";
	static const char middle[] = ".model dmid d is=20p\x1a n=1\n";
	static const char top[] = "t\n.include old.mod\nd1 a 0 dsense\nr1 a 0 1k\n";
	static const char top_mid[] = "t\n.include mid.mod\nr1 a 0 1k\n";
	static const char own[] = "t\nr1 a 0 1k\n\x1a";
	char dir[] = "/tmp/schrot-deck-eofXXXXXX";
	char path[512], *notes = NULL;
	size_t notes_len = 0;
	struct sch_deck deck;
	struct sch_diag verbose;
	FILE *sink;

	CHECK(mkdtemp(dir) != NULL);
	CHECK(put_file(dir, "old.mod", model, sizeof(model) - 1));
	CHECK(put_file(dir, "mid.mod", middle, sizeof(middle) - 1));
	CHECK(put_file(dir, "top.cir", top, strlen(top)));
	CHECK(put_file(dir, "mid.cir", top_mid, strlen(top_mid)));
	CHECK(put_file(dir, "own.cir", own, strlen(own)));
	/* accepted after the last line of an included file, with a note */
	sink = open_memstream(&notes, &notes_len);
	CHECK(sink != NULL);
	sch_deck_init(&deck);
	sch_diag_init(&verbose, sink, 1);
	snprintf(path, sizeof(path), "%s/top.cir", dir);
	CHECK(sch_deck_load(&deck, path, &verbose) == SCH_OK);
	CHECK(deck.n_models == 1 && deck.n_elements == 2);
	if (sink)
		fclose(sink);
	snprintf(path, sizeof(path), "%s/old.mod:3: note: DOS end-of-file byte (0x1a) after the last line: ignored", dir);
	CHECK(notes && strstr(notes, path) != NULL);
	free(notes);
	sch_deck_release(&deck);
	/* refused inside a card, and in the netlist itself */
	sch_deck_init(&deck);
	sch_diag_init(&diag, NULL, 0);
	snprintf(path, sizeof(path), "%s/mid.cir", dir);
	CHECK(sch_deck_load(&deck, path, &diag) == SCH_ERR_INPUT);
	snprintf(path, sizeof(path), "%s/mid.mod:1: control character 0x1a in the text", dir);
	CHECK_STR(diag.first_error, path);
	sch_deck_release(&deck);
	sch_diag_init(&diag, NULL, 0);
	snprintf(path, sizeof(path), "%s/own.cir", dir);
	CHECK(sch_deck_load(&deck, path, &diag) == SCH_ERR_INPUT);
	snprintf(path, sizeof(path), "%s/own.cir:3: control character 0x1a in the text", dir);
	CHECK_STR(diag.first_error, path);
	sch_deck_release(&deck);
	for (const char *const *f = (const char *const[]){ "old.mod", "mid.mod", "top.cir", "mid.cir", "own.cir", NULL };
	     *f; f++) {
		snprintf(path, sizeof(path), "%s/%s", dir, *f);
		unlink(path);
	}
	rmdir(dir);
}

static void test_deck__node_counts_follow_the_model_type_and_keywords(void)
{
	static const struct {
		const char *name;
		int n;
	} want[] = {
		{ "m1", 3 }, { "m2", 5 }, { "m3", 4 }, { "m4", 6 }, { "q1", 5 }, { "q2", 4 }, { "q3", 4 },
		{ "q4", 3 }, { "q5", 5 }, { "d1", 3 }, { "d2", 2 }, { "d3", 3 },
	};
	struct sch_deck deck;
	const char *const *nodes;

	CHECK(load_text(&deck, "nodes\n.model pwr-n1 vdmos nchan vto=2\n.model nm nmos level=1\n"
				".model soi nmos level=10\n.model qv npn level=4 rth=300\n.model qv9 pnp(level=9)\n"
				".model qh npn level = 8\n.model qg npn\n.model dm d is=1e-14 rth0=500\n"
				"m1 d g s pwr-n1\nm2 d g s tj tc pwr-n1 thermal\nm3 d g s b nm w=1u\n"
				"m4 d g s e p b soi\nq1 c b e s dt qv area=1\nq2 c b e s qv9\nq3 c b e s qg\n"
				"q4 c b e qg 2\nq5 c b e 0 0 qh\nd1 a k tj dm thermal\nd2 a k dm 2\nd3 a k tj dm\n") == SCH_OK);
	for (size_t i = 0; i < sizeof(want) / sizeof(want[0]); i++) {
		const struct sch_element *e = element(&deck, want[i].name);
		int got = e ? sch_deck_element_nodes(&deck, e, &nodes) : -1;

		if (got != want[i].n)
			fprintf(stderr, "  %s: %d nodes, want %d\n", want[i].name, got, want[i].n);
		CHECK(got == want[i].n);
	}
	sch_deck_release(&deck);
	/* three nodes are a vdmos model's privilege; five a VBIC's or HICUM's */
	expect_error("t\nm1 d g s nm\n.model nm nmos\n", INLINE_NAME ":2: too few fields for 'm1': needs 4 nodes and a model");
	expect_error("t\nq1 c b e s dt qg\n.model qg npn\n",
		     INLINE_NAME ":2: 'q1' connects 5 nodes but its npn model (level 1) takes at most 4");
	/* the missing model is named, not the thermal node before it */
	expect_error("t\nd1 a k tj dmiss thermal\n", INLINE_NAME ":2: model 'dmiss' is not defined");
	expect_error("t\nq1 c b e s dt qmiss area=1\n", INLINE_NAME ":2: model 'qmiss' is not defined");
	expect_error("t\nm1 d g s irf-x\n", INLINE_NAME ":2: model 'irf-x' is not defined");
}

static void test_deck__script_title_without_a_circuit_is_bad_input(void)
{
	expect_error("*ng_script light-sensor batch run\n",
		     INLINE_NAME ":1: a '*ng_script' title and no circuit: the file is a simulator script, not a netlist");
	expect_error("*NG_SCRIPT\n.control\nsource other.cir\nrun\n.endc\n.end\n",
		     INLINE_NAME ":1: a '*ng_script' title and no circuit: the file is a simulator script, not a netlist");
	expect_error("\n*ng_script after a blank title\n.param a=1\n",
		     INLINE_NAME ":2: a '*ng_script' title and no circuit: the file is a simulator script, not a netlist");
}

static void test_deck__drops_cards_outside_the_allow_list(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "t\n.foo bar\n.backanno\n.title plain\n.csparam x=1\n.four 1k v(a)\nr1 a 0 1k\n") == SCH_OK);
	CHECK(deck.n_cards == 2 && deck.n_elements == 1);
	CHECK_STR(deck.cards[0].keyword, ".four");
	CHECK(diag.n_warnings == 1); /* .csparam; the rest are notes */
	sch_deck_release(&deck);
	/* a conditional netlist is kept whole: numparam picks the branch the simulator reads */
	CHECK(load_text(&deck, "t\n.param s=1\n.if (s == 1)\nr1 a 0 1k\n.else\nr1 a 0 2k\n.endif\n") == SCH_OK);
	CHECK(deck.n_cards == 6);
	sch_deck_release(&deck);
	/* '.para...' is read as .param by the simulator, so it is kept as written */
	CHECK(load_text(&deck, "t\n.params k=2\nr1 a 0 {k}\n") == SCH_OK);
	CHECK(deck.n_cards == 2);
	sch_deck_release(&deck);
}

static void test_deck__filters_options_to_the_allow_list(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "t\n.options reltol = 1e-4 measoutfile=/tmp/x sqrnoise noopiter temp 50\n") == SCH_OK);
	CHECK(deck.n_cards == 1 && diag.n_warnings == 1);
	CHECK_STR(deck.cards[0].text, ".options reltol=1e-4 noopiter temp=50");
	sch_deck_release(&deck);
	/* every '.opt...' card is an options card to the simulator; one with nothing kept is dropped */
	CHECK(load_text(&deck, "t\n.OPTX rawfile=x\n.optionsfoo gmin=1e-13\n") == SCH_OK);
	CHECK(deck.n_cards == 1);
	CHECK_STR(deck.cards[0].text, ".options gmin=1e-13");
	CHECK_STR(deck.cards[0].keyword, ".options");
	sch_deck_release(&deck);
	expect_error("t\n.options gmin=(1 2)\n", INLINE_NAME ":2: option 'gmin' needs a number");
	expect_error("t\n.options noopiter=1\n", INLINE_NAME ":2: option 'noopiter' takes no value");
	expect_error("t\n.options tnom=-280\n", INLINE_NAME ":2: temperature -280 °C is below absolute zero (-273.15 °C)");
	expect_error("t\n.options method=euler\n", INLINE_NAME ":2: option 'method' needs 'gear' or 'trap'");
	CHECK(load_text(&deck, "t\n.options temp={tamb} seed=random method=gear\n") == SCH_OK);
	CHECK_STR(deck.cards[0].text, ".options temp={tamb} seed=random method=gear");
	sch_deck_release(&deck);
}

static void test_deck__drops_measurement_cards_by_prefix(void)
{
	struct sch_deck deck;

	CHECK(load_text(&deck, "t\n.meas(x) tran a max v(1)\n.MEASURE=y ac b\n.meas,z op c\n.measurements d\nr1 a 0 1k\n")
	      == SCH_OK);
	CHECK(deck.n_cards == 1 && diag.n_warnings == 4);
	sch_deck_release(&deck);
}

static void test_deck__refuses_a_script_title_card(void)
{
	struct sch_deck deck;

	expect_error("t\n.title *ng_script\nr1 a 0 1k\n",
		     INLINE_NAME ":2: '.title' card would make the deck a command script ('*ng_script'): nothing in a netlist runs");
	expect_error("t\n.TITLEfoo    *NG_SCRIPT x\n",
		     INLINE_NAME ":2: '.title' card would make the deck a command script ('*ng_script'): nothing in a netlist runs");
	/* any other title card is dropped: the simulator gets schrot's own title */
	CHECK(load_text(&deck, "t\n.title a probe\nr1 a 0 1k\n") == SCH_OK);
	CHECK(deck.n_cards == 1);
	sch_deck_release(&deck);
}

static void test_deck__refuses_cards_the_simulator_reads_as_circuit_cards(void)
{
	expect_error("t\n.macro c a b\n", INLINE_NAME ":2: '.macro' is read by the simulator as '.subckt': write '.subckt'");
	expect_error("t\n.eom\n", INLINE_NAME ":2: '.eom' is read by the simulator as '.ends': write '.ends'");
	expect_error("t\n.cmodel m d\n", INLINE_NAME ":2: '.cmodel' is read by the simulator as '.model': write '.model'");
	expect_error("t\n.modelx m d\n", INLINE_NAME ":2: '.modelx' is read by the simulator as '.model': write '.model'");
	expect_error("t\n.temperature 50\n", INLINE_NAME ":2: '.temperature' is read by the simulator as '.temp': write '.temp'");
	expect_error("t\n.ifdef fast\n", INLINE_NAME ":2: '.ifdef' is read by the simulator as '.if': write '.if'");
	expect_error("t\n.endifx\n", INLINE_NAME ":2: '.endifx' is read by the simulator as '.endif': write '.endif'");
}

static void test_deck__checks_temp_cards(void)
{
	struct sch_deck deck;

	expect_error("t\n.temp 50 60\n",
		     INLINE_NAME ":2: '.temp' takes one temperature: the simulator would ignore a list and run at 27 °C");
	expect_error("t\n.temp -300\n", INLINE_NAME ":2: temperature -300 °C is below absolute zero (-273.15 °C)");
	expect_error("t\n.temp warm\n", INLINE_NAME ":2: '.temp' needs a number");
	CHECK(load_text(&deck, "t\n.temp=85\n.temp {tamb}\n.temp -273.15\n") == SCH_OK);
	CHECK(deck.n_cards == 3);
	sch_deck_release(&deck);
}

static void test_deck__caps_sweep_points(void)
{
	struct sch_deck deck;

	expect_error("t\niph a 0 dc 1n\nr1 a 0 1k\n.noise v(a) iph lin 100001 1 1k\n",
		     INLINE_NAME ":4: '.noise' asks for 100001 frequency points: at most 100000 are allowed");
	expect_error("t\n.ac oct 10000 1 1g\n", INLINE_NAME ":2: '.ac' asks for 298975 frequency points: at most 100000 are allowed");
	expect_error("t\n.ac dec 1e300 1 1e300\n",
		     INLINE_NAME ":2: '.ac' asks for 3e+302 frequency points: at most 100000 are allowed");
	CHECK(load_text(&deck, "t\niph a 0 dc 1n\nr1 a 0 1k\n.noise v(a) iph dec 10000 1 1g 1\n.ac lin {n} 1 1k\n") == SCH_OK);
	sch_deck_release(&deck);
}

static void test_deck__refuses_element_names_the_simulator_misreads(void)
{
	struct sch_deck deck;

	expect_error("t\ni(v1) a 0 dc 1n\n", INLINE_NAME ":2: element name 'i(v1)' holds '(', which the simulator reads as a separator");
	expect_error("t\nr=1 a 0 1k\n", INLINE_NAME ":2: element name 'r=1' holds '=', which the simulator reads as a separator");
	expect_error("t\nr{x} a 0 1k\n", INLINE_NAME ":2: element name 'r{x}' holds '{', which the simulator reads as a separator");
	CHECK(load_text(&deck, "t\nr[1] a 0 1k\nr-2 a 0 1k\nr#3 a 0 1k\n") == SCH_OK);
	CHECK(deck.n_elements == 3);
	sch_deck_release(&deck);
}

static void test_deck__refuses_source_values_out_of_range(void)
{
	struct sch_deck deck;

	expect_error("t\niph a 0 dc 1e308\n", INLINE_NAME ":2: source value '1e308' is out of range: at most 1e+06 A or V");
	expect_error("t\nv1 a 0 2meg\n", INLINE_NAME ":2: source value '2meg' is out of range: at most 1e+06 A or V");
	expect_error("t\nv1 a 0 dc 0 ac -1e7\n", INLINE_NAME ":2: source value '-1e7' is out of range: at most 1e+06 A or V");
	CHECK(load_text(&deck, "t\nv1 a 0 dc 1meg ac 1\nr1 a 0 1e18\n") == SCH_OK);
	sch_deck_release(&deck);
}

static void test_deck__refuses_unterminated_quotes_and_open_lib_sections(void)
{
	expect_error("t\n.lib \"a;b.lib\" typ\n",
		     INLINE_NAME ":2: unterminated quote in '.lib' file name (';' starts a comment, even inside quotes)");
	expect_error("t\n.include 'x;y.inc'\n",
		     INLINE_NAME ":2: unterminated quote in '.include' file name (';' starts a comment, even inside quotes)");
	expect_error("t\nr1 a 0 1k\n.lib typ\nr2 a 0 1k\n",
		     INLINE_NAME ":3: library section 'typ' has no '.endl': the rest of the file would be skipped");
}

static void test_deck__refuses_a_double_backslash_line_end(void)
{
	/* ngspice joins such a line to the next card; the reader would see two cards */
	expect_error("t\nr1 a 0 1k \\\\ \nr2 a 0 1k\n", INLINE_NAME ":2: line ends in '\\\\', which the simulator joins to the next "
						     "card: continue it with a '+' line");
}

static void test_deck__allow_list_messages_never_quote_included_text(void)
{
	char path[256], text[512], *out = NULL;
	size_t out_len = 0;
	struct sch_deck deck;
	FILE *inc, *sink;

	snprintf(path, sizeof(path), "%s/allow.inc", check_scratch_dir());
	inc = fopen(path, "w");
	CHECK(inc != NULL);
	if (!inc)
		return;
	fputs(".foosecret x\n.options secretopt=1 measoutfile=secretfile gmin=1e-13\n.meassecret\n"
	      ".title secret\ni(secret) a 0 1n\n", inc);
	fclose(inc);
	snprintf(text, sizeof(text), "t\n.include %s\n", path);
	sink = open_memstream(&out, &out_len);
	CHECK(sink != NULL);
	if (!sink)
		return;
	sch_deck_init(&deck);
	sch_diag_init(&diag, sink, 1);
	CHECK(sch_deck_load_text(&deck, INLINE_NAME, text, strlen(text), &diag) == SCH_ERR_INPUT);
	fclose(sink);
	CHECK(out && strstr(out, "allow.inc:1: note: a dot card dropped") != NULL);
	CHECK(out && strstr(out, "allow.inc:2: warning: option dropped: it names a file") != NULL);
	CHECK(out && strstr(out, "allow.inc:3: warning: '.meas' card dropped") != NULL);
	CHECK(out && strstr(out, "allow.inc:5: error: element name holds '('") != NULL);
	CHECK(out && strstr(out, "secret") == NULL);
	free(out);
	sch_deck_release(&deck);
}

CHECK_MAIN(CASE(test_deck__joins_plus_continuation_lines), CASE(test_deck__drops_star_comment_lines),
	   CASE(test_deck__strips_semicolon_and_dollar_comments),
	   CASE(test_deck__comment_only_line_does_not_end_a_card), CASE(test_deck__title_is_never_a_card),
	   CASE(test_deck__lowercases_tokens_and_keeps_card_text), CASE(test_deck__accepts_engineering_suffixes),
	   CASE(test_deck__rejects_malformed_number), CASE(test_deck__keeps_param_and_braces_as_text),
	   CASE(test_deck__groups_brackets_quotes_and_assignments), CASE(test_deck__reads_models_in_each_form),
	   CASE(test_deck__fills_noise_temp_and_options), CASE(test_deck__end_stops_reading_the_top_file),
	   CASE(test_deck__subckt_with_params), CASE(test_deck__nested_subckt_definitions_have_parents),
	   CASE(test_deck__reads_an_upper_case_export_with_continuations),
	   CASE(test_deck__reads_nested_includes_relative_to_the_including_file),
	   CASE(test_deck__resolves_includes_from_another_working_directory),
	   CASE(test_deck__reads_only_the_named_lib_section),
	   CASE(test_deck__skips_lib_definitions_in_a_normally_read_file), CASE(test_deck__lists_each_file_once),
	   CASE(test_deck__drops_control_blocks), CASE(test_deck__drops_script_lines),
	   CASE(test_deck__drops_control_and_script_in_included_files), CASE(test_deck__warns_about_a_script_title),
	   CASE(test_deck__survives_odd_shapes),
	   CASE(test_deck__reports_missing_include_file), CASE(test_deck__reports_include_cycle),
	   CASE(test_deck__reports_include_depth), CASE(test_deck__limits_include_fan_out),
	   CASE(test_deck__reports_missing_lib_section),
	   CASE(test_deck__rejects_binary_input), CASE(test_deck__rejects_invalid_utf8_outside_comments),
	   CASE(test_deck__rejects_overlong_line), CASE(test_deck__rejects_element_not_starting_with_a_letter),
	   CASE(test_deck__rejects_too_few_fields_per_letter), CASE(test_deck__accepts_behavioural_controlled_sources),
	   CASE(test_deck__rejects_unbalanced_subckt), CASE(test_deck__rejects_unknown_subckt_at_the_x_line),
	   CASE(test_deck__rejects_undefined_model_at_the_line), CASE(test_deck__rejects_empty_netlist),
	   CASE(test_deck__loads_a_title_only_file), CASE(test_deck__rejects_directories_and_missing_files),
	   CASE(test_deck__expands_two_level_subcircuit_instances), CASE(test_deck__rejects_recursive_instantiation),
	   CASE(test_deck__expands_8000_instances_quickly), CASE(test_deck__reports_element_nodes),
	   CASE(test_deck__release_is_safe_on_null_and_twice),
	   CASE(test_deck__rejects_control_characters_in_card_text),
	   CASE(test_deck__keeps_crlf_tabs_and_control_bytes_in_comments),
	   CASE(test_deck__include_of_a_fifo_fails_at_once),
	   CASE(test_deck__code_model_data_file_becomes_an_absolute_path),
	   CASE(test_deck__rejects_noise_output_at_a_node_nothing_touches),
	   CASE(test_deck__rejects_current_source_without_dc_path),
	   CASE(test_deck__quotes_are_short_and_never_from_included_files),
	   CASE(test_deck__reads_the_noise_command_of_a_control_block),
	   CASE(test_deck__a_noise_card_wins_over_the_control_block),
	   CASE(test_deck__honours_op_and_temperature_before_the_noise_command),
	   CASE(test_deck__lists_what_the_block_does_not_honour),
	   CASE(test_deck__never_takes_a_noise_command_with_odd_tokens),
	   CASE(test_deck__reads_a_control_noise_command_from_an_included_file),
	   CASE(test_deck__a_spot_noise_command_is_read),
	   CASE(test_deck__a_control_noise_output_must_be_a_node),
	   CASE(test_deck__ends_with_glued_text_closes_the_subckt),
	   CASE(test_deck__dos_eof_byte_ends_an_included_file_only),
	   CASE(test_deck__node_counts_follow_the_model_type_and_keywords),
	   CASE(test_deck__script_title_without_a_circuit_is_bad_input),
	   CASE(test_deck__drops_cards_outside_the_allow_list), CASE(test_deck__filters_options_to_the_allow_list),
	   CASE(test_deck__drops_measurement_cards_by_prefix), CASE(test_deck__refuses_a_script_title_card),
	   CASE(test_deck__refuses_cards_the_simulator_reads_as_circuit_cards), CASE(test_deck__checks_temp_cards),
	   CASE(test_deck__caps_sweep_points), CASE(test_deck__refuses_element_names_the_simulator_misreads),
	   CASE(test_deck__refuses_source_values_out_of_range),
	   CASE(test_deck__refuses_unterminated_quotes_and_open_lib_sections),
	   CASE(test_deck__refuses_a_double_backslash_line_end),
	   CASE(test_deck__allow_list_messages_never_quote_included_text))
