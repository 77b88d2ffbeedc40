/* SPDX-License-Identifier: BSD-3-Clause */
/* test_report.c - every output of a result, checked on a hand-built result of a photodiode receiver. */
#include <dirent.h>
#include <jansson.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include "check.h"
#include "schrot/analysis.h"
#include "schrot/physics.h"
#include "schrot/report.h"
#include "schrot/spectra.h"

#define N_FREQ 31
#define N_CONTRIB 4

/*
 * fontconfig (loaded by cairo for the plot's text) keeps its configuration for the life of the
 * process; LeakSanitizer would count that as a leak of ours.
 */
const char *__lsan_default_suppressions(void);
const char *__lsan_default_suppressions(void)
{
	return "leak:libfontconfig\n";
}

/* A scratch file name in the test's private directory; each call has its own storage. */
static const char *scratch(struct sch_arena *a, const char *name)
{
	return sch_arena_printf(a, "%s/%s", check_scratch_dir(), name);
}

static char *slurp(const char *path, size_t *len)
{
	FILE *fp = fopen(path, "rb");
	char *buf = NULL;
	long n;

	if (!fp)
		return NULL;
	fseek(fp, 0, SEEK_END);
	n = ftell(fp);
	rewind(fp);
	buf = malloc((size_t)n + 1);
	if (buf && fread(buf, 1, (size_t)n, fp) != (size_t)n) {
		free(buf);
		buf = NULL;
	}
	if (buf)
		buf[n] = '\0';
	if (len)
		*len = (size_t)n;
	fclose(fp);
	return buf;
}

static void write_text(const char *path, const char *text)
{
	FILE *fp = fopen(path, "w");

	if (fp) {
		fputs(text, fp);
		fclose(fp);
	}
}

static int by_share(const void *a, const void *b)
{
	double x = ((const struct sch_contribution *)a)->share, y = ((const struct sch_contribution *)b)->share;

	return x < y ? 1 : x > y ? -1 : 0;
}

/*
 * An invented canopy light probe: 10 nA photocurrent into a 1 MOhm transimpedance, an op amp with
 * flicker noise, and a junction correction that removes a little of the simulator's diode noise.
 */
