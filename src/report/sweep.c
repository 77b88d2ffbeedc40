/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * report_sweep.c - the outputs of a sweep: a terminal table, the sweep JSON document, the partial
 * documents of sweep --shard and their join (schrot merge).
 */
#include <jansson.h>
#include <math.h>
#include <stdlib.h>
#include <stdio.h>
#include <string.h>
#include "schrot/outfile.h"
#include "schrot/report.h"
#include "schrot/si.h"
#include "report_int.h"

static json_t *real_or_null(double x)
{
	return isfinite(x) ? json_real(x) : json_null();
}

/* The printf field width that right-aligns s in width display columns (UTF-8 counted by code points). */
static int cols(const char *s, int width)
{
	return width + (int)(strlen(s) - sch_report_width(s));
}

enum sch_err sch_report_sweep_table(const struct sch_result *r, const struct sch_sweep *s, FILE *out)
{
	char v[64], o[64], in[64], ratio[64];
	const char *in_unit = r->input_unit && strcmp(r->input_unit, "A") == 0 ? "A" : "V";

	fprintf(out, "schrot sweep: %s, varying %s, band %s to %s\n\n", r->netlist, s->name,
		sch_si_format(o, sizeof(o), r->band_lo_hz, 3, "Hz"), sch_si_format(in, sizeof(in), r->band_hi_hz, 3, "Hz"));
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
		sch_report_ratio(ratio, sizeof(ratio), p->other_power_v2 > 0 ? p->carrier_power_v2 / p->other_power_v2 : NAN);
		/* widths in display columns: "µ" and "×" take two bytes and one column */
		fprintf(out, "  %*s  %*s  %*s  %*s\n", cols(v, 12), v, cols(o, 14), o, cols(in, 14), in, cols(ratio, 16), ratio);
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

/* The sweep document without its crossover; NULL when out of memory. */
static json_t *sweep_doc(const struct sch_result *r, const struct sch_sweep *s)
{
	json_t *doc = json_object(), *points = json_array(), *band = json_array();

	if (!doc || !points || !band) {
		json_decref(doc);
		json_decref(points);
		json_decref(band);
		return NULL;
	}
	json_object_set_new(doc, "schema", json_integer(1));
	json_object_set_new(doc, "netlist", json_string(r->netlist ? r->netlist : ""));
	json_object_set_new(doc, "vary", json_string(s->name));
	json_object_set_new(doc, "vary_unit", json_string(s->unit));
	json_object_set_new(doc, "output", json_string(r->output ? r->output : ""));
	json_object_set_new(doc, "input", json_string(r->input ? r->input : ""));
	json_array_append_new(band, real_or_null(r->band_lo_hz));
	json_array_append_new(band, real_or_null(r->band_hi_hz));
	json_object_set_new(doc, "band_hz", band);
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
	return doc;
}

static json_t *crossover_obj(double value, const char *meaning)
{
	json_t *cross = json_object();

	if (!cross)
		return NULL;
	json_object_set_new(cross, "value", real_or_null(value));
	json_object_set_new(cross, "meaning", json_string(meaning));
	return cross;
}

/* Writes doc atomically; 17 significant digits, so every double reads back exactly. */
static enum sch_err write_doc(json_t *doc, const char *path, const char *what, struct sch_diag *d)
{
	struct sch_outfile o;
	enum sch_err ret;

	if ((ret = sch_outfile_open(&o, path, d)) != SCH_OK)
		return ret;
	if (json_dumpf(doc, o.fp, JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(17)) != 0 ||
	    fputc('\n', o.fp) == EOF) {
		sch_outfile_abort(&o);
		return sch_diag_error(d, SCH_ERR_IO, path, 0, "could not write the %s", what);
	}
	return sch_outfile_commit(&o, d);
}

enum sch_err sch_report_sweep_json(const struct sch_result *r, const struct sch_sweep *s, const char *path,
				   struct sch_diag *d)
{
	json_t *doc = sweep_doc(r, s);
	json_t *cross = crossover_obj(s->crossover, "value at which the carriers' shot-noise power equals all other "
						    "noise power in the band (log-log interpolation; a temperature "
						    "on the kelvin scale)");
	enum sch_err ret = SCH_ERR_NOMEM;

	if (!doc || !cross)
		goto out;
	json_object_set_new(doc, "crossover", cross);
	cross = NULL;
	ret = write_doc(doc, path, "sweep JSON", d);
out:
	json_decref(doc);
	json_decref(cross);
	return ret;
}

enum sch_err sch_report_sweep_csv(const struct sch_result *r, const struct sch_sweep *s, const char *path,
				  struct sch_diag *d)
{
	struct sch_outfile o;
	enum sch_err ret = sch_outfile_open(&o, path, d);
	const char *unit = strcmp(s->unit, "C") == 0 ? "c" : strcmp(s->unit, "A") == 0 ? "a" : "";

