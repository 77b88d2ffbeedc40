/* SPDX-License-Identifier: BSD-3-Clause */
/* pattern_pcre2.c - the PCRE2 adapter behind pattern.h; the only file that knows PCRE2. */
#define PCRE2_CODE_UNIT_WIDTH 8
#include <pcre2.h>
#include <stdint.h>
#include <stdlib.h>
#include "schrot/pattern.h"

struct sch_pattern {
	pcre2_code *code;
};

enum sch_err sch_pattern_compile(struct sch_pattern **out, const char *regex, unsigned flags,
				 const char *what, struct sch_diag *d)
{
	enum sch_err ret = SCH_ERR_NOMEM;
	struct sch_pattern *p = NULL;
	uint32_t options = PCRE2_UTF | PCRE2_MATCH_INVALID_UTF;
	int code = 0;
	PCRE2_SIZE offset = 0;

	*out = NULL;
	if (!regex) {
		ret = sch_diag_error(d, SCH_ERR_INPUT, NULL, 0, "bad regex for %s: none given",
				     what ? what : "pattern");
		goto out;
	}
	p = calloc(1, sizeof(*p));
	if (!p)
		goto out;
	if (flags & SCH_PAT_CASELESS)
		options |= PCRE2_CASELESS;
	if (flags & SCH_PAT_WHOLE)
		options |= PCRE2_ANCHORED | PCRE2_ENDANCHORED;
	p->code = pcre2_compile((PCRE2_SPTR)regex, PCRE2_ZERO_TERMINATED, options, &code, &offset, NULL);
	if (!p->code) {
		PCRE2_UCHAR reason[256];

		if (pcre2_get_error_message(code, reason, sizeof(reason)) < 0)
			reason[0] = '\0';
		ret = sch_diag_error(d, SCH_ERR_INPUT, NULL, 0, "bad regex '%s' for %s: %s at offset %zu",
				     regex, what ? what : "pattern", (const char *)reason, (size_t)offset);
		goto out;
	}
	*out = p;
	p = NULL;
	ret = SCH_OK;
out:
	sch_pattern_free(p);
	return ret;
}

/* Match data is made per call so that one compiled pattern can be used from several threads. */
static int run(const struct sch_pattern *p, const char *subject, size_t n, size_t start,
	       pcre2_match_data *md)
{
	if (!p || !subject || start > n || !md)
		return -1;
	return pcre2_match(p->code, (PCRE2_SPTR)subject, n, start, 0, md, NULL);
}

bool sch_pattern_match(const struct sch_pattern *p, const char *subject, size_t n)
{
	pcre2_match_data *md = p ? pcre2_match_data_create(1, NULL) : NULL;
	int rc = run(p, subject, n, 0, md);

	pcre2_match_data_free(md);
	return rc >= 0;
}

bool sch_pattern_search(const struct sch_pattern *p, const char *subject, size_t n, size_t start,
			size_t *ovec, size_t n_pairs)
{
	pcre2_match_data *md = p ? pcre2_match_data_create_from_pattern(p->code, NULL) : NULL;
	int rc = run(p, subject, n, start, md);
	PCRE2_SIZE *v;
	uint32_t have;

	if (rc < 0) {
		pcre2_match_data_free(md);
		return false;
	}
	v = pcre2_get_ovector_pointer(md);
	have = pcre2_get_ovector_count(md);
	for (size_t i = 0; i < n_pairs && ovec; i++) {
		/* Groups past rc did not take part in the match; PCRE2 marks unset ones PCRE2_UNSET. */
		if (i < have && i < (size_t)rc && v[2 * i] != PCRE2_UNSET) {
			ovec[2 * i] = v[2 * i];
			ovec[2 * i + 1] = v[2 * i + 1];
		} else {
			ovec[2 * i] = SIZE_MAX;
			ovec[2 * i + 1] = SIZE_MAX;
		}
	}
	pcre2_match_data_free(md);
	return true;
}

void sch_pattern_free(struct sch_pattern *p)
{
	if (!p)
		return;
	pcre2_code_free(p->code);
	free(p);
}
