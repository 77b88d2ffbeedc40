/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_merge.c - schrot merge: joins the partial JSON files of sweep --shard K/N into one sweep. */
#include <stdio.h>
#include <string.h>
#include "schrot/cmd.h"
#include "schrot/report.h"

int cmd_merge(int argc, char **argv, struct sch_ctx *ctx)
{
	struct sch_cli cli;
	struct sch_result res;
	struct sch_sweep sweep;
	bool done;
	enum sch_err ret;

	sch_result_init(&res);
	ret = sch_cmd_start(&cli, argc, argv, ctx, &done);
	if (ret != SCH_OK || done)
		goto out;
	if ((ret = sch_report_sweep_merge(cli.files, cli.n_files, &res, &sweep, &ctx->diag)) != SCH_OK)
		goto out;
	ret = sch_cmd_sweep_finish(&cli, &res, &sweep, &ctx->diag);
out:
	sch_result_release(&res);
	sch_cli_release(&cli);
	return sch_err_exit_code(ret);
}
