/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * analysis.c - the one analysis entry point: reads the deck, finds carriers, augments, runs the
 * simulator, maps its generators back to netlist names and integrates the spectra into a result.
 */
#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/analysis.h"
#include "schrot/augment.h"
#include "schrot/pattern.h"
#include "schrot/physics.h"
#include "schrot/si.h"
#include "schrot/sim.h"
#include "schrot/spectra.h"
#include "schrot/strmap.h"

const char *sch_mechanism_name(enum sch_mechanism m)
{
	switch (m) {
	case SCH_MECH_SHOT:
		return "shot";
	case SCH_MECH_THERMAL:
		return "thermal";
	case SCH_MECH_FLICKER:
		return "flicker";
	default:
		return "other";
	}
}

const char *sch_origin_name(enum sch_origin o)
{
	switch (o) {
	case SCH_ORIGIN_ADDED:
		return "added";
	case SCH_ORIGIN_CORRECTION:
		return "correction";
	default:
		return "simulator";
	}
}

void sch_run_options_init(struct sch_run_options *opt)
{
	memset(opt, 0, sizeof(*opt));
	opt->mode = SCH_RUN_REPORT;
	opt->band_lo_hz = NAN;
	opt->band_hi_hz = NAN;
	opt->junction_correction = true;
	opt->responsivity_a_per_w = NAN;
	opt->signal = NAN;
	opt->n_workers = 1;
}

void sch_result_init(struct sch_result *res)
{
	memset(res, 0, sizeof(*res));
	sch_arena_init(&res->arena);
	sch_deck_init(&res->deck);
	res->temp_k = NAN;
	res->band_lo_hz = NAN;
	res->band_hi_hz = NAN;
	res->responsivity_a_per_w = NAN;
	res->signal = NAN;
	res->snr = NAN;
	res->shot_to_rest = NAN;
	res->nep_band_w_per_rthz = NAN;
	res->dominant_other_share = NAN;
	res->output_rms_v = NAN;
	res->input_rms = NAN;
}

void sch_result_release(struct sch_result *res)
{
	if (!res)
		return;
	sch_deck_release(&res->deck);
	sch_arena_release(&res->arena);
}

/* Growable list of const char * in the result arena. */
struct strlist {
	const char **v;
	size_t n, cap;
};

static enum sch_err strlist_push(struct sch_arena *a, struct strlist *l, const char *s)
{
	if (!s)
		return SCH_ERR_NOMEM;
	if (l->n == l->cap) {
		size_t cap = l->cap ? l->cap * 2 : 64;
		const char **v = sch_arena_alloc(a, cap * sizeof(*v));
		if (!v)
			return SCH_ERR_NOMEM;
		if (l->n)
			memcpy(v, l->v, l->n * sizeof(*v));
		l->v = v;
		l->cap = cap;
	}
	l->v[l->n++] = s;
	return SCH_OK;
}

/* From this many resistor instances on, a report without --lump says that --lump exists. */
#define SCH_LUMP_HINT_RESISTORS 2000

/* The noise analysis to run, resolved from the deck's .noise line and the options. */
struct noise_plan {
	const char *output;
	const char *input;
	char letter;        /* 'i' or 'v' */
	double f_start, f_stop;
	char command[1040];
	char bare_command[1024]; /* the same run without per-device vectors */
	bool needs_ac;      /* the input source has no AC value of its own */
};

static bool node_is_safe(const char *s, size_t n)
{
	if (n == 0 || n > 200)
		return false;
	for (size_t i = 0; i < n; i++) {
		unsigned char c = (unsigned char)s[i];
		if (!(isalnum(c) || c == '_' || c == '.' || c == '#' || c == '+' || c == '-' || c == '[' || c == ']'))
			return false;
	}
	return true;
}

/* Normalises "v(out)" / "V( out , ref )" into out (lower case); false when it is not such a form. */
static bool normalise_output(const char *expr, char *out, size_t size)
{
	char tmp[512];
	size_t n = 0;
	char *comma, *a, *b = NULL;

	for (const char *p = expr; *p && n + 1 < sizeof(tmp); p++) {
		if (!isspace((unsigned char)*p))
			tmp[n++] = (char)tolower((unsigned char)*p);
	}
	tmp[n] = '\0';
	if (n < 4 || strncmp(tmp, "v(", 2) != 0 || tmp[n - 1] != ')')
		return false;
	tmp[n - 1] = '\0';
	a = tmp + 2;
	comma = strchr(a, ',');
	if (comma) {
		*comma = '\0';
		b = comma + 1;
	}
	if (!node_is_safe(a, strlen(a)) || (b && !node_is_safe(b, strlen(b))))
		return false;
	if (b)
		snprintf(out, size, "v(%s,%s)", a, b);
	else
		snprintf(out, size, "v(%s)", a);
	return true;
}

static enum sch_err parse_freq_token(const struct sch_deck *deck, const char *tok, double *v, struct sch_diag *d)
{
	const struct sch_card *c = &deck->cards[deck->noise.card];
	if (!tok || sch_si_parse(tok, v) != SCH_OK || !(*v > 0))
		return sch_diag_error(d, SCH_ERR_INPUT, c->file, c->line, "'.noise' needs a positive number, not '%s'",
				      tok ? tok : "");
	return SCH_OK;
}

static const struct sch_element *top_element(const struct sch_deck *deck, const char *name)
{
	for (size_t k = 0; k < deck->n_elements; k++) {
		if (deck->elements[k].subckt < 0 && strcmp(deck->elements[k].name, name) == 0)
			return &deck->elements[k];
	}
	return NULL;
}

static bool element_has_ac(const struct sch_element *e)
{
	for (int k = 0; k < e->n_tok; k++) {
		if (strcmp(e->tok[k], "ac") == 0 || strncmp(e->tok[k], "ac=", 3) == 0)
			return true;
	}
	return false;
}

static enum sch_err plan_noise(const struct sch_deck *deck, const struct sch_run_options *opt, struct sch_arena *a,
			       struct noise_plan *plan, struct sch_diag *d)
{
	const struct sch_noise_spec *ns = &deck->noise;
	const char *where_file = ns->present ? deck->cards[ns->card].file : deck->path;
	long where_line = ns->present ? deck->cards[ns->card].line : 0;
	const char *output = opt->output_expr ? opt->output_expr : (ns->present ? ns->output : NULL);
	const char *input = opt->input_src ? opt->input_src : (ns->present ? ns->input : NULL);
	char out_norm[512], in_lower[256];
	const struct sch_element *src;
	const char *sweep = "dec";
	long n_points = 20;
	enum sch_err ret;

	if (!output || !input || (!ns->present && !opt->have_freq))
		return sch_diag_error(d, SCH_ERR_USAGE, deck->path, 0,
				      "no '.noise' line: give --output, --input and --freq");
	if (!normalise_output(output, out_norm, sizeof(out_norm)))
		return sch_diag_error(d, SCH_ERR_INPUT, opt->output_expr ? NULL : where_file, where_line,
				      "noise output must be v(node) or v(node,ref), not '%s'", output);
	snprintf(in_lower, sizeof(in_lower), "%s", input);
	for (char *p = in_lower; *p; p++)
		*p = (char)tolower((unsigned char)*p);
	src = top_element(deck, in_lower);
	if (!src || (src->letter != 'v' && src->letter != 'i') || !node_is_safe(in_lower, strlen(in_lower)))
		return sch_diag_error(d, SCH_ERR_INPUT, opt->input_src ? NULL : where_file, where_line,
				      "noise input '%s' is not a voltage or current source at the netlist's top level", input);
	if (opt->have_freq) {
		plan->f_start = opt->freq.f_start;
		plan->f_stop = opt->freq.f_stop;
		n_points = opt->freq.points_per_decade;
	} else {
		double np;
		if ((ret = parse_freq_token(deck, ns->f_start, &plan->f_start, d)) != SCH_OK ||
		    (ret = parse_freq_token(deck, ns->f_stop, &plan->f_stop, d)) != SCH_OK ||
		    (ret = parse_freq_token(deck, ns->n_points, &np, d)) != SCH_OK)
			return ret;
		n_points = (long)np;
		sweep = ns->sweep;
		if (!sweep || (strcmp(sweep, "dec") && strcmp(sweep, "oct") && strcmp(sweep, "lin")))
			return sch_diag_error(d, SCH_ERR_INPUT, where_file, where_line,
					      "'.noise' sweep must be dec, oct or lin, not '%s'", sweep ? sweep : "");
	}
	if (!(plan->f_stop > plan->f_start) || n_points < 1)
		return sch_diag_error(d, SCH_ERR_INPUT, opt->have_freq ? NULL : where_file, where_line,
				      "noise sweep needs a stop frequency above its start and at least one point");
	plan->output = sch_arena_strdup(a, out_norm);
	plan->input = sch_arena_strdup(a, in_lower);
	plan->letter = src->letter;
	plan->needs_ac = !element_has_ac(src);
	snprintf(plan->bare_command, sizeof(plan->bare_command), "noise %s %s %s %ld %.17g %.17g", out_norm, in_lower,
		 sweep, n_points, plan->f_start, plan->f_stop);
	snprintf(plan->command, sizeof(plan->command), "%s 1", plan->bare_command);
	return plan->output && plan->input ? SCH_OK : SCH_ERR_NOMEM;
}

