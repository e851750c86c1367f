/* SPDX-License-Identifier: BSD-3-Clause */
/* covquery.h: a coverage audit from the database to rendered bytes, the
   one path shared by "moonrange coverage" and GET /api/v1/coverage. */
#ifndef MOONRANGE_COVQUERY_H
#define MOONRANGE_COVQUERY_H

#include <stddef.h>

#include "core/coverage.h"
#include "core/errcode.h"
#include "core/mem.h"
#include "formats/render_cov.h"
#include "query/qparam.h"

struct store;

enum covquery_format {
	COVQUERY_TEXT = 0,
	COVQUERY_JSON,
	COVQUERY_CSV,
	COVQUERY_SVG
};

#define COVQUERY_HORIZON_DEFAULT 60.0	/* days of fill dates */
#define COVQUERY_HORIZON_MAX 366.0

/*
 * The query.  spec's own_station and site are filled by covquery_run
 * from the database; the caller sets the rest (defaults from
 * covquery_params_init).  now_mjd (UTC) starts the horizon of the fill
 * dates: the caller reads the clock, so that a pinned "now" gives the
 * same bytes.  horizon_days 0 asks for no fill dates.
 */
struct covquery_params {
	enum qparam_style style;	/* how sentences name parameters */
	const char *fault;		/* after an error: the parameter at
					   fault (canonical name), or NULL */
	struct coverage_spec spec;
	double horizon_days;
	double now_mjd;
	enum render_cov_theme theme;	/* the SVG's palette (light) */
};

void covquery_params_init(struct covquery_params *p);

/*
 * Set one parameter from text, by its canonical name (the HTTP API's;
 * the CLI's option without "--", with '-' as '_'): source, axis, bins,
 * min_count, since, until, target, station, horizon, theme (light or
 * dark; the SVG only).  ERRCODE_BAD_ARG (a sentence naming the parameter
 * as p->style spells it in errbuf, p->fault set) for a bad value,
 * ERRCODE_NOT_FOUND for an unknown name.  Times are ISO 8601 UTC.
 */
enum errcode covquery_param_set(struct covquery_params *p, const char *name,
    const char *value, char *errbuf, size_t errlen);

/*
 * Check the parameters together (until after since, then
 * coverage_spec_check); covquery_run does it too.  ERRCODE_OK, or
 * ERRCODE_BAD_ARG with a sentence naming the parameter, p->fault set.
 */
enum errcode covquery_params_check(struct covquery_params *p, char *errbuf,
    size_t errlen);

/*
 * Run the audit on an open database and render it in fmt into out.
 *
 * Returned (function value):
 *   ERRCODE_OK; ERRCODE_NOT_FOUND for an unknown target (errbuf names
 *   it, p->fault is "target"); ERRCODE_BAD_ARG for a bad spec or the hour_angle axis without a
 *   station; ERRCODE_TOO_LARGE when the result would exceed the core's
 *   limits; ERRCODE_DB, ERRCODE_NOMEM.
 * Notes:
 *   Nothing is written to the database.  On failure out may hold a part
 *   of the output: the caller discards it.
 */
enum errcode covquery_run(struct store *db, struct covquery_params *p,
    enum covquery_format fmt, struct mbuf *out, char *errbuf,
    size_t errlen);

#endif
