/* SPDX-License-Identifier: BSD-3-Clause */
/* cli.c - parsing of the options shared by every command (DESIGN.md section 4). */
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/cli.h"
#include "schrot/si.h"

static enum sch_err usage(struct sch_diag *d, const char *fmt, const char *arg)
{
	char msg[512];
	snprintf(msg, sizeof(msg), fmt, arg ? arg : "");
	return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "%s (try 'schrot --help')", msg);
}

static enum sch_err parse_number(const char *text, double *v)
{
	return text && sch_si_parse(text, v) == SCH_OK ? SCH_OK : SCH_ERR_USAGE;
}

enum sch_err sch_cli_parse_range(const char *text, double *lo, double *hi)
{
	const char *colon = strchr(text, ':');
	if (!colon || sch_si_parse_n(text, (size_t)(colon - text), lo) != SCH_OK ||
	    sch_si_parse(colon + 1, hi) != SCH_OK || !(*lo > 0) || !(*hi > *lo))
		return SCH_ERR_USAGE;
	return SCH_OK;
}

/*
 * "REGEX=a:b" or "REGEX=a": splits at the last '=' (the argument itself is cut there, so callers
 * quote a copy in messages); fills up to n numbers, returns how many.
 */
static int parse_rule(char *text, const char **regex, double *nums, int n)
{
	char *eq = strrchr(text, '=');
	int got = 0;
	if (!eq || eq == text)
		return -1;
	*eq = '\0';
	*regex = text;
	for (char *p = eq + 1; got < n;) {
		char *colon = strchr(p, ':');
		size_t len = colon ? (size_t)(colon - p) : strlen(p);
		if (sch_si_parse_n(p, len, &nums[got]) != SCH_OK)
			return -1;
		got++;
		if (!colon)
			break;
		p = colon + 1;
	}
	return got;
}

static bool takes_value(const char *name)
{
	static const char *const names[] = { "--json", "--csv", "--spectrum", "--plot", "--html", "--depfile", "-o",
					     "--out", "--band", "--freq", "--spot", "--carrier", "--ignore", "--lump", "--avalanche",
					     "--fano", "--responsivity", "--signal", "--budget", "--output", "--input",
					     "--top", "--vary", "--jobs", "--shard", "--window", "--duration", "--windows", "--seed",
					     "--step", "--settle" };
	for (size_t k = 0; k < sizeof(names) / sizeof(names[0]); k++) {
		if (strcmp(name, names[k]) == 0)
			return true;
	}
	return false;
}

enum sch_err sch_cli_parse(struct sch_cli *cli, int argc, char **argv, struct sch_diag *d)
{
	size_t n_spots = 0;