enum sch_err sch_analysis_noise_command(const struct sch_deck *deck, const struct sch_run_options *opt,
					struct sch_arena *arena, const char **command, const char **ac_source,
					struct sch_diag *d)
{
	struct noise_plan plan;
	const char *text;
	enum sch_err ret;

	memset(&plan, 0, sizeof(plan));
	if ((ret = plan_noise(deck, opt, arena, &plan, d)) != SCH_OK)
		return ret;
	if (!(text = sch_arena_strdup(arena, plan.command)))
		return SCH_ERR_NOMEM;
	*command = text;
	*ac_source = plan.needs_ac ? plan.input : NULL;
	return SCH_OK;
}

/* GMIN from ".options gmin=X" (the simulator's default 1e-12 otherwise). */
static double deck_gmin(const struct sch_deck *deck)
{
	double gmin = 1e-12;
	for (size_t c = 0; c < deck->n_cards; c++) {
		const char *kw = deck->cards[c].keyword;
		const char *t = deck->cards[c].text;
		if (!kw || strncmp(kw, ".opt", 4) != 0)
			continue;
		for (const char *p = t; *p; p++) {
			if (strncasecmp(p, "gmin", 4) == 0 && (p == t || isspace((unsigned char)p[-1]))) {
				const char *q = p + 4;
				char num[64];
				size_t n = 0;
				double v;
				while (isspace((unsigned char)*q))
					q++;
				if (*q != '=')
					continue;
				q++;
				while (isspace((unsigned char)*q))
					q++;
				while (q[n] && !isspace((unsigned char)q[n]) && n + 1 < sizeof(num)) {
					num[n] = q[n];
					n++;
				}
				num[n] = '\0';
				if (sch_si_parse(num, &v) == SCH_OK)
					gmin = v;
			}
		}
	}
	return gmin;
}

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

/* Everything the mapping of simulator vectors needs. */
struct mapping {
	struct sch_strmap devices;  /* simulator name -> instance index */
	struct sch_strmap probes;   /* probe resistor simulator name -> instance index of the probed device */
	int *probe_vec;             /* instance -> vector index of its probe, -1 */
	int *id_vec;                /* instance -> vector index of the simulator's "id" generator, -1 */
	int *id_row;                /* instance -> contribution index of that generator, -1 */
	int *ic_row, *ib_row;       /* instance -> contribution index of a bipolar's "ic" / "ib" row, -1 */
	int *probe_owner;           /* instance -> the instance whose probe it shares (a paired diode), -1 */
};

struct contrib_list {
	struct sch_contribution *v;
	size_t n, cap;
};

static struct sch_contribution *contrib_add(struct sch_arena *a, struct contrib_list *l, size_t n_freq)
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

static int by_band_power(const void *pa, const void *pb)
{
	const struct sch_contribution *a = pa, *b = pb;
	if (a->band_power > b->band_power)
		return -1;
	if (a->band_power < b->band_power)
		return 1;
	return strcmp(a->device, b->device);
}

static bool all_zero(const double *v, size_t n)
{
	for (size_t i = 0; i < n; i++) {
		if (v[i] != 0.0)
			return false;
	}
	return true;
}

/* Quantity indices into the outcome's quantity array. */
struct quantity_plan {
	struct strlist names;
	size_t temp;
	size_t carriers;   /* first carrier current; one per carrier */
	size_t noiseless;  /* first noiseless-source current */
	size_t diodes;     /* first diode quantity; three (id, vd, gd) per diode instance */
	int *diode_inst;   /* the diode instances, n_diodes of them */
	size_t n_diodes;
	size_t bjts;       /* first bipolar quantity; four (ic, ib, vbe, vbc) per bipolar instance */
	int *bjt_of_inst;  /* instance -> its index among the bipolar instances, -1 */
};

static enum sch_err plan_quantities(struct sch_result *res, const struct sch_augmented *aug, struct quantity_plan *q)
{
	struct sch_arena *a = &res->arena;
	const struct sch_carrier_set *set = &res->set;
	enum sch_err ret;

	memset(q, 0, sizeof(*q));
	if ((ret = strlist_push(a, &q->names, aug->temp_quantity)) != SCH_OK)
		return ret;
	q->carriers = q->names.n;
	for (size_t k = 0; k < set->n_carriers; k++) {
		const struct sch_carrier *c = &set->carriers[k];
		ret = strlist_push(a, &q->names,
				   sch_carriers_current_quantity(a, res->deck.elements[c->element].letter, c->sim_name));
		if (ret != SCH_OK)
			return ret;
	}
	q->noiseless = q->names.n;
	for (size_t k = 0; k < set->n_noiseless; k++) {
		const struct sch_source *s = &set->noiseless[k];
		ret = strlist_push(a, &q->names,
				   sch_carriers_current_quantity(a, res->deck.elements[s->element].letter, s->sim_name));
		if (ret != SCH_OK)
			return ret;
	}
	q->diodes = q->names.n;
	q->diode_inst = sch_arena_alloc(a, (set->n_instances + 1) * sizeof(int));
	if (!q->diode_inst)
		return SCH_ERR_NOMEM;
	for (size_t k = 0; k < set->n_instances; k++) {
		const struct sch_instance *in = &set->instances[k];
		if (res->deck.elements[in->element].letter != 'd')
			continue;
		q->diode_inst[q->n_diodes++] = (int)k;
		if ((ret = strlist_push(a, &q->names, sch_arena_printf(a, "@%s[id]", in->sim_name))) != SCH_OK ||
		    (ret = strlist_push(a, &q->names, sch_arena_printf(a, "@%s[vd]", in->sim_name))) != SCH_OK ||
		    (ret = strlist_push(a, &q->names, sch_arena_printf(a, "@%s[gd]", in->sim_name))) != SCH_OK)
			return ret;
	}
	q->bjts = q->names.n;
	q->bjt_of_inst = sch_arena_alloc(a, (set->n_instances + 1) * sizeof(int));
	if (!q->bjt_of_inst)
		return SCH_ERR_NOMEM;
	for (size_t k = 0, nb = 0; k < set->n_instances; k++) {
		const struct sch_instance *in = &set->instances[k];
		q->bjt_of_inst[k] = -1;
		if (res->deck.elements[in->element].letter != 'q')
			continue;
		q->bjt_of_inst[k] = (int)nb++;
		if ((ret = strlist_push(a, &q->names, sch_arena_printf(a, "@%s[ic]", in->sim_name))) != SCH_OK ||
		    (ret = strlist_push(a, &q->names, sch_arena_printf(a, "@%s[ib]", in->sim_name))) != SCH_OK ||
		    (ret = strlist_push(a, &q->names, sch_arena_printf(a, "@%s[vbe]", in->sim_name))) != SCH_OK ||
		    (ret = strlist_push(a, &q->names, sch_arena_printf(a, "@%s[vbc]", in->sim_name))) != SCH_OK)
			return ret;
	}
	return SCH_OK;
}

