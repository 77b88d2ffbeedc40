/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * contributions.c - the simulator's density vectors turned into rows named by netlist device: our
 * generators scaled to 2q|I|G, the simulator's own generators restated in SI 2019 constants, and
 * the --lump row for a set of resistors.
 */
#include <math.h>
#include <string.h>
#include "analysis_int.h"
#include "schrot/pattern.h"
#include "schrot/physics.h"
#include "schrot/si.h"

static enum sch_mechanism mechanism_of(char letter, const char *gen)
{
	if (strstr(gen, "1overf"))
		return SCH_MECH_FLICKER;
	switch (letter) {
	case 'd':
		return strcmp(gen, "id") == 0 ? SCH_MECH_SHOT : SCH_MECH_THERMAL;
	case 'q':
		if (gen[0] == 'i')
			return SCH_MECH_SHOT;
		return gen[0] == 'r' ? SCH_MECH_THERMAL : SCH_MECH_OTHER;
	case 'm':
	case 'j':
		if (strncmp(gen, "ig", 2) == 0)
			return SCH_MECH_SHOT;
		if (strcmp(gen, "id") == 0 || gen[0] == 'r')
			return SCH_MECH_THERMAL;
		return SCH_MECH_OTHER;
	default:
		if (strcmp(gen, "thermal") == 0 || gen[0] == 'r')
			return SCH_MECH_THERMAL;
		return SCH_MECH_OTHER;
	}
}

struct sch_contribution *sch_analysis_row_add(struct sch_arena *a, struct sch_row_list *l, size_t n_freq)
{
	struct sch_contribution *c;
	if (l->n == l->cap) {
		size_t cap = l->cap ? l->cap * 2 : 64;
		struct sch_contribution *v = sch_arena_alloc(a, cap * sizeof(*v));
		if (!v)
			return NULL;
		if (l->n)
			memcpy(v, l->v, l->n * sizeof(*v));
		l->v = v;
		l->cap = cap;
	}
	c = &l->v[l->n];
	memset(c, 0, sizeof(*c));
	c->psd = sch_arena_alloc(a, (n_freq + 1) * sizeof(double));
	if (!c->psd)
		return NULL;
	c->dc_current_a = NAN;
	c->device_count = 1;
	l->n++;
	return c;
}

static bool all_zero(const double *v, size_t n)
{
	for (size_t i = 0; i < n; i++) {
		if (v[i] != 0.0)
			return false;
	}
	return true;
}

/* Sets every per-instance vector and row index of m to -1 (none yet). */
static void reset_rows(struct sch_vector_map *m, size_t n_instances)
{
	for (size_t i = 0; i < n_instances; i++) {
		m->probe_vec[i] = -1;
		m->id_vec[i] = -1;
		m->id_row[i] = -1;
		m->ic_row[i] = -1;
		m->ib_row[i] = -1;
	}
}

enum sch_err sch_analysis_map_vectors(struct sch_analysis *an)
{
	struct sch_result *res = an->res;
	const struct sch_augmented *aug = &an->aug;
	struct sch_vector_map *m = &an->m;
	struct sch_arena *a = &res->arena;
	const struct sch_carrier_set *set = &res->set;
	size_t size = (set->n_instances + 1) * sizeof(int);

