/* SPDX-License-Identifier: BSD-3-Clause */
/* store.c: the station database on SQLite: opening, the schema and its
   migrations, transactions, the statement helpers and the settings. */
#include <math.h>
#include <pthread.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include <sqlite3.h>

#include "core/derive.h"
#include "core/mem.h"
#include "core/text.h"
#include "store/store.h"
#include "store/store_db.h"
#include "store/store_sql.h"
#include "core/tscale.h"

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

/* A macro's value as SQL text (TEXT_MJD0 in the EOP insert). */
#define STORE_STR_(x) #x
#define STORE_STR(x) STORE_STR_(x)

#define STATION_COLS "name, code, lat_deg, lon_deg, height_m, time_zone, " \
	"min_el_deg, max_sun_el_deg, min_sun_sep_deg, pressure_hpa, " \
	"temperature_c, humidity, wavelength_nm, zenith_tau, fire_rate_hz, " \
	"pulse_energy_mj, aperture_m, transmit_eff, receive_eff, detector_qe, " \
	"seeing_arcsec, jitter_ps"
#define TARGET_COLS "id, name, alias, lat_deg, lon_deg, height_m, " \
	"strength, dark_only, active, cube_count, cube_aperture_mm, " \
	"normal_lat_deg, normal_lon_deg, extent_m"
#define ATTEMPT_COLS "id, target_id, start_mjd, end_mjd, shots, returns, " \
	"normal_points, outcome, operator, seeing_arcsec, notes, " \
	"synodic_deg, mean_elong_deg, target_el_deg, sun_el_target_deg, " \
	"suspect, range_km"
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

static const char *const stmt_sql[ST__COUNT] = {
	[ST_STATION_GET] = "SELECT " STATION_COLS " FROM station WHERE id = 1",
	[ST_STATION_PUT] = "INSERT INTO station (id, " STATION_COLS ") VALUES "
	    "(1, ?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, "
	    "?15, ?16, ?17, ?18, ?19, ?20, ?21, ?22) ON CONFLICT (id) DO UPDATE SET name = excluded.name, "
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
	    "fire_rate_hz = excluded.fire_rate_hz, "
	    "pulse_energy_mj = excluded.pulse_energy_mj, "
	    "aperture_m = excluded.aperture_m, "
	    "transmit_eff = excluded.transmit_eff, "
	    "receive_eff = excluded.receive_eff, "
	    "detector_qe = excluded.detector_qe, "
	    "seeing_arcsec = excluded.seeing_arcsec, "
	    "jitter_ps = excluded.jitter_ps",
	[ST_TARGET_ADD] = "INSERT INTO targets (" TARGET_COLS ") VALUES "
	    "(?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14)",
	[ST_TARGET_UPDATE] = "UPDATE targets SET name = ?2, alias = ?3, "
	    "lat_deg = ?4, lon_deg = ?5, height_m = ?6, strength = ?7, "
	    "dark_only = ?8, active = ?9, cube_count = ?10, "
	    "cube_aperture_mm = ?11, normal_lat_deg = ?12, normal_lon_deg = ?13, "
	    "extent_m = ?14 WHERE id = ?1",
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
	    "mean_elong_deg, target_el_deg, sun_el_target_deg, suspect, "
	    "range_km) VALUES "
	    "(?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, "
	    "?16, ?17, ?18)",
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
	    "yp_arcsec) VALUES (?1, date(?1 + " STORE_STR(TEXT_MJD0) "), ?2, ?3, ?4) "
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
	[ST_DATA_VERSION] = "PRAGMA data_version",
};

/* --- errors --------------------------------------------------------------- */

