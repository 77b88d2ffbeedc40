/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * dialect.c - which compatibility mode the simulator runs the deck in: --dialect, else the one
 * setting of a .spiceinit beside the netlist, read as data; the rest of that file is ignored.
 */
#include <stdio.h>
#include <string.h>
#include "analysis_int.h"
#include "schrot/sim.h"

/* The note about a .spiceinit's lines that were not honoured (its mode line aside). */
static enum sch_err note_ignored(struct sch_analysis *an, const struct sch_spiceinit *si)
{
	struct sch_arena *a = &an->res->arena;

	if (si->bad_mode && sch_analysis_note(an, sch_arena_printf(a, "'%s' sets ngbehavior=%s, which is no compatibility "
								       "mode schrot knows (%s): not applied",
								   si->path, si->bad_mode, sch_sim_compat_mode_list())) != SCH_OK)
		return SCH_ERR_NOMEM;
	if (!si->n_ignored)
		return SCH_OK;
	return sch_analysis_note(an, sch_arena_printf(a, "'%s': %zu line%s ignored (schrot never runs a .spiceinit; "
							  "it reads only 'set ngbehavior=...' from it)",
						      si->path, si->n_ignored, si->n_ignored == 1 ? "" : "s"));
}

/*
 * A mode without 'a' applies, in ngspice, to included and library files only. schrot inlines
 * those files itself, so the simulator sees one netlist: the mode then has to cover all of it.
 * Returns the whole-netlist spelling ("ps" -> "psa"), or mode when it has none or needs none.
 */
static const char *whole_netlist_mode(const char *mode)
{
	static const char *const pairs[][2] = {
		{ "ps", "psa" }, { "lt", "lta" }, { "ltps", "ltpsa" }, { "hs", "hsa" }, { "ki", "kia" },
	};

	for (size_t k = 0; mode && k < sizeof(pairs) / sizeof(pairs[0]); k++)
		if (strcmp(mode, pairs[k][0]) == 0)
			return pairs[k][1];
	return mode;
}

enum sch_err sch_analysis_plan_dialect(struct sch_analysis *an)
{
	struct sch_result *res = an->res;
	struct sch_arena *a = &res->arena;
	struct sch_spiceinit si;
	const char *given = an->opt->compat_mode ? sch_sim_compat_mode_known(an->opt->compat_mode) : NULL;
	enum sch_err ret;

	if ((ret = sch_sim_read_spiceinit(res->netlist ? res->netlist : "", a, &si, an->d)) != SCH_OK)
		return ret;
	res->compat_mode = given ? given : si.mode;
	if (given)
		ret = sch_analysis_note(an, si.mode && si.mode != given
						    ? sch_arena_printf(a, "simulator compatibility mode '%s' (--dialect), in place "
									  "of '%s' from '%s' line %ld",
								       given, si.mode, si.path, si.mode_line)
						    : sch_arena_printf(a, "simulator compatibility mode '%s' (--dialect)", given));
	else if (si.mode)
		ret = sch_analysis_note(an, sch_arena_printf(a, "simulator compatibility mode '%s' from '%s' line %ld "
								 "(read as data; --dialect overrides it)",
							     si.mode, si.path, si.mode_line));
	if (ret == SCH_OK && res->compat_mode && res->deck.n_files > 1 &&
	    whole_netlist_mode(res->compat_mode) != res->compat_mode) {
		const char *whole = whole_netlist_mode(res->compat_mode);

		ret = sch_analysis_note(an, sch_arena_printf(a, "mode '%s' is for included and library files: schrot "
								 "inlines them itself, so the simulator runs the whole "
								 "deck in '%s'",
							     res->compat_mode, whole));
		res->compat_mode = whole;
	}
	if (ret != SCH_OK)
		return ret;
	return si.present ? note_ignored(an, &si) : SCH_OK;
}
