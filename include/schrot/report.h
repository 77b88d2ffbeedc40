/* SPDX-License-Identifier: BSD-3-Clause */
/* report.h - every output of a result: terminal tables, JSON, CSV, spectrum CSV, plot, HTML, depfile. */
#ifndef SCH_REPORT_H
#define SCH_REPORT_H

#include <stdbool.h>
#include <stdio.h>
#include "schrot/analysis.h"
#include "schrot/diag.h"

/*
 * Terminal table of the noise report: totals on top, contributions ranked by share, each junction
 * or bipolar correction folded into the simulator row it corrects (origin "corrected": one row per
 * device and generator). Returns SCH_ERR_IO when out fails, SCH_ERR_NOMEM.
 */
enum sch_err sch_report_table(const struct sch_result *r, FILE *out);

/* The same with split_corrections choosing between folded rows (false) and every row apart (true). */
enum sch_err sch_report_table_split(const struct sch_result *r, FILE *out, bool split_corrections);

/*
 * One sentence on whether the design is shot-noise limited, by what factor, and which device leads
 * the rest; written into out (always NUL-terminated), which is returned.
 */
const char *sch_report_verdict(const struct sch_result *r, char *out, size_t size);

/* Terminal table of carriers (name, DC current, reason) and noiseless sources. */
enum sch_err sch_report_carriers_table(const struct sch_result *r, FILE *out);

/* JSON schema 1 (DESIGN.md section 5), written atomically to path ("-": stdout). */
enum sch_err sch_report_json(const struct sch_result *r, const char *path, struct sch_diag *d);

/* One row per contribution, written atomically. */
enum sch_err sch_report_csv(const struct sch_result *r, const char *path, struct sch_diag *d);

/*
 * One row per frequency: frequency, total, the top n contributions, "rest", then |transfer|.
 * Densities are sqrt(|psd|) with psd's sign (negative where a row removes noise), so the signed
 * squares of the contribution and rest columns add to the total's square at every frequency.
 */
enum sch_err sch_report_spectrum(const struct sch_result *r, const char *path, int top_n, struct sch_diag *d);

/* Log-log plot of output density (total and top contributions), band shaded; .svg or .png. */
enum sch_err sch_report_plot(const struct sch_result *r, const char *path, struct sch_diag *d);

/* A self-contained HTML page for a design review. */
enum sch_err sch_report_html(const struct sch_result *r, const char *path, struct sch_diag *d);

/* A make rule: targets (the run's outputs) depend on every file the netlist read. */
enum sch_err sch_report_depfile(const struct sch_result *r, const char *path, const char *const *targets,
				size_t n_targets, struct sch_diag *d);

/* Terminal table of a sweep: one row per point, then the crossover. */
enum sch_err sch_report_sweep_table(const struct sch_result *r, const struct sch_sweep *s, FILE *out);

/* Sweep JSON (schema 1: vary, points, crossover), written atomically to path ("-": stdout). */
enum sch_err sch_report_sweep_json(const struct sch_result *r, const struct sch_sweep *s, const char *path,
				   struct sch_diag *d);

/*
 * Sweep CSV, one row per point, written atomically: value_a (a current), value_c (temp) or value
 * (a .param), output_rms_v, input_rms_a or input_rms_v, carrier_power_v2, other_power_v2,
 * shot_to_rest. SCH_ERR_IO when the file cannot be written.
 */
enum sch_err sch_report_sweep_csv(const struct sch_result *r, const struct sch_sweep *s, const char *path,
				  struct sch_diag *d);

/*
 * Plot of a sweep (.svg or .png by the name, written atomically): output rms, the carriers' shot
 * noise and all other noise over the band against the varied value (log axis over more than a
 * decade of positive values), the crossover as a dashed line. SCH_ERR_USAGE for another extension
 * or nothing positive to draw, SCH_ERR_IO when cairo or the file fails.
 */
enum sch_err sch_report_sweep_plot(const struct sch_sweep *s, const char *path, struct sch_diag *d);

/* Where a partial sweep (sweep --shard K/N) sits in the whole one. */
struct sch_sweep_shard {
	int index;                /* K: 1..count */
	int count;                /* N */
	size_t first;             /* the whole sweep's index of this shard's first point */
	size_t n_total;           /* points of the whole sweep */
};

/*
 * The sweep JSON of one shard, written atomically to path: the document sch_report_sweep_json
 * writes for its points, a "shard" object (index, count, first, points_total, input_unit) and a
 * null crossover, which only the joined sweep knows.
 */
enum sch_err sch_report_sweep_partial_json(const struct sch_result *r, const struct sch_sweep *s,
					   const struct sch_sweep_shard *shard, const char *path, struct sch_diag *d);

/*
 * Joins the partial sweep JSON files at paths (any order) into r (netlist, output, input,
 * input_unit, band) and s (name, unit, every point in order, the crossover as a single run finds
 * it), with storage from r's arena. Returns SCH_ERR_INPUT with a message naming the file when a
 * file is unreadable or no partial, when the partials come from different sweeps, or when a shard
 * is missing or given twice; SCH_ERR_NOMEM. r and s are then unusable but r can be released.
 */
enum sch_err sch_report_sweep_merge(const char *const *paths, size_t n_paths, struct sch_result *r,
				    struct sch_sweep *s, struct sch_diag *d);

#endif
