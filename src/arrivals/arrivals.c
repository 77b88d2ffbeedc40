/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * arrivals.c - the time-domain realisation of the carriers: arrival processes bin by bin, their
 * source files for the simulator, the transient run and the per-window statistics.
 */
#include <ctype.h>
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>
#include "schrot/arrivals.h"
#include "schrot/leftover.h"
#include "schrot/augment.h"
#include "schrot/physics.h"
#include "schrot/si.h"
#include "schrot/sim.h"
#include "schrot/strmap.h"

const char *sch_arrival_kind_name(enum sch_arrival_kind k)
{
	switch (k) {
	case SCH_ARRIVAL_AVALANCHE:
		return "avalanche";
	case SCH_ARRIVAL_RENEWAL:
		return "renewal";
	default:
		return "poisson";
	}
}

/* ---- arrival processes ----------------------------------------------------------------- */

/* Time from now to the next renewal event in equilibrium: U times a length-biased interval. */
static double renewal_first(struct sch_arrival_source *src)
{
	double mean = 1.0 / src->rate_hz;

	if (src->interval_shape <= 0)
		return sch_rng_uniform(&src->rng) * mean;
	return sch_rng_uniform(&src->rng) * sch_rng_gamma(&src->rng, src->interval_shape + 1.0) * mean /
	       src->interval_shape;
}

static double renewal_interval(struct sch_arrival_source *src)
{
	double mean = 1.0 / src->rate_hz;

	if (src->interval_shape <= 0)
		return mean;
	return sch_rng_gamma(&src->rng, src->interval_shape) * mean / src->interval_shape;
}

enum sch_err sch_arrival_source_init(struct sch_arrival_source *src, double current_a, double gain_m,
				     double excess_f, bool avalanche, uint64_t seed, uint64_t stream)
{
	memset(src, 0, sizeof(*src));
	sch_rng_init(&src->rng, seed, stream);
	src->current_a = current_a;
	src->gain_m = avalanche ? gain_m : 1.0;
	src->excess_f = excess_f;
	src->charge_c = current_a < 0 ? -SCH_Q : SCH_Q;
	src->rate_hz = fabs(current_a) / (SCH_Q * src->gain_m);
	if (avalanche) {
		if (!(excess_f >= 1.0))
			return SCH_ERR_USAGE;
		src->kind = SCH_ARRIVAL_AVALANCHE;
		src->gain_shape = excess_f > 1.0 ? 1.0 / (excess_f - 1.0) : 0.0;
	} else if (excess_f != 1.0 && excess_f >= 0) {
		src->kind = SCH_ARRIVAL_RENEWAL;
		src->interval_shape = excess_f > 0 ? 1.0 / excess_f : 0.0;
		if (src->rate_hz > 0)
			src->next_s = renewal_first(src);
	} else {
		src->kind = SCH_ARRIVAL_POISSON;
	}
	return SCH_OK;
}

void sch_arrival_source_bin(struct sch_arrival_source *src, double dt_s, uint64_t *n_primary, double *charge_c)
{
	uint64_t n = 0;
	double electrons;

	if (!(src->rate_hz > 0)) {
		*n_primary = 0;
		*charge_c = 0;
		src->clock_s += dt_s;
		return;
	}
	switch (src->kind) {
	case SCH_ARRIVAL_RENEWAL: {
		double end = src->clock_s + dt_s;
		while (src->next_s < end) {
			n++;
			src->next_s += renewal_interval(src);
		}
		electrons = (double)n;
		break;
	}
	case SCH_ARRIVAL_AVALANCHE:
		n = sch_rng_poisson(&src->rng, src->rate_hz * dt_s);
		if (n == 0)
			electrons = 0;
		else if (src->gain_shape > 0)
			/* a sum of n gamma(shape) gains is one gamma(n * shape) draw */
			electrons = sch_rng_gamma(&src->rng, (double)n * src->gain_shape) * src->gain_m / src->gain_shape;
		else
			electrons = (double)n * src->gain_m;
		break;
	default:
		n = sch_rng_poisson(&src->rng, src->rate_hz * dt_s);
		electrons = (double)n;
		break;
	}
	src->clock_s += dt_s;
	*n_primary = n;
	*charge_c = electrons * src->charge_c;
}

