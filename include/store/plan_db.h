/* SPDX-License-Identifier: BSD-3-Clause */
/* plan_db.h: fill a planning query from a moonrange database. */
#ifndef MOONRANGE_PLAN_DB_H
#define MOONRANGE_PLAN_DB_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/logstats.h"
#include "core/plan.h"
#include "core/site.h"

/* The arrays a loaded query borrows; free with plan_db_free. */
struct plan_db {
	struct site_target *targets;
	struct site_blackout *blackouts;
	struct logstats stats;		/* the log, as statistics */
	int stale;			/* 1: computed from the records (the
					   stored statistics were stale) */
	struct site_eop_row *eop;
	size_t ntargets, nblackouts, neop;
};

void plan_db_init(struct plan_db *d);

/* Free the arrays; a zeroed or failed holder is accepted. */
void plan_db_free(struct plan_db *d);

/*
 * Open path read-only and fill q's station, settings, targets, blackouts,
 * the log's statistics (q->stats; store_logstats_get: O(targets x bins)
 * when current) and Earth-orientation rows (q->targets and the others
 * then point into d).  The rest of q (span, target, limit) is left to the caller.
 * Returned (function value): ERRCODE_OK, ERRCODE_NOT_FOUND (no file, or
 * no station in it), ERRCODE_DB, ERRCODE_NOMEM; errbuf says which.
 */
enum errcode plan_db_load(const char *path, struct plan_query *q,
    struct plan_db *d, char *errbuf, size_t errlen);

/* The same from a database the caller has open (and keeps open). */
struct store;
enum errcode plan_db_fill(struct store *s, struct plan_query *q,
    struct plan_db *d, char *errbuf, size_t errlen);

#endif
