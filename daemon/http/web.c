/* SPDX-License-Identifier: BSD-3-Clause */
/* web.c: libmicrohttpd glue: requests to the API and static files, with limits. */
#define _XOPEN_SOURCE 700	/* realpath */
#include <arpa/inet.h>
#include <ctype.h>
#include <errno.h>
#include <limits.h>
#include <math.h>
#include <netinet/in.h>
#include <pthread.h>
#include <stdatomic.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <sys/socket.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#include <microhttpd.h>

#include "http/log.h"
#include "core/tscale.h"
#include "http/web.h"

struct web_server {
	struct MHD_Daemon *d;
	struct api_ctx *ctx;
	char root[PATH_MAX];		/* canonical web directory, "" none */
	unsigned port;
	int loopback;			/* bound to a loopback address */
	atomic_int inflight;		/* requests between start and reply */
	/* libmicrohttpd's messages: a repeat within WEB_LOG_REPEAT_S of
	   the same text is counted, not logged (a flood of refused
	   connections must not flood the event log). */
	pthread_mutex_t log_lock;
	char log_last[512];
	double log_last_s;		/* monotonic time of log_last */
	unsigned long log_repeats;	/* repeats of log_last not logged */
	atomic_int starting;		/* in web_start: hold messages */
	char start_msg[512];		/* the last one held (log_lock) */
	/* Open connections, for the header deadline (sweeper thread). */
	pthread_mutex_t sock_lock;
	struct web_sock *socks;		/* doubly linked, sock_lock */
	pthread_t sweeper;
	atomic_int sweeping;		/* 1 while the sweeper should run */
};

#define WEB_LOG_REPEAT_S 10.0

/*
 * A client has WEB_HEADER_DEADLINE_S from connecting (or from the end of
 * its previous request) to complete a request's headers; then its socket
 * is shut down.  libmicrohttpd's own timeout counts idle time only, so a
 * client sending a header line every few seconds was never timed out, and
 * 32 of them filled the per-address limit for good.
 */
#define WEB_HEADER_DEADLINE_S 10.0

struct web_sock {
	struct web_sock *prev, *next;
	int fd;
	int busy;			/* headers complete, request running */
	double since;			/* monotonic s: connected or idle */
};

/* Per-request state, kept in MHD's *con_cls until the request completes. */
struct web_conn {
	struct mbuf body;
	size_t total;			/* bytes received, kept or not */
	int too_large;			/* over API_BODY_MAX: stop keeping */
	const char *bad_field;		/* a header refused (framing), or NULL */
	const char *bad_msg;
	int started;			/* the first callback has run */
	struct timespec t0;
};

/* --- the fixed MIME table --- */

static const struct {
	const char *ext;
	const char *type;
} mime_table[] = {
	{".html", "text/html; charset=utf-8"},
	{".css", "text/css; charset=utf-8"},
	{".js", "text/javascript; charset=utf-8"},
	{".svg", "image/svg+xml"},
	{".png", "image/png"},
	{".ico", "image/x-icon"},
	{".txt", "text/plain; charset=utf-8"},
	{".json", "application/json"},
};

static const char *
mime_of(const char *path)
{
	const char *dot = strrchr(path, '.');

	if (dot == NULL || strchr(dot, '/') != NULL)
		return NULL;
	for (size_t i = 0; i < sizeof mime_table / sizeof mime_table[0]; i++)
		if (strcmp(dot, mime_table[i].ext) == 0)
			return mime_table[i].type;
	return NULL;
}

/* --- helpers --- */