static void fake_result(struct sch_result *r)
{
	struct sch_arena *a;
	static const double spot_hz[] = { 1e3, 1e4 };
	static const char *const notes[] = { "junction correction applied to x1.d1",
					     "AC 1 supplied for input source 'iph'" };
	static const char *const files[] = { "canopy probe.cir", "lib/op amp.lib", "models/$pd.inc" };
	const double rf = 1e6, fc = 2e4;

	sch_result_init(r);
	a = &r->arena;
	r->deck.files = (const char **)files;
	r->deck.n_files = 3;
	r->netlist = "canopy probe.cir";
	r->sim_version = "ngspice-39";
	r->temp_k = 300.15;
	r->output = "v(out)";
	r->input = "iph";
	r->input_unit = "A";
	r->band_lo_hz = 10;
	r->band_hi_hz = 1e5;
	r->n_freq = N_FREQ;
	r->freq_hz = sch_arena_alloc(a, N_FREQ * sizeof(double));
	r->total_psd = sch_arena_alloc(a, N_FREQ * sizeof(double));
	r->gain2 = sch_arena_alloc(a, N_FREQ * sizeof(double));
	r->n_contributions = N_CONTRIB;
	r->contributions = sch_arena_alloc(a, N_CONTRIB * sizeof(*r->contributions));
	for (size_t k = 0; k < N_FREQ; k++) {
		double f = pow(10.0, (double)k / 5.0);
		r->freq_hz[k] = f;
		r->gain2[k] = rf * rf / (1 + f * f / (fc * fc));
	}
	{
		static const char *const dev[N_CONTRIB] = { "x1.iph", "rf", "u1", "x1.d1" };
		static const char *const gen[N_CONTRIB] = { "shot", "thermal", "1overf", "id" };
		static const enum sch_mechanism mech[N_CONTRIB] = { SCH_MECH_SHOT, SCH_MECH_THERMAL,
								    SCH_MECH_FLICKER, SCH_MECH_SHOT };
		static const enum sch_origin orig[N_CONTRIB] = { SCH_ORIGIN_ADDED, SCH_ORIGIN_SIMULATOR,
								 SCH_ORIGIN_SIMULATOR, SCH_ORIGIN_CORRECTION };
		const double dc[N_CONTRIB] = { 10e-9, NAN, NAN, -1e-12 };
		for (size_t i = 0; i < N_CONTRIB; i++) {
			struct sch_contribution *c = &r->contributions[i];
			c->device = dev[i];
			c->generator = gen[i];
			c->mechanism = mech[i];
			c->origin = orig[i];
			c->dc_current_a = dc[i];
			c->psd = sch_arena_alloc(a, N_FREQ * sizeof(double));
			for (size_t k = 0; k < N_FREQ; k++) {
				double f = r->freq_hz[k], g2 = r->gain2[k];
				double psd = i == 0   ? sch_shot_density(10e-9, 1) * g2
					     : i == 1 ? 4 * SCH_K * r->temp_k / rf * g2
					     : i == 2 ? 2e-16 * (1 + 100 / f) * (1 + f / 1e4)
						      : -0.05 * sch_shot_density(10e-9, 1) * g2;
				c->psd[k] = psd;
				r->total_psd[k] += psd;
			}
		}
	}
	r->n_spots = 2;
	r->spots = sch_arena_alloc(a, 2 * sizeof(*r->spots));
	for (size_t i = 0; i < N_CONTRIB; i++) {
		struct sch_contribution *c = &r->contributions[i];
		c->band_power = sch_spectra_band_power(r->freq_hz, c->psd, N_FREQ, 10, 1e5);
		c->output_rms_v = sqrt(fabs(c->band_power));
		c->spot_density = sch_arena_alloc(a, 2 * sizeof(double));
		for (size_t j = 0; j < 2; j++)
			c->spot_density[j] = sqrt(fabs(sch_spectra_at(r->freq_hz, c->psd, N_FREQ, spot_hz[j])));
		if (c->origin == SCH_ORIGIN_ADDED)
			r->carrier_power_v2 += c->band_power;
	}
	for (size_t i = 0; i < N_CONTRIB; i++)
		r->total_power_v2 += r->contributions[i].band_power;
	for (size_t i = 0; i < N_CONTRIB; i++)
		r->contributions[i].share = r->contributions[i].band_power / r->total_power_v2;
	r->output_rms_v = sqrt(r->total_power_v2);
	qsort(r->contributions, N_CONTRIB, sizeof(*r->contributions), by_share);
	r->input_rms = r->output_rms_v / rf;
	r->responsivity_a_per_w = 0.5;
	for (size_t j = 0; j < 2; j++) {
		struct sch_spot *s = &r->spots[j];
		s->freq_hz = spot_hz[j];
		s->output_v_per_rthz = sqrt(sch_spectra_at(r->freq_hz, r->total_psd, N_FREQ, spot_hz[j]));
		s->input_per_rthz = s->output_v_per_rthz / sqrt(sch_spectra_at(r->freq_hz, r->gain2, N_FREQ, spot_hz[j]));
		s->nep_w_per_rthz = j == 0 ? s->input_per_rthz / 0.5 : NAN;
	}
	r->signal = 1e-9;
	r->snr = r->signal * r->signal / (r->input_rms * r->input_rms);
	r->notes = (const char **)notes;
	r->n_notes = 2;
	r->set.n_carriers = 2;
	r->set.carriers = sch_arena_alloc(a, 2 * sizeof(*r->set.carriers));
	r->set.carriers[0] = (struct sch_carrier){ .name = "x1.iph", .sim_name = "i.x1.iph", .why = SCH_WHY_DIODE,
						    .reason = "shares nodes with diode x1.d1; name rule",
						    .gain_m = 1, .excess_f = 1, .dc_current_a = 10e-9 };
	r->set.carriers[1] = (struct sch_carrier){ .name = "xapd.idark", .sim_name = "i.xapd.idark",
						    .why = SCH_WHY_AVALANCHE, .reason = "named by --avalanche",
						    .gain_m = 20, .excess_f = sch_mcintyre_f(20, 0.02),
						    .dc_current_a = -2e-10 };
	r->set.n_noiseless = 1;
	r->set.noiseless = sch_arena_alloc(a, sizeof(*r->set.noiseless));
	r->set.noiseless[0] = (struct sch_source){ .name = "ibias", .sim_name = "ibias", .dc_current_a = 1e-6 };
}

