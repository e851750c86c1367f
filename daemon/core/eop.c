/* SPDX-License-Identifier: BSD-3-Clause */
/* eop.c: interpolation in a daily Earth-orientation table, across leap
   seconds (pure). */
#include <math.h>
#include <stddef.h>

#include <erfa.h>
#include <erfam.h>

#include "core/eop.h"
#include "core/tscale.h"

#define EOP_MAX_GAP_DAYS 10.0	/* rows further apart cover nothing */
#define EOP_MAX_PM_ARCSEC 2.0
#define EOP_MAX_DUT1_S 1.0

const char *
eop_source_name(enum eop_source s)
{
	switch (s) {
	case EOP_SOURCE_NONE:
		return "none";
	case EOP_SOURCE_TABLE:
		return "table";
	case EOP_SOURCE_OPTION:
		return "option";
	}
	return "none";
}

/* TAI-UTC at a UTC MJD from ERFA's table; 0 where ERFA has none (before
   1960), which only matters for tables that old. */
static double
tai_utc(double mjd)
{
	double s;

	if (tscale_tai_utc(ERFA_DJM0, mjd, &s) != ERRCODE_OK)
		return 0.0;
	return s;
}

enum eop_source
eop_lookup(const struct eop_table *t, double utc_mjd, struct geom_eop *out)
{
	const struct site_eop_row *a, *b;
	size_t lo, hi;
	double f, ua, ub, step, dut1;

	out->dut1 = out->xp = out->yp = 0.0;
	if (t == NULL || t->rows == NULL || t->n == 0 || !isfinite(utc_mjd))
		return EOP_SOURCE_NONE;
	if (utc_mjd < t->rows[0].mjd || utc_mjd > t->rows[t->n - 1].mjd)
		return EOP_SOURCE_NONE;
	if (t->n == 1 || utc_mjd == t->rows[t->n - 1].mjd) {
		a = &t->rows[t->n - 1];
		out->dut1 = a->dut1_s;
		out->xp = a->xp_arcsec * ERFA_DAS2R;
		out->yp = a->yp_arcsec * ERFA_DAS2R;
		return EOP_SOURCE_TABLE;
	}
	/* rows[lo].mjd <= utc_mjd < rows[hi].mjd */
	lo = 0;
	hi = t->n - 1;
	while (hi - lo > 1) {
		size_t mid = lo + (hi - lo) / 2;

		if (t->rows[mid].mjd <= utc_mjd)
			lo = mid;
		else
			hi = mid;
	}
	a = &t->rows[lo];
	b = &t->rows[hi];
	if (b->mjd - a->mjd > EOP_MAX_GAP_DAYS)
		return EOP_SOURCE_NONE;
	f = (utc_mjd - a->mjd) / (b->mjd - a->mjd);
	ua = a->dut1_s - tai_utc(a->mjd);
	ub = b->dut1_s - tai_utc(b->mjd);
	step = ub - ua;
	if (fabs(step) > 0.5)
		ub -= floor(step + 0.5);	/* a step the leap table lacks */
	dut1 = ua + f * (ub - ua) + tai_utc(utc_mjd);
	out->dut1 = dut1;
	out->xp = (a->xp_arcsec + f * (b->xp_arcsec - a->xp_arcsec)) *
	    ERFA_DAS2R;
	out->yp = (a->yp_arcsec + f * (b->yp_arcsec - a->yp_arcsec)) *
	    ERFA_DAS2R;
	return EOP_SOURCE_TABLE;
}

enum errcode
eop_table_check(const struct eop_table *t)
{
	if (t == NULL || (t->n > 0 && t->rows == NULL))
		return ERRCODE_BAD_ARG;
	for (size_t i = 0; i < t->n; i++) {
		const struct site_eop_row *r = &t->rows[i];

		if (!isfinite(r->mjd) || !isfinite(r->dut1_s) ||
		    !isfinite(r->xp_arcsec) || !isfinite(r->yp_arcsec))
			return ERRCODE_BAD_ARG;
		if (fabs(r->dut1_s) >= EOP_MAX_DUT1_S ||
		    fabs(r->xp_arcsec) > EOP_MAX_PM_ARCSEC ||
		    fabs(r->yp_arcsec) > EOP_MAX_PM_ARCSEC)
			return ERRCODE_BAD_ARG;
		if (i > 0 && !(r->mjd > t->rows[i - 1].mjd))
			return ERRCODE_BAD_ARG;
	}
	return ERRCODE_OK;
}

enum eop_source
eop_lookup_rows(const struct site_eop_row *rows, size_t n, double utc_mjd,
    struct geom_eop *out)
{
	struct eop_table t;

	t.rows = rows;
	t.n = n;
	return eop_lookup(&t, utc_mjd, out);
}
