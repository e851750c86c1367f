/* SPDX-License-Identifier: BSD-3-Clause */
/* api.c: the route table of /api/v1/ and its handlers, free of any HTTP library. */
#include <math.h>
#include <pthread.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include <erfam.h>
#include <jansson.h>

#include "http/api.h"
#include "query/winquery.h"
#include "query/covquery.h"
#include "core/derive.h"
#include "core/eop.h"
#include "core/geom.h"
#include "core/plan.h"
#include "store/plan_db.h"
#include "formats/render.h"
#include "formats/render_site.h"
#include "store/store.h"
#include "core/tscale.h"

#define PHASES_CAP 5000		/* ~100 years of principal phases */
#define SPAN_MAX_DAYS 36600.0	/* as the CLI */
#define ATTEMPTS_LIMIT_DEFAULT 50
#define ATTEMPTS_LIMIT_MAX 1000
#define ATTEMPT_MAX_DAYS 1.0	/* longest attempt accepted, days */
#define WINDOWS_DAYS_DEFAULT 3.0	/* as the CLI */
#define WINDOWS_DAYS_MAX 3660.0

struct api_ctx {
	pthread_mutex_t lock;		/* serialises handlers and replans */
	char *db_path;
	char token[API_TOKEN_MAX + 1];
	size_t token_len;		/* 0: writes are refused */
	double plan_days, refresh_s, start_posix;
	struct api_site site;
	struct store *db;		/* borrowed */
	/* the plan cache: GET windows and coverage without parameters */
	int planned;			/* a plan has been computed */
	double plan_utc1, plan_utc2;	/* when */
	int replan;			/* a write asked for a new plan */
	struct mbuf plan_windows;	/* render_windows_json of the plan */
	struct mbuf plan_coverage;	/* coverage JSON, default query */
	size_t plan_nwindows;
	double plan_days_used;
};

typedef void (*api_handler)(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);

struct route {
	struct api_route_info info;
	api_handler fn;
	int unlocked;		/* takes ctx->lock itself, only to look at
				   the context: its slow part runs on a
				   connection of its own (read_store) */
};

/* --- responses and errors --- */

void
api_response_init(struct api_response *r)
{
	r->status = 500;
	r->content_type = "application/json";
	mbuf_init(&r->body);
	r->location[0] = '\0';
	r->allow[0] = '\0';
}

void
api_response_free(struct api_response *r)
{
	mbuf_free(&r->body);
}

unsigned
api_http_status(enum errcode rc)
{
	switch (rc) {
	case ERRCODE_OK:
		return 200;
	case ERRCODE_BAD_ARG:
	case ERRCODE_BAD_TIME:
		return 400;
	case ERRCODE_AUTH:
		return 401;
	case ERRCODE_NOT_FOUND:
		return 404;
	case ERRCODE_METHOD:
		return 405;
	case ERRCODE_EXISTS:
		return 409;
	case ERRCODE_TOO_LARGE:
		return 413;
	case ERRCODE_UNSUPPORTED:
		return 415;
	case ERRCODE_CONFIG:		/* the daemon has no usable site */
		return 503;
	case ERRCODE_NOMEM:
	case ERRCODE_DB:
	case ERRCODE_IO:
	case ERRCODE_NO_CONVERGE:
	case ERRCODE__LAST:
		break;
	}
	return 500;
}

void
api_error(struct api_response *r, enum errcode rc, const char *field,
    const char *message)
{
	json_t *root = json_object(), *e = json_object();
	int bad = root == NULL || e == NULL;

	mbuf_free(&r->body);
	r->status = api_http_status(rc);
	r->content_type = "application/json";
	if (!bad) {
		bad |= json_object_set_new(root, "error", e);
		bad |= json_object_set_new(e, "code",
		    json_string(errcode_name(rc)));
		bad |= json_object_set_new(e, "message",
		    json_string(message ? message : errcode_str(rc)));
		bad |= json_object_set_new(e, "field",
		    field ? json_string(field) : json_null());
	} else {
		json_decref(e);
	}
	if (bad || render_json_dump(root, &r->body) != ERRCODE_OK) {
		if (bad)
			json_decref(root);
		/* Out of memory: a fixed body needs no allocation to describe. */
		mbuf_free(&r->body);
		r->status = 500;
	}
}

/* A handler's normal ending: 200 with what a renderer produced. */
static void
ok_or_error(struct api_response *r, enum errcode rc, unsigned status,
    const char *ctype)
{
	if (rc == ERRCODE_OK && mbuf_status(&r->body) == ERRCODE_OK) {
		r->status = status;
		r->content_type = ctype;
		return;
	}
	api_error(r, rc != ERRCODE_OK ? rc : ERRCODE_NOMEM, NULL, NULL);
}

/* --- the site snapshot --- */

void
api_site_free(struct api_site *s)
{
	if (s == NULL)
		return;
	mem_free(s->targets);
	mem_free(s->eop);
	memset(s, 0, sizeof *s);
}

/* --- parameters --- */

/* Is key one of the comma-separated names in list? */
static int
param_listed(const char *list, const char *key)
{
	size_t k = strlen(key);

	for (const char *p = list; p != NULL && *p != '\0';) {
		const char *e = strchr(p, ',');
		size_t n = e ? (size_t)(e - p) : strlen(p);

		if (n == k && k > 0 && strncmp(p, key, n) == 0)
			return 1;
		p = e ? e + 1 : NULL;
	}
	return 0;
}

/* Refuse unknown, repeated or too many query parameters (400 naming it). */
static int
params_check(const struct api_request *req, const char *allowed,
    struct api_response *resp)
{
	char msg[200];

