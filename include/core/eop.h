/* SPDX-License-Identifier: BSD-3-Clause */
/* eop.h: the Earth-orientation table and its interpolation (pure). */
#ifndef MOONRANGE_EOP_H
#define MOONRANGE_EOP_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/geom.h"
#include "core/site.h"

/*
 * A borrowed, MJD-sorted array of daily rows (the store loads it).  Lookup
 * interpolates linearly between the two rows around the instant; across a
 * leap second (a +-1 s step of UT1-UTC between rows) it interpolates
 * UT1-TAI instead, so that DUT1 jumps at the right moment.
 */
struct eop_table {
	const struct site_eop_row *rows;
	size_t n;
};

enum eop_source {
	EOP_SOURCE_NONE = 0,		/* no table row covers the instant */
	EOP_SOURCE_TABLE,		/* interpolated from the table */
	EOP_SOURCE_OPTION		/* given by the user */
};

const char *eop_source_name(enum eop_source s);	/* "none" "table" "option" */

/*
 * Earth orientation at a UTC instant, from a daily table.
 *
 * Given:
 *   t        eop_table*  rows sorted by MJD (see eop_table_check)
 *   utc_mjd  double      UTC quasi-MJD (UTC quasi-JD - 2400000.5; on a
 *                        day with a leap second the fraction runs over
 *                        86401 s, as in ERFA)
 * Returned:
 *   out      geom_eop    dut1 (UT1-UTC, s), xp, yp (polar motion, rad);
 *                        zero when not covered
 * Returned (function value):
 *   EOP_SOURCE_TABLE when rows[0].mjd <= utc_mjd <= rows[n-1].mjd and the
 *   two rows around it are at most 10 days apart; else EOP_SOURCE_NONE.
 * Notes:
 *   1. Linear interpolation between the rows before and after the
 *      instant, as the IERS recommends for daily values at the accuracy
 *      moonrange needs (pointing: the interpolation error of UT1 between
 *      daily values is well under 1 ms, i.e. < 0.015 arcsec of rotation).
 *   2. UT1-UTC steps by about +1 s at a leap second.  The interpolation
 *      is done on UT1-TAI = dut1 - (TAI-UTC), which is smooth, and
 *      TAI-UTC at the instant is added back, so that DUT1 jumps exactly
 *      at the leap second (end of the UTC day) and not gradually over the
 *      day before.  TAI-UTC comes from ERFA's leap-second table.  If the
 *      table's UT1-TAI still jumps by more than 0.5 s between two rows (a
 *      leap second ERFA does not know, or demo values), the step is taken
 *      to fall at the end of the earlier row's day, where UTC puts it.
 *   3. Polar motion is interpolated linearly; it has no steps.
 * References:
 *   IERS Conventions (2010), IERS Technical Note 36, ch. 5 and 8 (use of
 *   EOP series; diurnal and semidiurnal terms, not modelled here).
 * Called:
 *   tscale_tai_utc (eraJd2cal, eraDat)
 */
enum eop_source eop_lookup(const struct eop_table *t, double utc_mjd,
    struct geom_eop *out);

/* The same over a borrowed array of n rows (rows may be NULL when n is
   0): the one lookup for every layer that holds rows. */
enum eop_source eop_lookup_rows(const struct site_eop_row *rows, size_t n,
    double utc_mjd, struct geom_eop *out);

/* Check order and ranges; ERRCODE_BAD_ARG if rows are unsorted or absurd. */
enum errcode eop_table_check(const struct eop_table *t);

#endif
