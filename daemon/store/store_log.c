/* SPDX-License-Identifier: BSD-3-Clause */
/* store_log.c: the ranging log in the database: attempts and normal points,
   and the filters of their listings. */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <sqlite3.h>

#include "core/attempt.h"
#include "core/derive.h"
#include "core/mem.h"
#include "core/text.h"
#include "core/tscale.h"
#include "store/store.h"
#include "store/store_db.h"

/* --- queries -------------------------------------------------------------- */

void
store_query_init(struct store_query *q)
{
	memset(q, 0, sizeof *q);
	q->since_mjd = NAN;
	q->until_mjd = NAN;
}

static void
bind_query(sqlite3_stmt *st, const struct store_query *q, int with_station)
{
	store_bind_real_or_null(st, 1, q->since_mjd);
	store_bind_real_or_null(st, 2, q->until_mjd);
	store_bind_text_or_null(st, 3, q->target);
	sqlite3_bind_int(st, 4, q->newest_first ? 1 : 0);
	sqlite3_bind_int64(st, 5, q->limit > 0 && q->limit < INT64_MAX ?
	    (sqlite3_int64)q->limit : -1);
	if (with_station)
		store_bind_text_or_null(st, 6, q->station_code);
}

/* Statement id with the filters of q bound. */
static enum errcode
query_stmt(struct store *s, enum store_stmt_id id, const struct store_query *q,
    int with_station, sqlite3_stmt **st, char *errbuf, size_t errlen)
{
	enum errcode e;

	if ((e = store_stmt_get(s, id, st, errbuf, errlen)) == ERRCODE_OK)
		bind_query(*st, q, with_station);
	return e;
}

/* The rows of statement id under the filters of q, each read by row into
   a new array of n records of size bytes (free with mem_free). */
static enum errcode
list_rows(struct store *s, enum store_stmt_id id, const struct store_query *q,
    int with_station, size_t size, store_row_fn row,
    void **out, size_t *n, const char *what, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	*out = NULL;
	*n = 0;
	if ((e = query_stmt(s, id, q, with_station, &st, errbuf, errlen)))
		return e;
	return store_collect(s, st, size, row, out, n, what, errbuf, errlen);
}

/* A walker of attempts or of normal points. */
struct walk {
	store_attempt_fn att;
	store_np_fn np;
	void *ctx;
};

/* Each row of statement id under q, read by row into the zeroed rec
   (size bytes), handed to the walker; stops at its first error. */
static enum errcode
each_row(struct store *s, enum store_stmt_id id, const struct store_query *q,
    int with_station, void *rec, size_t size, store_row_fn row,
    const struct walk *w, const char *what, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;
	int rc;

	if ((e = query_stmt(s, id, q, with_station, &st, errbuf, errlen)))
		return e;
	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		memset(rec, 0, size);
		row(st, rec);
		e = w->att != NULL ? w->att(w->ctx, rec) : w->np(w->ctx, rec);
		if (e != ERRCODE_OK)
			break;
	}
	if (e == ERRCODE_OK && rc != SQLITE_DONE)
		e = store_db_error(s, sqlite3_extended_errcode(s->db), what,
		    errbuf, errlen);
	store_stmt_done(st);
	return e;
}

static enum errcode
count_rows(struct store *s, enum store_stmt_id id, const struct store_query *q,
    int with_station, size_t *n, const char *what, char *errbuf,
    size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;
	int rc;

	*n = 0;
	if ((e = query_stmt(s, id, q, with_station, &st, errbuf, errlen)))
		return e;
	if ((rc = sqlite3_step(st)) == SQLITE_ROW)
		*n = (size_t)sqlite3_column_int64(st, 0);
	else
		e = store_db_error(s, sqlite3_extended_errcode(s->db), what,
		    errbuf, errlen);
	store_stmt_done(st);
	return e;
}

/* --- attempts ------------------------------------------------------------- */
/* A record and the log's statistics in one transaction: the caller's,
   or one of their own (*own = 1) that own_end commits when e is
   ERRCODE_OK and rolls back otherwise. */
static enum errcode
own_begin(struct store *s, int *own, char *errbuf, size_t errlen)
{
	*own = !s->in_tx;
	return *own ? store_begin(s, errbuf, errlen) : ERRCODE_OK;
}

