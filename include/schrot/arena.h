/* SPDX-License-Identifier: BSD-3-Clause */
/* arena.h - per-run bump allocator: everything parsed from a netlist lives here and is freed at once. */
#ifndef SCH_ARENA_H
#define SCH_ARENA_H

#include <stddef.h>

/* Opaque: members MUST NOT be accessed. An initialised arena owns no memory. */
struct sch_arena {
	struct sch_arena_block *head;
	size_t total;
};

/* Initialises an empty arena. This function can't fail. */
void sch_arena_init(struct sch_arena *a);

/* Returns zeroed storage of n bytes aligned for any type, or NULL when out of memory. */
void *sch_arena_alloc(struct sch_arena *a, size_t n);

/* Copies the n bytes at s and a terminating NUL; NULL when out of memory. */
char *sch_arena_strndup(struct sch_arena *a, const char *s, size_t n);

/* Copies the NUL-terminated s; NULL when out of memory or s is NULL. */
char *sch_arena_strdup(struct sch_arena *a, const char *s);

/* printf into arena storage; NULL when out of memory. */
char *sch_arena_printf(struct sch_arena *a, const char *fmt, ...) __attribute__((format(printf, 2, 3)));

/* Frees every allocation; the arena stays usable (empty). No-op on NULL. */
void sch_arena_release(struct sch_arena *a);

#endif
