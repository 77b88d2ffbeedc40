/* SPDX-License-Identifier: BSD-3-Clause */
/* test_si.c - SPICE number syntax and SI-prefixed formatting. */
#include <math.h>
#include "check.h"
#include "schrot/si.h"

static double parsed(const char *s)
{
	double v = NAN;
	return sch_si_parse(s, &v) == SCH_OK ? v : NAN;
}

static void test_si__reads_engineering_suffixes(void)
{
	CHECK_REL(parsed("1MEG"), 1e6, 1e-15);
	CHECK_REL(parsed("1meg"), 1e6, 1e-15);
	CHECK_REL(parsed("10pF"), 10e-12, 1e-15);
	CHECK_REL(parsed("2.2k"), 2200, 1e-15);
	CHECK_REL(parsed("1m"), 1e-3, 1e-15);
	CHECK_REL(parsed("1M"), 1e-3, 1e-15); /* SPICE: M is milli, not mega */
	CHECK_REL(parsed("3u"), 3e-6, 1e-15);
	CHECK_REL(parsed("4n"), 4e-9, 1e-15);
	CHECK_REL(parsed("5f"), 5e-15, 1e-15);
	CHECK_REL(parsed("1g"), 1e9, 1e-15);
	CHECK_REL(parsed("1t"), 1e12, 1e-15);
	CHECK_REL(parsed("1mil"), 25.4e-6, 1e-15);
	CHECK_REL(parsed("-1.5e-3"), -1.5e-3, 1e-15);
	CHECK_REL(parsed(".5"), 0.5, 1e-15);
	CHECK_REL(parsed("1kohm"), 1e3, 1e-15);
	CHECK_REL(parsed("50u"), 50e-6, 1e-15);
	CHECK_REL(parsed("10V"), 10, 1e-15);
}

static void test_si__rejects_malformed_numbers(void)
{
	double v = 42;
	CHECK(sch_si_parse("1.2.3", &v) == SCH_ERR_INPUT);
	CHECK(sch_si_parse("1e", &v) == SCH_ERR_INPUT);
	CHECK(sch_si_parse("abc", &v) == SCH_ERR_INPUT);
	CHECK(sch_si_parse("", &v) == SCH_ERR_INPUT);
	CHECK(sch_si_parse("1k2", &v) == SCH_ERR_INPUT);
	CHECK(sch_si_parse("1e999", &v) == SCH_ERR_INPUT);
	CHECK(sch_si_parse("-", &v) == SCH_ERR_INPUT);
	CHECK(v == 42);
}

static void test_si__formats_with_prefixes(void)
{
	char buf[64];
	CHECK_STR(sch_si_format(buf, sizeof(buf), 12.3e-9, 3, "A"), "12.3 nA");
	CHECK_STR(sch_si_format(buf, sizeof(buf), 566.07e-15, 3, "A/√Hz"), "566 fA/√Hz");
	CHECK_STR(sch_si_format(buf, sizeof(buf), 999.96, 3, "V"), "1.00 kV");
	CHECK_STR(sch_si_format(buf, sizeof(buf), -2e-6, 3, "A"), "-2.00 µA");
	CHECK_STR(sch_si_format(buf, sizeof(buf), 0, 3, "V"), "0 V");
	CHECK_STR(sch_si_format(buf, sizeof(buf), 1e5, 3, "Hz"), "100 kHz");
	CHECK_STR(sch_si_format(buf, sizeof(buf), 99.96e3, 3, "Hz"), "100 kHz");
	CHECK_STR(sch_si_format(buf, sizeof(buf), 1.0, 3, "Hz"), "1.00 Hz");
	CHECK_STR(sch_si_format(buf, sizeof(buf), 9.9999, 3, "V"), "10.0 V");
	CHECK_STR(sch_si_format(buf, sizeof(buf), NAN, 3, "V"), "-");
}

CHECK_MAIN(CASE(test_si__reads_engineering_suffixes), CASE(test_si__rejects_malformed_numbers),
	   CASE(test_si__formats_with_prefixes))
