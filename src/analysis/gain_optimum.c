/* SPDX-License-Identifier: BSD-3-Clause */
/* gain_optimum.c - the avalanche gain that maximises SNR against a fixed noise (McIntyre excess noise). */
#include <math.h>
#include "schrot/levers.h"
#include "schrot/physics.h"

double sch_levers_snr_shape(double m, double a, double b, double k)
{
	return m * m / (a * m * m * sch_mcintyre_f(m, k) + b);
}

double sch_levers_gain_opt(double a, double b, double k, double m_max)
{
	enum { N = 2000 };
	double best = -1, lo, hi;
	size_t at = 0;

	if (!(a > 0) || !(b >= 0) || !(k > 0) || !(m_max > 1))
		return NAN;
	for (size_t i = 0; i <= N; i++) {
		double m = exp(log(m_max) * (double)i / N);
		double s = sch_levers_snr_shape(m, a, b, k);
		if (s > best) {
			best = s;
			at = i;
		}
	}
	if (at == N)
		return NAN;
	lo = log(m_max) * (double)(at ? at - 1 : 0) / N;
	hi = log(m_max) * (double)(at + 1) / N;
	for (int it = 0; it < 100; it++) { /* golden section in log M: the shape has one maximum */
		double x1 = hi - 0.6180339887498949 * (hi - lo), x2 = lo + 0.6180339887498949 * (hi - lo);
		if (sch_levers_snr_shape(exp(x1), a, b, k) < sch_levers_snr_shape(exp(x2), a, b, k))
			lo = x1;
		else
			hi = x2;
	}
	return exp((lo + hi) / 2);
}
