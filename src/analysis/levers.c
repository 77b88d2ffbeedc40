/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * levers.c - design changes tried and ranked: the candidates from a report's rows, one batch of
 * noise runs with one change each, the ranking by input-referred band noise, and SNR(M) of every
 * avalanche rule.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/levers.h"
#include "schrot/pattern.h"
#include "schrot/physics.h"
#include "schrot/sim.h"
#include "schrot/strmap.h"

#define GAIN_MAX 1e4         /* the largest avalanche gain searched */
#define CURVE_POINTS 60
#define COVERAGE 0.99        /* candidates carry this share of the band power */
#define MAX_GAIN_CARRIERS 64 /* a rule with more carriers gets no gain lever (one alter each per run) */

/* One thing changed, tried in both directions. */
struct lever_target {
	enum sch_lever_kind kind;
	const char *device;
	const char *sim_name;     /* R, C, I: the simulator's name */
	const char *param;        /* R, C, I: "resistance", "capacitance", "dc" */
	size_t quantity;          /* R, C, I: index into the batch's quantities */
	size_t rule;              /* gain: index into the rules */
	int inst;                 /* R, C, I: the instance */
};

/* The carriers of one --avalanche rule (the first rule a carrier's name matches). */
struct gain_rule {
	const struct sch_gain_rule *r;
	size_t *carriers;         /* indices into base->set.carriers */
	size_t n;
	double *saved_gain, *saved_excess;
};

/* One run of the batch. */
struct lever_point {
	size_t target;
	double factor;
};

/* Notes for the result, in base->arena. */
struct note_list {
	const char **v;
	size_t n, cap;
};

struct lever_ctx {
	struct sch_result *base;
	const struct sch_run_options *opt;
	const struct sch_levers_options *lo;
	struct sch_levers *out;
	struct sch_arena *a;      /* base->arena */
	struct sch_diag *d;
	struct lever_target *targets;
	size_t n_targets, cap_targets;
	struct gain_rule *rules;
	size_t n_rules;
	struct lever_point *points;
	size_t n_points;
	const char **quantities;
	size_t n_quantities;
	struct note_list notes;
};

const char *sch_lever_kind_name(enum sch_lever_kind k)
{
	switch (k) {
	case SCH_LEVER_RESISTANCE:
		return "resistance";
	case SCH_LEVER_CAPACITANCE:
		return "capacitance";
	case SCH_LEVER_CURRENT:
		return "current";
	case SCH_LEVER_TEMPERATURE:
		return "temperature";
	default:
		return "gain";
	}
}

void sch_levers_options_init(struct sch_levers_options *lo)
{
	lo->factor = 2;
	lo->max_devices = 12;
	lo->temp_step_k = 10;
}

static enum sch_err note(struct lever_ctx *c, const char *s)
{
	if (!s)
		return SCH_ERR_NOMEM;
	if (c->notes.n == c->notes.cap) {
		size_t cap = c->notes.cap ? 2 * c->notes.cap : 16;
		const char **v = sch_arena_alloc(c->a, cap * sizeof(*v));
		if (!v)
			return SCH_ERR_NOMEM;
		if (c->notes.n)
			memcpy(v, c->notes.v, c->notes.n * sizeof(*v));
		c->notes.v = v;
		c->notes.cap = cap;
	}
	c->notes.v[c->notes.n++] = s;
	return SCH_OK;
}

static struct lever_target *add_target(struct lever_ctx *c, enum sch_lever_kind kind, const char *device)
{
	if (c->n_targets == c->cap_targets) {
		size_t cap = c->cap_targets ? 2 * c->cap_targets : 32;
		struct lever_target *v = sch_arena_alloc(c->a, cap * sizeof(*v));
		if (!v)
			return NULL;
		if (c->n_targets)
			memcpy(v, c->targets, c->n_targets * sizeof(*v));
		c->targets = v;
		c->cap_targets = cap;
	}
	c->targets[c->n_targets] = (struct lever_target){ kind, device, NULL, NULL, 0, 0, -1 };
	return &c->targets[c->n_targets++];
}

/*
 * A value target (R, C, I) on instance in; a note instead when its simulator name is not safe to
 * use or its value could not be read (or is zero: no factor changes it).
 */
static enum sch_err add_value_target(struct lever_ctx *c, enum sch_lever_kind kind, const struct sch_instance *in)
{
	static const char *const params[] = { "resistance", "capacitance", "dc" };
	struct lever_target *t;
	double v;

