/* SPDX-License-Identifier: BSD-3-Clause */
/* store_stats.c: the log's statistics in the database (core/logstats.h),
   kept current with every write of a record, rebuilt when stale. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <sqlite3.h>

#include "core/link.h"
#include "core/logstats.h"
#include "core/mem.h"
#include "core/text.h"
#include "store/store.h"
#include "store/store_db.h"

/* The meta row of migration 0007. */
struct meta {
	sqlite3_int64 log_gen, stats_gen;
	int rule, nbins;
	double tau, seeing;
};

/* One statement prepared for this call; ERRCODE_DB with the message. */
static enum errcode
prep(struct store *s, const char *sql, sqlite3_stmt **st, char *errbuf,
    size_t errlen)
{
	if (sqlite3_prepare_v2(s->db, sql, -1, st, NULL) == SQLITE_OK)
		return ERRCODE_OK;
	*st = NULL;
	return text_err(ERRCODE_DB, errbuf, errlen, "log statistics: %s",
	    sqlite3_errmsg(s->db));
}

/* Finish a stepped statement: ERRCODE_OK on SQLITE_DONE. */
static enum errcode
done(struct store *s, sqlite3_stmt *st, int rc, char *errbuf, size_t errlen)
{
	enum errcode e = ERRCODE_OK;

	if (rc != SQLITE_DONE)
		e = store_db_error(s, rc, "log statistics", errbuf, errlen);
	sqlite3_finalize(st);
	return e;
}

static enum errcode
meta_get(struct store *s, struct meta *m, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st;
	enum errcode e;
	int rc;

	memset(m, 0, sizeof *m);
	if ((e = prep(s, "SELECT log_gen, stats_gen, rule, nbins, zenith_tau, "
	    "seeing_arcsec FROM logstats_meta WHERE id = 1", &st, errbuf,
	    errlen)))
		return e;
	if ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		m->log_gen = sqlite3_column_int64(st, 0);
		m->stats_gen = sqlite3_column_int64(st, 1);
		m->rule = sqlite3_column_int(st, 2);
		m->nbins = sqlite3_column_int(st, 3);
		m->tau = store_col_real_or_nan(st, 4);
		m->seeing = store_col_real_or_nan(st, 5);
		rc = SQLITE_DONE;
	}
	return done(s, st, rc, errbuf, errlen);
}

/* The station and the number of bins the statistics must be taken
   under; ERRCODE_NOT_FOUND when the database holds no station. */
static enum errcode
wanted(struct store *s, struct site_station *st, int *nbins, char *errbuf,
    size_t errlen)
{
	struct store_settings set;
	enum errcode e;

	if ((e = store_station_get(s, st, errbuf, errlen)) ||
	    (e = store_settings_get(s, &set, errbuf, errlen)))
		return e;
	*nbins = set.coverage_bins;
	return ERRCODE_OK;
}

/* Are the stored statistics those of the log, under st and nbins? */
static int
meta_current(const struct meta *m, const struct site_station *st, int nbins)
{
	struct link_station l;

	site_station_link(st, &l);
	return m->rule == LOGSTATS_RULE && m->stats_gen == m->log_gen &&
	    m->nbins == nbins && m->tau == st->zenith_tau &&
	    m->seeing == l.seeing_arcsec;
}

/* --- reading ------------------------------------------------------------- */

