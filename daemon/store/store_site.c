/* SPDX-License-Identifier: BSD-3-Clause */
/* store_site.c: the site in the database: the station, the targets and the
   blackouts. */
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

/* --- station -------------------------------------------------------------- */

static void
row_station(sqlite3_stmt *st, void *dst)
{
	struct site_station *o = dst;

	store_col_text(st, 0, o->name, sizeof o->name);
	store_col_text(st, 1, o->code, sizeof o->code);
	o->lat_deg = sqlite3_column_double(st, 2);
	o->lon_deg = sqlite3_column_double(st, 3);
	o->height_m = sqlite3_column_double(st, 4);
	store_col_text(st, 5, o->time_zone, sizeof o->time_zone);
	o->min_el_deg = sqlite3_column_double(st, 6);
	o->max_sun_el_deg = sqlite3_column_double(st, 7);
	o->min_sun_sep_deg = sqlite3_column_double(st, 8);
	o->pressure_hpa = sqlite3_column_double(st, 9);
	o->temperature_c = sqlite3_column_double(st, 10);
	o->humidity = sqlite3_column_double(st, 11);
	o->wavelength_nm = sqlite3_column_double(st, 12);
	o->zenith_tau = sqlite3_column_double(st, 13);
	o->fire_rate_hz = sqlite3_column_double(st, 14);
	o->pulse_energy_mj = store_col_real_or_nan(st, 15);
	o->aperture_m = store_col_real_or_nan(st, 16);
	o->transmit_eff = store_col_real_or_nan(st, 17);
	o->receive_eff = store_col_real_or_nan(st, 18);
	o->detector_qe = store_col_real_or_nan(st, 19);
	o->seeing_arcsec = store_col_real_or_nan(st, 20);
	o->jitter_ps = store_col_real_or_nan(st, 21);
}

/* A physics value: a positive number, else NULL (the default). */
static void
bind_positive(sqlite3_stmt *st, int i, double v)
{
	store_bind_real_or_null(st, i, (isfinite(v) && v > 0.0) ? v : NAN);
}

enum errcode
store_station_get(struct store *s, struct site_station *out, char *errbuf,
    size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	if ((e = store_stmt_get(s, ST_STATION_GET, &st, errbuf, errlen)))
		return e;
	memset(out, 0, sizeof *out);
	e = store_fetch_one(s, st, row_station, out, "station", errbuf, errlen);
	if (e == ERRCODE_NOT_FOUND)
		(void)text_err(ERRCODE_OK, errbuf, errlen,
		    "the database holds no station (load "
		    "one with 'moonrange init')");
	return e;
}

enum errcode
store_station_put(struct store *s, const struct site_station *o,
    char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	if ((e = text_field_check("station name", o->name, sizeof o->name, 0,
	    errbuf, errlen)) ||
	    (e = text_field_check("station code", o->code, sizeof o->code, 0,
	    errbuf, errlen)) ||
	    (e = text_field_check("station time_zone", o->time_zone,
	    sizeof o->time_zone, 0, errbuf, errlen)))
		return e;
	if ((e = store_stmt_get(s, ST_STATION_PUT, &st, errbuf, errlen)))
		return e;
	store_bind_text(st, 1, o->name);
	store_bind_text(st, 2, o->code);
	sqlite3_bind_double(st, 3, o->lat_deg);
	sqlite3_bind_double(st, 4, o->lon_deg);
	sqlite3_bind_double(st, 5, o->height_m);
	store_bind_text(st, 6, o->time_zone);
	store_bind_real_or_null(st, 7, o->min_el_deg);
	store_bind_real_or_null(st, 8, o->max_sun_el_deg);
	store_bind_real_or_null(st, 9, o->min_sun_sep_deg);
	store_bind_real_or_null(st, 10, o->pressure_hpa);
	store_bind_real_or_null(st, 11, o->temperature_c);
	store_bind_real_or_null(st, 12, o->humidity);
	store_bind_real_or_null(st, 13, o->wavelength_nm);
	store_bind_real_or_null(st, 14, o->zenith_tau);
	store_bind_real_or_null(st, 15, o->fire_rate_hz);
	bind_positive(st, 16, o->pulse_energy_mj);
	bind_positive(st, 17, o->aperture_m);
	bind_positive(st, 18, o->transmit_eff);
	bind_positive(st, 19, o->receive_eff);
	bind_positive(st, 20, o->detector_qe);
	bind_positive(st, 21, o->seeing_arcsec);
	bind_positive(st, 22, o->jitter_ps);
	s->tx_rate_known = 0;
	if ((e = store_step_done(s, st, "station", errbuf, errlen)))
		return e;
	/* The log's exposures depend on zenith_tau and seeing_arcsec. */
	return store_logstats_sync(s, NULL, errbuf, errlen);
}

