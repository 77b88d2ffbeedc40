/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * cli.c - option parsing for every command (DESIGN.md section 4): one table row per option says
 * which commands take it and where its value goes; the per-command help is printed from it.
 */
#include <errno.h>
#include <math.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include "schrot/cli.h"
#include "schrot/si.h"
#include "schrot/sim.h"

/* The commands, one bit each, for the option table's "accepted by" column. */
enum {
	CMD_REPORT = 1 << 0,
	CMD_CARRIERS = 1 << 1,
	CMD_AUGMENT = 1 << 2,
	CMD_SWEEP = 1 << 3,
	CMD_ARRIVALS = 1 << 4,
	CMD_MERGE = 1 << 5,
	CMD_LEVERS = 1 << 6,
	CMD_NETLIST = CMD_REPORT | CMD_CARRIERS | CMD_AUGMENT | CMD_SWEEP | CMD_ARRIVALS | CMD_LEVERS, /* the commands reading a deck */
	CMD_ALL = CMD_NETLIST | CMD_MERGE,
};

struct cli_command {
	const char *name;
	unsigned bit;
	bool many_files; /* positional arguments are files (cli->files), not one netlist */
	const char *usage;
	const char *about;
};

static const struct cli_command commands[] = {
	{ "report", CMD_REPORT, false, "usage: schrot report NETLIST [options]",
	  "Finds the operating point, sizes a shot-noise generator for every carrier, runs the noise\n"
	  "analysis and prints each device's share of the output noise, ranked, with input-referred noise,\n"
	  "NEP and SNR when asked.\n" },
	{ "carriers", CMD_CARRIERS, false, "usage: schrot carriers NETLIST [options]",
	  "Lists the shot-noise carriers (and why each was chosen), the noiseless DC sources and the\n"
	  "operating-point currents. No noise run.\n" },
	{ "augment", CMD_AUGMENT, false, "usage: schrot augment NETLIST -o FILE [options]",
	  "Writes the netlist with a sized shot-noise generator for every carrier instance, runnable by\n"
	  "plain ngspice.\n" },
	{ "sweep", CMD_SWEEP, false, "usage: schrot sweep NETLIST --vary NAME=START:STOP:N[:lin] [options]",
	  "Repeats the noise run over a level (a current source, a top-level .param or temp) and finds\n"
	  "where the added shot noise crosses the rest.\n" },
	{ "arrivals", CMD_ARRIVALS, false, "usage: schrot arrivals NETLIST --window T (--duration D | --windows N) [options]",
	  "Realises each carrier's electrons as a random arrival process (Poisson at |I|/q; with --avalanche\n"
	  "a random gain of mean M and excess noise factor F per primary; with --fano F a renewal process),\n"
	  "runs one transient with it and samples the output at the end of every window.\n" },
	{ "levers", CMD_LEVERS, false, "usage: schrot levers NETLIST [options]",
	  "Tries design changes one at a time, each as a full noise run on the loaded circuit: the values\n"
	  "of the resistors and capacitors and the currents of the sources that carry 99 % of the band's\n"
	  "noise, the temperature and every avalanche gain, each up and down by --factor; ranks them by the\n"
	  "input-referred band noise they leave, and finds the avalanche gain that maximises SNR.\n" },
	{ "merge", CMD_MERGE, true, "usage: schrot merge PART.json... [--json OUT] [options]",
	  "Joins the partial results of 'schrot sweep --shard K/N' runs into one sweep.\n" },
};

/* How a number option's value is checked; the message says "NAME needs NEED, not 'VALUE'". */
enum cli_check { CHECK_ANY, CHECK_POSITIVE, CHECK_POSITIVE_FINITE, CHECK_NOT_NEGATIVE_FINITE, CHECK_WHOLE };

/*
 * One option. metavar NULL: a flag (no value). set stores the value at offset into struct sch_cli
 * (set_text, set_number, set_whole_int) or does the option's own parsing. lo/hi bound CHECK_WHOLE.
 */
struct cli_option {
	const char *name;
	const char *short_name; /* NULL: none */
	const char *metavar;
	unsigned commands;
	enum sch_err (*set)(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d);
	size_t offset;
	enum cli_check check;
	double lo, hi;
	const char *need;       /* for the value's error message */
	const char *help;       /* '\n' starts a continuation line */
};

