/* SPDX-License-Identifier: BSD-3-Clause */
/* levers.c (cmd) - schrot levers: which design change buys the most SNR, and the best avalanche gain. */
#include <stdio.h>
#include <string.h>
#include <unistd.h>
#include "schrot/cmd.h"
#include "schrot/levers.h"

/* "schrot: levers 3/9 runs done" on one rewritten stderr line, erased after the last run. */
static void show_progress(void *progress_ctx, size_t done, size_t total)
{
	(void)progress_ctx;
	if (done < total)
		fprintf(stderr, "\r\033[Kschrot: levers %zu/%zu runs done", done, total);
	else
		fputs("\r\033[K", stderr);
	fflush(stderr);
}

static enum sch_err write_outputs(const struct sch_cli *cli, const struct sch_result *res, const struct sch_levers *lv,
				  struct sch_diag *d)
{
	enum sch_err ret = SCH_OK;

	if (cli->json_path && (ret = sch_report_levers_json(res, lv, cli->json_path, d)) != SCH_OK)
		return ret;
	if (cli->csv_path && (ret = sch_report_levers_csv(res, lv, cli->csv_path, d)) != SCH_OK)
		return ret;
	if (cli->plot_path && (ret = sch_report_levers_plot(lv, cli->plot_path, d)) != SCH_OK)
		return ret;
	if (cli->verbosity >= 0 && !(cli->json_path && strcmp(cli->json_path, "-") == 0))
		ret = sch_report_levers_table(res, lv, stdout);
	return ret;
}

int cmd_levers(int argc, char **argv, struct sch_ctx *ctx)
{
	struct sch_levers_options lo;
	struct sch_levers lv;
	struct sch_cli cli;
	struct sch_result res;
	bool jobs_given = false, done;
	enum sch_err ret;

	sch_result_init(&res);
	memset(&lv, 0, sizeof(lv));
	for (int i = 1; i < argc; i++)
		jobs_given |= strncmp(argv[i], "--jobs", 6) == 0;
	ret = sch_cmd_start(&cli, argc, argv, ctx, &done);
	if (ret != SCH_OK || done)
		goto out;
	if (!(cli.lever_factor > 1)) {
		ret = sch_diag_error(&ctx->diag, SCH_ERR_USAGE, NULL, 0,
				     "--factor needs a number above 1, not '%g' (try 'schrot levers --help')", cli.lever_factor);
		goto out;
	}
	if (cli.plot_path && cli.run.carriers.n_avalanche == 0) {
		ret = sch_diag_error(&ctx->diag, SCH_ERR_USAGE, NULL, 0,
				     "levers --plot draws SNR against avalanche gain: it needs an --avalanche rule "
				     "(try 'schrot levers --help')");
		goto out;
	}
	sch_levers_options_init(&lo);
	lo.factor = cli.lever_factor;
	lo.max_devices = cli.lever_max;
	if (!jobs_given)
		cli.run.n_workers = 2; /* both cores */
	cli.run.mode = SCH_RUN_REPORT;
	if (cli.verbosity >= 0 && isatty(STDERR_FILENO))
		cli.run.progress = show_progress; /* a pipe or a log file gets no progress lines */
	ret = sch_levers_find(cli.netlist, &cli.run, &lo, &res, &lv, &ctx->diag);
	if (ret != SCH_OK)
		goto out;
	ret = write_outputs(&cli, &res, &lv, &ctx->diag);
out:
	sch_result_release(&res);
	sch_cli_release(&cli);
	return sch_err_exit_code(ret);
}