	if (req->params_overflow) {
		snprintf(msg, sizeof msg, "more than %d query parameters",
		    API_MAX_PARAMS);
		api_error(resp, ERRCODE_BAD_ARG, NULL, msg);
		return -1;
	}
	for (size_t i = 0; i < req->nparams; i++) {
		const char *key = req->params[i].key;

		if (!param_listed(allowed, key)) {
			if (allowed != NULL && *allowed != '\0')
				snprintf(msg, sizeof msg, "unknown query "
				    "parameter '%.60s' (accepted: %s)", key,
				    allowed);
			else
				snprintf(msg, sizeof msg, "unknown query "
				    "parameter '%.60s' (this resource takes "
				    "none)", key);
			api_error(resp, ERRCODE_BAD_ARG, key, msg);
			return -1;
		}
		for (size_t j = 0; j < i; j++)
			if (strcmp(req->params[j].key, key) == 0) {
				snprintf(msg, sizeof msg, "query parameter "
				    "'%.60s' given twice", key);
				api_error(resp, ERRCODE_BAD_ARG, key, msg);
				return -1;
			}
	}
	return 0;
}

static const char *
param(const struct api_request *req, const char *key)
{
	for (size_t i = 0; i < req->nparams; i++)
		if (strcmp(req->params[i].key, key) == 0)
			return req->params[i].value ? req->params[i].value : "";
	return NULL;
}

/* A UTC time parameter: "now" or ISO 8601.  0, or -1 with the error set. */
static int
param_time(const struct api_request *req, const char *key, double *u1,
    double *u2, struct api_response *resp)
{
	const char *v = param(req, key);
	char err[160], msg[220];

	if (strcmp(v, "now") == 0) {
		*u1 = req->now1;
		*u2 = req->now2;
		return 0;
	}
	if (tscale_parse_utc(v, u1, u2, err, sizeof err) != ERRCODE_OK) {
		snprintf(msg, sizeof msg, "%s: %s", key, err);
		api_error(resp, ERRCODE_BAD_TIME, key, msg);
		return -1;
	}
	return 0;
}

static int
param_number(const struct api_request *req, const char *key, double min,
    double max, double *out, struct api_response *resp)
{
	const char *v = param(req, key);
	char msg[200], *end;
	double x;

	x = strtod(v, &end);
	if (*v == '\0' || *end != '\0' || !isfinite(x) || x < min || x > max) {
		snprintf(msg, sizeof msg, "%s: '%.40s' is not a number in "
		    "%g..%g", key, v, min, max);
		api_error(resp, ERRCODE_BAD_ARG, key, msg);
		return -1;
	}
	*out = x;
	return 0;
}

/* A whole-number parameter in [min, max]; *out untouched when absent. */
static int
param_count(const struct api_request *req, const char *key, double min,
    double max, size_t *out, struct api_response *resp)
{
	char msg[120];
	double x;

	if (param(req, key) == NULL)
		return 0;
	if (param_number(req, key, min, max, &x, resp))
		return -1;
	if (x != floor(x)) {
		snprintf(msg, sizeof msg, "%s: must be a whole number", key);
		api_error(resp, ERRCODE_BAD_ARG, key, msg);
		return -1;
	}
	*out = (size_t)x;
	return 0;
}

/*
 * The span of from/to/days, with the CLI's rules: from defaults to now,
 * to to from + days, days to defdays; to and days exclude each other.
 */
static int
param_span(const struct api_request *req, double defdays, double maxdays,
    double *f1,
    double *f2, double *t1, double *t2, struct tscale_instant *a,
    struct tscale_instant *b, struct api_response *resp)
{
	double days = defdays, span;

	*f1 = req->now1;
	*f2 = req->now2;
	if (param(req, "from") && param_time(req, "from", f1, f2, resp))
		return -1;
	if (param(req, "days") && param_number(req, "days", 0.0,
	    maxdays, &days, resp))
		return -1;
	if (param(req, "to") != NULL) {
		if (param(req, "days") != NULL) {
			api_error(resp, ERRCODE_BAD_ARG, "days",
			    "to and days: give one, not both");
			return -1;
		}
		if (param_time(req, "to", t1, t2, resp))
			return -1;
	} else {
		*t1 = *f1;
		*t2 = *f2 + days;
	}
	if (tscale_from_utc(*f1, *f2, 0.0, a) != ERRCODE_OK ||
	    tscale_from_utc(*t1, *t2, 0.0, b) != ERRCODE_OK) {
		api_error(resp, ERRCODE_BAD_TIME, "from",
		    "from/to: outside the convertible range");
		return -1;
	}
	span = tscale_tt_diff(a->tt1, a->tt2, b->tt1, b->tt2);
	if (span < 0) {
		api_error(resp, ERRCODE_BAD_ARG, "to",
		    "to: must not be before from");
		return -1;
	}
	if (span > maxdays * 86400.0) {
		char msg[80];

		snprintf(msg, sizeof msg, "to: span longer than %.0f days",
		    maxdays);
		api_error(resp, ERRCODE_BAD_ARG, "to", msg);
		return -1;
	}
	return 0;
}

/* --- small JSON helpers --- */

static json_t *
iso_or_null(double utc1, double utc2)
{
	char buf[40];

	if (tscale_format_utc(utc1, utc2, 0, buf, sizeof buf) != ERRCODE_OK)
		return json_null();
	return json_string(buf);
}

static json_t *
iso_of_mjd(double mjd)
{
	return isfinite(mjd) ? iso_or_null(ERFA_DJM0, mjd) : json_null();
}

static void
json_reply(struct api_response *resp, json_t *root, int bad)
{
	enum errcode rc;

	if (root == NULL || bad) {
		json_decref(root);
		api_error(resp, ERRCODE_NOMEM, NULL, NULL);
		return;
	}
	rc = render_json_dump(root, &resp->body);
	ok_or_error(resp, rc, 200, "application/json");
}

static int
site_loaded(struct api_ctx *ctx, struct api_response *resp)
{
	if (ctx->site.station.name[0] == '\0') {
		api_error(resp, ERRCODE_CONFIG, NULL,
		    "the daemon has no station loaded");
		return 0;
	}
	return 1;
}

/* Earth orientation at a UTC MJD from the site's table (zeros if none). */
static enum eop_source
site_eop_at(const struct api_site *s, double mjd, struct geom_eop *out)
{
	struct eop_table t;

	t.rows = s->eop;
	t.n = s->neop;
	return eop_lookup(&t, mjd, out);
}

