/* SPDX-License-Identifier: BSD-3-Clause */
/* test_planquery.c: the night plan query on the sample site's database:
   parameters, the plan's constraints in its JSON, several targets on a
   long night, settings, the other formats. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include <jansson.h>

#include "check.h"
#include "fixture.h"
#include "core/text.h"
#include "formats/render_json.h"
#include "query/planquery.h"
#include "store/store.h"

static int
setup(void **state)
{
	render_json_setup();
	return fixture_sample_setup(state);
}

/* Run the query with name/value pairs; the JSON parsed. */
static json_t *
plan_json(struct store *db, const char *const *kv, char *text, size_t len)
{
	struct planquery_params p;
	struct mbuf out;
	char err[300];
	json_t *j;

	planquery_params_init(&p, QPARAM_QUERY);
	for (; kv[0] != NULL; kv += 2)
		assert_int_equal(planquery_param_set(&p, kv[0], kv[1], err,
		    sizeof err), ERRCODE_OK);
	mbuf_init(&out);
	assert_int_equal(planquery_run(db, &p, PLANQUERY_JSON, &out, err,
	    sizeof err), ERRCODE_OK);
	if (text != NULL)
		snprintf(text, len, "%s", out.data);
	j = json_loads(out.data, 0, NULL);
	assert_non_null(j);
	mbuf_free(&out);
	return j;
}

/* The constraints, read back from the JSON (default settings). */
static size_t
check_runs(json_t *root)
{
	json_t *runs = json_object_get(root, "runs"), *r;
	json_t *set = json_object_get(root, "settings");
	double sw = json_number_value(json_object_get(set, "plan_switch_s"));
	double lo = json_number_value(json_object_get(set, "plan_run_min_s"));
	double hi = json_number_value(json_object_get(set, "plan_run_max_s"));
	double prev_end = -1, sum = 0;
	const char *prev = NULL, *ids[64];
	size_t i, nids = 0;

	json_array_foreach(runs, i, r) {
		const char *t = json_string_value(json_object_get(r, "target"));
		double a = fixture_mjd(json_string_value(json_object_get(r,
		    "start")));
		double b = fixture_mjd(json_string_value(json_object_get(r, "end")));
		double len = (b - a) * 86400.0;
		size_t k;

		assert_true(len >= lo - 1.0 && len <= hi + 1.0);
		if (prev != NULL) {
			assert_true((a - prev_end) * 86400.0 >=
			    (strcmp(prev, t) != 0 ? sw : 60.0) - 1.0);
		}
		for (k = 0; k < nids && strcmp(ids[k], t) != 0; k++)
			;
		if (k == nids && nids < 64)
			ids[nids++] = t;
		sum += json_number_value(json_object_get(r, "value"));
		assert_true(json_array_size(json_object_get(r, "reasons")) >= 3);
		prev = t;
		prev_end = b;
	}
	/* the total is the runs' sum (to the 6 decimals written) */
	check_near(json_number_value(json_object_get(root, "total_value")),
	    sum, 1e-5 * (1.0 + (double)json_array_size(runs)), "",
	    "total_value");
	return nids;
}

/* A long night on the sample site (2027-03-20, windows 19:45-03:46
   local): at least three targets with the default settings, best not
   below greedy. */
static void
test_planquery_sample_night(void **state)
{
	static const char *const best[] = {"from", "2027-03-20T00:00:00Z",
	    "to", "2027-03-20T14:00:00Z", NULL};
	static const char *const greedy[] = {"from", "2027-03-20T00:00:00Z",
	    "to", "2027-03-20T14:00:00Z", "method", "greedy", NULL};
	struct store *db;
	char err[300];
	json_t *b, *g;
	size_t nb;

	(void)state;
	assert_int_equal(store_open(fixture_db, STORE_OPEN_READONLY, &db, err,
	    sizeof err), ERRCODE_OK);
	b = plan_json(db, best, NULL, 0);
	g = plan_json(db, greedy, NULL, 0);
	assert_string_equal(json_string_value(json_object_get(b, "method")),
	    "best");
	assert_string_equal(json_string_value(json_object_get(g, "method")),
	    "greedy");
	assert_string_equal(json_string_value(json_object_get(b, "from")),
	    "2027-03-20T00:00:00Z");
	nb = check_runs(b);
	(void)check_runs(g);
	printf("sample night: %zu runs on %zu targets, value %.4f, greedy "
	    "%.4f\n", json_array_size(json_object_get(b, "runs")), nb,
	    json_number_value(json_object_get(b, "total_value")),
	    json_number_value(json_object_get(g, "total_value")));
	assert_true(nb >= 3);
	assert_true(json_number_value(json_object_get(b, "total_value")) >=
	    json_number_value(json_object_get(g, "total_value")));
	json_decref(b);
	json_decref(g);
	store_close(db);
}

