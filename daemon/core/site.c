/* SPDX-License-Identifier: BSD-3-Clause */
/* site.c: names of the closed vocabularies of the data model. */
#include <math.h>
#include <string.h>

#include "core/link.h"
#include "core/site.h"

void
site_target_init(struct site_target *t)
{
	memset(t, 0, sizeof *t);
	t->strength = 1.0;
	t->active = 1;
	t->cube_count = SITE_DEFAULT_CUBES;
	t->cube_aperture_mm = SITE_DEFAULT_CUBE_MM;
	t->normal_lat_deg = NAN;
	t->normal_lon_deg = NAN;
	t->extent_m = NAN;
}

void
site_target_array(const struct site_target *t, double *normal_lat_deg,
    double *normal_lon_deg, double *extent_m)
{
	int single = t->cube_count == 1;

	*normal_lat_deg = isfinite(t->normal_lat_deg) ? t->normal_lat_deg : 0.0;
	*normal_lon_deg = isfinite(t->normal_lon_deg) ? t->normal_lon_deg : 0.0;
	if (single)
		*extent_m = 0.0;
	else
		*extent_m = (isfinite(t->extent_m) && t->extent_m >= 0.0) ?
		    t->extent_m : SITE_DEFAULT_EXTENT_M;
}

/* v when it is a positive number, else the default d. */
static double
pos_or(double v, double d)
{
	return (isfinite(v) && v > 0.0) ? v : d;
}

void
site_station_link(const struct site_station *st, struct link_station *out)
{
	struct link_station d;

	link_station_default(&d);
	out->pulse_energy_j = pos_or(st->pulse_energy_mj, d.pulse_energy_j *
	    1e3) / 1e3;
	out->wavelength_m = pos_or(st->wavelength_nm, d.wavelength_m * 1e9) /
	    1e9;
	out->transmit_eff = pos_or(st->transmit_eff, d.transmit_eff);
	out->receive_eff = pos_or(st->receive_eff, d.receive_eff);
	out->aperture_m = pos_or(st->aperture_m, d.aperture_m);
	out->detector_qe = pos_or(st->detector_qe, d.detector_qe);
	out->seeing_arcsec = pos_or(st->seeing_arcsec, d.seeing_arcsec);
}

void
site_target_link(const struct site_target *t, struct link_target *out)
{
	link_target_default(out);
	if (t->cube_count > 0)
		out->cube_count = t->cube_count;
	out->cube_aperture_m = pos_or(t->cube_aperture_mm,
	    SITE_DEFAULT_CUBE_MM) / 1e3;
}

const char *
site_outcome_name(enum site_outcome o)
{
	switch (o) {
	case SITE_OUTCOME_RANGED:
		return "ranged";
	case SITE_OUTCOME_NO_RETURNS:
		return "no_returns";
	case SITE_OUTCOME_WEATHER:
		return "weather";
	case SITE_OUTCOME_TECHNICAL:
		return "technical";
	case SITE_OUTCOME_SAFETY:
		return "safety";
	case SITE_OUTCOME_OTHER:
		return "other";
	case SITE_OUTCOME__COUNT:
		break;
	}
	return "other";
}

int
site_outcome_parse(const char *s)
{
	for (int i = 0; i < SITE_OUTCOME__COUNT; i++)
		if (s != NULL && strcmp(s, site_outcome_name(i)) == 0)
			return i;
	return -1;
}
