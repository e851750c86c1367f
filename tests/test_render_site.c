/* SPDX-License-Identifier: BSD-3-Clause */
/* test_render_site.c: the log, targets, station and blackouts as JSON,
   CSV and text; parsed back with jansson; allocation failures. */
#include <math.h>
#include <string.h>

#include <jansson.h>

#include "check.h"
#include "core/mem.h"
#include "formats/render_json.h"
#include "core/text.h"
#include "core/tzone.h"
#include "formats/render_site.h"

static void
attempt(struct site_attempt *a)
{
	memset(a, 0, sizeof *a);
	a->id = 7;
	strcpy(a->target, "NORTH");
	a->start_mjd = 61465.0 + 4.0 / 24;	/* 2027-03-01T04:00:00Z */
	a->end_mjd = a->start_mjd + 1200.0 / 86400;
	a->shots = 12000;
	a->returns = 340;
	a->normal_points = 3;
	a->outcome = SITE_OUTCOME_NO_RETURNS;
	strcpy(a->operator_name, " leading blank");
	a->seeing_arcsec = NAN;
	strcpy(a->notes, "say \"hi\", then\nstop");
	a->synodic_deg = 91.25;
	a->mean_elong_deg = 88.5;
	a->target_el_deg = 45.125;
	a->sun_el_target_deg = -2.5;
}

static void
test_render_site_attempt_json_fields(void **state)
{
	struct site_attempt a;
	struct mbuf b;
	json_t *root, *o;
	json_error_t jerr;

	(void)state;
	attempt(&a);
	mbuf_init(&b);
	assert_int_equal(render_site_attempts_json(&a, 1, &b), ERRCODE_OK);
	root = json_loads(b.data, 0, &jerr);
	assert_non_null(root);
	o = json_array_get(json_object_get(root, "attempts"), 0);
	assert_non_null(o);
	assert_int_equal(json_integer_value(json_object_get(o, "id")), 7);
	assert_string_equal(json_string_value(json_object_get(o, "start_utc")),
	    "2027-03-01T04:00:00.000Z");
	assert_string_equal(json_string_value(json_object_get(o, "end_utc")),
	    "2027-03-01T04:20:00.000Z");
	check_near(json_real_value(json_object_get(o, "duration_s")), 1200.0,
	    1e-6, "s", "duration");
	assert_string_equal(json_string_value(json_object_get(o, "outcome")),
	    "no_returns");
	assert_true(json_is_null(json_object_get(o, "seeing_arcsec")));
	assert_string_equal(json_string_value(json_object_get(o, "notes")),
	    a.notes);
	check_near(json_real_value(json_object_get(o, "synodic_deg")), 91.25,
	    0, "deg", "synodic");
	json_decref(root);
	mbuf_free(&b);
}

static void
test_render_site_csv_is_rfc4180(void **state)
{
	struct site_attempt a[2];
	struct mbuf b;

	(void)state;
	attempt(&a[0]);
	attempt(&a[1]);
	a[1].seeing_arcsec = 1.1;
	strcpy(a[1].operator_name, "op");
	strcpy(a[1].notes, "");
	mbuf_init(&b);
	assert_int_equal(render_site_attempts_csv(a, 2, 0, &b), ERRCODE_OK);
	/* RFC 4180 section 2: CRLF record ends; fields with quotes, commas
	   or line breaks (and, ours, edge blanks) quoted, quotes doubled. */
	assert_string_equal(b.data,
	    RENDER_SITE_ATTEMPT_CSV_HEADER "\r\n"
	    "NORTH,2027-03-01T04:00:00.000Z,2027-03-01T04:20:00.000Z,12000,"
	    "340,3,no_returns,\" leading blank\",,\"say \"\"hi\"\", then\n"
	    "stop\"\r\n"
	    "NORTH,2027-03-01T04:00:00.000Z,2027-03-01T04:20:00.000Z,12000,"
	    "340,3,no_returns,op,1.1,\r\n");
	mbuf_free(&b);
	mbuf_init(&b);
	assert_int_equal(render_site_attempts_csv(a, 1, 1, &b), ERRCODE_OK);
	assert_non_null(strstr(b.data, "id,target,"));
	assert_non_null(strstr(b.data, ",91.250000,88.500000,45.125000,"
	    "-2.500000\r\n"));
	mbuf_free(&b);
}

static void
test_render_site_tables_parse(void **state)
{
	struct site_target t;
	struct site_station st;
	struct site_blackout bo;
	struct mbuf b;
	json_t *root;

	(void)state;
	memset(&t, 0, sizeof t);
	strcpy(t.id, "NORTH");
	strcpy(t.name, "Invented array");
	t.lat_deg = 12.5;
	t.strength = 1;
	t.active = 1;
	memset(&st, 0, sizeof st);
	strcpy(st.name, "Invented station");
	strcpy(st.code, "INV");
	strcpy(st.time_zone, "UTC");
	memset(&bo, 0, sizeof bo);
	bo.id = 1;
	bo.start_mjd = 61465.0;
	bo.end_mjd = 61465.5;
	mbuf_init(&b);
	assert_int_equal(render_site_targets_json(&t, 1, &b), ERRCODE_OK);
	root = json_loads(b.data, 0, NULL);
	assert_true(json_is_true(json_object_get(json_array_get(
	    json_object_get(root, "targets"), 0), "active")));
	json_decref(root);
	mbuf_free(&b);
	assert_int_equal(render_site_station_json(&st, &b), ERRCODE_OK);
	root = json_loads(b.data, 0, NULL);
	assert_string_equal(json_string_value(json_object_get(root, "code")),
	    "INV");
	json_decref(root);
	mbuf_free(&b);
	assert_int_equal(render_site_blackouts_json(&bo, 1, &b), ERRCODE_OK);
	assert_non_null(strstr(b.data, "2027-03-01T12:00:00.000Z"));
	mbuf_free(&b);
	assert_int_equal(render_site_targets_text(&t, 1, &b), ERRCODE_OK);
	assert_non_null(strstr(b.data, "NORTH"));
	mbuf_free(&b);
}

