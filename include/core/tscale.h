/* SPDX-License-Identifier: BSD-3-Clause */
/* tscale.h: UTC, TAI, TT and UT1 as two-part Julian Dates; ISO 8601 text. */
#ifndef MOONRANGE_TSCALE_H
#define MOONRANGE_TSCALE_H

#include <stddef.h>

#include "core/errcode.h"

/*
 * One instant on every time scale moonrange uses.  All pairs are ERFA
 * two-part (quasi-)Julian Dates: the first part is the integral day (or
 * 2400000.5 style base), the second the remainder, so that adding them
 * loses no precision below a microsecond.  UTC is ERFA's quasi-JD, in
 * which a day holding a leap second is 86401 s long.
 */
struct tscale_instant {
	double utc1, utc2;	/* UTC quasi-JD */
	double tai1, tai2;	/* TAI JD */
	double tt1, tt2;	/* TT JD (TDB is taken equal: < 2 ms) */
	double ut11, ut12;	/* UT1 JD, from UTC + dut1 */
	double dut1;		/* UT1-UTC used, seconds */
	int dubious;		/* 1 when ERFA warned the leap-second table is
				   unreliable for this date (before 1960 or
				   beyond its horizon), else 0 */
};

/* --- parsing and formatting (UTC, ISO 8601 with Z) --- */

/*
 * Parse an ISO 8601 UTC date-time.
 *
 * Given:
 *   text     const char*  e.g. "2027-03-01T04:00:00.25Z"
 * Returned:
 *   utc1,2   double       UTC quasi-JD, two parts (eraDtf2d convention)
 * Returned (function value):
 *   ERRCODE_OK or ERRCODE_BAD_TIME (message in errbuf)
 * Notes:
 *   1. The date and time must be complete: no week dates, ordinal dates,
 *      reduced precision or missing offset, since each is ambiguous for a
 *      laser-pointing schedule.
 *   2. ERFA's "dubious year" warning is not an error here; tscale_from_utc
 *      reports it.
 *   3. An offset is applied to the clock reading (RFC 3339): local
 *      "2017-01-01T00:30:00+01:00" is "2016-12-31T23:30:00Z" exactly,
 *      even though that UTC day holds a leap second.
 *   4. "23:59:60" is accepted only at the end of a UTC day that ERFA's
 *      table says holds a leap second, and only with a zero offset.  The
 *      sentence in errbuf (which may be NULL) quotes the text.
 * Called:
 *   eraDtf2d, eraCal2jd, eraJd2cal
 */
enum errcode tscale_parse_utc(const char *text, double *utc1, double *utc2,
    char *errbuf, size_t errlen);

/*
 * Format a UTC quasi-JD as "YYYY-MM-DDTHH:MM:SS[.f...]Z" with ndp decimal
 * places of seconds (0..6).  buf needs at least 32 bytes.
 */
enum errcode tscale_format_utc(double utc1, double utc2, int ndp, char *buf,
    size_t len);

/* Calendar fields of a UTC quasi-JD (seconds may read 60 in a leap second). */
enum errcode tscale_utc_fields(double utc1, double utc2, int *year,
    int *month, int *day, int *hour, int *minute, double *second);

/* --- conversions --- */

/*
 * All scales from UTC.
 *
 * Given:
 *   utc1,2  double  UTC quasi-JD
 *   dut1    double  UT1-UTC, seconds (|dut1| < 1 by IERS rule, not enforced
 *                   beyond a sanity bound of 2 s)
 * Returned:
 *   out     tscale_instant
 * Returned (function value):
 *   ERRCODE_OK, or ERRCODE_BAD_TIME when ERFA rejects the date
 * Called:
 *   eraUtctai, eraTaitt, eraUtcut1
 */
enum errcode tscale_from_utc(double utc1, double utc2, double dut1,
    struct tscale_instant *out);

/* Fill every scale from a TT JD (the inverse path, used by searches). */
enum errcode tscale_from_tt(double tt1, double tt2, double dut1,
    struct tscale_instant *out);

/* UTC quasi-JD of a POSIX time (seconds since 1970-01-01, no leap seconds). */
enum errcode tscale_from_posix(double posix_s, double *utc1, double *utc2);

/* POSIX seconds of a UTC quasi-JD (a leap second maps onto the next one). */
double tscale_to_posix(double utc1, double utc2);

/* Difference b - a of two TT instants, seconds. */
double tscale_tt_diff(double a1, double a2, double b1, double b2);

/* TAI-UTC in seconds at a UTC quasi-JD, from ERFA's leap-second table. */
enum errcode tscale_tai_utc(double utc1, double utc2, double *seconds);

#endif
