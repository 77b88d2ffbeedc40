/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * rng.h - the pseudo-random generator behind every time-domain realisation: xoshiro256** seeded
 * through splitmix64, with the few distributions the arrival processes need. Same seed and
 * stream, same numbers, on every platform.
 */
#ifndef SCH_RNG_H
#define SCH_RNG_H

#include <stdint.h>

/*
 * xoshiro256** 1.0 (D. Blackman and S. Vigna, "Scrambled linear pseudorandom number generators",
 * ACM Trans. Math. Softw. 47(4), 36 (2021); reference code at https://prng.di.unimi.it/).
 * Members are the generator's state; callers do not touch them.
 */
struct sch_rng {
	uint64_t s[4];
};

/*
 * Seeds rng for one (seed, stream) pair: the four state words are the next outputs of
 * splitmix64 started at seed ^ (stream * golden ratio constant), so different streams of one seed
 * (one per carrier) are unrelated sequences. This function can't fail.
 */
void sch_rng_init(struct sch_rng *rng, uint64_t seed, uint64_t stream);

/* The next 64 random bits. */
uint64_t sch_rng_next(struct sch_rng *rng);

/* Uniform on the open interval (0, 1), 53 bits of resolution. */
double sch_rng_uniform(struct sch_rng *rng);

/* Standard normal (Box-Muller, one value per call). */
double sch_rng_normal(struct sch_rng *rng);

/* Exponential with mean 1. */
double sch_rng_exponential(struct sch_rng *rng);

/*
 * Gamma with the given shape (> 0) and scale 1: G. Marsaglia and W. W. Tsang, "A simple method for
 * generating gamma variables", ACM Trans. Math. Softw. 26(3), 363-372 (2000); shape < 1 through
 * Gamma(shape + 1) * U^(1/shape). Returns 0 for a shape that is not positive.
 */
double sch_rng_gamma(struct sch_rng *rng, double shape);

/*
 * Poisson with the given mean (>= 0): multiplication of uniforms below 10, W. Hoermann's
 * transformed rejection PTRS above ("The transformed rejection method for generating Poisson
 * random variables", Insurance: Mathematics and Economics 12, 39-45 (1993); citation and constants
 * from memory, checked by the moment and histogram tests). Means above 1e15
 * use the normal approximation rounded to an integer (relative error below 1e-7).
 */
uint64_t sch_rng_poisson(struct sch_rng *rng, double mean);

#endif
