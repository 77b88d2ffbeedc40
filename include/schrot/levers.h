/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * levers.h - which design change buys the most signal-to-noise: every candidate change tried as a
 * full noise run on the loaded circuit, ranked by the input-referred band noise it leaves, and the
 * avalanche gain that maximises SNR.
 */
#ifndef SCH_LEVERS_H
#define SCH_LEVERS_H

#include <stdbool.h>
#include <stddef.h>
#include <stdio.h>
#include "schrot/analysis.h"

/* What a lever changes. */
enum sch_lever_kind {
	SCH_LEVER_RESISTANCE,  /* a resistor's value, ohms */
	SCH_LEVER_CAPACITANCE, /* a capacitor's value, farads */
	SCH_LEVER_CURRENT,     /* a current source's DC value, amperes */
	SCH_LEVER_TEMPERATURE, /* the circuit temperature, kelvin */
	SCH_LEVER_GAIN         /* an avalanche rule's gain M, its primary photocurrent held */
};

/* "resistance", "capacitance", "current", "temperature", "gain". */
const char *sch_lever_kind_name(enum sch_lever_kind k);

/* One change tried, and what it left. */
struct sch_lever {
	enum sch_lever_kind kind;
	const char *device;        /* hierarchical name ("rf", "x1.iph"), "temp", or the gain rule's first carrier */
	const char *change;        /* "rf 100k -> 200k" */
	double factor;             /* new / old value (temperature: new / old in kelvin) */
	double old_value, new_value;
	double input_rms;          /* input-referred band rms after the change (gain: per primary current, see below) */
	double input_rms_ratio;    /* input_rms / the unchanged circuit's; below 1 is better */
	double output_rms_v;       /* output band rms after the change */
	double snr_change_db;      /* -20 log10(input_rms_ratio); NaN without a signal */
	double snr;                /* the SNR after the change; NaN without a signal */
	const char *leader;        /* the leading contributor after the change (device of the top row) */
	double leader_share;
	double f_high_hz;          /* the transfer's -3 dB upper edge after the change (transfer.f_high_hz); NaN: none within the run */
	bool bandwidth_warning;    /* the change put that edge below the band's top (and lowered it) */
};

/* SNR against avalanche gain for one --avalanche rule, the primary photocurrent held. */
struct sch_gain_curve {
	const char *rule;          /* the rule's REGEX */
	const char *carrier;       /* its first carrier */
	size_t n_carriers;
	double gain_m, k_ratio;    /* the rule's M and k */
	double carrier_share;      /* the band power share of the rule's carriers at M */
	double gain_opt;           /* the gain that maximises SNR; NaN when none is finite (k = 0, or no rest) */
	double snr_change_opt_db;  /* SNR at gain_opt against SNR at gain_m, dB */
	double snr_at_rule;        /* absolute SNR at gain_m; NaN without a signal */
	double snr_at_opt;         /* absolute SNR at gain_opt; NaN without a signal */
	double *gain;              /* the curve: n points, log-spaced from 1 */
	double *snr_change_db;     /* SNR(M) against SNR(gain_m), dB */
	size_t n;
};

struct sch_levers {
	struct sch_lever *levers;  /* best (lowest input_rms_ratio) first */
	size_t n_levers;
	double factor;             /* --factor */
	double temp_step_k;        /* the temperature step, K */
	double base_input_rms;     /* the unchanged circuit's input-referred band rms */
	double base_f_high_hz;     /* its -3 dB upper edge (NaN: none within the run) */
	double coverage;           /* band power share of the devices whose levers were tried */
	size_t n_devices;          /* devices whose levers were tried */
	size_t n_runs;             /* noise runs of the batch */
	struct sch_gain_curve *curves;
	size_t n_curves;
	const char **notes;        /* devices passed over and why */
	size_t n_notes;
};

struct sch_levers_options {
	double factor;             /* > 1; each value tried x factor and / factor */
	int max_devices;           /* most lever devices (resistors, capacitors, current sources) */
	double temp_step_k;        /* > 0 */
};

/* factor 2, 12 devices, 10 K. This function can't fail. */
void sch_levers_options_init(struct sch_levers_options *lo);

/*
 * Runs the netlist at path once into base (a report, as sch_analysis_run), picks the candidates
 * from its rows (the devices that carry 99 % of the band power, at most lo->max_devices, with the
 * capacitors across them; never the input source), runs every change as a batch on
 * opt->n_workers workers and fills out (storage in base->arena), best first; then the SNR(M)
 * curve of every avalanche rule, from base's rows. Errors as sch_analysis_run and
 * sch_analysis_batch; base and out must be released (base) in every case.
 */
enum sch_err sch_levers_find(const char *path, const struct sch_run_options *opt, const struct sch_levers_options *lo,
			     struct sch_result *base, struct sch_levers *out, struct sch_diag *d);

/*
 * The gain that maximises M^2 / (a M^2 F(M) + b) for McIntyre's F with ratio k (a, b > 0): the
 * SNR of a receiver whose multiplied shot noise is a M^2 F(M) and whose fixed noise is b, with
 * M in [1, m_max]. NaN when the maximum lies at m_max or beyond (k = 0: SNR rises towards a limit).
 * This function can't fail.
 */
double sch_levers_gain_opt(double a, double b, double k_ratio, double m_max);

/* Outputs (src/report/levers.c); r is the unchanged circuit's result that sch_levers_find filled. */

/* The ranked table, the gain optimum and the notes. SCH_ERR_IO when out fails. */
enum sch_err sch_report_levers_table(const struct sch_result *r, const struct sch_levers *lv, FILE *out);

/* The JSON document (schema 1, keys in docs/guide.md), written atomically to path ("-": stdout). */
enum sch_err sch_report_levers_json(const struct sch_result *r, const struct sch_levers *lv, const char *path,
				    struct sch_diag *d);

/* One CSV row per lever, best first, written atomically. */
enum sch_err sch_report_levers_csv(const struct sch_result *r, const struct sch_levers *lv, const char *path,
				   struct sch_diag *d);

/* SNR against avalanche gain, SVG or PNG by the name; SCH_ERR_USAGE without an avalanche rule. */
enum sch_err sch_report_levers_plot(const struct sch_levers *lv, const char *path, struct sch_diag *d);

#endif