/* --- targets -------------------------------------------------------------- */

static void
row_target(sqlite3_stmt *st, void *dst)
{
	struct site_target *o = dst;

	store_col_text(st, 0, o->id, sizeof o->id);
	store_col_text(st, 1, o->name, sizeof o->name);
	store_col_text(st, 2, o->alias, sizeof o->alias);
	o->lat_deg = sqlite3_column_double(st, 3);
	o->lon_deg = sqlite3_column_double(st, 4);
	o->height_m = sqlite3_column_double(st, 5);
	o->strength = sqlite3_column_double(st, 6);
	o->dark_only = sqlite3_column_int(st, 7);
	o->active = sqlite3_column_int(st, 8);
	o->cube_count = sqlite3_column_type(st, 9) == SQLITE_NULL ? 0 :
	    (long)sqlite3_column_int64(st, 9);
	o->cube_aperture_mm = store_col_real_or_nan(st, 10);
	o->normal_lat_deg = store_col_real_or_nan(st, 11);
	o->normal_lon_deg = store_col_real_or_nan(st, 12);
	o->extent_m = store_col_real_or_nan(st, 13);
}

static void
bind_target(sqlite3_stmt *st, const struct site_target *t)
{
	store_bind_text(st, 1, t->id);
	store_bind_text(st, 2, t->name);
	store_bind_text(st, 3, t->alias);
	store_bind_real_or_null(st, 4, t->lat_deg);
	store_bind_real_or_null(st, 5, t->lon_deg);
	store_bind_real_or_null(st, 6, t->height_m);
	store_bind_real_or_null(st, 7, t->strength);
	sqlite3_bind_int(st, 8, t->dark_only);
	sqlite3_bind_int(st, 9, t->active);
	if (t->cube_count > 0)
		sqlite3_bind_int64(st, 10, t->cube_count);
	else
		sqlite3_bind_null(st, 10);
	bind_positive(st, 11, t->cube_aperture_mm);
	store_bind_real_or_null(st, 12, t->normal_lat_deg);
	store_bind_real_or_null(st, 13, t->normal_lon_deg);
	store_bind_real_or_null(st, 14, t->extent_m);
}

/* The target's text members, through the one check of core/text.h. */
static enum errcode
target_text_check(const struct site_target *t, char *errbuf, size_t errlen)
{
	enum errcode e;

	if ((e = text_field_check("target id", t->id, sizeof t->id, 0, errbuf,
	    errlen)) ||
	    (e = text_field_check("target name", t->name, sizeof t->name, 0,
	    errbuf, errlen)) ||
	    (e = text_field_check("target alias", t->alias, sizeof t->alias, 0,
	    errbuf, errlen)))
		return e;
	return ERRCODE_OK;
}

/* Check and write t with statement id (ST_TARGET_ADD, ST_TARGET_UPDATE). */
static enum errcode
target_write(struct store *s, enum store_stmt_id id,
    const struct site_target *t, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	char what[SITE_ID_LEN + 16];
	enum errcode e;

	if ((e = target_text_check(t, errbuf, errlen)))
		return e;
	if ((e = store_stmt_get(s, id, &st, errbuf, errlen)))
		return e;
	snprintf(what, sizeof what, "target '%s'", t->id);
	bind_target(st, t);
	return store_step_done(s, st, what, errbuf, errlen);
}

enum errcode
store_target_add(struct store *s, const struct site_target *t, char *errbuf,
    size_t errlen)
{
	return target_write(s, ST_TARGET_ADD, t, errbuf, errlen);
}

