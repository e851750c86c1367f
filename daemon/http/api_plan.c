/* SPDX-License-Identifier: BSD-3-Clause */
/* api_plan.c: the planning handlers: phases, windows (and .ics), coverage
   (and .csv, .svg), and the daemon's plan refresh. */
#include <math.h>
#include <pthread.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include <erfam.h>
#include <jansson.h>

#include "http/api.h"
#include "http/api_int.h"
#include "core/text.h"
#include "query/phquery.h"
#include "query/winquery.h"
#include "query/covquery.h"
#include "query/planquery.h"
#include "core/derive.h"
#include "core/eop.h"
#include "core/geom.h"
#include "core/plan.h"
#include "store/plan_db.h"
#include "formats/render_time.h"
#include "formats/render_phases.h"
#include "query/eclquery.h"
#include "formats/render_plan.h"
#include "formats/render_site.h"
#include "store/store.h"
#include "core/tscale.h"
#include "query/qzone.h"

void
api_h_phases(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	struct phquery_params p;
	char err[300];
	enum errcode rc;

	(void)ctx;
	phquery_params_init(&p, QPARAM_QUERY, (req->now1 - TEXT_MJD0) +
	    req->now2);
	err[0] = '\0';
	rc = ERRCODE_OK;
	for (size_t i = 0; i < req->nparams && rc == ERRCODE_OK; i++)
		rc = phquery_param_set(&p, req->params[i].key,
		    req->params[i].value, err, sizeof err);
	if (rc == ERRCODE_OK)
		rc = phquery_run(&p, PHQUERY_JSON, NULL, &resp->body, err,
		    sizeof err);
	if (rc != ERRCODE_OK)
		api_query_error(resp, rc, p.fault, err);
	else
		api_ok_or_error(resp, rc, 200, "application/json");
}

/* GET /api/v1/eclipses: the eclipses of a span (default a year from
   now) as "moonrange eclipses --json" prints them. */
void
api_h_eclipses(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	double now = (req->now1 - TEXT_MJD0) + req->now2, from, to;
	const char *fault = NULL;
	struct qspan sp;
	char err[300];
	enum errcode rc = ERRCODE_OK;

	(void)ctx;
	qspan_init(&sp);
	err[0] = '\0';
	for (size_t i = 0; i < req->nparams && rc == ERRCODE_OK; i++)
		rc = qspan_set(&sp, req->params[i].key, req->params[i].value,
		    now, ECLQUERY_DAYS_MAX, QPARAM_QUERY, &fault, err,
		    sizeof err);
	if (rc == ERRCODE_OK)
		rc = qspan_resolve(&sp, now, ECLQUERY_DAYS_DEFAULT,
		    ECLQUERY_DAYS_MAX, QPARAM_QUERY, &from, &to, &fault, err,
		    sizeof err);
	if (rc == ERRCODE_OK) {
		rc = eclquery_run(from, to, NULL, ECLQUERY_JSON, &resp->body,
		    err, sizeof err);
		if (rc == ERRCODE_BAD_ARG)
			fault = "to";
	}
	if (rc != ERRCODE_OK)
		api_query_error(resp, rc, fault, err);
	else
		api_ok_or_error(resp, rc, 200, "application/json");
}

/*
 * Under the lock: 0 if the daemon has no database (503 set); 1 if the
 * plan cache answered (cache is the plan's bytes, used when want); 2 to
 * compute the answer.
 */
static int
cache_or_compute(struct api_ctx *ctx, const struct mbuf *cache, int want,
    struct api_response *resp)
{
	int r = 2;

	pthread_mutex_lock(&ctx->lock);
	if (!api_store_open_ok(ctx, resp)) {
		r = 0;
	} else if (want && ctx->planned && cache->len > 0 &&
	    mbuf_status(cache) == ERRCODE_OK) {
		/* The plan cache: the coming days as of the last refresh. */
		mbuf_add(&resp->body, cache->data, cache->len);
		api_ok_or_error(resp, ERRCODE_OK, 200, "application/json");
		r = 1;
	}
	pthread_mutex_unlock(&ctx->lock);
	return r;
}

/*
 * Ranked windows from the open database, rendered as JSON or iCalendar:
 * the planner's query filled by plan_db_fill, p applied, then run and
 * rendered by winquery_render, as "moonrange windows" does.
 */
static enum errcode
windows_render(struct store *db, struct winquery_params *p, int ics,
    struct mbuf *out, size_t *nwindows, char *err, size_t errlen)
{
	struct plan_query q;
	struct plan_db hold;
	struct render_plan rp;
	struct tzone zone;
	enum errcode rc;

