/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * bench_deck.c - deck reader throughput: loads one netlist REPS times with sch_deck_load (file
 * read, includes, cards, elements, instances) and prints the median rate in MB/s. Prints only.
 */
#include <stdio.h>
#include <stdlib.h>
#include <sys/stat.h>
#include <time.h>
#include "schrot/deck.h"
#include "schrot/diag.h"

#define BENCH_MAX_REPS 64

static double now_s(void)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

static int by_value(const void *pa, const void *pb)
{
	double a = *(const double *)pa, b = *(const double *)pb;

	return a < b ? -1 : a > b;
}

int main(int argc, char **argv)
{
	double secs[BENCH_MAX_REPS];
	struct stat st;
	int reps = argc > 2 ? atoi(argv[2]) : 5;
	size_t n_elements = 0;

	if (argc < 2 || reps < 1 || reps > BENCH_MAX_REPS) {
		fprintf(stderr, "usage: bench_deck NETLIST [REPS 1..%d]\n", BENCH_MAX_REPS);
		return 2;
	}
	if (stat(argv[1], &st) != 0) {
		fprintf(stderr, "bench_deck: cannot stat '%s'\n", argv[1]);
		return 2;
	}
	for (int r = 0; r < reps; r++) {
		struct sch_deck deck;
		struct sch_diag d;
		double t0;
		enum sch_err err;

		sch_diag_init(&d, stderr, -1);
		sch_deck_init(&deck);
		t0 = now_s();
		err = sch_deck_load(&deck, argv[1], &d);
		secs[r] = now_s() - t0;
		n_elements = deck.n_elements;
		sch_deck_release(&deck);
		if (err != SCH_OK) {
			fprintf(stderr, "bench_deck: '%s' did not load\n", argv[1]);
			return 1;
		}
	}
	qsort(secs, (size_t)reps, sizeof(secs[0]), by_value);
	printf("deck reader: %s, %.1f MB, %zu elements: median %.3f s over %d loads = %.0f MB/s (fastest %.0f MB/s)\n",
	       argv[1], (double)st.st_size / 1e6, n_elements, secs[reps / 2], reps,
	       (double)st.st_size / 1e6 / secs[reps / 2], (double)st.st_size / 1e6 / secs[0]);
	return 0;
}