	if (ret != SCH_OK)
		return ret;
	fprintf(o.fp, "value%s%s,output_rms_v,input_rms_%s,carrier_power_v2,other_power_v2,shot_to_rest\n", *unit ? "_" : "",
		unit, r->input_unit && strcmp(r->input_unit, "A") == 0 ? "a" : "v");
	for (size_t k = 0; k < s->n_points; k++) {
		const struct sch_sweep_point *p = &s->points[k];
		double v[] = { p->value, p->output_rms_v, p->input_rms, p->carrier_power_v2, p->other_power_v2,
			       p->other_power_v2 > 0 ? p->carrier_power_v2 / p->other_power_v2 : NAN };
		for (size_t c = 0; c < sizeof(v) / sizeof(v[0]); c++) {
			if (c)
				fputc(',', o.fp);
			if (isfinite(v[c]))
				fprintf(o.fp, "%.12g", v[c]);
		}
		fputc('\n', o.fp);
	}
	if (ferror(o.fp)) {
		sch_outfile_abort(&o);
		return sch_diag_error(d, SCH_ERR_IO, path, 0, "cannot write the sweep CSV");
	}
	return sch_outfile_commit(&o, d);
}

enum sch_err sch_report_sweep_partial_json(const struct sch_result *r, const struct sch_sweep *s,
					   const struct sch_sweep_shard *shard, const char *path, struct sch_diag *d)
{
	json_t *doc = sweep_doc(r, s), *sh = json_object();
	json_t *cross = crossover_obj(NAN, "a partial sweep has no crossover: 'schrot merge' joins the shards and finds it");
	enum sch_err ret = SCH_ERR_NOMEM;

	if (!doc || !sh || !cross)
		goto out;
	json_object_set_new(sh, "index", json_integer(shard->index));
	json_object_set_new(sh, "count", json_integer(shard->count));
	json_object_set_new(sh, "first", json_integer((json_int_t)shard->first));
	json_object_set_new(sh, "points_total", json_integer((json_int_t)shard->n_total));
	json_object_set_new(sh, "input_unit", json_string(r->input_unit ? r->input_unit : "V"));
	json_object_set_new(doc, "shard", sh);
	sh = NULL;
	json_object_set_new(doc, "crossover", cross);
	cross = NULL;
	ret = write_doc(doc, path, "partial sweep JSON", d);
out:
	json_decref(doc);
	json_decref(sh);
	json_decref(cross);
	return ret;
}


/* One partial file as read; strings belong to doc. */
struct partial {
	json_t *doc;
	const char *netlist, *vary, *vary_unit, *output, *input, *input_unit;
	double band[2];
	json_int_t index, count, first, n_total;
	json_t *points;
};

static const char *string_at(json_t *obj, const char *key)
{
	return json_string_value(json_object_get(obj, key));
}

/* A JSON number, NaN for null; false when the value is neither. */
static bool number_at(json_t *obj, const char *key, double *v)
{
	json_t *x = json_object_get(obj, key);

	if (json_is_null(x)) {
		*v = NAN;
		return true;
	}
	if (!json_is_number(x))
		return false;
	*v = json_number_value(x);
	return true;
}

static enum sch_err read_partial(const char *path, struct partial *p, struct sch_diag *d)
{
	json_error_t jerr;
	json_t *sh, *band;

