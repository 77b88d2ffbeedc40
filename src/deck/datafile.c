/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * datafile.c - the data file a code model's .model card names (filesource, d_source, d_state,
 * table2d, table3d, xfer): found as an .include is, checked, and handed on as an absolute path.
 */
#include <errno.h>
#include <limits.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include "deck_int.h"
#include "schrot/sim.h"

/*
 * The code models whose one string parameter names a file they read (ngspice's
 * src/xspice/icm/<library>/<model>/ifspec.ifs). required: without it the model reads a default name from the
 * simulator's working directory, which schrot never lets it do; xfer may give its data inline.
 */
static const struct {
	const char *type, *param;
	bool required;
} data_models[] = {
	{ "filesource", "file", true }, { "d_source", "input_file", true }, { "d_state", "state_file", true },
	{ "table2d", "file", true },    { "table3d", "file", true },        { "xfer", "file", false },
};

static bool name_boundary_before(const char *text, size_t i)
{
	return i == 0 || is_blank(text[i - 1]) || text[i - 1] == '(' || text[i - 1] == ',' || text[i - 1] == '+';
}

/*
 * Finds "param = value" in text (any case, a whole word): *vb..*ve is the value as written, quotes
 * included. Returns the number of times the parameter is given.
 */
static int find_param(const char *text, const char *param, size_t *vb, size_t *ve)
{
	size_t n = strlen(text), k = strlen(param);
	int found = 0;

	for (size_t i = 0; i + k <= n; i++) {
		size_t j = i + k;

		if (strncasecmp(text + i, param, k) != 0 || !name_boundary_before(text, i))
			continue;
		while (j < n && is_blank(text[j]))
			j++;
		if (j >= n || text[j] != '=')
			continue;
		j++;
		while (j < n && is_blank(text[j]))
			j++;
		*vb = j;
		if (j < n && text[j] == '"') {
			const char *q = strchr(text + j + 1, '"');

			j = q ? (size_t)(q - text) + 1 : n;
		} else {
			while (j < n && !is_blank(text[j]) && text[j] != ')' && text[j] != ',')
				j++;
		}
		*ve = j;
		found++;
		i = j > i ? j - 1 : i;
	}
	return found;
}

/* A character the reader keeps out of a data file's path even though the simulator would take it. */
static bool path_char_is_odd(char c)
{
	return strchr("()=,{}\"'", c) != NULL;
}

/*
 * Reads the data file at path (checked: regular, within the caps) and keeps its text so that the
 * simulator's messages can leave it out. On failure the message names the path as the netlist gave
 * it (shown, resolved like an include) and the reason.
 */
static enum sch_err read_data_file(struct sch_deck_load *ld, const char *file, long line, const char *what,
				   const char *path, const char *shown)
{
	size_t used = ld->total_bytes ? *ld->total_bytes : 0;
	size_t left = used < DECK_MAX_TOTAL ? DECK_MAX_TOTAL - used : 0;
	size_t limit = left < DECK_MAX_FILE ? left : DECK_MAX_FILE, len = 0;
	char *data = NULL, why[128];
	const char *kept;
	int err_no = 0;
	enum sch_err ret = sch_deck_slurp(path, true, limit, &data, &len, &err_no);

	if (ret == SCH_ERR_INPUT) {
		if (err_no == EFBIG && limit < DECK_MAX_FILE)
			return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line,
					      "the netlist, its includes and data files hold more than %zu bytes in all (at '%s')",
					      DECK_MAX_TOTAL, shown);
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, err_no == EISDIR ?
				      "%s data file '%s' is a directory%s" : "cannot open %s data file '%s': %s", what, shown,
				      err_no == EISDIR ? "" : sch_deck_errno_text(err_no, why, sizeof(why)));
	}
	if (ret != SCH_OK)
		return ret;
	if (ld->total_bytes)
		*ld->total_bytes += len;
	kept = sch_arena_strndup(&ld->deck->arena, data, len);
	free(data);
	if (!kept || GROW(ld->data_texts, ld->n_data_texts, ld->a_data_texts) != SCH_OK)
		return SCH_ERR_NOMEM;
	ld->data_texts[ld->n_data_texts++] = kept;
	return SCH_OK;
}

enum sch_err sch_deck_code_model_file(struct sch_deck_load *ld, const char *file, long line, const char *type,
				      const char **text)
{
	const char *t = *text, *param = NULL, *joined, *p;
	char what[64], *real = NULL;
	size_t vb = 0, ve = 0, nb, ne;
	bool required = false;
	enum sch_err ret;
	int n;

	for (size_t i = 0; i < sizeof(data_models) / sizeof(data_models[0]); i++)
		if (strcasecmp(type, data_models[i].type) == 0)
			param = data_models[i].param, required = data_models[i].required;
	if (!param)
		return SCH_OK;
	snprintf(what, sizeof(what), "code model '%s'", type);
	n = find_param(t, param, &vb, &ve);
	if (n == 0 && !required)
		return SCH_OK;
	if (n != 1)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line,
				      n ? "%s gives its '%s' parameter more than once" :
					  "%s needs its '%s' parameter: without it the simulator would read a file of a "
					  "default name from wherever it runs",
				      what, param);
	nb = vb, ne = ve;
	if (nb < ne && t[nb] == '"') {
		nb++;
		if (ne - nb == 0 || t[ne - 1] != '"')
			return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "%s: unterminated quote in its '%s' parameter",
					      what, param);
		ne--;
	}
	if (ne <= nb)
		return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "%s: empty '%s' parameter", what, param);
	for (size_t i = nb; i < ne; i++)
		if (t[i] == '{' || t[i] == '\'' || t[i] == '"')
			return sch_diag_error(ld->d, SCH_ERR_INPUT, file, line,
					      "%s: its '%s' parameter must be a plain file name, not an expression", what, param);
	joined = sch_deck_resolve(&ld->deck->arena, file, t + nb, ne - nb);
	if (!joined)
		return SCH_ERR_NOMEM;
	real = realpath(joined, NULL);
	if (!real) {
		char why[128];

		return errno == ENOMEM ? SCH_ERR_NOMEM :
		       sch_diag_error(ld->d, SCH_ERR_INPUT, file, line, "cannot open %s data file '%s': %s", what, joined,
				      sch_deck_errno_text(errno, why, sizeof(why)));
	}
	for (p = real; *p && !path_char_is_odd(*p); p++)
		;
	if (*p || real[0] != '/' || !sch_sim_path_is_command_safe(real)) {
		ret = sch_diag_error(ld->d, SCH_ERR_INPUT, file, line,
				     "%s: the path of its data file holds a character schrot never passes to the simulator "
				     "(quotes, backquotes, blanks, ';', '$', '>', '|', '&', '(', '=', control bytes and the like) "
				     "or is too long",
				     what);
		goto out;
	}
	ret = read_data_file(ld, file, line, what, real, joined);
	if (ret != SCH_OK)
		goto out;
	*text = sch_arena_printf(&ld->deck->arena, "%.*s\"%s\"%s", (int)vb, t, real, t + ve);
	ret = *text ? SCH_OK : SCH_ERR_NOMEM;
out:
	free(real);
	return ret;
}
