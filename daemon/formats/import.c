/* SPDX-License-Identifier: BSD-3-Clause */
/* import.c: parsers for the station file, CSV tables, CRD normal points
   and IERS Earth-orientation files, reading from memory buffers. */
#include <ctype.h>
#include <errno.h>
#include <limits.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>
#include <ini.h>

#include "core/geom.h"
#include "formats/import.h"
#include "core/mem.h"
#include "core/tscale.h"

/*
 * Nothing here allocates: records are assembled in fixed buffers on the
 * stack (bounded by IMPORT_CSV_MAX_RECORD and the line limits below) and
 * libinih, as Debian builds it, reads lines into a stack buffer.
 */

#define LINE_MAX_CRD 512	/* a CRD record line, bytes */
#define LINE_MAX_EOP 512	/* an IERS line, bytes */

/* ------------------------------------------------------------------ */
/* reports                                                             */
/* ------------------------------------------------------------------ */

void
import_report_init(struct import_report *rep)
{
	memset(rep, 0, sizeof *rep);
}

static void rep_error(struct import_report *rep, size_t line,
    const char *field, const char *fmt, ...) MEM_PRINTFLIKE(4, 5);

/* Keep one error (the first IMPORT_MAX_ERRORS are kept). */
static void
rep_error(struct import_report *rep, size_t line, const char *field,
    const char *fmt, ...)
{
	struct import_error *e;
	va_list ap;

	if (rep->nerrors >= IMPORT_MAX_ERRORS)
		return;
	e = &rep->errors[rep->nerrors++];
	e->line = line;
	snprintf(e->field, sizeof e->field, "%s", field ? field : "");
	va_start(ap, fmt);
	vsnprintf(e->message, sizeof e->message, fmt, ap);
	va_end(ap);
}

void
import_error_format(const struct import_report *rep, size_t i,
    const char *file, char *buf, size_t len)
{
	const struct import_error *e;
	char where[64];

	if (len == 0)
		return;
	if (rep == NULL || i >= rep->nerrors) {
		snprintf(buf, len, "%s: no such error", file ? file : "input");
		return;
	}
	e = &rep->errors[i];
	if (e->line > 0)
		snprintf(where, sizeof where, ":%zu", e->line);
	else
		where[0] = '\0';
	if (e->field[0] != '\0')
		snprintf(buf, len, "%s%s: field '%s': %s", file ? file : "input",
		    where, e->field, e->message);
	else
		snprintf(buf, len, "%s%s: %s", file ? file : "input", where,
		    e->message);
}

/* The final status of a parse. */
static enum errcode
rep_status(const struct import_report *rep)
{
	return rep->bad > 0 ? ERRCODE_BAD_ARG : ERRCODE_OK;
}

/* ------------------------------------------------------------------ */
/* text checks                                                         */
/* ------------------------------------------------------------------ */

/*
 * Length of the UTF-8 sequence at p (1..4), or 0 if it is not valid
 * UTF-8 (overlong forms, surrogates and code points above U+10FFFF are
 * invalid, RFC 3629).
 */
static size_t
utf8_seq(const unsigned char *p, size_t avail)
{
	unsigned c = p[0];
	size_t n;
	unsigned lo = 0x80, hi = 0xBF;

	if (c < 0x80)
		return 1;
	if (c >= 0xC2 && c <= 0xDF)
		n = 2;
	else if (c >= 0xE0 && c <= 0xEF)
		n = 3;
	else if (c >= 0xF0 && c <= 0xF4)
		n = 4;
	else
		return 0;
	if (avail < n)
		return 0;
	if (c == 0xE0)
		lo = 0xA0;
	else if (c == 0xED)
		hi = 0x9F;
	else if (c == 0xF0)
		lo = 0x90;
	else if (c == 0xF4)
		hi = 0x8F;
	if (p[1] < lo || p[1] > hi)
		return 0;
	for (size_t i = 2; i < n; i++)
		if (p[i] < 0x80 || p[i] > 0xBF)
			return 0;
	return n;
}

/*
 * The whole buffer must be text: no NUL byte, valid UTF-8.  On failure
 * one error names the line and column and ERRCODE_IO is returned; no
 * record has been handed on.
 */
static enum errcode
check_text(const char *buf, size_t len, struct import_report *rep)
{
	const unsigned char *p = (const unsigned char *)buf;
	size_t line = 1, col = 1, n;

	if (buf == NULL && len > 0)
		return ERRCODE_BAD_ARG;
	for (size_t i = 0; i < len; i += n, col++) {
		if (p[i] == '\0') {
			rep_error(rep, line, "", "NUL byte at column %zu: "
			    "this is not a text file", col);
			rep->bad++;
			return ERRCODE_IO;
		}
		if ((n = utf8_seq(p + i, len - i)) == 0) {
			rep_error(rep, line, "", "invalid UTF-8 byte 0x%02X at "
			    "column %zu: the file must be UTF-8 text", p[i],
			    col);
			rep->bad++;
			return ERRCODE_IO;
		}
		if (p[i] == '\n') {
			line++;
			col = 0;
		}
	}
	return ERRCODE_OK;
}

/* Skip a UTF-8 byte-order mark. */
static size_t
bom_len(const char *buf, size_t len)
{
	return (len >= 3 && memcmp(buf, "\xEF\xBB\xBF", 3) == 0) ? 3 : 0;
}

/* ------------------------------------------------------------------ */
/* values                                                              */
/* ------------------------------------------------------------------ */

/* Copy s without leading and trailing blanks into out (size cap). */
static const char *
trim(const char *s, char *out, size_t cap)
{
	size_t n;

	while (*s == ' ' || *s == '\t')
		s++;
	n = strlen(s);
	while (n > 0 && (s[n - 1] == ' ' || s[n - 1] == '\t'))
		n--;
	if (n >= cap)
		n = cap - 1;
	memcpy(out, s, n);
	out[n] = '\0';
	return out;
}

/*
 * A strict decimal number: [+-]digits[.digits][(e|E)[+-]digits], with at
 * least one digit before or after the point; no hex, inf or nan (which
 * strtod would take).  Returns 0 and sets *v, or -1.
 */
static int
parse_real(const char *s, double *v)
{
	const char *p = s;
	char *end;
	int digits = 0;

	if (*p == '+' || *p == '-')
		p++;
	while (isdigit((unsigned char)*p)) {
		p++;
		digits++;
	}
	if (*p == '.') {
		p++;
		while (isdigit((unsigned char)*p)) {
			p++;
			digits++;
		}
	}
	if (digits == 0)
		return -1;
	if (*p == 'e' || *p == 'E') {
		p++;
		if (*p == '+' || *p == '-')
			p++;
		if (!isdigit((unsigned char)*p))
			return -1;
		while (isdigit((unsigned char)*p))
			p++;
	}
	if (*p != '\0')
		return -1;
	errno = 0;
	*v = strtod(s, &end);
	if (end != p || errno == ERANGE || !isfinite(*v))
		return -1;
	return 0;
}

enum count_status { COUNT_OK = 0, COUNT_NOT_INT, COUNT_NEGATIVE,
    COUNT_TOO_BIG };

/* A non-negative whole number of at most LONG_MAX. */
static enum count_status
parse_count(const char *s, long *v)
{
	const char *p = s;
	long n = 0;

	if (*p == '+')
		p++;
	else if (*p == '-') {
		int any = 0;

		for (p++; isdigit((unsigned char)*p); p++)
			any = 1;
		return (any && *p == '\0') ? COUNT_NEGATIVE : COUNT_NOT_INT;
	}
	if (!isdigit((unsigned char)*p))
		return COUNT_NOT_INT;
	for (; isdigit((unsigned char)*p); p++) {
		int d = *p - '0';

		if (n > (LONG_MAX - d) / 10)
			return COUNT_TOO_BIG;
		n = n * 10 + d;
	}
	if (*p != '\0')
		return COUNT_NOT_INT;
	*v = n;
	return COUNT_OK;
}

/* A whole number (possibly negative) in [min, max]. */
static int
parse_int(const char *s, long min, long max, long *v)
{
	char *end;
	long n;

	if (!(isdigit((unsigned char)*s) || ((*s == '-' || *s == '+') &&
	    isdigit((unsigned char)s[1]))))
		return -1;
	errno = 0;
	n = strtol(s, &end, 10);
	if (*end != '\0' || errno == ERANGE || n < min || n > max)
		return -1;
	*v = n;
	return 0;
}

/* 1..maxlen characters of [A-Za-z0-9_.-] (the target id rule), or of
   [A-Za-z0-9_-] when dot is 0. */
static int
valid_ident(const char *s, size_t maxlen, int dot)
{
	size_t n = strlen(s);

	if (n == 0 || n > maxlen)
		return 0;
	for (size_t i = 0; i < n; i++)
		if (!isalnum((unsigned char)s[i]) && s[i] != '_' &&
		    s[i] != '-' && !(dot && s[i] == '.'))
			return 0;
	return 1;
}

/* Valid UTF-8 without control characters (tab and newline too, unless
   multiline).  Files were checked whole; command-line values and
   "station set" are checked here. */
static int
valid_text(const char *s, int multiline)
{
	const unsigned char *p = (const unsigned char *)s;
	size_t len = strlen(s), n;

	for (size_t i = 0; i < len; i += n) {
		unsigned char c = p[i];

		if ((n = utf8_seq(p + i, len - i)) == 0 || c == 0x7F)
			return 0;
		if (c < 0x20 && !(multiline && (c == '\n' || c == '\t' ||
		    c == '\r')))
			return 0;
	}
	return 1;
}

int
import_text_ok(const char *s, int multiline)
{
	return s != NULL && valid_text(s, multiline);
}

