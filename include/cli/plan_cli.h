/* SPDX-License-Identifier: BSD-3-Clause */
/* plan_cli.h: what the windows and tonight commands share. */
#ifndef MOONRANGE_PLAN_CLI_H
#define MOONRANGE_PLAN_CLI_H

#include "cli/cli.h"
#include "core/mem.h"
#include "core/plan.h"
#include "store/plan_db.h"
#include "query/winquery.h"
#include "formats/render_plan.h"

/*
 * Start a query: plan_query_init, then the station and data of database
 * db, or (db NULL) the ad-hoc station lat, lon (deg), h (m).  Returns an
 * exit status; on failure the error is printed and hold is freed.
 */
int plan_cli_load(const char *db, double lat, double lon, double h,
    struct plan_query *q, struct plan_db *hold);

/* What the options windows and tonight share gave: --db or --station
   (group 1 of their rows, one required), --tz, and --limit (text:
   winquery_param_set checks it, as for the API). */
struct plan_cli_opts {
	const char *db;			/* NULL: not given */
	const char *tz;			/* NULL: not given */
	double lat, lon, h;		/* --station, deg, deg east, m */
	int have_station;
	const char *limit;		/* --limit as given, NULL: not given */
};

/*
 * Take the shared options of a into o.
 * Returns CLI_EXIT_OK, or the exit status of an error already printed
 * (one line naming the option).
 */
int plan_cli_site(const struct cli_args *a, struct plan_cli_opts *o);

/*
 * Apply p to q (winquery_apply), read zone (an IANA name, or NULL for
 * UTC only) over the span for rp->time_zone, run q, render the result
 * with fn (rp->r is set here, the rest is the caller's) and print it.
 * Frees hold.  Returns an exit status; errors are printed once, naming
 * the option as winquery says it (p->style QPARAM_OPTION).
 */
int plan_cli_run(struct winquery_params *p, struct plan_query *q,
    struct plan_db *hold, const char *zone, struct render_plan *rp,
    winquery_render_fn fn);

#endif
