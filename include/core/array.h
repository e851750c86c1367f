/* SPDX-License-Identifier: BSD-3-Clause */
/* array.h: a reflector array's tilt to the line of sight and the pulse
   spread it causes (pure core). */
#ifndef MOONRANGE_ARRAY_H
#define MOONRANGE_ARRAY_H

#include "core/geom.h"
#include "core/site.h"

/*
 * A multi-cube array is a flat panel.  When libration turns it away from
 * the line of sight by the tilt theta, its cubes sit at different depths
 * and a returned pulse is spread.  For a square panel of side L (the
 * target's extent) the depth along the line of sight of a cube at x
 * across the panel (x uniform on -L/2..L/2 along the tilt's direction)
 * is x sin theta, so the round trip 2 x sin theta / c has the RMS
 *
 *   sigma_t = 2 (L / sqrt 12) sin theta / c = L sin theta / (sqrt 3 c).
 *
 * A single reflector (extent 0) does not spread.  Elementary geometry;
 * the RMS of a uniform distribution of width L is L / sqrt 12.
 */

/* Unit normal in the lunar body frame from a selenographic direction
   (lat, east lon, rad); (0, 0) is +x, the mean direction to the Earth. */
void array_normal(double lat, double lon, double n[3]);

/*
 * Tilt of an array: the angle between its normal and the direction from
 * the target to the station, in the lunar body frame.
 *
 * Given:
 *   g       the instant (geom_instant_make)
 *   t       the target, body-fixed
 *   n       unit normal, body frame
 * Returned (function value):
 *   tilt, rad, 0..pi
 * Notes:
 *   The station's position is taken at the instant, the Moon's (and its
 *   orientation) one light time earlier, as in geom_target_view.
 * Called:
 *   geom_sep
 */
double array_tilt(const struct geom_instant *g, const struct geom_target *t,
    const double n[3]);

/* RMS round-trip spread, picoseconds, of a square panel of side
   extent_m at tilt (rad): extent sin(tilt) / (sqrt 3 c). */
double array_spread_ps(double extent_m, double tilt);

/*
 * Tilt (rad) and spread (ps) of a target's array at an instant: the
 * target record's normal and extent, with their defaults
 * (site_target_array; NULL t: the defaults, normal +x and 0.5 m).
 * Called:
 *   site_target_array, site_target_init, array_normal, array_tilt,
 *   array_spread_ps
 */
void array_of_target(const struct geom_instant *g,
    const struct geom_target *gt, const struct site_target *t, double *tilt,
    double *spread_ps);

#endif