/* The stored statistics into ls (initialised for the meta's station). */
static enum errcode
load_stored(struct store *s, struct logstats *ls, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st;
	enum errcode e;
	int rc;

	if ((e = prep(s, "SELECT target_id, attempts, nps, used, dark_returns, "
	    "dark_exposure, lit_returns, lit_exposure, ret_nps, ret_returns "
	    "FROM logstats ORDER BY target_id", &st, errbuf, errlen)))
		return e;
	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		char id[SITE_ID_LEN];
		struct logstats_entry *x;

		store_col_text(st, 0, id, sizeof id);
		if ((x = logstats_entry(ls, id)) == NULL) {
			sqlite3_finalize(st);
			return ERRCODE_NOMEM;
		}
		x->attempts = (long)sqlite3_column_int64(st, 1);
		x->nps = (long)sqlite3_column_int64(st, 2);
		x->y.used = (long)sqlite3_column_int64(st, 3);
		x->y.dark_returns = (long)sqlite3_column_int64(st, 4);
		x->y.dark_exposure = sqlite3_column_double(st, 5);
		x->y.lit_returns = (long)sqlite3_column_int64(st, 6);
		x->y.lit_exposure = sqlite3_column_double(st, 7);
		x->ret_nps = (long)sqlite3_column_int64(st, 8);
		x->ret_returns = (long)sqlite3_column_int64(st, 9);
	}
	if ((e = done(s, st, rc, errbuf, errlen)))
		return e;
	if ((e = prep(s, "SELECT target_id, bin, count FROM logstats_bins",
	    &st, errbuf, errlen)))
		return e;
	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		char id[SITE_ID_LEN];
		struct logstats_entry *x;
		int b = sqlite3_column_int(st, 1);

		store_col_text(st, 0, id, sizeof id);
		if ((x = logstats_entry(ls, id)) == NULL) {
			sqlite3_finalize(st);
			return ERRCODE_NOMEM;
		}
		if (b >= 0 && b < ls->nbins)
			x->counts[b] = (long)sqlite3_column_int64(st, 2);
	}
	if ((e = done(s, st, rc, errbuf, errlen)))
		return e;
	if ((e = prep(s, "SELECT target_id, source, n, c, s FROM "
	    "logstats_phase", &st, errbuf, errlen)))
		return e;
	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		char id[SITE_ID_LEN], src[16];
		struct logstats_entry *x;
		struct value_moments *m;
		int n = sqlite3_column_int(st, 2);

		store_col_text(st, 0, id, sizeof id);
		store_col_text(st, 1, src, sizeof src);
		if ((x = logstats_entry(ls, id)) == NULL) {
			sqlite3_finalize(st);
			return ERRCODE_NOMEM;
		}
		m = strcmp(src, "attempts") == 0 ? &x->ph_att : &x->ph_np;
		if (n == 0) {
			m->w = sqlite3_column_double(st, 3);
		} else if (n > 0 && n <= VALUE_MOMENTS) {
			m->c[n - 1] = sqlite3_column_double(st, 3);
			m->s[n - 1] = sqlite3_column_double(st, 4);
		}
	}
	return done(s, st, rc, errbuf, errlen);
}

/*
 * The statistics computed from the records, in row order (the order the
 * store adds them in as they are written): the columns they read only.
 */
