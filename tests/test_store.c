/* SPDX-License-Identifier: BSD-3-Clause */
/* test_store.c: the station database on real SQLite files in a temporary
   directory: round trips, every schema rule, migrations, failures. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "check.h"
#include "fixture.h"
#include "core/derive.h"
#include "core/mem.h"
#include "store/store.h"

static int fileno_seq;

/* A fresh database path in the temporary directory. */
static void
db_path(char *buf, size_t len)
{
	snprintf(buf, len, "%s/t%d.db", fixture_dir, ++fileno_seq);
}

static void
target(struct site_target *t, const char *id, const char *alias)
{
	memset(t, 0, sizeof *t);
	snprintf(t->id, sizeof t->id, "%s", id);
	snprintf(t->name, sizeof t->name, "Invented array %s", id);
	snprintf(t->alias, sizeof t->alias, "%s", alias);
	t->lat_deg = 12.5;
	t->lon_deg = -8.25;
	t->strength = 1.0;
	t->active = 1;
}

static void
attempt(struct site_attempt *a, const char *tgt, double start_mjd)
{
	memset(a, 0, sizeof *a);
	snprintf(a->target, sizeof a->target, "%s", tgt);
	a->start_mjd = start_mjd;
	a->end_mjd = start_mjd + 20.0 / 1440.0;
	a->shots = 12000;
	a->returns = 340;
	a->normal_points = 3;
	a->outcome = SITE_OUTCOME_RANGED;
	strcpy(a->operator_name, "Operator A");
	a->seeing_arcsec = NAN;
	strcpy(a->notes, "invented, \"quoted\", with a comma");
	a->synodic_deg = 91.5;
	a->mean_elong_deg = 88.0;
	a->target_el_deg = 45.0;
	a->sun_el_target_deg = 2.0;
	a->range_km = 381234.5;
}

/* A file database with the station and two targets. */
static struct store *
open_site(char *path, size_t len)
{
	struct site_station st;
	struct site_target t;
	struct store *s = NULL;
	char err[300];

	db_path(path, len);
	assert_int_equal(store_open(path, STORE_OPEN_CREATE, &s, err,
	    sizeof err), ERRCODE_OK);
	fixture_station(&st);
	assert_int_equal(store_station_put(s, &st, err, sizeof err),
	    ERRCODE_OK);
	target(&t, "NORTH", "INVENTED-N");
	assert_int_equal(store_target_add(s, &t, err, sizeof err), ERRCODE_OK);
	target(&t, "SOUTH", "");
	t.lat_deg = -21.75;
	assert_int_equal(store_target_add(s, &t, err, sizeof err), ERRCODE_OK);
	return s;
}

/*
 * A damaged database takes no writes (issue 11, defect 8): opening it for
 * writing is refused with a message naming the file; opening it to read
 * still works.  The damage: the last page of the file (a b-tree page of
 * the attempts after 300 inserts) overwritten with 0xA5 bytes, a page
 * type byte SQLite's file format does not define (sqlite.org/fileformat2,
 * b-tree page header: 2, 5, 10 or 13).
 */
static void
test_store_damaged_file_takes_no_writes(void **state)
{
	struct site_attempt a;
	struct store *s;
	char path[512], err[400];
	unsigned char junk[512];
	long size;
	FILE *f;

	(void)state;
	s = open_site(path, sizeof path);
	for (int i = 0; i < 300; i++) {
		attempt(&a, "NORTH", 61000.0 + i);
		assert_int_equal(store_attempt_add(s, &a, err, sizeof err),
		    ERRCODE_OK);
	}
	store_close(s);
	/* An intact file opens for writing. */
	assert_int_equal(store_open(path, 0, &s, err, sizeof err), ERRCODE_OK);
	store_close(s);
	memset(junk, 0xA5, sizeof junk);
	assert_non_null(f = fopen(path, "r+b"));
	assert_int_equal(fseek(f, 0, SEEK_END), 0);
	size = ftell(f);
	assert_true(size >= 8192);
	/* 4096-byte pages (SQLite's default): the last page's start */
	assert_int_equal(fseek(f, size - 4096, SEEK_SET), 0);
	assert_int_equal(fwrite(junk, 1, sizeof junk, f), sizeof junk);
	assert_int_equal(fclose(f), 0);
	s = NULL;
	assert_int_equal(store_open(path, 0, &s, err, sizeof err), ERRCODE_DB);
	assert_null(s);
	assert_non_null(strstr(err, path));
	assert_non_null(strstr(err, "damaged"));
	assert_non_null(strstr(err, "no writes"));
	assert_int_equal(store_open(path, STORE_OPEN_READONLY, &s, err,
	    sizeof err), ERRCODE_OK);
	store_close(s);
}

