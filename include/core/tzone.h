/* SPDX-License-Identifier: BSD-3-Clause */
/* tzone.h: local civil time from a table of UTC offsets (pure): the query
   layer reads the zone once with the C library (query/qzone.h), the
   renderers convert from the table and touch no environment. */
#ifndef MOONRANGE_TZONE_H
#define MOONRANGE_TZONE_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/site.h"

#define TZONE_MAX_SPANS 512	/* offset changes held: ~250 years of DST */
#define TZONE_ABBR_LEN 16

/* From POSIX second from_s on, local time is UTC + offset_s, named abbr. */
struct tzone_span {
	long long from_s;
	long offset_s;
	char abbr[TZONE_ABBR_LEN];
};

/*
 * A zone over a covered span of POSIX seconds [first_s, last_s]: the
 * spans in time order, the first starting at first_s.  Filled by
 * qzone_load; the caller owns it (a plain value, nothing allocated).
 */
struct tzone {
	char name[SITE_TZ_LEN];		/* IANA name, e.g. "America/Denver" */
	long long first_s, last_s;
	size_t n;
	struct tzone_span span[TZONE_MAX_SPANS];
};

/* Local time of an instant, broken down. */
struct tzone_parts {
	int year, month, day, hour, minute, second;
	const char *abbr;		/* points into the table */
};

/*
 * Local time of a UTC quasi-JD (utc1 + utc2, whole seconds rounded to
 * nearest as the C library's time_t).  Returns ERRCODE_OK, or
 * ERRCODE_NOT_FOUND when z is NULL, empty, or does not cover the instant.
 */
enum errcode tzone_local(const struct tzone *z, double utc1, double utc2,
    struct tzone_parts *out);

/*
 * The same as text, "YYYY-MM-DD HH:MM ZZZ" (strftime's "%Y-%m-%d %H:%M
 * %Z"), into buf.  Errors as tzone_local, ERRCODE_BAD_ARG when buf is too
 * small.
 */
enum errcode tzone_format(const struct tzone *z, double utc1, double utc2,
    char *buf, size_t len);

/* Fill z with the zone "UTC" (offset 0) over every instant. */
void tzone_utc(struct tzone *z);

/* Civil date of a count of days since 1970-01-01 (proleptic Gregorian;
   H. Hinnant's days_from_civil inverse). */
void tzone_civil(long long days, int *year, int *month, int *day);

/* Days since 1970-01-01 of a civil date (the inverse of tzone_civil). */
long long tzone_days(int year, int month, int day);

#endif
