/* SPDX-License-Identifier: BSD-3-Clause */
/* sched.h: the night's sequence of ranging runs that buys the most
   science, on a time grid (pure core). */
#ifndef MOONRANGE_SCHED_H
#define MOONRANGE_SCHED_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/value.h"

/*
 * The problem.  The span is cut into nslots slots of slot_s seconds
 * (at most 60 s).  A run is (target, start slot, length in slots); a plan
 * is a sequence of runs in time order such that
 *
 *   - every slot of a run is available for its target (inside one of its
 *     windows, outside blackouts: avail), one target at a time;
 *   - run_min <= length <= run_max;
 *   - switch_slots free slots lie between two runs on different targets,
 *     and between a run and a calibration; two runs on the same target
 *     are at least one slot apart (back to back they would be one run,
 *     which run_max bounds);
 *   - with cal_every > 0, a calibration of cal_slots clear slots (outside
 *     blackouts) precedes the first run, and no run ends more than
 *     cal_every slots after the end of the last calibration before it.
 *
 * The value of a plan is the sum of its runs' values (value.h), each
 * taken against the information held before it: the phase matrices
 * phase0 (one per pool: pooled, or one per target) and an empty night's
 * orientation matrix, both updated by every run.  A run of target j from
 * s for L slots expects returns R = sum of returns[j][s..s+L), normal
 * points n = value_expected_nps(npr[j], R, L slot_s), at the synodic
 * angle and with the vector h of its middle slot s + (L - 1) / 2.
 *
 * Because a run's value depends on the runs before it, the objective is
 * not a sum of fixed terms; sched_solve's notes say how it is searched.
 */

#define SCHED_MAX_SLOT_S 60.0
#define SCHED_BEAM_WIDTH 40		/* states kept per step of the beam */
#define SCHED_EXACT_NODES 3000000L	/* node budget of the exact search */
#define SCHED_EXACT_MAX_SLOTS 64	/* exact search up to this many slots */
#define SCHED_EXACT_MAX_TARGETS 4	/* ... and targets */
#define SCHED_CALIBRATION (-1)		/* target index of a calibration */

struct sched_problem {
	size_t nslots;
	double slot_s;			/* seconds, 0 < slot_s <= 60 */
	size_t ntargets;
	const unsigned char *avail;	/* ntargets x nslots: 1 = usable */
	const unsigned char *clear;	/* nslots: 1 = outside blackouts (for
					   calibrations); NULL = all clear */
	const double *returns;		/* ntargets x nslots: expected returns
					   in the slot, >= 0 */
	const double *h;		/* ntargets x nslots x VALUE_ODIM */
	const double *synodic;		/* nslots: synodic angle, rad */
	const double *bin_weight;	/* ntargets x nslots: W (bins model;
					   may be NULL under design) */
	const double *npr;		/* ntargets: normal points per return */
	const double *precision;	/* ntargets x nslots: information of a
					   normal point relative to one from
					   an untilted array, 0..1 (jitter^2 /
					   (jitter^2 + spread^2)); NULL = 1 */
	const struct value_settings *vs;
	const struct value_phase *phase0; /* nphase information states */
	size_t nphase;
	const size_t *phase_of;		/* ntargets: index into phase0 */
	int run_min, run_max;		/* slots, 1 <= run_min <= run_max */
	int switch_slots;		/* >= 0 */
	int cal_slots;			/* >= 1 when cal_every > 0 */
	int cal_every;			/* slots; 0 = no calibrations */
};

struct sched_run {
	int target;			/* index, or SCHED_CALIBRATION */
	size_t start, len;		/* slots */
	double returns;			/* expected returns */
	double nps;			/* expected normal points */
	double precision_weight;	/* information per normal point, 0..1
					   (sched_problem.precision) */
	double phase;			/* phase term (nats; n W for bins) */
	double orientation;		/* orientation gain, nats */
	double value;			/* value_combine of the two */
	double phase_leverage;		/* f^T M^-1 f before the run */
	double orient_leverage;		/* h^T N^-1 h before the run */
	int visit;			/* 1 = first run on this target */
};

enum sched_method {
	SCHED_GREEDY = 0,		/* the baseline */
	SCHED_BEST			/* never below greedy */
};