static int
segment_ok(const char *s, size_t n)
{
	if (n == 0 || s[0] == '.')
		return 0;
	for (size_t i = 0; i < n; i++) {
		char c = s[i];

		if (!((c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') ||
		    (c >= '0' && c <= '9') || c == '.' || c == '_' || c == '-'))
			return 0;
	}
	return 1;
}

enum errcode
web_static_resolve(const char *root, const char *url_path, char *out,
    size_t outlen, const char **mime)
{
	char joined[PATH_MAX], canon[PATH_MAX];
	const char *rel, *p;
	size_t rootlen = strlen(root);
	struct stat st;
	int n;

	if (root[0] != '/' || url_path == NULL || url_path[0] != '/')
		return ERRCODE_NOT_FOUND;
	rel = strcmp(url_path, "/") == 0 ? "index.html" : url_path + 1;
	if (strlen(rel) > 200)
		return ERRCODE_NOT_FOUND;
	for (p = rel;;) {
		const char *slash = strchr(p, '/');
		size_t len = slash ? (size_t)(slash - p) : strlen(p);

		if (!segment_ok(p, len))
			return ERRCODE_NOT_FOUND;
		if (slash == NULL)
			break;
		p = slash + 1;
	}
	n = snprintf(joined, sizeof joined, "%s/%s", root, rel);
	if (n < 0 || (size_t)n >= sizeof joined)
		return ERRCODE_NOT_FOUND;
	/* Resolve symlinks; the result must still be inside root. */
	if (realpath(joined, canon) == NULL)
		return ERRCODE_NOT_FOUND;
	if (strncmp(canon, root, rootlen) != 0 || canon[rootlen] != '/')
		return ERRCODE_NOT_FOUND;
	if (stat(canon, &st) != 0 || !S_ISREG(st.st_mode))
		return ERRCODE_NOT_FOUND;
	if ((*mime = mime_of(canon)) == NULL)
		return ERRCODE_NOT_FOUND;
	if (strlen(canon) >= outlen)
		return ERRCODE_NOT_FOUND;
	strcpy(out, canon);
	return ERRCODE_OK;
}

int
web_is_loopback(const char *addr)
{
	struct in_addr a4;
	struct in6_addr a6;

	if (inet_pton(AF_INET, addr, &a4) == 1)
		return (ntohl(a4.s_addr) >> 24) == 127;
	if (inet_pton(AF_INET6, addr, &a6) == 1)
		return IN6_IS_ADDR_LOOPBACK(&a6);
	return 0;
}

enum errcode
web_parse_listen(const char *s, char *addr, size_t addrlen, unsigned *port,
    char *errbuf, size_t errlen)
{
	const char *colon, *a = s, *pstr;
	size_t alen;
	char tmp[64], *end;
	unsigned long p;
	struct in_addr a4;
	struct in6_addr a6;

	if (s == NULL || *s == '\0')
		goto bad;
	if (s[0] == '[') {
		const char *close = strchr(s, ']');

		if (close == NULL || close[1] != ':')
			goto bad;
		a = s + 1;
		alen = (size_t)(close - a);
		pstr = close + 2;
	} else {
		colon = strrchr(s, ':');
		if (colon == NULL || strchr(s, ':') != colon)
			goto bad;
		alen = (size_t)(colon - s);
		pstr = colon + 1;
	}
	if (alen == 0) {
		a = WEB_DEFAULT_ADDR;
		alen = strlen(a);
	}
	if (alen >= sizeof tmp || alen >= addrlen)
		goto bad;
	memcpy(tmp, a, alen);
	tmp[alen] = '\0';
	if (inet_pton(AF_INET, tmp, &a4) != 1 &&
	    inet_pton(AF_INET6, tmp, &a6) != 1) {
		snprintf(errbuf, errlen, "--listen '%s': '%s' is not a numeric "
		    "IPv4 or IPv6 address", s, tmp);
		return ERRCODE_BAD_ARG;
	}
	errno = 0;
	p = strtoul(pstr, &end, 10);
	if (*pstr == '\0' || *pstr == '-' || *end != '\0' || errno != 0 ||
	    p > 65535) {
		snprintf(errbuf, errlen, "--listen '%s': port must be a number "
		    "in 0..65535", s);
		return ERRCODE_BAD_ARG;
	}
	strcpy(addr, tmp);
	*port = (unsigned)p;
	return ERRCODE_OK;
bad:
	snprintf(errbuf, errlen, "--listen '%s': expected ADDR:PORT, "
	    "[IPV6]:PORT or :PORT", s ? s : "");
	return ERRCODE_BAD_ARG;
}

int
web_host_is_local(const char *host)
{
	char name[64];
	const char *end;
	size_t n;

	if (host == NULL || *host == '\0')
		return 0;
	if (host[0] == '[') {			/* [v6]:port */
		end = strchr(host, ']');
		if (end == NULL)
			return 0;
		n = (size_t)(end - host - 1);
		host++;
		end++;
	} else {
		end = strchr(host, ':');
		n = end ? (size_t)(end - host) : strlen(host);
		end = host + n;
	}
	if (*end != '\0' && (*end != ':' || end[1] == '\0' ||
	    strspn(end + 1, "0123456789") != strlen(end + 1)))
		return 0;
	if (n == 0 || n >= sizeof name)
		return 0;
	memcpy(name, host, n);
	name[n] = '\0';
	return strcasecmp(name, "localhost") == 0 || web_is_loopback(name);
}

/* --- responses --- */

/*
 * The policy of every response.  An SVG opened on its own is a document
 * under this policy too; the chart's fixed <style> block (render_cov.c)
 * would be refused, so SVG answers also allow inline style (never
 * script: default-src 'self' still holds).
 */
static const char *
csp_of(const char *ctype)
{
	if (ctype != NULL && strncmp(ctype, "image/svg+xml", 13) == 0)
		return "default-src 'self'; style-src 'self' 'unsafe-inline'";
	return "default-src 'self'";
}

static void
add_common_headers(struct MHD_Response *r, int api, const char *ctype)
{
	MHD_add_response_header(r, "Content-Security-Policy", csp_of(ctype));
	MHD_add_response_header(r, "X-Content-Type-Options", "nosniff");
	MHD_add_response_header(r, "Referrer-Policy", "no-referrer");
	MHD_add_response_header(r, "X-Frame-Options", "DENY");
	MHD_add_response_header(r, "Cache-Control",
	    api ? "no-store" : "no-cache");
}

static enum MHD_Result
send_response(struct MHD_Connection *conn, const struct api_response *ar,
    int api)
{
	struct MHD_Response *r;
	enum MHD_Result ret;

	r = MHD_create_response_from_buffer(ar->body.len,
	    ar->body.data ? ar->body.data : (char *)"", MHD_RESPMEM_MUST_COPY);
	if (r == NULL)
		return MHD_NO;
	MHD_add_response_header(r, "Content-Type", ar->content_type);
	add_common_headers(r, api, ar->content_type);
	if (ar->location[0] != '\0')
		MHD_add_response_header(r, "Location", ar->location);
	if (ar->allow[0] != '\0')
		MHD_add_response_header(r, "Allow", ar->allow);
	if (ar->status == 401)
		MHD_add_response_header(r, "WWW-Authenticate",
		    "Bearer realm=\"moonrange\"");
	ret = MHD_queue_response(conn, ar->status, r);
	MHD_destroy_response(r);
	return ret;
}

/* Read a static file into resp (200), or set a 404 JSON error. */
static void
serve_static(struct web_server *s, const char *url, struct api_response *ar)
{
	char path[PATH_MAX];
	const char *mime;
	FILE *f = NULL;
	struct stat st;
	char *buf = NULL;

	if (s->root[0] == '\0' ||
	    web_static_resolve(s->root, url, path, sizeof path, &mime) !=
	    ERRCODE_OK)
		goto notfound;
	if ((f = fopen(path, "rb")) == NULL || fstat(fileno(f), &st) != 0 ||
	    !S_ISREG(st.st_mode) || st.st_size > WEB_STATIC_MAX)
		goto notfound;
	buf = mem_alloc((size_t)st.st_size + 1);
	if (buf == NULL) {
		fclose(f);
		api_error(ar, ERRCODE_NOMEM, NULL, NULL);
		return;
	}
	if (fread(buf, 1, (size_t)st.st_size, f) != (size_t)st.st_size)
		goto notfound;
	mbuf_add(&ar->body, buf, (size_t)st.st_size);
	mem_free(buf);
	fclose(f);
	if (mbuf_status(&ar->body) != ERRCODE_OK) {
		api_error(ar, ERRCODE_NOMEM, NULL, NULL);
		return;
	}
	ar->status = 200;
	ar->content_type = mime;
	return;
notfound:
	mem_free(buf);
	if (f != NULL)
		fclose(f);
	api_error(ar, ERRCODE_NOT_FOUND, NULL, "no such page");
}

/* --- request collection --- */

static enum MHD_Result
collect_param(void *cls, enum MHD_ValueKind kind, const char *key,
    const char *value)
{
	struct api_request *req = cls;

	(void)kind;
	if (req->nparams == API_MAX_PARAMS) {
		req->params_overflow = 1;
		return MHD_NO;
	}
	req->params[req->nparams].key = key ? key : "";
	req->params[req->nparams].value = value ? value : "";
	req->nparams++;
	return MHD_YES;
}

static int
is_api_path(const char *url)
{
	return strcmp(url, "/api") == 0 || strncmp(url, "/api/", 5) == 0;
}

static double
ms_since(const struct timespec *t0)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)(t.tv_sec - t0->tv_sec) * 1e3 +
	    (double)(t.tv_nsec - t0->tv_nsec) / 1e6;
}

