/* SPDX-License-Identifier: BSD-3-Clause */
/* plan_cli.h: what the windows and tonight commands share. */
#ifndef MOONRANGE_PLAN_CLI_H
#define MOONRANGE_PLAN_CLI_H

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

/* The options windows and tonight share (getopt_long values in
   parentheses): --db FILE ('D'), --station LAT,LON,H ('s'), --tz ZONE
   ('z', a zone the C library knows), --limit N ('l', 1..PLAN_MAX_WINDOWS). */
struct plan_cli_opts {
	const char *db;			/* NULL: not given */
	const char *tz;			/* NULL: not given */
	double lat, lon, h;		/* --station, deg, deg east, m */
	int have_station;
	long limit;			/* the caller's default until given */
};

/*
 * Take option c with its argument arg into o.  Returns -1 when c is not
 * one of the shared options, CLI_EXIT_OK when taken, else the exit status
 * of the error, already printed (one line naming the option).
 */
int plan_cli_option(int c, const char *arg, struct plan_cli_opts *o);

/*
 * After getopt_long: no operand left (optind) and exactly one of --db and
 * --station.  cmd names the command in the messages.  Returns CLI_EXIT_OK
 * or the status of the error, already printed.
 */
int plan_cli_opts_check(const struct plan_cli_opts *o, const char *cmd,
    int argc, char **argv);


/*
 * Run q, render the result with fn (rp->r is set here, the rest is the
 * caller's) and print it.  Frees hold.  Returns an exit status; errors
 * are printed once.
 */
int plan_cli_run(const struct plan_query *q, struct plan_db *hold,
    struct render_plan *rp, winquery_render_fn fn);

#endif
