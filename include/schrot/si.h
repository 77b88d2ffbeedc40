/* SPDX-License-Identifier: BSD-3-Clause */
/* si.h - SPICE numbers with engineering suffixes (1meg, 10pF, 2.2k, 5mil) and SI-prefixed formatting. */
#ifndef SCH_SI_H
#define SCH_SI_H

#include <stdbool.h>
#include <stddef.h>
#include "schrot/err.h"

/*
 * Parses a whole SPICE number: [+-]digits[.digits][e[+-]digits][suffix][unit letters].
 * Suffixes (case-insensitive): f p n u m k meg g t mil; 'm' is milli, 'meg' is 1e6.
 * Trailing letters after the suffix are units and are ignored ("10pF", "1kohm").
 * Returns SCH_ERR_INPUT (value untouched) when text is not such a number
 * ("1.2.3", "1e", "abc", "", "1k2" is rejected, as are non-finite results).
 */
enum sch_err sch_si_parse(const char *text, double *value);

/* Same as sch_si_parse for the first n bytes of text. */
enum sch_err sch_si_parse_n(const char *text, size_t n, double *value);

/* True when text starts like a number (optional sign, then a digit or '.' and digit). */
bool sch_si_looks_numeric(const char *text);

/*
 * Formats value with an SI prefix and unit into out: "12.3 nA", "566 fA/√Hz"
 * (unit given by the caller), digits significant figures (3 by default if 0).
 * Zero prints "0 <unit>", NaN prints "-". Always NUL-terminates; returns out.
 */
char *sch_si_format(char *out, size_t size, double value, int digits, const char *unit);

#endif
