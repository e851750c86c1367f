/* SPDX-License-Identifier: BSD-3-Clause */
/* qzone.h: an IANA time zone read once with the C library into the pure
   table of core/tzone.h, for the queries and the command line (the
   renderers convert from the table and do no I/O). */
#ifndef MOONRANGE_QZONE_H
#define MOONRANGE_QZONE_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/tzone.h"

/* Does the C library know this IANA zone name (its file under
   /usr/share/zoneinfo is readable, or it is "UTC")? */
int qzone_known(const char *name);

/*
 * Read zone name's UTC offsets over the UTC MJD span [from_mjd, to_mjd]
 * (widened by two days each side) into *out.  Serialised internally: the
 * C library reads the zone through the process's TZ variable, set and
 * restored here.
 *
 * Returned (function value):
 *   ERRCODE_OK; ERRCODE_NOT_FOUND for a zone the system does not know;
 *   ERRCODE_BAD_ARG for a span that is not finite or reversed;
 *   ERRCODE_TOO_LARGE for more offset changes than TZONE_MAX_SPANS.
 */
enum errcode qzone_load(const char *name, double from_mjd, double to_mjd,
    struct tzone *out);

/*
 * One instant: local time of a UTC MJD in zone name as text, "YYYY-MM-DD
 * HH:MM ZZZ" (qzone_load over that day, then tzone_format).  Errors as
 * qzone_load; ERRCODE_BAD_ARG when buf is too small.
 */
enum errcode qzone_format(const char *name, double mjd, char *buf,
    size_t len);

#endif
