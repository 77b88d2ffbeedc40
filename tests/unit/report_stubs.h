/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * report_stubs.h - TEMPORARY: weak stand-ins for deck.c, which has not landed yet, so that the
 * report tests link. Remove this file and its include once src/deck.c exists.
 */
#ifndef SCH_REPORT_STUBS_H
#define SCH_REPORT_STUBS_H

#include <string.h>
#include "schrot/deck.h"

__attribute__((weak)) void sch_deck_init(struct sch_deck *deck)
{
	memset(deck, 0, sizeof(*deck));
}

__attribute__((weak)) void sch_deck_release(struct sch_deck *deck)
{
	if (deck)
		memset(deck, 0, sizeof(*deck));
}

__attribute__((weak)) enum sch_err sch_deck_load(struct sch_deck *deck, const char *path, struct sch_diag *d)
{
	return SCH_ERR_INPUT;
}

__attribute__((weak)) enum sch_err sch_deck_instances(const struct sch_deck *deck, struct sch_arena *arena,
						      struct sch_instance **out, size_t *n, struct sch_diag *d)
{
	return SCH_ERR_INPUT;
}

#endif
