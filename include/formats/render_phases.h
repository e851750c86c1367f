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

/* Set p to the UTC span from1 + from2 to to1 + to2 (two-part JDs) and
   its n events ev (borrowed), with no time zone. */
void render_phases_init(struct render_phases *p, double from1, double from2,
    double to1, double to2, const struct geom_phase_event *ev, size_t n);

enum errcode render_phases_json(const struct render_phases *p,
    struct mbuf *out);
enum errcode render_phases_text(const struct render_phases *p,
    struct mbuf *out);

#endif
