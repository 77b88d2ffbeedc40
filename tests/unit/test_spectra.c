/* SPDX-License-Identifier: BSD-3-Clause */
/* test_spectra.c - band integration and interpolation against closed forms. */
#include <math.h>
#include <stdlib.h>
#include "check.h"
#include "schrot/spectra.h"

static void test_spectra__integrates_flat_psd_exactly(void)
{
	double f[] = { 1, 10, 100, 1000 }, p[] = { 2, 2, 2, 2 };
	CHECK_REL(sch_spectra_band_power(f, p, 4, 1, 1000), 2 * 999, 1e-14);
	CHECK_REL(sch_spectra_band_power(f, p, 4, 5, 50), 2 * 45, 1e-14);
	/* brick-wall band clipped to the data */
	CHECK_REL(sch_spectra_band_power(f, p, 4, 0.1, 1e6), 2 * 999, 1e-14);
}

static void test_spectra__integrates_power_laws_exactly(void)
{
	double f[] = { 1, 10, 100 }, p1[] = { 1, 0.1, 0.01 }, p2[] = { 1, 100, 1e4 };
	/* 1/f: integral = ln(f2/f1) */
	CHECK_REL(sch_spectra_band_power(f, p1, 3, 1, 100), log(100.0), 1e-13);
	/* f^2: (b^3 - a^3)/3 */
	CHECK_REL(sch_spectra_band_power(f, p2, 3, 2, 50), (125000.0 - 8.0) / 3.0, 1e-13);
}

/*
 * Single-pole noise bandwidth (pi/2) f_3dB: T. J. Sobering, "Equivalent Noise Bandwidth",
 * SDE Consulting Technote 1 (1991, rev. 2008), eqs. (1)-(3) [CHECK-VALUES K9].
 */
static void test_spectra__single_pole_noise_bandwidth(void)
{
	const size_t n = 100 * 12 + 1;
	const double fc = 159154.943; /* 1/(2 pi 1 Mohm 1 pF) */
	double *f = malloc(n * sizeof(*f)), *p = malloc(n * sizeof(*p));
	for (size_t i = 0; i < n; i++) {
		f[i] = pow(10.0, -2.0 + i / 100.0);
		p[i] = 1.0 / (1.0 + (f[i] / fc) * (f[i] / fc));
	}
	/* 100 points per decade: power-law segments are within 5e-5 at the corner */
	CHECK_REL(sch_spectra_band_power(f, p, n, f[0], f[n - 1]), M_PI / 2 * fc, 5e-5);
	free(f);
	free(p);
}

static void test_spectra__interpolates_log_log(void)
{
	double f[] = { 1, 100 }, p[] = { 1, 1e-4 };
	CHECK_REL(sch_spectra_at(f, p, 2, 10), 1e-2, 1e-13);
	CHECK(isnan(sch_spectra_at(f, p, 2, 1000)));
	CHECK_REL(sch_spectra_at(f, p, 2, 100), 1e-4, 1e-15);
}

/* A row that removes noise must cancel the row it corrects exactly (same power law, opposite sign). */
static void test_spectra__negative_row_mirrors_its_magnitude(void)
{
	double f[] = { 1, 10, 100 }, p[] = { 1, 0.1, 0.01 }, n[] = { -1, -0.1, -0.01 };
	CHECK_REL(sch_spectra_band_power(f, n, 3, 1, 100), -log(100.0), 1e-13);
	CHECK_REL(sch_spectra_band_power(f, n, 3, 2, 50) + sch_spectra_band_power(f, p, 3, 2, 50), 0.0, 1e-15);
	CHECK_REL(sch_spectra_at(f, n, 3, sqrt(10.0)), -pow(10.0, -0.5), 1e-13);
}

CHECK_MAIN(CASE(test_spectra__integrates_flat_psd_exactly), CASE(test_spectra__negative_row_mirrors_its_magnitude), CASE(test_spectra__integrates_power_laws_exactly),
	   CASE(test_spectra__single_pole_noise_bandwidth), CASE(test_spectra__interpolates_log_log))
