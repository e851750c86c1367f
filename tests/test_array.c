/* SPDX-License-Identifier: BSD-3-Clause */
/* test_array.c: array tilt against the core's libration, and the pulse
   spread's laws (elementary geometry). */
#include <erfa.h>
#include <erfam.h>

#include "check.h"
#include "core/array.h"

#define D2R ERFA_DD2R
#define R2D ERFA_DR2D

static void
instant(double utc2, struct geom_instant *g)
{
	struct geom_site site;

	/* Invented station (test data only). */
	assert_int_equal(geom_site_init(&site, 38.0 * D2R, -114.0 * D2R,
	    2900.0, NULL), ERRCODE_OK);
	assert_int_equal(geom_instant_at(&site, NULL, 2400000.5, utc2,
	    GEOM_PREC_FULL, g), ERRCODE_OK);
}

/*
 * The tilt is the angle between the normal and the direction from the
 * target to the station in the lunar frame.  Independently of
 * array_tilt's vectors, that direction is built from the libration the
 * core reports (the sub-station point, g.lib.topo_lon/lat, at the
 * centre's range g.moon.range) less the target's body vector; over a
 * month of instants they agree to 0.001 deg.  For the default normal
 * (+x) and a target at the disc's centre the tilt is, to the target's
 * parallax (1738 km / 384 400 km = 0.26 deg), the total topocentric
 * libration.
 */
static void
test_array_tilt_against_libration(void **state)
{
	struct geom_target tg[3];
	double n0[3], n1[3];

	(void)state;
	assert_int_equal(geom_target_from_selen(0.0, 0.0, 0.0, &tg[0]),
	    ERRCODE_OK);
	assert_int_equal(geom_target_from_selen(20.0 * D2R, -30.0 * D2R,
	    -1000.0, &tg[1]), ERRCODE_OK);
	assert_int_equal(geom_target_from_selen(-10.0 * D2R, 40.0 * D2R,
	    500.0, &tg[2]), ERRCODE_OK);
	array_normal(0.0, 0.0, n0);
	array_normal(3.0 * D2R, 6.0 * D2R, n1);
	check_near(n0[0], 1.0, 0.0, "", "default normal is +x");
	for (int k = 0; k < 30; k++) {
		struct geom_instant g;
		double s[3], lib;

		instant(61400.0 + k * 0.97, &g);
		eraS2p(g.lib.topo_lon, g.lib.topo_lat, g.moon.range, s);
		lib = acos(cos(g.lib.topo_lat) * cos(g.lib.topo_lon));
		for (int j = 0; j < 3; j++) {
			double u[3];

			for (int i = 0; i < 3; i++)
				u[i] = s[i] - tg[j].body[i];
			check_near(array_tilt(&g, &tg[j], n0) * R2D,
			    geom_sep(n0, u) * R2D, 0.001, "deg",
			    "tilt vs libration, normal +x");
			check_near(array_tilt(&g, &tg[j], n1) * R2D,
			    geom_sep(n1, u) * R2D, 0.001, "deg",
			    "tilt vs libration, tilted normal");
		}
		check_near(array_tilt(&g, &tg[0], n0) * R2D, lib * R2D, 0.27,
		    "deg", "centre target: the total libration");
	}
}

/* Zero tilt, zero extent: no spread; spread proportional to extent and
   to sin(tilt); 1 m at 90 deg is 1 / (sqrt 3 c) = 1925.8 ps. */
static void
test_array_spread_laws(void **state)
{
	(void)state;
	check_near(array_spread_ps(0.5, 0.0), 0.0, 0.0, "ps", "zero tilt");
	check_near(array_spread_ps(0.0, 0.3), 0.0, 0.0, "ps",
	    "single reflector");
	check_near(array_spread_ps(1.0, ERFA_DPI / 2.0),
	    1e12 / (sqrt(3.0) * 299792458.0), 1e-9, "ps",
	    "L / (sqrt 3 c) at 90 deg");
	check_near(array_spread_ps(1.0, ERFA_DPI / 2.0), 1925.8, 0.1, "ps",
	    "1 m at 90 deg (evaluated by hand)");
	check_near(array_spread_ps(0.9, 0.1) / array_spread_ps(0.3, 0.1), 3.0,
	    1e-12, "", "proportional to extent");
	check_near(array_spread_ps(0.5, 0.2) / array_spread_ps(0.5, 0.1),
	    sin(0.2) / sin(0.1), 1e-12, "", "proportional to sin(tilt)");
	/* The RMS of a uniform panel against a direct sum over 10 000 cubes
	   spread evenly across it (round trip 2 x sin(tilt) / c). */
	{
		const int n = 10000;
		double sum2 = 0.0, L = 0.6, th = 0.12;

		for (int i = 0; i < n; i++) {
			double x = L * ((i + 0.5) / n - 0.5);
			double dt = 2.0 * x * sin(th) / 299792458.0;

			sum2 += dt * dt;
		}
		check_near(array_spread_ps(L, th), sqrt(sum2 / n) * 1e12, 1e-3,
		    "ps", "uniform panel vs direct sum");
	}
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_array_tilt_against_libration),
		cmocka_unit_test(test_array_spread_laws),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
