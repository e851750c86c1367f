/* SPDX-License-Identifier: BSD-3-Clause */
/* import_station.c: the station file (station.ini, read with libinih)
   and its key table. */
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
#include "core/mem.h"
#include "core/text.h"
#include "core/tscale.h"
#include "formats/import.h"
#include "formats/import_util.h"

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
	KEY("weather", "pressure_hpa", IMPORT_KEY_REAL, 200, 1100, 0, NAN,
	    "typical air pressure, hPa (default: standard atmosphere at "
	    "height_m, 220 hPa at its 10,000 m)"),
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
	KEY("laser", "pulse_energy_mj", IMPORT_KEY_REAL, 0.001, 100000, 0,
	    100.0, "energy of one pulse leaving the laser, millijoules (link "
	    "budget)"),
	KEY("telescope", "aperture_m", IMPORT_KEY_REAL, 0.01, 50, 0, 1.0,
	    "receive aperture diameter, metres (link budget)"),
	KEY("telescope", "transmit_efficiency", IMPORT_KEY_REAL, 0.001, 1, 0,
	    0.5, "share of the pulse leaving the telescope (link budget)"),
	KEY("telescope", "receive_efficiency", IMPORT_KEY_REAL, 0.001, 1, 0,
	    0.1, "share of collected light reaching the detector, filter "
	    "included (link budget)"),
	KEY("detector", "quantum_efficiency", IMPORT_KEY_REAL, 0.001, 1, 0,
	    0.3, "detector quantum efficiency at the laser wavelength (link "
	    "budget)"),
	KEY("detector", "jitter_ps", IMPORT_KEY_REAL, 0.1, 1000000, 0, NAN,
	    "single-photon timing jitter (RMS), picoseconds; set, it weights "
	    "normal points by their expected precision"),
	KEY("site", "seeing_arcsec", IMPORT_KEY_REAL, 0.1, 60, 0, 1.5,
	    "typical seeing (FWHM), arcseconds: sets the uplink divergence"),
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
		{ "pulse_energy_mj", offsetof(struct site_station,
		    pulse_energy_mj) },
		{ "aperture_m", offsetof(struct site_station, aperture_m) },
		{ "transmit_efficiency", offsetof(struct site_station,
		    transmit_eff) },
		{ "receive_efficiency", offsetof(struct site_station,
		    receive_eff) },
		{ "quantum_efficiency", offsetof(struct site_station,
		    detector_qe) },
		{ "jitter_ps", offsetof(struct site_station, jitter_ps) },
		{ "seeing_arcsec", offsetof(struct site_station,
		    seeing_arcsec) },
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
			mbuf_puts(out, strcmp(key->section, "weather") == 0 ?
			    " | derived" : " | none");
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
	import_trim(raw, v, sizeof v);
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
		if (key->type == IMPORT_KEY_TEXT && !import_valid_text(v, 0)) {
			snprintf(err, errlen, "not UTF-8 text, or control "
			    "characters in it");
			return ERRCODE_BAD_ARG;
		}
		if (key->type == IMPORT_KEY_CODE &&
		    !import_valid_ident(v, (size_t)key->max, 0)) {
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
		if (text_parse_real(v, -HUGE_VAL, HUGE_VAL, &d) != 0) {
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
		import_err(s->rep, s->cur_line, "", "not a [section] or "
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
		import_err(s->rep, s->cur_line, "",
		    "line longer than %zu bytes",
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
	import_trim(str, s->cur_text, sizeof s->cur_text);
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
		import_err(s->rep, s->cur_line, field,
		    "continuation lines are "
		    "not allowed (an indented line continues the key above)");
		s->rep->bad++;
		return 1;
	}
	k = key_find(section, name);
	if (k == NKEYS) {
		if (section[0] == '\0')
			import_err(s->rep, s->cur_line, name,
			    "key outside any "
			    "[section]");
		else
			import_err(s->rep, s->cur_line, field, "unknown key "
			    "'%s' in section [%s]", name, section);
		s->rep->bad++;
		return 1;
	}
	if (s->seen[k] != 0) {
		import_err(s->rep, s->cur_line, field, "given twice (first on "
		    "line %zu)", s->seen[k]);
		s->rep->bad++;
		return 1;
	}
	s->seen[k] = s->cur_line;
	if (key_set(s->st, k, value, err, sizeof err) != ERRCODE_OK) {
		import_err(s->rep, s->cur_line, field, "%s", err);
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

	if ((rc = import_begin(buf, len, rep)) != ERRCODE_OK)
		return rc;
	memset(&s, 0, sizeof s);
	s.p = buf + import_bom_len(buf, len);
	s.end = buf + len;
	s.st = st;
	s.rep = rep;
	import_station_defaults(st);
	r = ini_parse_stream(station_read_line, &s, station_pair, &s);
	ini_check_previous(&s);
	if (r < 0) {
		import_err(rep, 0, "", "the INI reader failed (%d)", r);
		return ERRCODE_NOMEM;
	}
	if (r > 0 && rep->bad == 0) {
		/* inih found an error our line check did not */
		import_err(rep, (size_t)r, "", "malformed line");
		rep->bad++;
	}
	for (size_t k = 0; k < NKEYS; k++) {
		char field[32];

		if (!station_keys[k].required || s.seen[k] != 0)
			continue;
		snprintf(field, sizeof field, "%s.%s", station_keys[k].section,
		    station_keys[k].name);
		import_err(rep, 0, field, "required key missing from [%s]",
		    station_keys[k].section);
		rep->bad++;
	}
	import_station_finish(st);
	return import_status(rep);
}
