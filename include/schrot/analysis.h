/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * analysis.h - the one analysis entry point: deck -> carriers -> augment -> simulator -> spectra,
 * handing back one result structure that every command and every output reads.
 */
#ifndef SCH_ANALYSIS_H
#define SCH_ANALYSIS_H

#include <stdbool.h>
#include <stddef.h>
#include "schrot/arena.h"
#include "schrot/carriers.h"
#include "schrot/deck.h"
#include "schrot/diag.h"

enum sch_mechanism { SCH_MECH_SHOT, SCH_MECH_THERMAL, SCH_MECH_FLICKER, SCH_MECH_OTHER };
enum sch_origin { SCH_ORIGIN_ADDED, SCH_ORIGIN_SIMULATOR, SCH_ORIGIN_CORRECTION };

/* Lower-case names used in tables and JSON: "shot", "thermal", "flicker", "other". */
const char *sch_mechanism_name(enum sch_mechanism m);
/* "added", "simulator", "correction". */
const char *sch_origin_name(enum sch_origin o);

/* One noise generator's share of the output. */
struct sch_contribution {
	const char *device;      /* hierarchical netlist name: "x1.iph", "x1.d1", "rf" */
	const char *generator;   /* "shot" for added generators; the simulator's suffix otherwise ("id", "thermal", "1overf", "ic") */
	enum sch_mechanism mechanism;
	enum sch_origin origin;
	double dc_current_a;     /* NaN when the generator is not sized by a current */
	double *psd;             /* output power density at each frequency, V^2/Hz; negative for a correction that removes noise */
	double band_power;       /* integral of psd over the band, V^2 (negative for such a correction) */
	double output_rms_v;     /* sqrt(|band_power|) with band_power's sign: negative for a row that removes noise */
	double share;            /* band_power / total band power; shares sum to 1 */
	double *spot_density;    /* at each spot frequency: sqrt(|psd|) with psd's sign, V/√Hz */
	size_t device_count;     /* devices the row stands for: 1, or the resistors of a --lump row */
};

struct sch_spot {
	double freq_hz;
	double output_v_per_rthz;
	double input_per_rthz;   /* input-referred, in the input source's unit per √Hz */
	double nep_w_per_rthz;   /* input_per_rthz / (responsivity * input_gain_m); NaN without a responsivity or for a voltage input */
};

/* A parsed --freq F1:F2[:PPD]. */
struct sch_freq_spec {
	double f_start;
	double f_stop;
	int points_per_decade;
};

enum sch_run_mode {
	SCH_RUN_REPORT,   /* operating point and noise (report) */
	SCH_RUN_OP        /* operating point only (carriers, augment sizing) */
};

struct sch_run_options {
	enum sch_run_mode mode;
	struct sch_carrier_options carriers;
	double band_lo_hz, band_hi_hz;  /* NaN: the noise run's own range */
	const double *spots_hz;
	size_t n_spots;
	const char *output_expr;        /* --output; NULL: the deck's .noise */
	const char *input_src;          /* --input; NULL: the deck's .noise */
	bool have_freq;                 /* --freq given */
	struct sch_freq_spec freq;
	bool junction_correction;
	double responsivity_a_per_w;    /* NaN: none */
	double signal;                  /* NaN: none; in input units */
	double signal_freq_hz;          /* NaN: none; the transfer's reference frequency when given */
	int n_workers;
	/*
	 * --lump: resistors whose whole hierarchical name matches (case-insensitive) are reported as
	 * one row. The per-device run leaves them quiet (noisy=0), and a second run without per-device
	 * vectors, in a second worker at the same time, gives the total; the row is the difference.
	 * NULL: every device its own row. Report runs only.
	 */
	const char *lump_regex;
	/*
	 * --dialect: the simulator's compatibility mode (a value sch_sim_compat_mode_known accepts);
	 * NULL: the one a .spiceinit beside the netlist sets, else none.
	 */
	const char *compat_mode;
	/*
	 * Sweeps only: called in the calling process with the number of points done (0 before the
	 * first) out of total; NULL for none. It must not write to stdout.
	 */
	void (*progress)(void *progress_ctx, size_t done, size_t total);
	void *progress_ctx;
	/*
	 * Also read the value of every resistor, capacitor and current source instance after the run
	 * (res->instance_values), so a later run can put it back. Single runs only.
	 */
	bool read_values;
};

