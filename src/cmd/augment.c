/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_augment.c - schrot augment: writes the netlist with sized shot-noise generators for plain ngspice. */
#include <stdio.h>
#include <string.h>
#include <sys/stat.h>
#include "schrot/augment.h"
#include "schrot/cmd.h"
#include "schrot/outfile.h"

/* True when out names the same existing file as path (hard links and symlinks included). */
static bool same_file(const char *out, const char *path)
{
	struct stat a, b;
	return stat(out, &a) == 0 && stat(path, &b) == 0 && a.st_dev == b.st_dev && a.st_ino == b.st_ino;
}

/* SCH_ERR_USAGE when out is the netlist or any file it reads. */
static enum sch_err check_not_input(const char *out, const struct sch_result *res, const char *netlist,
				    struct sch_diag *d)
{
	if (same_file(out, netlist))
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "refusing to write the augmented deck over the netlist '%s'",
				      netlist);
	for (size_t k = 0; res && k < res->deck.n_files; k++) {
		if (same_file(out, res->deck.files[k]))
			return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
					      "refusing to write the augmented deck over '%s', which the netlist reads",
					      res->deck.files[k]);
	}
	return SCH_OK;
}

/* Runs the operating point and writes the sized deck to cli->out_path atomically. */
static enum sch_err augment(const struct sch_cli *cli, struct sch_result *res, struct sch_diag *d)
{
	struct sch_augment_options aopt;
	struct sch_augmented aug;
	struct sch_outfile of = { 0 };
	const char *noise_command = NULL;
	bool to_stdout = strcmp(cli->out_path, "-") == 0;
	enum sch_err ret;

	memset(&aopt, 0, sizeof(aopt));
	aopt.keep_analyses = true;
	aopt.plain = true;
	if (!to_stdout && (ret = check_not_input(cli->out_path, NULL, cli->netlist, d)) != SCH_OK)
		goto out;
	if ((ret = sch_analysis_run(cli->netlist, &cli->run, res, d)) != SCH_OK)
		goto out;
	if (!to_stdout && (ret = check_not_input(cli->out_path, res, cli->netlist, d)) != SCH_OK)
		goto out;
	if ((ret = sch_analysis_noise_command(&res->deck, &cli->run, &res->arena, &noise_command, &aopt.ac_source, d)) !=
	    SCH_OK)
		goto out;
	if ((ret = sch_augment_build(&res->deck, &res->set, &aopt, &res->arena, &aug, d)) != SCH_OK)
		goto out;
	if ((ret = sch_outfile_open(&of, cli->out_path, d)) != SCH_OK)
		goto out;
	if ((ret = sch_augment_write(&aug, &res->deck, &res->set, res->temp_k, noise_command, res->compat_mode,
				     &res->arena, of.fp, d)) != SCH_OK)
		goto out;
	ret = sch_outfile_commit(&of, d);
out:
	sch_outfile_abort(&of);
	return ret;
}

int cmd_augment(int argc, char **argv, struct sch_ctx *ctx)
{
	struct sch_cli cli;
	struct sch_result res;
	bool done;
	enum sch_err ret;

	sch_result_init(&res);
	ret = sch_cmd_start(&cli, argc, argv, ctx, &done);
	if (ret != SCH_OK || done)
		goto out;
	if (!cli.out_path) {
		ret = sch_diag_error(&ctx->diag, SCH_ERR_USAGE, NULL, 0,
				     "augment needs '-o FILE' ('-' for the standard output) (try 'schrot --help')");
		goto out;
	}
	cli.run.mode = SCH_RUN_OP;
	/* the deck and the other outputs are one set: a JSON that cannot be written keeps the old deck */
	sch_outfile_batch_begin();
	ret = augment(&cli, &res, &ctx->diag);
	if (ret == SCH_OK)
		ret = sch_cmd_write_outputs(&cli, &res, &ctx->diag);
	if (sch_outfile_batch_end(ret == SCH_OK, &ctx->diag) != SCH_OK && ret == SCH_OK)
		ret = SCH_ERR_IO;
	if (ret != SCH_OK)
		goto out;
	if (cli.verbosity > 0 && strcmp(cli.out_path, "-") != 0)
		fprintf(stderr, "schrot: wrote '%s' with %zu carrier generator%s sized per instance\n", cli.out_path,
			res.set.n_carriers, res.set.n_carriers == 1 ? "" : "s");
out:
	sch_result_release(&res);
	sch_cli_release(&cli);
	return sch_err_exit_code(ret);
}