static void
test_store_open_requires_create_and_close_accepts_null(void **state)
{
	char path[300], err[300];
	struct store *s = (struct store *)1;

	(void)state;
	store_close(NULL);
	db_path(path, sizeof path);
	assert_int_equal(store_open(path, 0, &s, err, sizeof err),
	    ERRCODE_NOT_FOUND);
	assert_null(s);
	assert_non_null(strstr(err, "does not exist"));
	assert_int_equal(store_open(path, STORE_OPEN_CREATE, &s, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_schema_version(s), STORE_SCHEMA_VERSION);
	assert_int_equal(store_integrity_check(s, err, sizeof err), ERRCODE_OK);
	store_close(s);
	/* Not a database at all. */
	{
		FILE *f = fopen(path, "w");

		assert_non_null(f);
		fputs("this is a text file, not a database\n", f);
		fclose(f);
	}
	assert_int_equal(store_open(path, 0, &s, err, sizeof err), ERRCODE_DB);
	assert_non_null(strstr(err, "not a readable SQLite database"));
}

static void
test_store_station_round_trip(void **state)
{
	struct site_station st, got;
	struct store *s = NULL;
	char err[300];

	(void)state;
	assert_int_equal(store_open(":memory:", STORE_OPEN_CREATE, &s, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_station_get(s, &got, err, sizeof err),
	    ERRCODE_NOT_FOUND);
	fixture_station(&st);
	assert_int_equal(store_station_put(s, &st, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(store_station_get(s, &got, err, sizeof err),
	    ERRCODE_OK);
	assert_memory_equal(&st, &got, sizeof st);
	/* Put again replaces the one row. */
	st.min_el_deg = 20.0;
	assert_int_equal(store_station_put(s, &st, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(store_station_get(s, &got, err, sizeof err),
	    ERRCODE_OK);
	assert_true(got.min_el_deg == 20.0);
	store_close(s);
}

static void
test_store_targets(void **state)
{
	struct site_target t, *list = NULL;
	struct store *s;
	char path[300], err[300];
	size_t n = 0;

	(void)state;
	s = open_site(path, sizeof path);
	target(&t, "NORTH", "");
	assert_int_equal(store_target_add(s, &t, err, sizeof err),
	    ERRCODE_EXISTS);
	target(&t, "EAST", "INVENTED-N");	/* alias taken */
	assert_int_equal(store_target_add(s, &t, err, sizeof err),
	    ERRCODE_EXISTS);
	assert_int_equal(store_target_by_alias(s, "INVENTED-N", &t, err,
	    sizeof err), ERRCODE_OK);
	assert_string_equal(t.id, "NORTH");
	assert_int_equal(store_target_by_alias(s, "SOUTH", &t, err,
	    sizeof err), ERRCODE_OK);
	assert_string_equal(t.id, "SOUTH");
	assert_int_equal(store_target_by_alias(s, "NOWHERE", &t, err,
	    sizeof err), ERRCODE_NOT_FOUND);
	/* Retire SOUTH. */
	assert_int_equal(store_target_get(s, "SOUTH", &t, err, sizeof err),
	    ERRCODE_OK);
	t.active = 0;
	assert_int_equal(store_target_update(s, &t, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(store_targets_list(s, 1, &list, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 1);
	assert_string_equal(list[0].id, "NORTH");
	mem_free(list);
	assert_int_equal(store_targets_list(s, 0, &list, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 2);
	assert_string_equal(list[1].id, "SOUTH");
	assert_int_equal(list[1].active, 0);
	mem_free(list);
	target(&t, "GHOST", "");
	assert_int_equal(store_target_update(s, &t, err, sizeof err),
	    ERRCODE_NOT_FOUND);
	store_close(s);
}

static void
test_store_attempts_round_trip_and_filters(void **state)
{
	struct site_attempt a, b, *list = NULL;
	struct store_query q;
	struct store *s;
	char path[300], err[300];
	size_t n = 0;

	(void)state;
	s = open_site(path, sizeof path);
	/* 2027-03-01T04:00:00.0004Z: stored to the millisecond. */
	attempt(&a, "NORTH", 61465.0 + 4.0 / 24 + 0.0004 / 86400);
	assert_int_equal(store_attempt_add(s, &a, err, sizeof err), ERRCODE_OK);
	assert_true(a.id > 0);
	check_near(a.start_mjd, 61465.0 + 4.0 / 24, 1e-9, "d",
	    "canonical start (rounded to 1 ms)");
	assert_int_equal(store_attempt_get(s, a.id, &b, err, sizeof err),
	    ERRCODE_OK);
	assert_memory_equal(&a, &b, offsetof(struct site_attempt, seeing_arcsec));
	assert_true(isnan(b.seeing_arcsec));
	assert_string_equal(a.notes, b.notes);
	assert_true(a.synodic_deg == b.synodic_deg);
	/* Same target and start: refused with EXISTS. */
	attempt(&b, "NORTH", a.start_mjd);
	assert_int_equal(store_attempt_add(s, &b, err, sizeof err),
	    ERRCODE_EXISTS);
	assert_non_null(strstr(err, "already has an attempt"));
	/* Unknown target: NOT_FOUND naming the field. */
	attempt(&b, "NOWHERE", a.start_mjd);
	assert_int_equal(store_attempt_add(s, &b, err, sizeof err),
	    ERRCODE_NOT_FOUND);
	assert_non_null(strstr(err, "target"));
	for (int i = 1; i <= 9; i++) {
		attempt(&b, i % 2 ? "SOUTH" : "NORTH", 61465.0 + i);
		b.seeing_arcsec = 1.5;
		assert_int_equal(store_attempt_add(s, &b, err, sizeof err),
		    ERRCODE_OK);
	}
	store_query_init(&q);
	assert_int_equal(store_attempts_count(s, &q, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 10);
	q.target = "SOUTH";
	assert_int_equal(store_attempts_count(s, &q, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 5);
	q.since_mjd = 61468.0;		/* inclusive */
	q.until_mjd = 61472.0;		/* exclusive */
	assert_int_equal(store_attempts_list(s, &q, &list, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 2);		/* SOUTH on days 3 and 5 */
	mem_free(list);
	q.target = NULL;
	q.newest_first = 1;
	q.limit = 2;
	assert_int_equal(store_attempts_list(s, &q, &list, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 2);
	check_near(list[0].start_mjd, 61471.0, 1e-9, "d", "newest first");
	check_near(list[1].start_mjd, 61470.0, 1e-9, "d", "then the next");
	check_near(list[0].seeing_arcsec, 1.5, 0, "arcsec", "seeing kept");
	mem_free(list);
	store_close(s);
}

/*
 * Each row of the table breaks one rule of the attempts table; the schema
 * must refuse it with ERRCODE_BAD_ARG (or the listed code) and name the
 * field.  The store passes the values straight to SQLite, so these are the
 * SQL CHECK rules at work.
 */
static void
test_store_every_attempt_rule_refuses_its_bad_row(void **state)
{
	static const struct {
		const char *field;
		enum errcode want;
	} cases[] = {
		{"shots", ERRCODE_BAD_ARG}, {"returns", ERRCODE_BAD_ARG},
		{"normal_points", ERRCODE_BAD_ARG},
		{"end", ERRCODE_BAD_ARG},	/* core/attempt.c's rule */
		{"seeing_arcsec", ERRCODE_BAD_ARG},
		{"synodic_deg", ERRCODE_BAD_ARG},
		{"mean_elong_deg", ERRCODE_BAD_ARG},
		{"target_el_deg", ERRCODE_BAD_ARG},
		{"sun_el_target_deg", ERRCODE_BAD_ARG},
		{"outcome", ERRCODE_BAD_ARG},
		{"start", ERRCODE_BAD_TIME},
	};
	struct site_attempt a;
	struct store_query q;
	struct store *s;
	char path[300], err[300];
	size_t n = 0;

	(void)state;
	s = open_site(path, sizeof path);
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		const char *f = cases[i].field;

		attempt(&a, "NORTH", 61500.0 + (double)i);
		if (strcmp(f, "shots") == 0)
			a.shots = -1;
		else if (strcmp(f, "returns") == 0)
			a.returns = -5;
		else if (strcmp(f, "normal_points") == 0)
			a.normal_points = -1;
		else if (strcmp(f, "end") == 0)
			a.end_mjd = a.start_mjd - 0.01;	/* end before start */
		else if (strcmp(f, "seeing_arcsec") == 0)
			a.seeing_arcsec = -0.5;
		else if (strcmp(f, "synodic_deg") == 0)
			a.synodic_deg = 360.0;
		else if (strcmp(f, "mean_elong_deg") == 0)
			a.mean_elong_deg = -1.0;
		else if (strcmp(f, "target_el_deg") == 0)
			a.target_el_deg = 91.0;
		else if (strcmp(f, "sun_el_target_deg") == 0)
			a.sun_el_target_deg = NAN;	/* NULL: required */
		else if (strcmp(f, "outcome") == 0)
			a.outcome = SITE_OUTCOME__COUNT;
		else if (strcmp(f, "start") == 0)
			a.start_mjd = NAN;
		err[0] = '\0';
		assert_int_equal(store_attempt_add(s, &a, err, sizeof err),
		    cases[i].want);
		if (strstr(err, f) == NULL)
			fail_msg("case %s: message '%s' does not name the field",
			    f, err);
	}
	store_query_init(&q);
	assert_int_equal(store_attempts_count(s, &q, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 0);
	store_close(s);
}

/* A new database in memory, its schema made. */
static struct store *
memory_store(void)
{
	struct store *s = NULL;
	char err[300];

	assert_int_equal(store_open(":memory:", STORE_OPEN_CREATE, &s, err,
	    sizeof err), ERRCODE_OK);
	return s;
}

/*
 * Every stored text field, not only an attempt's, refuses C1 controls and
 * bidirectional overrides and isolates (issue 11, defect 8): the station's
 * name, the target's name and alias, a blackout's reason, whichever entry
 * point (CLI, station.ini and CSV importers, HTTP) calls the store.  The
 * code points are those of Unicode's C1 block and UAX #9 (quoted from
 * memory; the same list as text_unsafe_at in core/text.h).
 */
static void
test_store_text_fields_refuse_c1_and_bidi(void **state)
{
	static const char *const bad[] = {
		"K\xc2\x80x", "K\xc2\x85x", "K\xc2\x9fx",	/* C1 */
		"K\xe2\x80\xaax", "K\xe2\x80\xaex",		/* LRE, RLO */
		"K\xe2\x81\xa6x", "K\xe2\x81\xa9x",		/* LRI, PDI */
	};
	struct site_station st;
	struct site_target t;
	struct site_blackout b;
	struct store *s = memory_store();
	char err[300];

	(void)state;
	fixture_station(&st);
	assert_int_equal(store_station_put(s, &st, err, sizeof err),
	    ERRCODE_OK);
	target(&t, "T1", "");
	assert_int_equal(store_target_add(s, &t, err, sizeof err), ERRCODE_OK);
	for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
		fixture_station(&st);
		snprintf(st.name, sizeof st.name, "%s", bad[i]);
		assert_int_equal(store_station_put(s, &st, err, sizeof err),
		    ERRCODE_BAD_ARG);
		assert_non_null(strstr(err, "station name"));
		target(&t, "T2", "");
		snprintf(t.name, sizeof t.name, "%s", bad[i]);
		assert_int_equal(store_target_add(s, &t, err, sizeof err),
		    ERRCODE_BAD_ARG);
		assert_non_null(strstr(err, "target name"));
		target(&t, "T1", "");
		snprintf(t.alias, sizeof t.alias, "%s", bad[i]);
		assert_int_equal(store_target_update(s, &t, err, sizeof err),
		    ERRCODE_BAD_ARG);
		assert_non_null(strstr(err, "target alias"));
		memset(&b, 0, sizeof b);
		b.start_mjd = 61000.0;
		b.end_mjd = 61001.0;
		snprintf(b.reason, sizeof b.reason, "%s", bad[i]);
		assert_int_equal(store_blackout_add(s, &b, err, sizeof err),
		    ERRCODE_BAD_ARG);
		assert_non_null(strstr(err, "blackout reason"));
		/* settings hold words and digits only */
		assert_int_equal(store_setting_set(s, "coverage_bins", bad[i],
		    err, sizeof err), ERRCODE_BAD_ARG);
	}
	/* Other non-ASCII text is kept. */
	fixture_station(&st);
	snprintf(st.name, sizeof st.name, "K\xc3\xa9strel \xe2\x80\x94 ridge");
	assert_int_equal(store_station_put(s, &st, err, sizeof err),
	    ERRCODE_OK);
	store_close(s);
}

static void
test_store_station_and_target_rules(void **state)
{
	struct site_station st;
	struct site_target t;
	struct store *s = memory_store();
	char err[300];

	(void)state;
	fixture_station(&st);
	st.lat_deg = 90.5;
	assert_int_equal(store_station_put(s, &st, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "lat_deg"));
	fixture_station(&st);
	st.humidity = 1.2;
	assert_int_equal(store_station_put(s, &st, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "humidity"));
	fixture_station(&st);
	strcpy(st.code, "bad code");
	assert_int_equal(store_station_put(s, &st, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "code"));
	target(&t, "bad id!", "");
	assert_int_equal(store_target_add(s, &t, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "id"));
	target(&t, "T1", "");
	t.lat_deg = -90.01;
	assert_int_equal(store_target_add(s, &t, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "lat_deg"));
	target(&t, "T1", "");
	t.strength = 0.0;
	assert_int_equal(store_target_add(s, &t, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "strength"));
	target(&t, "T1", "");
	t.dark_only = 2;
	assert_int_equal(store_target_add(s, &t, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "dark_only"));
	store_close(s);
}

static void
test_store_blackouts(void **state)
{
	struct site_blackout b, *list = NULL;
	struct store *s;
	char path[300], err[300];
	size_t n = 0;

	(void)state;
	s = open_site(path, sizeof path);
	memset(&b, 0, sizeof b);
	b.start_mjd = 61500.25;
	b.end_mjd = 61500.5;
	strcpy(b.reason, "invented maintenance");
	assert_int_equal(store_blackout_add(s, &b, err, sizeof err),
	    ERRCODE_OK);
	assert_true(b.id > 0);
	b.start_mjd = 61502.0;
	b.end_mjd = 61501.0;		/* end before start */
	assert_int_equal(store_blackout_add(s, &b, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "end_mjd"));
	assert_int_equal(store_blackouts_list(s, 61500.4, NAN, &list, &n, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(n, 1);
	assert_string_equal(list[0].reason, "invented maintenance");
	mem_free(list);
	assert_int_equal(store_blackouts_list(s, 61500.6, NAN, &list, &n, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(n, 0);
	assert_int_equal(store_blackout_remove(s, 1, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(store_blackout_remove(s, 1, err, sizeof err),
	    ERRCODE_NOT_FOUND);
	store_close(s);
}

static void
test_store_normal_points_idempotent(void **state)
{
	struct site_normal_point np, *list = NULL;
	struct store_query q;
	struct store *s;
	char path[300], err[300];
	size_t n = 0;
	int ins = -1;

	(void)state;
	s = open_site(path, sizeof path);
	memset(&np, 0, sizeof np);
	strcpy(np.target, "NORTH");
	strcpy(np.station_code, "TRS1");
	np.epoch_mjd = 61465.123456789;
	np.tof_s = 2.5312345678901;
	np.photons = 42;
	np.rms_ps = 55.0;
	np.synodic_deg = 10.0;
	np.mean_elong_deg = 12.0;
	np.target_el_deg = 40.0;
	np.sun_el_target_deg = -20.0;
	assert_int_equal(store_np_add(s, &np, &ins, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(ins, 1);
	assert_int_equal(store_np_add(s, &np, &ins, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(ins, 0);
	strcpy(np.station_code, "OTHER");	/* another station: new row */
	assert_int_equal(store_np_add(s, &np, &ins, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(ins, 1);
	np.tof_s = 1.0;			/* not a lunar round trip */
	np.epoch_mjd += 0.1;
	assert_int_equal(store_np_add(s, &np, &ins, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "tof_s"));
	store_query_init(&q);
	q.station_code = "TRS1";
	assert_int_equal(store_nps_list(s, &q, &list, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 1);
	/* Epochs are kept to the microsecond, the time of flight exactly. */
	check_near(list[0].epoch_mjd, 61465.123456789, 1e-6 / 86400 + 1e-11,
	    "d", "epoch to 1 us");
	assert_true(list[0].tof_s == 2.5312345678901);
	mem_free(list);
	store_query_init(&q);
	assert_int_equal(store_nps_count(s, &q, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 2);
	store_close(s);
}

static void
test_store_eop(void **state)
{
	struct site_eop_row r, *rows = NULL;
	struct store *s = NULL;
	char err[300];
	double first = 0, last = 0;
	size_t n = 0;

	(void)state;
	assert_int_equal(store_open(":memory:", STORE_OPEN_CREATE, &s, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_eop_span(s, &first, &last, err, sizeof err),
	    ERRCODE_NOT_FOUND);
	for (int i = 2; i >= 0; i--) {
		r.mjd = 61400.0 + i;
		r.dut1_s = 0.1 - 0.001 * i;
		r.xp_arcsec = 0.2;
		r.yp_arcsec = 0.3;
		assert_int_equal(store_eop_put(s, &r, err, sizeof err),
		    ERRCODE_OK);
	}
	r.mjd = 61401.0;			/* replaces */
	r.dut1_s = -0.25;
	assert_int_equal(store_eop_put(s, &r, err, sizeof err), ERRCODE_OK);
	r.mjd = 61403.5;
	assert_int_equal(store_eop_put(s, &r, err, sizeof err),
	    ERRCODE_BAD_ARG);
	r.mjd = 61404.0;
	r.dut1_s = 1.2;				/* |UT1-UTC| < 0.9 s rule */
	assert_int_equal(store_eop_put(s, &r, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "dut1_s"));
	assert_int_equal(store_eop_load(s, &rows, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 3);
	assert_true(rows[0].mjd == 61400.0 && rows[2].mjd == 61402.0);
	assert_true(rows[1].dut1_s == -0.25);
	mem_free(rows);
	assert_int_equal(store_eop_span(s, &first, &last, err, sizeof err),
	    ERRCODE_OK);
	assert_true(first == 61400.0 && last == 61402.0);
	store_close(s);
}

/* Every setting lands in its member of struct store_settings (the values
   are the ones set here; the words by their place in the setting's list,
   README "setting list"). */
static void
test_store_settings_every_member(void **state)
{
	static const char *const kv[][2] = {
		{"coverage_bins", "24"}, {"coverage_alpha", "0.5"},
		{"coverage_k", "2.5"}, {"coverage_scope", "per_target"},
		{"plan_days", "5"}, {"value_model", "bins"},
		{"value_harmonics", "3"}, {"value_phase_weight", "2"},
		{"value_orientation_weight", "0.25"}, {"plan_run_min_s", "700"},
		{"plan_run_max_s", "1900"}, {"plan_switch_s", "90"},
		{"plan_calibration_s", "400"},
		{"plan_calibration_every_s", "3600"},
	};
	/* Static: its padding is zero, as memset makes set's. */
	static const struct store_settings want = {
		.coverage_bins = 24, .coverage_alpha = 0.5, .coverage_k = 2.5,
		.coverage_per_target = 1, .plan_days = 5, .value_bins = 1,
		.value_harmonics = 3, .value_phase_weight = 2.0,
		.value_orientation_weight = 0.25, .plan_run_min_s = 700,
		.plan_run_max_s = 1900, .plan_switch_s = 90,
		.plan_calibration_s = 400, .plan_calibration_every_s = 3600,
	};
	struct store_settings set;
	struct store *s = NULL;
	char err[300];

	(void)state;
	memset(&set, 0, sizeof set);
	assert_int_equal(store_open(":memory:", STORE_OPEN_CREATE, &s, err,
	    sizeof err), ERRCODE_OK);
	for (size_t i = 0; i < sizeof kv / sizeof kv[0]; i++)
		assert_int_equal(store_setting_set(s, kv[i][0], kv[i][1], err,
		    sizeof err), ERRCODE_OK);
	assert_int_equal(store_settings_get(s, &set, err, sizeof err),
	    ERRCODE_OK);
	assert_memory_equal(&set, &want, sizeof set);
	store_close(s);
}

static void
test_store_settings(void **state)
{
	struct store_settings set;
	struct store *s = NULL;
	char err[300], v[64];

	(void)state;
	assert_int_equal(store_open(":memory:", STORE_OPEN_CREATE, &s, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_settings_get(s, &set, err, sizeof err),
	    ERRCODE_OK);
	/* Defaults documented in the README (setting list): 12 bins of 30 deg,
	   the usual monthly-phase binning (common practice). */
	assert_int_equal(set.coverage_bins, 12);
	assert_true(set.coverage_alpha == 1.0);
	assert_int_equal(set.coverage_per_target, 0);
	assert_int_equal(store_setting_set(s, "coverage_bins", "24", err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_setting_set(s, "coverage_scope", "per_target",
	    err, sizeof err), ERRCODE_OK);
	assert_int_equal(store_setting_set(s, "coverage_alpha", "0", err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_settings_get(s, &set, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(set.coverage_bins, 24);
	assert_int_equal(set.coverage_per_target, 1);
	assert_true(set.coverage_alpha == 0.0);
	assert_int_equal(store_setting_set(s, "coverage_bins", "3", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "coverage_bins"));
	assert_int_equal(store_setting_set(s, "coverage_bins", "12x", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_int_equal(store_setting_set(s, "coverage_k", "0", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_int_equal(store_setting_set(s, "no_such_key", "1", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "no_such_key"));
	assert_int_equal(store_setting_get(s, "plan_days", v, sizeof v, err,
	    sizeof err), ERRCODE_OK);
	assert_string_equal(v, "3");
	for (size_t i = 0; store_setting_info(i) != NULL; i++)
		assert_int_equal(store_setting_get(s, store_setting_info(i)->key,
		    v, sizeof v, err, sizeof err), ERRCODE_OK);
	store_close(s);
}

static void
test_store_transaction_all_or_nothing(void **state)
{
	struct site_attempt a;
	struct store_query q;
	struct store *s;
	char path[300], err[300];
	size_t n = 0;

	(void)state;
	s = open_site(path, sizeof path);
	assert_int_equal(store_begin(s, err, sizeof err), ERRCODE_OK);
	for (int i = 0; i < 50; i++) {
		attempt(&a, "NORTH", 61600.0 + i);
		assert_int_equal(store_attempt_add(s, &a, err, sizeof err),
		    ERRCODE_OK);
	}
	store_rollback(s);
	store_query_init(&q);
	assert_int_equal(store_attempts_count(s, &q, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 0);
	assert_int_equal(store_begin(s, err, sizeof err), ERRCODE_OK);
	assert_int_equal(store_begin(s, err, sizeof err), ERRCODE_DB);
	attempt(&a, "NORTH", 61600.0);
	assert_int_equal(store_attempt_add(s, &a, err, sizeof err), ERRCODE_OK);
	assert_int_equal(store_commit(s, err, sizeof err), ERRCODE_OK);
	store_close(s);
	/* Durable: a new connection sees the row. */
	assert_int_equal(store_open(path, STORE_OPEN_READONLY, &s, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_attempts_count(s, &q, &n, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(n, 1);
	store_close(s);
}

static void
test_store_attempt_log_derives_with_stored_eop(void **state)
{
	struct site_station st;
	struct site_target t;
	struct site_attempt a, b;
	struct site_eop_row r;
	struct geom_eop eop, want_eop;
	struct derive_angles d;
	enum eop_source src;
	struct store *s;
	char path[300], err[300];

	(void)state;
	s = open_site(path, sizeof path);
	/* Invented EOP rows (test values, not IERS data) on MJD 61465..61467. */
	for (int i = 0; i < 3; i++) {
		r.mjd = 61465.0 + i;
		r.dut1_s = 0.2 + 0.01 * i;
		r.xp_arcsec = 0.1;
		r.yp_arcsec = 0.3;
		assert_int_equal(store_eop_put(s, &r, err, sizeof err),
		    ERRCODE_OK);
	}
	assert_int_equal(store_eop_at(s, 61466.5, &eop, &src, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(src, EOP_SOURCE_TABLE);
	/* Linear between 0.21 s and 0.22 s, halfway (no leap second). */
	check_near(eop.dut1, 0.215, 1e-12, "s", "interpolated DUT1");
	assert_int_equal(store_eop_at(s, 61500.0, &eop, &src, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(src, EOP_SOURCE_NONE);
	assert_true(eop.dut1 == 0.0);

	attempt(&a, "NORTH", 61466.25);
	a.synodic_deg = a.mean_elong_deg = NAN;
	assert_int_equal(store_attempt_log(s, &a, err, sizeof err), ERRCODE_OK);
	assert_int_equal(store_attempt_get(s, a.id, &b, err, sizeof err),
	    ERRCODE_OK);
	/* The same angles as derive.h with the table's EOP at mid-time. */
	fixture_station(&st);
	target(&t, "NORTH", "INVENTED-N");
	assert_int_equal(store_eop_at(s, 0.5 * (a.start_mjd + a.end_mjd),
	    &want_eop, NULL, err, sizeof err), ERRCODE_OK);
	assert_int_equal(derive_at(&st, &t, &want_eop, 0.5 * (a.start_mjd +
	    a.end_mjd), &d), ERRCODE_OK);
	assert_true(b.synodic_deg == d.synodic_deg);
	assert_true(b.target_el_deg == d.target_el_deg);
	assert_true(b.sun_el_target_deg == d.sun_el_target_deg);
	attempt(&a, "NOWHERE", 61466.5);
	assert_int_equal(store_attempt_log(s, &a, err, sizeof err),
	    ERRCODE_NOT_FOUND);
	assert_non_null(strstr(err, "NOWHERE"));
	store_close(s);
}

/* The schema dump of a database opened at path. */
static char *
dump_of(const char *path)
{
	struct store *s = NULL;
	struct mbuf b;
	char err[300];

	assert_int_equal(store_open(path, STORE_OPEN_CREATE, &s, err,
	    sizeof err), ERRCODE_OK);
	mbuf_init(&b);
	assert_int_equal(store_schema_dump(s, &b), ERRCODE_OK);
	store_close(s);
	return mbuf_take(&b);
}

/* An empty file is not a database: refused without CREATE (it was given
   a schema and became an empty station). */
static void
test_store_empty_file_refused(void **state)
{
	char path[300], err[300];
	struct store *s = NULL;
	FILE *f;

	(void)state;
	db_path(path, sizeof path);
	assert_non_null(f = fopen(path, "w"));
	fclose(f);
	assert_int_equal(store_open(path, 0, &s, err, sizeof err), ERRCODE_DB);
	assert_null(s);
	assert_non_null(strstr(err, "empty file"));
	/* With CREATE (init) it becomes a database. */
	assert_int_equal(store_open(path, STORE_OPEN_CREATE, &s, err,
	    sizeof err), ERRCODE_OK);
	store_close(s);
}

static void
test_store_migrations_reach_the_same_schema(void **state)
{
	char path[300], err[300];
	char *fresh, *migrated;
	struct store *s = NULL;

	(void)state;
	db_path(path, sizeof path);
	fresh = dump_of(path);		/* empty file: every migration at once */
	assert_non_null(strstr(fresh, "table attempts: CREATE TABLE"));
	snprintf(err, sizeof err, "user_version %d", STORE_SCHEMA_VERSION);
	assert_non_null(strstr(fresh, err));
	/* From every earlier version (1 = all migrations from empty). */
	for (int v = 1; v < STORE_SCHEMA_VERSION; v++) {
		db_path(path, sizeof path);
		assert_int_equal(store_open(path, STORE_OPEN_CREATE |
		    STORE_OPEN_NO_MIGRATE, &s, err, sizeof err), ERRCODE_OK);
		assert_int_equal(store_schema_version(s), 0);
		assert_int_equal(store_migrate(s, v, err, sizeof err),
		    ERRCODE_OK);
		assert_int_equal(store_schema_version(s), v);
		/* Going down is refused. */
		if (v > 1)
			assert_int_equal(store_migrate(s, v - 1, err,
			    sizeof err), ERRCODE_DB);
		store_close(s);
		migrated = dump_of(path);
		if (strcmp(fresh, migrated) != 0)
			fail_msg("schema migrated from version %d differs:\n"
			    "%s\n--- fresh ---\n%s", v, migrated, fresh);
		mem_free(migrated);
	}
	/* One version per transaction, as a database kept across releases. */
	db_path(path, sizeof path);
	assert_int_equal(store_open(path, STORE_OPEN_CREATE |
	    STORE_OPEN_NO_MIGRATE, &s, err, sizeof err), ERRCODE_OK);
	for (int v = 1; v <= STORE_SCHEMA_VERSION; v++) {
		assert_int_equal(store_migrate(s, v, err, sizeof err),
		    ERRCODE_OK);
		assert_int_equal(store_schema_version(s), v);
	}
	store_close(s);
	migrated = dump_of(path);
	if (strcmp(fresh, migrated) != 0)
		fail_msg("schema migrated one version at a time differs:\n"
		    "%s\n--- fresh ---\n%s", migrated, fresh);
	mem_free(migrated);
	mem_free(fresh);
}

/* A round of work under an allocation failure: success or a clean error. */
static enum errcode
work_round(void)
{
	struct site_station st;
	struct site_target t, *list = NULL;
	struct site_attempt a;
	struct store *s = NULL;
	char err[300];
	size_t n;
	enum errcode e;

	if ((e = store_open(":memory:", STORE_OPEN_CREATE, &s, err,
	    sizeof err)))
		return e;
	fixture_station(&st);
	target(&t, "NORTH", "");
	attempt(&a, "NORTH", 61465.0);
	if (!(e = store_station_put(s, &st, err, sizeof err)) &&
	    !(e = store_target_add(s, &t, err, sizeof err)) &&
	    !(e = store_attempt_add(s, &a, err, sizeof err)) &&
	    !(e = store_targets_list(s, 0, &list, &n, err, sizeof err))) {
		assert_int_equal(n, 1);
		mem_free(list);
	}
	store_close(s);
	return e;
}

static void
test_store_allocation_failure_is_clean(void **state)
{
	int failures = 0;

	(void)state;
	assert_int_equal(work_round(), ERRCODE_OK);	/* warms SQLite up */
	for (long i = 1; i < 5000; i++) {
		enum errcode e;
		long used;

		mem_fail_after(i);
		e = work_round();
		used = mem_fail_after(0);
		if (used < i) {		/* the failure never came: done */
			assert_int_equal(e, ERRCODE_OK);
			break;
		}
		/* Out of memory, or SQLite reporting it as an error. */
		if (e != ERRCODE_NOMEM && e != ERRCODE_DB && e != ERRCODE_OK)
			fail_msg("allocation %ld: unexpected %s", i,
			    errcode_name(e));
		failures += e != ERRCODE_OK;
	}
	assert_true(failures > 10);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(
		    test_store_open_requires_create_and_close_accepts_null),
		cmocka_unit_test(test_store_station_round_trip),
		cmocka_unit_test(test_store_targets),
		cmocka_unit_test(test_store_attempts_round_trip_and_filters),
		cmocka_unit_test(
		    test_store_every_attempt_rule_refuses_its_bad_row),
		cmocka_unit_test(test_store_station_and_target_rules),
		cmocka_unit_test(test_store_text_fields_refuse_c1_and_bidi),
		cmocka_unit_test(test_store_blackouts),
		cmocka_unit_test(test_store_normal_points_idempotent),
		cmocka_unit_test(test_store_eop),
		cmocka_unit_test(test_store_settings),
		cmocka_unit_test(test_store_settings_every_member),
		cmocka_unit_test(test_store_transaction_all_or_nothing),
		cmocka_unit_test(test_store_attempt_log_derives_with_stored_eop),
		cmocka_unit_test(test_store_empty_file_refused),
		cmocka_unit_test(test_store_damaged_file_takes_no_writes),
		cmocka_unit_test(test_store_migrations_reach_the_same_schema),
		cmocka_unit_test(test_store_allocation_failure_is_clean),
	};

	return cmocka_run_group_tests_name("store", tests, fixture_dir_setup,
	    fixture_dir_teardown);
}