static void release(struct sch_result *r)
{
	r->deck.files = NULL;
	r->deck.n_files = 0;
	sch_result_release(r);
}

static double real(json_t *v)
{
	return json_is_number(v) ? json_number_value(v) : NAN;
}

static json_t *get(json_t *o, const char *key)
{
	json_t *v = json_object_get(o, key);

	if (!v)
		fprintf(stderr, "missing key '%s'\n", key);
	return v;
}

static void test_report__json_round_trips_every_schema_key(void)
{
	struct sch_result r;
	struct sch_diag d;
	json_error_t err;
	json_t *doc, *spot, *c0, *k1;
	const char *path;

	fake_result(&r);
	sch_diag_init(&d, stderr, 0);
	path = scratch(&r.arena, "report.json");
	CHECK(sch_report_json(&r, path, &d) == SCH_OK);
	doc = json_load_file(path, 0, &err);
	CHECK(doc != NULL);
	if (!doc)
		goto out;
	CHECK(json_integer_value(get(doc, "schema")) == 1);
	CHECK_STR(json_string_value(get(doc, "netlist")), "canopy probe.cir");
	CHECK(real(get(doc, "temperature_k")) == 300.15);
	CHECK_STR(json_string_value(get(doc, "output")), "v(out)");
	CHECK_STR(json_string_value(get(doc, "input")), "iph");
	CHECK_STR(json_string_value(get(doc, "input_unit")), "A");
	CHECK(json_array_size(get(doc, "band_hz")) == 2);
	CHECK(real(json_array_get(get(doc, "band_hz"), 0)) == 10);
	CHECK(real(json_array_get(get(doc, "band_hz"), 1)) == 1e5);
	CHECK(real(get(get(doc, "total"), "output_rms_v")) == r.output_rms_v);
	CHECK(real(get(get(doc, "total"), "input_rms")) == r.input_rms);
	spot = get(doc, "spot");
	CHECK(json_array_size(spot) == 2);
	CHECK(real(get(json_array_get(spot, 0), "frequency_hz")) == 1e3);
	CHECK(real(get(json_array_get(spot, 0), "output_v_per_rthz")) == r.spots[0].output_v_per_rthz);
	CHECK(real(get(json_array_get(spot, 0), "input_per_rthz")) == r.spots[0].input_per_rthz);
	CHECK(real(get(json_array_get(spot, 0), "nep_w_per_rthz")) == r.spots[0].nep_w_per_rthz);
	CHECK(json_is_null(get(json_array_get(spot, 1), "nep_w_per_rthz")));
	CHECK(json_array_size(get(doc, "contributions")) == N_CONTRIB);
	c0 = json_array_get(get(doc, "contributions"), 0);
	CHECK_STR(json_string_value(get(c0, "device")), r.contributions[0].device);
	CHECK_STR(json_string_value(get(c0, "generator")), r.contributions[0].generator);
	CHECK_STR(json_string_value(get(c0, "mechanism")), sch_mechanism_name(r.contributions[0].mechanism));
	CHECK_STR(json_string_value(get(c0, "origin")), sch_origin_name(r.contributions[0].origin));
	CHECK(get(c0, "dc_current_a") != NULL);
	CHECK(real(get(c0, "output_rms_v")) == r.contributions[0].output_rms_v);
	CHECK(real(get(c0, "share")) == r.contributions[0].share);
	CHECK(json_array_size(get(c0, "spot_v_per_rthz")) == 2);
	CHECK(real(json_array_get(get(c0, "spot_v_per_rthz"), 1)) == r.contributions[0].spot_density[1]);
	CHECK(json_array_size(get(doc, "carriers")) == 2);
	k1 = json_array_get(get(doc, "carriers"), 1);
	CHECK_STR(json_string_value(get(k1, "name")), "xapd.idark");
	CHECK(real(get(k1, "dc_current_a")) == -2e-10);
	CHECK_STR(json_string_value(get(k1, "reason")), "named by --avalanche");
	CHECK(real(get(k1, "gain")) == 20);
	CHECK(real(get(k1, "excess_factor")) == r.set.carriers[1].excess_f);
	CHECK_REL(real(get(k1, "density_a_per_rthz")),
		  sqrt(2 * SCH_Q * 2e-10 * 20 * sch_mcintyre_f(20, 0.02)), 1e-15);
	CHECK(json_array_size(get(doc, "noiseless_sources")) == 1);
	CHECK_STR(json_string_value(get(json_array_get(get(doc, "noiseless_sources"), 0), "name")), "ibias");
	CHECK(real(get(json_array_get(get(doc, "noiseless_sources"), 0), "dc_current_a")) == 1e-6);
	CHECK(real(get(get(doc, "snr"), "ratio")) == r.snr);
	CHECK_REL(real(get(get(doc, "snr"), "db")), 10 * log10(r.snr), 1e-15);
	CHECK_STR(json_string_value(get(doc, "simulator")), "ngspice-39");
	CHECK(json_array_size(get(doc, "notes")) == 2);
out:
	json_decref(doc);
	release(&r);
}

