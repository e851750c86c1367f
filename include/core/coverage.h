/* SPDX-License-Identifier: BSD-3-Clause */
/* coverage.h: binning of normal points and attempts over the lunar cycle,
   and the audit's metrics (pure core). */
#ifndef MOONRANGE_COVERAGE_H
#define MOONRANGE_COVERAGE_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/geom.h"
#include "core/site.h"

/*
 * The coverage audit.  Records (normal points, attempts) are binned by an
 * angle of the lunar cycle, per target, pooled over targets and per
 * calendar year (UTC), and each set of counts gets the same metrics.
 *
 * Everything here is pure: the caller passes plain arrays of site.h
 * records and a caller-owned result (large: allocate it, do not put it on
 * a small stack); nothing is allocated, read from a clock or a file.
 */

#define COVERAGE_BINS_MIN 4
#define COVERAGE_BINS_MAX 72
#define COVERAGE_BINS_DEFAULT 12
#define COVERAGE_MAX_TARGETS 64	/* distinct targets in one result */
#define COVERAGE_MAX_YEARS 100	/* distinct calendar years in one result */
#define COVERAGE_EMPTIEST 3	/* emptiest bins listed at least */
#define COVERAGE_FILL_PER_BIN 3	/* fill dates kept per bin */

/* --- axes and sources --- */

enum coverage_axis {
	COVERAGE_AXIS_SYNODIC = 0,	/* apparent Moon - Sun longitude;
					   0 new, 90 first quarter, 180 full */
	COVERAGE_AXIS_ANOMALY,		/* Moon's mean anomaly l (eraFal03);
					   0 = mean perigee */
	COVERAGE_AXIS_LATITUDE,		/* argument of latitude F (eraFaf03);
					   0 = ascending node */
	COVERAGE_AXIS_HOUR_ANGLE,	/* local hour angle of the Moon at the
					   station, west +, 0 = upper transit */
	COVERAGE_AXIS__COUNT
};

enum coverage_source {
	COVERAGE_SOURCE_NORMAL_POINTS = 0, /* imported normal points, plus the
					   normal points logged with attempts */
	COVERAGE_SOURCE_ATTEMPTS,	/* one count per logged attempt */
	COVERAGE_SOURCE__COUNT
};

/* Stable names ("synodic", "anomaly", "latitude", "hour_angle";
   "normal_points", "attempts") and their parsers (-1 when unknown). */
const char *coverage_axis_name(enum coverage_axis a);
const char *coverage_axis_label(enum coverage_axis a);	/* for people */
int coverage_axis_parse(const char *s);
const char *coverage_source_name(enum coverage_source s);
int coverage_source_parse(const char *s);

/*
 * Names of the four quarter points of an axis (0, 90, 180, 270 deg), for
 * labels: "new moon", "first quarter", "full moon", "last quarter" on the
 * synodic axis; "perigee" ... on the anomaly axis, and so on.
 */
const char *coverage_axis_mark(enum coverage_axis a, int quarter);

/* --- the query --- */

struct coverage_spec {
	enum coverage_source source;
	enum coverage_axis axis;
	int nbins;			/* COVERAGE_BINS_MIN..MAX */
	long min_count;			/* a bin is filled at >= this, >= 1 */
	double since_mjd, until_mjd;	/* UTC MJD; since inclusive, until
					   exclusive; NaN = open */
	char target[SITE_ID_LEN];	/* "" = every target */
	char station[SITE_CODE_LEN];	/* "" = every station */
	char own_station[SITE_CODE_LEN]; /* code of the station whose log the
					   attempts are ("" = unknown: then a
					   station filter drops attempts) */
	struct geom_site site;		/* initialised station, used by the
					   hour_angle axis only */
};

/* Defaults: normal points, synodic axis, 12 bins, min_count 1, no filter. */
void coverage_spec_init(struct coverage_spec *s);

/* Check ranges; ERRCODE_BAD_ARG with a sentence naming the field. */
enum errcode coverage_spec_check(const struct coverage_spec *s,
    char *errbuf, size_t errlen);

struct coverage_input {
	const struct site_normal_point *np;	/* imported normal points */
	size_t nnp;
	const struct site_attempt *att;		/* the station's log */
	size_t natt;
};

/* --- metrics --- */

