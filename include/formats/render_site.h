/* SPDX-License-Identifier: BSD-3-Clause */
/* render_site.h: the station, targets, blackouts, attempts and normal
   points as JSON, CSV and text tables, for the CLI and the HTTP API. */
#ifndef MOONRANGE_RENDER_SITE_H
#define MOONRANGE_RENDER_SITE_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/mem.h"
#include "core/site.h"
#include "core/tzone.h"

/*
 * Like render.h: each function appends to a caller-owned mbuf and returns
 * ERRCODE_OK or ERRCODE_NOMEM; no I/O.  Times are written as ISO 8601 UTC
 * with three decimals of seconds (six for normal-point epochs), exactly as
 * the store keeps them.  JSON field names are part of the documented
 * contract (README, "Station store").  Absent values are JSON null and
 * empty CSV fields.
 */

/* --- attempts --- */

/* {"attempts":[{id, target, start_utc, end_utc, duration_s, shots, returns,
   normal_points, outcome, operator, seeing_arcsec, notes, synodic_deg,
   mean_elong_deg, target_el_deg, sun_el_target_deg}, ...]} */
enum errcode render_site_attempts_json(const struct site_attempt *a,
    size_t n, struct mbuf *out);
/* One attempt object (the body of a created row). */
enum errcode render_site_attempt_json(const struct site_attempt *a,
    struct mbuf *out);
/*
 * CSV (RFC 4180: CRLF line ends, quoted fields where needed).  With
 * derived = 0 the columns are exactly those of the log import format
 * (RENDER_SITE_ATTEMPT_CSV_HEADER), so an export imports back unchanged;
 * derived = 1 adds the id first and the four derived angles last.
 */
#define RENDER_SITE_ATTEMPT_CSV_HEADER "target,start_utc,end_utc,shots," \
	"returns,normal_points,outcome,operator,seeing_arcsec,notes"
enum errcode render_site_attempts_csv(const struct site_attempt *a, size_t n,
    int derived, struct mbuf *out);
/* A table for people in 80 columns: id, start (local, from the zone table
   tz of qzone_load, when not NULL, else UTC), target, outcome, returns,
   normal points, operator and notes (cut to fit, control characters as
   spaces); then a count, "N of TOTAL attempts" when a limit left some
   out (total > n). */
enum errcode render_site_attempts_text(const struct site_attempt *a,
    size_t n, size_t total, const struct tzone *tz, struct mbuf *out);

/* --- station, targets, blackouts, normal points --- */

enum errcode render_site_station_json(const struct site_station *st,
    struct mbuf *out);
enum errcode render_site_station_text(const struct site_station *st,
    struct mbuf *out);
/* {"targets":[{id, name, alias, lat_deg, lon_deg, height_m, strength,
   dark_only, active}, ...]} */
enum errcode render_site_targets_json(const struct site_target *t, size_t n,
    struct mbuf *out);
enum errcode render_site_targets_text(const struct site_target *t, size_t n,
    struct mbuf *out);
/* {"blackouts":[{id, start_utc, end_utc, reason}, ...]} */
enum errcode render_site_blackouts_json(const struct site_blackout *b,
    size_t n, struct mbuf *out);
enum errcode render_site_blackouts_text(const struct site_blackout *b,
    size_t n, struct mbuf *out);

/* Append one CSV field (quoted when it holds , " CR LF or edge blanks). */
void render_site_csv_field(struct mbuf *out, const char *s);

#endif
