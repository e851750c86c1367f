/* SPDX-License-Identifier: BSD-3-Clause */
/* store_eop.c: Earth-orientation rows in the database and the lookup of one
   instant. */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <sqlite3.h>

#include "core/derive.h"
#include "core/mem.h"
#include "core/text.h"
#include "core/tscale.h"
#include "store/store.h"
#include "store/store_db.h"

/* --- Earth orientation ---------------------------------------------------- */

static void
row_eop(sqlite3_stmt *st, void *dst)
{
	struct site_eop_row *o = dst;

	o->mjd = (double)sqlite3_column_int64(st, 0);
	o->dut1_s = sqlite3_column_double(st, 1);
	o->xp_arcsec = sqlite3_column_double(st, 2);
	o->yp_arcsec = sqlite3_column_double(st, 3);
}

enum errcode
store_eop_put(struct store *s, const struct site_eop_row *r, char *errbuf,
    size_t errlen)
{
	sqlite3_stmt *st = NULL;
	char what[48];
	enum errcode e;

	if (!isfinite(r->mjd) || r->mjd != floor(r->mjd) ||
	    fabs(r->mjd) > 1e7) {
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "EOP row: field 'mjd': not a whole day");
	}
	snprintf(what, sizeof what, "EOP row of MJD %.0f", r->mjd);
	if ((e = store_stmt_get(s, ST_EOP_PUT, &st, errbuf, errlen)))
		return e;
	sqlite3_bind_int64(st, 1, (sqlite3_int64)r->mjd);
	store_bind_real_or_null(st, 2, r->dut1_s);
	store_bind_real_or_null(st, 3, r->xp_arcsec);
	store_bind_real_or_null(st, 4, r->yp_arcsec);
	return store_step_done(s, st, what, errbuf, errlen);
}

enum errcode
store_eop_load(struct store *s, struct site_eop_row **out, size_t *n,
    char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	*out = NULL;
	*n = 0;
	if ((e = store_stmt_get(s, ST_EOP_LOAD, &st, errbuf, errlen)))
		return e;
	return store_collect(s, st, sizeof **out, row_eop, (void **)out, n,
	    "EOP table", errbuf, errlen);
}

enum errcode
store_eop_at(struct store *s, double utc_mjd, struct geom_eop *out,
    enum eop_source *source, char *errbuf, size_t errlen)
{
	struct site_eop_row *rows = NULL;
	struct eop_table t;
	sqlite3_stmt *st = NULL;
	size_t n = 0;
	enum eop_source src;
	enum errcode e;

	memset(out, 0, sizeof *out);
	if (source != NULL)
		*source = EOP_SOURCE_NONE;
	if (!isfinite(utc_mjd))
		return ERRCODE_BAD_TIME;
	if ((e = store_stmt_get(s, ST_EOP_AROUND, &st, errbuf, errlen)))
		return e;
	sqlite3_bind_double(st, 1, floor(utc_mjd));
	if ((e = store_collect(s, st, sizeof *rows, row_eop, (void **)&rows, &n,
	    "EOP table", errbuf, errlen)))
		return e;
	t.rows = rows;
	t.n = n;
	src = eop_lookup(&t, utc_mjd, out);
	if (source != NULL)
		*source = src;
	mem_free(rows);
	return ERRCODE_OK;
}

enum errcode
store_eop_span(struct store *s, double *first_mjd, double *last_mjd,
    char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;
	int rc;

	if ((e = store_stmt_get(s, ST_EOP_SPAN, &st, errbuf, errlen)))
		return e;
	if ((rc = sqlite3_step(st)) != SQLITE_ROW) {
		e = store_db_error(s, sqlite3_extended_errcode(s->db),
		    "EOP table",
		    errbuf, errlen);
	} else if (sqlite3_column_int64(st, 2) == 0) {
		e = text_err(ERRCODE_NOT_FOUND, errbuf, errlen,
		    "the EOP table is empty (load one with "
		    "'moonrange eop import')");
	} else {
		if (first_mjd != NULL)
			*first_mjd = (double)sqlite3_column_int64(st, 0);
		if (last_mjd != NULL)
			*last_mjd = (double)sqlite3_column_int64(st, 1);
	}
	store_stmt_done(st);
	return e;
}
