/* SPDX-License-Identifier: BSD-3-Clause */
/* worker_file.c - the worker's reader of the simulator's binary data file (the noise_via_file path). */
#include <ctype.h>
#include <stdbool.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h> /* _exit */

#include "sim_int.h"

/* One header line of a data file, without its newline; false at the end or for a longer line. */
static bool data_file_line(FILE *f, char *buf, size_t size)
{
	size_t n;

	if (!fgets(buf, (int)size, f))
		return false;
	n = strlen(buf);
	if (n == 0 || buf[n - 1] != '\n')
		return false;
	buf[n - 1] = '\0';
	return true;
}

/* "\t3\tonoise_r1_thermal\tvoltage^2-density\tgrid=3": the name, copied; NULL when malformed. */
static char *data_file_name(const char *line)
{
	const char *p = line, *end;
	char *name;

	if (*p++ != '\t' || !isdigit((unsigned char)*p))
		return NULL;
	while (isdigit((unsigned char)*p))
		p++;
	if (*p++ != '\t')
		return NULL;
	end = strchr(p, '\t');
	if (!end)
		end = p + strlen(p);
	if (end == p)
		return NULL;
	name = malloc((size_t)(end - p) + 1);
	if (!name)
		_exit(4);
	memcpy(name, p, (size_t)(end - p));
	name[end - p] = '\0';
	return name;
}

/*
 * Reads the first plot of the simulator's binary data file and, when it is a density plot (its
 * first variable is "frequency"), sends it as the SendData path does: its names, then each row.
 * A file that does not parse, or ends early (a full disk), flags the step's plot as garbled.
 */
void sch_worker_send_data_file(struct sch_worker_ctx *w, const char *path)
{
	FILE *f = fopen(path, "rb");
	char line[8192];
	long n_vars = -1, n_points = -1;
	bool real = false, header_done = false;
	double *row = NULL;

	if (!f)
		return;
	while (data_file_line(f, line, sizeof(line))) {
		if (strncmp(line, "Flags:", 6) == 0)
			real = strstr(line, "real") && !strstr(line, "complex");
		else if (strncmp(line, "No. Variables:", 14) == 0)
			n_vars = strtol(line + 14, NULL, 10);
		else if (strncmp(line, "No. Points:", 11) == 0)
			n_points = strtol(line + 11, NULL, 10);
		else if (strcmp(line, "Variables:") == 0) {
			header_done = true;
			break;
		}
	}
	if (!header_done || n_vars <= 0 || n_vars > (long)(SCH_SIM_MAX_RECORD / 8) || n_points <= 0)
		goto bad;
	sch_worker_noise_clear(w);
	w->names = calloc((size_t)n_vars, sizeof(*w->names));
	if (!w->names)
		_exit(4);
	for (long i = 0; i < n_vars; i++) {
		if (!data_file_line(f, line, sizeof(line)) || !(w->names[i] = data_file_name(line)))
			goto bad;
		w->n_names = (size_t)i + 1;
	}
	if (!data_file_line(f, line, sizeof(line)) || strcmp(line, "Binary:") != 0)
		goto bad;
	if (strcmp(w->names[0], "frequency") != 0) {
		sch_worker_noise_clear(w); /* not a density plot */
		goto out;
	}
	if (!real)
		goto bad;
	w->noise_live = w->noise_seen = true;
	if (w->req->collect_noise)
		sch_worker_send_noise_names(w);
	if (w->noise_order_bad)
		goto out;
	row = malloc((size_t)n_vars * sizeof(*row));
	if (!row)
		_exit(4);
	for (long k = 0; k < n_points; k++) {
		if (fread(row, sizeof(*row), (size_t)n_vars, f) != (size_t)n_vars)
			goto bad;
		w->n_rows++;
		if (!w->req->collect_noise)
			continue;
		sch_wire_header(&w->out, SCH_REC_NOISE_ROW, 8 + 8 * (size_t)n_vars);
		sch_wire_put_u32(&w->out, w->step);
		sch_wire_put_u32(&w->out, (uint32_t)n_vars);
		sch_wire_put(&w->out, row, (size_t)n_vars * sizeof(*row));
	}
	goto out;
bad:
	w->noise_seen = true;
	w->noise_order_bad = true;
	w->data_file_bad = true;
out:
	free(row);
	sch_worker_noise_free_names(w);
	fclose(f);
}
