/* SPDX-License-Identifier: BSD-3-Clause */
/* cli.c: dispatch to a command or action of the table (cli_table.c), and
   the helpers the commands share (messages, exit statuses, output). */
#include <ctype.h>
#include <errno.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "core/text.h"
#include "core/tscale.h"

/* An unknown command or action word: say so, with the nearest. */
static int
unknown_word(const char *what, const char *path,
    const struct cli_command *table, const char *word)
{
	const char *near;
	size_t n = 0;
	char list[200];
	size_t len = 0;

	while (table[n].name != NULL)
		n++;
	near = cli_nearest(word, &table[0].name, n, sizeof table[0]);
	if (path == NULL)
		return near != NULL ? cli_usage_error("unknown command '%s'; "
		    "did you mean '%s'? (try 'moonrange --help')", word, near) :
		    cli_usage_error("unknown command '%s' (try 'moonrange "
		    "--help')", word);
	list[0] = '\0';
	for (size_t i = 0; i < n; i++)
		len += (size_t)snprintf(list + len, len < sizeof list ?
		    sizeof list - len : 0, "%s%s", i == 0 ? "" : i + 1 == n ?
		    " or " : ", ", table[i].name);
	if (near != NULL)
		return cli_usage_error("%s: unknown %s '%s'; did you mean "
		    "'%s'? (%s)", path, what, word, near, list);
	return cli_usage_error("%s: unknown %s '%s' (%s)", path, what, word,
	    list);
}

/* Run cmd (the word argv[0], at path) or one of its actions. */
static int
run_command(const struct cli_command *c, const char *path, int argc,
    char **argv)
{
	struct cli_args a;
	char sub[96];
	int st;

	if (c->actions != NULL) {
		const struct cli_command *act;
		char list[200];
		size_t len = 0;

		if (argc >= 2 && (strcmp(argv[1], "--help") == 0 ||
		    strcmp(argv[1], "-h") == 0)) {
			cli_help(stdout, c, path);
			return CLI_EXIT_OK;
		}
		if (argc < 2) {
			list[0] = '\0';
			for (size_t i = 0; c->actions[i].name != NULL; i++)
				len += (size_t)snprintf(list + len, len <
				    sizeof list ? sizeof list - len : 0,
				    "%s%s", i == 0 ? "" :
				    c->actions[i + 1].name == NULL ? " or " :
				    ", ", c->actions[i].name);
			return cli_usage_error("%s: an action is required: %s "
			    "(see 'moonrange %s --help')", path, list, path);
		}
		if ((act = cli_find(c->actions, argv[1])) == NULL)
			return unknown_word("action", path, c->actions,
			    argv[1]);
		snprintf(sub, sizeof sub, "%s %s", path, act->name);
		return run_command(act, sub, argc - 1, argv + 1);
	}
	if ((st = cli_args_parse(c, path, argc, argv, &a)) >= 0)
		return st;
	st = c->job != NULL ? cli_store_run(&a, c->db_flags, c->job, NULL) :
	    c->run(&a);
	cli_args_free(&a);
	return st;
}

int
cli_run(int argc, char **argv)
{
	const struct cli_command *c = cli_find(cli_commands, argv[0]);

	if (c == NULL)
		return unknown_word("command", NULL, cli_commands, argv[0]);
	return run_command(c, c->name, argc, argv);
}

/* "moonrange help [COMMAND [ACTION]]" */
static int
help_command(int argc, char **argv)
{
	const struct cli_command *c, *act;
	char path[96];

	if (argc < 1) {
		cli_help_main(stdout);
		return CLI_EXIT_OK;
	}
	if ((c = cli_find(cli_commands, argv[0])) == NULL)
		return unknown_word("command", NULL, cli_commands, argv[0]);
	if (argc >= 2 && c->actions != NULL) {
		if ((act = cli_find(c->actions, argv[1])) == NULL)
			return unknown_word("action", c->name, c->actions,
			    argv[1]);
		snprintf(path, sizeof path, "%s %s", c->name, act->name);
		cli_help(stdout, act, path);
		return CLI_EXIT_OK;
	}
	cli_help(stdout, c, c->name);
	return CLI_EXIT_OK;
}