static void test_report__json_writes_null_for_nan(void)
{
	struct sch_result r;
	struct sch_diag d;
	json_t *doc;
	const char *path;
	size_t thermal = N_CONTRIB;

	fake_result(&r);
	sch_diag_init(&d, stderr, 0);
	path = scratch(&r.arena, "nan.json");
	r.contributions[0].output_rms_v = INFINITY;
	CHECK(sch_report_json(&r, path, &d) == SCH_OK);
	doc = json_load_file(path, 0, NULL);
	CHECK(doc != NULL);
	for (size_t i = 0; i < N_CONTRIB; i++)
		if (strcmp(r.contributions[i].device, "rf") == 0)
			thermal = i;
	CHECK(thermal < N_CONTRIB);
	CHECK(json_is_null(json_object_get(json_array_get(json_object_get(doc, "contributions"), thermal),
					   "dc_current_a")));
	CHECK(json_is_null(json_object_get(json_array_get(json_object_get(doc, "contributions"), 0),
					   "output_rms_v")));
	json_decref(doc);
	release(&r);
}

static void test_report__json_of_operating_point_run_has_carrier_keys_only(void)
{
	struct sch_result r;
	struct sch_diag d;
	json_t *doc;
	const char *path;
	static const char *const allowed[] = { "schema", "netlist", "temperature_k", "carriers",
					       "noiseless_sources", "simulator", "schrot_version" };
	const char *key;
	json_t *value;

	fake_result(&r);
	r.n_freq = 0;
	sch_diag_init(&d, stderr, 0);
	path = scratch(&r.arena, "op.json");
	CHECK(sch_report_json(&r, path, &d) == SCH_OK);
	doc = json_load_file(path, 0, NULL);
	CHECK(doc != NULL);
	CHECK(json_array_size(json_object_get(doc, "carriers")) == 2);
	CHECK(json_object_get(doc, "contributions") == NULL);
	CHECK(json_object_get(doc, "total") == NULL);
	json_object_foreach(doc, key, value)
	{
		int ok = 0;
		(void)value;
		for (size_t i = 0; i < sizeof(allowed) / sizeof(allowed[0]); i++)
			ok |= strcmp(key, allowed[i]) == 0;
		CHECK(ok);
	}
	json_decref(doc);
	release(&r);
}

