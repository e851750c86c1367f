/* SPDX-License-Identifier: BSD-3-Clause */
/* fastpath.h: Moon, Sun and Earth orientation fitted by Chebyshev series
   over a span, for evaluating many instants cheaply (pure core). */
#ifndef MOONRANGE_FASTPATH_H
#define MOONRANGE_FASTPATH_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/geom.h"

/*
 * The fast path.  Over a span of TT, cut into segments of FAST_SEG_DAYS,
 * each segment holds Chebyshev series fitted to the same ERFA models the
 * direct path (geom_instant_at) calls, so that answers do not change:
 *
 *   Moon     eraMoon98 positions at FAST_MOON_NODES Chebyshev-Lobatto
 *            nodes (degree FAST_MOON_NODES - 1; eraMoon98's velocity is
 *            not the exact derivative of its position, by ~1 mm/s, so
 *            it is not fitted); velocity from the series' derivative,
 *            light time applied per instant as in geom_instant_make
 *   Sun      minus eraEpv00's heliocentric Earth, position and velocity
 *            at FAST_SUN_NODES nodes (Hermite), and the Earth's
 *            barycentric velocity / c for annual aberration (eraAb per
 *            instant).  Segments go in pairs: eraEpv00 runs at the
 *            segment boundaries only; a segment's middle node takes the
 *            Earth-Moon barycentre (free of the monthly wobble) from a
 *            Hermite fit over the pair's three boundaries, less the
 *            Moon's share of eraMoon98 there (within 0.0003" of a Kepler
 *            orbit over 16 d; the fitted Sun stays within 0.004" of the
 *            direct chain)
 *   Earth    CIP X, Y and the CIO locator s (IAU 2006 precession with
 *            IAU 2000B nutation scaled as eraNut06a scales 2000A: within
 *            ~1 mas of eraPnm06a) and the equation of the origins, at
 *            FAST_ORI_NODES nodes; the Earth rotation angle is exact per
 *            instant (eraEra00 of UT1 at the segment's start plus the
 *            IERS rate times the UT1 elapsed); polar motion constant (as
 *            the callers' EOP are)
 *   Moon's   IAU 2009 pole and prime meridian angles (geom_lunar_angles)
 *   frame    at FAST_ORI_NODES
 *   synodic  geom_synodic_of's formula per instant on the fitted bodies,
 *   angle    with the ecliptic of date held at the segment's middle (its
 *            precession turns both longitudes alike); a coarse fit at
 *            FAST_ORI_NODES only unwraps it along the track
 *   UT1      TT-UT1 linear per segment, with the one step of a leap
 *            second located to 1e-9 d where a segment holds one (before
 *            1972 eraUtcut1 takes TAI-UTC at 0h of each day, a staircase
 *            of up to 2.6 ms a day that the line cuts through: <= 0.04")
 *
 * Work shared by all targets (the fitted bodies, the GCRS->ITRS matrix,
 * the light time) is done once per instant in a frame (fast_frame_at);
 * what a caller reads beyond the Moon's centre (the Sun, the lunar
 * frame) is computed only when asked for.  Times are TT offsets in days
 * from the track's base.  Nothing here allocates or does I/O: the caller
 * owns the segments.
 */

#define FAST_SEG_DAYS 8.0
#define FAST_MOON_NODES 13		/* odd: the other fits use subsets */
#define FAST_MOON_NC FAST_MOON_NODES
#define FAST_ORI_NODES 7		/* every second Moon node */
#define FAST_VEL_NC 8			/* terms of the Moon's velocity read
					   (for the 1.3 s of light time) */
#define FAST_SUN_NODES 3		/* both ends and the middle */
#define FAST_SUN_NC (2 * FAST_SUN_NODES)

/* One segment of the fit: coefficients in x = 2 (t - mid) / len. */
struct fast_seg {
	double mid;				/* offset of the middle, days */
	double moon[3][FAST_MOON_NC];		/* Moon, GCRS, m */
	double dmoon[3][FAST_MOON_NC];		/* d moon / dx */
	double ecm[3][3];			/* GCRS -> ecliptic of date */
	double sun[3][FAST_SUN_NC];		/* geometric Sun, GCRS, m */
	double beta[3][FAST_SUN_NODES];		/* Earth velocity / c */
	double ori[4][FAST_ORI_NODES];		/* X, Y, s, EO, rad */
	double lun[3][FAST_ORI_NODES];		/* lunar ra, dec, W, rad */
	double syn[FAST_ORI_NODES];		/* synodic, rad, unwrapped
						   (coarse, < 10") */
	double dut[2][2];	/* TT-UT1, days: value at the piece's start
				   and slope, before and after step */
	double step;		/* offset of a UT1 step inside, else > end */
	double era;		/* Earth rotation angle at the start, rad */
};

struct fast_track {
	struct geom_site site;		/* the station (copy) */
	struct geom_eop eop;		/* constant over the span */
	double base1, base2;		/* TT JD of offset 0 */
	double t0;			/* offset of segment 0's start, days */
	double len;			/* segment length, days */
	double rpom[3][3];		/* polar motion matrix */
	const struct fast_seg *seg;
	size_t n;
};

/* Segments needed to cover offsets [from, to] (0 if to <= from or the
   span is over 4000 days). */
size_t fast_track_segments(double from, double to);

