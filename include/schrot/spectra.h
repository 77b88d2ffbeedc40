/* SPDX-License-Identifier: BSD-3-Clause */
/* spectra.h - band integration and spot values of power spectral densities. */
#ifndef SCH_SPECTRA_H
#define SCH_SPECTRA_H

#include <stddef.h>

/*
 * Integral of psd over [f1, f2] (clipped to the data's range), the psd taken as a power law
 * between adjacent points (straight in log-log), which is exact for straight segments. Segments
 * with a zero or negative end are integrated linearly. freq must be increasing and positive.
 * Returns 0 for n < 2 or an empty band.
 */
double sch_spectra_band_power(const double *freq, const double *psd, size_t n, double f1, double f2);

/* psd at f by log-log interpolation (linear where an end is <= 0); NaN outside the data. */
double sch_spectra_at(const double *freq, const double *psd, size_t n, double f);

#endif