static void test_report__json_keeps_non_utf8_netlist_names_readable(void)
{
	struct sch_result r;
	struct sch_diag d;
	json_t *doc;
	const char *path;

	fake_result(&r);
	r.netlist = "sonde_\xe9t\xe9.cir";
	sch_diag_init(&d, stderr, 0);
	path = scratch(&r.arena, "latin1.json");
	CHECK(sch_report_json(&r, path, &d) == SCH_OK);
	doc = json_load_file(path, 0, NULL);
	CHECK(doc != NULL);
	CHECK_STR(json_string_value(json_object_get(doc, "netlist")), "sonde_\xef\xbf\xbdt\xef\xbf\xbd.cir");
	json_decref(doc);
	release(&r);
}

/* Splits a CSV line with no quoted fields into fields (in place). */
static int split(char *line, char **field, int max)
{
	int n = 0;

	field[n++] = line;
	for (char *p = line; *p && n < max; p++)
		if (*p == ',') {
			*p = '\0';
			field[n++] = p + 1;
		}
	return n;
}

static void test_report__csv_share_column_sums_to_one_with_a_negative_correction(void)
{
	struct sch_result r;
	struct sch_diag d;
	char *text, *line, *save = NULL, *field[16];
	const char *path;
	double sum = 0;
	int rows = 0, negative = 0, n;

	fake_result(&r);
	sch_diag_init(&d, stderr, 0);
	path = scratch(&r.arena, "contrib.csv");
	CHECK(sch_report_csv(&r, path, &d) == SCH_OK);
	text = slurp(path, NULL);
	CHECK(text != NULL);
	if (!text)
		goto out;
	line = strtok_r(text, "\n", &save);
	CHECK_STR(line, "device,generator,mechanism,origin,dc_current_a,output_rms_v,share,"
			"spot_1000_hz_v_per_rthz,spot_10000_hz_v_per_rthz");
	while ((line = strtok_r(NULL, "\n", &save))) {
		n = split(line, field, 16);
		CHECK(n == 9);
		if (n < 9)
			continue;
		CHECK_STR(field[0], r.contributions[rows].device);
		CHECK_REL(strtod(field[6], NULL), r.contributions[rows].share, 1e-11);
		sum += strtod(field[6], NULL);
		if (strcmp(field[3], "correction") == 0) {
			negative = field[6][0] == '-';
			CHECK_STR(field[4], "-1e-12");
		}
		if (strcmp(field[0], "rf") == 0)
			CHECK_STR(field[4], "");
		rows++;
	}
	CHECK(rows == N_CONTRIB);
	CHECK(negative);
	CHECK_REL(sum, 1.0, 1e-10);
out:
	free(text);
	release(&r);
}

static void test_report__csv_quotes_names_with_commas(void)
{
	struct sch_result r;
	struct sch_diag d;
	char *text;
	const char *path;

	fake_result(&r);
	r.contributions[0].device = "x\"1,a";
	sch_diag_init(&d, stderr, 0);
	path = scratch(&r.arena, "quoted.csv");
	CHECK(sch_report_csv(&r, path, &d) == SCH_OK);
	text = slurp(path, NULL);
	CHECK(text && strstr(text, "\n\"x\"\"1,a\",") != NULL);
	free(text);
	release(&r);
}

