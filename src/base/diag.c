/* SPDX-License-Identifier: BSD-3-Clause */
/* diag.c - located diagnostics printed to a sink, filtered by verbosity. */
#include <stdarg.h>
#include <stdio.h>
#include <string.h>
#include "schrot/diag.h"

void sch_diag_init(struct sch_diag *d, FILE *sink, int verbosity)
{
	memset(d, 0, sizeof(*d));
	d->sink = sink;
	d->verbosity = verbosity;
}

static const char *severity_word(enum sch_severity sev)
{
	switch (sev) {
	case SCH_ERROR:
		return "error";
	case SCH_WARNING:
		return "warning";
	default:
		return "note";
	}
}

static void vreport(struct sch_diag *d, enum sch_severity sev, const char *file, long line,
		    const char *fmt, va_list ap)
{
	char msg[1024];
	char prefix[600];

	if (!d)
		return;
	vsnprintf(msg, sizeof(msg), fmt, ap);
	if (file && line > 0)
		snprintf(prefix, sizeof(prefix), "%.500s:%ld", file, line);
	else if (file)
		snprintf(prefix, sizeof(prefix), "%.500s", file);
	else
		snprintf(prefix, sizeof(prefix), "schrot");
	if (sev == SCH_ERROR) {
		if (d->n_errors == 0)
			snprintf(d->first_error, sizeof(d->first_error), "%.200s: %.300s", prefix, msg);
		d->n_errors++;
	} else if (sev == SCH_WARNING) {
		d->n_warnings++;
	}
	if (!d->sink)
		return;
	if (sev == SCH_WARNING && d->verbosity < 0)
		return;
	if (sev == SCH_NOTE && d->verbosity < 1)
		return;
	fprintf(d->sink, "%s: %s: %s\n", prefix, severity_word(sev), msg);
}

void sch_diag_report(struct sch_diag *d, enum sch_severity sev, const char *file, long line,
		     const char *fmt, ...)
{
	va_list ap;

	va_start(ap, fmt);
	vreport(d, sev, file, line, fmt, ap);
	va_end(ap);
}

enum sch_err sch_diag_error(struct sch_diag *d, enum sch_err err, const char *file, long line,
			    const char *fmt, ...)
{
	va_list ap;

	va_start(ap, fmt);
	vreport(d, SCH_ERROR, file, line, fmt, ap);
	va_end(ap);
	return err;
}
