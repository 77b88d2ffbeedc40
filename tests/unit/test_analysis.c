/* SPDX-License-Identifier: BSD-3-Clause */
/* test_analysis.c - unit tests of the analysis rooms: the noise plan, the sweep crossover and one whole run. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "check.h"
#include "schrot/analysis.h"
#include "schrot/physics.h"

#define INLINE_NAME "inline.cir"

static struct sch_diag diag;

/* Every row points at a device and a density, and the shares of a result sum to 1. */
static void assert_sane_result(const struct sch_result *res)
{
	double shares = 0;

	CHECK(res->n_freq >= 2 && res->freq_hz && res->total_psd && res->gain2);
	for (size_t c = 0; c < res->n_contributions; c++) {
		const struct sch_contribution *ct = &res->contributions[c];
		CHECK(ct->device && ct->generator && ct->psd && ct->device_count >= 1);
		if (c > 0)
			CHECK(res->contributions[c - 1].band_power >= ct->band_power);
		shares += ct->share;
	}
	CHECK_REL(shares, 1.0, 1e-12);
}

static enum sch_err load_text(struct sch_deck *deck, const char *text)
{
	sch_deck_init(deck);
	sch_diag_init(&diag, NULL, 0);
	return sch_deck_load_text(deck, INLINE_NAME, text, strlen(text), &diag);
}

static void test_analysis__noise_command_from_the_card(void)
{
	struct sch_deck deck;
	struct sch_arena arena;
	struct sch_run_options opt;
	const char *command = NULL, *ac_source = NULL;

	sch_arena_init(&arena);
	sch_run_options_init(&opt);
	CHECK(load_text(&deck, "t\niph 0 OUT dc 1u\nr1 out 0 1k\n.noise V( Out ) IPH dec 10 1 1k 1\n.end\n") == SCH_OK);
	CHECK(sch_analysis_noise_command(&deck, &opt, &arena, &command, &ac_source, &diag) == SCH_OK);
	CHECK_STR(command, "noise v(out) iph dec 10 1 1000 1");
	/* no AC value of its own: the run supplies one */
	CHECK_STR(ac_source, "iph");
	sch_deck_release(&deck);
	sch_arena_release(&arena);
}

static void test_analysis__noise_command_options_override_the_card(void)
{
	struct sch_deck deck;
	struct sch_arena arena;
	struct sch_run_options opt;
	const char *command = NULL, *ac_source = "untouched";

	sch_arena_init(&arena);
	sch_run_options_init(&opt);
	opt.output_expr = "v(a, b)";
	opt.input_src = "vin";
	opt.have_freq = true;
	opt.freq.f_start = 10;
	opt.freq.f_stop = 1e5;
	opt.freq.points_per_decade = 5;
	CHECK(load_text(&deck, "t\nvin a 0 dc 0 ac 1\nr1 a b 1k\nr2 b 0 1k\n.end\n") == SCH_OK);
	CHECK(sch_analysis_noise_command(&deck, &opt, &arena, &command, &ac_source, &diag) == SCH_OK);
	CHECK_STR(command, "noise v(a,b) vin dec 5 10 100000 1");
	CHECK(ac_source == NULL);
	sch_deck_release(&deck);
	sch_arena_release(&arena);
}

static void test_analysis__noise_command_refuses_an_input_that_is_no_source(void)
{
	struct sch_deck deck;
	struct sch_arena arena;
	struct sch_run_options opt;
	const char *command = "untouched", *ac_source = "untouched";

	sch_arena_init(&arena);
	sch_run_options_init(&opt);
	CHECK(load_text(&deck, "t\niph 0 out dc 1u\nr1 out 0 1k\n.noise v(out) r1 dec 10 1 1k 1\n.end\n") == SCH_OK);
	CHECK(sch_analysis_noise_command(&deck, &opt, &arena, &command, &ac_source, &diag) == SCH_ERR_INPUT);
	CHECK(strstr(diag.first_error, "'r1' is not a voltage or current source") != NULL);
	CHECK_STR(command, "untouched");
	CHECK_STR(ac_source, "untouched");
	sch_deck_release(&deck);
	sch_arena_release(&arena);
}

/*
 * Shot noise 2qI (Schottky 1918, CHECK-VALUES S1) meets a resistor's 4kT/R (Johnson 1928, Nyquist
 * 1928, J1) at I = 2kT/(qR): 51.704000 nA for 1 Mohm at 300 K [CHECK-VALUES X2, derived]. The
 * ratio is a power law in I, which log-log interpolation follows exactly.
 */
