/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * sim_ngspice.c - the simulator session: forks worker processes that drive the ngspice shared
 * library and stream their results back over a pipe. The only file that includes sharedspice.h.
 */
#define _GNU_SOURCE /* dladdr, strcasestr */
#include <ctype.h>
#include <dlfcn.h>
#include <errno.h>
#include <fcntl.h>
#include <limits.h>
#include <math.h>
#include <poll.h>
#include <signal.h>
#include <stdbool.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <unistd.h>

#include <ngspice/sharedspice.h>

#include "schrot/sim.h"

#define SCH_SIM_TITLE "* schrot deck"
#define SCH_SIM_MAX_COMMAND 1000
#define SCH_SIM_MAX_WORKERS 64
#define SCH_SIM_FALLBACK_CM "/usr/lib/x86_64-linux-gnu/ngspice/spice2poly.cm"
#define SCH_SIM_MAX_RECORD ((uint32_t)1 << 31)
#define SCH_SIM_READS_PER_GC 8

/*
 * Wire format, worker -> parent: records of kind (u8), payload length (u32), payload. Integers and
 * doubles are in native byte order (both ends are the same process image).
 */
enum sch_rec {
	SCH_REC_MSG = 1,   /* u8 phase, u32 step, text */
	SCH_REC_FATAL,     /* text: the worker could not set up the simulator */
	SCH_REC_LOADED,    /* u8 ngSpice_Circ returned nonzero */
	SCH_REC_QUANT,     /* u32 step, then n_quantities doubles */
	SCH_REC_VEC,       /* u32 step, u32 name length, name, u32 n, n doubles */
	SCH_REC_STEP_DONE, /* u32 step, u8 flags */
	SCH_REC_GAVE_UP,   /* ControlledExit was called */
	SCH_REC_END,       /* the worker finished */
	SCH_REC_NOISE_NAMES, /* u32 step, u32 n, then n times (u32 name length, name): a density plot starts */
	SCH_REC_NOISE_ROW    /* u32 step, u32 n, n doubles: one frequency point of that plot, in name order */
};

/* Which part of the worker's job a simulator line belongs to; decides how it is judged. */
enum sch_phase {
	SCH_PHASE_INIT = 0, /* ngSpice_Init banner, code model, options: not kept */
	SCH_PHASE_LOAD,     /* ngSpice_Circ */
	SCH_PHASE_STEP,     /* a step's commands */
	SCH_PHASE_READ,     /* quantity and vector reads: errors here only mean "no value" */
	SCH_PHASE_CLEANUP   /* destroy all between steps */
};

#define SCH_STEP_NO_NOISE_PLOT 0x1u
#define SCH_STEP_NOISE_GARBLED 0x2u
#define SCH_STEP_DATA_FILE_BAD 0x4u
#define SCH_STEP_NONE UINT32_MAX

/* ------------------------------------------------------------------------------------------ */
/* Worker side                                                                                */
/* ------------------------------------------------------------------------------------------ */