enum errcode
store_db_error(struct store *s, int rc, const char *what, char *errbuf,
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
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "%s: field '%s': value refused by the "
		    "database (out of range or malformed)", what, col);
	case SQLITE_CONSTRAINT_NOTNULL:
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "%s: field '%s': a value is required",
		    what, col);
	case SQLITE_CONSTRAINT_UNIQUE:
	case SQLITE_CONSTRAINT_PRIMARYKEY:
		return text_err(ERRCODE_EXISTS, errbuf, errlen,
		    "%s: already stored (%s)", what,
		    msg);
	case SQLITE_CONSTRAINT_FOREIGNKEY:
		return text_err(ERRCODE_NOT_FOUND, errbuf, errlen,
		    "%s: field 'target': no such target",
		    what);
	case SQLITE_CONSTRAINT_DATATYPE:
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "%s: a value has the wrong type (%s)",
		    what, msg);
	case SQLITE_NOMEM:
		return text_err(ERRCODE_NOMEM, errbuf, errlen,
		    "%s: out of memory", what);
	case SQLITE_BUSY:
	case SQLITE_LOCKED:
		return text_err(ERRCODE_DB, errbuf, errlen,
		    "%s: the database stayed locked by "
		    "another process for over %d s", what, STORE_BUSY_MS / 1000);
	default:
		(void)text_err(ERRCODE_OK, errbuf, errlen,
		    "%s: database error: %s", what,
		    msg);
		return (rc & 0xff) == SQLITE_NOMEM ? ERRCODE_NOMEM : ERRCODE_DB;
	}
}

/* --- statement helpers ---------------------------------------------------- */

enum errcode
store_stmt_get(struct store *s, enum store_stmt_id id, sqlite3_stmt **out,
    char *errbuf,
    size_t errlen)
{
	int rc;

	if (s->stmt[id] == NULL) {
		rc = sqlite3_prepare_v3(s->db, stmt_sql[id], -1,
		    SQLITE_PREPARE_PERSISTENT, &s->stmt[id], NULL);
		if (rc != SQLITE_OK) {
			s->stmt[id] = NULL;
			return store_db_error(s, rc, "preparing a query",
			    errbuf,
			    errlen);
		}
	}
	*out = s->stmt[id];
	return ERRCODE_OK;
}

void
store_stmt_done(sqlite3_stmt *st)
{
	sqlite3_reset(st);
	sqlite3_clear_bindings(st);
}

void
store_bind_text(sqlite3_stmt *st, int i, const char *v)
{
	sqlite3_bind_text(st, i, v, -1, SQLITE_STATIC);
}

void
store_bind_real_or_null(sqlite3_stmt *st, int i, double v)
{
	if (isnan(v))
		sqlite3_bind_null(st, i);
	else
		sqlite3_bind_double(st, i, v);
}

void
store_bind_text_or_null(sqlite3_stmt *st, int i, const char *v)
{
	if (v == NULL || *v == '\0')
		sqlite3_bind_null(st, i);
	else
		store_bind_text(st, i, v);
}

void
store_col_text(sqlite3_stmt *st, int i, char *buf, size_t len)
{
	const unsigned char *t = sqlite3_column_text(st, i);

	snprintf(buf, len, "%s", t != NULL ? (const char *)t : "");
}

double
store_col_real_or_nan(sqlite3_stmt *st, int i)
{
	if (sqlite3_column_type(st, i) == SQLITE_NULL)
		return NAN;
	return sqlite3_column_double(st, i);
}

