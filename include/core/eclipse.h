/* SPDX-License-Identifier: BSD-3-Clause */
/* eclipse.h: lunar eclipses (the Earth's umbra and penumbra at the Moon)
   and the shadow state of a point on the Moon (pure core). */
#ifndef MOONRANGE_ECLIPSE_H
#define MOONRANGE_ECLIPSE_H

#include <stddef.h>

#include "core/errcode.h"

/*
 * The Earth's shadow is enlarged for its atmosphere by Danjon's rule:
 * the Earth's radius (taken, as the Explanatory Supplement does for the
 * shadow, as 0.998340 of the equatorial radius, to allow for the
 * flattening) is increased by 1/85.  Seen from the Earth's centre the
 * shadow's angular radii at the Moon's distance are then
 *
 *   umbra     rho_u = pi_M' + pi_S' - s_S
 *   penumbra  rho_p = pi_M' + pi_S' + s_S
 *
 * pi' = asin(a' / r), a' = 6378137 m x 0.998340 x (1 + 1/85) the
 * effective radius of the Earth, s_S = asin(R_S / r_S) the Sun's
 * semi-diameter (959.63" at 1 au), s_M = asin(k a / r_M) the Moon's
 * (k = 0.2725076, IAU 1982).  With sigma the angle between the Moon's
 * centre and the shadow axis (the anti-solar point):
 *
 *   umbral magnitude     (rho_u + s_M - sigma) / (2 s_M)
 *   penumbral magnitude  (rho_p + s_M - sigma) / (2 s_M)
 *   P1, P4   sigma = rho_p + s_M       U1, U4   sigma = rho_u + s_M
 *   U2, U3   sigma = rho_u - s_M       greatest: sigma least
 *
 * A point on the Moon is in the umbra when the enlarged Earth's disc, seen
 * from it, covers the whole solar disc, in the penumbra when it covers a
 * part; the visible fraction of the solar disc is the uncovered share of
 * its area (two overlapping circles).
 *
 * References: Explanatory Supplement to the Astronomical Almanac (1992),
 * 8.4 (lunar eclipses; Chauvenet's 2 % and Danjon's 1/85 compared);
 * J. Meeus, Astronomical Algorithms, 2nd ed. (1998), ch. 54; A. Danjon
 * (1951), "Les eclipses de Lune par la penombre en 1951", L'Astronomie 65.
 */

#define ECLIPSE_EARTH_A 6378137.0		/* equatorial radius, m (WGS84) */
#define ECLIPSE_FLAT_FACTOR 0.998340		/* Expl. Suppl.: shadow radius */
#define ECLIPSE_DANJON (1.0 + 1.0 / 85.0)	/* atmosphere, Danjon */
#define ECLIPSE_SUN_SD_1AU 959.63		/* arcsec at 1 au */
#define ECLIPSE_MOON_K 0.2725076		/* Moon radius / Earth a */

enum eclipse_kind {
	ECLIPSE_PENUMBRAL = 0,
	ECLIPSE_PARTIAL,
	ECLIPSE_TOTAL
};

enum eclipse_contact {
	ECLIPSE_P1 = 0,
	ECLIPSE_U1,
	ECLIPSE_U2,
	ECLIPSE_U3,
	ECLIPSE_U4,
	ECLIPSE_P4,
	ECLIPSE_NCONTACTS
};

enum eclipse_shadow {
	ECLIPSE_SHADOW_NONE = 0,
	ECLIPSE_SHADOW_PENUMBRA,
	ECLIPSE_SHADOW_UMBRA
};

/* "penumbral", "partial", "total". */
const char *eclipse_kind_name(enum eclipse_kind k);
/* "P1", "U1", "U2", "U3", "U4", "P4". */
const char *eclipse_contact_name(enum eclipse_contact c);
/* "none", "penumbra", "umbra". */
const char *eclipse_shadow_name(enum eclipse_shadow s);

