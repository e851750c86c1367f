/* SPDX-License-Identifier: BSD-3-Clause */
/* import_iers.c: IERS Earth-orientation tables, finals (standard and
   2000A) and C04. */
#include <ctype.h>
#include <errno.h>
#include <limits.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/geom.h"
#include "core/mem.h"
#include "core/text.h"
#include "core/tscale.h"
#include "formats/import.h"
#include "formats/import_util.h"

#define LINE_MAX_EOP 512	/* an IERS line, bytes */

/* ------------------------------------------------------------------ */
/* IERS Earth orientation                                              */
/* ------------------------------------------------------------------ */

#define EOP_MAX_PM 2.0		/* |polar motion|, arcsec */
#define EOP_MAX_DUT1 1.0	/* |UT1-UTC|, s (IERS keeps it < 0.9) */

/* Columns first..last (1-based, inclusive) of a line, trimmed, into out;
   "" where the line is shorter. */
static const char *
column(const char *s, size_t n, size_t first, size_t last, char *out,
    size_t cap)
{
	char tmp[64];
	size_t a = first - 1, b = last;

	if (a >= n) {
		out[0] = '\0';
		return out;
	}
	if (b > n)
		b = n;
	if (b - a >= sizeof tmp)
		b = a + sizeof tmp - 1;
	memcpy(tmp, s + a, b - a);
	tmp[b - a] = '\0';
	return import_trim(tmp, out, cap);
}

/* Check a row against the calendar date, order and ranges; emit it. */
static enum errcode
eop_row(int y, int m, int d, double mjd, double x, double yp, double dut1,
    double *prev_mjd, size_t line, import_eop_fn fn, void *ctx,
    struct import_report *rep)
{
	struct site_eop_row r;
	double d1, d2;