/* Compare ASCII text ignoring case (locale-free). */
static int
strcasecmp_ascii(const char *a, const char *b)
{
	for (; *a && *b; a++, b++) {
		int x = tolower((unsigned char)*a), y = tolower(
		    (unsigned char)*b);

		if (x != y)
			return x - y;
	}
	return (unsigned char)*a - (unsigned char)*b;
}

/* Boolean column: 0/1, true/false, yes/no (any case). */
static int
parse_bool(const char *s, int *v)
{
	static const char *const yes[] = { "1", "true", "yes" };
	static const char *const no[] = { "0", "false", "no" };

	for (size_t i = 0; i < sizeof yes / sizeof yes[0]; i++) {
		if (strcasecmp_ascii(s, yes[i]) == 0) {
			*v = 1;
			return 0;
		}
		if (strcasecmp_ascii(s, no[i]) == 0) {
			*v = 0;
			return 0;
		}
	}
	return -1;
}

/* UTC MJD of an ISO 8601 text. */
static enum errcode
parse_utc_mjd(const char *s, double *mjd, char *err, size_t errlen)
{
	double u1, u2;
	enum errcode rc;

	if ((rc = tscale_parse_utc(s, &u1, &u2, err, errlen)) != ERRCODE_OK)
		return rc;
	*mjd = (u1 - ERFA_DJM0) + u2;
	return ERRCODE_OK;
}

/* ------------------------------------------------------------------ */
/* station file                                                        */
/* ------------------------------------------------------------------ */

#define KEY(sec, nm, ty, lo, hi, req, dflt, hlp) \
	{ sec, nm, ty, lo, hi, req, dflt, hlp }

static const struct import_key station_keys[] = {
	KEY("station", "name", IMPORT_KEY_TEXT, 0, SITE_NAME_LEN - 1, 1, NAN,
	    "station name shown to people"),
	KEY("station", "code", IMPORT_KEY_CODE, 0, 10, 1, NAN,
	    "station code, as in the H2 record of its CRD files"),
	KEY("station", "lat_deg", IMPORT_KEY_REAL, -90, 90, 1, NAN,
	    "WGS84 geodetic latitude, degrees, north positive"),
	KEY("station", "lon_deg", IMPORT_KEY_REAL, -180, 180, 1, NAN,
	    "longitude, degrees, east positive"),
	KEY("station", "height_m", IMPORT_KEY_REAL, -500, 10000, 1, NAN,
	    "height above the WGS84 ellipsoid, metres"),
	KEY("station", "time_zone", IMPORT_KEY_TZ, 0, SITE_TZ_LEN - 1, 1, NAN,
	    "IANA time zone of the local-time columns, e.g. America/Denver"),
	KEY("limits", "min_elevation_deg", IMPORT_KEY_REAL, 0, 89, 0, 20.0,
	    "lowest target elevation to plan, degrees"),
	KEY("limits", "max_sun_elevation_deg", IMPORT_KEY_REAL, -90, 90, 0,
	    -12.0, "highest Sun elevation at the station, degrees "
	    "(90 = daylight ranging allowed)"),
	KEY("limits", "min_sun_separation_deg", IMPORT_KEY_REAL, 0, 180, 0,
	    30.0, "smallest Sun-Moon angle seen from the station, degrees"),
	KEY("weather", "pressure_hpa", IMPORT_KEY_REAL, 300, 1100, 0, NAN,
	    "typical air pressure, hPa (default: standard atmosphere at "
	    "height_m)"),
	KEY("weather", "temperature_c", IMPORT_KEY_REAL, -60, 50, 0, NAN,
	    "typical night temperature, deg C (default: 15 C less 6.5 C per "
	    "km of height_m)"),
	KEY("weather", "humidity", IMPORT_KEY_REAL, 0, 1, 0, 0.5,
	    "typical relative humidity, 0..1"),
	KEY("laser", "wavelength_nm", IMPORT_KEY_REAL, 300, 2000, 0, 532.0,
	    "laser wavelength, nanometres"),
	KEY("laser", "zenith_tau", IMPORT_KEY_REAL, 0, 3, 0, 0.15,
	    "zenith optical depth at the laser wavelength (one way)"),
	KEY("laser", "fire_rate_hz", IMPORT_KEY_REAL, 0.1, 100000, 0, 10.0,
	    "shots per second"),
};

#define NKEYS (sizeof station_keys / sizeof station_keys[0])

const struct import_key *
import_station_keys(size_t *n)
{
	*n = NKEYS;
	return station_keys;
}

/* Where key k lives in a station: a text buffer or a double. */
static char *
key_text(struct site_station *st, size_t k, size_t *cap)
{
	const char *nm = station_keys[k].name;

	if (strcmp(nm, "name") == 0) {
		*cap = sizeof st->name;
		return st->name;
	}
	if (strcmp(nm, "code") == 0) {
		*cap = sizeof st->code;
		return st->code;
	}
	if (strcmp(nm, "time_zone") == 0) {
		*cap = sizeof st->time_zone;
		return st->time_zone;
	}
	return NULL;
}

static double *
key_real(struct site_station *st, size_t k)
{
	static const struct {
		const char *name;
		size_t off;
	} map[] = {
		{ "lat_deg", offsetof(struct site_station, lat_deg) },
		{ "lon_deg", offsetof(struct site_station, lon_deg) },
		{ "height_m", offsetof(struct site_station, height_m) },
		{ "min_elevation_deg", offsetof(struct site_station,
		    min_el_deg) },
		{ "max_sun_elevation_deg", offsetof(struct site_station,
		    max_sun_el_deg) },
		{ "min_sun_separation_deg", offsetof(struct site_station,
		    min_sun_sep_deg) },
		{ "pressure_hpa", offsetof(struct site_station,
		    pressure_hpa) },
		{ "temperature_c", offsetof(struct site_station,
		    temperature_c) },
		{ "humidity", offsetof(struct site_station, humidity) },
		{ "wavelength_nm", offsetof(struct site_station,
		    wavelength_nm) },
		{ "zenith_tau", offsetof(struct site_station, zenith_tau) },
		{ "fire_rate_hz", offsetof(struct site_station,
		    fire_rate_hz) },
	};

	for (size_t i = 0; i < sizeof map / sizeof map[0]; i++)
		if (strcmp(map[i].name, station_keys[k].name) == 0)
			return (double *)(void *)((char *)st + map[i].off);
	return NULL;
}

static const char *
key_type_name(enum import_key_type t)
{
	switch (t) {
	case IMPORT_KEY_TEXT:
		return "text";
	case IMPORT_KEY_CODE:
		return "code";
	case IMPORT_KEY_TZ:
		return "time zone";
	case IMPORT_KEY_REAL:
		return "number";
	}
	return "text";
}

void
import_station_keys_doc(struct mbuf *out)
{
	mbuf_puts(out, "| Key | Type and range | Default | Meaning |\n"
	    "|---|---|---|---|\n");
	for (size_t k = 0; k < NKEYS; k++) {
		const struct import_key *key = &station_keys[k];

		mbuf_printf(out, "| `[%s] %s` | %s", key->section, key->name,
		    key_type_name(key->type));
		if (key->type == IMPORT_KEY_REAL)
			mbuf_printf(out, ", %g to %g", key->min, key->max);
		else if (key->type == IMPORT_KEY_CODE)
			mbuf_printf(out, ", 1-%.0f of A-Z a-z 0-9 _ -",
			    key->max);
		else
			mbuf_printf(out, ", at most %.0f bytes", key->max);
		if (key->required)
			mbuf_puts(out, " | required");
		else if (isnan(key->def))
			mbuf_puts(out, " | derived");
		else
			mbuf_printf(out, " | %g", key->def);
		mbuf_printf(out, " | %s |\n", key->help);
	}
}

void
import_station_defaults(struct site_station *st)
{
	memset(st, 0, sizeof *st);
	for (size_t k = 0; k < NKEYS; k++) {
		double *d = key_real(st, k);

		if (d != NULL)
			*d = station_keys[k].def;
	}
}

void
import_station_finish(struct site_station *st)
{
	struct geom_weather wx;

	if (!isfinite(st->height_m))
		return;
	geom_weather_standard(st->height_m, &wx);
	if (isnan(st->pressure_hpa))
		st->pressure_hpa = wx.pressure_hpa;
	if (isnan(st->temperature_c))
		st->temperature_c = wx.temperature_c;
}

static int
valid_tz(const char *s, size_t maxlen)
{
	size_t n = strlen(s);

	if (n == 0 || n > maxlen || s[0] == '/' || s[n - 1] == '/' ||
	    strstr(s, "..") != NULL || strstr(s, "//") != NULL)
		return 0;
	for (size_t i = 0; i < n; i++)
		if (!isalnum((unsigned char)s[i]) && strchr("_+-/", s[i]) ==
		    NULL)
			return 0;
	return 1;
}

static size_t
key_find(const char *section, const char *name)
{
	for (size_t k = 0; k < NKEYS; k++)
		if (strcmp(station_keys[k].section, section) == 0 &&
		    strcmp(station_keys[k].name, name) == 0)
			return k;
	return NKEYS;
}

