/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_demo.c: "moonrange demo", a sample-site database in the data directory, served. */
#include <errno.h>
#include <fcntl.h>
#include <limits.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"

/* mkdir -p with mode 0700 for the parts it creates. */
static int
make_dirs(const char *path)
{
	char tmp[PATH_MAX];
	size_t n = strlen(path);

	if (n == 0 || n >= sizeof tmp)
		return -1;
	memcpy(tmp, path, n + 1);
	for (char *p = tmp + 1; *p; p++) {
		if (*p != '/')
			continue;
		*p = '\0';
		if (mkdir(tmp, 0700) != 0 && errno != EEXIST)
			return -1;
		*p = '/';
	}
	if (mkdir(tmp, 0700) != 0 && errno != EEXIST)
		return -1;
	return 0;
}

static int
default_data_dir(char *buf, size_t len)
{
	const char *x = getenv("XDG_DATA_HOME"), *home = getenv("HOME");
	int n;

	if (x != NULL && x[0] == '/')
		n = snprintf(buf, len, "%s/moonrange", x);
	else if (home != NULL && home[0] == '/')
		n = snprintf(buf, len, "%s/.local/share/moonrange", home);
	else
		return cli_usage_error("demo: neither XDG_DATA_HOME nor HOME "
		    "is an absolute path; give --data-dir");
	if (n < 0 || (size_t)n >= len)
		return cli_usage_error("demo: data directory path too long");
	return CLI_EXIT_OK;
}

/* A new token file of 48 hex digits from the kernel's random source. */
static int
make_token(const char *path)
{
	unsigned char raw[24];
	char hex[sizeof raw * 2 + 2];
	FILE *r;
	int fd;
	size_t n;

	if ((r = fopen("/dev/urandom", "rb")) == NULL)
		return cli_fail("/dev/urandom: %s", strerror(errno));
	n = fread(raw, 1, sizeof raw, r);
	fclose(r);
	if (n != sizeof raw)
		return cli_fail("/dev/urandom: short read");
	for (size_t i = 0; i < sizeof raw; i++)
		snprintf(hex + 2 * i, 3, "%02x", raw[i]);
	hex[2 * sizeof raw] = '\n';
	hex[2 * sizeof raw + 1] = '\0';
	fd = open(path, O_WRONLY | O_CREAT | O_EXCL, 0600);
	if (fd < 0)
		return cli_fail("%s: %s", path, strerror(errno));
	if (write(fd, hex, strlen(hex)) != (ssize_t)strlen(hex)) {
		close(fd);
		unlink(path);
		return cli_fail("%s: cannot write", path);
	}
	close(fd);
	return CLI_EXIT_OK;
}

int
cmd_demo(const struct cli_args *a)
{
	char dir[PATH_MAX - 32], db[PATH_MAX], token[PATH_MAX];
	char *sargv[16];
	const char *data_dir = cli_text(a, "data-dir", NULL);
	const char *listen = cli_text(a, "listen", NULL);
	const char *web = cli_text(a, "web", NULL);
	const char *refresh = cli_text(a, "refresh", NULL);
	int st, n = 0;
	struct stat sb;

	if (data_dir != NULL) {
		if (strlen(data_dir) >= sizeof dir)
			return cli_usage_error("--data-dir: path too long");
		strcpy(dir, data_dir);
	} else if ((st = default_data_dir(dir, sizeof dir)) != CLI_EXIT_OK) {
		return st;
	}
	if (make_dirs(dir) != 0)
		return cli_fail("--data-dir '%s': %s", dir, strerror(errno));
	snprintf(db, sizeof db, "%s/demo.db", dir);
	snprintf(token, sizeof token, "%s/token", dir);

	if (stat(db, &sb) != 0) {
		/* init's default site directory is the sample site. */
		char *iargv[] = {"init", "--db", db, NULL};

		printf("moonrange: creating %s from the sample site\n", db);
		fflush(stdout);
		st = cli_run(3, iargv);
		if (st != CLI_EXIT_OK)
			return st;
	}
	if (stat(token, &sb) != 0) {
		if ((st = make_token(token)) != CLI_EXIT_OK)
			return st;
		printf("moonrange: created write token %s (mode 0600)\n", token);
	}
	printf("moonrange: database %s\nmoonrange: token file %s\n", db, token);
	fflush(stdout);

	sargv[n++] = "serve";
	sargv[n++] = "--db";
	sargv[n++] = db;
	sargv[n++] = "--token-file";
	sargv[n++] = token;
	if (listen) {
		sargv[n++] = "--listen";
		sargv[n++] = (char *)listen;
	}
	if (web) {
		sargv[n++] = "--web";
		sargv[n++] = (char *)web;
	}
	if (refresh) {
		sargv[n++] = "--refresh";
		sargv[n++] = (char *)refresh;
	}
	sargv[n] = NULL;
	return cli_run(n, sargv);
}