	for (size_t k = 0; k < c->n_targets; k++) {
		if (c->targets[k].device == in->path)
			return SCH_OK;
	}
	if (!sch_sim_name_is_safe(in->sim_name))
		return note(c, sch_arena_printf(c->a, "%s: its name cannot be passed to the simulator safely; not tried",
						in->path));
	v = c->base->instance_values ? c->base->instance_values[in - c->base->set.instances] : NAN;
	if (!isfinite(v) || v == 0)
		return note(c, sch_arena_printf(c->a, "%s: its value could not be read or is zero; not tried", in->path));
	if (!(t = add_target(c, kind, in->path)))
		return SCH_ERR_NOMEM;
	t->inst = (int)(in - c->base->set.instances);
	t->sim_name = in->sim_name;
	t->param = params[kind == SCH_LEVER_RESISTANCE ? 0 : kind == SCH_LEVER_CAPACITANCE ? 1 : 2];
	return SCH_OK;
}

/* Net band power per device, largest first. */
struct device_power {
	const char *device;
	double power;
};

static int by_power(const void *pa, const void *pb)
{
	const struct device_power *a = pa, *b = pb;
	if (a->power != b->power)
		return a->power > b->power ? -1 : 1;
	return strcmp(a->device, b->device);
}

static enum sch_err device_powers(const struct sch_result *res, struct device_power **out, size_t *n_out)
{
	struct sch_strmap idx;
	struct device_power *v = calloc(res->n_contributions + 1, sizeof(*v));
	size_t n = 0;
	enum sch_err ret = SCH_ERR_NOMEM;

	sch_strmap_init(&idx);
	if (!v)
		goto out;
	for (size_t k = 0; k < res->n_contributions; k++) {
		const struct sch_contribution *ct = &res->contributions[k];
		int at = sch_strmap_get(&idx, ct->device, strlen(ct->device));
		if (at < 0) {
			if (sch_strmap_put(&idx, ct->device, strlen(ct->device), (int)n) != SCH_OK)
				goto out;
			v[n].device = ct->device;
			at = (int)n++;
		}
		v[at].power += ct->band_power;
	}
	qsort(v, n, sizeof(*v), by_power);
	*out = v;
	*n_out = n;
	v = NULL;
	ret = SCH_OK;
out:
	free(v);
	sch_strmap_release(&idx);
	return ret;
}

/* True when instances a and b sit across the same two nodes of the same enclosing instance. */
static bool across(const struct sch_deck *deck, const struct sch_instance *a, const struct sch_instance *b)
{
	const char *const *na, *const *nb;

	if (a->parent != b->parent || deck->elements[a->element].subckt != deck->elements[b->element].subckt ||
	    sch_deck_element_nodes(deck, &deck->elements[a->element], &na) != 2 ||
	    sch_deck_element_nodes(deck, &deck->elements[b->element], &nb) != 2)
		return false;
	return (strcmp(na[0], nb[0]) == 0 && strcmp(na[1], nb[1]) == 0) ||
	       (strcmp(na[0], nb[1]) == 0 && strcmp(na[1], nb[0]) == 0);
}

/* The capacitors across instance in, as targets, while there is room. */
static enum sch_err add_capacitors(struct lever_ctx *c, const struct sch_instance *in, size_t *n_value)
{
	const struct sch_carrier_set *set = &c->base->set;
	enum sch_err ret;

	for (size_t k = 0; k < set->n_instances && *n_value < (size_t)c->lo->max_devices; k++) {
		const struct sch_instance *cap = &set->instances[k];
		if (c->base->deck.elements[cap->element].letter != 'c' || !across(&c->base->deck, in, cap))
			continue;
		size_t before = c->n_targets;
		if ((ret = add_value_target(c, SCH_LEVER_CAPACITANCE, cap)) != SCH_OK)
			return ret;
		*n_value += c->n_targets - before;
	}
	return SCH_OK;
}

/* True when instances a and b share a node other than ground, in the same enclosing instance. */
static bool share_node(const struct sch_deck *deck, const struct sch_instance *a, const struct sch_instance *b)
{
	const char *const *na, *const *nb;
	int ka, kb;

	if (a->parent != b->parent || deck->elements[a->element].subckt != deck->elements[b->element].subckt)
		return false;
	ka = sch_deck_element_nodes(deck, &deck->elements[a->element], &na);
	kb = sch_deck_element_nodes(deck, &deck->elements[b->element], &nb);
	for (int i = 0; i < ka; i++)
		for (int j = 0; j < kb; j++)
			if (strcmp(na[i], nb[j]) == 0 && strcmp(na[i], "0") != 0 && strcmp(na[i], "gnd") != 0)
				return true;
	return false;
}

