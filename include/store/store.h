/* SPDX-License-Identifier: BSD-3-Clause */
/* store.h: the station database (one SQLite file): station, targets,
   blackouts, the observation log, normal points, EOP rows and settings. */
#ifndef MOONRANGE_STORE_H
#define MOONRANGE_STORE_H

#include <stddef.h>

#include "core/eop.h"
#include "core/errcode.h"
#include "core/geom.h"
#include "core/site.h"

/*
 * The store is the only module that speaks SQL.  It hands out and takes
 * the plain records of site.h; no statement handle or SQLite type leaves
 * it.  Every function that can fail returns enum errcode and, when errbuf
 * is not NULL, writes one sentence naming the field at fault (the schema
 * names each CHECK constraint after its column, so a refused row is
 * reported by column: "attempts.shots: value refused by the database").
 *
 * Codes: ERRCODE_DB for SQLite failures (including a database busy for
 * longer than the busy timeout), ERRCODE_BAD_ARG for a value refused by
 * a rule of the schema or by the store's own validation, ERRCODE_NOT_FOUND
 * for a missing row, ERRCODE_EXISTS for a duplicate key, ERRCODE_NOMEM.
 *
 * Times are UTC MJDs in the records; the store keeps each as canonical
 * ISO 8601 text ("2027-03-01T04:00:00.000Z", STORE_TIME_NDP decimals,
 * six for normal-point epochs) plus the MJD of that text, so that what
 * is read back (and exported) is exactly what a re-import stores.
 *
 * A struct store is not thread-safe; open one per thread.  Several
 * processes may share one file (WAL, busy timeout STORE_BUSY_MS).
 */

#define STORE_SCHEMA_VERSION 8	/* PRAGMA user_version of a current file */
#define STORE_BUSY_MS 10000	/* wait this long for a lock, then fail */
#define STORE_TIME_NDP 3	/* decimals of seconds of stored times */
#define STORE_NP_TIME_NDP 6	/* ... of normal-point epochs */

struct store;			/* opaque */

/* --- opening and closing --- */

#define STORE_OPEN_CREATE 0x1	/* create the file if missing */
#define STORE_OPEN_READONLY 0x2	/* no writes (no migration either) */
#define STORE_OPEN_NO_MIGRATE 0x4 /* leave the schema as it is (tests,
				   store_migrate) */

/*
 * Open (and, unless read-only, migrate to STORE_SCHEMA_VERSION) a
 * database.  path may be ":memory:".  Without STORE_OPEN_CREATE a
 * missing file is ERRCODE_NOT_FOUND.  A file with a newer schema than
 * this program knows is refused (ERRCODE_DB).  On success *out owns the
 * connection; free with store_close.
 */
enum errcode store_open(const char *path, int flags, struct store **out,
    char *errbuf, size_t errlen);

/* Close the connection; NULL is accepted. */
void store_close(struct store *s);

/* The schema version of the open file (PRAGMA user_version). */
int store_schema_version(struct store *s);

/*
 * PRAGMA data_version of this connection: a number that changes when
 * another connection (of this process or another) has committed a
 * change to the file since the last call, and stays the same otherwise
 * (this connection's own commits do not change it).  -1 on failure.
 */
int store_data_version(struct store *s);

/*
 * Bring the schema to version (1..STORE_SCHEMA_VERSION), in one
 * transaction, by running sql/migrations/NNNN_*.sql in order (an empty
 * file runs them all: the migrations are the one source of the schema).
 * Going down is refused.  store_open does this unless told not to.
 */
enum errcode store_migrate(struct store *s, int version, char *errbuf,
    size_t errlen);

/*
 * The schema as text, one object per line ("type name: SQL" with comments
 * removed and white space collapsed), sorted by name, into a caller-owned
 * mbuf: two files with the same dump have the same schema.
 */
struct mbuf;
enum errcode store_schema_dump(struct store *s, struct mbuf *out);

/* PRAGMA integrity_check: ERRCODE_OK when it answers "ok". */
enum errcode store_integrity_check(struct store *s, char *errbuf,
    size_t errlen);

/* --- transactions (for all-or-nothing imports) --- */

/*
 * store_begin takes the write lock at once (BEGIN IMMEDIATE), waiting up
 * to the busy timeout; store_commit makes the work durable;
 * store_rollback undoes it (safe to call when no transaction is open).
 * Transactions do not nest.  Without store_begin every write is its own
 * transaction.
 */
enum errcode store_begin(struct store *s, char *errbuf, size_t errlen);
enum errcode store_commit(struct store *s, char *errbuf, size_t errlen);
void store_rollback(struct store *s);

/* --- station (one row) --- */

/* ERRCODE_NOT_FOUND when the database holds no station yet. */
enum errcode store_station_get(struct store *s, struct site_station *out,
    char *errbuf, size_t errlen);
/* Insert or replace the station row. */
enum errcode store_station_put(struct store *s, const struct site_station *st,
    char *errbuf, size_t errlen);

/* --- targets --- */