struct sch_worker_ctx {
	int fd;
	unsigned char *buf;
	size_t len;
	size_t cap;
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

static void worker_write_raw(struct sch_worker_ctx *w, const void *p, size_t n)
{
	const unsigned char *s = p;

	while (n > 0) {
		ssize_t k = write(w->fd, s, n);
		if (k < 0) {
			if (errno == EINTR)
				continue;
			_exit(3); /* the parent is gone; nothing left to report to */
		}
		s += k;
		n -= (size_t)k;
	}
}

static void worker_flush(struct sch_worker_ctx *w)
{
	worker_write_raw(w, w->buf, w->len);
	w->len = 0;
}

static void worker_put(struct sch_worker_ctx *w, const void *p, size_t n)
{
	if (w->len + n > w->cap)
		worker_flush(w);
	if (n > w->cap) {
		worker_write_raw(w, p, n);
		return;
	}
	memcpy(w->buf + w->len, p, n);
	w->len += n;
}

static void worker_put_u8(struct sch_worker_ctx *w, uint8_t v)
{
	worker_put(w, &v, 1);
}

static void worker_put_u32(struct sch_worker_ctx *w, uint32_t v)
{
	worker_put(w, &v, sizeof(v));
}

static void worker_header(struct sch_worker_ctx *w, enum sch_rec kind, size_t payload)
{
	worker_put_u8(w, (uint8_t)kind);
	worker_put_u32(w, (uint32_t)payload);
}

static void worker_send_text(struct sch_worker_ctx *w, enum sch_rec kind, const char *text)
{
	size_t n = strlen(text);

	if (n > 65536)
		n = 65536;
	worker_header(w, kind, n);
	worker_put(w, text, n);
	worker_flush(w);
}

static void worker_send_empty(struct sch_worker_ctx *w, enum sch_rec kind)
{
	worker_header(w, kind, 0);
	worker_flush(w);
}

static bool starts_ci(const char *s, const char *prefix)
{
	while (*s == ' ' || *s == '\t')
		s++;
	return strncasecmp(s, prefix, strlen(prefix)) == 0;
}

/* SendChar: every simulator line goes straight to the parent, so a crash loses nothing. */
static int worker_on_char(char *text, int id, void *user)
{
	struct sch_worker_ctx *w = user;
	size_t n;

	if (!text)
		return 0;
	if (strncmp(text, "stdout ", 7) == 0 || strncmp(text, "stderr ", 7) == 0)
		text += 7;
	n = strlen(text);
	while (n > 0 && (text[n - 1] == '\n' || text[n - 1] == '\r'))
		n--;
	if (n > 65536)
		n = 65536;
	if (w->phase == SCH_PHASE_LOAD && starts_ci(text, "error"))
		w->load_error = true;
	/* a data-file run says where it writes and how much: not news */
	if (w->req && w->req->noise_via_file &&
	    (starts_ci(text, "binary raw file") || starts_ci(text, "No. of Data ")))
		return 0;
	worker_header(w, SCH_REC_MSG, 1 + 4 + n);
	worker_put_u8(w, (uint8_t)w->phase);
	worker_put_u32(w, w->step);
	worker_put(w, text, n);
	worker_flush(w);
	return 0;
}

/* ControlledExit: the library is dead from now on. Never exit here; the worker loop stops. */
static int worker_on_exit(int status, NG_BOOL immediate, NG_BOOL quit, int id, void *user)
{
	struct sch_worker_ctx *w = user;

	w->gave_up = true;
	return 0;
}

static bool command_char_is_bad(unsigned char c)
{
	return c < 0x20 || c == 0x7f || strchr("`;><|&$~\"", c) != NULL;
}

/* A path may go into a command only if the command language cannot read anything into it. */
static bool path_is_command_safe(const char *p)
{
	if (strlen(p) > SCH_SIM_MAX_COMMAND - 16)
		return false;
	for (; *p; p++)
		if (command_char_is_bad((unsigned char)*p) || *p == ' ' || *p == '\'' || *p == '\\')
			return false;
	return true;
}

/*
 * With noise_via_file: the private directory the simulator writes its data files to, one per
 * step ("s12.raw"). The parent makes it before it forks the workers and removes it afterwards.
 */
static char sch_data_dir[PATH_MAX];

static bool data_file_path(size_t step, char *out, size_t size)
{
	int n = snprintf(out, size, "%s/s%zu.raw", sch_data_dir, step);

	return sch_data_dir[0] && n > 0 && (size_t)n < size && path_is_command_safe(out);
}

static void noise_free_names(struct sch_worker_ctx *w)
{
	if (w->names)
		for (size_t i = 0; i < w->n_names; i++)
			free(w->names[i]);
	free(w->names);
	w->names = NULL;
}

static void noise_clear(struct sch_worker_ctx *w)
{
	noise_free_names(w);
	w->n_names = w->n_rows = 0;
	w->noise_live = w->noise_seen = w->noise_order_bad = w->data_file_bad = false;
}

static void tran_clear(struct sch_worker_ctx *w)
{
	free(w->tran_ix);
	free(w->tran_rows);
	free(w->tran_prev);
	w->tran_ix = NULL;
	w->tran_rows = w->tran_prev = NULL;
	w->tran_n_rows = w->tran_cap = w->tran_next = 0;
	w->tran_live = w->tran_have_prev = false;
	w->tran_time_ix = -1;
}

/* "v(out)" and "out" both name the node vector "out". */
static bool tran_name_matches(const char *vecname, const char *wanted)
{
	size_t n = strlen(wanted);

	if (n > 3 && strncasecmp(wanted, "v(", 2) == 0 && wanted[n - 1] == ')')
		return strlen(vecname) == n - 3 && strncasecmp(vecname, wanted + 2, n - 3) == 0;
	return strcasecmp(vecname, wanted) == 0;
}

/* A transient plot starts: find the wanted vectors and "time" in its list. */
static void tran_start(struct sch_worker_ctx *w, pvecinfoall info)
{
	const struct sch_sim_request *req = w->req;
	size_t width = 1 + req->n_tran_vectors;

	tran_clear(w);
	w->tran_ix = malloc(req->n_tran_vectors * sizeof(*w->tran_ix));
	w->tran_prev = malloc(width * sizeof(*w->tran_prev));
	if (!w->tran_ix || !w->tran_prev)
		_exit(4);
	for (size_t j = 0; j < req->n_tran_vectors; j++) {
		w->tran_ix[j] = -1;
		for (int i = 0; i < info->veccount; i++)
			if (info->vecs[i] && info->vecs[i]->vecname && req->tran_vectors[j] &&
			    tran_name_matches(info->vecs[i]->vecname, req->tran_vectors[j]))
				w->tran_ix[j] = i;
	}
	for (int i = 0; i < info->veccount; i++)
		if (info->vecs[i] && info->vecs[i]->vecname && strcmp(info->vecs[i]->vecname, "time") == 0)
			w->tran_time_ix = i;
	w->tran_live = w->tran_time_ix >= 0;
}

/*
 * Tells the parent the names of a density plot that starts. A plot too big for records is
 * flagged as garbled instead (the parent then keeps none of it).
 */
static void worker_send_noise_names(struct sch_worker_ctx *w)
{
	size_t payload = 8;

	for (size_t i = 0; i < w->n_names && payload < SCH_SIM_MAX_RECORD; i++)
		payload += 4 + strlen(w->names[i]);
	if (payload >= SCH_SIM_MAX_RECORD || 8 + 8 * w->n_names >= SCH_SIM_MAX_RECORD) {
		w->noise_order_bad = true;
		return;
	}
	worker_header(w, SCH_REC_NOISE_NAMES, payload);
	worker_put_u32(w, w->step);
	worker_put_u32(w, (uint32_t)w->n_names);
	for (size_t i = 0; i < w->n_names; i++) {
		size_t len = strlen(w->names[i]);

		worker_put_u32(w, (uint32_t)len);
		worker_put(w, w->names[i], len);
	}
}

/* SendInitData: a new plot starts. A noise plot holding "frequency" is a density plot. */
static int worker_on_init_data(pvecinfoall info, int id, void *user)
{
	struct sch_worker_ctx *w = user;
	bool density = false;

	w->noise_live = false;
	w->tran_live = false;
	if (info && info->type && strncmp(info->type, "tran", 4) == 0 && info->veccount > 0 && w->req &&
	    w->req->n_tran_vectors > 0) {
		tran_start(w, info);
		return 0;
	}
	if (!info || !info->type || strncmp(info->type, "noise", 5) != 0 || info->veccount <= 0)
		return 0;
	for (int i = 0; i < info->veccount; i++)
		if (info->vecs[i] && info->vecs[i]->vecname && strcmp(info->vecs[i]->vecname, "frequency") == 0)
			density = true;
	if (!density)
		return 0;
	noise_clear(w);
	w->names = calloc((size_t)info->veccount, sizeof(*w->names));
	if (!w->names)
		_exit(4);
	for (int i = 0; i < info->veccount; i++) {
		w->names[i] = strdup(info->vecs[i] && info->vecs[i]->vecname ? info->vecs[i]->vecname : "");
		if (!w->names[i])
			_exit(4);
	}
	w->n_names = (size_t)info->veccount;
	w->noise_live = w->noise_seen = true;
	if (w->req && w->req->collect_noise)
		worker_send_noise_names(w);
	return 0;
}

static void tran_append(struct sch_worker_ctx *w, const double *row)
{
	size_t width = 1 + w->req->n_tran_vectors;

	if ((w->tran_n_rows + 1) * width > w->tran_cap) {
		size_t cap = w->tran_cap ? 2 * w->tran_cap : 1024 * width;
		double *grown = realloc(w->tran_rows, cap * sizeof(*grown));

		if (!grown)
			_exit(4);
		w->tran_rows = grown;
		w->tran_cap = cap;
	}
	memcpy(w->tran_rows + w->tran_n_rows * width, row, width * sizeof(*row));
	w->tran_n_rows++;
}

/* One accepted transient point: kept, or turned into the samples it passes. */
static void tran_on_data(struct sch_worker_ctx *w, pvecvaluesall vals)
{
	const struct sch_sim_request *req = w->req;
	size_t width = 1 + req->n_tran_vectors;
	double cur[1 + 64], *row = width <= 65 ? cur : malloc(width * sizeof(*row));

	if (!row)
		_exit(4);
	if (w->tran_time_ix >= vals->veccount) {
		w->tran_live = false;
		goto out;
	}
	row[0] = vals->vecsa[w->tran_time_ix]->creal;
	for (size_t j = 0; j < req->n_tran_vectors; j++)
		row[1 + j] = w->tran_ix[j] >= 0 && w->tran_ix[j] < vals->veccount ? vals->vecsa[w->tran_ix[j]]->creal : NAN;
	if (!(req->tran_sample_step_s > 0)) {
		tran_append(w, row);
		goto out;
	}
	while (w->tran_next < req->tran_n_samples) {
		double ts = req->tran_sample_start_s + (double)(w->tran_next + 1) * req->tran_sample_step_s;
		double sample[1 + 64], *out = width <= 65 ? sample : malloc(width * sizeof(*out));
		double a = 1.0;

		if (row[0] < ts - 1e-9 * req->tran_sample_step_s) {
			if (out != sample)
				free(out);
			break;
		}
		if (!out)
			_exit(4);
		if (w->tran_have_prev && row[0] > w->tran_prev[0])
			a = (ts - w->tran_prev[0]) / (row[0] - w->tran_prev[0]);
		if (a > 1)
			a = 1;
		if (a < 0)
			a = 0;
		out[0] = ts;
		for (size_t j = 1; j < width; j++)
			out[j] = w->tran_have_prev ? w->tran_prev[j] + a * (row[j] - w->tran_prev[j]) : row[j];
		tran_append(w, out);
		if (out != sample)
			free(out);
		w->tran_next++;
	}
	memcpy(w->tran_prev, row, width * sizeof(*row));
	w->tran_have_prev = true;
out:
	if (row != cur)
		free(row);
}

/* True when the row holds the vectors SendInitData named, in that order. */
static bool noise_row_matches_names(const struct sch_worker_ctx *w, pvecvaluesall vals)
{
	for (size_t i = 0; i < w->n_names; i++) {
		const struct vecvalues *v = vals->vecsa[i];

		if (!v || !v->name || strcmp(v->name, w->names[i]) != 0)
			return false;
	}
	return true;
}

/*
 * SendData: one frequency point of every vector, sent on at once. Once a row does not match the
 * plot's names, nothing more of the plot is sent and the step is flagged as garbled.
 */
static int worker_on_data(pvecvaluesall vals, int count, int id, void *user)
{
	struct sch_worker_ctx *w = user;

	if (w->tran_live && vals) {
		tran_on_data(w, vals);
		return 0;
	}
	if (!w->noise_live || !vals || w->noise_order_bad)
		return 0;
	if ((size_t)vals->veccount != w->n_names) {
		w->noise_order_bad = true;
		return 0;
	}
	if (w->n_rows == 0) {
		if (!noise_row_matches_names(w, vals)) {
			w->noise_order_bad = true;
			return 0;
		}
		noise_free_names(w); /* before the library builds its next plot */
	}
	w->n_rows++;
	if (!w->req || !w->req->collect_noise)
		return 0;
	worker_header(w, SCH_REC_NOISE_ROW, 8 + 8 * w->n_names);
	worker_put_u32(w, w->step);
	worker_put_u32(w, (uint32_t)w->n_names);
	for (size_t i = 0; i < w->n_names; i++)
		worker_put(w, &vals->vecsa[i]->creal, sizeof(double));
	return 0;
}

/* Sends one column of rows (stride values apart) as a vector record. */
static void worker_send_column(struct sch_worker_ctx *w, const char *name, const double *rows, size_t n,
			       size_t stride, size_t col)
{
	size_t name_len = strlen(name);
	double *column;

	if (name_len > 65536 || 12 + name_len + 8 * n >= SCH_SIM_MAX_RECORD)
		return;
	column = malloc((n ? n : 1) * sizeof(*column));
	if (!column)
		_exit(4);
	for (size_t k = 0; k < n; k++)
		column[k] = rows[k * stride + col];
	worker_header(w, SCH_REC_VEC, 12 + name_len + 8 * n);
	worker_put_u32(w, w->step);
	worker_put_u32(w, (uint32_t)name_len);
	worker_put(w, name, name_len);
	worker_put_u32(w, (uint32_t)n);
	worker_put(w, column, n * sizeof(*column));
	free(column);
}

/* Sends the collected transient vectors: "time", then each wanted vector the plot had. */
static void worker_send_tran(struct sch_worker_ctx *w)
{
	const struct sch_sim_request *req = w->req;
	size_t width = 1 + req->n_tran_vectors;

	if (w->tran_time_ix < 0 || !w->tran_ix)
		return;
	worker_send_column(w, "time", w->tran_rows, w->tran_n_rows, width, 0);
	for (size_t j = 0; j < req->n_tran_vectors; j++)
		if (w->tran_ix[j] >= 0)
			worker_send_column(w, req->tran_vectors[j], w->tran_rows, w->tran_n_rows, width, 1 + j);
}

/* A code-model file name we accept: [a-z0-9_] letters ending in ".cm", no directory part. */
static bool codemodel_name_is_safe(const char *name)
{
	size_t n = strlen(name);

	if (n < 4 || n > 64 || strcmp(name + n - 3, ".cm") != 0)
		return false;
	for (size_t i = 0; i + 3 < n; i++)
		if (!((name[i] >= 'a' && name[i] <= 'z') || (name[i] >= '0' && name[i] <= '9') || name[i] == '_'))
			return false;
	return true;
}

/* The code model POLY sources need (or another one by name), next to the library we were linked with. */
static void worker_load_codemodel_named(const char *file)
{
	char path[PATH_MAX + 32];
	char fallback[PATH_MAX];
	char cmd[PATH_MAX + 64];
	const char *chosen = NULL;
	const char *slash_fb = strrchr(SCH_SIM_FALLBACK_CM, '/');
	Dl_info info;

	if (!codemodel_name_is_safe(file))
		return;
	snprintf(fallback, sizeof(fallback), "%.*s/%s", (int)(slash_fb - SCH_SIM_FALLBACK_CM), SCH_SIM_FALLBACK_CM, file);

	if (dladdr((void *)ngSpice_Init, &info) && info.dli_fname && strlen(info.dli_fname) < PATH_MAX) {
		char *slash;

		snprintf(path, sizeof(path), "%s", info.dli_fname);
		slash = strrchr(path, '/');
		if (slash) {
			snprintf(slash + 1, sizeof(path) - (size_t)(slash + 1 - path), "ngspice/%s", file);
			if (access(path, R_OK) == 0 && path_is_command_safe(path))
				chosen = path;
		}
	}
	if (!chosen && access(fallback, R_OK) == 0 && path_is_command_safe(fallback))
		chosen = fallback;
	if (!chosen)
		return;
	snprintf(cmd, sizeof(cmd), "codemodel %s", chosen);
	ngSpice_Command(cmd);
}

static void worker_load_codemodel(void)
{
	worker_load_codemodel_named("spice2poly.cm");
}

/* Starts the library with no start-up script able to run (NGSPICE-NOTES.md section 5). */
static bool worker_init_library(struct sch_worker_ctx *w)
{
	const char *tmp = getenv("TMPDIR");
	char dir[PATH_MAX];
	char initfile[PATH_MAX + 16];
	char cwd[PATH_MAX];
	char reason[PATH_MAX + 128];
	int cwd_fd, f;
	bool ok = false;

	if (setenv("SPICE_SCRIPTS", "", 1) != 0) {
		worker_send_text(w, SCH_REC_FATAL, "cannot clear SPICE_SCRIPTS");
		return false;
	}
	if (!tmp || tmp[0] != '/' || strlen(tmp) > PATH_MAX - 64)
		tmp = "/tmp";
	snprintf(dir, sizeof(dir), "%s/schrot-sim-XXXXXX", tmp);
	if (!mkdtemp(dir)) {
		snprintf(reason, sizeof(reason), "cannot create a private directory in '%s': %s", tmp,
			 strerror(errno));
		worker_send_text(w, SCH_REC_FATAL, reason);
		return false;
	}
	snprintf(initfile, sizeof(initfile), "%s/.spiceinit", dir);
	f = open(initfile, O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0600);
	cwd_fd = open(".", O_RDONLY | O_DIRECTORY | O_CLOEXEC);
	if (cwd_fd < 0 && !getcwd(cwd, sizeof(cwd))) {
		snprintf(reason, sizeof(reason), "cannot remember the working directory: %s", strerror(errno));
		goto out;
	}
	if (f < 0 || chdir(dir) != 0) {
		snprintf(reason, sizeof(reason), "cannot prepare '%s': %s", dir, strerror(errno));
		goto out;
	}
	/* the library's SendData setup dereferences a plot a data-file run does not have: no callbacks then */
	if (w->req->noise_via_file)
		ngSpice_Init(worker_on_char, NULL, worker_on_exit, NULL, NULL, NULL, w);
	else
		ngSpice_Init(worker_on_char, NULL, worker_on_exit, worker_on_data, worker_on_init_data, NULL, w);
	if ((cwd_fd >= 0 ? fchdir(cwd_fd) : chdir(cwd)) != 0) {
		snprintf(reason, sizeof(reason), "cannot return to the working directory: %s", strerror(errno));
		goto out;
	}
	ok = true;
out:
	if (f >= 0)
		close(f);
	if (cwd_fd >= 0)
		close(cwd_fd);
	unlink(initfile);
	rmdir(dir);
	if (!ok)
		worker_send_text(w, SCH_REC_FATAL, reason);
	return ok;
}

static double vector_value(const struct vector_info *vi, int i)
{
	if (vi->v_realdata)
		return vi->v_realdata[i];
	if (vi->v_compdata)
		return vi->v_compdata[i].cx_real;
	return NAN;
}

/* The value of one quantity in the current plot (or the live circuit for "@dev[param]"), NaN if none. */
static double worker_read_quantity(const char *name)
{
	pvector_info vi = name ? ngGet_Vec_Info((char *)name) : NULL;

	return vi && vi->v_length > 0 ? vector_value(vi, vi->v_length - 1) : NAN;
}

/*
 * Values are read first: a read may print, and a message must not land inside a record. Plot
 * vectors ("v(out)") are read in the step's own plot. Device quantities ("@d.x1.d1[id]") are read
 * from the live circuit after the plots are dropped (the density plot already came through
 * SendData): each read first looks its name up in the current plot and leaves a temporary vector
 * there, so after a noise run with per-generator vectors, reading Q of them cost O(Q x vectors)
 * plus O(Q^2) (docs/performance.md). A command every SCH_SIM_READS_PER_GC reads lets the
 * simulator collect the temporaries. Every read also rebuilds the current plot's name table over
 * the temporaries not yet collected, so the interval is short: 8 instead of 128 took a 50-point
 * sweep of 500 pixels from 2.66-2.96 s to 2.0-2.3 s and 8000 pixels from 3.0 s to 2.2-2.5 s.
 */
static void worker_send_quantities(struct sch_worker_ctx *w, const struct sch_sim_request *req)
{
	double *values;
	size_t n_device = 0;

	if (req->n_quantities == 0)
		return;
	values = malloc(req->n_quantities * sizeof(*values));
	if (!values)
		_exit(4);
	for (size_t q = 0; q < req->n_quantities; q++) {
		const char *name = req->quantities[q];

		if (name && name[0] == '@')
			continue;
		values[q] = worker_read_quantity(name);
	}
	for (size_t q = 0; q < req->n_quantities; q++) {
		const char *name = req->quantities[q];

		if (!name || name[0] != '@')
			continue;
		if (n_device == 0)
			ngSpice_Command((char *)"destroy all");
		values[q] = worker_read_quantity(name);
		if (++n_device % SCH_SIM_READS_PER_GC == 0)
			ngSpice_Command((char *)"unset schrot_collect_temporaries");
	}
	worker_header(w, SCH_REC_QUANT, 4 + 8 * req->n_quantities);
	worker_put_u32(w, w->step);
	worker_put(w, values, 8 * req->n_quantities);
	free(values);
}

/* One header line of a data file, without its newline; false at the end or for a longer line. */
static bool data_file_line(FILE *f, char *buf, size_t size)
{
	size_t n;

	if (!fgets(buf, (int)size, f))
		return false;
	n = strlen(buf);
	if (n == 0 || buf[n - 1] != '\n')
		return false;
	buf[n - 1] = '\0';
	return true;
}

/* "\t3\tonoise_r1_thermal\tvoltage^2-density\tgrid=3": the name, copied; NULL when malformed. */
static char *data_file_name(const char *line)
{
	const char *p = line, *end;
	char *name;

	if (*p++ != '\t' || !isdigit((unsigned char)*p))
		return NULL;
	while (isdigit((unsigned char)*p))
		p++;
	if (*p++ != '\t')
		return NULL;
	end = strchr(p, '\t');
	if (!end)
		end = p + strlen(p);
	if (end == p)
		return NULL;
	name = malloc((size_t)(end - p) + 1);
	if (!name)
		_exit(4);
	memcpy(name, p, (size_t)(end - p));
	name[end - p] = '\0';
	return name;
}

/*
 * Reads the first plot of the simulator's binary data file and, when it is a density plot (its
 * first variable is "frequency"), sends it as the SendData path does: its names, then each row.
 * A file that does not parse, or ends early (a full disk), flags the step's plot as garbled.
 */
static void worker_send_data_file(struct sch_worker_ctx *w, const char *path)
{
	FILE *f = fopen(path, "rb");
	char line[8192];
	long n_vars = -1, n_points = -1;
	bool real = false, header_done = false;
	double *row = NULL;

	if (!f)
		return;
	while (data_file_line(f, line, sizeof(line))) {
		if (strncmp(line, "Flags:", 6) == 0)
			real = strstr(line, "real") && !strstr(line, "complex");
		else if (strncmp(line, "No. Variables:", 14) == 0)
			n_vars = strtol(line + 14, NULL, 10);
		else if (strncmp(line, "No. Points:", 11) == 0)
			n_points = strtol(line + 11, NULL, 10);
		else if (strcmp(line, "Variables:") == 0) {
			header_done = true;
			break;
		}
	}
	if (!header_done || n_vars <= 0 || n_vars > (long)(SCH_SIM_MAX_RECORD / 8) || n_points <= 0)
		goto bad;
	noise_clear(w);
	w->names = calloc((size_t)n_vars, sizeof(*w->names));
	if (!w->names)
		_exit(4);
	for (long i = 0; i < n_vars; i++) {
		if (!data_file_line(f, line, sizeof(line)) || !(w->names[i] = data_file_name(line)))
			goto bad;
		w->n_names = (size_t)i + 1;
	}
	if (!data_file_line(f, line, sizeof(line)) || strcmp(line, "Binary:") != 0)
		goto bad;
	if (strcmp(w->names[0], "frequency") != 0) {
		noise_clear(w); /* not a density plot */
		goto out;
	}
	if (!real)
		goto bad;
	w->noise_live = w->noise_seen = true;
	if (w->req->collect_noise)
		worker_send_noise_names(w);
	if (w->noise_order_bad)
		goto out;
	row = malloc((size_t)n_vars * sizeof(*row));
	if (!row)
		_exit(4);
	for (long k = 0; k < n_points; k++) {
		if (fread(row, sizeof(*row), (size_t)n_vars, f) != (size_t)n_vars)
			goto bad;
		w->n_rows++;
		if (!w->req->collect_noise)
			continue;
		worker_header(w, SCH_REC_NOISE_ROW, 8 + 8 * (size_t)n_vars);
		worker_put_u32(w, w->step);
		worker_put_u32(w, (uint32_t)n_vars);
		worker_put(w, row, (size_t)n_vars * sizeof(*row));
	}
	goto out;
bad:
	w->noise_seen = true;
	w->noise_order_bad = true;
	w->data_file_bad = true;
out:
	free(row);
	noise_free_names(w);
	fclose(f);
}

/* Runs ngspice commands in this process; returns false once the library has given up. */
static bool worker_command(struct sch_worker_ctx *w, const char *command)
{
	char buf[SCH_SIM_MAX_COMMAND + 1];

	snprintf(buf, sizeof(buf), "%s", command);
	ngSpice_Command(buf);
	return !w->gave_up;
}

/* The command "run" with the data file of step s: the deck's analyses, then its density plot read back. */
static bool worker_run_to_file(struct sch_worker_ctx *w, size_t s)
{
	char path[PATH_MAX], cmd[SCH_SIM_MAX_COMMAND + 1];

	if (!data_file_path(s, path, sizeof(path)) || (size_t)snprintf(cmd, sizeof(cmd), "run %s", path) >= sizeof(cmd)) {
		w->noise_seen = w->noise_order_bad = w->data_file_bad = true;
		return true;
	}
	unlink(path);
	/* again before each run: a deck's ".options filetype=ascii" would have changed it */
	if (worker_command(w, "set filetype=binary") && worker_command(w, cmd))
		worker_send_data_file(w, path);
	unlink(path);
	return !w->gave_up;
}

static bool step_runs_noise(const struct sch_sim_step *st)
{
	for (size_t c = 0; c < st->n_commands; c++) {
		const char *s = st->commands[c];

		while (*s == ' ' || *s == '\t')
			s++;
		if (strncasecmp(s, "noise", 5) == 0 && (s[5] == '\0' || isspace((unsigned char)s[5])))
			return true;
		if (strcmp(s, "run") == 0)
			return true;
	}
	return false;
}

static bool worker_run_step(struct sch_worker_ctx *w, const struct sch_sim_request *req, size_t s)
{
	const struct sch_sim_step *st = &req->steps[s];
	uint8_t flags = 0;

	w->step = (uint32_t)s;
	w->phase = SCH_PHASE_STEP;
	noise_clear(w);
	tran_clear(w);
	for (size_t c = 0; c < st->n_commands; c++) {
		bool ok = req->noise_via_file && strcmp(st->commands[c], "run") == 0 ? worker_run_to_file(w, s)
											: worker_command(w, st->commands[c]);
		if (!ok)
			return false;
	}
	w->phase = SCH_PHASE_READ;
	worker_send_quantities(w, req);
	if (w->gave_up)
		return false;
	if (req->collect_noise) {
		if (w->data_file_bad)
			flags |= SCH_STEP_DATA_FILE_BAD;
		else if (w->noise_seen && w->noise_order_bad)
			flags |= SCH_STEP_NOISE_GARBLED;
		else if (!w->noise_seen && step_runs_noise(st))
			flags |= SCH_STEP_NO_NOISE_PLOT;
	}
	noise_clear(w);
	if (req->n_tran_vectors > 0)
		worker_send_tran(w);
	tran_clear(w);
	if (w->gave_up)
		return false;
	worker_header(w, SCH_REC_STEP_DONE, 5);
	worker_put_u32(w, (uint32_t)s);
	worker_put_u8(w, flags);
	worker_flush(w);
	return true;
}

/* The whole life of a worker process. Never returns. */
static void worker_main(const struct sch_sim_request *req, char **deck, size_t first, size_t end, int fd)
{
	struct sch_worker_ctx w = { .fd = fd, .cap = 1 << 16, .phase = SCH_PHASE_INIT,
				    .step = SCH_STEP_NONE, .req = req, .tran_time_ix = -1 };
	int devnull = open("/dev/null", O_RDWR);
	int rc;

	/* Stray prints from the library must not land in the tool's report on stdout. */
	if (devnull >= 0) {
		dup2(devnull, STDIN_FILENO);
		dup2(devnull, STDOUT_FILENO);
		if (devnull > STDERR_FILENO)
			close(devnull);
	}
	w.buf = malloc(w.cap);
	if (!w.buf)
		_exit(4);
	if (!worker_init_library(&w))
		goto done;
	worker_load_codemodel();
	for (size_t k = 0; k < req->n_code_models; k++)
		if (req->code_models[k])
			worker_load_codemodel_named(req->code_models[k]);
	if (req->squared_noise)
		worker_command(&w, "set sqrnoise");
	if (req->noise_via_file)
		worker_command(&w, "set norefvalue");
	if (w.gave_up)
		goto gave_up;
	w.phase = SCH_PHASE_LOAD;
	rc = ngSpice_Circ(deck);
	if (w.gave_up)
		goto gave_up;
	worker_header(&w, SCH_REC_LOADED, 1);
	worker_put_u8(&w, rc != 0);
	worker_flush(&w);
	if (rc != 0 || w.load_error)
		goto done;
	/* Plots keep only last points; densities arrive through SendData (NGSPICE-NOTES.md 6). */
	w.phase = SCH_PHASE_CLEANUP;
	if (!worker_command(&w, "save none"))
		goto gave_up;
	for (size_t s = first; s < end; s++) {
		if (!worker_run_step(&w, req, s))
			goto gave_up;
		if (s + 1 < end) {
			w.phase = SCH_PHASE_CLEANUP;
			if (!worker_command(&w, "destroy all"))
				goto gave_up;
		}
	}
	goto done;
gave_up:
	worker_flush(&w);
	worker_send_empty(&w, SCH_REC_GAVE_UP);
done:
	worker_send_empty(&w, SCH_REC_END);
	_exit(0);
}

/* ------------------------------------------------------------------------------------------ */
/* Parent side                                                                                */
/* ------------------------------------------------------------------------------------------ */

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
};

