/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * corrections.c - rows that put right what the simulator's own shot noise gets wrong: a diode's
 * 2q|I_D| in place of the junction's coth form, and GMIN's legs in a bipolar's terminal currents.
 */
#include <math.h>
#include <stdbool.h>
#include <stdio.h>
#include <string.h>
#include "analysis_int.h"
#include "schrot/si.h"
#include "schrot/physics.h"

/*
 * The junction correction of diode j (the j-th diode instance): the junction's 2q*I_j*coth(qV_j/2kT)
 * through the transfer of its id row or its probe, less the simulator's id row. *applied says
 * whether a row was added; none is without the diode's values or a transfer. SCH_ERR_NOMEM.
 */
static enum sch_err correct_junction(struct sch_row_build *rb, size_t j, bool *applied)
{
	const struct sch_quantity_plan *q = rb->q;
	const struct sch_vector_map *m = rb->m;
	const struct sch_sim_outcome *o = rb->o;
	int k = q->diode_inst[j];
	const struct sch_instance *in = &rb->res->set.instances[k];
	double id = o->quantities[q->diodes + 3 * j];
	double vd = o->quantities[q->diodes + 3 * j + 1];
	double gd = o->quantities[q->diodes + 3 * j + 2];
	double ij = id - rb->gmin * vd, gj = gd - rb->gmin, sj, sim_s;
	const double *h2_src = NULL;
	double h2_scale = 0;
	struct sch_contribution *ct;

	*applied = false;
	if (!isfinite(id) || !isfinite(vd) || !isfinite(gd))
		return SCH_OK;
	sim_s = 2.0 * SCH_SIM_Q * fabs(id); /* what the simulator's own id row was computed with */
	if (m->id_vec[k] >= 0 && sim_s > 0) {
		h2_src = o->vectors[m->id_vec[k]].values;
		h2_scale = 1.0 / sim_s;
	} else if (m->probe_vec[k] >= 0) {
		h2_src = o->vectors[m->probe_vec[k]].values;
		h2_scale = 1.0 / rb->unit;
	}
	if (!h2_src)
		return SCH_OK;
	sj = sch_junction_density(vd, ij, gj, rb->res->temp_k);
	if (!(ct = sch_analysis_row_add(&rb->res->arena, &rb->list, rb->nf)))
		return SCH_ERR_NOMEM;
	ct->device = in->path;
	ct->generator = "junction";
	ct->origin = SCH_ORIGIN_CORRECTION;
	/*
	 * Near zero bias the junction's noise is the Nyquist noise 4kT*g_j of its conductance, which
	 * its DC current does not set: 2q|I_j| is the part tanh(|qV_j/2kT|) of S_j, so below half of
	 * it (|V_j| < 1.1 kT/q) the row is thermal and names no current (common practice, no source).
	 */
	if (2.0 * SCH_Q * fabs(ij) < 0.5 * sj) {
		ct->mechanism = SCH_MECH_THERMAL;
		ct->dc_current_a = NAN;
	} else {
		ct->mechanism = SCH_MECH_SHOT;
		ct->dc_current_a = ij;
	}
	for (size_t i = 0; i < rb->nf; i++) {
		double h2 = h2_src[i] * h2_scale;
		double sim_psd = m->id_row[k] >= 0 ? rb->list.v[m->id_row[k]].psd[i] : 0.0;
		ct->psd[i] = h2 * sj - sim_psd;
	}
	*applied = true;
	return SCH_OK;
}

/* Every diode's junction correction; *n_corrected counts the rows added. SCH_ERR_NOMEM. */
static enum sch_err correct_junctions(struct sch_row_build *rb, int *n_corrected)
{
	enum sch_err ret;
	bool applied;

	*n_corrected = 0;
	for (size_t j = 0; j < rb->q->n_diodes; j++) {
		if ((ret = correct_junction(rb, j, &applied)) != SCH_OK)
			return ret;
		*n_corrected += applied;
	}
	return SCH_OK;
}

/*
 * The correction of one bipolar generator (which 0: "ic", 1: "ib") of instance k, bipolar b.
 * *applied says whether a row was added. SCH_ERR_NOMEM.
 */
static enum sch_err correct_bipolar_row(struct sch_row_build *rb, size_t k, int b, int which, bool *applied)
{
	int row = which ? rb->m->ib_row[k] : rb->m->ic_row[k];
	const double *qv = &rb->o->quantities[rb->q->bjts + 4 * (size_t)b];
	double ic = qv[0], ib = qv[1], vbe = qv[2], vbc = qv[3];
	double term = which ? ib : ic;
	double junction = which ? ib - rb->gmin * (vbe + vbc) : ic + rb->gmin * vbc;
	double ratio;
	struct sch_contribution *ct;

