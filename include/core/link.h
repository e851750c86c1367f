/* SPDX-License-Identifier: BSD-3-Clause */
/* link.h: the laser-ranging link equation, a physical prior for the
   returns per shot of a station and a lunar reflector (pure core). */
#ifndef MOONRANGE_LINK_H
#define MOONRANGE_LINK_H

#include "core/errcode.h"

/*
 * Expected photoelectrons per shot (Degnan 1993, the radar link
 * equation written for laser ranging):
 *
 *   n = eta_q (E lambda / h c) eta_t G_t sigma (1 / 4 pi R^2)^2
 *       A_r eta_r T^2
 *
 * E pulse energy, lambda wavelength (E lambda / h c photons), eta_t and
 * eta_r the transmit and receive optics efficiencies, eta_q the
 * detector's quantum efficiency, A_r = pi D_r^2 / 4 the receive aperture,
 * T^2 the two-way atmospheric transmission, R the range; G_t = 8 /
 * theta_t^2 the on-axis gain of a Gaussian beam whose 1/e^2 half-angle
 * divergence is theta_t, set by the seeing: theta_t = FWHM / sqrt(2 ln 2)
 * (for lunar ranging the atmosphere, not the transmit optics, sets the
 * beam: a 1 m aperture diffracts to 0.13").  The target's optical cross
 * section of N corner cubes of aperture D (or one reflector of aperture
 * D, N = 1):
 *
 *   sigma = N rho (pi D^2 / 4) (4 pi / lambda^2) (pi D^2 / 4) F(alpha)
 *         = N rho pi^3 D^4 / (4 lambda^2) F(alpha)
 *
 * rho the cube's reflectance, F the far-field pattern of a circular
 * aperture (Airy: F = (2 J1(x) / x)^2, x = pi D alpha / lambda) at the
 * velocity-aberration angle alpha = 2 v / c, v the Moon's transverse
 * velocity relative to the station.
 *
 * References: J. J. Degnan, "Millimeter accuracy satellite laser
 * ranging: a review", in Contributions of Space Geodesy to Geodynamics:
 * Technology, AGU Geodynamics Series 25 (1993), section 2 (link equation,
 * cube cross-section, far-field pattern and velocity aberration);
 * M. Born and E. Wolf, Principles of Optics, 8.5.2 (Airy pattern);
 * M. Abramowitz and I. A. Stegun, Handbook of Mathematical Functions,
 * 9.1.10 (J1 series).
 */

#define LINK_PLANCK 6.62607015e-34	/* h, J s (SI 2019, exact) */
#define LINK_C 299792458.0		/* c, m/s */
#define LINK_REFLECTANCE 0.93		/* cube reflectance (common practice
					   for uncoated total internal
					   reflection cubes) */
#define LINK_MOON_VT 1.02e3		/* the Moon's mean orbital speed, m/s
					   (2 pi a / sidereal month) */
#define LINK_R0 384400e3		/* reference range: the Moon's mean
					   distance, m (IAU) */

struct link_station {
	double pulse_energy_j;	/* laser pulse energy, J */
	double wavelength_m;	/* laser wavelength, m */
	double transmit_eff;	/* eta_t, 0..1 */
	double receive_eff;	/* eta_r, 0..1 */
	double aperture_m;	/* receive telescope diameter, m */
	double detector_qe;	/* eta_q, 0..1 */
	double seeing_arcsec;	/* typical seeing, FWHM, arcsec */
};

struct link_target {
	long cube_count;	/* N corner cubes; 1 for a single reflector */
	double cube_aperture_m;	/* D of each cube (or of the reflector), m */
	double reflectance;	/* rho, 0..1 */
};

/*
 * Station and target defaults (documented in README "Link budget"):
 * 100 mJ, 532 nm, eta_t 0.5, eta_r 0.1 (with the narrow-band filter and
 * the detector's coupling), 1.0 m, QE 0.3, seeing 1.5" (common practice);
 * 100 cubes of 38 mm, rho LINK_REFLECTANCE.
 */
void link_station_default(struct link_station *s);
void link_target_default(struct link_target *t);

/* ERRCODE_BAD_ARG with *field naming the member out of range. */
enum errcode link_station_check(const struct link_station *s,
    const char **field);
enum errcode link_target_check(const struct link_target *t,
    const char **field);

/* Bessel function J1 by its power series (A&S 9.1.10), |x| <= 20. */
double link_bessel_j1(double x);

/*
 * Far-field pattern of a circular aperture relative to its peak.
 *
 * Given:
 *   aperture_m  D
 *   lambda_m    wavelength
 *   alpha_rad   angle off the return's axis
 * Returned (function value):
 *   (2 J1(x) / x)^2, x = pi D alpha / lambda; 1 at alpha = 0
 * References:
 *   Born and Wolf, 8.5.2; Degnan (1993), section 2.
 * Called:
 *   link_bessel_j1
 */
double link_far_field(double aperture_m, double lambda_m, double alpha_rad);

/*
 * Optical cross-section of the target, m^2.
 *
 * Given:
 *   t          cubes (count, aperture, reflectance)
 *   lambda_m   wavelength
 *   alpha_rad  velocity aberration (2 v / c)
 * Returned (function value):
 *   N rho pi^3 D^4 / (4 lambda^2) F(alpha)
 * References:
 *   Degnan (1993), section 2.
 * Called:
 *   link_far_field
 */
double link_cross_section(const struct link_target *t, double lambda_m,
    double alpha_rad);

/* Gaussian beam's 1/e^2 half-angle divergence from a FWHM seeing, rad. */
double link_divergence(double seeing_arcsec);

/*
 * On-axis irradiance at range R of one transmitted photon, per m^2:
 * G_t / (4 pi R^2) = 2 / (pi theta_t^2 R^2) (Degnan 1993, section 2).
 */
double link_uplink_irradiance(double seeing_arcsec, double range_m);

/*
 * Expected photoelectrons per shot.
 *
 * Given:
 *   s             station (seeing_arcsec may be replaced by the caller
 *                 for one attempt)
 *   t             target
 *   range_m       station to target, m
 *   transmission  two-way atmospheric transmission T^2, 0..1
 * Returned (function value):
 *   n, photoelectrons per shot (the expected returns per shot when they
 *   are few, as for lunar ranging)
 * Notes:
 *   Velocity aberration is taken at the Moon's mean orbital speed
 *   (LINK_MOON_VT): alpha = 2 v / c = 6.8 urad.  No pointing error, no
 *   central obscuration of the receive aperture, no detector dead time.
 * References:
 *   Degnan (1993), section 2.
 * Called:
 *   link_uplink_irradiance, link_cross_section
 */
double link_photoelectrons(const struct link_station *s,
    const struct link_target *t, double range_m, double transmission);

/*
 * The seeing and range factor of the rate relative to the station's
 * typical seeing and the mean distance: (theta_0 / theta)^2 (R0 / R)^4.
 * A NaN or non-positive seeing is the typical one.
 */
double link_rate_factor(const struct link_station *s, double seeing_arcsec,
    double range_m);

#endif
