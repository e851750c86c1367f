/* SPDX-License-Identifier: BSD-3-Clause */
/* window.h: observing windows of lunar targets under a station's limits
   (pure core). */
#ifndef MOONRANGE_WINDOW_H
#define MOONRANGE_WINDOW_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/fastpath.h"
#include "core/geom.h"

/*
 * A window is a maximal interval of TT in which every constraint of the
 * station holds for one target:
 *
 *   target elevation (geometric)     >= min_el
 *   Sun elevation at the station     <= max_sun_el
 *   Sun-Moon separation (topocentric) >= min_sun_sep
 *   outside every blackout
 *   dark_only targets: Sun below the target's local lunar horizon, or
 *                    the target in the Earth's umbra (geom_target_view's
 *                    dark_margin > 0)
 *
 * Work is in two steps.  window_track_init fits the Moon, the Sun and
 * the Earth's orientation over the span (core/fastpath.h: Chebyshev
 * series per segment fitted to the same ERFA models); window_track_instant
 * rebuilds any instant from the fit.  window_find follows each elevation
 * (the targets' and the Sun's) from one meridian transit to the next,
 * predicting its crossings of the limit from the hour angle and
 * declination; it samples the other constraints on a WINDOW_GRID_DAYS
 * grid through light frames that compute only what the constraint reads,
 * brackets sign changes and extrema, and refines each edge by root
 * finding.
 *
 * Times inside this module are TT in days since the track's base (the
 * start of the span), so one double holds them to ~1e-11 d.  Nothing
 * here allocates; the caller owns nodes and output arrays.
 */

#define WINDOW_NODE_DAYS 0.25		/* margin unit of the fit, days */
#define WINDOW_GRID_DAYS (20.0 / 1440.0) /* constraint grid: 20 min */
#define WINDOW_EDGE_TOL_S 0.2		/* edges refined to this, s */
#define WINDOW_MAX_TARGETS 64		/* targets in one search */
#define WINDOW_MAX_SPAN_DAYS 3660.0	/* longest span, days */

/* --- the track: the fitted ephemeris over a span --- */

/* Storage of the track: one fitted segment (FAST_SEG_DAYS) each. */
struct window_node {
	struct fast_seg seg;
};

struct window_track {
	struct geom_site site;		/* the station (copy) */
	struct geom_eop eop;		/* held constant over the span */
	double base1, base2;		/* TT JD of offset 0 (span start) */
	double span;			/* span length, days */
	struct fast_track ft;		/* the fit (borrows the nodes) */
};

/* Nodes needed for a span of this many days (margins included). */
size_t window_track_nodes(double span_days);

/*
 * Tabulate the span [tt, tt + span_days] for a station.
 *
 * Given:
 *   site       initialised station (geom_site_init)
 *   eop        UT1-UTC and polar motion, constant over the span; NULL: 0
 *   tt1, tt2   TT JD of the span start
 *   span_days  length, 0 < span_days <= WINDOW_MAX_SPAN_DAYS
 *   nodes, cap caller storage, cap >= window_track_nodes(span_days)
 * Returned:
 *   tr         the track (borrows nodes: keep them alive while tr is used)
 * Returned (function value):
 *   ERRCODE_OK, ERRCODE_BAD_ARG (span out of range), ERRCODE_TOO_LARGE
 *   (cap too small), ERRCODE_BAD_TIME (span outside ERFA's range)
 * Notes:
 *   1. The fit covers the span with a margin of two grid steps and two
 *      WINDOW_NODE_DAYS on each side (fast_track_init; directions within
 *      0.01" of the direct IAU 2006/2000A chain).
 *   2. A constant DUT1 over a year moves the Earth by at most ~1 s of
 *      rotation (15"), i.e. well under 1 s in a window edge; callers that
 *      have a table may pass the value at the span's middle.
 * Called:
 *   fast_track_init
 */
enum errcode window_track_init(struct window_track *tr,
    const struct geom_site *site, const struct geom_eop *eop, double tt1,
    double tt2, double span_days, struct window_node *nodes, size_t cap);

/*
 * The instant at offset t (TT days since the base) from the track.
 *
 * Notes:
 *   1. fast_instant: every field as geom_instant_make builds it, from the
 *      fitted Moon, Sun and Earth orientation.
 *   2. t is clamped into the fitted range.
 *   3. out->t carries TT exactly and UT1 as the direct path; UTC is
 *      UT1 - DUT1 (on a leap-second day it may differ from ERFA's
 *      quasi-JD by a fraction of that second).
 * Called:
 *   fast_instant
 */
