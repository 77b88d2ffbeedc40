/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * run.c - the simulator session: checks the request, builds the decks, starts the worker processes,
 * feeds their pipes to the collector, reaps them, owns the data-file directory and the result API.
 */
#include <ctype.h>
#include <errno.h>
#include <fcntl.h>
#include <limits.h>
#include <poll.h>
#include <signal.h>
#include <stdbool.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <sys/stat.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <unistd.h>

#include "schrot/leftover.h"
#include "sim_int.h"

#define SCH_SIM_TITLE "* schrot deck"
#define SCH_SIM_MAX_WORKERS 64

/* ---- command safety and the data-file directory ---------------------------------------- */

bool sch_sim_command_char_is_bad(unsigned char c)
{
	return c < 0x20 || c == 0x7f || strchr("`;><|&$~\"", c) != NULL;
}

/* A path may go into a command only if the command language cannot read anything into it. */
bool sch_sim_path_is_command_safe(const char *p)
{
	if (strlen(p) > SCH_SIM_MAX_COMMAND - 16)
		return false;
	for (; *p; p++)
		if (sch_sim_command_char_is_bad((unsigned char)*p) || *p == ' ' || *p == '\'' || *p == '\\')
			return false;
	return true;
}

/*
 * With noise_via_file: the private directory the simulator writes its data files to, one per
 * step ("s12.raw"). The parent makes it before it forks the workers and removes it afterwards.
 */
static char sch_data_dir[PATH_MAX];

bool sch_sim_data_file_path(size_t step, char *out, size_t size)
{
	int n = snprintf(out, size, "%s/s%zu.raw", sch_data_dir, step);

	return sch_data_dir[0] && n > 0 && (size_t)n < size && sch_sim_path_is_command_safe(out);
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
				if (sch_sim_command_char_is_bad((unsigned char)*p))
					return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
							      "simulator: refusing command '%.60s': it contains "
							      "a character the command language interprets",
							      cmd);
		}
	}
	return SCH_OK;
}

/*
 * Cards that could run commands or write files, matched the way the simulator matches them (a
 * case-insensitive prefix after blanks). The deck reader's allow-list drops them first; this is
 * the second line, for any deck that reaches a worker.
 */
static bool line_runs_commands(const char *s)
{
	static const char *const prefixes[] = { ".control", ".endc", "*#", ".inc", ".lib", "*ng_script", ".title",
						".meas", ".csparam" };

	for (size_t i = 0; i < sizeof(prefixes) / sizeof(prefixes[0]); i++)
		if (sch_sim_starts_ci(s, prefixes[i]))
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
			if (sch_sim_starts_ci(line, ".endc"))
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
					"simulator: dropped deck line %zu: a card that could run commands or write files",
					i + 1);
			in_control = sch_sim_starts_ci(line, ".control");
			continue;
		}
		deck[n++] = (char *)line;
	}
	deck[n] = NULL;
	*out = deck;
	return SCH_OK;
}

/* ---- assembling the result ------------------------------------------------------------- */

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
		return sch_sim_dup_mem(p, n);
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
			if (sch_sim_starts_ci(m->text, "warning"))
				sch_diag_report(d, SCH_NOTE, NULL, 0, "simulator: %s", m->text);
		}
	}
}

/* Replaces *text by its redacted copy when it quotes included text. */
static enum sch_err redact_one(const struct sch_redact *r, char **text)
{
	bool changed = false;
	char *clean = *text ? sch_redact_text(r, *text, &changed) : NULL;

	if (changed && !clean)
		return SCH_ERR_NOMEM;
	if (clean) {
		free(*text);
		*text = clean;
	}
	return SCH_OK;
}

/* Replaces, in place, every worker text that quotes included text (redact.c). */
static enum sch_err redact_workers(const struct sch_sim_request *req, struct sch_worker *wks, size_t n_wk)
{
	struct sch_redact r;
	enum sch_err ret = sch_redact_init(&r, req);

