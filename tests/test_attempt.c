/* SPDX-License-Identifier: BSD-3-Clause */
/* test_attempt.c: the one validation of an attempt (core/attempt.c),
   table-driven: each row one rule kept or broken and the member named.
   The limits are the rules of attempt.h; the shots limit is arithmetic
   on them (20 Hz x 600 s x 1.05 + 10 = 12610 shots). */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "check.h"
#include "core/attempt.h"

/* A valid attempt: 10 minutes on HERON, ranged. */
static struct site_attempt
base(void)
{
	struct site_attempt a;

	memset(&a, 0, sizeof a);
	snprintf(a.target, sizeof a.target, "HERON");
	a.start_mjd = 61000.0;			/* 2025-11-10 */
	a.end_mjd = 61000.0 + 600.0 / 86400.0;	/* 10 minutes */
	a.shots = 12000;
	a.returns = 40;
	a.normal_points = 2;
	a.outcome = SITE_OUTCOME_RANGED;
	snprintf(a.operator_name, sizeof a.operator_name, "op-dune");
	a.seeing_arcsec = NAN;
	a.target_el_deg = a.sun_el_target_deg = NAN;
	a.synodic_deg = a.mean_elong_deg = NAN;
	return a;
}

enum edit {
	E_NONE, E_TARGET, E_START, E_END, E_SHOTS, E_RETURNS, E_NP, E_OUTCOME,
	E_OPERATOR, E_NOTES, E_SEEING
};

static const struct {
	const char *what;
	enum edit e;
	double x;		/* the number set (E_START, E_END: MJD) */
	const char *text;	/* the text set (target, operator, notes) */
	int outcome;		/* with E_OUTCOME, or -1: unchanged */
	const char *field;	/* member named, NULL: accepted */
} cases[] = {
	{ "valid", E_NONE, 0, NULL, -1, NULL },
	{ "empty target", E_TARGET, 0, "", -1, "target" },
	{ "start 1858", E_START, -100.0, NULL, -1, "start_utc" },
	{ "start 1959-12-31", E_START, 36933.5, NULL, -1, "start_utc" },
	{ "start 1960-01-01", E_START, 36934.0, NULL, -1, NULL },
	{ "start 2126", E_START, 97200.0, NULL, -1, "start_utc" },
	{ "start NaN", E_START, NAN, NULL, -1, "start_utc" },
	{ "end before start", E_END, 60999.9, NULL, -1, "end_utc" },
	{ "end equals start", E_END, 61000.0, NULL, -1, "end_utc" },
	{ "end after a day", E_END, 61001.01, NULL, -1, "end_utc" },
	{ "end infinite", E_END, INFINITY, NULL, -1, "end_utc" },
	{ "shots negative", E_SHOTS, -1, NULL, -1, "shots" },
	{ "shots at the limit", E_SHOTS, 12610, NULL, -1, NULL },
	{ "shots over the limit", E_SHOTS, 12611, NULL, -1, "shots" },
	{ "1e12 shots", E_SHOTS, 1e12, NULL, -1, "shots" },
	{ "returns negative", E_RETURNS, -1, NULL, -1, "returns" },
	{ "returns 10 per shot", E_RETURNS, 120000, NULL, -1, NULL },
	{ "1e6 returns", E_RETURNS, 1e6, NULL, -1, "returns" },
	{ "np negative", E_NP, -1, NULL, -1, "normal_points" },
	{ "np = returns", E_NP, 40, NULL, -1, NULL },
	{ "np > returns", E_NP, 41, NULL, -1, "normal_points" },
	{ "no_returns with 500", E_OUTCOME, 500, NULL,
	  SITE_OUTCOME_NO_RETURNS, "outcome" },
	{ "no_returns with noise", E_OUTCOME, 3, NULL,
	  SITE_OUTCOME_NO_RETURNS, NULL },
	{ "ranged, no returns", E_OUTCOME, 0, NULL, SITE_OUTCOME_RANGED,
	  "outcome" },
	{ "weather, no returns", E_OUTCOME, 0, NULL, SITE_OUTCOME_WEATHER,
	  NULL },
	{ "outcome out of range", E_OUTCOME, 0, NULL, SITE_OUTCOME__COUNT,
	  "outcome" },
	{ "operator tab", E_OPERATOR, 0, "a\tb", -1, "operator" },
	{ "operator newline", E_OPERATOR, 0, "a\nb", -1, "operator" },
	{ "operator DEL", E_OPERATOR, 0, "a\x7f" "b", -1, "operator" },
	{ "operator C1 NEL", E_OPERATOR, 0, "a\xc2\x85" "b", -1, "operator" },
	{ "operator RLO", E_OPERATOR, 0, "a\xe2\x80\xae" "b", -1,
	  "operator" },
	{ "operator FSI", E_OPERATOR, 0, "a\xe2\x81\xa8" "b", -1,
	  "operator" },
	{ "operator not UTF-8", E_OPERATOR, 0, "a\xff" "b", -1, "operator" },
	{ "operator accented", E_OPERATOR, 0, "Ren\xc3\xa9" "e", -1, NULL },
	{ "notes newline", E_NOTES, 0, "line 1\nline 2", -1, NULL },
	{ "notes CR", E_NOTES, 0, "line 1\rline 2", -1, "notes" },
	{ "notes overlong 0xC0", E_NOTES, 0, "\xc0\xaf", -1, "notes" },
	{ "notes LRE", E_NOTES, 0, "\xe2\x80\xaa", -1, "notes" },
	{ "seeing 0.001", E_SEEING, 0.001, NULL, -1, "seeing_arcsec" },
	{ "seeing 0.01", E_SEEING, 0.01, NULL, -1, NULL },
	{ "seeing 60", E_SEEING, 60, NULL, -1, NULL },
	{ "seeing 61", E_SEEING, 61, NULL, -1, "seeing_arcsec" },
	{ "seeing inf", E_SEEING, INFINITY, NULL, -1, "seeing_arcsec" },
};