/* --- handlers --- */

static void
h_status(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	json_t *root = json_object(), *o;
	const struct api_site *s = &ctx->site;
	double now_mjd = (req->now1 - ERFA_DJM0) + req->now2;
	double up = tscale_to_posix(req->now1, req->now2) - ctx->start_posix;
	double su1, su2;
	size_t active = 0;
	int bad = root == NULL;

	if (bad)
		goto out;
	for (size_t i = 0; i < s->ntargets; i++)
		active += s->targets[i].active != 0;
	if (tscale_from_posix(ctx->start_posix, &su1, &su2) != ERRCODE_OK)
		su1 = su2 = NAN;
	bad |= json_object_set_new(root, "version",
	    json_string(MOONRANGE_VERSION));
	bad |= json_object_set_new(root, "api", json_string("v1"));
	bad |= json_object_set_new(root, "now_utc",
	    iso_or_null(req->now1, req->now2));
	bad |= json_object_set_new(root, "started_utc", iso_or_null(su1, su2));
	bad |= json_object_set_new(root, "uptime_s",
	    json_integer((json_int_t)(up > 0 ? floor(up) : 0)));
	bad |= json_object_set_new(root, "database",
	    ctx->db_path ? json_string(ctx->db_path) : json_null());
	bad |= json_object_set_new(root, "station",
	    s->station.name[0] ? json_string(s->station.name) : json_null());
	bad |= json_object_set_new(root, "targets_active",
	    json_integer((json_int_t)active));
	bad |= json_object_set_new(root, "writes_enabled",
	    json_boolean(ctx->token_len > 0));

	o = json_object();
	bad |= json_object_set_new(root, "plan", o);
	if (o != NULL) {
		bad |= json_object_set_new(o, "last_utc", ctx->planned ?
		    iso_or_null(ctx->plan_utc1, ctx->plan_utc2) : json_null());
		bad |= json_object_set_new(o, "refresh_s",
		    render_json_num(ctx->refresh_s, 0));
		bad |= json_object_set_new(o, "days", ctx->planned ?
		    render_json_num(ctx->plan_days_used, 3) : json_null());
		bad |= json_object_set_new(o, "windows", ctx->planned ?
		    json_integer((json_int_t)ctx->plan_nwindows) : json_null());
	}

	o = json_object();
	bad |= json_object_set_new(root, "eop", o);
	if (o != NULL) {
		int covers = s->neop > 0 && now_mjd >= s->eop[0].mjd &&
		    now_mjd <= s->eop[s->neop - 1].mjd;

		bad |= json_object_set_new(o, "rows",
		    json_integer((json_int_t)s->neop));
		bad |= json_object_set_new(o, "first_utc", s->neop ?
		    iso_of_mjd(s->eop[0].mjd) : json_null());
		bad |= json_object_set_new(o, "last_utc", s->neop ?
		    iso_of_mjd(s->eop[s->neop - 1].mjd) : json_null());
		bad |= json_object_set_new(o, "covers_now",
		    json_boolean(covers));
	}
out:
	json_reply(resp, root, bad);
}

/* The station and the targets: the renderers of "station show --json"
   and "target list --json". */
static void
h_site(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	enum errcode rc;

	(void)req;
	if (!site_loaded(ctx, resp))
		return;
	rc = render_site_station_json(&ctx->site.station, &resp->body);
	ok_or_error(resp, rc, 200, "application/json");
}

static void
h_targets(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	enum errcode rc;

	(void)req;
	rc = render_site_targets_json(ctx->site.targets, ctx->site.ntargets,
	    &resp->body);
	ok_or_error(resp, rc, 200, "application/json");
}