/*
 * The transfer from the input source to the output, |H| = |output / input| (V/A for a current
 * input, V/V for a voltage input). mid_band = |H| at ref_hz: the signal's frequency when given
 * (--signal-freq), otherwise the frequency of largest |H| within the band. f_low_hz / f_high_hz:
 * the -3 dB points relative to mid_band, the nearest frequencies below and above ref_hz where
 * |H| = mid_band / sqrt(2) (log-log interpolation), NaN where |H| does not fall 3 dB inside the
 * simulated range. enbw_hz = integral over the band of |H|^2 df / mid_band^2. All NaN when the
 * result has no noise run or no transfer.
 */
struct sch_transfer {
	double mid_band;
	double ref_hz;
	double f_low_hz;
	double f_high_hz;
	double enbw_hz;
};

struct sch_result {
	struct sch_arena arena;         /* owns everything below except deck */
	struct sch_deck deck;
	struct sch_carrier_set set;
	const char *netlist;            /* path as given */
	const char *sim_version;
	const char *compat_mode;        /* the simulator's compatibility mode the run used, NULL: none */
	double temp_k;                  /* circuit temperature */
	/* noise run (mode SCH_RUN_REPORT only) */
	const char *output;             /* "v(out)" */
	const char *input;              /* "iph" */
	const char *input_unit;         /* "A" for a current source, "V" for a voltage source */
	double band_lo_hz, band_hi_hz;
	double run_lo_hz, run_hi_hz;    /* the noise run's requested frequency range */
	/*
	 * A spot run (start == stop, one frequency): every band figure (rms, band power, NEP over the
	 * band, SNR) is NaN, the spots hold that frequency, and shares and the verdict are of the
	 * output noise power density there.
	 */
	bool spot_run;
	size_t n_freq;
	double *freq_hz;
	double *total_psd;              /* V^2/Hz: sum of every contribution's psd */
	double *gain2;                  /* |output / input|^2 at each frequency */
	struct sch_contribution *contributions; /* ranked by share, largest first */
	size_t n_contributions;
	double total_power_v2;          /* band power of the total */
	double output_rms_v;
	double input_rms;               /* output_rms_v / transfer.mid_band: input-referred rms over the band, input units */
	struct sch_transfer transfer;   /* the input-to-output transfer (report runs) */
	struct sch_spot *spots;
	size_t n_spots;
	double responsivity_a_per_w;    /* NaN: none; the unity-gain responsivity R0 */
	double input_gain_m;            /* avalanche gain M of the input carrier (1 without a gain rule): NEP divides by R0 * M */
	double signal;                  /* NaN: none */
	double snr;                     /* at the output: (signal * transfer.mid_band)^2 / total_power_v2; NaN without a signal */
	double *instance_values;        /* read_values: per set.instances entry, ohms, farads or an I source's DC
					   amperes as the simulator holds them; NaN for other elements; else NULL */
	double carrier_power_v2;        /* band power of all added carrier shot noise */
	double shot_to_rest;            /* carrier_power_v2 / (everything else); NaN without carriers or rest */
	const struct sch_contribution *dominant_other; /* the largest row of the device that leads the rest, or NULL */
	double dominant_other_share;    /* that device's share, all its rows netted (corrections included) */
	double nep_band_w_per_rthz;     /* input_rms / sqrt(transfer.enbw_hz) / (responsivity * input_gain_m); NaN without one */
	const char **notes;             /* assumptions and corrections applied, for reports */
	size_t n_notes;
};

/* Initialises an empty result. This function can't fail. */
void sch_result_init(struct sch_result *res);

/*
 * Runs the pipeline on the netlist at path. Returns SCH_ERR_INPUT for bad input (located
 * message), SCH_ERR_SIM when the simulator fails, SCH_ERR_NOMEM. res must be released in every case.
 */
enum sch_err sch_analysis_run(const char *path, const struct sch_run_options *opt, struct sch_result *res,
			      struct sch_diag *d);

/* Frees everything in res. No-op on NULL. */
void sch_result_release(struct sch_result *res);

/*
 * The simulator's noise command for deck under opt ("noise v(out) iph dec 20 1 1e+06 1"), as
 * sch_analysis_run would issue it, in *command; *ac_source is the input source that needs " ac 1"
 * for the run, NULL when it has its own AC value. Strings come from arena. Returns SCH_ERR_USAGE or
 * SCH_ERR_INPUT with a located message when the deck and options name no valid noise run,
 * SCH_ERR_NOMEM; the outputs are untouched then.
 */
