/* SPDX-License-Identifier: BSD-3-Clause */
/* test_eop.c: interpolation of the Earth-orientation table, across leap
   seconds, and the table check. */
#include <math.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "check.h"
#include "core/eop.h"

/* Two daily rows around the leap second at the end of 2016-12-31,
   copied from the IERS EOP 14 C04 series as shipped by Debian's
   python3-astropy (astropy/utils/iers/data/eopc04_IAU2000.62-now, rows
   2016-12-31 and 2017-01-01). */
static const struct site_eop_row leap_rows[] = {
	{ 57753.0, -0.4077492, 0.081284, 0.263013 },
	{ 57754.0, 0.5912977, 0.080406, 0.263110 },
};

static void
test_eop_source_names(void **state)
{
	(void)state;
	assert_string_equal(eop_source_name(EOP_SOURCE_NONE), "none");
	assert_string_equal(eop_source_name(EOP_SOURCE_TABLE), "table");
	assert_string_equal(eop_source_name(EOP_SOURCE_OPTION), "option");
}

static void
test_eop_linear(void **state)
{
	/* invented rows; expected values are plain linear interpolation,
	   worked by hand (common practice) */
	static const struct site_eop_row rows[] = {
		{ 60000.0, 0.1000, 0.100, 0.300 },
		{ 60001.0, 0.0980, 0.104, 0.296 },
		{ 60002.0, 0.0970, 0.106, 0.290 },
	};
	struct eop_table t = { rows, 3 };
	struct geom_eop e;

	(void)state;
	assert_int_equal(eop_lookup(&t, 60000.25, &e), EOP_SOURCE_TABLE);
	check_near(e.dut1, 0.0995, 1e-12, "s", "dut1 a quarter into day 1");
	/* 1 arcsec = pi / 648000 rad (definition; ERFA_DAS2R) */
	check_near(e.xp, 0.101 * (ERFA_DPI / 648000.0), 1e-18, "rad", "xp");
	check_near(e.yp, 0.299 * (ERFA_DPI / 648000.0), 1e-18, "rad", "yp");
	assert_int_equal(eop_lookup(&t, 60001.5, &e), EOP_SOURCE_TABLE);
	check_near(e.dut1, 0.0975, 1e-12, "s", "dut1 mid day 2");
	/* on a row: that row's values */
	assert_int_equal(eop_lookup(&t, 60001.0, &e), EOP_SOURCE_TABLE);
	check_near(e.dut1, 0.0980, 1e-12, "s", "dut1 on row 2");
	assert_int_equal(eop_lookup(&t, 60002.0, &e), EOP_SOURCE_TABLE);
	check_near(e.dut1, 0.0970, 1e-12, "s", "dut1 on the last row");
	check_near(e.yp, 0.290 * (ERFA_DPI / 648000.0), 1e-18, "rad",
	    "yp on the last row");
}

static void
test_eop_outside(void **state)
{
	static const struct site_eop_row rows[] = {
		{ 60000.0, 0.1, 0.1, 0.3 },
		{ 60001.0, 0.1, 0.1, 0.3 },
		{ 60020.0, 0.1, 0.1, 0.3 },	/* after a 19-day gap */
	};
	struct eop_table t = { rows, 3 }, empty = { NULL, 0 };
	struct geom_eop e;

	(void)state;
	assert_int_equal(eop_lookup(&t, 59999.999, &e), EOP_SOURCE_NONE);
	assert_true(e.dut1 == 0.0 && e.xp == 0.0 && e.yp == 0.0);
	assert_int_equal(eop_lookup(&t, 60020.001, &e), EOP_SOURCE_NONE);
	assert_int_equal(eop_lookup(&t, 60010.0, &e), EOP_SOURCE_NONE);
	assert_true(e.dut1 == 0.0);
	assert_int_equal(eop_lookup(&t, NAN, &e), EOP_SOURCE_NONE);
	assert_int_equal(eop_lookup(&empty, 60000.0, &e), EOP_SOURCE_NONE);
	assert_int_equal(eop_lookup(NULL, 60000.0, &e), EOP_SOURCE_NONE);
}