/*
 * Fit the span.
 *
 * Given:
 *   site       initialised station
 *   eop        UT1-UTC and polar motion, constant; NULL: zero
 *   tt1, tt2   TT JD of offset 0
 *   from, to   offsets covered, days (from < to)
 *   seg, cap   caller storage, cap >= fast_track_segments(from, to)
 * Returned:
 *   ft         the track (borrows seg)
 * Returned (function value):
 *   ERRCODE_OK, ERRCODE_BAD_ARG, ERRCODE_TOO_LARGE (cap too small),
 *   ERRCODE_BAD_TIME (outside the time scales' range)
 * Notes:
 *   1. Against the direct chain (eraMoon98, eraEpv00, IAU 2006/2000A)
 *      the fitted directions agree to < 0.01" over 1900-2100 (tested
 *      to 0.1" in test_fastpath); the IAU 2000B nodes differ from
 *      2006/2000A by < 1 mas.
 *   2. Cost per segment: 12 eraMoon98, 1 eraEpv00, 6 Earth-orientation
 *      and lunar-frame evaluations (about 0.12 ms).
 * Called:
 *   eraMoon98, eraEpv00, eraNut00b, eraPn06, eraBpn2xy, eraS06, eraEors,
 *   eraEcm06, eraPom00, eraSp00, geom_lunar_angles, geom_synodic_of,
 *   tscale_from_tt, eraAb, eraAnpm, eraEra00
 */
enum errcode fast_track_init(struct fast_track *ft,
    const struct geom_site *site, const struct geom_eop *eop, double tt1,
    double tt2, double from, double to, struct fast_seg *seg, size_t cap);

/* What a frame computes beyond the Moon's centre. */
enum {
	FAST_SUN = 1,		/* the apparent Sun */
	FAST_LUNAR = 2		/* the Moon's body-fixed frame */
};

/* Everything shared by targets at one instant (fast_frame_at). */
struct fast_frame {
	double t;			/* TT offset, days */
	unsigned have;			/* FAST_SUN | FAST_LUNAR computed */
	double rc2t[3][3];		/* GCRS -> ITRS */
	double site_gcrs[3];		/* station, GCRS, m */
	double tau;			/* light time to the Moon's centre, s */
	double moon_p[3], moon_v[3];	/* geocentric Moon at t, m, m/s */
	double moon_ret[3];		/* geocentric Moon at t - tau, m */
	double moon_itrs[3];		/* station -> Moon, ITRS, m */
	double sun_p[3];		/* apparent geocentric Sun, m */
	double sun_itrs[3];		/* station -> Sun, ITRS, m */
	double lunar_rot[3][3];		/* GCRS -> lunar body-fixed, t - tau */
};

/*
 * The frame at offset t (clamped into the fitted range); need is a set
 * of FAST_SUN and FAST_LUNAR.
 *
 * Called:
 *   eraAb, geom_lunar_matrix
 */
void fast_frame_at(const struct fast_track *ft, double t, unsigned need,
    struct fast_frame *f);

/*
 * The frame at offset t for an instant's own Earth orientation: UT1 (two
 * parts) and polar motion given, not the track's; what is fitted (bodies,
 * X, Y, s, the lunar frame) still comes from the track.  For records each
 * with its own EOP (derive_cache).
 *
 * Called:
 *   eraPom00, eraSp00, eraEra00, eraAb, geom_lunar_matrix
 */
void fast_frame_earth(const struct fast_track *ft, double t, double ut11,
    double ut12, const struct geom_eop *eop, unsigned need,
    struct fast_frame *f);

/* Geometric elevation of an ITRS topocentric vector at the station. */
double fast_elevation(const struct fast_track *ft, const double itrs[3]);

/* Sun-Moon separation seen from the station (frame with FAST_SUN), rad. */
double fast_separation(const struct fast_frame *f);

/*
 * A lunar target in a frame with FAST_LUNAR (and FAST_SUN when sun_el or
 * dark is wanted): its geometric elevation; *sun_el (if not NULL) the Sun
 * above its local lunar horizon, *dark (if not NULL) geom_target_view's
 * dark_margin (> 0 when the Sun is below that horizon or the target in
 * the Earth's umbra).
 *
 * Called:
 *   fast_elevation, eclipse_point_at
 */
double fast_target_el(const struct fast_track *ft,
    const struct fast_frame *f, const struct geom_target *t,
    double *sun_el, double *dark);

/* A lunar target in a frame with FAST_LUNAR: topo, the station-to-target
   vector (ITRS, m), radial, the target from the Moon's centre (GCRS, m);
   returns the range |topo|. */
double fast_target_topo(const struct fast_frame *f,
    const struct geom_target *t, double topo[3], double radial[3]);

/*
 * The apparent geocentric Sun and the geocentric Moon taken back by its
 * light time from the Earth's centre (m, GCRS) at offset t (clamped into
 * the fitted range): what eclipse_geo_tt reads from the direct chain.
 */
void fast_bodies_seen(const struct fast_track *ft, double t, double sun[3],
    double moon[3]);

/* The synodic angle on a track less an angle, as a function of the
   offset for geom_root_illinois (ctx: a struct fast_synodic_goal). */
struct fast_synodic_goal {
	const struct fast_track *ft;
	double ang;			/* rad, on the unwrapped scale */
};
double fast_synodic_less(void *ctx, double t);

/* The offsets the track covers: [*lo, *hi]. */
void fast_track_range(const struct fast_track *ft, double *lo, double *hi);

/* Synodic angle at offset t, rad, unwrapped along the track (as
   geom_synodic_of on the fitted bodies). */
double fast_synodic(const struct fast_track *ft, double t);

/*
 * The full instant at offset t, as geom_instant_at would build it from
 * the same TT (geom_instant_make on fitted bodies and Earth orientation).
 *
 * Called:
 *   fast_frame_at, eraFad03, geom_instant_make, eraAb, eraAnp, eraAnpm, eraRz
 */
void fast_instant(const struct fast_track *ft, double t,
    struct geom_instant *out);

#endif
