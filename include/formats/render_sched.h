/* SPDX-License-Identifier: BSD-3-Clause */
/* render_sched.h: the night plan as JSON, CSV, iCalendar, an 80-column
   table and an SVG timeline, for the CLI and the HTTP API alike. */
#ifndef MOONRANGE_RENDER_SCHED_H
#define MOONRANGE_RENDER_SCHED_H

#include "core/errcode.h"
#include "core/mem.h"
#include "core/night.h"
#include "core/tzone.h"

struct render_sched {
	const struct night_result *r;
	const char *station_name;	/* NULL: none */
	const struct tzone *time_zone;		/* local times (a table filled by
				   qzone_load), or NULL */
	double now_mjd;			/* UTC: DTSTAMP, the timeline's now */
	/* tonight only */
	double now_el_deg, now_az_deg;	/* the run now's target, or NaN */
	double next_night_mjd;		/* first run of the next plannable
					   night when this one has none; NaN */
	size_t next_runs;		/* next runs listed */
};

/* {"method","from","to","total_value","expected_normal_points",
   "runs":[...], ...}; fields in README "plan". */
enum errcode render_sched_json(const struct render_sched *p,
    struct mbuf *out);
/* RFC 4180, one row per run, reasons joined by "; ". */
enum errcode render_sched_csv(const struct render_sched *p, struct mbuf *out);
/* RFC 5545, one VEVENT per run. */
enum errcode render_sched_ics(const struct render_sched *p, struct mbuf *out);
/* 80 columns, station local time and UTC. */
enum errcode render_sched_text(const struct render_sched *p,
    struct mbuf *out);
/* The operator's view of tonight around the plan: the run now (until
   when, elevation and azimuth now), the next runs, the night's totals
   and why; when nothing can be ranged, the limit and the next night. */
enum errcode render_sched_tonight(const struct render_sched *p,
    struct mbuf *out);
/* The timeline: Moon elevation, twilight, lit/dark spans, runs, now. */
enum errcode render_sched_svg(const struct render_sched *p, struct mbuf *out);

#endif
