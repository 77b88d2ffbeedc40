/* SPDX-License-Identifier: BSD-3-Clause */
/* report_json.c - the JSON document of a result (schema 1, DESIGN.md section 5), built with jansson. */
#include <jansson.h>
#include <math.h>
#include <stdbool.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/outfile.h"
#include "schrot/physics.h"
#include "schrot/report.h"
#include "report_int.h"

#ifndef SCH_VERSION
#define SCH_VERSION "unknown"
#endif

/* Reals that JSON cannot hold (NaN, inf) become null. */
static json_t *num(double x)
{
	return isfinite(x) ? json_real(x) : json_null();
}

/* Length of the valid UTF-8 sequence at s (1-4), or 0 when the bytes are not one. */
static size_t utf8_seq(const unsigned char *s)
{
	size_t n;
	unsigned int cp;

	if (s[0] < 0x80)
		return 1;
	if (s[0] >= 0xC2 && s[0] <= 0xDF)
		n = 2, cp = s[0] & 0x1F;
	else if (s[0] >= 0xE0 && s[0] <= 0xEF)
		n = 3, cp = s[0] & 0x0F;
	else if (s[0] >= 0xF0 && s[0] <= 0xF4)
		n = 4, cp = s[0] & 0x07;
	else
		return 0;
	for (size_t i = 1; i < n; i++) {
		if ((s[i] & 0xC0) != 0x80)
			return 0;
		cp = cp << 6 | (s[i] & 0x3F);
	}
	if ((n == 3 && (cp < 0x800 || (cp >= 0xD800 && cp <= 0xDFFF))) || (n == 4 && (cp < 0x10000 || cp > 0x10FFFF)))
		return 0;
	return n;
}

/*
 * Netlist text need not be UTF-8 (old decks in Latin-1), but a JSON string must be: invalid bytes
 * become U+FFFD rather than dropping the whole value. NULL becomes null.
 */
static json_t *text(const char *s)
{
	json_t *v;
	char *clean;
	size_t len, k = 0;

	if (!s)
		return json_null();
	v = json_string(s);
	if (v)
		return v;
	len = strlen(s);
	clean = malloc(len * 3 + 1);
	if (!clean)
		return NULL;
	for (size_t i = 0; i < len;) {
		size_t n = utf8_seq((const unsigned char *)s + i);
		if (n == 0) {
			memcpy(clean + k, "\xEF\xBF\xBD", 3);
			k += 3;
			i++;
		} else {
			memcpy(clean + k, s + i, n);
			k += n;
			i += n;
		}
	}
	clean[k] = '\0';
	v = json_string(clean);
	free(clean);
	return v;
}

/* Sets or appends, recording a failed allocation in *bad; jansson drops value on failure and accepts NULL. */
static void put(json_t *obj, const char *key, json_t *value, int *bad)
{
	if (json_object_set_new(obj, key, value) != 0)
		*bad = 1;
}

static void append(json_t *arr, json_t *value, int *bad)
{
	if (json_array_append_new(arr, value) != 0)
		*bad = 1;
}

static json_t *carriers_json(const struct sch_result *r, int *bad)
{
	json_t *arr = json_array();

	for (size_t i = 0; i < r->set.n_carriers; i++) {
		const struct sch_carrier *c = &r->set.carriers[i];
		json_t *o = json_object();
		double g = sch_carrier_gain(c);
		put(o, "name", text(c->name), bad);
		put(o, "dc_current_a", num(c->dc_current_a), bad);
		put(o, "reason", text(c->reason), bad);
		put(o, "gain", num(c->gain_m), bad);
		put(o, "excess_factor", num(c->excess_f), bad);
		put(o, "density_a_per_rthz", num(sqrt(sch_shot_density(c->dc_current_a, g))), bad);
		put(o, "density_multiplier", num(g), bad);
		put(o, "simulator_name", text(c->sim_name), bad);
		append(arr, o, bad);
	}
	return arr;
}

