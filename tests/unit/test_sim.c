/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * test_sim.c - facts about the simulator session (sim.h): results, physics, workers and safety.
 * How failures are judged: test_sim_judge.c.
 */
#include <errno.h>
#include <fcntl.h>
#include <limits.h>
#include <math.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "sim_fixture.h"

/* Exact SI 2019 values: BIPM, The International System of Units (SI Brochure), 9th ed., 2019. */
#define SI_Q 1.602176634e-19
#define SI_K 1.380649e-23
#define T_DEFAULT_K 300.15 /* ngspice's default circuit temperature, 27 degC */

/* A scratch directory under /tmp for marker files; removed by scratch_release. */
struct scratch {
	char dir[64];
	char marker[128];
};

static void scratch_init(struct scratch *s)
{
	snprintf(s->dir, sizeof(s->dir), "/tmp/schrot-test-sim-XXXXXX");
	if (!mkdtemp(s->dir)) {
		perror("mkdtemp");
		abort();
	}
	snprintf(s->marker, sizeof(s->marker), "%s/pwned", s->dir);
}

static bool marker_exists(const struct scratch *s)
{
	return access(s->marker, F_OK) == 0;
}

static void write_file(const char *path, const char *text)
{
	FILE *f = fopen(path, "w");

	if (!f) {
		perror(path);
		abort();
	}
	fputs(text, f);
	fclose(f);
}

/* Removes the scratch tree (two levels are all these tests make). */
static void scratch_release(struct scratch *s)
{
	char cmd[200];

	snprintf(cmd, sizeof(cmd), "rm -rf '%s'", s->dir);
	if (system(cmd) != 0)
		fprintf(stderr, "could not remove %s\n", s->dir);
}

static const char *const op_cmd[] = { "op" };
static const struct sch_sim_step op_step[] = { { op_cmd, 1, NULL, 0 } };

static const char *const divider[] = {
	"resistor divider", "v1 in 0 dc 10", "r1 in out 1k", "r2 out 0 4k", ".end",
};

static void test_sim__divider_current_obeys_ohms_law(void)
{
	static const char *const q[] = { "@r1[i]", "v(out)" };
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(divider, N_OF(divider), op_step, 1, q, 2, false, &res, &d) == SCH_OK);
	assert_sane_result(&res, 1);
	CHECK(res.failure == NULL);
	/* Ohm's law: I = V / (R1 + R2) = 10 V / 5 kOhm; V(out) = I * R2. */
	CHECK_REL(res.steps[0].quantities[0], 10.0 / 5000.0, 1e-9);
	CHECK_REL(res.steps[0].quantities[1], 10.0 * 4000.0 / 5000.0, 1e-9);
	CHECK(d.n_errors == 0);
	sch_sim_result_release(&res);
}

static void test_sim__reports_version_from_the_simulator(void)
{
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(divider, N_OF(divider), op_step, 1, NULL, 0, false, &res, &d) == SCH_OK);
	CHECK(res.version && strncmp(res.version, "ngspice-", 8) == 0);
	sch_sim_result_release(&res);
}

static void test_sim__forward_diode_voltage_matches_ideal_diode_equation(void)
{
	static const char *const deck[] = {
		"forward diode", "i1 0 a dc 1m", "d1 a 0 dmod", ".model dmod d is=1e-14 n=1.5", ".end",
	};
	static const char *const q[] = { "@d1[vd]" };
	struct sch_sim_result res;
	struct sch_diag d;
	/* Ideal diode: V = n*(kT/q)*ln(I/Is + 1); q and k from the SI Brochure, 9th ed. (BIPM 2019). */
	double expected = 1.5 * SI_K * T_DEFAULT_K / SI_Q * log(1e-3 / 1e-14 + 1.0);

	CHECK(run_deck(deck, N_OF(deck), op_step, 1, q, 1, false, &res, &d) == SCH_OK);
	assert_sane_result(&res, 1);
	/* 1e-5: ngspice uses CODATA 2014 q and k and puts gmin across the junction. */
	CHECK_REL(res.steps[0].quantities[0], expected, 1e-5);
	sch_sim_result_release(&res);
}

static const char *const johnson_deck[] = {
	"resistor across a current source", "i1 0 out dc 0 ac 1", "r1 out 0 1k", ".end",
};