/* Sets the currents and temperature read from the simulator into the result. */
static enum sch_err take_operating_point(struct sch_result *res, const struct quantity_plan *q,
					 const struct sch_sim_outcome *o, struct sch_diag *d)
{
	struct sch_carrier_set *set = &res->set;
	size_t keep = 0;
	double t_c = o->quantities[q->temp];

	if (!isfinite(t_c))
		return sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: could not read the circuit temperature");
	res->temp_k = t_c + SCH_ZERO_C_K;
	for (size_t k = 0; k < set->n_carriers; k++) {
		set->carriers[k].dc_current_a = o->quantities[q->carriers + k];
		if (!isfinite(set->carriers[k].dc_current_a))
			return sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: no operating-point current for '%s'",
					      set->carriers[k].name);
	}
	/* only sources that carry DC current are listed: a zero-current test source is no concern */
	for (size_t k = 0; k < set->n_noiseless; k++) {
		struct sch_source s = set->noiseless[k];
		s.dc_current_a = o->quantities[q->noiseless + k];
		if (isfinite(s.dc_current_a) && s.dc_current_a != 0)
			set->noiseless[keep++] = s;
	}
	set->n_noiseless = keep;
	return SCH_OK;
}

static enum sch_err build_mapping(struct sch_result *res, const struct sch_augmented *aug, struct mapping *m)
{
	struct sch_arena *a = &res->arena;
	const struct sch_carrier_set *set = &res->set;

