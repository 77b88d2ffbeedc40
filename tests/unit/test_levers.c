/* SPDX-License-Identifier: BSD-3-Clause */
/* test_levers.c - the avalanche gain optimum of levers against the receiver's closed form. */
#include "check.h"
#include "schrot/levers.h"
#include "schrot/physics.h"

#define Q 1.602176634e-19
#define K 1.380649e-23

/*
 * d/dM of M^2 / (a M^2 F(M) + b) is zero where b (2M) = a M^2 M^2 F'(M) (the quotient rule with
 * the M^2 terms cancelled): 2b = a M^3 F'(M), F'(M) = k + (1 - k)/M^2 (McIntyre's F, row A1).
 * Solved here by bisection, independently of the scan and golden-section search under test.
 */
static double root_of_derivative(double a, double b, double k)
{
	double lo = 1, hi = 1e4;
	for (int i = 0; i < 200; i++) {
		double m = sqrt(lo * hi);
		double g = a * m * m * m * (k + (1 - k) / (m * m)) - 2 * b;
		if (g > 0)
			hi = m;
		else
			lo = m;
	}
	return sqrt(lo * hi);
}

/*
 * [A8] I_p = 10 nA, R_L = 10 kOhm, B = 1 MHz, 300 K, k = 0.02: SNR = M^2 I_p^2 / (2q I_p M^2 F B +
 * 4kTB/R_L) (Kumar & Deen, Fiber Optic Communications, Wiley 2014, eqs. (5.73) and (5.76)).
 */
static void test_levers__gain_optimum_of_the_receiver_form(void)
{
	double a = 2 * Q * 10e-9 * 1e6, b = 4 * K * 300 * 1e6 / 10e3;
	double m = sch_levers_gain_opt(a, b, 0.02, 1e4);

	CHECK_REL(m, root_of_derivative(a, b, 0.02), 1e-6);
	CHECK_REL(m, 36.8157448, 1e-6); /* the e2e test's numerical optimum of the same form */
	/* a larger fixed noise pushes the optimum up, as M_opt ~ (b / (a k))^(1/3) for large M */
	CHECK(sch_levers_gain_opt(a, 8 * b, 0.02, 1e4) > 1.8 * m);
	CHECK_REL(sch_levers_gain_opt(a, b, 0.2, 1e4), root_of_derivative(a, b, 0.2), 1e-6);
}

/* k = 0: F -> 2, SNR rises with M towards 1/(2a): no finite optimum. No fixed noise: M = 1. */
static void test_levers__no_finite_optimum_without_k(void)
{
	CHECK(isnan(sch_levers_gain_opt(1e-12, 1e-15, 0, 1e4)));
	CHECK_REL(sch_levers_gain_opt(1e-12, 0, 0.02, 1e4), 1.0, 1e-3);
	CHECK(isnan(sch_levers_gain_opt(0, 1e-15, 0.02, 1e4)));
}

static void test_levers__kind_names(void)
{
	CHECK_STR(sch_lever_kind_name(SCH_LEVER_RESISTANCE), "resistance");
	CHECK_STR(sch_lever_kind_name(SCH_LEVER_CAPACITANCE), "capacitance");
	CHECK_STR(sch_lever_kind_name(SCH_LEVER_CURRENT), "current");
	CHECK_STR(sch_lever_kind_name(SCH_LEVER_TEMPERATURE), "temperature");
	CHECK_STR(sch_lever_kind_name(SCH_LEVER_GAIN), "gain");
}

CHECK_MAIN(CASE(test_levers__gain_optimum_of_the_receiver_form), CASE(test_levers__no_finite_optimum_without_k),
	   CASE(test_levers__kind_names))