static json_t *noiseless_json(const struct sch_result *r, int *bad)
{
	json_t *arr = json_array();

	for (size_t i = 0; i < r->set.n_noiseless; i++) {
		json_t *o = json_object();
		put(o, "name", text(r->set.noiseless[i].name), bad);
		put(o, "dc_current_a", num(r->set.noiseless[i].dc_current_a), bad);
		if (r->set.noiseless[i].reason)
			put(o, "reason", text(r->set.noiseless[i].reason), bad);
		append(arr, o, bad);
	}
	return arr;
}

static json_t *spots_json(const struct sch_result *r, int *bad)
{
	json_t *arr = json_array();

	for (size_t i = 0; i < r->n_spots; i++) {
		const struct sch_spot *s = &r->spots[i];
		json_t *o = json_object();
		put(o, "frequency_hz", num(s->freq_hz), bad);
		put(o, "output_v_per_rthz", num(s->output_v_per_rthz), bad);
		put(o, "input_per_rthz", num(s->input_per_rthz), bad);
		put(o, "nep_w_per_rthz", num(s->nep_w_per_rthz), bad);
		append(arr, o, bad);
	}
	return arr;
}

static json_t *contributions_json(const struct sch_result *r, int *bad)
{
	json_t *arr = json_array();

	for (size_t i = 0; i < r->n_contributions; i++) {
		const struct sch_contribution *c = &r->contributions[i];
		json_t *o = json_object();
		json_t *spot = json_array();
		for (size_t j = 0; j < r->n_spots; j++)
			append(spot, num(c->spot_density ? c->spot_density[j] : NAN), bad);
		put(o, "device", text(c->device), bad);
		put(o, "generator", text(c->generator), bad);
		put(o, "mechanism", text(sch_mechanism_name(c->mechanism)), bad);
		put(o, "origin", text(sch_origin_name(c->origin)), bad);
		put(o, "dc_current_a", num(c->dc_current_a), bad);
		put(o, "output_rms_v", num(c->output_rms_v), bad);
		put(o, "share", num(c->share), bad);
		put(o, "spot_v_per_rthz", spot, bad);
		put(o, "band_power_v2", num(c->band_power), bad);
		put(o, "device_count", json_integer((json_int_t)(c->device_count ? c->device_count : 1)), bad);
		append(arr, o, bad);
	}
	return arr;
}

static json_t *notes_json(const struct sch_result *r, int *bad)
{
	json_t *arr = json_array();

	for (size_t i = 0; i < r->n_notes; i++)
		append(arr, text(r->notes[i]), bad);
	return arr;
}

static json_t *band_json(const struct sch_result *r, int *bad)
{
	json_t *arr = json_array();

	append(arr, num(r->band_lo_hz), bad);
	append(arr, num(r->band_hi_hz), bad);
	return arr;
}

static json_t *total_json(const struct sch_result *r, int *bad)
{
	json_t *o = json_object();

	put(o, "output_rms_v", num(r->output_rms_v), bad);
	put(o, "input_rms", num(r->input_rms), bad);
	put(o, "output_power_v2", num(r->total_power_v2), bad);
	put(o, "carrier_shot_power_v2", num(r->carrier_power_v2), bad);
	put(o, "carrier_shot_share",
	    num(r->total_power_v2 > 0 ? r->carrier_power_v2 / r->total_power_v2 : NAN), bad);
	put(o, "nep_band_w_per_rthz", num(r->nep_band_w_per_rthz), bad);
	return o;
}

static json_t *transfer_json(const struct sch_result *r, int *bad)
{
	json_t *o = json_object();
	const struct sch_transfer *t = &r->transfer;

	put(o, "mid_band", num(t->mid_band), bad);
	put(o, "unit", text(sch_report_transfer_unit(r)), bad);
	put(o, "ref_hz", num(t->ref_hz), bad);
	put(o, "f_low_hz", num(t->f_low_hz), bad);
	put(o, "f_high_hz", num(t->f_high_hz), bad);
	put(o, "enbw_hz", num(t->enbw_hz), bad);
	return o;
}

