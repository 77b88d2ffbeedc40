/* SPDX-License-Identifier: BSD-3-Clause */
/* test_outfile.c - atomic output files: commit replaces, abort and failure leave the target alone. */
#include <dirent.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>
#include "check.h"
#include "schrot/outfile.h"

/* A fresh scratch file name in the test's private directory. */
static const char *scratch(const char *name)
{
	static char p[512];

	snprintf(p, sizeof(p), "%s/%s", check_scratch_dir(), name);
	return p;
}

static int count_entries(void)
{
	DIR *dp = opendir(check_scratch_dir());
	struct dirent *e;
	int n = 0;

	if (!dp)
		return -1;
	while ((e = readdir(dp)))
		if (strcmp(e->d_name, ".") && strcmp(e->d_name, ".."))
			n++;
	closedir(dp);
	return n;
}

static void write_text(const char *path, const char *text)
{
	FILE *fp = fopen(path, "w");

	if (fp) {
		fputs(text, fp);
		fclose(fp);
	}
}

static char *slurp(const char *path)
{
	static char buf[4096];
	FILE *fp = fopen(path, "r");
	size_t n;

	if (!fp)
		return NULL;
	n = fread(buf, 1, sizeof(buf) - 1, fp);
	buf[n] = '\0';
	fclose(fp);
	return buf;
}

static void test_outfile__commit_replaces_target(void)
{
	char path[512];
	struct sch_outfile o;
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	snprintf(path, sizeof(path), "%s", scratch("a.json"));
	write_text(path, "old\n");
	CHECK(sch_outfile_open(&o, path, &d) == SCH_OK);
	CHECK(o.tmp_path && strncmp(o.tmp_path, path, strlen(path)) == 0);
	fputs("new\n", o.fp);
	CHECK_STR(slurp(path), "old\n");
	CHECK(sch_outfile_commit(&o, &d) == SCH_OK);
	CHECK_STR(slurp(path), "new\n");
	CHECK(o.fp == NULL);
	CHECK(count_entries() == 1);
	remove(path);
}

static void test_outfile__abort_leaves_old_file_untouched(void)
{
	char path[512];
	struct sch_outfile o;
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	snprintf(path, sizeof(path), "%s", scratch("b.csv"));
	write_text(path, "earlier run\n");
	CHECK(sch_outfile_open(&o, path, &d) == SCH_OK);
	fputs("half a report", o.fp);
	sch_outfile_abort(&o);
	CHECK_STR(slurp(path), "earlier run\n");
	CHECK(count_entries() == 1);
	sch_outfile_abort(&o); /* no-op on a closed outfile */
	remove(path);
}

static void test_outfile__abort_without_target_leaves_nothing(void)
{
	char path[512];
	struct sch_outfile o;
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	snprintf(path, sizeof(path), "%s", scratch("c.svg"));
	CHECK(sch_outfile_open(&o, path, &d) == SCH_OK);
	sch_outfile_abort(&o);
	CHECK(access(path, F_OK) != 0);
	CHECK(count_entries() == 0);
}

static void test_outfile__open_in_missing_directory_fails_naming_the_file(void)
{
	char path[512];
	struct sch_outfile o;
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	snprintf(path, sizeof(path), "%s", scratch("no/such/dir/x.json"));
	CHECK(sch_outfile_open(&o, path, &d) == SCH_ERR_IO);
	CHECK(o.fp == NULL && o.tmp_path == NULL && o.path == NULL);
	CHECK(d.n_errors == 1);
	CHECK(strstr(d.first_error, "x.json") != NULL);
}

static void test_outfile__dash_is_stdout(void)
{
	struct sch_outfile o;
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	CHECK(sch_outfile_open(&o, "-", &d) == SCH_OK);
	CHECK(o.fp == stdout);
	CHECK(o.is_stdout);
	CHECK(o.tmp_path == NULL);
	CHECK(sch_outfile_commit(&o, &d) == SCH_OK);
	CHECK(o.fp == NULL);
}