static void test_sim__resistor_noise_density_is_4ktr(void)
{
	static const char *const cmd[] = { "noise v(out) i1 dec 5 10 100k 1" };
	static const struct sch_sim_step step[] = { { cmd, 1, NULL, 0 } };
	struct sch_sim_result res;
	struct sch_diag d;
	const struct sch_sim_vector *f, *total, *r1;
	/* Johnson-Nyquist: S_V = 4kTR (J. B. Johnson, Phys. Rev. 32, 97 (1928); H. Nyquist, Phys. Rev. 32, 110 (1928)). */
	double expected = 4.0 * SI_K * T_DEFAULT_K * 1000.0;

	CHECK(run_deck(johnson_deck, N_OF(johnson_deck), step, 1, NULL, 0, true, &res, &d) == SCH_OK);
	assert_sane_result(&res, 1);
	f = sch_sim_find_vector(&res.steps[0], "frequency");
	total = sch_sim_find_vector(&res.steps[0], "onoise_spectrum");
	r1 = sch_sim_find_vector(&res.steps[0], "onoise_r1_thermal");
	CHECK(f && total && r1);
	CHECK(sch_sim_find_vector(&res.steps[0], "inoise_spectrum") != NULL);
	if (f && total && r1) {
		CHECK(f->n == 21 && total->n == 21 && r1->n == 21);
		CHECK_REL(f->values[0], 10.0, 1e-12);
		for (size_t i = 0; i < r1->n; i++) {
			CHECK_REL(r1->values[i], expected, 2e-6);
			CHECK_REL(total->values[i], expected, 2e-6);
		}
	}
	sch_sim_result_release(&res);
}

/*
 * noise_via_file: the deck's own .noise card, its data written to a file and read back. Every
 * vector must equal the SendData path's bit for bit, and the density still be 4kTR (Johnson 1928,
 * Nyquist 1928, as above).
 */
static const char *const johnson_card_deck[] = {
	"resistor across a current source", "i1 0 out dc 0 ac 1", "r1 out 0 1k", "r2 out 0 3k",
	".noise v(out) i1 dec 5 10 100k 1", ".end",
};

/* How many entries dir holds besides "." and "..". */
static size_t entries_in(const char *dir)
{
	size_t n = 0;
	char cmd[128];
	FILE *p;

	snprintf(cmd, sizeof(cmd), "ls -A '%s' | wc -l", dir);
	p = popen(cmd, "r");
	if (p) {
		if (fscanf(p, "%zu", &n) != 1)
			n = 0;
		pclose(p);
	}
	return n;
}

static void test_sim__data_file_path_equals_senddata_path(void)
{
	static const char *const cmd[] = { "noise v(out) i1 dec 5 10 100k 1" };
	static const char *const run[] = { "run" };
	static const struct sch_sim_step mem_step[] = { { cmd, 1, NULL, 0 } };
	static const struct sch_sim_step file_step[] = { { run, 1, NULL, 0 } };
	struct sch_sim_request req = {
		.lines = johnson_card_deck, .n_lines = N_OF(johnson_card_deck), .steps = file_step, .n_steps = 1,
		.collect_noise = true, .squared_noise = true, .n_workers = 1, .noise_via_file = true,
	};
	struct sch_sim_result mem, file;
	struct sch_diag d;
	struct scratch tmp;
	const char *old_tmpdir = getenv("TMPDIR");
	char *saved_tmpdir = old_tmpdir ? strdup(old_tmpdir) : NULL;
	/* R = 1k || 3k = 750 ohm: S_V = 4kTR */
	double expected = 4.0 * SI_K * T_DEFAULT_K * 750.0;

	CHECK(run_deck(johnson_card_deck, N_OF(johnson_card_deck), mem_step, 1, NULL, 0, true, &mem, &d) == SCH_OK);
	/* a private TMPDIR: the run's data-file directory must be gone afterwards, whatever else runs */
	scratch_init(&tmp);
	setenv("TMPDIR", tmp.dir, 1);
	sch_diag_init(&d, NULL, 0);
	CHECK(sch_sim_run(&req, &file, &d) == SCH_OK);
	assert_sane_result(&file, 1);
	CHECK(entries_in(tmp.dir) == 0);
	if (saved_tmpdir)
		setenv("TMPDIR", saved_tmpdir, 1);
	else
		unsetenv("TMPDIR");
	free(saved_tmpdir);
	scratch_release(&tmp);
	if (mem.n_steps == 1 && file.n_steps == 1) {
		const struct sch_sim_vector *total = sch_sim_find_vector(&file.steps[0], "onoise_spectrum");
		size_t compared = 0;

		CHECK(file.steps[0].n_vectors == mem.steps[0].n_vectors);
		for (size_t v = 0; v < mem.steps[0].n_vectors; v++) {
			const struct sch_sim_vector *a = &mem.steps[0].vectors[v];
			const struct sch_sim_vector *b = sch_sim_find_vector(&file.steps[0], a->name);

			CHECK(b != NULL);
			if (!b || b->n != a->n)
				continue;
			CHECK(memcmp(a->values, b->values, a->n * sizeof(double)) == 0);
			compared++;
		}
		CHECK(compared >= 8); /* frequency, two spectra, r1 and r2 with three each */
		CHECK(total && total->n == 21);
		for (size_t i = 0; total && i < total->n; i++)
			CHECK_REL(total->values[i], expected, 2e-6);
	}
	sch_sim_result_release(&mem);
	sch_sim_result_release(&file);
}