static enum errcode
own_end(struct store *s, int own, enum errcode e, char *errbuf, size_t errlen)
{
	if (own && e == ERRCODE_OK)
		return store_commit(s, errbuf, errlen);
	if (own)
		store_rollback(s);
	return e;
}


static void
row_attempt(sqlite3_stmt *st, void *dst)
{
	struct site_attempt *o = dst;
	char outcome[SITE_OUTCOME_LEN];
	int oc;

	o->id = (long)sqlite3_column_int64(st, 0);
	store_col_text(st, 1, o->target, sizeof o->target);
	o->start_mjd = sqlite3_column_double(st, 2);
	o->end_mjd = sqlite3_column_double(st, 3);
	o->shots = (long)sqlite3_column_int64(st, 4);
	o->returns = (long)sqlite3_column_int64(st, 5);
	o->normal_points = (long)sqlite3_column_int64(st, 6);
	store_col_text(st, 7, outcome, sizeof outcome);
	oc = site_outcome_parse(outcome);
	o->outcome = oc >= 0 ? (enum site_outcome)oc : SITE_OUTCOME_OTHER;
	store_col_text(st, 8, o->operator_name, sizeof o->operator_name);
	o->seeing_arcsec = store_col_real_or_nan(st, 9);
	store_col_text(st, 10, o->notes, sizeof o->notes);
	o->synodic_deg = sqlite3_column_double(st, 11);
	o->mean_elong_deg = sqlite3_column_double(st, 12);
	o->target_el_deg = sqlite3_column_double(st, 13);
	o->sun_el_target_deg = sqlite3_column_double(st, 14);
	o->suspect = (unsigned)sqlite3_column_int(st, 15);
	o->range_km = store_col_real_or_nan(st, 16);
}

/*
 * attempt_check (core/attempt.h) with the message in the store's form,
 * "WHAT: field 'F': why" ('start' and 'end' as store_canon names them).
 */
static enum errcode
check_attempt(const struct site_attempt *a, double rate, const char *what,
    char *errbuf, size_t errlen)
{
	const char *field = NULL;
	char why[300];
	enum errcode e;

	if ((e = attempt_check(a, rate, &field, why, sizeof why)) ==
	    ERRCODE_OK)
		return e;
	(void)text_err(ERRCODE_OK, errbuf, errlen, "%s: field '%s': %s", what,
	    strcmp(field, "start_utc") == 0 ? "start" :
	    strcmp(field, "end_utc") == 0 ? "end" : field,
	    why + strlen(field) + 2);
	return e;
}