static double
mono_now(void)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)t.tv_sec + (double)t.tv_nsec / 1e9;
}

/* The socket record of a connection (set by on_connection), or NULL. */
static struct web_sock *
sock_of(struct MHD_Connection *conn)
{
	const union MHD_ConnectionInfo *ci = MHD_get_connection_info(conn,
	    MHD_CONNECTION_INFO_SOCKET_CONTEXT);

	return ci != NULL ? ci->socket_context : NULL;
}

/* Mark a connection's headers as complete (busy) or it idle again. */
static void
sock_mark(struct web_server *s, struct MHD_Connection *conn, int busy)
{
	struct web_sock *k = sock_of(conn);

	if (k == NULL)
		return;
	pthread_mutex_lock(&s->sock_lock);
	k->busy = busy;
	k->since = mono_now();
	pthread_mutex_unlock(&s->sock_lock);
}

/* Count the Host headers of a request (MHD_KeyValueIterator). */
static enum MHD_Result
count_host(void *cls, enum MHD_ValueKind kind, const char *key,
    const char *value)
{
	(void)kind;
	(void)value;
	if (strcasecmp(key, MHD_HTTP_HEADER_HOST) == 0)
		(*(int *)cls)++;
	return MHD_YES;
}

/*
 * Headers that make a request ambiguous (RFC 9112 3.2, 6.3): not exactly
 * one Host, or both Transfer-Encoding and Content-Length (a proxy in
 * front could read another body length than libmicrohttpd).  Sets
 * wc->bad_field and wc->bad_msg.
 */
