/* SPDX-License-Identifier: BSD-3-Clause */
/* test_tscale.c: ISO 8601 UTC parsing and formatting, leap seconds, TT, UT1. */
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "check.h"
#include "core/tscale.h"

/* Difference b - a of two UTC quasi-JDs in seconds (not valid on a day
   holding a leap second, whose quasi-JD day is 86401 s long). */
static double
utc_diff_s(double a1, double a2, double b1, double b2)
{
	return ((b1 - a1) + (b2 - a2)) * ERFA_DAYSEC;
}

/*
 * Texts that must parse, each with the canonical UTC it denotes (formatted
 * back with 6 decimals).  Numbered as the cases of a data table.
 */
static const struct {
	const char *id, *text, *want;
} valid_cases[] = {
	{"tscale-1.1", "2027-03-01T04:00:00Z", "2027-03-01T04:00:00.000000Z"},
	{"tscale-1.2", "2027-03-01T04:00:00.25Z",
	    "2027-03-01T04:00:00.250000Z"},
	{"tscale-1.3", "2027-03-01T04:00:00.123456Z",
	    "2027-03-01T04:00:00.123456Z"},
	{"tscale-1.4", "2027-03-01T04:00:00,5Z",
	    "2027-03-01T04:00:00.500000Z"},
	{"tscale-1.5", "2027-03-01T04:00:00+00:00",
	    "2027-03-01T04:00:00.000000Z"},
	{"tscale-1.6", "2027-03-01T04:00:00-00:00",
	    "2027-03-01T04:00:00.000000Z"},
	/* other offsets are converted to UTC */
	{"tscale-1.7", "2027-03-01T06:00:00+02:00",
	    "2027-03-01T04:00:00.000000Z"},
	{"tscale-1.8", "2027-02-28T22:30:00-05:30",
	    "2027-03-01T04:00:00.000000Z"},
	{"tscale-1.9", "2027-03-01T01:00:00+09:45",
	    "2027-02-28T15:15:00.000000Z"},
	/* offsets move the clock reading across midnight, month and year;
	   across a day holding a leap second the result is still exact
	   (RFC 3339 section 4.2 arithmetic) */
	{"tscale-1.16", "2027-01-01T00:30:00+01:00",
	    "2026-12-31T23:30:00.000000Z"},
	{"tscale-1.17", "2024-02-28T23:30:00-01:00",
	    "2024-02-29T00:30:00.000000Z"},
	{"tscale-1.18", "2017-01-01T00:30:00+01:00",
	    "2016-12-31T23:30:00.000000Z"},
	{"tscale-1.19", "2016-12-31T22:30:00-01:30",
	    "2017-01-01T00:00:00.000000Z"},
	{"tscale-1.20", "2016-12-31T00:30:00+01:00",
	    "2016-12-30T23:30:00.000000Z"},
	{"tscale-1.21", "2016-12-30T23:30:00.25-01:00",
	    "2016-12-31T00:30:00.250000Z"},
	/* rounding to 6 decimals carries into the next day, also out of a
	   leap second */
	{"tscale-1.22", "2027-12-31T23:59:59.9999996Z",
	    "2028-01-01T00:00:00.000000Z"},
	{"tscale-1.23", "2016-12-31T23:59:60.9999996Z",
	    "2017-01-01T00:00:00.000000Z"},
	{"tscale-1.10", "2024-02-29T12:00:00Z", "2024-02-29T12:00:00.000000Z"},
	{"tscale-1.11", "2000-02-29T00:00:00Z", "2000-02-29T00:00:00.000000Z"},
	{"tscale-1.12", "1999-12-31T23:59:59.999Z",
	    "1999-12-31T23:59:59.999000Z"},
	/* the leap second at the end of 2016 (IERS Bulletin C) */
	{"tscale-1.13", "2016-12-31T23:59:60Z", "2016-12-31T23:59:60.000000Z"},
	{"tscale-1.14", "2016-12-31T23:59:60.5Z",
	    "2016-12-31T23:59:60.500000Z"},
	{"tscale-1.15", "1972-06-30T23:59:60Z", "1972-06-30T23:59:60.000000Z"},
};

