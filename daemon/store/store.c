/* SPDX-License-Identifier: BSD-3-Clause */
/* store.c: the station database on SQLite (the only file that speaks SQL). */
#include <math.h>
#include <pthread.h>
#include <stdarg.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include <sqlite3.h>

#include "core/derive.h"
#include "core/mem.h"
#include "store/store.h"
#include "store/store_sql.h"
#include "core/tscale.h"

#define MJD_BASE 2400000.5

/* --- SQLite's allocations go through mem.h (so tests can fail them) --- */

/*
 * SQLite asks for the size of an allocation back (xSize), so each block
 * carries its size in a header as large as the strictest alignment.
 */
#define HDR 16

static void *
sq_malloc(int n)
{
	unsigned char *p;

	if (n <= 0)
		return NULL;
	if ((p = mem_alloc((size_t)n + HDR)) == NULL)
		return NULL;
	memcpy(p, &n, sizeof n);
	return p + HDR;
}

static void
sq_free(void *p)
{
	if (p != NULL)
		mem_free((unsigned char *)p - HDR);
}

static void *
sq_realloc(void *p, int n)
{
	unsigned char *q;

	if (p == NULL)
		return sq_malloc(n);
	if (n <= 0) {
		sq_free(p);
		return NULL;
	}
	if ((q = mem_realloc((unsigned char *)p - HDR, (size_t)n + HDR)) == NULL)
		return NULL;
	memcpy(q, &n, sizeof n);
	return q + HDR;
}

static int
sq_size(void *p)
{
	int n;

	if (p == NULL)
		return 0;
	memcpy(&n, (unsigned char *)p - HDR, sizeof n);
	return n;
}

static int
sq_roundup(int n)
{
	return (n + 7) & ~7;
}

static int
sq_init(void *ctx)
{
	(void)ctx;
	return SQLITE_OK;
}

static void
sq_shutdown(void *ctx)
{
	(void)ctx;
}

static pthread_once_t sqlite_once = PTHREAD_ONCE_INIT;

static void
sqlite_setup(void)
{
	static const sqlite3_mem_methods methods = {
		sq_malloc, sq_free, sq_realloc, sq_size, sq_roundup, sq_init,
		sq_shutdown, NULL
	};

	/* Before any other use of SQLite in the process (store.c is the
	   only user), so the call cannot fail with SQLITE_MISUSE. */
	(void)sqlite3_config(SQLITE_CONFIG_MALLOC, &methods);
}

/* --- statements ----------------------------------------------------------- */

#define STATION_COLS "name, code, lat_deg, lon_deg, height_m, time_zone, " \
	"min_el_deg, max_sun_el_deg, min_sun_sep_deg, pressure_hpa, " \
	"temperature_c, humidity, wavelength_nm, zenith_tau, fire_rate_hz"
#define TARGET_COLS "id, name, alias, lat_deg, lon_deg, height_m, " \
	"strength, dark_only, active"
#define ATTEMPT_COLS "id, target_id, start_mjd, end_mjd, shots, returns, " \
	"normal_points, outcome, operator, seeing_arcsec, notes, " \
	"synodic_deg, mean_elong_deg, target_el_deg, sun_el_target_deg"
#define NP_COLS "id, target_id, station_code, epoch_mjd, tof_s, photons, " \
	"rms_ps, synodic_deg, mean_elong_deg, target_el_deg, " \
	"sun_el_target_deg"
/* Filters ?1 since, ?2 until, ?3 target, ?4 newest first, ?5 limit. */
#define ATTEMPT_WHERE " WHERE (?1 IS NULL OR start_mjd >= ?1)" \
	" AND (?2 IS NULL OR start_mjd < ?2) AND (?3 IS NULL OR target_id = ?3)"
#define ORDER_BY(col) " ORDER BY CASE WHEN ?4 THEN -" col " ELSE " col \
	" END, CASE WHEN ?4 THEN -id ELSE id END LIMIT ?5"
/* ... and ?6 station code for normal points. */
#define NP_WHERE " WHERE (?1 IS NULL OR epoch_mjd >= ?1)" \
	" AND (?2 IS NULL OR epoch_mjd < ?2) AND (?3 IS NULL OR target_id = ?3)" \
	" AND (?6 IS NULL OR station_code = ?6)"

enum stmt_id {
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
	ST__COUNT
};

static const char *const stmt_sql[ST__COUNT] = {
	[ST_STATION_GET] = "SELECT " STATION_COLS " FROM station WHERE id = 1",
	[ST_STATION_PUT] = "INSERT INTO station (id, " STATION_COLS ") VALUES "
	    "(1, ?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, "
	    "?15) ON CONFLICT (id) DO UPDATE SET name = excluded.name, "
	    "code = excluded.code, lat_deg = excluded.lat_deg, "
	    "lon_deg = excluded.lon_deg, height_m = excluded.height_m, "
	    "time_zone = excluded.time_zone, min_el_deg = excluded.min_el_deg, "
	    "max_sun_el_deg = excluded.max_sun_el_deg, "
	    "min_sun_sep_deg = excluded.min_sun_sep_deg, "
	    "pressure_hpa = excluded.pressure_hpa, "
	    "temperature_c = excluded.temperature_c, "
	    "humidity = excluded.humidity, "
	    "wavelength_nm = excluded.wavelength_nm, "
	    "zenith_tau = excluded.zenith_tau, "
	    "fire_rate_hz = excluded.fire_rate_hz",
	[ST_TARGET_ADD] = "INSERT INTO targets (" TARGET_COLS ") VALUES "
	    "(?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9)",
	[ST_TARGET_UPDATE] = "UPDATE targets SET name = ?2, alias = ?3, "
	    "lat_deg = ?4, lon_deg = ?5, height_m = ?6, strength = ?7, "
	    "dark_only = ?8, active = ?9 WHERE id = ?1",
	[ST_TARGET_GET] = "SELECT " TARGET_COLS " FROM targets WHERE id = ?1",
	[ST_TARGET_ALIAS] = "SELECT " TARGET_COLS " FROM targets "
	    "WHERE alias = ?1 OR id = ?1 ORDER BY alias = ?1 DESC LIMIT 1",
	[ST_TARGETS_LIST] = "SELECT " TARGET_COLS " FROM targets "
	    "WHERE ?1 = 0 OR active = 1 ORDER BY id",
	[ST_BLACKOUT_ADD] = "INSERT INTO blackouts (start_utc, start_mjd, "
	    "end_utc, end_mjd, reason) VALUES (?1, ?2, ?3, ?4, ?5)",
	[ST_BLACKOUT_REMOVE] = "DELETE FROM blackouts WHERE id = ?1",
	[ST_BLACKOUTS_LIST] = "SELECT id, start_mjd, end_mjd, reason "
	    "FROM blackouts WHERE (?1 IS NULL OR end_mjd >= ?1) AND "
	    "(?2 IS NULL OR start_mjd <= ?2) ORDER BY start_mjd, id",
	[ST_ATTEMPT_ADD] = "INSERT INTO attempts (target_id, start_utc, "
	    "start_mjd, end_utc, end_mjd, shots, returns, normal_points, "
	    "outcome, operator, seeing_arcsec, notes, synodic_deg, "
	    "mean_elong_deg, target_el_deg, sun_el_target_deg) VALUES (?1, "
	    "?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16)",
	[ST_ATTEMPT_GET] = "SELECT " ATTEMPT_COLS " FROM attempts WHERE id = ?1",
	[ST_ATTEMPTS_LIST] = "SELECT " ATTEMPT_COLS " FROM attempts"
	    ATTEMPT_WHERE ORDER_BY("start_mjd"),
	[ST_ATTEMPTS_COUNT] = "SELECT count(*) FROM attempts" ATTEMPT_WHERE,
	[ST_NP_ADD] = "INSERT INTO normal_points (target_id, station_code, "
	    "epoch_utc, epoch_mjd, tof_s, photons, rms_ps, synodic_deg, "
	    "mean_elong_deg, target_el_deg, sun_el_target_deg) VALUES (?1, ?2, "
	    "?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11) ON CONFLICT (station_code, "
	    "target_id, epoch_utc) DO NOTHING",
	[ST_NPS_LIST] = "SELECT " NP_COLS " FROM normal_points" NP_WHERE
	    ORDER_BY("epoch_mjd"),
	[ST_NPS_COUNT] = "SELECT count(*) FROM normal_points" NP_WHERE,
	[ST_EOP_PUT] = "INSERT INTO eop (mjd, date_utc, dut1_s, xp_arcsec, "
	    "yp_arcsec) VALUES (?1, date(?1 + 2400000.5), ?2, ?3, ?4) "
	    "ON CONFLICT (mjd) DO UPDATE SET dut1_s = excluded.dut1_s, "
	    "xp_arcsec = excluded.xp_arcsec, yp_arcsec = excluded.yp_arcsec",
	[ST_EOP_LOAD] = "SELECT mjd, dut1_s, xp_arcsec, yp_arcsec FROM eop "
	    "ORDER BY mjd",
	[ST_EOP_SPAN] = "SELECT min(mjd), max(mjd), count(*) FROM eop",
	/* Rows near an instant: eop_lookup needs the two around it, and
	   rows more than 10 days apart cover nothing (eop.c). */
	[ST_EOP_AROUND] = "SELECT mjd, dut1_s, xp_arcsec, yp_arcsec FROM eop "
	    "WHERE mjd BETWEEN ?1 - 11 AND ?1 + 11 ORDER BY mjd",
	[ST_SETTING_GET] = "SELECT value FROM settings WHERE key = ?1",
	[ST_SETTING_SET] = "INSERT INTO settings (key, value) VALUES (?1, ?2) "
	    "ON CONFLICT (key) DO UPDATE SET value = excluded.value",
};

