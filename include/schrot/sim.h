/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * sim.h - the simulator session. Only src/sim/ talks to the ngspice shared library. Every run
 * happens in a worker process, so a simulator crash, exit or dead library never takes the tool
 * down; netlist text and start-up scripts never make the simulator run commands.
 */
#ifndef SCH_SIM_H
#define SCH_SIM_H

#include <stdbool.h>
#include <stddef.h>
#include "schrot/arena.h"
#include "schrot/diag.h"

/* Commands run in order in one step, e.g. "noise v(out) iph dec 10 1 1meg 1" or "op". */
struct sch_sim_step {
	const char *const *commands;
	size_t n_commands;
	/*
	 * A deck of its own for this step (NULL: the request's). A request with any such step runs
	 * every step in a worker of its own, all at once, so it may have at most 64 steps.
	 */
	const char *const *lines;
	size_t n_lines;
};

struct sch_sim_outcome;

struct sch_sim_request {
	const char *const *lines;      /* the deck: lines[0] is the title, the last line is ".end" */
	size_t n_lines;
	/*
	 * n_lines flags, true for a line holding text of an included or library file; NULL: none.
	 * Words only such lines hold are replaced by "…" in every simulator text the session passes
	 * on (failure reasons, notes, messages), so included text never reaches a message.
	 */
	const bool *private_lines;
	/* Text of the data files code models read (never in lines): every word only they hold is left out too. */
	const char *const *private_texts;
	size_t n_private_texts;
	const struct sch_sim_step *steps;
	size_t n_steps;
	const char *const *quantities; /* read after each step, e.g. "@i.x1.iph[current]", "@d.x1.d1[vd]" */
	size_t n_quantities;
	bool collect_noise;            /* after each step, copy every vector of the newest noise density plot */
	bool squared_noise;            /* "set sqrnoise": densities in V^2/Hz (or A^2/Hz) */
	/*
	 * A step command "run" runs the deck's own analysis cards (a ".noise" line), and the simulator
	 * writes its data to a file in a private directory instead of building a vector per generator
	 * in memory; the worker reads the density plot back from that file. Same numbers as the
	 * SendData path, far less memory for big circuits. Transient vectors cannot be collected then.
	 */
	bool noise_via_file;
	int n_workers;                 /* worker processes sharing the steps (<= 1: one) */
	/*
	 * Transient vectors collected from the simulator's data stream during each step (the library
	 * itself keeps none under "save none"): names as the simulator's transient plot calls them
	 * ("out", "x1.k"; "v(out)" is read as "out"). Each step's outcome then holds "time" and one
	 * vector per name found, under the name as given. With tran_sample_step_s > 0 only
	 * tran_n_samples values are kept, linearly interpolated at tran_sample_start_s + (k+1) *
	 * tran_sample_step_s, so memory does not grow with the number of time points.
	 */
	const char *const *tran_vectors;
	size_t n_tran_vectors;
	double tran_sample_start_s;
	double tran_sample_step_s;
	size_t tran_n_samples;
	/*
	 * Run a one-point AC analysis before each step's noise run. ngspice 39 evaluates code-model
	 * (A) devices' small-signal response wrongly in a noise run that no AC analysis preceded
	 * (measured: an s_xfer low-pass gave an output density rising with frequency); after one, every
	 * point but the first agrees with a plain AC analysis.
	 */
	bool prime_ac;
	/*
	 * The simulator's compatibility mode ("ps", "ltpsa": ngspice's ngbehavior), set before the
	 * deck loads; NULL for none. Only a value sch_sim_compat_mode_known accepts is applied.
	 */
	const char *compat_mode;
	/*
	 * Code-model libraries by file name ("analog.cm"), loaded from the simulator's own directory
	 * besides the standard ones (spice2poly, analog, digital, xtradev, xtraevt, table), which are
	 * always loaded.
	 */
	const char *const *code_models;
	size_t n_code_models;
	/*
	 * Which density vectors (collect_noise) the outcome keeps: called once per vector name when
	 * a density plot starts; a vector it returns false for is dropped as its data arrives and is
	 * not in the outcome. NULL keeps every vector.
	 */
	bool (*keep_vector)(void *ctx, const char *name);
	void *keep_vector_ctx;
	/*
	 * Called in the tool as soon as a step's data is complete and sound (its commands left no
	 * error, its noise plot arrived whole), in the order steps finish, not their index order.
	 * The session then frees the step's vectors (its quantities stay) and sets its consumed flag,
	 * so a long sweep never holds more than the steps in flight. A return other than SCH_OK stops
	 * the run with that error. NULL: every step is kept until the run ends.
	 */
	enum sch_err (*on_step)(void *ctx, size_t step, const struct sch_sim_outcome *o);
	void *on_step_ctx;
};