static void test_outfile__new_file_gets_umask_permissions(void)
{
	char path[512];
	struct sch_outfile o;
	struct sch_diag d;
	struct stat st;
	mode_t mask = umask(022);

	umask(mask);
	sch_diag_init(&d, NULL, 0);
	snprintf(path, sizeof(path), "%s", scratch("d.json"));
	CHECK(sch_outfile_open(&o, path, &d) == SCH_OK);
	CHECK(sch_outfile_commit(&o, &d) == SCH_OK);
	CHECK(stat(path, &st) == 0 && (st.st_mode & 0777) == (0666 & ~mask));
	remove(path);
}

static void test_outfile__replaced_file_keeps_its_mode(void)
{
	char path[512];
	struct sch_outfile o;
	struct sch_diag d;
	struct stat st;

	sch_diag_init(&d, NULL, 0);
	snprintf(path, sizeof(path), "%s", scratch("e.json"));
	write_text(path, "x");
	chmod(path, 0640);
	CHECK(sch_outfile_open(&o, path, &d) == SCH_OK);
	CHECK(sch_outfile_commit(&o, &d) == SCH_OK);
	CHECK(stat(path, &st) == 0 && (st.st_mode & 0777) == 0640);
	remove(path);
}

static void write_one(const char *path, const char *text, struct sch_diag *d)
{
	struct sch_outfile o;

	CHECK(sch_outfile_open(&o, path, d) == SCH_OK);
	fputs(text, o.fp);
	CHECK(sch_outfile_commit(&o, d) == SCH_OK);
}

static void test_outfile__failed_batch_leaves_every_target_untouched(void)
{
	char a[512], b[512];
	struct sch_outfile o;
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	snprintf(a, sizeof(a), "%s", scratch("a.json"));
	snprintf(b, sizeof(b), "%s", scratch("b.csv"));
	write_text(a, "old a");
	write_text(b, "old b");
	sch_outfile_batch_begin();
	write_one(a, "new a", &d);
	CHECK(slurp(a) && strcmp(slurp(a), "old a") == 0); /* deferred: not renamed yet */
	/* the second output cannot even be created: the whole set fails */
	CHECK(sch_outfile_open(&o, "/nonexistent-dir/b.csv", &d) == SCH_ERR_IO);
	CHECK(sch_outfile_batch_end(false, &d) == SCH_OK);
	CHECK(slurp(a) && strcmp(slurp(a), "old a") == 0);
	CHECK(slurp(b) && strcmp(slurp(b), "old b") == 0);
	CHECK(count_entries() == 2);
	remove(a);
	remove(b);
}

static void test_outfile__nested_batch_joins_the_outer_one(void)
{
	char a[512], b[512];
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	snprintf(a, sizeof(a), "%s", scratch("a.cir"));
	snprintf(b, sizeof(b), "%s", scratch("b.json"));
	write_text(a, "old a");
	write_text(b, "old b");
	/* an inner batch that fails makes the outer one fail: neither file is replaced */
	sch_outfile_batch_begin();
	write_one(a, "new a", &d);
	sch_outfile_batch_begin();
	write_one(b, "new b", &d);
	CHECK(sch_outfile_batch_end(false, &d) == SCH_OK);
	CHECK(slurp(a) && strcmp(slurp(a), "old a") == 0);
	CHECK(sch_outfile_batch_end(true, &d) == SCH_OK);
	CHECK(slurp(a) && strcmp(slurp(a), "old a") == 0);
	CHECK(slurp(b) && strcmp(slurp(b), "old b") == 0);
	CHECK(count_entries() == 2);
	/* both good: only the outer end renames */
	sch_outfile_batch_begin();
	write_one(a, "new a", &d);
	sch_outfile_batch_begin();
	write_one(b, "new b", &d);
	CHECK(sch_outfile_batch_end(true, &d) == SCH_OK);
	CHECK(slurp(b) && strcmp(slurp(b), "old b") == 0);
	CHECK(sch_outfile_batch_end(true, &d) == SCH_OK);
	CHECK(slurp(a) && strcmp(slurp(a), "new a") == 0);
	CHECK(slurp(b) && strcmp(slurp(b), "new b") == 0);
	CHECK(count_entries() == 2);
	remove(a);
	remove(b);
}