static void
check_framing(struct MHD_Connection *conn, struct web_conn *wc)
{
	int hosts = 0;

	MHD_get_connection_values(conn, MHD_HEADER_KIND, count_host, &hosts);
	if (hosts > 1) {
		wc->bad_field = "Host";
		wc->bad_msg = "more than one Host header";
	} else if (MHD_lookup_connection_value(conn, MHD_HEADER_KIND,
	    MHD_HTTP_HEADER_TRANSFER_ENCODING) != NULL &&
	    MHD_lookup_connection_value(conn, MHD_HEADER_KIND,
	    MHD_HTTP_HEADER_CONTENT_LENGTH) != NULL) {
		wc->bad_field = "Content-Length";
		wc->bad_msg = "both Content-Length and Transfer-Encoding";
	}
}

static enum MHD_Result
on_request(void *cls, struct MHD_Connection *conn, const char *url,
    const char *method, const char *version, const char *upload_data,
    size_t *upload_data_size, void **con_cls)
{
	struct web_server *s = cls;
	struct web_conn *wc = *con_cls;
	struct api_request req;
	struct api_response ar;
	struct timespec now;
	enum MHD_Result ret;
	int api = is_api_path(url);

	(void)version;
	if (wc == NULL) {
		const char *cl;

		if ((wc = mem_calloc(1, sizeof *wc)) == NULL)
			return MHD_NO;
		mbuf_init(&wc->body);
		clock_gettime(CLOCK_MONOTONIC, &wc->t0);
		*con_cls = wc;
		sock_mark(s, conn, 1);	/* headers complete */
		atomic_fetch_add(&s->inflight, 1);
		/* A declared length over the cap is refused before reading,
		   and so is an ambiguous request. */
		cl = MHD_lookup_connection_value(conn, MHD_HEADER_KIND,
		    MHD_HTTP_HEADER_CONTENT_LENGTH);
		check_framing(conn, wc);
		if (wc->bad_msg != NULL)
			wc->too_large = 1;	/* keep none of the body */
		else if (cl != NULL && strtoull(cl, NULL, 10) > API_BODY_MAX)
			wc->too_large = 1;
		else
			return MHD_YES;
	}
	if (*upload_data_size != 0) {
		size_t n = *upload_data_size;

		wc->total += n;
		if (!wc->too_large && wc->total > API_BODY_MAX) {
			wc->too_large = 1;
			mbuf_free(&wc->body);
		}
		if (!wc->too_large)
			mbuf_add(&wc->body, upload_data, n);
		*upload_data_size = 0;
		return MHD_YES;
	}

	memset(&req, 0, sizeof req);
	req.method = method;
	req.path = url;
	MHD_get_connection_values(conn, MHD_GET_ARGUMENT_KIND, collect_param,
	    &req);
	req.authorization = MHD_lookup_connection_value(conn, MHD_HEADER_KIND,
	    MHD_HTTP_HEADER_AUTHORIZATION);
	req.content_type = MHD_lookup_connection_value(conn, MHD_HEADER_KIND,
	    MHD_HTTP_HEADER_CONTENT_TYPE);
	req.body = wc->body.data;
	req.body_len = wc->body.len;
	req.body_too_large = wc->too_large;
	clock_gettime(CLOCK_REALTIME, &now);
	if (tscale_from_posix((double)now.tv_sec + (double)now.tv_nsec / 1e9,
	    &req.now1, &req.now2) != ERRCODE_OK) {
		req.now1 = 2451545.0;	/* unreachable for a sane clock */
		req.now2 = 0.0;
	}
	if (wc->bad_msg != NULL) {
		api_response_init(&ar);
		api_error(&ar, ERRCODE_BAD_ARG, wc->bad_field, wc->bad_msg);
	} else if (mbuf_status(&wc->body) != ERRCODE_OK) {
		api_response_init(&ar);
		api_error(&ar, ERRCODE_NOMEM, NULL, NULL);
	} else if (s->loopback && !web_host_is_local(
	    MHD_lookup_connection_value(conn, MHD_HEADER_KIND,
	    MHD_HTTP_HEADER_HOST))) {
		/* A page of another site reaching us by a rebound name. */
		api_response_init(&ar);
		api_error(&ar, ERRCODE_BAD_ARG, "Host", "a daemon on loopback "
		    "answers only Host: localhost or a loopback address");
	} else if (api) {
		api_handle(s->ctx, &req, &ar);
	} else if (strcmp(method, "GET") == 0 || strcmp(method, "HEAD") == 0) {
		api_response_init(&ar);
		if (req.nparams > 0 || req.body_too_large)
			api_error(&ar, req.body_too_large ? ERRCODE_TOO_LARGE :
			    ERRCODE_BAD_ARG, NULL, "pages take no query or body");
		else
			serve_static(s, url, &ar);
	} else {
		api_response_init(&ar);
		api_error(&ar, ERRCODE_METHOD, NULL, "pages allow GET and HEAD");
		snprintf(ar.allow, sizeof ar.allow, "GET, HEAD");
	}
	ret = send_response(conn, &ar, api);
	if (ar.status >= 500)
		log_error("%s %s -> %u (%.1f ms)", method, url, ar.status,
		    ms_since(&wc->t0));
	else if (ar.status >= 400 || strcmp(method, "GET") != 0)
		log_info("%s %s -> %u (%.1f ms)", method, url, ar.status,
		    ms_since(&wc->t0));
	else
		log_debug("%s %s -> %u (%.1f ms)", method, url, ar.status,
		    ms_since(&wc->t0));
	api_response_free(&ar);
	return ret;
}