/* Texts that must be refused with ERRCODE_BAD_TIME. */
static const struct {
	const char *id, *text;
} invalid_cases[] = {
	{"tscale-2.1", "2027-13-01T00:00:00Z"},		/* month 13 */
	{"tscale-2.2", "2027-00-10T00:00:00Z"},		/* month 0 */
	{"tscale-2.3", "2027-01-32T00:00:00Z"},		/* day 32 */
	{"tscale-2.4", "2027-01-00T00:00:00Z"},		/* day 0 */
	{"tscale-2.5", "2027-02-30T00:00:00Z"},		/* Feb 30 */
	{"tscale-2.6", "2027-02-29T00:00:00Z"},		/* not a leap year */
	{"tscale-2.7", "1900-02-29T00:00:00Z"},		/* century rule */
	{"tscale-2.8", "2027-04-31T00:00:00Z"},		/* 30-day month */
	{"tscale-2.9", "2027-03-01T24:00:01Z"},		/* hour 24 */
	{"tscale-2.10", "2027-03-01T24:00:00Z"},	/* strict: no 24:00 */
	{"tscale-2.11", "2027-03-01T23:60:00Z"},	/* minute 60 */
	{"tscale-2.12", "2027-03-01T23:59:61Z"},	/* second 61 */
	{"tscale-2.13", "2027-03-01T12:00:60Z"},	/* 60 s mid-day */
	/* 2017-06-30 held no leap second (IERS Bulletin C) */
	{"tscale-2.14", "2017-06-30T23:59:60Z"},
	{"tscale-2.15", "2016-12-31T23:59:60+01:00"},	/* leap s not in UTC */
	{"tscale-2.16", "2027-03-01T04:00:00"},		/* no offset */
	{"tscale-2.17", "2027-03-01t04:00:00Z"},	/* lowercase t */
	{"tscale-2.18", "2027-03-01T04:00:00z"},	/* lowercase z */
	{"tscale-2.19", "2027-03-01 04:00:00Z"},	/* space separator */
	{"tscale-2.20", "2027-03-01T04:00:00Zjunk"},	/* trailing junk */
	{"tscale-2.21", "2027-03-01T04:00:00Z "},	/* trailing space */
	{"tscale-2.22", " 2027-03-01T04:00:00Z"},	/* leading space */
	{"tscale-2.23", ""},				/* empty */
	{"tscale-2.24", "2027-03-01T04:00Z"},		/* no seconds */
	{"tscale-2.25", "2027-03-01T04Z"},		/* hour only */
	{"tscale-2.26", "2027-03-01"},			/* date only */
	{"tscale-2.27", "2027-03"},			/* month only */
	{"tscale-2.28", "20270301T040000Z"},		/* basic format */
	{"tscale-2.29", "2027-060T04:00:00Z"},		/* ordinal date */
	{"tscale-2.30", "2027-W09-1T04:00:00Z"},	/* week date */
	{"tscale-2.31", "2027-03-01T04:00:00.Z"},	/* empty fraction */
	{"tscale-2.32", "2027-03-01T04:00:00+0200"},	/* offset no colon */
	{"tscale-2.33", "2027-03-01T04:00:00+02"},	/* offset no minutes */
	{"tscale-2.34", "2027-03-01T04:00:00+24:00"},	/* offset hour 24 */
	{"tscale-2.35", "2027-03-01T04:00:00+02:60"},	/* offset minute 60 */
	{"tscale-2.36", "27-03-01T04:00:00Z"},		/* two-digit year */
	{"tscale-2.37", "2027-3-1T4:00:00Z"},		/* missing zeros */
	{"tscale-2.38", "now"},
	{"tscale-2.39", "2027-03-01T04:00:00.123456789012345678901234567Z"},
};

static void
test_tscale_parse_valid_table(void **state)
{
	(void)state;
	for (size_t i = 0; i < sizeof valid_cases / sizeof valid_cases[0];
	    i++) {
		double u1, u2;
		char err[160] = "", out[40];
		enum errcode rc;

		rc = tscale_parse_utc(valid_cases[i].text, &u1, &u2, err,
		    sizeof err);
		if (rc != ERRCODE_OK)
			print_error("%s: '%s' refused: %s\n",
			    valid_cases[i].id, valid_cases[i].text, err);
		assert_int_equal(rc, ERRCODE_OK);
		assert_int_equal(tscale_format_utc(u1, u2, 6, out, sizeof out),
		    ERRCODE_OK);
		if (strcmp(out, valid_cases[i].want) != 0)
			print_error("%s: '%s' gave %s, want %s\n",
			    valid_cases[i].id, valid_cases[i].text, out,
			    valid_cases[i].want);
		assert_string_equal(out, valid_cases[i].want);
	}
}

