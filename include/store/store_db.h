/* SPDX-License-Identifier: BSD-3-Clause */
/* store_db.h: what the files of store/ share (the connection, its prepared
   statements and the helpers around them); internal to store/, other
   layers use store/store.h. */
#ifndef MOONRANGE_STORE_DB_H
#define MOONRANGE_STORE_DB_H

#include <stddef.h>

#include <sqlite3.h>

#include "core/errcode.h"
#include "core/mem.h"	/* MEM_PRINTFLIKE */
#include "store/store.h"

/* The prepared statements, one per query (SQL text in store.c). */
enum store_stmt_id {
	ST_STATION_GET,
	ST_STATION_PUT,
	ST_TARGET_ADD,
	ST_TARGET_UPDATE,
	ST_TARGET_GET,
	ST_TARGET_ALIAS,
	ST_TARGETS_LIST,
	ST_BLACKOUT_ADD,
	ST_BLACKOUT_REMOVE,
	ST_BLACKOUTS_LIST,
	ST_ATTEMPT_ADD,
	ST_ATTEMPT_GET,
	ST_ATTEMPTS_LIST,
	ST_ATTEMPTS_COUNT,
	ST_NP_ADD,
	ST_NPS_LIST,
	ST_NPS_COUNT,
	ST_EOP_PUT,
	ST_EOP_LOAD,
	ST_EOP_SPAN,
	ST_EOP_AROUND,
	ST_SETTING_GET,
	ST_SETTING_SET,
	ST_DATA_VERSION,
	ST__COUNT
};

/* An open database: owned by the caller of store_open, freed by
   store_close. */
struct store {
	sqlite3 *db;
	int in_tx;			/* store_begin was called */
	sqlite3_stmt *stmt[ST__COUNT];	/* prepared on first use */
	/* The log's statistics with the records of the open transaction
	   (store_stats.c): pend_state 0 none noted yet, 1 pend holds them,
	   -1 the stored ones were not current (the commit rebuilds). */
	struct logstats *pend;
	int pend_state;
	long long pend_gen0;		/* log_gen before the first */
	long long pend_n;		/* records noted */
	/* The station's fire rate, read once per transaction for the rules
	   of its attempts (store_station_put forgets it). */
	int tx_rate_known;
	double tx_rate;
};

/* Page cache of a connection inside a transaction, KiB: an import of
   200,000 attempts spills pages to the WAL again and again with
   SQLite's default 2 MiB (twice the system time); back to the default at
   its end. */
#define STORE_TX_CACHE_KIB 32768

/*
 * The log's statistics and the writes of a transaction (store_stats.c):
 * note each record written (after its insert), flush before COMMIT (the
 * records' sums written once, then a rebuild if the statistics are still
 * stale: *rebuilt, may be NULL), discard on ROLLBACK.
 */
struct site_attempt;
struct site_normal_point;
void store_stats_note_attempt(struct store *s, const struct site_attempt *a);
void store_stats_note_np(struct store *s, const struct site_normal_point *p);
enum errcode store_stats_flush(struct store *s, int *rebuilt, char *errbuf,
    size_t errlen);
void store_stats_discard(struct store *s);

/* Fill one element from the current row. */
typedef void (*store_row_fn)(sqlite3_stmt *st, void *dst);

/*
 * Turn a failed step into a code and a sentence.  what names the table
 * (and row) for the message.  Constraint messages of SQLite end with the
 * constraint name, which the schema makes the column name.
 */
enum errcode store_db_error(struct store *s, int rc, const char *what,
    char *errbuf, size_t errlen);

/* The prepared statement id, prepared on first use. */
enum errcode store_stmt_get(struct store *s, enum store_stmt_id id,
    sqlite3_stmt **out, char *errbuf, size_t errlen);

/* Reset a statement after use (clears bindings too). */
void store_stmt_done(sqlite3_stmt *st);

/* Bind text (not copied: it must outlive the step). */
void store_bind_text(sqlite3_stmt *st, int i, const char *v);

/* A number, or NULL for NaN. */
void store_bind_real_or_null(sqlite3_stmt *st, int i, double v);

/* Text, or NULL for an empty or NULL string. */
void store_bind_text_or_null(sqlite3_stmt *st, int i, const char *v);

/* Column i as text into buf ("" for NULL). */
void store_col_text(sqlite3_stmt *st, int i, char *buf, size_t len);

/* Column i as a number, NaN for NULL. */
double store_col_real_or_nan(sqlite3_stmt *st, int i);

/* Run a statement that returns no rows. */
enum errcode store_step_done(struct store *s, sqlite3_stmt *st,
    const char *what, char *errbuf, size_t errlen);

/*
 * Read every row of a bound statement into a new array of elements of
 * size esz, each filled by fn.  The statement is reset afterwards.
 */
enum errcode store_collect(struct store *s, sqlite3_stmt *st, size_t esz,
    store_row_fn fn, void **out, size_t *n, const char *what, char *errbuf,
    size_t errlen);

/* Fetch at most one row; ERRCODE_NOT_FOUND when there is none. */
enum errcode store_fetch_one(struct store *s, sqlite3_stmt *st,
    store_row_fn fn, void *dst, const char *what, char *errbuf, size_t errlen);

/* Canonical text and MJD of a record's time, or a BAD_TIME sentence. */
enum errcode store_canon(double *mjd, int ndp, char *buf, size_t len,
    const char *what, const char *field, char *errbuf, size_t errlen);

#endif