int
cli_main(int argc, char **argv)
{
	if (argc < 2) {
		cli_help_main(stderr);
		return CLI_EXIT_USAGE;
	}
	if (strcmp(argv[1], "--help") == 0 || strcmp(argv[1], "-h") == 0)
		return help_command(0, NULL);
	if (strcmp(argv[1], "help") == 0)
		return help_command(argc - 2, argv + 2);
	if (strcmp(argv[1], "--man") == 0) {
		cli_man(stdout);
		return CLI_EXIT_OK;
	}
	if (strcmp(argv[1], "__complete") == 0)
		return cli_complete(argc - 2, argv + 2);
	if (strcmp(argv[1], "--version") == 0) {
		printf("moonrange %s\n", MOONRANGE_VERSION);
		return CLI_EXIT_OK;
	}
	return cli_run(argc - 1, argv + 1);
}

#define CLI_MSG_MAX 512	/* bytes of a message; longer ones end in "..." */

void
cli_vmessage(const char *kind, const char *fmt, va_list ap)
{
	char buf[CLI_MSG_MAX + 4];
	int n = vsnprintf(buf, CLI_MSG_MAX + 1, fmt, ap);
	size_t len, k;

	/* One line of text whatever the user typed: control bytes and
	   malformed UTF-8 become '?', an overlong message is cut. */
	len = n < 0 ? 0 : (size_t)n > CLI_MSG_MAX ? CLI_MSG_MAX : (size_t)n;
	buf[len] = '\0';
	for (size_t i = 0; i < len; i += k) {
		unsigned char c = (unsigned char)buf[i];

		k = 1;
		if (c < 0x20 || c == 0x7F)
			buf[i] = '?';
		else if (c >= 0x80 && (k = text_utf8_seq((unsigned char *)buf +
		    i, len - i)) == 0) {
			buf[i] = '?';
			k = 1;
		}
	}
	if (n > CLI_MSG_MAX)
		memcpy(buf + len, "...", 4);
	fprintf(stderr, "moonrange: %s: %s\n", kind, buf);
}


int
cli_usage_error(const char *fmt, ...)
{
	va_list ap;

	va_start(ap, fmt);
	cli_vmessage("error", fmt, ap);
	va_end(ap);
	return CLI_EXIT_USAGE;
}

int
cli_fail(const char *fmt, ...)
{
	va_list ap;

	va_start(ap, fmt);
	cli_vmessage("error", fmt, ap);
	va_end(ap);
	return CLI_EXIT_FAIL;
}

void
cli_warn(const char *fmt, ...)
{
	va_list ap;

	va_start(ap, fmt);
	cli_vmessage("warning", fmt, ap);
	va_end(ap);
}

int
cli_status_of(enum errcode rc)
{
	if (rc == ERRCODE_OK)
		return CLI_EXIT_OK;
	return errcode_is_internal(rc) ? CLI_EXIT_FAIL : CLI_EXIT_USAGE;
}

enum errcode
cli_parse_double(const char *s, double min, double max, double *out)
{
	/* The command line has always taken plain decimals only. */
	if (s == NULL || strpbrk(s, "eE") != NULL)
		return ERRCODE_BAD_ARG;
	return text_parse_real(s, min, max, out);
}

enum errcode
cli_parse_long(const char *s, long min, long max, long *out)
{
	return text_parse_long(s, min, max, out);
}