static void
h_now(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	const struct site_station *st = &ctx->site.station;
	struct render_target_row *rows = NULL;
	struct geom_site site;
	struct geom_eop eop = {0.0, 0.0, 0.0};
	struct geom_instant *g = NULL;
	struct render_ephem rep;
	enum eop_source src;
	double u1 = req->now1, u2 = req->now2;
	char last[40];
	size_t n = 0;
	enum errcode rc;

	if (!site_loaded(ctx, resp))
		return;
	if (param(req, "at") && param_time(req, "at", &u1, &u2, resp))
		return;
	if (derive_site(st, &site) != ERRCODE_OK) {
		api_error(resp, ERRCODE_CONFIG, NULL,
		    "the station's position is out of range");
		return;
	}
	src = site_eop_at(&ctx->site, (u1 - ERFA_DJM0) + u2, &eop);
	/* The table's last day, as "ephem --db" reports it. */
	if (ctx->site.neop == 0 || tscale_format_utc(ERFA_DJM0,
	    ctx->site.eop[ctx->site.neop - 1].mjd, 0, last, sizeof last))
		last[0] = '\0';
	last[10] = '\0';
	g = mem_alloc(sizeof *g);
	rows = mem_calloc(ctx->site.ntargets + 1, sizeof *rows);
	if (g == NULL || rows == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	rc = geom_instant_at(&site, &eop, u1, u2, GEOM_PREC_FULL, g);
	if (rc != ERRCODE_OK) {
		api_error(resp, rc, "at", "at: the instant cannot be converted");
		goto done;
	}
	for (size_t i = 0; i < ctx->site.ntargets; i++) {
		const struct site_target *t = &ctx->site.targets[i];
		struct geom_target gt;

		if (!t->active || geom_target_from_selen(t->lat_deg * ERFA_DD2R,
		    t->lon_deg * ERFA_DD2R, t->height_m, &gt) != ERRCODE_OK)
			continue;
		rows[n].id = t->id;
		geom_target_view(g, &gt, &rows[n].view);
		n++;
	}
	memset(&rep, 0, sizeof rep);
	rep.g = g;
	rep.targets = rows;
	rep.ntargets = n;
	rep.dut1_source = eop_source_name(src);
	rep.eop_last_utc = last[0] ? last : NULL;
	rep.station_name = st->name;
	rep.time_zone = st->time_zone[0] ? st->time_zone : NULL;
	rc = render_ephem_json(&rep, &resp->body);
out:
	ok_or_error(resp, rc, 200, "application/json");
done:
	mem_free(rows);
	mem_free(g);
}

static void
h_phases(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	struct geom_phase_event *ev;
	struct tscale_instant a, b;
	struct render_phases rp;
	size_t n = 0;
	enum errcode rc;

	(void)ctx;
	memset(&rp, 0, sizeof rp);
	if (param_span(req, 30.0, SPAN_MAX_DAYS, &rp.from1, &rp.from2, &rp.to1, &rp.to2, &a,
	    &b, resp))
		return;
	ev = mem_calloc(PHASES_CAP, sizeof *ev);
	if (ev == NULL) {
		api_error(resp, ERRCODE_NOMEM, NULL, NULL);
		return;
	}
	rc = geom_phases_find(a.tt1, a.tt2, b.tt1, b.tt2, ev, PHASES_CAP, &n);
	if (rc == ERRCODE_OK) {
		rp.ev = ev;
		rp.n = n;
		rc = render_phases_json(&rp, &resp->body);
	}
	ok_or_error(resp, rc, 200, "application/json");
	mem_free(ev);
}

static int
store_open_ok(struct api_ctx *ctx, struct api_response *resp)
{
	if (ctx->db == NULL) {
		api_error(resp, ERRCODE_CONFIG, NULL,
		    "the daemon has no database open");
		return 0;
	}
	return 1;
}

/*
 * A database to read for one slow request (windows, coverage) without
 * holding ctx->lock, so that /now, /status and writes go on meanwhile:
 * a read-only connection of its own to the daemon's file (WAL lets it
 * read beside the shared one).  Where that cannot be had (no path, or
 * the open fails), the shared connection under the lock; *locked says
 * which, for release_store.
 */
static struct store *
read_store(struct api_ctx *ctx, int *locked)
{
	struct store *db = NULL;

	if (ctx->db_path != NULL && store_open(ctx->db_path,
	    STORE_OPEN_READONLY, &db, NULL, 0) == ERRCODE_OK) {
		*locked = 0;
		return db;
	}
	pthread_mutex_lock(&ctx->lock);
	*locked = 1;
	return ctx->db;
}

static void
release_store(struct api_ctx *ctx, struct store *db, int locked)
{
	if (locked)
		pthread_mutex_unlock(&ctx->lock);
	else
		store_close(db);
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
	if (!store_open_ok(ctx, resp)) {
		r = 0;
	} else if (want && ctx->planned && cache->len > 0 &&
	    mbuf_status(cache) == ERRCODE_OK) {
		/* The plan cache: the coming days as of the last refresh. */
		mbuf_add(&resp->body, cache->data, cache->len);
		ok_or_error(resp, ERRCODE_OK, 200, "application/json");
		r = 1;
	}
	pthread_mutex_unlock(&ctx->lock);
	return r;
}

/*
 * Ranked windows of [from, to) from the open database, rendered as JSON
 * or iCalendar: the planner's query filled by plan_db_fill, then run and
 * rendered by winquery_render, as "moonrange windows" does.
 */
static enum errcode
windows_render(struct store *db, double from_mjd, double to_mjd,
    const char *target, size_t limit, int ics, double now_mjd,
    struct mbuf *out, size_t *nwindows, char *err, size_t errlen)
{
	struct plan_query q;
	struct plan_db hold;
	struct render_plan rp;
	enum errcode rc;

	plan_query_init(&q);
	plan_db_init(&hold);
	rc = plan_db_fill(db, &q, &hold, err, errlen);
	if (rc != ERRCODE_OK)
		goto out;
	q.from_mjd = from_mjd;
	q.to_mjd = to_mjd;
	q.target = target;
	q.limit = limit;
	memset(&rp, 0, sizeof rp);
	rp.station_name = q.station.name[0] != '\0' ? q.station.name : NULL;
	rp.time_zone = q.station.time_zone[0] != '\0' &&
	    render_zone_known(q.station.time_zone) ? q.station.time_zone : NULL;
	rp.now_mjd = now_mjd;
	rc = winquery_render(&q, &rp, ics ? render_windows_ics :
	    render_windows_json, out, nwindows, err, errlen);
out:
	plan_db_free(&hold);
	return rc;
}

static void
windows_common(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp, int ics)
{
	struct tscale_instant a, b;
	struct store *db;
	double f1, f2, t1, t2;
	size_t limit = 0;
	char err[300];
	int locked;
	enum errcode rc;

	if (cache_or_compute(ctx, &ctx->plan_windows, !ics &&
	    req->nparams == 0, resp) != 2)
		return;
	if (param_span(req, WINDOWS_DAYS_DEFAULT, WINDOWS_DAYS_MAX, &f1, &f2,
	    &t1, &t2, &a, &b, resp))
		return;
	if (param_count(req, "limit", 1, PLAN_MAX_WINDOWS, &limit, resp))
		return;
	err[0] = '\0';
	db = read_store(ctx, &locked);
	rc = windows_render(db, (f1 - ERFA_DJM0) + f2,
	    (t1 - ERFA_DJM0) + t2, param(req, "target"), limit, ics,
	    (req->now1 - ERFA_DJM0) + req->now2, &resp->body, NULL, err,
	    sizeof err);
	release_store(ctx, db, locked);
	if (rc == ERRCODE_OK)
		ok_or_error(resp, rc, 200, ics ? "text/calendar; charset=utf-8" :
		    "application/json");
	else if (rc == ERRCODE_NOT_FOUND)	/* the target */
		api_error(resp, ERRCODE_BAD_ARG, "target", err[0] ? err : NULL);
	else if (rc == ERRCODE_TOO_LARGE)	/* the span's windows */
		api_error(resp, ERRCODE_BAD_ARG, "to", err[0] ? err :
		    "too many windows: shorten the span or set a limit");
	else
		api_error(resp, rc, NULL, err[0] ? err : NULL);
}

static void
h_windows(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	windows_common(ctx, req, resp, 0);
}

static void
h_windows_ics(struct api_ctx *ctx, const struct api_request *req,
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
			api_error(resp, rc == ERRCODE_NOT_FOUND ?
			    ERRCODE_BAD_ARG : rc, req->params[i].key,
			    err[0] ? err : NULL);
			return;
		}
	}
	p.now_mjd = (req->now1 - ERFA_DJM0) + req->now2;
	err[0] = '\0';
	db = read_store(ctx, &locked);
	rc = covquery_run(db, &p, fmt, &resp->body, err, sizeof err);
	release_store(ctx, db, locked);
	if (rc != ERRCODE_OK) {
		api_error(resp, rc == ERRCODE_NOT_FOUND ? ERRCODE_BAD_ARG : rc,
		    rc == ERRCODE_NOT_FOUND ? "target" : NULL,
		    err[0] ? err : NULL);
		return;
	}
	ok_or_error(resp, rc, 200, ctype);
}