enum errcode
store_attempt_add(struct store *s, struct site_attempt *a, char *errbuf,
    size_t errlen)
{
	sqlite3_stmt *st = NULL;
	char t0[40], t1[40], what[SITE_ID_LEN + 80];
	struct site_station station;
	double rate = NAN;
	enum errcode e;
	int own = 0;

	snprintf(what, sizeof what, "attempt on '%s'", a->target);
	if ((e = store_canon(&a->start_mjd, STORE_TIME_NDP, t0, sizeof t0, what,
	    "start", errbuf, errlen)) ||
	    (e = store_canon(&a->end_mjd, STORE_TIME_NDP, t1, sizeof t1, what,
	    "end",
	    errbuf, errlen)))
		return e;
	snprintf(what, sizeof what, "attempt on '%s' at %s", a->target, t0);
	/* The one validation of an attempt (core/attempt.h), whatever the
	   way in; the schema's CHECKs mirror what a column can hold. */
	if (s->in_tx && s->tx_rate_known) {
		rate = s->tx_rate;
	} else {
		if (store_station_get(s, &station, NULL, 0) == ERRCODE_OK)
			rate = station.fire_rate_hz;
		s->tx_rate = rate;
		s->tx_rate_known = s->in_tx;
	}
	if ((e = check_attempt(a, rate, what, errbuf, errlen)))
		return e;
	a->suspect = attempt_suspect(a, rate, NULL, 0);
	if ((e = store_stmt_get(s, ST_ATTEMPT_ADD, &st, errbuf, errlen)))
		return e;
	if ((e = own_begin(s, &own, errbuf, errlen)))
		return e;
	store_bind_text(st, 1, a->target);
	store_bind_text(st, 2, t0);
	sqlite3_bind_double(st, 3, a->start_mjd);
	store_bind_text(st, 4, t1);
	sqlite3_bind_double(st, 5, a->end_mjd);
	sqlite3_bind_int64(st, 6, a->shots);
	sqlite3_bind_int64(st, 7, a->returns);
	sqlite3_bind_int64(st, 8, a->normal_points);
	if ((unsigned)a->outcome < SITE_OUTCOME__COUNT)
		store_bind_text(st, 9, site_outcome_name(a->outcome));
	else
		store_bind_text(st, 9, "?");
	store_bind_text(st, 10, a->operator_name);
	store_bind_real_or_null(st, 11, a->seeing_arcsec);
	store_bind_text(st, 12, a->notes);
	store_bind_real_or_null(st, 13, a->synodic_deg);
	store_bind_real_or_null(st, 14, a->mean_elong_deg);
	store_bind_real_or_null(st, 15, a->target_el_deg);
	store_bind_real_or_null(st, 16, a->sun_el_target_deg);
	sqlite3_bind_int(st, 17, (int)a->suspect);
	/* 0 (a record never derived) is no range. */
	store_bind_real_or_null(st, 18, a->range_km > 0.0 ? a->range_km : NAN);
	e = store_step_done(s, st, what, errbuf, errlen);
	if (e == ERRCODE_EXISTS)
		(void)text_err(ERRCODE_OK, errbuf, errlen,
		    "%s: target '%s' already has an attempt "
		    "starting at %s", what, a->target, t0);
	if (e == ERRCODE_OK) {
		a->id = (long)sqlite3_last_insert_rowid(s->db);
		store_stats_note_attempt(s, a);
	}
	return own_end(s, own, e, errbuf, errlen);
}

enum errcode
store_attempt_log(struct store *s, struct site_attempt *a, char *errbuf,
    size_t errlen)
{
	struct site_station station;
	struct site_target t;
	struct geom_eop eop;
	char what[SITE_ID_LEN + 20];
	enum errcode e;

	if ((e = store_station_get(s, &station, errbuf, errlen)) ||
	    (e = store_target_get(s, a->target, &t, errbuf, errlen)))
		return e;
	/* Checked before the geometry, which a date outside the rules'
	   span could not give. */
	snprintf(what, sizeof what, "attempt on '%s'", a->target);
	if ((e = check_attempt(a, station.fire_rate_hz, what, errbuf,
	    errlen)))
		return e;
	if ((e = store_eop_at(s, 0.5 * (a->start_mjd + a->end_mjd), &eop, NULL,
	    errbuf, errlen)))
		return e;
	if ((e = derive_attempt(&station, &t, &eop, a)) != ERRCODE_OK) {
		(void)text_err(ERRCODE_OK, errbuf, errlen,
		    "attempt on '%s': field 'start_utc': "
		    "cannot compute the geometry (%s)", a->target,
		    errcode_str(e));
		return e;
	}
	return store_attempt_add(s, a, errbuf, errlen);
}

enum errcode
store_attempt_get(struct store *s, long id, struct site_attempt *out,
    char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	if ((e = store_stmt_get(s, ST_ATTEMPT_GET, &st, errbuf, errlen)))
		return e;
	sqlite3_bind_int64(st, 1, id);
	memset(out, 0, sizeof *out);
	e = store_fetch_one(s, st, row_attempt, out, "attempt", errbuf, errlen);
	if (e == ERRCODE_NOT_FOUND)
		(void)text_err(ERRCODE_OK, errbuf, errlen,
		    "no attempt with id %ld", id);
	return e;
}

enum errcode
store_attempts_list(struct store *s, const struct store_query *q,
    struct site_attempt **out, size_t *n, char *errbuf, size_t errlen)
{
	return list_rows(s, ST_ATTEMPTS_LIST, q, 0, sizeof **out, row_attempt,
	    (void **)out, n, "attempts", errbuf, errlen);
}

enum errcode
store_attempts_each(struct store *s, const struct store_query *q,
    store_attempt_fn fn, void *ctx, char *errbuf, size_t errlen)
{
	struct walk w = {fn, NULL, ctx};
	struct site_attempt a;

	return each_row(s, ST_ATTEMPTS_LIST, q, 0, &a, sizeof a, row_attempt,
	    &w, "attempts", errbuf, errlen);
}

