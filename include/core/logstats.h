/* SPDX-License-Identifier: BSD-3-Clause */
/* logstats.h: the ranging log as the sufficient statistics the planner
   reads, per target and pooled (pure core). */
#ifndef MOONRANGE_LOGSTATS_H
#define MOONRANGE_LOGSTATS_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/score.h"
#include "core/site.h"
#include "core/value.h"

/*
 * The planner reads the log only through these sums, so a log of any
 * length costs it O(targets x bins):
 *
 *   yield (score_fit)        score_sums of the target's usable attempts;
 *                            the exposures depend on the station's zenith
 *                            tau and typical seeing, taken as recorded
 *   coverage (score.h W)     normal points per synodic-angle bin: 1 per
 *                            normal point, normal_points per attempt
 *   phase (value.h)          moments of the normal points (weight 1) and
 *                            of the attempts (weight normal_points)
 *   normal points per return sums of normal_points and returns over the
 *                            attempts with returns > 0
 *
 * Entry 0 is the pool: every record whatever its target.  Each record is
 * added to its target's entry and to the pool in the order given: the
 * store adds them as they are written, in row order, and rebuilds in row
 * order, so its sums equal logstats_build over the rows by id.
 */

/* The rule of the sums: stored statistics of another rule are rebuilt. */
#define LOGSTATS_RULE 1

struct logstats_entry {
	char id[SITE_ID_LEN];		/* target id; "" for the pool */
	long attempts;			/* attempts, used or not */
	long nps;			/* normal points */
	struct score_sums y;		/* the usable attempts' yield sums */
	long counts[SCORE_BINS_MAX];	/* normal points per bin (nbins) */
	struct value_moments ph_np;	/* normal points, weight 1 */
	struct value_moments ph_att;	/* attempts, weight normal_points */
	long ret_nps, ret_returns;	/* attempts with returns > 0 */
};

struct logstats {
	double tau;			/* the station's zenith tau */
	double seeing;			/* its typical seeing (link budget) */
	int nbins;			/* bins of counts */
	size_t n, cap;			/* entries; e[0] is the pool */
	struct logstats_entry *e;	/* mem_alloc'd: logstats_free */
};

/*
 * Empty statistics for station st and nbins bins (SCORE_BINS_MIN..MAX):
 * the pool alone.  ERRCODE_BAD_ARG (nbins or tau), ERRCODE_NOMEM.
 * Free with logstats_free.
 */
enum errcode logstats_init(struct logstats *ls, const struct site_station *st,
    int nbins);

/* Free the entries; a zeroed or freed holder is accepted. */
void logstats_free(struct logstats *ls);

/* 1 when ls was taken under st's tau and typical seeing and nbins bins. */
int logstats_current(const struct logstats *ls, const struct site_station *st,
    int nbins);

/* The entry of target id ("" the pool), or NULL when it has none. */
const struct logstats_entry *logstats_find(const struct logstats *ls,
    const char *id);

/* The entry of id, added empty when missing; NULL when out of memory. */
struct logstats_entry *logstats_entry(struct logstats *ls, const char *id);

/*
 * Add one attempt (one normal point) to its target's entry and the pool.
 * Returned (function value): ERRCODE_OK, ERRCODE_NOMEM.
 * Called:
 *   score_sums_add, score_bin_add, value_moments_add
 */
enum errcode logstats_add_attempt(struct logstats *ls,
    const struct site_attempt *a);
enum errcode logstats_add_np(struct logstats *ls,
    const struct site_normal_point *p);

/*
 * The statistics of arrays of attempts and normal points: logstats_init,
 * then each normal point, then each attempt, in the order given.
 */
enum errcode logstats_build(struct logstats *ls, const struct site_station *st,
    int nbins, const struct site_attempt *att, size_t na,
    const struct site_normal_point *nps, size_t nnp);

#endif
