/* SPDX-License-Identifier: BSD-3-Clause */
/* test_web.c: static-file path rules, the listen-address parser and the
   libmicrohttpd message log of web.c. */
#define _XOPEN_SOURCE 700	/* realpath, mkdtemp, symlink */
#include <limits.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#include <cmocka.h>

#include "http_client.h"
#include "http/log.h"
#include "http/web.h"

static char tmp[PATH_MAX];	/* canonical temp dir: root/ and outside */
static char root[PATH_MAX + 8];

static void
write_file(const char *path, const char *text)
{
	FILE *f = fopen(path, "w");

	assert_non_null(f);
	fputs(text, f);
	fclose(f);
}

static int
setup(void **state)
{
	char t[] = "/tmp/moonrange-web-XXXXXX", p[PATH_MAX + 64];

	(void)state;
	if (mkdtemp(t) == NULL || realpath(t, tmp) == NULL)
		return -1;
	snprintf(root, sizeof root, "%s/www", tmp);
	if (mkdir(root, 0700) != 0)
		return -1;
	snprintf(p, sizeof p, "%s/index.html", root);
	write_file(p, "<html></html>");
	snprintf(p, sizeof p, "%s/style.css", root);
	write_file(p, "body{}");
	snprintf(p, sizeof p, "%s/data.bin", root);
	write_file(p, "x");
	snprintf(p, sizeof p, "%s/secret.txt", tmp);
	write_file(p, "outside");
	snprintf(p, sizeof p, "%s/img", root);
	mkdir(p, 0700);
	/* A link inside root that points outside it, and one that stays. */
	snprintf(p, sizeof p, "%s/escape.txt", root);
	if (symlink("../secret.txt", p) != 0)
		return -1;
	snprintf(p, sizeof p, "%s/img/inside.css", root);
	if (symlink("../style.css", p) != 0)
		return -1;
	return 0;
}

static int
teardown(void **state)
{
	char cmd[PATH_MAX + 32];

	(void)state;
	snprintf(cmd, sizeof cmd, "rm -rf '%s'", tmp);
	return system(cmd) == 0 ? 0 : -1;
}

static void
test_web_static_resolve(void **state)
{
	static const char *refused[] = {
		"/../secret.txt", "/escape.txt", "/img/../../secret.txt",
		"/img/..", "/.", "/./index.html", "//index.html", "/index.html/",
		"/data.bin", "/img", "/missing.css", "index.html", "",
		"/a b.css", "/%2e%2e/secret.txt",
	};
	char out[PATH_MAX], want[PATH_MAX + 32];
	const char *mime = NULL;

	(void)state;
	assert_int_equal(web_static_resolve(root, "/", out, sizeof out, &mime),
	    ERRCODE_OK);
	snprintf(want, sizeof want, "%s/index.html", root);
	assert_string_equal(out, want);
	assert_string_equal(mime, "text/html; charset=utf-8");
	assert_int_equal(web_static_resolve(root, "/img/inside.css", out,
	    sizeof out, &mime), ERRCODE_OK);
	assert_string_equal(mime, "text/css; charset=utf-8");
	for (size_t i = 0; i < sizeof refused / sizeof refused[0]; i++)
		if (web_static_resolve(root, refused[i], out, sizeof out,
		    &mime) != ERRCODE_NOT_FOUND)
			fail_msg("'%s' was not refused", refused[i]);
}

static void
test_web_parse_listen(void **state)
{
	static const struct {
		const char *in;
		enum errcode rc;
		const char *addr;
		unsigned port;
	} cases[] = {
		{"127.0.0.1:8470", ERRCODE_OK, "127.0.0.1", 8470},
		{":0", ERRCODE_OK, "127.0.0.1", 0},
		{"[::1]:9000", ERRCODE_OK, "::1", 9000},
		{"0.0.0.0:80", ERRCODE_OK, "0.0.0.0", 80},
		{"localhost:80", ERRCODE_BAD_ARG, NULL, 0},
		{"127.0.0.1", ERRCODE_BAD_ARG, NULL, 0},
		{"127.0.0.1:65536", ERRCODE_BAD_ARG, NULL, 0},
		{"127.0.0.1:-1", ERRCODE_BAD_ARG, NULL, 0},
		{"127.0.0.1:80x", ERRCODE_BAD_ARG, NULL, 0},
		{"::1:80", ERRCODE_BAD_ARG, NULL, 0},
		{"", ERRCODE_BAD_ARG, NULL, 0},
	};
	char addr[64], err[200];
	unsigned port;

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		enum errcode rc = web_parse_listen(cases[i].in, addr,
		    sizeof addr, &port, err, sizeof err);

		if (rc != cases[i].rc)
			fail_msg("'%s': got %d", cases[i].in, rc);
		if (rc == ERRCODE_OK) {
			assert_string_equal(addr, cases[i].addr);
			assert_int_equal(port, cases[i].port);
		} else {
			assert_non_null(strstr(err, "--listen"));
		}
	}
}

