/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * analysis_int.h - internals shared by the analysis rooms: the state one analysis carries from its
 * plan through the simulator run to the rows, corrections, band integration, verdict and sweep.
 */
#ifndef SCH_ANALYSIS_INT_H
#define SCH_ANALYSIS_INT_H

#include <stdbool.h>
#include <stddef.h>
#include "schrot/analysis.h"
#include "schrot/augment.h"
#include "schrot/sim.h"
#include "schrot/strmap.h"

/* Growable list of const char * in the result arena. */
struct sch_strlist {
	const char **v;
	size_t n, cap;
};

/* Appends s (NULL counts as out of memory). Returns SCH_ERR_NOMEM and leaves l unchanged on failure. */
enum sch_err sch_strlist_push(struct sch_arena *a, struct sch_strlist *l, const char *s);

/* The noise analysis to run, resolved from the deck's .noise line and the options. */
struct sch_noise_plan {
	const char *output;
	const char *input;
	char letter;        /* 'i' or 'v' */
	double f_start, f_stop;
	char command[1040];
	char bare_command[1024]; /* the same run without per-device vectors */
	bool needs_ac;      /* the input source has no AC value of its own */
};

/* Quantity indices into the outcome's quantity array. */
struct sch_quantity_plan {
	struct sch_strlist names;
	size_t temp;
	size_t carriers;   /* first carrier current; one per carrier */
	size_t noiseless;  /* first noiseless-source current */
	size_t diodes;     /* first diode quantity; three (id, vd, gd) per diode instance */
	int *diode_inst;   /* the diode instances, n_diodes of them */
	size_t n_diodes;
	size_t bjts;       /* first bipolar quantity; four (ic, ib, vbe, vbc) per bipolar instance */
	int *bjt_of_inst;  /* instance -> its index among the bipolar instances, -1 */
	size_t extra;      /* first of a batch's own quantities */
	size_t values;     /* read_values: first instance value */
	int *value_inst;   /* read_values: the instance of each value quantity, n_values of them */
	size_t n_values;
};

/* Everything the mapping of simulator vectors to device instances needs. */
struct sch_vector_map {
	struct sch_strmap devices;  /* simulator name -> instance index */
	struct sch_strmap probes;   /* probe resistor simulator name -> instance index of the probed device */
	int *probe_vec;             /* instance -> vector index of its probe, -1 */
	int *id_vec;                /* instance -> vector index of the simulator's "id" generator, -1 */
	int *id_row;                /* instance -> contribution index of that generator, -1 */
	int *ic_row, *ib_row;       /* instance -> contribution index of a bipolar's "ic" / "ib" row, -1 */
	int *probe_owner;           /* instance -> the instance whose probe it shares (a paired diode), -1 */
};

/* Growable array of contributions in the result arena. */
struct sch_row_list {
	struct sch_contribution *v;
	size_t n, cap;
};

/* --lump: which resistor definitions run quiet, and the row that stands for them. */
struct sch_lump_plan {
	bool *quiet;          /* deck element index -> quiet; NULL when there is no lump */
	size_t n_instances;   /* resistor instances in the row */
	const char *label;    /* the row's device name */
};

/* How a sweep changes one quantity per step; a batch (name NULL) carries each point's own change. */
struct sch_vary_plan {
	const char *name;
	const double *values;
	size_t n;
	struct sch_sweep *sweep;
	const struct sch_batch *batch;  /* NULL for a sweep */
};

/*
 * One analysis from plan to result: what analysis_core's steps build and hand on. It lives on
 * analysis_core's stack; strings and arrays it points to live in res->arena.
 */
struct sch_analysis {
	struct sch_result *res;
	const struct sch_run_options *opt;
	const struct sch_vary_plan *vary;   /* NULL for a single report */
	struct sch_diag *d;
	struct sch_noise_plan plan;         /* mode SCH_RUN_REPORT only */
	struct sch_augment_options aopt;
	struct sch_lump_plan lump;          /* lump.quiet NULL: no --lump */
	struct sch_augmented aug;           /* the deck the simulator runs */
	struct sch_augmented aug_full;      /* --lump: the circuit's own noise, every resistor noisy */
	struct sch_quantity_plan q;
	struct sch_vector_map m;
	struct sch_strlist notes;
	const char *commands[2];            /* every step ends with these: "run" or "op", then "op" again */
	size_t n_commands;
	const char *bare_commands[1];       /* --lump: the second run's commands */
	struct sch_sim_step one_step;
	struct sch_sim_step *steps;
	size_t n_steps;
	struct sch_sim_request req;
	struct sch_sim_result sim;
	const struct sch_sim_outcome *full; /* --lump: the circuit's own noise run */
	struct sch_source *noiseless_all;   /* sweeps: the sources before any point compacted them */
	size_t n_noiseless_all;
	size_t n_done;                      /* sweeps: points taken so far */
	long junction_note;                 /* index in notes of the junction correction's note, -1: none */
	int n_junction_rows;                /* junction correction rows made (before small ones are dropped) */
	double gmin;                        /* the deck's GMIN, for that note */
};

