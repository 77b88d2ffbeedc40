/* SPDX-License-Identifier: BSD-3-Clause */
/* sim_fixture.h - what the simulator session's unit tests share: running a deck and the result invariants. */
#ifndef SCH_SIM_FIXTURE_H
#define SCH_SIM_FIXTURE_H

#include <stdbool.h>
#include <string.h>

#include "check.h"
#include "schrot/sim.h"

#define N_OF(a) (sizeof(a) / sizeof((a)[0]))

/* Runs lines on one worker; *res and *d are the caller's to release. */
static inline enum sch_err run_deck(const char *const *lines, size_t n_lines, const struct sch_sim_step *steps,
				    size_t n_steps, const char *const *quantities, size_t n_quantities,
				    bool noise, struct sch_sim_result *res, struct sch_diag *d)
{
	struct sch_sim_request req = {
		.lines = lines, .n_lines = n_lines, .steps = steps, .n_steps = n_steps,
		.quantities = quantities, .n_quantities = n_quantities, .collect_noise = noise,
		.squared_noise = noise, .n_workers = 1,
	};

	sch_diag_init(d, NULL, 0);
	return sch_sim_run(&req, res, d);
}

/* Invariants every result must hold, success or not. */
static inline void assert_sane_result(const struct sch_sim_result *res, size_t n_steps)
{
	CHECK(res->n_steps == n_steps);
	for (size_t i = 0; i < res->n_messages; i++) {
		CHECK(strncmp(res->messages[i], "stdout ", 7) != 0);
		CHECK(strncmp(res->messages[i], "stderr ", 7) != 0);
	}
	if (res->failure)
		CHECK(strchr(res->failure, '\n') == NULL);
	for (size_t s = 0; s < res->n_steps; s++)
		if (res->steps[s].failure)
			CHECK(strchr(res->steps[s].failure, '\n') == NULL);
}

#endif