static void
h_coverage(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	coverage_common(ctx, req, resp, COVQUERY_JSON, "application/json");
}

static void
h_coverage_csv(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	coverage_common(ctx, req, resp, COVQUERY_CSV,
	    "text/csv; charset=utf-8; header=present");
}

static void
h_coverage_svg(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	coverage_common(ctx, req, resp, COVQUERY_SVG, "image/svg+xml");
}

static void
h_attempts_list(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	struct site_attempt *rows = NULL;
	struct store_query q;
	const char *order;
	double u1, u2;
	size_t limit = ATTEMPTS_LIMIT_DEFAULT;
	char err[300];
	size_t n = 0;
	enum errcode rc;

	if (!store_open_ok(ctx, resp))
		return;
	store_query_init(&q);
	if (param(req, "since") != NULL) {
		if (param_time(req, "since", &u1, &u2, resp))
			return;
		q.since_mjd = (u1 - ERFA_DJM0) + u2;
	}
	if (param(req, "until") != NULL) {
		if (param_time(req, "until", &u1, &u2, resp))
			return;
		q.until_mjd = (u1 - ERFA_DJM0) + u2;
	}
	if (param_count(req, "limit", 1, ATTEMPTS_LIMIT_MAX, &limit, resp))
		return;
	order = param(req, "order");
	if (order != NULL && strcmp(order, "newest") != 0 &&
	    strcmp(order, "oldest") != 0) {
		api_error(resp, ERRCODE_BAD_ARG, "order",
		    "order: 'newest' or 'oldest'");
		return;
	}
	q.target = param(req, "target");
	q.limit = limit;
	q.newest_first = 1;		/* the newest limit rows ... */
	rc = store_attempts_list(ctx->db, &q, &rows, &n, err, sizeof err);
	if (rc != ERRCODE_OK) {
		api_error(resp, rc, NULL, err);
		return;
	}
	/* ... shown oldest first with order=oldest, as "log list --limit". */
	for (size_t i = 0; order != NULL && strcmp(order, "oldest") == 0 &&
	    i < n / 2; i++) {
		struct site_attempt tmp = rows[i];

		rows[i] = rows[n - 1 - i];
		rows[n - 1 - i] = tmp;
	}
	rc = render_site_attempts_json(rows, n, &resp->body);
	mem_free(rows);
	ok_or_error(resp, rc, 200, "application/json");
}

static void
h_attempt_get(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	const char *digits = strrchr(req->path, '/') + 1;
	struct site_attempt a;
	char err[300], *end;
	long id;
	enum errcode rc;

	if (!store_open_ok(ctx, resp))
		return;
	id = strtol(digits, &end, 10);
	rc = store_attempt_get(ctx->db, id, &a, err, sizeof err);
	if (rc != ERRCODE_OK) {
		api_error(resp, rc, NULL, rc == ERRCODE_NOT_FOUND ?
		    "no attempt with this id" : err);
		return;
	}
	rc = render_site_attempt_json(&a, &resp->body);
	ok_or_error(resp, rc, 200, "application/json");
}

/* The Authorization header carries "Bearer " and the daemon's token? */
static int
authorized(const struct api_ctx *ctx, const struct api_request *req)
{
	const char *h = req->authorization;

	if (h == NULL || ctx->token_len == 0 || strncmp(h, "Bearer ", 7) != 0)
		return 0;
	h += 7;
	return api_token_equal(h, strlen(h), ctx->token, ctx->token_len);
}

/* Is the media type application/json (parameters such as charset aside)? */
static int
is_json_type(const char *ct)
{
	static const char want[] = "application/json";
	size_t n = sizeof want - 1;

	if (ct == NULL)
		return 0;
	while (*ct == ' ')
		ct++;
	if (strncasecmp(ct, want, n) != 0)
		return 0;
	ct += n;
	while (*ct == ' ')
		ct++;
	return *ct == '\0' || *ct == ';';
}

/* Text member into buf (at most len - 1 bytes, no control characters). */
static int
member_text(json_t *v, const char *name, char *buf, size_t len, int required,
    struct api_response *resp)
{
	char msg[200];
	const char *s;

	if (v == NULL && !required) {
		buf[0] = '\0';
		return 0;
	}
	if (!json_is_string(v)) {
		snprintf(msg, sizeof msg, "%s: %s a string", name,
		    v == NULL ? "required," : "must be");
		api_error(resp, ERRCODE_BAD_ARG, name, msg);
		return -1;
	}
	s = json_string_value(v);
	if (json_string_length(v) >= len || strlen(s) != json_string_length(v)) {
		snprintf(msg, sizeof msg, "%s: longer than %zu bytes or holds "
		    "a NUL", name, len - 1);
		api_error(resp, ERRCODE_BAD_ARG, name, msg);
		return -1;
	}
	for (const char *p = s; *p; p++)
		if ((unsigned char)*p < 0x20 && *p != '\n' && *p != '\t') {
			snprintf(msg, sizeof msg, "%s: holds a control "
			    "character", name);
			api_error(resp, ERRCODE_BAD_ARG, name, msg);
			return -1;
		}
	memcpy(buf, s, strlen(s) + 1);
	return 0;
}