/* Validate and store one value of key k; a sentence in err on failure. */
static enum errcode
key_set(struct site_station *st, size_t k, const char *raw, char *err,
    size_t errlen)
{
	const struct import_key *key = &station_keys[k];
	char v[256];
	double d;
	size_t cap;
	char *dst;

	if (strlen(raw) >= sizeof v) {
		snprintf(err, errlen, "value longer than %zu bytes",
		    sizeof v - 1);
		return ERRCODE_BAD_ARG;
	}
	trim(raw, v, sizeof v);
	switch (key->type) {
	case IMPORT_KEY_TEXT:
	case IMPORT_KEY_CODE:
	case IMPORT_KEY_TZ:
		if (v[0] == '\0') {
			snprintf(err, errlen, "empty value");
			return ERRCODE_BAD_ARG;
		}
		if (strlen(v) > (size_t)key->max) {
			snprintf(err, errlen, "longer than %.0f bytes",
			    key->max);
			return ERRCODE_BAD_ARG;
		}
		if (key->type == IMPORT_KEY_TEXT && !valid_text(v, 0)) {
			snprintf(err, errlen, "not UTF-8 text, or control "
			    "characters in it");
			return ERRCODE_BAD_ARG;
		}
		if (key->type == IMPORT_KEY_CODE &&
		    !valid_ident(v, (size_t)key->max, 0)) {
			snprintf(err, errlen, "'%.40s' is not 1-%.0f letters, "
			    "digits, '_' or '-'", v, key->max);
			return ERRCODE_BAD_ARG;
		}
		if (key->type == IMPORT_KEY_TZ &&
		    !valid_tz(v, (size_t)key->max)) {
			snprintf(err, errlen, "'%.40s' is not an IANA time "
			    "zone name such as Europe/Madrid", v);
			return ERRCODE_BAD_ARG;
		}
		cap = 0;
		dst = key_text(st, k, &cap);
		if (dst == NULL || strlen(v) >= cap) {
			snprintf(err, errlen, "no room for the value");
			return ERRCODE_BAD_ARG;
		}
		memcpy(dst, v, strlen(v) + 1);
		return ERRCODE_OK;
	case IMPORT_KEY_REAL:
		if (parse_real(v, &d) != 0) {
			snprintf(err, errlen, "'%.40s' is not a number", v);
			return ERRCODE_BAD_ARG;
		}
		if (d < key->min || d > key->max) {
			snprintf(err, errlen, "%g is out of range %g..%g", d,
			    key->min, key->max);
			return ERRCODE_BAD_ARG;
		}
		*key_real(st, k) = d;
		return ERRCODE_OK;
	}
	snprintf(err, errlen, "unknown key type");
	return ERRCODE_BAD_ARG;
}

enum errcode
import_station_set(struct site_station *st, const char *section,
    const char *name, const char *value, char *errbuf, size_t errlen)
{
	char tmp[160];
	size_t k = key_find(section ? section : "", name ? name : "");
	enum errcode rc;

	if (k == NKEYS) {
		if (errbuf != NULL && errlen > 0)
			snprintf(errbuf, errlen, "unknown station key '%.40s.%.40s'",
			    section ? section : "", name ? name : "");
		return ERRCODE_NOT_FOUND;
	}
	rc = key_set(st, k, value ? value : "", tmp, sizeof tmp);
	if (rc != ERRCODE_OK && errbuf != NULL && errlen > 0)
		snprintf(errbuf, errlen, "%s.%s: %s", section, name, tmp);
	return rc;
}

/*
 * The INI parse.  libinih (Debian's build: no line number in the
 * handler) reads through ini_parse_stream with our own line reader,
 * which counts lines and checks each one, so that every error carries
 * its line.  The reader is called once per line before the handler sees
 * that line's pair, so cur_line is the line being handled.
 */
struct ini_state {
	const char *p, *end;
	size_t cur_line;		/* line last returned */
	int cur_indented;		/* it started with a blank */
	int cur_handled;		/* the handler saw it */
	char cur_kind;			/* ' ' blank/comment, '[' section,
					   '=' pair, '?' other */
	char cur_text[64];		/* start of the line, for messages */
	struct site_station *st;
	struct import_report *rep;
	size_t seen[NKEYS];		/* line where each key was given */
};

static void
ini_check_previous(struct ini_state *s)
{
	if (s->cur_line == 0 || s->cur_handled)
		return;
	if (s->cur_kind == '?' || s->cur_kind == '=') {
		rep_error(s->rep, s->cur_line, "", "not a [section] or "
		    "name = value line: '%s'", s->cur_text);
		s->rep->bad++;
	}
}

static char *
station_read_line(char *str, int num, void *stream)
{
	struct ini_state *s = stream;
	const char *nl, *q;
	size_t n, keep, cap = num > 3 ? (size_t)num - 3 : 0;

	ini_check_previous(s);
	if (s->p >= s->end)
		return NULL;
	nl = memchr(s->p, '\n', (size_t)(s->end - s->p));
	n = nl ? (size_t)(nl - s->p) : (size_t)(s->end - s->p);
	s->cur_line++;
	s->cur_handled = 0;
	s->cur_indented = (n > 0 && (s->p[0] == ' ' || s->p[0] == '\t'));
	keep = n;
	if (keep > 0 && s->p[keep - 1] == '\r')
		keep--;
	if (keep > cap) {
		rep_error(s->rep, s->cur_line, "", "line longer than %zu bytes",
		    cap);
		s->rep->bad++;
		keep = 0;	/* hand an empty line on */
	}
	memcpy(str, s->p, keep);
	str[keep] = '\n';
	str[keep + 1] = '\0';
	/* classify for the syntax check */
	q = str;
	while (*q == ' ' || *q == '\t')
		q++;
	if (*q == '\n' || *q == ';' || *q == '#')
		s->cur_kind = ' ';
	else if (*q == '[')
		s->cur_kind = strchr(q, ']') ? '[' : '?';
	else if (strchr(q, '=') || strchr(q, ':'))
		s->cur_kind = '=';
	else
		s->cur_kind = '?';
	trim(str, s->cur_text, sizeof s->cur_text);
	s->cur_text[strcspn(s->cur_text, "\r\n")] = '\0';
	s->p += nl ? n + 1 : n;
	return str;
}

static int
station_pair(void *user, const char *section, const char *name,
    const char *value)
{
	struct ini_state *s = user;
	char field[32], err[160];
	size_t k;

	s->cur_handled = 1;
	snprintf(field, sizeof field, "%s.%s", section, name);
	if (s->cur_indented) {
		rep_error(s->rep, s->cur_line, field, "continuation lines are "
		    "not allowed (an indented line continues the key above)");
		s->rep->bad++;
		return 1;
	}
	k = key_find(section, name);
	if (k == NKEYS) {
		if (section[0] == '\0')
			rep_error(s->rep, s->cur_line, name, "key outside any "
			    "[section]");
		else
			rep_error(s->rep, s->cur_line, field, "unknown key "
			    "'%s' in section [%s]", name, section);
		s->rep->bad++;
		return 1;
	}
	if (s->seen[k] != 0) {
		rep_error(s->rep, s->cur_line, field, "given twice (first on "
		    "line %zu)", s->seen[k]);
		s->rep->bad++;
		return 1;
	}
	s->seen[k] = s->cur_line;
	if (key_set(s->st, k, value, err, sizeof err) != ERRCODE_OK) {
		rep_error(s->rep, s->cur_line, field, "%s", err);
		s->rep->bad++;
		return 1;
	}
	s->rep->records++;
	return 1;
}

enum errcode
import_station_ini(const char *buf, size_t len, struct site_station *st,
    struct import_report *rep)
{
	struct ini_state s;
	enum errcode rc;
	int r;

	import_report_init(rep);
	if ((rc = check_text(buf, len, rep)) != ERRCODE_OK)
		return rc;
	memset(&s, 0, sizeof s);
	s.p = buf + bom_len(buf, len);
	s.end = buf + len;
	s.st = st;
	s.rep = rep;
	import_station_defaults(st);
	r = ini_parse_stream(station_read_line, &s, station_pair, &s);
	ini_check_previous(&s);
	if (r < 0) {
		rep_error(rep, 0, "", "the INI reader failed (%d)", r);
		return ERRCODE_NOMEM;
	}
	if (r > 0 && rep->bad == 0) {
		/* inih found an error our line check did not */
		rep_error(rep, (size_t)r, "", "malformed line");
		rep->bad++;
	}
	for (size_t k = 0; k < NKEYS; k++) {
		char field[32];

		if (!station_keys[k].required || s.seen[k] != 0)
			continue;
		snprintf(field, sizeof field, "%s.%s", station_keys[k].section,
		    station_keys[k].name);
		rep_error(rep, 0, field, "required key missing from [%s]",
		    station_keys[k].section);
		rep->bad++;
	}
	import_station_finish(st);
	return rep_status(rep);
}

/* ------------------------------------------------------------------ */
/* CSV (RFC 4180)                                                      */
/* ------------------------------------------------------------------ */

#define CSV_STR2(x) #x
#define CSV_STR(x) CSV_STR2(x)

struct csv {
	const char *p, *end;
	size_t line;			/* current physical line */
	size_t rec_line;		/* first line of the last record */
	size_t nf;
	char *f[IMPORT_CSV_MAX_FIELDS];
	char store[IMPORT_CSV_MAX_RECORD + IMPORT_CSV_MAX_FIELDS];
	size_t used;
	char err[160];
	size_t err_col;			/* 0-based field of the error */
};

/* Skip to just past the end of the current physical line. */
static void
csv_skip_line(struct csv *c)
{
	const char *nl = memchr(c->p, '\n', (size_t)(c->end - c->p));

	if (nl == NULL) {
		c->p = c->end;
	} else {
		c->p = nl + 1;
		c->line++;
	}
}

static int
csv_fail(struct csv *c, const char *msg)
{
	snprintf(c->err, sizeof c->err, "%s", msg);
	c->err_col = c->nf;
	csv_skip_line(c);
	return -1;
}

/* Append one byte to the current field (the record store is bounded). */
static int
csv_put(struct csv *c, char ch)
{
	if (c->used + 1 >= sizeof c->store - 1)
		return -1;
	c->store[c->used++] = ch;
	return 0;
}