static enum errcode
compute(struct store *s, const struct site_station *station, int nbins,
    struct logstats *ls, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st;
	enum errcode e;
	int rc;

	if ((e = logstats_init(ls, station, nbins)))
		return text_err(e, errbuf, errlen, "log statistics: %s",
		    errcode_str(e));
	if ((e = prep(s, "SELECT target_id, synodic_deg FROM normal_points "
	    "ORDER BY id", &st, errbuf, errlen)))
		goto out;
	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		struct site_normal_point p;

		memset(&p, 0, sizeof p);
		store_col_text(st, 0, p.target, sizeof p.target);
		p.synodic_deg = sqlite3_column_double(st, 1);
		if ((e = logstats_add_np(ls, &p))) {
			sqlite3_finalize(st);
			goto out;
		}
	}
	if ((e = done(s, st, rc, errbuf, errlen)))
		goto out;
	if ((e = prep(s, "SELECT target_id, shots, returns, normal_points, "
	    "outcome, seeing_arcsec, synodic_deg, target_el_deg, "
	    "sun_el_target_deg, suspect, range_km FROM attempts ORDER BY id",
	    &st, errbuf, errlen)))
		goto out;
	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		struct site_attempt a;
		char oc[SITE_OUTCOME_LEN];
		int o;

		memset(&a, 0, sizeof a);
		store_col_text(st, 0, a.target, sizeof a.target);
		a.shots = (long)sqlite3_column_int64(st, 1);
		a.returns = (long)sqlite3_column_int64(st, 2);
		a.normal_points = (long)sqlite3_column_int64(st, 3);
		store_col_text(st, 4, oc, sizeof oc);
		o = site_outcome_parse(oc);
		a.outcome = o >= 0 ? (enum site_outcome)o : SITE_OUTCOME_OTHER;
		a.seeing_arcsec = store_col_real_or_nan(st, 5);
		a.synodic_deg = sqlite3_column_double(st, 6);
		a.target_el_deg = sqlite3_column_double(st, 7);
		a.sun_el_target_deg = sqlite3_column_double(st, 8);
		a.suspect = (unsigned)sqlite3_column_int(st, 9);
		a.range_km = store_col_real_or_nan(st, 10);
		if ((e = logstats_add_attempt(ls, &a))) {
			sqlite3_finalize(st);
			goto out;
		}
	}
	e = done(s, st, rc, errbuf, errlen);
out:
	if (e != ERRCODE_OK)
		logstats_free(ls);
	return e;
}

enum errcode
store_logstats_get(struct store *s, const struct site_station *st, int nbins,
    struct logstats *out, int *stale, char *errbuf, size_t errlen)
{
	struct meta m;
	enum errcode e;

	memset(out, 0, sizeof *out);
	*stale = 0;
	if ((e = meta_get(s, &m, errbuf, errlen)))
		return e;
	if (!meta_current(&m, st, nbins)) {
		*stale = 1;
		return compute(s, st, nbins, out, errbuf, errlen);
	}
	if ((e = logstats_init(out, st, nbins)) == ERRCODE_OK)
		e = load_stored(s, out, errbuf, errlen);
	if (e != ERRCODE_OK)
		logstats_free(out);
	return e;
}

/* --- writing ------------------------------------------------------------- */

