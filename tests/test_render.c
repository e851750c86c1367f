/* SPDX-License-Identifier: BSD-3-Clause */
/* test_render.c: ephemeris and phase JSON carry the documented fields,
   text tables render, text is wrapped and escaped, and every allocation
   failure is reported cleanly. */
#include <string.h>

#include <erfam.h>
#include <jansson.h>

#include "check.h"
#include "fixture.h"
#include "formats/render_json.h"
#include "formats/render_ephem.h"
#include "formats/render_phases.h"
#include "formats/render_cov.h"
#include "formats/render_plan.h"
#include "formats/render_text.h"
#include "core/tzone.h"

/* An invented station and two invented targets (test data only), and e
   showing them at g (the rest of e zero). */
static void
make_ephem(struct geom_instant *g, struct render_target_row rows[2],
    struct render_ephem *e)
{
	struct geom_site site;
	struct geom_eop eop = {0.1234, 0.0, 0.0};
	struct geom_target t;
	double u1, u2;

	assert_int_equal(geom_site_init(&site, 41.25 * ERFA_DD2R,
	    -105.5 * ERFA_DD2R, 2200.0, NULL), ERRCODE_OK);
	assert_int_equal(tscale_parse_utc("2027-03-01T04:00:00Z", &u1, &u2,
	    NULL, 0), ERRCODE_OK);
	assert_int_equal(geom_instant_at(&site, &eop, u1, u2, GEOM_PREC_FULL,
	    g), ERRCODE_OK);
	assert_int_equal(geom_target_from_selen(12.5 * ERFA_DD2R,
	    -20.0 * ERFA_DD2R, 0.0, &t), ERRCODE_OK);
	rows[0].id = "T-ALPHA";
	geom_target_view(g, &t, &rows[0].view);
	assert_int_equal(geom_target_from_selen(-3.0 * ERFA_DD2R,
	    31.0 * ERFA_DD2R, -1500.0, &t), ERRCODE_OK);
	rows[1].id = "T-BETA";
	geom_target_view(g, &t, &rows[1].view);
	memset(e, 0, sizeof *e);
	e->g = g;
	e->targets = rows;
	e->ntargets = 2;
}

static void
want_number(json_t *o, const char *key)
{
	json_t *v = json_object_get(o, key);

	if (v == NULL || !json_is_number(v))
		print_error("field '%s' missing or not a number\n", key);
	assert_true(v != NULL && json_is_number(v));
}

static json_t *
want_object(json_t *o, const char *key)
{
	json_t *v = json_object_get(o, key);

	if (v == NULL || !json_is_object(v))
		print_error("field '%s' missing or not an object\n", key);
	assert_true(v != NULL && json_is_object(v));
	return v;
}

