/* SPDX-License-Identifier: BSD-3-Clause */
/* tscale.c: time-scale conversions and strict ISO 8601 UTC text. */
#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/tscale.h"

#define POSIX_EPOCH_MJD 40587.0	/* 1970-01-01 as MJD */

static enum errcode
bad_time(char *errbuf, size_t errlen, const char *text, const char *why)
{
	if (errbuf != NULL && errlen > 0)
		snprintf(errbuf, errlen, "invalid UTC time '%.60s': %s", text,
		    why);
	return ERRCODE_BAD_TIME;
}

/* Read exactly n decimal digits; returns -1 if any is missing. */
static int
read_digits(const char *s, int n)
{
	int v = 0;

	for (int i = 0; i < n; i++) {
		if (!isdigit((unsigned char)s[i]))
			return -1;
		v = v * 10 + (s[i] - '0');
	}
	return v;
}

enum errcode
tscale_parse_utc(const char *text, double *utc1, double *utc2, char *errbuf,
    size_t errlen)
{
	int year, month, day, hour, minute, isec;
	double frac = 0.0, sec;
	const char *p;
	int off_sign = 0, off_h = 0, off_m = 0;
	double d1, d2;
	int st;

	if (text == NULL || *text == '\0')
		return bad_time(errbuf, errlen, "", "empty");
	if (strlen(text) > 40)
		return bad_time(errbuf, errlen, text, "too long");
	if ((year = read_digits(text, 4)) < 0 || text[4] != '-' ||
	    (month = read_digits(text + 5, 2)) < 0 || text[7] != '-' ||
	    (day = read_digits(text + 8, 2)) < 0)
		return bad_time(errbuf, errlen, text,
		    "expected YYYY-MM-DDTHH:MM:SSZ");
	if (text[10] != 'T')
		return bad_time(errbuf, errlen, text,
		    "expected 'T' between date and time");
	if ((hour = read_digits(text + 11, 2)) < 0 || text[13] != ':' ||
	    (minute = read_digits(text + 14, 2)) < 0 || text[16] != ':' ||
	    (isec = read_digits(text + 17, 2)) < 0)
		return bad_time(errbuf, errlen, text,
		    "expected HH:MM:SS after 'T'");
	p = text + 19;
	if (*p == '.' || *p == ',') {
		double scale = 0.1;
		int ndig = 0;

		for (p++; isdigit((unsigned char)*p); p++, ndig++) {
			if (ndig < 9)
				frac += (*p - '0') * scale;
			scale /= 10.0;
		}
		if (ndig == 0)
			return bad_time(errbuf, errlen, text,
			    "no digits after the decimal sign");
	}
	if (*p == 'Z') {
		p++;
	} else if (*p == '+' || *p == '-') {
		off_sign = (*p == '+') ? 1 : -1;
		if ((off_h = read_digits(p + 1, 2)) < 0 || p[3] != ':' ||
		    (off_m = read_digits(p + 4, 2)) < 0)
			return bad_time(errbuf, errlen, text,
			    "offset must read +HH:MM or -HH:MM");
		if (off_h > 23 || off_m > 59)
			return bad_time(errbuf, errlen, text,
			    "offset out of range");
		p += 6;
	} else {
		return bad_time(errbuf, errlen, text,
		    "a 'Z' or +HH:MM offset is required");
	}
	if (*p != '\0')
		return bad_time(errbuf, errlen, text, "trailing characters");
	if (month < 1 || month > 12)
		return bad_time(errbuf, errlen, text, "month out of range");
	if (day < 1 || day > 31)
		return bad_time(errbuf, errlen, text, "day out of range");
	if (hour > 23)
		return bad_time(errbuf, errlen, text, "hour out of range");
	if (minute > 59)
		return bad_time(errbuf, errlen, text, "minute out of range");
	if (isec > 60)
		return bad_time(errbuf, errlen, text, "second out of range");
	if (isec == 60 && (off_h != 0 || off_m != 0))
		return bad_time(errbuf, errlen, text,
		    "a leap second must be given in UTC");
	sec = isec + frac;

	st = eraDtf2d("UTC", year, month, day, hour, minute, sec, &d1, &d2);
	if (st < 0) {
		if (st == -3)
			return bad_time(errbuf, errlen, text,
			    "day does not exist in that month");
		return bad_time(errbuf, errlen, text, "impossible date or time");
	}
	if (st == 2 || st == 3)
		return bad_time(errbuf, errlen, text,
		    "that UTC day holds no leap second");
	if (off_sign != 0 && (off_h != 0 || off_m != 0)) {
		/*
		 * Local time = UTC + offset, as clock readings (RFC 3339
		 * section 4.2): subtract the offset from the calendar fields,
		 * not from the quasi-JD, whose day is 86401 s long when it
		 * holds a leap second (a quasi-JD shift across such a day
		 * would be off by up to a second).
		 */
		int mins = hour * 60 + minute - off_sign * (off_h * 60 + off_m);
		int shift = mins < 0 ? -1 : (mins >= 1440 ? 1 : 0);
		double djm0, djm, fd;

		mins -= shift * 1440;
		if (eraCal2jd(year, month, day, &djm0, &djm) != 0 ||
		    eraJd2cal(djm0, djm + shift, &year, &month, &day, &fd) != 0)
			return bad_time(errbuf, errlen, text,
			    "impossible date or time");
		st = eraDtf2d("UTC", year, month, day, mins / 60, mins % 60, sec,
		    &d1, &d2);
		if (st < 0)
			return bad_time(errbuf, errlen, text,
			    "impossible date or time");
	}
	*utc1 = d1;
	*utc2 = d2;
	return ERRCODE_OK;
}