	sch_strmap_init(&m->devices);
	sch_strmap_init(&m->probes);
	m->probe_vec = sch_arena_alloc(a, (set->n_instances + 1) * sizeof(int));
	m->id_vec = sch_arena_alloc(a, (set->n_instances + 1) * sizeof(int));
	m->id_row = sch_arena_alloc(a, (set->n_instances + 1) * sizeof(int));
	m->ic_row = sch_arena_alloc(a, (set->n_instances + 1) * sizeof(int));
	m->ib_row = sch_arena_alloc(a, (set->n_instances + 1) * sizeof(int));
	m->probe_owner = sch_arena_alloc(a, (set->n_instances + 1) * sizeof(int));
	if (!m->probe_vec || !m->id_vec || !m->id_row || !m->ic_row || !m->ib_row || !m->probe_owner)
		return SCH_ERR_NOMEM;
	for (size_t k = 0; k < set->n_instances; k++) {
		const struct sch_instance *in = &set->instances[k];
		int p = aug->probe_of_element[in->element];
		m->probe_vec[k] = -1;
		m->id_vec[k] = -1;
		m->id_row[k] = -1;
		m->ic_row[k] = -1;
		m->ib_row[k] = -1;
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
static int classify_vector(const struct mapping *m, const char *name, const char **gen, int *probe_of)
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
 * Whether take_noise can use a density vector; the simulator session drops the others as they
 * arrive. Device sums (classify_vector's -2) are left out: take_noise skips them anyway.
 */
static bool keep_noise_vector(void *ctx, const char *name)
{
	const char *gen = NULL;
	int probe_of = -1;

	if (strncmp(name, "onoise", 6) != 0 || strcmp(name, "onoise_spectrum") == 0)
		return true;
	return classify_vector(ctx, name, &gen, &probe_of) != -2;
}

static enum sch_err add_notes(struct sch_result *res, struct strlist *notes, const char *s)
{
	return strlist_push(&res->arena, notes, s);
}

/*
 * The simulator's bipolar "ib" and "ic" rows are 2q|I| of terminal currents that include GMIN's
 * conductances across both junctions (measured: I_B carries GMIN*(V_BE+V_BC), I_C carries
 * -GMIN*V_BC). A correction row per generator rescales each to the junction current alone; the
 * transfer comes from the row itself (density / 2q|I|). Returns the number of instances corrected,
 * -1 when out of memory.
 */
static int correct_bipolar(struct sch_result *res, const struct quantity_plan *q, const struct sch_sim_outcome *o,
			   const struct mapping *m, struct contrib_list *list, double gmin, size_t nf)
{
	int n = 0;

	for (size_t k = 0; k < res->set.n_instances; k++) {
		int b = q->bjt_of_inst[k];
		bool any = false;
		if (b < 0)
			continue;
		for (int which = 0; which < 2; which++) {
			int row = which ? m->ib_row[k] : m->ic_row[k];
			const double *qv = &o->quantities[q->bjts + 4 * (size_t)b];
			double ic = qv[0], ib = qv[1], vbe = qv[2], vbc = qv[3];
			double term = which ? ib : ic;
			double junction = which ? ib - gmin * (vbe + vbc) : ic + gmin * vbc;
			double ratio;
			struct sch_contribution *ct;
			if (row < 0 || !isfinite(term) || !isfinite(junction) || !isfinite(vbe) || !isfinite(vbc) || term == 0)
				continue;
			ratio = fabs(junction) / fabs(term) - 1.0;
			if (fabs(ratio) < 1e-9)
				continue;
			ct = contrib_add(&res->arena, list, nf);
			if (!ct)
				return -1;
			ct->device = list->v[row].device;
			ct->generator = which ? "base" : "collector";
			ct->mechanism = SCH_MECH_SHOT;
			ct->origin = SCH_ORIGIN_CORRECTION;
			ct->dc_current_a = junction;
			for (size_t i = 0; i < nf; i++)
				ct->psd[i] = list->v[row].psd[i] * ratio;
			any = true;
		}
		n += any;
	}
	return n;
}

/* --lump: which resistor definitions run quiet, and the row that stands for them. */
struct lump_plan {
	bool *quiet;          /* deck element index -> quiet; NULL when there is no lump */
	size_t n_instances;   /* resistor instances in the row */
	const char *label;    /* the row's device name */
};

/*
 * Matches --lump against every resistor instance. noisy=0 goes on a definition's line, so every
 * instance of a definition must match, or none.
 */
static enum sch_err plan_lump(struct sch_result *res, const char *regex, struct lump_plan *lp, struct sch_diag *d)
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

/*
 * The lump's row: the circuit's own output density (the second run: every resistor noisy, our
 * generators quiet) less the sum of the simulator's rows of the per-device run, where the lumped
 * resistors were quiet. Both runs solve the same circuit, so the difference is the lumped
 * resistors' noise (thermal, and flicker if their models give one), restated with the exact SI
 * 2019 k. Neither side holds a generator's unit density, so no digits are lost next to it.
 */
static enum sch_err add_lump_row(struct sch_result *res, const struct lump_plan *lp, const double *own,
				 const struct sch_sim_outcome *o, const struct sch_sim_outcome *full,
				 struct contrib_list *list, struct sch_diag *d)
{
	const struct sch_sim_vector *fa = sch_sim_find_vector(o, "frequency");
	const struct sch_sim_vector *fb = sch_sim_find_vector(full, "frequency");
	const struct sch_sim_vector *ob = sch_sim_find_vector(full, "onoise_spectrum");
	struct sch_contribution *ct;
	size_t nf = res->n_freq;

	if (!fa || !fb || !ob || fb->n != nf || ob->n != nf)
		return sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: the run for --lump returned no spectra");
	for (size_t i = 0; i < nf; i++) {
		if (fabs(fa->values[i] - fb->values[i]) > 1e-12 * fabs(fa->values[i]))
			return sch_diag_error(d, SCH_ERR_SIM, NULL, 0,
					      "simulator: the two runs for --lump have different frequency points");
	}
	if (!(ct = contrib_add(&res->arena, list, nf)))
		return SCH_ERR_NOMEM;
	ct->device = lp->label;
	ct->generator = "thermal";
	ct->mechanism = SCH_MECH_THERMAL;
	ct->origin = SCH_ORIGIN_SIMULATOR;
	ct->device_count = lp->n_instances;
	for (size_t i = 0; i < nf; i++) {
		double diff = ob->values[i] - own[i];
		ct->psd[i] = (diff > 0 ? diff : 0) * (SCH_K / SCH_SIM_K);
	}
	return SCH_OK;
}

/* Contributions of one noise outcome: scaled generators, the simulator's own, and corrections. */
static enum sch_err take_noise(struct sch_result *res, const struct sch_run_options *opt,
			       const struct quantity_plan *q, const struct sch_sim_outcome *o, const struct mapping *m,
			       const struct lump_plan *lp, const struct sch_sim_outcome *full, struct strlist *notes,
			       struct sch_diag *d)
{
	struct sch_arena *a = &res->arena;
	const struct sch_sim_vector *fv = sch_sim_find_vector(o, "frequency");
	const struct sch_sim_vector *on = sch_sim_find_vector(o, "onoise_spectrum");
	const struct sch_sim_vector *inn = sch_sim_find_vector(o, "inoise_spectrum");
	struct contrib_list list = { NULL, 0, 0 };
	/* a probe's own density as the simulator computes it: 4 k_sim T / R */
	const double unit = 4.0 * SCH_SIM_K * res->temp_k / SCH_PROBE_OHMS;
	const double gmin = deck_gmin(&res->deck);
	double *carrier_of_inst, *own = NULL;
	size_t nf;
	int n_corrected = 0;
	enum sch_err ret;

	if (!fv || !on || !inn || fv->n < 2 || on->n != fv->n || inn->n != fv->n)
		return sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: the noise run returned no spectra");
	nf = fv->n;
	res->n_freq = nf;
	res->freq_hz = sch_arena_alloc(a, nf * sizeof(double));
	res->gain2 = sch_arena_alloc(a, nf * sizeof(double));
	res->total_psd = sch_arena_alloc(a, nf * sizeof(double));
	carrier_of_inst = sch_arena_alloc(a, (res->set.n_instances + 1) * sizeof(double));
	if (!res->freq_hz || !res->gain2 || !res->total_psd || !carrier_of_inst)
		return SCH_ERR_NOMEM;
	memcpy(res->freq_hz, fv->values, nf * sizeof(double));
	for (size_t i = 0; i < nf; i++)
		res->gain2[i] = inn->values[i] > 0 ? on->values[i] / inn->values[i] : NAN;
	for (size_t k = 0; k < res->set.n_instances; k++)
		carrier_of_inst[k] = -1;
	for (size_t k = 0; k < res->set.n_carriers; k++)
		carrier_of_inst[res->set.carriers[k].instance] = (double)k;
	/* with --lump: the simulator's own rows as it computed them, summed over devices */
	if (lp && lp->quiet && !(own = sch_arena_alloc(a, (nf + 1) * sizeof(double))))
		return SCH_ERR_NOMEM;

	for (size_t v = 0; v < o->n_vectors; v++) {
		const struct sch_sim_vector *vec = &o->vectors[v];
		const char *gen = NULL;
		int probe_of = -1;
		int k;

		if (vec->n != nf || strncmp(vec->name, "onoise", 6) != 0 || strcmp(vec->name, "onoise_spectrum") == 0)
			continue;
		k = classify_vector(m, vec->name, &gen, &probe_of);
		if (k == -3) {
			m->probe_vec[probe_of] = (int)v;
			if (carrier_of_inst[probe_of] >= 0) {
				const struct sch_carrier *c = &res->set.carriers[(size_t)carrier_of_inst[probe_of]];
				double s = sch_shot_density(c->dc_current_a, sch_carrier_gain(c));
				struct sch_contribution *ct = contrib_add(a, &list, nf);
				if (!ct)
					return SCH_ERR_NOMEM;
				ct->device = c->name;
				ct->generator = "shot";
				ct->mechanism = SCH_MECH_SHOT;
				ct->origin = SCH_ORIGIN_ADDED;
				ct->dc_current_a = c->dc_current_a;
				for (size_t i = 0; i < nf; i++)
					ct->psd[i] = vec->values[i] / unit * s;
			}
			continue;
		}
		if (k == -2 || all_zero(vec->values, nf))
			continue;
		{
			struct sch_contribution *ct = contrib_add(a, &list, nf);
			if (!ct)
				return SCH_ERR_NOMEM;
			if (k >= 0) {
				const struct sch_instance *in = &res->set.instances[k];
				char letter = res->deck.elements[in->element].letter;
				ct->device = in->path;
				ct->generator = sch_arena_strdup(a, gen);
				ct->mechanism = mechanism_of(letter, gen);
				if (letter == 'q' && q->bjt_of_inst[k] >= 0 && (strcmp(gen, "ic") == 0 || strcmp(gen, "ib") == 0)) {
					ct->dc_current_a = o->quantities[q->bjts + 4 * (size_t)q->bjt_of_inst[k] + (gen[1] == 'b')];
					if (gen[1] == 'b')
						m->ib_row[k] = (int)(list.n - 1);
					else
						m->ic_row[k] = (int)(list.n - 1);
				}
				if (letter == 'd' && strcmp(gen, "id") == 0) {
					m->id_vec[k] = (int)v;
					m->id_row[k] = (int)(list.n - 1);
				}
			} else {
				ct->device = sch_arena_strdup(a, vec->name + 7);
				ct->generator = "";
				ct->mechanism = SCH_MECH_OTHER;
			}
			ct->origin = SCH_ORIGIN_SIMULATOR;
			if (!ct->device || !ct->generator)
				return SCH_ERR_NOMEM;
			for (size_t i = 0; own && i < nf; i++)
				own[i] += vec->values[i];
			{
				/* restate the simulator's CODATA 2014 constants as the exact SI 2019 ones */
				double scale = ct->mechanism == SCH_MECH_THERMAL ? SCH_K / SCH_SIM_K
					       : ct->mechanism == SCH_MECH_SHOT  ? SCH_Q / SCH_SIM_Q
										  : 1.0;
				for (size_t i = 0; i < nf; i++)
					ct->psd[i] = vec->values[i] * scale;
			}
		}
	}

	for (size_t k = 0; k < res->set.n_instances; k++) {
		if (m->probe_owner[k] >= 0)
			m->probe_vec[k] = m->probe_vec[m->probe_owner[k]];
	}
	/* the simulator's diode rows get their DC current; the junction correction follows */
	for (size_t j = 0; j < q->n_diodes; j++) {
		int k = q->diode_inst[j];
		const struct sch_instance *in = &res->set.instances[k];
		double id = o->quantities[q->diodes + 3 * j];
		double vd = o->quantities[q->diodes + 3 * j + 1];
		double gd = o->quantities[q->diodes + 3 * j + 2];
		double ij = id - gmin * vd, gj = gd - gmin, sj, sim_s;
		const double *h2_src = NULL;
		double h2_scale = 0;
		struct sch_contribution *ct;

		if (m->id_row[k] >= 0)
			list.v[m->id_row[k]].dc_current_a = id;
		if (!opt->junction_correction || !isfinite(id) || !isfinite(vd) || !isfinite(gd))
			continue;
		sim_s = 2.0 * SCH_SIM_Q * fabs(id); /* what the simulator's own id row was computed with */
		if (m->id_vec[k] >= 0 && sim_s > 0) {
			h2_src = o->vectors[m->id_vec[k]].values;
			h2_scale = 1.0 / sim_s;
		} else if (m->probe_vec[k] >= 0) {
			h2_src = o->vectors[m->probe_vec[k]].values;
			h2_scale = 1.0 / unit;
		}
		if (!h2_src)
			continue;
		sj = sch_junction_density(vd, ij, gj, res->temp_k);
		ct = contrib_add(a, &list, nf);
		if (!ct)
			return SCH_ERR_NOMEM;
		ct->device = in->path;
		ct->generator = "junction";
		ct->mechanism = SCH_MECH_SHOT;
		ct->origin = SCH_ORIGIN_CORRECTION;
		ct->dc_current_a = ij;
		for (size_t i = 0; i < nf; i++) {
			double h2 = h2_src[i] * h2_scale;
			double sim_psd = m->id_row[k] >= 0 ? list.v[m->id_row[k]].psd[i] : 0.0;
			ct->psd[i] = h2 * sj - sim_psd;
		}
		n_corrected++;
	}
	if (opt->junction_correction) {
		int n_bjt = correct_bipolar(res, q, o, m, &list, gmin, nf);
		if (n_bjt < 0)
			return SCH_ERR_NOMEM;
		if (n_bjt && (ret = add_notes(res, notes, sch_arena_printf(a, "bipolar shot noise corrected for %d instance%s: "
								  "2q|I| of the junction currents without GMIN's legs "
								  "(I_B - GMIN*(V_BE+V_BC), I_C + GMIN*V_BC)",
								  n_bjt, n_bjt == 1 ? "" : "s"))) != SCH_OK)
			return ret;
	}
	if (n_corrected) {
		ret = add_notes(res, notes,
				sch_arena_printf(a, "junction correction applied to %d diode instance%s: 2q*I_j*coth(qV_j/2kT) "
						    "in place of the simulator's 2q|I_D| (GMIN %g S kept out)",
						 n_corrected, n_corrected == 1 ? "" : "s", gmin));
		if (ret != SCH_OK)
			return ret;
	}
	if (lp && lp->quiet) {
		if ((ret = add_lump_row(res, lp, own, o, full, &list, d)) != SCH_OK)
			return ret;
		ret = add_notes(res, notes, sch_arena_printf(a, "--lump: %s reported as one row, the circuit's own noise "
								"(a second run) less the simulator's rows of this run, "
								"where they were quiet (noisy=0)",
							    lp->label));
		if (ret != SCH_OK)
			return ret;
	}
	res->contributions = list.v;
	res->n_contributions = list.n;
	return SCH_OK;
}

/*
 * The device that leads the noise besides the added carrier shot noise: rows netted per device
 * (a correction row counts against the row it corrects), the device's largest row named.
 */
static enum sch_err lead_other(struct sch_result *res, double total)
{
	struct sch_strmap devices;
	double *sum = sch_arena_alloc(&res->arena, (res->n_contributions + 1) * sizeof(double));
	int *first = sch_arena_alloc(&res->arena, (res->n_contributions + 1) * sizeof(int));
	int n_dev = 0, best = -1;
	enum sch_err ret = SCH_ERR_NOMEM;

	sch_strmap_init(&devices);
	res->dominant_other = NULL;
	res->dominant_other_share = NAN;
	if (!sum || !first)
		goto out;
	for (size_t c = 0; c < res->n_contributions; c++) {
		const struct sch_contribution *ct = &res->contributions[c];
		int k;
		if (ct->origin == SCH_ORIGIN_ADDED)
			continue;
		k = sch_strmap_get(&devices, ct->device, strlen(ct->device));
		if (k < 0) {
			k = n_dev++;
			if (sch_strmap_put(&devices, ct->device, strlen(ct->device), k) != SCH_OK)
				goto out;
			first[k] = (int)c; /* sorted by band power: the device's largest row */
			sum[k] = 0;
		}
		sum[k] += ct->band_power;
	}
	for (int k = 0; k < n_dev; k++) {
		if (sum[k] > 0 && (best < 0 || sum[k] > sum[best]))
			best = k;
	}
	if (best >= 0) {
		res->dominant_other = &res->contributions[first[best]];
		res->dominant_other_share = total != 0 ? sum[best] / total : NAN;
	}
	ret = SCH_OK;
out:
	sch_strmap_release(&devices);
	return ret;
}

/* Band powers, shares, spots, input referral and SNR. */
static enum sch_err integrate(struct sch_result *res, const struct sch_run_options *opt, struct sch_diag *d)
{
	struct sch_arena *a = &res->arena;
	size_t nf = res->n_freq;
	double lo = res->freq_hz[0], hi = res->freq_hz[nf - 1];
	double total = 0, *input_psd;
	size_t keep = 0;

	/* the simulator's own frequency points carry rounding (99999.99999999904): report the range asked for */
	if (fabs(lo - res->run_lo_hz) <= 1e-9 * res->run_lo_hz)
		lo = res->run_lo_hz;
	if (fabs(hi - res->run_hi_hz) <= 1e-9 * res->run_hi_hz)
		hi = res->run_hi_hz;
	res->band_lo_hz = isnan(opt->band_lo_hz) ? lo : opt->band_lo_hz;
	res->band_hi_hz = isnan(opt->band_hi_hz) ? hi : opt->band_hi_hz;
	if (res->band_lo_hz < lo * (1 - 1e-9) || res->band_hi_hz > hi * (1 + 1e-9))
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "band %g:%g Hz is outside the simulated range %g:%g Hz (widen .noise or --freq)",
				      res->band_lo_hz, res->band_hi_hz, lo, hi);
	for (size_t c = 0; c < res->n_contributions; c++) {
		struct sch_contribution *ct = &res->contributions[c];
		ct->band_power = sch_spectra_band_power(res->freq_hz, ct->psd, nf, res->band_lo_hz, res->band_hi_hz);
		total += ct->band_power;
	}
	/* a correction too small to matter next to its device's simulator row would only clutter */
	for (size_t c = 0; c < res->n_contributions; c++) {
		struct sch_contribution *ct = &res->contributions[c];
		if (ct->origin == SCH_ORIGIN_CORRECTION && fabs(ct->band_power) < 1e-9 * fabs(total)) {
			total -= ct->band_power;
			continue;
		}
		res->contributions[keep++] = *ct;
	}
	res->n_contributions = keep;
	res->total_power_v2 = total;
	res->output_rms_v = sqrt(fabs(total));
	memset(res->total_psd, 0, nf * sizeof(double));
	res->carrier_power_v2 = 0;
	for (size_t c = 0; c < res->n_contributions; c++) {
		struct sch_contribution *ct = &res->contributions[c];
		for (size_t i = 0; i < nf; i++)
			res->total_psd[i] += ct->psd[i];
		ct->share = total != 0 ? ct->band_power / total : 0;
		ct->output_rms_v = sqrt(fabs(ct->band_power));
		if (ct->origin == SCH_ORIGIN_ADDED)
			res->carrier_power_v2 += ct->band_power;
	}
	qsort(res->contributions, res->n_contributions, sizeof(*res->contributions), by_band_power);
	if (lead_other(res, total) != SCH_OK)
		return SCH_ERR_NOMEM;
	res->shot_to_rest = NAN;
	if (res->set.n_carriers && total - res->carrier_power_v2 > 0)
		res->shot_to_rest = res->carrier_power_v2 / (total - res->carrier_power_v2);

	input_psd = sch_arena_alloc(a, nf * sizeof(double));
	if (!input_psd)
		return SCH_ERR_NOMEM;
	for (size_t i = 0; i < nf; i++)
		input_psd[i] = res->gain2[i] > 0 ? res->total_psd[i] / res->gain2[i] : 0;
	res->input_rms = sqrt(fabs(sch_spectra_band_power(res->freq_hz, input_psd, nf, res->band_lo_hz, res->band_hi_hz)));
	res->responsivity_a_per_w = opt->responsivity_a_per_w;
	res->signal = opt->signal;
	res->nep_band_w_per_rthz = NAN;
	if (!isnan(opt->responsivity_a_per_w) && strcmp(res->input_unit, "A") == 0)
		res->nep_band_w_per_rthz = res->input_rms / sqrt(res->band_hi_hz - res->band_lo_hz) / opt->responsivity_a_per_w;
	if (!isnan(opt->signal) && res->input_rms > 0)
		res->snr = opt->signal * opt->signal / (res->input_rms * res->input_rms);

	res->n_spots = opt->n_spots;
	res->spots = sch_arena_alloc(a, (opt->n_spots + 1) * sizeof(*res->spots));
	if (!res->spots)
		return SCH_ERR_NOMEM;
	for (size_t s = 0; s < opt->n_spots; s++) {
		struct sch_spot *sp = &res->spots[s];
		double f = opt->spots_hz[s];
		if (!(f >= lo * (1 - 1e-9) && f <= hi * (1 + 1e-9)))
			return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "spot frequency %g Hz is outside the simulated range %g:%g Hz",
					      f, lo, hi);
		sp->freq_hz = f;
		sp->output_v_per_rthz = sqrt(fabs(sch_spectra_at(res->freq_hz, res->total_psd, nf, f)));
		sp->input_per_rthz = sqrt(fabs(sch_spectra_at(res->freq_hz, input_psd, nf, f)));
		sp->nep_w_per_rthz = NAN;
		if (!isnan(opt->responsivity_a_per_w) && strcmp(res->input_unit, "A") == 0)
			sp->nep_w_per_rthz = sp->input_per_rthz / opt->responsivity_a_per_w;
	}
	for (size_t c = 0; c < res->n_contributions; c++) {
		struct sch_contribution *ct = &res->contributions[c];
		ct->spot_density = sch_arena_alloc(a, (opt->n_spots + 1) * sizeof(double));
		if (!ct->spot_density)
			return SCH_ERR_NOMEM;
		for (size_t s = 0; s < opt->n_spots; s++)
			ct->spot_density[s] = sqrt(fabs(sch_spectra_at(res->freq_hz, ct->psd, nf, opt->spots_hz[s])));
	}
	return SCH_OK;
}

/* How a sweep changes one quantity per step; NULL name for a plain run. */
struct vary_plan {
	const char *name;
	const double *values;
	size_t n;
	struct sch_sweep *sweep;
};

/* True when a top-level .param card defines name (lower case). */
static bool deck_defines_param(const struct sch_deck *deck, const char *name)
{
	size_t n = strlen(name);
	for (size_t c = 0; c < deck->n_cards; c++) {
		const struct sch_card *card = &deck->cards[c];
		const char *p;
		if (!card->keyword || strcmp(card->keyword, ".param") != 0 || card->subckt >= 0)
			continue;
		for (p = card->text + 6; *p; p++) {
			if ((p == card->text + 6 || isspace((unsigned char)p[-1])) && strncasecmp(p, name, n) == 0) {
				const char *q = p + n;
				while (isspace((unsigned char)*q))
					q++;
				if (*q == '=')
					return true;
			}
		}
	}
	return false;
}

/* The commands of one sweep step that set name to value: one or two (a .param needs a reset). */
static enum sch_err vary_command(const struct sch_result *res, const char *name, double value, char *out, size_t size,
				 bool *needs_reset, struct sch_diag *d)
{
	*needs_reset = false;
	if (strcmp(name, "temp") == 0) {
		snprintf(out, size, "option temp=%.17g", value);
		return SCH_OK;
	}
	if (sch_sim_name_is_safe(name) && !strchr(name, '.') && deck_defines_param(&res->deck, name)) {
		snprintf(out, size, "alterparam %s=%.17g", name, value);
		*needs_reset = true;
		return SCH_OK;
	}
	for (size_t k = 0; k < res->set.n_instances; k++) {
		const struct sch_instance *in = &res->set.instances[k];
		char letter = res->deck.elements[in->element].letter;
		if (strcmp(in->path, name) != 0)
			continue;
		if (letter != 'i' || !sch_sim_name_is_safe(in->sim_name))
			break;
		snprintf(out, size, "alter @%s[dc]=%.17g", in->sim_name, value);
		return SCH_OK;
	}
	return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
			      "--vary '%s' is neither 'temp', a top-level .param nor a current source of the netlist "
			      "(hierarchical name)",
			      name);
}

