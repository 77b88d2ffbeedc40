/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * report_csv.c - CSV views of a result (RFC 4180 quoting, LF line ends): one row per contribution, and the
 * spectrum, one row per frequency with the top contributions and the rest, densities signed so
 * that the columns' signed squares add up to the total's.
 */
#include <math.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/outfile.h"
#include "schrot/report.h"
#include "report_int.h"

void sch_report_csv_field(FILE *fp, const char *s)
{
	if (!s)
		s = "";
	if (!strpbrk(s, ",\"\r\n")) {
		fputs(s, fp);
		return;
	}
	fputc('"', fp);
	for (; *s; s++) {
		if (*s == '"')
			fputc('"', fp);
		fputc(*s, fp);
	}
	fputc('"', fp);
}

/* sqrt(|psd|) with psd's sign: a column whose square, signed, adds to the total. */
static double signed_density(double psd)
{
	return copysign(sqrt(fabs(psd)), psd);
}

/* A number field, empty for NaN or inf. */
static void put_num(FILE *fp, double x)
{
	if (isfinite(x))
		fprintf(fp, "%.12g", x);
}

static enum sch_err finish(struct sch_outfile *o, const char *what, struct sch_diag *d)
{
	if (ferror(o->fp)) {
		sch_outfile_abort(o);
		return sch_diag_error(d, SCH_ERR_IO, o->path, 0, "cannot write the %s", what);
	}
	return sch_outfile_commit(o, d);
}

static enum sch_err no_spectrum(const struct sch_result *r, const char *path, const char *what,
				struct sch_diag *d)
{
	return sch_diag_error(d, SCH_ERR_USAGE, path, 0, "%s needs a noise analysis; '%s' had none", what,
			      r->netlist ? r->netlist : "the netlist");
}

enum sch_err sch_report_csv(const struct sch_result *r, const char *path, struct sch_diag *d)
{
	enum sch_err ret;
	struct sch_outfile o;
	FILE *fp;

	if (r->n_freq == 0)
		return no_spectrum(r, path, "the contribution CSV", d);
	ret = sch_outfile_open(&o, path, d);
	if (ret != SCH_OK)
		return ret;
	fp = o.fp;
	fputs("device,generator,mechanism,origin,dc_current_a,output_rms_v,share", fp);
	for (size_t j = 0; j < r->n_spots; j++)
		fprintf(fp, ",spot_%.9g_hz_v_per_rthz", r->spots[j].freq_hz);
	fputs("\n", fp);
	for (size_t i = 0; i < r->n_contributions; i++) {
		const struct sch_contribution *c = &r->contributions[i];
		sch_report_csv_field(fp, c->device);
		fputc(',', fp);
		sch_report_csv_field(fp, c->generator);
		fputc(',', fp);
		sch_report_csv_field(fp, sch_mechanism_name(c->mechanism));
		fputc(',', fp);
		sch_report_csv_field(fp, sch_origin_name(c->origin));
		fputc(',', fp);
		put_num(fp, c->dc_current_a);
		fputc(',', fp);
		put_num(fp, c->output_rms_v);
		fputc(',', fp);
		put_num(fp, c->share);
		for (size_t j = 0; j < r->n_spots; j++) {
			fputc(',', fp);
			put_num(fp, c->spot_density ? c->spot_density[j] : NAN);
		}
		fputs("\n", fp);
	}
	return finish(&o, "contribution CSV", d);
}

enum sch_err sch_report_spectrum(const struct sch_result *r, const char *path, int top_n, struct sch_diag *d)
{
	enum sch_err ret;
	struct sch_outfile o;
	size_t top = sch_report_top_count(r, top_n);
	FILE *fp;
	char label[512];

	if (r->n_freq == 0)
		return no_spectrum(r, path, "the spectrum CSV", d);
	ret = sch_outfile_open(&o, path, d);
	if (ret != SCH_OK)
		return ret;
	fp = o.fp;
	fputs("frequency [Hz],total [V/rtHz]", fp);
	for (size_t i = 0; i < top; i++) {
		char head[600];
		sch_report_label(&r->contributions[i], label, sizeof(label));
		snprintf(head, sizeof(head), "%s [V/rtHz]", label);
		fputc(',', fp);
		sch_report_csv_field(fp, head);
	}
	fprintf(fp, ",rest [V/rtHz],transfer [%s]\n", sch_report_transfer_unit(r));
	for (size_t k = 0; k < r->n_freq; k++) {
		double sum = 0;
		put_num(fp, r->freq_hz[k]);
		fputc(',', fp);
		put_num(fp, signed_density(r->total_psd[k]));
		for (size_t i = 0; i < top; i++) {
			double psd = r->contributions[i].psd ? r->contributions[i].psd[k] : NAN;
			sum += psd;
			fputc(',', fp);
			put_num(fp, signed_density(psd));
		}
		fputc(',', fp);
		put_num(fp, signed_density(r->total_psd[k] - sum));
		fputc(',', fp);
		put_num(fp, sqrt(r->gain2[k]));
		fputs("\n", fp);
	}
	return finish(&o, "spectrum CSV", d);
}