/* The Moon's centre against the shadow, seen from the Earth's centre. */
struct eclipse_geo {
	double sigma;		/* Moon centre from the shadow axis, rad */
	double umbra;		/* rho_u, rad */
	double penumbra;	/* rho_p, rad */
	double moon_sd;		/* s_M, rad */
	double umbral_mag, penumbral_mag;
};

/*
 * The shadow at the Moon's centre.
 *
 * Given:
 *   sun   double[3]  apparent geocentric Sun, m (any frame)
 *   moon  double[3]  geocentric Moon, same frame, m
 * Returned:
 *   out   angles and magnitudes (formulas above)
 * Notes:
 *   The apparent Sun (with annual aberration) is the right axis: the
 *   shadow at the Moon's distance was cast by the Earth 1.3 s earlier,
 *   which displaces it by the aberration angle.
 * References:
 *   Explanatory Supplement (1992), 8.4; Meeus (1998), ch. 54.
 */
void eclipse_geo_at(const double sun[3], const double moon[3],
    struct eclipse_geo *out);

/* A point on the Moon and the Earth's shadow. */
struct eclipse_point {
	enum eclipse_shadow shadow;
	double sun_visible;	/* visible fraction of the solar disc, 0..1 */
	double umbra_margin;	/* rad: > 0 inside the umbra (the enlarged
				   Earth's radius less the Sun's radius less
				   their separation, seen from the point) */
};

/*
 * Shadow state of a point.
 *
 * Given:
 *   sun    double[3]  apparent geocentric Sun, m
 *   point  double[3]  geocentric position of the point, m
 * Returned:
 *   out    shadow, visible solar fraction, umbra margin
 * Notes:
 *   Seen from the point: the Sun's disc of angular radius asin(R_S/d_S),
 *   the Earth's of asin(a'/d_E) (a' as above), their centres an angle
 *   theta apart.  Umbra: theta + s <= e; penumbra: theta < s + e; the
 *   covered area is the lens of two circles (small-angle plane).
 * References:
 *   Explanatory Supplement (1992), 8.4; Danjon (1951).
 */
void eclipse_point_at(const double sun[3], const double point[3],
    struct eclipse_point *out);

/* One lunar eclipse.  Times are TT JD in two parts (tt1 + tt2). */
struct eclipse_event {
	enum eclipse_kind kind;
	double greatest_tt1, greatest_tt2;
	double umbral_mag, penumbral_mag;	/* at greatest eclipse */
	double gamma;		/* sigma / pi_M' at greatest, signed by the
				   Moon's side of the ecliptic (+ north) */
	int has[ECLIPSE_NCONTACTS];		/* 1 when the contact occurs */
	double contact_tt1[ECLIPSE_NCONTACTS];
	double contact_tt2[ECLIPSE_NCONTACTS];
};

/*
 * Every lunar eclipse whose greatest eclipse falls in a TT span.
 *
 * Given:
 *   from1,2, to1,2  double  TT JD span [from, to), at most 400 years
 *   cap             size_t  room in out
 * Returned:
 *   out             eclipses in time order
 *   n               number found (may exceed cap)
 * Returned (function value):
 *   ERRCODE_OK, ERRCODE_BAD_ARG (span reversed, too long or not finite),
 *   ERRCODE_TOO_LARGE (more than cap: the first cap written),
 *   ERRCODE_NO_CONVERGE
 * Notes:
 *   1. Each full moon (geom_phases_find_kinds, full moons only) within
 *      0.6 d of the span is examined: when sigma at the full moon (the
 *      latitude from the shadow's axis) is beyond 1/0.95 of
 *      rho_p + s_M + 0.002 rad, no eclipse is possible (the least sigma
 *      of the passage is >= 0.99 of it); otherwise sigma is minimised by
 *      golden section over +-0.3 d to 0.01 s; an eclipse is there when
 *      sigma < rho_p + s_M.
 *   2. Each contact is the root of sigma - limit on either side of
 *      greatest eclipse (limit as in the table above, re-evaluated at
 *      each instant), by regula falsi (Illinois) to 1e-7 d (9 ms).
 *   3. Sun and Moon are the core's (geom_bodies_at: ERFA eraEpv00 and
 *      eraMoon98); the Moon is taken 1.3 s back for its light time, so
 *      that times are those seen from the Earth.
 * References:
 *   Meeus (1998), ch. 54; Explanatory Supplement (1992), 8.4.
 * Called:
 *   geom_phases_find_kinds, geom_bodies_at, geom_root_illinois, eraC2s,
 *   eraEcm06, eraRxp
 */
