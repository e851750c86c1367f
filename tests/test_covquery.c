/* SPDX-License-Identifier: BSD-3-Clause */
/* test_covquery.c: the coverage audit from a real SQLite database to
   rendered bytes, with its filters and its errors. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <jansson.h>

#include "check.h"
#include "fixture.h"
#include "query/covquery.h"
#include "core/mem.h"
#include "formats/render_json.h"
#include "store/store.h"
#include "core/tscale.h"

/* An invented station and two invented targets. */
static struct store *
open_db(void)
{
	struct site_station st;
	struct site_target t;
	struct store *db = NULL;
	char err[256];

	assert_int_equal(store_open(":memory:", STORE_OPEN_CREATE, &db, err,
	    sizeof err), ERRCODE_OK);
	memset(&st, 0, sizeof st);
	snprintf(st.name, sizeof st.name, "Test Mesa (invented)");
	snprintf(st.code, sizeof st.code, "9901");
	st.lat_deg = 35.5;
	st.lon_deg = -110.25;
	st.height_m = 2100.0;
	snprintf(st.time_zone, sizeof st.time_zone, "America/Phoenix");
	st.min_el_deg = 15.0;
	st.max_sun_el_deg = -12.0;
	st.min_sun_sep_deg = 20.0;
	st.pressure_hpa = 790.0;
	st.temperature_c = 10.0;
	st.humidity = 0.3;
	st.wavelength_nm = 532.0;
	st.zenith_tau = 0.15;
	st.fire_rate_hz = 20.0;
	assert_int_equal(store_station_put(db, &st, err, sizeof err),
	    ERRCODE_OK);
	for (int i = 0; i < 2; i++) {
		memset(&t, 0, sizeof t);
		snprintf(t.id, sizeof t.id, i ? "south" : "north");
		snprintf(t.name, sizeof t.name, i ? "South array" : "North array");
		t.lat_deg = i ? -20.0 : 25.0;
		t.lon_deg = i ? 15.0 : -10.0;
		t.strength = 1.0;
		t.active = 1;
		assert_int_equal(store_target_add(db, &t, err, sizeof err),
		    ERRCODE_OK);
	}
	return db;
}

static void
add_np(struct store *db, const char *target, const char *station,
    double mjd)
{
	struct site_normal_point np;
	char err[256];
	int ins;

	memset(&np, 0, sizeof np);
	snprintf(np.target, sizeof np.target, "%s", target);
	snprintf(np.station_code, sizeof np.station_code, "%s", station);
	np.epoch_mjd = mjd;
	np.tof_s = 2.5;
	np.photons = 10;
	np.rms_ps = 50.0;
	assert_int_equal(coverage_axis_value(COVERAGE_AXIS_SYNODIC, NULL, mjd,
	    &np.synodic_deg), ERRCODE_OK);
	np.mean_elong_deg = np.synodic_deg;
	np.target_el_deg = 40.0;
	np.sun_el_target_deg = 10.0;
	assert_int_equal(store_np_add(db, &np, &ins, err, sizeof err),
	    ERRCODE_OK);
}

/* Pooled counts of a JSON report. */
static json_t *
run_json(struct store *db, struct covquery_params *p)
{
	struct mbuf b;
	json_error_t jerr;
	json_t *root;
	char err[256] = "";

	mbuf_init(&b);
	assert_int_equal(covquery_run(db, p, COVQUERY_JSON, &b, err,
	    sizeof err), ERRCODE_OK);
	root = json_loads(b.data, 0, &jerr);
	assert_non_null(root);
	mbuf_free(&b);
	return root;
}

static long
pooled_total(json_t *root)
{
	return (long)json_integer_value(json_object_get(json_object_get(
	    json_object_get(root, "pooled"), "metrics"), "total"));
}

