/* SPDX-License-Identifier: BSD-3-Clause */
/* check.h - the whole unit-test framework: a few macros and a name -> function table runner. */
#ifndef SCH_CHECK_H
#define SCH_CHECK_H

#include <dirent.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

static int check_failures;
static int check_count;

#define CHECK(cond)                                                                        \
	do {                                                                               \
		check_count++;                                                             \
		if (!(cond)) {                                                             \
			check_failures++;                                                  \
			fprintf(stderr, "%s:%d: check failed: %s\n", __FILE__, __LINE__, #cond); \
		}                                                                          \
	} while (0)

#define CHECK_STR(a, b)                                                                    \
	do {                                                                               \
		const char *check_a_ = (a), *check_b_ = (b);                               \
		check_count++;                                                             \
		if (!check_a_ || !check_b_ || strcmp(check_a_, check_b_) != 0) {          \
			check_failures++;                                                  \
			fprintf(stderr, "%s:%d: '%s' != '%s'\n", __FILE__, __LINE__,       \
				check_a_ ? check_a_ : "(null)", check_b_ ? check_b_ : "(null)"); \
		}                                                                          \
	} while (0)

/* Relative closeness: |a-b| <= rel*max(|a|,|b|). */
#define CHECK_REL(a, b, rel)                                                               \
	do {                                                                               \
		double check_x_ = (a), check_y_ = (b);                                     \
		double check_m_ = fabs(check_x_) > fabs(check_y_) ? fabs(check_x_) : fabs(check_y_); \
		check_count++;                                                             \
		if (!(fabs(check_x_ - check_y_) <= (rel)*check_m_)) {                     \
			check_failures++;                                                  \
			fprintf(stderr, "%s:%d: %.12g != %.12g (rel %.3g > %.3g)\n", __FILE__, \
				__LINE__, check_x_, check_y_,                              \
				check_m_ > 0 ? fabs(check_x_ - check_y_) / check_m_ : 0.0, (double)(rel)); \
		}                                                                          \
	} while (0)

static char check_dir_path[64];

static void check_dir_remove(void)
{
	DIR *dp = opendir(check_dir_path);
	struct dirent *e;
	char p[512];

	if (!dp)
		return;
	while ((e = readdir(dp)))
		if (strcmp(e->d_name, ".") && strcmp(e->d_name, "..")) {
			snprintf(p, sizeof(p), "%s/%s", check_dir_path, e->d_name);
			remove(p);
		}
	closedir(dp);
	rmdir(check_dir_path);
}

/* A private scratch directory for the test program (made on first use, removed at exit). */
static inline const char *check_scratch_dir(void)
{
	if (!check_dir_path[0]) {
		snprintf(check_dir_path, sizeof(check_dir_path), "/tmp/schrot-test-XXXXXX");
		if (!mkdtemp(check_dir_path))
			abort();
		atexit(check_dir_remove);
	}
	return check_dir_path;
}

struct check_case {
	const char *name;
	void (*fn)(void);
};

static inline int check_run(const struct check_case *cases, size_t n)
{
	for (size_t i = 0; i < n; i++) {
		int before = check_failures;
		cases[i].fn();
		printf("%s %s\n", check_failures == before ? "ok  " : "FAIL", cases[i].name);
	}
	printf("%d checks, %d failed\n", check_count, check_failures);
	return check_failures ? 1 : 0;
}

#define CHECK_MAIN(...)                                                                    \
	int main(void)                                                                     \
	{                                                                                  \
		static const struct check_case cases[] = { __VA_ARGS__ };                 \
		return check_run(cases, sizeof(cases) / sizeof(cases[0]));                 \
	}
#define CASE(fn) { #fn, fn }

#endif
