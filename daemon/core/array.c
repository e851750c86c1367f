/* SPDX-License-Identifier: BSD-3-Clause */
/* array.c: array tilt to the line of sight and the RMS pulse spread. */
#include <math.h>

#include "core/array.h"

#define GEOM_DEG (3.14159265358979323846 / 180.0)

void
array_normal(double lat, double lon, double n[3])
{
	n[0] = cos(lat) * cos(lon);
	n[1] = cos(lat) * sin(lon);
	n[2] = sin(lat);
}

double
array_tilt(const struct geom_instant *g, const struct geom_target *t,
    const double n[3])
{
	double pos[3], d[3], u[3];

	/* target, GCRS: Moon (retarded) + rot^T body */
	for (int i = 0; i < 3; i++)
		pos[i] = g->moon_ret[i] + g->lunar_rot[0][i] * t->body[0] +
		    g->lunar_rot[1][i] * t->body[1] +
		    g->lunar_rot[2][i] * t->body[2];
	for (int i = 0; i < 3; i++)
		d[i] = g->site_gcrs[i] - pos[i];
	for (int i = 0; i < 3; i++)	/* into the body frame */
		u[i] = g->lunar_rot[i][0] * d[0] + g->lunar_rot[i][1] * d[1] +
		    g->lunar_rot[i][2] * d[2];
	return geom_sep(n, u);
}

void
array_of_target(const struct geom_instant *g, const struct geom_target *gt,
    const struct site_target *t, double *tilt, double *spread_ps)
{
	struct site_target d;
	double lat, lon, ext, n[3];

	if (t == NULL) {
		site_target_init(&d);
		t = &d;
	}
	site_target_array(t, &lat, &lon, &ext);
	array_normal(lat * GEOM_DEG, lon * GEOM_DEG, n);
	*tilt = array_tilt(g, gt, n);
	*spread_ps = array_spread_ps(ext, *tilt);
}

double
array_spread_ps(double extent_m, double tilt)
{
	if (!(extent_m > 0.0))
		return 0.0;
	return extent_m * fabs(sin(tilt)) / (sqrt(3.0) * GEOM_C) * 1e12;
}