	plan_query_init(&q);
	plan_db_init(&hold);
	rc = plan_db_fill(db, &q, &hold, err, errlen);
	if (rc == ERRCODE_OK)
		rc = winquery_apply(p, &q, err, errlen);
	if (rc != ERRCODE_OK)
		goto out;
	memset(&rp, 0, sizeof rp);
	rp.station_name = q.station.name[0] != '\0' ? q.station.name : NULL;
	if (qzone_load(q.station.time_zone, q.from_mjd, q.to_mjd, &zone) ==
	    ERRCODE_OK)
		rp.time_zone = &zone;
	rp.now_mjd = p->now_mjd;
	rc = winquery_render(p, &q, &rp, ics ? render_windows_ics :
	    render_windows_json, out, nwindows, err, errlen);
out:
	plan_db_free(&hold);
	return rc;
}

/*
 * A window query over more than HEAVY_DAYS holds tens of megabytes while
 * it runs (the windows of every night and target, then their text): at
 * most HEAVY_MAX of them run at once in the daemon and the others wait
 * their turn, so that its memory stays bounded whatever the number of
 * clients (four 10-year queries at once raised it to 237 MB).  Shorter
 * queries never wait.  tests/load/heavy_rss.sh measures it.
 */
#define HEAVY_DAYS 400.0
#define HEAVY_MAX 1

static pthread_mutex_t heavy_mu = PTHREAD_MUTEX_INITIALIZER;
static pthread_cond_t heavy_cv = PTHREAD_COND_INITIALIZER;
static int heavy_running;

/* Is the span of p longer than HEAVY_DAYS (before qspan_resolve)? */
static int
heavy_span(const struct winquery_params *p)
{
	const struct qspan *s = &p->span;
	double from = isnan(s->from_mjd) ? p->now_mjd : s->from_mjd;

	if (!isnan(s->days))
		return s->days > HEAVY_DAYS;
	return !isnan(s->to_mjd) && s->to_mjd - from > HEAVY_DAYS;
}

/* Take (take != 0) or give back a turn of a heavy query. */
static void
heavy_turn(int take)
{
	pthread_mutex_lock(&heavy_mu);
	if (take) {
		while (heavy_running >= HEAVY_MAX)
			pthread_cond_wait(&heavy_cv, &heavy_mu);
		heavy_running++;
	} else {
		heavy_running--;
		pthread_cond_signal(&heavy_cv);
	}
	pthread_mutex_unlock(&heavy_mu);
}

static void
windows_common(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp, int ics)
{
	struct winquery_params p;
	struct store *db;
	char err[300];
	int locked;
	enum errcode rc = ERRCODE_OK;

	if (cache_or_compute(ctx, &ctx->plan_windows, !ics &&
	    req->nparams == 0, resp) != 2)
		return;
	winquery_params_init(&p, QPARAM_QUERY, (req->now1 - TEXT_MJD0) +
	    req->now2);
	err[0] = '\0';
	for (size_t i = 0; i < req->nparams && rc == ERRCODE_OK; i++)
		rc = winquery_param_set(&p, req->params[i].key,
		    req->params[i].value, err, sizeof err);
	if (rc == ERRCODE_OK) {
		int heavy = heavy_span(&p);

		if (heavy)
			heavy_turn(1);
		db = api_read_store(ctx, &locked);
		rc = windows_render(db, &p, ics, &resp->body, NULL, err,
		    sizeof err);
		api_release_store(ctx, db, locked);
		if (heavy)
			heavy_turn(0);
	}
	if (rc != ERRCODE_OK)
		api_query_error(resp, rc, p.fault, err);
	else
		api_ok_or_error(resp, rc, 200,
		    ics ? "text/calendar; charset=utf-8" :
		    "application/json");
}

void
api_h_windows(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	windows_common(ctx, req, resp, 0);
}

void
api_h_windows_ics(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	windows_common(ctx, req, resp, 1);
}

/* coverage, coverage.csv, coverage.svg: the CLI's query path. */
static void
coverage_common(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp, enum covquery_format fmt, const char *ctype)
{
	struct covquery_params p;
	struct store *db;
	char err[300];
	int locked;
	enum errcode rc;

	if (cache_or_compute(ctx, &ctx->plan_coverage, fmt == COVQUERY_JSON &&
	    req->nparams == 0, resp) != 2)
		return;
	covquery_params_init(&p);
	for (size_t i = 0; i < req->nparams; i++) {
		err[0] = '\0';
		rc = covquery_param_set(&p, req->params[i].key,
		    req->params[i].value, err, sizeof err);
		if (rc != ERRCODE_OK) {
			api_query_error(resp, rc, req->params[i].key, err);
			return;
		}
	}
	p.now_mjd = (req->now1 - TEXT_MJD0) + req->now2;
	err[0] = '\0';
	db = api_read_store(ctx, &locked);
	rc = covquery_run(db, &p, fmt, &resp->body, err, sizeof err);
	api_release_store(ctx, db, locked);
	if (rc != ERRCODE_OK) {
		api_query_error(resp, rc, p.fault, err);
		return;
	}
	api_ok_or_error(resp, rc, 200, ctype);
}

