/* SPDX-License-Identifier: BSD-3-Clause */
/* sim_int.h - what the sim rooms share: the worker's and the collector's state and their entry points. */
#ifndef SCH_SIM_INT_H
#define SCH_SIM_INT_H

#include <stdbool.h>
#include <stddef.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <sys/types.h>

#include "schrot/sim.h"
#include "schrot/strmap.h"
#include "wire.h"

#define SCH_SIM_MAX_COMMAND 1000
/* A worker's exit status when an allocation failed (its own, or the library's followed by a crash). */
#define SCH_WORKER_EXIT_NOMEM 4

/* ---- worker side (runs in the child) ---------------------------------------------------- */

struct sch_worker_ctx {
	struct sch_wire_out out; /* the pipe to the parent */
	enum sch_phase phase;
	uint32_t step;
	volatile bool gave_up;
	bool load_error;
	/*
	 * The newest noise density plot of the current step. Its names go to the parent when the plot
	 * starts and each SendData row as it arrives, so no one holds the whole plot here. With
	 * "save none" the library itself keeps only each vector's last point, which is what keeps
	 * big circuits affordable. names is kept only until the first row has been checked against it.
	 */
	bool noise_live;  /* the plot now being written is a density plot */
	bool noise_seen;  /* this step produced one */
	bool noise_order_bad;
	bool data_file_bad; /* the step's data file did not read back whole */
	char **names;
	size_t n_names;
	size_t n_rows;
	/*
	 * The transient vectors the request asks for, as SendData delivers them: rows of
	 * 1 + n_tran_vectors values (time first), every point or only the interpolated samples.
	 */
	const struct sch_sim_request *req;
	bool tran_live;
	int tran_time_ix;
	int *tran_ix;         /* per wanted vector: its index in the plot, -1 when absent */
	double *tran_rows;
	size_t tran_n_rows, tran_cap;
	double *tran_prev;    /* the previous point, for interpolation */
	bool tran_have_prev;
	size_t tran_next;     /* next sample to produce */
};

/* Drops the density plot's names; the plot state stays. */
void sch_worker_noise_free_names(struct sch_worker_ctx *w);
/* Forgets the step's density plot: names, rows and every flag. */
void sch_worker_noise_clear(struct sch_worker_ctx *w);
/* Sends a starting density plot's names, or flags the plot as garbled when they are too big for a record. */
void sch_worker_send_noise_names(struct sch_worker_ctx *w);
/* Reads the density plot of the data file at path and sends it; a bad file flags the step (worker_file.c). */
void sch_worker_send_data_file(struct sch_worker_ctx *w, const char *path);
/*
 * In the worker: a SIGSEGV or SIGBUS after a failed allocation exits with SCH_WORKER_EXIT_NOMEM;
 * other crashes stay crashes; SIGINT, SIGTERM and SIGHUP act as they do on the tool (the library
 * would catch SIGINT and cut the analysis short). Called again after the library's start-up,
 * which installs handlers of its own.
 */
void sch_sim_catch_crashes(void);
/*
 * In a freshly forked worker (parent: the tool's pid): the run's budget as resource limits, no
 * core file, death with the tool, the tool's crash handlers reset (limits.c). Exits when the tool
 * is already gone; otherwise can't fail (a limit that cannot be set is left as it was).
 */
void sch_sim_worker_process_setup(pid_t parent);
/* The whole life of a worker process on steps [first, end), writing records to fd. Never returns. */
void sch_sim_worker_main(const struct sch_sim_request *req, char **deck, size_t first, size_t end, int fd);

/* ---- tool side ------------------------------------------------------------------------- */

struct sch_tagged_msg {
	char *text;
	uint8_t phase;
	uint32_t step;
};

struct sch_worker {
	pid_t pid;
	int fd;
	size_t first, end;          /* the steps [first, end) */
	unsigned char *buf;
	size_t len, off, cap;
	struct sch_tagged_msg *msgs;
	size_t n_msgs, msgs_cap;
	char *fatal;                /* setup failure sent by the worker */
	bool loaded, load_rc, gave_up, ended, malformed;
	uint32_t gave_up_step;      /* SCH_STEP_NONE: during set-up or load */
	enum sch_phase gave_up_phase;
	int status;                 /* from waitpid; -1 when unknown */
	int err_fd;                 /* the read end of the worker's stderr, -1 once closed */
	char err_text[512];         /* the first line the worker wrote to stderr, blanks folded */
	size_t err_len;
	bool err_line_done;         /* err_text holds a whole line: the rest is read and dropped */
	long long cpu_ticks;        /* the worker's CPU time when last looked at, -1 unknown */
	double cpu_seen_s;          /* monotonic time since when cpu_ticks has not moved */
	bool stalled;               /* killed after SCH_SIM_STALL_S without CPU time or output */
};