/*
 * A device without a value of its own (a transistor, a diode) is changed through the current
 * sources at its nodes, its bias (never the input source), while there is room. *found counts them.
 */
static enum sch_err add_bias_sources(struct lever_ctx *c, const struct sch_instance *in, size_t *n_value, size_t *found)
{
	const struct sch_carrier_set *set = &c->base->set;
	enum sch_err ret;

	for (size_t k = 0; k < set->n_instances && *n_value < (size_t)c->lo->max_devices; k++) {
		const struct sch_instance *src = &set->instances[k];
		size_t before = c->n_targets;
		if (src == in || c->base->deck.elements[src->element].letter != 'i' || !share_node(&c->base->deck, in, src) ||
		    (c->base->input && src->parent < 0 && strcmp(src->path, c->base->input) == 0))
			continue;
		(*found)++;
		if ((ret = add_value_target(c, SCH_LEVER_CURRENT, src)) != SCH_OK)
			return ret;
		*n_value += c->n_targets - before;
	}
	return SCH_OK;
}

/* The lever of one noisy device (and the capacitors across it); a note when it has none. */
static enum sch_err device_levers(struct lever_ctx *c, const struct sch_instance *in, size_t *n_value)
{
	char letter = c->base->deck.elements[in->element].letter;
	size_t before = c->n_targets;
	enum sch_err ret;

	if (letter == 'i' && c->base->input && in->parent < 0 && strcmp(in->path, c->base->input) == 0)
		ret = note(c, sch_arena_printf(c->a, "%s: the input source; never a lever", in->path));
	else if (letter == 'r' || letter == 'i')
		ret = add_value_target(c, letter == 'r' ? SCH_LEVER_RESISTANCE : SCH_LEVER_CURRENT, in);
	else {
		size_t found = 0;
		if ((ret = add_bias_sources(c, in, n_value, &found)) == SCH_OK && found == 0)
			ret = note(c, sch_arena_printf(c->a, "%s: no value to change (element letter '%c') and no current "
							     "source at its nodes; its noise follows its operating point",
						       in->path, letter));
	}
	if (ret != SCH_OK)
		return ret;
	*n_value += c->n_targets - before;
	return add_capacitors(c, in, n_value);
}

/* The devices that carry COVERAGE of the band power, at most max_devices value targets. */
static enum sch_err pick_devices(struct lever_ctx *c)
{
	const struct sch_result *res = c->base;
	struct device_power *dev = NULL;
	struct sch_strmap paths;
	size_t n_dev = 0, n_value = 0;
	double covered = 0;
	enum sch_err ret;

	sch_strmap_init(&paths);
	if ((ret = device_powers(res, &dev, &n_dev)) != SCH_OK)
		goto out;
	for (size_t k = 0; k < res->set.n_instances; k++) {
		const char *p = res->set.instances[k].path;
		if ((ret = sch_strmap_put(&paths, p, strlen(p), (int)k)) != SCH_OK)
			goto out;
	}
	for (size_t k = 0; k < n_dev && covered < COVERAGE * res->total_power_v2 && n_value < (size_t)c->lo->max_devices;
	     k++) {
		int at = sch_strmap_get(&paths, dev[k].device, strlen(dev[k].device));
		covered += dev[k].power;
		c->out->n_devices++;
		if (at < 0)
			continue; /* a --lump row */
		if ((ret = device_levers(c, &res->set.instances[at], &n_value)) != SCH_OK)
			goto out;
	}
	c->out->coverage = res->total_power_v2 > 0 ? covered / res->total_power_v2 : NAN;
	if (c->out->coverage < COVERAGE)
		ret = note(c, sch_arena_printf(c->a, "levers tried for the first %zu devices, %.1f %% of the band power "
						     "(--max %d)",
					       c->out->n_devices, 100 * c->out->coverage, c->lo->max_devices));
out:
	free(dev);
	sch_strmap_release(&paths);
	return ret;
}

/* Each carrier under the first --avalanche rule its name matches (c->rules). SCH_ERR_NOMEM. */
static enum sch_err match_gain_rules(struct lever_ctx *c)
{
	const struct sch_carrier_options *co = &c->opt->carriers;
	const struct sch_carrier_set *set = &c->base->set;
	struct sch_pattern **pat = calloc(co->n_avalanche + 1, sizeof(*pat));
	enum sch_err ret = SCH_ERR_NOMEM;