enum errcode
store_attempts_count(struct store *s, const struct store_query *q, size_t *n,
    char *errbuf, size_t errlen)
{
	return count_rows(s, ST_ATTEMPTS_COUNT, q, 0, n, "attempts", errbuf,
	    errlen);
}

/* --- normal points -------------------------------------------------------- */

static void
row_np(sqlite3_stmt *st, void *dst)
{
	struct site_normal_point *o = dst;

	o->id = (long)sqlite3_column_int64(st, 0);
	store_col_text(st, 1, o->target, sizeof o->target);
	store_col_text(st, 2, o->station_code, sizeof o->station_code);
	o->epoch_mjd = sqlite3_column_double(st, 3);
	o->tof_s = sqlite3_column_double(st, 4);
	o->photons = (long)sqlite3_column_int64(st, 5);
	o->rms_ps = store_col_real_or_nan(st, 6);
	o->synodic_deg = sqlite3_column_double(st, 7);
	o->mean_elong_deg = sqlite3_column_double(st, 8);
	o->target_el_deg = store_col_real_or_nan(st, 9);
	o->sun_el_target_deg = sqlite3_column_double(st, 10);
}

enum errcode
store_np_add(struct store *s, struct site_normal_point *np, int *inserted,
    char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	char t0[40], what[SITE_ID_LEN + SITE_CODE_LEN + 80];
	enum errcode e;
	int own = 0;

	if (inserted != NULL)
		*inserted = 0;
	snprintf(what, sizeof what, "normal point of '%s'", np->target);
	if ((e = store_canon(&np->epoch_mjd, STORE_NP_TIME_NDP, t0, sizeof t0,
	    what,
	    "epoch", errbuf, errlen)))
		return e;
	snprintf(what, sizeof what, "normal point of '%s' at %s", np->target,
	    t0);
	if ((e = store_stmt_get(s, ST_NP_ADD, &st, errbuf, errlen)))
		return e;
	if ((e = own_begin(s, &own, errbuf, errlen)))
		return e;
	store_bind_text(st, 1, np->target);
	store_bind_text(st, 2, np->station_code);
	store_bind_text(st, 3, t0);
	sqlite3_bind_double(st, 4, np->epoch_mjd);
	store_bind_real_or_null(st, 5, np->tof_s);
	sqlite3_bind_int64(st, 6, np->photons);
	store_bind_real_or_null(st, 7, np->rms_ps);
	store_bind_real_or_null(st, 8, np->synodic_deg);
	store_bind_real_or_null(st, 9, np->mean_elong_deg);
	store_bind_real_or_null(st, 10, np->target_el_deg);
	store_bind_real_or_null(st, 11, np->sun_el_target_deg);
	if ((e = store_step_done(s, st, what, errbuf, errlen)) == ERRCODE_OK &&
	    sqlite3_changes(s->db) > 0) {
		np->id = (long)sqlite3_last_insert_rowid(s->db);
		if (inserted != NULL)
			*inserted = 1;
		store_stats_note_np(s, np);
	}
	return own_end(s, own, e, errbuf, errlen);
}

enum errcode
store_nps_list(struct store *s, const struct store_query *q,
    struct site_normal_point **out, size_t *n, char *errbuf, size_t errlen)
{
	return list_rows(s, ST_NPS_LIST, q, 1, sizeof **out, row_np,
	    (void **)out, n, "normal points", errbuf, errlen);
}

enum errcode
store_nps_each(struct store *s, const struct store_query *q, store_np_fn fn,
    void *ctx, char *errbuf, size_t errlen)
{
	struct walk w = {NULL, fn, ctx};
	struct site_normal_point p;

	return each_row(s, ST_NPS_LIST, q, 1, &p, sizeof p, row_np, &w,
	    "normal points", errbuf, errlen);
}

enum errcode
store_nps_count(struct store *s, const struct store_query *q, size_t *n,
    char *errbuf, size_t errlen)
{
	return count_rows(s, ST_NPS_COUNT, q, 1, n, "normal points", errbuf,
	    errlen);
}