	sch_strmap_init(&m->devices);
	sch_strmap_init(&m->probes);
	m->probe_vec = sch_arena_alloc(a, size);
	m->id_vec = sch_arena_alloc(a, size);
	m->id_row = sch_arena_alloc(a, size);
	m->ic_row = sch_arena_alloc(a, size);
	m->ib_row = sch_arena_alloc(a, size);
	m->probe_owner = sch_arena_alloc(a, size);
	if (!m->probe_vec || !m->id_vec || !m->id_row || !m->ic_row || !m->ib_row || !m->probe_owner)
		return SCH_ERR_NOMEM;
	reset_rows(m, set->n_instances);
	for (size_t k = 0; k < set->n_instances; k++) {
		const struct sch_instance *in = &set->instances[k];
		int p = aug->probe_of_element[in->element];
		if (sch_strmap_put(&m->devices, in->sim_name, strlen(in->sim_name), (int)k) != SCH_OK)
			return SCH_ERR_NOMEM;
		m->probe_owner[k] = -1;
		/* a shared probe belongs to the instance of the element it was made for (the carrier) */
		if (p >= 0 && aug->probes[p].element == in->element) {
			const char *pn = sch_augment_probe_sim_name(a, &aug->probes[p], in->path);
			if (!pn || sch_strmap_put(&m->probes, pn, strlen(pn), (int)k) != SCH_OK)
				return SCH_ERR_NOMEM;
		}
	}
	for (size_t k = 0; k < set->n_instances; k++) {
		const struct sch_instance *in = &set->instances[k];
		int p = aug->probe_of_element[in->element];
		const char *pn;
		if (p < 0 || aug->probes[p].element == in->element)
			continue;
		if (!(pn = sch_augment_probe_sim_name(a, &aug->probes[p], in->path)))
			return SCH_ERR_NOMEM;
		m->probe_owner[k] = sch_strmap_get(&m->probes, pn, strlen(pn));
	}
	return SCH_OK;
}

/*
 * Splits a per-generator vector name into its device instance and generator suffix. Returns the
 * instance index (and *gen), -2 for a device-sum vector, -3 for a probe (instance in *probe_of),
 * -1 for a name that maps to nothing we know.
 */
static int classify_vector(const struct sch_vector_map *m, const char *name, const char **gen, int *probe_of)
{
	const char *rest;
	char sep;
	size_t n;
	int k;

	if (strncmp(name, "onoise_", 7) == 0)
		sep = '_';
	else if (strncmp(name, "onoise.", 7) == 0)
		sep = '.';
	else
		return -1;
	rest = name + 7;
	n = strlen(rest);
	if (n > 8 && strcmp(rest + n - 8, "_thermal") == 0 && (k = sch_strmap_get(&m->probes, rest, n - 8)) >= 0) {
		*probe_of = k;
		return -3;
	}
	if (sch_strmap_get(&m->probes, rest, n) >= 0 || sch_strmap_get(&m->devices, rest, n) >= 0)
		return -2;
	for (size_t p = n; p-- > 0;) {
		if (rest[p] != sep)
			continue;
		k = sch_strmap_get(&m->probes, rest, p);
		if (k >= 0) {
			*gen = NULL; /* another generator of our own resistor (flicker: always zero) */
			return -2;
		}
		k = sch_strmap_get(&m->devices, rest, p);
		if (k >= 0) {
			*gen = rest + p + 1;
			return k;
		}
	}
	return -1;
}

/*
 * Whether take_vectors can use a density vector; the simulator session drops the others as they
 * arrive. Device sums (classify_vector's -2) are left out: take_vectors skips them anyway.
 */
bool sch_analysis_keep_vector(void *ctx, const char *name)
{
	const char *gen = NULL;
	int probe_of = -1;

	if (strncmp(name, "onoise", 6) != 0 || strcmp(name, "onoise_spectrum") == 0)
		return true;
	return classify_vector(ctx, name, &gen, &probe_of) != -2;
}

/*
 * Matches --lump against every resistor instance. noisy=0 goes on a definition's line, so every
 * instance of a definition must match, or none.
 */
static enum sch_err match_lump(struct sch_result *res, const char *regex, struct sch_lump_plan *lp, struct sch_diag *d)
{
	struct sch_arena *a = &res->arena;
	const struct sch_deck *deck = &res->deck;
	struct sch_pattern *pat = NULL;
	unsigned char *seen = sch_arena_alloc(a, deck->n_elements + 1); /* bit 1: a match, bit 2: a miss */
	enum sch_err ret;