#define SCH_NO_VECTOR SIZE_MAX

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

static char *judge_text(const struct sch_worker *wk, enum sch_phase phase, uint32_t step, bool *nomem);

/* Frees an outcome's vectors (their names, values and the shared zeros); quantities stay. */
static void outcome_free_vectors(struct sch_sim_outcome *o)
{
	for (size_t v = 0; v < o->n_vectors; v++) {
		free(o->vectors[v].name);
		if (o->vectors[v].values != o->shared_zeros)
			free(o->vectors[v].values);
	}
	free(o->shared_zeros);
	free(o->vectors);
	o->vectors = NULL;
	o->shared_zeros = NULL;
	o->n_vectors = 0;
}

static char *dup_mem(const void *p, size_t n)
{
	char *s = malloc(n + 1);

	if (!s)
		return NULL;
	memcpy(s, p, n);
	s[n] = '\0';
	return s;
}

static uint32_t get_u32(const unsigned char *p)
{
	uint32_t v;

	memcpy(&v, p, sizeof(v));
	return v;
}

static enum sch_err on_msg(struct sch_worker *wk, const unsigned char *p, size_t n)
{
	struct sch_tagged_msg *m;

	if (n < 5) {
		wk->malformed = true;
		return SCH_OK;
	}
	if (wk->n_msgs == wk->msgs_cap) {
		size_t cap = wk->msgs_cap ? 2 * wk->msgs_cap : 64;
		struct sch_tagged_msg *grown = realloc(wk->msgs, cap * sizeof(*grown));

		if (!grown)
			return SCH_ERR_NOMEM;
		wk->msgs = grown;
		wk->msgs_cap = cap;
	}
	m = &wk->msgs[wk->n_msgs];
	m->phase = p[0];
	m->step = get_u32(p + 1);
	m->text = dup_mem(p + 5, n - 5);
	if (!m->text)
		return SCH_ERR_NOMEM;
	wk->n_msgs++;
	return SCH_OK;
}

