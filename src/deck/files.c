/* SPDX-License-Identifier: BSD-3-Clause */
/* files.c - reading a netlist file whole within a size cap, include paths, and the UTF-8 check. */
#include <errno.h>
#include <fcntl.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>
#include "deck_int.h"

/* Offset of the first byte that is not valid UTF-8 in s[0..n), or n. */
size_t sch_deck_utf8_bad(const char *str, size_t n)
{
	const unsigned char *s = (const unsigned char *)str;
	size_t i = 0;

	while (i < n) {
		unsigned c = s[i];
		size_t k;
		unsigned cp, min;

		if (c < 0x80) {
			i++;
			continue;
		}
		if (c >= 0xc2 && c <= 0xdf)
			k = 1, cp = c & 0x1f, min = 0x80;
		else if (c >= 0xe0 && c <= 0xef)
			k = 2, cp = c & 0x0f, min = 0x800;
		else if (c >= 0xf0 && c <= 0xf4)
			k = 3, cp = c & 0x07, min = 0x10000;
		else
			return i;
		if (n - i <= k)
			return i;
		for (size_t j = 1; j <= k; j++) {
			if ((s[i + j] & 0xc0) != 0x80)
				return i;
			cp = (cp << 6) | (s[i + j] & 0x3f);
		}
		if (cp < min || cp > 0x10ffff || (cp >= 0xd800 && cp <= 0xdfff))
			return i;
		i += k + 1;
	}
	return n;
}


/*
 * Reads a whole file. *err_no is set on failure (EISDIR for a directory, EFBIG when too large,
 * ENODEV for a device or pipe when regular_only: an include must never block on /dev/stdin).
 */
enum sch_err sch_deck_slurp(const char *path, bool regular_only, size_t limit, char **out, size_t *out_len,
			    int *err_no)
{
	enum sch_err ret = SCH_ERR_INPUT;
	struct stat st;
	char *data = NULL;
	size_t len = 0, alloc = 0;
	/* O_NONBLOCK: opening a FIFO that nobody writes must not hang the reader. */
	int fd = open(path, O_RDONLY | O_CLOEXEC | (regular_only ? O_NONBLOCK : 0));

	*out = NULL;
	*out_len = 0;
	*err_no = 0;
	if (fd < 0) {
		*err_no = errno;
		goto out;
	}
	if (fstat(fd, &st) != 0) {
		*err_no = errno;
		goto out;
	}
	if (S_ISDIR(st.st_mode)) {
		*err_no = EISDIR;
		goto out;
	}
	if (regular_only && !S_ISREG(st.st_mode)) {
		*err_no = ENODEV;
		goto out;
	}
	if (S_ISREG(st.st_mode) && (uintmax_t)st.st_size > limit) {
		*err_no = EFBIG;
		goto out;
	}
	for (;;) {
		ssize_t got;

		if (len + 1 >= alloc) {
			size_t want = alloc ? alloc * 2 : (S_ISREG(st.st_mode) && st.st_size > 0 ? (size_t)st.st_size + 2 : 65536);
			char *p;

			if (alloc > limit) {
				*err_no = EFBIG;
				goto out;
			}
			p = realloc(data, want);
			if (!p) {
				ret = SCH_ERR_NOMEM;
				goto out;
			}
			data = p;
			alloc = want;
		}
		got = read(fd, data + len, alloc - len - 1);
		if (got < 0 && errno == EINTR)
			continue;
		if (got < 0) {
			*err_no = errno;
			goto out;
		}
		if (got == 0)
			break;
		len += (size_t)got;
	}
	if (len > limit) {
		*err_no = EFBIG;
		goto out;
	}
	data[len] = '\0';
	*out = data;
	*out_len = len;
	data = NULL;
	ret = SCH_OK;
out:
	free(data);
	if (fd >= 0)
		close(fd);
	return ret;
}

const char *sch_deck_errno_text(int err_no, char *buf, size_t size)
{
	snprintf(buf, size, "%s", err_no == EFBIG ? "file too large" : err_no == ENODEV ? "not a regular file" :
				  strerror(err_no));
	if (buf[0] >= 'A' && buf[0] <= 'Z')
		buf[0] = (char)(buf[0] - 'A' + 'a');
	return buf;
}

/* The directory part of path joined with name; name itself when absolute or path has no '/'. */
const char *sch_deck_resolve(struct sch_arena *a, const char *including, const char *name, size_t n)
{
	const char *slash = strrchr(including, '/');

	if (name[0] == '/' || !slash)
		return sch_arena_strndup(a, name, n);
	return sch_arena_printf(a, "%.*s/%.*s", (int)(slash - including), including, (int)n, name);
}