double sch_sweep_crossover(const struct sch_sweep_point *p, size_t n)
{
	for (size_t i = 0; i + 1 < n; i++) {
		double r0 = p[i].carrier_power_v2 / p[i].other_power_v2;
		double r1 = p[i + 1].carrier_power_v2 / p[i + 1].other_power_v2;
		if (!(r0 > 0) || !(r1 > 0) || !isfinite(r0) || !isfinite(r1) || (r0 - 1) * (r1 - 1) > 0 || r0 == r1)
			continue;
		if (p[i].value > 0 && p[i + 1].value > 0) {
			double t = -log(r0) / (log(r1) - log(r0));
			return exp(log(p[i].value) + t * (log(p[i + 1].value) - log(p[i].value)));
		}
		return p[i].value + (1 - r0) / (r1 - r0) * (p[i + 1].value - p[i].value);
	}
	return NAN;
}

/* True when a carrier or listed source is a G, F or B element, whose current is read from the solution. */
static bool needs_dc_solution(const struct sch_result *res)
{
	for (size_t k = 0; k < res->set.n_carriers; k++) {
		char l = res->deck.elements[res->set.carriers[k].element].letter;
		if (l == 'g' || l == 'f' || l == 'b')
			return true;
	}
	for (size_t k = 0; k < res->set.n_noiseless; k++) {
		char l = res->deck.elements[res->set.noiseless[k].element].letter;
		if (l == 'g' || l == 'f' || l == 'b')
			return true;
	}
	return false;
}