	if (eraCal2jd(y, m, d, &d1, &d2) != 0) {
		import_err(rep, line, "date",
		    "%04d-%02d-%02d is not a calendar "
		    "date", y, m, d);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (fabs(d2 - mjd) > 1e-6) {
		import_err(rep, line, "MJD", "MJD %.2f is not the date "
		    "%04d-%02d-%02d (MJD %.0f)", mjd, y, m, d, d2);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (!isnan(*prev_mjd) && !(mjd > *prev_mjd)) {
		import_err(rep, line, "MJD", "MJD %.0f does not follow the "
		    "previous row's %.0f", mjd, *prev_mjd);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (fabs(x) > EOP_MAX_PM || fabs(yp) > EOP_MAX_PM) {
		import_err(rep, line, fabs(x) > EOP_MAX_PM ? "x" : "y",
		    "polar motion %g arcsec is beyond %g", fabs(x) >
		    EOP_MAX_PM ? x : yp, EOP_MAX_PM);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (fabs(dut1) >= EOP_MAX_DUT1) {
		import_err(rep, line, "UT1-UTC", "%g s is beyond the 1 s that "
		    "UTC allows", dut1);
		rep->bad++;
		return ERRCODE_OK;
	}
	*prev_mjd = mjd;
	r.mjd = mjd;
	r.xp_arcsec = x;
	r.yp_arcsec = yp;
	r.dut1_s = dut1;
	rep->records++;
	return fn(ctx, &r, line);
}

/* A fixed-column number: 0 ok, -1 not a number. */
static int
col_real(const char *s, size_t n, size_t first, size_t last, double *v,
    int *empty)
{
	char f[64];

	column(s, n, first, last, f, sizeof f);
	*empty = f[0] == '\0';
	if (*empty)
		return -1;
	return text_parse_real(f, -HUGE_VAL, HUGE_VAL, v);
}

/* A number in columns first..last (1-based) of a line, for field. */
struct eop_col {
	size_t first, last;
	const char *field, *unit;
};

/*
 * Read the polar motion x, y and UT1-UTC of a line from its three
 * columns; on a bad one, report it (naming its field and columns) and
 * return -1.
 */
static int
eop_values(const char *ln, size_t n, const struct eop_col col[3],
    double v[3], size_t line, struct import_report *rep)
{
	int empty;

	for (size_t i = 0; i < 3; i++)
		if (col_real(ln, n, col[i].first, col[i].last, &v[i],
		    &empty) != 0) {
			import_err(rep, line, col[i].field, "columns %zu-%zu "
			    "are not a number of %s", col[i].first,
			    col[i].last, col[i].unit);
			rep->bad++;
			return -1;
		}
	return 0;
}

/* The value columns (PM_x, PM_y, UT1-UTC) of finals [0] and C04 [1]. */
static const struct eop_col eop_cols[2][3] = {
	{{19, 27, "PM_x", "arcseconds"}, {38, 46, "PM_y", "arcseconds"},
	    {59, 68, "UT1-UTC", "seconds"}},
	{{20, 30, "x", "arcseconds"}, {31, 41, "y", "arcseconds"},
	    {42, 53, "UT1-UTC", "seconds"}},
};

/* One more bad record in rep (its sentence already reported); -1. */
static int
counted_bad(struct import_report *rep)
{
	rep->bad++;
	return -1;
}

/*
 * One line of an IERS format: 0 with the date, MJD and the three values
 * (PM_x, PM_y, UT1-UTC) of a data row; -1 for any other line (reported or
 * counted in rep).  *state starts at 0 for a file and is the format's own.
 */
typedef int (*eop_line_fn)(const char *ln, size_t n, size_t line,
    int *state, long ymd[3], double *mjd, double v[3],
    struct import_report *rep);

static int
finals_line(const char *ln, size_t n, size_t line, int *state, long ymd[3],
    double *mjd, double v[3], struct import_report *rep)
{
	double x, y, dut1;
	char f[16], pmflag[4], utflag[4];
	int e1, e2, e3;

	(void)state;
	if (n > LINE_MAX_EOP) {
		import_err(rep, line, "", "line longer than %d bytes",
		    LINE_MAX_EOP);
		return counted_bad(rep);
	}
	if (text_parse_long(column(ln, n, 1, 2, f, sizeof f), 0, 99,
	    &ymd[0]) || text_parse_long(column(ln, n, 3, 4, f, sizeof f),
	    1, 12, &ymd[1]) || text_parse_long(column(ln, n, 5, 6, f,
	    sizeof f), 1, 31, &ymd[2])) {
		import_err(rep, line, "date", "columns 1-6 are not a "
		    "YYMMDD date");
		return counted_bad(rep);
	}
	if (col_real(ln, n, 8, 15, mjd, &e1) != 0 ||
	    *mjd != floor(*mjd) || *mjd < 0.0 || *mjd > 200000.0) {
		import_err(rep, line, "MJD", "columns 8-15 are not a "
		    "whole MJD");
		return counted_bad(rep);
	}
	ymd[0] += *mjd <= 51543.0 ? 1900 : 2000;
	column(ln, n, 17, 17, pmflag, sizeof pmflag);
	column(ln, n, 58, 58, utflag, sizeof utflag);
	col_real(ln, n, 19, 27, &x, &e1);
	col_real(ln, n, 38, 46, &y, &e2);
	col_real(ln, n, 59, 68, &dut1, &e3);
	if (e1 && e2 && e3 && pmflag[0] == '\0' && utflag[0] == '\0') {
		rep->skipped++;	/* a date beyond the predictions */
		return -1;
	}
	if (n < 68) {
		import_err(rep, line, "UT1-UTC", "the line ends at "
		    "column %zu, before UT1-UTC (columns 59-68): "
		    "truncated?", n);
		return counted_bad(rep);
	}
	if ((pmflag[0] != 'I' && pmflag[0] != 'P') ||
	    (utflag[0] != 'I' && utflag[0] != 'P')) {
		import_err(rep, line, pmflag[0] != 'I' &&
		    pmflag[0] != 'P' ? "PM_flag" : "UT1_flag",
		    "flag is not I (IERS) or P (prediction)");
		return counted_bad(rep);
	}
	return eop_values(ln, n, eop_cols[0], v, line, rep);
}

/* *state: 1 once a data row has been seen (text after it is an error). */
static int
c04_line(const char *ln, size_t n, size_t line, int *state, long ymd[3],
    double *mjd, double v[3], struct import_report *rep)
{
	char f[16];
	size_t i = 0;
	int e;

	while (i < n && ln[i] == ' ')
		i++;
	if (!isdigit((unsigned char)ln[i])) {	/* the header */
		if (!*state)
			return -1;
		import_err(rep, line, "", "text among the data rows");
		return counted_bad(rep);
	}
	*state = 1;
	if (n > LINE_MAX_EOP) {
		import_err(rep, line, "", "line longer than %d bytes",
		    LINE_MAX_EOP);
		return counted_bad(rep);
	}
	if (n < 53) {
		import_err(rep, line, "UT1-UTC", "the line ends at "
		    "column %zu, before the end of UT1-UTC (column "
		    "53): truncated?", n);
		return counted_bad(rep);
	}
	if (text_parse_long(column(ln, n, 1, 4, f, sizeof f), 1900,
	    2999, &ymd[0]) || text_parse_long(column(ln, n, 5, 8, f,
	    sizeof f), 1, 12, &ymd[1]) || text_parse_long(column(ln, n, 9,
	    12, f, sizeof f), 1, 31, &ymd[2])) {
		import_err(rep, line, "date", "columns 1-12 are not "
		    "a year, month and day");
		return counted_bad(rep);
	}
	if (col_real(ln, n, 13, 19, mjd, &e) != 0 || *mjd != floor(*mjd)) {
		import_err(rep, line, "MJD", "columns 13-19 are not "
		    "a whole MJD");
		return counted_bad(rep);
	}
	return eop_values(ln, n, eop_cols[1], v, line, rep);
}

/* An IERS file read line by line with parse: the rows to fn, in order. */
static enum errcode
eop_import_lines(const char *buf, size_t len, eop_line_fn parse,
    import_eop_fn fn, void *ctx, struct import_report *rep)
{
	struct import_lines it;
	const char *ln;
	size_t n;
	int term, state = 0;
	double prev = NAN;
	enum errcode rc;

	if ((rc = import_begin(buf, len, rep)) != ERRCODE_OK)
		return rc;
	it.p = buf + import_bom_len(buf, len);
	it.end = buf + len;
	it.line = 0;
	while (import_lines_next(&it, &ln, &n, &term)) {
		double mjd, v[3];
		long ymd[3];

		if (import_blank(ln, n) || ln[0] == '#')
			continue;
		if (parse(ln, n, it.line, &state, ymd, &mjd, v, rep) != 0)
			continue;
		rc = eop_row((int)ymd[0], (int)ymd[1], (int)ymd[2], mjd, v[0],
		    v[1], v[2], &prev, it.line, fn, ctx, rep);
		if (rc != ERRCODE_OK)
			return rc;
	}
	if (rep->records == 0 && rep->bad == 0) {
		import_err(rep, 0, "", "no Earth-orientation rows found");
		rep->bad++;
	}
	return import_status(rep);
}

enum errcode
import_eop_finals(const char *buf, size_t len, import_eop_fn fn, void *ctx,
    struct import_report *rep)
{
	return eop_import_lines(buf, len, finals_line, fn, ctx, rep);
}

enum errcode
import_eop_c04(const char *buf, size_t len, import_eop_fn fn, void *ctx,
    struct import_report *rep)
{
	return eop_import_lines(buf, len, c04_line, fn, ctx, rep);
}

enum import_eop_format
import_eop_detect(const char *buf, size_t len)
{
	struct import_lines it;
	const char *ln;
	size_t n;
	int term;

	if (buf == NULL)
		return IMPORT_EOP_UNKNOWN;
	it.p = buf + import_bom_len(buf, len);
	it.end = buf + len;
	it.line = 0;
	while (import_lines_next(&it, &ln, &n, &term)) {
		size_t i = 0, d = 0;

		if (import_blank(ln, n) || ln[0] == '#')
			continue;
		/* C04 opens with a text header; finals with data rows */
		while (i < n && ln[i] == ' ')
			i++;
		if (i < n && !isdigit((unsigned char)ln[i]))
			return IMPORT_EOP_C04;
		/* a finals row: YYMMDD, a blank, the MJD as F8.2 in columns
		   8-15; a C04 row: a four-digit year, the MJD as I7 in
		   columns 13-19 */
		if (n >= 15 && ln[6] == ' ' && ln[12] == '.')
			return IMPORT_EOP_FINALS;
		for (i = 0; i < n && i < 4 && isdigit((unsigned char)ln[i]);
		    i++)
			d++;
		if (d == 4 && n >= 19 && isdigit((unsigned char)ln[18]))
			return IMPORT_EOP_C04;
		return IMPORT_EOP_UNKNOWN;
	}
	return IMPORT_EOP_UNKNOWN;
}

enum errcode
import_eop(const char *buf, size_t len, import_eop_fn fn, void *ctx,
    struct import_report *rep)
{
	enum errcode rc;

	if ((rc = import_begin(buf, len, rep)) != ERRCODE_OK)
		return rc;
	switch (import_eop_detect(buf, len)) {
	case IMPORT_EOP_FINALS:
		return import_eop_finals(buf, len, fn, ctx, rep);
	case IMPORT_EOP_C04:
		return import_eop_c04(buf, len, fn, ctx, rep);
	case IMPORT_EOP_UNKNOWN:
		break;
	}
	import_err(rep, 0, "", "neither the IERS finals2000A nor the EOP 14 "
	    "C04 format");
	rep->bad++;
	return ERRCODE_UNSUPPORTED;
}