static void
test_tscale_parse_invalid_table(void **state)
{
	(void)state;
	for (size_t i = 0;
	    i < sizeof invalid_cases / sizeof invalid_cases[0]; i++) {
		double u1 = -1, u2 = -1;
		char err[160] = "";
		enum errcode rc;

		rc = tscale_parse_utc(invalid_cases[i].text, &u1, &u2, err,
		    sizeof err);
		if (rc != ERRCODE_BAD_TIME)
			print_error("%s: '%s' accepted (rc %d)\n",
			    invalid_cases[i].id, invalid_cases[i].text,
			    (int)rc);
		assert_int_equal(rc, ERRCODE_BAD_TIME);
		/* The message quotes the text (a long text is quoted by its
		   first 60 characters). */
		{
			char head[61];

			snprintf(head, sizeof head, "%s",
			    invalid_cases[i].text);
			if (strstr(err, head) == NULL)
				print_error("%s: message '%s' does not quote "
				    "'%s'\n", invalid_cases[i].id, err, head);
			assert_non_null(strstr(err, head));
		}
		assert_non_null(strstr(err, "invalid UTC time '"));
		/* nothing half-written */
		assert_true(u1 == -1 && u2 == -1);
	}
}

static void
test_tscale_parse_null_errbuf_and_null_text(void **state)
{
	double u1, u2;

	(void)state;
	assert_int_equal(tscale_parse_utc("2027-13-01T00:00:00Z", &u1, &u2,
	    NULL, 0), ERRCODE_BAD_TIME);
	assert_int_equal(tscale_parse_utc(NULL, &u1, &u2, NULL, 0),
	    ERRCODE_BAD_TIME);
}

/* The leap second is a real second: 23:59:60 lies 1 s before 00:00:00. */
static void
test_tscale_leap_second_is_one_second(void **state)
{
	double a1, a2, b1, b2, c1, c2;
	struct tscale_instant ta, tb, tc;

	(void)state;
	assert_int_equal(tscale_parse_utc("2016-12-31T23:59:59Z", &a1, &a2,
	    NULL, 0), ERRCODE_OK);
	assert_int_equal(tscale_parse_utc("2016-12-31T23:59:60Z", &b1, &b2,
	    NULL, 0), ERRCODE_OK);
	assert_int_equal(tscale_parse_utc("2017-01-01T00:00:00Z", &c1, &c2,
	    NULL, 0), ERRCODE_OK);
	assert_int_equal(tscale_from_utc(a1, a2, 0.0, &ta), ERRCODE_OK);
	assert_int_equal(tscale_from_utc(b1, b2, 0.0, &tb), ERRCODE_OK);
	assert_int_equal(tscale_from_utc(c1, c2, 0.0, &tc), ERRCODE_OK);
	/* Leap second 2016-12-31 (IERS Bulletin C): 1 s apart on TT. */
	check_near(tscale_tt_diff(ta.tt1, ta.tt2, tb.tt1, tb.tt2), 1.0, 1e-6,
	    "s", "TT from 23:59:59 to 23:59:60");
	check_near(tscale_tt_diff(tb.tt1, tb.tt2, tc.tt1, tc.tt2), 1.0, 1e-6,
	    "s", "TT from 23:59:60 to 00:00:00");
}

static void
test_tscale_format_round_trip(void **state)
{
	static const struct {
		const char *text;
		int ndp;
	} cases[] = {
		{"2027-03-01T04:00:00Z", 0},
		{"1987-07-15T23:59:59Z", 0},
		{"2016-12-31T23:59:60Z", 0},		/* leap second */
		{"2016-12-31T23:59:60.250Z", 3},	/* inside it */
		{"2050-01-01T00:00:00.000001Z", 6},
		{"2099-12-31T12:34:56.789Z", 3},
		/* days ending in a step of TAI-UTC that is not a whole
		   second (ERFA dat.c's table, 1960-1971): eraD2dtf gave
		   .994999 for the first */
		{"1960-12-31T23:59:59.999999Z", 6},
		{"1963-10-31T23:59:59.999999Z", 6},
		{"1971-12-31T23:59:59.999999Z", 6},
		{"1971-12-31T23:59:59.999Z", 3},
		{"1961-12-31T12:00:00.000001Z", 6},
		/* an ordinary hour of a day holding a leap second */
		{"2016-12-31T11:00:00.000Z", 3},
		{"2015-06-30T23:59:60.999Z", 3},
	};

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		double u1, u2;
		char out[40];

		assert_int_equal(tscale_parse_utc(cases[i].text, &u1, &u2,
		    NULL, 0), ERRCODE_OK);
		assert_int_equal(tscale_format_utc(u1, u2, cases[i].ndp, out,
		    sizeof out), ERRCODE_OK);
		assert_string_equal(out, cases[i].text);
	}
}