/*
 * Every allocation made while rendering fails once in turn: each run
 * either reports ERRCODE_NOMEM or produces exactly the bytes of a run
 * without failure (never a damaged document).
 */
/* Number of code points of a UTF-8 line (what a terminal shows, for the
   characters used here). */
static size_t
columns(const char *s, size_t n)
{
	size_t c = 0;

	for (size_t i = 0; i < n; i++)
		c += ((unsigned char)s[i] & 0xC0) != 0x80;
	return c;
}

/* The log table fits 80 columns whatever the operator and notes hold:
   long text is cut with an ellipsis, a line break in the notes is a
   space, a multi-byte name is not cut inside a character; the count
   says when a limit left rows out. */
static void
test_render_site_attempts_text_fits(void **state)
{
	static struct tzone zone;
	struct site_attempt a[2];
	struct mbuf b;
	const char *line, *end;

	(void)state;
	attempt(&a[0]);
	attempt(&a[1]);
	strcpy(a[1].operator_name, "\xc3\x89milie Ferrand-Long");	/* É */
	strcpy(a[1].notes, "cloud at 30 deg, then clear; long note\nend");
	strcpy(a[1].target, "A-VERY-LONG-TARGET-ID");
	mbuf_init(&b);
	assert_int_equal(render_site_attempts_text(a, 2, 40, NULL, &b),
	    ERRCODE_OK);
	for (line = b.data; *line; line = end + 1) {
		end = strchr(line, '\n');
		assert_non_null(end);
		assert_true(columns(line, (size_t)(end - line)) <= 80);
	}
	assert_non_null(strstr(b.data, "2027-03-01 04:00 UTC"));
	assert_non_null(strstr(b.data, "say \"hi\", t\xe2\x80\xa6"));
	assert_non_null(strstr(b.data, "\xc3\x89milie F\xe2\x80\xa6"));
	assert_non_null(strstr(b.data, "A-VERY-L\xe2\x80\xa6"));
	assert_null(strstr(b.data, "then\nstop"));
	assert_non_null(strstr(b.data, "2 attempts shown, the newest of 40\n"));
	assert_true(text_utf8_valid(b.data, b.len));
	mbuf_free(&b);
	/* A zone of one offset, UTC-7 named MST, from 1970 to 2100: 04:00
	   UTC is 21:00 MST the day before (by hand). */
	memset(&zone, 0, sizeof zone);
	strcpy(zone.name, "Test/Mountain");
	zone.first_s = 0;
	zone.last_s = 4102444800LL;
	zone.n = 1;
	zone.span[0].offset_s = -7 * 3600;
	strcpy(zone.span[0].abbr, "MST");
	mbuf_init(&b);
	assert_int_equal(render_site_attempts_text(a, 1, 1, &zone, &b),
	    ERRCODE_OK);
	assert_non_null(strstr(b.data, "start (local)"));
	assert_non_null(strstr(b.data, "2027-02-28 21:00 MST"));
	assert_non_null(strstr(b.data, "\n1 attempt\n"));
	mbuf_free(&b);
}

static void
test_render_site_allocation_failure(void **state)
{
	struct site_attempt a[3];
	int failed = 0;

	(void)state;
	struct mbuf ref;

	attempt(&a[0]);
	a[1] = a[2] = a[0];
	mbuf_init(&ref);
	assert_int_equal(render_site_attempts_json(a, 3, &ref), ERRCODE_OK);
	for (long i = 1; i < 400; i++) {
		struct mbuf b, j;
		enum errcode ej;
		long usedj;

		mbuf_init(&j);
		mem_fail_after(i);
		ej = render_site_attempts_json(a, 3, &j);
		usedj = mem_fail_after(0);
		if (ej == ERRCODE_OK)
			assert_string_equal(j.data, ref.data);
		else
			assert_int_equal(ej, ERRCODE_NOMEM);
		mbuf_free(&j);
		(void)usedj;
		enum errcode e1, e2, e3;
		long used;

		mbuf_init(&b);
		mem_fail_after(i);
		e1 = render_site_attempts_json(a, 3, &b);
		e2 = render_site_attempts_csv(a, 3, 1, &b);
		e3 = render_site_attempts_text(a, 3, 3, NULL, &b);
		used = mem_fail_after(0);
		mbuf_free(&b);
		if (used < i) {
			assert_int_equal(e1 | e2 | e3, ERRCODE_OK);
			break;
		}
		/* The failure came: some renderer reports it. */
		assert_true(e1 == ERRCODE_NOMEM || e2 == ERRCODE_NOMEM ||
		    e3 == ERRCODE_NOMEM);
		failed++;
	}
	assert_true(failed > 3);
	mbuf_free(&ref);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_render_site_attempt_json_fields),
		cmocka_unit_test(test_render_site_csv_is_rfc4180),
		cmocka_unit_test(test_render_site_tables_parse),
		cmocka_unit_test(test_render_site_attempts_text_fits),
		cmocka_unit_test(test_render_site_allocation_failure),
	};

	render_json_setup();
	return cmocka_run_group_tests_name("render_site", tests, NULL, NULL);
}