static bool step_is_ours(const struct sch_worker *wk, uint32_t step)
{
	return step >= wk->first && step < wk->end;
}

/* Appends an empty vector named by n bytes at name to the step's outcome; NULL when out of memory. */
static struct sch_sim_vector *outcome_add_vector(struct sch_collect *c, uint32_t step, const unsigned char *name,
						 size_t n)
{
	struct sch_sim_outcome *o = &c->res->steps[step];
	struct sch_sim_vector *v;

	if (o->n_vectors == c->vec_cap[step]) {
		size_t cap = c->vec_cap[step] ? 2 * c->vec_cap[step] : 16;
		struct sch_sim_vector *grown = realloc(o->vectors, cap * sizeof(*grown));

		if (!grown)
			return NULL;
		o->vectors = grown;
		c->vec_cap[step] = cap;
	}
	v = &o->vectors[o->n_vectors];
	memset(v, 0, sizeof(*v));
	v->name = dup_mem(name, n);
	if (!v->name)
		return NULL;
	o->n_vectors++;
	return v;
}

static enum sch_err on_vector(struct sch_worker *wk, struct sch_collect *c, const unsigned char *p, size_t n)
{
	uint32_t step, name_len, count;
	struct sch_sim_vector *v;

	if (n < 12)
		goto bad;
	step = get_u32(p);
	name_len = get_u32(p + 4);
	if (!step_is_ours(wk, step) || n < 12 + (size_t)name_len)
		goto bad;
	count = get_u32(p + 8 + name_len);
	if (n != 12 + (size_t)name_len + 8 * (size_t)count)
		goto bad;
	v = outcome_add_vector(c, step, p + 8, name_len);
	if (!v)
		return SCH_ERR_NOMEM;
	v->values = malloc(count ? 8 * (size_t)count : 1);
	if (!v->values)
		return SCH_ERR_NOMEM;
	memcpy(v->values, p + 12 + name_len, 8 * (size_t)count);
	v->n = count;
	return SCH_OK;
bad:
	wk->malformed = true;
	return SCH_OK;
}