/* One noise outcome being turned into rows: what the parts of sch_analysis_take_noise share. */
struct sch_row_build {
	struct sch_result *res;
	const struct sch_quantity_plan *q;
	const struct sch_sim_outcome *o;
	struct sch_vector_map *m;
	struct sch_row_list list;
	size_t nf;                  /* frequency points */
	double unit;                /* a probe's own density as the simulator computes it: 4 k_sim T / R */
	double gmin;                /* the deck's GMIN */
	double *carrier_of_inst;    /* instance -> carrier index, -1 */
	double *own;                /* --lump: the simulator's own rows summed over devices; NULL otherwise */
};

/* Appends a note to an's notes (NULL s counts as out of memory). Returns SCH_ERR_NOMEM on failure. */
enum sch_err sch_analysis_note(struct sch_analysis *an, const char *s);

/* plan.c */

/*
 * Resolves the noise run from the deck's .noise card and opt into plan (strings in a). Returns
 * SCH_ERR_USAGE or SCH_ERR_INPUT with a located message, SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_plan_noise(const struct sch_deck *deck, const struct sch_run_options *opt,
				     struct sch_arena *a, struct sch_noise_plan *plan, struct sch_diag *d);

/*
 * Report mode: plans the noise run, names its output and input in the result, notes an input
 * without AC value and sets the augment options the run needs. No-op in operating-point mode.
 * Errors as sch_analysis_plan_noise.
 */
enum sch_err sch_analysis_plan_report(struct sch_analysis *an);

/* GMIN from ".options gmin=X" (the simulator's default 1e-12 otherwise). This function can't fail. */
double sch_analysis_deck_gmin(const struct sch_deck *deck);

/* The quantities read after each step, in q (arrays in res->arena). Returns SCH_ERR_NOMEM on failure. */
enum sch_err sch_analysis_plan_quantities(struct sch_result *res, const struct sch_augmented *aug,
					  struct sch_quantity_plan *q);

/* run.c */

/*
 * The decks the simulator runs: with --lump first the circuit's own (every resistor noisy, our
 * generators quiet), then the per-device one with the noise card. Errors as sch_augment_build.
 */
enum sch_err sch_analysis_build_decks(struct sch_analysis *an);

/*
 * The commands every step ends with ("run" or "op", and "op" again where a G, F or B element's
 * current needs the DC solution back) and the single step made of them. This function can't fail.
 */
void sch_analysis_plan_steps(struct sch_analysis *an);

/*
 * Fills an->req from the built decks, steps and quantities; in report mode it maps the vectors to
 * instances first. Returns SCH_ERR_NOMEM on failure.
 */
enum sch_err sch_analysis_build_request(struct sch_analysis *an);

/*
 * Runs the request, reporting a simulator failure at the netlist line it concerns, and records the
 * simulator's version. Returns what sch_sim_run returns, SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_simulate(struct sch_analysis *an);

/*
 * One step's outcome into the result: its operating point and, in report mode, its rows and their
 * band integration. Returns SCH_ERR_SIM for missing values, SCH_ERR_USAGE for a band or spot
 * outside the run, SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_take_step(struct sch_analysis *an, const struct sch_sim_outcome *o);

/* A single run's outcome (sweeps take theirs as they arrive). Errors as sch_analysis_take_step. */
enum sch_err sch_analysis_take_outcome(struct sch_analysis *an);

/* contributions.c */

/*
 * Appends an empty row with room for n_freq densities (+1): DC current NaN, one device. Returns
 * NULL when out of memory; earlier rows may then have moved but are unchanged.
 */
struct sch_contribution *sch_analysis_row_add(struct sch_arena *a, struct sch_row_list *l, size_t n_freq);

/* Indexes the instances and their probes by simulator name in an->m. Returns SCH_ERR_NOMEM on failure. */
enum sch_err sch_analysis_map_vectors(struct sch_analysis *an);

/*
 * Whether a density vector is one the rows use (sch_sim_request.keep_vector; ctx is the
 * struct sch_vector_map). This function can't fail.
 */
bool sch_analysis_keep_vector(void *ctx, const char *name);

/*
 * --lump: refuses it outside a single report, matches the resistors and sets the augment options
 * for the two runs. No-op without --lump. Returns SCH_ERR_USAGE, SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_plan_lump(struct sch_analysis *an);

/*
 * The rows of one noise outcome: scaled generators, the simulator's own, corrections and the lump
 * row, into an->res. Returns SCH_ERR_SIM when the outcome lacks spectra, SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_take_noise(struct sch_analysis *an, const struct sch_sim_outcome *o);

/* corrections.c */