/* ERRCODE_EXISTS if the id (or the non-empty alias) is taken. */
enum errcode store_target_add(struct store *s, const struct site_target *t,
    char *errbuf, size_t errlen);
/* Replace every field of target t->id; ERRCODE_NOT_FOUND if none. */
enum errcode store_target_update(struct store *s, const struct site_target *t,
    char *errbuf, size_t errlen);
enum errcode store_target_get(struct store *s, const char *id,
    struct site_target *out, char *errbuf, size_t errlen);
/*
 * The target a CRD file means by name: the one whose alias is name, else
 * the one whose id is name.  ERRCODE_NOT_FOUND otherwise.
 */
enum errcode store_target_by_alias(struct store *s, const char *name,
    struct site_target *out, char *errbuf, size_t errlen);
/*
 * All targets (active_only: active ones), ordered by id, into a new
 * array *out of *n records (NULL when n is 0); free with mem_free.
 */
enum errcode store_targets_list(struct store *s, int active_only,
    struct site_target **out, size_t *n, char *errbuf, size_t errlen);

/* --- blackouts --- */

/* Insert; sets b->id. */
enum errcode store_blackout_add(struct store *s, struct site_blackout *b,
    char *errbuf, size_t errlen);
/* ERRCODE_NOT_FOUND if no blackout has this id. */
enum errcode store_blackout_remove(struct store *s, long id, char *errbuf,
    size_t errlen);
/*
 * Blackouts overlapping [from_mjd, to_mjd] (either bound may be NaN:
 * open), by start; free *out with mem_free.
 */
enum errcode store_blackouts_list(struct store *s, double from_mjd,
    double to_mjd, struct site_blackout **out, size_t *n, char *errbuf,
    size_t errlen);

/* --- the observation log --- */

/*
 * Filters of a list query.  NaN bounds and NULL/"" strings are open;
 * since is inclusive, until exclusive (attempts by start, normal points
 * by epoch).  limit 0 means no limit; newest_first orders by time
 * descending (default ascending, then by id).
 */
struct store_query {
	double since_mjd, until_mjd;
	const char *target;		/* target id */
	const char *station_code;	/* normal points only */
	size_t limit;
	int newest_first;
};

/* An open query (everything, oldest first). */
void store_query_init(struct store_query *q);

/*
 * Insert an attempt whose derived angles are already filled (derive.h).
 * The times are canonicalised (see above) and *a is updated to the row
 * as stored, with its id.  ERRCODE_EXISTS if the target already has an
 * attempt with this start; ERRCODE_NOT_FOUND for an unknown target;
 * ERRCODE_BAD_ARG naming the field for an attempt that breaks a rule of
 * attempt_check (core/attempt.h, with the stored station's fire rate).
 * a->suspect is set (attempt_suspect) and stored.
 */
enum errcode store_attempt_add(struct store *s, struct site_attempt *a,
    char *errbuf, size_t errlen);
/*
 * Log one attempt as the HTTP API and `log add` do: derive its angles
 * (derive.h) from the stored station, its target and the EOP table at
 * the mid-time, then store_attempt_add.  ERRCODE_NOT_FOUND for an unknown
 * target or a database without station; other codes as store_attempt_add.
 */
enum errcode store_attempt_log(struct store *s, struct site_attempt *a,
    char *errbuf, size_t errlen);
enum errcode store_attempt_get(struct store *s, long id,
    struct site_attempt *out, char *errbuf, size_t errlen);
/*
 * Each matching attempt (normal point), in the order of the list, handed
 * to fn, which may not keep the record; the first error fn returns stops
 * the walk and is returned.  Memory O(1) whatever the log's length.
 */
typedef enum errcode (*store_attempt_fn)(void *ctx,
    const struct site_attempt *a);
enum errcode store_attempts_each(struct store *s, const struct store_query *q,
    store_attempt_fn fn, void *ctx, char *errbuf, size_t errlen);
typedef enum errcode (*store_np_fn)(void *ctx,
    const struct site_normal_point *p);
enum errcode store_nps_each(struct store *s, const struct store_query *q,
    store_np_fn fn, void *ctx, char *errbuf, size_t errlen);
/* Matching attempts into a new array; free *out with mem_free. */
enum errcode store_attempts_list(struct store *s, const struct store_query *q,
    struct site_attempt **out, size_t *n, char *errbuf, size_t errlen);
/* Number of matching attempts (limit ignored). */
enum errcode store_attempts_count(struct store *s,
    const struct store_query *q, size_t *n, char *errbuf, size_t errlen);

/* --- normal points --- */

/*
 * Insert a normal point (target already mapped, derived angles filled).
 * A point with the same station code, target and epoch is left as it is
 * and *inserted set to 0 (re-import is idempotent); else *inserted = 1
 * and np->id is set.  inserted may be NULL.
 */
enum errcode store_np_add(struct store *s, struct site_normal_point *np,
    int *inserted, char *errbuf, size_t errlen);
enum errcode store_nps_list(struct store *s, const struct store_query *q,
    struct site_normal_point **out, size_t *n, char *errbuf, size_t errlen);