static void
test_eop_leap_second(void **state)
{
	struct eop_table t = { leap_rows, 2 };
	struct geom_eop e;
	double ua, ub;

	(void)state;
	/* UT1-TAI on each row, with TAI-UTC 36 s then 37 s (ERFA's table;
	   IERS Bulletin C 52: 37 s from 2017-01-01) */
	ua = leap_rows[0].dut1_s - 36.0;
	ub = leap_rows[1].dut1_s - 37.0;
	assert_int_equal(eop_lookup(&t, 57753.5, &e), EOP_SOURCE_TABLE);
	/* linear in UT1-TAI, then TAI-UTC = 36 s added back */
	check_near(e.dut1, ua + 0.5 * (ub - ua) + 36.0, 1e-9, "s",
	    "dut1 at 2016-12-31T12:00Z");
	check_near(e.dut1, -0.4082258, 1e-6, "s",
	    "dut1 at noon, not the 0.09 s a naive mean would give");
	/* just before the leap second DUT1 is still negative ... */
	assert_int_equal(eop_lookup(&t, 57753.0 + 86399.0 / 86401.0, &e),
	    EOP_SOURCE_TABLE);
	check_near(e.dut1, ua + (86399.0 / 86401.0) * (ub - ua) + 36.0, 1e-9,
	    "s", "dut1 at 23:59:59");
	assert_true(e.dut1 < 0.0);
	/* ... and at 00:00 it has jumped by the leap second */
	assert_int_equal(eop_lookup(&t, 57754.0, &e), EOP_SOURCE_TABLE);
	check_near(e.dut1, 0.5912977, 1e-12, "s", "dut1 at 2017-01-01T00:00Z");
}

static void
test_eop_step_unknown_to_erfa(void **state)
{
	/* invented demo rows in 2031 with a +1 s step that ERFA's
	   leap-second table does not hold: the step is put at the end of
	   the first day (where UTC inserts leap seconds) */
	static const struct site_eop_row rows[] = {
		{ 63000.0, -0.6000, 0.1, 0.3 },
		{ 63001.0, 0.3980, 0.1, 0.3 },
	};
	struct eop_table t = { rows, 2 };
	struct geom_eop e;

	(void)state;
	assert_int_equal(eop_lookup(&t, 63000.5, &e), EOP_SOURCE_TABLE);
	/* -0.6 + 0.5 * (0.398 - 1 - (-0.6)) = -0.601, by hand */
	check_near(e.dut1, -0.601, 1e-9, "s", "dut1 mid-day before the step");
	assert_int_equal(eop_lookup(&t, 63001.0, &e), EOP_SOURCE_TABLE);
	check_near(e.dut1, 0.398, 1e-12, "s", "dut1 after the step");
}

static void
test_eop_table_check(void **state)
{
	struct site_eop_row rows[3] = {
		{ 60000.0, 0.1, 0.1, 0.3 },
		{ 60001.0, 0.1, 0.1, 0.3 },
		{ 60002.0, 0.1, 0.1, 0.3 },
	};
	struct eop_table t = { rows, 3 };

	(void)state;
	assert_int_equal(eop_table_check(&t), ERRCODE_OK);
	rows[2].mjd = 60001.0;			/* not increasing */
	assert_int_equal(eop_table_check(&t), ERRCODE_BAD_ARG);
	rows[2].mjd = 60002.0;
	rows[1].dut1_s = 1.2;			/* beyond UTC's rule */
	assert_int_equal(eop_table_check(&t), ERRCODE_BAD_ARG);
	rows[1].dut1_s = 0.1;
	rows[0].xp_arcsec = NAN;
	assert_int_equal(eop_table_check(&t), ERRCODE_BAD_ARG);
	rows[0].xp_arcsec = 3.0;		/* polar motion is < 1" */
	assert_int_equal(eop_table_check(&t), ERRCODE_BAD_ARG);
	assert_int_equal(eop_table_check(NULL), ERRCODE_BAD_ARG);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_eop_source_names),
		cmocka_unit_test(test_eop_linear),
		cmocka_unit_test(test_eop_outside),
		cmocka_unit_test(test_eop_leap_second),
		cmocka_unit_test(test_eop_step_unknown_to_erfa),
		cmocka_unit_test(test_eop_table_check),
	};

	return cmocka_run_group_tests_name("eop", tests, NULL, NULL);
}