struct store {
	sqlite3 *db;
	int in_tx;			/* store_begin was called */
	sqlite3_stmt *stmt[ST__COUNT];	/* prepared on first use */
};

/* --- errors --------------------------------------------------------------- */

static void MEM_PRINTFLIKE(3, 4)
seterr(char *errbuf, size_t errlen, const char *fmt, ...)
{
	va_list ap;

	if (errbuf == NULL || errlen == 0)
		return;
	va_start(ap, fmt);
	vsnprintf(errbuf, errlen, fmt, ap);
	va_end(ap);
}

/*
 * Turn a failed step into a code and a sentence.  what names the table
 * (and row) for the message.  Constraint messages of SQLite end with the
 * constraint name, which the schema makes the column name.
 */
static enum errcode
db_error(struct store *s, int rc, const char *what, char *errbuf,
    size_t errlen)
{
	const char *msg = sqlite3_errmsg(s->db);
	const char *col = strrchr(msg, ':');
	const char *dot;

	col = col != NULL ? col + 1 : msg;
	while (*col == ' ')
		col++;
	if ((dot = strchr(col, '.')) != NULL && strchr(col, ',') == NULL)
		col = dot + 1;
	switch (rc) {
	case SQLITE_CONSTRAINT_CHECK:
		seterr(errbuf, errlen, "%s: field '%s': value refused by the "
		    "database (out of range or malformed)", what, col);
		return ERRCODE_BAD_ARG;
	case SQLITE_CONSTRAINT_NOTNULL:
		seterr(errbuf, errlen, "%s: field '%s': a value is required",
		    what, col);
		return ERRCODE_BAD_ARG;
	case SQLITE_CONSTRAINT_UNIQUE:
	case SQLITE_CONSTRAINT_PRIMARYKEY:
		seterr(errbuf, errlen, "%s: already stored (%s)", what, msg);
		return ERRCODE_EXISTS;
	case SQLITE_CONSTRAINT_FOREIGNKEY:
		seterr(errbuf, errlen, "%s: field 'target': no such target",
		    what);
		return ERRCODE_NOT_FOUND;
	case SQLITE_CONSTRAINT_DATATYPE:
		seterr(errbuf, errlen, "%s: a value has the wrong type (%s)",
		    what, msg);
		return ERRCODE_BAD_ARG;
	case SQLITE_NOMEM:
		seterr(errbuf, errlen, "%s: out of memory", what);
		return ERRCODE_NOMEM;
	case SQLITE_BUSY:
	case SQLITE_LOCKED:
		seterr(errbuf, errlen, "%s: the database stayed locked by "
		    "another process for over %d s", what, STORE_BUSY_MS / 1000);
		return ERRCODE_DB;
	default:
		seterr(errbuf, errlen, "%s: database error: %s", what, msg);
		return (rc & 0xff) == SQLITE_NOMEM ? ERRCODE_NOMEM : ERRCODE_DB;
	}
}

/* --- statement helpers ---------------------------------------------------- */

static enum errcode
stmt_get(struct store *s, enum stmt_id id, sqlite3_stmt **out, char *errbuf,
    size_t errlen)
{
	int rc;

	if (s->stmt[id] == NULL) {
		rc = sqlite3_prepare_v3(s->db, stmt_sql[id], -1,
		    SQLITE_PREPARE_PERSISTENT, &s->stmt[id], NULL);
		if (rc != SQLITE_OK) {
			s->stmt[id] = NULL;
			return db_error(s, rc, "preparing a query", errbuf,
			    errlen);
		}
	}
	*out = s->stmt[id];
	return ERRCODE_OK;
}

/* Reset a statement after use (clears bindings too). */
static void
stmt_done(sqlite3_stmt *st)
{
	sqlite3_reset(st);
	sqlite3_clear_bindings(st);
}

static void
bind_text(sqlite3_stmt *st, int i, const char *v)
{
	sqlite3_bind_text(st, i, v, -1, SQLITE_STATIC);
}

/* NULL for NaN and for an empty or NULL string. */
static void
bind_real_or_null(sqlite3_stmt *st, int i, double v)
{
	if (isnan(v))
		sqlite3_bind_null(st, i);
	else
		sqlite3_bind_double(st, i, v);
}

static void
bind_text_or_null(sqlite3_stmt *st, int i, const char *v)
{
	if (v == NULL || *v == '\0')
		sqlite3_bind_null(st, i);
	else
		bind_text(st, i, v);
}

static void
col_text(sqlite3_stmt *st, int i, char *buf, size_t len)
{
	const unsigned char *t = sqlite3_column_text(st, i);

	snprintf(buf, len, "%s", t != NULL ? (const char *)t : "");
}

