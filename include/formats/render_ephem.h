/* SPDX-License-Identifier: BSD-3-Clause */
/* render_ephem.h: the sky at an instant (moonrange ephem, GET
   /api/v1/now) as JSON and as text. */
#ifndef MOONRANGE_RENDER_EPHEM_H
#define MOONRANGE_RENDER_EPHEM_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/geom.h"
#include "core/mem.h"
#include "core/tzone.h"

/*
 * Renderers append to a caller-owned mbuf and return ERRCODE_OK or
 * ERRCODE_NOMEM.  They do no I/O, so the CLI and the HTTP API print the
 * same bytes for the same data.  JSON field names are a documented,
 * stable contract (README, "JSON contract").  Everything is borrowed for
 * the call.
 */

struct render_target_row {
	const char *id;
	struct geom_target_view view;
	double tilt;			/* array tilt to the line of sight, rad */
	double spread_ps;		/* RMS pulse spread of the array, ps */
};

struct render_ephem {
	const struct geom_instant *g;
	const struct render_target_row *targets;
	size_t ntargets;
	const char *dut1_source;	/* "option", "table" or "none" */
	const char *eop_last_utc;	/* last day of the EOP table, or NULL */
	const char *station_name;	/* NULL for an ad-hoc station */
	const struct tzone *time_zone;		/* local times (qzone_load), or NULL */
	int wide;			/* text: the station and DUT1 on one
					   line, wider than 80 columns */
};

enum errcode render_ephem_json(const struct render_ephem *e, struct mbuf *out);
enum errcode render_ephem_text(const struct render_ephem *e, struct mbuf *out);

#endif