static int
member_count(json_t *v, const char *name, long *out,
    struct api_response *resp)
{
	char msg[200];

	if (!json_is_integer(v) || json_integer_value(v) < 0 ||
	    json_integer_value(v) > 1000000000000LL) {
		snprintf(msg, sizeof msg, "%s: %s a whole number >= 0", name,
		    v == NULL ? "required," : "must be");
		api_error(resp, ERRCODE_BAD_ARG, name, msg);
		return -1;
	}
	*out = (long)json_integer_value(v);
	return 0;
}

static int
member_time(json_t *v, const char *name, double *mjd,
    struct api_response *resp)
{
	char text[64], err[160], msg[240];
	double u1, u2;

	if (member_text(v, name, text, sizeof text, 1, resp))
		return -1;
	if (tscale_parse_utc(text, &u1, &u2, err, sizeof err) != ERRCODE_OK) {
		snprintf(msg, sizeof msg, "%s: %s", name, err);
		api_error(resp, ERRCODE_BAD_TIME, name, msg);
		return -1;
	}
	*mjd = (u1 - ERFA_DJM0) + u2;
	return 0;
}

#define ATTEMPT_MEMBERS "target,start_utc,end_utc,shots,returns," \
	"normal_points,outcome,operator,seeing_arcsec,notes"

/* The body of POST /api/v1/attempts into a record; -1 with the error set. */
static int
attempt_from_json(json_t *o, struct site_attempt *a, struct api_response *resp)
{
	char outcome[SITE_OUTCOME_LEN + 8], msg[300];
	const char *key;
	json_t *v;
	int k;

	memset(a, 0, sizeof *a);
	if (!json_is_object(o)) {
		api_error(resp, ERRCODE_BAD_ARG, NULL,
		    "the body must be a JSON object");
		return -1;
	}
	json_object_foreach(o, key, v) {
		if (!param_listed(ATTEMPT_MEMBERS, key)) {
			snprintf(msg, sizeof msg, "unknown member '%.60s' "
			    "(accepted: %s)", key, ATTEMPT_MEMBERS);
			api_error(resp, ERRCODE_BAD_ARG, key, msg);
			return -1;
		}
	}
	if (member_text(json_object_get(o, "target"), "target", a->target,
	    sizeof a->target, 1, resp) ||
	    member_time(json_object_get(o, "start_utc"), "start_utc",
	    &a->start_mjd, resp) ||
	    member_time(json_object_get(o, "end_utc"), "end_utc", &a->end_mjd,
	    resp) ||
	    member_count(json_object_get(o, "shots"), "shots", &a->shots,
	    resp) ||
	    member_count(json_object_get(o, "returns"), "returns", &a->returns,
	    resp) ||
	    member_count(json_object_get(o, "normal_points"), "normal_points",
	    &a->normal_points, resp) ||
	    member_text(json_object_get(o, "outcome"), "outcome", outcome,
	    sizeof outcome, 1, resp) ||
	    member_text(json_object_get(o, "operator"), "operator",
	    a->operator_name, sizeof a->operator_name, 1, resp) ||
	    member_text(json_object_get(o, "notes"), "notes", a->notes,
	    sizeof a->notes, 0, resp))
		return -1;
	if (a->operator_name[0] == '\0') {
		api_error(resp, ERRCODE_BAD_ARG, "operator",
		    "operator: required, 1 to 95 bytes");
		return -1;
	}
	if ((k = site_outcome_parse(outcome)) < 0) {
		api_error(resp, ERRCODE_BAD_ARG, "outcome", "outcome: one of "
		    "ranged, no_returns, weather, technical, safety, other");
		return -1;
	}
	a->outcome = (enum site_outcome)k;
	if (!(a->end_mjd > a->start_mjd)) {
		api_error(resp, ERRCODE_BAD_ARG, "end_utc",
		    "end_utc: must be after start_utc");
		return -1;
	}
	if (a->end_mjd - a->start_mjd > ATTEMPT_MAX_DAYS) {
		api_error(resp, ERRCODE_BAD_ARG, "end_utc",
		    "end_utc: an attempt lasts at most one day");
		return -1;
	}
	v = json_object_get(o, "seeing_arcsec");
	a->seeing_arcsec = NAN;
	if (v != NULL && !json_is_null(v)) {
		double s = json_number_value(v);

		if (!json_is_number(v) || !(s > 0.0) || s > 60.0) {
			api_error(resp, ERRCODE_BAD_ARG, "seeing_arcsec",
			    "seeing_arcsec: a number in (0, 60] or null");
			return -1;
		}
		a->seeing_arcsec = s;
	}
	return 0;
}

/*
 * Parse the body twice and keep it only if both parses agree.  jansson
 * does not always report an allocation failure inside its lexer: it may
 * call it a syntax error, or drop a character of a string.  Parsing is
 * deterministic, so two equal results (or two identical syntax errors)
 * are the text's; anything else is ERRCODE_NOMEM.  *out is NULL with
 * *err set for a body that is not JSON.
 */
static enum errcode
parse_body(const struct api_request *req, json_t **out, json_error_t *err)
{
	const char *text = req->body ? req->body : "";
	json_error_t e2;
	json_t *a, *b;
	enum errcode rc = ERRCODE_OK;

	a = json_loadb(text, req->body_len, JSON_REJECT_DUPLICATES, err);
	b = json_loadb(text, req->body_len, JSON_REJECT_DUPLICATES, &e2);
	if (a != NULL && b != NULL) {
		if (!json_equal(a, b))
			rc = ERRCODE_NOMEM;
	} else if (a != NULL || b != NULL || err->text[0] == '\0' ||
	    json_error_code(err) == json_error_out_of_memory ||
	    strcmp(err->text, e2.text) != 0 || err->position != e2.position) {
		rc = ERRCODE_NOMEM;
	}
	json_decref(b);
	if (rc != ERRCODE_OK) {
		json_decref(a);
		a = NULL;
	}
	*out = a;
	return rc;
}

/*
 * The body member a store message names ("field 'start'" is start_utc,
 * "field 'end'" end_utc, others by their own name), or NULL.
 */
