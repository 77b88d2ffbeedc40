/* SPDX-License-Identifier: BSD-3-Clause */
/* wire.h - the record format a worker writes to its pipe and the tool reads: kinds, phases, framing. */
#ifndef SCH_SIM_WIRE_H
#define SCH_SIM_WIRE_H

#include <stddef.h>
#include <stdint.h>
#include <string.h>

#define SCH_SIM_MAX_RECORD ((uint32_t)1 << 31)

/*
 * Wire format, worker -> parent: records of kind (u8), payload length (u32), payload. Integers and
 * doubles are in native byte order (both ends are the same process image).
 */
enum sch_rec {
	SCH_REC_MSG = 1,   /* u8 phase, u32 step, text */
	SCH_REC_FATAL,     /* text: the worker could not set up the simulator */
	SCH_REC_LOADED,    /* u8 ngSpice_Circ returned nonzero */
	SCH_REC_QUANT,     /* u32 step, then n_quantities doubles */
	SCH_REC_VEC,       /* u32 step, u32 name length, name, u32 n, n doubles */
	SCH_REC_STEP_DONE, /* u32 step, u8 flags */
	SCH_REC_GAVE_UP,   /* ControlledExit was called */
	SCH_REC_END,       /* the worker finished */
	SCH_REC_NOISE_NAMES, /* u32 step, u32 n, then n times (u32 name length, name): a density plot starts */
	SCH_REC_NOISE_ROW    /* u32 step, u32 n, n doubles: one frequency point of that plot, in name order */
};

/* Which part of the worker's job a simulator line belongs to; decides how it is judged. */
enum sch_phase {
	SCH_PHASE_INIT = 0, /* ngSpice_Init banner, code model, options: not kept */
	SCH_PHASE_LOAD,     /* ngSpice_Circ */
	SCH_PHASE_STEP,     /* a step's commands */
	SCH_PHASE_READ,     /* quantity and vector reads: errors here only mean "no value" */
	SCH_PHASE_CLEANUP   /* destroy all between steps */
};

/* The flags of SCH_REC_STEP_DONE. */
#define SCH_STEP_NO_NOISE_PLOT 0x1u
#define SCH_STEP_NOISE_GARBLED 0x2u
#define SCH_STEP_DATA_FILE_BAD 0x4u
#define SCH_STEP_NONE UINT32_MAX

/*
 * The worker's end of the pipe: records are gathered in buf (cap bytes, never NULL once the worker
 * runs) and written out whole at each flush. Every writer below ends the worker process with
 * _exit(3) when the parent has gone; none returns an error.
 */
struct sch_wire_out {
	int fd;
	unsigned char *buf;
	size_t len;
	size_t cap;
};

/* Writes what is buffered to the pipe. */
void sch_wire_flush(struct sch_wire_out *o);
/* Appends n bytes of payload; a piece larger than the buffer goes out directly. */
void sch_wire_put(struct sch_wire_out *o, const void *p, size_t n);
void sch_wire_put_u8(struct sch_wire_out *o, uint8_t v);
void sch_wire_put_u32(struct sch_wire_out *o, uint32_t v);
/* Starts a record of the given kind; payload bytes must follow. */
void sch_wire_header(struct sch_wire_out *o, enum sch_rec kind, size_t payload);
/* A whole record holding text (cut at 64 KiB), flushed at once. */
void sch_wire_send_text(struct sch_wire_out *o, enum sch_rec kind, const char *text);
/* A whole record with no payload, flushed at once. */
void sch_wire_send_empty(struct sch_wire_out *o, enum sch_rec kind);

/* Reads a native u32 at p, which need not be aligned. */
static inline uint32_t sch_wire_get_u32(const unsigned char *p)
{
	uint32_t v;

	memcpy(&v, p, sizeof(v));
	return v;
}

#endif