/* Replace the stored statistics by ls, reflecting log generation gen. */
static enum errcode
write_all(struct store *s, const struct logstats *ls, sqlite3_int64 gen,
    char *errbuf, size_t errlen)
{
	sqlite3_stmt *a = NULL, *b = NULL, *p = NULL, *m = NULL;
	enum errcode e;
	int rc = SQLITE_DONE;

	if ((e = prep(s, "DELETE FROM logstats", &a, errbuf, errlen)) ||
	    (e = done(s, a, sqlite3_step(a), errbuf, errlen)) ||
	    (e = prep(s, "DELETE FROM logstats_bins", &a, errbuf, errlen)) ||
	    (e = done(s, a, sqlite3_step(a), errbuf, errlen)) ||
	    (e = prep(s, "DELETE FROM logstats_phase", &a, errbuf, errlen)) ||
	    (e = done(s, a, sqlite3_step(a), errbuf, errlen)))
		return e;
	a = NULL;
	if ((e = prep(s, "INSERT INTO logstats (target_id, attempts, nps, used, "
	    "dark_returns, dark_exposure, lit_returns, lit_exposure, ret_nps, "
	    "ret_returns) VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10)", &a,
	    errbuf, errlen)) ||
	    (e = prep(s, "INSERT INTO logstats_bins (target_id, bin, count) "
	    "VALUES (?1, ?2, ?3)", &b, errbuf, errlen)) ||
	    (e = prep(s, "INSERT INTO logstats_phase (target_id, source, n, c, "
	    "s) VALUES (?1, ?2, ?3, ?4, ?5)", &p, errbuf, errlen)) ||
	    (e = prep(s, "UPDATE logstats_meta SET stats_gen = ?1, rule = ?2, "
	    "zenith_tau = ?3, seeing_arcsec = ?4, nbins = ?5 WHERE id = 1", &m,
	    errbuf, errlen)))
		goto out;
	for (size_t i = 0; i < ls->n && rc == SQLITE_DONE; i++) {
		const struct logstats_entry *x = &ls->e[i];

		sqlite3_bind_text(a, 1, x->id, -1, SQLITE_STATIC);
		sqlite3_bind_int64(a, 2, x->attempts);
		sqlite3_bind_int64(a, 3, x->nps);
		sqlite3_bind_int64(a, 4, x->y.used);
		sqlite3_bind_int64(a, 5, x->y.dark_returns);
		sqlite3_bind_double(a, 6, x->y.dark_exposure);
		sqlite3_bind_int64(a, 7, x->y.lit_returns);
		sqlite3_bind_double(a, 8, x->y.lit_exposure);
		sqlite3_bind_int64(a, 9, x->ret_nps);
		sqlite3_bind_int64(a, 10, x->ret_returns);
		rc = sqlite3_step(a);
		sqlite3_reset(a);
		for (int k = 0; k < ls->nbins && rc == SQLITE_DONE; k++) {
			if (x->counts[k] == 0)
				continue;
			sqlite3_bind_text(b, 1, x->id, -1, SQLITE_STATIC);
			sqlite3_bind_int(b, 2, k);
			sqlite3_bind_int64(b, 3, x->counts[k]);
			rc = sqlite3_step(b);
			sqlite3_reset(b);
		}
		for (int src = 0; src < 2 && rc == SQLITE_DONE; src++) {
			const struct value_moments *v = src ? &x->ph_att :
			    &x->ph_np;

			if (v->w == 0.0)
				continue;
			for (int n = 0; n <= VALUE_MOMENTS &&
			    rc == SQLITE_DONE; n++) {
				sqlite3_bind_text(p, 1, x->id, -1,
				    SQLITE_STATIC);
				sqlite3_bind_text(p, 2, src ? "attempts" :
				    "normal_points", -1, SQLITE_STATIC);
				sqlite3_bind_int(p, 3, n);
				sqlite3_bind_double(p, 4, n ? v->c[n - 1] :
				    v->w);
				sqlite3_bind_double(p, 5, n ? v->s[n - 1] :
				    0.0);
				rc = sqlite3_step(p);
				sqlite3_reset(p);
			}
		}
	}
	if (rc == SQLITE_DONE) {
		sqlite3_bind_int64(m, 1, gen);
		sqlite3_bind_int(m, 2, LOGSTATS_RULE);
		sqlite3_bind_double(m, 3, ls->tau);
		sqlite3_bind_double(m, 4, ls->seeing);
		sqlite3_bind_int(m, 5, ls->nbins);
		rc = sqlite3_step(m);
	}
	if (rc != SQLITE_DONE)
		e = store_db_error(s, rc, "log statistics", errbuf, errlen);
out:
	sqlite3_finalize(a);
	sqlite3_finalize(b);
	sqlite3_finalize(p);
	sqlite3_finalize(m);
	return e;
}

/* Rebuild when stale, inside the open transaction. */
static enum errcode
sync_in_tx(struct store *s, int *rebuilt, char *errbuf, size_t errlen)
{
	struct site_station st;
	struct logstats ls;
	struct meta m;
	enum errcode e;
	int nbins;

	if ((e = wanted(s, &st, &nbins, NULL, 0)) == ERRCODE_NOT_FOUND)
		return ERRCODE_OK;	/* no station: nothing to take */
	if (e != ERRCODE_OK || (e = meta_get(s, &m, errbuf, errlen)))
		return e;
	if (meta_current(&m, &st, nbins))
		return ERRCODE_OK;
	if ((e = compute(s, &st, nbins, &ls, errbuf, errlen)))
		return e;
	e = write_all(s, &ls, m.log_gen, errbuf, errlen);
	logstats_free(&ls);
	if (e == ERRCODE_OK && rebuilt != NULL)
		*rebuilt = 1;
	return e;
}