static double
col_real_or_nan(sqlite3_stmt *st, int i)
{
	if (sqlite3_column_type(st, i) == SQLITE_NULL)
		return NAN;
	return sqlite3_column_double(st, i);
}

/* Run a statement that returns no rows. */
static enum errcode
step_done(struct store *s, sqlite3_stmt *st, const char *what, char *errbuf,
    size_t errlen)
{
	int rc = sqlite3_step(st);
	enum errcode e = ERRCODE_OK;

	if (rc != SQLITE_DONE && rc != SQLITE_ROW)
		e = db_error(s, sqlite3_extended_errcode(s->db), what, errbuf,
		    errlen);
	stmt_done(st);
	return e;
}

/* Run SQL text without parameters (schema, pragmas, transactions). */
static enum errcode
exec_sql(struct store *s, const char *sql, const char *what, char *errbuf,
    size_t errlen)
{
	char *msg = NULL;
	int rc = sqlite3_exec(s->db, sql, NULL, NULL, &msg);
	enum errcode e = ERRCODE_OK;

	if (rc != SQLITE_OK) {
		seterr(errbuf, errlen, "%s: %s", what,
		    msg != NULL ? msg : sqlite3_errstr(rc));
		e = (rc & 0xff) == SQLITE_NOMEM ? ERRCODE_NOMEM : ERRCODE_DB;
	}
	sqlite3_free(msg);
	return e;
}

static int
pragma_int(struct store *s, const char *sql, int *out)
{
	sqlite3_stmt *st = NULL;
	int rc = sqlite3_prepare_v2(s->db, sql, -1, &st, NULL);

	if (rc == SQLITE_OK && (rc = sqlite3_step(st)) == SQLITE_ROW) {
		*out = sqlite3_column_int(st, 0);
		rc = SQLITE_OK;
	}
	sqlite3_finalize(st);
	return rc;
}

/*
 * Read every row of a bound statement into a new array of elements of
 * size esz, each filled by fn.  The statement is reset afterwards.
 */
typedef void (*row_fn)(sqlite3_stmt *st, void *dst);

static enum errcode
collect(struct store *s, sqlite3_stmt *st, size_t esz, row_fn fn,
    void **out, size_t *n, const char *what, char *errbuf, size_t errlen)
{
	unsigned char *arr = NULL, *p;
	size_t cap = 0, cnt = 0;
	enum errcode e = ERRCODE_OK;
	int rc;

	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		if (cnt == cap) {
			size_t ncap = cap ? cap * 2 : 16;

			if (ncap > SIZE_MAX / esz ||
			    (p = mem_realloc(arr, ncap * esz)) == NULL) {
				seterr(errbuf, errlen, "%s: out of memory", what);
				e = ERRCODE_NOMEM;
				goto out;
			}
			arr = p;
			cap = ncap;
		}
		memset(arr + cnt * esz, 0, esz);
		fn(st, arr + cnt * esz);
		cnt++;
	}
	if (rc != SQLITE_DONE)
		e = db_error(s, sqlite3_extended_errcode(s->db), what, errbuf,
		    errlen);
out:
	stmt_done(st);
	if (e != ERRCODE_OK) {
		mem_free(arr);
		arr = NULL;
		cnt = 0;
	}
	*out = arr;
	*n = cnt;
	return e;
}

/* --- times ---------------------------------------------------------------- */

enum errcode
store_time_canon(double mjd, int ndp, char *buf, size_t len,
    double *canon_mjd)
{
	double u1, u2;

	if (!isfinite(mjd) || mjd < 0 || mjd > 300000 ||
	    tscale_format_utc(MJD_BASE, mjd, ndp, buf, len) != ERRCODE_OK ||
	    tscale_parse_utc(buf, &u1, &u2, NULL, 0) != ERRCODE_OK)
		return ERRCODE_BAD_TIME;
	*canon_mjd = (u1 - MJD_BASE) + u2;
	return ERRCODE_OK;
}

/* --- open, close, migrate ------------------------------------------------- */

int
store_schema_version(struct store *s)
{
	int v = -1;

	if (pragma_int(s, "PRAGMA user_version", &v) != SQLITE_OK)
		return -1;
	return v;
}

enum errcode
store_migrate(struct store *s, int version, char *errbuf, size_t errlen)
{
	char sql[64];
	int v, objects = 0;
	enum errcode e;

	if (version < 1 || version > (int)store_sql_nmigrations) {
		seterr(errbuf, errlen, "schema version %d is not one of "
		    "1..%zu", version, store_sql_nmigrations);
		return ERRCODE_BAD_ARG;
	}
	if ((e = exec_sql(s, "BEGIN IMMEDIATE", "locking the database for "
	    "its schema", errbuf, errlen)) != ERRCODE_OK)
		return e;
	if ((v = store_schema_version(s)) < 0 ||
	    pragma_int(s, "SELECT count(*) FROM sqlite_schema", &objects)) {
		seterr(errbuf, errlen, "cannot read the schema version: %s",
		    sqlite3_errmsg(s->db));
		e = ERRCODE_DB;
		goto out;
	}
	if (v > version) {
		seterr(errbuf, errlen, "the database has schema version %d, "
		    "newer than %d (this program knows up to %d)", v, version,
		    STORE_SCHEMA_VERSION);
		e = ERRCODE_DB;
		goto out;
	}
	if (v == 0 && objects > 0) {
		seterr(errbuf, errlen, "the file holds tables but no moonrange "
		    "schema version; it is not a moonrange database");
		e = ERRCODE_DB;
		goto out;
	}
	if (v == 0 && version == (int)store_sql_nmigrations) {
		if ((e = exec_sql(s, store_sql_schema, "creating the schema "
		    "(schema.sql)", errbuf, errlen)) != ERRCODE_OK)
			goto out;
	} else {
		for (int i = v; i < version; i++) {
			const struct store_sql_migration *m =
			    &store_sql_migrations[i];

			if ((e = exec_sql(s, m->sql, m->name, errbuf, errlen)) !=
			    ERRCODE_OK)
				goto out;
		}
	}
	snprintf(sql, sizeof sql, "PRAGMA user_version = %d", version);
	if ((e = exec_sql(s, sql, "setting the schema version", errbuf,
	    errlen)) != ERRCODE_OK)
		goto out;
	e = exec_sql(s, "COMMIT", "committing the schema", errbuf, errlen);
out:
	if (e != ERRCODE_OK)
		(void)sqlite3_exec(s->db, "ROLLBACK", NULL, NULL, NULL);
	return e;
}