enum errcode
store_step_done(struct store *s, sqlite3_stmt *st, const char *what,
    char *errbuf,
    size_t errlen)
{
	int rc = sqlite3_step(st);
	enum errcode e = ERRCODE_OK;

	if (rc != SQLITE_DONE && rc != SQLITE_ROW)
		e = store_db_error(s, sqlite3_extended_errcode(s->db), what,
		    errbuf, errlen);
	store_stmt_done(st);
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
		(void)text_err(ERRCODE_OK, errbuf, errlen, "%s: %s", what,
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

enum errcode
store_collect(struct store *s, sqlite3_stmt *st, size_t esz, store_row_fn fn,
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
				e = text_err(ERRCODE_NOMEM, errbuf, errlen,
				    "%s: out of memory", what);
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
		e = store_db_error(s, sqlite3_extended_errcode(s->db), what,
		    errbuf, errlen);
out:
	store_stmt_done(st);
	if (e != ERRCODE_OK) {
		mem_free(arr);
		arr = NULL;
		cnt = 0;
	}
	*out = arr;
	*n = cnt;
	return e;
}

enum errcode
store_fetch_one(struct store *s, sqlite3_stmt *st, store_row_fn fn, void *dst,
    const char *what, char *errbuf, size_t errlen)
{
	int rc = sqlite3_step(st);
	enum errcode e = ERRCODE_OK;

	if (rc == SQLITE_ROW) {
		fn(st, dst);
	} else if (rc == SQLITE_DONE) {
		e = text_err(ERRCODE_NOT_FOUND, errbuf, errlen, "%s: not found",
		    what);
	} else {
		e = store_db_error(s, sqlite3_extended_errcode(s->db), what,
		    errbuf, errlen);
	}
	store_stmt_done(st);
	return e;
}

enum errcode
store_canon(double *mjd, int ndp, char *buf, size_t len, const char *what,
    const char *field, char *errbuf, size_t errlen)
{
	if (store_time_canon(*mjd, ndp, buf, len, mjd) != ERRCODE_OK) {
		return text_err(ERRCODE_BAD_TIME, errbuf, errlen,
		    "%s: field '%s': not a valid UTC time",
		    what, field);
	}
	return ERRCODE_OK;
}

/* --- times ---------------------------------------------------------------- */

enum errcode
store_time_canon(double mjd, int ndp, char *buf, size_t len,
    double *canon_mjd)
{
	double u1, u2;

	if (!isfinite(mjd) || mjd < 0 || mjd > 300000 ||
	    tscale_format_utc(TEXT_MJD0, mjd, ndp, buf, len) != ERRCODE_OK ||
	    tscale_parse_utc(buf, &u1, &u2, NULL, 0) != ERRCODE_OK)
		return ERRCODE_BAD_TIME;
	*canon_mjd = (u1 - TEXT_MJD0) + u2;
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

int
store_data_version(struct store *s)
{
	sqlite3_stmt *st;
	int v = -1;

	/* Prepared once: the daemon asks on every cached request. */
	if (s == NULL || store_stmt_get(s, ST_DATA_VERSION, &st, NULL, 0) !=
	    ERRCODE_OK)
		return -1;
	if (sqlite3_step(st) == SQLITE_ROW)
		v = sqlite3_column_int(st, 0);
	store_stmt_done(st);
	return v;
}

enum errcode
store_migrate(struct store *s, int version, char *errbuf, size_t errlen)
{
	char sql[64];
	int v, objects = 0;
	enum errcode e;

	if (version < 1 || version > (int)store_sql_nmigrations) {
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "schema version %d is not one of "
		    "1..%zu", version, store_sql_nmigrations);
	}
	if ((e = exec_sql(s, "BEGIN IMMEDIATE", "locking the database for "
	    "its schema", errbuf, errlen)) != ERRCODE_OK)
		return e;
	if ((v = store_schema_version(s)) < 0 ||
	    pragma_int(s, "SELECT count(*) FROM sqlite_schema", &objects)) {
		e = text_err(ERRCODE_DB, errbuf, errlen,
		    "cannot read the schema version: %s",
		    sqlite3_errmsg(s->db));
		goto out;
	}
	if (v > version) {
		e = text_err(ERRCODE_DB, errbuf, errlen,
		    "the database has schema version %d, "
		    "newer than %d (this program knows up to %d)", v, version,
		    STORE_SCHEMA_VERSION);
		goto out;
	}
	if (v == 0 && objects > 0) {
		(void)text_err(ERRCODE_OK, errbuf, errlen,
		    "the file holds tables but no moonrange "
		    "schema version; it is not a moonrange database");
		e = ERRCODE_DB;
		goto out;
	}
	for (int i = v; i < version; i++) {
		const struct store_sql_migration *m = &store_sql_migrations[i];

		if ((e = exec_sql(s, m->sql, m->name, errbuf, errlen)) !=
		    ERRCODE_OK)
			goto out;
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

/*
 * Reopen s read-only as an immutable file ("file:PATH?immutable=1"): for a
 * reader of a WAL database that cannot create its -shm file (a read-only
 * file system or directory).  Only when no -wal file holds frames, since
 * an immutable reader would not see them.  SQLITE_OK when reopened.
 */
static int
reopen_immutable(struct store *s, const char *path)
{
	static const char hex[] = "0123456789ABCDEF";
	char wal[4096], uri[3 * 4096 + 32];
	struct stat st;
	size_t o;
	int rc;

	if (snprintf(wal, sizeof wal, "%s-wal", path) >= (int)sizeof wal ||
	    (stat(wal, &st) == 0 && st.st_size > 0))
		return SQLITE_CANTOPEN;
	o = (size_t)snprintf(uri, sizeof uri, "file:");
	for (const char *c = path; *c != '\0'; c++) {
		if (*c == '%' || *c == '?' || *c == '#') {
			uri[o++] = '%';
			uri[o++] = hex[(unsigned char)*c >> 4];
			uri[o++] = hex[(unsigned char)*c & 0xF];
		} else {
			uri[o++] = *c;
		}
	}
	snprintf(uri + o, sizeof uri - o, "?immutable=1");
	sqlite3_close(s->db);
	s->db = NULL;
	if ((rc = sqlite3_open_v2(uri, &s->db, SQLITE_OPEN_READONLY |
	    SQLITE_OPEN_URI | SQLITE_OPEN_NOMUTEX, NULL)) != SQLITE_OK)
		return rc;
	sqlite3_extended_result_codes(s->db, 1);
	return SQLITE_OK;
}

/*
 * A damaged database takes no writes: they would build on pages that may
 * be wrong and spread the damage.  PRAGMA quick_check(1) reads every page
 * once (O(file size): 1.6 s of CPU for 200,000 attempts, 47 MB; README
 * "Reliability") and stops at
 * the first fault.  ERRCODE_DB naming the file when it is not "ok".
 */
static enum errcode
check_intact(struct store *s, const char *path, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	const unsigned char *t;
	char why[160] = "";
	int rc;

	if ((rc = sqlite3_prepare_v2(s->db, "PRAGMA quick_check(1)", -1, &st,
	    NULL)) == SQLITE_OK && (rc = sqlite3_step(st)) == SQLITE_ROW &&
	    (t = sqlite3_column_text(st, 0)) != NULL &&
	    strcmp((const char *)t, "ok") == 0) {
		sqlite3_finalize(st);
		return ERRCODE_OK;
	}
	if (rc == SQLITE_ROW && (t = sqlite3_column_text(st, 0)) != NULL)
		text_quote((const char *)t, strlen((const char *)t), why,
		    sizeof why);
	else
		snprintf(why, sizeof why, "%s", sqlite3_errmsg(s->db));
	sqlite3_finalize(st);
	return text_err(ERRCODE_DB, errbuf, errlen, "database '%s' is "
	    "damaged (SQLite quick_check: %s); it takes no writes: read what "
	    "it holds with 'log export', or restore a copy", path, why);
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
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "no database file given");
	}
	pthread_once(&sqlite_once, sqlite_setup);
	/* A no-op once it has succeeded; retried after a failure. */
	if ((rc = sqlite3_initialize()) != SQLITE_OK) {
		(void)text_err(ERRCODE_OK, errbuf, errlen,
		    "SQLite failed to start: %s",
		    sqlite3_errstr(rc));
		return (rc & 0xff) == SQLITE_NOMEM ? ERRCODE_NOMEM : ERRCODE_DB;
	}
	memory = strcmp(path, ":memory:") == 0;
	if (!memory && !(flags & STORE_OPEN_CREATE) && access(path, F_OK) != 0) {
		return text_err(ERRCODE_NOT_FOUND, errbuf, errlen,
		    "database '%s' does not exist (create it "
		    "with 'moonrange init --db %s')", path, path);
	}
	if (!memory && !(flags & STORE_OPEN_CREATE)) {
		struct stat st;

		/* SQLite would take an empty file as a new database and the
		   migration give it a schema: a truncated or mistyped file
		   would quietly become an empty station. */
		if (stat(path, &st) == 0 && S_ISREG(st.st_mode) &&
		    st.st_size == 0)
			return text_err(ERRCODE_DB, errbuf, errlen,
			    "'%s' is an empty file, not a moonrange database "
			    "(create one with 'moonrange init --db %s')", path,
			    path);
	}
	if ((s = mem_calloc(1, sizeof *s)) == NULL) {
		return text_err(ERRCODE_NOMEM, errbuf, errlen,
		    "opening '%s': out of memory",
		    path);
	}
	oflags = (flags & STORE_OPEN_READONLY) ? SQLITE_OPEN_READONLY :
	    SQLITE_OPEN_READWRITE | ((flags & STORE_OPEN_CREATE) ?
	    SQLITE_OPEN_CREATE : 0);
	if (sqlite3_open_v2(path, &s->db, oflags | SQLITE_OPEN_NOMUTEX, NULL) !=
	    SQLITE_OK) {
		(void)text_err(ERRCODE_OK, errbuf, errlen,
		    "cannot open database '%s': %s",
		    path,
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
	/* A WAL database is read through its -shm file, which SQLite must
	   be able to create beside it; a reader on a read-only file system
	   or in a directory it cannot write reads the file as immutable. */
	if ((v = store_schema_version(s)) < 0 && (flags & STORE_OPEN_READONLY) &&
	    !memory && (sqlite3_extended_errcode(s->db) & 0xff) ==
	    SQLITE_READONLY && strlen(path) < 4000 &&
	    reopen_immutable(s, path) == SQLITE_OK)
		v = store_schema_version(s);
	if (v < 0) {
		if (s->db != NULL && (sqlite3_extended_errcode(s->db) & 0xff) ==
		    SQLITE_READONLY)
			e = text_err(ERRCODE_DB, errbuf, errlen,
			    "cannot read database '%s': "
			    "SQLite needs to create '%s-shm' beside it (is its "
			    "directory read-only?): %s", path, path,
			    sqlite3_errmsg(s->db));
		else
			(void)text_err(ERRCODE_OK, errbuf, errlen,
			    "'%s' is not a readable SQLite "
			    "database: %s", path, s->db != NULL ?
			    sqlite3_errmsg(s->db) : "out of memory");
		e = ERRCODE_DB;
		goto out;
	}
	/* Writers check once: the CLI's at each open, the daemon at start
	   (its per-request writers open with STORE_OPEN_NO_MIGRATE). */
	if (!(flags & (STORE_OPEN_READONLY | STORE_OPEN_NO_MIGRATE)) &&
	    !memory && v > 0 &&
	    (e = check_intact(s, path, errbuf, errlen)) != ERRCODE_OK)
		goto out;
	if (!(flags & STORE_OPEN_READONLY) && !memory &&
	    (e = exec_sql(s, "PRAGMA journal_mode = WAL", path, errbuf,
	    errlen)) != ERRCODE_OK)
		goto out;
	if (!(flags & (STORE_OPEN_READONLY | STORE_OPEN_NO_MIGRATE)) &&
	    v != STORE_SCHEMA_VERSION) {
		char msg[400];

		if ((e = store_migrate(s, STORE_SCHEMA_VERSION, msg,
		    sizeof msg)) != ERRCODE_OK) {
			(void)text_err(ERRCODE_OK, errbuf, errlen, "%s: %s",
			    path, msg);
			goto out;
		}
	}
	/* Writers bring stale log statistics up to date (a file just
	   migrated, or written without them).  Not a failure of the open
	   when they cannot (a file the daemon may only read): readers then
	   compute them from the records. */
	if (!(flags & (STORE_OPEN_READONLY | STORE_OPEN_NO_MIGRATE)))
		(void)store_logstats_sync(s, NULL, NULL, 0);
	if ((flags & STORE_OPEN_READONLY) && v > STORE_SCHEMA_VERSION) {
		e = text_err(ERRCODE_DB, errbuf, errlen,
		    "%s: the database has schema version %d, "
		    "newer than this program knows (up to %d)", path, v,
		    STORE_SCHEMA_VERSION);
		goto out;
	}
	if ((flags & STORE_OPEN_READONLY) && v != STORE_SCHEMA_VERSION) {
		e = text_err(ERRCODE_DB, errbuf, errlen,
		    "%s: schema version %d, this program needs "
		    "%d (open it once for writing to migrate it)", path, v,
		    STORE_SCHEMA_VERSION);
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
	store_stats_discard(s);
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
			(void)text_err(ERRCODE_OK, errbuf, errlen,
			    "integrity check: %s",
			    r != NULL ? r : "no answer");
	} else {
		(void)text_err(ERRCODE_OK, errbuf, errlen,
		    "integrity check: %s",
		    sqlite3_errmsg(s->db));
	}
	sqlite3_finalize(st);
	return e;
}

/* --- transactions --------------------------------------------------------- */

/* Set the page cache (PRAGMA cache_size: negative, KiB); the default of
   SQLite (-2000) outside transactions. */
static void
tx_cache(struct store *s, int kib)
{
	char sql[48];

	snprintf(sql, sizeof sql, "PRAGMA cache_size = %d", kib);
	(void)sqlite3_exec(s->db, sql, NULL, NULL, NULL);
}

enum errcode
store_begin(struct store *s, char *errbuf, size_t errlen)
{
	enum errcode e;

	if (s->in_tx) {
		return text_err(ERRCODE_DB, errbuf, errlen,
		    "a transaction is already open");
	}
	e = exec_sql(s, "BEGIN IMMEDIATE", "starting a transaction", errbuf,
	    errlen);
	if (e == ERRCODE_OK) {
		s->in_tx = 1;
		s->tx_rate_known = 0;
		tx_cache(s, -STORE_TX_CACHE_KIB);
	}
	return e;
}

enum errcode
store_commit(struct store *s, char *errbuf, size_t errlen)
{
	enum errcode e;

	if (!s->in_tx) {
		return text_err(ERRCODE_DB, errbuf, errlen,
		    "no transaction is open");
	}
	/* The log's statistics in the same transaction. */
	if ((e = store_stats_flush(s, NULL, errbuf, errlen)) == ERRCODE_OK)
		e = exec_sql(s, "COMMIT", "committing", errbuf, errlen);
	if (e != ERRCODE_OK)
		store_rollback(s);
	s->in_tx = 0;
	s->tx_rate_known = 0;
	tx_cache(s, -2000);
	return e;
}

void
store_rollback(struct store *s)
{
	if (s == NULL)
		return;
	store_stats_discard(s);
	if (!sqlite3_get_autocommit(s->db))
		(void)sqlite3_exec(s->db, "ROLLBACK", NULL, NULL, NULL);
	if (s->in_tx)
		tx_cache(s, -2000);
	s->in_tx = 0;
	s->tx_rate_known = 0;
}

/* --- settings ------------------------------------------------------------- */

enum setting_kind { SET_INT, SET_REAL, SET_WORD };

struct setting_def {
	struct store_setting_info info;
	enum setting_kind kind;
	double min, max;		/* numbers: inclusive range */
	int min_open;			/* 1: min itself is refused */
	const char *words[3];		/* SET_WORD: the accepted values */
	size_t at;			/* where store_settings_get puts the
					   value (IN), 0: nowhere */
};

/* A member of struct store_settings, as setting_def.at: its offset plus
   one.  SET_INT and SET_WORD (the word's index) go into an int, SET_REAL
   into a double. */
#define IN(m) (offsetof(struct store_settings, m) + 1)

/* The known settings (the SQL CHECK of table settings mirrors this). */
static const struct setting_def settings_table[] = {
	{{"coverage_bins", "12", "synodic-angle bins of the coverage audit "
	    "and weight, whole number 4..72"}, SET_INT, 4, 72, 0, {NULL},
	    IN(coverage_bins)},
	{{"coverage_alpha", "1", "strength of the coverage weight, 0..4 "
	    "(0 turns it off)"}, SET_REAL, 0, 4, 0, {NULL}, IN(coverage_alpha)},
	{{"coverage_k", "1", "smoothing count of the coverage weight, "
	    "over 0 up to 1000"}, SET_REAL, 0, 1000, 1, {NULL}, IN(coverage_k)},
	{{"coverage_scope", "pooled", "coverage counted over all targets "
	    "('pooled') or per target ('per_target')"}, SET_WORD, 0, 0, 0,
	    {"pooled", "per_target", NULL}, IN(coverage_per_target)},
	{{"plan_days", "3", "days the daemon plans ahead, whole number "
	    "1..30"}, SET_INT, 1, 30, 0, {NULL}, IN(plan_days)},
	{{"value_model", "design", "phase value of a run: 'design' (D-optimal "
	    "information gain) or 'bins' (coverage weight)"}, SET_WORD, 0, 0,
	    0, {"design", "bins", NULL}, IN(value_bins)},
	{{"value_harmonics", "2", "harmonic order K of the phase signals, "
	    "whole number 1..4"}, SET_INT, 1, 4, 0, {NULL},
	    IN(value_harmonics)},
	{{"value_phase_weight", "1", "weight of the phase information in a "
	    "run's value, 0..100"}, SET_REAL, 0, 100, 0, {NULL},
	    IN(value_phase_weight)},
	{{"value_orientation_weight", "1", "weight of the orientation "
	    "information in a run's value, 0..100 (both 0: normal points)"},
	    SET_REAL, 0, 100, 0, {NULL}, IN(value_orientation_weight)},
	{{"plan_run_min_s", "600", "shortest run, seconds, whole number "
	    "60..14400"}, SET_INT, 60, 14400, 0, {NULL}, IN(plan_run_min_s)},
	{{"plan_run_max_s", "1800", "longest run, seconds, whole number "
	    "60..14400 (not under plan_run_min_s)"}, SET_INT, 60, 14400, 0,
	    {NULL}, IN(plan_run_max_s)},
	{{"plan_switch_s", "120", "time to switch targets, seconds, whole "
	    "number 0..3600"}, SET_INT, 0, 3600, 0, {NULL}, IN(plan_switch_s)},
	{{"plan_calibration_s", "300", "length of a calibration run, "
	    "seconds, whole number 60..3600"}, SET_INT, 60, 3600, 0, {NULL},
	    IN(plan_calibration_s)},
	{{"plan_calibration_every_s", "0", "longest ranging after a "
	    "calibration, seconds, 0 (no calibrations) or plan_run_max_s.."
	    "86400"}, SET_INT, 0, 86400, 0, {NULL},
	    IN(plan_calibration_every_s)},
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
	double x;

	if (v == NULL || *v == '\0' || strlen(v) > 20)
		return 0;
	if (d->kind == SET_WORD) {
		for (int i = 0; d->words[i] != NULL; i++)
			if (strcmp(v, d->words[i]) == 0) {
				*num = i;
				return 1;
			}
		return 0;
	}
	/* Plain digits (and one '.' for reals): what the SQL CHECK accepts. */
	if (strspn(v, d->kind == SET_INT ? "0123456789" : "0123456789.") !=
	    strlen(v) || v[0] == '.')
		return 0;
	if (text_parse_real(v, d->min, d->max, &x) != ERRCODE_OK ||
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
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "unknown setting '%s'",
		    key ? key : "");
	}
	if ((e = store_stmt_get(s, ST_SETTING_GET, &st, errbuf, errlen)))
		return e;
	store_bind_text(st, 1, key);
	rc = sqlite3_step(st);
	if (rc == SQLITE_ROW)
		store_col_text(st, 0, buf, len);
	else if (rc == SQLITE_DONE)
		snprintf(buf, len, "%s", d->info.def);
	else
		e = store_db_error(s, sqlite3_extended_errcode(s->db),
		    "settings",
		    errbuf, errlen);
	store_stmt_done(st);
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
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "unknown setting '%s'",
		    key ? key : "");
	}
	if (!setting_valid(d, value, &num)) {
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "setting '%s': '%s' is not valid: %s",
		    key, value ? value : "", d->info.help);
	}
	snprintf(what, sizeof what, "setting '%s'", key);
	if ((e = store_stmt_get(s, ST_SETTING_SET, &st, errbuf, errlen)))
		return e;
	store_bind_text(st, 1, key);
	store_bind_text(st, 2, value);
	if ((e = store_step_done(s, st, what, errbuf, errlen)))
		return e;
	/* The log's statistics count normal points per coverage bin. */
	return strcmp(key, "coverage_bins") == 0 ?
	    store_logstats_sync(s, NULL, errbuf, errlen) : ERRCODE_OK;
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
			return text_err(ERRCODE_DB, errbuf, errlen,
			    "setting '%s' holds '%s', which "
			    "is not valid", d->info.key, v);
		}
		if (d->at == 0)
			continue;
		if (d->kind == SET_REAL)
			*(double *)(void *)((char *)out + d->at - 1) = num;
		else
			*(int *)(void *)((char *)out + d->at - 1) = (int)num;
	}
	return ERRCODE_OK;
}