	memset(p, 0, sizeof(*p));
	p->doc = json_load_file(path, 0, &jerr);
	if (!p->doc)
		return sch_diag_error(d, SCH_ERR_INPUT, path, jerr.line > 0 ? jerr.line : 0,
				      "not a partial sweep JSON file: %s", jerr.text);
	sh = json_object_get(p->doc, "shard");
	band = json_object_get(p->doc, "band_hz");
	p->netlist = string_at(p->doc, "netlist");
	p->vary = string_at(p->doc, "vary");
	p->vary_unit = string_at(p->doc, "vary_unit");
	p->output = string_at(p->doc, "output");
	p->input = string_at(p->doc, "input");
	p->input_unit = string_at(sh, "input_unit");
	p->points = json_object_get(p->doc, "points");
	p->index = json_integer_value(json_object_get(sh, "index"));
	p->count = json_integer_value(json_object_get(sh, "count"));
	p->first = json_integer_value(json_object_get(sh, "first"));
	p->n_total = json_integer_value(json_object_get(sh, "points_total"));
	if (json_integer_value(json_object_get(p->doc, "schema")) != 1 || !json_is_object(sh) || !p->netlist ||
	    !p->vary || !p->vary_unit || !p->output || !p->input || !p->input_unit || !json_is_array(p->points) ||
	    json_array_size(band) != 2)
		goto bad;
	p->band[0] = json_is_number(json_array_get(band, 0)) ? json_number_value(json_array_get(band, 0)) : NAN;
	p->band[1] = json_is_number(json_array_get(band, 1)) ? json_number_value(json_array_get(band, 1)) : NAN;
	/* the split sweep --shard uses: shard K holds points [n(K-1)/N, nK/N) */
	if (p->count < 1 || p->index < 1 || p->index > p->count || p->n_total < p->count ||
	    p->first != p->n_total * (p->index - 1) / p->count ||
	    (json_int_t)json_array_size(p->points) != p->n_total * p->index / p->count - p->first)
		goto bad;
	return SCH_OK;
bad:
	return sch_diag_error(d, SCH_ERR_INPUT, path, 0,
			      "not a partial sweep JSON file (written by 'schrot sweep --shard K/N --json FILE')");
}

static bool same_str(const char *a, const char *b)
{
	return strcmp(a, b) == 0;
}

/* Whether q belongs to the same sweep as p (doubles compared exactly: they were written exactly). */
static bool same_sweep(const struct partial *p, const struct partial *q)
{
	return same_str(p->netlist, q->netlist) && same_str(p->vary, q->vary) && same_str(p->vary_unit, q->vary_unit) &&
	       same_str(p->output, q->output) && same_str(p->input, q->input) &&
	       same_str(p->input_unit, q->input_unit) && p->count == q->count && p->n_total == q->n_total &&
	       (p->band[0] == q->band[0] || (isnan(p->band[0]) && isnan(q->band[0]))) &&
	       (p->band[1] == q->band[1] || (isnan(p->band[1]) && isnan(q->band[1])));
}

static enum sch_err take_points(const char *path, const struct partial *p, struct sch_sweep_point *out,
				struct sch_diag *d)
{
	for (size_t k = 0; k < json_array_size(p->points); k++) {
		json_t *pt = json_array_get(p->points, k);
		struct sch_sweep_point *q = &out[(size_t)p->first + k];
		if (!json_is_object(pt) || !number_at(pt, "value", &q->value) ||
		    !number_at(pt, "output_rms_v", &q->output_rms_v) || !number_at(pt, "input_rms", &q->input_rms) ||
		    !number_at(pt, "carrier_power_v2", &q->carrier_power_v2) ||
		    !number_at(pt, "other_power_v2", &q->other_power_v2))
			return sch_diag_error(d, SCH_ERR_INPUT, path, 0, "point %zu of the partial sweep is malformed", k + 1);
	}
	return SCH_OK;
}

enum sch_err sch_report_sweep_merge(const char *const *paths, size_t n_paths, struct sch_result *r,
				    struct sch_sweep *s, struct sch_diag *d)
{
	struct sch_arena *a = &r->arena;
	struct partial ref, cur;
	const char **seen = NULL; /* shard index -> the file that gave it */
	enum sch_err ret = SCH_ERR_INPUT;

	memset(&ref, 0, sizeof(ref));
	memset(&cur, 0, sizeof(cur));
	memset(s, 0, sizeof(*s));
	s->crossover = NAN;
	if (n_paths == 0)
		return sch_diag_error(d, SCH_ERR_USAGE, NULL, 0, "merge needs the partial sweep files (try 'schrot --help')");
	if ((ret = read_partial(paths[0], &ref, d)) != SCH_OK)
		goto out;
	ret = SCH_ERR_NOMEM;
	seen = calloc((size_t)ref.count + 1, sizeof(*seen));
	s->points = sch_arena_alloc(a, ((size_t)ref.n_total + 1) * sizeof(*s->points));
	r->netlist = sch_arena_strdup(a, ref.netlist);
	r->output = sch_arena_strdup(a, ref.output);
	r->input = sch_arena_strdup(a, ref.input);
	r->input_unit = sch_arena_strdup(a, ref.input_unit);
	s->name = sch_arena_strdup(a, ref.vary);
	s->unit = sch_arena_strdup(a, ref.vary_unit);
	if (!seen || !s->points || !r->netlist || !r->output || !r->input || !r->input_unit || !s->name || !s->unit)
		goto out;
	r->band_lo_hz = ref.band[0];
	r->band_hi_hz = ref.band[1];
	for (size_t f = 0; f < n_paths; f++) {
		const struct partial *p = &ref;
		if (f > 0) {
			json_decref(cur.doc);
			if ((ret = read_partial(paths[f], &cur, d)) != SCH_OK)
				goto out;
			p = &cur;
			if (!same_sweep(&ref, &cur)) {
				ret = sch_diag_error(d, SCH_ERR_INPUT, paths[f], 0,
						     "this shard belongs to another sweep than '%s' (netlist, --vary, "
						     "band, output or shard count differ)",
						     paths[0]);
				goto out;
			}
		}
		if (seen[p->index]) {
			ret = sch_diag_error(d, SCH_ERR_INPUT, paths[f], 0, "shard %d/%d was already given in '%s'",
					     (int)p->index, (int)p->count, seen[p->index]);
			goto out;
		}
		seen[p->index] = paths[f];
		if ((ret = take_points(paths[f], p, s->points, d)) != SCH_OK)
			goto out;
	}
	for (json_int_t k = 1; k <= ref.count; k++) {
		if (!seen[k]) {
			ret = sch_diag_error(d, SCH_ERR_INPUT, NULL, 0, "shard %d/%d is missing: give every shard once",
					     (int)k, (int)ref.count);
			goto out;
		}
	}
	s->n_points = (size_t)ref.n_total;
	s->crossover = sch_sweep_crossover_of(s);
	ret = SCH_OK;
out:
	json_decref(ref.doc);
	json_decref(cur.doc);
	free(seen);
	return ret;
}