struct sch_sim_vector {
	char *name;      /* as the simulator names it: "frequency", "onoise_spectrum", "onoise_d.x1.d1_id" */
	double *values;  /* n values, never NULL; read-only: may be the outcome's shared_zeros */
	size_t n;
};

/* What one step produced. */
struct sch_sim_outcome {
	double *quantities;            /* n_quantities values; NaN where the simulator had none */
	struct sch_sim_vector *vectors;
	size_t n_vectors;
	/*
	 * The values of every density vector that was exactly zero throughout (NULL when there is
	 * none): such vectors share this one array instead of holding their own.
	 */
	double *shared_zeros;
	char *failure;                 /* NULL when the step succeeded, else the simulator's reason, one line */
	bool consumed;                 /* on_step took it; its vectors are gone */
};

struct sch_sim_result {
	char *version;                 /* e.g. "ngspice-39" */
	struct sch_sim_outcome *steps; /* n_steps entries */
	size_t n_steps;
	char **messages;               /* the simulator's own lines, "stdout "/"stderr " prefix removed */
	size_t n_messages;
	char *failure;                 /* NULL on success; else the first reason (load or step), one line */
};

/*
 * Loads the deck in a fresh worker, runs the steps, reads quantities and vectors. Command strings
 * containing any of ` ; > < | & $ ~ " or a newline are refused (SCH_ERR_USAGE) before anything
 * runs. Returns SCH_ERR_SIM when the deck does not load, a step fails, the simulator asks to exit
 * or the worker dies; res->failure then says why. res must be released in every case.
 */
enum sch_err sch_sim_run(const struct sch_sim_request *req, struct sch_sim_result *res, struct sch_diag *d);

/* Frees everything in res; res is then empty. No-op on NULL. */
void sch_sim_result_release(struct sch_sim_result *res);

/* The vector called name in an outcome, or NULL. */
const struct sch_sim_vector *sch_sim_find_vector(const struct sch_sim_outcome *o, const char *name);

/*
 * What each worker process may use, set with setrlimit in the worker: CPU seconds (RLIMIT_CPU),
 * memory in MiB (RLIMIT_DATA) and the size of the data file it writes (RLIMIT_FSIZE, the same
 * MiB figure). A worker that hits one fails its run with that cause (exit 3).
 */
#define SCH_SIM_DEFAULT_CPU_S 3600.0
#define SCH_SIM_DEFAULT_MEM_MIB 8192.0
struct sch_sim_budget {
	double cpu_s;
	double mem_mib;
};

/* Sets the budget of every worker started from now on in this process. Values <= 0 keep the current one. */
void sch_sim_set_budget(const struct sch_sim_budget *b);

/* The budget workers get now (the defaults unless sch_sim_set_budget changed it). */
struct sch_sim_budget sch_sim_get_budget(void);

/* The canonical spelling of a compatibility mode ngspice reads (case ignored), or NULL for any other text. */
const char *sch_sim_compat_mode_known(const char *mode);

/* The known compatibility modes, for messages: "a, all, eg, ...". Static storage. */
const char *sch_sim_compat_mode_list(void);

/* What a .spiceinit beside a netlist says, read as data (the file is never run). */
struct sch_spiceinit {
	const char *path;      /* where it was looked for */
	bool present;          /* the file exists and was read */
	const char *mode;      /* its "set ngbehavior=..." with a known value, or NULL */
	long mode_line;        /* that line, 1-based */
	const char *bad_mode;  /* a "set ngbehavior=..." value that is not known, or NULL */
	size_t n_ignored;      /* lines that say something else (never honoured) */
};

/*
 * Reads the .spiceinit in netlist's directory, if any, for its one compatibility-mode setting;
 * every other line is only counted. A missing or unreadable file is no error (si->present false).
 * Strings live in arena. Returns SCH_ERR_NOMEM only.
 */
enum sch_err sch_sim_read_spiceinit(const char *netlist, struct sch_arena *arena, struct sch_spiceinit *si,
				    struct sch_diag *d);

/* True when name consists only of [a-z0-9_.#+-] characters and is 1..200 bytes long. */
bool sch_sim_name_is_safe(const char *name);

/*
 * Whether a path may reach the simulator (a command, or a code model's data file named in a
 * .model card): no quotes, backquotes, blanks, backslashes, ';', '$', '>', '<', '|', '&', '~' or
 * control bytes, and short enough for a command line. This function can't fail.
 */
bool sch_sim_path_is_command_safe(const char *p);

#endif