static void
test_covquery_filters_through_the_store(void **state)
{
	struct store *db = open_db();
	struct covquery_params p;
	json_t *root;

	(void)state;
	/* 2027-01-01 is MJD 61406 (see test_coverage.c). Points every
	   1.3 days over 60 days at the own station, and five from another. */
	for (int i = 0; i < 46; i++)
		add_np(db, i % 2 ? "south" : "north", "9901", 61406.0 + 1.3 * i);
	for (int i = 0; i < 5; i++)
		add_np(db, "north", "4402", 61406.0 + 0.5 + i);

	covquery_params_init(&p);
	p.horizon_days = 0;
	root = run_json(db, &p);
	assert_int_equal(pooled_total(root), 51);
	assert_string_equal(json_string_value(json_object_get(root,
	    "station_name")), "Test Mesa (invented)");
	json_decref(root);

	assert_int_equal(covquery_param_set(&p, "station", "4402", NULL, 0),
	    ERRCODE_OK);
	root = run_json(db, &p);
	assert_int_equal(pooled_total(root), 5);
	json_decref(root);

	assert_int_equal(covquery_param_set(&p, "station", "9901", NULL, 0),
	    ERRCODE_OK);
	assert_int_equal(covquery_param_set(&p, "target", "south", NULL, 0),
	    ERRCODE_OK);
	assert_int_equal(covquery_param_set(&p, "since",
	    "2027-01-10T00:00:00Z", NULL, 0), ERRCODE_OK);
	assert_int_equal(covquery_param_set(&p, "until",
	    "2027-01-20T00:00:00Z", NULL, 0), ERRCODE_OK);
	root = run_json(db, &p);
	/* south points at 61406 + 1.3 i, i odd, in [61415, 61425): i = 7, 9,
	   11, 13 (hand-counted: 61415.1, 61417.7, 61420.3, 61422.9). */
	assert_int_equal(pooled_total(root), 4);
	json_decref(root);

	/* Another axis with the station: hour angle. */
	covquery_params_init(&p);
	p.horizon_days = 0;
	assert_int_equal(covquery_param_set(&p, "axis", "hour_angle", NULL, 0),
	    ERRCODE_OK);
	assert_int_equal(covquery_param_set(&p, "bins", "24", NULL, 0),
	    ERRCODE_OK);
	root = run_json(db, &p);
	assert_int_equal(pooled_total(root), 51);
	assert_string_equal(json_string_value(json_object_get(root, "axis")),
	    "hour_angle");
	json_decref(root);
	store_close(db);
}