/*
 * Calendar fields of a UTC quasi-JD with the seconds rounded to ndp
 * decimals: the exact inverse of eraDtf2d, which tscale_parse_utc uses.
 *
 * Given:
 *   utc1,2  double  UTC quasi-JD
 *   ndp     int     decimals of seconds kept (0..6)
 * Returned:
 *   y,m,d,hh,mm  int     calendar day, hour, minute
 *   sec          double  seconds, rounded; 60.x inside a leap second
 * Returned (function value):
 *   ERRCODE_OK or ERRCODE_BAD_TIME
 * Notes:
 *   1. The length of the UTC day is taken as eraDtf2d takes it: 86400 s
 *      plus the jump of TAI-UTC at its end, the drift of 1961-1971 apart
 *      (ERFA dtf2d.c).  eraD2dtf does not always undo that on a day of a
 *      pre-1972 step that is not a whole second: 1960-12-31T23:59:59.999999
 *      came back as .994999.
 *   2. A second rounded up to the day's end carries into the next day.
 * Called:
 *   eraJd2cal, eraDat
 */
static enum errcode
utc_split(double utc1, double utc2, int ndp, int *y, int *m, int *d,
    int *hh, int *mm, double *sec)
{
	double big = utc1, small = utc2, fd, w, dat0, dat12, dat24, day, s;
	double scale = pow(10.0, ndp);
	int y2, m2, d2;

	if (!isfinite(utc1) || !isfinite(utc2))
		return ERRCODE_BAD_TIME;
	if (fabs(utc2) > fabs(utc1)) {
		big = utc2;
		small = utc1;
	}
	if (eraJd2cal(big, small, y, m, d, &fd) != 0)
		return ERRCODE_BAD_TIME;
	if (eraJd2cal(big + 1.5, small - fd, &y2, &m2, &d2, &w) != 0 ||
	    eraDat(*y, *m, *d, 0.0, &dat0) < 0 ||
	    eraDat(*y, *m, *d, 0.5, &dat12) < 0 ||
	    eraDat(y2, m2, d2, 0.0, &dat24) < 0)
		return ERRCODE_BAD_TIME;
	day = ERFA_DAYSEC + (dat24 - (2.0 * dat12 - dat0));
	s = round(fd * day * scale) / scale;
	if (s >= day) {
		/* Rounded up to the end of the day: 0h of the next. */
		s = 0.0;
		*y = y2;
		*m = m2;
		*d = d2;
	}
	*hh = (int)(s / 3600.0);
	if (*hh > 23)
		*hh = 23;
	s -= *hh * 3600.0;
	*mm = (int)(s / 60.0);
	if (*mm > 59)
		*mm = 59;
	s -= *mm * 60.0;
	*sec = s < 0.0 ? 0.0 : round(s * scale) / scale;
	return ERRCODE_OK;
}

enum errcode
tscale_utc_fields(double utc1, double utc2, int *year, int *month, int *day,
    int *hour, int *minute, double *second)
{
	return utc_split(utc1, utc2, 6, year, month, day, hour, minute,
	    second);
}