enum errcode
store_open(const char *path, int flags, struct store **out, char *errbuf,
    size_t errlen)
{
	struct store *s = NULL;
	int oflags, memory, v, rc;
	enum errcode e = ERRCODE_OK;
	char busy[48];

	*out = NULL;
	if (path == NULL || *path == '\0') {
		seterr(errbuf, errlen, "no database file given");
		return ERRCODE_BAD_ARG;
	}
	pthread_once(&sqlite_once, sqlite_setup);
	/* A no-op once it has succeeded; retried after a failure. */
	if ((rc = sqlite3_initialize()) != SQLITE_OK) {
		seterr(errbuf, errlen, "SQLite failed to start: %s",
		    sqlite3_errstr(rc));
		return (rc & 0xff) == SQLITE_NOMEM ? ERRCODE_NOMEM : ERRCODE_DB;
	}
	memory = strcmp(path, ":memory:") == 0;
	if (!memory && !(flags & STORE_OPEN_CREATE) && access(path, F_OK) != 0) {
		seterr(errbuf, errlen, "database '%s' does not exist (create it "
		    "with 'moonrange init --db %s')", path, path);
		return ERRCODE_NOT_FOUND;
	}
	if ((s = mem_calloc(1, sizeof *s)) == NULL) {
		seterr(errbuf, errlen, "opening '%s': out of memory", path);
		return ERRCODE_NOMEM;
	}
	oflags = (flags & STORE_OPEN_READONLY) ? SQLITE_OPEN_READONLY :
	    SQLITE_OPEN_READWRITE | ((flags & STORE_OPEN_CREATE) ?
	    SQLITE_OPEN_CREATE : 0);
	if (sqlite3_open_v2(path, &s->db, oflags | SQLITE_OPEN_NOMUTEX, NULL) !=
	    SQLITE_OK) {
		seterr(errbuf, errlen, "cannot open database '%s': %s", path,
		    s->db != NULL ? sqlite3_errmsg(s->db) : "out of memory");
		e = s->db != NULL ? ERRCODE_DB : ERRCODE_NOMEM;
		goto out;
	}
	sqlite3_extended_result_codes(s->db, 1);
	snprintf(busy, sizeof busy, "PRAGMA busy_timeout = %d", STORE_BUSY_MS);
	if ((e = exec_sql(s, busy, path, errbuf, errlen)) != ERRCODE_OK ||
	    (e = exec_sql(s, "PRAGMA foreign_keys = ON", path, errbuf,
	    errlen)) != ERRCODE_OK)
		goto out;
	/* The first read tells a database from any other file. */
	if ((v = store_schema_version(s)) < 0) {
		/* A WAL database is read through its -shm file, which SQLite
		   must be able to create beside it. */
		if ((sqlite3_extended_errcode(s->db) & 0xff) == SQLITE_READONLY)
			seterr(errbuf, errlen, "cannot read database '%s': "
			    "SQLite needs to create '%s-shm' beside it (is its "
			    "directory read-only?): %s", path, path,
			    sqlite3_errmsg(s->db));
		else
			seterr(errbuf, errlen, "'%s' is not a readable SQLite "
			    "database: %s", path, sqlite3_errmsg(s->db));
		e = ERRCODE_DB;
		goto out;
	}
	if (!(flags & STORE_OPEN_READONLY) && !memory &&
	    (e = exec_sql(s, "PRAGMA journal_mode = WAL", path, errbuf,
	    errlen)) != ERRCODE_OK)
		goto out;
	if (!(flags & (STORE_OPEN_READONLY | STORE_OPEN_NO_MIGRATE)) &&
	    v != STORE_SCHEMA_VERSION) {
		char msg[400];

		if ((e = store_migrate(s, STORE_SCHEMA_VERSION, msg,
		    sizeof msg)) != ERRCODE_OK) {
			seterr(errbuf, errlen, "%s: %s", path, msg);
			goto out;
		}
	}
	if ((flags & STORE_OPEN_READONLY) && v > STORE_SCHEMA_VERSION) {
		seterr(errbuf, errlen, "%s: the database has schema version %d, "
		    "newer than this program knows (up to %d)", path, v,
		    STORE_SCHEMA_VERSION);
		e = ERRCODE_DB;
		goto out;
	}
	if ((flags & STORE_OPEN_READONLY) && v != STORE_SCHEMA_VERSION) {
		seterr(errbuf, errlen, "%s: schema version %d, this program needs "
		    "%d (open it once for writing to migrate it)", path, v,
		    STORE_SCHEMA_VERSION);
		e = ERRCODE_DB;
		goto out;
	}
out:
	if (e != ERRCODE_OK) {
		store_close(s);
		return e;
	}
	*out = s;
	return ERRCODE_OK;
}

void
store_close(struct store *s)
{
	if (s == NULL)
		return;
	for (int i = 0; i < ST__COUNT; i++)
		sqlite3_finalize(s->stmt[i]);
	if (s->in_tx)
		(void)sqlite3_exec(s->db, "ROLLBACK", NULL, NULL, NULL);
	sqlite3_close(s->db);
	mem_free(s);
}

/*
 * Comments removed and white space normalised: runs become one space,
 * none after '(' or before ')' and ','.
 */
static void
dump_normalised(struct mbuf *out, const char *sql)
{
	int pending = 0;
	char last = '(';

	for (const char *p = sql; *p; p++) {
		if (p[0] == '-' && p[1] == '-') {
			while (p[1] != '\0' && p[1] != '\n')
				p++;
			pending = 1;
			continue;
		}
		if (*p == ' ' || *p == '\t' || *p == '\n' || *p == '\r') {
			pending = 1;
			continue;
		}
		if (pending && last != '(' && *p != ')' && *p != ',')
			mbuf_add(out, " ", 1);
		pending = 0;
		mbuf_add(out, p, 1);
		last = *p;
	}
}

enum errcode
store_schema_dump(struct store *s, struct mbuf *out)
{
	sqlite3_stmt *st = NULL;
	int rc;

	rc = sqlite3_prepare_v2(s->db, "SELECT type, name, sql FROM "
	    "sqlite_schema WHERE sql IS NOT NULL ORDER BY name", -1, &st, NULL);
	if (rc != SQLITE_OK)
		return (rc & 0xff) == SQLITE_NOMEM ? ERRCODE_NOMEM : ERRCODE_DB;
	while ((rc = sqlite3_step(st)) == SQLITE_ROW) {
		mbuf_printf(out, "%s %s: ", sqlite3_column_text(st, 0),
		    sqlite3_column_text(st, 1));
		dump_normalised(out, (const char *)sqlite3_column_text(st, 2));
		mbuf_add(out, "\n", 1);
	}
	sqlite3_finalize(st);
	if (rc != SQLITE_DONE)
		return (rc & 0xff) == SQLITE_NOMEM ? ERRCODE_NOMEM : ERRCODE_DB;
	mbuf_printf(out, "user_version %d\n", store_schema_version(s));
	return mbuf_status(out);
}

enum errcode
store_integrity_check(struct store *s, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e = ERRCODE_DB;
	int rc;

	rc = sqlite3_prepare_v2(s->db, "PRAGMA integrity_check", -1, &st, NULL);
	if (rc == SQLITE_OK && sqlite3_step(st) == SQLITE_ROW) {
		const char *r = (const char *)sqlite3_column_text(st, 0);

		if (r != NULL && strcmp(r, "ok") == 0)
			e = ERRCODE_OK;
		else
			seterr(errbuf, errlen, "integrity check: %s",
			    r != NULL ? r : "no answer");
	} else {
		seterr(errbuf, errlen, "integrity check: %s",
		    sqlite3_errmsg(s->db));
	}
	sqlite3_finalize(st);
	return e;
}

/* --- transactions --------------------------------------------------------- */