static json_t *verdict_json(const struct sch_result *r, int *bad)
{
	json_t *o = json_object();
	char line[512];

	bool limited = r->set.n_carriers && r->carrier_power_v2 > 0 && (isnan(r->shot_to_rest) || r->shot_to_rest >= 1);

	put(o, "shot_noise_limited", json_boolean(limited), bad);
	put(o, "shot_to_rest_power", num(r->shot_to_rest), bad);
	put(o, "dominant_other", r->dominant_other ? text(r->dominant_other->device) : json_null(), bad);
	put(o, "dominant_other_generator", r->dominant_other ? text(r->dominant_other->generator) : json_null(), bad);
	put(o, "dominant_other_share", num(r->dominant_other_share), bad);
	put(o, "text", text(sch_report_verdict(r, line, sizeof(line))), bad);
	return o;
}

static json_t *snr_json(const struct sch_result *r, int *bad)
{
	json_t *o = json_object();

	put(o, "ratio", num(r->snr), bad);
	put(o, "db", num(sch_report_db(r->snr)), bad);
	put(o, "signal", num(r->signal), bad);
	put(o, "output_signal_v", num(r->signal * r->transfer.mid_band), bad);
	return o;
}

/* The whole document; NULL when out of memory. */
static json_t *result_json(const struct sch_result *r)
{
	json_t *doc = json_object();
	int bad = 0;

	put(doc, "schema", json_integer(1), &bad);
	put(doc, "netlist", text(r->netlist), &bad);
	put(doc, "temperature_k", num(r->temp_k), &bad);
	put(doc, "simulator", text(r->sim_version), &bad);
	if (r->compat_mode)
		put(doc, "simulator_compat_mode", text(r->compat_mode), &bad);
	put(doc, "schrot_version", text(SCH_VERSION), &bad);
	if (r->n_freq > 0) {
		put(doc, "output", text(r->output), &bad);
		put(doc, "input", text(r->input), &bad);
		put(doc, "input_unit", text(r->input_unit), &bad);
		put(doc, "band_hz", band_json(r, &bad), &bad);
		if (r->spot_run) /* one frequency: band figures are null, spot figures hold it */
			put(doc, "spot_run", json_true(), &bad);
		put(doc, "total", total_json(r, &bad), &bad);
		put(doc, "transfer", transfer_json(r, &bad), &bad);
		put(doc, "verdict", verdict_json(r, &bad), &bad);
		put(doc, "spot", spots_json(r, &bad), &bad);
		put(doc, "contributions", contributions_json(r, &bad), &bad);
		put(doc, "responsivity_a_per_w", num(r->responsivity_a_per_w), &bad);
		put(doc, "input_gain_m", num(r->input_gain_m), &bad);
		if (!isnan(r->signal))
			put(doc, "snr", snr_json(r, &bad), &bad);
		put(doc, "notes", notes_json(r, &bad), &bad);
	}
	put(doc, "carriers", carriers_json(r, &bad), &bad);
	put(doc, "noiseless_sources", noiseless_json(r, &bad), &bad);
	if (bad) {
		json_decref(doc);
		return NULL;
	}
	return doc;
}

enum sch_err sch_report_json(const struct sch_result *r, const char *path, struct sch_diag *d)
{
	enum sch_err ret = SCH_ERR_NOMEM;
	struct sch_outfile o = { 0 };
	json_t *doc = result_json(r);
	bool open = false;

	if (!doc) {
		ret = sch_diag_error(d, SCH_ERR_NOMEM, path, 0, "out of memory building the JSON report");
		goto out;
	}
	ret = sch_outfile_open(&o, path, d);
	if (ret != SCH_OK)
		goto out;
	open = true;
	if (json_dumpf(doc, o.fp, JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(17)) != 0 ||
	    fputc('\n', o.fp) == EOF) {
		ret = sch_diag_error(d, SCH_ERR_IO, path, 0, "cannot write the JSON report");
		goto out;
	}
	open = false;
	ret = sch_outfile_commit(&o, d);
out:
	if (open)
		sch_outfile_abort(&o);
	json_decref(doc);
	return ret;
}