static void test_report__spectrum_has_one_row_per_frequency_and_the_rest(void)
{
	struct sch_result r;
	struct sch_diag d;
	char *text, *line, *save = NULL, *field[16];
	const char *path;
	size_t rows = 0;

	fake_result(&r);
	sch_diag_init(&d, stderr, 0);
	path = scratch(&r.arena, "spectrum.csv");
	CHECK(sch_report_spectrum(&r, path, 2, &d) == SCH_OK);
	text = slurp(path, NULL);
	CHECK(text != NULL);
	if (!text)
		goto out;
	line = strtok_r(text, "\n", &save);
	CHECK(line && strncmp(line, "frequency [Hz],total [V/rtHz],", 30) == 0);
	CHECK(line && strstr(line, ",rest [V/rtHz],transfer [V/A]") != NULL);
	CHECK(line && strstr(line, "rf thermal [V/rtHz]") != NULL);
	while ((line = strtok_r(NULL, "\n", &save))) {
		int n = split(line, field, 16);
		double rest, top;
		CHECK(n == 6);
		if (n < 6 || rows >= r.n_freq)
			continue;
		CHECK_REL(strtod(field[0], NULL), r.freq_hz[rows], 1e-11);
		CHECK_REL(strtod(field[1], NULL), sqrt(r.total_psd[rows]), 1e-11);
		CHECK_REL(strtod(field[2], NULL), sqrt(fabs(r.contributions[0].psd[rows])), 1e-11);
		top = r.contributions[0].psd[rows] + r.contributions[1].psd[rows];
		rest = sqrt(fabs(r.total_psd[rows] - top));
		CHECK_REL(strtod(field[4], NULL), rest, 1e-9);
		CHECK_REL(strtod(field[5], NULL), sqrt(r.gain2[rows]), 1e-11); /* |transfer|, V/A */
		rows++;
	}
	CHECK(rows == r.n_freq);
out:
	free(text);
	release(&r);
}

static void test_report__depfile_escapes_spaces_and_dollars(void)
{
	struct sch_result r;
	struct sch_diag d;
	static const char *const targets[] = { "out/report.json", "noise plot.svg" };
	char *text;
	const char *path;

	fake_result(&r);
	sch_diag_init(&d, stderr, 0);
	path = scratch(&r.arena, "report.d");
	CHECK(sch_report_depfile(&r, path, targets, 2, &d) == SCH_OK);
	text = slurp(path, NULL);
	CHECK_STR(text, "out/report.json noise\\ plot.svg: canopy\\ probe.cir lib/op\\ amp.lib \\\n"
			" models/$$pd.inc\n"
			"\nlib/op\\ amp.lib:\n"
			"\nmodels/$$pd.inc:\n");
	free(text);
	release(&r);
}

static void test_report__depfile_without_a_target_is_a_usage_error(void)
{
	struct sch_result r;
	struct sch_diag d;
	const char *path;

	fake_result(&r);
	sch_diag_init(&d, NULL, 0);
	path = scratch(&r.arena, "none.d");
	CHECK(sch_report_depfile(&r, path, NULL, 0, &d) == SCH_ERR_USAGE);
	CHECK(access(path, F_OK) != 0);
	release(&r);
}

static void test_report__plot_writes_a_png(void)
{
	struct sch_result r;
	struct sch_diag d;
	char *data;
	size_t len = 0;
	const char *path;

	fake_result(&r);
	sch_diag_init(&d, stderr, 0);
	path = scratch(&r.arena, "noise.png");
	CHECK(sch_report_plot(&r, path, &d) == SCH_OK);
	data = slurp(path, &len);
	CHECK(data && len > 1000 && memcmp(data, "\x89PNG\r\n\x1a\n", 8) == 0);
	if (getenv("SCH_KEEP_PLOT"))
		CHECK(sch_report_plot(&r, getenv("SCH_KEEP_PLOT"), &d) == SCH_OK);
	free(data);
	release(&r);
}