/* Without from/to: from now to the next local noon (America/Los_Angeles:
   2027-03-20T03:00Z is 20:00 PDT, noon is 19:00Z). */
static void
test_planquery_default_span_and_params(void **state)
{
	static const char *const at[] = {"at", "2027-03-20T03:00:00Z", NULL};
	struct planquery_params p;
	struct store *db;
	char err[300], t1[65536], t2[65536];
	json_t *j;
	double to;

	(void)state;
	assert_int_equal(store_open(fixture_db, STORE_OPEN_READONLY, &db, err,
	    sizeof err), ERRCODE_OK);
	j = plan_json(db, at, t1, sizeof t1);
	assert_string_equal(json_string_value(json_object_get(j, "from")),
	    "2027-03-20T03:00:00Z");
	/* want 19:00Z: noon PDT (UTC-7; the zone's rule, tzdata) */
	assert_string_equal(json_string_value(json_object_get(j, "to")),
	    "2027-03-20T19:00:00Z");
	json_decref(j);
	/* the same instant and store: the same bytes */
	json_decref(plan_json(db, at, t2, sizeof t2));
	assert_string_equal(t1, t2);
	/* noon is found across a change of the clock (2027-03-14 02:00 PST
	   -> PDT): from 2027-03-13T20:00Z (12:00 PST) the next noon is
	   12:00 PDT on the 14th, 19:00Z (tzdata) */
	assert_int_equal(planquery_noon_after(fixture_mjd("2027-03-13T20:00:00Z"),
	    "America/Los_Angeles", &to), ERRCODE_OK);
	check_near(to, fixture_mjd("2027-03-14T19:00:00Z"), 1e-6, "d",
	    "noon after DST");
	planquery_params_init(&p, QPARAM_QUERY);
	assert_int_equal(planquery_param_set(&p, "method", "fast", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "method"));
	assert_string_equal(p.fault, "method");
	assert_int_equal(planquery_param_set(&p, "from", "2027-13-01", err,
	    sizeof err), ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "from"));
	assert_int_equal(planquery_param_set(&p, "target", "HERON", err,
	    sizeof err), ERRCODE_NOT_FOUND);
	assert_int_equal(planquery_param_set(&p, "from",
	    "2027-03-20T00:00:00Z", err, sizeof err), ERRCODE_OK);
	{
		struct mbuf out;

		mbuf_init(&out);
		assert_int_equal(planquery_run(db, &p, PLANQUERY_JSON, &out, err,
		    sizeof err), ERRCODE_BAD_ARG);
		assert_non_null(strstr(err, "to"));
		assert_int_equal(planquery_param_set(&p, "to",
		    "2027-03-30T00:00:00Z", err, sizeof err), ERRCODE_OK);
		assert_int_equal(planquery_run(db, &p, PLANQUERY_JSON, &out, err,
		    sizeof err), ERRCODE_BAD_ARG);
		assert_non_null(strstr(err, "4 days"));
		assert_string_equal(p.fault, "to");
		/* the command line's spelling of the same parameters */
		planquery_params_init(&p, QPARAM_OPTION);
		assert_int_equal(planquery_param_set(&p, "method", "fast", err,
		    sizeof err), ERRCODE_BAD_ARG);
		assert_string_equal(err, "--method: 'fast' is not best or "
		    "greedy");
		assert_int_equal(planquery_param_set(&p, "from",
		    "2027-03-20T00:00:00Z", err, sizeof err), ERRCODE_OK);
		assert_int_equal(planquery_param_set(&p, "to",
		    "2027-03-20T00:00:30Z", err, sizeof err), ERRCODE_OK);
		assert_int_equal(planquery_run(db, &p, PLANQUERY_JSON, &out, err,
		    sizeof err), ERRCODE_BAD_ARG);
		assert_string_equal(err, "--to: the span is shorter than one "
		    "60 s slot");
		assert_string_equal(p.fault, "to");
		mbuf_free(&out);
	}
	store_close(db);
}