void sch_arrival_source_windows(struct sch_arrival_source *src, double dt_s, size_t bins_per_window, size_t n,
				uint32_t *per_window, double *electrons)
{
	for (size_t w = 0; w < n; w++) {
		uint64_t count = 0;
		double charge = 0;
		for (size_t b = 0; b < bins_per_window; b++) {
			uint64_t k;
			double c;
			sch_arrival_source_bin(src, dt_s, &k, &c);
			count += k;
			charge += c;
		}
		if (per_window)
			per_window[w] = count > UINT32_MAX ? UINT32_MAX : (uint32_t)count;
		if (electrons)
			electrons[w] = charge / src->charge_c;
	}
}

/* ---- statistics ------------------------------------------------------------------------- */

void sch_moments_init(struct sch_moments *m)
{
	memset(m, 0, sizeof(*m));
}

void sch_moments_add(struct sch_moments *m, double x)
{
	double n1 = m->n;
	double n = n1 + 1;
	double delta = x - m->mean;
	double delta_n = delta / n;
	double term1 = delta * delta_n * n1;

	m->n = n;
	m->mean += delta_n;
	m->m3 += term1 * delta_n * (n - 2) - 3 * delta_n * m->m2;
	m->m2 += term1;
}

double sch_moments_mean(const struct sch_moments *m)
{
	return m->n > 0 ? m->mean : NAN;
}

double sch_moments_var(const struct sch_moments *m)
{
	return m->n > 1 ? m->m2 / (m->n - 1) : NAN;
}

double sch_moments_skewness(const struct sch_moments *m)
{
	if (!(m->n > 2) || !(m->m2 > 0))
		return NAN;
	return sqrt(m->n) * m->m3 / pow(m->m2, 1.5);
}

double sch_poisson_pmf(double mean, uint64_t k)
{
	if (!(mean > 0))
		return k == 0 ? 1.0 : 0.0;
	return exp((double)k * log(mean) - mean - lgamma((double)k + 1));
}

double sch_gauss_interval(double mean, double sd, double lo, double hi)
{
	if (!(sd > 0))
		return mean >= lo && mean < hi ? 1.0 : 0.0;
	return 0.5 * (erfc((lo - mean) / (sd * M_SQRT2)) - erfc((hi - mean) / (sd * M_SQRT2)));
}

/* ---- the run ---------------------------------------------------------------------------- */

void sch_arrivals_init(struct sch_arrivals *a)
{
	memset(a, 0, sizeof(*a));
	sch_result_init(&a->op);
	a->output_mean_v = a->output_std_v = a->output_skewness = NAN;
	a->output_lag1_correlation = a->shortest_rc_s = NAN;
}

void sch_arrivals_release(struct sch_arrivals *a)
{
	if (!a)
		return;
	sch_result_release(&a->op);
	memset(a, 0, sizeof(*a));
}

static bool is_ground(const char *node)
{
	return strcmp(node, "0") == 0 || strcmp(node, "gnd") == 0;
}

/* "v(out)" / "V( a , b )" into its node names (lower case); false for other forms or unsafe names. */
static bool parse_output(const char *expr, char *a, char *b, size_t size)
{
	if (!sch_analysis_output_nodes(expr, a, b, size))
		return false;
	if (is_ground(b))
		b[0] = '\0'; /* the simulator has no vector for ground */
	return sch_sim_name_is_safe(a) && (!b[0] || sch_sim_name_is_safe(b));
}

/* Private directory for the source files; removed with everything in it by scratch_remove. */
struct scratch {
	char dir[512];
	size_t n_files;
	bool made;
};

static void scratch_file(const struct scratch *s, size_t k, char *out, size_t size)
{
	snprintf(out, size, "%s/carrier%zu.txt", s->dir, k);
}

static void scratch_remove(struct scratch *s)
{
	char file[600];

	if (!s->made)
		return;
	for (size_t k = 0; k < s->n_files; k++) {
		scratch_file(s, k, file, sizeof(file));
		unlink(file);
	}
	rmdir(s->dir);
	sch_leftover_drop_path(s->dir);
	s->made = false;
}

