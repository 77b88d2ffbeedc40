/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_sweep.c - schrot sweep: repeat the noise run over a level and find the shot-noise crossover. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include "schrot/cmd.h"
#include "schrot/outfile.h"
#include "schrot/report.h"
#include "schrot/si.h"

#define SWEEP_MAX_POINTS 10000

/* NAME=START:STOP:N[:lin] into name and values (log spacing over more than a decade unless :lin). */
static enum sch_err parse_vary(const char *text, char *name, size_t name_size, double **values, size_t *n,
			       struct sch_diag *d)
{
	char buf[512];
	char *eq, *fields[4];
	int n_fields = 0;
	double start, stop, count;
	bool lin = false;

	snprintf(buf, sizeof(buf), "%s", text);
	eq = strrchr(buf, '=');
	if (!eq || eq == buf)
		goto bad;
	*eq = '\0';
	snprintf(name, name_size, "%.200s", buf);
	for (char *p = name; *p; p++)
		*p = (char)(*p >= 'A' && *p <= 'Z' ? *p - 'A' + 'a' : *p);
	for (char *p = strtok(eq + 1, ":"); p && n_fields < 4; p = strtok(NULL, ":"))
		fields[n_fields++] = p;
	if (n_fields == 4 && strcmp(fields[3], "lin") == 0)
		lin = true;
	else if (n_fields != 3)
		goto bad;
	if (sch_si_parse(fields[0], &start) != SCH_OK || sch_si_parse(fields[1], &stop) != SCH_OK ||
	    sch_si_parse(fields[2], &count) != SCH_OK || count < 2 || count > SWEEP_MAX_POINTS || count != floor(count) ||
	    start == stop)
		goto bad;
	*n = (size_t)count;
	*values = malloc(*n * sizeof(double));
	if (!*values)
		return SCH_ERR_NOMEM;
	if (!lin && start > 0 && stop > 0 && (stop / start > 10 || start / stop > 10))
		for (size_t k = 0; k < *n; k++)
			(*values)[k] = start * pow(stop / start, (double)k / (double)(*n - 1));
	else
		for (size_t k = 0; k < *n; k++)
			(*values)[k] = start + (stop - start) * (double)k / (double)(*n - 1);
	return SCH_OK;
bad:
	return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
			      "--vary needs NAME=START:STOP:N[:lin] with N from 2 to %d, not '%s' (try 'schrot --help')",
			      SWEEP_MAX_POINTS, text);
}

/* "schrot: sweep 3/9 points done" on one rewritten stderr line, erased after the last point. */
static void show_progress(void *progress_ctx, size_t done, size_t total)
{
	(void)progress_ctx;
	if (done < total)
		fprintf(stderr, "\r\033[Kschrot: sweep %zu/%zu points done", done, total);
	else
		fputs("\r\033[K", stderr);
	fflush(stderr);
}

/*
 * Narrows values to shard K/N of the points, [n(K-1)/N, nK/N), so that the shards cover the sweep
 * once whatever N. A shard of one point runs it twice (a sweep needs two steps; both cores take
 * one each, so it costs one point's time) and keeps the first.
 */
static enum sch_err take_shard(const struct sch_cli *cli, double **values, size_t *n, struct sch_sweep_shard *shard,
			       struct sch_diag *d)
{
	size_t first = *n * (size_t)(cli->shard_k - 1) / (size_t)cli->shard_n;
	size_t end = *n * (size_t)cli->shard_k / (size_t)cli->shard_n;
	double *mine;

	if (!cli->json_path)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "--shard needs '--json FILE' for its partial result (try 'schrot --help')");
	if ((size_t)cli->shard_n > *n)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "--shard %d/%d: more shards than the %zu points of the sweep",
				      cli->shard_k, cli->shard_n, *n);
	mine = malloc(2 * sizeof(*mine) + (end - first) * sizeof(*mine));
	if (!mine)
		return SCH_ERR_NOMEM;
	memcpy(mine, *values + first, (end - first) * sizeof(*mine));
	if (end - first == 1)
		mine[1] = mine[0];
	shard->index = cli->shard_k;
	shard->count = cli->shard_n;
	shard->first = first;
	shard->n_total = *n;
	free(*values);
	*values = mine;
	*n = end - first == 1 ? 2 : end - first;
	return SCH_OK;
}

/* The point with the largest output rms; NULL for an empty sweep. */
static const struct sch_sweep_point *worst_point(const struct sch_sweep *s)
{
	const struct sch_sweep_point *w = NULL;
	for (size_t k = 0; k < s->n_points; k++) {
		if (!w || s->points[k].output_rms_v > w->output_rms_v)
			w = &s->points[k];
	}
	return w;
}

/* "output noise 61.2 µV rms at iph = 1.00 µA (the worst of 9 points, 3 over) exceeds the budget ..." */
static enum sch_err budget_breach(const struct sch_cli *cli, const struct sch_result *res, const struct sch_sweep *s,
				  const struct sch_sweep_point *worst, struct sch_diag *d)
{
	char got[64], lim[64], over[64], at[64];
	size_t n_over = 0;

	for (size_t k = 0; k < s->n_points; k++)
		n_over += s->points[k].output_rms_v > cli->budget_v;
	sch_si_format(got, sizeof(got), worst->output_rms_v, 4, "V");
	sch_si_format(lim, sizeof(lim), cli->budget_v, 4, "V");
	sch_si_format(over, sizeof(over), worst->output_rms_v - cli->budget_v, 3, "V");
	if (strcmp(s->unit, "C") == 0)
		snprintf(at, sizeof(at), "%.2f °C", worst->value);
	else
		sch_si_format(at, sizeof(at), worst->value, 4, s->unit);
	return sch_diag_error(d, SCH_ERR_CHECK, res->netlist, 0,
			      "output noise %s rms over %g:%g Hz at %s = %s (the worst of %zu points, %zu over) exceeds "
			      "the budget %s rms by %s (%.1f %%)",
			      got, res->band_lo_hz, res->band_hi_hz, s->name, at, s->n_points, n_over, lim, over,
			      100.0 * (worst->output_rms_v - cli->budget_v) / cli->budget_v);
}