/* Parse then format gives the text back, on every day from 1960 to the
   end of 1973 (each step of ERFA's TAI-UTC table, whole or not) and on
   the days of the leap seconds of 2015 and 2016, at 0, 3 and 6
   decimals.  The property holds by construction of UTC text. */
static void
test_tscale_round_trip_every_step_day(void **state)
{
	static const char *const clock[] = {
		"00:00:00.000000", "11:00:00.000000", "23:59:59.000000",
		"23:59:59.500000", "23:59:59.999000", "23:59:59.999999",
	};
	int ymd[2][3] = {{1960, 1, 1}, {2015, 6, 25}};
	int ndays[2] = {5114, 560};

	(void)state;
	for (int run = 0; run < 2; run++) {
		double djm0, djm;

		assert_int_equal(eraCal2jd(ymd[run][0], ymd[run][1],
		    ymd[run][2], &djm0, &djm), 0);
		for (int k = 0; k < ndays[run]; k++) {
			int y, m, d;
			double fd;

			assert_int_equal(eraJd2cal(djm0, djm + k, &y, &m, &d,
			    &fd), 0);
			for (size_t c = 0; c < sizeof clock / sizeof clock[0];
			    c++) {
				for (int ndp = 0; ndp <= 6; ndp += 3) {
					char in[40], out[40];
					double u1, u2;
					int len = 19 + (ndp ? ndp + 1 : 0);

					snprintf(in, sizeof in,
					    "%04d-%02d-%02dT%.*sZ", y, m, d,
					    len - 11, clock[c]);
					if (tscale_parse_utc(in, &u1, &u2, NULL,
					    0) != ERRCODE_OK)
						continue; /* a day cut short */
					assert_int_equal(tscale_format_utc(u1,
					    u2, ndp, out, sizeof out),
					    ERRCODE_OK);
					if (strcmp(in, out) != 0)
						fail_msg("%s came back %s", in,
						    out);
				}
			}
		}
	}
}

static void
test_tscale_format_rejects_bad_args(void **state)
{
	char small[8], out[40];

	(void)state;
	assert_int_equal(tscale_format_utc(2451545.0, 0.0, 0, small,
	    sizeof small), ERRCODE_BAD_ARG);
	assert_int_equal(tscale_format_utc(2451545.0, 0.0, 7, out, sizeof out),
	    ERRCODE_BAD_ARG);
	assert_int_equal(tscale_format_utc(2451545.0, 0.0, -1, out,
	    sizeof out), ERRCODE_BAD_ARG);
}

static void
test_tscale_fields(void **state)
{
	double u1, u2, sec;
	int y, mo, d, h, mi;

	(void)state;
	assert_int_equal(tscale_parse_utc("2016-12-31T23:59:60.5Z", &u1, &u2,
	    NULL, 0), ERRCODE_OK);
	assert_int_equal(tscale_utc_fields(u1, u2, &y, &mo, &d, &h, &mi, &sec),
	    ERRCODE_OK);
	assert_int_equal(y, 2016);
	assert_int_equal(mo, 12);
	assert_int_equal(d, 31);
	assert_int_equal(h, 23);
	assert_int_equal(mi, 59);
	check_near(sec, 60.5, 1e-6, "s", "seconds field in a leap second");
}