/* A path the simulator may read from a model card: no quotes, blanks or command characters. */
static bool path_is_plain(const char *p)
{
	for (; *p; p++)
		if (!(isalnum((unsigned char)*p) || strchr("/._-", *p)))
			return false;
	return true;
}

/*
 * Writes the source file of one carrier (time, current fluctuation about the DC value: the bin's
 * mean current minus I at each bin centre, linearly interpolated by the simulator, so every
 * arrival is a triangular pulse of its full charge and two bins wide) and counts its windows.
 */
static enum sch_err write_source(const char *file, struct sch_arrival_source *src, double dt, size_t settle_bins,
				 size_t bins_per_window, size_t n_windows, struct sch_arrival_counts *ct,
				 struct sch_moments *electrons, struct sch_diag *d)
{
	FILE *f = fopen(file, "w");
	size_t n_bins = settle_bins + bins_per_window * n_windows;
	uint64_t window_count = 0;
	double window_charge = 0;
	struct sch_moments counts;
	size_t zero = 0;

	if (!f)
		return sch_diag_error(d, SCH_ERR_IO, file, 0, "cannot write a source file: %s", strerror(errno));
	sch_moments_init(&counts);
	fprintf(f, "0 0\n");
	for (size_t b = 0; b < n_bins; b++) {
		uint64_t k;
		double q;
		sch_arrival_source_bin(src, dt, &k, &q);
		fprintf(f, "%.15g %.12g\n", ((double)b + 0.5) * dt, q / dt - src->current_a);
		if (b < settle_bins)
			continue;
		window_count += k;
		window_charge += q;
		if ((b - settle_bins + 1) % bins_per_window == 0) {
			size_t w = (b - settle_bins) / bins_per_window;
			ct->per_window[w] = window_count > UINT32_MAX ? UINT32_MAX : (uint32_t)window_count;
			sch_moments_add(&counts, (double)window_count);
			sch_moments_add(electrons, window_charge / src->charge_c);
			zero += window_count == 0;
			window_count = 0;
			window_charge = 0;
		}
	}
	fprintf(f, "%.15g 0\n", ((double)n_bins + 1.0) * dt);
	if (ferror(f) | (fclose(f) != 0))
		return sch_diag_error(d, SCH_ERR_IO, file, 0, "cannot write a source file: %s", strerror(errno));
	ct->windows = n_windows;
	ct->mean_count = sch_moments_mean(&counts);
	ct->var_count = sch_moments_var(&counts);
	ct->skew_count = sch_moments_skewness(&counts);
	ct->p_zero = (double)zero / (double)n_windows;
	return SCH_OK;
}

/* The deck of the transient: the netlist's cards, then one file-driven source per carrier. */
static enum sch_err build_lines(struct sch_arrivals *a, const struct scratch *s, const char ***lines, size_t *n_lines,
				struct sch_diag *d)
{
	struct sch_arena *ar = &a->op.arena;
	const struct sch_deck *deck = &a->op.deck;
	struct sch_augmented aug;
	const char **v;
	size_t n = 0;
	enum sch_err ret;

