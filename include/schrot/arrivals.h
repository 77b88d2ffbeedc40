/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * arrivals.h - the low-count regime in the time domain: each carrier's electron arrivals as a
 * random process (Poisson; avalanche multiplication; a renewal process for a Fano factor), fed to
 * the simulator's transient analysis, with per-window count and output statistics.
 */
#ifndef SCH_ARRIVALS_H
#define SCH_ARRIVALS_H

#include <stdbool.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include "schrot/analysis.h"
#include "schrot/diag.h"
#include "schrot/rng.h"

#define SCH_ARRIVALS_MAX_WINDOWS 10000000
#define SCH_ARRIVALS_MAX_BINS 20000000  /* source points of all carriers together (16 bytes each in the simulator) */
#define SCH_ARRIVALS_DEFAULT_SEED 1
#define SCH_ARRIVALS_STEPS_PER_WINDOW 50  /* default source resolution */

enum sch_arrival_kind {
	SCH_ARRIVAL_POISSON,   /* independent electrons, rate |I|/q */
	SCH_ARRIVAL_AVALANCHE, /* Poisson primaries at |I|/(qM), each multiplied by a random gain */
	SCH_ARRIVAL_RENEWAL    /* --fano F: gamma-distributed intervals of shape 1/F (F = 0: regular) */
};

/*
 * One carrier's arrival process, consumed one time bin after another. Avalanche gains are
 * gamma-distributed with mean M and mean square M^2*F (so the density is 2q|I|MF, as McIntyre's
 * excess noise factor F gives it); this matches the first two moments of the gain, not McIntyre's
 * full gain distribution. A carrier whose current depends on the circuit (G, B, F) keeps its own
 * current and gets the fluctuation about its operating-point value added beside it. Members are
 * read-only for callers.
 */
struct sch_arrival_source {
	enum sch_arrival_kind kind;
	double current_a;       /* mean terminal current, signed */
	double rate_hz;         /* primary events per second */
	double charge_c;        /* signed charge of one primary electron, ±q */
	double gain_m;
	double excess_f;
	double gain_shape;      /* avalanche: 1/(F-1); 0 for a fixed gain M */
	double interval_shape;  /* renewal: 1/F; 0 for regular arrivals */
	double next_s;          /* renewal: time of the next event after the clock */
	double clock_s;
	struct sch_rng rng;
};

/*
 * Sets up the process of a carrier with mean terminal current current_a, gain M >= 1 and
 * excess factor F (McIntyre's F(M) for avalanche, the Fano factor otherwise). Random numbers
 * come from stream `stream` of seed. Returns SCH_ERR_USAGE when an avalanche carrier has F < 1
 * (no gain distribution has it).
 */
enum sch_err sch_arrival_source_init(struct sch_arrival_source *src, double current_a, double gain_m,
				     double excess_f, bool avalanche, uint64_t seed, uint64_t stream);

/* Advances by one bin of dt_s seconds: *n_primary events arrived, delivering *charge_c coulombs. */
void sch_arrival_source_bin(struct sch_arrival_source *src, double dt_s, uint64_t *n_primary, double *charge_c);

/* Running mean, variance and skewness (one-pass update of P. Pebay, Sandia report SAND2008-6212; from memory). */
struct sch_moments {
	double n, mean, m2, m3;
};

/* Empties m. This function can't fail. */
void sch_moments_init(struct sch_moments *m);
void sch_moments_add(struct sch_moments *m, double x);
double sch_moments_mean(const struct sch_moments *m);
/* Sample variance (n - 1 in the denominator); NaN below two values. */
double sch_moments_var(const struct sch_moments *m);
/* Sample skewness g1 = m3 / m2^1.5 (population form); NaN without spread. */
double sch_moments_skewness(const struct sch_moments *m);

/* Poisson probability of k events at mean n (P(0) = e^-n). */
double sch_poisson_pmf(double mean, uint64_t k);

/* Probability that a normal variable of this mean and sd falls in [lo, hi). */
double sch_gauss_interval(double mean, double sd, double lo, double hi);

