/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * integrate.c - the rows' spectra over the band: band powers, shares and ranking, the total
 * referred to the input through the transfer (rms, NEP, SNR), and the densities at the spots.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "analysis_int.h"
#include "schrot/spectra.h"

/* The simulated range, its ends as the run asked for them. */
struct sim_range {
	double lo, hi;
};

static int by_band_power(const void *pa, const void *pb)
{
	const struct sch_contribution *a = pa, *b = pb;
	if (a->band_power > b->band_power)
		return -1;
	if (a->band_power < b->band_power)
		return 1;
	return strcmp(a->device, b->device);
}

/* Sets res's band from opt, within the simulated range (*range). SCH_ERR_USAGE outside it. */
static enum sch_err take_band(struct sch_result *res, const struct sch_run_options *opt, struct sim_range *range,
			      struct sch_diag *d)
{
	size_t nf = res->n_freq;
	double lo = res->freq_hz[0], hi = res->freq_hz[nf - 1];

	/* the simulator's own frequency points carry rounding (99999.99999999904): report the range asked for */
	if (fabs(lo - res->run_lo_hz) <= 1e-9 * res->run_lo_hz)
		lo = res->run_lo_hz;
	if (fabs(hi - res->run_hi_hz) <= 1e-9 * res->run_hi_hz)
		hi = res->run_hi_hz;
	range->lo = lo;
	range->hi = hi;
	res->band_lo_hz = isnan(opt->band_lo_hz) ? lo : opt->band_lo_hz;
	res->band_hi_hz = isnan(opt->band_hi_hz) ? hi : opt->band_hi_hz;
	if (res->band_lo_hz < lo * (1 - 1e-9) || res->band_hi_hz > hi * (1 + 1e-9))
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0,
				      "band %g:%g Hz is outside the simulated range %g:%g Hz (widen .noise or --freq)",
				      res->band_lo_hz, res->band_hi_hz, lo, hi);
	return SCH_OK;
}

/*
 * Each row's band power; returns their sum. A spot run has no band: its rows are weighed by their
 * density at the one frequency (V^2/Hz) for shares, ranking and the verdict, and blank_band
 * clears the band figures afterwards.
 */
static double band_powers(struct sch_result *res)
{
	double total = 0;

	for (size_t c = 0; c < res->n_contributions; c++) {
		struct sch_contribution *ct = &res->contributions[c];
		ct->band_power = res->spot_run ? ct->psd[0] :
						 sch_spectra_band_power(res->freq_hz, ct->psd, res->n_freq,
									res->band_lo_hz, res->band_hi_hz);
		total += ct->band_power;
	}
	return total;
}

/*
 * A correction too small to matter next to its device's simulator row would only clutter: drops
 * those rows and returns total less their power.
 */
static double drop_tiny_corrections(struct sch_result *res, double total)
{
	size_t keep = 0;

	for (size_t c = 0; c < res->n_contributions; c++) {
		struct sch_contribution *ct = &res->contributions[c];
		if (ct->origin == SCH_ORIGIN_CORRECTION && fabs(ct->band_power) < 1e-9 * fabs(total)) {
			total -= ct->band_power;
			continue;
		}
		res->contributions[keep++] = *ct;
	}
	res->n_contributions = keep;
	return total;
}

/* The total and the carriers' band power, the total density, and each row's share and rms. */
static void sum_rows(struct sch_result *res, double total)
{
	size_t nf = res->n_freq;

	res->total_power_v2 = total;
	res->output_rms_v = sqrt(fabs(total));
	memset(res->total_psd, 0, nf * sizeof(double));
	res->carrier_power_v2 = 0;
	for (size_t c = 0; c < res->n_contributions; c++) {
		struct sch_contribution *ct = &res->contributions[c];
		for (size_t i = 0; i < nf; i++)
			res->total_psd[i] += ct->psd[i];
		ct->share = total != 0 ? ct->band_power / total : 0;
		/* signed: a row that removes noise shows it in every output */
		ct->output_rms_v = copysign(sqrt(fabs(ct->band_power)), ct->band_power);
		if (ct->origin == SCH_ORIGIN_ADDED)
			res->carrier_power_v2 += ct->band_power;
	}
}

/* True when a responsivity turns the input-referred current into optical power (NEP). */
static bool has_nep(const struct sch_result *res, const struct sch_run_options *opt)
{
	return !isnan(opt->responsivity_a_per_w) && strcmp(res->input_unit, "A") == 0;
}

/*
 * The total's density referred to the input through the squared gain (*input_psd, in res->arena,
 * for the spots); the band's figures through the transfer as designers sign them: input-referred
 * rms = output rms / mid-band transfer, SNR at the output, NEP over the noise-equivalent bandwidth.
 * SCH_ERR_NOMEM.
 */
static enum sch_err refer_to_input(struct sch_result *res, const struct sch_run_options *opt, double **input_psd)
{
	size_t nf = res->n_freq;
	double *psd = sch_arena_alloc(&res->arena, nf * sizeof(double));
	const struct sch_transfer *t = &res->transfer;

