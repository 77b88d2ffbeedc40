/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_common.c - help text and the output files every command can write. */
#include <stdio.h>
#include <string.h>
#include "schrot/cmd.h"
#include "schrot/outfile.h"
#include "schrot/report.h"

void sch_cmd_print_help(FILE *out)
{
	fputs("schrot - shot noise where SPICE leaves it out: detector currents, avalanche gain, zero-bias junctions\n"
	      "\n"
	      "usage: schrot COMMAND NETLIST [options]\n"
	      "\n"
	      "commands:\n"
	      "  report   NETLIST     operating point, sized shot-noise generators, noise run, ranked table\n"
	      "  carriers NETLIST     list the shot-noise carriers (and why), noiseless DC sources, currents\n"
	      "  augment  NETLIST -o FILE   write the netlist with sized generators, runnable by plain ngspice\n"
	      "  sweep    NETLIST --vary NAME=START:STOP:N[:lin]   repeat over a level, find the shot-noise crossover\n"
	      "  arrivals NETLIST --window T (--duration D | --windows N) [--seed S]\n"
	      "                       time-domain Poisson realisation of the carriers: counts per window, P(0)\n"
	      "  levers   NETLIST     design changes tried one at a time, ranked by input-referred noise; best APD gain\n"
	      "  merge    PART.json... [--json OUT]   join the partial results of 'sweep --shard K/N' runs\n"
	      "\n"
	      "options:\n"
	      "  --band F1:F2           integration band in Hz (SI suffixes: 10:1meg); default: the noise run's range\n"
	      "  --spot F               spot frequency in Hz (repeatable)\n"
	      "  --carrier REGEX        also treat matching current elements as carriers (whole hierarchical name)\n"
	      "  --ignore REGEX         never treat matching elements as carriers\n"
	      "  --lump REGEX           report: matching resistors as one row (extracted parasitics; much faster)\n"
	      "  --avalanche REGEX=M:K  avalanche gain M >= 1 and ionisation ratio k in [0,1] (McIntyre excess noise);\n"
	      "                         the netlist's current is the multiplied terminal current\n"
	      "  --fano REGEX=F         shot noise scaled by the Fano factor F >= 0\n"
	      "  --no-junction-correction   keep the simulator's own 2q|I_D| diode noise\n"
	      "  --show-corrections     report: corrections as their own table rows (default: added into the row they correct)\n"
	      "  --responsivity A_PER_W unity-gain detector responsivity R0, for NEP (NEP divides by R0*M under --avalanche)\n"
	      "  --signal VALUE         signal in the input's unit, for SNR at the output over the band\n"
	      "  --signal-freq F        the signal's frequency: the transfer there refers the noise (default: peak |H| in the band)\n"
	      "  --budget VRMS          exit 1 when the band's output rms exceeds it (SI suffixes: 50u)\n"
	      "  --output EXPR --input SRC --freq F1:F2[:PPD]   the noise run when the netlist has no .noise line\n"
	      "  --jobs N               sweep, levers: worker processes (default 2);  --shard K/N  sweep: only share K of N\n"
	      "  --max N  --factor X    levers: most devices tried (default 12), the factor of each change (default 2)\n"
	      "  --window T --duration D --windows N --step DT --settle TS --seed S   arrivals: the time-domain run\n"
	      "  --json FILE  --csv FILE  --spectrum FILE.csv  --top N  --plot FILE.svg|png  --html FILE  --depfile FILE\n"
	      "                         outputs ('-' is stdout for --json); written atomically\n"
	      "  -q  only errors;  -v  notes and simulator messages;  --help;  --version\n"
	      "\n"
	      "exit codes: 0 ok, 1 a check failed (noise over --budget), 2 bad input, 3 the simulation failed\n",
	      out);
}

static enum sch_err write_outputs(const struct sch_cli *cli, const struct sch_result *res, struct sch_diag *d);

/* All or nothing: a later output that fails leaves the earlier ones' targets untouched too. */
enum sch_err sch_cmd_start(struct sch_cli *cli, int argc, char **argv, struct sch_ctx *ctx, bool *done)
{
	enum sch_err ret = sch_cli_parse(cli, argc, argv, &ctx->diag);

	*done = false;
	if (ret != SCH_OK)
		return ret;
	if (cli->help) {
		if (!sch_cli_print_help(cli->command, stdout))
			sch_cmd_print_help(stdout);
		*done = true;
	}
	ctx->diag.verbosity = cli->verbosity;
	return SCH_OK;
}

enum sch_err sch_cmd_write_outputs(const struct sch_cli *cli, const struct sch_result *res, struct sch_diag *d)
{
	enum sch_err ret, end;

	sch_outfile_batch_begin();
	ret = write_outputs(cli, res, d);
	end = sch_outfile_batch_end(ret == SCH_OK, d);
	return ret != SCH_OK ? ret : end;
}

static enum sch_err write_outputs(const struct sch_cli *cli, const struct sch_result *res, struct sch_diag *d)
{
	enum sch_err ret = SCH_OK;

	if (cli->json_path && (ret = sch_report_json(res, cli->json_path, d)) != SCH_OK)
		return ret;
	if (res->n_freq) {
		if (cli->csv_path && (ret = sch_report_csv(res, cli->csv_path, d)) != SCH_OK)
			return ret;
		if (cli->spectrum_path && (ret = sch_report_spectrum(res, cli->spectrum_path, cli->top_n, d)) != SCH_OK)
			return ret;
		if (cli->plot_path && (ret = sch_report_plot(res, cli->plot_path, d)) != SCH_OK)
			return ret;
	} else if (cli->csv_path || cli->spectrum_path || cli->plot_path) {
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "--csv, --spectrum and --plot need a noise run (schrot report)");
	}
	/* the review page also serves an operating-point run: carriers, currents, assumptions */
	if (cli->html_path && (ret = sch_report_html(res, cli->html_path, d)) != SCH_OK)
		return ret;
	if (cli->depfile_path)
		ret = sch_cmd_write_depfile(cli, res, d);
	return ret;
}

enum sch_err sch_cmd_write_depfile(const struct sch_cli *cli, const struct sch_result *res, struct sch_diag *d)
{
	const char *outs[] = { cli->json_path, cli->csv_path, cli->spectrum_path, cli->plot_path, cli->html_path,
			       cli->out_path };
	const char *targets[8];
	size_t n_targets = 0;

	for (size_t k = 0; k < sizeof(outs) / sizeof(outs[0]); k++) {
		if (outs[k] && !(outs[k][0] == '-' && outs[k][1] == '\0'))
			targets[n_targets++] = outs[k];
	}
	if (n_targets == 0)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "--depfile needs at least one output file (--json, --csv, ...) as its target");
	return sch_report_depfile(res, cli->depfile_path, targets, n_targets, d);
}