/* Drops a step's density plot: its vectors leave the outcome. */
static void noise_stream_drop(struct sch_collect *c, size_t step)
{
	struct sch_noise_stream *ns = &c->noise[step];
	struct sch_sim_outcome *o = &c->res->steps[step];

	if (ns->live) {
		for (size_t v = ns->first; v < ns->end; v++) {
			free(o->vectors[v].name);
			free(o->vectors[v].values);
		}
		memmove(o->vectors + ns->first, o->vectors + ns->end, (o->n_vectors - ns->end) * sizeof(*o->vectors));
		o->n_vectors -= ns->end - ns->first;
	}
	free(ns->vec_of_col);
	free(ns->cap_of_col);
	memset(ns, 0, sizeof(*ns));
}

/*
 * Ends a step's density plot: every vector gets its length, and those that stayed zero point at
 * the outcome's one array of zeros.
 */
static enum sch_err noise_stream_finish(struct sch_collect *c, size_t step)
{
	struct sch_noise_stream *ns = &c->noise[step];
	struct sch_sim_outcome *o = &c->res->steps[step];

	if (!ns->live)
		return SCH_OK;
	for (size_t v = ns->first; v < ns->end; v++) {
		struct sch_sim_vector *vec = &o->vectors[v];

		if (!vec->values) {
			if (!o->shared_zeros)
				o->shared_zeros = calloc(ns->n_rows ? ns->n_rows : 1, sizeof(double));
			if (!o->shared_zeros)
				return SCH_ERR_NOMEM;
			vec->values = o->shared_zeros;
		}
		vec->n = ns->n_rows;
	}
	free(ns->vec_of_col);
	free(ns->cap_of_col);
	memset(ns, 0, sizeof(*ns));
	return SCH_OK;
}

static bool keeps_vector(const struct sch_collect *c, const char *name)
{
	return !c->req->keep_vector || c->req->keep_vector(c->req->keep_vector_ctx, name);
}

/* A density plot starts: its vectors enter the outcome, empty, in name order. */
static enum sch_err on_noise_names(struct sch_worker *wk, struct sch_collect *c, const unsigned char *p, size_t n)
{
	struct sch_noise_stream *ns;
	uint32_t step, n_cols;
	size_t at = 8;

	if (n < 8 || !step_is_ours(wk, (step = get_u32(p))) || c->step_done[step])
		goto bad;
	n_cols = get_u32(p + 4);
	if (n_cols > (n - 8) / 4)
		goto bad;
	noise_stream_drop(c, step); /* only the newest density plot of a step counts */
	ns = &c->noise[step];
	ns->first = ns->end = c->res->steps[step].n_vectors;
	ns->n_cols = n_cols;
	ns->live = true;
	ns->vec_of_col = malloc((n_cols + 1) * sizeof(*ns->vec_of_col));
	ns->cap_of_col = calloc(n_cols + 1, sizeof(*ns->cap_of_col));
	if (!ns->vec_of_col || !ns->cap_of_col)
		return SCH_ERR_NOMEM;
	for (size_t col = 0; col < n_cols; col++) {
		uint32_t len;
		struct sch_sim_vector *v;

		if (n - at < 4 || n - at - 4 < (len = get_u32(p + at)))
			goto bad;
		ns->vec_of_col[col] = SCH_NO_VECTOR;
		v = len <= 65536 ? outcome_add_vector(c, step, p + at + 4, len) : NULL;
		at += 4 + (size_t)len;
		if (len > 65536)
			continue;
		if (!v)
			return SCH_ERR_NOMEM;
		if (keeps_vector(c, v->name)) {
			ns->vec_of_col[col] = c->res->steps[step].n_vectors - 1;
		} else {
			free(v->name);
			c->res->steps[step].n_vectors--;
		}
		ns->end = c->res->steps[step].n_vectors;
	}
	if (at != n)
		goto bad;
	return SCH_OK;
bad:
	wk->malformed = true;
	return SCH_OK;
}

/* Gives a vector its first storage: its zeros so far, then room for more. */
static double *noise_values_start(size_t n_rows, size_t *cap)
{
	size_t want = 8;
	double *values;

	while (want <= n_rows)
		want *= 2;
	values = calloc(want, sizeof(*values));
	if (values)
		*cap = want;
	return values;
}

/* One frequency point of a density plot: each value goes to the end of its vector. */
static enum sch_err on_noise_row(struct sch_worker *wk, struct sch_collect *c, const unsigned char *p, size_t n)
{
	struct sch_noise_stream *ns;
	struct sch_sim_outcome *o;
	uint32_t step;

	if (n < 8 || !step_is_ours(wk, (step = get_u32(p))) || c->step_done[step])
		goto bad;
	ns = &c->noise[step];
	if (!ns->live || get_u32(p + 4) != ns->n_cols || n != 8 + 8 * (size_t)ns->n_cols)
		goto bad;
	o = &c->res->steps[step];
	for (size_t col = 0; col < ns->n_cols; col++) {
		size_t vi = ns->vec_of_col[col];
		struct sch_sim_vector *v;
		double x;

		if (vi == SCH_NO_VECTOR)
			continue;
		memcpy(&x, p + 8 + 8 * col, sizeof(x));
		v = &o->vectors[vi];
		if (!v->values) {
			if (x == 0.0 && !signbit(x))
				continue;
			v->values = noise_values_start(ns->n_rows, &ns->cap_of_col[col]);
			if (!v->values)
				return SCH_ERR_NOMEM;
		} else if (ns->n_rows == ns->cap_of_col[col]) {
			double *grown = realloc(v->values, 2 * ns->cap_of_col[col] * sizeof(*grown));

			if (!grown)
				return SCH_ERR_NOMEM;
			v->values = grown;
			ns->cap_of_col[col] *= 2;
		}
		v->values[ns->n_rows] = x;
	}
	ns->n_rows++;
	return SCH_OK;
bad:
	wk->malformed = true;
	return SCH_OK;
}

/*
 * A finished step goes to the request's on_step at once when nothing speaks against it yet: no
 * flag, no failure in its messages (they arrive before the step's end on the same pipe). The
 * final judgement still looks at every step; one handed over here had no failure to find.
 */
static enum sch_err hand_over_step(struct sch_worker *wk, struct sch_collect *c, uint32_t step)
{
	struct sch_sim_outcome *o = &c->res->steps[step];
	bool nomem = false;
	char *why;
	enum sch_err err;

	if (!c->req->on_step || c->step_flags[step])
		return SCH_OK;
	why = judge_text(wk, SCH_PHASE_STEP, step, &nomem);
	if (nomem)
		return SCH_ERR_NOMEM;
	if (why) {
		free(why);
		return SCH_OK;
	}
	if ((err = c->req->on_step(c->req->on_step_ctx, step, o)) != SCH_OK)
		return c->hook_err = err;
	outcome_free_vectors(o);
	o->consumed = true;
	return SCH_OK;
}

static enum sch_err on_record(struct sch_worker *wk, struct sch_collect *c, unsigned kind,
			      const unsigned char *p, size_t n)
{
	uint32_t step;
	enum sch_err err;

	switch (kind) {
	case SCH_REC_MSG:
		return on_msg(wk, p, n);
	case SCH_REC_FATAL:
		if (!wk->fatal) {
			wk->fatal = dup_mem(p, n);
			if (!wk->fatal)
				return SCH_ERR_NOMEM;
		}
		return SCH_OK;
	case SCH_REC_LOADED:
		wk->loaded = true;
		wk->load_rc = n >= 1 && p[0] != 0;
		return SCH_OK;
	case SCH_REC_QUANT:
		if (n != 4 + 8 * c->n_quantities || !step_is_ours(wk, get_u32(p)))
			break;
		memcpy(c->res->steps[get_u32(p)].quantities, p + 4, 8 * c->n_quantities);
		return SCH_OK;
	case SCH_REC_VEC:
		return on_vector(wk, c, p, n);
	case SCH_REC_NOISE_NAMES:
		return on_noise_names(wk, c, p, n);
	case SCH_REC_NOISE_ROW:
		return on_noise_row(wk, c, p, n);
	case SCH_REC_STEP_DONE:
		if (n != 5 || !step_is_ours(wk, get_u32(p)) || c->step_done[get_u32(p)])
			break;
		step = get_u32(p);
		c->step_done[step] = true;
		c->step_flags[step] = p[4];
		if (p[4] & (SCH_STEP_NOISE_GARBLED | SCH_STEP_DATA_FILE_BAD)) {
			noise_stream_drop(c, step);
			return SCH_OK;
		}
		if ((err = noise_stream_finish(c, step)) != SCH_OK)
			return err;
		return hand_over_step(wk, c, step);
	case SCH_REC_GAVE_UP:
		wk->gave_up = true;
		return SCH_OK;
	case SCH_REC_END:
		wk->ended = true;
		return SCH_OK;
	default:
		break;
	}
	wk->malformed = true;
	return SCH_OK;
}