/*
 * libmicrohttpd's unescaping of the path and of query keys and values,
 * except that "%00" stays as those three characters: decoded, it would
 * end the C string there ("/api/v1/status%00.html" served /status).
 * Returns the new length.
 */
static size_t
unescape(void *cls, struct MHD_Connection *conn, char *s)
{
	char *w = s;

	(void)cls;
	(void)conn;
	for (const char *r = s; *r != '\0'; ) {
		if (r[0] == '%' && isxdigit((unsigned char)r[1]) &&
		    isxdigit((unsigned char)r[2]) && !(r[1] == '0' &&
		    r[2] == '0')) {
			char hex[3] = {r[1], r[2], '\0'};

			*w++ = (char)strtol(hex, NULL, 16);
			r += 3;
		} else {
			*w++ = *r++;
		}
	}
	*w = '\0';
	return (size_t)(w - s);
}

static void
on_connection(void *cls, struct MHD_Connection *conn, void **socket_context,
    enum MHD_ConnectionNotificationCode toe)
{
	struct web_server *s = cls;
	struct web_sock *k = *socket_context;
	const union MHD_ConnectionInfo *ci;

	if (toe == MHD_CONNECTION_NOTIFY_STARTED) {
		ci = MHD_get_connection_info(conn,
		    MHD_CONNECTION_INFO_CONNECTION_FD);
		if (ci == NULL || (k = mem_calloc(1, sizeof *k)) == NULL)
			return;
		k->fd = ci->connect_fd;
		k->since = mono_now();
		pthread_mutex_lock(&s->sock_lock);
		k->next = s->socks;
		if (s->socks != NULL)
			s->socks->prev = k;
		s->socks = k;
		pthread_mutex_unlock(&s->sock_lock);
		*socket_context = k;
	} else if (k != NULL) {
		pthread_mutex_lock(&s->sock_lock);
		if (k->prev != NULL)
			k->prev->next = k->next;
		else
			s->socks = k->next;
		if (k->next != NULL)
			k->next->prev = k->prev;
		pthread_mutex_unlock(&s->sock_lock);
		mem_free(k);
		*socket_context = NULL;
	}
}

