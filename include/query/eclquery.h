/* SPDX-License-Identifier: BSD-3-Clause */
/* eclquery.h: the lunar-eclipse query shared by "moonrange eclipses" and
   GET /api/v1/eclipses. */
#ifndef MOONRANGE_ECLQUERY_H
#define MOONRANGE_ECLQUERY_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/geom.h"
#include "core/mem.h"

#define ECLQUERY_DAYS_DEFAULT 365.0
#define ECLQUERY_DAYS_MAX 146000.0	/* 400 years */
#define ECLQUERY_PARAMS "from,to,days"

enum eclquery_format {
	ECLQUERY_TEXT = 0, ECLQUERY_JSON, ECLQUERY_CSV, ECLQUERY_ICS
};

/*
 * Every lunar eclipse with greatest eclipse in [from, to) (UTC MJDs),
 * rendered; with a station (site not NULL), whether the Moon is above
 * its horizon at each contact.  ERRCODE_BAD_ARG (the span, in errbuf),
 * ERRCODE_NOMEM.
 */
enum errcode eclquery_run(double from_mjd, double to_mjd,
    const struct geom_site *site, enum eclquery_format fmt, struct mbuf *out,
    char *errbuf, size_t errlen);

#endif