	if ((ret = sch_augment_build(deck, &a->op.set, NULL, ar, &aug, d)) != SCH_OK)
		return ret;
	v = sch_arena_alloc(ar, (aug.n_lines + 3 * a->n_counts + 2) * sizeof(*v));
	if (!v)
		return SCH_ERR_NOMEM;
	for (size_t k = 0; k + 1 < aug.n_lines; k++)
		v[n++] = aug.lines[k];
	for (size_t k = 0; k < a->n_counts; k++) {
		const struct sch_carrier *c = &a->op.set.carriers[k];
		const char *np, *nm;
		char file[600];
		if ((ret = sch_augment_flat_nodes(ar, deck, c->element, c->name, &np, &nm)) != SCH_OK) {
			if (ret == SCH_ERR_NOMEM)
				return ret;
			return sch_diag_error(d, SCH_ERR_INPUT, deck->path, 0, "cannot find the nodes of carrier '%s'", c->name);
		}
		if (!sch_sim_name_is_safe(np) || !sch_sim_name_is_safe(nm))
			return sch_diag_error(d, SCH_ERR_INPUT, deck->path, 0,
					      "carrier '%s' sits on a node name the simulator cannot be given safely", c->name);
		scratch_file(s, k, file, sizeof(file));
		v[n++] = sch_arena_printf(ar, "* schrot: arrivals of %s", c->name);
		v[n++] = sch_arena_printf(ar, "aschar%zu %%id([%s %s]) mschar%zu", k, np, nm, k);
		v[n++] = sch_arena_printf(ar,
					  ".model mschar%zu filesource (file=\"%s\" amploffset=[0] amplscale=[1] timeoffset=0 "
					  "timescale=1 timerelative=false amplstep=false)",
					  k, file);
		if (!v[n - 1] || !v[n - 2] || !v[n - 3])
			return SCH_ERR_NOMEM;
	}
	v[n++] = ".end";
	*lines = v;
	*n_lines = n;
	return SCH_OK;
}

/*
 * The run loads the analog code models for its own file sources; a netlist's own code-model
 * instances (a file source could read any file) stay as unavailable as in every other command.
 * Checked on a deck of its own, before the operating point runs.
 */
static enum sch_err refuse_code_models(const char *path, struct sch_diag *d)
{
	struct sch_deck deck;
	enum sch_err ret;

	sch_deck_init(&deck);
	if ((ret = sch_deck_load(&deck, path, d)) != SCH_OK)
		goto out;
	for (size_t k = 0; k < deck.n_elements; k++) {
		const struct sch_card *card = &deck.cards[deck.elements[k].card];
		if (deck.elements[k].letter == 'a') {
			ret = sch_diag_error(d, SCH_ERR_INPUT, card->file, card->line,
					     "code-model instance '%s' is not allowed in a netlist for arrivals",
					     deck.elements[k].name);
			goto out;
		}
	}
	ret = SCH_OK;
out:
	sch_deck_release(&deck);
	return ret;
}

/* Options checked and turned into the bin grid. */
static enum sch_err plan_grid(struct sch_arrivals *a, const struct sch_arrivals_options *opt, size_t *bins_per_window,
			      size_t *settle_bins, struct sch_diag *d)
{
	double step = isnan(opt->step_s) ? opt->window_s / SCH_ARRIVALS_STEPS_PER_WINDOW : opt->step_s;
	double bpw;

	if (!(opt->window_s > 0) || !isfinite(opt->window_s))
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "arrivals needs --window with a positive time (try 'schrot --help')");
	if (opt->n_windows < 2 || opt->n_windows > SCH_ARRIVALS_MAX_WINDOWS)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "arrivals needs 2 to %d windows (--windows N, or --duration D of at least two windows)",
				      SCH_ARRIVALS_MAX_WINDOWS);
	if (!(step > 0) || step > opt->window_s * (1 + 1e-12))
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "--step must be positive and no longer than the window");
	if (!(opt->settle_s >= 0) || !isfinite(opt->settle_s))
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "--settle must not be negative");
	bpw = ceil(opt->window_s / step * (1 - 1e-12));
	if (bpw < 1)
		bpw = 1;
	a->step_s = opt->window_s / bpw;
	*bins_per_window = (size_t)bpw;
	*settle_bins = (size_t)ceil(opt->settle_s / a->step_s * (1 - 1e-12));
	if ((double)*settle_bins + bpw * (double)opt->n_windows > SCH_ARRIVALS_MAX_BINS)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "%.0f simulator steps per carrier exceed the limit of %d: use fewer windows or a longer --step",
				      (double)*settle_bins + bpw * (double)opt->n_windows, SCH_ARRIVALS_MAX_BINS);
	a->settle_s = (double)*settle_bins * a->step_s;
	a->window_s = opt->window_s;
	a->n_windows = opt->n_windows;
	a->seed = opt->seed;
	a->n_bins = *settle_bins + *bins_per_window * opt->n_windows;
	return SCH_OK;
}

/*
 * The simulator lower-cases the file names in model cards, so the directory is named with lower
 * case letters only (mkdtemp would mix cases): a random suffix, created with mkdir until it is new.
 */
