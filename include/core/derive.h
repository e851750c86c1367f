/* SPDX-License-Identifier: BSD-3-Clause */
/* derive.h: the angles stored with each attempt and normal point, computed
   by the geometry core (pure). */
#ifndef MOONRANGE_DERIVE_H
#define MOONRANGE_DERIVE_H

#include "core/errcode.h"
#include "core/fastpath.h"
#include "core/geom.h"
#include "core/site.h"

/*
 * The store records, beside each attempt (at its mid-time) and each normal
 * point (at its epoch), the phase and pointing it was taken at, so that
 * coverage audits never depend on recomputing.  Everything here is pure:
 * the caller passes the station, the target and the Earth orientation
 * (from eop_lookup, or zeros when no table covers the instant).
 */

struct derive_angles {
	double synodic_deg;		/* Moon - Sun apparent ecliptic
					   longitude, 0 <= x < 360 */
	double mean_elong_deg;		/* Delaunay D, 0 <= x < 360 */
	double target_el_deg;		/* geometric elevation of the target
					   at the station, -90..90 */
	double sun_el_target_deg;	/* Sun above the target's lunar
					   horizon, -90..90 */
	double range_km;		/* station to target (stored with
					   attempts, for the R^-4 law) */
};

/*
 * The geometry core's station from a station record (degrees to radians,
 * the record's weather and wavelength for refraction).
 * ERRCODE_BAD_ARG when the position or the weather is out of range.
 */
enum errcode derive_site(const struct site_station *st, struct geom_site *out);

/*
 * Angles of target t seen from station st at a UTC MJD.
 *
 * Given:
 *   st       site_station    WGS84 station and its weather
 *   t        site_target     selenographic position (deg, m)
 *   eop      geom_eop        UT1-UTC (s) and polar motion (rad); NULL = 0
 *   utc_mjd  double          UTC MJD (quasi-JD minus 2400000.5)
 * Returned:
 *   out      derive_angles   degrees, see above
 * Returned (function value):
 *   ERRCODE_OK; ERRCODE_BAD_ARG for a station or target out of range;
 *   ERRCODE_BAD_TIME when ERFA cannot convert the time.
 * Notes:
 *   1) Computed on the fast path (derive_at_cached with a fresh cache):
 *      the 8-day segment of a fixed grid that holds the instant, fitted to
 *      the Moon of eraMoon98, the Sun of eraEpv00, IAU 2006 precession
 *      and the IAU WGCCRE lunar frame (see fastpath.h), with the record's
 *      own UT1 and polar motion.  So one record gets the same angles
 *      whether it is logged alone or imported among 200,000, in any
 *      order; they are within 0.005" of derive_at_direct (test_derive).
 *   2) The elevation is geometric (airless); refraction is not applied,
 *      so the stored value does not depend on the weather of the night.
 *   3) The synodic angle and D depend on time only; the two elevations on
 *      station and target too.
 * References:
 *   Archinal et al. 2011, Celest. Mech. Dyn. Astr. 109, 101 (lunar
 *   orientation); IERS Conventions 2003 (Delaunay D).
 * Called:
 *   derive_cache_init, derive_at_cached
 */
enum errcode derive_at(const struct site_station *st,
    const struct site_target *t, const struct geom_eop *eop, double utc_mjd,
    struct derive_angles *out);

/*
 * The same on the direct chain: geom_instant_at at full precision (IAU
 * 2006/2000A), one instant at a time; the reference of the fast path.
 *
 * Called:
 *   derive_site, geom_instant_at, geom_target_from_selen,
 *   geom_target_view
 */
enum errcode derive_at_direct(const struct site_station *st,
    const struct site_target *t, const struct geom_eop *eop, double utc_mjd,
    struct derive_angles *out);

/* derive_at at the mid-time of an attempt; fills a's derived fields. */
enum errcode derive_attempt(const struct site_station *st,
    const struct site_target *t, const struct geom_eop *eop,
    struct site_attempt *a);

/* derive_at at the epoch of a normal point; fills np's derived fields. */
enum errcode derive_normal_point(const struct site_station *st,
    const struct site_target *t, const struct geom_eop *eop,
    struct site_normal_point *np);

/*
 * The same angles for many records through the fast path: the bodies,
 * the CIP and the lunar frame fitted over one FAST_SEG_DAYS segment of a
 * fixed grid from J2000, refitted when a record falls in another (so
 * records in time order share one fit each 8 days, and a record's angles
 * do not depend on the order of an import); each record's own UT1 and
 * polar motion (fast_frame_earth).  The cache is the caller's (zero it, or
 * derive_cache_init, before the first use); it holds no pointers.
 */
struct derive_cache {
	int valid;
	double lat_deg, lon_deg, height_m;	/* station of the fit */
	struct fast_track ft;
	struct fast_seg seg[1];
};

void derive_cache_init(struct derive_cache *c);

/*
 * derive_at through a cache.
 *
 * Notes:
 *   Within 0.005" of derive_at_direct (test_derive; test_fastpath bounds
 *   the fast path at 0.1" over 1900-2100), and equal to derive_at.
 * Called:
 *   derive_site, geom_target_from_selen, tscale_from_utc,
 *   fast_track_init, fast_frame_earth, fast_target_el, fast_synodic,
 *   eraFad03
 */
enum errcode derive_at_cached(struct derive_cache *c,
    const struct site_station *st, const struct site_target *t,
    const struct geom_eop *eop, double utc_mjd, struct derive_angles *out);

/* derive_attempt and derive_normal_point through a cache. */
enum errcode derive_attempt_cached(struct derive_cache *c,
    const struct site_station *st, const struct site_target *t,
    const struct geom_eop *eop, struct site_attempt *a);
enum errcode derive_normal_point_cached(struct derive_cache *c,
    const struct site_station *st, const struct site_target *t,
    const struct geom_eop *eop, struct site_normal_point *np);

#endif
