/* SPDX-License-Identifier: BSD-3-Clause */
/* winquery.h: the windows query, shared by "moonrange windows" /
   "tonight" and GET /api/v1/windows: its parameters set by name with one
   set of rules, applied to a filled plan query, run and rendered. */
#ifndef MOONRANGE_WINQUERY_H
#define MOONRANGE_WINQUERY_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/mem.h"
#include "core/plan.h"
#include "core/site.h"
#include "core/window.h"
#include "formats/render_plan.h"
#include "query/qparam.h"

#define WINQUERY_DAYS_DEFAULT 3.0
#define WINQUERY_DAYS_MAX WINDOW_MAX_SPAN_DAYS

/* The parameters by their canonical names (the HTTP API's), comma
   separated: what GET /api/v1/windows accepts. */
#define WINQUERY_PARAMS "from,to,days,target,limit,min_el,max_sun_el," \
	"min_sun_sep"

/*
 * The query as given.  The caller owns it; nothing in it is allocated.
 * style says how sentences name parameters (qparam.h); after an error,
 * fault is the canonical name of the parameter at fault, or NULL.
 */
struct winquery_params {
	enum qparam_style style;
	const char *fault;
	double now_mjd;			/* UTC: "now", and the default from */
	struct qspan span;
	char target[SITE_ID_LEN];	/* "" for every active target */
	size_t limit;			/* the best limit windows; 0 = all */
	double min_el_deg;		/* overrides of the station's limits; */
	double max_sun_el_deg;		/* NaN keeps the station's */
	double min_sun_sep_deg;
};

/* Defaults: no limit, every target, the station's limits, from now. */
void winquery_params_init(struct winquery_params *p,
    enum qparam_style style, double now_mjd);

/*
 * Set one parameter from text by its canonical name: from, to, days
 * (qspan rules, at most WINQUERY_DAYS_MAX), target (a target id), limit
 * (whole, 1..PLAN_MAX_WINDOWS), min_el (-5..89), max_sun_el (-90..90),
 * min_sun_sep (0..180) in degrees.  Numbers are text_parse_real's.
 *
 * Returned (function value):
 *   ERRCODE_OK; ERRCODE_BAD_ARG or ERRCODE_BAD_TIME with a sentence
 *   naming the parameter (as p->style spells it) in errbuf and p->fault
 *   set; ERRCODE_NOT_FOUND for a name that is not a parameter.
 */
enum errcode winquery_param_set(struct winquery_params *p, const char *name,
    const char *value, char *errbuf, size_t errlen);

/*
 * Apply p to q, which plan_db_load, plan_db_fill or the caller filled
 * (station, targets, data): the span, target, limit and limit overrides.
 * Errors as winquery_param_set (a bad span names "to" or "days").
 */
enum errcode winquery_apply(struct winquery_params *p,
    struct plan_query *q, char *errbuf, size_t errlen);

/* A renderer of a plan: render_windows_json, _csv, _ics, _text, ... */
typedef enum errcode (*winquery_render_fn)(const struct render_plan *p,
    struct mbuf *out);

/*
 * Run q (as winquery_apply left it) and append the result rendered by fn
 * to out: rp->r is set for the call and reset after it, the rest of rp is
 * the caller's.  *nwindows (may be NULL) gets the number of windows
 * ranked.  The same path for "moonrange windows" / "tonight" and the
 * daemon's /api/v1/windows, so that both print the same bytes.  p gives
 * the style of the sentences and gets the fault; it may be NULL (the
 * plan refresh), the sentences then use canonical names.
 *
 * Returned (function value):
 *   plan_run's code with its sentence in errbuf (ERRCODE_NOT_FOUND for a
 *   target that is not active, naming "target"; ERRCODE_TOO_LARGE for
 *   too many windows, naming "to"), or the renderer's (ERRCODE_NOMEM).
 */
enum errcode winquery_render(struct winquery_params *p,
    const struct plan_query *q, struct render_plan *rp,
    winquery_render_fn fn, struct mbuf *out, size_t *nwindows,
    char *errbuf, size_t errlen);

#endif
