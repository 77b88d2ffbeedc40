/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * report_depfile.c - a make dependency file: the run's outputs depend on every file the netlist
 * read, plus an empty rule per included file so that deleting one does not break make.
 */
#include <stdbool.h>
#include <stdio.h>
#include <string.h>
#include "schrot/outfile.h"
#include "schrot/report.h"
#include "report_int.h"

/* Keeps rules readable the way compilers write them: a break before a name past this column. */
#define DEP_WRAP 78

/* Writes name escaped for make: space, tab and '#' take a backslash, '$' is doubled. */
static size_t put_name(FILE *fp, const char *s)
{
	size_t n = 0;

	for (; *s; s++, n++) {
		if (*s == ' ' || *s == '\t' || *s == '#') {
			fputc('\\', fp);
			n++;
		} else if (*s == '$') {
			fputc('$', fp);
			n++;
		}
		fputc(*s, fp);
	}
	return n;
}

/* A name make cannot hold at all. */
static bool unwritable(const char *s)
{
	return !s || !*s || strpbrk(s, "\n\r") != NULL;
}

enum sch_err sch_report_depfile(const struct sch_result *r, const char *path, const char *const *targets,
				size_t n_targets, struct sch_diag *d)
{
	enum sch_err ret = SCH_ERR_USAGE;
	struct sch_outfile o;
	const char *top = r->netlist;
	const char *const *files = r->deck.files;
	size_t n_files = r->deck.n_files, col = 0;
	bool open = false;

	if (n_files == 0) {
		files = &top;
		n_files = top ? 1 : 0;
	}
	if (n_targets == 0 || n_files == 0) {
		ret = sch_diag_error(d, SCH_ERR_USAGE, path, 0,
				     "a dependency file needs an output to name as its target (--json, --csv, ...)");
		goto out;
	}
	for (size_t i = 0; i < n_targets + n_files; i++) {
		const char *s = i < n_targets ? targets[i] : files[i - n_targets];
		if (unwritable(s)) {
			ret = sch_diag_error(d, SCH_ERR_USAGE, path, 0,
					     "cannot name '%s' in a make rule (empty or with a line break)", s ? s : "");
			goto out;
		}
	}
	ret = sch_outfile_open(&o, path, d);
	if (ret != SCH_OK)
		goto out;
	open = true;
	for (size_t i = 0; i < n_targets; i++) {
		if (i)
			fputc(' ', o.fp);
		col += put_name(o.fp, targets[i]) + 1;
	}
	fputc(':', o.fp);
	col++;
	for (size_t i = 0; i < n_files; i++) {
		if (col + strlen(files[i]) + 1 > DEP_WRAP) {
			fputs(" \\\n", o.fp);
			col = 0;
		}
		fputc(' ', o.fp);
		col += put_name(o.fp, files[i]) + 1;
	}
	fputc('\n', o.fp);
	/* Like gcc -MP: every prerequisite but the netlist itself gets an empty rule. */
	for (size_t i = 1; i < n_files; i++) {
		fputc('\n', o.fp);
		put_name(o.fp, files[i]);
		fputs(":\n", o.fp);
	}
	if (ferror(o.fp)) {
		ret = sch_diag_error(d, SCH_ERR_IO, path, 0, "cannot write the dependency file");
		goto out;
	}
	open = false;
	ret = sch_outfile_commit(&o, d);
out:
	if (open)
		sch_outfile_abort(&o);
	return ret;
}