/* JSON, CSV, plot and the depfile naming them, all or none. */
static enum sch_err write_outputs(const struct sch_cli *cli, const struct sch_result *res, const struct sch_sweep *s,
				  struct sch_diag *d)
{
	enum sch_err ret = SCH_OK, end;

	sch_outfile_batch_begin();
	if (cli->json_path)
		ret = sch_report_sweep_json(res, s, cli->json_path, d);
	if (ret == SCH_OK && cli->csv_path)
		ret = sch_report_sweep_csv(res, s, cli->csv_path, d);
	if (ret == SCH_OK && cli->plot_path)
		ret = sch_report_sweep_plot(s, cli->plot_path, d);
	if (ret == SCH_OK && cli->depfile_path)
		ret = sch_cmd_write_depfile(cli, res, d);
	end = sch_outfile_batch_end(ret == SCH_OK, d);
	return ret != SCH_OK ? ret : end;
}

/* A shard's partial JSON and the depfile naming it, both or neither. */
static enum sch_err write_shard(const struct sch_cli *cli, const struct sch_result *res, const struct sch_sweep *s,
				const struct sch_sweep_shard *shard, struct sch_diag *d)
{
	enum sch_err ret, end;

	sch_outfile_batch_begin();
	ret = sch_report_sweep_partial_json(res, s, shard, cli->json_path, d);
	if (ret == SCH_OK && cli->depfile_path)
		ret = sch_cmd_write_depfile(cli, res, d);
	end = sch_outfile_batch_end(ret == SCH_OK, d);
	return ret != SCH_OK ? ret : end;
}

enum sch_err sch_cmd_sweep_finish(const struct sch_cli *cli, const struct sch_result *res, const struct sch_sweep *s,
				  struct sch_diag *d)
{
	const struct sch_sweep_point *worst = worst_point(s);
	bool over = !isnan(cli->budget_v) && worst && worst->output_rms_v > cli->budget_v;
	enum sch_err ret = SCH_OK;

	/* as in report: a breach writes no output file, so make reruns the check next time */
	if (!over && (ret = write_outputs(cli, res, s, d)) != SCH_OK)
		return ret;
	if (cli->verbosity >= 0 && !(cli->json_path && strcmp(cli->json_path, "-") == 0))
		ret = sch_report_sweep_table(res, s, stdout);
	if (over)
		ret = budget_breach(cli, res, s, worst, d);
	return ret;
}

int cmd_sweep(int argc, char **argv, struct sch_ctx *ctx)
{
	struct sch_sweep_shard shard = { 0, 0, 0, 0 };
	struct sch_cli cli;
	struct sch_result res;
	struct sch_sweep sweep;
	double *values = NULL;
	size_t n = 0;
	char name[256];
	const struct sch_sweep_point *worst;
	bool jobs_given = false;
	bool done;
	enum sch_err ret;

	sch_result_init(&res);
	for (int i = 1; i < argc; i++)
		jobs_given |= strncmp(argv[i], "--jobs", 6) == 0;
	ret = sch_cmd_start(&cli, argc, argv, ctx, &done);
	if (ret != SCH_OK || done)
		goto out;
	if (!cli.vary) {
		ret = sch_diag_error(&ctx->diag, SCH_ERR_USAGE, NULL, 0, "sweep needs --vary NAME=START:STOP:N (try 'schrot --help')");
		goto out;
	}
	if ((ret = parse_vary(cli.vary, name, sizeof(name), &values, &n, &ctx->diag)) != SCH_OK)
		goto out;
	if (!jobs_given)
		cli.run.n_workers = 2; /* both cores */
	cli.run.mode = SCH_RUN_REPORT;
	if (cli.shard_n && (cli.csv_path || cli.plot_path)) {
		ret = sch_diag_error(&ctx->diag, SCH_ERR_USAGE, NULL, 0,
				     "--csv and --plot show the whole sweep: give them to 'schrot merge', not to a shard");
		goto out;
	}
	if (cli.shard_n && (ret = take_shard(&cli, &values, &n, &shard, &ctx->diag)) != SCH_OK)
		goto out;
	if (cli.verbosity >= 0 && isatty(STDERR_FILENO))
		cli.run.progress = show_progress; /* a pipe or a log file gets no progress lines */
	ret = sch_analysis_sweep(cli.netlist, &cli.run, name, values, n, &res, &sweep, &ctx->diag);
	if (cli.run.progress)
		show_progress(NULL, n, n); /* erases the line when the sweep stopped early */
	if (ret != SCH_OK)
		goto out;
	if (cli.shard_n) {
		if (shard.n_total * (size_t)shard.index / (size_t)shard.count - shard.first == 1)
			sweep.n_points = 1; /* the shard's one point was run twice; keep it once */
		worst = worst_point(&sweep);
		if (!isnan(cli.budget_v) && worst && worst->output_rms_v > cli.budget_v)
			ret = budget_breach(&cli, &res, &sweep, worst, &ctx->diag);
		else
			ret = write_shard(&cli, &res, &sweep, &shard, &ctx->diag);
		goto out;
	}
	ret = sch_cmd_sweep_finish(&cli, &res, &sweep, &ctx->diag);
out:
	free(values);
	sch_result_release(&res);
	sch_cli_release(&cli);
	return sch_err_exit_code(ret);
}
