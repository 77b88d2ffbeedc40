/* SPDX-License-Identifier: BSD-3-Clause */
/* buf.h - growable byte buffer with a hard size cap. */
#ifndef SCH_BUF_H
#define SCH_BUF_H

#include <stddef.h>
#include "schrot/err.h"

/*
 * Invariant: data is NULL or NUL-terminated at data[len]. Callers read
 * data/len but change them only through these functions.
 */
struct sch_buf {
	char *data;
	size_t len;
	size_t alloc;
	size_t cap; /* appends that would make len exceed cap fail */
};

/* Initialises an empty buffer that will never grow past cap bytes. Can't fail. */
void sch_buf_init(struct sch_buf *b, size_t cap);

/* Appends n bytes. SCH_ERR_NOMEM on allocation failure or cap; the buffer is then unchanged. */
enum sch_err sch_buf_add(struct sch_buf *b, const char *s, size_t n);

/* Appends a NUL-terminated string (same failure rules). */
enum sch_err sch_buf_adds(struct sch_buf *b, const char *s);

/* printf-append (same failure rules). */
enum sch_err sch_buf_printf(struct sch_buf *b, const char *fmt, ...) __attribute__((format(printf, 2, 3)));

/* Empties the buffer, keeping its storage. */
void sch_buf_reset(struct sch_buf *b);

/* Frees the storage; the buffer is empty and reusable. */
void sch_buf_release(struct sch_buf *b);

/* Hands the storage (NUL-terminated, possibly NULL) to the caller, who frees it with free(3). */
char *sch_buf_detach(struct sch_buf *b, size_t *len);

#endif