	if (!pat || !(c->rules = sch_arena_alloc(c->a, (co->n_avalanche + 1) * sizeof(*c->rules))))
		goto out;
	for (size_t r = 0; r < co->n_avalanche; r++) {
		struct gain_rule *g = &c->rules[r];
		/* the same rules compiled for the first run: they cannot fail here */
		if ((ret = sch_pattern_compile(&pat[r], co->avalanche[r].regex, SCH_PAT_CASELESS | SCH_PAT_WHOLE,
					       "--avalanche", c->d)) != SCH_OK)
			goto out;
		g->r = &co->avalanche[r];
		g->carriers = sch_arena_alloc(c->a, (set->n_carriers + 1) * sizeof(size_t));
		g->saved_gain = sch_arena_alloc(c->a, (set->n_carriers + 1) * sizeof(double));
		g->saved_excess = sch_arena_alloc(c->a, (set->n_carriers + 1) * sizeof(double));
		if (!g->carriers || !g->saved_gain || !g->saved_excess) {
			ret = SCH_ERR_NOMEM;
			goto out;
		}
	}
	c->n_rules = co->n_avalanche;
	for (size_t k = 0; k < set->n_carriers; k++) {
		for (size_t r = 0; r < c->n_rules; r++) {
			if (sch_pattern_match(pat[r], set->carriers[k].name, strlen(set->carriers[k].name))) {
				c->rules[r].carriers[c->rules[r].n++] = k;
				break;
			}
		}
	}
	ret = SCH_OK;
out:
	for (size_t r = 0; pat && r < co->n_avalanche; r++)
		sch_pattern_free(pat[r]);
	free(pat);
	return ret;
}

/* True when every carrier of g is a current source whose value can be read and changed. */
static bool gain_changeable(const struct lever_ctx *c, const struct gain_rule *g)
{
	const struct sch_result *base = c->base;

	if (g->n == 0 || g->n > MAX_GAIN_CARRIERS || !base->instance_values)
		return false;
	for (size_t k = 0; k < g->n; k++) {
		const struct sch_carrier *car = &base->set.carriers[g->carriers[k]];
		double v = base->instance_values[car->instance];
		if (base->deck.elements[car->element].letter != 'i' || !sch_sim_name_is_safe(car->sim_name) ||
		    !isfinite(v) || v == 0)
			return false;
	}
	return true;
}

/* A gain target per --avalanche rule with carriers; a note for a rule whose gain cannot be tried. */
static enum sch_err pick_gain_rules(struct lever_ctx *c)
{
	enum sch_err ret = match_gain_rules(c);

	for (size_t r = 0; r < c->n_rules && ret == SCH_OK; r++) {
		const struct gain_rule *g = &c->rules[r];
		struct lever_target *t;
		if (gain_changeable(c, g)) {
			if (!(t = add_target(c, SCH_LEVER_GAIN, c->base->set.carriers[g->carriers[0]].name)))
				return SCH_ERR_NOMEM;
			t->rule = r;
		} else if (g->n > 0) {
			ret = note(c, sch_arena_printf(c->a, "--avalanche '%s': gain not tried (its carriers must be current "
							     "sources, at most %d)",
						       g->r->regex, MAX_GAIN_CARRIERS));
		}
	}
	return ret;
}

/* The gain a point gives its rule: M x factor, never below 1. */
static double point_gain(const struct gain_rule *g, double factor)
{
	double m = g->r->gain_m * factor;
	return m < 1 ? 1 : m;
}

/* The points (two per target; one for a gain already at 1 going down) and their quantities. */
static enum sch_err plan_points(struct lever_ctx *c)
{
	double f = c->lo->factor;