static const char *
store_member(const char *err)
{
	static const char *const members[] = {"target", "shots", "returns",
	    "normal_points", "outcome", "operator", "seeing_arcsec", "notes"};
	const char *f = strstr(err, "field '");
	size_t n;

	if (f == NULL)
		return NULL;
	f += 7;
	n = strcspn(f, "'");
	if (n == 5 && strncmp(f, "start", 5) == 0)
		return "start_utc";
	if (n == 3 && strncmp(f, "end", 3) == 0)
		return "end_utc";
	for (size_t i = 0; i < sizeof members / sizeof members[0]; i++)
		if (strlen(members[i]) == n && strncmp(f, members[i], n) == 0)
			return members[i];
	return NULL;
}

static void
h_attempts_add(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	struct site_attempt a;
	json_error_t jerr;
	json_t *body = NULL;
	char err[300], msg[360];
	enum errcode rc;

	if (!authorized(ctx, req)) {
		api_error(resp, ERRCODE_AUTH, "Authorization", ctx->token_len ?
		    "writes need the header Authorization: Bearer TOKEN with "
		    "the daemon's token" : "writes are disabled: the daemon "
		    "was started without --token-file");
		return;
	}
	if (req->body_too_large) {
		snprintf(msg, sizeof msg, "the body is larger than %d bytes",
		    API_BODY_MAX);
		api_error(resp, ERRCODE_TOO_LARGE, NULL, msg);
		return;
	}
	if (!is_json_type(req->content_type)) {
		api_error(resp, ERRCODE_UNSUPPORTED, "Content-Type",
		    "the body must be sent as Content-Type: application/json");
		return;
	}
	if (!store_open_ok(ctx, resp) || !site_loaded(ctx, resp))
		return;
	if (parse_body(req, &body, &jerr) != ERRCODE_OK) {
		api_error(resp, ERRCODE_NOMEM, NULL, NULL);
		return;
	}
	if (body == NULL) {
		snprintf(msg, sizeof msg, "the body is not valid JSON: %s "
		    "(line %d, column %d)", jerr.text, jerr.line, jerr.column);
		api_error(resp, ERRCODE_BAD_ARG, NULL, msg);
		return;
	}
	if (attempt_from_json(body, &a, resp))
		goto out;
	/* As "log add": angles derived from the stored station, target and
	   EOP table at the mid-time, then one insert. */
	rc = store_attempt_log(ctx->db, &a, err, sizeof err);
	if (rc == ERRCODE_NOT_FOUND) {
		snprintf(msg, sizeof msg, "target: no target '%.40s' in the "
		    "database", a.target);
		api_error(resp, ERRCODE_BAD_ARG, "target", msg);
		goto out;
	}
	if (rc == ERRCODE_BAD_TIME || rc == ERRCODE_BAD_ARG) {
		/* The store refused a value: "...: field 'start': ..." */
		const char *member = store_member(err);

		snprintf(msg, sizeof msg, "%s: %s", member ? member : "body",
		    err);
		api_error(resp, rc, member, msg);
		goto out;
	}
	if (rc != ERRCODE_OK) {
		api_error(resp, rc, rc == ERRCODE_EXISTS ? "start_utc" : NULL,
		    rc == ERRCODE_EXISTS ? "start_utc: the target already has "
		    "an attempt starting at this time" : err);
		goto out;
	}
	ctx->replan = 1;
	snprintf(resp->location, sizeof resp->location,
	    "/api/v1/attempts/%ld", a.id);
	rc = render_site_attempt_json(&a, &resp->body);
	ok_or_error(resp, rc, 201, "application/json");
out:
	json_decref(body);
}

/* --- the route table --- */

#define COVERAGE_PARAMS "source,axis,bins,min_count,since,until,target," \
	"station,horizon"

static const struct route routes[] = {
	{{"GET", "/api/v1/status", "",
	    "version, uptime, database, last plan time, EOP coverage"},
	    h_status, 0},
	{{"GET", "/api/v1/site", "", "the station and its planning limits"},
	    h_site, 0},
	{{"GET", "/api/v1/targets", "", "every target, active or retired"},
	    h_targets, 0},
	{{"GET", "/api/v1/now", "at",
	    "Moon, Sun and each active target at an instant (default now)"},
	    h_now, 0},
	{{"GET", "/api/v1/phases", "from,to,days",
	    "new moon, quarters and full moon in a span"}, h_phases, 1},
	{{"GET", "/api/v1/windows", "from,to,days,target,limit",
	    "ranked observing windows (no parameters: the cached plan)"},
	    h_windows, 1},
	{{"GET", "/api/v1/windows.ics", "from,to,days,target,limit",
	    "the windows as iCalendar (RFC 5545)"}, h_windows_ics, 1},
	{{"GET", "/api/v1/coverage", COVERAGE_PARAMS,
	    "phase-coverage audit as JSON (the CLI's coverage --json)"},
	    h_coverage, 1},
	{{"GET", "/api/v1/coverage.csv", COVERAGE_PARAMS,
	    "the coverage audit as CSV (RFC 4180)"}, h_coverage_csv, 1},
	{{"GET", "/api/v1/coverage.svg", COVERAGE_PARAMS,
	    "the coverage chart as SVG"}, h_coverage_svg, 1},
	{{"GET", "/api/v1/attempts", "since,until,target,limit,order",
	    "logged attempts, newest first (order=oldest: as log list)"},
	    h_attempts_list, 0},
	{{"POST", "/api/v1/attempts", "",
	    "log an attempt (JSON body, bearer token); 201 with Location"},
	    h_attempts_add, 0},
	{{"GET", "/api/v1/attempts/{id}", "", "one logged attempt"},
	    h_attempt_get, 0},
};

#define NROUTES (sizeof routes / sizeof routes[0])

const struct api_route_info *
api_route(size_t i)
{
	return i < NROUTES ? &routes[i].info : NULL;
}

/* --- the context --- */