/*
 * The netlist card behind a simulator failure, or -1. The simulator numbers the lines of the deck
 * it was given ("Error on line 4 ...", our title is line 1), which aug->line_card maps back, and
 * names expanded subcircuit elements ("Error on line: n.x1.n7 ..."), which the instances map back.
 */
static int card_of_failure(const struct sch_result *res, const struct sch_augmented *aug, const char *reason)
{
	static const char key[] = "rror on line";
	const char *at = strstr(reason, key);

	if (!at)
		return -1;
	at += strlen(key);
	if (at[0] == ' ' && at[1] >= '0' && at[1] <= '9') {
		long n = strtol(at + 1, NULL, 10);
		return n >= 1 && (size_t)n <= aug->n_lines ? aug->line_card[n - 1] : -1;
	}
	if (at[0] == ':' && at[1] == ' ') {
		size_t len = strcspn(at + 2, " :");
		for (size_t k = 0; k < res->set.n_instances; k++) {
			const char *sim = res->set.instances[k].sim_name;
			if (strlen(sim) == len && strncmp(sim, at + 2, len) == 0)
				return res->deck.elements[res->set.instances[k].element].card;
		}
	}
	return -1;
}

/*
 * Reports a simulator failure at the netlist line it concerns: "input.cir:4: error: simulator:
 * n1 a 0 foo: unknown device type - error". The simulator's own line reference goes; so does its
 * echo of the card when the card comes from an included file (text of included files is never
 * quoted, docs/security.md). Without a known card the reason is reported as it came.
 */
static void report_failure(const struct sch_result *res, const struct sch_augmented *aug, const char *reason,
			   struct sch_diag *d)
{
	int card = card_of_failure(res, aug, reason);
	const struct sch_card *c;
	const char *rest;

	if (card < 0 || (size_t)card >= res->deck.n_cards) {
		sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: %s", reason);
		return;
	}
	c = &res->deck.cards[card];
	rest = strstr(reason, "rror on line");
	rest = strstr(rest, ": ");
	rest = rest ? rest + 2 : reason;
	if (c->file != res->deck.path && strstr(rest, ": "))
		for (const char *p = strstr(rest, ": "); p; p = strstr(p + 2, ": "))
			rest = p + 2;
	sch_diag_error(d, SCH_ERR_SIM, c->file, c->line, "simulator: %s", rest);
}

/*
 * sch_sim_run with its failure line held back and reported again at the netlist's FILE:LINE; every
 * other message passes through unchanged and in order.
 */