/* Once a second: shut down the sockets past the header deadline. */
static void *
sweeper(void *arg)
{
	struct web_server *s = arg;
	struct timespec tick = {0, 250 * 1000 * 1000};

	while (atomic_load(&s->sweeping)) {
		double now = mono_now();

		pthread_mutex_lock(&s->sock_lock);
		for (struct web_sock *k = s->socks; k != NULL; k = k->next)
			if (!k->busy && now - k->since > WEB_HEADER_DEADLINE_S) {
				shutdown(k->fd, SHUT_RDWR);
				k->since = INFINITY;	/* once */
			}
		pthread_mutex_unlock(&s->sock_lock);
		nanosleep(&tick, NULL);
	}
	return NULL;
}

static void
on_completed(void *cls, struct MHD_Connection *conn, void **con_cls,
    enum MHD_RequestTerminationCode toe)
{
	struct web_server *s = cls;
	struct web_conn *wc = *con_cls;

	(void)toe;
	if (wc == NULL)
		return;
	sock_mark(s, conn, 0);	/* the next request's deadline starts */
	mbuf_free(&wc->body);
	mem_free(wc);
	*con_cls = NULL;
	atomic_fetch_sub(&s->inflight, 1);
}

/* Say how many repeats of the last message were not logged. */
static void
mhd_log_flush(struct web_server *s)
{
	unsigned long n;
	char last[sizeof s->log_last];

	pthread_mutex_lock(&s->log_lock);
	n = s->log_repeats;
	s->log_repeats = 0;
	memcpy(last, s->log_last, sizeof last);
	pthread_mutex_unlock(&s->log_lock);
	if (n > 0)
		log_warn("http: %s (%lu more times)", last, n);
}

