/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_arrivals.c - schrot arrivals: a time-domain Poisson realisation of the carriers, window by window. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "schrot/arrivals.h"
#include "schrot/cmd.h"
#include "schrot/outfile.h"

/* JSON, CSV, plot and the depfile naming them, all or none. */
static enum sch_err write_outputs(const struct sch_cli *cli, const struct sch_arrivals *a, struct sch_diag *d)
{
	enum sch_err ret = SCH_OK, end;

	sch_outfile_batch_begin();
	if (cli->json_path)
		ret = sch_report_arrivals_json(a, cli->json_path, d);
	if (ret == SCH_OK && cli->csv_path)
		ret = sch_report_arrivals_csv(a, cli->csv_path, d);
	if (ret == SCH_OK && cli->plot_path)
		ret = sch_report_arrivals_plot(a, cli->plot_path, d);
	if (ret == SCH_OK && cli->depfile_path)
		ret = sch_cmd_write_depfile(cli, &a->op, d);
	end = sch_outfile_batch_end(ret == SCH_OK, d);
	return ret != SCH_OK ? ret : end;
}

int cmd_arrivals(int argc, char **argv, struct sch_ctx *ctx)
{
	struct sch_cli cli;
	struct sch_arrivals res;
	struct sch_arrivals_options opt;
	bool done;
	enum sch_err ret;

	sch_arrivals_init(&res);
	ret = sch_cmd_start(&cli, argc, argv, ctx, &done);
	if (ret != SCH_OK || done)
		goto out;
	if (isnan(cli.window_s)) {
		ret = sch_diag_error(&ctx->diag, SCH_ERR_USAGE, NULL, 0, "arrivals needs --window T (try 'schrot arrivals --help')");
		goto out;
	}
	if ((cli.n_windows > 0) == !isnan(cli.duration_s)) {
		ret = sch_diag_error(&ctx->diag, SCH_ERR_USAGE, NULL, 0,
				     "arrivals needs exactly one of --duration D and --windows N (try 'schrot arrivals --help')");
		goto out;
	}
	memset(&opt, 0, sizeof(opt));
	opt.window_s = cli.window_s;
	opt.n_windows = cli.n_windows > 0 ? (size_t)cli.n_windows
					  : (size_t)fmin(floor(cli.duration_s / cli.window_s * (1 + 1e-12)), 1e8);
	opt.step_s = cli.step_s;
	opt.settle_s = cli.settle_s;
	opt.seed = cli.seed_given ? (uint64_t)cli.seed : SCH_ARRIVALS_DEFAULT_SEED;
	ret = sch_arrivals_run(cli.netlist, &cli.run, &opt, &res, &ctx->diag);
	if (ret != SCH_OK)
		goto out;
	if ((ret = write_outputs(&cli, &res, &ctx->diag)) != SCH_OK)
		goto out;
	if (cli.verbosity >= 0 && !(cli.json_path && strcmp(cli.json_path, "-") == 0))
		ret = sch_report_arrivals_table(&res, stdout);
out:
	sch_arrivals_release(&res);
	sch_cli_release(&cli);
	return sch_err_exit_code(ret);
}