enum errcode
store_begin(struct store *s, char *errbuf, size_t errlen)
{
	enum errcode e;

	if (s->in_tx) {
		seterr(errbuf, errlen, "a transaction is already open");
		return ERRCODE_DB;
	}
	e = exec_sql(s, "BEGIN IMMEDIATE", "starting a transaction", errbuf,
	    errlen);
	if (e == ERRCODE_OK)
		s->in_tx = 1;
	return e;
}

enum errcode
store_commit(struct store *s, char *errbuf, size_t errlen)
{
	enum errcode e;

	if (!s->in_tx) {
		seterr(errbuf, errlen, "no transaction is open");
		return ERRCODE_DB;
	}
	e = exec_sql(s, "COMMIT", "committing", errbuf, errlen);
	if (e != ERRCODE_OK)
		store_rollback(s);
	s->in_tx = 0;
	return e;
}

void
store_rollback(struct store *s)
{
	if (s == NULL)
		return;
	if (!sqlite3_get_autocommit(s->db))
		(void)sqlite3_exec(s->db, "ROLLBACK", NULL, NULL, NULL);
	s->in_tx = 0;
}

/* --- station -------------------------------------------------------------- */

static void
row_station(sqlite3_stmt *st, void *dst)
{
	struct site_station *o = dst;

	col_text(st, 0, o->name, sizeof o->name);
	col_text(st, 1, o->code, sizeof o->code);
	o->lat_deg = sqlite3_column_double(st, 2);
	o->lon_deg = sqlite3_column_double(st, 3);
	o->height_m = sqlite3_column_double(st, 4);
	col_text(st, 5, o->time_zone, sizeof o->time_zone);
	o->min_el_deg = sqlite3_column_double(st, 6);
	o->max_sun_el_deg = sqlite3_column_double(st, 7);
	o->min_sun_sep_deg = sqlite3_column_double(st, 8);
	o->pressure_hpa = sqlite3_column_double(st, 9);
	o->temperature_c = sqlite3_column_double(st, 10);
	o->humidity = sqlite3_column_double(st, 11);
	o->wavelength_nm = sqlite3_column_double(st, 12);
	o->zenith_tau = sqlite3_column_double(st, 13);
	o->fire_rate_hz = sqlite3_column_double(st, 14);
}

/* Fetch at most one row; ERRCODE_NOT_FOUND when there is none. */
static enum errcode
fetch_one(struct store *s, sqlite3_stmt *st, row_fn fn, void *dst,
    const char *what, char *errbuf, size_t errlen)
{
	int rc = sqlite3_step(st);
	enum errcode e = ERRCODE_OK;

	if (rc == SQLITE_ROW) {
		fn(st, dst);
	} else if (rc == SQLITE_DONE) {
		seterr(errbuf, errlen, "%s: not found", what);
		e = ERRCODE_NOT_FOUND;
	} else {
		e = db_error(s, sqlite3_extended_errcode(s->db), what, errbuf,
		    errlen);
	}
	stmt_done(st);
	return e;
}

enum errcode
store_station_get(struct store *s, struct site_station *out, char *errbuf,
    size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	if ((e = stmt_get(s, ST_STATION_GET, &st, errbuf, errlen)))
		return e;
	memset(out, 0, sizeof *out);
	e = fetch_one(s, st, row_station, out, "station", errbuf, errlen);
	if (e == ERRCODE_NOT_FOUND)
		seterr(errbuf, errlen, "the database holds no station (load "
		    "one with 'moonrange init')");
	return e;
}

enum errcode
store_station_put(struct store *s, const struct site_station *o,
    char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	if ((e = stmt_get(s, ST_STATION_PUT, &st, errbuf, errlen)))
		return e;
	bind_text(st, 1, o->name);
	bind_text(st, 2, o->code);
	sqlite3_bind_double(st, 3, o->lat_deg);
	sqlite3_bind_double(st, 4, o->lon_deg);
	sqlite3_bind_double(st, 5, o->height_m);
	bind_text(st, 6, o->time_zone);
	bind_real_or_null(st, 7, o->min_el_deg);
	bind_real_or_null(st, 8, o->max_sun_el_deg);
	bind_real_or_null(st, 9, o->min_sun_sep_deg);
	bind_real_or_null(st, 10, o->pressure_hpa);
	bind_real_or_null(st, 11, o->temperature_c);
	bind_real_or_null(st, 12, o->humidity);
	bind_real_or_null(st, 13, o->wavelength_nm);
	bind_real_or_null(st, 14, o->zenith_tau);
	bind_real_or_null(st, 15, o->fire_rate_hz);
	return step_done(s, st, "station", errbuf, errlen);
}

/* --- targets -------------------------------------------------------------- */

static void
row_target(sqlite3_stmt *st, void *dst)
{
	struct site_target *o = dst;

	col_text(st, 0, o->id, sizeof o->id);
	col_text(st, 1, o->name, sizeof o->name);
	col_text(st, 2, o->alias, sizeof o->alias);
	o->lat_deg = sqlite3_column_double(st, 3);
	o->lon_deg = sqlite3_column_double(st, 4);
	o->height_m = sqlite3_column_double(st, 5);
	o->strength = sqlite3_column_double(st, 6);
	o->dark_only = sqlite3_column_int(st, 7);
	o->active = sqlite3_column_int(st, 8);
}

static void
bind_target(sqlite3_stmt *st, const struct site_target *t)
{
	bind_text(st, 1, t->id);
	bind_text(st, 2, t->name);
	bind_text(st, 3, t->alias);
	bind_real_or_null(st, 4, t->lat_deg);
	bind_real_or_null(st, 5, t->lon_deg);
	bind_real_or_null(st, 6, t->height_m);
	bind_real_or_null(st, 7, t->strength);
	sqlite3_bind_int(st, 8, t->dark_only);
	sqlite3_bind_int(st, 9, t->active);
}

enum errcode
store_target_add(struct store *s, const struct site_target *t, char *errbuf,
    size_t errlen)
{
	sqlite3_stmt *st = NULL;
	char what[SITE_ID_LEN + 16];
	enum errcode e;

	if ((e = stmt_get(s, ST_TARGET_ADD, &st, errbuf, errlen)))
		return e;
	snprintf(what, sizeof what, "target '%s'", t->id);
	bind_target(st, t);
	return step_done(s, st, what, errbuf, errlen);
}

enum errcode
store_target_update(struct store *s, const struct site_target *t,
    char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	char what[SITE_ID_LEN + 16];
	enum errcode e;

	if ((e = stmt_get(s, ST_TARGET_UPDATE, &st, errbuf, errlen)))
		return e;
	snprintf(what, sizeof what, "target '%s'", t->id);
	bind_target(st, t);
	if ((e = step_done(s, st, what, errbuf, errlen)))
		return e;
	if (sqlite3_changes(s->db) == 0) {
		seterr(errbuf, errlen, "no target '%s'", t->id);
		return ERRCODE_NOT_FOUND;
	}
	return ERRCODE_OK;
}

enum errcode
store_target_get(struct store *s, const char *id, struct site_target *out,
    char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	if ((e = stmt_get(s, ST_TARGET_GET, &st, errbuf, errlen)))
		return e;
	bind_text(st, 1, id);
	memset(out, 0, sizeof *out);
	e = fetch_one(s, st, row_target, out, "target", errbuf, errlen);
	if (e == ERRCODE_NOT_FOUND)
		seterr(errbuf, errlen, "no target '%s'", id);
	return e;
}

