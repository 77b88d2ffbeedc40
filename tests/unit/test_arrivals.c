/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * test_arrivals.c - facts about the arrival processes and window statistics (arrivals.h), without
 * the simulator: Poisson counts, avalanche multiplication, renewal processes, moments.
 */
#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include "check.h"
#include "schrot/arrivals.h"
#include "schrot/physics.h"

#define N_WINDOWS 200000

/* Window counts of a carrier of current i_a over windows of window_s in bins of window_s / bins. */
static void count_windows(double i_a, double m, double f, bool avalanche, double window_s, size_t bins,
			  uint32_t *counts, double *electrons, size_t n)
{
	struct sch_arrival_source src;

	CHECK(sch_arrival_source_init(&src, i_a, m, f, avalanche, 2026, 0) == SCH_OK);
	sch_arrival_source_windows(&src, window_s / (double)bins, bins, n, counts, electrons);
}

struct stats {
	double mean, var, skew, p_zero;
};

static struct stats stats_of(const uint32_t *c, size_t n)
{
	struct sch_moments m;
	struct stats s;
	size_t zero = 0;

	sch_moments_init(&m);
	for (size_t i = 0; i < n; i++) {
		sch_moments_add(&m, (double)c[i]);
		zero += c[i] == 0;
	}
	s.mean = sch_moments_mean(&m);
	s.var = sch_moments_var(&m);
	s.skew = sch_moments_skewness(&m);
	s.p_zero = (double)zero / (double)n;
	return s;
}

/*
 * CHECK-VALUES.md N1 and N2: for a current delivering N = I*T/q electrons per window the counts
 * have mean = variance = N, skewness 1/sqrt(N) and P(0) = e^-N (0.36787944117144233,
 * 0.018315638888734179 at N = 1, 4; GSL gsl_ran_poisson_pdf), within five standard errors.
 */
static void test_arrivals__poisson_counts_have_mean_variance_and_p0_of_poisson(void)
{
	static const double n_mean[] = { 1, 4, 100 };
	static const double p0[] = { 0.36787944117144233, 0.018315638888734179, 3.7200759760208361e-44 };
	uint32_t *c = malloc(N_WINDOWS * sizeof(*c));
	const double window = 1e-3;

	for (size_t k = 0; k < 3; k++) {
		double nn = n_mean[k], i_a = nn * SCH_Q / window;
		struct stats s;
		count_windows(i_a, 1, 1, false, window, 7, c, NULL, N_WINDOWS);
		s = stats_of(c, N_WINDOWS);
		CHECK(fabs(s.mean - nn) < 5 * sqrt(nn / N_WINDOWS));
		CHECK(fabs(s.var - nn) < 5 * sqrt((nn + 2 * nn * nn) / N_WINDOWS));
		/* sd of the sample skewness is about sqrt(6/n) */
		CHECK(fabs(s.skew - 1 / sqrt(nn)) < 5 * sqrt(6.0 / N_WINDOWS));
		CHECK(fabs(s.p_zero - p0[k]) < 5 * sqrt(p0[k] * (1 - p0[k]) / N_WINDOWS) + 1e-12);
	}
	free(c);
}

/* The bin grid does not change the statistics: one bin or fifty per window, same Poisson law. */
static void test_arrivals__counts_do_not_depend_on_the_bin_size(void)
{
	uint32_t *c = malloc(N_WINDOWS * sizeof(*c));
	const double nn = 2.5, window = 1e-6, i_a = nn * SCH_Q / window;
	struct stats a, b;

	count_windows(i_a, 1, 1, false, window, 1, c, NULL, N_WINDOWS);
	a = stats_of(c, N_WINDOWS);
	count_windows(i_a, 1, 1, false, window, 50, c, NULL, N_WINDOWS / 4);
	b = stats_of(c, N_WINDOWS / 4);
	CHECK(fabs(a.mean - nn) < 5 * sqrt(nn / N_WINDOWS));
	CHECK(fabs(b.mean - nn) < 5 * sqrt(nn / (N_WINDOWS / 4)));
	CHECK(fabs(b.p_zero - exp(-nn)) < 5 * sqrt(exp(-nn) / (N_WINDOWS / 4)));
	free(c);
}

/*
 * Avalanche gain M = 10, k = 0.02: McIntyre's F = 2.062 (CHECK-VALUES.md A3). Primaries arrive
 * at |I|/(qM); delivered electrons per window have mean N*M and variance N*M^2*F (the window
 * form of the density 2q|I|MF, DESIGN.md section 3).
 */