static enum sch_err make_scratch(struct scratch *s, struct sch_diag *d)
{
	const char *tmp = getenv("TMPDIR");
	struct sch_rng rng;

	if (!tmp || tmp[0] != '/' || strlen(tmp) > 400 || !path_is_plain(tmp))
		tmp = "/tmp";
	for (const char *p = tmp; *p; p++)
		if (isupper((unsigned char)*p))
			tmp = "/tmp";
	sch_rng_init(&rng, (uint64_t)getpid() ^ ((uint64_t)time(NULL) << 20), (uint64_t)(uintptr_t)s);
	for (int attempt = 0; attempt < 100; attempt++) {
		char suffix[11];
		for (int i = 0; i < 10; i++)
			suffix[i] = (char)('a' + sch_rng_next(&rng) % 26);
		suffix[10] = '\0';
		snprintf(s->dir, sizeof(s->dir), "%s/schrot-arrivals-%s", tmp, suffix);
		sigset_t old;
		bool made;

		sch_leftover_hold(&old);
		made = mkdir(s->dir, 0700) == 0;
		if (made)
			sch_leftover_add_path(s->dir, true); /* a signal removes it with its files */
		sch_leftover_release(&old);
		if (made) {
			s->made = true;
			return SCH_OK;
		}
		if (errno != EEXIST)
			break;
	}
	return sch_diag_error(d, SCH_ERR_IO, NULL, 0, "cannot create a private directory in '%s': %s", tmp, strerror(errno));
}

/* Correlation of each window's output with the next one's: sum (x_i - m)(x_i+1 - m) / sum (x_i - m)^2; NaN without spread. */
static double lag1_correlation(const double *x, size_t n, double mean)
{
	double num = 0, den = 0;

	for (size_t i = 0; i < n; i++) {
		den += (x[i] - mean) * (x[i] - mean);
		if (i + 1 < n)
			num += (x[i] - mean) * (x[i + 1] - mean);
	}
	return den > 0 ? num / den : NAN;
}

/* The output's samples from the transient outcome: v(a) or v(a) - v(b). */
static enum sch_err take_output(struct sch_arrivals *a, const struct sch_sim_outcome *o, const char *na, const char *nb,
				struct sch_diag *d)
{
	const struct sch_sim_vector *va = sch_sim_find_vector(o, na);
	const struct sch_sim_vector *vb = nb[0] ? sch_sim_find_vector(o, nb) : NULL;
	struct sch_moments m;

	if (!va || va->n != a->n_windows || (nb[0] && (!vb || vb->n != a->n_windows)))
		return sch_diag_error(d, SCH_ERR_SIM, NULL, 0, "simulator: the transient returned no samples of '%s'", a->output);
	a->output_v = sch_arena_alloc(&a->op.arena, (a->n_windows + 1) * sizeof(double));
	if (!a->output_v)
		return SCH_ERR_NOMEM;
	sch_moments_init(&m);
	for (size_t w = 0; w < a->n_windows; w++) {
		a->output_v[w] = va->values[w] - (vb ? vb->values[w] : 0.0);
		sch_moments_add(&m, a->output_v[w]);
	}
	a->output_mean_v = sch_moments_mean(&m);
	a->output_std_v = sqrt(sch_moments_var(&m));
	a->output_skewness = sch_moments_skewness(&m);
	a->output_lag1_correlation = lag1_correlation(a->output_v, a->n_windows, a->output_mean_v);
	return SCH_OK;
}

/*
 * The node names of the output (from --output, else the deck's .noise line) into na and nb (nb ""
 * for a single node) and a->output ("v(a)" or "v(a,b)"; NULL when out of memory, which the caller
 * checks). SCH_ERR_USAGE when there is no output or it is no plain node voltage.
 */