enum errcode
store_target_by_alias(struct store *s, const char *name,
    struct site_target *out, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	if ((e = stmt_get(s, ST_TARGET_ALIAS, &st, errbuf, errlen)))
		return e;
	bind_text(st, 1, name);
	memset(out, 0, sizeof *out);
	e = fetch_one(s, st, row_target, out, "target", errbuf, errlen);
	if (e == ERRCODE_NOT_FOUND)
		seterr(errbuf, errlen, "no target has the alias or id '%s'",
		    name);
	return e;
}

enum errcode
store_targets_list(struct store *s, int active_only, struct site_target **out,
    size_t *n, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	*out = NULL;
	*n = 0;
	if ((e = stmt_get(s, ST_TARGETS_LIST, &st, errbuf, errlen)))
		return e;
	sqlite3_bind_int(st, 1, active_only ? 1 : 0);
	return collect(s, st, sizeof **out, row_target, (void **)out, n,
	    "targets", errbuf, errlen);
}

/* --- blackouts ------------------------------------------------------------ */

static void
row_blackout(sqlite3_stmt *st, void *dst)
{
	struct site_blackout *o = dst;

	o->id = (long)sqlite3_column_int64(st, 0);
	o->start_mjd = sqlite3_column_double(st, 1);
	o->end_mjd = sqlite3_column_double(st, 2);
	col_text(st, 3, o->reason, sizeof o->reason);
}

/* Canonical text and MJD of a record's time, or a BAD_TIME sentence. */
static enum errcode
canon(double *mjd, int ndp, char *buf, size_t len, const char *what,
    const char *field, char *errbuf, size_t errlen)
{
	if (store_time_canon(*mjd, ndp, buf, len, mjd) != ERRCODE_OK) {
		seterr(errbuf, errlen, "%s: field '%s': not a valid UTC time",
		    what, field);
		return ERRCODE_BAD_TIME;
	}
	return ERRCODE_OK;
}

enum errcode
store_blackout_add(struct store *s, struct site_blackout *b, char *errbuf,
    size_t errlen)
{
	sqlite3_stmt *st = NULL;
	char t0[40], t1[40];
	enum errcode e;

	if ((e = canon(&b->start_mjd, STORE_TIME_NDP, t0, sizeof t0,
	    "blackout", "start", errbuf, errlen)) ||
	    (e = canon(&b->end_mjd, STORE_TIME_NDP, t1, sizeof t1, "blackout",
	    "end", errbuf, errlen)))
		return e;
	if ((e = stmt_get(s, ST_BLACKOUT_ADD, &st, errbuf, errlen)))
		return e;
	bind_text(st, 1, t0);
	sqlite3_bind_double(st, 2, b->start_mjd);
	bind_text(st, 3, t1);
	sqlite3_bind_double(st, 4, b->end_mjd);
	bind_text(st, 5, b->reason);
	if ((e = step_done(s, st, "blackout", errbuf, errlen)))
		return e;
	b->id = (long)sqlite3_last_insert_rowid(s->db);
	return ERRCODE_OK;
}

enum errcode
store_blackout_remove(struct store *s, long id, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	if ((e = stmt_get(s, ST_BLACKOUT_REMOVE, &st, errbuf, errlen)))
		return e;
	sqlite3_bind_int64(st, 1, id);
	if ((e = step_done(s, st, "blackout", errbuf, errlen)))
		return e;
	if (sqlite3_changes(s->db) == 0) {
		seterr(errbuf, errlen, "no blackout with id %ld", id);
		return ERRCODE_NOT_FOUND;
	}
	return ERRCODE_OK;
}

enum errcode
store_blackouts_list(struct store *s, double from_mjd, double to_mjd,
    struct site_blackout **out, size_t *n, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	*out = NULL;
	*n = 0;
	if ((e = stmt_get(s, ST_BLACKOUTS_LIST, &st, errbuf, errlen)))
		return e;
	bind_real_or_null(st, 1, from_mjd);
	bind_real_or_null(st, 2, to_mjd);
	return collect(s, st, sizeof **out, row_blackout, (void **)out, n,
	    "blackouts", errbuf, errlen);
}

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
	bind_real_or_null(st, 1, q->since_mjd);
	bind_real_or_null(st, 2, q->until_mjd);
	bind_text_or_null(st, 3, q->target);
	sqlite3_bind_int(st, 4, q->newest_first ? 1 : 0);
	sqlite3_bind_int64(st, 5, q->limit > 0 && q->limit < INT64_MAX ?
	    (sqlite3_int64)q->limit : -1);
	if (with_station)
		bind_text_or_null(st, 6, q->station_code);
}

static enum errcode
count_rows(struct store *s, enum stmt_id id, const struct store_query *q,
    int with_station, size_t *n, const char *what, char *errbuf,
    size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;
	int rc;

	*n = 0;
	if ((e = stmt_get(s, id, &st, errbuf, errlen)))
		return e;
	bind_query(st, q, with_station);
	if ((rc = sqlite3_step(st)) == SQLITE_ROW)
		*n = (size_t)sqlite3_column_int64(st, 0);
	else
		e = db_error(s, sqlite3_extended_errcode(s->db), what, errbuf,
		    errlen);
	stmt_done(st);
	return e;
}

/* --- attempts ------------------------------------------------------------- */

static void
row_attempt(sqlite3_stmt *st, void *dst)
{
	struct site_attempt *o = dst;
	char outcome[SITE_OUTCOME_LEN];
	int oc;

	o->id = (long)sqlite3_column_int64(st, 0);
	col_text(st, 1, o->target, sizeof o->target);
	o->start_mjd = sqlite3_column_double(st, 2);
	o->end_mjd = sqlite3_column_double(st, 3);
	o->shots = (long)sqlite3_column_int64(st, 4);
	o->returns = (long)sqlite3_column_int64(st, 5);
	o->normal_points = (long)sqlite3_column_int64(st, 6);
	col_text(st, 7, outcome, sizeof outcome);
	oc = site_outcome_parse(outcome);
	o->outcome = oc >= 0 ? (enum site_outcome)oc : SITE_OUTCOME_OTHER;
	col_text(st, 8, o->operator_name, sizeof o->operator_name);
	o->seeing_arcsec = col_real_or_nan(st, 9);
	col_text(st, 10, o->notes, sizeof o->notes);
	o->synodic_deg = sqlite3_column_double(st, 11);
	o->mean_elong_deg = sqlite3_column_double(st, 12);
	o->target_el_deg = sqlite3_column_double(st, 13);
	o->sun_el_target_deg = sqlite3_column_double(st, 14);
}