static enum sch_err run_simulator(const struct sch_result *res, const struct sch_augmented *aug,
				  const struct sch_sim_request *req, struct sch_sim_result *sim, struct sch_diag *d)
{
	struct sch_diag held;
	char *text = NULL, *line, *next;
	size_t len = 0;
	FILE *mem = open_memstream(&text, &len);
	enum sch_err ret;
	bool relocate;

	if (!mem)
		return sch_sim_run(req, sim, d);
	sch_diag_init(&held, mem, d->verbosity);
	ret = sch_sim_run(req, sim, &held);
	fclose(mem);
	relocate = ret == SCH_ERR_SIM && sim->failure && held.n_errors == 1;
	for (line = text; line && *line; line = next) {
		next = strchr(line, '\n');
		next = next ? next + 1 : line + strlen(line);
		if (relocate && strncmp(line, "schrot: error: simulator: ", 26) == 0)
			continue;
		if (d->sink)
			fwrite(line, 1, (size_t)(next - line), d->sink);
	}
	free(text);
	d->n_warnings += held.n_warnings;
	if (relocate) {
		report_failure(res, aug, sim->failure, d);
	} else if (held.n_errors) {
		if (d->n_errors == 0)
			memcpy(d->first_error, held.first_error, sizeof(d->first_error));
		d->n_errors += held.n_errors;
	}
	return ret;
}

/* What turning one step's outcome into results needs. */
struct step_run {
	struct sch_result *res;
	const struct sch_run_options *opt;
	const struct vary_plan *vary;       /* NULL for a single report */
	const struct quantity_plan *q;
	struct mapping *m;
	struct strlist *notes;
	const struct lump_plan *lump;
	const struct sch_sim_outcome *full; /* --lump: the circuit's own noise run */
	struct sch_source *noiseless_all;   /* sweeps: the sources before any point compacted them */
	size_t n_noiseless_all;
	size_t n_steps, n_done;
	struct sch_diag *d;
};

/*
 * One step: its operating point, its rows, their band powers and, in a sweep, its point. A sweep
 * point's rows go to an arena of their own that is freed once the point's values are taken, so a
 * sweep's memory does not grow with its points; the result then holds no rows, only the values
 * every point shares (band, names).
 */
static enum sch_err take_step(struct step_run *sr, size_t k, const struct sch_sim_outcome *o)
{
	struct sch_result *res = sr->res;
	const struct sch_run_options *opt = sr->opt;
	struct sch_arena kept = res->arena;
	enum sch_err ret = SCH_ERR_NOMEM;

	if (sr->vary) {
		sch_arena_init(&res->arena);
		memset(sr->notes, 0, sizeof(*sr->notes));
		res->set.noiseless = sch_arena_alloc(&res->arena, (sr->n_noiseless_all + 1) * sizeof(*res->set.noiseless));
		if (!res->set.noiseless)
			goto done;
		memcpy(res->set.noiseless, sr->noiseless_all, sr->n_noiseless_all * sizeof(*res->set.noiseless));
		res->set.n_noiseless = sr->n_noiseless_all;
	}
	if ((ret = take_operating_point(res, sr->q, o, sr->d)) != SCH_OK)
		goto done;
	if (opt->mode == SCH_RUN_REPORT) {
		for (size_t i = 0; i < res->set.n_instances; i++) {
			sr->m->probe_vec[i] = -1;
			sr->m->id_vec[i] = -1;
			sr->m->id_row[i] = -1;
			sr->m->ic_row[i] = -1;
			sr->m->ib_row[i] = -1;
		}
		if ((ret = take_noise(res, opt, sr->q, o, sr->m, sr->lump, sr->full, sr->notes, sr->d)) != SCH_OK)
			goto done;
		if ((ret = integrate(res, opt, sr->d)) != SCH_OK)
			goto done;
	}
	if (sr->vary) {
		struct sch_sweep_point *p = &sr->vary->sweep->points[k];
		p->value = sr->vary->values[k];
		p->output_rms_v = res->output_rms_v;
		p->input_rms = res->input_rms;
		p->carrier_power_v2 = res->carrier_power_v2;
		p->other_power_v2 = res->total_power_v2 - res->carrier_power_v2;
		sr->n_done++;
		if (opt->progress)
			opt->progress(opt->progress_ctx, sr->n_done, sr->n_steps);
	}
done:
	if (sr->vary) {
		sch_arena_release(&res->arena);
		res->arena = kept;
		res->set.noiseless = sr->noiseless_all;
		res->set.n_noiseless = sr->n_noiseless_all;
		memset(sr->notes, 0, sizeof(*sr->notes));
		res->contributions = NULL;
		res->n_contributions = 0;
		res->dominant_other = NULL;
		res->freq_hz = res->gain2 = res->total_psd = NULL;
		res->n_freq = 0;
		res->spots = NULL;
		res->n_spots = 0;
	}
	return ret;
}

/* The simulator session hands over each sweep point as it finishes (sim.h, on_step). */
static enum sch_err sweep_point_done(void *ctx, size_t step, const struct sch_sim_outcome *o)
{
	return take_step(ctx, step, o);
}

static enum sch_err analysis_core(const char *path, const struct sch_run_options *opt, const struct vary_plan *vary,
				  struct sch_result *res, struct sch_diag *d)
{
	struct sch_arena *a = &res->arena;
	struct noise_plan plan;
	struct sch_augment_options aopt = { NULL, false, false, false, NULL, false, NULL };
	struct sch_augmented aug;
	struct quantity_plan q;
	struct mapping m;
	struct strlist notes = { NULL, 0, 0 };
	struct sch_sim_request req;
	struct sch_sim_step one_step, *steps = &one_step;
	struct sch_sim_result sim;
	const char *commands[2];
	size_t n_commands = 1;
	size_t n_steps = 1;
	struct step_run sr;
	struct lump_plan lump;
	struct sch_augmented aug_full;
	const char *bare_commands[1];
	enum sch_err ret;

