/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * augment.h - the augmenter: the deck the simulator runs, with a noise generator of known density
 * across every carrier (and every junction, for the junction correction). Each generator is a 1 ohm
 * resistor alone on its own node, whose thermal noise voltage a unity-gain G element (VCCS) turns
 * into a current across the device; its density 4kT x 1 ohm at the circuit temperature is scaled
 * afterwards to 2q|I|G per instance, so one definition serves every instance and the operating
 * point is untouched (the node has no DC voltage, the G element carries no DC current).
 */
#ifndef SCH_AUGMENT_H
#define SCH_AUGMENT_H

#include <stdbool.h>
#include <stddef.h>
#include <stdio.h>
#include "schrot/carriers.h"
#include "schrot/deck.h"

#define SCH_PROBE_OHMS 1.0

enum sch_probe_kind { SCH_PROBE_CARRIER, SCH_PROBE_JUNCTION };

/* One generator in one definition (it exists once per instance of that definition). */
struct sch_probe {
	enum sch_probe_kind kind;
	int element;           /* the deck element it sits across */
	const char *res_name;  /* its resistor's name inside the definition: "rschg3" */
};

struct sch_augment_options {
	const char *ac_source;   /* top-level source given " ac 1" because it has no AC value; NULL: none */
	bool junction_probes;    /* a generator across every diode too */
	bool keep_analyses;      /* keep the deck's own analysis and output cards (for schrot augment) */
	/*
	 * schrot augment's plain deck: no generators inside definitions and no temperature reader
	 * (sch_augment_write puts one per carrier instance at the top level), the deck's .noise card
	 * left out (sch_augment_write writes the planned one).
	 */
	bool plain;
	/*
	 * A diode whose two nodes are a carrier's (same definition, either order) uses that carrier's
	 * generator instead of a junction generator of its own: probe_of_element then maps both
	 * elements to one probe, whose simulator name is the same for both instances.
	 */
	bool share_paired_junctions;
	/* deck element index -> true: the element (a resistor) gets " noisy=0"; NULL: none */
	const bool *quiet_elements;
	bool quiet_probes;       /* every generator's resistor gets " noisy=0" (a run for the circuit's own noise) */
	const char *analysis_card; /* a card put just before ".end" (".noise v(out) iin dec 10 1 1meg 1"); NULL: none */
};

struct sch_augmented {
	const char **lines;            /* lines[0] is a title, the last is ".end" */
	const int *line_card;          /* n_lines entries: the deck card each line is, -1 for generated lines */
	size_t n_lines;
	struct sch_probe *probes;
	size_t n_probes;
	int *probe_of_element;         /* deck element index -> probe index, -1 when none */
	const char *temp_quantity;     /* reads the circuit temperature in degrees C */
};

/*
 * Builds the simulated deck from deck and the carriers in set. Storage comes from arena.
 * Returns SCH_ERR_NOMEM, or SCH_ERR_INPUT when a generator name would collide with the netlist's.
 */
enum sch_err sch_augment_build(const struct sch_deck *deck, const struct sch_carrier_set *set,
			       const struct sch_augment_options *opt, struct sch_arena *arena,
			       struct sch_augmented *aug, struct sch_diag *d);

/*
 * The simulator's name of the probe resistor of an instance: "rschg3" at top level,
 * "r.x1.x2.rschg3" inside subcircuit instance path "x1.x2.<leaf>".
 */
const char *sch_augment_probe_sim_name(struct sch_arena *arena, const struct sch_probe *p,
				       const char *instance_path);

/*
 * Probe resistance that stands for no generator at all (a zero current, or no carrier there): its
 * density 4 k_sim T x 1e-30 ohm is about 1.7e-50, as good as none, and the node stays well posed.
 */
#define SCH_PROBE_OFF_OHMS 1e-30

/*
 * The simulator's flat names of the first two nodes of deck element `element` in its instance at
 * path ("x1.x2.iph"): a port is the node its X line connects it to, one level up at a time; an
 * internal node is "x1.x2.node"; ground and .global nodes stay. Strings come from arena. Returns
 * SCH_ERR_INPUT when the path does not follow the deck's hierarchy or the element has fewer than
 * two nodes (out of memory reads as that too); the outputs are then unspecified.
 */
enum sch_err sch_augment_flat_nodes(struct sch_arena *arena, const struct sch_deck *deck, int element,
				    const char *path, const char **n_plus, const char **n_minus);

/*
 * An E/G TABLE card's text rewritten as "value={pwl(expr, x0-d, y0, x0, y0, ..., xn, yn, xn+d, yn)}"
 * with d = (xn - x0) / 2 (flat beyond the ends), in arena. ngspice 39 turns a TABLE into a pwl
 * code model whose small-signal gain in a noise run is taken at the AC solution instead of the
 * operating point (measured: 520 V/V falls to 460 above 10 kHz); the behavioural pwl() keeps it.
 * The code model rounds each corner within 10 % of the next segment; pwl() does not. NULL when
 * the text is no TABLE with plain numeric, rising x values (it then stays as written) or when
 * out of memory.
 */
const char *sch_augment_table_as_value(struct sch_arena *arena, const char *text);

/*
 * Writes aug (built from deck with opt->plain) to out as a plain deck: its cards, then one
 * generator per carrier instance of set at the top level, across the instance's flat node names
 * ("x1.x2.k"), its resistor a literal value sized for 2q|I|G with the operating-point current at
 * temp_k (SCH_PROBE_OFF_OHMS for a zero current), then ".<noise_command>" and ".end". No .control
 * block: 'ngspice -b -r out.raw' runs the deck's analyses and writes the noise spectrum, and a
 * user's own .control block can go before the .end. compat_mode (NULL: none) is the simulator
 * compatibility mode the deck was read in, written as a note for plain ngspice. Returns SCH_ERR_INPUT when an instance's node
 * cannot be named at the top level, SCH_ERR_IO (message in d) when a write fails; out may then
 * hold part of the deck.
 */
enum sch_err sch_augment_write(const struct sch_augmented *aug, const struct sch_deck *deck,
			       const struct sch_carrier_set *set, double temp_k, const char *noise_command,
			       const char *compat_mode,
			       struct sch_arena *arena, FILE *out, struct sch_diag *d);

#endif
