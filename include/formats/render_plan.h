/* SPDX-License-Identifier: BSD-3-Clause */
/* render_plan.h: planned windows (moonrange windows / tonight, GET
   /api/v1/windows) as JSON, CSV, iCalendar and text. */
#ifndef MOONRANGE_RENDER_PLAN_H
#define MOONRANGE_RENDER_PLAN_H

#include "core/errcode.h"
#include "core/mem.h"
#include "core/plan.h"
#include "core/tzone.h"

/*
 * The planner's result and what the renderers show around it, borrowed
 * for the call.  Renderers append to a caller-owned mbuf and return
 * ERRCODE_OK or ERRCODE_NOMEM; JSON field names are a documented, stable
 * contract (README, "windows").
 */
struct render_plan {
	const struct plan_result *r;
	const char *station_name;	/* NULL for an ad-hoc station */
	const struct tzone *time_zone;		/* local times (a table filled by
				   qzone_load), or NULL */
	double now_mjd;			/* UTC: DTSTAMP of iCalendar, "now" of
					   tonight */
	double now_synodic_deg;		/* tonight: the phase now */
	int wide;			/* windows text: local dates too,
					   wider than 80 columns */
};

/* {"windows":[...]} and metadata; field names in README "windows". */
struct json_t;

/* A window's or run's detail set on o: tilt_deg, spread_ps, eclipse (an
   object with kind, greatest and shadow, or null) and "reasons", an
   array of the n texts: 0, or non-zero when a member could not be set. */
int render_plan_detail_json(struct json_t *o, const struct plan_physics *ph,
    const char (*reasons)[PLAN_REASON_LEN], size_t n);
/* The same as the last six CSV fields of a row and its CRLF: tilt_deg,
   spread_ps, eclipse_kind, eclipse_greatest, eclipse_shadow and the
   reasons joined by "; " (RFC 4180 quoting): ERRCODE_OK or
   ERRCODE_NOMEM. */
enum errcode render_plan_detail_csv(struct mbuf *out,
    const struct plan_physics *ph, const char (*reasons)[PLAN_REASON_LEN],
    size_t n);

enum errcode render_windows_json(const struct render_plan *p,
    struct mbuf *out);
/* RFC 4180: header row, CRLF, quoted where needed; reasons joined by
   "; ". */
enum errcode render_windows_csv(const struct render_plan *p,
    struct mbuf *out);
/* RFC 5545: one VEVENT per window, folded at 75 octets, CRLF. */
enum errcode render_windows_ics(const struct render_plan *p,
    struct mbuf *out);
/* A table with UTC and station local time side by side: 80 columns
   (local hours only), or with p->wide the local dates too (89). */
enum errcode render_windows_text(const struct render_plan *p,
    struct mbuf *out);
/* The operator's view of the coming night, 80 columns. */
enum errcode render_tonight_text(const struct render_plan *p,
    struct mbuf *out);

/* iCalendar (RFC 5545): basic-format UTC "YYYYMMDDTHHMMSSZ" of an MJD;
   one content line folded at 75 octets with CRLF; a NAME:TEXT property
   escaped (3.3.11) and folded. */
void render_ics_time(double mjd, char *buf, size_t len);
void render_ics_line(struct mbuf *b, const char *s);
void render_ics_prop_text(struct mbuf *out, const char *name,
    const char *value);
/* The calendar's opening lines: BEGIN:VCALENDAR, VERSION, the given
   PRODID line, CALSCALE:GREGORIAN and METHOD:PUBLISH. */
void render_ics_calendar_begin(struct mbuf *out, const char *prodid);
/* An event's opening lines: BEGIN:VEVENT, then UID, DTSTAMP, DTSTART and
   DTEND with the given values (basic-format UTC times; the uid without
   "UID:"). */
void render_ics_event_begin(struct mbuf *out, const char *uid,
    const char *stamp, const char *start, const char *end);
/* A window's or run's DESCRIPTION: what d holds, then each reason as a
   "- reason" line and the planning-aid note.  d (the caller's, begun with
   mbuf_init) is freed; out is marked failed when d failed. */
void render_ics_reasons_desc(struct mbuf *out, struct mbuf *d,
    const char (*reasons)[PLAN_REASON_LEN], size_t n);

/* Local "MM-DD", "HH:MM" and zone abbreviation of a UTC MJD from the
   zone table tz (UTC when tz is NULL or does not cover it); day >= 8,
   hm >= 8, zone >= 8. */
void render_local_parts(double mjd, const struct tzone *tz, char *day,
    char *hm, char *zone);

#endif
