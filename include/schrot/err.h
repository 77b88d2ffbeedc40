/* SPDX-License-Identifier: BSD-3-Clause */
/* err.h - error codes every fallible schrot function returns, and the fixed process exit codes. */
#ifndef SCH_ERR_H
#define SCH_ERR_H

/* Internal result of a fallible function. SCH_OK is 0. New codes go last. */
enum sch_err {
	SCH_OK = 0,
	SCH_ERR_NOMEM,   /* allocation failed */
	SCH_ERR_USAGE,   /* bad command line */
	SCH_ERR_INPUT,   /* unreadable, malformed or binary netlist, missing include, bad regex */
	SCH_ERR_IO,      /* an output file could not be written */
	SCH_ERR_SIM,     /* the simulator failed: no operating point, simulator error, crash */
	SCH_ERR_CHECK    /* a check failed: integrated output noise over the budget */
};

/* Process exit codes, fixed by DESIGN.md section 4. Never renumber; add last. */
enum sch_exit {
	SCH_EXIT_OK = 0,
	SCH_EXIT_CHECK = 1,
	SCH_EXIT_INPUT = 2,
	SCH_EXIT_SIM = 3
};

/* Maps an internal error to the process exit code. This function can't fail. */
int sch_err_exit_code(enum sch_err err);

#endif
