/* SPDX-License-Identifier: BSD-3-Clause */
/* report_sweep.c - the outputs of a sweep: a terminal table and the sweep JSON document. */
#include <jansson.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "schrot/outfile.h"
#include "schrot/report.h"
#include "schrot/si.h"

static json_t *real_or_null(double x)
{
	return isfinite(x) ? json_real(x) : json_null();
}

enum sch_err sch_report_sweep_table(const struct sch_result *r, const struct sch_sweep *s, FILE *out)
{
	char v[64], o[64], in[64];
	const char *in_unit = r->input_unit && strcmp(r->input_unit, "A") == 0 ? "A" : "V";

	fprintf(out, "schrot sweep: %s, varying %s, band %g Hz to %g Hz\n\n", r->netlist, s->name, r->band_lo_hz,
		r->band_hi_hz);
	fprintf(out, "  %12s  %14s  %14s  %16s\n",
		strcmp(s->unit, "C") == 0 ? "temp" : strcmp(s->unit, "A") == 0 ? "DC current" : s->name, "output rms",
		"input-referred", "carrier shot / rest");
	for (size_t k = 0; k < s->n_points; k++) {
		const struct sch_sweep_point *p = &s->points[k];
		if (strcmp(s->unit, "C") == 0)
			snprintf(v, sizeof(v), "%.2f °C", p->value);
		else
			sch_si_format(v, sizeof(v), p->value, 3, s->unit);
		sch_si_format(o, sizeof(o), p->output_rms_v, 3, "V");
		sch_si_format(in, sizeof(in), p->input_rms, 3, in_unit);
		fprintf(out, "  %12s  %14s  %14s  %16.3g\n", v, o, in,
			p->other_power_v2 > 0 ? p->carrier_power_v2 / p->other_power_v2 : NAN);
	}
	if (isnan(s->crossover)) {
		fprintf(out, "\n  no crossover: the carriers' shot noise stays %s the rest over the whole sweep\n",
			s->n_points && s->points[0].carrier_power_v2 > s->points[0].other_power_v2 ? "above" : "below");
	} else {
		if (strcmp(s->unit, "C") == 0)
			snprintf(v, sizeof(v), "%.3f °C", s->crossover);
		else
			sch_si_format(v, sizeof(v), s->crossover, 4, s->unit);
		fprintf(out, "\n  shot-noise-limited from %s %s (carrier shot noise power equals all other noise)\n",
			strcmp(s->unit, "C") == 0 ? "temp" : s->name, v);
	}
	return ferror(out) ? SCH_ERR_IO : SCH_OK;
}

enum sch_err sch_report_sweep_json(const struct sch_result *r, const struct sch_sweep *s, const char *path,
				   struct sch_diag *d)
{
	struct sch_outfile o;
	json_t *doc = json_object(), *points = json_array(), *cross = json_object();
	enum sch_err ret = SCH_ERR_NOMEM;

	if (!doc || !points || !cross)
		goto out;
	json_object_set_new(doc, "schema", json_integer(1));
	json_object_set_new(doc, "netlist", json_string(r->netlist ? r->netlist : ""));
	json_object_set_new(doc, "vary", json_string(s->name));
	json_object_set_new(doc, "vary_unit", json_string(s->unit));
	json_object_set_new(doc, "output", json_string(r->output ? r->output : ""));
	json_object_set_new(doc, "input", json_string(r->input ? r->input : ""));
	{
		json_t *band = json_array();
		json_array_append_new(band, real_or_null(r->band_lo_hz));
		json_array_append_new(band, real_or_null(r->band_hi_hz));
		json_object_set_new(doc, "band_hz", band);
	}
	for (size_t k = 0; k < s->n_points; k++) {
		const struct sch_sweep_point *p = &s->points[k];
		json_t *pt = json_object();
		json_object_set_new(pt, "value", real_or_null(p->value));
		json_object_set_new(pt, "output_rms_v", real_or_null(p->output_rms_v));
		json_object_set_new(pt, "input_rms", real_or_null(p->input_rms));
		json_object_set_new(pt, "carrier_power_v2", real_or_null(p->carrier_power_v2));
		json_object_set_new(pt, "other_power_v2", real_or_null(p->other_power_v2));
		json_array_append_new(points, pt);
	}
	json_object_set_new(doc, "points", points);
	points = NULL;
	json_object_set_new(cross, "value", real_or_null(s->crossover));
	json_object_set_new(cross, "meaning", json_string("value at which the carriers' shot-noise power equals all other "
							   "noise power in the band (log-log interpolation)"));
	json_object_set_new(doc, "crossover", cross);
	cross = NULL;
	if ((ret = sch_outfile_open(&o, path, d)) != SCH_OK)
		goto out;
	if (json_dumpf(doc, o.fp, JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(17)) != 0 ||
	    fputc('\n', o.fp) == EOF) {
		sch_outfile_abort(&o);
		ret = sch_diag_error(d, SCH_ERR_IO, path, 0, "could not write the sweep JSON");
		goto out;
	}
	ret = sch_outfile_commit(&o, d);
out:
	json_decref(doc);
	json_decref(points);
	json_decref(cross);
	return ret;
}