static void test_report__plot_writes_an_svg(void)
{
	struct sch_result r;
	struct sch_diag d;
	char *data;
	const char *path;

	fake_result(&r);
	sch_diag_init(&d, stderr, 0);
	path = scratch(&r.arena, "noise.SVG");
	CHECK(sch_report_plot(&r, path, &d) == SCH_OK);
	data = slurp(path, NULL);
	CHECK(data && strstr(data, "<svg") != NULL && strstr(data, "</svg>") != NULL);
	free(data);
	release(&r);
}

static void test_report__plot_refuses_other_extensions(void)
{
	struct sch_result r;
	struct sch_diag d;
	const char *path;

	fake_result(&r);
	sch_diag_init(&d, NULL, 0);
	path = scratch(&r.arena, "noise.pdf");
	CHECK(sch_report_plot(&r, path, &d) == SCH_ERR_USAGE);
	CHECK(access(path, F_OK) != 0);
	release(&r);
}

static void test_report__failed_plot_leaves_the_earlier_file_untouched(void)
{
	struct sch_result r;
	struct sch_diag d;
	char *text;
	const char *path;

	fake_result(&r);
	sch_diag_init(&d, NULL, 0);
	path = scratch(&r.arena, "earlier.png");
	write_text(path, "earlier run");
	for (size_t i = 0; i < r.n_freq; i++)
		r.total_psd[i] = 0;
	for (size_t i = 0; i < r.n_contributions; i++)
		r.contributions[i].psd = NULL;
	CHECK(sch_report_plot(&r, path, &d) != SCH_OK);
	text = slurp(path, NULL);
	CHECK_STR(text, "earlier run");
	free(text);
	release(&r);
}

static char *table_text(const struct sch_result *r, enum sch_err (*fn)(const struct sch_result *, FILE *))
{
	char *text = NULL;
	size_t len = 0;
	FILE *fp = open_memstream(&text, &len);

	if (!fp)
		return NULL;
	CHECK(fn(r, fp) == SCH_OK);
	fclose(fp);
	return text;
}

static void test_report__table_leads_with_the_headline_figures(void)
{
	struct sch_result r;
	char *text;

	fake_result(&r);
	text = table_text(&r, sch_report_table);
	CHECK(text != NULL);
	if (!text)
		goto out;
	CHECK(strstr(text, "canopy probe.cir") != NULL);
	CHECK(strstr(text, "300.15 K (27.00 °C)") != NULL);
	CHECK(strstr(text, "V rms") != NULL);
	CHECK(strstr(text, "A rms") != NULL);
	CHECK(strstr(text, "dB") != NULL);
	CHECK(strstr(text, "W/√Hz") != NULL);
	CHECK(strstr(text, "A/√Hz") != NULL);
	CHECK(strstr(text, "10.0 Hz to 100 kHz") != NULL);
	if (getenv("SCH_SHOW_TABLE"))
		fputs(text, stdout);
out:
	free(text);
	release(&r);
}

static void test_report__table_ranks_rows_and_signs_the_correction(void)
{
	struct sch_result r;
	char *text, *rf, *iph, *corr, *line_end;

	fake_result(&r);
	text = table_text(&r, sch_report_table);
	CHECK(text != NULL);
	if (!text)
		goto out;
	rf = strstr(text, "\n  1  rf ");
	iph = strstr(text, "  x1.iph ");
	corr = strstr(text, " correction ");
	CHECK(rf && iph && corr && rf < iph && iph < corr);
	if (corr) {
		line_end = strchr(corr, '\n');
		CHECK(line_end && memchr(corr, '%', (size_t)(line_end - corr)));
		CHECK(strstr(corr, "  -") && strstr(corr, "  -") < line_end);
	}
	CHECK(strstr(text, "100.0 %\n") != NULL);
out:
	free(text);
	release(&r);
}

