/* SPDX-License-Identifier: BSD-3-Clause */
/* test_link.c: the laser-ranging link equation: J1 and the Airy pattern
   against handbook tables, each scaling law, published figures. */
#include <string.h>

#include "check.h"
#include "core/link.h"

#define AS (3.14159265358979323846 / 648000.0)

/* J1 against Abramowitz and Stegun, table 9.1 (x = 0.5, 1, 2) and 9.5
   (first zero j_1,1 = 3.8317059702). */
static void
test_link_bessel_j1(void **state)
{
	(void)state;
	check_near(link_bessel_j1(0.5), 0.2422684577, 1e-10, "", "J1(0.5) A&S 9.1");
	check_near(link_bessel_j1(1.0), 0.4400505857, 1e-10, "", "J1(1) A&S 9.1");
	check_near(link_bessel_j1(2.0), 0.5767248078, 1e-10, "", "J1(2) A&S 9.1");
	check_near(link_bessel_j1(3.8317059702), 0.0, 1e-9, "",
	    "J1 first zero A&S 9.5");
	check_near(link_bessel_j1(-1.0), -0.4400505857, 1e-10, "", "J1 odd");
}

/*
 * The Airy pattern (Born and Wolf 8.5.2): 1 on axis, half power at
 * x = 1.6163 (FWHM 1.029 lambda / D), the first dark ring at
 * x = 3.8317 (1.22 lambda / D).
 */
static void
test_link_far_field(void **state)
{
	const double d = 0.038, lam = 532e-9, pi = 3.14159265358979323846;

	(void)state;
	check_near(link_far_field(d, lam, 0.0), 1.0, 0.0, "", "on axis");
	check_near(link_far_field(d, lam, 1.6163 * lam / (pi * d)), 0.5, 1e-4,
	    "", "half power at x = 1.6163 (Born and Wolf)");
	check_near(link_far_field(d, lam, 1.21967 * lam / d), 0.0, 1e-8, "",
	    "first dark ring at 1.22 lambda / D (Born and Wolf)");
}

static void
station(struct link_station *s)
{
	link_station_default(s);
}

/*
 * Each scaling law of the link equation (Degnan 1993, section 2): n is
 * proportional to pulse energy, receive area, cross-section (number of
 * cubes), divergence^-2, R^-4, quantum efficiency and T^2.  Exact ratios
 * (to rounding).
 */
static void
test_link_scaling_laws(void **state)
{
	struct link_station s, s2;
	struct link_target t, t2;
	double n0;

	(void)state;
	station(&s);
	link_target_default(&t);
	n0 = link_photoelectrons(&s, &t, LINK_R0, 0.8);
	assert_true(n0 > 0.0);

	s2 = s;
	s2.pulse_energy_j *= 3.0;
	check_near(link_photoelectrons(&s2, &t, LINK_R0, 0.8) / n0, 3.0, 1e-12,
	    "", "proportional to pulse energy");
	s2 = s;
	s2.aperture_m *= 2.0;
	check_near(link_photoelectrons(&s2, &t, LINK_R0, 0.8) / n0, 4.0, 1e-12,
	    "", "proportional to receive area (D^2)");
	t2 = t;
	t2.cube_count *= 3;
	check_near(link_photoelectrons(&s, &t2, LINK_R0, 0.8) / n0, 3.0, 1e-12,
	    "", "proportional to cross-section (cube count)");
	check_near(link_cross_section(&t2, s.wavelength_m, 1e-6) /
	    link_cross_section(&t, s.wavelength_m, 1e-6), 3.0, 1e-12, "",
	    "cross-section proportional to cube count");
	s2 = s;
	s2.seeing_arcsec *= 2.0;
	check_near(link_photoelectrons(&s2, &t, LINK_R0, 0.8) / n0, 0.25,
	    1e-12, "", "divergence^-2");
	check_near(link_photoelectrons(&s, &t, 1.1 * LINK_R0, 0.8) / n0,
	    1.0 / pow(1.1, 4.0), 1e-12, "", "R^-4");
	check_near(link_photoelectrons(&s, &t, LINK_R0, 0.4) / n0, 0.5, 1e-12,
	    "", "two-way transmission");
	s2 = s;
	s2.detector_qe *= 0.5;
	check_near(link_photoelectrons(&s2, &t, LINK_R0, 0.8) / n0, 0.5, 1e-12,
	    "", "quantum efficiency");
	/* Cross-section of one cube on axis ~ D^4 / lambda^2. */
	t2 = t;
	t2.cube_aperture_m *= 2.0;
	check_near(link_cross_section(&t2, 532e-9, 0.0) /
	    link_cross_section(&t, 532e-9, 0.0), 16.0, 1e-12, "",
	    "cube cross-section ~ D^4");
	check_near(link_cross_section(&t, 1064e-9, 0.0) /
	    link_cross_section(&t, 532e-9, 0.0), 0.25, 1e-12, "",
	    "cube cross-section ~ lambda^-2");
	/* The rate factor is the same (R0/R)^4 (theta0/theta)^2. */
	check_near(link_rate_factor(&s, 2.0 * s.seeing_arcsec, 1.1 * LINK_R0),
	    0.25 / pow(1.1, 4.0), 1e-12, "", "rate factor");
	check_near(link_rate_factor(&s, NAN, LINK_R0), 1.0, 0.0, "",
	    "no seeing: the station's typical");
	/* Velocity aberration costs a large single reflector more than a
	   small cube (Degnan 1993: the far-field lobe narrows as 1/D). */
	t2.cube_count = 1;
	t2.cube_aperture_m = 0.10;
	assert_true(link_far_field(0.10, 532e-9, 2.0 * LINK_MOON_VT / LINK_C) <
	    link_far_field(0.038, 532e-9, 2.0 * LINK_MOON_VT / LINK_C));
}