	c->points = sch_arena_alloc(c->a, (2 * c->n_targets + 1) * sizeof(*c->points));
	c->quantities = sch_arena_alloc(c->a, (c->n_targets + 1) * sizeof(*c->quantities));
	if (!c->points || !c->quantities)
		return SCH_ERR_NOMEM;
	for (size_t t = 0; t < c->n_targets; t++) {
		struct lever_target *tg = &c->targets[t];
		c->points[c->n_points++] = (struct lever_point){ t, f };
		if (tg->kind == SCH_LEVER_GAIN) {
			const struct gain_rule *g = &c->rules[tg->rule];
			if (point_gain(g, 1 / f) < g->r->gain_m)
				c->points[c->n_points++] = (struct lever_point){ t, point_gain(g, 1 / f) / g->r->gain_m };
			continue;
		}
		c->points[c->n_points++] = (struct lever_point){ t, 1 / f };
		if (tg->sim_name) {
			tg->quantity = c->n_quantities;
			c->quantities[c->n_quantities] = sch_arena_printf(c->a, "@%s[%s]", tg->sim_name, tg->param);
			if (!c->quantities[c->n_quantities++])
				return SCH_ERR_NOMEM;
		}
	}
	return SCH_OK;
}

/* The number of commands that set target t (to its value or back). */
static size_t target_commands(const struct lever_ctx *c, const struct lever_target *t)
{
	return t->kind == SCH_LEVER_GAIN ? c->rules[t->rule].n : 1;
}

/*
 * Appends to cmds the commands that set target t to factor times its value in the unchanged
 * circuit (factor 1: back to it). Values are absolute, so a point never depends on which point
 * its worker ran before. The names passed sch_sim_name_is_safe when the target was made.
 */
static enum sch_err set_target(struct lever_ctx *c, const struct lever_target *t, double factor, const char **cmds,
			       size_t *n)
{
	const struct sch_result *base = c->base;

	if (t->kind == SCH_LEVER_TEMPERATURE) {
		double t_c = base->temp_k - SCH_ZERO_C_K;
		if (factor != 1)
			t_c += factor > 1 ? c->lo->temp_step_k : -c->lo->temp_step_k;
		return (cmds[(*n)++] = sch_arena_printf(c->a, "option temp=%.17g", t_c)) ? SCH_OK : SCH_ERR_NOMEM;
	}
	for (size_t i = 0; i < target_commands(c, t); i++) {
		const struct sch_carrier *car = t->kind == SCH_LEVER_GAIN ? &base->set.carriers[c->rules[t->rule].carriers[i]]
									  : NULL;
		const char *sim = car ? car->sim_name : t->sim_name;
		const char *param = car ? "dc" : t->param;
		double v = base->instance_values[car ? car->instance : t->inst] * factor;
		if (!(cmds[(*n)++] = sch_arena_printf(c->a, "alter @%s[%s]=%.17g", sim, param, v)))
			return SCH_ERR_NOMEM;
	}
	return SCH_OK;
}

/* Point k's commands: every other target back to its value (a worker's earlier point may have changed it), then its own change. */
static enum sch_err point_commands(struct lever_ctx *c, size_t k, struct sch_batch_point *bp)
{
	const struct lever_point *p = &c->points[k];
	size_t n_cmds = 0, n = 0;
	const char **cmds;
	enum sch_err ret;

	for (size_t t = 0; t < c->n_targets; t++)
		n_cmds += target_commands(c, &c->targets[t]);
	if (!(cmds = sch_arena_alloc(c->a, (n_cmds + 1) * sizeof(*cmds))))
		return SCH_ERR_NOMEM;
	for (size_t t = 0; t < c->n_targets; t++) {
		if (t != p->target && (ret = set_target(c, &c->targets[t], 1, cmds, &n)) != SCH_OK)
			return ret;
	}
	if ((ret = set_target(c, &c->targets[p->target], p->factor, cmds, &n)) != SCH_OK)
		return ret;
	bp->commands = cmds;
	bp->n_commands = n;
	return SCH_OK;
}

/* A gain point runs with its rule's carriers at the new gain (their Fano factor kept). */
static enum sch_err lever_prepare(void *ctx, size_t k, struct sch_result *res)
{
	struct lever_ctx *c = ctx;
	const struct lever_target *t = &c->targets[c->points[k].target];
	struct gain_rule *g;
	double m, f0;

	if (t->kind != SCH_LEVER_GAIN)
		return SCH_OK;
	g = &c->rules[t->rule];
	m = g->r->gain_m * c->points[k].factor;
	f0 = sch_mcintyre_f(g->r->gain_m, g->r->k_ratio);
	for (size_t i = 0; i < g->n; i++) {
		struct sch_carrier *car = &res->set.carriers[g->carriers[i]];
		g->saved_gain[i] = car->gain_m;
		g->saved_excess[i] = car->excess_f;
		car->gain_m = m;
		car->excess_f = sch_mcintyre_f(m, g->r->k_ratio) * (car->excess_f / f0);
	}
	return SCH_OK;
}

