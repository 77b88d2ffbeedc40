/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_carriers.c - schrot carriers: which currents carry shot noise, why, and their DC values. */
#include <stdio.h>
#include <string.h>
#include "schrot/cmd.h"
#include "schrot/report.h"

int cmd_carriers(int argc, char **argv, struct sch_ctx *ctx)
{
	struct sch_cli cli;
	struct sch_result res;
	bool done;
	enum sch_err ret;

	sch_result_init(&res);
	ret = sch_cmd_start(&cli, argc, argv, ctx, &done);
	if (ret != SCH_OK || done)
		goto out;
	cli.run.mode = SCH_RUN_OP;
	ret = sch_analysis_run(cli.netlist, &cli.run, &res, &ctx->diag);
	if (ret != SCH_OK)
		goto out;
	ret = sch_cmd_write_outputs(&cli, &res, &ctx->diag);
	if (ret != SCH_OK)
		goto out;
	if (cli.verbosity >= 0 && !(cli.json_path && strcmp(cli.json_path, "-") == 0))
		sch_report_carriers_table(&res, stdout);
out:
	sch_result_release(&res);
	sch_cli_release(&cli);
	return sch_err_exit_code(ret);
}