enum errcode eclipse_find(double from1, double from2, double to1,
    double to2, struct eclipse_event *out, size_t cap, size_t *n);

struct fast_track;

/* Offsets a fitted track must cover beyond the span searched, days: a
   passage's least sigma lies within 0.02 d of its full moon and its
   contacts within 0.14 d of greatest eclipse. */
#define ECLIPSE_TRACK_MARGIN 0.3

/*
 * Every lunar eclipse whose greatest eclipse falls in [from, to), TT
 * offsets on a fitted track (core/fastpath.h): eclipse_find's answer for
 * the same span, with the search done on the fit.
 *
 * Given:
 *   ft        the track; it must cover [from - ECLIPSE_TRACK_MARGIN,
 *             to + ECLIPSE_TRACK_MARGIN]
 *   from, to  TT offsets, days
 *   cap       room in out
 * Returned:
 *   out       eclipses in time order (times as TT JDs in two parts, the
 *             first part the track's base1)
 *   n         number found (may exceed cap)
 * Returned (function value):
 *   ERRCODE_OK, ERRCODE_BAD_ARG (span reversed, not finite or not
 *   covered), ERRCODE_TOO_LARGE (more than cap: the first cap written),
 *   ERRCODE_NO_CONVERGE
 * Notes:
 *   1. Full moons are the roots of the fitted synodic angle less
 *      pi + 2 k pi (bracketed a day at a time, to 1 s); each passes
 *      eclipse_find's screen on the fitted bodies (within 0.01" of the
 *      direct chain, against a margin of 0.002 rad).
 *   2. Greatest eclipse: least sigma on the fit by golden section to
 *      0.05 s, then the vertex of sigma^2 through that instant and
 *      +-2 s on the near chain: eraMoon98 at each instant as the direct
 *      chain, and the Sun of the direct chain (geom_bodies_at) at that
 *      instant moved by the fitted Sun's change since (the fit's error
 *      changes by far less than its 0.01" over the hours of an eclipse).
 *      eclipse_find's golden section to 0.01 s finds the same least to
 *      within it.  Magnitudes and gamma from the near chain there.
 *   3. Each contact: the root on the fit to 0.05 s, then on the near
 *      chain by regula falsi (Illinois) to 1e-7 d inside +-1 s of it;
 *      when that bracket does not hold the root, eclipse_find's whole
 *      bracket of 0.3 d on the direct chain.  So a contact differs from
 *      eclipse_find's by no more than the two tolerances (< 0.03 s,
 *      tested).
 *   4. One eraEpv00 and about 15 eraMoon98 an eclipse, none for a full
 *      moon that cannot be eclipsed.
 * References:
 *   Meeus (1998), ch. 54; Explanatory Supplement (1992), 8.4.
 * Called:
 *   fast_track_range, fast_synodic, fast_bodies_seen, eclipse_geo_at,
 *   geom_bodies_at, geom_root_illinois, eraMoon98, eraSxp, eraC2s,
 *   eraEcm06, eraRxp
 */
enum errcode eclipse_find_track(const struct fast_track *ft, double from,
    double to, struct eclipse_event *out, size_t cap, size_t *n);

/* The shadow at the Moon's centre at a TT instant (geom_bodies_at and
   eclipse_geo_at, Moon taken back for its light time). */
enum errcode eclipse_geo_tt(double tt1, double tt2, struct eclipse_geo *out);

#endif
