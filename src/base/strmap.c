/* SPDX-License-Identifier: BSD-3-Clause */
/* strmap.c - open-addressing string map with FNV-1a hashing and linear probing. */
#include <stdlib.h>
#include <string.h>
#include "schrot/strmap.h"

static size_t hash(const char *s, size_t len)
{
	size_t h = 1469598103934665603ULL;
	for (size_t i = 0; i < len; i++) {
		h ^= (unsigned char)s[i];
		h *= 1099511628211ULL;
	}
	return h;
}

void sch_strmap_init(struct sch_strmap *m)
{
	memset(m, 0, sizeof(*m));
}

static enum sch_err grow(struct sch_strmap *m)
{
	size_t cap = m->cap ? m->cap * 2 : 64;
	struct sch_strmap g = { calloc(cap, sizeof(char *)), calloc(cap, sizeof(size_t)), calloc(cap, sizeof(int)), cap, 0 };

	if (!g.keys || !g.lens || !g.values) {
		sch_strmap_release(&g);
		return SCH_ERR_NOMEM;
	}
	for (size_t i = 0; i < m->cap; i++) {
		if (m->keys[i])
			sch_strmap_put(&g, m->keys[i], m->lens[i], m->values[i]);
	}
	sch_strmap_release(m);
	*m = g;
	return SCH_OK;
}

enum sch_err sch_strmap_put(struct sch_strmap *m, const char *key, size_t len, int value)
{
	size_t i;

	if ((m->n + 1) * 2 > m->cap && grow(m) != SCH_OK)
		return SCH_ERR_NOMEM;
	for (i = hash(key, len) & (m->cap - 1); m->keys[i]; i = (i + 1) & (m->cap - 1)) {
		if (m->lens[i] == len && memcmp(m->keys[i], key, len) == 0) {
			m->values[i] = value;
			return SCH_OK;
		}
	}
	m->keys[i] = key;
	m->lens[i] = len;
	m->values[i] = value;
	m->n++;
	return SCH_OK;
}

int sch_strmap_get(const struct sch_strmap *m, const char *key, size_t len)
{
	if (!m->cap)
		return -1;
	for (size_t i = hash(key, len) & (m->cap - 1); m->keys[i]; i = (i + 1) & (m->cap - 1)) {
		if (m->lens[i] == len && memcmp(m->keys[i], key, len) == 0)
			return m->values[i];
	}
	return -1;
}

void sch_strmap_release(struct sch_strmap *m)
{
	if (!m)
		return;
	free(m->keys);
	free(m->lens);
	free(m->values);
	memset(m, 0, sizeof(*m));
}
