/* SPDX-License-Identifier: BSD-3-Clause */
/* attempt.h: the one validation of a logged attempt, for every way in
   (command line, form and API, CSV import), and the checks that store a
   plausible but suspicious attempt with a warning and a flag. */
#ifndef MOONRANGE_ATTEMPT_H
#define MOONRANGE_ATTEMPT_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/site.h"

/*
 * The rules (sql/migrations/0004_attempt_rules.sql mirrors every one a
 * column CHECK can hold):
 *
 *   target         1-32 characters of [A-Za-z0-9_.-]
 *   start, end     finite UTC MJDs, ATTEMPT_MJD_MIN <= start < end <=
 *                  ATTEMPT_MJD_MAX, end - start <= ATTEMPT_MAX_DAYS
 *   shots, returns, normal_points   >= 0
 *   normal_points  <= returns (each normal point needs a return)
 *   returns        <= ATTEMPT_RETURNS_PER_SHOT x shots
 *   shots          <= fire_rate_hz x duration x ATTEMPT_RATE_MARGIN
 *                     + ATTEMPT_SHOTS_SLACK (when the rate is known)
 *   outcome        ranged: shots > 0 and returns > 0;
 *                  no_returns: shots > 0, normal_points = 0 and
 *                  returns <= ATTEMPT_NOISE_MAX (stray counts, no signal)
 *                  (weather, technical, safety, other: any counts)
 *   operator       < 96 bytes, notes < 512 bytes: UTF-8 without control
 *                  characters (notes may hold line feeds), DEL, C1
 *                  controls or bidirectional overrides (text_unsafe_at)
 *   seeing_arcsec  NaN (not given) or ATTEMPT_SEEING_MIN..ATTEMPT_SEEING_MAX
 */
#define ATTEMPT_MJD_MIN 36934.0	/* 1960-01-01: UTC as ERFA defines it */
#define ATTEMPT_MJD_MAX 88069.0	/* 2100-01-01: the geometry's stated span
				   (geom.c: the Moon series 1950-2100) */
#define ATTEMPT_MAX_DAYS 1.0	/* one attempt lasts at most a day */
#define ATTEMPT_RETURNS_PER_SHOT 10 /* an event timer records at most a
				   few stops per shot (common practice) */
#define ATTEMPT_RATE_MARGIN 1.05 /* fire-rate tolerance (common practice:
				   a laser's rate is held within a few %) */
#define ATTEMPT_SHOTS_SLACK 10	/* shots beyond rate x duration x margin */
#define ATTEMPT_NOISE_MAX 10	/* counts a no_returns attempt may hold:
				   noise, no normal point (project rule) */
#define ATTEMPT_STR_(x) #x
#define ATTEMPT_STR(x) ATTEMPT_STR_(x)
#define ATTEMPT_SEEING_MIN 0.01
#define ATTEMPT_SEEING_MAX 60.0

/* Suspicious but possible: stored with a warning, flagged (the bits of
   site_attempt.suspect), left out of the yield model. */
#define ATTEMPT_SUSPECT_BELOW_HORIZON 0x1 /* target below 0 deg elevation
					     at the mid-time (often local
					     time typed with a Z) */
#define ATTEMPT_SUSPECT_LOW_RATE 0x2	/* ranged/no_returns fired at less
					   than ATTEMPT_LOW_RATE of the
					   station's rate */
#define ATTEMPT_SUSPECT_ALL 0x3
#define ATTEMPT_LOW_RATE 0.1

/*
 * Check an attempt against the rules above.
 *
 * Given:
 *   a             the attempt (derived angles not needed)
 *   fire_rate_hz  the station's laser rate; NaN or <= 0: the shots rule
 *                 is skipped
 *
 * Returned:
 *   *field        the member at fault ("shots", "end_utc", ...), or NULL
 *                 when the attempt passes; field may be NULL
 *   errbuf        one sentence naming the member, e.g. "normal_points: 5
 *                 normal points from 3 returns ..."; may be NULL
 *   (function value)  ERRCODE_OK, ERRCODE_BAD_TIME (a start or end
 *                 outside the span) or ERRCODE_BAD_ARG (any other rule)
 */
enum errcode attempt_check(const struct site_attempt *a, double fire_rate_hz,
    const char **field, char *errbuf, size_t errlen);

/*
 * The suspicion bits of an attempt whose derived angles are filled
 * (derive_attempt), and a warning sentence for the person who logged it
 * ("" when the bits are 0).  warn may be NULL.
 */
unsigned attempt_suspect(const struct site_attempt *a, double fire_rate_hz,
    char *warn, size_t warnlen);

/* The warning sentence of suspicion bits into warn ("" for 0); returns
   warn ("" when warn is NULL). */
const char *attempt_warning(unsigned bits, char *warn, size_t warnlen);

#endif