	*applied = false;
	if (row < 0 || !isfinite(term) || !isfinite(junction) || !isfinite(vbe) || !isfinite(vbc) || term == 0)
		return SCH_OK;
	ratio = fabs(junction) / fabs(term) - 1.0;
	if (fabs(ratio) < 1e-9)
		return SCH_OK;
	if (!(ct = sch_analysis_row_add(&rb->res->arena, &rb->list, rb->nf)))
		return SCH_ERR_NOMEM;
	ct->device = rb->list.v[row].device;
	ct->generator = which ? "base" : "collector";
	ct->mechanism = SCH_MECH_SHOT;
	ct->origin = SCH_ORIGIN_CORRECTION;
	ct->dc_current_a = junction;
	for (size_t i = 0; i < rb->nf; i++)
		ct->psd[i] = rb->list.v[row].psd[i] * ratio;
	*applied = true;
	return SCH_OK;
}

/*
 * The simulator's bipolar "ib" and "ic" rows are 2q|I| of terminal currents that include GMIN's
 * conductances across both junctions (measured: I_B carries GMIN*(V_BE+V_BC), I_C carries
 * -GMIN*V_BC). A correction row per generator rescales each to the junction current alone; the
 * transfer comes from the row itself (density / 2q|I|). *n_corrected counts the instances
 * corrected. SCH_ERR_NOMEM.
 */
static enum sch_err correct_bipolars(struct sch_row_build *rb, int *n_corrected)
{
	enum sch_err ret;

	*n_corrected = 0;
	for (size_t k = 0; k < rb->res->set.n_instances; k++) {
		int b = rb->q->bjt_of_inst[k];
		bool any = false, applied;
		if (b < 0)
			continue;
		for (int which = 0; which < 2; which++) {
			if ((ret = correct_bipolar_row(rb, k, b, which, &applied)) != SCH_OK)
				return ret;
			any = any || applied;
		}
		*n_corrected += any;
	}
	return SCH_OK;
}

/*
 * "junction correction applied to 3 diode instances: ...", and when fewer rows are listed than
 * applied, how many the table leaves out as too small to matter. NULL when out of memory.
 */
static const char *junction_note(struct sch_arena *a, int n_applied, int n_listed, double gmin)
{
	char left_out[160] = "", gmin_text[48];

	if (n_listed < n_applied)
		snprintf(left_out, sizeof(left_out), "; %d of these row%s below 1e-9 of the output noise power, "
			 "left out of the table", n_applied - n_listed, n_applied - n_listed == 1 ? " is" : "s are");
	return sch_arena_printf(a, "junction correction applied to %d diode instance%s: 2q*I_j*coth(qV_j/2kT) in "
				   "place of the simulator's 2q|I_D| (GMIN %s kept out)%s",
				n_applied, n_applied == 1 ? "" : "s", sch_si_format(gmin_text, sizeof(gmin_text), gmin, 3, "S"),
				left_out);
}

enum sch_err sch_analysis_correct(struct sch_analysis *an, struct sch_row_build *rb)
{
	struct sch_arena *a = &an->res->arena;
	int n_diodes = 0, n_bjt = 0;
	enum sch_err ret;

	an->junction_note = -1;
	if (!an->opt->junction_correction)
		return SCH_OK;
	if ((ret = correct_junctions(rb, &n_diodes)) != SCH_OK || (ret = correct_bipolars(rb, &n_bjt)) != SCH_OK)
		return ret;
	if (n_bjt && (ret = sch_analysis_note(an, sch_arena_printf(a, "bipolar shot noise corrected for %d instance%s: "
								      "2q|I| of the junction currents without GMIN's legs "
								      "(I_B - GMIN*(V_BE+V_BC), I_C + GMIN*V_BC)",
								      n_bjt, n_bjt == 1 ? "" : "s"))) != SCH_OK)
		return ret;
	an->n_junction_rows = n_diodes;
	an->junction_note = -1;
	if (n_diodes) {
		an->junction_note = (long)an->notes.n;
		an->gmin = rb->gmin;
		return sch_analysis_note(an, junction_note(a, n_diodes, n_diodes, rb->gmin));
	}
	return SCH_OK;
}

enum sch_err sch_analysis_junction_note_recount(struct sch_analysis *an)
{
	const struct sch_result *res = an->res;
	int listed = 0;
	const char *s;

	if (an->junction_note < 0 || (size_t)an->junction_note >= an->notes.n)
		return SCH_OK;
	for (size_t c = 0; c < res->n_contributions; c++) {
		const struct sch_contribution *ct = &res->contributions[c];
		listed += ct->origin == SCH_ORIGIN_CORRECTION && ct->generator && strcmp(ct->generator, "junction") == 0;
	}
	if (listed == an->n_junction_rows)
		return SCH_OK;
	if (!(s = junction_note(&an->res->arena, an->n_junction_rows, listed, an->gmin)))
		return SCH_ERR_NOMEM;
	an->notes.v[an->junction_note] = s;
	return SCH_OK;
}