static void test_arrivals__avalanche_electrons_have_mean_nm_and_variance_nm2f(void)
{
	const double m = 10, f = sch_mcintyre_f(10, 0.02), np = 3, window = 1e-6;
	const double i_a = np * m * SCH_Q / window;
	uint32_t *c = malloc(N_WINDOWS * sizeof(*c));
	double *e = malloc(N_WINDOWS * sizeof(*e));
	struct sch_moments me;
	struct stats s;

	CHECK_REL(f, 2.062, 1e-12);
	count_windows(i_a, m, f, true, window, 5, c, e, N_WINDOWS);
	s = stats_of(c, N_WINDOWS);
	CHECK(fabs(s.mean - np) < 5 * sqrt(np / N_WINDOWS));
	CHECK(fabs(s.p_zero - exp(-np)) < 5 * sqrt(exp(-np) / N_WINDOWS));
	sch_moments_init(&me);
	for (size_t i = 0; i < N_WINDOWS; i++)
		sch_moments_add(&me, e[i]);
	CHECK(fabs(sch_moments_mean(&me) - np * m) < 5 * sqrt(np * m * m * f / N_WINDOWS));
	CHECK_REL(sch_moments_var(&me), np * m * m * f, 0.03);
	free(c);
	free(e);
}

/* An avalanche gain cannot have F < 1 (F = E[G^2]/M^2 >= 1); the source refuses it. */
static void test_arrivals__avalanche_below_unit_excess_is_refused(void)
{
	struct sch_arrival_source src;

	CHECK(sch_arrival_source_init(&src, 1e-9, 10, 0.5, true, 1, 0) == SCH_ERR_USAGE);
	CHECK(sch_arrival_source_init(&src, 1e-9, 1, 1, true, 1, 0) == SCH_OK);
	CHECK(src.gain_shape == 0);
}

/*
 * A Fano factor F as a renewal process with gamma intervals of shape 1/F: over windows long
 * against the interval, var/mean -> F (the squared coefficient of variation of the interval; D. R.
 * Cox, Renewal Theory, Methuen 1962, from memory). F = 0.5 here, 200 intervals per window.
 */
static void test_arrivals__renewal_counts_have_fano_factor(void)
{
	const double nn = 200, window = 1e-3, i_a = nn * SCH_Q / window;
	const size_t n = 20000;
	uint32_t *c = malloc(n * sizeof(*c));
	struct stats s;

	count_windows(i_a, 1, 0.5, false, window, 4, c, NULL, n);
	s = stats_of(c, n);
	CHECK(fabs(s.mean - nn) < 5 * sqrt(0.5 * nn / n));
	CHECK(fabs(s.var / s.mean - 0.5) < 0.05);
	/* F = 0: regular arrivals, every window holds N or N +- 1 */
	count_windows(i_a, 1, 0, false, window, 4, c, NULL, n);
	s = stats_of(c, n);
	CHECK(fabs(s.mean - nn) < 0.01);
	CHECK(s.var < 0.5);
	free(c);
}

/* A negative current delivers negative charge; the rate uses |I|. */
static void test_arrivals__negative_current_gives_negative_charge(void)
{
	struct sch_arrival_source src;
	uint64_t k = 0;
	double q = 0, total = 0;
	uint64_t n = 0;

	CHECK(sch_arrival_source_init(&src, -1e-12, 1, 1, false, 9, 2) == SCH_OK);
	CHECK_REL(src.rate_hz, 1e-12 / SCH_Q, 1e-15);
	for (int i = 0; i < 10000; i++) {
		sch_arrival_source_bin(&src, 1e-6, &k, &q);
		total += q;
		n += k;
	}
	CHECK(total < 0);
	CHECK_REL(total, -(double)n * SCH_Q, 1e-12);
	CHECK(sch_arrival_source_init(&src, 0, 1, 1, false, 9, 2) == SCH_OK);
	sch_arrival_source_bin(&src, 1, &k, &q);
	CHECK(k == 0 && q == 0);
}