static void test_analysis__crossover_at_two_kt_over_qr(void)
{
	const double r_ohm = 1e6, t_k = 300;
	double currents[] = { 1e-9, 1e-8, 1e-7, 1e-6 };
	struct sch_sweep_point p[4];

	for (size_t i = 0; i < 4; i++) {
		memset(&p[i], 0, sizeof(p[i]));
		p[i].value = currents[i];
		p[i].carrier_power_v2 = 2 * SCH_Q * currents[i];
		p[i].other_power_v2 = 4 * SCH_K * t_k / r_ohm;
	}
	CHECK_REL(sch_sweep_crossover(p, 4), 51.704000e-9, 1e-7);
	/* points that never cross: no crossover */
	CHECK(isnan(sch_sweep_crossover(p, 1)));
	p[0].carrier_power_v2 = p[1].carrier_power_v2 = p[2].carrier_power_v2 = p[3].carrier_power_v2 = 1e-30;
	CHECK(isnan(sch_sweep_crossover(p, 4)));
}

/*
 * A temperature sweep of a fixed current I into R: the shot-to-thermal ratio 2qI/(4kT/R) goes as
 * 1/T, so the crossover is T = qIR/(2k) in kelvin (CHECK-VALUES X2 solved for T, derived from the
 * Schottky and Johnson-Nyquist densities S1, J1). With I = 51.704 nA and R = 1 Mohm that is
 * 300.00 K = 26.85 C, found exactly on the kelvin scale between points at 10 C and 60 C.
 */
static void test_analysis__temperature_crossover_in_kelvin(void)
{
	const double i_a = 51.704e-9, r_ohm = 1e6;
	double temps_c[] = { -40, 10, 60, 110 };
	struct sch_sweep_point p[4];
	struct sch_sweep s;

	for (size_t i = 0; i < 4; i++) {
		memset(&p[i], 0, sizeof(p[i]));
		p[i].value = temps_c[i];
		p[i].carrier_power_v2 = 2 * SCH_Q * i_a;
		p[i].other_power_v2 = 4 * SCH_K * (temps_c[i] + SCH_ZERO_C_K) / r_ohm;
	}
	memset(&s, 0, sizeof(s));
	s.name = "temp";
	s.unit = "C";
	s.points = p;
	s.n_points = 4;
	CHECK_REL(sch_sweep_crossover_of(&s) + SCH_ZERO_C_K, SCH_Q * i_a * r_ohm / (2 * SCH_K), 1e-12);
	/* a current sweep keeps its own scale */
	s.unit = "A";
	CHECK_REL(sch_sweep_crossover_of(&s), sch_sweep_crossover(p, 4), 1e-15);
}

/*
 * A 1 uA detector current into 1 kohm: the added row is 2qI R^2 (CHECK-VALUES S3 times R^2) and
 * the resistor's own row 4kTR at the simulator's default 27 C (J1's formula, Johnson 1928 and
 * Nyquist 1928), both flat, so each band power is its density times the band width.
 */
static void test_analysis__report_rows_are_the_closed_forms(void)
{
	const char *dir = check_scratch_dir();
	char path[256];
	struct sch_run_options opt;
	struct sch_result res;
	FILE *f;

	snprintf(path, sizeof(path), "%s/detector.cir", dir);
	f = fopen(path, "w");
	CHECK(f != NULL);
	if (!f)
		return;
	fputs("detector into a load\niph 0 out dc 1u\nr1 out 0 1k\n.noise v(out) iph dec 10 1 1k 1\n.end\n", f);
	fclose(f);
	sch_run_options_init(&opt);
	sch_result_init(&res);
	sch_diag_init(&diag, NULL, 0);
	CHECK(sch_analysis_run(path, &opt, &res, &diag) == SCH_OK);
	assert_sane_result(&res);
	CHECK(res.n_contributions == 2);
	if (res.n_contributions == 2) {
		const struct sch_contribution *r1 = &res.contributions[0], *iph = &res.contributions[1];
		CHECK_STR(r1->device, "r1");
		CHECK(r1->mechanism == SCH_MECH_THERMAL && r1->origin == SCH_ORIGIN_SIMULATOR);
		CHECK_REL(r1->band_power, 4 * SCH_K * 300.15 * 1e3 * 999, 1e-6);
		CHECK_STR(iph->device, "iph");
		CHECK(iph->mechanism == SCH_MECH_SHOT && iph->origin == SCH_ORIGIN_ADDED);
		CHECK_REL(iph->band_power, 3.2043533e-25 * 1e6 * 999, 1e-7);
		CHECK(res.dominant_other == r1);
		CHECK_REL(res.shot_to_rest, iph->band_power / r1->band_power, 1e-12);
	}
	CHECK_REL(res.temp_k, 300.15, 1e-12);
	sch_result_release(&res);
}

CHECK_MAIN(CASE(test_analysis__noise_command_from_the_card), CASE(test_analysis__noise_command_options_override_the_card),
	   CASE(test_analysis__noise_command_refuses_an_input_that_is_no_source),
	   CASE(test_analysis__crossover_at_two_kt_over_qr),
	   CASE(test_analysis__temperature_crossover_in_kelvin), CASE(test_analysis__report_rows_are_the_closed_forms))
