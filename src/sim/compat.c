/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * compat.c - the simulator's compatibility modes (ngspice's "ngbehavior" values) and the one
 * setting read, as data, from a .spiceinit beside the netlist; the file itself is never run.
 */
#include <ctype.h>
#include <errno.h>
#include <stdio.h>
#include <string.h>
#include <strings.h>
#include "schrot/sim.h"

#define SCH_SPICEINIT_MAX_BYTES (256 * 1024)

/* The values ngspice 39 reads (each printed back as its modes when a circuit loads; "mc" is its test mode). */
static const char *const compat_modes[] = {
	"a", "all", "eg", "hs", "hsa", "ki", "kia", "lt", "lta", "ltps", "ltpsa", "ps", "psa", "s3", "spe", "xs",
};

#define N_COMPAT_MODES (sizeof(compat_modes) / sizeof(compat_modes[0]))

const char *sch_sim_compat_mode_known(const char *mode)
{
	for (size_t k = 0; mode && k < N_COMPAT_MODES; k++)
		if (strcasecmp(mode, compat_modes[k]) == 0)
			return compat_modes[k];
	return NULL;
}

const char *sch_sim_compat_mode_list(void)
{
	return "a, all, eg, hs, hsa, ki, kia, lt, lta, ltps, ltpsa, ps, psa, s3, spe, xs";
}

/* The directory part of path ("." when it has none) followed by "/.spiceinit", in arena. */
static const char *spiceinit_path(struct sch_arena *arena, const char *netlist)
{
	const char *slash = strrchr(netlist, '/');

	if (!slash)
		return sch_arena_strdup(arena, ".spiceinit");
	return sch_arena_printf(arena, "%.*s/.spiceinit", (int)(slash - netlist), netlist);
}

/*
 * "set ngbehavior=ps", "set ngbehavior = ps" or "set ngbehavior='ps'": the value (at most
 * size-1 bytes, quotes removed) in out. False for any other line.
 */
static bool parse_set_ngbehavior(const char *line, char *out, size_t size)
{
	const char *p = line;
	size_t n = 0;

	while (isspace((unsigned char)*p))
		p++;
	if (strncasecmp(p, "set", 3) != 0 || !isspace((unsigned char)p[3]))
		return false;
	p += 3;
	while (isspace((unsigned char)*p))
		p++;
	if (strncasecmp(p, "ngbehavior", 10) != 0)
		return false;
	p += 10;
	while (isspace((unsigned char)*p))
		p++;
	if (*p++ != '=')
		return false;
	while (isspace((unsigned char)*p) || *p == '"' || *p == '\'')
		p++;
	while (p[n] && !isspace((unsigned char)p[n]) && p[n] != '"' && p[n] != '\'' && n + 1 < size) {
		out[n] = p[n];
		n++;
	}
	out[n] = '\0';
	return n > 0;
}

/* Whether a line says nothing: blank, or a comment ('*' or '#'). */
static bool line_is_empty(const char *line)
{
	while (isspace((unsigned char)*line))
		line++;
	return *line == '\0' || *line == '*' || *line == '#';
}

/* One line that says something: the mode, an unknown mode, or an ignored line. SCH_ERR_NOMEM. */
static enum sch_err take_line(struct sch_spiceinit *si, struct sch_arena *arena, const char *line, long lineno)
{
	char value[64];
	const char *known;

	if (!parse_set_ngbehavior(line, value, sizeof(value))) {
		si->n_ignored++;
		return SCH_OK;
	}
	if ((known = sch_sim_compat_mode_known(value)) != NULL) {
		si->mode = known;
		si->mode_line = lineno;
		return SCH_OK;
	}
	si->n_ignored++;
	if (!si->bad_mode && !(si->bad_mode = sch_arena_strdup(arena, value)))
		return SCH_ERR_NOMEM;
	return SCH_OK;
}

enum sch_err sch_sim_read_spiceinit(const char *netlist, struct sch_arena *arena, struct sch_spiceinit *si,
				    struct sch_diag *d)
{
	char line[1024];
	FILE *f = NULL;
	long lineno = 0;
	enum sch_err ret = SCH_ERR_NOMEM;

	memset(si, 0, sizeof(*si));
	if (!(si->path = spiceinit_path(arena, netlist)))
		goto out;
	f = fopen(si->path, "r");
	if (!f) {
		ret = SCH_OK; /* none there (or unreadable): nothing to honour */
		goto out;
	}
	si->present = true;
	while (fgets(line, sizeof(line), f)) {
		size_t len = strlen(line);

		lineno++;
		if (ftell(f) > SCH_SPICEINIT_MAX_BYTES) {
			si->n_ignored++;
			break;
		}
		while (len == sizeof(line) - 1 && line[len - 1] != '\n' && fgets(line, sizeof(line), f))
			len = strlen(line); /* an overlong line counts once */
		if (!line_is_empty(line) && take_line(si, arena, line, lineno) != SCH_OK)
			goto out;
	}
	ret = SCH_OK;
out:
	if (f)
		fclose(f);
	(void)d;
	return ret;
}