/* Per-carrier window statistics. */
struct sch_arrival_counts {
	const char *carrier;      /* hierarchical name */
	enum sch_arrival_kind kind;
	double current_a, gain_m, excess_f;
	double rate_hz;           /* primary events per second */
	double expected_count;    /* rate * window */
	size_t windows;
	uint32_t *per_window;     /* primary events in each window (saturates at UINT32_MAX) */
	double mean_count, var_count, skew_count;
	double p_zero;            /* fraction of windows without an event */
	double mean_electrons, var_electrons; /* delivered charge per window / q (after gain) */
};

struct sch_arrivals_options {
	double window_s;
	size_t n_windows;
	double step_s;            /* source resolution; NaN: window / SCH_ARRIVALS_STEPS_PER_WINDOW */
	double settle_s;          /* simulated before the first window; 0 */
	uint64_t seed;
};

struct sch_arrivals {
	struct sch_result op;     /* the operating-point run: deck, carriers, currents, temperature */
	double window_s, step_s, settle_s;
	size_t n_windows;
	uint64_t seed;
	const char *output;       /* "v(out)" or "v(a,b)" */
	double *output_v;         /* output at the end of each window, n_windows values */
	double output_mean_v, output_std_v, output_skewness;
	double output_lag1_correlation; /* of each window's output with the next one's; NaN without spread */
	double shortest_rc_s;     /* the circuit's shortest RC estimated from the deck; NaN: none found */
	struct sch_arrival_counts *counts;
	size_t n_counts;
	size_t n_bins;            /* source points per carrier */
};

/* Initialises an empty result. This function can't fail. */
void sch_arrivals_init(struct sch_arrivals *a);

/*
 * Runs the operating point of the netlist at path (carrier options and --output from run), then
 * one transient in which every carrier instance delivers its own random arrival process, and
 * samples the output at the end of every window. The output is run->output_expr or the deck's
 * '.noise' output. Event streams are generated bin by bin and written to the simulator's source
 * files as they go (never held in memory); the simulator's file sources then hold one point per
 * bin, which SCH_ARRIVALS_MAX_BINS bounds, and the result one count per window. Returns SCH_ERR_USAGE (bad options, no output, no
 * carrier), SCH_ERR_INPUT, SCH_ERR_SIM, SCH_ERR_IO, SCH_ERR_NOMEM with a message in d; a must be
 * released in every case.
 */
enum sch_err sch_arrivals_run(const char *path, const struct sch_run_options *run,
			      const struct sch_arrivals_options *opt, struct sch_arrivals *a, struct sch_diag *d);

/* Frees everything in a. No-op on NULL. */
void sch_arrivals_release(struct sch_arrivals *a);

/*
 * Generates the windows of one source without the simulator: per_window[w] primaries and
 * electrons[w] delivered electrons (either may be NULL) for n windows of bins_per_window bins of
 * dt_s each. Used by sch_arrivals_run's counting and by tests.
 */
void sch_arrival_source_windows(struct sch_arrival_source *src, double dt_s, size_t bins_per_window, size_t n,
				uint32_t *per_window, double *electrons);

/* "poisson", "avalanche", "renewal". */
const char *sch_arrival_kind_name(enum sch_arrival_kind k);

/* Terminal table: output moments beside the Gaussian, each carrier's counts beside Poisson. */
enum sch_err sch_report_arrivals_table(const struct sch_arrivals *a, FILE *out);

/* JSON (schema 1): output_mean_v, output_std_v, output_skewness, counts[] with histograms. */
enum sch_err sch_report_arrivals_json(const struct sch_arrivals *a, const char *path, struct sch_diag *d);

/*
 * One row per window, written atomically: window (1..n), end_s (time from the start, settling
 * included), output_v, then "NAME count" per carrier (primary events in that window). SCH_ERR_IO
 * when the file cannot be written.
 */
enum sch_err sch_report_arrivals_csv(const struct sch_arrivals *a, const char *path, struct sch_diag *d);

/* Histogram plot (.svg or .png): output values against the Gaussian, counts against Poisson. */
enum sch_err sch_report_arrivals_plot(const struct sch_arrivals *a, const char *path, struct sch_diag *d);

#endif