static int
csv_begin_field(struct csv *c)
{
	if (c->nf >= IMPORT_CSV_MAX_FIELDS)
		return -1;
	c->f[c->nf] = c->store + c->used;
	return 0;
}

/* Fields hold no NUL (check_text), so the terminator ends each one. */
static int
csv_end_field(struct csv *c)
{
	if (c->used >= sizeof c->store)
		return -1;
	c->store[c->used++] = '\0';
	c->nf++;
	return 0;
}

/*
 * Read one record.  Returns 1 with the fields in c->f, 0 at the end of
 * the buffer, -1 for a malformed record (message in c->err; the rest of
 * its physical line is skipped).  Empty lines are skipped.
 */
static int
csv_next(struct csv *c)
{
	static const char too_long[] = "record longer than "
	    CSV_STR(IMPORT_CSV_MAX_RECORD) " bytes or "
	    CSV_STR(IMPORT_CSV_MAX_FIELDS) " fields";

	c->nf = 0;
	c->used = 0;
	c->err[0] = '\0';
	/* empty lines */
	while (c->p < c->end && (*c->p == '\n' || (*c->p == '\r' &&
	    c->p + 1 < c->end && c->p[1] == '\n'))) {
		c->p += (*c->p == '\r') ? 2 : 1;
		c->line++;
	}
	if (c->p >= c->end)
		return 0;
	c->rec_line = c->line;
	for (;;) {
		if (csv_begin_field(c) != 0)
			return csv_fail(c, too_long);
		if (c->p < c->end && *c->p == '"') {
			size_t open_line = c->line;

			c->p++;
			for (;;) {
				if (c->p >= c->end) {
					snprintf(c->err, sizeof c->err,
					    "quoted field opened on line %zu "
					    "never closes (truncated file?)",
					    open_line);
					c->err_col = c->nf;
					return -1;
				}
				if (*c->p == '"') {
					if (c->p + 1 < c->end &&
					    c->p[1] == '"') {
						if (csv_put(c, '"') != 0)
							return csv_fail(c,
							    too_long);
						c->p += 2;
						continue;
					}
					c->p++;
					break;
				}
				if (*c->p == '\n')
					c->line++;
				if (csv_put(c, *c->p++) != 0)
					return csv_fail(c, too_long);
			}
			if (c->p < c->end && *c->p != ',' && *c->p != '\n' &&
			    !(*c->p == '\r' && c->p + 1 < c->end &&
			    c->p[1] == '\n'))
				return csv_fail(c, "text after the closing "
				    "quote of a field");
		} else {
			while (c->p < c->end && *c->p != ',' &&
			    *c->p != '\n' && *c->p != '\r') {
				if (*c->p == '"')
					return csv_fail(c, "a quote inside an "
					    "unquoted field (quote the whole "
					    "field and double the quote)");
				if (csv_put(c, *c->p++) != 0)
					return csv_fail(c, too_long);
			}
			if (c->p < c->end && *c->p == '\r' &&
			    !(c->p + 1 < c->end && c->p[1] == '\n'))
				return csv_fail(c, "carriage return not "
				    "followed by a line feed");
		}
		if (csv_end_field(c) != 0)
			return csv_fail(c, too_long);
		if (c->p >= c->end)
			return 1;
		if (*c->p == ',') {
			c->p++;
			continue;
		}
		/* end of record: CRLF or LF */
		c->p += (*c->p == '\r') ? 2 : 1;
		c->line++;
		return 1;
	}
}

/* A table format: its columns and how to convert a row. */
struct csv_column {
	const char *name;
	int required;
};

struct csv_table {
	const struct csv_column *cols;
	size_t ncols;
	const char *colnames;		/* for messages */
	int map[IMPORT_CSV_MAX_FIELDS];	/* file column -> table column */
	int where[IMPORT_CSV_MAX_FIELDS];	/* table column -> file column,
						   -1 absent */
	size_t nfile;
};

/*
 * Skip comment lines before the header, read it and map its columns.
 * Returns ERRCODE_OK, ERRCODE_BAD_ARG (errors in rep; the table cannot be
 * read without a good header).
 */
static enum errcode
csv_header(struct csv *c, struct csv_table *t, struct import_report *rep)
{
	int r;

	while (c->p < c->end && *c->p == '#')
		csv_skip_line(c);
	r = csv_next(c);
	if (r == 0) {
		rep_error(rep, 0, "", "empty file: a header row naming the "
		    "columns is required");
		rep->bad++;
		return ERRCODE_BAD_ARG;
	}
	if (r < 0) {
		rep_error(rep, c->rec_line, "", "header row: %s", c->err);
		rep->bad++;
		return ERRCODE_BAD_ARG;
	}
	for (size_t j = 0; j < t->ncols; j++)
		t->where[j] = -1;
	t->nfile = c->nf;
	for (size_t i = 0; i < c->nf; i++) {
		char name[64];
		size_t j;

		trim(c->f[i], name, sizeof name);
		for (j = 0; j < t->ncols; j++)
			if (strcasecmp_ascii(name, t->cols[j].name) == 0)
				break;
		if (j == t->ncols) {
			rep_error(rep, c->rec_line, name, "unknown column "
			    "(known: %s)", t->colnames);
			rep->bad++;
			continue;
		}
		if (t->where[j] >= 0) {
			rep_error(rep, c->rec_line, name, "column given twice");
			rep->bad++;
			continue;
		}
		t->where[j] = (int)i;
		t->map[i] = (int)j;
	}
	for (size_t j = 0; j < t->ncols; j++)
		if (t->cols[j].required && t->where[j] < 0) {
			rep_error(rep, c->rec_line, t->cols[j].name,
			    "required column missing from the header row");
			rep->bad++;
		}
	return rep->bad > 0 ? ERRCODE_BAD_ARG : ERRCODE_OK;
}

/* The value of table column j in the current record ("" if absent). */
static const char *
csv_get(const struct csv *c, const struct csv_table *t, size_t j)
{
	return t->where[j] >= 0 ? c->f[t->where[j]] : "";
}

/* Shared loop: header, then each row through conv (which reports its
   own errors and returns 0 good, -1 bad) and the callback. */
typedef int (*csv_row_fn)(const struct csv *c, const struct csv_table *t,
    struct import_report *rep, void *rec);

/* The caller's callback: exactly one of the two is set. */
struct csv_job {
	import_target_fn target;
	import_attempt_fn attempt;
	void *ctx;
};

static enum errcode
csv_emit(const struct csv_job *job, const void *rec, size_t line)
{
	if (job->target != NULL)
		return job->target(job->ctx, rec, line);
	return job->attempt(job->ctx, rec, line);
}

static enum errcode
csv_run(const char *buf, size_t len, const struct csv_column *cols,
    size_t ncols, const char *colnames, csv_row_fn conv, void *rec,
    const struct csv_job *job, struct import_report *rep)
{
	struct csv c;
	struct csv_table t;
	enum errcode rc;
	int r;

	import_report_init(rep);
	if ((rc = check_text(buf, len, rep)) != ERRCODE_OK)
		return rc;
	memset(&t, 0, sizeof t);
	t.cols = cols;
	t.ncols = ncols;
	t.colnames = colnames;
	c.p = buf + bom_len(buf, len);
	c.end = buf + len;
	c.line = 1;
	c.rec_line = 1;
	if ((rc = csv_header(&c, &t, rep)) != ERRCODE_OK)
		return rc;
	while ((r = csv_next(&c)) != 0) {
		if (r < 0) {
			rep_error(rep, c.rec_line, c.err_col < t.nfile ?
			    t.cols[t.map[c.err_col]].name : "", "%s", c.err);
			rep->bad++;
			continue;
		}
		if (c.nf != t.nfile) {
			rep_error(rep, c.rec_line, "", "row has %zu fields, "
			    "the header has %zu", c.nf, t.nfile);
			rep->bad++;
			continue;
		}
		if (conv(&c, &t, rep, rec) != 0) {
			rep->bad++;
			continue;
		}
		if ((rc = csv_emit(job, rec, c.rec_line)) != ERRCODE_OK)
			return rc;
		rep->records++;
	}
	return rep_status(rep);
}

/* --- targets --- */

enum { TC_ID, TC_NAME, TC_ALIAS, TC_LAT, TC_LON, TC_HEIGHT, TC_STRENGTH,
    TC_DARK, TC_ACTIVE, TC__N };

static const struct csv_column target_cols[TC__N] = {
	{ "id", 1 }, { "name", 1 }, { "alias", 0 }, { "lat_deg", 1 },
	{ "lon_deg", 1 }, { "height_m", 0 }, { "strength", 0 },
	{ "dark_only", 0 }, { "active", 0 },
};

/* A number column in [lo, hi], or dflt when empty and allowed. */
static int
row_real(const struct csv *c, const struct csv_table *t, size_t j,
    double lo, double hi, double dflt, struct import_report *rep,
    double *out)
{
	char v[64];
	const char *raw = csv_get(c, t, j);

	trim(raw, v, sizeof v);
	if (v[0] == '\0') {
		if (t->cols[j].required) {
			rep_error(rep, c->rec_line, t->cols[j].name,
			    "empty; a number is required");
			return -1;
		}
		*out = dflt;	/* NaN for "not given" */
		return 0;
	}
	if (strlen(raw) >= sizeof v || parse_real(v, out) != 0) {
		rep_error(rep, c->rec_line, t->cols[j].name, "'%.40s' is not "
		    "a number", v);
		return -1;
	}
	if (*out < lo || *out > hi) {
		rep_error(rep, c->rec_line, t->cols[j].name, "%g is out of "
		    "range %g..%g", *out, lo, hi);
		return -1;
	}
	return 0;
}