struct coverage_metrics {
	long total;			/* counts over all bins */
	int filled_bins;		/* bins with >= min_count */
	double filled_fraction;		/* filled_bins / nbins */
	int nemptiest;			/* entries in emptiest[] */
	int emptiest[COVERAGE_BINS_MAX]; /* bins by ascending count (ties by
					   index): at least COVERAGE_EMPTIEST,
					   and every bin tied at the minimum */
	int nsparse;			/* entries in sparse[] */
	int sparse[COVERAGE_BINS_MAX];	/* filled bins (>= min_count) holding
					   fewer than half the mean count
					   total/nbins, ascending */
	double longest_gap_deg;		/* longest run of adjacent bins below
					   min_count, around the circle */
	double longest_gap_from_deg;	/* where that run starts; NaN if none */
	double entropy;			/* -sum p ln p / ln nbins; NaN if
					   total = 0 */
	double chi2;			/* sum (n - E)^2 / E, E = total/nbins;
					   NaN if total = 0 */
	int chi2_dof;			/* nbins - 1 */
	double chi2_p;			/* P(X >= chi2) under a uniform spread */
	int chi2_reliable;		/* E >= 5 (Cochran's rule) */
};

struct coverage_counts {
	long n[COVERAGE_BINS_MAX];
	struct coverage_metrics m;
};

/*
 * Metrics of nbins counts.  Given n[0..nbins-1] >= 0, nbins in
 * COVERAGE_BINS_MIN..MAX, min_count >= 1; fills m.
 */
void coverage_metrics_of(const long *n, int nbins, long min_count,
    struct coverage_metrics *m);

/*
 * Regularised upper incomplete gamma function Q(a, x) = Gamma(a, x) /
 * Gamma(a), a > 0, x >= 0; NaN for arguments outside.
 *
 * Notes:
 *   Series for x < a + 1 and Lentz's continued fraction otherwise, to a
 *   relative accuracy of about 1e-14 (Press et al., Numerical Recipes in
 *   C, 2nd ed., 1992, section 6.2, gser/gcf; Abramowitz & Stegun 6.5.29
 *   and 6.5.31).
 */
double coverage_gamma_q(double a, double x);

/* Upper tail P(X >= x) of the chi-square distribution: Q(dof/2, x/2). */
double coverage_chi2_p(double x, int dof);

/* --- the result --- */

struct coverage_target {
	char id[SITE_ID_LEN];
	struct coverage_counts c;
};

struct coverage_year {
	int year;			/* UTC calendar year */
	struct coverage_counts c;
};

struct coverage_result {
	struct coverage_spec spec;
	double bin_width_deg;
	long records;			/* records that passed the filters */
	long skipped;			/* records without a usable epoch */
	long suspect;			/* attempts that passed the filters
					   but are flagged suspect
					   (attempt_suspect): left out, as
					   the yield model leaves them */
	struct coverage_counts pooled;
	size_t ntargets;		/* sorted by id */
	struct coverage_target targets[COVERAGE_MAX_TARGETS];
	size_t nyears;			/* ascending */
	struct coverage_year years[COVERAGE_MAX_YEARS];
};

/*
 * Angle of an axis at a UTC instant.
 *
 * Given:
 *   axis     which angle
 *   site     initialised station (hour_angle only; may be NULL otherwise)
 *   utc_mjd  UTC modified Julian Date
 * Returned:
 *   deg      the angle, degrees, 0 <= deg < 360
 * Returned (function value):
 *   ERRCODE_OK, ERRCODE_BAD_TIME when the epoch cannot be converted,
 *   ERRCODE_BAD_ARG for the hour angle without a station
 * Notes:
 *   1. Synodic angle: geom_synodic_at (apparent ecliptic longitude of the
 *      Moon minus that of the Sun).
 *   2. l and F: IERS Conventions (2003) fundamental arguments, eraFal03
 *      and eraFaf03, at TT (TDB taken equal: < 2 ms), in Julian
 *      centuries from J2000.0.
 *   3. Hour angle: geom_instant_at with UT1 = UTC and no polar motion
 *      (error < 15" from |DUT1| < 0.9 s) and the IAU 2000B fast model;
 *      the topocentric, light-time corrected Moon centre.
 * References:
 *   IERS Conventions (2003), IERS Technical Note 32, ch. 5, eq. (5.43).
 * Called:
 *   tscale_from_utc, geom_synodic_at, eraFal03, eraFaf03, geom_instant_at,
 *   eraAnp, eraAnpm
 */
enum errcode coverage_axis_value(enum coverage_axis axis,
    const struct geom_site *site, double utc_mjd, double *deg);

/* Bin of an angle in degrees (any value; wrapped into 0..360). */
int coverage_bin_of(double deg, int nbins);