enum errcode
tscale_format_utc(double utc1, double utc2, int ndp, char *buf, size_t len)
{
	int y, m, d, hh, mm, isec;
	double sec, scale;
	long frac;
	int n;

	if (ndp < 0 || ndp > 6 || buf == NULL || len < 32)
		return ERRCODE_BAD_ARG;
	if (utc_split(utc1, utc2, ndp, &y, &m, &d, &hh, &mm, &sec) !=
	    ERRCODE_OK)
		return ERRCODE_BAD_TIME;
	if (y < 0 || y > 9999)
		return ERRCODE_BAD_TIME;
	scale = pow(10.0, ndp);
	isec = (int)floor(sec);
	frac = lround((sec - isec) * scale);
	if (frac >= (long)scale) {	/* 59.9999996 kept as 60 - 1 ulp */
		frac -= (long)scale;
		isec++;
	}
	if (ndp == 0)
		n = snprintf(buf, len, "%04d-%02d-%02dT%02d:%02d:%02dZ", y, m,
		    d, hh, mm, isec);
	else
		n = snprintf(buf, len, "%04d-%02d-%02dT%02d:%02d:%02d.%0*ldZ",
		    y, m, d, hh, mm, isec, ndp, frac);
	return (n > 0 && (size_t)n < len) ? ERRCODE_OK : ERRCODE_BAD_ARG;
}

enum errcode
tscale_from_utc(double utc1, double utc2, double dut1,
    struct tscale_instant *out)
{
	int st, dubious = 0;

	if (!isfinite(utc1) || !isfinite(utc2) || !isfinite(dut1) ||
	    fabs(dut1) > 2.0)
		return ERRCODE_BAD_TIME;
	out->utc1 = utc1;
	out->utc2 = utc2;
	out->dut1 = dut1;
	st = eraUtctai(utc1, utc2, &out->tai1, &out->tai2);
	if (st < 0)
		return ERRCODE_BAD_TIME;
	if (st > 0)
		dubious = 1;
	if (eraTaitt(out->tai1, out->tai2, &out->tt1, &out->tt2) != 0)
		return ERRCODE_BAD_TIME;
	st = eraUtcut1(utc1, utc2, dut1, &out->ut11, &out->ut12);
	if (st < 0)
		return ERRCODE_BAD_TIME;
	out->dubious = dubious;
	return ERRCODE_OK;
}

enum errcode
tscale_from_tt(double tt1, double tt2, double dut1, struct tscale_instant *out)
{
	double tai1, tai2, u1, u2;
	int st;

	if (!isfinite(tt1) || !isfinite(tt2))
		return ERRCODE_BAD_TIME;
	if (eraTttai(tt1, tt2, &tai1, &tai2) != 0)
		return ERRCODE_BAD_TIME;
	st = eraTaiutc(tai1, tai2, &u1, &u2);
	if (st < 0)
		return ERRCODE_BAD_TIME;
	return tscale_from_utc(u1, u2, dut1, out);
}

enum errcode
tscale_from_posix(double posix_s, double *utc1, double *utc2)
{
	double days;

	if (!isfinite(posix_s))
		return ERRCODE_BAD_TIME;
	days = floor(posix_s / ERFA_DAYSEC);
	*utc1 = ERFA_DJM0 + POSIX_EPOCH_MJD + days;
	*utc2 = (posix_s - days * ERFA_DAYSEC) / ERFA_DAYSEC;
	return ERRCODE_OK;
}

double
tscale_to_posix(double utc1, double utc2)
{
	double mjd = (utc1 - ERFA_DJM0) + utc2;
	double day = floor(mjd);
	double frac = mjd - day;

	/* A leap second's quasi-JD fraction can exceed 1 - 1/86400 only
	   by the leap second itself; clamp it onto the next day. */
	if (frac > 1.0)
		frac = 1.0;
	return (day - POSIX_EPOCH_MJD) * ERFA_DAYSEC + frac * ERFA_DAYSEC;
}

double
tscale_tt_diff(double a1, double a2, double b1, double b2)
{
	return ((b1 - a1) + (b2 - a2)) * ERFA_DAYSEC;
}

enum errcode
tscale_tai_utc(double utc1, double utc2, double *seconds)
{
	int y, m, d, st;
	double fd;

	if (eraJd2cal(utc1, utc2, &y, &m, &d, &fd) != 0)
		return ERRCODE_BAD_TIME;
	st = eraDat(y, m, d, fd, seconds);
	return st < 0 ? ERRCODE_BAD_TIME : ERRCODE_OK;
}