/* Consumes every complete record in the worker's buffer. */
static enum sch_err parse_records(struct sch_worker *wk, struct sch_collect *c)
{
	while (wk->len - wk->off >= 5 && !wk->malformed) {
		const unsigned char *h = wk->buf + wk->off;
		uint32_t plen = get_u32(h + 1);
		enum sch_err err;

		if (plen >= SCH_SIM_MAX_RECORD) {
			wk->malformed = true;
			break;
		}
		if (wk->len - wk->off - 5 < plen)
			break;
		err = on_record(wk, c, h[0], h + 5, plen);
		if (err != SCH_OK)
			return err;
		wk->off += 5 + (size_t)plen;
	}
	if (wk->off > 0 && wk->off == wk->len) {
		wk->off = wk->len = 0;
	} else if (wk->off > wk->cap / 2) {
		memmove(wk->buf, wk->buf + wk->off, wk->len - wk->off);
		wk->len -= wk->off;
		wk->off = 0;
	}
	return SCH_OK;
}

/* Reads what is available on one worker's pipe. Sets *eof at end of stream. */
static enum sch_err read_worker(struct sch_worker *wk, struct sch_collect *c, bool *eof)
{
	ssize_t k;

	*eof = false;
	if (wk->cap - wk->len < 65536) {
		size_t cap = wk->cap ? 2 * wk->cap : 1 << 17;
		unsigned char *grown = realloc(wk->buf, cap);

		if (!grown)
			return SCH_ERR_NOMEM;
		wk->buf = grown;
		wk->cap = cap;
	}
	k = read(wk->fd, wk->buf + wk->len, wk->cap - wk->len);
	if (k < 0) {
		if (errno == EINTR || errno == EAGAIN)
			return SCH_OK;
		*eof = true;
		return SCH_OK;
	}
	if (k == 0) {
		*eof = true;
		return SCH_OK;
	}
	wk->len += (size_t)k;
	return parse_records(wk, c);
}

/* Reads all workers' pipes until every one is closed, so that no worker blocks on a full pipe. */
static enum sch_err drain_workers(struct sch_worker *wks, size_t n, struct sch_collect *c)
{
	struct pollfd pfd[SCH_SIM_MAX_WORKERS];
	size_t open_count = n;

	while (open_count > 0) {
		size_t m = 0;
		int r;

		for (size_t i = 0; i < n; i++) {
			if (wks[i].fd < 0)
				continue;
			pfd[m].fd = wks[i].fd;
			pfd[m].events = POLLIN;
			pfd[m].revents = 0;
			m++;
		}
		r = poll(pfd, (nfds_t)m, -1);
		if (r < 0) {
			if (errno == EINTR)
				continue;
			return SCH_ERR_SIM;
		}
		for (size_t j = 0; j < m; j++) {
			struct sch_worker *wk = NULL;
			bool eof = false;
			enum sch_err err;

			if (!pfd[j].revents)
				continue;
			for (size_t i = 0; i < n; i++)
				if (wks[i].fd == pfd[j].fd)
					wk = &wks[i];
			err = read_worker(wk, c, &eof);
			if (err != SCH_OK)
				return err;
			if (eof || wk->malformed) {
				close(wk->fd);
				wk->fd = -1;
				open_count--;
			}
		}
	}
	return SCH_OK;
}

/* ---- judging the simulator's text ------------------------------------------------------- */

static bool is_warning(const char *s)
{
	return strcasestr(s, "warning") != NULL;
}

static bool names_a_cause(const char *s)
{
	static const char *const causes[] = {
		"has no ac value", "timestep too small", "no such vector", "dc solution failed",
		"circuit not parsed", "aren't any circuits loaded", "unknown subckt",
		"could not find include file", ".end statement is missing", "not enough parameters",
		"singular matrix",
	};

	for (size_t i = 0; i < sizeof(causes) / sizeof(causes[0]); i++) {
		if (!strcasestr(s, causes[i]))
			continue;
		/* Warnings about a singular matrix come during gmin stepping, which may still succeed. */
		if (is_warning(s) && strcmp(causes[i], "has no ac value") != 0)
			continue;
		return true;
	}
	return false;
}

/* How strongly a line says the job failed: 0 not at all, 1 the best reason, 3 the weakest. */
static int failure_rank(const char *s)
{
	if (starts_ci(s, "error"))
		return 1;
	if (names_a_cause(s))
		return 2;
	if (!is_warning(s) && !starts_ci(s, "note") &&
	    (strcasestr(s, "aborted") || strcasestr(s, "failed")))
		return 3;
	return 0;
}

static bool msg_in(const struct sch_tagged_msg *m, enum sch_phase phase, uint32_t step)
{
	return m->phase == phase && (phase != SCH_PHASE_STEP || m->step == step);
}

/* The reason as one line: "Error on line 3 ...:" is joined with the lines that explain it. */
static char *reason_from(const struct sch_worker *wk, size_t at, enum sch_phase phase, uint32_t step)
{
	const char *text = wk->msgs[at].text;
	char line[1024];
	size_t used;

	if (strncasecmp(text, "warning: ", 9) == 0)
		text += 9;
	snprintf(line, sizeof(line), "%s", text);
	used = strlen(line);
	for (size_t k = at + 1, joined = 0; k < wk->n_msgs && joined < 2; k++) {
		const char *next = wk->msgs[k].text;

		if (used == 0 || line[used - 1] != ':')
			break;
		if (!msg_in(&wk->msgs[k], phase, step))
			continue;
		if (starts_ci(next, "error") || is_warning(next))
			break;
		while (*next == ' ' || *next == '\t')
			next++;
		snprintf(line + used, sizeof(line) - used, " %s%s", next, joined == 0 ? ":" : "");
		used = strlen(line);
		joined++;
	}
	while (used > 0 && (line[used - 1] == ':' || isspace((unsigned char)line[used - 1])))
		line[--used] = '\0';
	for (char *q = line; *q; q++)
		if (*q == '\n' || *q == '\r' || *q == '\t')
			*q = ' ';
	return strdup(line);
}

/* The most telling failure line of one phase (and step), or NULL when the text shows none. */
/*
 * A failed operating point says "timestep too small" or "aborted"; the node to look at is in the
 * earlier singular-matrix warning, so the reason gets it: "...too small (singular matrix: check
 * node v1#branch)".
 */
static char *with_singular_node(const struct sch_worker *wk, enum sch_phase phase, uint32_t step, char *r,
				bool *nomem)
{
	for (size_t i = 0; i < wk->n_msgs && !strcasestr(r, "singular matrix"); i++) {
		const char *m = strcasestr(wk->msgs[i].text, "singular matrix");
		char line[1024];
		char *joined;

		if (!m || !msg_in(&wk->msgs[i], phase, step))
			continue;
		snprintf(line, sizeof(line), "%s (%.300s", r, m);
		for (char *q = line; *q; q++)
			if (*q == '\t' || *q == '\r' || *q == '\n')
				*q = ' ';
		for (char *q = strstr(line, "  "); q; q = strstr(q, "  "))
			memmove(q, q + 1, strlen(q));
		snprintf(line + strlen(line), sizeof(line) - strlen(line), ")");
		joined = strdup(line);
		if (!joined) {
			*nomem = true;
			break;
		}
		free(r);
		return joined;
	}
	return r;
}

static char *judge_text(const struct sch_worker *wk, enum sch_phase phase, uint32_t step, bool *nomem)
{
	size_t best = 0;
	int best_rank = 0;
	char *r;

	for (size_t i = 0; i < wk->n_msgs; i++) {
		int rank;

		if (!msg_in(&wk->msgs[i], phase, step))
			continue;
		rank = failure_rank(wk->msgs[i].text);
		if (rank && (!best_rank || rank < best_rank)) {
			best = i;
			best_rank = rank;
		}
	}
	if (!best_rank)
		return NULL;
	r = reason_from(wk, best, phase, step);
	if (!r)
		*nomem = true;
	return r ? with_singular_node(wk, phase, step, r, nomem) : NULL;
}

static char *printf_dup(const char *fmt, const char *arg)
{
	char line[1200];

	snprintf(line, sizeof(line), fmt, arg);
	return strdup(line);
}

/* Why the library gave up: the line that says what went wrong, not the "cannot recover" line. */
static char *gave_up_reason(const struct sch_worker *wk)
{
	const char *pick = NULL;

	for (size_t i = 0; i < wk->n_msgs; i++) {
		const struct sch_tagged_msg *m = &wk->msgs[i];

		if (m->phase != wk->gave_up_phase || (m->phase == SCH_PHASE_STEP && m->step != wk->gave_up_step))
			continue;
		if (strcasestr(m->text, "err") && !strcasestr(m->text, "cannot recover")) {
			pick = m->text;
			break;
		}
		if (!pick && strcasestr(m->text, "cannot recover"))
			pick = m->text;
	}
	return printf_dup("simulator gave up: %s", pick ? pick : "it asked to exit");
}

