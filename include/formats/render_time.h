/* SPDX-License-Identifier: BSD-3-Clause */
/* render_time.h: times as text for the renderers (UTC of a TT date,
   local civil time in an IANA zone). */
#ifndef MOONRANGE_RENDER_TIME_H
#define MOONRANGE_RENDER_TIME_H

#include <stddef.h>

#include "core/errcode.h"

/* A UTC MJD as ISO 8601 text with ndp decimals of the seconds; "?" when
   it is not finite or cannot be formatted.  buf >= 40. */
void render_utc_text(double mjd, int ndp, char *buf, size_t len);

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

#endif
