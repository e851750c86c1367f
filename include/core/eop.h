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
 * Earth orientation at a UTC MJD.  When the table covers it, fills out and
 * returns EOP_SOURCE_TABLE; otherwise zeroes out and returns
 * EOP_SOURCE_NONE.
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