void window_track_instant(const struct window_track *tr, double t,
    struct geom_instant *out);

/* Synodic angle at offset t, rad, unwrapped (increasing along the track). */
double window_track_synodic(const struct window_track *tr, double t);

/* --- the search --- */

struct window_limits {
	double min_el;		/* target elevation >= this, rad (geometric) */
	double max_sun_el;	/* Sun at the station <= this, rad; >= pi/2
				   switches the constraint off */
	double min_sun_sep;	/* Sun-Moon separation >= this, rad; <= 0
				   switches it off */
};

struct window_target {
	const struct geom_target *body;	/* NULL: the Moon's centre */
	int dark_only;			/* 1: Sun below the target's local
					   horizon (ignored for the centre) */
};

/* An interval of TT offsets (days since the track base), start < end. */
struct window_interval {
	double start, end;
};

struct window {
	size_t target;		/* index into the targets given */
	double start, end;	/* TT offsets, days since the track base */
};

/*
 * Every window of every target in the track's span.
 *
 * Given:
 *   tr          the track
 *   lim         the station's limits
 *   targets     ntargets (1..WINDOW_MAX_TARGETS) targets
 *   blackouts   nblackouts intervals (any order, may overlap; NULL if 0)
 *   cap         room in out
 * Returned:
 *   out         windows in order of their end (then target index)
 *   n           the number found (may exceed cap)
 * Returned (function value):
 *   ERRCODE_OK, ERRCODE_BAD_ARG (no or too many targets, limits not
 *   finite), ERRCODE_TOO_LARGE (more than cap windows: the first cap are
 *   written, *n counts all)
 * Notes:
 *   1. Elevations (stations below |lat| 80 deg): sin e = sin phi sin d +
 *      cos phi cos d cos H for the body's hour angle H and declination d
 *      (ITRS), so e has one maximum near each upper transit and one
 *      minimum near each lower one and is monotone between them.  Each
 *      transit is found by secant steps on H; a transit whose elevation
 *      is near the limit (0.1 deg / (cos phi cos d), about three times
 *      what d's drift can make the extremum differ from it) is replaced
 *      by the extremum itself (golden section), so a window of seconds
 *      at culmination is found; between consecutive points of opposite
 *      sides the one crossing starts from the hour angle the formula
 *      gives and is refined by secant steps inside the bracket to
 *      0.01 s.  About 12 evaluations a day against 72 grid samples.
 *   2. The separation and lunar darkness (and elevations beyond |lat|
 *      80 deg) are sampled every WINDOW_GRID_DAYS (plus one step of
 *      margin at both ends).  A sign change between neighbours is
 *      refined by the Illinois variant of regula falsi to
 *      WINDOW_EDGE_TOL_S.  A sample that is a local extremum of the
 *      wrong sign (a maximum still below the limit, a minimum still above
 *      it) starts a golden-section search over its two neighbouring
 *      cells; when the extremum crosses the limit its two roots are
 *      refined the same way.  Three roots of one constraint inside one
 *      20 min cell are not resolved (none of these functions turns that
 *      fast for a station below |lat| 89 deg).
 *   3. Windows are clipped at the span's ends and at blackouts.
 *   4. Elevations are geometric (airless): refraction raises a target at
 *      20 deg by about 2.6'.
 * References:
 *   Press et al., Numerical Recipes in C, 2nd ed. (1992), 9.2 (false
 *   position) and 10.1 (golden section); J. Meeus, Astronomical
 *   Algorithms, 2nd ed. (1998), eq. 13.6 (altitude from hour angle and
 *   declination).
 * Called:
 *   fast_frame_at, fast_elevation, fast_separation, fast_target_el,
 *   fast_target_topo, geom_root_illinois, eraAnpm
 */
enum errcode window_find(const struct window_track *tr,
    const struct window_limits *lim, const struct window_target *targets,
    size_t ntargets, const struct window_interval *blackouts,
    size_t nblackouts, struct window *out, size_t cap, size_t *n);

/*
 * Every constraint at one instant, for checks and reports: 1 when all
 * hold (outside blackouts is the caller's business), else 0.
 */
int window_constraints_hold(const struct geom_instant *g,
    const struct window_limits *lim, const struct window_target *target);

#endif
