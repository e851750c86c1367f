/* SPDX-License-Identifier: BSD-3-Clause */
/* api.c: the route table of /api/v1/ and its handlers, free of any HTTP library. */
#include <math.h>
#include <pthread.h>
#include <stdio.h>
#include <string.h>

#include <erfam.h>
#include <jansson.h>

#include "api.h"
#include "geom.h"
#include "render.h"
#include "tscale.h"

#define PHASES_CAP 5000		/* ~100 years of principal phases */
#define SPAN_MAX_DAYS 36600.0	/* as the CLI */

struct api_ctx {
	pthread_mutex_t lock;		/* serialises handlers and replans */
	char *db_path;
	char token[API_TOKEN_MAX + 1];
	size_t token_len;		/* 0: writes are refused */
	double plan_days, refresh_s, start_posix;
	struct api_site site;
	struct store *db;		/* borrowed */
	/* the plan cache */
	int planned;			/* a plan has been computed */
	double plan_utc1, plan_utc2;	/* when */
	int replan;			/* a write asked for a new plan */
};

typedef void (*api_handler)(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);

struct route {
	struct api_route_info info;
	api_handler fn;
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

/*
 * The span of from/to/days, with the CLI's rules: from defaults to now,
 * to to from + days, days to defdays; to and days exclude each other.
 */
static int
param_span(const struct api_request *req, double defdays, double *f1,
    double *f2, double *t1, double *t2, struct tscale_instant *a,
    struct tscale_instant *b, struct api_response *resp)
{
	double days = defdays, span;

