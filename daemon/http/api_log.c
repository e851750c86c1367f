/* SPDX-License-Identifier: BSD-3-Clause */
/* api_log.c: the ranging-log handlers: list, get and add attempts (the
   write path: token, JSON body, its members). */
#include <limits.h>
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
#include "formats/render_json.h"
#include "query/winquery.h"
#include "query/covquery.h"
#include "core/derive.h"
#include "core/eop.h"
#include "core/geom.h"
#include "core/plan.h"
#include "store/plan_db.h"
#include "formats/render_site.h"
#include "store/store.h"
#include "core/tscale.h"

void
api_h_attempts_list(struct api_ctx *ctx, const struct api_request *req,
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

	if (!api_store_open_ok(ctx, resp))
		return;
	store_query_init(&q);
	if (api_param(req, "since") != NULL) {
		if (api_param_time(req, "since", &u1, &u2, resp))
			return;
		q.since_mjd = (u1 - ERFA_DJM0) + u2;
	}
	if (api_param(req, "until") != NULL) {
		if (api_param_time(req, "until", &u1, &u2, resp))
			return;
		q.until_mjd = (u1 - ERFA_DJM0) + u2;
	}
	if (api_param_count(req, "limit", 1, ATTEMPTS_LIMIT_MAX, &limit, resp))
		return;
	order = api_param(req, "order");
	if (order != NULL && strcmp(order, "newest") != 0 &&
	    strcmp(order, "oldest") != 0) {
		api_error(resp, ERRCODE_BAD_ARG, "order",
		    "order: 'newest' or 'oldest'");
		return;
	}
	q.target = api_param(req, "target");
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
	api_ok_or_error(resp, rc, 200, "application/json");
}

