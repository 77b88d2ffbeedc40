/* SPDX-License-Identifier: BSD-3-Clause */
/* outfile.c - atomic output files: a mkstemp file beside the target, renamed over it on commit. */
#include <errno.h>
#include <fcntl.h>
#include <signal.h>
#include <stdbool.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>
#include "schrot/leftover.h"
#include "schrot/outfile.h"

/* Renames deferred by a batch: (temporary file, target), in commit order. Nested batches join the outermost. */
struct deferred {
	char *tmp_path;
	char *path;
};

static struct {
	bool active;
	int depth;      /* begins not yet ended */
	bool failed;    /* an inner batch ended without ok: the outermost one fails too */
	struct deferred *v;
	size_t n, cap;
} batch;

static enum sch_err defer(struct sch_outfile *o)
{
	if (batch.n == batch.cap) {
		size_t cap = batch.cap ? 2 * batch.cap : 8;
		struct deferred *v = realloc(batch.v, cap * sizeof(*v));

		if (!v)
			return SCH_ERR_NOMEM;
		batch.v = v;
		batch.cap = cap;
	}
	batch.v[batch.n++] = (struct deferred){ o->tmp_path, o->path };
	o->tmp_path = NULL;
	o->path = NULL;
	return SCH_OK;
}

void sch_outfile_batch_begin(void)
{
	if (batch.depth++ == 0) {
		batch.active = true;
		batch.failed = false;
		batch.n = 0;
	}
}

enum sch_err sch_outfile_batch_end(bool ok, struct sch_diag *d)
{
	enum sch_err ret = SCH_OK;
	sigset_t old;

	if (!ok)
		batch.failed = true;
	if (batch.depth > 0 && --batch.depth > 0)
		return SCH_OK;
	ok = !batch.failed;
	/* a signal waits until every file of the batch is in place (or removed): never half of them */
	sch_leftover_hold(&old);
	for (size_t i = 0; i < batch.n; i++) {
		struct deferred *f = &batch.v[i];

		if (ok && ret == SCH_OK && rename(f->tmp_path, f->path) != 0)
			ret = sch_diag_error(d, SCH_ERR_IO, f->path, 0, "cannot replace output file: %s", strerror(errno));
		if (!ok || ret != SCH_OK)
			remove(f->tmp_path);
		sch_leftover_drop_path(f->tmp_path);
		free(f->tmp_path);
		free(f->path);
	}
	sch_leftover_release(&old);
	free(batch.v);
	batch.v = NULL;
	batch.n = batch.cap = 0;
	batch.active = false;
	batch.failed = false;
	batch.depth = 0;
	return ret;
}

/* Every path to a temporary file ends here or in batch_end: the signal registry forgets it too. */
static void outfile_clear(struct sch_outfile *o)
{
	sch_leftover_drop_path(o->tmp_path);
	free(o->path);
	free(o->tmp_path);
	o->fp = NULL;
	o->path = NULL;
	o->tmp_path = NULL;
	o->is_stdout = false;
	o->direct = false;
}

/*
 * mkstemp creates 0600; an output file should get the permissions a plain fopen would give it
 * (or keep those of the file it replaces), or make rules and other users could not read it.
 */
static mode_t target_mode(const char *path)
{
	struct stat st;
	mode_t mask;

	if (stat(path, &st) == 0 && S_ISREG(st.st_mode))
		return st.st_mode & 07777;
	mask = umask(022);
	umask(mask);
	return 0666 & ~mask;
}

enum sch_err sch_outfile_open(struct sch_outfile *o, const char *path, struct sch_diag *d)
{
	enum sch_err ret = SCH_ERR_IO;
	struct stat st, lst;
	sigset_t old;
	size_t len;
	int fd = -1;

