/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * fuzz_cli.c - libFuzzer target: the option parser, SPICE numbers and --carrier style regexes.
 * The input is split at newlines into argv (after the command name "report"); every argument is
 * also parsed as a SPICE number and a range, and a parsed --carrier/--ignore regex is compiled.
 */
#include <math.h>
#include <stddef.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/cli.h"
#include "schrot/pattern.h"
#include "schrot/si.h"

#define FUZZ_MAX_ARGS 64

static void try_pattern(const char *regex)
{
	struct sch_pattern *p = NULL;
	struct sch_diag d;
	size_t ov[6];

	if (!regex)
		return;
	sch_diag_init(&d, NULL, 0);
	if (sch_pattern_compile(&p, regex, SCH_PAT_CASELESS | SCH_PAT_WHOLE, "--carrier", &d) == SCH_OK) {
		(void)sch_pattern_match(p, "x1.iph", 6);
		(void)sch_pattern_search(p, regex, strlen(regex), 0, ov, 3);
	}
	sch_pattern_free(p);
}

static void try_number(const char *text, size_t n)
{
	double v = 0, lo, hi;
	char out[64];

	(void)sch_si_looks_numeric(text);
	if (sch_si_parse_n(text, n, &v) == SCH_OK) {
		if (!isfinite(v))
			abort(); /* the contract: non-finite results are rejected */
		sch_si_format(out, sizeof(out), v, (int)(n % 12), "V");
	}
	(void)sch_cli_parse_range(text, &lo, &hi);
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	char *copy = malloc(size + 1);
	char *argv[FUZZ_MAX_ARGS + 2];
	int argc = 0;
	struct sch_cli cli;
	struct sch_diag d;
	char *p;

	if (!copy)
		return 0;
	memcpy(copy, data, size);
	copy[size] = '\0';
	argv[argc++] = "report";
	for (p = copy; argc <= FUZZ_MAX_ARGS;) {
		char *nl = strchr(p, '\n');

		argv[argc++] = p;
		if (!nl)
			break;
		*nl = '\0';
		p = nl + 1;
	}
	argv[argc] = NULL;
	for (int i = 1; i < argc; i++)
		try_number(argv[i], strlen(argv[i]));
	/* sch_cli_parse may cut rule arguments at '=', so it runs after the number checks. */
	sch_diag_init(&d, NULL, 0);
	if (sch_cli_parse(&cli, argc, argv, &d) == SCH_OK) {
		try_pattern(cli.run.carriers.carrier_regex);
		try_pattern(cli.run.carriers.ignore_regex);
		for (size_t k = 0; k < cli.run.carriers.n_avalanche; k++)
			try_pattern(cli.avalanche[k].regex);
		sch_cli_release(&cli);
	}
	free(copy);
	return 0;
}