static void
test_tscale_tai_minus_utc(void **state)
{
	static const struct {
		const char *text;
		double want;	/* s, IERS Bulletin C (see each line) */
	} cases[] = {
		/* 37 s since 2017-01-01, still in 2026: no leap second
		   announced since (IERS Bulletin C) */
		{"2026-06-15T00:00:00Z", 37.0},
		{"2026-12-01T12:00:00Z", 37.0},
		{"2017-01-01T00:00:00Z", 37.0},
		/* 36 s from 2015-07-01 to 2016-12-31 (IERS Bulletin C) */
		{"2016-07-01T00:00:00Z", 36.0},
		{"2016-12-30T23:59:59Z", 36.0},
		/* 10 s when integral leap seconds began on 1972-01-01
		   (IERS Bulletin C, table of TAI-UTC) */
		{"1972-01-01T00:00:00Z", 10.0},
	};

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		double u1, u2, dat;
		struct tscale_instant t;

		assert_int_equal(tscale_parse_utc(cases[i].text, &u1, &u2,
		    NULL, 0), ERRCODE_OK);
		assert_int_equal(tscale_tai_utc(u1, u2, &dat), ERRCODE_OK);
		check_near(dat, cases[i].want, 1e-9, "s", cases[i].text);
		/* and the instant's TAI agrees with it */
		assert_int_equal(tscale_from_utc(u1, u2, 0.0, &t), ERRCODE_OK);
		check_near(utc_diff_s(u1, u2, t.tai1, t.tai2), cases[i].want,
		    1e-5, "s", "TAI - UTC of the instant");
	}
}

static void
test_tscale_tt_minus_tai(void **state)
{
	double u1, u2;
	struct tscale_instant t;

	(void)state;
	assert_int_equal(tscale_parse_utc("2026-03-20T14:00:00Z", &u1, &u2,
	    NULL, 0), ERRCODE_OK);
	assert_int_equal(tscale_from_utc(u1, u2, 0.0, &t), ERRCODE_OK);
	/* TT - TAI = 32.184 s exactly (IAU 1991 Resolution A4; IERS
	   Conventions 2010, ch. 10) */
	check_near(tscale_tt_diff(t.tai1, t.tai2, t.tt1, t.tt2), 32.184, 1e-6,
	    "s", "TT - TAI");
	/* so TT - UTC = 69.184 s in 2026 (37 + 32.184, facts above) */
	check_near(utc_diff_s(u1, u2, t.tt1, t.tt2), 69.184, 1e-5, "s",
	    "TT - UTC");
}

static void
test_tscale_ut1_is_utc_plus_dut1(void **state)
{
	static const double dut1s[] = {-0.8, -0.2173, 0.0, 0.0421, 0.9};
	double u1, u2;

	(void)state;
	assert_int_equal(tscale_parse_utc("2023-05-10T03:21:00Z", &u1, &u2,
	    NULL, 0), ERRCODE_OK);
	for (size_t i = 0; i < sizeof dut1s / sizeof dut1s[0]; i++) {
		struct tscale_instant t;

		assert_int_equal(tscale_from_utc(u1, u2, dut1s[i], &t),
		    ERRCODE_OK);
		/* UT1 = UTC + DUT1 (definition of DUT1, IERS Bulletin A) */
		check_near(utc_diff_s(u1, u2, t.ut11, t.ut12), dut1s[i], 1e-5,
		    "s", "UT1 - UTC");
		check_near(t.dut1, dut1s[i], 0.0, "s", "dut1 kept");
	}
	/* an absurd DUT1 is refused rather than silently used */
	{
		struct tscale_instant t;

		assert_int_equal(tscale_from_utc(u1, u2, 5.0, &t),
		    ERRCODE_BAD_TIME);
	}
}

static void
test_tscale_from_tt_inverts_from_utc(void **state)
{
	static const char *texts[] = {
		"1962-03-04T05:06:07Z", "1999-12-31T23:59:59.5Z",
		"2016-12-31T23:59:60.5Z", "2017-01-01T00:00:00Z",
		"2026-12-01T00:00:00Z", "2088-08-08T08:08:08Z",
	};

	(void)state;
	for (size_t i = 0; i < sizeof texts / sizeof texts[0]; i++) {
		double u1, u2;
		struct tscale_instant a, b;
		char s1[40], s2[40];

		assert_int_equal(tscale_parse_utc(texts[i], &u1, &u2, NULL, 0),
		    ERRCODE_OK);
		assert_int_equal(tscale_from_utc(u1, u2, 0.1, &a), ERRCODE_OK);
		assert_int_equal(tscale_from_tt(a.tt1, a.tt2, 0.1, &b),
		    ERRCODE_OK);
		check_near(tscale_tt_diff(a.tt1, a.tt2, b.tt1, b.tt2), 0.0,
		    1e-6, "s", texts[i]);
		assert_int_equal(tscale_format_utc(a.utc1, a.utc2, 3, s1,
		    sizeof s1), ERRCODE_OK);
		assert_int_equal(tscale_format_utc(b.utc1, b.utc2, 3, s2,
		    sizeof s2), ERRCODE_OK);
		assert_string_equal(s1, s2);
		check_near(b.dut1, 0.1, 0.0, "s", "dut1 carried");
	}
}

