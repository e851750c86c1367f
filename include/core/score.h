/* SPDX-License-Identifier: BSD-3-Clause */
/* score.h: the yield model learned from the log, coverage weights and the
   ranking of observing windows (pure core). */
#ifndef MOONRANGE_SCORE_H
#define MOONRANGE_SCORE_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/geom.h"
#include "core/link.h"
#include "core/site.h"
#include "core/window.h"

/*
 * Expected yield rate of target j at time t (returns per second):
 *
 *   R_j(t) = q * r_j * exp(-2 tau X(h(t))) * (R0 / R(t))^4
 *            * (f_j if sunlit else 1)
 *
 * q the fire rate (shots/s), r_j returns per shot above the atmosphere
 * at the mean distance R0 (LINK_R0), in the station's typical seeing and
 * in lunar darkness (in the Earth's umbra a target is dark), f_j the
 * sunlit/dark factor, tau the zenith optical depth (one way), X the
 * Kasten & Young airmass at the target's elevation h, R(t) the range.
 * The true zenith rate at R0 is r_j exp(-2 tau).  r_j = e_j n_j: n_j the
 * link-equation prior (core/link.h) times the target's strength, e_j its
 * efficiency learned from the log.  Coverage weight of synodic-angle bin
 * b:
 *
 *   W(b) = ((nbar + k) / (n_b + k))^alpha
 *
 * n_b the normal points in b (of the target, or pooled), nbar their mean
 * over the bins.  Score of a window = integral of R_j(t) W(b(t)) dt.
 * README ("Windows and ranking") writes out the estimators.
 */

#define SCORE_BINS_MIN 4
#define SCORE_BINS_MAX 72

struct score_settings {
	int nbins;		/* synodic-angle bins, SCORE_BINS_MIN..MAX */
	double alpha;		/* coverage-weight exponent, 0..4; 0 = off */
	double k;		/* smoothing count, > 0 */
	int per_target;		/* 1: n_b of the target; 0: pooled */
	double prior_sunlit;	/* sunlit/dark factor with no history */
	double prior_weight;	/* weight of each gamma prior, in expected
				   returns (pseudo-exposure) */
	double step_s;		/* quadrature: parts of a window are at most
				   60 step_s long (8 Gauss-Legendre nodes
				   each), s */
};

/* Defaults: 12 bins, alpha 1, k 1, pooled, prior sunlit factor 0.5,
   prior weight 20 expected returns, step 120 s. */
void score_settings_default(struct score_settings *s);

/* ERRCODE_BAD_ARG when a field is out of range; *field names it. */
enum errcode score_settings_check(const struct score_settings *s,
    const char **field);

/* --- atmosphere --- */

/*
 * Relative optical airmass.
 *
 * Given:
 *   el_rad  double  elevation of the target, rad (geometric)
 * Returned (function value):
 *   X, dimensionless; X(90 deg) = 1; elevations below 0 are taken as 0
 *   (X = 38.1)
 * Notes:
 *   Kasten & Young's interpolation formula, within 0.1 % of their
 *   tabulated model atmosphere (ISO 2533) to the horizon:
 *     X = 1 / (sin h + 0.50572 (h + 6.07995)^-1.6364), h in degrees.
 * References:
 *   F. Kasten and A. T. Young, "Revised optical air mass tables and
 *   approximation formula", Applied Optics 28, 4735-4738 (1989), eq. (3).
 */
double score_airmass(double el_rad);

/* Two-way transmission exp(-2 tau X(el)). */
double score_transmission(double tau, double el_rad);

/* --- the yield model --- */

struct score_yield {
	double rate;		/* r_j, returns per shot above the atmosphere,
				   R0, typical seeing, dark */
	double sunlit_factor;	/* f_j */
	double link_rate;	/* n_j, the link-equation prior of r_j */
	double efficiency;	/* e_j = r_j / n_j */
	double prior_rate;	/* the prior mean of r_j (n_j x base) */
	double dark_returns, dark_exposure;	/* sums over the log; exposure
				   in shots x T x (R0/R)^4 x seeing factor */
	double lit_returns, lit_exposure;
	long attempts;		/* attempts used */
};