static int
row_text(const struct csv *c, const struct csv_table *t, size_t j,
    int multiline, char *dst, size_t cap, struct import_report *rep)
{
	const char *raw = csv_get(c, t, j);
	size_t n = strlen(raw);

	if (n >= cap) {
		rep_error(rep, c->rec_line, t->cols[j].name, "longer than %zu "
		    "bytes", cap - 1);
		return -1;
	}
	if (!valid_text(raw, multiline)) {
		rep_error(rep, c->rec_line, t->cols[j].name, "control "
		    "characters are not allowed");
		return -1;
	}
	memcpy(dst, raw, n + 1);
	return 0;
}

static int
row_bool(const struct csv *c, const struct csv_table *t, size_t j, int dflt,
    struct import_report *rep, int *out)
{
	char v[16];
	const char *raw = csv_get(c, t, j);

	trim(raw, v, sizeof v);
	if (v[0] == '\0') {
		*out = dflt;
		return 0;
	}
	if (strlen(raw) >= sizeof v || parse_bool(v, out) != 0) {
		rep_error(rep, c->rec_line, t->cols[j].name, "'%.15s' is not "
		    "0/1, true/false or yes/no", v);
		return -1;
	}
	return 0;
}

static int
row_ident(const struct csv *c, const struct csv_table *t, size_t j,
    char *dst, size_t cap, int allow_empty, struct import_report *rep)
{
	char v[SITE_NAME_LEN];
	const char *raw = csv_get(c, t, j);

	trim(raw, v, sizeof v);
	if (v[0] == '\0' && allow_empty) {
		dst[0] = '\0';
		return 0;
	}
	if (strlen(raw) >= sizeof v || !valid_ident(v, cap - 1, 1)) {
		rep_error(rep, c->rec_line, t->cols[j].name, "'%.40s' is not "
		    "1-%zu letters, digits, '_', '-' or '.'", v, cap - 1);
		return -1;
	}
	snprintf(dst, cap, "%s", v);
	return 0;
}

static int
target_row(const struct csv *c, const struct csv_table *t,
    struct import_report *rep, void *rec)
{
	struct site_target *tg = rec;

	memset(tg, 0, sizeof *tg);
	if (row_ident(c, t, TC_ID, tg->id, sizeof tg->id, 0, rep) ||
	    row_text(c, t, TC_NAME, 0, tg->name, sizeof tg->name, rep) ||
	    row_ident(c, t, TC_ALIAS, tg->alias, sizeof tg->alias, 1, rep) ||
	    row_real(c, t, TC_LAT, -90, 90, NAN, rep, &tg->lat_deg) ||
	    row_real(c, t, TC_LON, -180, 180, NAN, rep, &tg->lon_deg) ||
	    row_real(c, t, TC_HEIGHT, -20000, 20000, 0.0, rep,
	    &tg->height_m) ||
	    row_real(c, t, TC_STRENGTH, 1e-6, 1000, 1.0, rep,
	    &tg->strength) ||
	    row_bool(c, t, TC_DARK, 0, rep, &tg->dark_only) ||
	    row_bool(c, t, TC_ACTIVE, 1, rep, &tg->active))
		return -1;
	if (tg->name[0] == '\0') {
		rep_error(rep, c->rec_line, "name", "empty; a name is "
		    "required");
		return -1;
	}
	return 0;
}

enum errcode
import_targets_csv(const char *buf, size_t len, import_target_fn fn,
    void *ctx, struct import_report *rep)
{
	struct site_target tg;
	struct csv_job job = { fn, NULL, ctx };

	return csv_run(buf, len, target_cols, TC__N, IMPORT_TARGETS_COLUMNS,
	    target_row, &tg, &job, rep);
}

/* --- attempts --- */

enum { AC_TARGET, AC_START, AC_END, AC_SHOTS, AC_RETURNS, AC_NP, AC_OUTCOME,
    AC_OPERATOR, AC_SEEING, AC_NOTES, AC__N };

static const struct csv_column attempt_cols[AC__N] = {
	{ "target", 1 }, { "start_utc", 1 }, { "end_utc", 1 },
	{ "shots", 1 }, { "returns", 1 }, { "normal_points", 1 },
	{ "outcome", 1 }, { "operator", 0 }, { "seeing_arcsec", 0 },
	{ "notes", 0 },
};

#define ATTEMPT_MAX_DAYS 1.0	/* one attempt lasts at most a day */

static int
row_time(const struct csv *c, const struct csv_table *t, size_t j,
    struct import_report *rep, double *mjd)
{
	char v[64], err[160];
	const char *raw = csv_get(c, t, j);

	trim(raw, v, sizeof v);
	if (strlen(raw) >= sizeof v) {
		rep_error(rep, c->rec_line, t->cols[j].name, "too long for a "
		    "UTC time");
		return -1;
	}
	if (parse_utc_mjd(v, mjd, err, sizeof err) != ERRCODE_OK) {
		rep_error(rep, c->rec_line, t->cols[j].name, "%s", err);
		return -1;
	}
	return 0;
}

static int
row_count(const struct csv *c, const struct csv_table *t, size_t j,
    struct import_report *rep, long *out)
{
	char v[32];
	const char *raw = csv_get(c, t, j);

	trim(raw, v, sizeof v);
	if (strlen(raw) >= sizeof v) {
		rep_error(rep, c->rec_line, t->cols[j].name, "too long for a "
		    "count");
		return -1;
	}
	switch (parse_count(v, out)) {
	case COUNT_OK:
		return 0;
	case COUNT_NEGATIVE:
		rep_error(rep, c->rec_line, t->cols[j].name, "%s is negative; "
		    "counts are whole numbers >= 0", v);
		return -1;
	case COUNT_TOO_BIG:
		rep_error(rep, c->rec_line, t->cols[j].name, "%.30s is too "
		    "large", v);
		return -1;
	case COUNT_NOT_INT:
		break;
	}
	rep_error(rep, c->rec_line, t->cols[j].name, "'%.30s' is not a whole "
	    "number >= 0", v);
	return -1;
}

static int
attempt_row(const struct csv *c, const struct csv_table *t,
    struct import_report *rep, void *rec)
{
	struct site_attempt *a = rec;
	char v[32];
	int o;

	memset(a, 0, sizeof *a);
	a->synodic_deg = a->mean_elong_deg = NAN;
	a->target_el_deg = a->sun_el_target_deg = NAN;
	if (row_ident(c, t, AC_TARGET, a->target, sizeof a->target, 0, rep) ||
	    row_time(c, t, AC_START, rep, &a->start_mjd) ||
	    row_time(c, t, AC_END, rep, &a->end_mjd))
		return -1;
	if (!(a->end_mjd > a->start_mjd)) {
		rep_error(rep, c->rec_line, "end_utc", "end is not after "
		    "start_utc");
		return -1;
	}
	if (a->end_mjd - a->start_mjd > ATTEMPT_MAX_DAYS) {
		rep_error(rep, c->rec_line, "end_utc", "attempt longer than "
		    "24 hours");
		return -1;
	}
	if (row_count(c, t, AC_SHOTS, rep, &a->shots) ||
	    row_count(c, t, AC_RETURNS, rep, &a->returns) ||
	    row_count(c, t, AC_NP, rep, &a->normal_points))
		return -1;
	if (a->normal_points > a->returns) {
		rep_error(rep, c->rec_line, "normal_points", "%ld normal "
		    "points from %ld returns: each needs at least one return",
		    a->normal_points, a->returns);
		return -1;
	}
	trim(csv_get(c, t, AC_OUTCOME), v, sizeof v);
	if ((o = site_outcome_parse(v)) < 0) {
		rep_error(rep, c->rec_line, "outcome", "'%.20s' is not one of "
		    "ranged no_returns weather technical safety other", v);
		return -1;
	}
	a->outcome = (enum site_outcome)o;
	if (row_text(c, t, AC_OPERATOR, 0, a->operator_name,
	    sizeof a->operator_name, rep) ||
	    row_real(c, t, AC_SEEING, 0.01, 60, NAN, rep, &a->seeing_arcsec) ||
	    row_text(c, t, AC_NOTES, 1, a->notes, sizeof a->notes, rep))
		return -1;
	return 0;
}

enum errcode
import_attempts_csv(const char *buf, size_t len, import_attempt_fn fn,
    void *ctx, struct import_report *rep)
{
	struct site_attempt a;
	struct csv_job job = { NULL, fn, ctx };

	return csv_run(buf, len, attempt_cols, AC__N, IMPORT_ATTEMPTS_COLUMNS,
	    attempt_row, &a, &job, rep);
}

/* ------------------------------------------------------------------ */
/* line-oriented formats                                               */
/* ------------------------------------------------------------------ */

struct lines {
	const char *p, *end;
	size_t line;		/* of the line last returned */
};

/* Next physical line without its CR/LF; 0 at the end.  *terminated says
   whether it ended with a line feed. */
static int
lines_next(struct lines *it, const char **s, size_t *n, int *terminated)
{
	const char *nl;

	if (it->p >= it->end)
		return 0;
	nl = memchr(it->p, '\n', (size_t)(it->end - it->p));
	*s = it->p;
	*n = nl ? (size_t)(nl - it->p) : (size_t)(it->end - it->p);
	*terminated = nl != NULL;
	it->p = nl ? nl + 1 : it->end;
	if (*n > 0 && (*s)[*n - 1] == '\r')
		(*n)--;
	it->line++;
	return 1;
}

/* Is the line empty or only blanks? */
static int
blank(const char *s, size_t n)
{
	for (size_t i = 0; i < n; i++)
		if (s[i] != ' ' && s[i] != '\t')
			return 0;
	return 1;
}

/* Split at blanks into at most max tokens in buf; returns the count (or
   max + 1 if there were more). */
