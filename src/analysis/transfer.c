/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * transfer.c - the transfer from the input source to the output: its reference (mid-band) value,
 * the -3 dB points around it and the noise-equivalent bandwidth over the band (guide section 5).
 */
#include <math.h>
#include <stdbool.h>
#include "analysis_int.h"
#include "schrot/spectra.h"

/* |H|^2 within this fraction of its peak counts as the peak (a flat response's rounding). */
#define SCH_FLAT 1e-6

/* The relative slack with which a frequency counts as the simulated range's end. */
#define SCH_FREQ_SLACK 1e-9

/*
 * |H|^2 at f: the simulated point itself where f is one, log-log interpolation otherwise; f is
 * first clamped to the simulated range, whose ends carry the simulator's rounding.
 */
static double gain2_at(const struct sch_result *res, double f)
{
	f = fmin(fmax(f, res->freq_hz[0]), res->freq_hz[res->n_freq - 1]);
	return sch_spectra_at(res->freq_hz, res->gain2, res->n_freq, f);
}

/* True when a and b are the same frequency but for the simulator's rounding. */
static bool same_freq(double a, double b)
{
	return fabs(a - b) <= SCH_FREQ_SLACK * fmax(fabs(a), fabs(b));
}

/*
 * The frequency of largest |H| within the band, the band's ends included (*g2 its |H|^2), the
 * lowest one where |H|^2 comes within SCH_FLAT of the peak; NaN where no point has a finite transfer.
 */
static double peak_in_band(const struct sch_result *res, double *g2)
{
	double best_f = NAN, best = -INFINITY;
	double ends[2] = { res->band_lo_hz, res->band_hi_hz };

	for (size_t i = 0; i < res->n_freq; i++) {
		double f = res->freq_hz[i];
		if (f < res->band_lo_hz || f > res->band_hi_hz || same_freq(f, res->band_lo_hz) ||
		    same_freq(f, res->band_hi_hz) || !(res->gain2[i] > best))
			continue; /* the band's ends are taken as asked, below */
		best = res->gain2[i];
		best_f = f;
	}
	for (int k = 0; k < 2; k++) {
		double g = gain2_at(res, ends[k]);
		if (g > best) {
			best = g;
			best_f = ends[k];
		}
	}
	/* a flat response peaks anywhere by rounding: take the lowest frequency within 1e-6 of the peak */
	if (res->band_lo_hz < best_f && gain2_at(res, res->band_lo_hz) >= best * (1 - SCH_FLAT)) {
		*g2 = gain2_at(res, res->band_lo_hz);
		return res->band_lo_hz;
	}
	for (size_t i = 0; i < res->n_freq; i++) {
		double f = res->freq_hz[i];
		if (f > res->band_lo_hz && f < best_f && !same_freq(f, res->band_lo_hz) && res->gain2[i] >= best * (1 - SCH_FLAT)) {
			*g2 = res->gain2[i];
			return f;
		}
	}
	*g2 = best;
	return best_f;
}

/* Where |H|^2 passes level between (fa, ga) and (fb, gb): log-log, linear where an end is <= 0. */
static double crossing(double fa, double ga, double fb, double gb, double level)
{
	if (ga > 0 && gb > 0) {
		double t = (log(level) - log(ga)) / (log(gb) - log(ga));
		return exp(log(fa) + t * (log(fb) - log(fa)));
	}
	return fa + (level - ga) / (gb - ga) * (fb - fa);
}

/*
 * The first frequency from ref_hz in direction step (+1 up, -1 down) where |H|^2 falls below
 * level; NaN when it does not inside the simulated range.
 */
static double edge(const struct sch_result *res, double ref_hz, double ref_g2, double level, int step)
{
	double fa = ref_hz, ga = ref_g2;
	size_t n = res->n_freq;

	for (size_t k = 0; k < n; k++) {
		size_t i = step > 0 ? k : n - 1 - k;
		double f = res->freq_hz[i], g = res->gain2[i];
		if (step > 0 ? f <= ref_hz : f >= ref_hz)
			continue;
		if (!isfinite(g))
			return NAN;
		if (g < level)
			return crossing(fa, ga, f, g, level);
		fa = f;
		ga = g;
	}
	return NAN;
}

enum sch_err sch_analysis_transfer(struct sch_result *res, const struct sch_run_options *opt, struct sch_diag *d)
{
	struct sch_transfer *t = &res->transfer;
	double lo = res->freq_hz[0], hi = res->freq_hz[res->n_freq - 1];
	double ref_g2;

	t->mid_band = t->ref_hz = t->f_low_hz = t->f_high_hz = t->enbw_hz = NAN;
	if (!isnan(opt->signal_freq_hz)) {
		if (!(opt->signal_freq_hz >= lo * (1 - SCH_FREQ_SLACK) && opt->signal_freq_hz <= hi * (1 + SCH_FREQ_SLACK)))
			return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
					      "signal frequency %.6g Hz is outside the simulated range %.6g:%.6g Hz",
					      opt->signal_freq_hz, res->run_lo_hz, res->run_hi_hz);
		t->ref_hz = opt->signal_freq_hz;
		ref_g2 = gain2_at(res, t->ref_hz);
	} else {
		t->ref_hz = peak_in_band(res, &ref_g2);
	}
	if (!(ref_g2 > 0) || !isfinite(ref_g2))
		return SCH_OK;
	t->mid_band = sqrt(ref_g2);
	t->f_low_hz = edge(res, t->ref_hz, ref_g2, ref_g2 / 2, -1);
	t->f_high_hz = edge(res, t->ref_hz, ref_g2, ref_g2 / 2, +1);
	t->enbw_hz = sch_spectra_band_power(res->freq_hz, res->gain2, res->n_freq, res->band_lo_hz, res->band_hi_hz) /
		     ref_g2;
	return SCH_OK;
}