/*
 * Bin the records that pass the spec's filters and compute every metric.
 *
 * Given:
 *   spec  the query (checked with coverage_spec_check)
 *   in    the records; attempts count at their mid-time
 * Returned:
 *   out   counts and metrics, pooled, per target and per year
 * Returned (function value):
 *   ERRCODE_OK; ERRCODE_BAD_ARG for a bad spec; ERRCODE_TOO_LARGE when
 *   more than COVERAGE_MAX_TARGETS targets or COVERAGE_MAX_YEARS years
 *   pass the filters (narrow the query).
 * Notes:
 *   1. Source normal_points: each imported normal point counts 1 and each
 *      attempt counts its normal_points; attempts with none are left out.
 *      Source attempts: each attempt counts 1, normal points are unused.
 *   2. On the synodic axis the records' synodic_deg (computed when they
 *      were stored) is used; when it is NaN, the angle is computed from
 *      the epoch.  Other axes are always computed from the epoch.
 *   3. Attempts belong to spec->own_station for the station filter.
 *   4. A record whose epoch cannot be converted is counted in skipped.
 */
enum errcode coverage_compute(const struct coverage_spec *spec,
    const struct coverage_input *in, struct coverage_result *out);

/*
 * coverage_compute one record at a time, for a caller that streams the
 * records (the daemon's audit of a long log holds none of them):
 * coverage_begin (ERRCODE_BAD_ARG for a bad spec), then each normal point
 * and attempt (ERRCODE_TOO_LARGE as coverage_compute), then coverage_end
 * for the metrics.  The same counts as coverage_compute over the same
 * records.
 */
enum errcode coverage_begin(const struct coverage_spec *spec,
    struct coverage_result *out);
enum errcode coverage_add_np(const struct coverage_spec *spec,
    const struct site_normal_point *p, struct coverage_result *out);
enum errcode coverage_add_attempt(const struct coverage_spec *spec,
    const struct site_attempt *a, struct coverage_result *out);
void coverage_end(const struct coverage_spec *spec,
    struct coverage_result *out);

/* --- what would fill the gaps --- */

/* A planned observing window of one target (from the window planner). */
struct coverage_window {
	char target[SITE_ID_LEN];
	double start_mjd, end_mjd;	/* UTC */
	double score;			/* the planner's score */
};

struct coverage_fill_date {
	char target[SITE_ID_LEN];
	double window_start_mjd, window_end_mjd;
	double in_bin_start_mjd, in_bin_end_mjd; /* part inside the bin */
	double score;
};

struct coverage_fill_bin {
	int bin;
	long count;			/* the bin's count now */
	size_t ndates;			/* earliest first */
	struct coverage_fill_date dates[COVERAGE_FILL_PER_BIN];
};

struct coverage_fill {
	double from_mjd, to_mjd;	/* the horizon searched, UTC */
	size_t windows;			/* windows examined */
	size_t nbins;			/* bins below min_count, ascending */
	struct coverage_fill_bin bins[COVERAGE_BINS_MAX];
};

#define COVERAGE_FILL_STEP_S 300.0	/* sampling of a window's angle */

/*
 * For each bin of r below min_count (per r->spec.target when set, else
 * pooled), the earliest windows in [from, to) during which the axis angle
 * lies in that bin.  Windows whose parts in the bin overlap (the same
 * night for several targets) are one date: the best-scoring one is kept.
 *
 * Given:
 *   r        a coverage result (its spec gives axis, bins, target, site)
 *   w, nw    windows in any order; only r->spec.target's are used when
 *            it is set
 *   from_mjd, to_mjd  the horizon, UTC MJD
 * Returned:
 *   out      the gap bins and up to COVERAGE_FILL_PER_BIN dates each
 * Returned (function value):
 *   ERRCODE_OK, or the first error of coverage_axis_value
 * Notes:
 *   1. The angle is sampled every COVERAGE_FILL_STEP_S seconds across
 *      each window and at both ends; the part in a bin is given to that
 *      resolution.  The synodic angle advances about 0.5 deg an hour, the
 *      hour angle 14.5 deg an hour.
 *   2. The samples are taken on the fast path (a track fitted over the
 *      horizon, allocated with mem_calloc and freed here), within 0.04"
 *      of coverage_axis_value; without memory, or for a horizon over
 *      3000 days, on the direct chain.
 * Called:
 *   fast_track_segments, fast_track_init, fast_synodic, fast_frame_at,
 *   geom_synodic_at, geom_instant_at, tscale_from_utc, eraFal03,
 *   eraFaf03, eraAnp, eraAnpm
 */
enum errcode coverage_fill_compute(const struct coverage_result *r,
    const struct coverage_window *w, size_t nw, double from_mjd,
    double to_mjd, struct coverage_fill *out);

#endif
