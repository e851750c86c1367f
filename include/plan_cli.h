/* SPDX-License-Identifier: BSD-3-Clause */
/* plan_cli.h: what the windows and tonight commands share. */
#ifndef MOONRANGE_PLAN_CLI_H
#define MOONRANGE_PLAN_CLI_H

#include "mem.h"
#include "plan.h"
#include "plan_db.h"
#include "render.h"

/*
 * Start a query: plan_query_init, then the station and data of database
 * db, or (db NULL) the ad-hoc station lat, lon (deg), h (m).  Returns an
 * exit status; on failure the error is printed and hold is freed.
 */
int plan_cli_load(const char *db, double lat, double lon, double h,
    struct plan_query *q, struct plan_db *hold);

typedef enum errcode (*plan_cli_render_fn)(const struct render_plan *p,
    struct mbuf *out);

/*
 * Run q, render the result with fn (rp->r is set here, the rest is the
 * caller's) and print it.  Frees hold.  Returns an exit status; errors
 * are printed once.
 */
int plan_cli_run(const struct plan_query *q, struct plan_db *hold,
    struct render_plan *rp, plan_cli_render_fn fn);

#endif