static void
test_covquery_bad_parameters(void **state)
{
	struct store *db = open_db();
	struct covquery_params p;
	struct mbuf b;
	char err[256];

	(void)state;
	covquery_params_init(&p);
	assert_int_equal(covquery_param_set(&p, "bins", "3", err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "bins"));
	assert_int_equal(covquery_param_set(&p, "bins", "-12", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_int_equal(covquery_param_set(&p, "min_count", "0", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "min_count"));
	assert_int_equal(covquery_param_set(&p, "axis", "phase", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_int_equal(covquery_param_set(&p, "since", "yesterday", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "since"));
	assert_int_equal(covquery_param_set(&p, "target", "a b", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_int_equal(covquery_param_set(&p, "horizon", "400", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_int_equal(covquery_param_set(&p, "colour", "red", err,
	    sizeof err), ERRCODE_NOT_FOUND);
	assert_int_equal(covquery_param_set(&p, "theme", "grey", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "theme"));
	assert_int_equal(covquery_param_set(&p, "theme", "dark", err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(p.theme, RENDER_COV_DARK);
	assert_int_equal(covquery_param_set(&p, "theme", "light", err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(p.theme, RENDER_COV_LIGHT);

	/* An unknown target is named. */
	assert_int_equal(covquery_param_set(&p, "target", "west", err,
	    sizeof err), ERRCODE_OK);
	mbuf_init(&b);
	assert_int_equal(covquery_run(db, &p, COVQUERY_TEXT, &b, err,
	    sizeof err), ERRCODE_NOT_FOUND);
	assert_non_null(strstr(err, "'west'"));
	mbuf_free(&b);
	store_close(db);
}

/* Every allocation failing in turn: a clean ERRCODE_NOMEM, or success
   once past the last one. */
static void
test_covquery_allocation_failure(void **state)
{
	struct store *db = open_db();
	struct covquery_params p;
	int ok = 0;

	(void)state;
	for (int i = 0; i < 6; i++)
		add_np(db, "north", "9901", 61406.0 + 3.1 * i);
	covquery_params_init(&p);
	p.horizon_days = 3;		/* the planner's allocations too */
	p.now_mjd = 61440.0;
	for (long n = 1; n < 5000 && !ok; n++) {
		struct mbuf b;
		enum errcode rc;

		mbuf_init(&b);
		mem_fail_after(n);
		rc = covquery_run(db, &p, COVQUERY_JSON, &b, NULL, 0);
		mem_fail_after(0);
		assert_true(rc == ERRCODE_OK || rc == ERRCODE_NOMEM ||
		    rc == ERRCODE_DB);
		ok = rc == ERRCODE_OK;
		mbuf_free(&b);
	}
	assert_true(ok);
	store_close(db);
}

/* The fill dates from the real window planner land in the bins below the
   threshold, inside a window of the station, within the horizon. */
static void
test_covquery_fill_dates_from_the_planner(void **state)
{
	struct store *db = open_db();
	struct covquery_params p;
	json_t *root, *fill, *bins;
	char err[256];
	size_t ndates = 0;

	(void)state;
	/* Points only between first quarter and full (synodic 60..170 deg)
	   in January 2027, so new moon and the waning half are gaps. */
	for (double mjd = 61406.0; mjd < 61436.0; mjd += 0.25) {
		double syn;

		assert_int_equal(coverage_axis_value(COVERAGE_AXIS_SYNODIC, NULL,
		    mjd, &syn), ERRCODE_OK);
		if (syn > 60.0 && syn < 170.0)
			add_np(db, "north", "9901", mjd);
	}
	covquery_params_init(&p);
	assert_int_equal(covquery_param_set(&p, "horizon", "30", err,
	    sizeof err), ERRCODE_OK);
	p.now_mjd = 61440.0;		/* 2027-02-04T00:00Z, pinned */
	root = run_json(db, &p);
	fill = json_object_get(root, "fill");
	assert_true(json_is_object(fill));
	assert_true(json_integer_value(json_object_get(fill,
	    "windows_examined")) > 10);
	bins = json_object_get(fill, "bins");
	assert_true(json_array_size(bins) >= 6);
	for (size_t i = 0; i < json_array_size(bins); i++) {
		json_t *b = json_array_get(bins, i), *d;
		long bin = (long)json_integer_value(json_object_get(b, "bin"));
		size_t k;

		/* Only bins below the threshold (min_count 1: empty). */
		assert_int_equal(json_integer_value(json_object_get(b, "count")),
		    0);
		json_array_foreach(json_object_get(b, "dates"), k, d) {
			double mjd, deg, ws, we;

			mjd = fixture_mjd(json_string_value(json_object_get(d,
			    "in_bin_start_utc")));
			assert_int_equal(coverage_axis_value(
			    COVERAGE_AXIS_SYNODIC, NULL, mjd, &deg), ERRCODE_OK);
			assert_int_equal(coverage_bin_of(deg, 12), bin);
			assert_true(mjd >= 61440.0 && mjd < 61470.0);
			ws = fixture_mjd(json_string_value(json_object_get(d,
			    "window_start_utc")));
			we = fixture_mjd(json_string_value(json_object_get(d,
			    "window_end_utc")));
			/* Inside the window (times printed to the second). */
			assert_true(mjd >= ws - 1.0 / 86400 &&
			    mjd <= we + 1.0 / 86400);
			assert_true(json_real_value(json_object_get(d,
			    "score")) >= 0.0);
			ndates++;
		}
	}
	/* A night-only station gets windows in most gap bins within 30
	   days; bins next to new moon may have none (Sun too close). */
	assert_true(ndates >= 6);
	json_decref(root);
	store_close(db);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_covquery_filters_through_the_store),
		cmocka_unit_test(test_covquery_bad_parameters),
		cmocka_unit_test(test_covquery_allocation_failure),
		cmocka_unit_test(test_covquery_fill_dates_from_the_planner),
	};

	render_json_setup();
	return cmocka_run_group_tests_name("covquery", tests, NULL, NULL);
}
