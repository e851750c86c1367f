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
 * Parse "YYYY-MM-DDTHH:MM:SS[.fraction](Z|+HH:MM|-HH:MM)" into a UTC
 * quasi-JD.  A non-zero offset is subtracted.  "23:59:60" is accepted only
 * at the end of a UTC day that ERFA's table says holds a leap second (and
 * only with a zero offset).  Returns ERRCODE_BAD_TIME for any other form,
 * with a sentence quoting the text in errbuf (which may be NULL).
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

/* Fill every scale from a UTC quasi-JD and a given UT1-UTC (seconds). */
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