static enum sch_err set_text(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_number(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_whole_int(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_flag(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_band(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_freq(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_spot(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_lump(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_avalanche(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_fano(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_shard(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_seed(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_worker_limit(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);
static enum sch_err set_dialect(struct sch_cli *, const struct cli_option *, char *, struct sch_diag *);

#define AT(field) offsetof(struct sch_cli, field)
#define TEXT(field) set_text, AT(field), CHECK_ANY, 0, 0, NULL
#define NUMBER(field, check, need) set_number, AT(field), check, 0, 0, need
#define OWN(fn, need) fn, 0, CHECK_ANY, 0, 0, need

/*
 * Which command honours what was read from src/cmd and src/analysis: an operating-point run
 * (carriers, augment, arrivals) reads only the carrier rules; augment's deck takes the noise run's
 * output, input and range but no junction probes; a sweep reports band rms only (no spots, NEP or
 * SNR) and gates --budget on its worst point (merge likewise on the joined sweep); sweep, merge
 * and arrivals write JSON, CSV and a plot (a shard only its JSON), and every command that reads a
 * netlist a depfile naming what it wrote; none of them has an HTML page.
 */
static const struct cli_option options[] = {
	{ "--out", "-o", "FILE", CMD_AUGMENT, TEXT(out_path), "the augmented netlist ('-': the standard output)" },
	{ "--vary", NULL, "NAME=START:STOP:N[:lin]", CMD_SWEEP, TEXT(vary),
	  "a current source, a top-level .param or temp, N points from 2 to 10000\n"
	  "(log spacing over more than a decade unless :lin)" },
	{ "--jobs", NULL, "N", CMD_SWEEP | CMD_LEVERS, set_whole_int, AT(run.n_workers), CHECK_WHOLE, 1, 64, "a whole number 1..64",
	  "worker processes (default 2)" },
	{ "--shard", NULL, "K/N", CMD_SWEEP, OWN(set_shard, "K/N with 1 <= K <= N <= 10000"),
	  "compute only share K of N of the points (needs --json;\njoin the parts with 'schrot merge')" },
	{ "--max", NULL, "N", CMD_LEVERS, set_whole_int, AT(lever_max), CHECK_WHOLE, 1, 100, "a whole number 1..100",
	  "most devices whose values are tried (default 12)" },
	{ "--factor", NULL, "X", CMD_LEVERS, NUMBER(lever_factor, CHECK_POSITIVE_FINITE, "a number above 1"),
	  "each value tried times and divided by X (default 2)" },
	{ "--window", NULL, "T", CMD_ARRIVALS, NUMBER(window_s, CHECK_POSITIVE_FINITE, "a positive time in seconds"),
	  "observation window (s, SI suffixes: 10u)" },
	{ "--duration", NULL, "D", CMD_ARRIVALS, NUMBER(duration_s, CHECK_POSITIVE_FINITE, "a positive time in seconds"),
	  "total observed time (s); or --windows N" },
	{ "--windows", NULL, "N", CMD_ARRIVALS, set_number, AT(n_windows), CHECK_WHOLE, 2, 1e7,
	  "a whole number 2..10000000", "the number of windows; or --duration D" },
	{ "--step", NULL, "DT", CMD_ARRIVALS, NUMBER(step_s, CHECK_POSITIVE_FINITE, "a positive time in seconds"),
	  "resolution of the arrival sources and largest simulator step\n"
	  "(default T/50); keep it below a fiftieth of the fastest time constant\n"
	  "that matters (a single pole's output variance came out about 2 % low\n"
	  "at tau/50 in our tests, less at finer steps)" },
	{ "--settle", NULL, "TS", CMD_ARRIVALS,
	  NUMBER(settle_s, CHECK_NOT_NEGATIVE_FINITE, "a time in seconds that is not negative"),
	  "simulated before the first window, so the output forgets its start\n(default 0)" },
	{ "--seed", NULL, "S", CMD_ARRIVALS, OWN(set_seed, "a whole number 0..18446744073709551615"),
	  "seed of the xoshiro256** generator (default 1); same seed, same run" },
	{ "--band", NULL, "F1:F2", CMD_REPORT | CMD_SWEEP | CMD_LEVERS, OWN(set_band, "F1:F2 in Hz with 0 < F1 < F2"),
	  "integration band in Hz (SI suffixes: 10:1meg);\ndefault: the noise run's range" },
	{ "--spot", NULL, "F", CMD_REPORT, OWN(set_spot, "a positive frequency in Hz"),
	  "spot frequency in Hz (repeatable, at most 32)" },
	{ "--carrier", NULL, "REGEX", CMD_NETLIST, TEXT(run.carriers.carrier_regex),
	  "also treat matching current elements as carriers\n(whole hierarchical name)" },
	{ "--ignore", NULL, "REGEX", CMD_NETLIST, TEXT(run.carriers.ignore_regex),
	  "never treat matching elements as carriers" },
	{ "--lump", NULL, "REGEX", CMD_REPORT, OWN(set_lump, NULL),
	  "matching resistors as one row (extracted parasitics; much faster)" },
	{ "--avalanche", NULL, "REGEX=M:K", CMD_NETLIST, OWN(set_avalanche, "REGEX=M:K"),
	  "avalanche gain M >= 1 and ionisation ratio k in [0,1]\n(McIntyre excess noise); the netlist's current is the\nmultiplied terminal current M*I_p" },
	{ "--fano", NULL, "REGEX=F", CMD_NETLIST, OWN(set_fano, "REGEX=F"), "shot noise scaled by the Fano factor F >= 0" },
	{ "--dialect", NULL, "MODE", CMD_NETLIST, OWN(set_dialect, NULL),
	  "the simulator's compatibility mode for vendor models written for\n"
	  "other SPICE programs (ngspice's ngbehavior: ps, lt, ltps, ltpsa, ki,\n"
	  "hs, spe, a, ...); default: the 'set ngbehavior=' line of a .spiceinit\n"
	  "beside the netlist, read as data (the file is never run)" },
	{ "--no-junction-correction", NULL, NULL, CMD_REPORT | CMD_SWEEP | CMD_LEVERS, OWN(set_flag, NULL),
	  "keep the simulator's own 2q|I_D| diode noise" },
	{ "--show-corrections", NULL, NULL, CMD_REPORT, OWN(set_flag, NULL),
	  "list each junction and bipolar correction as its own table row\n"
	  "(default: added into the simulator row it corrects)" },
	{ "--responsivity", NULL, "A_PER_W", CMD_REPORT,
	  NUMBER(run.responsivity_a_per_w, CHECK_POSITIVE, "a positive value in A/W"),
	  "unity-gain detector responsivity R0, for NEP; with --avalanche\non the input source NEP divides by R0*M" },
	{ "--signal", NULL, "VALUE", CMD_REPORT | CMD_LEVERS, NUMBER(run.signal, CHECK_ANY, "a number in the input's unit"),
	  "signal in the input's unit, for SNR at the output over the band" },
	{ "--signal-freq", NULL, "F", CMD_REPORT | CMD_LEVERS,
	  NUMBER(run.signal_freq_hz, CHECK_POSITIVE_FINITE, "a positive frequency in Hz"),
	  "the signal's frequency in Hz: the transfer there refers the band's\n"
	  "noise to the input and carries the signal (default: where |H|\n"
	  "peaks in the band)" },
	{ "--budget", NULL, "VRMS", CMD_REPORT | CMD_SWEEP | CMD_MERGE,
	  NUMBER(budget_v, CHECK_POSITIVE, "a positive rms voltage"),
	  "exit 1 when the band's output rms exceeds it (SI suffixes: 50u);\na sweep: at its worst point" },
	{ "--output", NULL, "EXPR", CMD_REPORT | CMD_AUGMENT | CMD_SWEEP | CMD_ARRIVALS | CMD_LEVERS, TEXT(run.output_expr),
	  "v(node) or v(node,ref) when the netlist has no .noise line" },
	{ "--input", NULL, "SRC", CMD_REPORT | CMD_AUGMENT | CMD_SWEEP | CMD_LEVERS, TEXT(run.input_src),
	  "noise input source when the netlist has no .noise line" },
	{ "--freq", NULL, "F1:F2[:PPD]", CMD_REPORT | CMD_AUGMENT | CMD_SWEEP | CMD_LEVERS, OWN(set_freq, NULL),
	  "noise run range in Hz and points per decade (default 20)\nwhen the netlist has no .noise line" },
	{ "--json", NULL, "FILE", CMD_ALL, TEXT(json_path), "the result as JSON ('-': the standard output, no table)" },
	{ "--csv", NULL, "FILE", CMD_REPORT | CMD_SWEEP | CMD_ARRIVALS | CMD_MERGE | CMD_LEVERS, TEXT(csv_path),
	  "one row per contribution (sweep, merge: per point; arrivals: per\nwindow; levers: per lever)" },
	{ "--spectrum", NULL, "FILE.csv", CMD_REPORT, TEXT(spectrum_path),
	  "output noise density per frequency: total, the --top largest\ncontributions, the rest" },
	{ "--top", NULL, "N", CMD_REPORT, set_whole_int, AT(top_n), CHECK_WHOLE, 1, 100, "a whole number 1..100",
	  "contributions with their own --spectrum column (default 8)" },
	{ "--plot", NULL, "FILE.svg|png", CMD_REPORT | CMD_SWEEP | CMD_ARRIVALS | CMD_MERGE | CMD_LEVERS, TEXT(plot_path),
	  "a plot, SVG or PNG by the name (levers: SNR against avalanche gain)" },
	{ "--html", NULL, "FILE", CMD_REPORT | CMD_CARRIERS | CMD_AUGMENT, TEXT(html_path),
	  "a self-contained review page" },
	{ "--depfile", NULL, "FILE", CMD_REPORT | CMD_CARRIERS | CMD_AUGMENT | CMD_SWEEP | CMD_ARRIVALS, TEXT(depfile_path),
	  "make dependency file: the output files depend on the netlist\nand its includes" },
	{ "--worker-limit", NULL, "SECONDS:MIB", CMD_NETLIST, OWN(set_worker_limit, "SECONDS:MIB, both positive"),
	  "CPU time and memory (MiB, also the data file's size) each\nsimulator worker may use (default 3600:8192)" },
	{ "--quiet", "-q", NULL, CMD_ALL, OWN(set_flag, NULL), "only errors" },
	{ "--verbose", "-v", NULL, CMD_ALL, OWN(set_flag, NULL), "notes and simulator messages too" },
	{ "--help", "-h", NULL, CMD_ALL, OWN(set_flag, NULL), "this help" },
};

#define N_OPTIONS (sizeof(options) / sizeof(options[0]))
#define N_COMMANDS (sizeof(commands) / sizeof(commands[0]))

static enum sch_err usage(struct sch_diag *d, const char *fmt, const char *arg)
{
	char msg[512];
	snprintf(msg, sizeof(msg), fmt, arg ? arg : "");
	return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "%s (try 'schrot --help')", msg);
}

/* "--band needs F1:F2 in Hz with 0 < F1 < F2, not '1k'" */
static enum sch_err bad_value(const struct cli_option *o, const char *val, struct sch_diag *d)
{
	return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "%s needs %s, not '%s' (try 'schrot --help')", o->name, o->need,
			      val);
}

static enum sch_err parse_number(const char *text, double *v)
{
	return text && sch_si_parse(text, v) == SCH_OK ? SCH_OK : SCH_ERR_USAGE;
}

static void *field(struct sch_cli *cli, const struct cli_option *o)
{
	return (char *)cli + o->offset;
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

static enum sch_err set_text(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	(void)d;
	*(const char **)field(cli, o) = val;
	return SCH_OK;
}

static bool number_ok(const struct cli_option *o, double v)
{
	switch (o->check) {
	case CHECK_POSITIVE:
		return v > 0;
	case CHECK_POSITIVE_FINITE:
		return v > 0 && isfinite(v);
	case CHECK_NOT_NEGATIVE_FINITE:
		return v >= 0 && isfinite(v);
	case CHECK_WHOLE:
		return v >= o->lo && v <= o->hi && v == floor(v);
	case CHECK_ANY:
		break;
	}
	return true;
}

static enum sch_err set_number(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	double *v = field(cli, o);
	if (parse_number(val, v) != SCH_OK || !number_ok(o, *v))
		return bad_value(o, val, d);
	return SCH_OK;
}

static enum sch_err set_whole_int(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	double v;
	if (parse_number(val, &v) != SCH_OK || !number_ok(o, v))
		return bad_value(o, val, d);
	*(int *)field(cli, o) = (int)v;
	return SCH_OK;
}

static enum sch_err set_flag(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	(void)val;
	(void)d;
	if (strcmp(o->name, "--quiet") == 0)
		cli->verbosity = -1;
	else if (strcmp(o->name, "--verbose") == 0)
		cli->verbosity = 1;
	else if (strcmp(o->name, "--help") == 0)
		cli->help = true;
	else if (strcmp(o->name, "--show-corrections") == 0)
		cli->show_corrections = true;
	else
		cli->run.junction_correction = false;
	return SCH_OK;
}

/*
 * A frequency written with a capital M after its digits ("1MHz", "10M") reads as milli in SPICE,
 * where M and m are both milli and mega is "meg": refused with the reading spelled out, since a
 * frequency in millihertz written that way is far rarer than a megahertz one mistyped.
 */
static enum sch_err refuse_capital_m(const struct cli_option *o, const char *val, struct sch_diag *d)
{
	for (const char *p = val; *p; p++) {
		const char *num = p, *end = p + 1;
		if (p == val || p[0] != 'M' || !((p[-1] >= '0' && p[-1] <= '9') || p[-1] == '.') ||
		    strncasecmp(p, "meg", 3) == 0)
			continue;
		while (num > val && ((num[-1] >= '0' && num[-1] <= '9') || num[-1] == '.'))
			num--;
		while (*end && *end != ':')
			end++;
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "%s '%s': '%.*s' reads as %.*s mHz (SPICE's M is milli); write %.*smeg for "
				      "megahertz (try 'schrot --help')",
				      o->name, val, (int)(end - num), num, (int)(p - num), num, (int)(p - num), num);
	}
	return SCH_OK;
}

static enum sch_err set_dialect(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	const char *mode = sch_sim_compat_mode_known(val);

	if (!mode)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "%s needs one of %s, not '%s' (try 'schrot --help')",
				      o->name, sch_sim_compat_mode_list(), val);
	cli->run.compat_mode = mode;
	return SCH_OK;
}

static enum sch_err set_band(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	if (refuse_capital_m(o, val, d) != SCH_OK)
		return SCH_ERR_USAGE;
	if (sch_cli_parse_range(val, &cli->run.band_lo_hz, &cli->run.band_hi_hz) != SCH_OK)
		return bad_value(o, val, d);
	return SCH_OK;
}

static enum sch_err set_freq(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	char buf[256];
	char *last;
	double ppd = 20;

	if (refuse_capital_m(o, val, d) != SCH_OK)
		return SCH_ERR_USAGE;
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
	return SCH_OK;
}

static enum sch_err set_spot(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	double *spot = &cli->spots[cli->run.n_spots];
	if (cli->run.n_spots >= SCH_MAX_SPOTS)
		return usage(d, "too many --spot frequencies (at most 32): '%s'", val);
	if (refuse_capital_m(o, val, d) != SCH_OK)
		return SCH_ERR_USAGE;
	if (parse_number(val, spot) != SCH_OK || !(*spot > 0))
		return bad_value(o, val, d);
	cli->run.n_spots++;
	return SCH_OK;
}

/* The workers' budget is the simulator session's own setting, not a run option: it is set here. */
static enum sch_err set_worker_limit(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	const char *colon = strchr(val, ':');
	struct sch_sim_budget b;

	(void)cli;
	if (!colon || sch_si_parse_n(val, (size_t)(colon - val), &b.cpu_s) != SCH_OK ||
	    sch_si_parse(colon + 1, &b.mem_mib) != SCH_OK || !(b.cpu_s >= 1 && b.cpu_s < 1e9) ||
	    !(b.mem_mib >= 16 && b.mem_mib < 1e9))
		return bad_value(o, val, d);
	sch_sim_set_budget(&b);
	return SCH_OK;
}

static enum sch_err set_lump(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	(void)o;
	if (cli->run.lump_regex)
		return usage(d, "--lump given twice ('%s'): join the patterns with '|' into one", val);
	cli->run.lump_regex = val;
	return SCH_OK;
}

static enum sch_err set_avalanche(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	double nums[2];
	char shown[256];
	struct sch_gain_rule *r = &cli->avalanche[cli->run.carriers.n_avalanche];

	snprintf(shown, sizeof(shown), "%s", val);
	if (cli->run.carriers.n_avalanche >= SCH_MAX_RULES)
		return usage(d, "too many --avalanche rules: '%s'", val);
	if (parse_rule(val, &r->regex, nums, 2) != 2)
		return bad_value(o, shown, d);
	if (!(nums[0] >= 1))
		return usage(d, "--avalanche gain M must be at least 1 in '%s'", shown);
	if (!(nums[1] >= 0 && nums[1] <= 1))
		return usage(d, "--avalanche ionisation ratio K must lie in [0, 1] in '%s'", shown);
	r->gain_m = nums[0];
	r->k_ratio = nums[1];
	r->fano = 1;
	cli->run.carriers.n_avalanche++;
	return SCH_OK;
}

static enum sch_err set_fano(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	double num;
	char shown[256];
	struct sch_gain_rule *r = &cli->fano[cli->run.carriers.n_fano];

	snprintf(shown, sizeof(shown), "%s", val);
	if (cli->run.carriers.n_fano >= SCH_MAX_RULES)
		return usage(d, "too many --fano rules: '%s'", val);
	if (parse_rule(val, &r->regex, &num, 1) != 1)
		return bad_value(o, shown, d);
	if (!(num >= 0))
		return usage(d, "--fano factor F must not be negative in '%s'", shown);
	r->fano = num;
	r->gain_m = 1;
	cli->run.carriers.n_fano++;
	return SCH_OK;
}

static enum sch_err set_shard(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	int k = 0, n = 0, used = 0;
	if (sscanf(val, "%d/%d%n", &k, &n, &used) != 2 || val[used] != '\0' || n < 1 || n > 10000 || k < 1 || k > n)
		return bad_value(o, val, d);
	cli->shard_k = k;
	cli->shard_n = n;
	return SCH_OK;
}

static enum sch_err set_seed(struct sch_cli *cli, const struct cli_option *o, char *val, struct sch_diag *d)
{
	char *end = NULL;
	errno = 0;
	cli->seed = strtoull(val, &end, 10);
	if (!val[0] || val[0] == '-' || !end || *end || errno)
		return bad_value(o, val, d);
	cli->seed_given = true;
	return SCH_OK;
}

static const struct cli_command *find_command(const char *name)
{
	for (size_t k = 0; name && k < N_COMMANDS; k++) {
		if (strcmp(name, commands[k].name) == 0)
			return &commands[k];
	}
	return NULL;
}

/* The row whose long name is arg's first len characters, or whose short name is arg; NULL: none. */
static const struct cli_option *find_option(const char *arg, size_t len)
{
	for (size_t k = 0; k < N_OPTIONS; k++) {
		const struct cli_option *o = &options[k];
		if ((strncmp(arg, o->name, len) == 0 && o->name[len] == '\0') ||
		    (o->short_name && strlen(o->short_name) == len && strncmp(arg, o->short_name, len) == 0))
			return o;
	}
	return NULL;
}

/* A positional argument: the netlist, or one more file for a command that takes many. */
static enum sch_err take_positional(struct sch_cli *cli, const struct cli_command *cmd, char *arg, struct sch_diag *d)
{
	if (cmd && cmd->many_files) {
		cli->files[cli->n_files++] = arg;
		if (!cli->netlist)
			cli->netlist = arg;
		return SCH_OK;
	}
	if (cli->netlist)
		return usage(d, "more than one netlist given: '%s'", arg);
	cli->netlist = arg;
	return SCH_OK;
}

/*
 * "option '--lump' does not apply to 'schrot sweep', only to report (try 'schrot sweep --help')";
 * the option is quoted as typed, its first len characters.
 */
static enum sch_err refuse(const struct cli_option *o, const char *typed, size_t len, const struct cli_command *cmd,
			   struct sch_diag *d)
{
	char takers[128] = "";
	size_t n = 0, n_takers = 0;

	for (size_t k = 0; k < N_COMMANDS; k++)
		n_takers += (o->commands & commands[k].bit) != 0;
	for (size_t k = 0; k < N_COMMANDS; k++) {
		size_t used = strlen(takers);
		if (!(o->commands & commands[k].bit))
			continue;
		n++;
		snprintf(takers + used, sizeof(takers) - used, "%s%s", n == 1 ? "" : n == n_takers ? " and " : ", ",
			 commands[k].name);
	}
	return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
			      "option '%.*s' does not apply to 'schrot %s', only to %s (try 'schrot %s --help')", (int)len,
			      typed, cmd->name, takers, cmd->name);
}

/*
 * Parses the option at argv[*i] (and its value, advancing *i past it). A known option that cmd
 * does not honour is refused; an unknown command (not in commands[]) takes every option.
 */
static enum sch_err take_option(struct sch_cli *cli, const struct cli_command *cmd, int argc, char **argv, int *i,
				struct sch_diag *d)
{
	char *arg = argv[*i];
	char *eq = strncmp(arg, "--", 2) == 0 ? strchr(arg, '=') : NULL;
	size_t len = eq ? (size_t)(eq - arg) : strlen(arg);
	const struct cli_option *o = find_option(arg, len);
	char *val = NULL;

	if (!o || (eq && !o->metavar))
		return usage(d, "unknown option '%s'", arg);
	if (cmd && !(o->commands & cmd->bit))
		return refuse(o, arg, len, cmd, d);
	if (o->metavar) {
		if (eq)
			val = eq + 1;
		else if (*i + 1 < argc)
			val = argv[++*i];
		else
			return usage(d, "option '%s' needs a value", arg);
	}
	return o->set(cli, o, val, d);
}

static void cli_init(struct sch_cli *cli, const char *command)
{
	memset(cli, 0, sizeof(*cli));
	sch_run_options_init(&cli->run);
	cli->budget_v = NAN;
	cli->top_n = 8;
	cli->lever_max = 12;
	cli->lever_factor = 2;
	cli->window_s = NAN;
	cli->duration_s = NAN;
	cli->step_s = NAN;
	cli->command = command;
	cli->run.spots_hz = cli->spots;
	cli->run.carriers.avalanche = cli->avalanche;
	cli->run.carriers.fano = cli->fano;
}

enum sch_err sch_cli_parse(struct sch_cli *cli, int argc, char **argv, struct sch_diag *d)
{
	const struct cli_command *cmd = find_command(argv[0]);
	enum sch_err ret = SCH_OK;

	cli_init(cli, argv[0]);
	if (cmd && cmd->many_files && !(cli->files = calloc((size_t)argc + 1, sizeof(*cli->files))))
		return SCH_ERR_NOMEM;
	for (int i = 1; i < argc && ret == SCH_OK; i++) {
		char *arg = argv[i];
		if (arg[0] != '-' || strcmp(arg, "-") == 0)
			ret = take_positional(cli, cmd, arg, d);
		else
			ret = take_option(cli, cmd, argc, argv, &i, d);
	}
	if (ret == SCH_OK && !cli->help && !cli->netlist && !(cmd && cmd->many_files))
		ret = usage(d, "no netlist given%s", "");
	if (ret != SCH_OK)
		sch_cli_release(cli);
	return ret;
}

/* "  --band F1:F2" padded to the help column, then the help text, continuation lines indented. */
static void print_option(const struct cli_option *o, FILE *out)
{
	char left[64];
	const char *line = o->help;

	snprintf(left, sizeof(left), "%s%s%s%s%s", o->short_name ? o->short_name : "", o->short_name ? ", " : "",
		 o->name, o->metavar ? " " : "", o->metavar ? o->metavar : "");
	fprintf(out, "  %-22s", left);
	if (strlen(left) >= 22)
		fprintf(out, "\n%24s", "");
	for (;;) {
		const char *nl = strchr(line, '\n');
		int len = nl ? (int)(nl - line) : (int)strlen(line);
		fprintf(out, " %.*s\n", len, line);
		if (!nl)
			break;
		line = nl + 1;
		fprintf(out, "%24s", "");
	}
}

bool sch_cli_print_help(const char *command, FILE *out)
{
	const struct cli_command *cmd = find_command(command);

	if (!cmd)
		return false;
	fprintf(out, "%s\n\n%s\noptions:\n", cmd->usage, cmd->about);
	for (size_t k = 0; k < N_OPTIONS; k++) {
		if (options[k].commands & cmd->bit)
			print_option(&options[k], out);
	}
	fputs("\nexit codes: 0 ok, 1 a check failed, 2 bad input, 3 the simulation failed\n", out);
	return true;
}

void sch_cli_release(struct sch_cli *cli)
{
	free(cli->files);
	cli->files = NULL;
	cli->n_files = 0;
}