	for (size_t w = 0; w < n_wk && ret == SCH_OK && r.active; w++) {
		struct sch_worker *wk = &wks[w];
		char *err_text = strdup(wk->err_text);

		ret = err_text ? redact_one(&r, &err_text) : SCH_ERR_NOMEM;
		if (ret == SCH_OK)
			snprintf(wk->err_text, sizeof(wk->err_text), "%s", err_text);
		free(err_text);
		if (ret == SCH_OK)
			ret = redact_one(&r, &wk->fatal);
		for (size_t i = 0; i < wk->n_msgs && ret == SCH_OK; i++)
			if (wk->msgs[i].phase != SCH_PHASE_INIT)
				ret = redact_one(&r, &wk->msgs[i].text);
	}
	sch_redact_release(&r);
	return ret;
}

/* ---- the workers' lives ---------------------------------------------------------------- */

static void release_workers(struct sch_worker *wks, size_t n_wk)
{
	for (size_t w = 0; w < n_wk; w++) {
		struct sch_worker *wk = &wks[w];

		if (wk->fd >= 0)
			close(wk->fd);
		if (wk->err_fd >= 0)
			close(wk->err_fd);
		if (wk->pid > 0) {
			int st;

			if (!wk->ended || wk->status < 0)
				kill(wk->pid, SIGKILL);
			while (waitpid(wk->pid, &st, 0) < 0 && errno == EINTR)
				;
			sch_leftover_drop_pid(wk->pid);
		}
		for (size_t i = 0; i < wk->n_msgs; i++)
			free(wk->msgs[i].text);
		free(wk->msgs);
		free(wk->buf);
		free(wk->fatal);
	}
}

/*
 * The child side of worker w: only its own pipe ends stay open, the process is set up (budget,
 * death with the tool), stderr goes to the tool. Never returns.
 */
static void become_worker(const struct sch_sim_request *req, char **deck, struct sch_worker *wks, size_t w,
			  const int fds[2], const int errs[2], pid_t parent, const sigset_t *held)
{
	close(fds[0]);
	close(errs[0]);
	for (size_t k = 0; k < w; k++) {
		if (wks[k].fd >= 0)
			close(wks[k].fd);
		if (wks[k].err_fd >= 0)
			close(wks[k].err_fd);
	}
	sch_sim_worker_process_setup(parent);
	sch_leftover_release(held);
	/* the library's own prints to stderr (an assertion) come to the tool, not the terminal */
	if (dup2(errs[1], STDERR_FILENO) < 0)
		_exit(3);
	close(errs[1]);
	sch_sim_worker_main(req, deck, wks[w].first, wks[w].end, fds[1]);
}

static enum sch_err start_workers(const struct sch_sim_request *req, char **const *decks, struct sch_worker *wks,
				  size_t n_wk, char *why, size_t why_len)
{
	pid_t parent = getpid();

	for (size_t w = 0; w < n_wk; w++) {
		wks[w].fd = -1;
		wks[w].err_fd = -1;
		wks[w].status = -1;
		wks[w].first = req->n_steps * w / n_wk;
		wks[w].end = req->n_steps * (w + 1) / n_wk;
	}
	fflush(NULL); /* a child must not write out the parent's buffered output again */
	for (size_t w = 0; w < n_wk; w++) {
		int fds[2] = { -1, -1 }, errs[2] = { -1, -1 };
		sigset_t held;
		pid_t pid = -1;

		if (pipe(fds) == 0 && pipe(errs) == 0) {
			sch_leftover_hold(&held); /* no signal between the fork and the worker's registration */
			pid = fork();
			if (pid == 0)
				become_worker(req, decks[w], wks, w, fds, errs, parent, &held);
			if (pid > 0)
				sch_leftover_add_pid(pid);
			sch_leftover_release(&held);
		}
		if (pid < 0) {
			snprintf(why, why_len, "cannot start the simulator: %s", strerror(errno));
			for (size_t k = 0; k < 2; k++) {
				if (fds[k] >= 0)
					close(fds[k]);
				if (errs[k] >= 0)
					close(errs[k]);
			}
			return SCH_ERR_SIM;
		}
		close(fds[1]);
		close(errs[1]);
		wks[w].err_fd = errs[0];
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
	sigset_t old;
	bool made;

	if (!tmp || tmp[0] != '/' || strlen(tmp) > 200 || !sch_sim_path_is_command_safe(tmp))
		tmp = "/tmp";
	snprintf(sch_data_dir, sizeof(sch_data_dir), "%s/schrot-data-XXXXXX", tmp);
	sch_leftover_hold(&old);
	made = mkdtemp(sch_data_dir) != NULL;
	if (made)
		sch_leftover_add_path(sch_data_dir, true);
	sch_leftover_release(&old);
	if (!made) {
		sch_data_dir[0] = '\0';
		return sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: cannot create a private directory in '%s': %s",
				      tmp, strerror(errno));
	}
	return SCH_OK;
}

