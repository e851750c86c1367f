/* SPDX-License-Identifier: BSD-3-Clause */
/* http_client.h: a minimal HTTP/1.1 client for tests, talking to 127.0.0.1 only. */
#ifndef MOONRANGE_TEST_HTTP_CLIENT_H
#define MOONRANGE_TEST_HTTP_CLIENT_H

#include <arpa/inet.h>
#include <netinet/in.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <sys/socket.h>
#include <sys/time.h>
#include <unistd.h>

/*
 * One request per connection ("Connection: close"), the whole answer read
 * until the server closes.  head holds the status line and headers, body
 * the rest (NUL-terminated, malloc'ed).  Returns the status or -1.
 */
struct http_reply {
	int status;
	char head[8192];
	char *body;
	size_t body_len;
};

static inline void
http_reply_free(struct http_reply *r)
{
	free(r->body);
	r->body = NULL;
}

/* Value of header name in r->head (case-insensitive), copied to buf. */
static inline const char *
http_header(const struct http_reply *r, const char *name, char *buf,
    size_t len)
{
	size_t n = strlen(name);

	for (const char *p = strstr(r->head, "\r\n"); p != NULL;
	    p = strstr(p + 2, "\r\n")) {
		const char *line = p + 2, *end;
		size_t vl;

		if (strncasecmp(line, name, n) != 0 || line[n] != ':')
			continue;
		line += n + 1;
		while (*line == ' ')
			line++;
		end = strstr(line, "\r\n");
		vl = end ? (size_t)(end - line) : strlen(line);
		if (vl >= len)
			vl = len - 1;
		memcpy(buf, line, vl);
		buf[vl] = '\0';
		return buf;
	}
	return NULL;
}

static inline int
http_send_all(int fd, const char *p, size_t n)
{
	while (n > 0) {
		ssize_t k = send(fd, p, n, MSG_NOSIGNAL);

		if (k <= 0)
			return -1;
		p += k;
		n -= (size_t)k;
	}
	return 0;
}

/*
 * Send raw bytes (a whole request) to 127.0.0.1:port and read the answer.
 * A server refusing a large body may answer and close before all is
 * sent: that is fine.
 */
static inline int
http_raw(unsigned port, const char *raw, size_t raw_len, struct http_reply *r)
{
	struct sockaddr_in sa;
	struct timeval tv = {20, 0};
	char *buf = NULL, *sep;
	size_t len = 0, cap = 0;
	int fd;

	memset(r, 0, sizeof *r);
	r->status = -1;
	if ((fd = socket(AF_INET, SOCK_STREAM, 0)) < 0)
		return -1;
	setsockopt(fd, SOL_SOCKET, SO_RCVTIMEO, &tv, sizeof tv);
	memset(&sa, 0, sizeof sa);
	sa.sin_family = AF_INET;
	sa.sin_port = htons((unsigned short)port);
	sa.sin_addr.s_addr = htonl(INADDR_LOOPBACK);
	if (connect(fd, (struct sockaddr *)&sa, sizeof sa) != 0)
		goto out;
	(void)http_send_all(fd, raw, raw_len);
	for (;;) {
		ssize_t k;

		if (cap - len < 4096) {
			char *nb = realloc(buf, cap + 65536);

			if (nb == NULL)
				goto out;
			buf = nb;
			cap += 65536;
		}
		k = recv(fd, buf + len, cap - len - 1, 0);
		if (k <= 0)
			break;
		len += (size_t)k;
	}
	if (buf == NULL)
		goto out;
	buf[len] = '\0';
	sep = strstr(buf, "\r\n\r\n");
	if (sep == NULL || (size_t)(sep - buf) >= sizeof r->head)
		goto out;
	memcpy(r->head, buf, (size_t)(sep - buf) + 2);
	r->head[sep - buf + 2] = '\0';
	r->body_len = len - (size_t)(sep + 4 - buf);
	r->body = malloc(r->body_len + 1);
	if (r->body == NULL)
		goto out;
	memcpy(r->body, sep + 4, r->body_len);
	r->body[r->body_len] = '\0';
	if (sscanf(buf, "HTTP/1.%*d %d", &r->status) != 1)
		r->status = -1;
out:
	free(buf);
	close(fd);
	return r->status;
}

/*
 * Send method path with extra header lines (each ending "\r\n", may be
 * NULL) and a body (may be NULL, then no Content-Length is sent).
 */
static inline int
http_request(unsigned port, const char *method, const char *path,
    const char *headers, const char *body, size_t body_len,
    struct http_reply *r)
{
	char head[4096], *req;
	size_t n;
	int k, st;

	k = snprintf(head, sizeof head, "%s %s HTTP/1.1\r\nHost: 127.0.0.1:%u"
	    "\r\nConnection: close\r\n%s", method, path, port,
	    headers ? headers : "");
	if (body != NULL)
		k += snprintf(head + k, sizeof head - (size_t)k,
		    "Content-Length: %zu\r\n", body_len);
	k += snprintf(head + k, sizeof head - (size_t)k, "\r\n");
	n = (size_t)k + (body ? body_len : 0);
	if ((req = malloc(n)) == NULL)
		return -1;
	memcpy(req, head, (size_t)k);
	if (body != NULL)
		memcpy(req + k, body, body_len);
	st = http_raw(port, req, n, r);
	free(req);
	return st;
}

#endif