static void test_report__carriers_table_lists_noiseless_sources(void)
{
	struct sch_result r;
	char *text;

	fake_result(&r);
	text = table_text(&r, sch_report_carriers_table);
	CHECK(text != NULL);
	if (!text)
		goto out;
	CHECK(strstr(text, "x1.iph") != NULL);
	CHECK(strstr(text, "named by --avalanche") != NULL);
	CHECK(strstr(text, "56.6 fA/√Hz") != NULL); /* sqrt(2q * 10 nA) */
	CHECK(strstr(text, "ibias") != NULL && strstr(text, "1.00 µA") != NULL);
	CHECK(strstr(text, "noiseless") != NULL);
	if (getenv("SCH_SHOW_TABLE"))
		fputs(text, stdout);
out:
	free(text);
	release(&r);
}

static void test_report__html_escapes_netlist_text_and_inlines_the_plot(void)
{
	struct sch_result r;
	struct sch_diag d;
	char *text;
	const char *path;

	fake_result(&r);
	r.netlist = "<b>probe & co</b>.cir";
	r.contributions[0].device = "x<1>";
	sch_diag_init(&d, stderr, 0);
	path = scratch(&r.arena, "review.html");
	CHECK(sch_report_html(&r, path, &d) == SCH_OK);
	text = slurp(path, NULL);
	CHECK(text != NULL);
	if (!text)
		goto out;
	CHECK(strstr(text, "&lt;b&gt;probe &amp; co&lt;/b&gt;.cir") != NULL);
	CHECK(strstr(text, "<b>probe") == NULL);
	CHECK(strstr(text, "x&lt;1&gt;") != NULL);
	CHECK(strstr(text, "<svg") != NULL);
	CHECK(strstr(text, "<?xml") == NULL);
	CHECK(strstr(text, "junction correction applied to x1.d1") != NULL);
	CHECK(strstr(text, "named by --avalanche") != NULL);
	CHECK(strstr(text, "simulator: ngspice-39") != NULL);
	CHECK(strstr(text, "</html>\n") != NULL);
	if (getenv("SCH_KEEP_HTML"))
		CHECK(sch_report_html(&r, getenv("SCH_KEEP_HTML"), &d) == SCH_OK);
out:
	free(text);
	release(&r);
}

static void test_report__json_to_missing_directory_fails_and_names_the_file(void)
{
	struct sch_result r;
	struct sch_diag d;
	const char *path;

	fake_result(&r);
	sch_diag_init(&d, NULL, 0);
	path = scratch(&r.arena, "gone/report.json");
	CHECK(sch_report_json(&r, path, &d) == SCH_ERR_IO);
	CHECK(strstr(d.first_error, "gone/report.json") != NULL);
	release(&r);
}

CHECK_MAIN(CASE(test_report__json_round_trips_every_schema_key), CASE(test_report__json_writes_null_for_nan),
	   CASE(test_report__json_of_operating_point_run_has_carrier_keys_only),
	   CASE(test_report__json_keeps_non_utf8_netlist_names_readable),
	   CASE(test_report__csv_share_column_sums_to_one_with_a_negative_correction),
	   CASE(test_report__csv_quotes_names_with_commas),
	   CASE(test_report__spectrum_has_one_row_per_frequency_and_the_rest),
	   CASE(test_report__depfile_escapes_spaces_and_dollars),
	   CASE(test_report__depfile_without_a_target_is_a_usage_error), CASE(test_report__plot_writes_a_png),
	   CASE(test_report__plot_writes_an_svg), CASE(test_report__plot_refuses_other_extensions),
	   CASE(test_report__failed_plot_leaves_the_earlier_file_untouched),
	   CASE(test_report__table_leads_with_the_headline_figures),
	   CASE(test_report__table_ranks_rows_and_signs_the_correction),
	   CASE(test_report__carriers_table_lists_noiseless_sources),
	   CASE(test_report__html_escapes_netlist_text_and_inlines_the_plot),
	   CASE(test_report__json_to_missing_directory_fails_and_names_the_file))
