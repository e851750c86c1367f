/* SPDX-License-Identifier: BSD-3-Clause */
/* fuzz_http.c: the API as the daemon runs it (api_handle on a context
   with a real SQLite file of the sample site).  Built twice: fuzz_query
   feeds the query string of every GET route (the first byte picks the
   route), fuzz_body (FUZZ_HTTP_BODY) the body of POST /api/v1/attempts.
   Every answer must be a status below 500 with, for errors, a body that
   is valid UTF-8. */
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "core/text.h"
#include "formats/import.h"
#include "http/api.h"
#include "http/log.h"
#include "store/store.h"
#include "fuzz_common.h"

#define TOKEN "fuzz-token-0123456789abcdef"

static struct api_ctx *ctx;
static struct store *db;
static char dbpath[128];

static enum errcode
put_target(void *c, const struct site_target *t, size_t line)
{
	(void)line;
	return store_target_add(c, t, NULL, 0);
}

/* The text of a sample-site file, NUL-terminated; exits on failure. */
static char *
slurp(const char *name, size_t *len)
{
	char path[1024];
	FILE *f;
	char *buf = malloc(1 << 20);

	snprintf(path, sizeof path, "%s/sample-site/%s", MOONRANGE_SOURCE_DIR,
	    name);
	if (buf == NULL || (f = fopen(path, "rb")) == NULL) {
		fprintf(stderr, "fuzz: cannot read %s\n", path);
		abort();
	}
	*len = fread(buf, 1, (1 << 20) - 1, f);
	buf[*len] = '\0';
	fclose(f);
	return buf;
}

int LLVMFuzzerInitialize(int *argc, char ***argv);

/* The database and its WAL files go when the fuzzer exits. */
static void
remove_db(void)
{
	char p[160];

	store_close(db);
	db = NULL;
	unlink(dbpath);
	snprintf(p, sizeof p, "%s-wal", dbpath);
	unlink(p);
	snprintf(p, sizeof p, "%s-shm", dbpath);
	unlink(p);
}

int
LLVMFuzzerInitialize(int *argc, char ***argv)
{
	struct api_config cfg;
	struct api_site site;
	struct import_report rep;
	size_t n;
	char *buf;

	(void)argc;
	(void)argv;
	log_init(LOG_LEVEL_ERROR, NULL);
	snprintf(dbpath, sizeof dbpath, "/tmp/moonrange-fuzz-%ld.db",
	    (long)getpid());
	unlink(dbpath);
	if (store_open(dbpath, STORE_OPEN_CREATE, &db, NULL, 0) != ERRCODE_OK)
		abort();
	atexit(remove_db);
	memset(&site, 0, sizeof site);
	buf = slurp("station.ini", &n);
	if (import_station_ini(buf, n, &site.station, &rep) != ERRCODE_OK ||
	    store_station_put(db, &site.station, NULL, 0) != ERRCODE_OK) {
		fprintf(stderr, "fuzz: the sample station file is refused\n");
		abort();
	}
	free(buf);
	buf = slurp("targets.csv", &n);
	if (import_targets_csv(buf, n, put_target, db, &rep) != ERRCODE_OK ||
	    store_targets_list(db, 0, &site.targets, &site.ntargets, NULL,
	    0) != ERRCODE_OK)
		abort();
	free(buf);
	memset(&cfg, 0, sizeof cfg);
	cfg.db_path = dbpath;
	cfg.token = TOKEN;
	cfg.refresh_s = 600;
	if ((ctx = api_new(&cfg)) == NULL)
		abort();
	api_set_site(ctx, &site);
	api_set_store(ctx, db);
	return 0;
}

static void
check(const struct api_response *r)
{
	if (r->status >= 500 && r->status != 503)
		__builtin_trap();
	if (r->status >= 400 && !text_utf8_valid(r->body.data, r->body.len))
		__builtin_trap();
}

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	struct api_request req;
	struct api_response resp;
	char text[4096], path[96];
	size_t n = size < sizeof text - 1 ? size : sizeof text - 1;

	memset(&req, 0, sizeof req);
	req.now1 = 2461406.5;	/* 2026-12-02 */
	req.now2 = 0.2;
#ifdef FUZZ_HTTP_BODY
	req.method = "POST";
	req.path = "/api/v1/attempts";
	req.authorization = "Bearer " TOKEN;
	req.content_type = "application/json";
	req.body = (const char *)data;
	req.body_len = size;
	(void)text;
	(void)path;
	(void)n;
#else
	{
		const struct api_route_info *ri;
		size_t nroutes = 0, k;
		char *p, *save = NULL;

		if (size == 0)
			return 0;
		while (api_route(nroutes) != NULL)
			nroutes++;
		ri = api_route(data[0] % nroutes);
		if (strcmp(ri->method, "GET") != 0)
			return 0;
		snprintf(path, sizeof path, "%s", ri->path);
		if ((p = strstr(path, "{id}")) != NULL)
			snprintf(p, sizeof path - (size_t)(p - path), "%u",
			    size > 1 ? data[1] : 1u);
		req.method = "GET";
		req.path = path;
		memcpy(text, data + 1, n - (n > 0));
		text[n - (n > 0)] = '\0';
		/* Split as libmicrohttpd does: '&' between pairs, the first
		   '=' between key and value. */
		for (p = strtok_r(text, "&", &save); p != NULL;
		    p = strtok_r(NULL, "&", &save)) {
			char *eq = strchr(p, '=');

			if (req.nparams == API_MAX_PARAMS) {
				req.params_overflow = 1;
				break;
			}
			k = req.nparams++;
			if (eq != NULL)
				*eq = '\0';
			req.params[k].key = p;
			req.params[k].value = eq != NULL ? eq + 1 : "";
		}
	}
#endif
	api_response_init(&resp);
	api_handle(ctx, &req, &resp);
	check(&resp);
	api_response_free(&resp);
	return 0;
}
