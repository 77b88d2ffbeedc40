/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_merge.c - schrot merge: joins the partial JSON files of sweep --shard K/N into one sweep. */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/cmd.h"
#include "schrot/report.h"

static enum sch_err merge_usage(struct sch_diag *d, const char *what, const char *arg)
{
	return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "%s '%s' (try 'schrot --help')", what, arg);
}

int cmd_merge(int argc, char **argv, struct sch_ctx *ctx)
{
	const char **paths = calloc((size_t)argc + 1, sizeof(*paths));
	const char *json_path = NULL;
	size_t n_paths = 0;
	int verbosity = 0;
	bool help = false;
	struct sch_result res;
	struct sch_sweep sweep;
	enum sch_err ret = SCH_ERR_NOMEM;

	sch_result_init(&res);
	if (!paths)
		goto out;
	for (int i = 1; i < argc; i++) {
		const char *arg = argv[i];
		if (strcmp(arg, "-q") == 0 || strcmp(arg, "--quiet") == 0) {
			verbosity = -1;
		} else if (strcmp(arg, "-v") == 0 || strcmp(arg, "--verbose") == 0) {
			verbosity = 1;
		} else if (strcmp(arg, "-h") == 0 || strcmp(arg, "--help") == 0) {
			help = true;
		} else if (strncmp(arg, "--json=", 7) == 0) {
			json_path = arg + 7;
		} else if (strcmp(arg, "--json") == 0) {
			if (i + 1 >= argc) {
				ret = merge_usage(&ctx->diag, "option needs a value:", arg);
				goto out;
			}
			json_path = argv[++i];
		} else if (arg[0] == '-' && arg[1] != '\0') {
			ret = merge_usage(&ctx->diag, "unknown option", arg);
			goto out;
		} else {
			paths[n_paths++] = arg;
		}
	}
	if (help) {
		sch_cmd_print_help(stdout);
		ret = SCH_OK;
		goto out;
	}
	ctx->diag.verbosity = verbosity;
	if ((ret = sch_report_sweep_merge(paths, n_paths, &res, &sweep, &ctx->diag)) != SCH_OK)
		goto out;
	if (json_path && (ret = sch_report_sweep_json(&res, &sweep, json_path, &ctx->diag)) != SCH_OK)
		goto out;
	if (verbosity >= 0 && !(json_path && strcmp(json_path, "-") == 0))
		ret = sch_report_sweep_table(&res, &sweep, stdout);
out:
	free(paths);
	sch_result_release(&res);
	return sch_err_exit_code(ret);
}
