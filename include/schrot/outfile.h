/* SPDX-License-Identifier: BSD-3-Clause */
/* outfile.h - atomic output files: written under a temporary name, renamed over the target on commit. */
#ifndef SCH_OUTFILE_H
#define SCH_OUTFILE_H

#include <stdbool.h>
#include <stdio.h>
#include "schrot/diag.h"

struct sch_outfile {
	FILE *fp;         /* write here between open and commit */
	char *path;       /* target (a symlink's target file, so that the link stays) */
	char *tmp_path;   /* NULL for stdout and for direct writes */
	bool is_stdout;
	bool direct;      /* the target is a device or FIFO (/dev/null): written in place, never replaced */
};

/*
 * Opens a temporary file beside path ("-" means stdout). An existing target that is not a
 * regular file (/dev/null, /dev/stderr, a FIFO) is opened and written in place instead: renaming
 * over it would replace the device with a file. SCH_ERR_IO with a message naming the file when it
 * cannot be created or is a directory; nothing is left behind then.
 */
enum sch_err sch_outfile_open(struct sch_outfile *o, const char *path, struct sch_diag *d);

/* Flushes, closes and renames over the target. On failure removes the temporary file (SCH_ERR_IO). */
enum sch_err sch_outfile_commit(struct sch_outfile *o, struct sch_diag *d);

/* Closes and removes the temporary file; the target is untouched. No-op on a closed outfile. */
void sch_outfile_abort(struct sch_outfile *o);

/*
 * A batch makes a set of outputs all-or-nothing: between begin and end, sch_outfile_commit writes
 * and closes its temporary file but defers the rename (direct writes to devices are not deferred).
 * A batch begun inside another joins it: only the outermost end renames or removes. Begin can't
 * fail; every begin needs its end.
 */
void sch_outfile_batch_begin(void);

/*
 * Ends the batch. An inner end only records ok (SCH_OK). The outermost end, when it and every
 * inner end had ok, renames every deferred file over its target in commit order (SCH_ERR_IO
 * naming the file when a rename fails; the files not yet renamed are removed, the ones renamed
 * stay); otherwise it removes every deferred temporary file: all targets untouched, SCH_OK.
 * Either way no temporary file is left.
 */
enum sch_err sch_outfile_batch_end(bool ok, struct sch_diag *d);

#endif
