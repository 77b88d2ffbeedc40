/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * values.c - the values of the circuit's resistors, capacitors and current sources as the
 * simulator holds them after a run, read on request (levers puts them back between its runs).
 */
#include <math.h>
#include <string.h>
#include "analysis_int.h"

/* The simulator parameter holding an element's value, or NULL for elements without one. */
static const char *value_param(char letter)
{
	switch (letter) {
	case 'r':
		return "resistance";
	case 'c':
		return "capacitance";
	case 'i':
		return "dc";
	default:
		return NULL;
	}
}

enum sch_err sch_analysis_value_quantities(struct sch_analysis *an)
{
	struct sch_result *res = an->res;
	struct sch_arena *a = &res->arena;
	struct sch_quantity_plan *q = &an->q;
	enum sch_err ret;

	if (!an->opt->read_values || an->vary)
		return SCH_OK;
	q->values = q->names.n;
	q->value_inst = sch_arena_alloc(a, (res->set.n_instances + 1) * sizeof(int));
	if (!q->value_inst)
		return SCH_ERR_NOMEM;
	for (size_t k = 0; k < res->set.n_instances; k++) {
		const struct sch_instance *in = &res->set.instances[k];
		const char *param = value_param(res->deck.elements[in->element].letter);
		if (!param || !sch_sim_name_is_safe(in->sim_name))
			continue;
		ret = sch_strlist_push(a, &q->names, sch_arena_printf(a, "@%s[%s]", in->sim_name, param));
		if (ret != SCH_OK)
			return ret;
		q->value_inst[q->n_values++] = (int)k;
	}
	return SCH_OK;
}

enum sch_err sch_analysis_take_values(struct sch_analysis *an, const struct sch_sim_outcome *o)
{
	struct sch_result *res = an->res;
	const struct sch_quantity_plan *q = &an->q;

	if (!an->opt->read_values || an->vary)
		return SCH_OK;
	res->instance_values = sch_arena_alloc(&res->arena, (res->set.n_instances + 1) * sizeof(double));
	if (!res->instance_values)
		return SCH_ERR_NOMEM;
	for (size_t k = 0; k < res->set.n_instances; k++)
		res->instance_values[k] = NAN;
	for (size_t v = 0; v < q->n_values; v++)
		res->instance_values[q->value_inst[v]] = o->quantities[q->values + v];
	return SCH_OK;
}