static void
apply(struct site_attempt *a, size_t i)
{
	switch (cases[i].e) {
	case E_NONE:
		break;
	case E_TARGET:
		snprintf(a->target, sizeof a->target, "%s", cases[i].text);
		break;
	case E_START:	/* the same 10 minutes from another start */
		a->start_mjd = cases[i].x;
		a->end_mjd = cases[i].x + 600.0 / 86400.0;
		break;
	case E_END:
		a->end_mjd = cases[i].x;
		break;
	case E_SHOTS:
		a->shots = (long)cases[i].x;
		break;
	case E_RETURNS:
		a->returns = (long)cases[i].x;
		break;
	case E_NP:
		a->normal_points = (long)cases[i].x;
		break;
	case E_OUTCOME:
		a->outcome = (enum site_outcome)cases[i].outcome;
		a->returns = (long)cases[i].x;
		a->normal_points = 0;
		break;
	case E_OPERATOR:
		snprintf(a->operator_name, sizeof a->operator_name, "%s",
		    cases[i].text);
		break;
	case E_NOTES:
		snprintf(a->notes, sizeof a->notes, "%s", cases[i].text);
		break;
	case E_SEEING:
		a->seeing_arcsec = cases[i].x;
		break;
	}
}

static void
test_attempt_rules_table(void **state)
{
	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		struct site_attempt a = base();
		const char *field = "unset";
		char err[300] = "";
		enum errcode rc;

		apply(&a, i);
		rc = attempt_check(&a, 20.0, &field, err, sizeof err);
		if (cases[i].field == NULL) {
			if (rc != ERRCODE_OK)
				fail_msg("%s: refused: %s", cases[i].what, err);
			assert_null(field);
		} else {
			if ((rc != ERRCODE_BAD_ARG && rc != ERRCODE_BAD_TIME) ||
			    field == NULL ||
			    strcmp(field, cases[i].field) != 0)
				fail_msg("%s: rc %d field %s (%s), want %s",
				    cases[i].what, rc, field ? field : "NULL",
				    err, cases[i].field);
			/* The sentence names the member first. */
			assert_int_equal(strncmp(err, cases[i].field,
			    strlen(cases[i].field)), 0);
		}
	}
}

static void
test_attempt_rate_unknown(void **state)
{
	struct site_attempt a = base();

	(void)state;
	/* Without a station rate the shots rule cannot apply ... */
	a.shots = 1000000;
	assert_int_equal(attempt_check(&a, NAN, NULL, NULL, 0), ERRCODE_OK);
	assert_int_equal(attempt_check(&a, 0.0, NULL, NULL, 0), ERRCODE_OK);
	/* ... and with one, 1e6 shots in 600 s at 20 Hz are too many. */
	assert_int_equal(attempt_check(&a, 20.0, NULL, NULL, 0),
	    ERRCODE_BAD_ARG);
}

static void
test_attempt_suspect(void **state)
{
	struct site_attempt a = base();
	char warn[300];

	(void)state;
	a.target_el_deg = 35.0;
	assert_int_equal(attempt_suspect(&a, 20.0, warn, sizeof warn), 0);
	assert_string_equal(warn, "");
	/* 50 degrees below the horizon: local time typed with a Z. */
	a.target_el_deg = -50.0;
	assert_int_equal(attempt_suspect(&a, 20.0, warn, sizeof warn),
	    ATTEMPT_SUSPECT_BELOW_HORIZON);
	assert_non_null(strstr(warn, "below the horizon"));
	/* 1000 shots in 600 s at 20 Hz is 1/12 of the rate: low. */
	a.target_el_deg = 35.0;
	a.shots = 1000;
	assert_int_equal(attempt_suspect(&a, 20.0, warn, sizeof warn),
	    ATTEMPT_SUSPECT_LOW_RATE);
	/* 1200 is exactly a tenth: not flagged. */
	a.shots = 1200;
	assert_int_equal(attempt_suspect(&a, 20.0, NULL, 0), 0);
	/* A weather abort fires little and is not suspicious for it. */
	a.shots = 10;
	a.returns = 0;
	a.normal_points = 0;
	a.outcome = SITE_OUTCOME_WEATHER;
	assert_int_equal(attempt_suspect(&a, 20.0, NULL, 0), 0);
	/* Both at once, one sentence with both reasons. */
	a.outcome = SITE_OUTCOME_NO_RETURNS;
	a.target_el_deg = -5.0;
	assert_int_equal(attempt_suspect(&a, 20.0, warn, sizeof warn),
	    ATTEMPT_SUSPECT_ALL);
	assert_non_null(strstr(warn, "; fewer than a tenth"));
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_attempt_rules_table),
		cmocka_unit_test(test_attempt_rate_unknown),
		cmocka_unit_test(test_attempt_suspect),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