static void
test_web_is_loopback(void **state)
{
	(void)state;
	assert_true(web_is_loopback("127.0.0.1"));
	assert_true(web_is_loopback("127.8.9.10"));
	assert_true(web_is_loopback("::1"));
	assert_false(web_is_loopback("0.0.0.0"));
	assert_false(web_is_loopback("::"));
	assert_false(web_is_loopback("192.168.1.1"));
	assert_false(web_is_loopback("128.0.0.1"));
	assert_false(web_is_loopback("localhost"));
}

static void
test_web_host_is_local(void **state)
{
	static const char *yes[] = {"127.0.0.1:8470", "127.0.0.1", "localhost",
	    "LOCALHOST:80", "[::1]:8470", "[::1]", "127.9.9.9:1"};
	static const char *no[] = {"evil.example", "evil.example:8470",
	    "localhost.evil.example", "10.0.0.1:8470", "127.0.0.1:", "[::1",
	    "127.0.0.1:80x", "", "[::2]:80", "localhost:80:90"};

	(void)state;
	for (size_t i = 0; i < sizeof yes / sizeof yes[0]; i++)
		if (!web_host_is_local(yes[i]))
			fail_msg("'%s' refused", yes[i]);
	for (size_t i = 0; i < sizeof no / sizeof no[0]; i++)
		if (web_host_is_local(no[i]))
			fail_msg("'%s' accepted", no[i]);
	assert_false(web_host_is_local(NULL));
}

/* A storm of refused requests (here: request lines too long for the
   connection's memory, 414): libmicrohttpd says so once, and the repeats
   are counted in one more line, not logged one by one. */
static void
test_web_log_repeats_counted(void **state)
{
	struct api_config cfg;
	struct web_config wc;
	struct web_server *srv = NULL;
	struct api_ctx *ctx;
	struct http_reply r;
	size_t len = 200 * 1024;
	char err[200], line[1024], *raw = malloc(len + 64);
	FILE *logf = tmpfile();
	int seen = 0, counted = 0;

	(void)state;
	assert_non_null(logf);
	assert_non_null(raw);
	memcpy(raw, "GET /", 5);
	memset(raw + 5, 'a', len);
	strcpy(raw + 5 + len, " HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n");
	log_init(LOG_LEVEL_INFO, logf);
	memset(&cfg, 0, sizeof cfg);
	ctx = api_new(&cfg);
	assert_non_null(ctx);
	memset(&wc, 0, sizeof wc);
	wc.addr = "127.0.0.1";
	assert_int_equal(web_start(&wc, ctx, &srv, err, sizeof err),
	    ERRCODE_OK);
	for (int i = 0; i < 30; i++) {
		http_raw(web_port(srv), raw, strlen(raw), &r);
		assert_int_equal(r.status, 414);
		http_reply_free(&r);
	}
	web_stop(srv, 1.0);
	api_free(ctx);
	log_init(LOG_LEVEL_INFO, NULL);
	rewind(logf);
	while (fgets(line, sizeof line, logf) != NULL) {
		if (strstr(line, "414") == NULL)
			continue;
		seen++;
		counted += strstr(line, " more times)") != NULL;
	}
	fclose(logf);
	free(raw);
	/* The first refusal, then one line counting the other 29 (or two
	   of each on a machine slower than WEB_LOG_REPEAT_S for 30). */
	assert_in_range(seen, 2, 4);
	assert_in_range(counted, 1, 2);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_web_static_resolve),
		cmocka_unit_test(test_web_parse_listen),
		cmocka_unit_test(test_web_is_loopback),
		cmocka_unit_test(test_web_host_is_local),
		cmocka_unit_test(test_web_log_repeats_counted),
	};

	return cmocka_run_group_tests(tests, setup, teardown);
}
