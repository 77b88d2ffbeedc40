/* SPDX-License-Identifier: BSD-3-Clause */
/* test_augment.c - the simulated deck's text: E/G TABLE sources as behavioural pwl(). */
#include <stddef.h>
#include "check.h"
#include "schrot/augment.h"

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

CHECK_MAIN(CASE(test_augment__table_becomes_pwl_with_flat_ends), CASE(test_augment__table_it_cannot_read_stays))