void
api_h_attempt_get(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	const char *digits = strrchr(req->path, '/') + 1;
	struct site_attempt a;
	char err[300];
	long id;
	enum errcode rc;

	if (!api_store_open_ok(ctx, resp))
		return;
	/* The route matched 1 to 18 digits. */
	rc = text_parse_long(digits, 1, LONG_MAX, &id);
	if (rc == ERRCODE_OK)
		rc = store_attempt_get(ctx->db, id, &a, err, sizeof err);
	if (rc != ERRCODE_OK) {
		api_error(resp, rc, NULL, rc == ERRCODE_NOT_FOUND ?
		    "no attempt with this id" : err);
		return;
	}
	rc = render_site_attempt_json(&a, &resp->body);
	api_ok_or_error(resp, rc, 200, "application/json");
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
		if (!api_param_listed(ATTEMPT_MEMBERS, key)) {
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

/*
 * What every write checks first: the bearer token, the body's size and
 * type, an open database with a station, a body that is JSON.  0 with
 * *body (the caller drops it), else -1 with the error set.
 */
static int
write_body(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp, json_t **body)
{
	json_error_t jerr;
	char msg[360];

	*body = NULL;
	if (!authorized(ctx, req)) {
		api_error(resp, ERRCODE_AUTH, "Authorization", ctx->token_len ?
		    "writes need the header Authorization: Bearer TOKEN with "
		    "the daemon's token" : "writes are disabled: the daemon "
		    "was started without --token-file");
		return -1;
	}
	if (ctx->db_read_only) {
		api_error(resp, ERRCODE_CONFIG, NULL, "writes are disabled: "
		    "the daemon cannot write its database file (read-only)");
		return -1;
	}
	if (req->body_too_large) {
		snprintf(msg, sizeof msg, "the body is larger than %d bytes",
		    API_BODY_MAX);
		api_error(resp, ERRCODE_TOO_LARGE, NULL, msg);
		return -1;
	}
	if (!is_json_type(req->content_type)) {
		api_error(resp, ERRCODE_UNSUPPORTED, "Content-Type",
		    "the body must be sent as Content-Type: application/json");
		return -1;
	}
	if (!api_store_open_ok(ctx, resp) || !api_site_loaded(ctx, resp))
		return -1;
	if (parse_body(req, body, &jerr) != ERRCODE_OK) {
		api_error(resp, ERRCODE_NOMEM, NULL, NULL);
		return -1;
	}
	if (*body == NULL) {
		snprintf(msg, sizeof msg, "the body is not valid JSON: %s "
		    "(line %d, column %d)", jerr.text, jerr.line, jerr.column);
		api_error(resp, ERRCODE_BAD_ARG, NULL, msg);
		return -1;
	}
	return 0;
}

void
api_h_attempts_add(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	struct site_attempt a;
	struct store *db;
	json_t *body = NULL;
	char err[300], msg[360];
	int bad, locked;
	enum errcode rc;

	/* An unlocked route: the context is looked at under its lock, the
	   write made on a connection of its own (api_write_store). */
	pthread_mutex_lock(&ctx->lock);
	bad = write_body(ctx, req, resp, &body) != 0;
	pthread_mutex_unlock(&ctx->lock);
	if (bad)
		return;
	if (attempt_from_json(body, &a, resp))
		goto out;
	/* As "log add": angles derived from the stored station, target and
	   EOP table at the mid-time, then one insert. */
	db = api_write_store(ctx, &locked);
	rc = store_attempt_log(db, &a, err, sizeof err);
	api_release_store(ctx, db, locked);
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
	pthread_mutex_lock(&ctx->lock);
	ctx->replan = 1;
	pthread_mutex_unlock(&ctx->lock);
	api_data_changed(ctx);
	snprintf(resp->location, sizeof resp->location,
	    "/api/v1/attempts/%ld", a.id);
	rc = render_site_attempt_json(&a, &resp->body);
	api_ok_or_error(resp, rc, 201, "application/json");
out:
	json_decref(body);
}

#define BLACKOUT_MEMBERS "start_utc,end_utc,reason"
#define BLACKOUT_MAX_DAYS 366.0

/*
 * POST /api/v1/blackouts: {"start_utc", "end_utc", "reason"} (reason
 * optional); as "blackout add".  The daemon re-plans after it.
 */
void
api_h_blackouts_add(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	struct site_blackout b;
	json_t *body = NULL, *o, *v;
	const char *key;
	char err[300], msg[360];
	enum errcode rc;
	int bad;

	if (write_body(ctx, req, resp, &body))
		return;
	memset(&b, 0, sizeof b);
	if (!json_is_object(body)) {
		api_error(resp, ERRCODE_BAD_ARG, NULL,
		    "the body must be a JSON object");
		goto out;
	}
	json_object_foreach(body, key, v) {
		if (!api_param_listed(BLACKOUT_MEMBERS, key)) {
			snprintf(msg, sizeof msg, "unknown member '%.60s' "
			    "(accepted: %s)", key, BLACKOUT_MEMBERS);
			api_error(resp, ERRCODE_BAD_ARG, key, msg);
			goto out;
		}
	}
	if (member_time(json_object_get(body, "start_utc"), "start_utc",
	    &b.start_mjd, resp) ||
	    member_time(json_object_get(body, "end_utc"), "end_utc",
	    &b.end_mjd, resp) ||
	    member_text(json_object_get(body, "reason"), "reason", b.reason,
	    sizeof b.reason, 0, resp))
		goto out;
	if (!(b.end_mjd > b.start_mjd)) {
		api_error(resp, ERRCODE_BAD_ARG, "end_utc",
		    "end_utc: must be after start_utc");
		goto out;
	}
	if (b.end_mjd - b.start_mjd > BLACKOUT_MAX_DAYS) {
		api_error(resp, ERRCODE_BAD_ARG, "end_utc",
		    "end_utc: a blackout lasts at most 366 days");
		goto out;
	}
	rc = store_blackout_add(ctx->db, &b, err, sizeof err);
	if (rc == ERRCODE_BAD_ARG || rc == ERRCODE_BAD_TIME) {
		const char *m = strstr(err, "'end'") ? "end_utc" :
		    strstr(err, "'start'") ? "start_utc" :
		    strstr(err, "'reason'") ? "reason" : NULL;

		snprintf(msg, sizeof msg, "%s: %s", m ? m : "body", err);
		api_error(resp, rc, m, msg);
		goto out;
	}
	if (rc != ERRCODE_OK) {
		api_error(resp, rc, NULL, err);
		goto out;
	}
	ctx->replan = 1;
	api_data_changed(ctx);
	o = json_object();
	bad = o == NULL;
	bad |= json_object_set_new(o, "id", json_integer(b.id));
	bad |= json_object_set_new(o, "start_utc", render_json_mjd(b.start_mjd, 0));
	bad |= json_object_set_new(o, "end_utc", render_json_mjd(b.end_mjd, 0));
	bad |= json_object_set_new(o, "reason", json_string(b.reason));
	if (bad) {
		json_decref(o);
		api_error(resp, ERRCODE_NOMEM, NULL, NULL);
		goto out;
	}
	api_json_reply(resp, o, 0);
	resp->status = 201;
out:
	json_decref(body);
}