/*
 * A worker that neither writes nor uses CPU time for this long is stuck for good: the library
 * takes a lock again when an allocation fails inside a locked section. It is killed and its run
 * fails; a working worker is always either computing or writing.
 */
#define SCH_SIM_STALL_S 20.0

/*
 * A step's density plot while its rows arrive, transposed straight into the outcome's vectors:
 * o->vectors[first..] are the plot's, in name order. A vector has no storage (values NULL, cap 0)
 * while every value so far is exactly +0.0; it gets one at its first other value, with the zeros
 * before it filled in. When the step ends, the vectors that stayed zero share one array of zeros.
 */
struct sch_noise_stream {
	bool live;
	size_t first, end;          /* the plot's vectors are o->vectors[first, end) */
	size_t n_cols;              /* values per row */
	size_t n_rows;
	size_t *vec_of_col;         /* index into o->vectors, or SCH_NO_VECTOR for a column not kept */
	size_t *cap_of_col;         /* capacity of that vector's values */
};

struct sch_collect {
	struct sch_sim_result *res;
	const struct sch_sim_request *req;
	size_t *vec_cap;            /* capacity of res->steps[i].vectors */
	bool *step_done;
	uint8_t *step_flags;
	struct sch_noise_stream *noise; /* per step */
	size_t n_quantities;
	enum sch_err hook_err;      /* what on_step returned, when not SCH_OK: the run stops with it */
};

/* Frees an outcome's vectors (their names, values and the shared zeros); quantities stay. */
void sch_sim_outcome_free_vectors(struct sch_sim_outcome *o);
/* Drops a step's density plot: its vectors leave the outcome. */
void sch_sim_noise_stream_drop(struct sch_collect *c, size_t step);
/* Reads what is available on one worker's pipe and consumes its complete records. Sets *eof at end of stream. */
enum sch_err sch_sim_collect_read(struct sch_worker *wk, struct sch_collect *c, bool *eof);
/* Sizes res and c for req (every quantity NaN); SCH_ERR_NOMEM leaves what was allocated for release. */
enum sch_err sch_sim_collect_init(struct sch_sim_result *res, const struct sch_sim_request *req,
				  struct sch_collect *c);

/* The most telling failure line of one phase (and step), or NULL (then *nomem says whether memory ran out). */
char *sch_sim_judge_text(const struct sch_worker *wk, enum sch_phase phase, uint32_t step, bool *nomem);
/* Sets every step's failure and res->failure; *failed says whether anything failed. */
enum sch_err sch_sim_judge(struct sch_sim_result *res, struct sch_worker *wks, size_t n_wk,
			   struct sch_collect *c, bool *failed);

/* ---- keeping included text out of messages (redact.c) ---------------------------------- */

struct sch_redact {
	bool active;               /* the request marks private lines: texts are checked */
	struct sch_strmap words;   /* lower-cased deck word -> 1 only in private lines, 2 elsewhere too */
	char *text;                /* the keys' storage */
};

/* Learns the words of req's deck. SCH_ERR_NOMEM leaves r for sch_redact_release. */
enum sch_err sch_redact_init(struct sch_redact *r, const struct sch_sim_request *req);
/*
 * A copy of text with every word only private lines hold replaced by "…" (numbers and the words
 * "error", "warning", "on", "line" are kept), or NULL when nothing is replaced (*changed false)
 * or memory ran out (*changed true). The caller owns the copy.
 */
char *sch_redact_text(const struct sch_redact *r, const char *text, bool *changed);
void sch_redact_release(struct sch_redact *r);

/* ---- shared by both sides (run.c) ------------------------------------------------------- */

/*
 * The run's private directory ($TMPDIR/schrot-sim-XXXXXX, "" when there is none), made by the
 * tool before it forks and registered for removal on a signal: each worker makes the directory it
 * starts the library in inside it, so a worker killed while starting leaves nothing elsewhere.
 */
extern char sch_sim_session_dir[];

/* A character the simulator's command language would interpret. */
bool sch_sim_command_char_is_bad(unsigned char c);
/* The data file of a step in the run's private directory; false when there is none or it is unsafe. */
bool sch_sim_data_file_path(size_t step, char *out, size_t size);

/* Whether s, after leading blanks, starts with prefix, ignoring case. */
static inline bool sch_sim_starts_ci(const char *s, const char *prefix)
{
	while (*s == ' ' || *s == '\t')
		s++;
	return strncasecmp(s, prefix, strlen(prefix)) == 0;
}

/* A NUL-terminated copy of n bytes at p; NULL when out of memory. */
static inline char *sch_sim_dup_mem(const void *p, size_t n)
{
	char *s = malloc(n + 1);

	if (!s)
		return NULL;
	memcpy(s, p, n);
	s[n] = '\0';
	return s;
}

#endif
