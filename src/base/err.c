/* SPDX-License-Identifier: BSD-3-Clause */
/* err.c - mapping of internal errors to the fixed process exit codes. */
#include "schrot/err.h"

int sch_err_exit_code(enum sch_err err)
{
	switch (err) {
	case SCH_OK:
		return SCH_EXIT_OK;
	case SCH_ERR_CHECK:
		return SCH_EXIT_CHECK;
	case SCH_ERR_SIM:
		return SCH_EXIT_SIM;
	case SCH_ERR_NOMEM:
	case SCH_ERR_USAGE:
	case SCH_ERR_INPUT:
	case SCH_ERR_IO:
	default:
		return SCH_EXIT_INPUT;
	}
}