struct score_model {
	double base_efficiency;	/* pooled efficiency against the link
				   equation (prior 1) */
	double base_sunlit;	/* pooled sunlit factor */
	long attempts_used, attempts_skipped;
};

/*
 * The sums score_fit reads from the log for one target: its sufficient
 * statistics, the same whichever way the log is read (core/logstats.h
 * keeps them per target as the log grows).
 */
struct score_sums {
	long used;			/* usable attempts */
	long dark_returns, lit_returns;
	double dark_exposure, lit_exposure;	/* E of score_fit note 1 */
};

/*
 * Add one attempt to u when it is usable (score_fit note 1), with its
 * exposure under tau and the typical seeing of ls.
 * Returned (function value): 1 when added, 0 when skipped.
 */
int score_sums_add(struct score_sums *u, const struct link_station *ls,
    double tau, const struct site_attempt *a);

/*
 * score_fit from the sums: sums[nt] of the targets, in their order (the
 * exposures taken under st's tau and typical seeing), and na the
 * attempts of the log, used or not.
 * Called:
 *   link_photoelectrons, site_station_link, site_target_link
 */
enum errcode score_fit_sums(const struct score_settings *s,
    const struct site_station *st, const struct site_target *targets,
    size_t nt, const struct score_sums *sums, long na,
    struct score_yield *yield, struct score_model *model);

/*
 * Learn r_j and f_j for each target from the log.
 *
 * Given:
 *   s          settings (priors)
 *   st         station: zenith_tau and the link budget (site_station_link)
 *   targets    nt targets (cubes and strength set the prior)
 *   att        na attempts (target_el_deg, sun_el_target_deg and
 *              range_km at the mid-time, as the store computes them)
 * Returned:
 *   yield      nt entries, in the order of targets
 *   model      the pooled quantities
 * Returned (function value):
 *   ERRCODE_OK, ERRCODE_BAD_ARG (tau < 0 or a strength <= 0)
 * Notes:
 *   1. Attempts used: outcome ranged or no_returns, shots > 0, target
 *      elevation above 0; others (weather, technical, safety, other) say
 *      nothing about the target and are skipped.  Exposure of an attempt
 *      E = shots exp(-2 tau X(h)) (theta_0/theta)^2 (R0/R)^4, theta its
 *      seeing (the station's typical theta_0 when not logged), R its
 *      range (R0 when not stored): the link equation's scaling laws
 *      (link_rate_factor).  It is dark when the Sun is below the target's
 *      horizon, else sunlit.
 *   2. n_j = strength_j x link_photoelectrons(station, target, R0, 1).
 *      Gamma-Poisson shrinkage, prior weight w = prior_weight (in
 *      expected returns at efficiency 1):
 *        base = (w + sum R_dark) / (w + sum n_j E_dark,j)
 *        e_j  = (base w + R_dark,j) / (w + n_j E_dark,j),  r_j = e_j n_j
 *        fbase = (prior_sunlit w + sum R_lit,j) / (w + sum r_j E_lit,j)
 *        f_j  = (fbase w + R_lit,j) / (w + r_j E_lit,j)
 *      Each is the posterior mean of a Poisson rate factor under a gamma
 *      prior with that mean and w of weight: the efficiency is shrunk
 *      toward the station's pooled efficiency, itself shrunk toward 1
 *      (the link equation as it stands); as exposure grows the estimate
 *      tends to the observed one.
 * Called:
 *   score_sums_add, score_fit_sums, site_station_link
 */
enum errcode score_fit(const struct score_settings *s,
    const struct site_station *st, const struct site_target *targets,
    size_t nt, const struct site_attempt *att, size_t na,
    struct score_yield *yield, struct score_model *model);

/*
 * The range and seeing factor of a rate relative to the mean distance
 * and the station's typical seeing (link_rate_factor with the station's
 * link budget); NaN seeing is the typical one, NaN or <= 0 range is R0.
 */
double score_link_factor(const struct site_station *st, double seeing_arcsec,
    double range_m);

/* (R0 / R)^4 at range R (m); 1 for a range that is not positive. */
double score_range_factor(double range_m);