void
api_h_coverage(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	coverage_common(ctx, req, resp, COVQUERY_JSON, "application/json");
}

void
api_h_coverage_csv(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	coverage_common(ctx, req, resp, COVQUERY_CSV,
	    "text/csv; charset=utf-8; header=present");
}

void
api_h_coverage_svg(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	coverage_common(ctx, req, resp, COVQUERY_SVG, "image/svg+xml");
}

/*
 * plan, plan.ics, plan.svg: the night plan by the CLI's query path
 * (planquery_run), planned afresh from the store as it is now, so a
 * logged attempt or a new blackout shows in the next answer.  at
 * defaults to the request's arrival.
 */
static void
plan_common(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp, enum planquery_format fmt, const char *ctype)
{
	struct planquery_params p;
	struct store *db;
	char err[300];
	int locked, ok;
	enum errcode rc;

	pthread_mutex_lock(&ctx->lock);
	ok = api_store_open_ok(ctx, resp);
	pthread_mutex_unlock(&ctx->lock);
	if (!ok)
		return;
	planquery_params_init(&p, QPARAM_QUERY);
	p.at_mjd = (req->now1 - ERFA_DJM0) + req->now2;
	for (size_t i = 0; i < req->nparams; i++) {
		err[0] = '\0';
		rc = planquery_param_set(&p, req->params[i].key,
		    req->params[i].value, err, sizeof err);
		if (rc != ERRCODE_OK) {
			api_query_error(resp, rc, req->params[i].key, err);
			return;
		}
	}
	err[0] = '\0';
	db = api_read_store(ctx, &locked);
	rc = planquery_run(db, &p, fmt, &resp->body, err, sizeof err);
	api_release_store(ctx, db, locked);
	if (rc != ERRCODE_OK) {
		api_query_error(resp, rc, p.fault, err);
		return;
	}
	api_ok_or_error(resp, rc, 200, ctype);
}

void
api_h_plan(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	plan_common(ctx, req, resp, PLANQUERY_JSON, "application/json");
}

void
api_h_plan_ics(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	plan_common(ctx, req, resp, PLANQUERY_ICS,
	    "text/calendar; charset=utf-8");
}

void
api_h_plan_svg(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	plan_common(ctx, req, resp, PLANQUERY_SVG, "image/svg+xml");
}

enum errcode
api_replan(struct api_ctx *ctx, double now1, double now2, char *errbuf,
    size_t errlen)
{
	struct store_settings set;
	struct covquery_params p;
	struct store *db;
	struct mbuf w, c;
	double now_mjd = (now1 - TEXT_MJD0) + now2, days;
	size_t n = 0;
	int locked;
	enum errcode rc;

	mbuf_init(&w);
	mbuf_init(&c);
	/* A write from now on asks for the next plan: this one may not
	   see it. */
	pthread_mutex_lock(&ctx->lock);
	ctx->replan = 0;
	db = ctx->db;
	pthread_mutex_unlock(&ctx->lock);
	if (db == NULL) {
		snprintf(errbuf, errlen, "no database open");
		return ERRCODE_CONFIG;
	}
	/* Computed on a connection of its own: requests go on meanwhile. */
	db = api_read_store(ctx, &locked);
	rc = store_settings_get(db, &set, errbuf, errlen);
	if (rc == ERRCODE_OK) {
		days = ctx->plan_days > 0 ? ctx->plan_days : set.plan_days;
		struct winquery_params wp;

		winquery_params_init(&wp, QPARAM_QUERY, now_mjd);
		wp.span.from_mjd = now_mjd;
		wp.span.to_mjd = now_mjd + days;
		rc = windows_render(db, &wp, 0, &w, &n, errbuf, errlen);
	}
	if (rc == ERRCODE_OK) {
		covquery_params_init(&p);
		p.now_mjd = now_mjd;
		rc = covquery_run(db, &p, COVQUERY_JSON, &c, errbuf, errlen);
	}
	api_release_store(ctx, db, locked);
	if (rc == ERRCODE_OK) {
		pthread_mutex_lock(&ctx->lock);
		mbuf_free(&ctx->plan_windows);
		mbuf_free(&ctx->plan_coverage);
		ctx->plan_windows = w;
		ctx->plan_coverage = c;
		mbuf_init(&w);
		mbuf_init(&c);
		ctx->plan_nwindows = n;
		ctx->plan_days_used = days;
		ctx->planned = 1;
		ctx->plan_utc1 = now1;
		ctx->plan_utc2 = now2;
		pthread_mutex_unlock(&ctx->lock);
	}
	mbuf_free(&w);
	mbuf_free(&c);
	return rc;
}

int
api_replan_wanted(struct api_ctx *ctx)
{
	int w;

	pthread_mutex_lock(&ctx->lock);
	w = ctx->replan;
	ctx->replan = 0;
	pthread_mutex_unlock(&ctx->lock);
	return w;
}