/* Finds where the worker gave up: the phase of its last message before the end. */
static void locate_give_up(struct sch_worker *wk, const struct sch_collect *c)
{
	wk->gave_up_phase = wk->loaded ? SCH_PHASE_STEP : SCH_PHASE_LOAD;
	wk->gave_up_step = SCH_STEP_NONE;
	if (!wk->loaded && wk->n_msgs > 0)
		wk->gave_up_phase = (enum sch_phase)wk->msgs[wk->n_msgs - 1].phase;
	for (size_t s = wk->first; s < wk->end && wk->loaded; s++) {
		if (!c->step_done[s]) {
			wk->gave_up_step = (uint32_t)s;
			break;
		}
	}
	if (wk->loaded && wk->n_msgs > 0 && wk->msgs[wk->n_msgs - 1].phase != SCH_PHASE_STEP)
		wk->gave_up_phase = (enum sch_phase)wk->msgs[wk->n_msgs - 1].phase;
}

/* The reason the worker as a whole failed (set-up, load, give-up, crash), or NULL. */
static char *worker_failure(struct sch_worker *wk, const struct sch_collect *c, bool *nomem)
{
	char *r = NULL;
	char num[32];

	if (wk->fatal)
		return printf_dup("%s", wk->fatal);
	if (wk->gave_up) {
		locate_give_up(wk, c);
		return gave_up_reason(wk);
	}
	if (wk->status >= 0 && WIFSIGNALED(wk->status)) {
		snprintf(num, sizeof(num), "%d", WTERMSIG(wk->status));
		return printf_dup("simulator crashed (signal %s)", num);
	}
	r = judge_text(wk, SCH_PHASE_LOAD, SCH_STEP_NONE, nomem);
	if (r || *nomem)
		return r;
	if (wk->loaded && wk->load_rc)
		return strdup("the simulator did not load the deck");
	if (wk->malformed)
		return strdup("simulator worker sent malformed data");
	if (!wk->ended)
		return strdup("simulator worker exited without a result");
	return NULL;
}

/* ---- request checks and the deck ------------------------------------------------------- */

static enum sch_err check_commands(const struct sch_sim_request *req, struct sch_diag *d)
{
	for (size_t s = 0; s < req->n_steps; s++) {
		const struct sch_sim_step *st = &req->steps[s];

		for (size_t c = 0; c < st->n_commands; c++) {
			const char *cmd = st->commands[c];

			if (!cmd)
				return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "simulator: empty command");
			if (strlen(cmd) > SCH_SIM_MAX_COMMAND)
				return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
						      "simulator: refusing a command longer than %d bytes",
						      SCH_SIM_MAX_COMMAND);
			for (const char *p = cmd; *p; p++)
				if (command_char_is_bad((unsigned char)*p))
					return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
							      "simulator: refusing command '%.60s': it contains "
							      "a character the command language interprets",
							      cmd);
		}
	}
	return SCH_OK;
}

static bool line_runs_commands(const char *s)
{
	static const char *const prefixes[] = { ".control", ".endc", "*#", ".inc", ".lib", "*ng_script" };

	for (size_t i = 0; i < sizeof(prefixes) / sizeof(prefixes[0]); i++)
		if (starts_ci(s, prefixes[i]))
			return true;
	return false;
}

/*
 * The deck as the library gets it: our own title, then every line except those that could make
 * the simulator run commands. A .control block is dropped whole. NULL-terminated; the strings
 * still belong to req.
 */
static enum sch_err build_deck(const char *const *lines, size_t n_lines, char ***out, struct sch_diag *d)
{
	char **deck = calloc(n_lines + 2, sizeof(*deck));
	size_t n = 0;
	bool in_control = false;

	if (!deck)
		return SCH_ERR_NOMEM;
	deck[n++] = (char *)SCH_SIM_TITLE;
	for (size_t i = 1; i < n_lines; i++) {
		const char *line = lines[i];

		if (!line)
			continue;
		if (in_control) {
			if (starts_ci(line, ".endc"))
				in_control = false;
			continue;
		}
		if (strchr(line, '\n')) {
			sch_diag_report(d, SCH_WARNING, NULL, 0, "simulator: dropped deck line %zu: it holds a newline",
					i + 1);
			continue;
		}
		if (line_runs_commands(line)) {
			sch_diag_report(d, SCH_WARNING, NULL, 0,
					"simulator: dropped deck line %zu '%.40s': netlists may not run commands",
					i + 1, line);
			in_control = starts_ci(line, ".control");
			continue;
		}
		deck[n++] = (char *)line;
	}
	deck[n] = NULL;
	*out = deck;
	return SCH_OK;
}

/* ---- assembling the result ------------------------------------------------------------- */

static enum sch_err alloc_result(struct sch_sim_result *res, const struct sch_sim_request *req,
				 struct sch_collect *c)
{
	c->res = res;
	c->req = req;
	c->n_quantities = req->n_quantities;
	c->vec_cap = calloc(req->n_steps + 1, sizeof(*c->vec_cap));
	c->step_done = calloc(req->n_steps + 1, sizeof(*c->step_done));
	c->step_flags = calloc(req->n_steps + 1, sizeof(*c->step_flags));
	c->noise = calloc(req->n_steps + 1, sizeof(*c->noise));
	res->steps = calloc(req->n_steps + 1, sizeof(*res->steps));
	if (!c->vec_cap || !c->step_done || !c->step_flags || !c->noise || !res->steps)
		return SCH_ERR_NOMEM;
	res->n_steps = req->n_steps;
	for (size_t s = 0; s < req->n_steps; s++) {
		res->steps[s].quantities = malloc((req->n_quantities + 1) * sizeof(double));
		if (!res->steps[s].quantities)
			return SCH_ERR_NOMEM;
		for (size_t q = 0; q < req->n_quantities; q++)
			res->steps[s].quantities[q] = NAN;
	}
	return SCH_OK;
}

/* "ngspice-39" from the banner line "** ngspice-39 shared library". */
static char *version_from(const struct sch_worker *wk)
{
	for (size_t i = 0; i < wk->n_msgs; i++) {
		const char *p;
		size_t n = 0;

		if (wk->msgs[i].phase != SCH_PHASE_INIT || !(p = strstr(wk->msgs[i].text, "ngspice-")))
			continue;
		while (p[n] && !isspace((unsigned char)p[n]) && n < 40)
			n++;
		return dup_mem(p, n);
	}
	return strdup("ngspice");
}

/* Moves the workers' messages into res in worker order; the start-up banner is left out. */
static enum sch_err take_messages(struct sch_sim_result *res, struct sch_worker *wks, size_t n_wk)
{
	size_t total = 0;

	for (size_t w = 0; w < n_wk; w++)
		total += wks[w].n_msgs;
	res->messages = calloc(total + 1, sizeof(*res->messages));
	if (!res->messages)
		return SCH_ERR_NOMEM;
	for (size_t w = 0; w < n_wk; w++) {
		for (size_t i = 0; i < wks[w].n_msgs; i++) {
			if (wks[w].msgs[i].phase == SCH_PHASE_INIT)
				continue;
			res->messages[res->n_messages++] = wks[w].msgs[i].text;
			wks[w].msgs[i].text = NULL;
		}
	}
	return SCH_OK;
}

static void report_notes(struct sch_worker *wks, size_t n_wk, struct sch_diag *d)
{
	for (size_t w = 0; w < n_wk; w++) {
		for (size_t i = 0; i < wks[w].n_msgs; i++) {
			const struct sch_tagged_msg *m = &wks[w].msgs[i];

			/* Every worker loads the same deck; its load warnings are said once. */
			if (m->phase == SCH_PHASE_INIT || (w > 0 && m->phase == SCH_PHASE_LOAD))
				continue;
			if (starts_ci(m->text, "warning"))
				sch_diag_report(d, SCH_NOTE, NULL, 0, "simulator: %s", m->text);
		}
	}
}

/* Sets every step's failure and res->failure; returns whether anything failed. */
static enum sch_err judge(struct sch_sim_result *res, struct sch_worker *wks, size_t n_wk,
			  struct sch_collect *c, bool *failed)
{
	bool nomem = false;

	*failed = false;
	for (size_t w = 0; w < n_wk; w++) {
		struct sch_worker *wk = &wks[w];
		char *wfail = worker_failure(wk, c, &nomem);

		if (nomem)
			return SCH_ERR_NOMEM;
		for (size_t s = wk->first; s < wk->end; s++) {
			struct sch_sim_outcome *o = &res->steps[s];

			if (c->step_done[s])
				o->failure = judge_text(wk, SCH_PHASE_STEP, (uint32_t)s, &nomem);
			if (!o->failure && !nomem && c->step_done[s] && (c->step_flags[s] & SCH_STEP_NO_NOISE_PLOT))
				o->failure = strdup("the noise analysis produced no result");
			if (!o->failure && !nomem && c->step_done[s] && (c->step_flags[s] & SCH_STEP_DATA_FILE_BAD))
				o->failure = strdup("the simulator's data file did not read back whole (is the temporary "
						    "directory full?)");
			if (!o->failure && !nomem && c->step_done[s] && (c->step_flags[s] & SCH_STEP_NOISE_GARBLED))
				o->failure = strdup("the simulator sent noise data that does not match its vector list");
			if (!o->failure && !nomem && !c->step_done[s])
				o->failure = strdup(wfail ? wfail : "simulator worker exited without a result");
			if (nomem || (!o->failure && !c->step_done[s])) {
				free(wfail);
				return SCH_ERR_NOMEM;
			}
			if (o->failure)
				*failed = true;
		}
		if (wfail) {
			*failed = true;
			if (!res->failure)
				res->failure = wfail;
			else
				free(wfail);
		}
	}
	/* The first reason in step order wins over a worker-level one found later. */
	for (size_t s = 0; s < res->n_steps; s++) {
		if (!res->steps[s].failure)
			continue;
		free(res->failure);
		res->failure = strdup(res->steps[s].failure);
		if (!res->failure)
			return SCH_ERR_NOMEM;
		break;
	}
	return SCH_OK;
}

