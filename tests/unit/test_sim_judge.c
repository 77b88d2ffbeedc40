/* SPDX-License-Identifier: BSD-3-Clause */
/* test_sim_judge.c - facts about how the simulator session judges failures: one-line reasons, per step. */
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "sim_fixture.h"

static const char *const op_cmd[] = { "op" };
static const struct sch_sim_step op_step[] = { { op_cmd, 1, NULL, 0 } };

static const char *const divider[] = {
	"resistor divider", "v1 in 0 dc 10", "r1 in out 1k", "r2 out 0 4k", ".end",
};

static void check_sim_failure(const struct sch_sim_result *res, const struct sch_diag *d)
{
	assert_sane_result(res, res->n_steps);
	CHECK(res->failure != NULL && res->failure[0] != '\0');
	CHECK(d->n_errors == 1);
	CHECK(strncmp(d->first_error, "schrot: simulator: ", 19) == 0);
}

static void test_sim_judge__unknown_model_fails_with_one_line(void)
{
	static const char *const deck[] = { "bad model", "v1 a 0 1", "d1 a 0 nosuchmodel", ".end" };
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(deck, N_OF(deck), op_step, 1, NULL, 0, false, &res, &d) == SCH_ERR_SIM);
	check_sim_failure(&res, &d);
	CHECK(res.failure && strstr(res.failure, "modelname") != NULL);
	CHECK(res.steps[0].failure != NULL);
	sch_sim_result_release(&res);
}

/*
 * A code model's data file never reaches a message: a word that only the data file holds is left
 * out of every reason the session passes on ("valid" below: the simulator's own reason holds it,
 * the deck does not), while the deck's own words (the model name) stay.
 */
static void test_sim_judge__words_of_data_files_are_left_out_of_reasons(void)
{
	static const char *const deck[] = { "data words", "v1 a 0 1", "d1 a 0 nosuchmodel", ".end" };
	static const char *const data[] = { "* invented bias table\nvalid 0.50 0.52\n" };
	struct sch_sim_request req = {
		.lines = deck, .n_lines = N_OF(deck), .steps = op_step, .n_steps = 1, .n_workers = 1,
		.private_texts = data, .n_private_texts = 1,
	};
	struct sch_sim_result res;
	struct sch_diag d;

	/* the control: without the data file the reason reads "could not find a valid modelname" */
	CHECK(run_deck(deck, N_OF(deck), op_step, 1, NULL, 0, false, &res, &d) == SCH_ERR_SIM);
	CHECK(res.failure && strstr(res.failure, "a valid modelname") != NULL);
	sch_sim_result_release(&res);
	sch_diag_init(&d, NULL, 0);
	CHECK(sch_sim_run(&req, &res, &d) == SCH_ERR_SIM);
	check_sim_failure(&res, &d);
	CHECK(res.failure && strstr(res.failure, "valid") == NULL);
	CHECK(res.failure && strstr(res.failure, "a \xe2\x80\xa6 modelname") != NULL);
	CHECK(res.failure && strstr(res.failure, "nosuchmodel") != NULL);
	CHECK(strstr(d.first_error, "valid") == NULL);
	sch_sim_result_release(&res);
}

static void test_sim_judge__numparam_error_gives_up_and_next_run_works(void)
{
	static const char *const deck[] = { "numparam", ".param a={1+}", "v1 a 0 1", "r1 a 0 1k", ".end" };
	static const char *const q[] = { "@r1[i]" };
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(deck, N_OF(deck), op_step, 1, NULL, 0, false, &res, &d) == SCH_ERR_SIM);
	check_sim_failure(&res, &d);
	CHECK(res.failure && strncmp(res.failure, "simulator gave up: ", 19) == 0);
	sch_sim_result_release(&res);
	CHECK(run_deck(divider, N_OF(divider), op_step, 1, q, 1, false, &res, &d) == SCH_OK);
	CHECK_REL(res.steps[0].quantities[0], 2e-3, 1e-9);
	sch_sim_result_release(&res);
}

static void test_sim_judge__quit_command_gives_up(void)
{
	static const char *const cmds[] = { "quit" };
	static const struct sch_sim_step step[] = { { cmds, 1, NULL, 0 } };
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(divider, N_OF(divider), step, 1, NULL, 0, false, &res, &d) == SCH_ERR_SIM);
	check_sim_failure(&res, &d);
	CHECK(res.steps[0].failure != NULL);
	sch_sim_result_release(&res);
}

