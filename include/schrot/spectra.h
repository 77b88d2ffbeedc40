/* SPDX-License-Identifier: BSD-3-Clause */
/* spectra.h - band integration and spot values of power spectral densities. */
#ifndef SCH_SPECTRA_H
#define SCH_SPECTRA_H

#include <stddef.h>

/*
 * Integral of psd over [f1, f2] (clipped to the data's range), the psd taken as a power law
 * between adjacent points (straight in log-log), which is exact for straight segments. A segment
 * negative at both ends (a correction that removes noise) is the mirror of its magnitude, so a
 * row and its negative integrate to exactly opposite powers; a segment with a zero end or a sign
 * change is integrated linearly. freq must be increasing and positive.
 * Returns 0 for n < 2 or an empty band.
 */
double sch_spectra_band_power(const double *freq, const double *psd, size_t n, double f1, double f2);

/* psd at f by log-log interpolation of its magnitude (linear where an end is 0 or the sign changes); NaN outside the data. */
double sch_spectra_at(const double *freq, const double *psd, size_t n, double f);

#endif
