/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_deck.c - libFuzzer target: any bytes given to the deck reader load or fail cleanly. */
#include <stddef.h>
#include <stdint.h>
#include "schrot/deck.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	struct sch_deck deck;
	struct sch_diag d;
	struct sch_instance *in;
	size_t n;

	sch_deck_init(&deck);
	sch_diag_init(&d, NULL, 0);
	/* The name has no directory part, so relative includes look in the working directory. */
	if (sch_deck_load_text(&deck, "fuzz.cir", (const char *)data, size, &d) == SCH_OK) {
		struct sch_arena arena;

		sch_arena_init(&arena);
		(void)sch_deck_instances(&deck, &arena, &in, &n, &d);
		for (size_t i = 0; i < deck.n_elements; i++) {
			const char *const *nodes;
			(void)sch_deck_element_nodes(&deck, &deck.elements[i], &nodes);
			(void)sch_deck_x_subckt(&deck, &deck.elements[i]);
		}
		sch_arena_release(&arena);
	}
	sch_deck_release(&deck);
	return 0;
}