	if (!psd)
		return SCH_ERR_NOMEM;
	for (size_t i = 0; i < nf; i++)
		psd[i] = res->gain2[i] > 0 ? res->total_psd[i] / res->gain2[i] : 0;
	res->input_rms = res->output_rms_v / t->mid_band;
	res->responsivity_a_per_w = opt->responsivity_a_per_w;
	res->signal = opt->signal;
	res->nep_band_w_per_rthz = NAN;
	res->input_gain_m = sch_analysis_input_gain(res);
	*input_psd = psd;
	if (res->spot_run) { /* no band: the spots carry the figures */
		res->input_rms = NAN;
		return SCH_OK;
	}
	if (has_nep(res, opt) && t->enbw_hz > 0)
		res->nep_band_w_per_rthz = res->input_rms / sqrt(t->enbw_hz) / (opt->responsivity_a_per_w * res->input_gain_m);
	if (!isnan(opt->signal) && res->total_power_v2 > 0) {
		double out_signal = opt->signal * t->mid_band;
		res->snr = out_signal * out_signal / res->total_power_v2;
	}
	return SCH_OK;
}

/*
 * The total's output and input densities at each spot frequency, and each row's. SCH_ERR_USAGE
 * for a spot outside the simulated range, SCH_ERR_NOMEM.
 */
static enum sch_err take_spots(struct sch_result *res, const struct sch_run_options *opt, const double *input_psd,
			       const struct sim_range *range, struct sch_diag *d)
{
	struct sch_arena *a = &res->arena;
	size_t nf = res->n_freq;
	/* a spot run without --spot reports its one frequency */
	const double *spots_hz = opt->n_spots || !res->spot_run ? opt->spots_hz : &range->lo;
	size_t n_spots = opt->n_spots || !res->spot_run ? opt->n_spots : 1;

	res->n_spots = n_spots;
	res->spots = sch_arena_alloc(a, (n_spots + 1) * sizeof(*res->spots));
	if (!res->spots)
		return SCH_ERR_NOMEM;
	for (size_t s = 0; s < n_spots; s++) {
		struct sch_spot *sp = &res->spots[s];
		double f = spots_hz[s];
		if (!(f >= range->lo * (1 - 1e-9) && f <= range->hi * (1 + 1e-9)))
			return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "spot frequency %g Hz is outside the simulated range %g:%g Hz",
					      f, range->lo, range->hi);
		sp->freq_hz = f;
		sp->output_v_per_rthz = sqrt(fabs(sch_spectra_at(res->freq_hz, res->total_psd, nf, f)));
		sp->input_per_rthz = sqrt(fabs(sch_spectra_at(res->freq_hz, input_psd, nf, f)));
		sp->nep_w_per_rthz = NAN;
		if (has_nep(res, opt))
			sp->nep_w_per_rthz = sp->input_per_rthz / (opt->responsivity_a_per_w * res->input_gain_m);
	}
	for (size_t c = 0; c < res->n_contributions; c++) {
		struct sch_contribution *ct = &res->contributions[c];
		ct->spot_density = sch_arena_alloc(a, (n_spots + 1) * sizeof(double));
		if (!ct->spot_density)
			return SCH_ERR_NOMEM;
		for (size_t s = 0; s < n_spots; s++) {
			double psd = sch_spectra_at(res->freq_hz, ct->psd, nf, spots_hz[s]);
			ct->spot_density[s] = copysign(sqrt(fabs(psd)), psd);
		}
	}
	return SCH_OK;
}

/* A spot run has no band: once shares and the verdict are taken, its band figures are NaN. */
static void blank_band(struct sch_result *res)
{
	if (!res->spot_run)
		return;
	for (size_t c = 0; c < res->n_contributions; c++) {
		res->contributions[c].band_power = NAN;
		res->contributions[c].output_rms_v = NAN;
	}
	res->total_power_v2 = NAN;
	res->output_rms_v = NAN;
	res->carrier_power_v2 = NAN;
	res->transfer.enbw_hz = NAN;
	res->transfer.f_low_hz = NAN;
	res->transfer.f_high_hz = NAN;
}

enum sch_err sch_analysis_integrate(struct sch_result *res, const struct sch_run_options *opt, struct sch_diag *d)
{
	struct sim_range range;
	double *input_psd;
	enum sch_err ret;

	if ((ret = take_band(res, opt, &range, d)) != SCH_OK)
		return ret;
	sum_rows(res, drop_tiny_corrections(res, band_powers(res)));
	qsort(res->contributions, res->n_contributions, sizeof(*res->contributions), by_band_power);
	if ((ret = sch_analysis_verdict(res)) != SCH_OK || (ret = sch_analysis_transfer(res, opt, d)) != SCH_OK ||
	    (ret = refer_to_input(res, opt, &input_psd)) != SCH_OK)
		return ret;
	blank_band(res);
	return take_spots(res, opt, input_psd, &range, d);
}