enum errcode store_nps_count(struct store *s, const struct store_query *q,
    size_t *n, char *errbuf, size_t errlen);

/* --- Earth orientation --- */

/* Insert or replace the row of day r->mjd (an integral UTC MJD). */
enum errcode store_eop_put(struct store *s, const struct site_eop_row *r,
    char *errbuf, size_t errlen);
/* Every row, sorted by MJD, into a new array (eop.h's table); free with
   mem_free.  *n = 0 and *out = NULL for an empty table. */
enum errcode store_eop_load(struct store *s, struct site_eop_row **out,
    size_t *n, char *errbuf, size_t errlen);
/*
 * Earth orientation at a UTC MJD, interpolated (eop_lookup) from the
 * stored rows around it; *source says whether the table covered it (else
 * out is zero).  source may be NULL.
 */
enum errcode store_eop_at(struct store *s, double utc_mjd,
    struct geom_eop *out, enum eop_source *source, char *errbuf,
    size_t errlen);
/* First and last MJD of the table; ERRCODE_NOT_FOUND when it is empty.
   Either pointer may be NULL. */
enum errcode store_eop_span(struct store *s, double *first_mjd,
    double *last_mjd, char *errbuf, size_t errlen);

/* --- settings --- */

/*
 * Station-wide settings of the planner and the audit.  Stored as
 * key/value text; the table of known keys (name, range, default, help)
 * lives in store.c and is listed by store_setting_info.
 */
struct store_settings {
	int coverage_bins;		/* synodic-angle bins, 4..72 (12) */
	double coverage_alpha;		/* weight exponent, 0..4 (1); 0 = off */
	double coverage_k;		/* weight smoothing count, > 0 (1) */
	int coverage_per_target;	/* 1 per target, 0 pooled (0) */
	int plan_days;			/* days the daemon plans ahead (3) */
	/* the night plan (core/night.h, core/value.h) */
	int value_bins;			/* value_model: 1 bins, 0 design (0) */
	int value_harmonics;		/* K, 1..4 (2) */
	double value_phase_weight;	/* 0..100 (1) */
	double value_orientation_weight; /* 0..100 (1) */
	int plan_run_min_s;		/* 60..14400 (600) */
	int plan_run_max_s;		/* 60..14400 (1800) */
	int plan_switch_s;		/* 0..3600 (120) */
	int plan_calibration_s;		/* 60..3600 (300) */
	int plan_calibration_every_s;	/* 0..86400 (0: none) */
};

/* Every setting, defaults for keys never set. */
enum errcode store_settings_get(struct store *s, struct store_settings *out,
    char *errbuf, size_t errlen);

/*
 * Set one setting by name from text ("coverage_bins", "24"); unknown
 * keys and out-of-range values are ERRCODE_BAD_ARG naming the key.
 */
enum errcode store_setting_set(struct store *s, const char *key,
    const char *value, char *errbuf, size_t errlen);

/* Current value of one setting as text (default if never set); buf >= 32. */
enum errcode store_setting_get(struct store *s, const char *key, char *buf,
    size_t len, char *errbuf, size_t errlen);

/* --- the log's statistics (core/logstats.h; DEVELOPERS.md "Log
   statistics") --- */

struct logstats;

/*
 * The statistics of the log taken under station st and nbins bins: the
 * stored ones when current, else computed from the records (*stale = 1;
 * the same sums, in O(records)).  Free out with logstats_free.
 * Returned (function value): ERRCODE_OK, ERRCODE_DB, ERRCODE_NOMEM,
 * ERRCODE_BAD_ARG (tau or nbins out of range).
 */
enum errcode store_logstats_get(struct store *s, const struct site_station *st,
    int nbins, struct logstats *out, int *stale, char *errbuf,
    size_t errlen);

/*
 * Rebuild the stored statistics when they are stale (the log written
 * without them, another zenith tau, seeing or coverage_bins, another
 * rule, a file just migrated), in the open transaction or one of its
 * own; *rebuilt (may be NULL) says whether.  Writers' store_open, station
 * and coverage_bins changes and every commit call it.
 */
enum errcode store_logstats_sync(struct store *s, int *rebuilt, char *errbuf,
    size_t errlen);

/* The log's change generation: bumped by every write of an attempt or a
   normal point (whoever writes), never lowered. */
enum errcode store_log_generation(struct store *s, long long *gen,
    char *errbuf, size_t errlen);

struct store_setting_info {
	const char *key;
	const char *def;		/* default, as text */
	const char *help;		/* one line with the range */
};

/* The i-th known setting, or NULL past the end. */
const struct store_setting_info *store_setting_info(size_t i);

/* --- helpers --- */

/*
 * Canonical stored text of a UTC MJD with ndp decimals ("...Z") and the
 * MJD of that text; buf >= 32.  ERRCODE_BAD_TIME if out of range.
 */
enum errcode store_time_canon(double mjd, int ndp, char *buf, size_t len,
    double *canon_mjd);

#endif