/* A resistor without a flicker coefficient: its flicker vector is zero at every point, yet it is there. */
static void test_sim__all_zero_vector_keeps_its_length(void)
{
	static const char *const cmd[] = { "noise v(out) i1 dec 5 10 100k 1" };
	static const struct sch_sim_step steps[] = { { cmd, 1, NULL, 0 }, { cmd, 1, NULL, 0 } };
	struct sch_sim_request req = {
		.lines = johnson_deck, .n_lines = N_OF(johnson_deck), .steps = steps, .n_steps = 2,
		.collect_noise = true, .squared_noise = true, .n_workers = 2,
	};
	struct sch_sim_result res;
	struct sch_diag d;

	sch_diag_init(&d, NULL, 0);
	CHECK(sch_sim_run(&req, &res, &d) == SCH_OK);
	assert_sane_result(&res, 2);
	for (size_t s = 0; s < res.n_steps; s++) {
		const struct sch_sim_vector *flicker = sch_sim_find_vector(&res.steps[s], "onoise_r1_1overf");
		const struct sch_sim_vector *thermal = sch_sim_find_vector(&res.steps[s], "onoise_r1_thermal");

		CHECK(flicker && thermal);
		if (!flicker || !thermal)
			continue;
		CHECK(flicker->n == 21 && thermal->n == 21);
		for (size_t i = 0; i < flicker->n; i++)
			CHECK(flicker->values[i] == 0.0);
		CHECK_REL(thermal->values[20], 4.0 * SI_K * T_DEFAULT_K * 1000.0, 2e-6);
	}
	sch_sim_result_release(&res);
}

/* Refuses two names given by the test; counts the calls. */
struct refusal {
	const char *names[2];
	size_t calls;
};

static bool keep_unless_refused(void *ctx, const char *name)
{
	struct refusal *r = ctx;

	r->calls++;
	return strcmp(name, r->names[0]) != 0 && strcmp(name, r->names[1]) != 0;
}

/* The first and the last vector of the plot are refused, so both ends of the list are covered. */
static void test_sim__keep_vector_drops_the_vectors_it_refuses(void)
{
	static const char *const cmd[] = { "noise v(out) i1 dec 5 10 100k 1" };
	static const struct sch_sim_step step[] = { { cmd, 1, NULL, 0 } };
	struct refusal refused = { { "", "" }, 0 };
	struct sch_sim_request req = {
		.lines = johnson_deck, .n_lines = N_OF(johnson_deck), .steps = step, .n_steps = 1,
		.collect_noise = true, .squared_noise = true, .n_workers = 1,
	};
	struct sch_sim_result all, kept;
	struct sch_diag d;
	size_t n_all;

	sch_diag_init(&d, NULL, 0);
	CHECK(sch_sim_run(&req, &all, &d) == SCH_OK);
	n_all = all.n_steps == 1 ? all.steps[0].n_vectors : 0;
	CHECK(n_all >= 4);
	if (n_all < 4) {
		sch_sim_result_release(&all);
		return;
	}
	refused.names[0] = all.steps[0].vectors[0].name;
	refused.names[1] = all.steps[0].vectors[n_all - 1].name;
	req.keep_vector = keep_unless_refused;
	req.keep_vector_ctx = &refused;
	CHECK(sch_sim_run(&req, &kept, &d) == SCH_OK);
	assert_sane_result(&kept, 1);
	CHECK(refused.calls == n_all);
	CHECK(kept.steps[0].n_vectors == n_all - 2);
	CHECK(sch_sim_find_vector(&kept.steps[0], refused.names[0]) == NULL);
	CHECK(sch_sim_find_vector(&kept.steps[0], refused.names[1]) == NULL);
	for (size_t v = 1; v + 1 < n_all; v++) {
		const struct sch_sim_vector *a = &all.steps[0].vectors[v];
		const struct sch_sim_vector *k = sch_sim_find_vector(&kept.steps[0], a->name);

		CHECK(k && k->n == a->n);
		if (k && k->n == a->n)
			CHECK(memcmp(k->values, a->values, a->n * sizeof(double)) == 0);
	}
	sch_sim_result_release(&kept);
	sch_sim_result_release(&all);
}

