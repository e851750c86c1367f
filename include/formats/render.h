/* SPDX-License-Identifier: BSD-3-Clause */
/* render.h: results to JSON, CSV, iCalendar, SVG and text, for CLI and HTTP. */
#ifndef MOONRANGE_RENDER_H
#define MOONRANGE_RENDER_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/geom.h"
#include "core/mem.h"
#include "core/plan.h"

/*
 * Renderers append to a caller-owned mbuf and return ERRCODE_OK or
 * ERRCODE_NOMEM.  They do no I/O, so the CLI and the HTTP API print the
 * same bytes for the same data.  JSON field names are a documented,
 * stable contract (README, "JSON contract").
 */

/* --- ephemeris (moonrange ephem, GET /api/v1/now) --- */

struct render_target_row {
	const char *id;
	struct geom_target_view view;
};

struct render_ephem {
	const struct geom_instant *g;
	const struct render_target_row *targets;
	size_t ntargets;
	const char *dut1_source;	/* "option", "table" or "none" */
	const char *eop_last_utc;	/* last day of the EOP table, or NULL */
	const char *station_name;	/* NULL for an ad-hoc station */
	const char *time_zone;		/* IANA name for local times, or NULL */
};

enum errcode render_ephem_json(const struct render_ephem *e, struct mbuf *out);
enum errcode render_ephem_text(const struct render_ephem *e, struct mbuf *out);

/* --- phases --- */

struct render_phases {
	double from1, from2, to1, to2;	/* UTC span */
	const struct geom_phase_event *ev;
	size_t n;
	const char *time_zone;		/* for the text table, or NULL */
};

enum errcode render_phases_json(const struct render_phases *p,
    struct mbuf *out);
enum errcode render_phases_text(const struct render_phases *p,
    struct mbuf *out);

/* --- planned windows (moonrange windows / tonight, GET /api/v1/windows) */

struct render_plan {
	const struct plan_result *r;
	const char *station_name;	/* NULL for an ad-hoc station */
	const char *time_zone;		/* IANA zone for local times, or NULL */
	double now_mjd;			/* UTC: DTSTAMP of iCalendar, "now" of
					   tonight */
	double now_synodic_deg;		/* tonight: the phase now */
};

/* {"windows":[...]} and metadata; field names in README "windows". */
enum errcode render_windows_json(const struct render_plan *p,
    struct mbuf *out);
/* RFC 4180: header row, CRLF, quoted where needed; reasons joined by
   "; ". */
enum errcode render_windows_csv(const struct render_plan *p,
    struct mbuf *out);
/* RFC 5545: one VEVENT per window, folded at 75 octets, CRLF. */
enum errcode render_windows_ics(const struct render_plan *p,
    struct mbuf *out);
/* A table with UTC and station local time side by side. */
enum errcode render_windows_text(const struct render_plan *p,
    struct mbuf *out);
/* The operator's view of the coming night, 80 columns. */
enum errcode render_tonight_text(const struct render_plan *p,
    struct mbuf *out);

/* --- shared helpers --- */

/* UTC of a TT JD as ISO text (0 decimals); "?" on failure. buf >= 32. */
void render_tt_iso(double tt1, double tt2, char *buf, size_t len);

/*
 * Local civil time of a UTC quasi-JD in an IANA zone, "YYYY-MM-DD HH:MM
 * ZZZ".  Uses the C library's zone database; serialised internally.
 * Returns ERRCODE_NOT_FOUND for an unknown zone.  buf >= 40.
 */
enum errcode render_local_time(double utc1, double utc2, const char *tz,
    char *buf, size_t len);

/* Does the C library know this IANA zone name? */
int render_zone_known(const char *tz);

/* JSON helpers for the render*.c files: a real rounded to decimals (null
   when not finite); dump a value (consumed) with a newline into out. */
struct json_t;
struct json_t *render_json_num(double v, int decimals);
enum errcode render_json_dump(struct json_t *root, struct mbuf *out);

/* Route jansson's allocations through mem_alloc/mem_free.  Call once at
   start, before any JSON value exists. */
void render_json_setup(void);

#endif
