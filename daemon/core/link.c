/* SPDX-License-Identifier: BSD-3-Clause */
/* link.c: the laser-ranging link equation (Degnan 1993). */
#include <math.h>
#include <stddef.h>

#include "core/link.h"

#define PI 3.14159265358979323846
#define AS2R (PI / 648000.0)

void
link_station_default(struct link_station *s)
{
	s->pulse_energy_j = 0.100;
	s->wavelength_m = 532e-9;
	s->transmit_eff = 0.5;
	s->receive_eff = 0.1;
	s->aperture_m = 1.0;
	s->detector_qe = 0.3;
	s->seeing_arcsec = 1.5;
}

void
link_target_default(struct link_target *t)
{
	t->cube_count = 100;
	t->cube_aperture_m = 0.038;
	t->reflectance = LINK_REFLECTANCE;
}

static int
in(double v, double lo, double hi)
{
	return isfinite(v) && v > lo && v <= hi;
}

enum errcode
link_station_check(const struct link_station *s, const char **field)
{
	const char *bad = NULL;

	if (!in(s->pulse_energy_j, 0.0, 100.0))
		bad = "pulse_energy";
	else if (!in(s->wavelength_m, 200e-9, 20e-6))
		bad = "wavelength";
	else if (!in(s->transmit_eff, 0.0, 1.0))
		bad = "transmit_efficiency";
	else if (!in(s->receive_eff, 0.0, 1.0))
		bad = "receive_efficiency";
	else if (!in(s->aperture_m, 0.0, 50.0))
		bad = "aperture";
	else if (!in(s->detector_qe, 0.0, 1.0))
		bad = "quantum_efficiency";
	else if (!in(s->seeing_arcsec, 0.0, 60.0))
		bad = "seeing";
	if (field != NULL)
		*field = bad;
	return bad != NULL ? ERRCODE_BAD_ARG : ERRCODE_OK;
}

enum errcode
link_target_check(const struct link_target *t, const char **field)
{
	const char *bad = NULL;

	if (t->cube_count < 1 || t->cube_count > 100000)
		bad = "cube_count";
	else if (!in(t->cube_aperture_m, 0.0, 5.0))
		bad = "cube_aperture";
	else if (!in(t->reflectance, 0.0, 1.0))
		bad = "reflectance";
	if (field != NULL)
		*field = bad;
	return bad != NULL ? ERRCODE_BAD_ARG : ERRCODE_OK;
}

double
link_bessel_j1(double x)
{
	double term = x / 2.0, sum = term, q = -(x * x) / 4.0;

	/* J1(x) = sum_k (-x^2/4)^k (x/2) / (k! (k+1)!); 60 terms reach
	   double precision for |x| <= 20. */
	for (int k = 1; k < 60; k++) {
		term *= q / ((double)k * (double)(k + 1));
		sum += term;
	}
	return sum;
}

double
link_far_field(double aperture_m, double lambda_m, double alpha_rad)
{
	double x = PI * aperture_m * fabs(alpha_rad) / lambda_m, f;

	if (x < 1e-8)
		return 1.0;
	if (x > 20.0)
		x = 20.0;	/* far in the rings: < 1e-3 of the peak */
	f = 2.0 * link_bessel_j1(x) / x;
	return f * f;
}

double
link_cross_section(const struct link_target *t, double lambda_m,
    double alpha_rad)
{
	double d2 = t->cube_aperture_m * t->cube_aperture_m;

	return (double)t->cube_count * t->reflectance * PI * PI * PI * d2 *
	    d2 / (4.0 * lambda_m * lambda_m) *
	    link_far_field(t->cube_aperture_m, lambda_m, alpha_rad);
}

double
link_divergence(double seeing_arcsec)
{
	return seeing_arcsec * AS2R / sqrt(2.0 * log(2.0));
}

double
link_uplink_irradiance(double seeing_arcsec, double range_m)
{
	double th = link_divergence(seeing_arcsec);

	return (8.0 / (th * th)) / (4.0 * PI * range_m * range_m);
}

double
link_photoelectrons(const struct link_station *s,
    const struct link_target *t, double range_m, double transmission)
{
	double photons = s->pulse_energy_j * s->wavelength_m /
	    (LINK_PLANCK * LINK_C);
	double sigma = link_cross_section(t, s->wavelength_m,
	    2.0 * LINK_MOON_VT / LINK_C);
	double back = 1.0 / (4.0 * PI * range_m * range_m);
	double area = PI * s->aperture_m * s->aperture_m / 4.0;

	return s->detector_qe * photons * s->transmit_eff *
	    link_uplink_irradiance(s->seeing_arcsec, range_m) * sigma * back *
	    area * s->receive_eff * transmission;
}

double
link_rate_factor(const struct link_station *s, double seeing_arcsec,
    double range_m)
{
	double th = (isfinite(seeing_arcsec) && seeing_arcsec > 0.0) ?
	    seeing_arcsec : s->seeing_arcsec;
	double rr = LINK_R0 / range_m;
	double sr = s->seeing_arcsec / th;

	return sr * sr * rr * rr * rr * rr;
}