static void test_sim__poly_sources_work_without_spinit(void)
{
	static const char *const deck[] = {
		"poly gain", "v1 a 0 dc 1.25", "e1 b 0 poly(1) a 0 0 2", "rl b 0 1k", ".end",
	};
	static const char *const q[] = { "v(b)" };
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(deck, N_OF(deck), op_step, 1, q, 1, false, &res, &d) == SCH_OK);
	CHECK_REL(res.steps[0].quantities[0], 2.5, 1e-9);
	sch_sim_result_release(&res);
}

static void test_sim__unknown_quantity_is_nan_not_a_failure(void)
{
	static const char *const q[] = { "@r1[nosuchparam]", "@rnosuch[i]", "@r1[i]" };
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(divider, N_OF(divider), op_step, 1, q, 3, false, &res, &d) == SCH_OK);
	CHECK(res.failure == NULL && res.steps[0].failure == NULL);
	CHECK(isnan(res.steps[0].quantities[0]));
	CHECK(isnan(res.steps[0].quantities[1]));
	CHECK_REL(res.steps[0].quantities[2], 2e-3, 1e-9);
	sch_sim_result_release(&res);
}

/* ---- safety ------------------------------------------------------------------------------ */

static void test_sim__cwd_spiceinit_is_not_run(void)
{
	struct scratch s;
	char path[200], text[300], cwd[PATH_MAX];
	struct sch_sim_result res;
	struct sch_diag d;

	scratch_init(&s);
	snprintf(path, sizeof(path), "%s/.spiceinit", s.dir);
	snprintf(text, sizeof(text), "shell touch %s\n", s.marker);
	write_file(path, text);
	CHECK(getcwd(cwd, sizeof(cwd)) != NULL);
	CHECK(chdir(s.dir) == 0);
	CHECK(run_deck(divider, N_OF(divider), op_step, 1, NULL, 0, false, &res, &d) == SCH_OK);
	CHECK(chdir(cwd) == 0);
	CHECK(!marker_exists(&s));
	sch_sim_result_release(&res);
	scratch_release(&s);
}

static void test_sim__home_spiceinit_is_not_run(void)
{
	struct scratch s;
	char path[300], text[300], cwd[PATH_MAX], home[200];
	const char *old_home = getenv("HOME");
	struct sch_sim_result res;
	struct sch_diag d;

	scratch_init(&s);
	snprintf(home, sizeof(home), "%s/home", s.dir);
	CHECK(mkdir(home, 0700) == 0);
	snprintf(path, sizeof(path), "%s/.spiceinit", home);
	snprintf(text, sizeof(text), "shell touch %s\n", s.marker);
	write_file(path, text);
	/* A .spiceinit in the working directory that does nothing, and HOME pointing at the bad one. */
	snprintf(path, sizeof(path), "%s/.spiceinit", s.dir);
	write_file(path, "* nothing\n");
	CHECK(getcwd(cwd, sizeof(cwd)) != NULL);
	CHECK(chdir(s.dir) == 0);
	setenv("HOME", home, 1);
	CHECK(run_deck(divider, N_OF(divider), op_step, 1, NULL, 0, false, &res, &d) == SCH_OK);
	if (old_home)
		setenv("HOME", old_home, 1);
	else
		unsetenv("HOME");
	CHECK(chdir(cwd) == 0);
	CHECK(!marker_exists(&s));
	sch_sim_result_release(&res);
	scratch_release(&s);
}