	memset(cli, 0, sizeof(*cli));
	sch_run_options_init(&cli->run);
	cli->budget_v = NAN;
	cli->top_n = 8;
	cli->window_s = NAN;
	cli->duration_s = NAN;
	cli->step_s = NAN;
	cli->command = argv[0];
	cli->run.spots_hz = cli->spots;
	cli->run.carriers.avalanche = cli->avalanche;
	cli->run.carriers.fano = cli->fano;
	for (int i = 1; i < argc; i++) {
		char *arg = argv[i];
		char *val = NULL;
		char *eq;
		char name[64];

		if (strcmp(arg, "-q") == 0 || strcmp(arg, "--quiet") == 0) {
			cli->verbosity = -1;
			continue;
		}
		if (strcmp(arg, "-v") == 0 || strcmp(arg, "--verbose") == 0) {
			cli->verbosity = 1;
			continue;
		}
		if (strcmp(arg, "-h") == 0 || strcmp(arg, "--help") == 0) {
			cli->help = true;
			continue;
		}
		if (strcmp(arg, "--no-junction-correction") == 0) {
			cli->run.junction_correction = false;
			continue;
		}
		if (arg[0] != '-' || strcmp(arg, "-") == 0) {
			if (cli->netlist)
				return usage(d, "more than one netlist given: '%s'", arg);
			cli->netlist = arg;
			continue;
		}
		snprintf(name, sizeof(name), "%s", arg);
		eq = strchr(name, '=');
		if (eq)
			*eq = '\0';
		if (!takes_value(name))
			return usage(d, "unknown option '%s'", arg);
		if (eq)
			*eq = '=';
		if (eq && strncmp(name, "--", 2) == 0) {
			*eq = '\0';
			val = strchr(arg, '=') + 1;
		} else if (i + 1 < argc) {
			val = argv[++i];
		} else {
			return usage(d, "option '%s' needs a value", arg);
		}
		if (strcmp(name, "--json") == 0) {
			cli->json_path = val;
		} else if (strcmp(name, "--csv") == 0) {
			cli->csv_path = val;
		} else if (strcmp(name, "--spectrum") == 0) {
			cli->spectrum_path = val;
		} else if (strcmp(name, "--plot") == 0) {
			cli->plot_path = val;
		} else if (strcmp(name, "--html") == 0) {
			cli->html_path = val;
		} else if (strcmp(name, "--depfile") == 0) {
			cli->depfile_path = val;
		} else if (strcmp(name, "-o") == 0 || strcmp(name, "--out") == 0) {
			cli->out_path = val;
		} else if (strcmp(name, "--band") == 0) {
			if (sch_cli_parse_range(val, &cli->run.band_lo_hz, &cli->run.band_hi_hz) != SCH_OK)
				return usage(d, "--band needs F1:F2 in Hz with 0 < F1 < F2, not '%s'", val);
		} else if (strcmp(name, "--freq") == 0) {
			char buf[256];
			char *last;
			double ppd = 20;
			snprintf(buf, sizeof(buf), "%s", val);
			last = strrchr(buf, ':');
			if (last && strchr(buf, ':') != last) {
				*last = '\0';
				if (parse_number(last + 1, &ppd) != SCH_OK || ppd < 1 || ppd > 1000 || ppd != floor(ppd))
					return usage(d, "--freq points per decade must be a whole number 1..1000 in '%s'", val);
			}
			if (sch_cli_parse_range(buf, &cli->run.freq.f_start, &cli->run.freq.f_stop) != SCH_OK)
				return usage(d, "--freq needs F1:F2[:PPD] in Hz with 0 < F1 < F2, not '%s'", val);
			cli->run.freq.points_per_decade = (int)ppd;
			cli->run.have_freq = true;
		} else if (strcmp(name, "--spot") == 0) {
			if (n_spots >= SCH_MAX_SPOTS)
				return usage(d, "too many --spot frequencies (at most 32): '%s'", val);
			if (parse_number(val, &cli->spots[n_spots]) != SCH_OK || !(cli->spots[n_spots] > 0))
				return usage(d, "--spot needs a positive frequency in Hz, not '%s'", val);
			n_spots++;
		} else if (strcmp(name, "--carrier") == 0) {
			cli->run.carriers.carrier_regex = val;
		} else if (strcmp(name, "--ignore") == 0) {
			cli->run.carriers.ignore_regex = val;
		} else if (strcmp(name, "--lump") == 0) {
			if (cli->run.lump_regex)
				return usage(d, "--lump given twice ('%s'): join the patterns with '|' into one", val);
			cli->run.lump_regex = val;
		} else if (strcmp(name, "--avalanche") == 0) {
			double nums[2];
			char shown[256];
			snprintf(shown, sizeof(shown), "%s", val);
			struct sch_gain_rule *r = &cli->avalanche[cli->run.carriers.n_avalanche];
			if (cli->run.carriers.n_avalanche >= SCH_MAX_RULES)
				return usage(d, "too many --avalanche rules: '%s'", val);
			if (parse_rule(val, &r->regex, nums, 2) != 2)
				return usage(d, "--avalanche needs REGEX=M:K, not '%s'", shown);
			if (!(nums[0] >= 1))
				return usage(d, "--avalanche gain M must be at least 1 in '%s'", shown);
			if (!(nums[1] >= 0 && nums[1] <= 1))
				return usage(d, "--avalanche ionisation ratio K must lie in [0, 1] in '%s'", shown);
			r->gain_m = nums[0];
			r->k_ratio = nums[1];
			r->fano = 1;
			cli->run.carriers.n_avalanche++;
		} else if (strcmp(name, "--fano") == 0) {
			double num;
			char shown[256];
			snprintf(shown, sizeof(shown), "%s", val);
			struct sch_gain_rule *r = &cli->fano[cli->run.carriers.n_fano];
			if (cli->run.carriers.n_fano >= SCH_MAX_RULES)
				return usage(d, "too many --fano rules: '%s'", val);
			if (parse_rule(val, &r->regex, &num, 1) != 1)
				return usage(d, "--fano needs REGEX=F, not '%s'", shown);
			if (!(num >= 0))
				return usage(d, "--fano factor F must not be negative in '%s'", shown);
			r->fano = num;
			r->gain_m = 1;
			cli->run.carriers.n_fano++;
		} else if (strcmp(name, "--responsivity") == 0) {
			if (parse_number(val, &cli->run.responsivity_a_per_w) != SCH_OK || !(cli->run.responsivity_a_per_w > 0))
				return usage(d, "--responsivity needs a positive value in A/W, not '%s'", val);
		} else if (strcmp(name, "--signal") == 0) {
			if (parse_number(val, &cli->run.signal) != SCH_OK)
				return usage(d, "--signal needs a number in the input's unit, not '%s'", val);
		} else if (strcmp(name, "--budget") == 0) {
			if (parse_number(val, &cli->budget_v) != SCH_OK || !(cli->budget_v > 0))
				return usage(d, "--budget needs a positive rms voltage, not '%s'", val);
		} else if (strcmp(name, "--output") == 0) {
			cli->run.output_expr = val;
		} else if (strcmp(name, "--input") == 0) {
			cli->run.input_src = val;
		} else if (strcmp(name, "--top") == 0) {
			double v;
			if (parse_number(val, &v) != SCH_OK || v < 1 || v > 100 || v != floor(v))
				return usage(d, "--top needs a whole number 1..100, not '%s'", val);
			cli->top_n = (int)v;
		} else if (strcmp(name, "--vary") == 0) {
			cli->vary = val;
		} else if (strcmp(name, "--shard") == 0) {
			int k = 0, n = 0, used = 0;
			if (sscanf(val, "%d/%d%n", &k, &n, &used) != 2 || val[used] != '\0' || n < 1 || n > 10000 || k < 1 ||
			    k > n)
				return usage(d, "--shard needs K/N with 1 <= K <= N <= 10000, not '%s'", val);
			cli->shard_k = k;
			cli->shard_n = n;
		} else if (strcmp(name, "--jobs") == 0) {
			double v;
			if (parse_number(val, &v) != SCH_OK || v < 1 || v > 64 || v != floor(v))
				return usage(d, "--jobs needs a whole number 1..64, not '%s'", val);
			cli->run.n_workers = (int)v;
		} else if (strcmp(name, "--window") == 0) {
			if (parse_number(val, &cli->window_s) != SCH_OK || !(cli->window_s > 0) || !isfinite(cli->window_s))
				return usage(d, "--window needs a positive time in seconds, not '%s'", val);
		} else if (strcmp(name, "--duration") == 0) {
			if (parse_number(val, &cli->duration_s) != SCH_OK || !(cli->duration_s > 0) || !isfinite(cli->duration_s))
				return usage(d, "--duration needs a positive time in seconds, not '%s'", val);
		} else if (strcmp(name, "--windows") == 0) {
			if (parse_number(val, &cli->n_windows) != SCH_OK || cli->n_windows < 2 || cli->n_windows > 1e7 ||
			    cli->n_windows != floor(cli->n_windows))
				return usage(d, "--windows needs a whole number 2..10000000, not '%s'", val);
		} else if (strcmp(name, "--step") == 0) {
			if (parse_number(val, &cli->step_s) != SCH_OK || !(cli->step_s > 0) || !isfinite(cli->step_s))
				return usage(d, "--step needs a positive time in seconds, not '%s'", val);
		} else if (strcmp(name, "--settle") == 0) {
			if (parse_number(val, &cli->settle_s) != SCH_OK || !(cli->settle_s >= 0) || !isfinite(cli->settle_s))
				return usage(d, "--settle needs a time in seconds that is not negative, not '%s'", val);
		} else if (strcmp(name, "--seed") == 0) {
			char *end = NULL;
			errno = 0;
			cli->seed = strtoull(val, &end, 10);
			if (!val[0] || val[0] == '-' || !end || *end || errno)
				return usage(d, "--seed needs a whole number 0..18446744073709551615, not '%s'", val);
			cli->seed_given = true;
		} else {
			return usage(d, "unknown option '%s'", arg);
		}
	}
	cli->run.n_spots = n_spots;
	if (!cli->help && !cli->netlist)
		return usage(d, "no netlist given%s", "");
	return SCH_OK;
}

void sch_cli_release(struct sch_cli *cli)
{
	(void)cli; /* nothing owned yet; kept so commands release what they parse */
}