/* One-pass moments equal the two-pass ones for a fixed set: 1, 2, 3, 10 (mean 4, var 14, g1 by hand). */
static void test_arrivals__moments_match_two_pass_values(void)
{
	static const double x[] = { 1, 2, 3, 10 };
	struct sch_moments m;
	double m2 = 0, m3 = 0;

	sch_moments_init(&m);
	for (int i = 0; i < 4; i++)
		sch_moments_add(&m, x[i]);
	for (int i = 0; i < 4; i++) {
		m2 += (x[i] - 4) * (x[i] - 4);
		m3 += (x[i] - 4) * (x[i] - 4) * (x[i] - 4);
	}
	CHECK_REL(sch_moments_mean(&m), 4, 1e-15);
	CHECK_REL(sch_moments_var(&m), m2 / 3, 1e-14);
	CHECK_REL(sch_moments_skewness(&m), sqrt(4.0) * m3 / pow(m2, 1.5), 1e-13);
	sch_moments_init(&m);
	sch_moments_add(&m, 1);
	CHECK(isnan(sch_moments_var(&m)) && isnan(sch_moments_skewness(&m)));
}

/*
 * CHECK-VALUES.md N2, N3 (GSL values): e^-1, e^-4, P(X=4 | N=4) = 0.19536681481316454, P(X=100 |
 * N=100) = 0.039860996809148827; N5: the normal approximation Phi((0.5 - N)/sqrt(N)) =
 * 0.30853753872598694 at N = 1 and 0.0400591568638171 at N = 4 (gsl_cdf_ugaussian_P).
 */
static void test_arrivals__poisson_and_gaussian_reference_values(void)
{
	CHECK_REL(sch_poisson_pmf(1, 0), 0.36787944117144233, 1e-15);
	CHECK_REL(sch_poisson_pmf(4, 0), 0.018315638888734179, 1e-15);
	CHECK_REL(sch_poisson_pmf(4, 4), 0.19536681481316454, 1e-13);
	CHECK_REL(sch_poisson_pmf(100, 100), 0.039860996809148827, 1e-11);
	CHECK_REL(sch_gauss_interval(1, 1, -INFINITY, 0.5), 0.30853753872598694, 1e-13);
	CHECK_REL(sch_gauss_interval(4, 2, -INFINITY, 0.5), 0.0400591568638171, 1e-13);
}

/* The counted histogram follows the Poisson law bin by bin (N = 100, PTRS region), five sigma per bin. */
static void test_arrivals__count_distribution_follows_poisson_pmf(void)
{
	uint32_t *c = malloc(N_WINDOWS * sizeof(*c));
	const double nn = 100, window = 1e-3;
	size_t hist[201] = { 0 };
	int bad = 0;

	count_windows(nn * SCH_Q / window, 1, 1, false, window, 1, c, NULL, N_WINDOWS);
	for (size_t i = 0; i < N_WINDOWS; i++)
		if (c[i] <= 200)
			hist[c[i]]++;
	for (int k = 60; k <= 140; k++) {
		double want = sch_poisson_pmf(nn, (uint64_t)k) * N_WINDOWS;
		if (fabs((double)hist[k] - want) > 5 * sqrt(want) + 1)
			bad++;
	}
	CHECK(bad == 0);
	CHECK_REL((double)hist[100] / N_WINDOWS, 0.039860996809148827, 0.05);
	free(c);
}

/* Same seed, same windows: the run is reproducible. */
static void test_arrivals__same_seed_same_windows(void)
{
	uint32_t a[1000], b[1000];

	count_windows(3e-15, 1, 1, false, 1e-4, 3, a, NULL, 1000);
	count_windows(3e-15, 1, 1, false, 1e-4, 3, b, NULL, 1000);
	CHECK(memcmp(a, b, sizeof(a)) == 0);
}

CHECK_MAIN(CASE(test_arrivals__poisson_counts_have_mean_variance_and_p0_of_poisson),
	   CASE(test_arrivals__counts_do_not_depend_on_the_bin_size),
	   CASE(test_arrivals__avalanche_electrons_have_mean_nm_and_variance_nm2f),
	   CASE(test_arrivals__avalanche_below_unit_excess_is_refused), CASE(test_arrivals__renewal_counts_have_fano_factor),
	   CASE(test_arrivals__negative_current_gives_negative_charge), CASE(test_arrivals__moments_match_two_pass_values),
	   CASE(test_arrivals__poisson_and_gaussian_reference_values),
	   CASE(test_arrivals__count_distribution_follows_poisson_pmf), CASE(test_arrivals__same_seed_same_windows))
