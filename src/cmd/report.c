/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_report.c - schrot report: the main job, ranked noise contributions and the budget check. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "schrot/cmd.h"
#include "schrot/report.h"
#include "schrot/si.h"

int cmd_report(int argc, char **argv, struct sch_ctx *ctx)
{
	struct sch_cli cli;
	struct sch_result res;
	bool done;
	enum sch_err ret;

	sch_result_init(&res);
	ret = sch_cmd_start(&cli, argc, argv, ctx, &done);
	if (ret != SCH_OK || done)
		goto out;
	cli.run.mode = SCH_RUN_REPORT;
	ret = sch_analysis_run(cli.netlist, &cli.run, &res, &ctx->diag);
	if (ret != SCH_OK)
		goto out;
	if (!isnan(cli.budget_v) && res.spot_run) {
		/* a single-frequency run has a density, no rms to hold against a budget */
		ret = sch_diag_error(&ctx->diag, SCH_ERR_USAGE, res.netlist, 0,
				     "--budget needs a band: the noise run is a single-frequency spot run at %g Hz",
				     res.band_lo_hz);
		goto out;
	}
	/*
	 * A budget breach is a failed run: no output file is written, so a makefile whose targets are
	 * these files reruns the check next time instead of finding them up to date.
	 */
	if (isnan(cli.budget_v) || res.output_rms_v <= cli.budget_v) {
		ret = sch_cmd_write_outputs(&cli, &res, &ctx->diag);
		if (ret != SCH_OK)
			goto out;
	}
	if (cli.verbosity >= 0 && !(cli.json_path && strcmp(cli.json_path, "-") == 0))
		sch_report_table_split(&res, stdout, cli.show_corrections);
	if (!isnan(cli.budget_v) && res.output_rms_v > cli.budget_v) {
		char got[64], lim[64], over[64];
		sch_si_format(got, sizeof(got), res.output_rms_v, 4, "V");
		sch_si_format(lim, sizeof(lim), cli.budget_v, 4, "V");
		sch_si_format(over, sizeof(over), res.output_rms_v - cli.budget_v, 3, "V");
		ret = sch_diag_error(&ctx->diag, SCH_ERR_CHECK, res.netlist, 0,
				     "output noise %s rms over %g:%g Hz exceeds the budget %s rms by %s (%.1f %%)", got,
				     res.band_lo_hz, res.band_hi_hz, lim, over,
				     100.0 * (res.output_rms_v - cli.budget_v) / cli.budget_v);
	}
out:
	sch_result_release(&res);
	sch_cli_release(&cli);
	return sch_err_exit_code(ret);
}