static void release_workers(struct sch_worker *wks, size_t n_wk)
{
	for (size_t w = 0; w < n_wk; w++) {
		struct sch_worker *wk = &wks[w];

		if (wk->fd >= 0)
			close(wk->fd);
		if (wk->pid > 0) {
			int st;

			if (!wk->ended || wk->status < 0)
				kill(wk->pid, SIGKILL);
			while (waitpid(wk->pid, &st, 0) < 0 && errno == EINTR)
				;
		}
		for (size_t i = 0; i < wk->n_msgs; i++)
			free(wk->msgs[i].text);
		free(wk->msgs);
		free(wk->buf);
		free(wk->fatal);
	}
}

static enum sch_err start_workers(const struct sch_sim_request *req, char **const *decks, struct sch_worker *wks,
				  size_t n_wk, char *why, size_t why_len)
{
	for (size_t w = 0; w < n_wk; w++) {
		wks[w].fd = -1;
		wks[w].status = -1;
		wks[w].first = req->n_steps * w / n_wk;
		wks[w].end = req->n_steps * (w + 1) / n_wk;
	}
	fflush(NULL); /* a child must not write out the parent's buffered output again */
	for (size_t w = 0; w < n_wk; w++) {
		int fds[2];
		pid_t pid;

		if (pipe(fds) != 0) {
			snprintf(why, why_len, "cannot start the simulator: %s", strerror(errno));
			return SCH_ERR_SIM;
		}
		pid = fork();
		if (pid < 0) {
			snprintf(why, why_len, "cannot start the simulator: %s", strerror(errno));
			close(fds[0]);
			close(fds[1]);
			return SCH_ERR_SIM;
		}
		if (pid == 0) {
			close(fds[0]);
			for (size_t k = 0; k < w; k++)
				if (wks[k].fd >= 0)
					close(wks[k].fd);
			signal(SIGPIPE, SIG_DFL);
			worker_main(req, decks[w], wks[w].first, wks[w].end, fds[1]);
		}
		close(fds[1]);
#ifdef F_SETPIPE_SZ
		fcntl(fds[0], F_SETPIPE_SZ, 1 << 20); /* fewer wake-ups for big vector sets; a hint only */
#endif
		wks[w].pid = pid;
		wks[w].fd = fds[0];
	}
	return SCH_OK;
}

/* The workers' data-file directory, in $TMPDIR when a command may name it, else in /tmp. */
static enum sch_err make_data_dir(struct sch_diag *d)
{
	const char *tmp = getenv("TMPDIR");

	if (!tmp || tmp[0] != '/' || strlen(tmp) > 200 || !path_is_command_safe(tmp))
		tmp = "/tmp";
	snprintf(sch_data_dir, sizeof(sch_data_dir), "%s/schrot-data-XXXXXX", tmp);
	if (!mkdtemp(sch_data_dir)) {
		sch_data_dir[0] = '\0';
		return sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: cannot create a private directory in '%s': %s",
				      tmp, strerror(errno));
	}
	return SCH_OK;
}

/* Removes what a worker that died early may have left, then the directory. */
static void remove_data_dir(size_t n_steps)
{
	char path[PATH_MAX];

	if (!sch_data_dir[0])
		return;
	for (size_t s = 0; s < n_steps; s++)
		if (data_file_path(s, path, sizeof(path)))
			unlink(path);
	rmdir(sch_data_dir);
	sch_data_dir[0] = '\0';
}

static void reap_workers(struct sch_worker *wks, size_t n_wk)
{
	for (size_t w = 0; w < n_wk; w++) {
		int st;
		pid_t r;

		while ((r = waitpid(wks[w].pid, &st, 0)) < 0 && errno == EINTR)
			;
		wks[w].status = r == wks[w].pid ? st : 0;
		wks[w].pid = 0;
	}
}

enum sch_err sch_sim_run(const struct sch_sim_request *req, struct sch_sim_result *res, struct sch_diag *d)
{
	enum sch_err ret = SCH_ERR_SIM;
	struct sch_worker wks[SCH_SIM_MAX_WORKERS];
	struct sch_collect c = { 0 };
	char **deck = NULL, **decks[SCH_SIM_MAX_WORKERS] = { NULL };
	size_t n_wk = 1;
	char why[512] = "";
	bool failed = false, own_decks = false;

	memset(res, 0, sizeof(*res));
	memset(wks, 0, sizeof(wks));
	ret = check_commands(req, d);
	if (ret != SCH_OK)
		goto out;
	for (size_t s = 0; s < req->n_steps; s++)
		own_decks = own_decks || req->steps[s].lines;
	if (req->noise_via_file && req->n_tran_vectors > 0) {
		ret = sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "simulator: transient vectors need the SendData path");
		goto out;
	}
	if (req->noise_via_file && (ret = make_data_dir(d)) != SCH_OK)
		goto out;
	if (own_decks && req->n_steps > SCH_SIM_MAX_WORKERS) {
		ret = sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "simulator: more than %d steps with decks of their own",
				     SCH_SIM_MAX_WORKERS);
		goto out;
	}
	ret = build_deck(req->lines, req->n_lines, &deck, d);
	if (ret != SCH_OK)
		goto out;
	ret = alloc_result(res, req, &c);
	if (ret != SCH_OK)
		goto out;
	if (own_decks)
		n_wk = req->n_steps; /* one step per worker: each loads its own deck */
	else if (req->n_workers > 1 && req->n_steps > 1)
		n_wk = (size_t)req->n_workers < req->n_steps ? (size_t)req->n_workers : req->n_steps;
	if (n_wk > SCH_SIM_MAX_WORKERS)
		n_wk = SCH_SIM_MAX_WORKERS;
	for (size_t w = 0; w < n_wk; w++) {
		const struct sch_sim_step *st = own_decks ? &req->steps[w] : NULL;

		decks[w] = deck;
		if (st && st->lines && (ret = build_deck(st->lines, st->n_lines, &decks[w], d)) != SCH_OK)
			goto out;
	}
	ret = start_workers(req, decks, wks, n_wk, why, sizeof(why));
	if (ret == SCH_OK)
		ret = drain_workers(wks, n_wk, &c);
	if (c.hook_err != SCH_OK || ret == SCH_ERR_NOMEM)
		goto out; /* the hook has said why */
	if (ret != SCH_OK) {
		res->failure = strdup(why[0] ? why : "lost contact with the simulator");
		ret = SCH_ERR_SIM;
		goto out;
	}
	reap_workers(wks, n_wk);
	res->version = version_from(&wks[0]);
	ret = judge(res, wks, n_wk, &c, &failed);
	if (ret != SCH_OK)
		goto out;
	report_notes(wks, n_wk, d);
	ret = take_messages(res, wks, n_wk);
	if (ret != SCH_OK)
		goto out;
	ret = failed ? SCH_ERR_SIM : SCH_OK;
out:
	/* an error of the on_step hook was reported by the hook */
	if (c.hook_err == SCH_OK && ret == SCH_ERR_SIM)
		sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: %s",
			       res->failure ? res->failure : "the simulation failed");
	else if (c.hook_err == SCH_OK && ret == SCH_ERR_NOMEM)
		sch_diag_error(d, SCH_ERR_NOMEM, NULL, 0, "simulator: out of memory");
	release_workers(wks, n_wk);
	remove_data_dir(req->n_steps);
	/* a density plot whose step never ended is left out, as if it had never started */
	for (size_t s = 0; c.noise && res->steps && s < res->n_steps; s++)
		noise_stream_drop(&c, s);
	free(c.noise);
	free(c.vec_cap);
	free(c.step_done);
	free(c.step_flags);
	for (size_t w = 0; w < SCH_SIM_MAX_WORKERS; w++)
		if (decks[w] && decks[w] != deck)
			free(decks[w]);
	free(deck);
	return ret;
}

void sch_sim_result_release(struct sch_sim_result *res)
{
	if (!res)
		return;
	for (size_t s = 0; s < res->n_steps; s++) {
		struct sch_sim_outcome *o = &res->steps[s];

		outcome_free_vectors(o);
		free(o->quantities);
		free(o->failure);
	}
	free(res->steps);
	for (size_t i = 0; i < res->n_messages; i++)
		free(res->messages[i]);
	free(res->messages);
	free(res->version);
	free(res->failure);
	memset(res, 0, sizeof(*res));
}

const struct sch_sim_vector *sch_sim_find_vector(const struct sch_sim_outcome *o, const char *name)
{
	if (!o || !name)
		return NULL;
	for (size_t i = 0; i < o->n_vectors; i++)
		if (strcmp(o->vectors[i].name, name) == 0)
			return &o->vectors[i];
	return NULL;
}

bool sch_sim_name_is_safe(const char *name)
{
	size_t n = 0;

	if (!name)
		return false;
	for (; name[n]; n++) {
		unsigned char ch = (unsigned char)name[n];

		if (n >= 200)
			return false;
		if (!((ch >= 'a' && ch <= 'z') || (ch >= '0' && ch <= '9') || strchr("_.#+-", ch)))
			return false;
	}
	return n >= 1;
}