static void test_sim_judge__parallel_voltage_sources_fail(void)
{
	static const char *const deck[] = { "loop", "v1 in 0 1", "v2 in 0 2", "r1 in 0 1k", ".end" };
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(deck, N_OF(deck), op_step, 1, NULL, 0, false, &res, &d) == SCH_ERR_SIM);
	check_sim_failure(&res, &d);
	CHECK(res.steps[0].failure != NULL);
	sch_sim_result_release(&res);
}

static void test_sim_judge__noise_input_without_ac_value_fails_with_reason(void)
{
	static const char *const deck[] = { "no ac", "v1 in 0 dc 1", "r1 in out 1k", "r2 out 0 1k", ".end" };
	static const char *const cmd[] = { "noise v(out) v1 dec 2 1 1k 1" };
	static const struct sch_sim_step step[] = { { cmd, 1, NULL, 0 } };
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(deck, N_OF(deck), step, 1, NULL, 0, true, &res, &d) == SCH_ERR_SIM);
	check_sim_failure(&res, &d);
	CHECK(res.failure && strstr(res.failure, "no AC value") != NULL);
	CHECK(res.steps[0].n_vectors == 0);
	sch_sim_result_release(&res);
}

static void test_sim_judge__unknown_subckt_fails(void)
{
	static const char *const deck[] = { "subckt", "x1 a 0 nosuchsub", "r1 a 0 1k", ".end" };
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(deck, N_OF(deck), op_step, 1, NULL, 0, false, &res, &d) == SCH_ERR_SIM);
	check_sim_failure(&res, &d);
	CHECK(res.failure && strstr(res.failure, "unknown subckt") != NULL);
	sch_sim_result_release(&res);
}

static void test_sim_judge__missing_end_fails(void)
{
	static const char *const deck[] = { "no end", "v1 a 0 1", "r1 a 0 1k" };
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(deck, N_OF(deck), op_step, 1, NULL, 0, false, &res, &d) == SCH_ERR_SIM);
	check_sim_failure(&res, &d);
	sch_sim_result_release(&res);
}

static void test_sim_judge__simulator_warnings_become_notes(void)
{
	static const char *const deck[] = { "low r", "i1 0 a dc 1m", "r1 a 0", ".end" };
	struct sch_sim_result res;
	struct sch_diag d;
	char buf[4096] = "";
	FILE *sink = fmemopen(buf, sizeof(buf) - 1, "w");
	struct sch_sim_request req = { .lines = deck, .n_lines = N_OF(deck), .steps = op_step, .n_steps = 1,
				       .n_workers = 1 };

	sch_diag_init(&d, sink, 1);
	CHECK(sch_sim_run(&req, &res, &d) == SCH_OK);
	fclose(sink);
	CHECK(strstr(buf, "note: simulator: Warning") != NULL);
	CHECK(d.n_warnings == 0 && d.n_errors == 0);
	sch_sim_result_release(&res);
}

static void test_sim_judge__failed_step_does_not_hide_later_steps(void)
{
	static const char *const good[] = { "op" };
	static const char *const bad[] = { "alter rnosuch 5k" };
	static const struct sch_sim_step steps[] = { { good, 1, NULL, 0 }, { bad, 1, NULL, 0 }, { good, 1, NULL, 0 } };
	static const char *const q[] = { "@r1[i]" };
	struct sch_sim_result res;
	struct sch_diag d;

	CHECK(run_deck(divider, N_OF(divider), steps, 3, q, 1, false, &res, &d) == SCH_ERR_SIM);
	check_sim_failure(&res, &d);
	CHECK(res.steps[0].failure == NULL);
	CHECK(res.steps[1].failure != NULL);
	CHECK(res.steps[2].failure == NULL);
	CHECK_REL(res.steps[2].quantities[0], 2e-3, 1e-9);
	sch_sim_result_release(&res);
}

CHECK_MAIN(CASE(test_sim_judge__unknown_model_fails_with_one_line),
	   CASE(test_sim_judge__words_of_data_files_are_left_out_of_reasons),
	   CASE(test_sim_judge__numparam_error_gives_up_and_next_run_works),
	   CASE(test_sim_judge__quit_command_gives_up),
	   CASE(test_sim_judge__parallel_voltage_sources_fail),
	   CASE(test_sim_judge__noise_input_without_ac_value_fails_with_reason),
	   CASE(test_sim_judge__unknown_subckt_fails),
	   CASE(test_sim_judge__missing_end_fails),
	   CASE(test_sim_judge__simulator_warnings_become_notes),
	   CASE(test_sim_judge__failed_step_does_not_hide_later_steps))