char sch_sim_session_dir[PATH_MAX];

/* The run's private directory (sim_int.h); without one, workers use $TMPDIR as before. */
static void make_session_dir(void)
{
	const char *tmp = getenv("TMPDIR");
	sigset_t old;

	if (!tmp || tmp[0] != '/' || strlen(tmp) > 200)
		tmp = "/tmp";
	snprintf(sch_sim_session_dir, PATH_MAX, "%s/schrot-sim-XXXXXX", tmp);
	sch_leftover_hold(&old);
	if (mkdtemp(sch_sim_session_dir))
		sch_leftover_add_path(sch_sim_session_dir, true);
	else
		sch_sim_session_dir[0] = '\0';
	sch_leftover_release(&old);
}

static void remove_session_dir(void)
{
	if (!sch_sim_session_dir[0])
		return;
	sch_leftover_remove_now(sch_sim_session_dir);
	sch_sim_session_dir[0] = '\0';
}

/* Removes what a worker that died early may have left, then the directory. */
static void remove_data_dir(size_t n_steps)
{
	char path[PATH_MAX];

	if (!sch_data_dir[0])
		return;
	for (size_t s = 0; s < n_steps; s++)
		if (sch_sim_data_file_path(s, path, sizeof(path)))
			unlink(path);
	rmdir(sch_data_dir);
	sch_leftover_drop_path(sch_data_dir);
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
		sch_leftover_drop_pid(wks[w].pid);
		wks[w].pid = 0;
	}
}

/*
 * Keeps the first line with a word in it a worker writes to stderr (an assertion, an allocation failure), blanks
 * folded, at most sizeof(err_text) - 1 bytes; the rest is read and dropped, so the worker never
 * blocks on a full pipe. Sets *eof at end of stream.
 */
static void read_worker_stderr(struct sch_worker *wk, bool *eof)
{
	char chunk[4096];
	ssize_t n = read(wk->err_fd, chunk, sizeof(chunk));

	if (n < 0 && errno == EINTR)
		return;
	if (n <= 0) {
		*eof = true;
		return;
	}
	for (ssize_t i = 0; i < n && !wk->err_line_done; i++) {
		unsigned char ch = (unsigned char)chunk[i];

		if (ch == '\n' && wk->err_len > 0) {
			bool has_word = false;

			for (size_t k = 0; k < wk->err_len; k++)
				has_word = has_word || isalnum((unsigned char)wk->err_text[k]);
			if (!has_word) {
				wk->err_len = 0; /* a rule of '=' (a sanitizer's report starts so): the next line tells */
				continue;
			}
			wk->err_line_done = true;
			break;
		}
		if (ch < 0x20 || ch == 0x7f)
			ch = ' ';
		if (ch == ' ' && (wk->err_len == 0 || wk->err_text[wk->err_len - 1] == ' '))
			continue;
		if (wk->err_len + 1 < sizeof(wk->err_text))
			wk->err_text[wk->err_len++] = (char)ch;
	}
	while (wk->err_len > 0 && wk->err_text[wk->err_len - 1] == ' ')
		wk->err_len--;
	wk->err_text[wk->err_len] = '\0';
}

static double now_s(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_MONOTONIC, &ts);
	return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* utime + stime of a process from /proc (fields 14 and 15 of stat), or -1. */
static long long cpu_ticks_of(pid_t pid)
{
	char path[64], buf[1024];
	unsigned long long ut, st;
	const char *p;
	ssize_t n;
	int fd;

	snprintf(path, sizeof(path), "/proc/%ld/stat", (long)pid);
	fd = open(path, O_RDONLY | O_CLOEXEC);
	if (fd < 0)
		return -1;
	n = read(fd, buf, sizeof(buf) - 1);
	close(fd);
	if (n <= 0)
		return -1;
	buf[n] = '\0';
	p = strrchr(buf, ')'); /* the command name may hold blanks */
	if (!p || sscanf(p + 1, " %*c %*d %*d %*d %*d %*d %*u %*u %*u %*u %*u %llu %llu", &ut, &st) != 2)
		return -1;
	return (long long)(ut + st);
}