static void test_sim__spinit_from_environment_is_not_run(void)
{
	static const char *const vars[] = { "SPICE_SCRIPTS", "SPICE_LIB_DIR" };
	struct scratch s;
	char path[300], text[300], scripts[200];
	struct sch_sim_result res;
	struct sch_diag d;

	scratch_init(&s);
	snprintf(scripts, sizeof(scripts), "%s/scripts", s.dir);
	CHECK(mkdir(scripts, 0700) == 0);
	snprintf(text, sizeof(text), "shell touch %s\n", s.marker);
	snprintf(path, sizeof(path), "%s/spinit", scripts);
	write_file(path, text);
	for (size_t v = 0; v < N_OF(vars); v++) {
		/* SPICE_SCRIPTS names the directory holding spinit; SPICE_LIB_DIR its parent. */
		setenv(vars[v], v == 0 ? scripts : s.dir, 1);
		CHECK(run_deck(divider, N_OF(divider), op_step, 1, NULL, 0, false, &res, &d) == SCH_OK);
		unsetenv(vars[v]);
		CHECK(!marker_exists(&s));
		sch_sim_result_release(&res);
	}
	scratch_release(&s);
}

/* Runs lines (with MARKER replaced by the marker path) and checks that nothing touched it. */
static void check_deck_cannot_run_commands(const char *const *tmpl, size_t n, bool expect_warning)
{
	struct scratch s;
	char *lines[16];
	char touch[200];
	struct sch_sim_result res;
	struct sch_diag d;

	scratch_init(&s);
	snprintf(touch, sizeof(touch), "shell touch %s", s.marker);
	for (size_t i = 0; i < n; i++) {
		const char *at = strstr(tmpl[i], "MARKER");

		lines[i] = malloc(strlen(tmpl[i]) + sizeof(s.marker) + 1);
		if (at)
			sprintf(lines[i], "%.*s%s%s", (int)(at - tmpl[i]), tmpl[i], s.marker, at + 6);
		else
			strcpy(lines[i], tmpl[i]);
	}
	run_deck((const char *const *)lines, n, op_step, 1, NULL, 0, false, &res, &d);
	CHECK(!marker_exists(&s));
	if (expect_warning)
		CHECK(d.n_warnings > 0);
	sch_sim_result_release(&res);
	for (size_t i = 0; i < n; i++)
		free(lines[i]);
	scratch_release(&s);
}

static void test_sim__control_block_in_lines_is_dropped(void)
{
	static const char *const deck[] = {
		"control", "v1 in 0 1", "r1 in 0 1k", "  .CONTROL", "shell touch MARKER", ".endc", ".end",
	};
	static const char *const pre[] = {
		"control", "v1 in 0 1", "r1 in 0 1k", ".controlX", "pre_shell touch MARKER", ".endc", ".end",
	};

	check_deck_cannot_run_commands(deck, N_OF(deck), true);
	check_deck_cannot_run_commands(pre, N_OF(pre), true);
}

static void test_sim__star_hash_line_is_dropped(void)
{
	static const char *const deck[] = {
		"star hash", "v1 in 0 1", "  *#shell touch MARKER", "r1 in 0 1k", ".end",
	};

	check_deck_cannot_run_commands(deck, N_OF(deck), true);
}

static void test_sim__ng_script_title_is_replaced(void)
{
	static const char *const title[] = { "*NG_SCRIPT harmless looking title", "shell touch MARKER", ".end" };
	static const char *const late[] = { "", "*ng_script", "shell touch MARKER", ".end" };

	check_deck_cannot_run_commands(title, N_OF(title), false);
	check_deck_cannot_run_commands(late, N_OF(late), true);
}

/* Second line behind the reader's allow-list: a script title by .title, and measurements that write files. */
static void test_sim__title_and_meas_cards_are_dropped(void)
{
	static const char *const title[] = { "title card", "v1 in 0 1", "r1 in 0 1k", ".TITLE *ng_script", "shell touch MARKER",
					     ".end" };
	static const char *const meas[] = { "meas card", "v1 in 0 1", "r1 in 0 1k", ".options measoutfile=MARKER",
					    ".meas(op) x find v(in)", " .measure op y find v(in)", ".end" };

	check_deck_cannot_run_commands(title, N_OF(title), true);
	check_deck_cannot_run_commands(meas, N_OF(meas), true);
}

