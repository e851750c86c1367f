/* SPDX-License-Identifier: BSD-3-Clause */
/* plan.h: from a query (station, targets, log, span) to ranked windows;
   shared by the CLI and the HTTP API. */
#ifndef MOONRANGE_PLAN_H
#define MOONRANGE_PLAN_H

#include <stddef.h>

#include "core/eclipse.h"
#include "core/errcode.h"
#include "core/geom.h"
#include "core/logstats.h"
#include "core/mem.h"
#include "core/score.h"
#include "core/site.h"

#define PLAN_MAX_REASONS 6
#define PLAN_REASON_LEN 160
#define PLAN_MAX_WINDOWS 20000	/* per query */
#define PLAN_MAX_ECLIPSES 64	/* per query: 3660 days hold about 25 */
#define PLAN_MOON_ID "moon"	/* the Moon's centre, when no targets */

/* Default limits for an ad-hoc station (--station without a database). */
#define PLAN_DEFAULT_MIN_EL_DEG 20.0
#define PLAN_DEFAULT_MAX_SUN_EL_DEG (-12.0)
#define PLAN_DEFAULT_MIN_SUN_SEP_DEG 20.0

/*
 * A planning query.  Everything is borrowed for the call.  Targets with
 * active = 0 are left out; with no (active) target, the Moon's centre is
 * planned as target PLAN_MOON_ID.  Times are UTC MJDs.
 */
struct plan_query {
	struct site_station station;	/* limits, tau, fire rate, zone */
	const struct site_target *targets;
	size_t ntargets;
	const struct site_blackout *blackouts;
	size_t nblackouts;
	const struct site_attempt *attempts;	/* the log (yield model) */
	size_t nattempts;
	const struct site_normal_point *nps;	/* coverage counts */
	size_t nnps;
	/* The log as statistics (core/logstats.h), taken under station's
	   tau and seeing and settings.nbins; when NULL they are built from
	   attempts and nps (the same sums), else those are not read. */
	const struct logstats *stats;
	struct geom_eop eop;		/* constant over the span, used when
					   no EOP row covers its middle */
	const struct site_eop_row *eop_rows;	/* MJD-sorted, or NULL */
	size_t neop;
	double from_mjd, to_mjd;	/* UTC */
	const char *target;		/* only this id, or NULL */
	size_t limit;			/* keep the best limit; 0 = all */
	struct score_settings settings;
};

/* Fill q with the defaults: no data, default settings, PLAN_DEFAULT_*
   limits on a zeroed station, tau 0.1, 10 shots/s. */
void plan_query_init(struct plan_query *q);

/* A window's or a run's reflector physics: the array's tilt and pulse
   spread at one instant, and the lunar eclipse it overlaps. */
struct plan_physics {
	double tilt_deg, spread_ps;	/* NaN when there is no target */
	int eclipse;			/* 1: overlaps P1..P4 of one */
	enum eclipse_kind kind;
	double greatest_mjd;		/* UTC */
	enum eclipse_shadow shadow;	/* the target's, at the greatest
					   eclipse clamped into the span */
};

struct window_track;

/*
 * Fill *out for target gt (record st, NULL for the defaults) over the TT
 * offsets t0..t1 of track tr: tilt and spread at offset t; the first of
 * ev[ne] (TT JDs) whose P1..P4 overlaps t0..t1, with the target's shadow
 * at its greatest eclipse clamped into t0..t1 (the deepest point of the
 * span).
 * Called:
 *   window_track_instant, array_of_target, geom_target_view
 */
void plan_physics_fill(const struct window_track *tr, double t0, double t1,
    double t, const struct geom_target *gt, const struct site_target *st,
    const struct eclipse_event *ev, size_t ne, struct plan_physics *out);

struct plan_window {
	char target[SITE_ID_LEN];
	double start_mjd, end_mjd, max_el_mjd;	/* UTC */
	struct plan_physics phys;		/* at max_el_mjd */
	struct score_window f;			/* every factor */
	size_t nreasons;
	char reasons[PLAN_MAX_REASONS][PLAN_REASON_LEN];
};

/* Append a reason (printf-style, cut at PLAN_REASON_LEN) to the table
   reasons of *n, a window's or a night run's; nothing once it holds
   PLAN_MAX_REASONS. */
void plan_reason_add(char (*reasons)[PLAN_REASON_LEN], size_t *n,
    const char *fmt, ...) MEM_PRINTFLIKE(3, 4);

struct plan_target_model {
	char id[SITE_ID_LEN];
	double strength;
	struct score_yield y;
};

struct plan_result {
	double from_mjd, to_mjd;
	struct geom_eop eop;			/* what was used */
	const char *dut1_source;		/* "table", "option" or "none" */
	struct site_station station;
	struct score_settings settings;
	struct score_model model;
	size_t nmodels;
	struct plan_target_model *models;	/* nmodels */
	long pooled[SCORE_BINS_MAX];		/* pooled counts per bin */
	size_t total;				/* windows before limit */
	size_t n;
	struct plan_window *w;			/* n, ranked */
	/* The lunar eclipses whose greatest eclipse falls in the span with a
	   day of margin either side (eclipse_find), for the windows here and
	   for a night plan built on this result. */
	size_t necl;
	struct eclipse_event ecl[PLAN_MAX_ECLIPSES];
};

/*
 * Run the query: yield model, coverage counts, windows of every planned
 * target, scores, ranks, limit.
 *
 * Returned:
 *   out      owns its arrays: free with plan_result_free
 * Returned (function value):
 *   ERRCODE_OK; ERRCODE_BAD_ARG (bad span, limits or settings; errbuf
 *   names the field), ERRCODE_NOT_FOUND (q->target unknown),
 *   ERRCODE_TOO_LARGE (over PLAN_MAX_WINDOWS or WINDOW_MAX_TARGETS),
 *   ERRCODE_NOMEM, ERRCODE_BAD_TIME
 */
enum errcode plan_run(const struct plan_query *q, struct plan_result *out,
    char *errbuf, size_t errlen);

/* The geometry core's station from a station record, with standard
   weather (geom_weather_standard) for what the record leaves NaN;
   ERRCODE_BAD_ARG when out of range. */
enum errcode plan_station_site(const struct site_station *st,
    struct geom_site *site);

/* Free what plan_run allocated; a zeroed or failed result is accepted. */
void plan_result_free(struct plan_result *r);

/* "new-moon", "waxing crescent", ... for a bin centre, degrees. */
const char *plan_phase_label(double synodic_deg);

#endif