enum errcode
store_attempt_add(struct store *s, struct site_attempt *a, char *errbuf,
    size_t errlen)
{
	sqlite3_stmt *st = NULL;
	char t0[40], t1[40], what[SITE_ID_LEN + 80];
	enum errcode e;

	snprintf(what, sizeof what, "attempt on '%s'", a->target);
	if ((e = canon(&a->start_mjd, STORE_TIME_NDP, t0, sizeof t0, what,
	    "start", errbuf, errlen)) ||
	    (e = canon(&a->end_mjd, STORE_TIME_NDP, t1, sizeof t1, what, "end",
	    errbuf, errlen)))
		return e;
	snprintf(what, sizeof what, "attempt on '%s' at %s", a->target, t0);
	if ((e = stmt_get(s, ST_ATTEMPT_ADD, &st, errbuf, errlen)))
		return e;
	bind_text(st, 1, a->target);
	bind_text(st, 2, t0);
	sqlite3_bind_double(st, 3, a->start_mjd);
	bind_text(st, 4, t1);
	sqlite3_bind_double(st, 5, a->end_mjd);
	sqlite3_bind_int64(st, 6, a->shots);
	sqlite3_bind_int64(st, 7, a->returns);
	sqlite3_bind_int64(st, 8, a->normal_points);
	if ((unsigned)a->outcome < SITE_OUTCOME__COUNT)
		bind_text(st, 9, site_outcome_name(a->outcome));
	else
		bind_text(st, 9, "?");
	bind_text(st, 10, a->operator_name);
	bind_real_or_null(st, 11, a->seeing_arcsec);
	bind_text(st, 12, a->notes);
	bind_real_or_null(st, 13, a->synodic_deg);
	bind_real_or_null(st, 14, a->mean_elong_deg);
	bind_real_or_null(st, 15, a->target_el_deg);
	bind_real_or_null(st, 16, a->sun_el_target_deg);
	e = step_done(s, st, what, errbuf, errlen);
	if (e == ERRCODE_EXISTS)
		seterr(errbuf, errlen, "%s: target '%s' already has an attempt "
		    "starting at %s", what, a->target, t0);
	if (e != ERRCODE_OK)
		return e;
	a->id = (long)sqlite3_last_insert_rowid(s->db);
	return ERRCODE_OK;
}

enum errcode
store_attempt_log(struct store *s, struct site_attempt *a, char *errbuf,
    size_t errlen)
{
	struct site_station station;
	struct site_target t;
	struct geom_eop eop;
	enum errcode e;

	if ((e = store_station_get(s, &station, errbuf, errlen)) ||
	    (e = store_target_get(s, a->target, &t, errbuf, errlen)))
		return e;
	if (!(a->end_mjd > a->start_mjd)) {
		seterr(errbuf, errlen, "attempt on '%s': field 'end_utc': not "
		    "after the start", a->target);
		return ERRCODE_BAD_ARG;
	}
	if ((e = store_eop_at(s, 0.5 * (a->start_mjd + a->end_mjd), &eop, NULL,
	    errbuf, errlen)))
		return e;
	if ((e = derive_attempt(&station, &t, &eop, a)) != ERRCODE_OK) {
		seterr(errbuf, errlen, "attempt on '%s': field 'start_utc': "
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

	if ((e = stmt_get(s, ST_ATTEMPT_GET, &st, errbuf, errlen)))
		return e;
	sqlite3_bind_int64(st, 1, id);
	memset(out, 0, sizeof *out);
	e = fetch_one(s, st, row_attempt, out, "attempt", errbuf, errlen);
	if (e == ERRCODE_NOT_FOUND)
		seterr(errbuf, errlen, "no attempt with id %ld", id);
	return e;
}

enum errcode
store_attempts_list(struct store *s, const struct store_query *q,
    struct site_attempt **out, size_t *n, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	*out = NULL;
	*n = 0;
	if ((e = stmt_get(s, ST_ATTEMPTS_LIST, &st, errbuf, errlen)))
		return e;
	bind_query(st, q, 0);
	return collect(s, st, sizeof **out, row_attempt, (void **)out, n,
	    "attempts", errbuf, errlen);
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
	col_text(st, 1, o->target, sizeof o->target);
	col_text(st, 2, o->station_code, sizeof o->station_code);
	o->epoch_mjd = sqlite3_column_double(st, 3);
	o->tof_s = sqlite3_column_double(st, 4);
	o->photons = (long)sqlite3_column_int64(st, 5);
	o->rms_ps = col_real_or_nan(st, 6);
	o->synodic_deg = sqlite3_column_double(st, 7);
	o->mean_elong_deg = sqlite3_column_double(st, 8);
	o->target_el_deg = col_real_or_nan(st, 9);
	o->sun_el_target_deg = sqlite3_column_double(st, 10);
}

enum errcode
store_np_add(struct store *s, struct site_normal_point *np, int *inserted,
    char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	char t0[40], what[SITE_ID_LEN + SITE_CODE_LEN + 80];
	enum errcode e;

	if (inserted != NULL)
		*inserted = 0;
	snprintf(what, sizeof what, "normal point of '%s'", np->target);
	if ((e = canon(&np->epoch_mjd, STORE_NP_TIME_NDP, t0, sizeof t0, what,
	    "epoch", errbuf, errlen)))
		return e;
	snprintf(what, sizeof what, "normal point of '%s' at %s", np->target,
	    t0);
	if ((e = stmt_get(s, ST_NP_ADD, &st, errbuf, errlen)))
		return e;
	bind_text(st, 1, np->target);
	bind_text(st, 2, np->station_code);
	bind_text(st, 3, t0);
	sqlite3_bind_double(st, 4, np->epoch_mjd);
	bind_real_or_null(st, 5, np->tof_s);
	sqlite3_bind_int64(st, 6, np->photons);
	bind_real_or_null(st, 7, np->rms_ps);
	bind_real_or_null(st, 8, np->synodic_deg);
	bind_real_or_null(st, 9, np->mean_elong_deg);
	bind_real_or_null(st, 10, np->target_el_deg);
	bind_real_or_null(st, 11, np->sun_el_target_deg);
	if ((e = step_done(s, st, what, errbuf, errlen)))
		return e;
	if (sqlite3_changes(s->db) > 0) {
		np->id = (long)sqlite3_last_insert_rowid(s->db);
		if (inserted != NULL)
			*inserted = 1;
	}
	return ERRCODE_OK;
}

enum errcode
store_nps_list(struct store *s, const struct store_query *q,
    struct site_normal_point **out, size_t *n, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	*out = NULL;
	*n = 0;
	if ((e = stmt_get(s, ST_NPS_LIST, &st, errbuf, errlen)))
		return e;
	bind_query(st, q, 1);
	return collect(s, st, sizeof **out, row_np, (void **)out, n,
	    "normal points", errbuf, errlen);
}

enum errcode
store_nps_count(struct store *s, const struct store_query *q, size_t *n,
    char *errbuf, size_t errlen)
{
	return count_rows(s, ST_NPS_COUNT, q, 1, n, "normal points", errbuf,
	    errlen);
}

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
		seterr(errbuf, errlen, "EOP row: field 'mjd': not a whole day");
		return ERRCODE_BAD_ARG;
	}
	snprintf(what, sizeof what, "EOP row of MJD %.0f", r->mjd);
	if ((e = stmt_get(s, ST_EOP_PUT, &st, errbuf, errlen)))
		return e;
	sqlite3_bind_int64(st, 1, (sqlite3_int64)r->mjd);
	bind_real_or_null(st, 2, r->dut1_s);
	bind_real_or_null(st, 3, r->xp_arcsec);
	bind_real_or_null(st, 4, r->yp_arcsec);
	return step_done(s, st, what, errbuf, errlen);
}