static void test_sim__include_and_lib_lines_are_dropped(void)
{
	struct scratch s;
	char path[200], text[300], inc[260], lib[260];
	const char *deck[] = { "includes", "v1 in 0 1", "r1 in 0 1k", inc, lib, ".end" };
	struct sch_sim_result res;
	struct sch_diag d;

	scratch_init(&s);
	snprintf(path, sizeof(path), "%s/evil.lib", s.dir);
	snprintf(text, sizeof(text), "* lib\n.lib sec\n*#shell touch %s\n.endl\n", s.marker);
	write_file(path, text);
	snprintf(inc, sizeof(inc), ".include %s", path);
	snprintf(lib, sizeof(lib), ".LIB %s sec", path);
	CHECK(run_deck(deck, N_OF(deck), op_step, 1, NULL, 0, false, &res, &d) == SCH_OK);
	CHECK(d.n_warnings == 2);
	CHECK(!marker_exists(&s));
	sch_sim_result_release(&res);
	scratch_release(&s);
}

static void test_sim__commands_with_special_characters_are_refused(void)
{
	struct scratch s;
	char bad[3][200];
	struct sch_sim_result res;
	struct sch_diag d;

	scratch_init(&s);
	snprintf(bad[0], sizeof(bad[0]), "alter r1`touch %s` = 5k", s.marker);
	snprintf(bad[1], sizeof(bad[1]), "alter r1;shell touch %s = 3k", s.marker);
	snprintf(bad[2], sizeof(bad[2]), "echo hi > %s", s.marker);
	for (size_t i = 0; i < 3; i++) {
		const char *cmds[] = { "op", bad[i] };
		struct sch_sim_step step = { cmds, 2, NULL, 0 };

		CHECK(run_deck(divider, N_OF(divider), &step, 1, NULL, 0, false, &res, &d) == SCH_ERR_USAGE);
		CHECK(res.n_messages == 0 && res.n_steps == 0);
		CHECK(d.n_errors == 1);
		CHECK(!marker_exists(&s));
		sch_sim_result_release(&res);
	}
	scratch_release(&s);
}

static void test_sim__overlong_command_is_refused(void)
{
	char cmd[1100];
	const char *cmds[] = { cmd };
	struct sch_sim_step step = { cmds, 1, NULL, 0 };
	struct sch_sim_result res;
	struct sch_diag d;

	memset(cmd, 'a', sizeof(cmd) - 1);
	memcpy(cmd, "echo ", 5);
	cmd[sizeof(cmd) - 1] = '\0';
	CHECK(run_deck(divider, N_OF(divider), &step, 1, NULL, 0, false, &res, &d) == SCH_ERR_USAGE);
	sch_sim_result_release(&res);
}

static void test_sim__name_is_safe_accepts_only_the_whitelist(void)
{
	char longname[202];

	CHECK(sch_sim_name_is_safe("r1"));
	CHECK(sch_sim_name_is_safe("d.x1.x2.d5"));
	CHECK(sch_sim_name_is_safe("v1#branch"));
	CHECK(sch_sim_name_is_safe("a+b-c_d"));
	CHECK(!sch_sim_name_is_safe(""));
	CHECK(!sch_sim_name_is_safe(NULL));
	CHECK(!sch_sim_name_is_safe("R1"));
	CHECK(!sch_sim_name_is_safe("r1;shell"));
	CHECK(!sch_sim_name_is_safe("r`x`"));
	CHECK(!sch_sim_name_is_safe("r 1"));
	CHECK(!sch_sim_name_is_safe("$x"));
	memset(longname, 'a', 200);
	longname[200] = '\0';
	CHECK(sch_sim_name_is_safe(longname));
	longname[200] = 'a';
	longname[201] = '\0';
	CHECK(!sch_sim_name_is_safe(longname));
}

/*
 * Four steps on two workers, an alter before each noise run: each step comes back in order with
 * its own R and 4kTR (Johnson 1928; Nyquist 1928) for it. The noise run is the command given, or
 * with via_file the deck's own .noise card through the simulator's data file.
 */
