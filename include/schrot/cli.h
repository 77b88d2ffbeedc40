/* SPDX-License-Identifier: BSD-3-Clause */
/* cli.h - the options every command shares, parsed into run options and output choices. */
#ifndef SCH_CLI_H
#define SCH_CLI_H

#include <stdbool.h>
#include <stdio.h>
#include "schrot/analysis.h"
#include "schrot/diag.h"

#define SCH_MAX_SPOTS 32
#define SCH_MAX_RULES 16

struct sch_cli {
	const char *command;           /* "report", "carriers", ... */
	const char *netlist;           /* merge: the first of files */
	const char **files;            /* merge: every positional argument, n_files of them; owned */
	size_t n_files;
	struct sch_run_options run;
	const char *json_path, *csv_path, *spectrum_path, *plot_path, *html_path, *depfile_path, *out_path;
	double budget_v;               /* NaN: no budget */
	int top_n;                     /* spectrum columns */
	int verbosity;                 /* -1 quiet, 0, 1 verbose */
	double spots[SCH_MAX_SPOTS];
	struct sch_gain_rule avalanche[SCH_MAX_RULES];
	struct sch_gain_rule fano[SCH_MAX_RULES];
	const char *vary;              /* sweep: NAME=START:STOP:N[:lin] */
	int lever_max;                 /* levers --max */
	double lever_factor;           /* levers --factor (> 1) */
	int shard_k, shard_n;          /* sweep --shard K/N: this run's share of the points; 0/0: all */
	/* arrivals */
	double window_s;               /* --window; NaN: not given */
	double duration_s;             /* --duration; NaN: not given */
	double n_windows;              /* --windows; 0: not given */
	double step_s;                 /* --step; NaN: not given */
	double settle_s;               /* --settle; 0 unless given */
	unsigned long long seed;       /* --seed */
	bool seed_given;
	bool help;
	bool show_corrections;         /* report: correction rows apart in the table */
};

/*
 * Parses argv (argv[0] is the command name). Returns SCH_ERR_USAGE with a one-line message for
 * unknown options, options the command does not use (an unknown command name takes them all),
 * missing values, malformed numbers, M < 1, K outside [0, 1], F < 0; SCH_ERR_NOMEM. On failure cli
 * holds nothing to release; on success release it with sch_cli_release.
 */
enum sch_err sch_cli_parse(struct sch_cli *cli, int argc, char **argv, struct sch_diag *d);

/*
 * Prints command's own help to out: its usage line, what it does and every option it accepts,
 * from the same table sch_cli_parse reads. Returns false (printing nothing) for an unknown command.
 */
bool sch_cli_print_help(const char *command, FILE *out);

/* Parses "F1:F2" (SI suffixes) into lo < hi. SCH_ERR_USAGE when malformed. */
enum sch_err sch_cli_parse_range(const char *text, double *lo, double *hi);

/* Frees what sch_cli_parse allocated (the file list); cli may be released twice. */
void sch_cli_release(struct sch_cli *cli);

#endif
