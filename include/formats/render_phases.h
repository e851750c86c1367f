/* SPDX-License-Identifier: BSD-3-Clause */
/* render_phases.h: the Moon's principal phases in a span (moonrange
   phases, GET /api/v1/phases) as JSON and as text. */
#ifndef MOONRANGE_RENDER_PHASES_H
#define MOONRANGE_RENDER_PHASES_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/geom.h"
#include "core/mem.h"
#include "core/tzone.h"

/* The span and its events, borrowed for the call.  The renderers append
   to out and return ERRCODE_OK or ERRCODE_NOMEM. */
struct render_phases {
	double from1, from2, to1, to2;	/* UTC span */
	const struct geom_phase_event *ev;
	size_t n;
	const struct tzone *time_zone;		/* local times of the text table
				   (qzone_load), or NULL */
};

enum errcode render_phases_json(const struct render_phases *p,
    struct mbuf *out);
enum errcode render_phases_text(const struct render_phases *p,
    struct mbuf *out);

#endif
