/* SPDX-License-Identifier: BSD-3-Clause */
/* test_pattern.c - unit tests of the regular-expression adapter behind pattern.h. */
#include <stdint.h>
#include <string.h>
#include "check.h"
#include "schrot/pattern.h"

static struct sch_pattern *compile(const char *re, unsigned flags)
{
	struct sch_pattern *p = NULL;
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	CHECK(sch_pattern_compile(&p, re, flags, "--carrier", &d) == SCH_OK);
	CHECK(p != NULL);
	CHECK(d.n_errors == 0);
	return p;
}

static bool matches(const struct sch_pattern *p, const char *s)
{
	return sch_pattern_match(p, s, strlen(s));
}

static void test_pattern__matches_anywhere_by_default(void)
{
	struct sch_pattern *p = compile("ph", 0);

	CHECK(matches(p, "iph"));
	CHECK(matches(p, "x1.iphoto"));
	CHECK(!matches(p, "IPH"));
	CHECK(!matches(p, "ibias"));
	sch_pattern_free(p);
}

static void test_pattern__caseless_ignores_case(void)
{
	struct sch_pattern *p = compile("^i(ph|pd|photo|dark|leak)", SCH_PAT_CASELESS);

	CHECK(matches(p, "IPHOTO"));
	CHECK(matches(p, "iDark"));
	CHECK(!matches(p, "rleak"));
	sch_pattern_free(p);
}

static void test_pattern__whole_anchors_both_ends(void)
{
	struct sch_pattern *p = compile("x1\\.i.*", SCH_PAT_WHOLE | SCH_PAT_CASELESS);
	struct sch_pattern *alt = compile("iph|ileak", SCH_PAT_WHOLE);

	CHECK(matches(p, "x1.iph"));
	CHECK(matches(p, "X1.IPH"));
	CHECK(!matches(p, "xrx.x1.iph"));
	CHECK(matches(alt, "ileak"));
	CHECK(!matches(alt, "iphx"));
	CHECK(!matches(alt, "xileak"));
	sch_pattern_free(p);
	sch_pattern_free(alt);
}

static void test_pattern__match_uses_only_n_bytes(void)
{
	struct sch_pattern *p = compile("^iph$", 0);

	CHECK(sch_pattern_match(p, "iphoto", 3));
	CHECK(!sch_pattern_match(p, "iphoto", 4));
	sch_pattern_free(p);
}

static void test_pattern__search_reports_captures_and_unset_groups(void)
{
	struct sch_pattern *p = compile("(\\d+)(k)?(meg)?", SCH_PAT_CASELESS);
	size_t ov[8];
	const char *s = "r1 a b 10MEG";

	CHECK(sch_pattern_search(p, s, strlen(s), 2, ov, 4));
	CHECK(ov[0] == 7 && ov[1] == 12);
	CHECK(ov[2] == 7 && ov[3] == 9);
	CHECK(ov[4] == SIZE_MAX && ov[5] == SIZE_MAX);
	CHECK(ov[6] == 9 && ov[7] == 12);
	CHECK(sch_pattern_search(p, s, strlen(s), 0, ov, 1));
	CHECK(ov[0] == 1 && ov[1] == 2);
	CHECK(!sch_pattern_search(p, "abc", 3, 0, ov, 1));
	CHECK(!sch_pattern_search(p, "abc", 3, 9, ov, 1));
	sch_pattern_free(p);
}

static void test_pattern__search_with_more_pairs_than_groups(void)
{
	struct sch_pattern *p = compile("a(b)", 0);
	size_t ov[6];

	CHECK(sch_pattern_search(p, "xab", 3, 0, ov, 3));
	CHECK(ov[0] == 1 && ov[1] == 3 && ov[2] == 2 && ov[3] == 3);
	CHECK(ov[4] == SIZE_MAX && ov[5] == SIZE_MAX);
	sch_pattern_free(p);
}

static void test_pattern__reports_bad_regex_with_offset(void)
{
	struct sch_pattern *p = (struct sch_pattern *)&p;
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	CHECK(sch_pattern_compile(&p, "i(ph", SCH_PAT_CASELESS, "--carrier", &d) == SCH_ERR_INPUT);
	CHECK(p == NULL);
	CHECK(d.n_errors == 1);
	CHECK(strstr(d.first_error, "bad regex 'i(ph'") != NULL);
	CHECK(strstr(d.first_error, "--carrier") != NULL);
	CHECK(strstr(d.first_error, "missing closing parenthesis") != NULL);
	CHECK(strstr(d.first_error, "at offset 4") != NULL);
	CHECK(d.first_error[strlen(d.first_error) - 1] != '.');
}

static void test_pattern__null_pattern_never_matches(void)
{
	size_t ov[2] = { 0, 0 };

	CHECK(!sch_pattern_match(NULL, "x", 1));
	CHECK(!sch_pattern_search(NULL, "x", 1, 0, ov, 1));
	sch_pattern_free(NULL);
}

static void test_pattern__matches_invalid_utf8_subjects_without_failing(void)
{
	struct sch_pattern *p = compile("leak", SCH_PAT_CASELESS);

	CHECK(matches(p, "\xff" "leak"));
	CHECK(!matches(p, "\xc3"));
	sch_pattern_free(p);
}

CHECK_MAIN(CASE(test_pattern__matches_anywhere_by_default), CASE(test_pattern__caseless_ignores_case),
	   CASE(test_pattern__whole_anchors_both_ends), CASE(test_pattern__match_uses_only_n_bytes),
	   CASE(test_pattern__search_reports_captures_and_unset_groups),
	   CASE(test_pattern__search_with_more_pairs_than_groups), CASE(test_pattern__reports_bad_regex_with_offset),
	   CASE(test_pattern__null_pattern_never_matches),
	   CASE(test_pattern__matches_invalid_utf8_subjects_without_failing))
