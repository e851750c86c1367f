/* SPDX-License-Identifier: BSD-3-Clause */
/* plan_db.h: fill a planning query from a moonrange database. */
#ifndef MOONRANGE_PLAN_DB_H
#define MOONRANGE_PLAN_DB_H

#include <stddef.h>

#include "errcode.h"
#include "plan.h"
#include "render.h"
#include "site.h"

/* The arrays a loaded query borrows; free with plan_db_free. */
struct plan_db {
	struct site_target *targets;
	struct site_blackout *blackouts;
	struct site_attempt *attempts;
	struct site_normal_point *nps;
	struct site_eop_row *eop;
	size_t ntargets, nblackouts, nattempts, nnps, neop;
};

void plan_db_init(struct plan_db *d);

/* Free the arrays; a zeroed or failed holder is accepted. */
void plan_db_free(struct plan_db *d);

/*
 * Open path read-only and fill q's station, settings, targets, blackouts,
 * attempts, normal points and Earth-orientation rows (q->targets and the other arrays then point
 * into d).  The rest of q (span, target, limit) is left to the caller.
 * Returned (function value): ERRCODE_OK, ERRCODE_NOT_FOUND (no file, or
 * no station in it), ERRCODE_DB, ERRCODE_NOMEM; errbuf says which.
 */
enum errcode plan_db_load(const char *path, struct plan_query *q,
    struct plan_db *d, char *errbuf, size_t errlen);

/* The same from a database the caller has open (and keeps open). */
struct store;
enum errcode plan_db_fill(struct store *s, struct plan_query *q,
    struct plan_db *d, char *errbuf, size_t errlen);

/* A renderer of a plan: render_windows_json, _csv, _ics, _text, ... */
typedef enum errcode (*plan_db_render_fn)(const struct render_plan *p,
    struct mbuf *out);

/*
 * Run a query filled as above (by plan_db_load or plan_db_fill, span,
 * target and limit set) and append the result rendered by fn to out:
 * rp->r is set for the call and reset after it, the rest of rp is the
 * caller's.  *nwindows (may be NULL) gets the number of windows ranked.
 * The same path for "moonrange windows" / "tonight" and the daemon's
 * /api/v1/windows, so that both print the same bytes.
 * Returned (function value): plan_run's code with its sentence in
 * errbuf, or the renderer's (ERRCODE_NOMEM).
 */
enum errcode plan_db_render(const struct plan_query *q,
    struct render_plan *rp, plan_db_render_fn fn, struct mbuf *out,
    size_t *nwindows, char *errbuf, size_t errlen);

#endif
