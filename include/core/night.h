/* SPDX-License-Identifier: BSD-3-Clause */
/* night.h: the night plan, from a planning query to a sequence of runs
   with their values and reasons, and the night's geometry for a
   timeline (pure core). */
#ifndef MOONRANGE_NIGHT_H
#define MOONRANGE_NIGHT_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/plan.h"
#include "core/sched.h"
#include "core/value.h"

#define NIGHT_CALIBRATION_ID "calibration"
#define NIGHT_SAMPLE_S 300.0		/* timeline samples, s */
#define NIGHT_MAX_DAYS 4.0		/* longest span planned */
#define NIGHT_WHY_LEN 200

/* The scheduler's settings (store keys plan_* and value_*). */
struct night_settings {
	struct value_settings value;
	double run_min_s;		/* plan_run_min_s (600) */
	double run_max_s;		/* plan_run_max_s (1800) */
	double switch_s;		/* plan_switch_s (120) */
	double cal_s;			/* plan_calibration_s (300) */
	double cal_every_s;		/* plan_calibration_every_s (0 = off) */
	double grid_s;			/* time grid, s (60) */
};

void night_settings_default(struct night_settings *s);

/* ERRCODE_BAD_ARG with a sentence naming the setting. */
enum errcode night_settings_check(const struct night_settings *s,
    char *errbuf, size_t errlen);

struct night_run {
	char target[SITE_ID_LEN];	/* NIGHT_CALIBRATION_ID for one */
	int calibration;
	double start_mjd, end_mjd;	/* UTC */
	double expected_returns, expected_nps;
	double value, value_phase, value_orientation;
	double el_start_deg, el_end_deg, el_max_deg;
	double synodic_deg;		/* at the middle */
	struct plan_physics phys;	/* tilt and spread at the middle */
	size_t nreasons;
	char reasons[PLAN_MAX_REASONS][PLAN_REASON_LEN];
};

/* The night's geometry every NIGHT_SAMPLE_S, for the timeline. */
struct night_sample {
	double mjd;			/* UTC */
	double moon_el_deg, sun_el_deg;
	unsigned long long lit;		/* bit j: target j sunlit */
	unsigned long long open;	/* bit j: target j inside a window */
};

struct night_target {
	char id[SITE_ID_LEN];
	char name[SITE_NAME_LEN];
};

struct night_result {
	enum sched_method method;
	double from_mjd, to_mjd;	/* UTC */
	double total_value, expected_nps, greedy_value;
	int exact;
	long nodes;
	size_t nruns;
	struct night_run *runs;
	size_t ntargets;		/* the targets planned (<= 64) */
	struct night_target *targets;
	size_t nsamples;
	struct night_sample *samples;
	size_t nwindows;		/* windows ranked by plan_run */
	struct site_station station;
	struct night_settings settings;
	/* When no run fits: the limit that prevents it. */
	char why_empty[NIGHT_WHY_LEN];
};

/*
 * Plan the runs of the span [q->from_mjd, q->to_mjd).
 *
 * Given:
 *   q       the planning query (station, targets, log, blackouts, span;
 *           q->target and q->limit are ignored)
 *   s       the scheduler's settings
 *   method  SCHED_GREEDY or SCHED_BEST
 * Returned:
 *   out     the plan; free with night_result_free
 * Returned (function value):
 *   ERRCODE_OK, or plan_run's errors; ERRCODE_BAD_ARG for settings or a
 *   span over NIGHT_MAX_DAYS (errbuf names it); ERRCODE_NOMEM
 * Notes:
 *   1. The windows are plan_run's (every constraint of the station, the
 *      blackouts cut out).  The span is cut into slots of grid_s; a slot
 *      is usable for a target when it lies wholly inside one of the
 *      target's windows.
 *   2. In each slot, at its middle: the expected returns R_j dt (score.h,
 *      the yield model fitted on the log), the target's vector h from its
 *      selenocentric position and the line of sight in the lunar frame,
 *      and the synodic angle.
 *   3. Phase information held: every normal point (imported, and those
 *      logged with attempts, each counted with its number) at its stored
 *      synodic angle; pooled or per target as coverage_scope says.
 *   4. Normal points per return: value_np_per_return over the station's
 *      log (attempts with returns).
 * Called:
 *   plan_run, plan_station_site, window_track_init, window_track_instant,
 *   window_track_synodic, geom_target_from_selen, geom_target_view,
 *   score_transmission, score_rate, score_bin_of, score_bin_mean,
 *   score_coverage_weight, logstats_build, logstats_find,
 *   value_moments_sum, value_phase_from_moments, value_orient_vector,
 *   value_np_per_return, sched_solve, eraAnp, eraRxp
 */
enum errcode night_plan(const struct plan_query *q,
    const struct night_settings *s, enum sched_method method,
    struct night_result *out, char *errbuf, size_t errlen);

void night_result_free(struct night_result *r);

/* "best" / "greedy" and the parser (-1 when unknown). */
const char *night_method_name(enum sched_method m);
int night_method_parse(const char *s);

#endif
