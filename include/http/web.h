/* SPDX-License-Identifier: BSD-3-Clause */
/* web.h: the HTTP server (libmicrohttpd) in front of the API and the page. */
#ifndef MOONRANGE_WEB_H
#define MOONRANGE_WEB_H

#include <stddef.h>

#include "http/api.h"
#include "core/errcode.h"

/*
 * web.c is the only file that includes microhttpd.h.  It turns requests
 * under /api/ into api_handle() calls and serves other GET requests as
 * static files from one directory.  Every response carries the security
 * headers (Content-Security-Policy: default-src 'self', nosniff,
 * Referrer-Policy, X-Frame-Options) and a Cache-Control.
 */

#define WEB_DEFAULT_ADDR "127.0.0.1"
#define WEB_DEFAULT_PORT 8470
#define WEB_STATIC_MAX (4L * 1024 * 1024)	/* largest static file */
/* Memory of a connection: its request line and headers must fit, and
   libmicrohttpd clears all of it between the requests of a kept-alive
   connection (128 KiB spent 13 % of the daemon's CPU on a cached /now
   under wrk; 32 KiB, 6 %).  Bodies do not count (web.c keeps them). */
#define WEB_CONNECTION_MEMORY (32u * 1024)

struct web_config {
	const char *addr;		/* numeric IPv4 or IPv6 address */
	unsigned port;			/* 0: the kernel picks one */
	const char *web_dir;		/* static files, or NULL for none */
	unsigned threads;		/* worker pool size (default 4) */
	unsigned connection_limit;	/* total (default 64) */
	unsigned per_ip_limit;		/* per client address (default 32) */
	unsigned timeout_s;		/* idle connection timeout (default 15) */
	size_t memory_limit;		/* per connection, bytes (default
					   WEB_CONNECTION_MEMORY) */
};

struct web_server;

/*
 * Start serving ctx (borrowed; must outlive the server).  Threads start
 * here, so block the signals the caller handles before calling.  Returns
 * ERRCODE_IO with a sentence in errbuf when the address cannot be bound,
 * errno then telling why (EADDRINUSE: another program holds the port).
 * libmicrohttpd's messages while starting are logged only if the start
 * succeeds (a failure is the errbuf sentence alone).
 */
enum errcode web_start(const struct web_config *cfg, struct api_ctx *ctx,
    struct web_server **out, char *errbuf, size_t errlen);

/* The port actually bound (useful when the configured port is 0). */
unsigned web_port(const struct web_server *s);

/*
 * Stop accepting, let requests in flight finish (waiting at most
 * grace_s seconds), then stop the threads and free the server.
 */
void web_stop(struct web_server *s, double grace_s);

/* --- helpers, exported for tests --- */

/* "ADDR:PORT", "[V6]:PORT" or ":PORT"; numeric address only. */
enum errcode web_parse_listen(const char *s, char *addr, size_t addrlen,
    unsigned *port, char *errbuf, size_t errlen);

/* 1 if a numeric address is a loopback one (127.0.0.0/8 or ::1). */
int web_is_loopback(const char *addr);

/*
 * 1 if a Host header names this machine: "localhost" or a loopback
 * address, with an optional numeric port.  A daemon bound to loopback
 * answers other Host values with 400, so that a page of another site
 * that rebinds its name to 127.0.0.1 cannot read the API.
 */
int web_host_is_local(const char *host);

/*
 * Map a URL path onto a file under root (itself a canonical path), or
 * ERRCODE_NOT_FOUND: only [A-Za-z0-9._-] segments not starting with '.',
 * the canonical result must lie inside root (no symlink escape), be a
 * regular file and have an extension in the fixed MIME table.  "/" is
 * index.html.  *mime points to static storage.
 */
enum errcode web_static_resolve(const char *root, const char *url_path,
    char *out, size_t outlen, const char **mime);

#endif