static enum sch_err pick_output(struct sch_arrivals *a, const char *path, const struct sch_run_options *run,
				char *na, char *nb, size_t size, struct sch_diag *d)
{
	struct sch_arena *ar = &a->op.arena;
	const char *expr = run->output_expr ? run->output_expr : a->op.deck.noise.present ? a->op.deck.noise.output : NULL;

	if (!expr)
		return sch_diag_error(d, SCH_ERR_USAGE, path, 0,
				      "arrivals needs an output: give --output v(node) or a '.noise' line");
	if (!parse_output(expr, na, nb, size))
		return sch_diag_error(d, SCH_ERR_USAGE, run->output_expr ? NULL : path, 0,
				      "output must be v(node) or v(node,ref) with plain node names, not '%s'", expr);
	a->output = nb[0] ? sch_arena_printf(ar, "v(%s,%s)", na, nb) : sch_arena_printf(ar, "v(%s)", na);
	return SCH_OK;
}

/* A literal element value (tok[2]: "10k", "2p"), NaN for an expression or none. */
static double literal_value(const struct sch_element *e)
{
	double v;
	return e->n_tok >= 3 && sch_si_parse(e->tok[2], &v) == SCH_OK && v > 0 && isfinite(v) ? v : NAN;
}

/*
 * The circuit's shortest RC time constant, estimated from the deck as the smallest C x R over each
 * capacitor and the smallest resistor that shares a node with it in the same definition (the
 * resistance a capacitor sees is at most that resistor's where the resistor's far end is held;
 * common practice, no source). Literal values only; NaN when no pair is found or out of memory.
 * *cap and *res name the pair.
 */
static double shortest_rc(const struct sch_deck *deck, struct sch_arena *arena, const char **cap, const char **res)
{
	struct sch_strmap min_r; /* "scope node" -> the element index of the smallest resistor on it */
	double best = NAN;

	sch_strmap_init(&min_r);
	for (size_t k = 0; k < deck->n_elements; k++) {
		const struct sch_element *e = &deck->elements[k];
		const char *const *nodes;
		double r = literal_value(e);
		if (e->letter != 'r' || isnan(r) || sch_deck_element_nodes(deck, e, &nodes) < 2)
			continue;
		for (int j = 0; j < 2; j++) {
			const char *key = sch_arena_printf(arena, "%d %s", e->subckt, nodes[j]);
			int old = key ? sch_strmap_get(&min_r, key, strlen(key)) : -1;
			if (!key || ((old < 0 || literal_value(&deck->elements[old]) > r) &&
				     sch_strmap_put(&min_r, key, strlen(key), (int)k) != SCH_OK))
				goto out;
		}
	}
	for (size_t k = 0; k < deck->n_elements; k++) {
		const struct sch_element *e = &deck->elements[k];
		const char *const *nodes;
		double c = literal_value(e);
		if (e->letter != 'c' || isnan(c) || sch_deck_element_nodes(deck, e, &nodes) < 2)
			continue;
		for (int j = 0; j < 2; j++) {
			const char *key = sch_arena_printf(arena, "%d %s", e->subckt, nodes[j]);
			int r = key ? sch_strmap_get(&min_r, key, strlen(key)) : -1;
			double tau = r >= 0 ? c * literal_value(&deck->elements[r]) : NAN;
			if (tau > 0 && !(tau >= best)) {
				best = tau;
				*cap = e->name;
				*res = deck->elements[r].name;
			}
		}
	}
out:
	sch_strmap_release(&min_r);
	return best;
}

/*
 * Warnings about what the realisation can resolve: a source step coarse against the shortest RC
 * (the --step advice: a fiftieth of it), and output windows that are not independent (lag-1
 * correlation beyond max(0.1, 3/sqrt(N)), three standard errors of an independent sequence).
 */
