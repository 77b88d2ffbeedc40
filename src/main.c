/* SPDX-License-Identifier: BSD-3-Clause */
/* main.c - init, dispatch to the command table, cleanup. */
#include <stdio.h>
#include <string.h>
#include "schrot/cmd.h"
#include "schrot/err.h"
#include "schrot/leftover.h"

struct cmd_entry {
	const char *name;
	int (*fn)(int argc, char **argv, struct sch_ctx *ctx);
};

static const struct cmd_entry commands[] = {
	{ "report", cmd_report },
	{ "carriers", cmd_carriers },
	{ "sweep", cmd_sweep },
	{ "augment", cmd_augment },
	{ "arrivals", cmd_arrivals },
	{ "levers", cmd_levers },
	{ "merge", cmd_merge },
};

int main(int argc, char **argv)
{
	struct sch_ctx ctx;
	int code = SCH_EXIT_INPUT;

	sch_diag_init(&ctx.diag, stderr, 0);
	sch_leftover_install();
	if (argc < 2) {
		fprintf(stderr, "schrot: error: no command given (try 'schrot --help')\n");
		return SCH_EXIT_INPUT;
	}
	if (strcmp(argv[1], "--help") == 0 || strcmp(argv[1], "-h") == 0 || strcmp(argv[1], "help") == 0) {
		sch_cmd_print_help(stdout);
		code = SCH_EXIT_OK;
	} else if (strcmp(argv[1], "--version") == 0) {
		printf("schrot %s\n", SCH_VERSION);
		code = SCH_EXIT_OK;
	} else {
		size_t k;
		for (k = 0; k < sizeof(commands) / sizeof(commands[0]); k++) {
			if (strcmp(argv[1], commands[k].name) == 0)
				break;
		}
		if (k == sizeof(commands) / sizeof(commands[0]))
			sch_diag_error(&ctx.diag, SCH_ERR_USAGE, NULL, 0, "unknown command '%s' (try 'schrot --help')",
				       argv[1]);
		else
			code = commands[k].fn(argc - 1, argv + 1, &ctx);
	}
	/* every failure reports itself through diag except a failed allocation, which has no room to */
	if (code == SCH_EXIT_INPUT && ctx.diag.n_errors == 0)
		fputs("schrot: error: out of memory\n", stderr);
	if (fflush(stdout) != 0 || ferror(stdout)) {
		fprintf(stderr, "schrot: error: could not write the standard output\n");
		if (code == SCH_EXIT_OK)
			code = SCH_EXIT_INPUT;
	}
	return code;
}