static void lever_undo(void *ctx, size_t k, struct sch_result *res)
{
	struct lever_ctx *c = ctx;
	const struct lever_target *t = &c->targets[c->points[k].target];
	const struct gain_rule *g;

	if (t->kind != SCH_LEVER_GAIN)
		return;
	g = &c->rules[t->rule];
	for (size_t i = 0; i < g->n; i++) {
		res->set.carriers[g->carriers[i]].gain_m = g->saved_gain[i];
		res->set.carriers[g->carriers[i]].excess_f = g->saved_excess[i];
	}
}

/* What point k left: its input-referred noise, leader and bandwidth; the new value when read. */
static enum sch_err lever_take(void *ctx, size_t k, const struct sch_result *res, const double *quantities)
{
	struct lever_ctx *c = ctx;
	const struct lever_point *p = &c->points[k];
	const struct lever_target *t = &c->targets[p->target];
	struct sch_lever *l = &c->out->levers[k];

	l->input_rms = res->input_rms;
	if (t->kind == SCH_LEVER_GAIN)
		l->input_rms /= p->factor; /* the signal is multiplied by the gain as the primary current is */
	l->output_rms_v = res->output_rms_v;
	l->f_high_hz = res->transfer.f_high_hz;
	l->leader = NULL;
	if (res->n_contributions) {
		l->leader = sch_arena_strdup(c->a, res->contributions[0].device);
		l->leader_share = res->contributions[0].share;
		if (!l->leader)
			return SCH_ERR_NOMEM;
	}
	if (t->sim_name) {
		l->new_value = quantities[t->quantity]; /* read back: the change took effect */
		l->old_value = c->base->instance_values[t->inst];
	}
	return SCH_OK;
}

/* "100k", "2.2p", "-500n": a value as a netlist would write it, four significant figures. */
static void spice_value(char *out, size_t size, double v)
{
	static const struct {
		double scale;
		const char *suffix;
	} s[] = { { 1e12, "t" }, { 1e9, "g" }, { 1e6, "meg" }, { 1e3, "k" }, { 1, "" },	  { 1e-3, "m" },
		  { 1e-6, "u" }, { 1e-9, "n" }, { 1e-12, "p" },	  { 1e-15, "f" }, { 1e-18, "a" } };
	double a = fabs(v);

	for (size_t i = 0; i < sizeof(s) / sizeof(s[0]); i++) {
		if (a >= s[i].scale * (1 - 1e-12) || i + 1 == sizeof(s) / sizeof(s[0])) {
			snprintf(out, size, "%.4g%s", v / s[i].scale, s[i].suffix);
			return;
		}
	}
}

/* The change as text and the figures that need the unchanged circuit. */
static enum sch_err finish_lever(struct lever_ctx *c, size_t k)
{
	const struct lever_point *p = &c->points[k];
	const struct lever_target *t = &c->targets[p->target];
	struct sch_lever *l = &c->out->levers[k];
	char a[64], b[64];

	l->kind = t->kind;
	l->device = t->kind == SCH_LEVER_TEMPERATURE ? "temp" : t->device;
	l->factor = p->factor;
	if (t->kind == SCH_LEVER_TEMPERATURE) {
		l->old_value = c->base->temp_k;
		l->new_value = c->base->temp_k + (p->factor > 1 ? c->lo->temp_step_k : -c->lo->temp_step_k);
		l->factor = l->new_value / l->old_value;
		l->change = sch_arena_printf(c->a, "temp %.5g K -> %.5g K", l->old_value, l->new_value);
	} else if (t->kind == SCH_LEVER_GAIN) {
		l->old_value = c->rules[t->rule].r->gain_m;
		l->new_value = l->old_value * p->factor;
		l->change = sch_arena_printf(c->a, "%s gain %.4g -> %.4g", t->device, l->old_value, l->new_value);
	} else {
		spice_value(a, sizeof(a), l->old_value);
		spice_value(b, sizeof(b), l->new_value);
		l->change = sch_arena_printf(c->a, "%s %s -> %s", t->device, a, b);
	}
	if (!l->change)
		return SCH_ERR_NOMEM;
	l->input_rms_ratio = c->out->base_input_rms > 0 ? l->input_rms / c->out->base_input_rms : NAN;
	l->snr_change_db = NAN;
	l->snr = NAN;
	if (!isnan(c->base->snr) && l->input_rms_ratio > 0) {
		l->snr_change_db = -20 * log10(l->input_rms_ratio);
		l->snr = c->base->snr / (l->input_rms_ratio * l->input_rms_ratio);
	}
	/* NaN: |H| does not fall 3 dB within the run */
	l->bandwidth_warning = l->f_high_hz < c->base->band_hi_hz &&
			       (isnan(c->out->base_f_high_hz) || l->f_high_hz < c->out->base_f_high_hz * 0.99);
	return SCH_OK;
}