	memset(lp, 0, sizeof(*lp));
	lp->quiet = sch_arena_alloc(a, (deck->n_elements + 1) * sizeof(bool));
	if (!seen || !lp->quiet)
		return SCH_ERR_NOMEM;
	if ((ret = sch_pattern_compile(&pat, regex, SCH_PAT_CASELESS | SCH_PAT_WHOLE, "--lump", d)) != SCH_OK)
		return ret;
	for (size_t k = 0; k < res->set.n_instances; k++) {
		const struct sch_instance *in = &res->set.instances[k];
		if (deck->elements[in->element].letter != 'r')
			continue;
		if (sch_pattern_match(pat, in->path, strlen(in->path))) {
			seen[in->element] |= 1;
			lp->n_instances++;
		} else {
			seen[in->element] |= 2;
		}
	}
	sch_pattern_free(pat);
	for (size_t e = 0; e < deck->n_elements; e++) {
		const struct sch_card *card = &deck->cards[deck->elements[e].card];
		if (seen[e] == 3)
			return sch_diag_error(d, SCH_ERR_USAGE, card->file, card->line,
					      "--lump '%s' matches some instances of resistor '%s' but not all: a lump "
					      "takes a subcircuit's resistor in every instance or in none",
					      regex, deck->elements[e].name);
		lp->quiet[e] = seen[e] == 1;
	}
	if (lp->n_instances == 0)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "--lump '%s' matches no resistor", regex);
	lp->label = sch_arena_printf(a, "%zu resistor%s /%s/", lp->n_instances, lp->n_instances == 1 ? "" : "s", regex);
	return lp->label ? SCH_OK : SCH_ERR_NOMEM;
}

enum sch_err sch_analysis_plan_lump(struct sch_analysis *an)
{
	if (!an->opt->lump_regex)
		return SCH_OK;
	if (an->opt->mode != SCH_RUN_REPORT || an->vary)
		return sch_diag_error(an->d, SCH_ERR_USAGE, NULL, 0, "--lump works with a single noise report only");
	return match_lump(an->res, an->opt->lump_regex, &an->lump, an->d);
}

/*
 * The lump's row: the circuit's own output density (the second run: every resistor noisy, our
 * generators quiet) less the sum of the simulator's rows of the per-device run, where the lumped
 * resistors were quiet. Both runs solve the same circuit, so the difference is the lumped
 * resistors' noise (thermal, and flicker if their models give one), restated with the exact SI
 * 2019 k. Neither side holds a generator's unit density, so no digits are lost next to it.
 */
static enum sch_err add_lump_row(struct sch_row_build *rb, const struct sch_lump_plan *lp,
				 const struct sch_sim_outcome *full, struct sch_diag *d)
{
	const struct sch_sim_vector *fa = sch_sim_find_vector(rb->o, "frequency");
	const struct sch_sim_vector *fb = sch_sim_find_vector(full, "frequency");
	const struct sch_sim_vector *ob = sch_sim_find_vector(full, "onoise_spectrum");
	struct sch_contribution *ct;
	size_t nf = rb->res->n_freq;

	if (!fa || !fb || !ob || fb->n != nf || ob->n != nf)
		return sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: the run for --lump returned no spectra");
	for (size_t i = 0; i < nf; i++) {
		if (fabs(fa->values[i] - fb->values[i]) > 1e-12 * fabs(fa->values[i]))
			return sch_diag_error(d, SCH_ERR_SIM, NULL, 0,
					      "simulator: the two runs for --lump have different frequency points");
	}
	if (!(ct = sch_analysis_row_add(&rb->res->arena, &rb->list, nf)))
		return SCH_ERR_NOMEM;
	ct->device = lp->label;
	ct->generator = "thermal";
	ct->mechanism = SCH_MECH_THERMAL;
	ct->origin = SCH_ORIGIN_SIMULATOR;
	ct->device_count = lp->n_instances;
	for (size_t i = 0; i < nf; i++) {
		double diff = ob->values[i] - rb->own[i];
		ct->psd[i] = (diff > 0 ? diff : 0) * (SCH_K / SCH_SIM_K);
	}
	return SCH_OK;
}

/* The lump row and its note; no-op without --lump. */
static enum sch_err take_lump(struct sch_analysis *an, struct sch_row_build *rb)
{
	enum sch_err ret;

	if (!an->lump.quiet)
		return SCH_OK;
	if ((ret = add_lump_row(rb, &an->lump, an->full, an->d)) != SCH_OK)
		return ret;
	return sch_analysis_note(an, sch_arena_printf(&an->res->arena,
						      "--lump: %s reported as one row, the circuit's own noise "
						      "(a second run) less the simulator's rows of this run, "
						      "where they were quiet (noisy=0)",
						      an->lump.label));
}

