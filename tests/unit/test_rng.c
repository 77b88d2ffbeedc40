/* SPDX-License-Identifier: BSD-3-Clause */
/* test_rng.c - facts about the pseudo-random generator (rng.h): known outputs, ranges, moments. */
#include <math.h>
#include <stdint.h>
#include "check.h"
#include "schrot/rng.h"

/*
 * xoshiro256** from the state {1, 2, 3, 4}: the first ten outputs of the reference algorithm
 * (Blackman & Vigna, ACM TOMS 47(4), 36 (2021)). The list is the one the rand_xoshiro crate's
 * tests use (from memory); an independent Python implementation gives the same ten numbers.
 */
static void test_rng__xoshiro256starstar_matches_reference_outputs(void)
{
	static const uint64_t want[10] = { 11520u, 0u, 1509978240u, 1215971899390074240u, 1216172134540287360u,
					   607988272756665600u, 16172922978634559625u, 8476171486693032832u,
					   10595114339597558777u, 2904607092377533576u };
	struct sch_rng r = { { 1, 2, 3, 4 } };

	for (int i = 0; i < 10; i++)
		CHECK(sch_rng_next(&r) == want[i]);
}

/*
 * Seeding: the state is splitmix64's output from seed ^ stream * 0x9e3779b97f4a7c15. For seed 0,
 * stream 0 the first splitmix64 outputs are 0xe220a8397b1dcdaf, 0x6e789e6aa1b965f4,
 * 0x06c45d188009454f (S. Vigna's reference splitmix64.c; values from memory, confirmed by an
 * independent Python implementation).
 */
static void test_rng__seeding_is_splitmix64(void)
{
	struct sch_rng r;

	sch_rng_init(&r, 0, 0);
	CHECK(r.s[0] == 0xe220a8397b1dcdafull);
	CHECK(r.s[1] == 0x6e789e6aa1b965f4ull);
	CHECK(r.s[2] == 0x06c45d188009454full);
	/* seed 1, stream 0 and seed 42, stream 3 (independent Python implementation) */
	sch_rng_init(&r, 1, 0);
	CHECK(sch_rng_next(&r) == 0xb3f2af6d0fc710c5ull);
	CHECK(sch_rng_next(&r) == 0x853b559647364ceaull);
	sch_rng_init(&r, 42, 3);
	CHECK(sch_rng_next(&r) == 0x6a415ec317ec9285ull);
}

static void test_rng__same_seed_same_numbers_other_stream_other_numbers(void)
{
	struct sch_rng a, b, c;
	int same = 0;

	sch_rng_init(&a, 7, 0);
	sch_rng_init(&b, 7, 0);
	sch_rng_init(&c, 7, 1);
	for (int i = 0; i < 1000; i++) {
		uint64_t x = sch_rng_next(&a);
		CHECK(x == sch_rng_next(&b));
		same += x == sch_rng_next(&c);
	}
	CHECK(same == 0);
}

static void test_rng__uniform_stays_inside_the_open_interval(void)
{
	struct sch_rng r;
	double sum = 0, lo = 1, hi = 0;
	const int n = 1000000;

	sch_rng_init(&r, 3, 0);
	for (int i = 0; i < n; i++) {
		double u = sch_rng_uniform(&r);
		sum += u;
		lo = fmin(lo, u);
		hi = fmax(hi, u);
	}
	CHECK(lo > 0 && hi < 1);
	/* mean 1/2, sd of the mean sqrt(1/12/n) = 2.9e-4: five of them */
	CHECK(fabs(sum / n - 0.5) < 5 * sqrt(1.0 / 12 / n));
}

/* Sample mean and variance of n draws of f. */
static void moments(double (*f)(struct sch_rng *, double), double arg, int n, double *mean, double *var)
{
	struct sch_rng r;
	double s = 0, s2 = 0;

	sch_rng_init(&r, 11, 5);
	for (int i = 0; i < n; i++) {
		double x = f(&r, arg);
		s += x;
		s2 += x * x;
	}
	*mean = s / n;
	*var = (s2 - s * s / n) / (n - 1);
}

static double poisson_draw(struct sch_rng *r, double mean)
{
	return (double)sch_rng_poisson(r, mean);
}

