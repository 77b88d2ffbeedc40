/* SPDX-License-Identifier: BSD-3-Clause */
/* physics.h - constants and closed forms: shot, thermal, McIntyre excess noise, junction noise. */
#ifndef SCH_PHYSICS_H
#define SCH_PHYSICS_H

/* SI 2019 exact values (BIPM, The International System of Units, 9th ed., 2019). */
#define SCH_Q 1.602176634e-19   /* elementary charge, C */
#define SCH_K 1.380649e-23      /* Boltzmann constant, J/K */
#define SCH_ZERO_C_K 273.15

/* The simulator's own constants (ngspice const.h, CODATA 2014): used only to undo its scaling. */
#define SCH_SIM_Q 1.6021766208e-19
#define SCH_SIM_K 1.38064852e-23

/* Single-sided shot-noise current density 2q|I|G, A^2/Hz. */
double sch_shot_density(double current_a, double gain);

/* Single-sided thermal current density 4kT/R, A^2/Hz. */
double sch_thermal_density(double temp_k, double resistance_ohm);

/* McIntyre's excess noise factor for electron injection: F = kM + (1-k)(2 - 1/M). */
double sch_mcintyre_f(double gain_m, double k_ratio);

/*
 * Junction current density 2q*I_j*coth(qV_j/2kT), A^2/Hz, with its V_j -> 0 limit 4kT*g_j.
 * v_j, i_j, g_j: junction voltage, current and small-signal conductance without GMIN.
 */
double sch_junction_density(double v_j, double i_j, double g_j, double temp_k);

/* Current at which 2qI equals 4kT/R: 2kT/(qR). */
double sch_crossover_current(double temp_k, double resistance_ohm);

#endif