	o->fp = NULL;
	o->path = NULL;
	o->tmp_path = NULL;
	o->is_stdout = false;
	o->direct = false;
	if (!path || !*path) {
		ret = sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "empty output file name");
		goto out;
	}
	o->path = strdup(path);
	if (!o->path) {
		ret = SCH_ERR_NOMEM;
		goto out;
	}
	if (strcmp(path, "-") == 0) {
		o->fp = stdout;
		o->is_stdout = true;
		ret = SCH_OK;
		goto out;
	}
	if (stat(path, &st) == 0 && S_ISDIR(st.st_mode)) {
		ret = sch_diag_error(d, SCH_ERR_IO, path, 0, "cannot write output file: it is a directory");
		goto out;
	}
	if (stat(path, &st) == 0 && !S_ISREG(st.st_mode)) {
		fd = open(path, O_WRONLY | O_CLOEXEC);
		o->fp = fd >= 0 ? fdopen(fd, "w") : NULL;
		if (!o->fp) {
			ret = sch_diag_error(d, SCH_ERR_IO, path, 0, "cannot open output file: %s", strerror(errno));
			if (fd >= 0)
				close(fd);
			goto out;
		}
		o->direct = true;
		ret = SCH_OK;
		goto out;
	}
	if (lstat(path, &lst) == 0 && S_ISLNK(lst.st_mode) && stat(path, &st) == 0) {
		/* replace the file the link names, not the link */
		char *real = realpath(path, NULL);

		if (!real) {
			ret = SCH_ERR_NOMEM;
			goto out;
		}
		free(o->path);
		o->path = real;
	}
	path = o->path;
	len = strlen(path);
	o->tmp_path = malloc(len + sizeof(".tmpXXXXXX"));
	if (!o->tmp_path) {
		ret = SCH_ERR_NOMEM;
		goto out;
	}
	memcpy(o->tmp_path, path, len);
	memcpy(o->tmp_path + len, ".tmpXXXXXX", sizeof(".tmpXXXXXX"));
	sch_leftover_hold(&old);
	fd = mkstemp(o->tmp_path);
	if (fd >= 0)
		sch_leftover_add_path(o->tmp_path, false);
	sch_leftover_release(&old);
	if (fd < 0) {
		ret = sch_diag_error(d, SCH_ERR_IO, path, 0, "cannot create output file: %s", strerror(errno));
		free(o->tmp_path);
		o->tmp_path = NULL;
		goto out;
	}
	(void)fchmod(fd, target_mode(path));
	o->fp = fdopen(fd, "w");
	if (!o->fp) {
		ret = sch_diag_error(d, SCH_ERR_IO, path, 0, "cannot open output file: %s", strerror(errno));
		close(fd);
		remove(o->tmp_path);
		goto out;
	}
	ret = SCH_OK;
out:
	if (ret != SCH_OK)
		outfile_clear(o);
	return ret;
}

enum sch_err sch_outfile_commit(struct sch_outfile *o, struct sch_diag *d)
{
	enum sch_err ret = SCH_ERR_IO;
	int failed;

	if (!o->fp)
		return sch_diag_error(d, SCH_ERR_IO, o->path, 0, "output file is not open");
	if (o->direct) {
		failed = ferror(o->fp) != 0;
		if (fclose(o->fp) != 0)
			failed = 1;
		o->fp = NULL;
		ret = failed ? sch_diag_error(d, SCH_ERR_IO, o->path, 0, "cannot write output file: %s",
					      errno ? strerror(errno) : "write error")
			     : SCH_OK;
		goto out;
	}
	if (o->is_stdout) {
		if (fflush(stdout) != 0 || ferror(stdout))
			ret = sch_diag_error(d, SCH_ERR_IO, NULL, 0, "cannot write to standard output: %s",
					     strerror(errno));
		else
			ret = SCH_OK;
		goto out;
	}
	failed = ferror(o->fp) != 0;
	if (fclose(o->fp) != 0)
		failed = 1;
	o->fp = NULL;
	if (failed) {
		ret = sch_diag_error(d, SCH_ERR_IO, o->path, 0, "cannot write output file: %s",
				     errno ? strerror(errno) : "write error");
		remove(o->tmp_path);
		goto out;
	}
	if (batch.active) {
		ret = defer(o);
		if (ret != SCH_OK) {
			remove(o->tmp_path);
			ret = sch_diag_error(d, SCH_ERR_NOMEM, o->path, 0, "out of memory");
		}
		goto out;
	}
	if (rename(o->tmp_path, o->path) != 0) {
		ret = sch_diag_error(d, SCH_ERR_IO, o->path, 0, "cannot replace output file: %s", strerror(errno));
		remove(o->tmp_path);
		goto out;
	}
	ret = SCH_OK;
out:
	outfile_clear(o);
	return ret;
}

void sch_outfile_abort(struct sch_outfile *o)
{
	if (!o)
		return;
	if (o->fp && !o->is_stdout)
		fclose(o->fp);
	else if (o->fp)
		fflush(stdout);
	if (o->tmp_path)
		remove(o->tmp_path);
	outfile_clear(o);
}