	memset(&lump, 0, sizeof(lump));
	memset(&sr, 0, sizeof(sr));
	memset(&one_step, 0, sizeof(one_step));
	memset(&sim, 0, sizeof(sim));
	memset(&m, 0, sizeof(m));
	memset(&plan, 0, sizeof(plan));
	res->netlist = sch_arena_strdup(a, path);
	if ((ret = sch_deck_load(&res->deck, path, d)) != SCH_OK)
		goto out;
	if ((ret = sch_carriers_find(&res->deck, &opt->carriers, a, &res->set, d)) != SCH_OK)
		goto out;
	if (opt->mode == SCH_RUN_REPORT) {
		if ((ret = plan_noise(&res->deck, opt, a, &plan, d)) != SCH_OK)
			goto out;
		res->output = plan.output;
		res->input = plan.input;
		res->input_unit = plan.letter == 'i' ? "A" : "V";
		res->run_lo_hz = plan.f_start;
		res->run_hi_hz = plan.f_stop;
		if (plan.needs_ac) {
			aopt.ac_source = plan.input;
			if ((ret = add_notes(res, &notes, sch_arena_printf(a, "input source '%s' has no AC value: AC 1 supplied "
									   "for the run (the netlist file is unchanged)",
									   plan.input))) != SCH_OK)
				goto out;
		}
		aopt.junction_probes = opt->junction_correction;
		aopt.share_paired_junctions = true;
	}
	if (opt->lump_regex) {
		if (opt->mode != SCH_RUN_REPORT || vary) {
			ret = sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "--lump works with a single noise report only");
			goto out;
		}
		if ((ret = plan_lump(res, opt->lump_regex, &lump, d)) != SCH_OK)
			goto out;
		/*
		 * The circuit's own noise, every resistor noisy and our generators quiet: their unit
		 * density is far above any real one, and a difference next to it would lose digits.
		 */
		aopt.quiet_probes = true;
		aopt.analysis_card = sch_arena_printf(a, ".%s", plan.bare_command);
		if (!aopt.analysis_card) {
			ret = SCH_ERR_NOMEM;
			goto out;
		}
		if ((ret = sch_augment_build(&res->deck, &res->set, &aopt, a, &aug_full, d)) != SCH_OK)
			goto out;
		aopt.quiet_probes = false;
		aopt.quiet_elements = lump.quiet;
	}
	/* the noise run is the deck's own card, so the simulator can write its data to a file (sim.h) */
	if (opt->mode == SCH_RUN_REPORT && !(aopt.analysis_card = sch_arena_printf(a, ".%s", plan.command))) {
		ret = SCH_ERR_NOMEM;
		goto out;
	}
	if ((ret = sch_augment_build(&res->deck, &res->set, &aopt, a, &aug, d)) != SCH_OK)
		goto out;
	if ((ret = plan_quantities(res, &aug, &q)) != SCH_OK)
		goto out;
	commands[0] = opt->mode == SCH_RUN_REPORT ? "run" : "op";
	/*
	 * G, F and B elements compute their current from the last solution, which after a noise run is
	 * the small-signal one: an operating point after the noise run puts the DC solution back.
	 */
	if (opt->mode == SCH_RUN_REPORT && needs_dc_solution(res))
		commands[n_commands++] = "op";
	one_step.commands = commands;
	one_step.n_commands = n_commands;
	if (vary) {
		n_steps = vary->n;
		ret = SCH_ERR_NOMEM;
		steps = sch_arena_alloc(a, (n_steps + 1) * sizeof(*steps));
		if (!steps)
			goto out;
		for (size_t k = 0; k < n_steps; k++) {
			const char **cmds = sch_arena_alloc(a, 4 * sizeof(*cmds));
			char buf[512];
			bool reset;
			size_t nc = 0;
			if (!cmds)
				goto out;
			if ((ret = vary_command(res, vary->name, vary->values[k], buf, sizeof(buf), &reset, d)) != SCH_OK)
				goto out;
			cmds[nc++] = sch_arena_strdup(a, buf);
			if (reset) {
				cmds[nc++] = "reset";
				vary->sweep->unit = ""; /* a .param: the netlist gives its meaning */
			}
			for (size_t c = 0; c < n_commands; c++)
				cmds[nc++] = commands[c];
			steps[k].commands = cmds;
			steps[k].n_commands = nc;
		}
	}
	memset(&req, 0, sizeof(req));
	req.lines = aug.lines;
	req.n_lines = aug.n_lines;
	req.steps = steps;
	req.n_steps = n_steps;
	if (lump.quiet) {
		/* step 1, the full circuit's total alone, runs in a second worker beside step 0 */
		ret = SCH_ERR_NOMEM;
		if (!(steps = sch_arena_alloc(a, 2 * sizeof(*steps))))
			goto out;
		steps[0] = one_step;
		bare_commands[0] = "run";
		steps[1].commands = bare_commands;
		steps[1].n_commands = 1;
		steps[1].lines = aug_full.lines;
		steps[1].n_lines = aug_full.n_lines;
		req.steps = steps;
		req.n_steps = 2;
	}
	req.quantities = q.names.v;
	req.n_quantities = q.names.n;
	req.collect_noise = opt->mode == SCH_RUN_REPORT;
	req.noise_via_file = opt->mode == SCH_RUN_REPORT;
	if (opt->mode == SCH_RUN_REPORT) {
		if ((ret = build_mapping(res, &aug, &m)) != SCH_OK)
			goto out;
		req.keep_vector = keep_noise_vector;
		req.keep_vector_ctx = &m;
	}
	req.squared_noise = true;
	req.n_workers = vary ? opt->n_workers : 1;
	if (vary && opt->progress)
		opt->progress(opt->progress_ctx, 0, n_steps);
	sr.res = res;
	sr.opt = opt;
	sr.vary = vary;
	sr.q = &q;
	sr.m = &m;
	sr.notes = &notes;
	sr.lump = &lump;
	sr.n_steps = n_steps;
	sr.d = d;
	if (vary) {
		/* every point starts from the full list of sources: taking the operating point compacts it */
		ret = SCH_ERR_NOMEM;
		sr.n_noiseless_all = res->set.n_noiseless;
		sr.noiseless_all = sch_arena_alloc(a, (sr.n_noiseless_all + 1) * sizeof(*sr.noiseless_all));
		if (!sr.noiseless_all)
			goto out;
		memcpy(sr.noiseless_all, res->set.noiseless, sr.n_noiseless_all * sizeof(*sr.noiseless_all));
		req.on_step = sweep_point_done;
		req.on_step_ctx = &sr;
	}
	if ((ret = run_simulator(res, &aug, &req, &sim, d)) != SCH_OK)
		goto out;
	res->sim_version = sch_arena_strdup(a, sim.version ? sim.version : "ngspice");
	if (vary) {
		for (size_t k = 0; k < n_steps; k++) {
			if (!sim.steps[k].consumed) {
				ret = sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: sweep point %zu gave no result", k + 1);
				goto out;
			}
		}
	} else {
		sr.full = lump.quiet ? &sim.steps[1] : NULL;
		if ((ret = take_step(&sr, 0, &sim.steps[0])) != SCH_OK)
			goto out;
	}
	if (vary) {
		vary->sweep->n_points = n_steps;
		vary->sweep->crossover = sch_sweep_crossover(vary->sweep->points, n_steps);
	}
	if (opt->mode == SCH_RUN_REPORT && !vary && !lump.quiet) {
		size_t n_res = 0;
		for (size_t k = 0; k < res->set.n_instances; k++)
			n_res += res->deck.elements[res->set.instances[k].element].letter == 'r';
		if (n_res >= SCH_LUMP_HINT_RESISTORS &&
		    (ret = add_notes(res, &notes, sch_arena_printf(a, "%zu resistors, one row each: --lump REGEX reports "
								      "matching ones (extracted parasitics) as one row, "
								      "and much faster",
								  n_res))) != SCH_OK)
			goto out;
	}
	if (res->set.n_noiseless) {
		char list[400] = "";
		size_t shown = 0;
		for (size_t k = 0; k < res->set.n_noiseless && strlen(list) < sizeof(list) - 80; k++, shown++)
			snprintf(list + strlen(list), sizeof(list) - strlen(list), "%s%s (%.3g A)", k ? ", " : "",
				 res->set.noiseless[k].name, res->set.noiseless[k].dc_current_a);
		ret = add_notes(res, &notes, sch_arena_printf(a, "noiseless DC current sources, given no shot noise: %s%s "
								  "(name them with --carrier if they carry shot noise)",
							      list, shown < res->set.n_noiseless ? ", ..." : ""));
		if (ret != SCH_OK)
			goto out;
	}
	if (res->set.n_carriers &&
	    (ret = add_notes(res, &notes, sch_arena_printf(a, "added generators sized 2q|I|G with the exact SI 2019 q = %.10g C "
							      "at the circuit temperature %.2f K",
							      SCH_Q, res->temp_k))) != SCH_OK)
		goto out;
	res->notes = notes.v;
	res->n_notes = notes.n;
	ret = SCH_OK;
out:
	sch_strmap_release(&m.devices);
	sch_strmap_release(&m.probes);
	sch_sim_result_release(&sim);
	return ret;
}

enum sch_err sch_analysis_run(const char *path, const struct sch_run_options *opt, struct sch_result *res,
			      struct sch_diag *d)
{
	return analysis_core(path, opt, NULL, res, d);
}

enum sch_err sch_analysis_sweep(const char *path, const struct sch_run_options *opt, const char *name,
				const double *values, size_t n_values, struct sch_result *res, struct sch_sweep *sweep,
				struct sch_diag *d)
{
	struct vary_plan vary = { name, values, n_values, sweep };

	memset(sweep, 0, sizeof(*sweep));
	sweep->crossover = NAN;
	sweep->name = sch_arena_strdup(&res->arena, name);
	sweep->unit = strcmp(name, "temp") == 0 ? "C" : "A";
	sweep->points = sch_arena_alloc(&res->arena, (n_values + 1) * sizeof(*sweep->points));
	if (!sweep->points || !sweep->name)
		return SCH_ERR_NOMEM;
	if (opt->mode != SCH_RUN_REPORT || n_values < 2)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "a sweep needs a noise run and at least two points");
	return analysis_core(path, opt, &vary, res, d);
}
