/* SPDX-License-Identifier: BSD-3-Clause */
/* test_api_cache.c: the daemon's response cache: its bounds, one
   computation per key, and the API's answers from it against fresh ones. */
#define _XOPEN_SOURCE 700	/* mkdtemp (fixture.h) */
#include <math.h>
#include <pthread.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include <cmocka.h>
#include <jansson.h>

#include "fixture.h"
#include "core/mem.h"
#include "core/tscale.h"
#include "http/api.h"
#include "http/api_cache.h"
#include "http/api_int.h"
#include "http/log.h"
#include "store/store.h"

/*
 * The API tests run on the sample site (invented station and targets),
 * initialised by the moonrange binary into a temporary file.  Instants
 * are pinned: T0 is a whole minute inside the site's EOP table.
 */
#define TOKEN "cache-test-token-0123456789"
#define T0 "2027-03-15T20:00:00Z"

static double t0_posix;

/* --- the cache alone --- */

/* A response of status and body (content type JSON). */
static void
make_resp(struct api_response *r, unsigned status, const char *body)
{
	api_response_init(r);
	r->status = status;
	mbuf_puts(&r->body, body);
}

static void
assert_body(const struct api_response *r, const char *body)
{
	assert_int_equal(r->body.len, strlen(body));
	assert_memory_equal(r->body.data, body, r->body.len);
}

static void
test_cache_hit_and_versions(void **state)
{
	struct api_cache *c = api_cache_new(4, 4096);
	struct api_cache_entry *own;
	struct api_response r, a;
	struct api_cache_stats st;

	(void)state;
	assert_non_null(c);
	api_response_init(&r);
	assert_int_equal(api_cache_get(c, "k", 1, 1, 60.0, &r, &own),
	    API_CACHE_OWN);
	make_resp(&a, 200, "first");
	api_cache_put(c, own, &a);
	api_response_free(&a);
	/* The same version: the kept answer, byte for byte. */
	assert_int_equal(api_cache_get(c, "k", 1, 1, 60.0, &r, &own),
	    API_CACHE_HIT);
	assert_int_equal(r.status, 200);
	assert_body(&r, "first");
	api_response_free(&r);
	/* An older version is computed on its own, the entry stays. */
	api_response_init(&r);
	assert_int_equal(api_cache_get(c, "k", 1, 1, 0.0, &r, &own),
	    API_CACHE_PASS);
	assert_int_equal(api_cache_get(c, "k", 1, 0, 60.0, &r, &own),
	    API_CACHE_PASS);
	/* A newer generation or instant replaces it. */
	assert_int_equal(api_cache_get(c, "k", 1, 2, 60.0, &r, &own),
	    API_CACHE_OWN);
	make_resp(&a, 200, "second");
	api_cache_put(c, own, &a);
	api_response_free(&a);
	assert_int_equal(api_cache_get(c, "k", 1, 2, 60.0, &r, &own),
	    API_CACHE_HIT);
	assert_body(&r, "second");
	api_response_free(&r);
	/* Keys differ by every byte, NULs included. */
	api_response_init(&r);
	assert_int_equal(api_cache_get(c, "k\0a", 3, 2, 60.0, &r, &own),
	    API_CACHE_OWN);
	make_resp(&a, 400, "refused");
	api_cache_put(c, own, &a);
	api_response_free(&a);
	assert_int_equal(api_cache_get(c, "k\0a", 3, 2, 60.0, &r, &own),
	    API_CACHE_HIT);
	assert_int_equal(r.status, 400);
	assert_body(&r, "refused");
	api_response_free(&r);
	api_cache_stats(c, &st);
	assert_int_equal(st.entries, 2);
	assert_int_equal(st.bytes, strlen("second") + strlen("refused"));
	assert_int_equal(st.hits, 3);
	assert_int_equal(st.misses, 3);
	assert_int_equal(st.passes, 2);
	api_cache_free(c);
}

