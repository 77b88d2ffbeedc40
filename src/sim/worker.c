/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * worker.c - the worker process: starts the ngspice shared library, answers its callbacks, runs
 * the steps and sends what they produce as records. The only file that includes sharedspice.h.
 */
#define _GNU_SOURCE /* dladdr */
#include <ctype.h>
#include <dlfcn.h>
#include <fcntl.h>
#include <errno.h>
#include <limits.h>
#include <math.h>
#include <stdbool.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <unistd.h>

#include <ngspice/sharedspice.h>

#include "sim_int.h"

#ifndef SCH_SIM_CODEMODEL_DIR /* set by CMake from pkg-config's libdir for ngspice */
#define SCH_SIM_CODEMODEL_DIR "/usr/lib/x86_64-linux-gnu/ngspice"
#endif
#define SCH_SIM_READS_PER_GC 8

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
	if (w->phase == SCH_PHASE_LOAD && sch_sim_starts_ci(text, "error"))
		w->load_error = true;
	/* a data-file run says where it writes and how much: not news */
	if (w->req && w->req->noise_via_file &&
	    (sch_sim_starts_ci(text, "binary raw file") || sch_sim_starts_ci(text, "No. of Data ")))
		return 0;
	sch_wire_header(&w->out, SCH_REC_MSG, 1 + 4 + n);
	sch_wire_put_u8(&w->out, (uint8_t)w->phase);
	sch_wire_put_u32(&w->out, w->step);
	sch_wire_put(&w->out, text, n);
	sch_wire_flush(&w->out);
	return 0;
}

/* ControlledExit: the library is dead from now on. Never exit here; the worker loop stops. */
static int worker_on_exit(int status, NG_BOOL immediate, NG_BOOL quit, int id, void *user)
{
	struct sch_worker_ctx *w = user;

	w->gave_up = true;
	return 0;
}

void sch_worker_noise_free_names(struct sch_worker_ctx *w)
{
	if (w->names)
		for (size_t i = 0; i < w->n_names; i++)
			free(w->names[i]);
	free(w->names);
	w->names = NULL;
}

