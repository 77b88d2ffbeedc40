/* SPDX-License-Identifier: BSD-3-Clause */
/* wire.c - the worker's record writer: buffers records and writes them to the pipe whole. */
#include <errno.h>
#include <stdint.h>
#include <string.h>
#include <unistd.h>

#include "wire.h"

static void wire_write_raw(struct sch_wire_out *o, const void *p, size_t n)
{
	const unsigned char *s = p;

	while (n > 0) {
		ssize_t k = write(o->fd, s, n);
		if (k < 0) {
			if (errno == EINTR)
				continue;
			_exit(3); /* the parent is gone; nothing left to report to */
		}
		s += k;
		n -= (size_t)k;
	}
}

void sch_wire_flush(struct sch_wire_out *o)
{
	wire_write_raw(o, o->buf, o->len);
	o->len = 0;
}

void sch_wire_put(struct sch_wire_out *o, const void *p, size_t n)
{
	if (o->len + n > o->cap)
		sch_wire_flush(o);
	if (n > o->cap) {
		wire_write_raw(o, p, n);
		return;
	}
	memcpy(o->buf + o->len, p, n);
	o->len += n;
}

void sch_wire_put_u8(struct sch_wire_out *o, uint8_t v)
{
	sch_wire_put(o, &v, 1);
}

void sch_wire_put_u32(struct sch_wire_out *o, uint32_t v)
{
	sch_wire_put(o, &v, sizeof(v));
}

void sch_wire_header(struct sch_wire_out *o, enum sch_rec kind, size_t payload)
{
	sch_wire_put_u8(o, (uint8_t)kind);
	sch_wire_put_u32(o, (uint32_t)payload);
}

void sch_wire_send_text(struct sch_wire_out *o, enum sch_rec kind, const char *text)
{
	size_t n = strlen(text);

	if (n > 65536)
		n = 65536;
	sch_wire_header(o, kind, n);
	sch_wire_put(o, text, n);
	sch_wire_flush(o);
}

void sch_wire_send_empty(struct sch_wire_out *o, enum sch_rec kind)
{
	sch_wire_header(o, kind, 0);
	sch_wire_flush(o);
}