static void
test_cache_bounds(void **state)
{
	struct api_cache *c = api_cache_new(3, 400);
	struct api_cache_entry *own;
	struct api_response r, a;
	struct api_cache_stats st;
	char key[8], big[120];

	(void)state;
	assert_non_null(c);
	api_response_init(&r);
	/* Four keys in a cache of three: the least recently used goes. */
	for (int i = 0; i < 4; i++) {
		snprintf(key, sizeof key, "k%d", i);
		assert_int_equal(api_cache_get(c, key, 2, 1, 0.0, &r, &own),
		    API_CACHE_OWN);
		make_resp(&a, 200, key);
		api_cache_put(c, own, &a);
		api_response_free(&a);
		if (i == 2)	/* k0 used again: k1 is the oldest */
			assert_int_equal(api_cache_get(c, "k0", 2, 1, 0.0,
			    &r, &own), API_CACHE_HIT);
	}
	api_cache_stats(c, &st);
	assert_int_equal(st.entries, 3);
	assert_int_equal(api_cache_get(c, "k0", 2, 1, 0.0, &r, &own),
	    API_CACHE_HIT);
	assert_int_equal(api_cache_get(c, "k1", 2, 1, 0.0, &r, &own),
	    API_CACHE_OWN);
	/* A body over a quarter of the bytes is not kept; the next request
	   of that version computes its own. */
	memset(big, 'x', sizeof big - 1);
	big[sizeof big - 1] = '\0';
	make_resp(&a, 200, big);
	api_cache_put(c, own, &a);
	api_response_free(&a);
	assert_int_equal(api_cache_get(c, "k1", 2, 1, 0.0, &r, &own),
	    API_CACHE_PASS);
	/* A failure is not kept: the next request computes again. */
	assert_int_equal(api_cache_get(c, "k9", 2, 1, 0.0, &r, &own),
	    API_CACHE_OWN);
	make_resp(&a, 500, "failed");
	api_cache_put(c, own, &a);
	api_response_free(&a);
	assert_int_equal(api_cache_get(c, "k9", 2, 1, 0.0, &r, &own),
	    API_CACHE_OWN);
	make_resp(&a, 200, "ok");
	api_cache_put(c, own, &a);
	api_response_free(&a);
	api_cache_stats(c, &st);
	assert_true(st.entries <= 3);
	assert_true(st.bytes <= 400);
	api_response_free(&r);
	api_cache_free(c);
}

struct waiter {
	struct api_cache *c;
	enum api_cache_way way;
	struct api_response r;
};

static void *
wait_for_answer(void *arg)
{
	struct waiter *w = arg;
	struct api_cache_entry *own;

	api_response_init(&w->r);
	w->way = api_cache_get(w->c, "busy", 4, 7, 120.0, &w->r, &own);
	if (w->way == API_CACHE_OWN)	/* not expected: keep it consistent */
		api_cache_put(w->c, own, &w->r);
	return NULL;
}

/* Requests for a key being computed wait for that answer. */
static void
test_cache_one_computation(void **state)
{
	struct api_cache *c = api_cache_new(4, 1 << 20);
	struct api_cache_entry *own;
	struct api_response r, a;
	struct api_cache_stats st;
	struct waiter w[6];
	pthread_t th[6];
	struct timespec pause = {0, 100 * 1000 * 1000};

	(void)state;
	assert_non_null(c);
	api_response_init(&r);
	assert_int_equal(api_cache_get(c, "busy", 4, 7, 120.0, &r, &own),
	    API_CACHE_OWN);
	for (int i = 0; i < 6; i++) {
		w[i].c = c;
		assert_int_equal(pthread_create(&th[i], NULL, wait_for_answer,
		    &w[i]), 0);
	}
	nanosleep(&pause, NULL);	/* let them reach the wait */
	make_resp(&a, 200, "computed once");
	api_cache_put(c, own, &a);
	api_response_free(&a);
	for (int i = 0; i < 6; i++) {
		assert_int_equal(pthread_join(th[i], NULL), 0);
		assert_int_equal(w[i].way, API_CACHE_HIT);
		assert_body(&w[i].r, "computed once");
		api_response_free(&w[i].r);
	}
	api_cache_stats(c, &st);
	assert_int_equal(st.misses, 1);
	assert_int_equal(st.hits, 6);
	api_response_free(&r);
	api_cache_free(c);
}

/* --- the API's answers --- */

static int
setup(void **state)
{
	double u1, u2;

	log_init(LOG_LEVEL_ERROR, NULL);
	if (tscale_parse_utc(T0, &u1, &u2, NULL, 0) != ERRCODE_OK)
		return -1;
	t0_posix = tscale_to_posix(u1, u2);
	return fixture_sample_setup(state);
}

