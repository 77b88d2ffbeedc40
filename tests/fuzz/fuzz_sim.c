/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * fuzz_sim.c - libFuzzer target: any bytes as a netlist go through the reader to one simulator
 * worker run (the noise run when the text has a ".noise", else the operating point) under small budgets.
 * The run must end (budgets and the stall watchdog see to that) and create no file anywhere it
 * could be seen: the working directory and the scratch directory are checked after each input.
 */
#include <dirent.h>
#include <stdbool.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <unistd.h>
#include "schrot/analysis.h"
#include "schrot/sim.h"

static char scratch[256];
static char netlist[300];

#define FUZZ_MAX_SEEN 256

struct listing {
	char names[FUZZ_MAX_SEEN][256];
	size_t n;
};

static void list_dir(const char *dir, struct listing *l)
{
	DIR *d = opendir(dir);
	struct dirent *e;

	l->n = 0;
	while (d && (e = readdir(d)) && l->n < FUZZ_MAX_SEEN)
		snprintf(l->names[l->n++], sizeof(l->names[0]), "%s", e->d_name);
	if (d)
		closedir(d);
}

/* Names in after that before lacks, printed; true when there is one (a marker). */
static bool new_entries(const char *dir, const struct listing *before, const struct listing *after)
{
	bool found = false;

	for (size_t i = 0; i < after->n; i++) {
		bool old = false;

		for (size_t k = 0; k < before->n && !old; k++)
			old = strcmp(after->names[i], before->names[k]) == 0;
		if (!old) {
			fprintf(stderr, "fuzz_sim: new file '%s' in '%s'\n", after->names[i], dir);
			found = true;
		}
	}
	return found;
}

static bool has_noise_line(const uint8_t *data, size_t size)
{
	for (size_t i = 0; i + 6 <= size; i++)
		if (strncasecmp((const char *)data + i, ".noise", 6) == 0)
			return true;
	return false;
}

static void remove_scratch(void)
{
	unlink(netlist);
	rmdir(scratch);
}

static void setup_once(void)
{
	const char *tmp = getenv("TMPDIR");
	struct sch_sim_budget b = { 5, 1024 };

	if (scratch[0])
		return;
	snprintf(scratch, sizeof(scratch), "%s/schrot-fuzz-sim-XXXXXX", tmp && tmp[0] == '/' ? tmp : "/tmp");
	if (!mkdtemp(scratch))
		abort();
	snprintf(netlist, sizeof(netlist), "%s/fuzz.cir", scratch);
	atexit(remove_scratch);
	sch_sim_set_budget(&b);
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	struct sch_run_options opt;
	struct sch_result res;
	struct sch_diag d;
	static struct listing cwd_before, scratch_before, cwd_after, scratch_after;
	bool marker;
	FILE *f;

	setup_once();
	if (size > 64 * 1024)
		return 0; /* the reader's own limits are fuzz_deck's business; keep each run short */
	f = fopen(netlist, "wb");
	if (!f)
		abort();
	if (size && fwrite(data, 1, size, f) != size)
		abort();
	fclose(f);
	list_dir(".", &cwd_before);
	list_dir(scratch, &scratch_before);
	sch_run_options_init(&opt);
	opt.mode = has_noise_line(data, size) ? SCH_RUN_REPORT : SCH_RUN_OP;
	sch_result_init(&res);
	sch_diag_init(&d, getenv("SCH_FUZZ_SIM_VERBOSE") ? stderr : NULL, 0); /* to see why an input fails */
	(void)sch_analysis_run(netlist, &opt, &res, &d);
	sch_result_release(&res);
	/* a marker: something in the netlist made the simulator write a file */
	list_dir(".", &cwd_after);
	list_dir(scratch, &scratch_after);
	marker = new_entries(".", &cwd_before, &cwd_after);
	marker = new_entries(scratch, &scratch_before, &scratch_after) || marker;
	if (marker)
		abort();
	return 0;
}
