/* SPDX-License-Identifier: BSD-3-Clause */
/* test_physics.c - closed forms against published values (shared/CHECK-VALUES.md rows in brackets). */
#include <math.h>
#include "check.h"
#include "schrot/physics.h"

/* [S1-S5] Schottky 2qI: W. Schottky, Ann. Phys. 1918; M. Johnson, Photodetection and Measurement (2003) §3.2. */
static void test_physics__schottky_densities(void)
{
	CHECK_REL(sch_shot_density(1.0, 1), 3.2043533e-19, 1e-7);
	CHECK_REL(sch_shot_density(1e-3, 1), 3.2043533e-22, 1e-7);
	CHECK_REL(sqrt(sch_shot_density(1e-6, 1)), 5.6607007e-13, 1e-7);
	CHECK_REL(sqrt(sch_shot_density(-1e-9, 1)), 1.7900707e-14, 1e-7);
	CHECK_REL(sqrt(sch_shot_density(1e-12, 1)), 5.6607007e-16, 1e-7);
}

/* [J5] Norton current noise 4kT/R: Johnson, Phys. Rev. 32, 97 (1928); Nyquist, Phys. Rev. 32, 110 (1928). */
static void test_physics__johnson_nyquist_current(void)
{
	CHECK_REL(sqrt(sch_thermal_density(300, 1e3)), 4.0703548e-12, 1e-7);
	CHECK_REL(sqrt(sch_thermal_density(300, 1e6)), 128.71592e-15, 1e-7);
	CHECK_REL(sqrt(sch_thermal_density(298.15, 1e3)), 4.0577851e-12, 1e-7);
}

/* [A2-A5] McIntyre, IEEE Trans. Electron Devices ED-13(1), 164 (1966). */
static void test_physics__mcintyre_excess_factor(void)
{
	CHECK_REL(sch_mcintyre_f(10, 0), 1.9, 1e-12);
	CHECK_REL(sch_mcintyre_f(100, 0), 1.99, 1e-12);
	CHECK_REL(sch_mcintyre_f(10, 0.02), 2.062, 1e-12);
	CHECK_REL(sch_mcintyre_f(100, 0.02), 3.9502, 1e-12);
	CHECK_REL(sch_mcintyre_f(10, 0.5), 5.95, 1e-12);
	CHECK_REL(sch_mcintyre_f(100, 0.5), 50.995, 1e-12);
	CHECK_REL(sch_mcintyre_f(10, 1), 10, 1e-12);
	CHECK_REL(sch_mcintyre_f(1, 0.3), 1, 1e-12);
}

/* [P8, P9] van der Ziel, Proc. IEEE 58(8), 1178 (1970) §II; derived identity 4qIs = 4kT/R0 for n = 1. */
static void test_physics__junction_coth_form(void)
{
	const double is = 1e-12, t = 300, vt = SCH_K * t / SCH_Q;
	double v, i, g;

	g = is / vt;
	CHECK_REL(sch_junction_density(0, 0, g, t), 6.4087065e-31, 1e-7);
	v = 0.1;
	i = is * expm1(v / vt);
	CHECK_REL(i, 46.854861e-12, 1e-7);
	CHECK_REL(sch_junction_density(v, i, is / vt * exp(v / vt), t), 1.5654823e-29, 1e-7);
	v = -0.1;
	i = is * expm1(v / vt);
	CHECK_REL(sch_junction_density(v, i, is / vt * exp(v / vt), t), 3.2713131e-31, 1e-7);
	v = -1;
	i = is * expm1(v / vt);
	CHECK_REL(sch_junction_density(v, i, 0, t), 3.2043533e-31, 1e-7);
	/* just off zero bias the coth form joins the limit smoothly */
	v = 1e-9;
	i = is * expm1(v / vt);
	CHECK_REL(sch_junction_density(v, i, g, t), 6.4087065e-31, 1e-7);
}

/* [X2] crossover 2kT/(qR): derived; rule credited to Hobbs, Building Electro-Optical Systems 2nd ed. (from memory). */
static void test_physics__crossover_current(void)
{
	CHECK_REL(sch_crossover_current(300, 1e3), 51.704000e-6, 1e-7);
	CHECK_REL(sch_crossover_current(300, 1e9), 51.704000e-12, 1e-7);
}

CHECK_MAIN(CASE(test_physics__schottky_densities), CASE(test_physics__johnson_nyquist_current),
	   CASE(test_physics__mcintyre_excess_factor), CASE(test_physics__junction_coth_form),
	   CASE(test_physics__crossover_current))
