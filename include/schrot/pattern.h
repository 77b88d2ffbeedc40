/* SPDX-License-Identifier: BSD-3-Clause */
/* pattern.h - compiled regular expressions (PCRE2 behind this interface; only pattern_pcre2.c knows it). */
#ifndef SCH_PATTERN_H
#define SCH_PATTERN_H

#include <stdbool.h>
#include <stddef.h>
#include "schrot/diag.h"

struct sch_pattern; /* opaque */

enum sch_pattern_flags {
	SCH_PAT_CASELESS = 1, /* case-insensitive */
	SCH_PAT_WHOLE = 2     /* anchored at both ends: must match the whole subject */
};

/*
 * Compiles regex with the given flags. On failure returns SCH_ERR_INPUT, sets *out
 * to NULL and reports "bad regex 'X': reason at offset N" naming what (e.g. "--carrier").
 * The caller owns *out and frees it with sch_pattern_free.
 */
enum sch_err sch_pattern_compile(struct sch_pattern **out, const char *regex, unsigned flags,
				 const char *what, struct sch_diag *d);

/* True when the pattern matches subject (length n). NULL pattern never matches. */
bool sch_pattern_match(const struct sch_pattern *p, const char *subject, size_t n);

/*
 * Finds the first match at or after offset start. On a match returns true and sets
 * the capture spans ovec[2*i], ovec[2*i+1] (i < n_pairs; unset groups are SIZE_MAX).
 */
bool sch_pattern_search(const struct sch_pattern *p, const char *subject, size_t n, size_t start,
			size_t *ovec, size_t n_pairs);

/* Frees a pattern; no-op on NULL. */
void sch_pattern_free(struct sch_pattern *p);

#endif