/* A daemon context on the database, with a connection of its own. */
struct daemon {
	struct api_ctx *ctx;
	struct store *db;
};

/* Load the site from the database into the daemon, as SIGHUP does. */
static void
daemon_load_site(struct daemon *d)
{
	struct api_site site;
	char err[200];

	memset(&site, 0, sizeof site);
	assert_int_equal(store_station_get(d->db, &site.station, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_targets_list(d->db, 0, &site.targets,
	    &site.ntargets, err, sizeof err), ERRCODE_OK);
	assert_int_equal(store_eop_load(d->db, &site.eop, &site.neop, err,
	    sizeof err), ERRCODE_OK);
	api_set_site(d->ctx, &site);
}

static void
daemon_open(struct daemon *d)
{
	struct api_config cfg;
	char err[200];

	memset(&cfg, 0, sizeof cfg);
	cfg.db_path = fixture_db;
	cfg.token = TOKEN;
	cfg.refresh_s = 600;
	d->ctx = api_new(&cfg);
	assert_non_null(d->ctx);
	assert_int_equal(store_open(fixture_db, 0, &d->db, err, sizeof err),
	    ERRCODE_OK);
	daemon_load_site(d);
	api_set_store(d->ctx, d->db);
}

static void
daemon_close(struct daemon *d)
{
	api_free(d->ctx);
	store_close(d->db);
}

/*
 * One request: method, path, query ("a=b&c=d", plain text, may be
 * NULL), arriving at posix seconds; body for a POST (JSON) or NULL.
 */
static void
handle(struct daemon *d, const char *method, const char *path,
    const char *query, double posix, const char *body,
    struct api_response *resp)
{
	struct api_request req;
	char q[512], *save = NULL;

	memset(&req, 0, sizeof req);
	req.method = method;
	req.path = path;
	snprintf(q, sizeof q, "%s", query ? query : "");
	for (char *p = strtok_r(q, "&", &save); p != NULL;
	    p = strtok_r(NULL, "&", &save)) {
		char *eq = strchr(p, '=');

		assert_true(req.nparams < API_MAX_PARAMS);
		if (eq != NULL)
			*eq = '\0';
		req.params[req.nparams].key = p;
		req.params[req.nparams].value = eq ? eq + 1 : "";
		req.nparams++;
	}
	if (body != NULL) {
		req.authorization = "Bearer " TOKEN;
		req.content_type = "application/json";
		req.body = body;
		req.body_len = strlen(body);
	}
	assert_int_equal(tscale_from_posix(posix, &req.now1, &req.now2),
	    ERRCODE_OK);
	api_handle(d->ctx, &req, resp);
}

static void
stats(struct daemon *d, struct api_cache_stats *st)
{
	api_cache_stats(d->ctx->cache, st);
}

/* The answer of a fresh daemon (a cache of its own) to the request. */
static void
assert_same_as_fresh(const struct api_response *got, const char *path,
    const char *query, double posix)
{
	struct daemon f;
	struct api_response r;

	daemon_open(&f);
	handle(&f, "GET", path, query, posix, NULL, &r);
	assert_int_equal(got->status, r.status);
	assert_string_equal(got->content_type, r.content_type);
	assert_int_equal(got->body.len, r.body.len);
	assert_memory_equal(got->body.data, r.body.data, r.body.len);
	api_response_free(&r);
	daemon_close(&f);
}

static int
same_body(const struct api_response *a, const struct api_response *b)
{
	return a->body.len == b->body.len &&
	    memcmp(a->body.data, b->body.data, a->body.len) == 0;
}

/*
 * The minute rule: windows?days=3 at 20:00:10 and 20:00:50 is one
 * answer, computed once, and it is the answer of 20:00:00 from a fresh
 * daemon, byte for byte; 20:01:05 is a new one.  The order of the query
 * parameters does not matter.
 */
static void
test_api_windows_minute_rule(void **state)
{
	struct daemon d;
	struct api_response a, b, c;
	struct api_cache_stats s0, s1;

	(void)state;
	daemon_open(&d);
	stats(&d, &s0);
	handle(&d, "GET", "/api/v1/windows", "days=3&limit=4", t0_posix + 10,
	    NULL, &a);
	assert_int_equal(a.status, 200);
	handle(&d, "GET", "/api/v1/windows", "limit=4&days=3", t0_posix + 50,
	    NULL, &b);
	stats(&d, &s1);
	assert_int_equal(s1.misses - s0.misses, 1);
	assert_int_equal(s1.hits - s0.hits, 1);
	assert_true(same_body(&a, &b));
	assert_same_as_fresh(&b, "/api/v1/windows", "days=3&limit=4",
	    t0_posix);
	handle(&d, "GET", "/api/v1/windows", "days=3&limit=4", t0_posix + 65,
	    NULL, &c);
	stats(&d, &s0);
	assert_int_equal(s0.misses - s1.misses, 1);
	assert_same_as_fresh(&c, "/api/v1/windows", "days=3&limit=4",
	    t0_posix + 60);
	api_response_free(&a);
	api_response_free(&b);
	api_response_free(&c);
	daemon_close(&d);
}

/* /now: one answer per whole second, at that second, until the site is
   reloaded; at= still works. */
static void
test_api_now_per_second(void **state)
{
	struct daemon d;
	struct api_response a, b;
	struct api_cache_stats s0, s1;
	json_t *j;

	(void)state;
	daemon_open(&d);
	stats(&d, &s0);
	handle(&d, "GET", "/api/v1/now", NULL, t0_posix + 7.25, NULL, &a);
	handle(&d, "GET", "/api/v1/now", NULL, t0_posix + 7.75, NULL, &b);
	stats(&d, &s1);
	assert_int_equal(s1.misses - s0.misses, 1);
	assert_int_equal(s1.hits - s0.hits, 1);
	assert_true(same_body(&a, &b));
	j = json_loadb(a.body.data, a.body.len, 0, NULL);
	assert_non_null(j);
	assert_string_equal(json_string_value(json_object_get(j, "utc")),
	    "2027-03-15T20:00:07Z");
	json_decref(j);
	/* The answer of the whole second is that of at= that second. */
	assert_same_as_fresh(&a, "/api/v1/now", "at=2027-03-15T20:00:07Z",
	    t0_posix + 300);
	api_response_free(&b);
	/* A reload of the site (SIGHUP): computed again. */
	daemon_load_site(&d);
	handle(&d, "GET", "/api/v1/now", NULL, t0_posix + 7.9, NULL, &b);
	stats(&d, &s0);
	assert_int_equal(s0.misses - s1.misses, 1);
	assert_true(same_body(&a, &b));
	api_response_free(&b);
	handle(&d, "GET", "/api/v1/now", "at=2027-03-15T21:30:00.5Z",
	    t0_posix + 8, NULL, &b);
	assert_int_equal(b.status, 200);
	assert_same_as_fresh(&b, "/api/v1/now", "at=2027-03-15T21:30:00.5Z",
	    t0_posix + 500);
	api_response_free(&a);
	api_response_free(&b);
	daemon_close(&d);
}

/*
 * A POSTed attempt, a POSTed blackout, and a setting changed by another
 * connection (as "moonrange setting set" does) each make the next answer
 * a new computation, equal to a fresh daemon's.
 */
static void
test_api_writes_invalidate(void **state)
{
	struct daemon d;
	struct api_response a, b, p;
	struct api_cache_stats s0, s1;
	struct store *other;
	char err[200];
	const char *plan_q = "at=" T0;
	double t = t0_posix + 20;

	(void)state;
	daemon_open(&d);
	handle(&d, "GET", "/api/v1/plan", plan_q, t, NULL, &a);
	assert_int_equal(a.status, 200);
	handle(&d, "GET", "/api/v1/plan", plan_q, t, NULL, &b);
	assert_true(same_body(&a, &b));
	api_response_free(&b);

	/* An attempt through the API. */
	stats(&d, &s0);
	handle(&d, "POST", "/api/v1/attempts", NULL, t, "{\"target\":"
	    "\"HERON\",\"start_utc\":\"2027-03-10T04:00:00Z\",\"end_utc\":"
	    "\"2027-03-10T04:05:00Z\",\"shots\":600,\"returns\":12,"
	    "\"normal_points\":1,\"outcome\":\"ranged\",\"operator\":"
	    "\"ops\"}", &p);
	if (p.status != 201)
		fail_msg("%.*s", (int)p.body.len, p.body.data);
	api_response_free(&p);
	handle(&d, "GET", "/api/v1/plan", plan_q, t, NULL, &b);
	stats(&d, &s1);
	assert_int_equal(s1.misses - s0.misses, 1);
	assert_same_as_fresh(&b, "/api/v1/plan", plan_q, t);
	api_response_free(&b);

	/* A blackout over the whole night: the plan changes. */
	handle(&d, "POST", "/api/v1/blackouts", NULL, t, "{\"start_utc\":"
	    "\"2027-03-15T18:00:00Z\",\"end_utc\":\"2027-03-16T18:00:00Z\","
	    "\"reason\":\"maintenance\"}", &p);
	assert_int_equal(p.status, 201);
	api_response_free(&p);
	handle(&d, "GET", "/api/v1/plan", plan_q, t, NULL, &b);
	stats(&d, &s0);
	assert_int_equal(s0.misses - s1.misses, 1);
	assert_false(same_body(&a, &b));
	assert_same_as_fresh(&b, "/api/v1/plan", plan_q, t);
	api_response_free(&a);

	/* A setting written by another connection. */
	assert_int_equal(store_open(fixture_db, 0, &other, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(store_setting_set(other, "plan_run_min_s", "900",
	    err, sizeof err), ERRCODE_OK);
	store_close(other);
	handle(&d, "GET", "/api/v1/plan", plan_q, t, NULL, &a);
	stats(&d, &s1);
	assert_int_equal(s1.misses - s0.misses, 1);
	assert_same_as_fresh(&a, "/api/v1/plan", plan_q, t);
	/* Unchanged since: from the cache again. */
	api_response_free(&b);
	handle(&d, "GET", "/api/v1/plan", plan_q, t, NULL, &b);
	stats(&d, &s0);
	assert_int_equal(s0.hits - s1.hits, 1);
	assert_true(same_body(&a, &b));
	api_response_free(&a);
	api_response_free(&b);
	daemon_close(&d);
}

struct client {
	struct daemon *d;
	struct api_response r;
};

static void *
client_run(void *arg)
{
	struct client *c = arg;

	handle(c->d, "GET", "/api/v1/coverage", "horizon=5", t0_posix + 1,
	    NULL, &c->r);
	return NULL;
}

/* Eight identical requests at once: one computation, eight answers. */
static void
test_api_no_stampede(void **state)
{
	struct daemon d;
	struct client c[8];
	pthread_t th[8];
	struct api_cache_stats s0, s1;

	(void)state;
	daemon_open(&d);
	stats(&d, &s0);
	for (int i = 0; i < 8; i++) {
		c[i].d = &d;
		assert_int_equal(pthread_create(&th[i], NULL, client_run,
		    &c[i]), 0);
	}
	for (int i = 0; i < 8; i++)
		assert_int_equal(pthread_join(th[i], NULL), 0);
	stats(&d, &s1);
	assert_int_equal(s1.misses - s0.misses, 1);
	assert_int_equal(s1.hits - s0.hits, 7);
	for (int i = 0; i < 8; i++) {
		assert_int_equal(c[i].r.status, 200);
		assert_true(same_body(&c[0].r, &c[i].r));
	}
	assert_same_as_fresh(&c[0].r, "/api/v1/coverage", "horizon=5",
	    t0_posix);
	for (int i = 0; i < 8; i++)
		api_response_free(&c[i].r);
	daemon_close(&d);
}

int
main(void)
{
	const struct CMUnitTest cache[] = {
		cmocka_unit_test(test_cache_hit_and_versions),
		cmocka_unit_test(test_cache_bounds),
		cmocka_unit_test(test_cache_one_computation),
	};
	const struct CMUnitTest api[] = {
		cmocka_unit_test(test_api_windows_minute_rule),
		cmocka_unit_test(test_api_now_per_second),
		cmocka_unit_test(test_api_writes_invalidate),
		cmocka_unit_test(test_api_no_stampede),
	};
	int bad = cmocka_run_group_tests_name("api_cache", cache, NULL, NULL);

	return bad + cmocka_run_group_tests_name("api_cache_routes", api,
	    setup, fixture_dir_teardown);
}
