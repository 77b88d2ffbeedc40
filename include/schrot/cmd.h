/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * cmd.h - the subcommands. Adding a command takes four steps:
 *   1. write src/cmd/<name>.c defining int cmd_<name>(int argc, char **argv, struct sch_ctx *ctx);
 *   2. declare it below;
 *   3. add a row to the commands[] table in src/main.c (and a CLI test case under tests/cli/);
 *   4. add its usage to commands[] in src/cmd/cli.c and its bit to every row of options[] there
 *      that it honours (the others are refused, and its --help lists exactly those).
 * A command only parses its options, calls sch_analysis_run and chooses outputs.
 */
#ifndef SCH_CMD_H
#define SCH_CMD_H

#include <stdbool.h>
#include <stdio.h>
#include "schrot/cli.h"
#include "schrot/diag.h"

struct sch_ctx {
	struct sch_diag diag;
};

/* Each returns a process exit code (enum sch_exit). argv[0] is the command name. */
int cmd_report(int argc, char **argv, struct sch_ctx *ctx);
int cmd_carriers(int argc, char **argv, struct sch_ctx *ctx);
int cmd_augment(int argc, char **argv, struct sch_ctx *ctx);
int cmd_sweep(int argc, char **argv, struct sch_ctx *ctx);
int cmd_arrivals(int argc, char **argv, struct sch_ctx *ctx);
int cmd_levers(int argc, char **argv, struct sch_ctx *ctx);
/* merge takes partial sweep JSON files, not a netlist: schrot merge PART.json... [--json OUT] */
int cmd_merge(int argc, char **argv, struct sch_ctx *ctx);

/* Writes every output file the options ask for (json, csv, spectrum, plot, html, depfile). */
enum sch_err sch_cmd_write_outputs(const struct sch_cli *cli, const struct sch_result *res, struct sch_diag *d);

/*
 * Writes cli->depfile_path: every output file cli names (not '-') depends on every file res's
 * netlist read. SCH_ERR_USAGE when cli names no output file; errors of sch_report_depfile.
 */
enum sch_err sch_cmd_write_depfile(const struct sch_cli *cli, const struct sch_result *res, struct sch_diag *d);

/*
 * The end of a whole sweep (sweep, and merge of its shards): unless a point's output rms exceeds
 * cli->budget_v, the JSON, CSV, plot and depfile cli asks for (all or none); the table unless
 * quiet or JSON on stdout; SCH_ERR_CHECK naming the worst point when over the budget, else the
 * writers' errors.
 */
enum sch_err sch_cmd_sweep_finish(const struct sch_cli *cli, const struct sch_result *res, const struct sch_sweep *s,
				  struct sch_diag *d);

/* Prints the help text of the whole tool to out. */
void sch_cmd_print_help(FILE *out);

/*
 * The start every command shares: parses argv into cli, prints the command's own help (from the
 * option table in cli.c) and sets *done when --help was given, and applies -q/-v to the
 * diagnostics. Returns SCH_ERR_USAGE for bad options, options the command does not use (message
 * printed) and SCH_ERR_NOMEM. cli must be released in every case.
 */
enum sch_err sch_cmd_start(struct sch_cli *cli, int argc, char **argv, struct sch_ctx *ctx, bool *done);

#endif
