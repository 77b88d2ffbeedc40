/* SPDX-License-Identifier: BSD-3-Clause */
/* arena.c - bump allocator in growing blocks, released all at once. */
#include <stdarg.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/arena.h"

struct sch_arena_block {
	struct sch_arena_block *next;
	size_t size;
	size_t used;
	max_align_t data[];
};

#define ARENA_MIN_BLOCK ((size_t)64 * 1024)

void sch_arena_init(struct sch_arena *a)
{
	a->head = NULL;
	a->total = 0;
}

void *sch_arena_alloc(struct sch_arena *a, size_t n)
{
	const size_t align = sizeof(max_align_t);
	struct sch_arena_block *b = a->head;
	size_t need = (n + align - 1) / align * align;
	void *p;

	if (need < n)
		return NULL;
	if (!b || b->size - b->used < need) {
		size_t size = need > ARENA_MIN_BLOCK ? need : ARENA_MIN_BLOCK;
		if (a->total / 4 > size)
			size = a->total / 4 / align * align;
		b = malloc(sizeof(*b) + size);
		if (!b)
			return NULL;
		b->size = size;
		b->used = 0;
		b->next = a->head;
		a->head = b;
		a->total += size;
	}
	p = (char *)b->data + b->used;
	b->used += need;
	memset(p, 0, n);
	return p;
}

char *sch_arena_strndup(struct sch_arena *a, const char *s, size_t n)
{
	char *p = sch_arena_alloc(a, n + 1);

	if (!p)
		return NULL;
	memcpy(p, s, n);
	p[n] = '\0';
	return p;
}

char *sch_arena_strdup(struct sch_arena *a, const char *s)
{
	return s ? sch_arena_strndup(a, s, strlen(s)) : NULL;
}

char *sch_arena_printf(struct sch_arena *a, const char *fmt, ...)
{
	va_list ap;
	int n;
	char *p;

	va_start(ap, fmt);
	n = vsnprintf(NULL, 0, fmt, ap);
	va_end(ap);
	if (n < 0)
		return NULL;
	p = sch_arena_alloc(a, (size_t)n + 1);
	if (!p)
		return NULL;
	va_start(ap, fmt);
	vsnprintf(p, (size_t)n + 1, fmt, ap);
	va_end(ap);
	return p;
}

void sch_arena_release(struct sch_arena *a)
{
	struct sch_arena_block *b;

	if (!a)
		return;
	b = a->head;
	while (b) {
		struct sch_arena_block *next = b->next;
		free(b);
		b = next;
	}
	a->head = NULL;
	a->total = 0;
}