/*
 * A published worked figure (J. O. Dickey et al., Science 265, 482
 * (1994), as quoted on a public page; quoted from memory otherwise): a
 * beam of 3-4" "spreads to an area of approximately 7 km in diameter on
 * the lunar surface" and the arrays "intercept only 10^-9" of it.  With
 * 3.5" (FWHM) the spot's FWHM at the mean distance is 6.5 km, and the
 * share of a Gaussian beam's photons falling on a 100-cube (or 300-cube)
 * array of 38 mm cubes is 2.4e-9 (7e-9): that order of magnitude.
 */
static void
test_link_worked_uplink(void **state)
{
	const double pi = 3.14159265358979323846;
	double cube = pi * 0.038 * 0.038 / 4.0;
	double f100 = link_uplink_irradiance(3.5, LINK_R0) * 100.0 * cube;
	double f300 = link_uplink_irradiance(3.5, LINK_R0) * 300.0 * cube;

	(void)state;
	check_near(2.0 * LINK_R0 * tan(3.5 * AS / 2.0) / 1e3, 7.0, 1.0, "km",
	    "spot diameter for 3.5\" (Dickey et al. 1994: ~7 km)");
	print_message("uplink share: 100 cubes %.2e, 300 cubes %.2e\n", f100,
	    f300);
	assert_true(f100 > 1e-10 && f100 < 1e-8);
	assert_true(f300 > 1e-10 && f300 < 1e-8);
}

/*
 * The prior against published return rates.
 *
 * 1. The first lunar returns (J. E. Faller et al., Science 166, 99
 *    (1969), abstract): 7-8 J per pulse at 694.3 nm into a 3.04 m
 *    telescope, "each return signal averaged more than one
 *    photoelectron ... in good agreement with calculations".  Assumed
 *    (common practice for that era): a 100-cube array of 38 mm cubes, 2"
 *    seeing, photocathode QE 0.03 at 694 nm, eta_t 0.5, eta_r 0.3,
 *    T^2 0.6.  The equation gives more than one, below a thousand.
 * 2. A large modern station on the best array: "an optimized steady
 *    photon return rate around 0.1" per shot, the array's 300 cubes
 *    acting as about 30 after dust (arXiv:2012.13081, introduction).
 *    Assumed: 3.5 m, 100 mJ at 532 nm, 1.5" seeing, eta_t 0.5, eta_r 0.05
 *    (filter, detector fill factor and several mirrors; common practice),
 *    QE 0.3, T^2 0.8, 30 cubes.  The equation gives 0.01..1 (that order).
 */
static void
test_link_prior_order_of_magnitude(void **state)
{
	struct link_station s;
	struct link_target t;
	double n1, n2;

	(void)state;
	link_target_default(&t);
	s.pulse_energy_j = 7.5;
	s.wavelength_m = 694.3e-9;
	s.transmit_eff = 0.5;
	s.receive_eff = 0.3;
	s.aperture_m = 3.04;
	s.detector_qe = 0.03;
	s.seeing_arcsec = 2.0;
	n1 = link_photoelectrons(&s, &t, LINK_R0, 0.6);
	s.pulse_energy_j = 0.100;
	s.wavelength_m = 532e-9;
	s.receive_eff = 0.05;
	s.aperture_m = 3.5;
	s.detector_qe = 0.3;
	s.seeing_arcsec = 1.5;
	t.cube_count = 30;
	n2 = link_photoelectrons(&s, &t, LINK_R0, 0.8);
	print_message("first returns: %.3g pe/shot; large station: %.3g\n", n1,
	    n2);
	assert_true(n1 > 1.0 && n1 < 1000.0);
	assert_true(n2 > 0.01 && n2 < 1.0);
}

static void
test_link_checks(void **state)
{
	struct link_station s;
	struct link_target t;
	const char *f = NULL;

	(void)state;
	link_station_default(&s);
	link_target_default(&t);
	assert_int_equal(link_station_check(&s, &f), ERRCODE_OK);
	assert_null(f);
	assert_int_equal(link_target_check(&t, &f), ERRCODE_OK);
	s.seeing_arcsec = 0.0;
	assert_int_equal(link_station_check(&s, &f), ERRCODE_BAD_ARG);
	assert_string_equal(f, "seeing");
	link_station_default(&s);
	s.detector_qe = 1.5;
	assert_int_equal(link_station_check(&s, &f), ERRCODE_BAD_ARG);
	assert_string_equal(f, "quantum_efficiency");
	t.cube_count = 0;
	assert_int_equal(link_target_check(&t, &f), ERRCODE_BAD_ARG);
	assert_string_equal(f, "cube_count");
	link_target_default(&t);
	t.cube_aperture_m = NAN;
	assert_int_equal(link_target_check(&t, &f), ERRCODE_BAD_ARG);
	assert_string_equal(f, "cube_aperture");
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_link_bessel_j1),
		cmocka_unit_test(test_link_far_field),
		cmocka_unit_test(test_link_scaling_laws),
		cmocka_unit_test(test_link_worked_uplink),
		cmocka_unit_test(test_link_prior_order_of_magnitude),
		cmocka_unit_test(test_link_checks),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
