/* SPDX-License-Identifier: BSD-3-Clause */
/* test_augment.c - the augmenter: E/G TABLE sources as behavioural pwl(), flat node names, the plain deck's cards. */
#include <stddef.h>
#include <stdio.h>
#include <string.h>
#include "check.h"
#include "schrot/augment.h"
#include "schrot/carriers.h"

static struct sch_diag diag;

static void test_augment__table_becomes_pwl_with_flat_ends(void)
{
	struct sch_arena a;

	sch_arena_init(&a);
	/* d = (10m - 0) / 2: one extra point each side holds the end values */
	CHECK_STR(sch_augment_table_as_value(&a, "G1 K A TABLE {V(LIGHT)} = (0,0) (1m,0.52m) (10m,5.2m)"),
		  "G1 K A value={pwl(V(LIGHT), -0.005, 0, 0, 0, 1m, 0.52m, 10m, 5.2m, 0.015, 5.2m)}");
	/* no '=', blanks inside the pairs, an E source */
	CHECK_STR(sch_augment_table_as_value(&a, "ecomp 3 0 table {v(1,2)} (-1 0) (1 10)"),
		  "ecomp 3 0 value={pwl(v(1,2), -2, 0, -1, 0, 1, 10, 2, 10)}");
	sch_arena_release(&a);
}

static void test_augment__table_it_cannot_read_stays(void)
{
	struct sch_arena a;

	sch_arena_init(&a);
	CHECK(sch_augment_table_as_value(&a, "g1 k a {v(l)*2}") == NULL);                     /* no TABLE */
	CHECK(sch_augment_table_as_value(&a, "g1 k a table {v(l)} = (0,0) ({p1},1)") == NULL); /* x from a parameter */
	CHECK(sch_augment_table_as_value(&a, "g1 k a table {v(l)} = (1,0) (0,1)") == NULL);    /* x not rising */
	CHECK(sch_augment_table_as_value(&a, "g1 k a table {v(l)} = (0,0)") == NULL);          /* one point */
	CHECK(sch_augment_table_as_value(&a, "g1 k a table {v(l) = (0,0) (1,1)") == NULL);     /* unbalanced */
	sch_arena_release(&a);
}

/* Two cells in series inside a pair, a pair at the top, one .global node (invented). */
static const char *const NESTED = "nested cells\n"
				  ".global vdd\n"
				  ".subckt cell a k\n"
				  "iph k a dc 1u\n"
				  "ib vdd k dc 1n\n"
				  ".ends\n"
				  ".subckt pair a k\n"
				  "xa a mid cell\n"
				  "xb mid k cell\n"
				  ".ends\n"
				  "x1 0 sum pair\n"
				  "itest 0 sum ac 1\n"
				  "rf sum 0 1k\n"
				  ".op\n"
				  ".noise v(sum) itest dec 10 1 1k 1\n"
				  ".end\n";

static int element_named(const struct sch_deck *deck, const char *name)
{
	for (size_t k = 0; k < deck->n_elements; k++) {
		if (strcmp(deck->elements[k].name, name) == 0)
			return (int)k;
	}
	return -1;
}

/*
 * The simulator names a node inside instance x1.xa "x1.xa.node" and a port the node its X line
 * connects it to (NGSPICE-NOTES.md section 1 for the device names; the node form measured with
 * ngspice 39 for this change: a top-level card on "x1.x2.m" joins the subcircuit's internal node).
 */
static void test_augment__flat_nodes_follow_ports_up_the_hierarchy(void)
{
	struct sch_deck deck;
	struct sch_arena arena;
	const char *a = NULL, *b = NULL;
	int iph, ib;

	sch_deck_init(&deck);
	sch_arena_init(&arena);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_deck_load_text(&deck, "nested.cir", NESTED, strlen(NESTED), &diag) == SCH_OK);
	iph = element_named(&deck, "iph");
	ib = element_named(&deck, "ib");
	CHECK(iph >= 0 && ib >= 0);
	/* xa: a = pair's a = x1's first node 0; k = pair's internal mid */
	CHECK(sch_augment_flat_nodes(&arena, &deck, iph, "x1.xa.iph", &a, &b) == SCH_OK);
	CHECK_STR(a, "x1.mid");
	CHECK_STR(b, "0");
	/* xb: a = mid, k = pair's k = sum */
	CHECK(sch_augment_flat_nodes(&arena, &deck, iph, "x1.xb.iph", &a, &b) == SCH_OK);
	CHECK_STR(a, "sum");
	CHECK_STR(b, "x1.mid");
	/* a .global node stays itself */
	CHECK(sch_augment_flat_nodes(&arena, &deck, ib, "x1.xb.ib", &a, &b) == SCH_OK);
	CHECK_STR(a, "vdd");
	/* a path that does not follow the hierarchy */
	CHECK(sch_augment_flat_nodes(&arena, &deck, iph, "x9.xa.iph", &a, &b) == SCH_ERR_INPUT);
	sch_arena_release(&arena);
	sch_deck_release(&deck);
}

/* The plain deck keeps the netlist's .op, leaves its .noise to sch_augment_write and has no generator inside a definition. */
static void test_augment__plain_deck_keeps_analyses_and_no_probes(void)
{
	struct sch_deck deck;
	struct sch_arena arena;
	struct sch_carrier_set set;
	struct sch_augment_options opt;
	struct sch_augmented aug;
	bool has_op = false, has_noise = false, has_probe = false;

	sch_deck_init(&deck);
	sch_arena_init(&arena);
	sch_diag_init(&diag, NULL, 0);
	memset(&opt, 0, sizeof(opt));
	opt.keep_analyses = true;
	opt.plain = true;
	CHECK(sch_deck_load_text(&deck, "nested.cir", NESTED, strlen(NESTED), &diag) == SCH_OK);
	CHECK(sch_carriers_find(&deck, NULL, &arena, &set, &diag) == SCH_OK);
	CHECK(set.n_carriers >= 2);
	CHECK(sch_augment_build(&deck, &set, &opt, &arena, &aug, &diag) == SCH_OK);
	for (size_t k = 0; k < aug.n_lines; k++) {
		has_op |= strcmp(aug.lines[k], ".op") == 0;
		has_noise |= strncmp(aug.lines[k], ".noise", 6) == 0;
		has_probe |= strstr(aug.lines[k], "schg") != NULL || strstr(aug.lines[k], "rschtemp") != NULL;
	}
	CHECK(has_op);
	CHECK(!has_noise);
	CHECK(!has_probe);
	CHECK(aug.n_probes == 0);
	CHECK_STR(aug.lines[aug.n_lines - 1], ".end");
	sch_arena_release(&arena);
	sch_deck_release(&deck);
}

CHECK_MAIN(CASE(test_augment__table_becomes_pwl_with_flat_ends), CASE(test_augment__table_it_cannot_read_stays),
	   CASE(test_augment__flat_nodes_follow_ports_up_the_hierarchy),
	   CASE(test_augment__plain_deck_keeps_analyses_and_no_probes))