/* Both weights 0: each run's value is its expected normal points. */
static void
test_planquery_weights_zero(void **state)
{
	static const char *const kv[] = {"from", "2027-03-20T00:00:00Z", "to",
	    "2027-03-20T14:00:00Z", NULL};
	struct store *db;
	char err[300];
	json_t *j, *r;
	size_t i;

	(void)state;
	assert_int_equal(store_open(fixture_db, 0, &db, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(store_setting_set(db, "value_phase_weight", "0", err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_setting_set(db, "value_orientation_weight", "0",
	    err, sizeof err), ERRCODE_OK);
	assert_int_equal(store_setting_set(db, "plan_run_min_s", "50", err,
	    sizeof err), ERRCODE_BAD_ARG);
	j = plan_json(db, kv, NULL, 0);
	json_array_foreach(json_object_get(j, "runs"), i, r)
		/* want: expected_normal_points (value.h, both weights 0) */
		check_near(json_number_value(json_object_get(r, "value")),
		    json_number_value(json_object_get(r,
		    "expected_normal_points")), 1e-4, "", "value = n");
	assert_true(json_array_size(json_object_get(j, "runs")) > 0);
	json_decref(j);
	assert_int_equal(store_setting_set(db, "value_phase_weight", "1", err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_setting_set(db, "value_orientation_weight", "1",
	    err, sizeof err), ERRCODE_OK);
	store_close(db);
}

/* The other formats render the same plan. */
static void
test_planquery_formats(void **state)
{
	struct planquery_params p;
	struct store *db;
	struct mbuf out;
	char err[300];

	(void)state;
	assert_int_equal(store_open(fixture_db, STORE_OPEN_READONLY, &db, err,
	    sizeof err), ERRCODE_OK);
	planquery_params_init(&p, QPARAM_QUERY);
	assert_int_equal(planquery_param_set(&p, "at", "2027-03-20T04:00:00Z",
	    err, sizeof err), ERRCODE_OK);
	mbuf_init(&out);
	assert_int_equal(planquery_run(db, &p, PLANQUERY_TEXT, &out, err,
	    sizeof err), ERRCODE_OK);
	assert_non_null(strstr(out.data, "Night plan (best)"));
	for (char *l = out.data; *l;) {	/* 80 columns */
		size_t n = strcspn(l, "\n");

		assert_true(n <= 80);
		l += n + (l[n] != '\0');
	}
	mbuf_free(&out);
	mbuf_init(&out);
	assert_int_equal(planquery_run(db, &p, PLANQUERY_ICS, &out, err,
	    sizeof err), ERRCODE_OK);
	assert_non_null(strstr(out.data, "BEGIN:VEVENT\r\n"));
	mbuf_free(&out);
	mbuf_init(&out);
	assert_int_equal(planquery_run(db, &p, PLANQUERY_CSV, &out, err,
	    sizeof err), ERRCODE_OK);
	assert_true(strncmp(out.data, "target,start,end,", 17) == 0);
	mbuf_free(&out);
	mbuf_init(&out);
	assert_int_equal(planquery_run(db, &p, PLANQUERY_SVG, &out, err,
	    sizeof err), ERRCODE_OK);
	assert_non_null(strstr(out.data, "id=\"plan-now\""));
	assert_non_null(strstr(out.data, "class=\"moon\""));
	assert_non_null(strstr(out.data, "class=\"minel\""));
	assert_non_null(strstr(out.data, "class=\"run\""));
	mbuf_free(&out);
	store_close(db);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_planquery_sample_night),
		cmocka_unit_test(test_planquery_default_span_and_params),
		cmocka_unit_test(test_planquery_weights_zero),
		cmocka_unit_test(test_planquery_formats),
	};

	return cmocka_run_group_tests(tests, setup, fixture_dir_teardown);
}
