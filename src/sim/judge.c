/* SPDX-License-Identifier: BSD-3-Clause */
/* judge.c - turns the simulator's text and the workers' fate into failure reasons, per step and per run. */
#define _GNU_SOURCE /* strcasestr */
#include <ctype.h>
#include <stdbool.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <signal.h>
#include <sys/wait.h>

#include "sim_int.h"

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
	if (sch_sim_starts_ci(s, "error"))
		return 1;
	if (names_a_cause(s))
		return 2;
	if (!is_warning(s) && !sch_sim_starts_ci(s, "note") &&
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
		if (sch_sim_starts_ci(next, "error") || is_warning(next))
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

/* The most telling failure line of one phase (and step), or NULL when the text shows none. */
char *sch_sim_judge_text(const struct sch_worker *wk, enum sch_phase phase, uint32_t step, bool *nomem)
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

/*
 * The library's own words for a failed allocation (tmalloc, trealloc and the numparam allocators).
 * "can't allocate -8 bytes" is a size gone negative, a bug of the library, not a lack of memory.
 */
static bool says_out_of_memory(const char *s)
{
	const char *n = strcasestr(s, "can't allocate");

	if (n) {
		n += strlen("can't allocate");
		while (*n == ' ')
			n++;
		return *n != '-';
	}
	/* the last two are a sanitizer allocator's words, in a sanitizer build */
	return strcasestr(s, "cannot allocate") || strcasestr(s, "memory allocation failed") ||
	       strcasestr(s, "out of memory") || strcasestr(s, "failed to allocate") ||
	       strcasestr(s, "failed to mmap");
}

static char *out_of_memory(void)
{
	char line[200];

	snprintf(line, sizeof(line), "the simulator ran out of memory (worker budget %.0f MiB; raise it with --worker-limit)",
		 sch_sim_get_budget().mem_mib);
	return strdup(line);
}

/*
 * A worker killed by a signal: a budget it reached, an allocation that failed (the worker's
 * SIGSEGV handler exits with SCH_WORKER_EXIT_NOMEM then), or a crash with the first line the
 * library wrote to stderr (an assertion), if any.
 */
static char *death_reason(const struct sch_worker *wk)
{
	struct sch_sim_budget b = sch_sim_get_budget();
	char line[800];

	if (WIFEXITED(wk->status) && WEXITSTATUS(wk->status) == SCH_WORKER_EXIT_NOMEM)
		return out_of_memory();
	if (wk->stalled) {
		snprintf(line, sizeof(line),
			 "the simulator hung (no CPU time used for %.0f s, as when an allocation fails inside it; "
			 "worker budget %.0f MiB, raise it with --worker-limit)", SCH_SIM_STALL_S, b.mem_mib);
		return strdup(line);
	}
	if (!WIFSIGNALED(wk->status))
		return NULL;
	switch (WTERMSIG(wk->status)) {
	case SIGXCPU:
		snprintf(line, sizeof(line),
			 "the simulator spent its CPU-time budget of %.0f s (raise it with --worker-limit)", b.cpu_s);
		break;
	case SIGXFSZ:
		snprintf(line, sizeof(line),
			 "the simulator's data file reached the size budget of %.0f MiB (raise it with --worker-limit)",
			 b.mem_mib);
		break;
	default:
		if (wk->err_text[0])
			snprintf(line, sizeof(line), "simulator crashed (signal %d): %.400s", WTERMSIG(wk->status),
				 wk->err_text);
		else
			snprintf(line, sizeof(line), "simulator crashed (signal %d)", WTERMSIG(wk->status));
		break;
	}
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
	if (pick && says_out_of_memory(pick))
		return out_of_memory();
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

	if (wk->fatal)
		return printf_dup("%s", wk->fatal);
	if (wk->gave_up) {
		locate_give_up(wk, c);
		return gave_up_reason(wk);
	}
	if (wk->status >= 0 && (r = death_reason(wk)) != NULL)
		return r;
	/* a sanitizer's allocator reports the failure on stderr and exits */
	if (!wk->ended && says_out_of_memory(wk->err_text))
		return out_of_memory();
	r = sch_sim_judge_text(wk, SCH_PHASE_LOAD, SCH_STEP_NONE, nomem);
	if (r || *nomem)
		return r;
	if (wk->loaded && wk->load_rc)
		return strdup("the simulator did not load the deck");
	if (wk->malformed)
		return strdup("simulator worker sent malformed data");
	if (!wk->ended)
		return wk->err_text[0] ? printf_dup("simulator worker exited without a result: %.400s", wk->err_text)
				       : strdup("simulator worker exited without a result");
	return NULL;
}

/* Sets every step's failure and res->failure; returns whether anything failed. */
enum sch_err sch_sim_judge(struct sch_sim_result *res, struct sch_worker *wks, size_t n_wk,
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
				o->failure = sch_sim_judge_text(wk, SCH_PHASE_STEP, (uint32_t)s, &nomem);
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