/*
 * With the junction correction on (the default), adds the junction (diode) and bipolar correction
 * rows to rb->list and their notes to an; no-op otherwise. Returns SCH_ERR_NOMEM on failure.
 */
enum sch_err sch_analysis_correct(struct sch_analysis *an, struct sch_row_build *rb);

/* integrate.c */

/*
 * Band powers, shares, ranking, the verdict, input referral, SNR and spots of res's rows. Returns
 * SCH_ERR_USAGE for a band or spot outside the simulated range, SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_integrate(struct sch_result *res, const struct sch_run_options *opt, struct sch_diag *d);

/* rules.c */

/*
 * Refuses (SCH_ERR_USAGE) an --avalanche or --fano rule that matches no carrier but a diode,
 * naming the carrier across that diode to use instead. SCH_ERR_INPUT for a bad regex.
 */
enum sch_err sch_analysis_check_rules(struct sch_analysis *an);

/* A note per gain rule: M, k and F(M), or the Fano factor, and the carriers it set. SCH_ERR_NOMEM. */
enum sch_err sch_analysis_note_rules(struct sch_analysis *an);

/* The avalanche gain M of the carrier that is the noise input source; 1 without one. Can't fail. */
double sch_analysis_input_gain(const struct sch_result *res);

/* transfer.c */

/*
 * res->transfer from the squared gain once the band is set: the reference frequency (opt's signal
 * frequency, else the band's peak |H|), mid-band value, -3 dB points and noise-equivalent
 * bandwidth. Returns SCH_ERR_USAGE for a signal frequency outside the simulated range.
 */
enum sch_err sch_analysis_transfer(struct sch_result *res, const struct sch_run_options *opt, struct sch_diag *d);

/* verdict.c */

/*
 * The device that leads besides the added carriers and the carriers' ratio to the rest, from rows
 * ranked by band power. Returns SCH_ERR_NOMEM on failure.
 */
enum sch_err sch_analysis_verdict(struct sch_result *res);

/*
 * After integration: when the table dropped junction correction rows too small to matter, the
 * junction note says how many (so its count matches the rows). SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_junction_note_recount(struct sch_analysis *an);

/*
 * After integration: a note per carrier with a --fano rule (2q|I|F holds well below its electron
 * rate |I|/q) and, outside sweeps, a warning when the band reaches within a decade of that rate.
 * SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_fano_notes(struct sch_analysis *an);

/*
 * After the operating point: a note per carrier whose netlist value is a time function (PULSE,
 * SIN, ...) naming the DC operating-point current its generator is sized from and, outside
 * sweeps, a warning when that current is zero. SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_time_source_notes(struct sch_analysis *an);

/*
 * dialect.c: the compatibility mode (--dialect, else a .spiceinit's one setting read as data) in
 * res->compat_mode, with notes saying where it came from and what of the .spiceinit was ignored.
 * SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_plan_dialect(struct sch_analysis *an);

/* light.c: a note when the input is a voltage standing for the optical power a carrier reads. SCH_ERR_NOMEM. */
enum sch_err sch_analysis_note_light_input(struct sch_analysis *an);
/* light.c: a note naming how many E/G TABLE sources run as pwl() (sch_augment_table_as_value). SCH_ERR_NOMEM. */
enum sch_err sch_analysis_note_tables(struct sch_analysis *an);

/* The notes that close a run (resistor count, noiseless sources, the constants). SCH_ERR_NOMEM. */
enum sch_err sch_analysis_closing_notes(struct sch_analysis *an);

/* sweep.c */

/*
 * A sweep's steps: per point, the command that sets the varied quantity (and a reset for a
 * .param), then an->commands. No-op for a single run. SCH_ERR_USAGE for a name that cannot be
 * varied, SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_sweep_steps(struct sch_analysis *an);

/*
 * Before a sweep runs: reports progress 0, keeps the full list of sources and hands each point
 * to the result as it finishes (an->req.on_step). No-op for a single run. SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_sweep_prepare(struct sch_analysis *an);

/* values.c */

/*
 * opt->read_values: one quantity per resistor, capacitor and current source instance whose
 * simulator name is safe ("@r.x1.rf[resistance]", "[capacitance]", "[dc]"). No-op otherwise. SCH_ERR_NOMEM.
 */
enum sch_err sch_analysis_value_quantities(struct sch_analysis *an);

/* Copies the values read into res->instance_values (NaN elsewhere). No-op otherwise. SCH_ERR_NOMEM. */
enum sch_err sch_analysis_take_values(struct sch_analysis *an, const struct sch_sim_outcome *o);

/* A batch's own quantities after the planned ones (q->extra). No-op otherwise. SCH_ERR_NOMEM. */
enum sch_err sch_analysis_batch_quantities(struct sch_analysis *an);

/* After a sweep ran: every point taken, and the crossover. SCH_ERR_SIM for a point without result. */
enum sch_err sch_analysis_sweep_finish(struct sch_analysis *an);

#endif