enum errcode
store_logstats_sync(struct store *s, int *rebuilt, char *errbuf,
    size_t errlen)
{
	enum errcode e;

	if (rebuilt != NULL)
		*rebuilt = 0;
	if (s->in_tx)
		return store_stats_flush(s, rebuilt, errbuf, errlen);
	if ((e = store_begin(s, errbuf, errlen)))
		return e;
	if ((e = store_stats_flush(s, rebuilt, errbuf, errlen))) {
		store_rollback(s);
		return e;
	}
	return store_commit(s, errbuf, errlen);
}

/* --- the records of a transaction ------------------------------------- */

void
store_stats_discard(struct store *s)
{
	if (s->pend != NULL) {
		logstats_free(s->pend);
		mem_free(s->pend);
	}
	s->pend = NULL;
	s->pend_state = 0;
	s->pend_n = 0;
}

/* The first record of a transaction: the stored statistics when they are
   current up to it, else none (the commit rebuilds them). */
static void
pend_start(struct store *s)
{
	struct site_station st;
	struct meta m;
	int nbins;

	s->pend_state = -1;
	if (wanted(s, &st, &nbins, NULL, 0) != ERRCODE_OK ||
	    meta_get(s, &m, NULL, 0) != ERRCODE_OK)
		return;
	/* The record's trigger has run: log_gen counts it already. */
	m.log_gen--;
	if (!meta_current(&m, &st, nbins) ||
	    (s->pend = mem_calloc(1, sizeof *s->pend)) == NULL)
		return;
	if (logstats_init(s->pend, &st, nbins) != ERRCODE_OK ||
	    load_stored(s, s->pend, NULL, 0) != ERRCODE_OK) {
		store_stats_discard(s);
		s->pend_state = -1;
		return;
	}
	s->pend_gen0 = m.log_gen;
	s->pend_n = 0;
	s->pend_state = 1;
}

void
store_stats_note_attempt(struct store *s, const struct site_attempt *a)
{
	if (s->pend_state == 0)
		pend_start(s);
	if (s->pend_state == 1 && logstats_add_attempt(s->pend, a) !=
	    ERRCODE_OK) {
		store_stats_discard(s);
		s->pend_state = -1;
	}
	s->pend_n++;
}

void
store_stats_note_np(struct store *s, const struct site_normal_point *p)
{
	if (s->pend_state == 0)
		pend_start(s);
	if (s->pend_state == 1 && logstats_add_np(s->pend, p) != ERRCODE_OK) {
		store_stats_discard(s);
		s->pend_state = -1;
	}
	s->pend_n++;
}

enum errcode
store_stats_flush(struct store *s, int *rebuilt, char *errbuf, size_t errlen)
{
	enum errcode e = ERRCODE_OK;
	struct meta m;

	if (store_schema_version(s) < 7) {	/* before migration 0007 */
		store_stats_discard(s);
		return ERRCODE_OK;
	}
	if (s->pend_state == 1) {
		/* Written as added, if no other write came between. */
		if ((e = meta_get(s, &m, errbuf, errlen)) == ERRCODE_OK &&
		    m.log_gen == s->pend_gen0 + s->pend_n)
			e = write_all(s, s->pend, m.log_gen, errbuf, errlen);
	}
	store_stats_discard(s);
	if (e == ERRCODE_OK)
		e = sync_in_tx(s, rebuilt, errbuf, errlen);
	return e;
}

enum errcode
store_log_generation(struct store *s, long long *gen, char *errbuf,
    size_t errlen)
{
	struct meta m;
	enum errcode e;

	*gen = 0;
	if ((e = meta_get(s, &m, errbuf, errlen)) == ERRCODE_OK)
		*gen = (long long)m.log_gen;
	return e;
}
