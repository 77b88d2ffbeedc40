/* SPDX-License-Identifier: BSD-3-Clause */
/* physics.c - closed forms of shot, thermal, avalanche and junction noise (single-sided densities). */
#include <math.h>
#include "schrot/physics.h"

double sch_shot_density(double current_a, double gain)
{
	return 2.0 * SCH_Q * fabs(current_a) * gain;
}

double sch_thermal_density(double temp_k, double resistance_ohm)
{
	return 4.0 * SCH_K * temp_k / resistance_ohm;
}

double sch_mcintyre_f(double gain_m, double k_ratio)
{
	return k_ratio * gain_m + (1.0 - k_ratio) * (2.0 - 1.0 / gain_m);
}

double sch_junction_density(double v_j, double i_j, double g_j, double temp_k)
{
	double x = SCH_Q * v_j / (2.0 * SCH_K * temp_k);

	/*
	 * 2q I coth(x) has the finite limit 4kT g_j at x = 0; below |x| = 1e-6 the limit is exact to
	 * about 1e-12 relative, and the division would only add rounding.
	 */
	if (fabs(x) < 1e-6)
		return 4.0 * SCH_K * temp_k * g_j;
	return 2.0 * SCH_Q * i_j / tanh(x);
}

double sch_crossover_current(double temp_k, double resistance_ohm)
{
	return 2.0 * SCH_K * temp_k / (SCH_Q * resistance_ohm);
}
