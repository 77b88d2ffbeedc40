/* SPDX-License-Identifier: BSD-3-Clause */
/* strmap.h - string -> int map (open addressing) for simulator-name lookups; keys are borrowed. */
#ifndef SCH_STRMAP_H
#define SCH_STRMAP_H

#include <stddef.h>
#include "schrot/err.h"

struct sch_strmap {
	const char **keys;
	size_t *lens;
	int *values;
	size_t cap;   /* power of two */
	size_t n;
};

/* Initialises an empty map. Can't fail. */
void sch_strmap_init(struct sch_strmap *m);

/* Maps the first len bytes of key (which must outlive the map) to value, replacing any old value. */
enum sch_err sch_strmap_put(struct sch_strmap *m, const char *key, size_t len, int value);

/* The value for the first len bytes of key, or -1. */
int sch_strmap_get(const struct sch_strmap *m, const char *key, size_t len);

/* Frees the table (not the keys). No-op on NULL. */
void sch_strmap_release(struct sch_strmap *m);

#endif