/* The frequencies, the squared gain and room for the total density, from the outcome's spectra. */
static enum sch_err take_spectra(struct sch_result *res, const struct sch_sim_outcome *o, struct sch_diag *d)
{
	struct sch_arena *a = &res->arena;
	const struct sch_sim_vector *fv = sch_sim_find_vector(o, "frequency");
	const struct sch_sim_vector *on = sch_sim_find_vector(o, "onoise_spectrum");
	const struct sch_sim_vector *inn = sch_sim_find_vector(o, "inoise_spectrum");
	size_t nf;

	/* a spot run (start == stop) has one point; a sweep needs two */
	if (!fv || !on || !inn || fv->n < (res->run_lo_hz == res->run_hi_hz ? 1u : 2u) || on->n != fv->n ||
	    inn->n != fv->n)
		return sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: the noise run returned no spectra");
	nf = fv->n;
	res->spot_run = nf == 1;
	res->n_freq = nf;
	res->freq_hz = sch_arena_alloc(a, nf * sizeof(double));
	res->gain2 = sch_arena_alloc(a, nf * sizeof(double));
	res->total_psd = sch_arena_alloc(a, nf * sizeof(double));
	if (!res->freq_hz || !res->gain2 || !res->total_psd)
		return SCH_ERR_NOMEM;
	memcpy(res->freq_hz, fv->values, nf * sizeof(double));
	for (size_t i = 0; i < nf; i++)
		res->gain2[i] = inn->values[i] > 0 ? on->values[i] / inn->values[i] : NAN;
	return SCH_OK;
}

/* What the rows of outcome o need, once take_spectra has set the frequencies. */
static enum sch_err row_build_init(struct sch_row_build *rb, struct sch_analysis *an, const struct sch_sim_outcome *o)
{
	struct sch_result *res = an->res;
	struct sch_arena *a = &res->arena;

	memset(rb, 0, sizeof(*rb));
	rb->res = res;
	rb->q = &an->q;
	rb->o = o;
	rb->m = &an->m;
	rb->nf = res->n_freq;
	rb->unit = 4.0 * SCH_SIM_K * res->temp_k / SCH_PROBE_OHMS;
	rb->gmin = sch_analysis_deck_gmin(&res->deck);
	rb->carrier_of_inst = sch_arena_alloc(a, (res->set.n_instances + 1) * sizeof(double));
	if (!rb->carrier_of_inst)
		return SCH_ERR_NOMEM;
	for (size_t k = 0; k < res->set.n_instances; k++)
		rb->carrier_of_inst[k] = -1;
	for (size_t k = 0; k < res->set.n_carriers; k++)
		rb->carrier_of_inst[res->set.carriers[k].instance] = (double)k;
	/* with --lump: the simulator's own rows as it computed them, summed over devices */
	if (an->lump.quiet && !(rb->own = sch_arena_alloc(a, (rb->nf + 1) * sizeof(double))))
		return SCH_ERR_NOMEM;
	return SCH_OK;
}

/* A probe's vector: the added shot-noise row of the carrier it was made for (none for a junction probe). */
static enum sch_err add_carrier_row(struct sch_row_build *rb, int inst, const struct sch_sim_vector *vec)
{
	const struct sch_carrier *c;
	struct sch_contribution *ct;
	double s;

	if (rb->carrier_of_inst[inst] < 0)
		return SCH_OK;
	c = &rb->res->set.carriers[(size_t)rb->carrier_of_inst[inst]];
	s = sch_shot_density(c->dc_current_a, sch_carrier_gain(c));
	if (!(ct = sch_analysis_row_add(&rb->res->arena, &rb->list, rb->nf)))
		return SCH_ERR_NOMEM;
	ct->device = c->name;
	ct->generator = "shot";
	ct->mechanism = SCH_MECH_SHOT;
	ct->origin = SCH_ORIGIN_ADDED;
	ct->dc_current_a = c->dc_current_a;
	for (size_t i = 0; i < rb->nf; i++)
		ct->psd[i] = vec->values[i] / rb->unit * s;
	return SCH_OK;
}

/* Notes which rows of instance k the corrections will need: a bipolar's ic and ib, a diode's id. */
static void mark_device_row(struct sch_row_build *rb, int k, char letter, const char *gen, size_t v,
			    struct sch_contribution *ct)
{
	const struct sch_quantity_plan *q = rb->q;
	struct sch_vector_map *m = rb->m;
	int row = (int)(rb->list.n - 1);

