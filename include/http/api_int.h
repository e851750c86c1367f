/* SPDX-License-Identifier: BSD-3-Clause */
/* api_int.h: what the files of the HTTP API share (the context, the
   handlers the route table names, the parameter and reply helpers);
   internal to http/, the daemon uses http/api.h. */
#ifndef MOONRANGE_API_INT_H
#define MOONRANGE_API_INT_H

#include <pthread.h>
#include <stdatomic.h>
#include <stddef.h>

#include <jansson.h>

#include "core/eop.h"
#include "core/geom.h"
#include "core/tscale.h"
#include "http/api.h"
#include "http/api_cache.h"
#include "store/store.h"

#define ATTEMPTS_LIMIT_DEFAULT 50
#define ATTEMPTS_LIMIT_MAX 1000
#define ATTEMPT_MAX_DAYS 1.0	/* longest attempt accepted, days */

/*
 * What GET /now reads, made once per site (api_set_site) so that /now
 * needs no lock while it computes: the station and its geometry, the
 * active targets with their body-fixed positions, the EOP table.
 * Shared by the requests using it (refs) and freed by the last one
 * (api_now_site_put).
 */
struct api_now_site {
	atomic_int refs;
	struct site_station station;
	int site_ok;			/* derive_site succeeded */
	struct geom_site site;		/* derive_site of station */
	struct site_target *targets;	/* owned: the active targets whose
					   position converts, in site order */
	struct geom_target *gt;		/* owned: their positions */
	size_t ntargets;
	struct site_eop_row *eop;	/* owned copy */
	size_t neop;
	char eop_last[32];		/* the table's last day, "" none */
};

/* Make the /now snapshot of s (copied), refs 1; NULL when out of
   memory.  Give it back with api_now_site_put (accepts NULL). */
struct api_now_site *api_now_site_make(const struct api_site *s);
void api_now_site_put(struct api_now_site *n);

/* The daemon's state: made by api_new, freed by api_free; the store is
   borrowed (the daemon closes it). */
struct api_ctx {
	pthread_mutex_t lock;		/* serialises handlers and replans */
	char *db_path;
	char *token_file;		/* NULL: none given */
	char token[API_TOKEN_MAX + 1];
	size_t token_len;		/* 0: writes are refused */
	int db_read_only;		/* api_config.db_read_only */
	double plan_days, refresh_s, start_posix;
	struct api_site site;
	struct api_now_site *now_site;	/* /now's snapshot of site (lock to
					   take a reference), NULL if it could
					   not be made */
	struct store *db;		/* borrowed */
	/* the plan cache: GET windows and coverage without parameters */
	int planned;			/* a plan has been computed */
	double plan_utc1, plan_utc2;	/* when */
	int replan;			/* a write asked for a new plan */
	struct mbuf plan_windows;	/* render_windows_json of the plan */
	struct mbuf plan_coverage;	/* coverage JSON, default query */
	size_t plan_nwindows;
	double plan_days_used;
	/* the response cache (api_cache.h) and the generations its entries
	   are computed from: gen_site changes with the site (api_set_site),
	   gen_data with the site and with every change of the database or
	   of the plan (api_data_changed, data_generation in api.c) */
	struct api_cache *cache;
	atomic_ulong gen_site, gen_data;
	int seen_data_version;		/* store_data_version of db (lock) */
	double seen_plan_utc1, seen_plan_utc2;	/* the plan seen (lock) */
};

/* --- handlers (the route table of api.c names them) --- */

void api_h_status(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_site(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_targets(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_now(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_eclipses(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_phases(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_windows(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_windows_ics(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_coverage(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_coverage_csv(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_coverage_svg(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_attempts_list(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_attempt_get(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_attempts_add(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_blackouts_add(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_plan(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_plan_ics(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);
void api_h_plan_svg(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp);

/* --- helpers (api.c) --- */

/* A handler's normal ending: 200 with what a renderer produced. */
void api_ok_or_error(struct api_response *r, enum errcode rc, unsigned status,
    const char *ctype);

/* Is key one of the comma-separated names in list? */
int api_param_listed(const char *list, const char *key);

/* Refuse unknown, repeated or too many query parameters (400 naming it). */
int api_params_check(const struct api_request *req, const char *allowed,
    struct api_response *resp);

/* The value of query parameter key, or NULL when absent. */
const char *api_param(const struct api_request *req, const char *key);

/* A UTC time parameter: "now" or ISO 8601.  0, or -1 with the error set. */
int api_param_time(const struct api_request *req, const char *key, double *u1,
    double *u2, struct api_response *resp);

/* A whole-number parameter in [min, max]; *out untouched when absent. */
int api_param_count(const struct api_request *req, const char *key,
    long min, long max, size_t *out, struct api_response *resp);

/*
 * Answer a query's error (winquery, phquery, covquery): 400 naming fault,
 * the canonical name of the parameter at fault, with the query's
 * sentence err; a code of its own (503, 500) when no parameter is at
 * fault.
 */
void api_query_error(struct api_response *resp, enum errcode rc,
    const char *fault, const char *err);

/* 1 when the daemon has a database; else 0 with a 503 set. */
int api_store_open_ok(struct api_ctx *ctx, struct api_response *resp);

/*
 * A database to read for one slow request (windows, coverage) without
 * holding ctx->lock, so that /now, /status and writes go on meanwhile:
 * a read-only connection of its own to the daemon's file (WAL lets it
 * read beside the shared one).  Where that cannot be had (no path, or
 * the open fails), the shared connection under the lock; *locked says
 * which, for api_release_store.
 */
struct store *api_read_store(struct api_ctx *ctx, int *locked);

/*
 * A connection to write on without holding ctx->lock, so that a write
 * waiting for the database (busy timeout, another process's import)
 * does not hold up /status, /now or the windows: one of its own to the
 * daemon's file, else the shared one under the lock (*locked says which).
 */
struct store *api_write_store(struct api_ctx *ctx, int *locked);

/* Give back what api_read_store or api_write_store returned. */
void api_release_store(struct api_ctx *ctx, struct store *db, int locked);

/* 200 with root dumped (root is consumed), or 500 when bad. */
void api_json_reply(struct api_response *resp, json_t *root, int bad);

/* After a write through the API has committed: answers computed before
   it are not served again (a new data generation). */
void api_data_changed(struct api_ctx *ctx);

/* 1 when a station is loaded; else 0 with a 503 set. */
int api_site_loaded(struct api_ctx *ctx, struct api_response *resp);

#endif
