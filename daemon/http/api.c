/* SPDX-License-Identifier: BSD-3-Clause */
/* api.c: the route table of /api/v1/, dispatch, the parameter helpers and
   the one mapping of error codes to HTTP statuses, free of any HTTP
   library (the handlers are in api_site.c, api_plan.c and api_log.c). */
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
#include "query/eclquery.h"
#include "query/phquery.h"
#include "query/winquery.h"
#include "query/covquery.h"
#include "core/derive.h"
#include "core/eop.h"
#include "core/geom.h"
#include "core/plan.h"
#include "store/plan_db.h"
#include "formats/render_json.h"
#include "formats/render_site.h"
#include "store/store.h"
#include "core/tscale.h"

typedef void (*api_handler)(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);

/* Which answers the response cache keeps (api_cache.h). */
enum route_cache {
	CACHE_NONE,		/* computed for each request */
	CACHE_SITE,		/* from the site snapshot: the instant "now"
				   is the whole second, gen_site */
	CACHE_DATA,		/* from the database: "now" is the whole
				   minute, gen_data */
	CACHE_SKY		/* from the parameters alone: "now" is the
				   whole minute */
};

struct route {
	struct api_route_info info;
	api_handler fn;
	int unlocked;		/* takes ctx->lock itself, only to look at
				   the context: its slow part runs on a
				   connection of its own (read_store) */
	enum route_cache cache;
};

/* The response cache's bounds: entries, and bytes of bodies (a body
   over a quarter of it is not kept: a year of windows is about 1 MB). */
#define CACHE_ENTRIES 48
#define CACHE_BYTES (8u * 1024 * 1024)
#define CACHE_KEY_MAX 2048	/* a longer query is computed, not kept */

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
	/* The status of each code that is not internal (errcode.h says
	   which are); the internal ones are the server's, 500. */
	static const unsigned status[ERRCODE__LAST] = {
		[ERRCODE_OK] = 200,
		[ERRCODE_BAD_ARG] = 400, [ERRCODE_BAD_TIME] = 400,
		[ERRCODE_AUTH] = 401,
		[ERRCODE_NOT_FOUND] = 404,
		[ERRCODE_METHOD] = 405,
		[ERRCODE_EXISTS] = 409,
		[ERRCODE_TOO_LARGE] = 413,
		[ERRCODE_UNSUPPORTED] = 415,
		[ERRCODE_CONFIG] = 503,	/* the daemon has no usable site */
	};

	if (errcode_is_internal(rc) || status[rc] == 0)
		return 500;
	return status[rc];
}

