/* SPDX-License-Identifier: BSD-3-Clause */
/* carriers.h - which current elements carry shot noise, and why; which DC sources stay noiseless. */
#ifndef SCH_CARRIERS_H
#define SCH_CARRIERS_H

#include <stdbool.h>
#include <stddef.h>
#include "schrot/deck.h"
#include "schrot/pattern.h"

/*
 * The default name rule, matched caselessly against the element's own name (the last part of the
 * hierarchical name): right after the element letter (and an optional '_'), one of ph, pd, photo,
 * dark or leak: "iph", "Ipd2", "i_dark", "gleak", "fphoto".
 */
#define SCH_DEFAULT_CARRIER_REGEX "[igbf]_?(ph|pd|photo|dark|leak).*"

enum sch_carrier_why {
	SCH_WHY_DIODE = 1,     /* its two nodes are a diode's two nodes */
	SCH_WHY_NAME = 2,      /* its name matches the default name rule */
	SCH_WHY_OPTION = 4,    /* --carrier */
	SCH_WHY_AVALANCHE = 8, /* named by --avalanche */
	SCH_WHY_FANO = 16      /* named by --fano */
};

/* --avalanche REGEX=M:K or --fano REGEX=F */
struct sch_gain_rule {
	const char *regex;
	double gain_m;   /* avalanche: M >= 1 */
	double k_ratio;  /* avalanche: 0 <= k <= 1 */
	double fano;     /* fano: F >= 0 */
};

struct sch_carrier_options {
	const char *carrier_regex;          /* NULL: none */
	const char *ignore_regex;           /* NULL: none */
	struct sch_gain_rule *avalanche;
	size_t n_avalanche;
	struct sch_gain_rule *fano;
	size_t n_fano;
	/*
	 * The hierarchical name of a swept current source: a carrier by the usual rules even when its
	 * netlist value has no DC current (the sweep gives it one); NULL: none.
	 */
	const char *swept;
};

struct sch_carrier {
	const char *name;        /* hierarchical name: "x1.iph" */
	const char *sim_name;    /* simulator name: "i.x1.iph" */
	int element;             /* deck element (the definition) */
	int instance;            /* index into the set's instance list */
	unsigned why;            /* enum sch_carrier_why bits */
	const char *reason;      /* human text: "shares nodes with diode x1.d1; name rule" */
	double gain_m;           /* 1 unless --avalanche */
	double excess_f;         /* McIntyre F(M) for avalanche, the Fano factor for --fano, else 1 */
	double dc_current_a;     /* terminal current from the operating point; NaN until simulated */
	const char *time_function; /* "PULSE", "SIN", ... when the netlist value is one (sized at its
				      operating-point value); NULL otherwise */
};

/*
 * The amplifier-shape rule: a current element instance across a diode is a bias, clamp or offset
 * construct, not a carrier, when its path passes (at any depth) through an instance of a subcircuit
 * with at least this many ports
 * and this many controlled sources (E, F, G, H, B) of its own, the shape of an op-amp or
 * comparator macro-model. A photodiode model (anode, cathode, maybe a light pin; one generator)
 * is not of that shape. The name rule, --carrier and the gain options still make it a carrier.
 */
#define SCH_AMP_SHAPE_MIN_PORTS 4
#define SCH_AMP_SHAPE_MIN_CONTROLLED 3

/* A DC current element that is not a carrier (noiseless in the simulator). */
struct sch_source {
	const char *name;
	const char *sim_name;
	int element;
	double dc_current_a;     /* NaN until simulated */
	/* why a current element across a diode is not a carrier (the amplifier-shape rule); NULL otherwise */
	const char *reason;
};

struct sch_carrier_set {
	struct sch_instance *instances; /* the whole expanded hierarchy */
	size_t n_instances;
	struct sch_carrier *carriers;
	size_t n_carriers;
	struct sch_source *noiseless;
	size_t n_noiseless;
};

/*
 * Expands the deck and classifies every current element instance (I; G; B with i=; F). An I
 * element whose netlist value has no DC current (none, "dc 0", only "ac 1") is a carrier only
 * when an option names it (or it is opt->swept). Regexes match the whole hierarchical name,
 * case-insensitive; every --carrier, --ignore, --avalanche and --fano pattern must match a current
 * element (SCH_ERR_USAGE naming the pattern and the closest names otherwise). Storage comes from arena. Returns
 * SCH_ERR_INPUT for a bad regex or a bad hierarchy (located message), SCH_ERR_NOMEM.
 */
enum sch_err sch_carriers_find(const struct sch_deck *deck, const struct sch_carrier_options *opt,
			       struct sch_arena *arena, struct sch_carrier_set *set, struct sch_diag *d);

/* The simulator quantity that gives a current element's DC current: "@i.x1.iph[current]", "@g1[i]". */
const char *sch_carriers_current_quantity(struct sch_arena *arena, char letter, const char *sim_name);

/* Density multiplier G of a carrier: M*F(M) for avalanche, F for Fano, else 1. */
double sch_carrier_gain(const struct sch_carrier *c);

#endif