/* Kills workers that have used no CPU time and sent nothing for SCH_SIM_STALL_S (see sim_int.h). */
static void kill_stalled(struct sch_worker *wks, size_t n, bool *heard)
{
	double t = now_s();

	for (size_t i = 0; i < n; i++) {
		struct sch_worker *wk = &wks[i];
		long long ticks;

		if (wk->pid <= 0 || wk->stalled || (wk->fd < 0 && wk->err_fd < 0))
			continue;
		ticks = cpu_ticks_of(wk->pid);
		if (heard[i] || ticks < 0 || ticks != wk->cpu_ticks) {
			wk->cpu_ticks = ticks;
			wk->cpu_seen_s = t;
			continue;
		}
		if (t - wk->cpu_seen_s >= SCH_SIM_STALL_S) {
			wk->stalled = true;
			kill(wk->pid, SIGKILL);
		}
	}
}

/* Reads all workers' pipes (records and stderr) until every one is closed, so that no worker blocks on a full pipe. */
static enum sch_err drain_workers(struct sch_worker *wks, size_t n, struct sch_collect *c)
{
	struct pollfd pfd[2 * SCH_SIM_MAX_WORKERS];
	size_t owner[2 * SCH_SIM_MAX_WORKERS];
	bool heard[SCH_SIM_MAX_WORKERS] = { false };
	double last_check = now_s();

	for (size_t i = 0; i < n; i++) {
		wks[i].cpu_ticks = -1;
		wks[i].cpu_seen_s = last_check;
	}
	for (;;) {
		size_t m = 0;
		int r;

		if (now_s() - last_check >= 1.0) {
			kill_stalled(wks, n, heard);
			memset(heard, 0, sizeof(heard));
			last_check = now_s();
		}

		for (size_t i = 0; i < n; i++) {
			int fds[2] = { wks[i].fd, wks[i].err_fd };

			for (size_t k = 0; k < 2; k++) {
				if (fds[k] < 0)
					continue;
				pfd[m] = (struct pollfd){ .fd = fds[k], .events = POLLIN };
				owner[m++] = i;
			}
		}
		if (m == 0)
			return SCH_OK;
		r = poll(pfd, (nfds_t)m, 1000);
		if (r < 0) {
			if (errno == EINTR)
				continue;
			return SCH_ERR_SIM;
		}
		for (size_t j = 0; j < m; j++) {
			struct sch_worker *wk = &wks[owner[j]];
			bool eof = false;
			enum sch_err err;

			if (!pfd[j].revents)
				continue;
			heard[owner[j]] = true;
			if (pfd[j].fd == wk->err_fd) {
				read_worker_stderr(wk, &eof);
				if (eof) {
					close(wk->err_fd);
					wk->err_fd = -1;
				}
				continue;
			}
			err = sch_sim_collect_read(wk, c, &eof);
			if (err != SCH_OK)
				return err;
			if (wk->malformed && wk->pid > 0)
				kill(wk->pid, SIGKILL); /* its stderr then closes too */
			if (eof || wk->malformed) {
				close(wk->fd);
				wk->fd = -1;
			}
		}
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
	for (size_t w = 0; w < SCH_SIM_MAX_WORKERS; w++)
		wks[w].fd = wks[w].err_fd = -1;
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
	ret = sch_sim_collect_init(res, req, &c);
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
	make_session_dir();
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
	ret = redact_workers(req, wks, n_wk);
	if (ret != SCH_OK)
		goto out;
	ret = sch_sim_judge(res, wks, n_wk, &c, &failed);
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
	remove_session_dir();
	remove_data_dir(req->n_steps);
	/* a density plot whose step never ended is left out, as if it had never started */
	for (size_t s = 0; c.noise && res->steps && s < res->n_steps; s++)
		sch_sim_noise_stream_drop(&c, s);
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

		sch_sim_outcome_free_vectors(o);
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