struct sched_plan {
	struct sched_run *runs;		/* n, in time order; mem_free'd by
					   sched_plan_free */
	size_t n;
	double value;			/* total */
	double nps;			/* expected normal points */
	double greedy_value;		/* the greedy plan's total */
	int exact;			/* 1: proved optimal on the grid */
	long nodes;			/* states examined */
};

/* ERRCODE_BAD_ARG (with *field naming the member) for a bad problem. */
enum errcode sched_problem_check(const struct sched_problem *p,
    const char **field);

/*
 * Values of a given sequence of runs and calibrations, in order: fills
 * every computed field of runs[] and *total (may be NULL).  Constraints
 * are not checked (sched_feasible does).
 * Called:
 *   value_expected_nps, value_phase_gain, value_phase_add,
 *   value_orient_gain, value_orient_add, value_combine
 */
enum errcode sched_evaluate(const struct sched_problem *p,
    struct sched_run *runs, size_t n, double *total);

/* 1 when runs[] (targets, starts, lengths) obeys every constraint. */
int sched_feasible(const struct sched_problem *p,
    const struct sched_run *runs, size_t n);

/*
 * Plan the span.
 *
 * Given:
 *   p       the problem (sched_problem_check)
 *   method  SCHED_GREEDY or SCHED_BEST
 * Returned:
 *   out     the plan; free with sched_plan_free
 * Returned (function value):
 *   ERRCODE_OK, ERRCODE_BAD_ARG, ERRCODE_NOMEM
 * Notes:
 *   1. Moves.  A plan is built run by run; a move is a run, optionally
 *      preceded by a calibration put as late as it fits before the run
 *      (any feasible plan can be rearranged so: moving a calibration
 *      later, towards the run it precedes, keeps every constraint).
 *   2. Greedy: from the end of the last run, for each target its
 *      earliest feasible start and every feasible length; the move with
 *      the most value per slot elapsed since the last run ends (waiting
 *      and switching included) is taken, ties to the lower target index,
 *      then the earlier start, then the shorter run; a calibration only
 *      when no run fits without one.  Stops when nothing fits.
 *   3. Bound.  Information only grows along a plan, so a run's gain
 *      1/2 ln(1 + n l) is at most n l / 2 with the leverage l taken
 *      against the information at the start; and n is at most npr times
 *      the returns.  Summing, per slot, the best target's bound over the
 *      rest of the span gives an upper bound U(t) on what any plan can
 *      still add after slot t (switches, calibrations and the length
 *      cap only lower it).
 *   4. Best: the greedy plan is the incumbent.  On small problems (at
 *      most SCHED_EXACT_MAX_TARGETS targets and SCHED_EXACT_MAX_SLOTS
 *      slots) a depth-first branch and bound over every move (every
 *      target, start, length, with or without a calibration) prunes a
 *      partial plan when value + U(end) cannot beat the incumbent; when
 *      it finishes within SCHED_EXACT_NODES states the plan is optimal
 *      on the grid (exact = 1).  Otherwise a beam search keeps, at each
 *      step, the SCHED_BEAM_WIDTH partial plans of highest value + G(end),
 *      G(t) the value the greedy plan still adds after slot t (a partial
 *      plan ahead of greedy at the same time ranks high), after dropping
 *      those with value + U(end) not above the incumbent; each is
 *      expanded by its targets' earliest starts with the shortest,
 *      middle and longest feasible lengths; any plan found better than
 *      the incumbent replaces it.  Either way the result is never worse
 *      than the greedy plan.
 *   5. Everything is deterministic: the same problem gives the same
 *      plan.
 * References:
 *   A. H. Land and A. G. Doig, "An automatic method of solving discrete
 *   programming problems", Econometrica 28, 497-520 (1960) (branch and
 *   bound); B. T. Lowerre, The HARPY speech recognition system, thesis,
 *   Carnegie-Mellon University (1976) (beam search).
 * Called:
 *   sched_problem_check, sched_evaluate, value_phase_leverage,
 *   value_orient_leverage, mem_calloc, mem_free
 */
enum errcode sched_solve(const struct sched_problem *p,
    enum sched_method method, struct sched_plan *out);

void sched_plan_free(struct sched_plan *plan);

#endif
