/* SPDX-License-Identifier: BSD-3-Clause */
/* spectra.c - band integration of power densities (piecewise power law) and log-log spot values. */
#include <math.h>
#include "schrot/spectra.h"

/*
 * Integral over [a, b] of a segment through (f0, p0) and (f1, p1), a power law p = p0 (f/f0)^s
 * when both ends are positive, else a straight line.
 */
static double segment_power(double f0, double p0, double f1, double p1, double a, double b)
{
	if (b <= a)
		return 0.0;
	/* a row that removes noise (negative throughout) integrates as the mirror of its magnitude */
	if (p0 < 0 && p1 < 0)
		return -segment_power(f0, -p0, f1, -p1, a, b);
	if (p0 > 0 && p1 > 0 && f0 > 0 && f1 > f0) {
		double s = log(p1 / p0) / log(f1 / f0);
		double e = s + 1.0;
		if (fabs(e) < 1e-12)
			return p0 * f0 * log(b / a);
		/* p0 f0^-s (b^e - a^e)/e, written to stay accurate for steep slopes */
		return p0 * f0 / e * (pow(b / f0, e) - pow(a / f0, e));
	}
	{
		double slope = (p1 - p0) / (f1 - f0);
		double pa = p0 + slope * (a - f0);
		double pb = p0 + slope * (b - f0);
		return 0.5 * (pa + pb) * (b - a);
	}
}

double sch_spectra_band_power(const double *freq, const double *psd, size_t n, double f1, double f2)
{
	double sum = 0.0;

	if (n < 2 || !(f2 > f1))
		return 0.0;
	for (size_t i = 0; i + 1 < n; i++) {
		double a = freq[i] > f1 ? freq[i] : f1;
		double b = freq[i + 1] < f2 ? freq[i + 1] : f2;
		if (b > a)
			sum += segment_power(freq[i], psd[i], freq[i + 1], psd[i + 1], a, b);
	}
	return sum;
}

double sch_spectra_at(const double *freq, const double *psd, size_t n, double f)
{
	if (n == 0 || !(f >= freq[0] * (1 - 1e-12)) || !(f <= freq[n - 1] * (1 + 1e-12)))
		return NAN;
	if (n == 1)
		return psd[0];
	for (size_t i = 0; i + 1 < n; i++) {
		double f0 = freq[i], f1 = freq[i + 1];
		if (f > f1 && i + 2 < n)
			continue;
		if (f <= f0)
			return psd[i];
		if (f >= f1)
			return psd[i + 1];
		if (f0 > 0 && ((psd[i] > 0 && psd[i + 1] > 0) || (psd[i] < 0 && psd[i + 1] < 0))) {
			double t = log(f / f0) / log(f1 / f0);
			return copysign(exp(log(fabs(psd[i])) + t * (log(fabs(psd[i + 1])) - log(fabs(psd[i])))), psd[i]);
		}
		return psd[i] + (psd[i + 1] - psd[i]) * (f - f0) / (f1 - f0);
	}
	return psd[n - 1];
}