/* Every field of the ephemeris JSON contract (README, "JSON contract"). */
static void
test_render_ephem_json_has_every_field(void **state)
{
	static const char *moon_keys[] = {"az_deg", "el_deg",
	    "el_apparent_deg", "ha_deg", "ra_deg", "dec_deg", "range_km",
	    "geocentric_range_km", "phase_angle_deg", "illuminated_fraction",
	    "elongation_deg", "synodic_angle_deg", "mean_elongation_deg"};
	static const char *target_keys[] = {"az_deg", "el_deg", "range_km",
	    "round_trip_s", "offset_ra_arcsec", "offset_dec_arcsec",
	    "sun_elevation_deg", "earth_elevation_deg"};
	struct geom_instant g;
	struct render_target_row rows[2];
	struct render_ephem e;
	struct mbuf b;
	json_t *root, *o, *arr;
	json_error_t jerr;

	(void)state;
	make_ephem(&g, rows, &e);
	e.dut1_source = "option";
	mbuf_init(&b);
	assert_int_equal(render_ephem_json(&e, &b), ERRCODE_OK);
	root = json_loads(b.data, 0, &jerr);
	if (root == NULL)
		print_error("JSON does not parse: %s (line %d)\n", jerr.text,
		    jerr.line);
	assert_non_null(root);

	assert_true(json_is_string(json_object_get(root, "utc")));
	assert_string_equal(json_string_value(json_object_get(root, "utc")),
	    "2027-03-01T04:00:00Z");
	want_number(root, "tt_jd");
	want_number(root, "dut1_s");
	check_near(json_number_value(json_object_get(root, "dut1_s")), 0.1234,
	    1e-9, "s", "dut1_s echoes the given DUT1");
	/* tt_jd = UTC JD + 69.184 s in 2027 (TAI-UTC 37 s, IERS Bulletin C;
	   TT-TAI 32.184 s by definition), rounded to 1e-8 d in the JSON */
	check_near(json_number_value(json_object_get(root, "tt_jd")),
	    2461465.5 + 1.0 / 6.0 + 69.184 / 86400.0, 1e-8, "d", "tt_jd");

	o = want_object(root, "station");
	want_number(o, "lat_deg");
	want_number(o, "lon_deg");
	want_number(o, "height_m");
	check_near(json_number_value(json_object_get(o, "lat_deg")), 41.25,
	    1e-9, "deg", "station lat echoed");
	check_near(json_number_value(json_object_get(o, "lon_deg")), -105.5,
	    1e-9, "deg", "station lon echoed");

	o = want_object(root, "moon");
	for (size_t i = 0; i < sizeof moon_keys / sizeof moon_keys[0]; i++)
		want_number(o, moon_keys[i]);
	check_near(json_number_value(json_object_get(o, "el_deg")),
	    g.moon.el * ERFA_DR2D, 1e-6, "deg", "moon el_deg matches core");

	o = want_object(root, "sun");
	want_number(o, "az_deg");
	want_number(o, "el_deg");
	want_number(o, "separation_deg");

	o = want_object(root, "libration");
	want_number(want_object(o, "geocentric"), "lon_deg");
	want_number(want_object(o, "geocentric"), "lat_deg");
	want_number(want_object(o, "topocentric"), "lon_deg");
	want_number(want_object(o, "topocentric"), "lat_deg");

	o = want_object(root, "subsolar");
	want_number(o, "lon_deg");
	want_number(o, "lat_deg");
	want_number(o, "colongitude_deg");

	arr = json_object_get(root, "targets");
	assert_true(json_is_array(arr));
	assert_int_equal(json_array_size(arr), 2);
	for (size_t j = 0; j < 2; j++) {
		json_t *t = json_array_get(arr, j);

		assert_true(json_is_object(t));
		assert_string_equal(json_string_value(json_object_get(t, "id")),
		    rows[j].id);
		for (size_t i = 0;
		    i < sizeof target_keys / sizeof target_keys[0]; i++)
			want_number(t, target_keys[i]);
		assert_true(json_is_boolean(json_object_get(t, "sunlit")));
	}
	json_decref(root);
	mbuf_free(&b);
}

static void
test_render_phases_json_parses(void **state)
{
	struct geom_phase_event ev[8];
	struct render_phases p;
	struct tscale_instant a, z;
	size_t n;
	struct mbuf b;
	json_t *root, *arr;

	(void)state;
	fixture_instant("2027-01-01T00:00:00Z", &a);
	fixture_instant("2027-02-01T00:00:00Z", &z);
	assert_int_equal(geom_phases_find(a.tt1, a.tt2, z.tt1, z.tt2, ev, 8,
	    &n), ERRCODE_OK);
	/* a 31-day month holds 4 or 5 principal phases (mean spacing
	   29.53 / 4 = 7.38 d, common practice) */
	assert_true(n >= 4 && n <= 5);
	render_phases_init(&p, a.utc1, a.utc2, z.utc1, z.utc2, ev, n);
	mbuf_init(&b);
	assert_int_equal(render_phases_json(&p, &b), ERRCODE_OK);
	root = json_loads(b.data, 0, NULL);
	assert_non_null(root);
	assert_string_equal(json_string_value(json_object_get(root, "from")),
	    "2027-01-01T00:00:00Z");
	arr = json_object_get(root, "phases");
	assert_true(json_is_array(arr));
	assert_int_equal(json_array_size(arr), n);
	for (size_t i = 0; i < n; i++) {
		json_t *o = json_array_get(arr, i);
		const char *k = json_string_value(json_object_get(o, "kind"));
		const char *u = json_string_value(json_object_get(o, "utc"));
		double u1, u2;

		assert_non_null(k);
		assert_non_null(u);
		assert_string_equal(k, geom_phase_name(ev[i].kind));
		assert_int_equal(tscale_parse_utc(u, &u1, &u2, NULL, 0),
		    ERRCODE_OK);
	}
	json_decref(root);
	mbuf_free(&b);
}

static void
test_render_text_tables(void **state)
{
	static struct tzone utc;
	struct geom_instant g;
	struct render_target_row rows[2];
	struct render_ephem e;
	struct mbuf b;

	(void)state;
	make_ephem(&g, rows, &e);
	tzone_utc(&utc);
	e.time_zone = &utc;
	mbuf_init(&b);
	assert_int_equal(render_ephem_text(&e, &b), ERRCODE_OK);
	assert_non_null(strstr(b.data, "2027-03-01T04:00:00Z"));
	assert_non_null(strstr(b.data, "T-ALPHA"));
	assert_non_null(strstr(b.data, "T-BETA"));
	assert_non_null(strstr(b.data, "colongitude"));
	mbuf_free(&b);
}

