/* SPDX-License-Identifier: BSD-3-Clause */
/* api.h: the JSON API under /api/v1/, as plain requests and responses. */
#ifndef MOONRANGE_API_H
#define MOONRANGE_API_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/mem.h"
#include "core/site.h"

/*
 * The API knows nothing of sockets or of libmicrohttpd: web.c turns each
 * HTTP request into a struct api_request, calls api_handle(), and turns
 * the struct api_response back into HTTP.  Tests call api_handle()
 * directly as well as through a real server.
 */

#define API_BODY_MAX 65536	/* request bodies above this get 413 */
#define API_MAX_PARAMS 16	/* query pairs kept; more is a 400 */
#define API_TOKEN_MIN 16	/* shortest bearer token accepted at start */
#define API_TOKEN_MAX 256

/* --- requests and responses --- */

struct api_param {
	const char *key;
	const char *value;	/* "" for a key given without '=' */
};

struct api_request {
	const char *method;		/* "GET", "HEAD", "POST", ... */
	const char *path;		/* decoded path without the query */
	struct api_param params[API_MAX_PARAMS];
	size_t nparams;
	int params_overflow;		/* more pairs than API_MAX_PARAMS */
	const char *authorization;	/* Authorization header or NULL */
	const char *content_type;	/* Content-Type header or NULL */
	const char *body;		/* borrowed, not NUL-terminated */
	size_t body_len;
	int body_too_large;		/* over API_BODY_MAX: body dropped */
	double now1, now2;		/* UTC quasi-JD, read at the edge */
};

/*
 * Filled by api_handle().  content_type points to static storage; body is
 * owned by the response and released by api_response_free().
 */
struct api_response {
	unsigned status;		/* HTTP status */
	const char *content_type;
	struct mbuf body;
	char location[160];		/* Location header, "" for none */
	char allow[48];			/* Allow header (405), "" for none */
};

void api_response_init(struct api_response *r);
void api_response_free(struct api_response *r);

/*
 * The one mapping from an error code to HTTP: sets status, content type
 * and a body {"error":{"code","message","field"}} where code is
 * errcode_name(rc), message the sentence (errcode_str(rc) when NULL) and
 * field the parameter or body member at fault (null when NULL).
 */
unsigned api_http_status(enum errcode rc);
void api_error(struct api_response *r, enum errcode rc, const char *field,
    const char *message);

/* --- the site the daemon serves (a snapshot loaded from the store) --- */

struct api_site {
	struct site_station station;
	struct site_target *targets;	/* owned (mem_alloc), all targets */
	size_t ntargets;
	struct site_eop_row *eop;	/* owned, MJD order, may be empty */
	size_t neop;
};

/* Release what an api_site owns (accepts NULL) and zero it. */
void api_site_free(struct api_site *s);

/* --- the daemon context --- */

struct api_config {
	const char *db_path;		/* shown by /status; may be NULL */
	const char *token;		/* bearer token for writes, NULL = none
					   (then every write is refused) */
	const char *token_file;		/* where the token was read: shown by
					   /status (the path, never the token)
					   so that the page can say where it
					   lives; may be NULL */
	int db_read_only;		/* the database file cannot be written
					   (e.g. mode 0444): writes answer 503
					   and /status says writes_enabled
					   false */
	double plan_days;		/* span of the plan cache, days; 0:
					   the store's plan_days setting */
	double refresh_s;		/* plan refresh interval, seconds */
	double start_posix;		/* when the daemon started */
};

struct api_ctx;

/*
 * A context owns a copy of the configuration (the token is copied and
 * wiped on api_free) and the current site.  api_handle() may be called
 * from several threads at once; the context serialises what touches it.
 * The slow reads (windows, coverage, the plan refresh) run on a read-only
 * database connection of their own, outside that lock, so that /now,
 * /status and writes are not held up by them.  Returns NULL on
 * allocation failure.
 */
struct api_ctx *api_new(const struct api_config *cfg);
void api_free(struct api_ctx *ctx);

/* The open database the handlers read and write (borrowed; the caller
   closes it after api_free).  NULL: endpoints that need it answer 503. */
struct store;
void api_set_store(struct api_ctx *ctx, struct store *db);

/* Replace the site (takes what *site owns, leaves *site zeroed). */
void api_set_site(struct api_ctx *ctx, struct api_site *site);

/*
 * Recompute the plan cache: the ranked windows of [now, now + plan_days)
 * and the coverage audit with default parameters, served by GET windows
 * and GET coverage without parameters.  Called by the daemon's main loop
 * (one thread) every refresh interval and when api_replan_wanted() says
 * the data changed; a write made while it runs asks for the next one.
 * On failure the previous plan stays and errbuf says why.
 */
enum errcode api_replan(struct api_ctx *ctx, double now1, double now2,
    char *errbuf, size_t errlen);

/* 1 once after each successful write since the last call, else 0. */
int api_replan_wanted(struct api_ctx *ctx);

/* Dispatch one request through the route table.  Always fills *resp. */
void api_handle(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);

/* --- the route table, for documentation and tests --- */

struct api_route_info {
	const char *method;
	const char *path;
	const char *params;	/* accepted query parameters, comma-separated */
	const char *summary;
};

/* The i-th route, or NULL past the end. */
const struct api_route_info *api_route(size_t i);

/* Equal in constant time for a given stored length (for tokens). */
int api_token_equal(const char *given, size_t given_len, const char *want,
    size_t want_len);

#endif