enum errcode
store_target_update(struct store *s, const struct site_target *t,
    char *errbuf, size_t errlen)
{
	enum errcode e;

	if ((e = target_write(s, ST_TARGET_UPDATE, t, errbuf, errlen)))
		return e;
	if (sqlite3_changes(s->db) == 0) {
		return text_err(ERRCODE_NOT_FOUND, errbuf, errlen,
		    "no target '%s'", t->id);
	}
	return ERRCODE_OK;
}

/* The target that statement id (ST_TARGET_GET, ST_TARGET_ALIAS) finds by
   key; ERRCODE_NOT_FOUND when there is none (the caller says why). */
static enum errcode
target_by(struct store *s, enum store_stmt_id id, const char *key,
    struct site_target *out, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	if ((e = store_stmt_get(s, id, &st, errbuf, errlen)))
		return e;
	store_bind_text(st, 1, key);
	memset(out, 0, sizeof *out);
	return store_fetch_one(s, st, row_target, out, "target", errbuf,
	    errlen);
}

enum errcode
store_target_get(struct store *s, const char *id, struct site_target *out,
    char *errbuf, size_t errlen)
{
	enum errcode e = target_by(s, ST_TARGET_GET, id, out, errbuf, errlen);

	if (e == ERRCODE_NOT_FOUND)
		(void)text_err(ERRCODE_OK, errbuf, errlen, "no target '%s'",
		    id);
	return e;
}

enum errcode
store_target_by_alias(struct store *s, const char *name,
    struct site_target *out, char *errbuf, size_t errlen)
{
	enum errcode e = target_by(s, ST_TARGET_ALIAS, name, out, errbuf,
	    errlen);

	if (e == ERRCODE_NOT_FOUND)
		(void)text_err(ERRCODE_OK, errbuf, errlen,
		    "no target has the alias or id '%s'",
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
	if ((e = store_stmt_get(s, ST_TARGETS_LIST, &st, errbuf, errlen)))
		return e;
	sqlite3_bind_int(st, 1, active_only ? 1 : 0);
	return store_collect(s, st, sizeof **out, row_target, (void **)out, n,
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
	store_col_text(st, 3, o->reason, sizeof o->reason);
}

enum errcode
store_blackout_add(struct store *s, struct site_blackout *b, char *errbuf,
    size_t errlen)
{
	sqlite3_stmt *st = NULL;
	char t0[40], t1[40];
	enum errcode e;

	if ((e = text_field_check("blackout reason", b->reason,
	    sizeof b->reason, 0, errbuf, errlen)))
		return e;
	if ((e = store_canon(&b->start_mjd, STORE_TIME_NDP, t0, sizeof t0,
	    "blackout", "start", errbuf, errlen)) ||
	    (e = store_canon(&b->end_mjd, STORE_TIME_NDP, t1, sizeof t1,
	    "blackout",
	    "end", errbuf, errlen)))
		return e;
	if ((e = store_stmt_get(s, ST_BLACKOUT_ADD, &st, errbuf, errlen)))
		return e;
	store_bind_text(st, 1, t0);
	sqlite3_bind_double(st, 2, b->start_mjd);
	store_bind_text(st, 3, t1);
	sqlite3_bind_double(st, 4, b->end_mjd);
	store_bind_text(st, 5, b->reason);
	if ((e = store_step_done(s, st, "blackout", errbuf, errlen)))
		return e;
	b->id = (long)sqlite3_last_insert_rowid(s->db);
	return ERRCODE_OK;
}

enum errcode
store_blackout_remove(struct store *s, long id, char *errbuf, size_t errlen)
{
	sqlite3_stmt *st = NULL;
	enum errcode e;

	if ((e = store_stmt_get(s, ST_BLACKOUT_REMOVE, &st, errbuf, errlen)))
		return e;
	sqlite3_bind_int64(st, 1, id);
	if ((e = store_step_done(s, st, "blackout", errbuf, errlen)))
		return e;
	if (sqlite3_changes(s->db) == 0) {
		return text_err(ERRCODE_NOT_FOUND, errbuf, errlen,
		    "no blackout with id %ld", id);
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
	if ((e = store_stmt_get(s, ST_BLACKOUTS_LIST, &st, errbuf, errlen)))
		return e;
	store_bind_real_or_null(st, 1, from_mjd);
	store_bind_real_or_null(st, 2, to_mjd);
	return store_collect(s, st, sizeof **out, row_blackout, (void **)out, n,
	    "blackouts", errbuf, errlen);
}
