/* SPDX-License-Identifier: BSD-3-Clause */
/* test_logstats.c: the log's statistics: the phase matrix from moments
   against its definition, and the store's statistics against those built
   from the records after adds, a bulk transaction, setting and station
   changes, and writes that bypass them (stale, then rebuilt); the store's
   walks of the log against its lists. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>
#include <sqlite3.h>

#include "check.h"
#include "fixture.h"
#include "rng.h"
#include "core/derive.h"
#include "core/logstats.h"
#include "core/mem.h"
#include "store/store.h"

RNG_FILE(0x5eed10c5ULL)

#define NT 3
#define NA 90
#define NNP 40

static struct site_station station;
static struct site_target targets[NT];

/* The invented station of fixture.h and three invented targets. */
static void
site_make(void)
{
	static const struct {
		const char *id;
		double lat, lon;
	} t[NT] = {
		{"WREN", 14.5, -9.25},		/* invented */
		{"FINCH", -18.75, 22.5},	/* invented */
		{"STARLING", 2.2, 40.1},	/* invented */
	};

	fixture_station(&station);
	for (int j = 0; j < NT; j++) {
		site_target_init(&targets[j]);
		snprintf(targets[j].id, sizeof targets[j].id, "%s", t[j].id);
		snprintf(targets[j].name, sizeof targets[j].name, "Array %s "
		    "(invented)", t[j].id);
		targets[j].lat_deg = t[j].lat;
		targets[j].lon_deg = t[j].lon;
		targets[j].strength = 1.0;
		targets[j].active = 1;
	}
}

/* Attempt i: mixed outcomes, seeing logged or not, out of time order. */
static void
attempt_make(int i, struct site_attempt *a)
{
	static const enum site_outcome oc[] = {SITE_OUTCOME_RANGED,
	    SITE_OUTCOME_RANGED, SITE_OUTCOME_NO_RETURNS, SITE_OUTCOME_WEATHER};
	int j = (int)(urand() * NT);

	memset(a, 0, sizeof *a);
	snprintf(a->target, sizeof a->target, "%s", targets[j].id);
	/* 2026-09-01 plus up to a year, in a shuffled order */
	a->start_mjd = 61284.0 + floor(urand() * 365.0 * 48.0) / 48.0 +
	    i * 1e-4;
	a->end_mjd = a->start_mjd + 600.0 / 86400.0;
	a->outcome = oc[i % 4];
	a->shots = 2000 + (long)(urand() * 9000.0);
	a->returns = a->outcome == SITE_OUTCOME_RANGED ?
	    1 + (long)(urand() * 200.0) : 0;
	a->normal_points = a->returns > 0 ? (long)(urand() * 3.0) : 0;
	if (a->normal_points > a->returns)
		a->normal_points = a->returns;
	a->seeing_arcsec = i % 3 == 0 ? NAN : 0.8 + urand() * 2.0;
	snprintf(a->operator_name, sizeof a->operator_name, "op-test");
	assert_int_equal(derive_attempt(&station, &targets[j], NULL, a),
	    ERRCODE_OK);
}

static void
np_make(int i, struct site_normal_point *p)
{
	memset(p, 0, sizeof *p);
	snprintf(p->target, sizeof p->target, "%s", targets[i % NT].id);
	snprintf(p->station_code, sizeof p->station_code, "%s", station.code);
	p->epoch_mjd = 60900.0 + i * 1.37;
	p->tof_s = 2.5;
	p->photons = 30;
	p->rms_ps = 50.0;
	p->synodic_deg = fmod(i * 47.3, 360.0);
	p->mean_elong_deg = p->synodic_deg;
	p->target_el_deg = 40.0;
	p->sun_el_target_deg = -5.0;
}

static int
cmp_id(const void *pa, const void *pb)
{
	const struct site_attempt *a = pa, *b = pb;

	return (a->id > b->id) - (a->id < b->id);
}