static size_t
tokenize(const char *s, size_t n, char *buf, size_t cap, char **tok,
    size_t max)
{
	size_t nt = 0, used = 0, i = 0;

	while (i < n) {
		size_t start;

		while (i < n && (s[i] == ' ' || s[i] == '\t'))
			i++;
		if (i >= n)
			break;
		start = i;
		while (i < n && s[i] != ' ' && s[i] != '\t')
			i++;
		if (nt == max)
			return max + 1;
		if (used + (i - start) + 1 > cap)
			return max + 1;
		tok[nt] = buf + used;
		memcpy(buf + used, s + start, i - start);
		used += i - start;
		buf[used++] = '\0';
		nt++;
	}
	return nt;
}

/* ------------------------------------------------------------------ */
/* CRD normal points                                                   */
/* ------------------------------------------------------------------ */

#define CRD_MAX_TOKENS 40
#define CRD_SLACK_S 60.0	/* tolerance on the H4 start and end times */
#define CRD_TOF_MIN 2.0		/* a lunar two-way time of flight, s */
#define CRD_TOF_MAX 3.0

struct crd_state {
	int version;			/* from H1, 0 before it */
	size_t h1_line;
	int have_h2, have_h3;
	char station[SITE_CODE_LEN];
	char target[SITE_NAME_LEN];
	int in_session;			/* H4 seen, H8 not yet */
	int session_ok;			/* the H4 was good */
	size_t h4_line;
	int start_day_mjd;		/* MJD of the H4 start date */
	double start_sod;		/* seconds of day of the H4 start */
	double end_mjd;			/* NaN when the H4 has no end */
	int done;			/* H9 seen */
	size_t h9_line;
};

/* Record types we know; those not used are skipped and counted. */
static const char *const crd_known[] = {
	"H1", "H2", "H3", "H4", "H5", "H8", "H9", "C0", "C1", "C2", "C3",
	"C4", "C5", "C6", "C7", "00", "10", "11", "12", "20", "21", "30",
	"40", "41", "42", "50", "60",
};

static int
crd_known_type(const char *t)
{
	char u[3];

	if (strlen(t) != 2)
		return 0;
	u[0] = (char)toupper((unsigned char)t[0]);
	u[1] = (char)toupper((unsigned char)t[1]);
	u[2] = '\0';
	if (u[0] == '9' && isdigit((unsigned char)u[1]))
		return 1;	/* 90-99: user-defined */
	for (size_t i = 0; i < sizeof crd_known / sizeof crd_known[0]; i++)
		if (strcmp(u, crd_known[i]) == 0)
			return 1;
	return 0;
}

/*
 * UTC quasi-MJD of a CRD epoch.
 *
 * Given:
 *   y,m,d   int     UTC calendar date (Gregorian)
 *   sod     double  seconds of that UTC day, 0 <= sod < 86400, or up to
 *                   86401 on a day that ends with a leap second
 * Returned:
 *   mjd     double  UTC quasi-JD - 2400000.5 (ERFA's convention: on a
 *                   leap-second day the fraction runs over 86401 s)
 * Returned (function value):
 *   0, or -1 when the date or time does not exist (including 86400.x on
 *   a day without a leap second)
 * Notes:
 *   CRD epochs are UTC seconds of day (the H2 record's time-scale field
 *   names the UTC source; all are taken as UTC).  Precision: a double
 *   MJD resolves ~1 us, far below what the planner and audit use,
 *   though coarser than the CRD picosecond fields.
 * References:
 *   ILRS, Consolidated Laser Ranging Data Format (CRD) version 2,
 *   record 11; ERFA eraDtf2d.
 * Called:
 *   eraDtf2d
 */
static int
crd_mjd(int y, int m, int d, double sod, double *mjd)
{
	double d1, d2, sec;
	int hr, mn, st;

	if (!(sod >= 0.0) || sod >= 86401.0)
		return -1;
	if (sod >= 86400.0) {
		hr = 23;
		mn = 59;
		sec = sod - 86340.0;
	} else {
		hr = (int)(sod / 3600.0);
		mn = (int)((sod - hr * 3600.0) / 60.0);
		sec = sod - hr * 3600.0 - mn * 60.0;
		if (mn > 59)
			mn = 59;
		if (sec < 0.0)
			sec = 0.0;
	}
	st = eraDtf2d("UTC", y, m, d, hr, mn, sec, &d1, &d2);
	if (st < 0 || st == 2 || st == 3)
		return -1;
	*mjd = (d1 - ERFA_DJM0) + d2;
	return 0;
}

/* Six integer tokens y m d h m s from tok; 0 ok, -1 bad, 1 all "0"/"na". */
static int
crd_datetime(char **tok, long v[6])
{
	int unset = 1;

	for (int i = 0; i < 6; i++) {
		if (strcasecmp_ascii(tok[i], "na") == 0) {
			v[i] = 0;
			continue;
		}
		if (parse_int(tok[i], 0, 9999, &v[i]) != 0)
			return -1;
		if (v[i] != 0)
			unset = 0;
	}
	return unset ? 1 : 0;
}

/*
 * H2 (station) and H3 (target): the name in the first field, outside a
 * session.  A bad name clears *have, so the points that follow are
 * refused until a good header comes.
 */
static void
crd_name_header(struct crd_state *s, char **tok, size_t nt, size_t line,
    const char *type, const char *what, char *name, size_t len, int *have,
    struct import_report *rep)
{
	if (s->in_session) {
		rep_error(rep, line, type, "%s header inside the session "
		    "opened on line %zu", what, s->h4_line);
		rep->bad++;
		return;
	}
	if (nt < 2 || strlen(tok[1]) >= len ||
	    !valid_ident(tok[1], len - 1, 1)) {
		rep_error(rep, line, type, "missing or bad %s name", what);
		rep->bad++;
		*have = 0;
		return;
	}
	snprintf(name, len, "%s", tok[1]);
	*have = 1;
}

static void
crd_h4(struct crd_state *s, char **tok, size_t nt, size_t line,
    struct import_report *rep)
{
	long a[6], b[6], dtype;
	double smjd, d1, d2;
	int r;

	s->in_session = 1;
	s->session_ok = 0;
	s->h4_line = line;
	if (!s->have_h2 || !s->have_h3) {
		rep_error(rep, line, "H4", "session header before the %s "
		    "record", s->have_h2 ? "H3 (target)" : "H2 (station)");
		rep->bad++;
		return;
	}
	if (nt < 14) {
		rep_error(rep, line, "H4", "%zu fields; a session header has "
		    "at least 14 (type, start and end date and time)", nt);
		rep->bad++;
		return;
	}
	if (parse_int(tok[1], 0, 2, &dtype) != 0) {
		rep_error(rep, line, "H4", "data type '%s' is not 0, 1 or 2",
		    tok[1]);
		rep->bad++;
		return;
	}
	if (crd_datetime(tok + 2, a) != 0 || a[3] > 23 || a[4] > 59 ||
	    a[5] > 60 || eraCal2jd((int)a[0], (int)a[1], (int)a[2], &d1,
	    &d2) != 0 || crd_mjd((int)a[0], (int)a[1], (int)a[2],
	    (double)(a[3] * 3600 + a[4] * 60 + a[5]), &smjd) != 0) {
		rep_error(rep, line, "H4", "bad session start date or time");
		rep->bad++;
		return;
	}
	s->start_day_mjd = (int)d2;
	s->start_sod = (double)(a[3] * 3600 + a[4] * 60 + a[5]);
	s->end_mjd = NAN;
	r = crd_datetime(tok + 8, b);
	if (r < 0 || (r == 0 && (b[3] > 23 || b[4] > 59 || b[5] > 60 ||
	    crd_mjd((int)b[0], (int)b[1], (int)b[2],
	    (double)(b[3] * 3600 + b[4] * 60 + b[5]), &s->end_mjd) != 0))) {
		rep_error(rep, line, "H4", "bad session end date or time");
		rep->bad++;
		return;
	}
	if (r == 0 && s->end_mjd < smjd) {
		rep_error(rep, line, "H4", "session ends before it starts");
		rep->bad++;
		return;
	}
	if (r == 0 && s->end_mjd - smjd > 1.0) {
		rep_error(rep, line, "H4", "session longer than one day");
		rep->bad++;
		return;
	}
	s->session_ok = 1;
}

/* A real field of record 11, or "na" for NaN when allowed. */
static int
crd_real(const char *t, int na_ok, double *v)
{
	if (na_ok && strcasecmp_ascii(t, "na") == 0) {
		*v = NAN;
		return 0;
	}
	return parse_real(t, v);
}

