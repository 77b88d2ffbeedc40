/* SPDX-License-Identifier: BSD-3-Clause */
/* diag.h - diagnostics: located error, warning and note messages printed to a sink (stderr). */
#ifndef SCH_DIAG_H
#define SCH_DIAG_H

#include <stdio.h>
#include "schrot/err.h"

enum sch_severity { SCH_NOTE, SCH_WARNING, SCH_ERROR };

/*
 * A diagnostics sink. Errors always print; warnings print unless quiet;
 * notes print only when verbose. The first error's text is kept so that
 * callers and tests can look at it.
 */
struct sch_diag {
	FILE *sink;         /* NULL: print nothing (counting still happens) */
	int verbosity;      /* -1 quiet (-q), 0 normal, 1 verbose (-v) */
	int n_errors;
	int n_warnings;
	char first_error[512];
};

/* Initialises d to print to sink (may be NULL). This function can't fail. */
void sch_diag_init(struct sch_diag *d, FILE *sink, int verbosity);

/*
 * Prints "FILE:LINE: error: message" (or "schrot: error: message" when file
 * is NULL; LINE is left out when line <= 0). A message never carries a
 * trailing newline. d may be NULL (message dropped).
 */
void sch_diag_report(struct sch_diag *d, enum sch_severity sev, const char *file, long line,
		     const char *fmt, ...) __attribute__((format(printf, 5, 6)));

/* Reports an error as above and returns err, so that `return sch_diag_error(...)` is one line. */
enum sch_err sch_diag_error(struct sch_diag *d, enum sch_err err, const char *file, long line,
			    const char *fmt, ...) __attribute__((format(printf, 5, 6)));

#endif
