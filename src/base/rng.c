/* SPDX-License-Identifier: BSD-3-Clause */
/* rng.c - xoshiro256** with splitmix64 seeding, and normal, exponential, gamma and Poisson variates. */
#include <math.h>
#include "schrot/rng.h"

/* splitmix64 (S. Vigna, public domain reference code at https://prng.di.unimi.it/splitmix64.c). */
static uint64_t splitmix64(uint64_t *x)
{
	uint64_t z = (*x += 0x9e3779b97f4a7c15ull);

	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ull;
	z = (z ^ (z >> 27)) * 0x94d049bb133111ebull;
	return z ^ (z >> 31);
}

static uint64_t rotl(uint64_t x, int k)
{
	return (x << k) | (x >> (64 - k));
}

void sch_rng_init(struct sch_rng *rng, uint64_t seed, uint64_t stream)
{
	uint64_t x = seed ^ (stream * 0x9e3779b97f4a7c15ull);

	for (int i = 0; i < 4; i++)
		rng->s[i] = splitmix64(&x);
}

uint64_t sch_rng_next(struct sch_rng *rng)
{
	uint64_t *s = rng->s;
	const uint64_t result = rotl(s[1] * 5, 7) * 9;
	const uint64_t t = s[1] << 17;

	s[2] ^= s[0];
	s[3] ^= s[1];
	s[1] ^= s[2];
	s[0] ^= s[3];
	s[2] ^= t;
	s[3] = rotl(s[3], 45);
	return result;
}

double sch_rng_uniform(struct sch_rng *rng)
{
	/* (k + 0.5) / 2^53 for the top 53 bits: never 0, never 1 */
	return ((double)(sch_rng_next(rng) >> 11) + 0.5) * 0x1.0p-53;
}

double sch_rng_normal(struct sch_rng *rng)
{
	double u = sch_rng_uniform(rng), v = sch_rng_uniform(rng);

	return sqrt(-2.0 * log(u)) * cos(2.0 * M_PI * v);
}

double sch_rng_exponential(struct sch_rng *rng)
{
	return -log(sch_rng_uniform(rng));
}

double sch_rng_gamma(struct sch_rng *rng, double shape)
{
	double d, c;

	if (!(shape > 0))
		return 0.0;
	if (shape < 1.0)
		return sch_rng_gamma(rng, shape + 1.0) * pow(sch_rng_uniform(rng), 1.0 / shape);
	d = shape - 1.0 / 3.0;
	c = 1.0 / sqrt(9.0 * d);
	for (;;) {
		double x, v, u;

		do {
			x = sch_rng_normal(rng);
			v = 1.0 + c * x;
		} while (v <= 0);
		v = v * v * v;
		u = sch_rng_uniform(rng);
		if (u < 1.0 - 0.0331 * x * x * x * x)
			return d * v;
		if (log(u) < 0.5 * x * x + d * (1.0 - v + log(v)))
			return d * v;
	}
}

/* Hoermann's PTRS for mean >= 10. */
static uint64_t poisson_ptrs(struct sch_rng *rng, double mean)
{
	const double slam = sqrt(mean), loglam = log(mean);
	const double b = 0.931 + 2.53 * slam;
	const double a = -0.059 + 0.02483 * b;
	const double invalpha = 1.1239 + 1.1328 / (b - 3.4);
	const double vr = 0.9277 - 3.6224 / (b - 2);

	for (;;) {
		double u = sch_rng_uniform(rng) - 0.5, v = sch_rng_uniform(rng);
		double us = 0.5 - fabs(u);
		double k = floor((2 * a / us + b) * u + mean + 0.43);

		if (us >= 0.07 && v <= vr)
			return (uint64_t)k;
		if (k < 0 || (us < 0.013 && v > us))
			continue;
		if (log(v) + log(invalpha) - log(a / (us * us) + b) <= -mean + k * loglam - lgamma(k + 1))
			return (uint64_t)k;
	}
}

uint64_t sch_rng_poisson(struct sch_rng *rng, double mean)
{
	if (!(mean > 0))
		return 0;
	if (mean < 10) {
		const double limit = exp(-mean);
		double prod = sch_rng_uniform(rng);
		uint64_t k = 0;

		while (prod > limit) {
			k++;
			prod *= sch_rng_uniform(rng);
		}
		return k;
	}
	if (mean > 1e15) {
		double k = floor(mean + sqrt(mean) * sch_rng_normal(rng) + 0.5);
		return k > 0 ? (uint64_t)k : 0;
	}
	return poisson_ptrs(rng, mean);
}