static enum errcode
crd_np(struct crd_state *s, char **tok, size_t nt, size_t line,
    import_np_fn fn, void *ctx, struct import_report *rep)
{
	struct import_crd_np out;
	double sod, tof, rms, mjd;
	long count;
	int day;

	if (!s->in_session) {
		rep_error(rep, line, "11", "normal point outside a session "
		    "(no H4 before it, or after H8)");
		rep->bad++;
		return ERRCODE_OK;
	}
	if (!s->session_ok) {
		rep_error(rep, line, "11", "the session header on line %zu is "
		    "invalid", s->h4_line);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (nt < 13 || nt > (s->version == 1 ? 13u : 14u)) {
		rep_error(rep, line, "11", "%zu fields; a version %d normal "
		    "point record has %s", nt, s->version, s->version == 1 ?
		    "13" : "13 or 14");
		rep->bad++;
		return ERRCODE_OK;
	}
	if (crd_real(tok[1], 0, &sod) != 0 || sod < 0.0 || sod >= 86401.0) {
		rep_error(rep, line, "seconds_of_day", "'%.30s' is not a "
		    "number of seconds in 0..86400", tok[1]);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (crd_real(tok[2], 0, &tof) != 0 || tof < CRD_TOF_MIN ||
	    tof > CRD_TOF_MAX) {
		rep_error(rep, line, "time_of_flight", "'%.30s' is not a lunar "
		    "two-way time of flight (%.1f..%.1f s)", tok[2],
		    CRD_TOF_MIN, CRD_TOF_MAX);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (parse_count(tok[6], &count) != COUNT_OK) {
		rep_error(rep, line, "return_count", "'%.30s' is not a whole "
		    "number >= 0", tok[6]);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (crd_real(tok[7], 1, &rms) != 0 || rms < 0.0) {
		rep_error(rep, line, "bin_rms", "'%.30s' is not a number of "
		    "picoseconds >= 0 (or na)", tok[7]);
		rep->bad++;
		return ERRCODE_OK;
	}
	/* the epoch is in the start's day unless the session crossed
	   midnight and the seconds of day wrapped */
	day = s->start_day_mjd;
	if (sod < s->start_sod - CRD_SLACK_S)
		day++;
	{
		int y, m, d;
		double fd;

		if (eraJd2cal(ERFA_DJM0, (double)day, &y, &m, &d, &fd) != 0 ||
		    crd_mjd(y, m, d, sod, &mjd) != 0) {
			rep_error(rep, line, "seconds_of_day", "no such UTC "
			    "time in the session's day");
			rep->bad++;
			return ERRCODE_OK;
		}
	}
	if (!isnan(s->end_mjd) && mjd > s->end_mjd + CRD_SLACK_S / 86400.0) {
		rep_error(rep, line, "seconds_of_day", "epoch after the end "
		    "of the session (H4 on line %zu)", s->h4_line);
		rep->bad++;
		return ERRCODE_OK;
	}
	memset(&out, 0, sizeof out);
	snprintf(out.target_name, sizeof out.target_name, "%s", s->target);
	snprintf(out.np.station_code, sizeof out.np.station_code, "%s",
	    s->station);
	out.np.epoch_mjd = mjd;
	out.np.tof_s = tof;
	out.np.photons = count;
	out.np.rms_ps = rms;
	out.np.synodic_deg = out.np.mean_elong_deg = NAN;
	out.np.target_el_deg = out.np.sun_el_target_deg = NAN;
	out.crd_version = s->version;
	out.session_line = s->h4_line;
	rep->records++;
	return fn(ctx, &out, line);
}

enum errcode
import_crd(const char *buf, size_t len, import_np_fn fn, void *ctx,
    struct import_report *rep)
{
	struct crd_state s;
	struct lines it;
	const char *ln;
	size_t n, nt;
	int term;
	char tb[LINE_MAX_CRD + CRD_MAX_TOKENS];
	char *tok[CRD_MAX_TOKENS];
	enum errcode rc;

	import_report_init(rep);
	if ((rc = check_text(buf, len, rep)) != ERRCODE_OK)
		return rc;
	memset(&s, 0, sizeof s);
	s.end_mjd = NAN;
	it.p = buf + bom_len(buf, len);
	it.end = buf + len;
	it.line = 0;
	while (lines_next(&it, &ln, &n, &term)) {
		char type[3];

		if (blank(ln, n))
			continue;
		if (n > LINE_MAX_CRD) {
			rep_error(rep, it.line, "", "line longer than %d bytes",
			    LINE_MAX_CRD);
			rep->bad++;
			continue;
		}
		nt = tokenize(ln, n, tb, sizeof tb, tok, CRD_MAX_TOKENS);
		if (nt > CRD_MAX_TOKENS) {
			rep_error(rep, it.line, "", "more than %d fields",
			    CRD_MAX_TOKENS);
			rep->bad++;
			continue;
		}
		if (!crd_known_type(tok[0])) {
			rep_error(rep, it.line, "", "unknown record type "
			    "'%.10s'", tok[0]);
			rep->bad++;
			continue;
		}
		type[0] = (char)toupper((unsigned char)tok[0][0]);
		type[1] = (char)toupper((unsigned char)tok[0][1]);
		type[2] = '\0';
		if (s.done) {
			rep_error(rep, it.line, type, "record after the H9 "
			    "end-of-file record on line %zu", s.h9_line);
			rep->bad++;
			continue;
		}
		if (s.version == 0 && strcmp(type, "H1") != 0) {
			rep_error(rep, it.line, type, "the first record must be "
			    "H1 (format header)");
			rep->bad++;
			s.version = -1;	/* report once */
			continue;
		}
		if (strcmp(type, "H1") == 0) {
			long v;

			if (s.version > 0) {
				rep_error(rep, it.line, "H1", "second H1 (the "
				    "first is on line %zu)", s.h1_line);
				rep->bad++;
				continue;
			}
			if (nt < 3 || strcasecmp_ascii(tok[1], "CRD") != 0 ||
			    parse_int(tok[2], 1, 2, &v) != 0) {
				rep_error(rep, it.line, "H1", "expected 'H1 CRD "
				    "1' or 'H1 CRD 2' (format and version)");
				rep->bad++;
				return rep_status(rep);
			}
			s.version = (int)v;
			s.h1_line = it.line;
		} else if (s.version < 0) {
			continue;
		} else if (strcmp(type, "H2") == 0) {
			crd_name_header(&s, tok, nt, it.line, "H2", "station",
			    s.station, sizeof s.station, &s.have_h2, rep);
		} else if (strcmp(type, "H3") == 0) {
			crd_name_header(&s, tok, nt, it.line, "H3", "target",
			    s.target, sizeof s.target, &s.have_h3, rep);
		} else if (strcmp(type, "H4") == 0) {
			if (s.in_session) {
				rep_error(rep, it.line, "H4", "new session "
				    "before H8 closed the one opened on line "
				    "%zu", s.h4_line);
				rep->bad++;
			}
			crd_h4(&s, tok, nt, it.line, rep);
		} else if (strcmp(type, "H8") == 0) {
			if (!s.in_session) {
				rep_error(rep, it.line, "H8", "end of session "
				    "without a session");
				rep->bad++;
			}
			s.in_session = 0;
		} else if (strcmp(type, "H9") == 0) {
			if (s.in_session) {
				rep_error(rep, it.line, "H9", "end of file "
				    "before H8 closed the session opened on "
				    "line %zu", s.h4_line);
				rep->bad++;
			}
			s.done = 1;
			s.h9_line = it.line;
		} else if (strcmp(type, "11") == 0) {
			rc = crd_np(&s, tok, nt, it.line, fn, ctx, rep);
			if (rc != ERRCODE_OK)
				return rc;
		} else {
			rep->skipped++;
		}
	}
	if (s.version == 0) {
		rep_error(rep, 0, "", "not a CRD file: no H1 record");
		rep->bad++;
	} else if (s.version > 0 && !s.done) {
		rep_error(rep, it.line, "H9", "the file ends without the H9 "
		    "end-of-file record (truncated?)");
		rep->bad++;
	}
	return rep_status(rep);
}

/* ------------------------------------------------------------------ */
/* IERS Earth orientation                                              */
/* ------------------------------------------------------------------ */

#define EOP_MAX_PM 2.0		/* |polar motion|, arcsec */
#define EOP_MAX_DUT1 1.0	/* |UT1-UTC|, s (IERS keeps it < 0.9) */

/* Columns first..last (1-based, inclusive) of a line, trimmed, into out;
   "" where the line is shorter. */
static const char *
column(const char *s, size_t n, size_t first, size_t last, char *out,
    size_t cap)
{
	char tmp[64];
	size_t a = first - 1, b = last;

	if (a >= n) {
		out[0] = '\0';
		return out;
	}
	if (b > n)
		b = n;
	if (b - a >= sizeof tmp)
		b = a + sizeof tmp - 1;
	memcpy(tmp, s + a, b - a);
	tmp[b - a] = '\0';
	return trim(tmp, out, cap);
}

/* Check a row against the calendar date, order and ranges; emit it. */
static enum errcode
eop_row(int y, int m, int d, double mjd, double x, double yp, double dut1,
    double *prev_mjd, size_t line, import_eop_fn fn, void *ctx,
    struct import_report *rep)
{
	struct site_eop_row r;
	double d1, d2;

	if (eraCal2jd(y, m, d, &d1, &d2) != 0) {
		rep_error(rep, line, "date", "%04d-%02d-%02d is not a calendar "
		    "date", y, m, d);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (fabs(d2 - mjd) > 1e-6) {
		rep_error(rep, line, "MJD", "MJD %.2f is not the date "
		    "%04d-%02d-%02d (MJD %.0f)", mjd, y, m, d, d2);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (!isnan(*prev_mjd) && !(mjd > *prev_mjd)) {
		rep_error(rep, line, "MJD", "MJD %.0f does not follow the "
		    "previous row's %.0f", mjd, *prev_mjd);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (fabs(x) > EOP_MAX_PM || fabs(yp) > EOP_MAX_PM) {
		rep_error(rep, line, fabs(x) > EOP_MAX_PM ? "x" : "y",
		    "polar motion %g arcsec is beyond %g", fabs(x) >
		    EOP_MAX_PM ? x : yp, EOP_MAX_PM);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (fabs(dut1) >= EOP_MAX_DUT1) {
		rep_error(rep, line, "UT1-UTC", "%g s is beyond the 1 s that "
		    "UTC allows", dut1);
		rep->bad++;
		return ERRCODE_OK;
	}
	*prev_mjd = mjd;
	r.mjd = mjd;
	r.xp_arcsec = x;
	r.yp_arcsec = yp;
	r.dut1_s = dut1;
	rep->records++;
	return fn(ctx, &r, line);
}

/* A fixed-column number: 0 ok, -1 not a number. */
static int
col_real(const char *s, size_t n, size_t first, size_t last, double *v,
    int *empty)
{
	char f[64];

	column(s, n, first, last, f, sizeof f);
	*empty = f[0] == '\0';
	if (*empty)
		return -1;
	return parse_real(f, v);
}

enum errcode
import_eop_finals(const char *buf, size_t len, import_eop_fn fn, void *ctx,
    struct import_report *rep)
{
	struct lines it;
	const char *ln;
	size_t n;
	int term;
	double prev = NAN;
	enum errcode rc;

	import_report_init(rep);
	if ((rc = check_text(buf, len, rep)) != ERRCODE_OK)
		return rc;
	it.p = buf + bom_len(buf, len);
	it.end = buf + len;
	it.line = 0;
	while (lines_next(&it, &ln, &n, &term)) {
		double mjd, x, y, dut1;
		long yy, mm, dd;
		char f[16], pmflag[4], utflag[4];
		int e1, e2, e3;

		if (blank(ln, n) || ln[0] == '#')
			continue;
		if (n > LINE_MAX_EOP) {
			rep_error(rep, it.line, "", "line longer than %d bytes",
			    LINE_MAX_EOP);
			rep->bad++;
			continue;
		}
		if (parse_int(column(ln, n, 1, 2, f, sizeof f), 0, 99, &yy) ||
		    parse_int(column(ln, n, 3, 4, f, sizeof f), 1, 12, &mm) ||
		    parse_int(column(ln, n, 5, 6, f, sizeof f), 1, 31, &dd)) {
			rep_error(rep, it.line, "date", "columns 1-6 are not a "
			    "YYMMDD date");
			rep->bad++;
			continue;
		}
		if (col_real(ln, n, 8, 15, &mjd, &e1) != 0 ||
		    mjd != floor(mjd) || mjd < 0.0 || mjd > 200000.0) {
			rep_error(rep, it.line, "MJD", "columns 8-15 are not a "
			    "whole MJD");
			rep->bad++;
			continue;
		}
		column(ln, n, 17, 17, pmflag, sizeof pmflag);
		column(ln, n, 58, 58, utflag, sizeof utflag);
		col_real(ln, n, 19, 27, &x, &e1);
		col_real(ln, n, 38, 46, &y, &e2);
		col_real(ln, n, 59, 68, &dut1, &e3);
		if (e1 && e2 && e3 && pmflag[0] == '\0' && utflag[0] == '\0') {
			rep->skipped++;	/* a date beyond the predictions */
			continue;
		}
		if (n < 68) {
			rep_error(rep, it.line, "UT1-UTC", "the line ends at "
			    "column %zu, before UT1-UTC (columns 59-68): "
			    "truncated?", n);
			rep->bad++;
			continue;
		}
		if ((pmflag[0] != 'I' && pmflag[0] != 'P') ||
		    (utflag[0] != 'I' && utflag[0] != 'P')) {
			rep_error(rep, it.line, pmflag[0] != 'I' &&
			    pmflag[0] != 'P' ? "PM_flag" : "UT1_flag",
			    "flag is not I (IERS) or P (prediction)");
			rep->bad++;
			continue;
		}
		if (col_real(ln, n, 19, 27, &x, &e1) != 0) {
			rep_error(rep, it.line, "PM_x", "columns 19-27 are not "
			    "a number of arcseconds");
			rep->bad++;
			continue;
		}
		if (col_real(ln, n, 38, 46, &y, &e2) != 0) {
			rep_error(rep, it.line, "PM_y", "columns 38-46 are not "
			    "a number of arcseconds");
			rep->bad++;
			continue;
		}
		if (col_real(ln, n, 59, 68, &dut1, &e3) != 0) {
			rep_error(rep, it.line, "UT1-UTC", "columns 59-68 are "
			    "not a number of seconds");
			rep->bad++;
			continue;
		}
		rc = eop_row((int)(yy + (mjd <= 51543.0 ? 1900 : 2000)),
		    (int)mm, (int)dd, mjd, x, y, dut1, &prev, it.line, fn, ctx,
		    rep);
		if (rc != ERRCODE_OK)
			return rc;
	}
	if (rep->records == 0 && rep->bad == 0) {
		rep_error(rep, 0, "", "no Earth-orientation rows found");
		rep->bad++;
	}
	return rep_status(rep);
}

enum errcode
import_eop_c04(const char *buf, size_t len, import_eop_fn fn, void *ctx,
    struct import_report *rep)
{
	struct lines it;
	const char *ln;
	size_t n;
	int term, data = 0;
	double prev = NAN;
	enum errcode rc;

	import_report_init(rep);
	if ((rc = check_text(buf, len, rep)) != ERRCODE_OK)
		return rc;
	it.p = buf + bom_len(buf, len);
	it.end = buf + len;
	it.line = 0;
	while (lines_next(&it, &ln, &n, &term)) {
		double mjd, x, y, dut1;
		long yy, mm, dd;
		char f[16];
		size_t i = 0;
		int e;

		if (blank(ln, n) || ln[0] == '#')
			continue;
		while (i < n && ln[i] == ' ')
			i++;
		if (!isdigit((unsigned char)ln[i])) {
			if (data) {
				rep_error(rep, it.line, "", "text among the data "
				    "rows");
				rep->bad++;
			}
			continue;	/* the header */
		}
		data = 1;
		if (n > LINE_MAX_EOP) {
			rep_error(rep, it.line, "", "line longer than %d bytes",
			    LINE_MAX_EOP);
			rep->bad++;
			continue;
		}
		if (n < 53) {
			rep_error(rep, it.line, "UT1-UTC", "the line ends at "
			    "column %zu, before the end of UT1-UTC (column "
			    "53): truncated?", n);
			rep->bad++;
			continue;
		}
		if (parse_int(column(ln, n, 1, 4, f, sizeof f), 1900, 2999,
		    &yy) || parse_int(column(ln, n, 5, 8, f, sizeof f), 1, 12,
		    &mm) || parse_int(column(ln, n, 9, 12, f, sizeof f), 1, 31,
		    &dd)) {
			rep_error(rep, it.line, "date", "columns 1-12 are not "
			    "a year, month and day");
			rep->bad++;
			continue;
		}
		if (col_real(ln, n, 13, 19, &mjd, &e) != 0 ||
		    mjd != floor(mjd)) {
			rep_error(rep, it.line, "MJD", "columns 13-19 are not "
			    "a whole MJD");
			rep->bad++;
			continue;
		}
		if (col_real(ln, n, 20, 30, &x, &e) != 0) {
			rep_error(rep, it.line, "x", "columns 20-30 are not a "
			    "number of arcseconds");
			rep->bad++;
			continue;
		}
		if (col_real(ln, n, 31, 41, &y, &e) != 0) {
			rep_error(rep, it.line, "y", "columns 31-41 are not a "
			    "number of arcseconds");
			rep->bad++;
			continue;
		}
		if (col_real(ln, n, 42, 53, &dut1, &e) != 0) {
			rep_error(rep, it.line, "UT1-UTC", "columns 42-53 are "
			    "not a number of seconds");
			rep->bad++;
			continue;
		}
		rc = eop_row((int)yy, (int)mm, (int)dd, mjd, x, y, dut1, &prev,
		    it.line, fn, ctx, rep);
		if (rc != ERRCODE_OK)
			return rc;
	}
	if (rep->records == 0 && rep->bad == 0) {
		rep_error(rep, 0, "", "no Earth-orientation rows found");
		rep->bad++;
	}
	return rep_status(rep);
}

enum import_eop_format
import_eop_detect(const char *buf, size_t len)
{
	struct lines it;
	const char *ln;
	size_t n;
	int term;

	if (buf == NULL)
		return IMPORT_EOP_UNKNOWN;
	it.p = buf + bom_len(buf, len);
	it.end = buf + len;
	it.line = 0;
	while (lines_next(&it, &ln, &n, &term)) {
		size_t i = 0, d = 0;

		if (blank(ln, n) || ln[0] == '#')
			continue;
		/* C04 opens with a text header; finals with data rows */
		while (i < n && ln[i] == ' ')
			i++;
		if (i < n && !isdigit((unsigned char)ln[i]))
			return IMPORT_EOP_C04;
		/* a finals row: YYMMDD, a blank, the MJD as F8.2 in columns
		   8-15; a C04 row: a four-digit year, the MJD as I7 in
		   columns 13-19 */
		if (n >= 15 && ln[6] == ' ' && ln[12] == '.')
			return IMPORT_EOP_FINALS;
		for (i = 0; i < n && i < 4 && isdigit((unsigned char)ln[i]);
		    i++)
			d++;
		if (d == 4 && n >= 19 && isdigit((unsigned char)ln[18]))
			return IMPORT_EOP_C04;
		return IMPORT_EOP_UNKNOWN;
	}
	return IMPORT_EOP_UNKNOWN;
}

enum errcode
import_eop(const char *buf, size_t len, import_eop_fn fn, void *ctx,
    struct import_report *rep)
{
	enum errcode rc;

	import_report_init(rep);
	if ((rc = check_text(buf, len, rep)) != ERRCODE_OK)
		return rc;
	switch (import_eop_detect(buf, len)) {
	case IMPORT_EOP_FINALS:
		return import_eop_finals(buf, len, fn, ctx, rep);
	case IMPORT_EOP_C04:
		return import_eop_c04(buf, len, fn, ctx, rep);
	case IMPORT_EOP_UNKNOWN:
		break;
	}
	rep_error(rep, 0, "", "neither the IERS finals2000A nor the EOP 14 "
	    "C04 format");
	rep->bad++;
	return ERRCODE_UNSUPPORTED;
}