static int
cmp_np_id(const void *pa, const void *pb)
{
	const struct site_normal_point *a = pa, *b = pb;

	return (a->id > b->id) - (a->id < b->id);
}

/* A walk of the log: the ids seen, in order; stops with
   ERRCODE_TOO_LARGE after stop_after records (0: never). */
struct walk {
	long ids[NA + NNP + 8];
	size_t n, stop_after;
};

static enum errcode
walk_attempt(void *ctx, const struct site_attempt *a)
{
	struct walk *w = ctx;

	w->ids[w->n++] = a->id;
	return w->stop_after > 0 && w->n == w->stop_after ?
	    ERRCODE_TOO_LARGE : ERRCODE_OK;
}

static enum errcode
walk_np(void *ctx, const struct site_normal_point *p)
{
	struct walk *w = ctx;

	w->ids[w->n++] = p->id;
	return ERRCODE_OK;
}

/* store_attempts_each and store_nps_each hand over the rows of the
   lists, in their order, and stop at the walker's first error. */
static void
expect_walks(struct store *s, const struct site_attempt *att, size_t na,
    const struct site_normal_point *nps, size_t nnp)
{
	struct store_query all;
	struct walk w;
	char err[256];

	store_query_init(&all);
	memset(&w, 0, sizeof w);
	assert_int_equal(store_attempts_each(s, &all, walk_attempt, &w, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(w.n, na);
	for (size_t i = 0; i < na; i++)
		assert_int_equal(w.ids[i], att[i].id);
	memset(&w, 0, sizeof w);
	assert_int_equal(store_nps_each(s, &all, walk_np, &w, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(w.n, nnp);
	for (size_t i = 0; i < nnp; i++)
		assert_int_equal(w.ids[i], nps[i].id);
	if (na > 2) {
		memset(&w, 0, sizeof w);
		w.stop_after = 2;
		assert_int_equal(store_attempts_each(s, &all, walk_attempt, &w,
		    err, sizeof err), ERRCODE_TOO_LARGE);
		assert_int_equal(w.n, 2);
	}
}

/*
 * The statistics of the records as listed, built in row order (the rule
 * of core/logstats.h), must equal got field by field, bit for bit.
 */
static void
expect_records(struct store *s, const struct logstats *got)
{
	struct site_attempt *att = NULL;
	struct site_normal_point *nps = NULL;
	struct store_query all;
	struct site_station st;
	struct logstats want;
	size_t na = 0, nnp = 0;
	char err[256];

	store_query_init(&all);
	assert_int_equal(store_station_get(s, &st, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(store_attempts_list(s, &all, &att, &na, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_nps_list(s, &all, &nps, &nnp, err, sizeof err),
	    ERRCODE_OK);
	expect_walks(s, att, na, nps, nnp);
	if (na > 0)	/* qsort wants a non-null base even for 0 items */
		qsort(att, na, sizeof att[0], cmp_id);
	if (nnp > 0)
		qsort(nps, nnp, sizeof nps[0], cmp_np_id);
	assert_int_equal(logstats_build(&want, &st, got->nbins, att, na, nps,
	    nnp), ERRCODE_OK);
	assert_true(logstats_current(got, &st, got->nbins));
	assert_int_equal(got->n, want.n);
	for (size_t i = 0; i < want.n; i++) {
		const struct logstats_entry *w = &want.e[i];
		const struct logstats_entry *g = logstats_find(got, w->id);

		assert_non_null(g);
		assert_int_equal(g->attempts, w->attempts);
		assert_int_equal(g->nps, w->nps);
		assert_int_equal(g->y.used, w->y.used);
		assert_int_equal(g->y.dark_returns, w->y.dark_returns);
		assert_int_equal(g->y.lit_returns, w->y.lit_returns);
		assert_true(g->y.dark_exposure == w->y.dark_exposure);
		assert_true(g->y.lit_exposure == w->y.lit_exposure);
		assert_memory_equal(g->counts, w->counts, sizeof w->counts);
		assert_memory_equal(&g->ph_np, &w->ph_np, sizeof w->ph_np);
		assert_memory_equal(&g->ph_att, &w->ph_att, sizeof w->ph_att);
		assert_int_equal(g->ret_nps, w->ret_nps);
		assert_int_equal(g->ret_returns, w->ret_returns);
	}
	assert_int_equal(want.e[0].attempts, (long)na);
	assert_int_equal(want.e[0].nps, (long)nnp);
	logstats_free(&want);
	mem_free(att);
	mem_free(nps);
}

/* The statistics as the planner reads them: current (not stale). */
static void
expect_current(struct store *s)
{
	struct store_settings set;
	struct site_station st;
	struct logstats ls;
	char err[256];
	int stale = -1;

	assert_int_equal(store_station_get(s, &st, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(store_settings_get(s, &set, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(store_logstats_get(s, &st, set.coverage_bins, &ls,
	    &stale, err, sizeof err), ERRCODE_OK);
	assert_int_equal(stale, 0);
	expect_records(s, &ls);
	logstats_free(&ls);
}

/* M = ridge I + sum w f f^T summed directly (value.h's definition)
   against value_phase_from_moments, for K = 1..VALUE_K_MAX. */
static void
test_moments_definition(void **state)
{
	double d[50], w[50];
	struct value_moments m;

	(void)state;
	memset(&m, 0, sizeof m);
	for (int i = 0; i < 50; i++) {
		d[i] = urand() * 2.0 * ERFA_DPI;
		w[i] = 1.0 + floor(urand() * 3.0);
		value_moments_add(&m, d[i], w[i]);
	}
	for (int k = 1; k <= VALUE_K_MAX; k++) {
		struct value_phase p;
		int dim = 2 * k + 1;
		double mm[VALUE_PDIM_MAX * VALUE_PDIM_MAX], f[VALUE_PDIM_MAX];

		memset(mm, 0, sizeof mm);
		for (int r = 0; r < dim; r++)
			mm[r * dim + r] = 0.7;
		for (int i = 0; i < 50; i++) {
			value_phase_features(d[i], k, f);
			for (int r = 0; r < dim; r++)
				for (int c = 0; c < dim; c++)
					mm[r * dim + c] += w[i] * f[r] * f[c];
		}
		assert_int_equal(value_phase_from_moments(&p, k, 0.7, &m),
		    ERRCODE_OK);
		/* M M^-1 = I (the inverse of the directly summed M) */
		for (int r = 0; r < dim; r++)
			for (int c = 0; c < dim; c++) {
				double sum = 0.0;

				for (int x = 0; x < dim; x++)
					sum += mm[r * dim + x] *
					    p.minv[x * dim + c];
				check_near(sum, r == c ? 1.0 : 0.0, 1e-10, "",
				    "M (direct) x M^-1 (moments)");
			}
	}
}

/* A database with the station and targets; its path in path. */
static struct store *
db_make(const char *name, char *path, size_t len)
{
	struct store *s = NULL;
	char err[256];

	snprintf(path, len, "%s/%s", fixture_dir, name);
	assert_int_equal(store_open(path, STORE_OPEN_CREATE, &s, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_station_put(s, &station, err, sizeof err),
	    ERRCODE_OK);
	for (int j = 0; j < NT; j++)
		assert_int_equal(store_target_add(s, &targets[j], err,
		    sizeof err), ERRCODE_OK);
	return s;
}

/* Adds one by one, then a bulk transaction (as an import), then a
   rolled-back one, then coverage_bins and the station's tau and seeing
   changed: the stored statistics equal the records' after each. */
/* store_attempt_add, its sentence shown on failure. */
static void
add_attempt(struct store *s, struct site_attempt *a)
{
	char err[256] = "";
	enum errcode rc = store_attempt_add(s, a, err, sizeof err);

	if (rc != ERRCODE_OK)
		fail_msg("%s", err);
}

static void
test_store_current(void **state)
{
	struct store *s;
	struct site_attempt a;
	struct site_normal_point p;
	char path[512], err[256];
	int i;

	(void)state;
	s = db_make("current.db", path, sizeof path);
	expect_current(s);
	for (i = 0; i < NA / 3; i++) {
		attempt_make(i, &a);
		add_attempt(s, &a);
	}
	for (int k = 0; k < NNP / 2; k++) {
		np_make(k, &p);
		assert_int_equal(store_np_add(s, &p, NULL, err, sizeof err),
		    ERRCODE_OK);
	}
	expect_current(s);
	/* bulk: one transaction, the statistics written once at commit */
	assert_int_equal(store_begin(s, err, sizeof err), ERRCODE_OK);
	for (; i < NA; i++) {
		attempt_make(i, &a);
		add_attempt(s, &a);
	}
	for (int k = NNP / 2; k < NNP; k++) {
		np_make(k, &p);
		assert_int_equal(store_np_add(s, &p, NULL, err, sizeof err),
		    ERRCODE_OK);
	}
	assert_int_equal(store_commit(s, err, sizeof err), ERRCODE_OK);
	expect_current(s);
	/* a rolled-back transaction leaves them as they were */
	assert_int_equal(store_begin(s, err, sizeof err), ERRCODE_OK);
	attempt_make(NA, &a);
	add_attempt(s, &a);
	store_rollback(s);
	expect_current(s);
	/* the bins and the exposures follow the settings and the station */
	assert_int_equal(store_setting_set(s, "coverage_bins", "30", err,
	    sizeof err), ERRCODE_OK);
	expect_current(s);
	station.zenith_tau = 0.2;
	station.seeing_arcsec = 1.1;
	assert_int_equal(store_station_put(s, &station, err, sizeof err),
	    ERRCODE_OK);
	expect_current(s);
	/* the link budget's default seeing when the station has none */
	station.seeing_arcsec = NAN;
	assert_int_equal(store_station_put(s, &station, err, sizeof err),
	    ERRCODE_OK);
	expect_current(s);
	fixture_station(&station);
	store_close(s);
}

/* Records written past the store (another program on the file): the
   statistics are stale, the reader computes them from the records, and
   the next writer rebuilds them. */
static void
test_store_stale(void **state)
{
	struct store *s;
	struct site_attempt a;
	struct site_station st;
	struct logstats ls;
	sqlite3 *raw;
	char path[512], err[256];
	int stale = -1, rebuilt = -1;

	(void)state;
	s = db_make("stale.db", path, sizeof path);
	for (int i = 0; i < 20; i++) {
		attempt_make(i, &a);
		add_attempt(s, &a);
	}
	store_close(s);
	/* one attempt's normal points changed and one deleted, by SQL */
	assert_int_equal(sqlite3_open(path, &raw), SQLITE_OK);
	assert_int_equal(sqlite3_exec(raw, "UPDATE attempts SET "
	    "normal_points = returns WHERE id = (SELECT min(id) FROM attempts "
	    "WHERE returns > 0 AND returns <= 3); DELETE FROM attempts WHERE "
	    "id = 5", NULL, NULL, NULL), SQLITE_OK);
	sqlite3_close(raw);

	assert_int_equal(store_open(path, STORE_OPEN_READONLY, &s, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_station_get(s, &st, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(store_logstats_get(s, &st, 12, &ls, &stale, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(stale, 1);
	expect_records(s, &ls);	/* computed from the records: right */
	logstats_free(&ls);
	store_close(s);

	assert_int_equal(store_open(path, STORE_OPEN_NO_MIGRATE, &s, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_logstats_sync(s, &rebuilt, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(rebuilt, 1);
	expect_current(s);
	assert_int_equal(store_logstats_sync(s, &rebuilt, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(rebuilt, 0);
	store_close(s);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_moments_definition),
		cmocka_unit_test(test_store_current),
		cmocka_unit_test(test_store_stale),
	};

	site_make();
	return cmocka_run_group_tests(tests, fixture_dir_setup,
	    fixture_dir_teardown);
}