/* libmicrohttpd's own messages, routed into the event log. */
static void mhd_logger(void *cls, const char *fmt, va_list ap)
    MEM_PRINTFLIKE(2, 0);

static void
mhd_logger(void *cls, const char *fmt, va_list ap)
{
	struct web_server *s = cls;
	struct timespec t;
	char msg[sizeof s->log_last], prev[sizeof s->log_last];
	unsigned long repeats;
	double now;
	size_t n;

	vsnprintf(msg, sizeof msg, fmt, ap);
	n = strlen(msg);
	while (n > 0 && (msg[n - 1] == '\n' || msg[n - 1] == '\r'))
		msg[--n] = '\0';
	if (atomic_load(&s->starting)) {
		/* Held: web_start logs it if the start succeeds. */
		pthread_mutex_lock(&s->log_lock);
		memcpy(s->start_msg, msg, n + 1);
		pthread_mutex_unlock(&s->log_lock);
		return;
	}
	clock_gettime(CLOCK_MONOTONIC, &t);
	now = (double)t.tv_sec + (double)t.tv_nsec / 1e9;
	pthread_mutex_lock(&s->log_lock);
	if (strcmp(msg, s->log_last) == 0 &&
	    now - s->log_last_s < WEB_LOG_REPEAT_S) {
		s->log_repeats++;
		pthread_mutex_unlock(&s->log_lock);
		return;
	}
	repeats = s->log_repeats;
	memcpy(prev, s->log_last, sizeof prev);
	memcpy(s->log_last, msg, n + 1);
	s->log_last_s = now;
	s->log_repeats = 0;
	pthread_mutex_unlock(&s->log_lock);
	if (repeats > 0)
		log_warn("http: %s (%lu more times)", prev, repeats);
	log_warn("http: %s", msg);
}

/* --- start and stop --- */

enum errcode
web_start(const struct web_config *cfg, struct api_ctx *ctx,
    struct web_server **out, char *errbuf, size_t errlen)
{
	struct web_server *s;
	struct sockaddr_in sa4;
	struct sockaddr_in6 sa6;
	struct sockaddr *sa;
	const union MHD_DaemonInfo *info;
	unsigned flags = MHD_USE_AUTO_INTERNAL_THREAD | MHD_USE_ITC |
	    MHD_USE_ERROR_LOG;
	const char *addr = cfg->addr ? cfg->addr : WEB_DEFAULT_ADDR;
	char msg[sizeof s->start_msg];

