/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * replay.c - runs a libFuzzer target's entry point over every file of a corpus directory in an
 * ordinary (or sanitizer) build, so that the committed corpus and every past crasher stay
 * regression tests without clang's fuzzer runtime.
 */
#include <dirent.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

static int replay_file(const char *path)
{
	FILE *f = fopen(path, "rb");
	unsigned char *data = NULL;
	size_t len = 0, cap = 0;
	int ret = 1;

	if (!f)
		return 1;
	for (;;) {
		size_t got;

		if (len == cap) {
			size_t want = cap ? 2 * cap : 4096;
			unsigned char *p = realloc(data, want);

			if (!p)
				goto out;
			data = p;
			cap = want;
		}
		got = fread(data + len, 1, cap - len, f);
		len += got;
		if (got == 0)
			break;
	}
	LLVMFuzzerTestOneInput(data, len);
	ret = 0;
out:
	free(data);
	fclose(f);
	return ret;
}

int main(int argc, char **argv)
{
	int n = 0, bad = 0;

	for (int i = 1; i < argc; i++) {
		DIR *dir = opendir(argv[i]);
		struct dirent *e;

		if (!dir) {
			bad += replay_file(argv[i]);
			n++;
			continue;
		}
		while ((e = readdir(dir))) {
			char path[4096];

			if (e->d_name[0] == '.')
				continue;
			snprintf(path, sizeof(path), "%s/%s", argv[i], e->d_name);
			bad += replay_file(path);
			n++;
		}
		closedir(dir);
	}
	printf("%d inputs replayed, %d unreadable\n", n, bad);
	return bad || n == 0 ? 1 : 0;
}