void sch_worker_noise_clear(struct sch_worker_ctx *w)
{
	sch_worker_noise_free_names(w);
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
void sch_worker_send_noise_names(struct sch_worker_ctx *w)
{
	size_t payload = 8;

	for (size_t i = 0; i < w->n_names && payload < SCH_SIM_MAX_RECORD; i++)
		payload += 4 + strlen(w->names[i]);
	if (payload >= SCH_SIM_MAX_RECORD || 8 + 8 * w->n_names >= SCH_SIM_MAX_RECORD) {
		w->noise_order_bad = true;
		return;
	}
	sch_wire_header(&w->out, SCH_REC_NOISE_NAMES, payload);
	sch_wire_put_u32(&w->out, w->step);
	sch_wire_put_u32(&w->out, (uint32_t)w->n_names);
	for (size_t i = 0; i < w->n_names; i++) {
		size_t len = strlen(w->names[i]);

		sch_wire_put_u32(&w->out, (uint32_t)len);
		sch_wire_put(&w->out, w->names[i], len);
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
	sch_worker_noise_clear(w);
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
		sch_worker_send_noise_names(w);
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
		sch_worker_noise_free_names(w); /* before the library builds its next plot */
	}
	w->n_rows++;
	if (!w->req || !w->req->collect_noise)
		return 0;
	sch_wire_header(&w->out, SCH_REC_NOISE_ROW, 8 + 8 * w->n_names);
	sch_wire_put_u32(&w->out, w->step);
	sch_wire_put_u32(&w->out, (uint32_t)w->n_names);
	for (size_t i = 0; i < w->n_names; i++)
		sch_wire_put(&w->out, &vals->vecsa[i]->creal, sizeof(double));
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
	sch_wire_header(&w->out, SCH_REC_VEC, 12 + name_len + 8 * n);
	sch_wire_put_u32(&w->out, w->step);
	sch_wire_put_u32(&w->out, (uint32_t)name_len);
	sch_wire_put(&w->out, name, name_len);
	sch_wire_put_u32(&w->out, (uint32_t)n);
	sch_wire_put(&w->out, column, n * sizeof(*column));
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

/*
 * The standard code-model libraries the distribution's ngspice package ships, the set its own
 * spinit loads: POLY sources (spice2poly), A devices and the code models E/G TABLE and LAPLACE
 * sources become (analog, table), digital and event-driven devices (digital, xtraevt) and the
 * extra devices (xtradev).
 */
static const char *const standard_codemodels[] = {
	"spice2poly.cm", "analog.cm", "digital.cm", "xtradev.cm", "xtraevt.cm", "table.cm",
};

/*
 * The package's code-model directory: "ngspice/" beside the shared library this process runs
 * (found at start), else the one pkg-config named at build time. Never a path from a netlist.
 * False when neither holds spice2poly.cm or the path could not go into a command.
 */
static bool worker_codemodel_dir(char *dir, size_t size)
{
	char probe[PATH_MAX + 32];
	Dl_info info;

	if (dladdr((void *)ngSpice_Init, &info) && info.dli_fname && strlen(info.dli_fname) < PATH_MAX) {
		const char *slash = strrchr(info.dli_fname, '/');

		if (slash) {
			snprintf(dir, size, "%.*s/ngspice", (int)(slash - info.dli_fname), info.dli_fname);
			snprintf(probe, sizeof(probe), "%s/spice2poly.cm", dir);
			if (access(probe, R_OK) == 0 && sch_sim_path_is_command_safe(dir))
				return true;
		}
	}
	snprintf(dir, size, "%s", SCH_SIM_CODEMODEL_DIR);
	snprintf(probe, sizeof(probe), "%s/spice2poly.cm", dir);
	return access(probe, R_OK) == 0 && sch_sim_path_is_command_safe(dir);
}

/* One code-model library by file name from dir; a missing or unsafe one is skipped. */
static void worker_load_codemodel_named(const char *dir, const char *file)
{
	char path[PATH_MAX + 80];
	char cmd[PATH_MAX + 96];

	if (!codemodel_name_is_safe(file))
		return;
	snprintf(path, sizeof(path), "%s/%s", dir, file);
	if (access(path, R_OK) != 0 || !sch_sim_path_is_command_safe(path))
		return;
	snprintf(cmd, sizeof(cmd), "codemodel %s", path);
	ngSpice_Command(cmd);
}

/* The standard libraries, then any other the request names (each once). */
static void worker_load_codemodels(const struct sch_sim_request *req)
{
	size_t n_std = sizeof(standard_codemodels) / sizeof(standard_codemodels[0]);
	char dir[PATH_MAX];

	if (!worker_codemodel_dir(dir, sizeof(dir)))
		return;
	for (size_t k = 0; k < n_std; k++)
		worker_load_codemodel_named(dir, standard_codemodels[k]);
	for (size_t k = 0; k < req->n_code_models; k++) {
		bool standard = false;

		if (!req->code_models[k])
			continue;
		for (size_t j = 0; j < n_std; j++)
			standard = standard || strcmp(req->code_models[k], standard_codemodels[j]) == 0;
		if (!standard)
			worker_load_codemodel_named(dir, req->code_models[k]);
	}
}

/* Starts the library with no start-up script able to run (NGSPICE-NOTES.md section 5). */
static bool worker_init_library(struct sch_worker_ctx *w)
{
	const char *tmp = sch_sim_session_dir[0] ? sch_sim_session_dir : getenv("TMPDIR");
	bool stay = sch_sim_session_dir[0] != '\0'; /* the tool removes the session directory whole */
	char dir[PATH_MAX];
	char initfile[PATH_MAX + 16];
	char cwd[PATH_MAX];
	char reason[PATH_MAX + 128];
	int cwd_fd, f;
	bool ok = false;

	if (setenv("SPICE_SCRIPTS", "", 1) != 0) {
		sch_wire_send_text(&w->out, SCH_REC_FATAL, "cannot clear SPICE_SCRIPTS");
		return false;
	}
	if (!tmp || tmp[0] != '/' || strlen(tmp) > PATH_MAX - 64)
		tmp = "/tmp";
	snprintf(dir, sizeof(dir), "%s/schrot-sim-XXXXXX", tmp);
	if (!mkdtemp(dir)) {
		snprintf(reason, sizeof(reason), "cannot create a private directory in '%s': %s", tmp,
			 strerror(errno));
		sch_wire_send_text(&w->out, SCH_REC_FATAL, reason);
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
	/*
	 * Inside the run's private directory the worker stays where it started: files the library
	 * writes on its own (BSIM3/SOI model checks write "*check.log" into the working directory)
	 * land there and go with the directory, never beside the user's netlist.
	 */
	if (!stay && (cwd_fd >= 0 ? fchdir(cwd_fd) : chdir(cwd)) != 0) {
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
	if (!stay || !ok)
		rmdir(dir);
	if (!ok)
		sch_wire_send_text(&w->out, SCH_REC_FATAL, reason);
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
	sch_wire_header(&w->out, SCH_REC_QUANT, 4 + 8 * req->n_quantities);
	sch_wire_put_u32(&w->out, w->step);
	sch_wire_put(&w->out, values, 8 * req->n_quantities);
	free(values);
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

	if (!sch_sim_data_file_path(s, path, sizeof(path)) || (size_t)snprintf(cmd, sizeof(cmd), "run %s", path) >= sizeof(cmd)) {
		w->noise_seen = w->noise_order_bad = w->data_file_bad = true;
		return true;
	}
	unlink(path);
	/* again before each run: a deck's ".options filetype=ascii" would have changed it */
	if (worker_command(w, "set filetype=binary") && worker_command(w, cmd))
		sch_worker_send_data_file(w, path);
	unlink(path);
	return !w->gave_up;
}

static bool command_runs_noise(const char *s)
{
	while (*s == ' ' || *s == '\t')
		s++;
	if (strncasecmp(s, "noise", 5) == 0 && (s[5] == '\0' || isspace((unsigned char)s[5])))
		return true;
	return strcmp(s, "run") == 0;
}

static bool step_runs_noise(const struct sch_sim_step *st)
{
	for (size_t c = 0; c < st->n_commands; c++)
		if (command_runs_noise(st->commands[c]))
			return true;
	return false;
}

static bool worker_run_step(struct sch_worker_ctx *w, const struct sch_sim_request *req, size_t s)
{
	const struct sch_sim_step *st = &req->steps[s];
	uint8_t flags = 0;

	w->step = (uint32_t)s;
	w->phase = SCH_PHASE_STEP;
	sch_worker_noise_clear(w);
	tran_clear(w);
	for (size_t c = 0; c < st->n_commands; c++) {
		bool ok;

		/* code models' small-signal state (sim.h, prime_ac) */
		if (req->prime_ac && command_runs_noise(st->commands[c]) && !worker_command(w, "ac lin 1 1 1"))
			return false;
		ok = req->noise_via_file && strcmp(st->commands[c], "run") == 0 ? worker_run_to_file(w, s)
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
	sch_worker_noise_clear(w);
	if (req->n_tran_vectors > 0)
		worker_send_tran(w);
	tran_clear(w);
	if (w->gave_up)
		return false;
	sch_wire_header(&w->out, SCH_REC_STEP_DONE, 5);
	sch_wire_put_u32(&w->out, (uint32_t)s);
	sch_wire_put_u8(&w->out, flags);
	sch_wire_flush(&w->out);
	return true;
}

/* The compatibility mode, read by the library as each circuit loads (its "Compatibility modes selected" note). */
static void worker_set_compat_mode(struct sch_worker_ctx *w, const struct sch_sim_request *req)
{
	const char *mode = req->compat_mode ? sch_sim_compat_mode_known(req->compat_mode) : NULL;
	char set[64];

	if (!mode)
		return;
	snprintf(set, sizeof(set), "set ngbehavior=%s", mode);
	worker_command(w, set);
}

/* The whole life of a worker process. Never returns. */
void sch_sim_worker_main(const struct sch_sim_request *req, char **deck, size_t first, size_t end, int fd)
{
	struct sch_worker_ctx w = { .out = { .fd = fd, .cap = 1 << 16 }, .phase = SCH_PHASE_INIT,
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
	w.out.buf = malloc(w.out.cap);
	if (!w.out.buf)
		_exit(4);
	if (!worker_init_library(&w))
		goto done;
	sch_sim_catch_crashes();
	worker_load_codemodels(req);
	if (req->squared_noise)
		worker_command(&w, "set sqrnoise");
	if (req->noise_via_file)
		worker_command(&w, "set norefvalue");
	worker_set_compat_mode(&w, req);
	if (w.gave_up)
		goto gave_up;
	w.phase = SCH_PHASE_LOAD;
	rc = ngSpice_Circ(deck);
	if (w.gave_up)
		goto gave_up;
	sch_wire_header(&w.out, SCH_REC_LOADED, 1);
	sch_wire_put_u8(&w.out, rc != 0);
	sch_wire_flush(&w.out);
	if (rc != 0 || w.load_error)
		goto done;
	/*
	 * The deck's own saves go first: ".option savecurrents" turns into "save @m1[ib]"-style
	 * entries, and a device without such a parameter (BSIM4 has no ib, ig, is) leaves a vector
	 * of length 0 that the library's SendData step indexes at [-1] (signal 11 in ngspice 39).
	 * We read every current ourselves; none of those saves is needed.
	 * Then plots keep only last points; densities arrive through SendData (NGSPICE-NOTES.md 6).
	 */
	w.phase = SCH_PHASE_CLEANUP;
	if (!worker_command(&w, "delete all") || !worker_command(&w, "save none"))
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
	sch_wire_flush(&w.out);
	sch_wire_send_empty(&w.out, SCH_REC_GAVE_UP);
done:
	sch_wire_send_empty(&w.out, SCH_REC_END);
	_exit(0);
}