	*out = NULL;
	if ((s = mem_calloc(1, sizeof *s)) == NULL)
		return ERRCODE_NOMEM;
	s->ctx = ctx;
	atomic_init(&s->inflight, 0);
	atomic_init(&s->starting, 0);
	if (pthread_mutex_init(&s->log_lock, NULL) != 0) {
		mem_free(s);
		return ERRCODE_NOMEM;
	}
	if (pthread_mutex_init(&s->sock_lock, NULL) != 0) {
		pthread_mutex_destroy(&s->log_lock);
		mem_free(s);
		return ERRCODE_NOMEM;
	}
	if (cfg->web_dir != NULL) {
		struct stat st;

		if (realpath(cfg->web_dir, s->root) == NULL ||
		    stat(s->root, &st) != 0 || !S_ISDIR(st.st_mode)) {
			snprintf(errbuf, errlen, "--web '%s': not a directory",
			    cfg->web_dir);
			pthread_mutex_destroy(&s->log_lock);
			mem_free(s);
			return ERRCODE_IO;
		}
	}
	memset(&sa4, 0, sizeof sa4);
	memset(&sa6, 0, sizeof sa6);
	if (inet_pton(AF_INET, addr, &sa4.sin_addr) == 1) {
		sa4.sin_family = AF_INET;
		sa4.sin_port = htons((uint16_t)cfg->port);
		sa = (struct sockaddr *)&sa4;
	} else if (inet_pton(AF_INET6, addr, &sa6.sin6_addr) == 1) {
		sa6.sin6_family = AF_INET6;
		sa6.sin6_port = htons((uint16_t)cfg->port);
		sa = (struct sockaddr *)&sa6;
		flags |= MHD_USE_IPv6;
	} else {
		snprintf(errbuf, errlen, "'%s' is not a numeric address", addr);
		pthread_mutex_destroy(&s->log_lock);
		mem_free(s);
		return ERRCODE_BAD_ARG;
	}
	/* Set before the server's threads start: they read it. */
	s->loopback = web_is_loopback(addr);
	atomic_store(&s->starting, 1);
	s->d = MHD_start_daemon(flags, (uint16_t)cfg->port, NULL, NULL,
	    on_request, s,
	    MHD_OPTION_EXTERNAL_LOGGER, mhd_logger, s,
	    MHD_OPTION_SOCK_ADDR, sa,
	    MHD_OPTION_THREAD_POOL_SIZE,
	    (unsigned)(cfg->threads ? cfg->threads : 4),
	    MHD_OPTION_CONNECTION_LIMIT,
	    (unsigned)(cfg->connection_limit ? cfg->connection_limit : 64),
	    MHD_OPTION_PER_IP_CONNECTION_LIMIT,
	    (unsigned)(cfg->per_ip_limit ? cfg->per_ip_limit : 32),
	    MHD_OPTION_CONNECTION_TIMEOUT,
	    (unsigned)(cfg->timeout_s ? cfg->timeout_s : 15),
	    MHD_OPTION_CONNECTION_MEMORY_LIMIT,
	    (size_t)(cfg->memory_limit ? cfg->memory_limit :
	    WEB_CONNECTION_MEMORY),
	    MHD_OPTION_NOTIFY_COMPLETED, on_completed, s,
	    MHD_OPTION_UNESCAPE_CALLBACK, unescape, NULL,
	    MHD_OPTION_NOTIFY_CONNECTION, on_connection, s,
	    MHD_OPTION_END);
	if (s->d == NULL) {
		int e = errno;

		snprintf(errbuf, errlen, "cannot listen on %s port %u: %s",
		    addr, cfg->port, e ? strerror(e) :
		    "libmicrohttpd refused the options");
		pthread_mutex_destroy(&s->log_lock);
		mem_free(s);
		errno = e;
		return ERRCODE_IO;
	}
	atomic_store(&s->starting, 0);
	pthread_mutex_lock(&s->log_lock);
	memcpy(msg, s->start_msg, sizeof msg);
	pthread_mutex_unlock(&s->log_lock);
	if (msg[0] != '\0')
		log_warn("http: %s", msg);
	info = MHD_get_daemon_info(s->d, MHD_DAEMON_INFO_BIND_PORT);
	s->port = info != NULL ? info->port : cfg->port;
	atomic_store(&s->sweeping, 1);
	if (pthread_create(&s->sweeper, NULL, sweeper, s) != 0) {
		atomic_store(&s->sweeping, 0);
		log_warn("http: no header deadline (thread not started)");
	}
	*out = s;
	return ERRCODE_OK;
}

unsigned
web_port(const struct web_server *s)
{
	return s->port;
}

void
web_stop(struct web_server *s, double grace_s)
{
	struct timespec t0, tick = {0, 20 * 1000 * 1000};
	MHD_socket fd;

	if (s == NULL)
		return;
	fd = MHD_quiesce_daemon(s->d);
	if (fd != MHD_INVALID_SOCKET)
		close(fd);
	clock_gettime(CLOCK_MONOTONIC, &t0);
	while (atomic_load(&s->inflight) > 0 && ms_since(&t0) < grace_s * 1e3)
		nanosleep(&tick, NULL);
	if (atomic_load(&s->inflight) > 0)
		log_warn("stopping with %d request(s) still open",
		    atomic_load(&s->inflight));
	if (atomic_exchange(&s->sweeping, 0))
		pthread_join(s->sweeper, NULL);
	MHD_stop_daemon(s->d);
	mhd_log_flush(s);
	pthread_mutex_destroy(&s->sock_lock);
	pthread_mutex_destroy(&s->log_lock);
	mem_free(s);
}
