/* SPDX-License-Identifier: BSD-3-Clause */
/* buf.c - growable byte buffer with a hard cap; a failed append leaves it unchanged. */
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/buf.h"

void sch_buf_init(struct sch_buf *b, size_t cap)
{
	b->data = NULL;
	b->len = 0;
	b->alloc = 0;
	b->cap = cap;
}

static enum sch_err grow(struct sch_buf *b, size_t extra)
{
	size_t want;
	char *p;

	if (extra > b->cap || b->len > b->cap - extra)
		return SCH_ERR_NOMEM;
	want = b->len + extra + 1;
	if (want <= b->alloc)
		return SCH_OK;
	if (want < b->alloc * 2)
		want = b->alloc * 2;
	if (want < 64)
		want = 64;
	p = realloc(b->data, want);
	if (!p)
		return SCH_ERR_NOMEM;
	b->data = p;
	b->alloc = want;
	return SCH_OK;
}

enum sch_err sch_buf_add(struct sch_buf *b, const char *s, size_t n)
{
	if (grow(b, n) != SCH_OK)
		return SCH_ERR_NOMEM;
	if (n)
		memcpy(b->data + b->len, s, n);
	b->len += n;
	b->data[b->len] = '\0';
	return SCH_OK;
}

enum sch_err sch_buf_adds(struct sch_buf *b, const char *s)
{
	return sch_buf_add(b, s, strlen(s));
}

enum sch_err sch_buf_printf(struct sch_buf *b, const char *fmt, ...)
{
	va_list ap;
	int n;

	va_start(ap, fmt);
	n = vsnprintf(NULL, 0, fmt, ap);
	va_end(ap);
	if (n < 0 || grow(b, (size_t)n) != SCH_OK)
		return SCH_ERR_NOMEM;
	va_start(ap, fmt);
	vsnprintf(b->data + b->len, (size_t)n + 1, fmt, ap);
	va_end(ap);
	b->len += (size_t)n;
	return SCH_OK;
}

void sch_buf_reset(struct sch_buf *b)
{
	b->len = 0;
	if (b->data)
		b->data[0] = '\0';
}

void sch_buf_release(struct sch_buf *b)
{
	free(b->data);
	b->data = NULL;
	b->len = 0;
	b->alloc = 0;
}

char *sch_buf_detach(struct sch_buf *b, size_t *len)
{
	char *p = b->data;

	if (len)
		*len = b->len;
	b->data = NULL;
	b->len = 0;
	b->alloc = 0;
	return p;
}
