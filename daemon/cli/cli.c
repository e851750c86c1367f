/* SPDX-License-Identifier: BSD-3-Clause */
/* cli.c: subcommand table, dispatch and shared option helpers. */
#include <ctype.h>
#include <errno.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "cli/cli.h"
#include "core/tscale.h"

const struct cli_command cli_commands[] = {
	{"ephem", "positions of the Moon, the Sun and each target at an instant",
	    cmd_ephem},
	{"phases", "new moon, quarters and full moon in a time span",
	    cmd_phases},
	{"windows", "observing windows in a span, ranked by yield and phase "
	    "coverage", cmd_windows},
	{"tonight", "the coming night: ranked windows, best target now",
	    cmd_tonight},
	{"coverage", "how the normal points spread over the lunar cycle",
	    cmd_coverage},
	{"init", "create a station database from a site directory",
	    cmd_init},
	{"station", "show or change the stored station", cmd_station},
	{"target", "the lunar targets: add, list, set, retire", cmd_target},
	{"blackout", "spans without ranging: add, list, remove", cmd_blackout},
	{"setting", "settings of the planner and the audit", cmd_setting},
	{"log", "the observation log: add, list, import, export attempts",
	    cmd_log},
	{"np", "normal points: import CRD files, count them", cmd_np},
	{"eop", "the Earth orientation table: import IERS files", cmd_eop},
	{"serve", "run the daemon: JSON API and station page over HTTP",
	    cmd_serve},
	{"demo", "create a demo database from sample-site/ and serve it",
	    cmd_demo},
	{NULL, NULL, NULL}
};

static void
print_usage(FILE *f)
{
	fprintf(f,
	    "usage: moonrange COMMAND [OPTIONS]\n"
	    "\n"
	    "Planning aid for lunar laser ranging. Commands:\n");
	for (const struct cli_command *c = cli_commands; c->name; c++)
		fprintf(f, "  %-10s %s\n", c->name, c->summary);
	fprintf(f,
	    "\n"
	    "Run 'moonrange COMMAND --help' for the options of a command.\n"
	    "Times are UTC in ISO 8601, e.g. 2027-03-01T04:00:00Z.\n"
	    "moonrange is a planning aid only: it never replaces the station's\n"
	    "laser-safety programme, aircraft and satellite avoidance or sun\n"
	    "interlocks.\n");
}

int
cli_main(int argc, char **argv)
{
	if (argc < 2) {
		print_usage(stderr);
		return CLI_EXIT_USAGE;
	}
	if (strcmp(argv[1], "--help") == 0 || strcmp(argv[1], "-h") == 0 ||
	    strcmp(argv[1], "help") == 0) {
		print_usage(stdout);
		return CLI_EXIT_OK;
	}
	if (strcmp(argv[1], "--version") == 0) {
		printf("moonrange %s\n", MOONRANGE_VERSION);
		return CLI_EXIT_OK;
	}
	for (const struct cli_command *c = cli_commands; c->name; c++)
		if (strcmp(argv[1], c->name) == 0)
			return c->run(argc - 1, argv + 1);
	return cli_usage_error("unknown command '%s' (try 'moonrange --help')",
	    argv[1]);
}

#define CLI_MSG_MAX 512	/* bytes of a message; longer ones end in "..." */

/* Length of a well-formed UTF-8 sequence at p (lead and continuation
   bytes only; 0 if malformed). */
static size_t
utf8_len(const unsigned char *p)
{
	size_t n = *p >= 0xF0 && *p <= 0xF4 ? 4 : *p >= 0xE0 ? 3 :
	    *p >= 0xC2 ? 2 : 0;

	if (*p >= 0xF5)
		return 0;
	for (size_t i = 1; i < n; i++)
		if ((p[i] & 0xC0) != 0x80)
			return 0;
	return n;
}

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
		else if (c >= 0x80 && ((k = utf8_len((unsigned char *)buf +
		    i)) == 0 || i + k > len)) {
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
	switch (rc) {
	case ERRCODE_OK:
		return CLI_EXIT_OK;
	case ERRCODE_BAD_ARG:
	case ERRCODE_BAD_TIME:
	case ERRCODE_CONFIG:
	case ERRCODE_NOT_FOUND:
	case ERRCODE_EXISTS:
	case ERRCODE_TOO_LARGE:
	case ERRCODE_UNSUPPORTED:
	case ERRCODE_AUTH:
	case ERRCODE_METHOD:
		return CLI_EXIT_USAGE;
	case ERRCODE_NOMEM:
	case ERRCODE_DB:
	case ERRCODE_IO:
	case ERRCODE_NO_CONVERGE:
	case ERRCODE__LAST:
		break;
	}
	return CLI_EXIT_FAIL;
}

/* Plain decimal: [+-]digits[.digits] or [+-].digits, nothing else (no
   spaces, hex, exponent, inf or nan, which strtod would take). */
static int
plain_decimal(const char *s)
{
	int digits = 0;

	if (*s == '+' || *s == '-')
		s++;
	for (; isdigit((unsigned char)*s); s++)
		digits++;
	if (*s == '.')
		for (s++; isdigit((unsigned char)*s); s++)
			digits++;
	return digits > 0 && *s == '\0';
}

enum errcode
cli_parse_double(const char *s, double min, double max, double *out)
{
	char *end;
	double v;

	if (s == NULL || *s == '\0' || !plain_decimal(s))
		return ERRCODE_BAD_ARG;
	errno = 0;
	v = strtod(s, &end);
	if (errno != 0 || *end != '\0' || end == s || !isfinite(v) ||
	    v < min || v > max)
		return ERRCODE_BAD_ARG;
	*out = v;
	return ERRCODE_OK;
}

enum errcode
cli_parse_long(const char *s, long min, long max, long *out)
{
	char *end;
	long v;

	if (s == NULL || *s == '\0')
		return ERRCODE_BAD_ARG;
	errno = 0;
	v = strtol(s, &end, 10);
	if (errno != 0 || *end != '\0' || end == s || v < min || v > max)
		return ERRCODE_BAD_ARG;
	*out = v;
	return ERRCODE_OK;
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
cli_bad_option(const char *cmd, const char *action, const char *opt)
{
	return cli_usage_error("%s%s%s: unknown or incomplete option '%s' (see "
	    "'moonrange %s --help')", cmd, action ? " " : "",
	    action ? action : "", opt, cmd);
}

int
cli_extra_argument(const char *cmd, const char *action, const char *arg)
{
	return cli_usage_error("%s%s%s: unexpected argument '%s'", cmd,
	    action ? " " : "", action ? action : "", arg);
}

int
cli_emit_rendered(enum errcode rc, struct mbuf *b)
{
	if (rc != ERRCODE_OK)
		return cli_fail("%s", errcode_str(rc));
	return cli_emit(b);
}
