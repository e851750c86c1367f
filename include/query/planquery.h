/* SPDX-License-Identifier: BSD-3-Clause */
/* planquery.h: the night plan from the database to rendered bytes, the
   one path shared by "moonrange plan", "tonight" and GET /api/v1/plan. */
#ifndef MOONRANGE_PLANQUERY_H
#define MOONRANGE_PLANQUERY_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/mem.h"
#include "core/night.h"
#include "query/qparam.h"

struct store;

enum planquery_format {
	PLANQUERY_TEXT = 0,
	PLANQUERY_JSON,
	PLANQUERY_CSV,
	PLANQUERY_ICS,
	PLANQUERY_SVG
};

/*
 * The query.  at_mjd is "now" (UTC): the caller reads the clock, so that
 * a pinned now gives the same bytes.  Without from/to the plan runs from
 * now to the next local noon at the station (the rest of the night);
 * with both it plans [from, to) as if it were now at from.  style says
 * how sentences name parameters (qparam.h); after an error, fault is the
 * canonical name of the parameter at fault, or NULL.
 */
struct planquery_params {
	enum qparam_style style;
	const char *fault;
	double at_mjd;
	double from_mjd, to_mjd;	/* NaN: not given */
	enum sched_method method;	/* best */
};

void planquery_params_init(struct planquery_params *p,
    enum qparam_style style);

/*
 * Set one parameter from text by its name (the CLI's option without
 * "--"): from, to, at (ISO 8601 UTC), method (best | greedy).
 * ERRCODE_BAD_ARG with a sentence naming the parameter (as p->style
 * spells it) and p->fault set; ERRCODE_NOT_FOUND for an unknown name.
 */
enum errcode planquery_param_set(struct planquery_params *p,
    const char *name, const char *value, char *errbuf, size_t errlen);

/*
 * The span the parameters ask for: from/to as given (both or neither,
 * to after from, at most NIGHT_MAX_DAYS, at least one slot of the
 * scheduler's grid), else now to the next local noon in zone tz.
 * ERRCODE_BAD_ARG naming the parameter as p->style spells it, p->fault
 * set (NULL for an unknown zone of the station).
 */
enum errcode planquery_span(struct planquery_params *p, const char *tz,
    double *from_mjd, double *to_mjd, char *errbuf, size_t errlen);

/*
 * Load the station, log and settings from an open database and plan the
 * span of [from, to): out owns its arrays (night_result_free).
 * station_name/tz (each >= SITE_NAME_LEN / SITE_TZ_LEN, may be NULL) get
 * the station's name and zone.
 */
enum errcode planquery_night(struct store *db, double from_mjd,
    double to_mjd, enum sched_method method, struct night_result *out,
    char *errbuf, size_t errlen);

/*
 * Run the query on an open database and render it in fmt into out.
 * Nothing is written to the database.  On failure out may hold a part of
 * the output: the caller discards it; a parameter at fault is named as
 * planquery_span names it.
 */
enum errcode planquery_run(struct store *db, struct planquery_params *p,
    enum planquery_format fmt, struct mbuf *out, char *errbuf, size_t errlen);

/* The settings of the scheduler from the database's settings. */
enum errcode planquery_settings(struct store *db, struct night_settings *s,
    char *errbuf, size_t errlen);

/*
 * The first local noon in zone tz strictly after mjd (UTC MJD), DST
 * included.  ERRCODE_BAD_ARG for an unknown zone.
 */
enum errcode planquery_noon_after(double mjd, const char *tz, double *out);

#endif
