/* SPDX-License-Identifier: BSD-3-Clause */
/* collect.c - the tool side of the pipe: reads the workers' records into messages, vectors and rows. */
#include <errno.h>
#include <math.h>
#include <stdbool.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "sim_int.h"

#define SCH_NO_VECTOR SIZE_MAX

/* Frees an outcome's vectors (their names, values and the shared zeros); quantities stay. */
void sch_sim_outcome_free_vectors(struct sch_sim_outcome *o)
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
	m->step = sch_wire_get_u32(p + 1);
	m->text = sch_sim_dup_mem(p + 5, n - 5);
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
	v->name = sch_sim_dup_mem(name, n);
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
	step = sch_wire_get_u32(p);
	name_len = sch_wire_get_u32(p + 4);
	if (!step_is_ours(wk, step) || n < 12 + (size_t)name_len)
		goto bad;
	count = sch_wire_get_u32(p + 8 + name_len);
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
void sch_sim_noise_stream_drop(struct sch_collect *c, size_t step)
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

	if (n < 8 || !step_is_ours(wk, (step = sch_wire_get_u32(p))) || c->step_done[step])
		goto bad;
	n_cols = sch_wire_get_u32(p + 4);
	if (n_cols > (n - 8) / 4)
		goto bad;
	sch_sim_noise_stream_drop(c, step); /* only the newest density plot of a step counts */
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

		if (n - at < 4 || n - at - 4 < (len = sch_wire_get_u32(p + at)))
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

	if (n < 8 || !step_is_ours(wk, (step = sch_wire_get_u32(p))) || c->step_done[step])
		goto bad;
	ns = &c->noise[step];
	if (!ns->live || sch_wire_get_u32(p + 4) != ns->n_cols || n != 8 + 8 * (size_t)ns->n_cols)
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
	why = sch_sim_judge_text(wk, SCH_PHASE_STEP, step, &nomem);
	if (nomem)
		return SCH_ERR_NOMEM;
	if (why) {
		free(why);
		return SCH_OK;
	}
	if ((err = c->req->on_step(c->req->on_step_ctx, step, o)) != SCH_OK)
		return c->hook_err = err;
	sch_sim_outcome_free_vectors(o);
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
			wk->fatal = sch_sim_dup_mem(p, n);
			if (!wk->fatal)
				return SCH_ERR_NOMEM;
		}
		return SCH_OK;
	case SCH_REC_LOADED:
		wk->loaded = true;
		wk->load_rc = n >= 1 && p[0] != 0;
		return SCH_OK;
	case SCH_REC_QUANT:
		if (n != 4 + 8 * c->n_quantities || !step_is_ours(wk, sch_wire_get_u32(p)))
			break;
		memcpy(c->res->steps[sch_wire_get_u32(p)].quantities, p + 4, 8 * c->n_quantities);
		return SCH_OK;
	case SCH_REC_VEC:
		return on_vector(wk, c, p, n);
	case SCH_REC_NOISE_NAMES:
		return on_noise_names(wk, c, p, n);
	case SCH_REC_NOISE_ROW:
		return on_noise_row(wk, c, p, n);
	case SCH_REC_STEP_DONE:
		if (n != 5 || !step_is_ours(wk, sch_wire_get_u32(p)) || c->step_done[sch_wire_get_u32(p)])
			break;
		step = sch_wire_get_u32(p);
		c->step_done[step] = true;
		c->step_flags[step] = p[4];
		if (p[4] & (SCH_STEP_NOISE_GARBLED | SCH_STEP_DATA_FILE_BAD)) {
			sch_sim_noise_stream_drop(c, step);
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
		uint32_t plen = sch_wire_get_u32(h + 1);
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
enum sch_err sch_sim_collect_read(struct sch_worker *wk, struct sch_collect *c, bool *eof)
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

/* Sizes res and c for req; every quantity starts as NaN. */
enum sch_err sch_sim_collect_init(struct sch_sim_result *res, const struct sch_sim_request *req,
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
