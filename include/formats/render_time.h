/* SPDX-License-Identifier: BSD-3-Clause */
/* render_time.h: times as text for the renderers (UTC of an MJD or a TT
   date); local times come from a table (core/tzone.h). */
#ifndef MOONRANGE_RENDER_TIME_H
#define MOONRANGE_RENDER_TIME_H

#include <stddef.h>

#include "core/errcode.h"

/* A UTC MJD as ISO 8601 text with ndp decimals of the seconds; "?" when
   it is not finite or cannot be formatted.  buf >= 40. */
void render_utc_text(double mjd, int ndp, char *buf, size_t len);

/* UTC of a TT JD as ISO text (0 decimals); "?" on failure. buf >= 32. */
void render_tt_iso(double tt1, double tt2, char *buf, size_t len);

#endif