enum sch_err sch_analysis_noise_command(const struct sch_deck *deck, const struct sch_run_options *opt,
					struct sch_arena *arena, const char **command, const char **ac_source,
					struct sch_diag *d);

/* One point of a sweep. */
struct sch_sweep_point {
	double value;             /* the varied quantity: amperes for a carrier, degrees C for temp */
	double output_rms_v;
	double input_rms;
	double carrier_power_v2;  /* band power of the added carrier shot noise */
	double other_power_v2;    /* band power of everything else */
};

struct sch_sweep {
	const char *name;         /* what was varied: a carrier's hierarchical name or "temp" */
	const char *unit;         /* "A" (a current source), "C" (temp) or "" (a .param) */
	struct sch_sweep_point *points;
	size_t n_points;
	double crossover;         /* value where carrier power equals the rest; NaN where it does not cross */
};

/*
 * The value at which the carriers' shot-noise power equals the rest, by log-log interpolation of
 * their ratio between the first pair of points that brackets 1 (linear where a value is <= 0);
 * NaN where the points do not cross. Points must be in sweep order. This function can't fail.
 */
double sch_sweep_crossover(const struct sch_sweep_point *points, size_t n);

/*
 * The crossover of a whole sweep, as sch_sweep_crossover over its n_points, except that a
 * temperature sweep (unit "C") is interpolated in kelvin, where the shot-to-thermal power ratio
 * goes as 1/T, and the result is handed back in degrees C. This function can't fail.
 */
double sch_sweep_crossover_of(const struct sch_sweep *s);

/*
 * Repeats the noise run of sch_analysis_run over values of one quantity (a current source's DC
 * value, a top-level .param through alterparam and reset, or "temp"), loading the circuit once per worker; opt->n_workers workers share the points.
 * The result res describes the last point; sweep gets every point and the crossover (log-log
 * interpolation of the carrier-to-rest power ratio). Errors as sch_analysis_run; SCH_ERR_USAGE for
 * a name that cannot be varied.
 */
enum sch_err sch_analysis_sweep(const char *path, const struct sch_run_options *opt, const char *name,
				const double *values, size_t n_values, struct sch_result *res, struct sch_sweep *sweep,
				struct sch_diag *d);

/*
 * One run of a batch: simulator commands that change the loaded circuit for that run only. A
 * batch point starts from the circuit as loaded only when its commands begin with "reset" (which
 * undoes every earlier alter and option); names in them must have passed sch_sim_name_is_safe.
 */
struct sch_batch_point {
	const char *const *commands;
	size_t n_commands;
};

/*
 * A batch: the sweep's machinery (one loaded circuit per worker, opt->n_workers workers) with a
 * change of its own per point. The hooks run in the calling process as each point arrives, in
 * the order points finish; prepare before the point's rows are made (it may change the carriers'
 * gains in res->set), take with the point's full result (rows ranked, band integrated; it must
 * copy what it keeps, the rows are freed after it) and the values of quantities read after the
 * point, undo after take (whatever happened). NULL hooks are skipped; a hook's error stops the run.
 */
struct sch_batch {
	const struct sch_batch_point *points;
	size_t n_points;
	const char *const *quantities;  /* extra quantities ("@r.x1.rf[resistance]") read after each point */
	size_t n_quantities;
	enum sch_err (*prepare)(void *ctx, size_t k, struct sch_result *res);
	enum sch_err (*take)(void *ctx, size_t k, const struct sch_result *res, const double *quantities);
	void (*undo)(void *ctx, size_t k, struct sch_result *res);
	void *ctx;
};

/*
 * Runs the points of batch as a sweep does (mode SCH_RUN_REPORT only, at least one point). res
 * ends with the values every point shares (names, band, temperature), no rows. Errors as
 * sch_analysis_run; SCH_ERR_USAGE for an empty batch.
 */
enum sch_err sch_analysis_batch(const char *path, const struct sch_run_options *opt, const struct sch_batch *batch,
				struct sch_result *res, struct sch_diag *d);

/* Options with every default set (junction correction on, NaN band, one worker). Can't fail. */
/*
 * Splits an output expression "v(a)" or "V( a , b )" into its node names, lower case, into a and b
 * (each of size bytes; b is "" without a reference). False, with a and b unspecified, when expr
 * is not such a form or a node name holds anything but letters, digits and _ . # + - [ ].
 */
bool sch_analysis_output_nodes(const char *expr, char *a, char *b, size_t size);

void sch_run_options_init(struct sch_run_options *opt);

#endif