	if (letter == 'q' && q->bjt_of_inst[k] >= 0 && (strcmp(gen, "ic") == 0 || strcmp(gen, "ib") == 0)) {
		ct->dc_current_a = rb->o->quantities[q->bjts + 4 * (size_t)q->bjt_of_inst[k] + (gen[1] == 'b')];
		if (gen[1] == 'b')
			m->ib_row[k] = row;
		else
			m->ic_row[k] = row;
	}
	if (letter == 'd' && strcmp(gen, "id") == 0) {
		m->id_vec[k] = (int)v;
		m->id_row[k] = row;
	}
}

/*
 * One of the simulator's own generators (instance k, generator gen; k -1: a vector we cannot name
 * a device for), its density restated with the exact SI 2019 constants.
 */
static enum sch_err add_simulator_row(struct sch_row_build *rb, int k, const char *gen, size_t v)
{
	struct sch_arena *a = &rb->res->arena;
	const struct sch_sim_vector *vec = &rb->o->vectors[v];
	struct sch_contribution *ct = sch_analysis_row_add(a, &rb->list, rb->nf);
	double scale;

	if (!ct)
		return SCH_ERR_NOMEM;
	if (k >= 0) {
		const struct sch_instance *in = &rb->res->set.instances[k];
		char letter = rb->res->deck.elements[in->element].letter;
		ct->device = in->path;
		ct->generator = sch_arena_strdup(a, gen);
		ct->mechanism = mechanism_of(letter, gen);
		mark_device_row(rb, k, letter, gen, v, ct);
	} else {
		ct->device = sch_arena_strdup(a, vec->name + 7);
		ct->generator = "";
		ct->mechanism = SCH_MECH_OTHER;
	}
	ct->origin = SCH_ORIGIN_SIMULATOR;
	if (!ct->device || !ct->generator)
		return SCH_ERR_NOMEM;
	for (size_t i = 0; rb->own && i < rb->nf; i++)
		rb->own[i] += vec->values[i];
	/* restate the simulator's CODATA 2014 constants as the exact SI 2019 ones */
	scale = ct->mechanism == SCH_MECH_THERMAL ? SCH_K / SCH_SIM_K
		: ct->mechanism == SCH_MECH_SHOT  ? SCH_Q / SCH_SIM_Q
						   : 1.0;
	for (size_t i = 0; i < rb->nf; i++)
		ct->psd[i] = vec->values[i] * scale;
	return SCH_OK;
}

/* Every per-generator density vector of the outcome into a row, in the outcome's order. */
static enum sch_err take_vectors(struct sch_row_build *rb)
{
	const struct sch_sim_outcome *o = rb->o;
	enum sch_err ret;

	for (size_t v = 0; v < o->n_vectors; v++) {
		const struct sch_sim_vector *vec = &o->vectors[v];
		const char *gen = NULL;
		int probe_of = -1;
		int k;

		if (vec->n != rb->nf || strncmp(vec->name, "onoise", 6) != 0 || strcmp(vec->name, "onoise_spectrum") == 0)
			continue;
		k = classify_vector(rb->m, vec->name, &gen, &probe_of);
		if (k == -3) {
			rb->m->probe_vec[probe_of] = (int)v;
			ret = add_carrier_row(rb, probe_of, vec);
		} else if (k == -2 || all_zero(vec->values, rb->nf)) {
			continue;
		} else {
			ret = add_simulator_row(rb, k, gen, v);
		}
		if (ret != SCH_OK)
			return ret;
	}
	return SCH_OK;
}

/* A diode that shares a carrier's probe (a paired junction) reads that probe's vector. */
static void share_paired_probes(struct sch_row_build *rb)
{
	struct sch_vector_map *m = rb->m;

	for (size_t k = 0; k < rb->res->set.n_instances; k++) {
		if (m->probe_owner[k] >= 0)
			m->probe_vec[k] = m->probe_vec[m->probe_owner[k]];
	}
}