	*f1 = req->now1;
	*f2 = req->now2;
	if (param(req, "from") && param_time(req, "from", f1, f2, resp))
		return -1;
	if (param(req, "days") && param_number(req, "days", 0.0,
	    SPAN_MAX_DAYS, &days, resp))
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
	if (span > SPAN_MAX_DAYS * 86400.0) {
		api_error(resp, ERRCODE_BAD_ARG, "to",
		    "to: span longer than 36600 days");
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
		bad |= json_object_set_new(o, "days",
		    render_json_num(ctx->plan_days, 3));
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

static json_t *
num_or_null(double v, int decimals)
{
	return render_json_num(v, decimals);
}

static void
h_site(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	const struct site_station *st = &ctx->site.station;
	json_t *root, *o;
	int bad;

	(void)req;
	if (!site_loaded(ctx, resp))
		return;
	root = json_object();
	o = json_object();
	bad = root == NULL || o == NULL;
	if (bad) {
		json_decref(o);
		goto out;
	}
	bad |= json_object_set_new(root, "station", o);
	bad |= json_object_set_new(o, "name", json_string(st->name));
	bad |= json_object_set_new(o, "code", json_string(st->code));
	bad |= json_object_set_new(o, "lat_deg", num_or_null(st->lat_deg, 7));
	bad |= json_object_set_new(o, "lon_deg", num_or_null(st->lon_deg, 7));
	bad |= json_object_set_new(o, "height_m", num_or_null(st->height_m, 2));
	bad |= json_object_set_new(o, "time_zone", json_string(st->time_zone));
	bad |= json_object_set_new(o, "min_el_deg",
	    num_or_null(st->min_el_deg, 3));
	bad |= json_object_set_new(o, "max_sun_el_deg",
	    num_or_null(st->max_sun_el_deg, 3));
	bad |= json_object_set_new(o, "min_sun_sep_deg",
	    num_or_null(st->min_sun_sep_deg, 3));
	bad |= json_object_set_new(o, "pressure_hpa",
	    num_or_null(st->pressure_hpa, 2));
	bad |= json_object_set_new(o, "temperature_c",
	    num_or_null(st->temperature_c, 2));
	bad |= json_object_set_new(o, "humidity", num_or_null(st->humidity, 3));
	bad |= json_object_set_new(o, "wavelength_nm",
	    num_or_null(st->wavelength_nm, 3));
	bad |= json_object_set_new(o, "zenith_tau",
	    num_or_null(st->zenith_tau, 4));
	bad |= json_object_set_new(o, "fire_rate_hz",
	    num_or_null(st->fire_rate_hz, 3));
out:
	json_reply(resp, root, bad);
}

static void
h_targets(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	json_t *root = json_object(), *arr = json_array();
	int bad = root == NULL || arr == NULL;

	(void)req;
	if (bad) {
		json_decref(arr);
		goto out;
	}
	bad |= json_object_set_new(root, "targets", arr);
	for (size_t i = 0; i < ctx->site.ntargets; i++) {
		const struct site_target *t = &ctx->site.targets[i];
		json_t *o = json_object();

		bad |= json_array_append_new(arr, o);
		if (o == NULL)
			break;
		bad |= json_object_set_new(o, "id", json_string(t->id));
		bad |= json_object_set_new(o, "name", json_string(t->name));
		bad |= json_object_set_new(o, "alias", t->alias[0] ?
		    json_string(t->alias) : json_null());
		bad |= json_object_set_new(o, "lat_deg",
		    num_or_null(t->lat_deg, 5));
		bad |= json_object_set_new(o, "lon_deg",
		    num_or_null(t->lon_deg, 5));
		bad |= json_object_set_new(o, "height_m",
		    num_or_null(t->height_m, 1));
		bad |= json_object_set_new(o, "strength",
		    num_or_null(t->strength, 4));
		bad |= json_object_set_new(o, "dark_only",
		    json_boolean(t->dark_only));
		bad |= json_object_set_new(o, "active", json_boolean(t->active));
	}
out:
	json_reply(resp, root, bad);
}

static void
h_now(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	const struct site_station *st = &ctx->site.station;
	struct render_target_row *rows = NULL;
	struct geom_weather wx;
	struct geom_site site;
	struct geom_eop eop = {0.0, 0.0, 0.0};
	struct geom_instant *g = NULL;
	struct render_ephem rep;
	double u1 = req->now1, u2 = req->now2;
	size_t n = 0;
	enum errcode rc;

	if (!site_loaded(ctx, resp))
		return;
	if (param(req, "at") && param_time(req, "at", &u1, &u2, resp))
		return;
	geom_weather_standard(st->height_m, &wx);
	if (isfinite(st->pressure_hpa))
		wx.pressure_hpa = st->pressure_hpa;
	if (isfinite(st->temperature_c))
		wx.temperature_c = st->temperature_c;
	if (isfinite(st->humidity))
		wx.humidity = st->humidity;
	if (isfinite(st->wavelength_nm))
		wx.wavelength_um = st->wavelength_nm / 1000.0;
	if (geom_site_init(&site, st->lat_deg * ERFA_DD2R,
	    st->lon_deg * ERFA_DD2R, st->height_m, &wx) != ERRCODE_OK) {
		api_error(resp, ERRCODE_CONFIG, NULL,
		    "the station's position is out of range");
		return;
	}
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
	rep.dut1_source = "none";
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
	if (param_span(req, 30.0, &rp.from1, &rp.from2, &rp.to1, &rp.to2, &a,
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

/* --- the route table --- */

static const struct route routes[] = {
	{{"GET", "/api/v1/status", "",
	    "version, uptime, database, last plan time, EOP coverage"},
	    h_status},
	{{"GET", "/api/v1/site", "", "the station and its planning limits"},
	    h_site},
	{{"GET", "/api/v1/targets", "", "every target, active or retired"},
	    h_targets},
	{{"GET", "/api/v1/now", "at",
	    "Moon, Sun and each active target at an instant (default now)"},
	    h_now},
	{{"GET", "/api/v1/phases", "from,to,days",
	    "new moon, quarters and full moon in a span"}, h_phases},
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
	ctx->plan_days = cfg->plan_days > 0 ? cfg->plan_days : 2.0;
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
api_replan(struct api_ctx *ctx, double now1, double now2)
{
	pthread_mutex_lock(&ctx->lock);
	ctx->planned = 1;
	ctx->replan = 0;
	ctx->plan_utc1 = now1;
	ctx->plan_utc2 = now2;
	pthread_mutex_unlock(&ctx->lock);
	return ERRCODE_OK;
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
		if (strcmp(routes[i].info.path, req->path) != 0)
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
	hit->fn(ctx, req, resp);
}

void
api_handle(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	api_response_init(resp);
	pthread_mutex_lock(&ctx->lock);
	dispatch(ctx, req, resp);
	pthread_mutex_unlock(&ctx->lock);
}