/*
 * Make the 1st, 2nd, ... allocation fail in turn until the renderer gets
 * through: every failing run must return ERRCODE_NOMEM (never crash or
 * leak: the sanitizer build checks leaks), and a successful run must give
 * the same bytes as without faults.
 */
static void
run_under_faults(enum errcode (*fn)(const void *, struct mbuf *),
    const void *arg)
{
	struct mbuf ref, b;
	long n;
	int failures = 0;

	mbuf_init(&ref);
	assert_int_equal(fn(arg, &ref), ERRCODE_OK);
	for (n = 1; n < 10000; n++) {
		enum errcode rc;

		mbuf_init(&b);
		(void)mem_fail_after(n);
		rc = fn(arg, &b);
		(void)mem_fail_after(0);
		if (rc == ERRCODE_OK) {
			assert_string_equal(b.data, ref.data);
			mbuf_free(&b);
			break;
		}
		assert_int_equal(rc, ERRCODE_NOMEM);
		failures++;
		mbuf_free(&b);
	}
	assert_true(n < 10000);
	assert_true(failures > 0);	/* the fault switch did reach it */
	mbuf_free(&ref);
}

static enum errcode
ephem_json(const void *arg, struct mbuf *b)
{
	return render_ephem_json(arg, b);
}

static enum errcode
phases_json(const void *arg, struct mbuf *b)
{
	return render_phases_json(arg, b);
}

static enum errcode
ephem_text(const void *arg, struct mbuf *b)
{
	return render_ephem_text(arg, b);
}

static void
test_render_allocation_failures(void **state)
{
	struct geom_instant g;
	struct render_target_row rows[2];
	struct render_ephem e;
	struct render_phases p;
	struct geom_phase_event ev[2];

	(void)state;
	make_ephem(&g, rows, &e);
	run_under_faults(ephem_json, &e);
	run_under_faults(ephem_text, &e);
	ev[0].kind = GEOM_PHASE_NEW;
	ev[0].tt1 = 2461400.5;
	ev[0].tt2 = 0.25;
	ev[1].kind = GEOM_PHASE_FULL;
	ev[1].tt1 = 2461400.5;
	ev[1].tt2 = 15.0;
	render_phases_init(&p, 2461400.5, 0.0, 2461400.5, 20.0, ev, 2);
	run_under_faults(phases_json, &p);
}

/* The escapes of XML 1.0 (section 2.4, the five predefined entities; a
   control character other than tab, LF and CR is not a Char, 2.2) and of
   an iCalendar TEXT value (RFC 5545, 3.3.11; a content line is folded at
   75 octets, 3.1); words wrapped at 79 columns. */
static void
test_render_text_escape_and_wrap(void **state)
{
	struct mbuf b;

	(void)state;
	mbuf_init(&b);
	render_cov_xml_escape(&b, "a<b & \"c\" 'd'\x01\t\n\r\xc3\xa9");
	assert_string_equal(b.data,
	    "a&lt;b &amp; &quot;c&quot; &apos;d&apos;?\t\n\r\xc3\xa9");
	mbuf_free(&b);
	mbuf_init(&b);
	render_ics_prop_text(&b, "SUMMARY", "a;b,c\\d\ne\rf\x01");
	assert_string_equal(b.data, "SUMMARY:a\\;b\\,c\\\\d\\nef\x01\r\n");
	mbuf_free(&b);
	mbuf_init(&b);
	render_text_wrap(&b, "Why: ", NULL, "one  two");
	assert_string_equal(b.data, "Why: one two\n");
	mbuf_free(&b);
	mbuf_init(&b);
	/* 9 words of 9 letters: 5 + 7 x 10 - 1 = 74 columns, the eighth
	   would end at 84. */
	render_text_wrap(&b, "Lead ", "  ", "aaaaaaaaa bbbbbbbbb ccccccccc "
	    "ddddddddd eeeeeeeee fffffffff ggggggggg hhhhhhhhh iiiiiiiii");
	assert_string_equal(b.data, "Lead aaaaaaaaa bbbbbbbbb ccccccccc "
	    "ddddddddd eeeeeeeee fffffffff ggggggggg\n  hhhhhhhhh iiiiiiiii\n");
	mbuf_free(&b);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_render_ephem_json_has_every_field),
		cmocka_unit_test(test_render_phases_json_parses),
		cmocka_unit_test(test_render_text_tables),
		cmocka_unit_test(test_render_text_escape_and_wrap),
		cmocka_unit_test(test_render_allocation_failures),
	};

	render_json_setup();	/* jansson's allocations go through mem_alloc */
	return cmocka_run_group_tests_name("render", tests, NULL, NULL);
}