static void warn_resolution(struct sch_arrivals *a, struct sch_diag *d)
{
	const char *cap = "", *res = "";
	char s1[64], s2[64], s3[64];
	double r1 = a->output_lag1_correlation, n = (double)a->n_windows;

	a->shortest_rc_s = shortest_rc(&a->op.deck, &a->op.arena, &cap, &res);
	if (a->shortest_rc_s > 0 && a->step_s > a->shortest_rc_s / 50)
		sch_diag_report(d, SCH_WARNING, NULL, 0,
				"the step %s is coarse against the circuit's shortest time constant, about %s (%s with "
				"%s): faster dynamics are averaged away; use --step %s or finer",
				sch_si_format(s1, sizeof(s1), a->step_s, 3, "s"),
				sch_si_format(s2, sizeof(s2), a->shortest_rc_s, 3, "s"), cap, res,
				sch_si_format(s3, sizeof(s3), a->shortest_rc_s / 50, 2, "s"));
	if (r1 > 0.1 && r1 > 3 / sqrt(n))
		sch_diag_report(d, SCH_WARNING, NULL, 0,
				"successive windows' outputs are correlated (lag-1 correlation %.3f over %zu windows): "
				"the output's memory is about %.2g window%s (-1/ln of the correlation), so its samples "
				"are not independent; use a longer --window",
				r1, a->n_windows, r1 < 1 ? -1 / log(r1) : INFINITY, r1 < 1 && -1 / log(r1) < 1.05 ? "" : "s");
}

/* SCH_ERR_USAGE when there are no carriers or their source tables together exceed the limit. */
static enum sch_err check_carriers(struct sch_arrivals *a, const char *path, struct sch_diag *d)
{
	if (a->op.set.n_carriers == 0)
		return sch_diag_error(d, SCH_ERR_USAGE, path, 0,
				      "no shot-noise carriers found: nothing arrives (name them with --carrier)");
	a->n_counts = a->op.set.n_carriers;
	/* each file source holds its whole table in the simulator (16 bytes a point): bound the sum */
	if ((double)a->n_bins * (double)a->n_counts > SCH_ARRIVALS_MAX_BINS)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "%zu carriers of %zu source steps each exceed the limit of %d steps in all: use fewer "
				      "windows or a longer --step",
				      a->n_counts, a->n_bins, SCH_ARRIVALS_MAX_BINS);
	return SCH_OK;
}

/* Sets up carrier k's arrival source; SCH_ERR_SIM or SCH_ERR_USAGE with a message when it cannot be drawn. */
static enum sch_err carrier_source(const struct sch_arrivals *a, const struct sch_arrivals_options *opt, size_t k,
				   const char *path, struct sch_arrival_source *src, struct sch_diag *d)
{
	const struct sch_carrier *c = &a->op.set.carriers[k];
	bool avalanche = (c->why & SCH_WHY_AVALANCHE) != 0;

	if (!isfinite(c->dc_current_a))
		return sch_diag_error(d, SCH_ERR_SIM, path, 0, "no operating-point current for carrier '%s'", c->name);
	if (sch_arrival_source_init(src, c->dc_current_a, c->gain_m, c->excess_f, avalanche, opt->seed, k) != SCH_OK)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "carrier '%s': an avalanche gain cannot have an excess noise factor below 1 (%g)",
				      c->name, c->excess_f);
	if (src->kind == SCH_ARRIVAL_RENEWAL && src->rate_hz * (double)a->n_bins * a->step_s > 2e9)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "carrier '%s': %.3g events are too many to draw one by one for its Fano factor: "
				      "use fewer windows",
				      c->name, src->rate_hz * (double)a->n_bins * a->step_s);
	return SCH_OK;
}

/* Draws carrier k's arrivals into its scratch file and fills a->counts[k]. */
static enum sch_err draw_carrier(struct sch_arrivals *a, const struct sch_arrivals_options *opt, struct scratch *s,
				 size_t k, size_t settle_bins, size_t bpw, const char *path, struct sch_diag *d)
{
	const struct sch_carrier *c = &a->op.set.carriers[k];
	struct sch_arrival_counts *ct = &a->counts[k];
	struct sch_arrival_source src;
	struct sch_moments electrons;
	char file[600];
	enum sch_err ret;

	if ((ret = carrier_source(a, opt, k, path, &src, d)) != SCH_OK)
		return ret;
	ct->carrier = c->name;
	ct->kind = src.kind;
	ct->current_a = c->dc_current_a;
	ct->gain_m = src.gain_m;
	ct->excess_f = c->excess_f;
	ct->rate_hz = src.rate_hz;
	ct->expected_count = src.rate_hz * a->window_s;
	ct->per_window = sch_arena_alloc(&a->op.arena, (a->n_windows + 1) * sizeof(uint32_t));
	if (!ct->per_window)
		return SCH_ERR_NOMEM;
	scratch_file(s, k, file, sizeof(file));
	s->n_files = k + 1;
	sch_moments_init(&electrons);
	if ((ret = write_source(file, &src, a->step_s, settle_bins, bpw, a->n_windows, ct, &electrons, d)) != SCH_OK)
		return ret;
	ct->mean_electrons = sch_moments_mean(&electrons);
	ct->var_electrons = sch_moments_var(&electrons);
	return SCH_OK;
}

