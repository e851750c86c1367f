/* SPDX-License-Identifier: BSD-3-Clause */
/* fixture.h: fixtures shared by the cmocka programs: a scratch directory
   for a group of tests (made by its setup, removed by its teardown), the
   invented station of the store and derive tests, and ISO UTC to an MJD
   or an instant. */
#ifndef MOONRANGE_TESTS_FIXTURE_H
#define MOONRANGE_TESTS_FIXTURE_H

#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include <cmocka.h>

#include "core/site.h"
#include "core/text.h"
#include "core/tscale.h"

/* The group's scratch directory (under $TMPDIR, else /tmp). */
static char fixture_dir[256];

/* Group setup: make fixture_dir; 0 or -1 as cmocka wants. */
static inline int
fixture_dir_setup(void **state)
{
	const char *base = getenv("TMPDIR");

	(void)state;
	snprintf(fixture_dir, sizeof fixture_dir, "%s/moonrange-test-XXXXXX",
	    base != NULL && *base ? base : "/tmp");
	return mkdtemp(fixture_dir) != NULL ? 0 : -1;
}

/* The sample site's database, made by fixture_sample_setup. */
static char fixture_db[300];

/* Group setup: fixture_dir, and in it fixture_db made from sample-site/
   by "moonrange init" (MOONRANGE_BIN, MOONRANGE_SOURCE_DIR, which ctest
   sets); 0 or -1 as cmocka wants. */
static inline int
fixture_sample_setup(void **state)
{
	const char *bin = getenv("MOONRANGE_BIN");
	const char *src = getenv("MOONRANGE_SOURCE_DIR");
	char cmd[1200];

	if (bin == NULL || src == NULL || fixture_dir_setup(state) != 0)
		return -1;
	snprintf(fixture_db, sizeof fixture_db, "%s/site.db", fixture_dir);
	snprintf(cmd, sizeof cmd, "'%s' init --db '%s' --site "
	    "'%s/sample-site' > /dev/null", bin, fixture_db, src);
	return system(cmd) == 0 ? 0 : -1;
}

/* Group teardown: remove fixture_dir and all in it. */
static inline int
fixture_dir_teardown(void **state)
{
	char cmd[300];

	(void)state;
	snprintf(cmd, sizeof cmd, "rm -rf '%s'", fixture_dir);
	return system(cmd) == 0 ? 0 : -1;
}

/* The UTC MJD of ISO 8601 UTC text; the test fails when it does not
   parse. */
static inline double
fixture_mjd(const char *iso)
{
	double u1, u2;

	assert_int_equal(tscale_parse_utc(iso, &u1, &u2, NULL, 0), ERRCODE_OK);
	return (u1 - TEXT_MJD0) + u2;
}

/* The instant of ISO 8601 UTC text (UT1 = UTC); the test fails when it
   does not parse or convert. */
static inline void
fixture_instant(const char *iso, struct tscale_instant *t)
{
	double u1, u2;

	assert_int_equal(tscale_parse_utc(iso, &u1, &u2, NULL, 0), ERRCODE_OK);
	assert_int_equal(tscale_from_utc(u1, u2, 0.0, t), ERRCODE_OK);
}

/* An invented station (the demo ridge's place and weather), every member
   set: limits, laser and link budget (jitter unknown). */
static inline void
fixture_station(struct site_station *st)
{
	memset(st, 0, sizeof *st);
	strcpy(st->name, "Test Ridge Station (invented)");
	strcpy(st->code, "TRS1");
	st->lat_deg = 38.9712;
	st->lon_deg = -114.3098;
	st->height_m = 2950.0;
	strcpy(st->time_zone, "America/Los_Angeles");
	st->min_el_deg = 15.0;
	st->max_sun_el_deg = -12.0;
	st->min_sun_sep_deg = 30.0;
	st->pressure_hpa = 700.0;
	st->temperature_c = 5.0;
	st->humidity = 0.3;
	st->wavelength_nm = 532.0;
	st->zenith_tau = 0.1;
	st->fire_rate_hz = 20.0;
	st->pulse_energy_mj = 85.0;
	st->aperture_m = 1.2;
	st->transmit_eff = 0.45;
	st->receive_eff = 0.08;
	st->detector_qe = 0.25;
	st->seeing_arcsec = 1.6;
	st->jitter_ps = NAN;
}

#endif