static void test_outfile__good_batch_replaces_every_target(void)
{
	char a[512], b[512];
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	snprintf(a, sizeof(a), "%s", scratch("a.json"));
	snprintf(b, sizeof(b), "%s", scratch("b.csv"));
	write_text(a, "old a");
	sch_outfile_batch_begin();
	write_one(a, "new a", &d);
	write_one(b, "new b", &d);
	CHECK(count_entries() == 3); /* a, its temporary file, b's temporary file */
	CHECK(sch_outfile_batch_end(true, &d) == SCH_OK);
	CHECK(slurp(a) && strcmp(slurp(a), "new a") == 0);
	CHECK(slurp(b) && strcmp(slurp(b), "new b") == 0);
	CHECK(count_entries() == 2);
	/* after the batch, commits rename at once again */
	write_one(a, "newer a", &d);
	CHECK(slurp(a) && strcmp(slurp(a), "newer a") == 0);
	remove(a);
	remove(b);
}

static void test_outfile__device_target_is_written_in_place(void)
{
	struct sch_outfile o;
	struct sch_diag d;
	struct stat st;

	sch_diag_init(&d, NULL, 0);
	/* renaming a temporary file over /dev/null would replace the device (as root) with a file */
	CHECK(sch_outfile_open(&o, "/dev/null", &d) == SCH_OK);
	CHECK(o.direct && o.tmp_path == NULL);
	fputs("{}\n", o.fp);
	CHECK(sch_outfile_commit(&o, &d) == SCH_OK);
	CHECK(stat("/dev/null", &st) == 0 && S_ISCHR(st.st_mode));
	sch_outfile_batch_begin();
	CHECK(sch_outfile_open(&o, "/dev/null", &d) == SCH_OK);
	CHECK(sch_outfile_commit(&o, &d) == SCH_OK);
	CHECK(sch_outfile_batch_end(true, &d) == SCH_OK);
	CHECK(stat("/dev/null", &st) == 0 && S_ISCHR(st.st_mode));
}

static void test_outfile__symlink_target_keeps_the_link(void)
{
	char real[512], link[512];
	struct sch_outfile o;
	struct sch_diag d;
	struct stat st;

	sch_diag_init(&d, NULL, 0);
	snprintf(real, sizeof(real), "%s", scratch("real.json"));
	snprintf(link, sizeof(link), "%s", scratch("link.json"));
	write_text(real, "old");
	CHECK(symlink(real, link) == 0);
	CHECK(sch_outfile_open(&o, link, &d) == SCH_OK);
	fputs("new", o.fp);
	CHECK(sch_outfile_commit(&o, &d) == SCH_OK);
	CHECK(lstat(link, &st) == 0 && S_ISLNK(st.st_mode));
	CHECK(slurp(real) && strcmp(slurp(real), "new") == 0);
	remove(link);
	remove(real);
}

static void test_outfile__directory_target_fails_at_open(void)
{
	struct sch_outfile o;
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	scratch("x");
	CHECK(sch_outfile_open(&o, check_scratch_dir(), &d) == SCH_ERR_IO);
	CHECK(strstr(d.first_error, "it is a directory") != NULL);
	CHECK(count_entries() == 0);
}

CHECK_MAIN(CASE(test_outfile__device_target_is_written_in_place), CASE(test_outfile__symlink_target_keeps_the_link),
	   CASE(test_outfile__directory_target_fails_at_open),
	   CASE(test_outfile__failed_batch_leaves_every_target_untouched),
	   CASE(test_outfile__good_batch_replaces_every_target), CASE(test_outfile__nested_batch_joins_the_outer_one), CASE(test_outfile__commit_replaces_target), CASE(test_outfile__abort_leaves_old_file_untouched),
	   CASE(test_outfile__abort_without_target_leaves_nothing),
	   CASE(test_outfile__open_in_missing_directory_fails_naming_the_file), CASE(test_outfile__dash_is_stdout),
	   CASE(test_outfile__new_file_gets_umask_permissions), CASE(test_outfile__replaced_file_keeps_its_mode))