static int by_ratio(const void *pa, const void *pb)
{
	const struct sch_lever *a = pa, *b = pb;
	bool na = isnan(a->input_rms_ratio), nb = isnan(b->input_rms_ratio);

	if (na != nb)
		return na ? 1 : -1;
	if (!na && a->input_rms_ratio != b->input_rms_ratio)
		return a->input_rms_ratio < b->input_rms_ratio ? -1 : 1;
	if (strcmp(a->device, b->device) != 0)
		return strcmp(a->device, b->device);
	return a->factor < b->factor ? -1 : a->factor > b->factor;
}

/* SNR(M) / SNR at the largest: M^2 / (a M^2 F(M) + b). */
static double snr_shape(double m, double a, double b, double k)
{
	return m * m / (a * m * m * sch_mcintyre_f(m, k) + b);
}

double sch_levers_gain_opt(double a, double b, double k, double m_max)
{
	enum { N = 2000 };
	double best = -1, lo, hi;
	size_t at = 0;

	if (!(a > 0) || !(b >= 0) || !(k > 0) || !(m_max > 1))
		return NAN;
	for (size_t i = 0; i <= N; i++) {
		double m = exp(log(m_max) * (double)i / N);
		double s = snr_shape(m, a, b, k);
		if (s > best) {
			best = s;
			at = i;
		}
	}
	if (at == N)
		return NAN;
	lo = log(m_max) * (double)(at ? at - 1 : 0) / N;
	hi = log(m_max) * (double)(at + 1) / N;
	for (int it = 0; it < 100; it++) { /* golden section in log M: the shape has one maximum */
		double x1 = hi - 0.6180339887498949 * (hi - lo), x2 = lo + 0.6180339887498949 * (hi - lo);
		if (snr_shape(exp(x1), a, b, k) < snr_shape(exp(x2), a, b, k))
			lo = x1;
		else
			hi = x2;
	}
	return exp((lo + hi) / 2);
}

/*
 * One rule's SNR(M) from the report's rows: its carriers' band power P_a scales as M^2 F(M) with
 * the primary current held (density 2q I M F with I = I_p M), the rest P_r stays, and the signal
 * scales as M: SNR(M) is proportional to M^2 / (P_a M^2 F(M) / (M0^2 F(M0)) + P_r).
 */
static enum sch_err gain_curve(struct lever_ctx *c, const struct gain_rule *g, struct sch_gain_curve *gc)
{
	const struct sch_result *res = c->base;
	double p_a = 0, m0 = g->r->gain_m, k = g->r->k_ratio, a, b, s0, top;

	for (size_t i = 0; i < res->n_contributions; i++) {
		const struct sch_contribution *ct = &res->contributions[i];
		if (ct->origin != SCH_ORIGIN_ADDED)
			continue;
		for (size_t j = 0; j < g->n; j++)
			if (ct->device == res->set.carriers[g->carriers[j]].name)
				p_a += ct->band_power;
	}
	gc->rule = g->r->regex;
	gc->carrier = res->set.carriers[g->carriers[0]].name;
	gc->n_carriers = g->n;
	gc->gain_m = m0;
	gc->k_ratio = k;
	gc->carrier_share = res->total_power_v2 > 0 ? p_a / res->total_power_v2 : NAN;
	a = p_a / (m0 * m0 * sch_mcintyre_f(m0, k));
	b = res->total_power_v2 - p_a;
	s0 = snr_shape(m0, a, b, k);
	gc->gain_opt = sch_levers_gain_opt(a, b < 0 ? 0 : b, k, GAIN_MAX);
	gc->snr_change_opt_db = isnan(gc->gain_opt) ? NAN : 10 * log10(snr_shape(gc->gain_opt, a, b, k) / s0);
	gc->snr_at_rule = res->snr;
	gc->snr_at_opt = isnan(gc->gain_opt) ? NAN : res->snr * snr_shape(gc->gain_opt, a, b, k) / s0;
	top = 10 * fmax(m0, isnan(gc->gain_opt) ? m0 : gc->gain_opt);
	top = fmin(fmax(top, 10), GAIN_MAX);
	gc->n = CURVE_POINTS;
	gc->gain = sch_arena_alloc(c->a, gc->n * sizeof(double));
	gc->snr_change_db = sch_arena_alloc(c->a, gc->n * sizeof(double));
	if (!gc->gain || !gc->snr_change_db)
		return SCH_ERR_NOMEM;
	for (size_t i = 0; i < gc->n; i++) {
		gc->gain[i] = exp(log(top) * (double)i / (double)(gc->n - 1));
		gc->snr_change_db[i] = 10 * log10(snr_shape(gc->gain[i], a, b, k) / s0);
	}
	return SCH_OK;
}