enum errcode
store_eop_load(struct store *s, struct site_eop_row **out, size_t *n,
    char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	*out = NULL;
	*n = 0;
	if ((e = stmt_get(s, ST_EOP_LOAD, &st, errbuf, errlen)))
		return e;
	return collect(s, st, sizeof **out, row_eop, (void **)out, n,
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
	if ((e = stmt_get(s, ST_EOP_AROUND, &st, errbuf, errlen)))
		return e;
	sqlite3_bind_double(st, 1, floor(utc_mjd));
	if ((e = collect(s, st, sizeof *rows, row_eop, (void **)&rows, &n,
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

	if ((e = stmt_get(s, ST_EOP_SPAN, &st, errbuf, errlen)))
		return e;
	if ((rc = sqlite3_step(st)) != SQLITE_ROW) {
		e = db_error(s, sqlite3_extended_errcode(s->db), "EOP table",
		    errbuf, errlen);
	} else if (sqlite3_column_int64(st, 2) == 0) {
		seterr(errbuf, errlen, "the EOP table is empty (load one with "
		    "'moonrange eop import')");
		e = ERRCODE_NOT_FOUND;
	} else {
		if (first_mjd != NULL)
			*first_mjd = (double)sqlite3_column_int64(st, 0);
		if (last_mjd != NULL)
			*last_mjd = (double)sqlite3_column_int64(st, 1);
	}
	stmt_done(st);
	return e;
}

/* --- settings ------------------------------------------------------------- */

enum setting_kind { SET_INT, SET_REAL, SET_WORD };

struct setting_def {
	struct store_setting_info info;
	enum setting_kind kind;
	double min, max;		/* numbers: inclusive range */
	int min_open;			/* 1: min itself is refused */
	const char *words[3];		/* SET_WORD: the accepted values */
};

/* The known settings (the SQL CHECK of table settings mirrors this). */
static const struct setting_def settings_table[] = {
	{{"coverage_bins", "12", "synodic-angle bins of the coverage audit "
	    "and weight, whole number 4..72"}, SET_INT, 4, 72, 0, {NULL}},
	{{"coverage_alpha", "1", "strength of the coverage weight, 0..4 "
	    "(0 turns it off)"}, SET_REAL, 0, 4, 0, {NULL}},
	{{"coverage_k", "1", "smoothing count of the coverage weight, "
	    "over 0 up to 1000"}, SET_REAL, 0, 1000, 1, {NULL}},
	{{"coverage_scope", "pooled", "coverage counted over all targets "
	    "('pooled') or per target ('per_target')"}, SET_WORD, 0, 0, 0,
	    {"pooled", "per_target", NULL}},
	{{"plan_days", "3", "days the daemon plans ahead, whole number "
	    "1..30"}, SET_INT, 1, 30, 0, {NULL}},
};

#define NSETTINGS (sizeof settings_table / sizeof settings_table[0])

const struct store_setting_info *
store_setting_info(size_t i)
{
	return i < NSETTINGS ? &settings_table[i].info : NULL;
}

static const struct setting_def *
setting_find(const char *key)
{
	for (size_t i = 0; i < NSETTINGS; i++)
		if (key != NULL && strcmp(settings_table[i].info.key, key) == 0)
			return &settings_table[i];
	return NULL;
}

/* Validate a value of a setting; 1 when it is acceptable. */
static int
setting_valid(const struct setting_def *d, const char *v, double *num)
{
	char *end;
	double x;

	if (v == NULL || *v == '\0' || strlen(v) > 20)
		return 0;
	if (d->kind == SET_WORD) {
		for (int i = 0; d->words[i] != NULL; i++)
			if (strcmp(v, d->words[i]) == 0)
				return 1;
		return 0;
	}
	/* Plain digits (and one '.' for reals): what the SQL CHECK accepts. */
	if (strspn(v, d->kind == SET_INT ? "0123456789" : "0123456789.") !=
	    strlen(v) || v[0] == '.')
		return 0;
	x = strtod(v, &end);
	if (*end != '\0' || !isfinite(x) || x < d->min || x > d->max ||
	    (d->min_open && x <= d->min))
		return 0;
	*num = x;
	return 1;
}

enum errcode
store_setting_get(struct store *s, const char *key, char *buf, size_t len,
    char *errbuf, size_t errlen)
{
	const struct setting_def *d = setting_find(key);
	sqlite3_stmt *st = NULL;
	enum errcode e;
	int rc;

	if (d == NULL) {
		seterr(errbuf, errlen, "unknown setting '%s'", key ? key : "");
		return ERRCODE_BAD_ARG;
	}
	if ((e = stmt_get(s, ST_SETTING_GET, &st, errbuf, errlen)))
		return e;
	bind_text(st, 1, key);
	rc = sqlite3_step(st);
	if (rc == SQLITE_ROW)
		col_text(st, 0, buf, len);
	else if (rc == SQLITE_DONE)
		snprintf(buf, len, "%s", d->info.def);
	else
		e = db_error(s, sqlite3_extended_errcode(s->db), "settings",
		    errbuf, errlen);
	stmt_done(st);
	return e;
}

enum errcode
store_setting_set(struct store *s, const char *key, const char *value,
    char *errbuf, size_t errlen)
{
	const struct setting_def *d = setting_find(key);
	sqlite3_stmt *st = NULL;
	char what[64];
	double num;
	enum errcode e;

	if (d == NULL) {
		seterr(errbuf, errlen, "unknown setting '%s'", key ? key : "");
		return ERRCODE_BAD_ARG;
	}
	if (!setting_valid(d, value, &num)) {
		seterr(errbuf, errlen, "setting '%s': '%s' is not valid: %s",
		    key, value ? value : "", d->info.help);
		return ERRCODE_BAD_ARG;
	}
	snprintf(what, sizeof what, "setting '%s'", key);
	if ((e = stmt_get(s, ST_SETTING_SET, &st, errbuf, errlen)))
		return e;
	bind_text(st, 1, key);
	bind_text(st, 2, value);
	return step_done(s, st, what, errbuf, errlen);
}

enum errcode
store_settings_get(struct store *s, struct store_settings *out, char *errbuf,
    size_t errlen)
{
	char v[64];
	double num = 0;
	enum errcode e;

	for (size_t i = 0; i < NSETTINGS; i++) {
		const struct setting_def *d = &settings_table[i];

		if ((e = store_setting_get(s, d->info.key, v, sizeof v, errbuf,
		    errlen)))
			return e;
		if (!setting_valid(d, v, &num)) {
			seterr(errbuf, errlen, "setting '%s' holds '%s', which "
			    "is not valid", d->info.key, v);
			return ERRCODE_DB;
		}
		if (strcmp(d->info.key, "coverage_bins") == 0)
			out->coverage_bins = (int)num;
		else if (strcmp(d->info.key, "coverage_alpha") == 0)
			out->coverage_alpha = num;
		else if (strcmp(d->info.key, "coverage_k") == 0)
			out->coverage_k = num;
		else if (strcmp(d->info.key, "coverage_scope") == 0)
			out->coverage_per_target = strcmp(v, "per_target") == 0;
		else if (strcmp(d->info.key, "plan_days") == 0)
			out->plan_days = (int)num;
	}
	return ERRCODE_OK;
}