struct api_ctx *
api_new(const struct api_config *cfg)
{
	struct api_ctx *ctx = mem_calloc(1, sizeof *ctx);

	if (ctx == NULL)
		return NULL;
	if (pthread_mutex_init(&ctx->lock, NULL) != 0) {
		mem_free(ctx);
		return NULL;
	}
	if (cfg->db_path != NULL &&
	    (ctx->db_path = mem_strdup(cfg->db_path)) == NULL) {
		api_free(ctx);
		return NULL;
	}
	if (cfg->token != NULL) {
		size_t n = strlen(cfg->token);

		if (n > API_TOKEN_MAX)
			n = API_TOKEN_MAX;
		memcpy(ctx->token, cfg->token, n);
		ctx->token[n] = '\0';
		ctx->token_len = n;
	}
	ctx->plan_days = cfg->plan_days;	/* 0: the store's setting */
	mbuf_init(&ctx->plan_windows);
	mbuf_init(&ctx->plan_coverage);
	ctx->refresh_s = cfg->refresh_s;
	ctx->start_posix = cfg->start_posix;
	return ctx;
}

void
api_free(struct api_ctx *ctx)
{
	if (ctx == NULL)
		return;
	api_site_free(&ctx->site);
	mbuf_free(&ctx->plan_windows);
	mbuf_free(&ctx->plan_coverage);
	mem_free(ctx->db_path);
	/* volatile: keep the wipe of the token from being optimised away */
	for (volatile char *p = ctx->token; *p != '\0'; p++)
		*p = '\0';
	pthread_mutex_destroy(&ctx->lock);
	mem_free(ctx);
}

void
api_set_store(struct api_ctx *ctx, struct store *db)
{
	pthread_mutex_lock(&ctx->lock);
	ctx->db = db;
	pthread_mutex_unlock(&ctx->lock);
}

void
api_set_site(struct api_ctx *ctx, struct api_site *site)
{
	struct api_site old;

	pthread_mutex_lock(&ctx->lock);
	old = ctx->site;
	ctx->site = *site;
	ctx->replan = 1;
	pthread_mutex_unlock(&ctx->lock);
	memset(site, 0, sizeof *site);
	api_site_free(&old);
}

enum errcode
api_replan(struct api_ctx *ctx, double now1, double now2, char *errbuf,
    size_t errlen)
{
	struct store_settings set;
	struct covquery_params p;
	struct store *db;
	struct mbuf w, c;
	double now_mjd = (now1 - ERFA_DJM0) + now2, days;
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
	db = read_store(ctx, &locked);
	rc = store_settings_get(db, &set, errbuf, errlen);
	if (rc == ERRCODE_OK) {
		days = ctx->plan_days > 0 ? ctx->plan_days : set.plan_days;
		rc = windows_render(db, now_mjd, now_mjd + days, NULL, 0, 0,
		    now_mjd, &w, &n, errbuf, errlen);
	}
	if (rc == ERRCODE_OK) {
		covquery_params_init(&p);
		p.now_mjd = now_mjd;
		rc = covquery_run(db, &p, COVQUERY_JSON, &c, errbuf, errlen);
	}
	release_store(ctx, db, locked);
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

int
api_token_equal(const char *given, size_t given_len, const char *want,
    size_t want_len)
{
	volatile unsigned char diff = 0;

	if (want_len == 0)
		return 0;
	/* Always walk the stored token's length; the given length only
	   enters the result, never the number of steps. */
	diff |= (unsigned char)(given_len != want_len);
	for (size_t i = 0; i < want_len; i++) {
		unsigned char g = given_len ? (unsigned char)given[i % given_len]
		    : 0;

		diff |= (unsigned char)(g ^ (unsigned char)want[i]);
	}
	return diff == 0;
}

/* --- dispatch --- */

/* Exact match, or a pattern ending in "{id}": 1 to 18 decimal digits. */
static int
path_match(const char *pattern, const char *path)
{
	const char *brace = strstr(pattern, "{id}");
	size_t n;

	if (brace == NULL)
		return strcmp(pattern, path) == 0;
	n = (size_t)(brace - pattern);
	if (strncmp(pattern, path, n) != 0)
		return 0;
	path += n;
	n = strspn(path, "0123456789");
	return n > 0 && n <= 18 && path[n] == '\0';
}

static void
dispatch(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	const char *method = strcmp(req->method, "HEAD") == 0 ? "GET" :
	    req->method;
	const struct route *hit = NULL;
	int path_known = 0;
	char msg[200];

	resp->allow[0] = '\0';
	for (size_t i = 0; i < NROUTES; i++) {
		if (!path_match(routes[i].info.path, req->path))
			continue;
		if (!path_known++)
			resp->allow[0] = '\0';
		else
			strncat(resp->allow, ", ",
			    sizeof resp->allow - strlen(resp->allow) - 1);
		strncat(resp->allow, routes[i].info.method,
		    sizeof resp->allow - strlen(resp->allow) - 1);
		if (strcmp(routes[i].info.method, "GET") == 0)
			strncat(resp->allow, ", HEAD",
			    sizeof resp->allow - strlen(resp->allow) - 1);
		if (strcmp(routes[i].info.method, method) == 0)
			hit = &routes[i];
	}
	if (hit == NULL) {
		if (path_known) {
			snprintf(msg, sizeof msg, "method %.16s not allowed "
			    "here (allowed: %s)", req->method, resp->allow);
			api_error(resp, ERRCODE_METHOD, NULL, msg);
		} else {
			resp->allow[0] = '\0';
			snprintf(msg, sizeof msg, "no resource at '%.100s'",
			    req->path);
			api_error(resp, ERRCODE_NOT_FOUND, NULL, msg);
		}
		return;
	}
	resp->allow[0] = '\0';
	if (params_check(req, hit->info.params, resp))
		return;
	if (hit->unlocked) {
		hit->fn(ctx, req, resp);
		return;
	}
	pthread_mutex_lock(&ctx->lock);
	hit->fn(ctx, req, resp);
	pthread_mutex_unlock(&ctx->lock);
}

void
api_handle(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	api_response_init(resp);
	dispatch(ctx, req, resp);
}