static enum sch_err gain_curves(struct lever_ctx *c)
{
	struct sch_levers *out = c->out;
	enum sch_err ret;

	out->curves = sch_arena_alloc(c->a, (c->n_rules + 1) * sizeof(*out->curves));
	if (!out->curves)
		return SCH_ERR_NOMEM;
	for (size_t r = 0; r < c->n_rules; r++) {
		if (c->rules[r].n == 0)
			continue;
		if ((ret = gain_curve(c, &c->rules[r], &out->curves[out->n_curves++])) != SCH_OK)
			return ret;
	}
	return SCH_OK;
}

/* Every point as one batch on the loaded circuit, then the levers ranked. */
static enum sch_err run_points(struct lever_ctx *c, const char *path, struct sch_diag *d)
{
	struct sch_batch batch;
	struct sch_result res;
	struct sch_batch_point *bp = sch_arena_alloc(c->a, (c->n_points + 1) * sizeof(*bp));
	enum sch_err ret = SCH_ERR_NOMEM;

	sch_result_init(&res);
	c->out->levers = sch_arena_alloc(c->a, (c->n_points + 1) * sizeof(*c->out->levers));
	if (!bp || !c->out->levers)
		goto out;
	for (size_t k = 0; k < c->n_points; k++) {
		if ((ret = point_commands(c, k, &bp[k])) != SCH_OK)
			goto out;
	}
	memset(&batch, 0, sizeof(batch));
	batch.points = bp;
	batch.n_points = c->n_points;
	batch.quantities = c->quantities;
	batch.n_quantities = c->n_quantities;
	batch.prepare = lever_prepare;
	batch.take = lever_take;
	batch.undo = lever_undo;
	batch.ctx = c;
	/* the batch's own set of carriers is changed by prepare: the rules index it the same way */
	if ((ret = sch_analysis_batch(path, c->opt, &batch, &res, d)) != SCH_OK)
		goto out;
	for (size_t k = 0; k < c->n_points; k++) {
		if ((ret = finish_lever(c, k)) != SCH_OK)
			goto out;
	}
	c->out->n_levers = c->n_points;
	c->out->n_runs = c->n_points;
	qsort(c->out->levers, c->out->n_levers, sizeof(*c->out->levers), by_ratio);
out:
	sch_result_release(&res);
	return ret;
}

enum sch_err sch_levers_find(const char *path, const struct sch_run_options *opt, const struct sch_levers_options *lo,
			     struct sch_result *base, struct sch_levers *out, struct sch_diag *d)
{
	struct sch_run_options base_opt;
	struct lever_ctx c;
	enum sch_err ret;

	memset(out, 0, sizeof(*out));
	memset(&c, 0, sizeof(c));
	out->factor = lo->factor;
	out->temp_step_k = lo->temp_step_k;
	base_opt = *opt;
	base_opt.read_values = true;
	if ((ret = sch_analysis_run(path, &base_opt, base, d)) != SCH_OK)
		return ret;
	c.base = base;
	c.opt = opt;
	c.lo = lo;
	c.out = out;
	c.a = &base->arena;
	c.d = d;
	out->base_input_rms = base->input_rms;
	out->base_f_high_hz = base->transfer.f_high_hz;
	if ((ret = pick_devices(&c)) != SCH_OK || !add_target(&c, SCH_LEVER_TEMPERATURE, "temp") ||
	    (ret = pick_gain_rules(&c)) != SCH_OK || (ret = plan_points(&c)) != SCH_OK ||
	    (ret = run_points(&c, path, d)) != SCH_OK || (ret = gain_curves(&c)) != SCH_OK)
		return ret ? ret : SCH_ERR_NOMEM;
	out->notes = c.notes.v;
	out->n_notes = c.notes.n;
	return SCH_OK;
}