/*
 * Poisson draws: mean = variance = N (CHECK-VALUES.md N1, "standard Poisson properties"),
 * within five standard errors: sd(mean) = sqrt(N/n), sd(var) = sqrt((N + 2N^2)/n).
 */
static void test_rng__poisson_mean_equals_variance(void)
{
	static const double means[] = { 0.3, 1, 4, 9.5, 10.5, 30, 100, 1e4, 1e7 };
	const int n = 400000;

	for (size_t k = 0; k < sizeof(means) / sizeof(means[0]); k++) {
		double mu = means[k], m, v;
		moments(poisson_draw, mu, n, &m, &v);
		CHECK(fabs(m - mu) < 5 * sqrt(mu / n));
		CHECK(fabs(v - mu) < 5 * sqrt((mu + 2 * mu * mu) / n));
	}
}

/* P(0) = e^-N: CHECK-VALUES.md N2, e^-1 = 0.36787944117144233 (GSL gsl_ran_poisson_pdf(0, 1)). */
static void test_rng__poisson_zero_fraction_is_exp_minus_n(void)
{
	struct sch_rng r;
	const int n = 1000000;
	int zeros = 0;
	const double p = 0.36787944117144233;

	sch_rng_init(&r, 5, 0);
	for (int i = 0; i < n; i++)
		zeros += sch_rng_poisson(&r, 1.0) == 0;
	CHECK(fabs((double)zeros / n - p) < 5 * sqrt(p * (1 - p) / n));
	CHECK(sch_rng_poisson(&r, 0.0) == 0);
	CHECK(sch_rng_poisson(&r, -1.0) == 0);
}

static double gamma_draw(struct sch_rng *r, double shape)
{
	return sch_rng_gamma(r, shape);
}

/* Gamma(shape, 1): mean = variance = shape (Marsaglia & Tsang 2000, section 1). */
static void test_rng__gamma_mean_and_variance_equal_the_shape(void)
{
	static const double shapes[] = { 0.2, 0.5, 1, 3, 50 };
	const int n = 400000;

	for (size_t k = 0; k < sizeof(shapes) / sizeof(shapes[0]); k++) {
		double a = shapes[k], m, v;
		moments(gamma_draw, a, n, &m, &v);
		/* sd(mean) = sqrt(a/n); sd(var) = sqrt((mu4 - a^2)/n), mu4 = 3a^2 + 6a */
		CHECK(fabs(m - a) < 5 * sqrt(a / n));
		CHECK(fabs(v - a) < 5 * sqrt((2 * a * a + 6 * a) / n));
	}
	{
		struct sch_rng r;
		sch_rng_init(&r, 1, 1);
		CHECK(sch_rng_gamma(&r, 0) == 0);
	}
}

static double normal_draw(struct sch_rng *r, double unused)
{
	(void)unused;
	return sch_rng_normal(r);
}

static double exponential_draw(struct sch_rng *r, double unused)
{
	(void)unused;
	return sch_rng_exponential(r);
}

static void test_rng__normal_and_exponential_moments(void)
{
	const int n = 400000;
	double m, v;

	moments(normal_draw, 0, n, &m, &v);
	CHECK(fabs(m) < 5 * sqrt(1.0 / n));
	CHECK(fabs(v - 1) < 5 * sqrt(2.0 / n));
	moments(exponential_draw, 0, n, &m, &v);
	CHECK(fabs(m - 1) < 5 * sqrt(1.0 / n));
	CHECK(fabs(v - 1) < 5 * sqrt(8.0 / n));
}

CHECK_MAIN(CASE(test_rng__xoshiro256starstar_matches_reference_outputs), CASE(test_rng__seeding_is_splitmix64),
	   CASE(test_rng__same_seed_same_numbers_other_stream_other_numbers),
	   CASE(test_rng__uniform_stays_inside_the_open_interval), CASE(test_rng__poisson_mean_equals_variance),
	   CASE(test_rng__poisson_zero_fraction_is_exp_minus_n), CASE(test_rng__gamma_mean_and_variance_equal_the_shape),
	   CASE(test_rng__normal_and_exponential_moments))