static void check_alters_on_two_workers(const char *const *lines, size_t n_lines, const char *noise, bool via_file)
{
	static const double ohms[4] = { 1e3, 2e3, 4e3, 8e3 };
	static const char *const alters[4] = { "alter r1 1k", "alter r1 2k", "alter r1 4k", "alter r1 8k" };
	static const char *const q[] = { "@r1[resistance]" };
	const char *cmds[4][2];
	struct sch_sim_step steps[4] = { { NULL, 0, NULL, 0 } };
	struct sch_sim_request req = {
		.lines = lines, .n_lines = n_lines, .steps = steps, .n_steps = 4, .quantities = q,
		.n_quantities = 1, .collect_noise = true, .squared_noise = true, .n_workers = 2,
		.noise_via_file = via_file,
	};
	struct sch_sim_result res;
	struct sch_diag d;

	for (size_t i = 0; i < 4; i++) {
		cmds[i][0] = alters[i];
		cmds[i][1] = noise;
		steps[i].commands = cmds[i];
		steps[i].n_commands = 2;
	}
	sch_diag_init(&d, NULL, 0);
	CHECK(sch_sim_run(&req, &res, &d) == SCH_OK);
	assert_sane_result(&res, 4);
	for (size_t i = 0; i < res.n_steps; i++) {
		const struct sch_sim_vector *v = sch_sim_find_vector(&res.steps[i], "onoise_spectrum");

		CHECK(res.steps[i].failure == NULL);
		CHECK_REL(res.steps[i].quantities[0], ohms[i], 1e-12);
		CHECK(v && v->n == 3);
		if (v && v->n > 0)
			CHECK_REL(v->values[0], 4.0 * SI_K * T_DEFAULT_K * ohms[i], 2e-6);
	}
	sch_sim_result_release(&res);
}

static void test_sim__steps_split_over_two_workers_come_back_in_order(void)
{
	check_alters_on_two_workers(johnson_deck, N_OF(johnson_deck), "noise v(out) i1 dec 1 10 1k 1", false);
}

static void test_sim__data_file_runs_follow_alters_on_two_workers(void)
{
	static const char *const lines[] = {
		"resistor across a current source", "i1 0 out dc 0 ac 1", "r1 out 0 1k",
		".noise v(out) i1 dec 1 10 1k 1", ".end",
	};

	check_alters_on_two_workers(lines, N_OF(lines), "run", true);
}

static void test_sim__release_is_a_noop_on_null_and_twice(void)
{
	struct sch_sim_result res;
	struct sch_diag d;

	sch_sim_result_release(NULL);
	CHECK(run_deck(divider, N_OF(divider), op_step, 1, NULL, 0, false, &res, &d) == SCH_OK);
	sch_sim_result_release(&res);
	sch_sim_result_release(&res);
	CHECK(res.steps == NULL && res.version == NULL);
}

CHECK_MAIN(CASE(test_sim__divider_current_obeys_ohms_law),
	   CASE(test_sim__reports_version_from_the_simulator),
	   CASE(test_sim__forward_diode_voltage_matches_ideal_diode_equation),
	   CASE(test_sim__resistor_noise_density_is_4ktr),
	   CASE(test_sim__data_file_path_equals_senddata_path),
	   CASE(test_sim__data_file_runs_follow_alters_on_two_workers),
	   CASE(test_sim__all_zero_vector_keeps_its_length),
	   CASE(test_sim__keep_vector_drops_the_vectors_it_refuses),
	   CASE(test_sim__poly_sources_work_without_spinit),
	   CASE(test_sim__unknown_quantity_is_nan_not_a_failure),
	   CASE(test_sim__cwd_spiceinit_is_not_run),
	   CASE(test_sim__home_spiceinit_is_not_run),
	   CASE(test_sim__spinit_from_environment_is_not_run),
	   CASE(test_sim__control_block_in_lines_is_dropped),
	   CASE(test_sim__star_hash_line_is_dropped),
	   CASE(test_sim__ng_script_title_is_replaced),
	   CASE(test_sim__include_and_lib_lines_are_dropped), CASE(test_sim__title_and_meas_cards_are_dropped),
	   CASE(test_sim__commands_with_special_characters_are_refused),
	   CASE(test_sim__overlong_command_is_refused),
	   CASE(test_sim__name_is_safe_accepts_only_the_whitelist),
	   CASE(test_sim__steps_split_over_two_workers_come_back_in_order),
	   CASE(test_sim__release_is_a_noop_on_null_and_twice))
