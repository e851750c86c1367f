/* SPDX-License-Identifier: BSD-3-Clause */
/* plan_db.c: a planning query filled from the station database. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "core/mem.h"
#include "store/plan_db.h"
#include "store/store.h"

void
plan_db_init(struct plan_db *d)
{
	memset(d, 0, sizeof *d);
}

void
plan_db_free(struct plan_db *d)
{
	if (d == NULL)
		return;
	mem_free(d->targets);
	mem_free(d->blackouts);
	logstats_free(&d->stats);
	mem_free(d->eop);
	plan_db_init(d);
}

enum errcode
plan_db_load(const char *path, struct plan_query *q, struct plan_db *d,
    char *errbuf, size_t errlen)
{
	struct store *s = NULL;
	enum errcode rc;

	rc = store_open(path, STORE_OPEN_READONLY, &s, errbuf, errlen);
	if (rc != ERRCODE_OK)
		return rc;
	rc = plan_db_fill(s, q, d, errbuf, errlen);
	store_close(s);
	return rc;
}

enum errcode
plan_db_fill(struct store *s, struct plan_query *q, struct plan_db *d,
    char *errbuf, size_t errlen)
{
	struct store_settings set;
	enum errcode rc;

	rc = store_station_get(s, &q->station, errbuf, errlen);
	if (rc == ERRCODE_NOT_FOUND && errbuf != NULL)
		snprintf(errbuf, errlen, "the database holds no station yet "
		    "(run 'moonrange init')");
	if (rc != ERRCODE_OK)
		goto out;
	rc = store_settings_get(s, &set, errbuf, errlen);
	if (rc != ERRCODE_OK)
		goto out;
	q->settings.nbins = set.coverage_bins;
	q->settings.alpha = set.coverage_alpha;
	q->settings.k = set.coverage_k;
	q->settings.per_target = set.coverage_per_target;
	rc = store_targets_list(s, 1, &d->targets, &d->ntargets, errbuf,
	    errlen);
	if (rc == ERRCODE_OK)
		rc = store_blackouts_list(s, NAN, NAN, &d->blackouts,
		    &d->nblackouts, errbuf, errlen);
	if (rc == ERRCODE_OK)
		rc = store_logstats_get(s, &q->station, set.coverage_bins,
		    &d->stats, &d->stale, errbuf, errlen);
	if (rc == ERRCODE_OK)
		rc = store_eop_load(s, &d->eop, &d->neop, errbuf, errlen);
	if (rc != ERRCODE_OK)
		goto out;
	q->targets = d->targets;
	q->ntargets = d->ntargets;
	q->blackouts = d->blackouts;
	q->nblackouts = d->nblackouts;
	q->attempts = NULL;
	q->nattempts = 0;
	q->nps = NULL;
	q->nnps = 0;
	q->stats = &d->stats;
	q->eop_rows = d->eop;
	q->neop = d->neop;
out:
	if (rc != ERRCODE_OK)
		plan_db_free(d);
	return rc;
}