void
api_error(struct api_response *r, enum errcode rc, const char *field,
    const char *message)
{
	json_t *root = json_object(), *e = json_object();
	int bad = root == NULL || e == NULL;
	char msg[1600], fld[400];

	/* A message or field may quote what the client sent: made valid
	   UTF-8 here (invalid bytes and controls as \xNN), which jansson
	   requires; a client's mistake is never a 500. */
	if (message == NULL)
		message = errcode_str(rc);
	message = text_quote(message, strlen(message), msg, sizeof msg);
	if (field != NULL)
		field = text_quote(field, strlen(field), fld, sizeof fld);
	mbuf_free(&r->body);
	r->status = api_http_status(rc);
	r->content_type = "application/json";
	if (!bad) {
		bad |= json_object_set_new(root, "error", e);
		bad |= json_object_set_new(e, "code",
		    json_string(errcode_name(rc)));
		bad |= json_object_set_new(e, "message", json_string(message));
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

void
api_ok_or_error(struct api_response *r, enum errcode rc, unsigned status,
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

int
api_param_listed(const char *list, const char *key)
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

int
api_params_check(const struct api_request *req, const char *allowed,
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

		if (!api_param_listed(allowed, key)) {
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

const char *
api_param(const struct api_request *req, const char *key)
{
	for (size_t i = 0; i < req->nparams; i++)
		if (strcmp(req->params[i].key, key) == 0)
			return req->params[i].value ? req->params[i].value : "";
	return NULL;
}

int
api_param_time(const struct api_request *req, const char *key, double *u1,
    double *u2, struct api_response *resp)
{
	const char *v = api_param(req, key);
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

int
api_param_count(const struct api_request *req, const char *key, long min,
    long max, size_t *out, struct api_response *resp)
{
	const char *v = api_param(req, key);
	char msg[200];
	long x;

	if (v == NULL)
		return 0;
	if (text_parse_long(v, min, max, &x) != ERRCODE_OK) {
		text_err(ERRCODE_BAD_ARG, msg, sizeof msg, "%s: '%.40s' is not "
		    "a whole number in %ld..%ld", key, v, min, max);
		api_error(resp, ERRCODE_BAD_ARG, key, msg);
		return -1;
	}
	*out = (size_t)x;
	return 0;
}

void
api_query_error(struct api_response *resp, enum errcode rc,
    const char *fault, const char *err)
{
	if (fault != NULL && (rc == ERRCODE_NOT_FOUND ||
	    rc == ERRCODE_TOO_LARGE))
		rc = ERRCODE_BAD_ARG;	/* the client's parameter */
	api_error(resp, rc, fault, err != NULL && err[0] != '\0' ? err :
	    NULL);
}

/* --- the database of a request --- */

int
api_store_open_ok(struct api_ctx *ctx, struct api_response *resp)
{
	if (ctx->db == NULL) {
		api_error(resp, ERRCODE_CONFIG, NULL,
		    "the daemon has no database open");
		return 0;
	}
	return 1;
}

/* A connection of its own opened with flags, else the shared one under
   the lock (*locked says which). */
static struct store *
own_store(struct api_ctx *ctx, int flags, int *locked)
{
	struct store *db = NULL;

	if (ctx->db_path != NULL && store_open(ctx->db_path, flags, &db, NULL,
	    0) == ERRCODE_OK) {
		*locked = 0;
		return db;
	}
	pthread_mutex_lock(&ctx->lock);
	*locked = 1;
	return ctx->db;
}

struct store *
api_read_store(struct api_ctx *ctx, int *locked)
{
	return own_store(ctx, STORE_OPEN_READONLY, locked);
}

struct store *
api_write_store(struct api_ctx *ctx, int *locked)
{
	return own_store(ctx, STORE_OPEN_NO_MIGRATE, locked);
}

void
api_release_store(struct api_ctx *ctx, struct store *db, int locked)
{
	if (locked)
		pthread_mutex_unlock(&ctx->lock);
	else
		store_close(db);
}

/* --- small JSON helpers --- */

void
api_json_reply(struct api_response *resp, json_t *root, int bad)
{
	enum errcode rc;

	if (root == NULL || bad) {
		json_decref(root);
		api_error(resp, ERRCODE_NOMEM, NULL, NULL);
		return;
	}
	rc = render_json_dump(root, &resp->body);
	api_ok_or_error(resp, rc, 200, "application/json");
}

int
api_site_loaded(struct api_ctx *ctx, struct api_response *resp)
{
	if (ctx->site.station.name[0] == '\0') {
		api_error(resp, ERRCODE_CONFIG, NULL,
		    "the daemon has no station loaded");
		return 0;
	}
	return 1;
}

/* --- the route table --- */

#define COVERAGE_PARAMS "source,axis,bins,min_count,since,until,target," \
	"station,horizon"

static const struct route routes[] = {
	{{"GET", "/api/v1/status", "",
	    "version, uptime, database, last plan time, EOP coverage"},
	    api_h_status, 0, CACHE_NONE},
	{{"GET", "/api/v1/site", "", "the station and its planning limits"},
	    api_h_site, 0, CACHE_NONE},
	{{"GET", "/api/v1/targets", "", "every target, active or retired"},
	    api_h_targets, 0, CACHE_NONE},
	{{"GET", "/api/v1/now", "at",
	    "Moon, Sun and each active target at an instant (default now)"},
	    api_h_now, 1, CACHE_SITE},
	{{"GET", "/api/v1/phases", PHQUERY_PARAMS,
	    "new moon, quarters and full moon in a span"}, api_h_phases, 1,
	    CACHE_SKY},
	{{"GET", "/api/v1/eclipses", ECLQUERY_PARAMS,
	    "lunar eclipses in a span (default a year): kind, magnitudes, "
	    "contacts"}, api_h_eclipses, 1, CACHE_SKY},
	{{"GET", "/api/v1/windows", WINQUERY_PARAMS,
	    "ranked observing windows (no parameters: the cached plan)"},
	    api_h_windows, 1, CACHE_DATA},
	{{"GET", "/api/v1/windows.ics", WINQUERY_PARAMS,
	    "the windows as iCalendar (RFC 5545)"}, api_h_windows_ics, 1,
	    CACHE_DATA},
	{{"GET", "/api/v1/coverage", COVERAGE_PARAMS,
	    "phase-coverage audit as JSON (the CLI's coverage --json)"},
	    api_h_coverage, 1, CACHE_DATA},
	{{"GET", "/api/v1/coverage.csv", COVERAGE_PARAMS,
	    "the coverage audit as CSV (RFC 4180)"}, api_h_coverage_csv, 1,
	    CACHE_DATA},
	{{"GET", "/api/v1/coverage.svg", COVERAGE_PARAMS ",theme",
	    "the coverage chart as SVG (theme=light or dark)"},
	    api_h_coverage_svg, 1, CACHE_DATA},
	{{"GET", "/api/v1/attempts", "since,until,target,limit,order",
	    "logged attempts, newest first (order=oldest: as log list)"},
	    api_h_attempts_list, 0, CACHE_NONE},
	{{"POST", "/api/v1/attempts", "",
	    "log an attempt (JSON body, bearer token); 201 with Location"},
	    api_h_attempts_add, 1, CACHE_NONE},
	{{"GET", "/api/v1/attempts/{id}", "", "one logged attempt"},
	    api_h_attempt_get, 0, CACHE_NONE},
	{{"GET", "/api/v1/plan", "from,to,at,method",
	    "the night plan: runs from now (at) to the next local noon, or "
	    "from-to"}, api_h_plan, 1, CACHE_DATA},
	{{"GET", "/api/v1/plan.ics", "from,to,at,method",
	    "the night plan as iCalendar (RFC 5545)"}, api_h_plan_ics, 1,
	    CACHE_DATA},
	{{"GET", "/api/v1/plan.svg", "from,to,at,method",
	    "the night's timeline as SVG"}, api_h_plan_svg, 1,
	    CACHE_DATA},
	{{"POST", "/api/v1/blackouts", "",
	    "add a blackout (JSON body, bearer token); 201"},
	    api_h_blackouts_add, 0, CACHE_NONE},
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
	if (cfg->token_file != NULL &&
	    (ctx->token_file = mem_strdup(cfg->token_file)) == NULL) {
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
	ctx->db_read_only = cfg->db_read_only;
	mbuf_init(&ctx->plan_windows);
	mbuf_init(&ctx->plan_coverage);
	ctx->refresh_s = cfg->refresh_s;
	ctx->start_posix = cfg->start_posix;
	atomic_init(&ctx->gen_site, 1);
	atomic_init(&ctx->gen_data, 1);
	ctx->seen_data_version = -1;
	if ((ctx->cache = api_cache_new(CACHE_ENTRIES, CACHE_BYTES)) == NULL) {
		api_free(ctx);
		return NULL;
	}
	return ctx;
}

void
api_free(struct api_ctx *ctx)
{
	if (ctx == NULL)
		return;
	api_site_free(&ctx->site);
	api_now_site_put(ctx->now_site);
	api_cache_free(ctx->cache);
	mbuf_free(&ctx->plan_windows);
	mbuf_free(&ctx->plan_coverage);
	mem_free(ctx->db_path);
	mem_free(ctx->token_file);
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
	struct api_now_site *now = api_now_site_make(site), *old_now;
	struct api_site old;

	pthread_mutex_lock(&ctx->lock);
	old = ctx->site;
	ctx->site = *site;
	old_now = ctx->now_site;
	ctx->now_site = now;
	ctx->replan = 1;
	pthread_mutex_unlock(&ctx->lock);
	api_now_site_put(old_now);
	/* After the swap: an answer computed from the old site before it
	   carries the old generation and is not served again. */
	atomic_fetch_add(&ctx->gen_site, 1);
	atomic_fetch_add(&ctx->gen_data, 1);
	memset(site, 0, sizeof *site);
	api_site_free(&old);
}

void
api_data_changed(struct api_ctx *ctx)
{
	atomic_fetch_add(&ctx->gen_data, 1);
}

/*
 * The data generation of a request: a new one when another connection,
 * of this process or of another (a CLI import, "setting set"), committed
 * a change to the database since the last look, or when the plan cache
 * was recomputed.
 */
static unsigned long
data_generation(struct api_ctx *ctx)
{
	int v;

	pthread_mutex_lock(&ctx->lock);
	v = ctx->db != NULL ? store_data_version(ctx->db) : -1;
	if (v != ctx->seen_data_version ||
	    ctx->plan_utc1 != ctx->seen_plan_utc1 ||
	    ctx->plan_utc2 != ctx->seen_plan_utc2) {
		ctx->seen_data_version = v;
		ctx->seen_plan_utc1 = ctx->plan_utc1;
		ctx->seen_plan_utc2 = ctx->plan_utc2;
		atomic_fetch_add(&ctx->gen_data, 1);
	}
	pthread_mutex_unlock(&ctx->lock);
	return atomic_load(&ctx->gen_data);
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
call(struct api_ctx *ctx, const struct route *hit,
    const struct api_request *req, struct api_response *resp)
{
	if (hit->unlocked) {
		hit->fn(ctx, req, resp);
		return;
	}
	pthread_mutex_lock(&ctx->lock);
	hit->fn(ctx, req, resp);
	pthread_mutex_unlock(&ctx->lock);
}

/*
 * The cache key of a request: the path, then each query parameter as
 * key and value, sorted by key, every part ended by a NUL (no part holds
 * one: unescape keeps "%00" as text).  The order of the parameters in
 * the URL does not matter.  0, or -1 when the key exceeds len.
 */
static int
cache_key(const struct api_request *req, const char *path, char *out,
    size_t len, size_t *outlen)
{
	size_t order[API_MAX_PARAMS], n = 0;

	for (size_t i = 0; i < req->nparams; i++) {
		size_t j = i;

		while (j > 0 && strcmp(req->params[order[j - 1]].key,
		    req->params[i].key) > 0) {
			order[j] = order[j - 1];
			j--;
		}
		order[j] = i;
	}
	for (size_t i = 0; i <= req->nparams * 2; i++) {
		const char *part = i == 0 ? path : i % 2 ?
		    req->params[order[i / 2]].key :
		    req->params[order[i / 2 - 1]].value;
		size_t k = strlen(part != NULL ? part : "");

		if (n + k + 1 > len)
			return -1;
		memcpy(out + n, part != NULL ? part : "", k);
		out[n + k] = '\0';
		n += k + 1;
	}
	*outlen = n;
	return 0;
}

/*
 * A request of a cached route: "now" becomes the start of the whole
 * second (CACHE_SITE) or minute (the others) it falls in, for the answer
 * and for its key, so that the requests of that second or minute share
 * one answer, computed once per generation (README, HTTP API).
 */
static void
cached_call(struct api_ctx *ctx, const struct route *hit,
    const struct api_request *req, struct api_response *resp)
{
	struct api_request r = *req;
	struct api_cache_entry *own;
	double unit = hit->cache == CACHE_SITE ? 1.0 : 60.0, p, stamp;
	unsigned long gen;
	char key[CACHE_KEY_MAX];
	size_t klen;
	enum api_cache_way way;

	p = tscale_to_posix(req->now1, req->now2);
	stamp = floor(p / unit) * unit;
	if (!isfinite(stamp) ||
	    tscale_from_posix(stamp, &r.now1, &r.now2) != ERRCODE_OK) {
		call(ctx, hit, req, resp);	/* no clock to round */
		return;
	}
	gen = hit->cache == CACHE_SITE ? atomic_load(&ctx->gen_site) :
	    hit->cache == CACHE_DATA ? data_generation(ctx) : 0;
	if (cache_key(req, hit->info.path, key, sizeof key, &klen) != 0) {
		call(ctx, hit, &r, resp);
		return;
	}
	way = api_cache_get(ctx->cache, key, klen, gen, stamp, resp, &own);
	if (way == API_CACHE_HIT)
		return;
	call(ctx, hit, &r, resp);
	if (way == API_CACHE_OWN)
		api_cache_put(ctx->cache, own, resp);
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
	if (api_params_check(req, hit->info.params, resp))
		return;
	if (hit->cache != CACHE_NONE)
		cached_call(ctx, hit, req, resp);
	else
		call(ctx, hit, req, resp);
}

void
api_handle(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	api_response_init(resp);
	dispatch(ctx, req, resp);
}