enum errcode
cli_parse_station(const char *s, double *lat, double *lon, double *h,
    char *errbuf, size_t errlen)
{
	char tmp[128], *f[3];
	int n;

	if (s == NULL || strlen(s) >= sizeof tmp) {
		snprintf(errbuf, errlen, "--station: expected LAT,LON,HEIGHT_M");
		return ERRCODE_BAD_ARG;
	}
	strcpy(tmp, s);
	n = cli_split_fields(tmp, f, 3);
	if (n != 3) {
		snprintf(errbuf, errlen,
		    "--station '%s': expected LAT,LON,HEIGHT_M", s);
		return ERRCODE_BAD_ARG;
	}
	if (cli_parse_double(f[0], -90, 90, lat)) {
		snprintf(errbuf, errlen,
		    "--station: latitude '%s' is not a number in -90..90", f[0]);
		return ERRCODE_BAD_ARG;
	}
	if (cli_parse_double(f[1], -180, 360, lon)) {
		snprintf(errbuf, errlen,
		    "--station: longitude '%s' is not a number in -180..360",
		    f[1]);
		return ERRCODE_BAD_ARG;
	}
	if (cli_parse_double(f[2], -500, 10000, h)) {
		snprintf(errbuf, errlen,
		    "--station: height '%s' is not a number of metres in "
		    "-500..10000", f[2]);
		return ERRCODE_BAD_ARG;
	}
	return ERRCODE_OK;
}

int
cli_split_fields(char *s, char **fields, int max)
{
	int n = 0;

	for (;;) {
		char *comma = strchr(s, ',');

		if (n == max)
			return -1;
		fields[n++] = s;
		if (comma == NULL)
			break;
		*comma = '\0';
		s = comma + 1;
	}
	for (int i = 0; i < n; i++)
		if (*fields[i] == '\0')
			return -1;
	return n;
}

void
cli_now(double *utc1, double *utc2)
{
	struct timespec ts;

	clock_gettime(CLOCK_REALTIME, &ts);
	(void)tscale_from_posix((double)ts.tv_sec + (double)ts.tv_nsec / 1e9, utc1,
	    utc2);
}

enum errcode
cli_parse_time(const char *opt, const char *s, double *utc1, double *utc2)
{
	char err[160];
	enum errcode rc;

	if (s != NULL && strcmp(s, "now") == 0) {
		cli_now(utc1, utc2);
		return ERRCODE_OK;
	}
	rc = tscale_parse_utc(s, utc1, utc2, err, sizeof err);
	if (rc != ERRCODE_OK)
		cli_usage_error("%s: %s", opt, err);
	return rc;
}

int
cli_emit(struct mbuf *b)
{
	if (mbuf_status(b) != ERRCODE_OK)
		return cli_fail("%s", errcode_str(ERRCODE_NOMEM));
	if (b->len > 0 && fwrite(b->data, 1, b->len, stdout) != b->len)
		return cli_fail("cannot write output");
	if (fflush(stdout) != 0)
		return cli_fail("cannot write output");
	return CLI_EXIT_OK;
}

int
cli_query_next(const struct cli_args *a, const char *names,
    struct cli_qparam *q)
{
	char opt[sizeof q->name];

	while (names[q->pos] != '\0') {
		size_t n = strcspn(names + q->pos, ",");

		snprintf(q->name, sizeof q->name, "%.*s", (int)n,
		    names + q->pos);
		q->pos += n + (names[q->pos + n] == ',');
		memcpy(opt, q->name, sizeof opt);
		for (char *c = opt; *c; c++)
			if (*c == '_')
				*c = '-';
		if ((q->value = cli_text(a, opt, NULL)) != NULL)
			return 1;
	}
	return 0;
}

int
cli_finish(enum errcode rc, struct mbuf *b, const char *fmt, ...)
{
	va_list ap;
	int st;

	if (rc == ERRCODE_OK) {
		st = cli_emit(b);
	} else {
		va_start(ap, fmt);
		cli_vmessage("error", fmt, ap);
		va_end(ap);
		st = cli_status_of(rc);
	}
	mbuf_free(b);
	return st;
}

int
cli_emit_rendered(enum errcode rc, struct mbuf *b)
{
	if (rc != ERRCODE_OK)
		return cli_fail("%s", errcode_str(rc));
	return cli_emit(b);
}