/* R_j(t) = q r_j T (f_j if sunlit else 1), returns per second, given
   T = exp(-2 tau X(h)) (R0/R)^4: the two-way transmission at the target's
   elevation times the range factor (score_range_factor). */
double score_rate(double fire_rate_hz, const struct score_yield *y,
    double transmission, int sunlit);

/* --- coverage weights --- */

/* Bin of a synodic angle in degrees (wrapped into 0..360). */
int score_bin_of(double synodic_deg, int nbins);

/* Add weight points at a synodic angle to counts[nbins] (NaN: ignored). */
void score_bin_add(long *counts, int nbins, double synodic_deg, long weight);

/* Mean of counts[nbins]. */
double score_bin_mean(const long *counts, int nbins);

/* ((nbar + k) / (n + k))^alpha. */
double score_coverage_weight(long n, double nbar, double k, double alpha);

/* --- scoring a window --- */

struct score_target {
	const struct geom_target *body;	/* NULL: the Moon's centre (lit/dark
					   then taken at selenographic 0, 0) */
	struct score_yield yield;
	const long *counts;		/* nbins counts used for W */
};

struct score_window {
	size_t rank;			/* 1 = best, after score_rank */
	size_t target;			/* index of the caller's target */
	double start, end;		/* TT offsets on the track, days */
	double duration_s;
	double max_el;			/* rad */
	double max_el_t;		/* TT offset, days */
	double synodic;			/* at the middle, rad 0..2pi */
	int phase_bin;			/* bin at the middle */
	long bin_count;			/* n_b of that bin */
	double bin_mean;		/* nbar */
	int bins_crossed;		/* bin boundaries inside the window */
	double coverage_weight;		/* score / expected_returns (W of the
					   bin when none is crossed) */
	double sunlit_fraction;		/* share of the time sunlit */
	double mean_airmass;		/* time mean of X */
	double mean_transmission;	/* time mean of exp(-2 tau X) */
	double mean_range_factor;	/* time mean of (R0 / R)^4 */
	double expected_returns;	/* integral of R dt */
	double score;			/* integral of R W dt */
};

struct score_params {
	const struct window_track *tr;
	const struct score_settings *s;
	double tau;			/* zenith optical depth, one way */
	double fire_rate_hz;		/* shots per second */
};

/*
 * Score one window.
 *
 * Given:
 *   p      track, settings, tau, fire rate
 *   t      the target, its yield and counts
 *   w      the window (target index, start, end)
 * Returned:
 *   out    every factor (rank left 0)
 * Returned (function value):
 *   ERRCODE_OK, ERRCODE_BAD_ARG (end before start, bad settings)
 * Notes:
 *   1. The window is cut where the integrand is not smooth: at the bin
 *      boundaries of the synodic angle and where the target turns lit or
 *      dark (its dark margin, scanned in steps too short for it to change
 *      sign), each cut refined to 1 ms by regula falsi.  Each piece, one
 *      bin and one lit state, is split into equal parts of at most
 *      60 step_s (2 h by default), each
 *      integrated by 8-point Gauss-Legendre quadrature: the integrand is
 *      smooth there, so the error is far below the 1-s midpoint rule's
 *      (test_score compares against it).
 *   2. Elevations and lit states come from the track's light frames
 *      (fast_frame_at): only what the integrand reads is computed.
 *   3. The maximum elevation is refined by successive parabolas about
 *      the best node to 0.05 s (golden section to 1 s when the first is
 *      not concave).
 *   4. The rate carries (R0/R)^4 at each node, R the target's range
 *      (fast_target_topo); mean_range_factor is its time mean.
 * References:
 *   Abramowitz & Stegun (1964), 25.4.30 and table 25.4.
 * Called:
 *   fast_frame_at, fast_elevation, fast_target_el, fast_target_topo,
 *   window_track_synodic, geom_root_illinois, score_airmass,
 *   score_coverage_weight, score_range_factor, eraAnp
 */
enum errcode score_window(const struct score_params *p,
    const struct score_target *t, const struct window *w,
    struct score_window *out);

/*
 * Rank windows together: by score (descending), then start, then target
 * index; sets rank 1..n.
 */
void score_rank(struct score_window *w, size_t n);

#endif