/* The simulator's diode rows get their DC current, whether or not the junction correction follows. */
static void set_diode_currents(struct sch_row_build *rb)
{
	const struct sch_quantity_plan *q = rb->q;

	for (size_t j = 0; j < q->n_diodes; j++) {
		int k = q->diode_inst[j];
		if (rb->m->id_row[k] >= 0)
			rb->list.v[rb->m->id_row[k]].dc_current_a = rb->o->quantities[q->diodes + 3 * j];
	}
}

enum sch_err sch_analysis_take_noise(struct sch_analysis *an, const struct sch_sim_outcome *o)
{
	struct sch_row_build rb;
	enum sch_err ret;

	reset_rows(&an->m, an->res->set.n_instances);
	if ((ret = take_spectra(an->res, o, an->d)) != SCH_OK || (ret = row_build_init(&rb, an, o)) != SCH_OK ||
	    (ret = take_vectors(&rb)) != SCH_OK)
		return ret;
	share_paired_probes(&rb);
	set_diode_currents(&rb);
	if ((ret = sch_analysis_correct(an, &rb)) != SCH_OK || (ret = take_lump(an, &rb)) != SCH_OK)
		return ret;
	an->res->contributions = rb.list.v;
	an->res->n_contributions = rb.list.n;
	return SCH_OK;
}

enum sch_err sch_analysis_fano_notes(struct sch_analysis *an)
{
	const struct sch_result *res = an->res;
	const struct sch_carrier_set *set = &res->set;

	for (size_t k = 0; k < set->n_carriers; k++) {
		const struct sch_carrier *c = &set->carriers[k];
		double rate_hz = fabs(c->dc_current_a) / SCH_Q;
		char rate[64], band[64];
		if (!(c->why & SCH_WHY_FANO) || !(rate_hz > 0) || !isfinite(rate_hz))
			continue;
		sch_si_format(rate, sizeof(rate), rate_hz, 3, "Hz");
		/*
		 * A Fano factor describes the count statistics of windows that each hold many electrons;
		 * at frequencies near the electron rate the spectrum of any arrival process returns to
		 * full shot noise (de Jong & Beenakker 1997; "a decade below" is common practice, no source).
		 */
		if (sch_analysis_note(an, sch_arena_printf(&an->res->arena,
							   "%s: 2q|I|F with F = %g holds for frequencies well below "
							   "its electron rate |I|/q = %s",
							   c->name, c->excess_f, rate)) != SCH_OK)
			return SCH_ERR_NOMEM;
		if (!an->vary && res->band_hi_hz > 0.1 * rate_hz) {
			sch_si_format(band, sizeof(band), res->band_hi_hz, 3, "Hz");
			sch_diag_report(an->d, SCH_WARNING, NULL, 0,
					"the band reaches %s, within a decade of %s's electron rate |I|/q = %s: its "
					"Fano-suppressed density 2q|I|F does not hold there",
					band, c->name, rate);
		}
	}
	return SCH_OK;
}

enum sch_err sch_analysis_time_source_notes(struct sch_analysis *an)
{
	const struct sch_carrier_set *set = &an->res->set;

	for (size_t k = 0; k < set->n_carriers; k++) {
		struct sch_carrier *c = &an->res->set.carriers[k];
		char cur[64];
		if (!c->time_function)
			continue;
		sch_si_format(cur, sizeof(cur), c->dc_current_a, 3, "A");
		/* the carrier list says it too (not in a sweep, whose points' strings do not outlive them) */
		if (!an->vary && !(c->reason = sch_arena_printf(&an->res->arena, "%s; %s source, sized at its DC operating "
										  "point", c->reason, c->time_function)))
			return SCH_ERR_NOMEM;
		if (sch_analysis_note(an, sch_arena_printf(&an->res->arena,
							   "%s is a %s source: its shot noise is sized from its DC "
							   "operating-point current %s (the function's value at t = 0)",
							   c->name, c->time_function, cur)) != SCH_OK)
			return SCH_ERR_NOMEM;
		if (!an->vary && c->dc_current_a == 0)
			sch_diag_report(an->d, SCH_WARNING, NULL, 0,
					"carrier %s is a %s source with no current at the operating point: it adds no "
					"shot noise (give it a DC value, or a level with 'dc')",
					c->name, c->time_function);
	}
	return SCH_OK;
}