static void
test_tscale_dubious_before_1960(void **state)
{
	static const struct {
		const char *text;
		int dubious;
	} cases[] = {
		/* ERFA eraDat: UTC before 1960 is not defined by the
		   leap-second table (ERFA dat.c, note 4) */
		{"1950-01-01T00:00:00Z", 1},
		{"1959-06-15T23:00:00Z", 1},
		{"1975-01-01T00:00:00Z", 0},
		{"2020-01-01T00:00:00Z", 0},
		/* far beyond the table's horizon (ERFA dat.c: more than 5
		   years after its release) */
		{"2100-01-01T00:00:00Z", 1},
	};

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		double u1, u2;
		struct tscale_instant t;

		assert_int_equal(tscale_parse_utc(cases[i].text, &u1, &u2,
		    NULL, 0), ERRCODE_OK);
		assert_int_equal(tscale_from_utc(u1, u2, 0.0, &t), ERRCODE_OK);
		if (t.dubious != cases[i].dubious)
			print_error("%s: dubious %d, want %d\n", cases[i].text,
			    t.dubious, cases[i].dubious);
		assert_int_equal(t.dubious, cases[i].dubious);
	}
}

static void
test_tscale_posix_round_trip(void **state)
{
	double u1, u2, p;
	char out[40];

	(void)state;
	/* 1700000000 s after the POSIX epoch is 2023-11-14T22:13:20Z
	   (common practice: date -u -d @1700000000) */
	assert_int_equal(tscale_from_posix(1700000000.0, &u1, &u2), ERRCODE_OK);
	assert_int_equal(tscale_format_utc(u1, u2, 0, out, sizeof out),
	    ERRCODE_OK);
	assert_string_equal(out, "2023-11-14T22:13:20Z");
	p = tscale_to_posix(u1, u2);
	check_near(p, 1700000000.0, 1e-4, "s", "POSIX round trip");
	assert_int_equal(tscale_from_posix(NAN, &u1, &u2), ERRCODE_BAD_TIME);
}

static void
test_tscale_from_utc_rejects_nonfinite(void **state)
{
	struct tscale_instant t;

	(void)state;
	assert_int_equal(tscale_from_utc(NAN, 0.0, 0.0, &t), ERRCODE_BAD_TIME);
	assert_int_equal(tscale_from_utc(2451545.0, INFINITY, 0.0, &t),
	    ERRCODE_BAD_TIME);
	assert_int_equal(tscale_from_tt(NAN, 0.0, 0.0, &t), ERRCODE_BAD_TIME);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_tscale_parse_valid_table),
		cmocka_unit_test(test_tscale_parse_invalid_table),
		cmocka_unit_test(test_tscale_parse_null_errbuf_and_null_text),
		cmocka_unit_test(test_tscale_leap_second_is_one_second),
		cmocka_unit_test(test_tscale_format_round_trip),
		cmocka_unit_test(test_tscale_round_trip_every_step_day),
		cmocka_unit_test(test_tscale_format_rejects_bad_args),
		cmocka_unit_test(test_tscale_fields),
		cmocka_unit_test(test_tscale_tai_minus_utc),
		cmocka_unit_test(test_tscale_tt_minus_tai),
		cmocka_unit_test(test_tscale_ut1_is_utc_plus_dut1),
		cmocka_unit_test(test_tscale_from_tt_inverts_from_utc),
		cmocka_unit_test(test_tscale_dubious_before_1960),
		cmocka_unit_test(test_tscale_posix_round_trip),
		cmocka_unit_test(test_tscale_from_utc_rejects_nonfinite),
	};

	return cmocka_run_group_tests_name("tscale", tests, NULL, NULL);
}