/* One transient run of the deck with the file sources, sampling the output at each window's end. */
static enum sch_err simulate(const struct sch_arrivals *a, const char **lines, size_t n_lines, const char *na,
			     const char *nb, struct sch_sim_result *sim, struct sch_diag *d)
{
	struct sch_sim_request req;
	struct sch_sim_step step;
	const char *cmds[1], *vecs[2], *models[1] = { "analog.cm" };
	char tran[256];

	snprintf(tran, sizeof(tran), "tran %.12g %.15g 0 %.12g", a->step_s, ((double)a->n_bins + 0.5) * a->step_s,
		 a->step_s);
	cmds[0] = tran;
	memset(&step, 0, sizeof(step));
	step.commands = cmds;
	step.n_commands = 1;
	vecs[0] = na;
	vecs[1] = nb;
	memset(&req, 0, sizeof(req));
	req.lines = lines;
	req.n_lines = n_lines;
	req.steps = &step;
	req.n_steps = 1;
	req.n_workers = 1;
	req.tran_vectors = vecs;
	req.n_tran_vectors = nb[0] ? 2 : 1;
	req.tran_sample_start_s = a->settle_s;
	req.tran_sample_step_s = a->window_s;
	req.tran_n_samples = a->n_windows;
	req.code_models = models;
	req.n_code_models = 1;
	req.compat_mode = a->op.compat_mode; /* the operating-point run's, so both read the deck alike */
	return sch_sim_run(&req, sim, d);
}

enum sch_err sch_arrivals_run(const char *path, const struct sch_run_options *run,
			      const struct sch_arrivals_options *opt, struct sch_arrivals *a, struct sch_diag *d)
{
	struct sch_run_options op = *run;
	struct scratch s = { "", 0, false };
	struct sch_sim_result sim;
	const char **lines = NULL;
	size_t n_lines = 0, bpw = 0, settle_bins = 0;
	char na[256], nb[256];
	enum sch_err ret;

	memset(&sim, 0, sizeof(sim));
	if ((ret = plan_grid(a, opt, &bpw, &settle_bins, d)) != SCH_OK)
		goto out;
	if ((ret = refuse_code_models(path, d)) != SCH_OK)
		goto out;
	op.mode = SCH_RUN_OP;
	if ((ret = sch_analysis_run(path, &op, &a->op, d)) != SCH_OK ||
	    (ret = pick_output(a, path, run, na, nb, sizeof(na), d)) != SCH_OK ||
	    (ret = check_carriers(a, path, d)) != SCH_OK)
		goto out;
	a->counts = sch_arena_alloc(&a->op.arena, (a->n_counts + 1) * sizeof(*a->counts));
	if (!a->output || !a->counts) {
		ret = SCH_ERR_NOMEM;
		goto out;
	}
	if ((ret = make_scratch(&s, d)) != SCH_OK)
		goto out;
	for (size_t k = 0; k < a->n_counts; k++) {
		if ((ret = draw_carrier(a, opt, &s, k, settle_bins, bpw, path, d)) != SCH_OK)
			goto out;
	}
	if ((ret = build_lines(a, &s, &lines, &n_lines, d)) != SCH_OK)
		goto out;
	if ((ret = simulate(a, lines, n_lines, na, nb, &sim, d)) != SCH_OK)
		goto out;
	if ((ret = take_output(a, &sim.steps[0], na, nb, d)) != SCH_OK)
		goto out;
	warn_resolution(a, d);
	ret = SCH_OK;
out:
	sch_sim_result_release(&sim);
	scratch_remove(&s);
	return ret;
}
