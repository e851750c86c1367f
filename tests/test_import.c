/* SPDX-License-Identifier: BSD-3-Clause */
/* test_import.c: the station-file, CSV, CRD and IERS parsers on good
   files, the sample site, a real IERS series and tables of bad input. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "check.h"
#include "core/eop.h"
#include "core/geom.h"
#include "formats/import.h"
#include "core/mem.h"

#define C04_PATH "/usr/lib/python3/dist-packages/astropy/utils/iers/data/" \
	"eopc04_IAU2000.62-now"

/* ------------------------------------------------------------------ */
/* helpers                                                             */
/* ------------------------------------------------------------------ */

/* Read a whole file (test-only, plain malloc); NULL if missing. */
static char *
slurp(const char *path, size_t *len)
{
	FILE *f = fopen(path, "rb");
	char *buf = NULL;
	long n;

	if (f == NULL)
		return NULL;
	if (fseek(f, 0, SEEK_END) == 0 && (n = ftell(f)) >= 0 &&
	    fseek(f, 0, SEEK_SET) == 0 && (buf = malloc((size_t)n + 1)) &&
	    fread(buf, 1, (size_t)n, f) == (size_t)n) {
		buf[n] = '\0';
		*len = (size_t)n;
	} else {
		free(buf);
		buf = NULL;
	}
	fclose(f);
	return buf;
}

static char *
sample(const char *name, size_t *len)
{
	const char *src = getenv("MOONRANGE_SOURCE_DIR");
	char path[1024];
	char *buf;

	snprintf(path, sizeof path, "%s/sample-site/%s", src ? src : ".",
	    name);
	buf = slurp(path, len);
	if (buf == NULL)
		fail_msg("cannot read %s", path);
	return buf;
}

/* Print every kept error (on failure the log says why). */
static void
dump(const struct import_report *rep, const char *file)
{
	char line[300];

	for (size_t i = 0; i < rep->nerrors; i++) {
		import_error_format(rep, i, file, line, sizeof line);
		print_message("  %s\n", line);
	}
}

/* One expected error: its line, field and a piece of the message. */
static void
expect_error(const struct import_report *rep, size_t line, const char *field,
    const char *part, const char *what)
{
	for (size_t i = 0; i < rep->nerrors; i++) {
		const struct import_error *e = &rep->errors[i];

		if (e->line == line && strcmp(e->field, field) == 0 &&
		    strstr(e->message, part) != NULL)
			return;
	}
	print_error("%s: no error at line %zu field '%s' containing '%s'; "
	    "got:\n", what, line, field, part);
	dump(rep, what);
	fail();
}

/* Collectors for the callbacks. */
#define MAXREC 400

/* Keep record rec (size bytes) and its line as number *n of arr and
   lines when there is room (cap); count it either way. */
static void
seen_add(size_t *n, size_t cap, void *arr, size_t *lines, const void *rec,
    size_t size, size_t line)
{
	if (*n < cap) {
		memcpy((char *)arr + *n * size, rec, size);
		lines[*n] = line;
	}
	(*n)++;
}

struct targets_seen {
	size_t n;
	struct site_target t[16];
	size_t line[16];
};

static enum errcode
on_target(void *ctx, const struct site_target *t, size_t line)
{
	struct targets_seen *s = ctx;

	seen_add(&s->n, 16, s->t, s->line, t, sizeof *t, line);
	return ERRCODE_OK;
}

struct attempts_seen {
	size_t n;
	struct site_attempt *a;		/* MAXREC */
	size_t line[MAXREC];
	enum errcode stop_at_2;		/* returned for the 2nd record */
};

static enum errcode
on_attempt(void *ctx, const struct site_attempt *a, size_t line)
{
	struct attempts_seen *s = ctx;

	seen_add(&s->n, MAXREC, s->a, s->line, a, sizeof *a, line);
	if (s->n == 2 && s->stop_at_2 != ERRCODE_OK)
		return s->stop_at_2;
	return ERRCODE_OK;
}

struct nps_seen {
	size_t n;
	struct import_crd_np np[64];
	size_t line[64];
};

static enum errcode
on_np(void *ctx, const struct import_crd_np *np, size_t line)
{
	struct nps_seen *s = ctx;

	seen_add(&s->n, 64, s->np, s->line, np, sizeof *np, line);
	return ERRCODE_OK;
}

struct eop_seen {
	size_t n, cap;
	struct site_eop_row *r;
};

static enum errcode
on_eop(void *ctx, const struct site_eop_row *r, size_t line)
{
	struct eop_seen *s = ctx;

	(void)line;
	if (s->n < s->cap)
		s->r[s->n] = *r;
	s->n++;
	return ERRCODE_OK;
}

static enum errcode
parse_attempts(const char *text, struct attempts_seen *seen,
    struct import_report *rep)
{
	static struct site_attempt store[MAXREC];

	memset(seen, 0, sizeof *seen);
	seen->a = store;
	return import_attempts_csv(text, strlen(text), on_attempt, seen, rep);
}

/* ------------------------------------------------------------------ */
/* station file                                                        */
/* ------------------------------------------------------------------ */

#define INI_REQUIRED \
	"[station]\nname = Test Peak (invented)\ncode = TSTP\n" \
	"lat_deg = 10.5\nlon_deg = -20.25\nheight_m = 1500\n" \
	"time_zone = Etc/UTC\n"

static void
test_import_station_sample(void **state)
{
	struct site_station st;
	struct import_report rep;
	size_t len;
	char *buf = sample("station.ini", &len);

	(void)state;
	assert_int_equal(import_station_ini(buf, len, &st, &rep), ERRCODE_OK);
	dump(&rep, "station.ini");
	assert_int_equal(rep.bad, 0);
	assert_int_equal(rep.nerrors, 0);
	/* values as written in sample-site/station.ini */
	assert_string_equal(st.code, "KSTR");
	assert_string_equal(st.time_zone, "America/Los_Angeles");
	assert_non_null(strstr(st.name, "invented"));
	check_near(st.lat_deg, 38.9712, 0.0, "deg", "lat (station.ini)");
	check_near(st.lon_deg, -114.3098, 0.0, "deg", "lon (station.ini)");
	check_near(st.height_m, 2950.0, 0.0, "m", "height (station.ini)");
	check_near(st.wavelength_nm, 532.0, 0.0, "nm", "laser (station.ini)");
	check_near(st.max_sun_el_deg, -12.0, 0.0, "deg", "sun limit");
	free(buf);
}

static void
test_import_station_defaults(void **state)
{
	static const char ini[] = INI_REQUIRED;
	struct site_station st;
	struct import_report rep;
	struct geom_weather wx;
	size_t n;
	const struct import_key *keys = import_station_keys(&n);

	(void)state;
	assert_int_equal(import_station_ini(ini, strlen(ini), &st, &rep),
	    ERRCODE_OK);
	dump(&rep, "defaults");
	/* every optional real key takes its table default */
	for (size_t k = 0; k < n; k++) {
		struct site_station one;
		char err[160], text[32];

		if (keys[k].required || keys[k].type != IMPORT_KEY_REAL ||
		    isnan(keys[k].def))
			continue;
		/* the default lies inside the key's own range */
		assert_true(keys[k].def >= keys[k].min &&
		    keys[k].def <= keys[k].max);
		/* and setting it back through import_station_set is OK */
		snprintf(text, sizeof text, "%.17g", keys[k].def);
		one = st;
		assert_int_equal(import_station_set(&one, keys[k].section,
		    keys[k].name, text, err, sizeof err), ERRCODE_OK);
	}
	check_near(st.min_el_deg, 20.0, 0.0, "deg", "table default");
	check_near(st.humidity, 0.5, 0.0, "", "table default");
	check_near(st.fire_rate_hz, 10.0, 0.0, "Hz", "table default");
	/* pressure and temperature follow the height: geom's standard
	   atmosphere (ERFA atco13 note 4 isothermal pressure) */
	geom_weather_standard(1500.0, &wx);
	check_near(st.pressure_hpa, wx.pressure_hpa, 1e-9, "hPa",
	    "standard pressure at 1500 m");
	check_near(st.temperature_c, 15.0 - 6.5 * 1.5, 1e-9, "C",
	    "15 C less 6.5 C per km (ICAO standard lapse rate)");
}

/*
 * A pressure or temperature derived from height_m lies inside the key's own
 * range over the whole range of height_m (-500 to 10,000 m), so that
 * 'station show' then 'station set' of the same value, or a station file
 * written from the record, is accepted.  A station at 9,730 m was given
 * 231 hPa while pressure_hpa took 300 to 1100 (issue 11, defect 8).
 * Expected: the standard atmosphere of ERFA atco13 note 4,
 * p = 1013.25 exp(-h / (29.3 T)) with T = 288.15 K - 6.5 K/km h, computed
 * with /usr/bin/python3: 219.525 hPa at 10,000 m, 1074.359 hPa at -500 m.
 */
static void
test_import_station_derived_weather_in_range(void **state)
{
	static const double heights[] = { -500.0, 0.0, 2950.0, 9730.0,
		10000.0 };
	const struct import_key *keys, *kp = NULL, *kt = NULL, *kh = NULL;
	size_t n;

	(void)state;
	keys = import_station_keys(&n);
	for (size_t k = 0; k < n; k++) {
		if (strcmp(keys[k].name, "pressure_hpa") == 0)
			kp = &keys[k];
		if (strcmp(keys[k].name, "temperature_c") == 0)
			kt = &keys[k];
		if (strcmp(keys[k].name, "height_m") == 0)
			kh = &keys[k];
	}
	assert_non_null(kp);
	assert_non_null(kt);
	assert_non_null(kh);
	check_near(kh->min, -500.0, 0.0, "m", "height_m range (table)");
	check_near(kh->max, 10000.0, 0.0, "m", "height_m range (table)");
	for (size_t i = 0; i < sizeof heights / sizeof heights[0]; i++) {
		char ini[400], text[40], err[200];
		struct site_station st, one;
		struct import_report rep;

		snprintf(ini, sizeof ini, "[station]\nname = High (invented)\n"
		    "code = HIGH\nlat_deg = 10\nlon_deg = 20\nheight_m = %.0f\n"
		    "time_zone = Etc/UTC\n", heights[i]);
		assert_int_equal(import_station_ini(ini, strlen(ini), &st,
		    &rep), ERRCODE_OK);
		assert_true(st.pressure_hpa >= kp->min &&
		    st.pressure_hpa <= kp->max);
		assert_true(st.temperature_c >= kt->min &&
		    st.temperature_c <= kt->max);
		snprintf(text, sizeof text, "%.17g", st.pressure_hpa);
		one = st;
		assert_int_equal(import_station_set(&one, "weather",
		    "pressure_hpa", text, err, sizeof err), ERRCODE_OK);
		if (heights[i] == 10000.0)
			check_near(st.pressure_hpa, 219.525, 0.001, "hPa",
			    "ERFA atco13 note 4 at 10 km (python3)");
		if (heights[i] == -500.0)
			check_near(st.pressure_hpa, 1074.359, 0.001, "hPa",
			    "ERFA atco13 note 4 at -500 m (python3)");
	}
}

static void
test_import_station_set(void **state)
{
	struct site_station st;
	char err[160];

	(void)state;
	import_station_defaults(&st);
	assert_int_equal(import_station_set(&st, "laser", "zenith_tau",
	    "0.2", err, sizeof err), ERRCODE_OK);
	check_near(st.zenith_tau, 0.2, 0.0, "", "set value");
	assert_int_equal(import_station_set(&st, "laser", "zenith_tau", "7",
	    err, sizeof err), ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "laser.zenith_tau"));
	assert_non_null(strstr(err, "out of range"));
	assert_int_equal(import_station_set(&st, "laser", "colour", "green",
	    err, sizeof err), ERRCODE_NOT_FOUND);
	assert_non_null(strstr(err, "laser.colour"));
	assert_int_equal(import_station_set(&st, "station", "code",
	    "K STR", NULL, 0), ERRCODE_BAD_ARG);
}

struct bad_case {
	const char *text;
	size_t line;
	const char *field;
	const char *part;
};

static void
test_import_station_bad(void **state)
{
	static const struct bad_case cases[] = {
		{ INI_REQUIRED "colour = green\n", 8, "station.colour",
		    "unknown key" },
		{ INI_REQUIRED "[laser]\nwavelength_nm = 5320\n", 9,
		    "laser.wavelength_nm", "out of range 300..2000" },
		{ INI_REQUIRED "[limits]\nmin_elevation_deg = high\n", 9,
		    "limits.min_elevation_deg", "not a number" },
		{ INI_REQUIRED "[limits]\nmin_elevation_deg = 0x10\n", 9,
		    "limits.min_elevation_deg", "not a number" },
		{ INI_REQUIRED "lat_deg = 11\n", 8, "station.lat_deg",
		    "given twice (first on line 4)" },
		{ "[station]\nname = X\ncode = TSTP\nlat_deg = 10\n"
		    "lon_deg = 0\nheight_m = 0\n", 0, "station.time_zone",
		    "required key missing" },
		{ "stray = 1\n" INI_REQUIRED, 1, "stray", "outside any" },
		{ INI_REQUIRED "this line has no equals sign\n", 8, "",
		    "not a [section]" },
		{ INI_REQUIRED "[optics]\nfocal_m = 2\n", 9, "optics.focal_m",
		    "unknown key 'focal_m' in section [optics]" },
		{ "[station]\nname = X\ncode = TSTP\nlat_deg = 91\n"
		    "lon_deg = 0\nheight_m = 0\ntime_zone = UTC\n", 4,
		    "station.lat_deg", "out of range -90..90" },
		{ "[station]\nname = X\ncode = T/S\nlat_deg = 1\n"
		    "lon_deg = 0\nheight_m = 0\ntime_zone = UTC\n", 3,
		    "station.code", "letters, digits" },
		{ "[station]\nname = X\ncode = TS\nlat_deg = 1\n"
		    "lon_deg = 0\nheight_m = 0\ntime_zone = ../etc\n", 7,
		    "station.time_zone", "IANA" },
		{ INI_REQUIRED "[weather]\nhumidity = 0.4\n  0.5\n", 10,
		    "weather.humidity", "continuation" },
		{ INI_REQUIRED "[laser]\nfire_rate_hz = "
		    "1000000000000000000000000000000000000000000000000000000000"
		    "0000000000000000000000000000000000000000000000000000000000"
		    "0000000000000000000000000000000000000000000000000000000000"
		    "0000000000000000000000000000000000000000000000000000000000"
		    "00\n", 9, "", "longer than 197 bytes" },
	};

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		struct site_station st;
		struct import_report rep;
		char what[32];

		snprintf(what, sizeof what, "ini case %zu", i);
		assert_int_equal(import_station_ini(cases[i].text,
		    strlen(cases[i].text), &st, &rep), ERRCODE_BAD_ARG);
		assert_true(rep.bad >= 1);
		expect_error(&rep, cases[i].line, cases[i].field,
		    cases[i].part, what);
	}
}

/* NUL bytes and invalid UTF-8: ERRCODE_IO with the line, for every
   parser (they share the check). */
static void
test_import_not_text(void **state)
{
	static const char nul[] = "[station]\nna\0me = X\n";
	static const char latin1[] = "id,name,lat_deg,lon_deg\n"
	    "A,Caf\xe9,1,2\n";
	static const char overlong[] = "H1 CRD 2\n\xc0\xaf\n";
	static const char surrogate[] = "# \xed\xa0\x80\n";
	struct site_station st;
	struct targets_seen ts = { 0 };
	struct nps_seen ns = { 0 };
	struct eop_seen es = { 0, 0, NULL };
	struct import_report rep;

	(void)state;
	assert_int_equal(import_station_ini(nul, sizeof nul - 1, &st, &rep),
	    ERRCODE_IO);
	expect_error(&rep, 2, "", "NUL byte at column 3", "ini NUL");
	assert_int_equal(import_targets_csv(latin1, sizeof latin1 - 1,
	    on_target, &ts, &rep), ERRCODE_IO);
	expect_error(&rep, 2, "", "invalid UTF-8 byte 0xE9", "csv latin-1");
	assert_int_equal(ts.n, 0);	/* nothing handed on */
	assert_int_equal(import_crd(overlong, sizeof overlong - 1, on_np, &ns,
	    &rep), ERRCODE_IO);
	expect_error(&rep, 2, "", "invalid UTF-8 byte 0xC0", "crd overlong");
	assert_int_equal(import_eop_finals(surrogate, sizeof surrogate - 1,
	    on_eop, &es, &rep), ERRCODE_IO);
	expect_error(&rep, 1, "", "invalid UTF-8 byte 0xED", "surrogate");
	/* valid multi-byte text is fine */
	{
		static const char ok[] = "id,name,lat_deg,lon_deg\n"
		    "A,Caf\xc3\xa9 \xe2\x98\xbe,1,2\n";

		ts.n = 0;
		assert_int_equal(import_targets_csv(ok, sizeof ok - 1,
		    on_target, &ts, &rep), ERRCODE_OK);
		assert_int_equal(ts.n, 1);
		assert_string_equal(ts.t[0].name, "Caf\xc3\xa9 \xe2\x98\xbe");
	}
}

/* Every parser behind one signature, for the tables below. */
static enum errcode
run_ini(const char *b, size_t n, struct import_report *rep)
{
	struct site_station st;

	return import_station_ini(b, n, &st, rep);
}

static enum errcode
run_targets(const char *b, size_t n, struct import_report *rep)
{
	struct targets_seen ts = { 0 };

	return import_targets_csv(b, n, on_target, &ts, rep);
}

static enum errcode
run_attempts(const char *b, size_t n, struct import_report *rep)
{
	static struct site_attempt store[MAXREC];
	struct attempts_seen s;

	memset(&s, 0, sizeof s);
	s.a = store;
	return import_attempts_csv(b, n, on_attempt, &s, rep);
}

static enum errcode
run_crd(const char *b, size_t n, struct import_report *rep)
{
	static struct nps_seen ns;

	memset(&ns, 0, sizeof ns);
	return import_crd(b, n, on_np, &ns, rep);
}

static enum errcode
run_finals(const char *b, size_t n, struct import_report *rep)
{
	struct site_eop_row rows[4];
	struct eop_seen es = { 0, 4, rows };

	return import_eop_finals(b, n, on_eop, &es, rep);
}

static enum errcode
run_c04(const char *b, size_t n, struct import_report *rep)
{
	struct site_eop_row rows[4];
	struct eop_seen es = { 0, 4, rows };

	return import_eop_c04(b, n, on_eop, &es, rep);
}

static const struct {
	const char *name;
	enum errcode (*run)(const char *, size_t, struct import_report *);
	const char *good;	/* a small good file */
} parsers[] = {
	{ "ini", run_ini, INI_REQUIRED },
	{ "targets", run_targets, "id,name,lat_deg,lon_deg\nA,Alpha,1,2\n" },
	{ "attempts", run_attempts, IMPORT_ATTEMPTS_COLUMNS "\n"
	    "A,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,1,1,0,ranged,,,\n" },
	{ "crd", run_crd, "H1 CRD 1 2026 3 2 1\nH2 TSTP 9998 1 1 7\n"
	    "H3 x na na na 0 2\nH4 1 2026 3 1 4 0 0 2026 3 1 5 0 0 0 1 0 0 1 "
	    "0 2 0\n11 14500.0 2.5 std1 2 120.0 25 51.0 na na na 1.0 0\n"
	    "H8\nH9\n" },
	{ "finals", run_finals, "2412 1 60645.00 I  0.196498 0.000090  "
	    "0.492936 0.000090  I 0.0907574 0.0000120 -0.1848 0.0100\n" },
	{ "c04", run_c04, "2016  12  31  57753   0.081284   0.263013  "
	    "-0.4077492   0.0009173\n" },
};

/* Each parser: its good file passes; with a NUL byte or a byte that is
   not UTF-8 put into its second line, ERRCODE_IO names that line; with
   CRLF line ends and a byte-order mark it passes too. */
static void
test_import_text_rules(void **state)
{
	(void)state;
	for (size_t i = 0; i < sizeof parsers / sizeof parsers[0]; i++) {
		char buf[1024], crlf[1200];
		struct import_report rep;
		const char *nl;
		size_t n = strlen(parsers[i].good), at, m = 0;

		assert_true(n < sizeof buf);
		if (parsers[i].run(parsers[i].good, n, &rep) != ERRCODE_OK) {
			dump(&rep, parsers[i].name);
			fail_msg("%s: good file refused", parsers[i].name);
		}
		/* second line, or the first when there is one */
		nl = strchr(parsers[i].good, '\n');
		at = (nl != NULL && (size_t)(nl - parsers[i].good) + 3 < n) ?
		    (size_t)(nl - parsers[i].good) + 2 : 1;
		memcpy(buf, parsers[i].good, n);
		buf[at] = '\0';
		assert_int_equal(parsers[i].run(buf, n, &rep), ERRCODE_IO);
		expect_error(&rep, at == 1 ? 1 : 2, "", "NUL byte",
		    parsers[i].name);
		buf[at] = '\xff';
		assert_int_equal(parsers[i].run(buf, n, &rep), ERRCODE_IO);
		expect_error(&rep, at == 1 ? 1 : 2, "", "invalid UTF-8 byte "
		    "0xFF", parsers[i].name);
		/* BOM + CRLF */
		memcpy(crlf, "\xef\xbb\xbf", 3);
		m = 3;
		for (size_t j = 0; j < n; j++) {
			if (parsers[i].good[j] == '\n')
				crlf[m++] = '\r';
			crlf[m++] = parsers[i].good[j];
		}
		if (parsers[i].run(crlf, m, &rep) != ERRCODE_OK) {
			dump(&rep, parsers[i].name);
			fail_msg("%s: CRLF file refused", parsers[i].name);
		}
		/* an empty buffer is never good */
		assert_int_not_equal(parsers[i].run("", 0, &rep), ERRCODE_OK);
		assert_true(rep.nerrors >= 1);
	}
}

/* A file cut short inside its last line: a per-line error for each. */
static void
test_import_truncated(void **state)
{
	static const struct {
		size_t parser;		/* index in parsers[] */
		const char *text;
		size_t line;
		const char *field, *part;
	} cases[] = {
		{ 0, INI_REQUIRED "[laser]\nfire_ra", 9, "", "not a [section]" },
		{ 0, "[station]\nname = X\ncode = T\nlat_deg = 1\n"
		    "lon_deg = 2\nheight_m = 3\ntime_zo", 7, "", "not a" },
		{ 1, "id,name,lat_deg,lon_deg\nA,Alpha,1,2\nB,Be", 3, "",
		    "row has 2 fields" },
		{ 2, IMPORT_ATTEMPTS_COLUMNS "\nA,2026-03-01T04:00:00Z,20", 2,
		    "", "row has 3 fields" },
		{ 3, "H1 CRD 1 2026 3 2 1\nH2 TSTP 9998 1 1 7\nH3 x na na "
		    "na 0 2\nH4 1 2026 3 1 4 0 0 2026 3 1 5 0 0 0 1 0 0 1 0 2 0"
		    "\n11 14500.0 2.5 std1 2 120", 5, "11", "6 fields" },
		{ 4, "2412 1 60645.00 I  0.196498 0.000090  0.492936 0.000090  "
		    "I 0.09075", 1, "UT1-UTC", "truncated?" },
		{ 5, "2016  12  31  57753   0.081284   0.263013  -0.40775", 1,
		    "UT1-UTC", "truncated?" },
	};

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		struct import_report rep;
		char what[40];

		snprintf(what, sizeof what, "truncated %s",
		    parsers[cases[i].parser].name);
		assert_int_equal(parsers[cases[i].parser].run(cases[i].text,
		    strlen(cases[i].text), &rep), ERRCODE_BAD_ARG);
		expect_error(&rep, cases[i].line, cases[i].field,
		    cases[i].part, what);
	}
}

/* ------------------------------------------------------------------ */
/* CSV                                                                 */
/* ------------------------------------------------------------------ */

static void
test_import_targets_sample(void **state)
{
	struct targets_seen ts = { 0 };
	struct import_report rep;
	size_t len;
	char *buf = sample("targets.csv", &len);

	(void)state;
	assert_int_equal(import_targets_csv(buf, len, on_target, &ts, &rep),
	    ERRCODE_OK);
	dump(&rep, "targets.csv");
	assert_int_equal(ts.n, 5);
	assert_int_equal(rep.records, 5);
	for (size_t i = 0; i < ts.n; i++) {
		/* the sample rule: near side, |lat| < 30, |lon| < 45 */
		assert_true(fabs(ts.t[i].lat_deg) < 30.0);
		assert_true(fabs(ts.t[i].lon_deg) < 45.0);
		assert_true(ts.t[i].strength > 0.0);
		assert_true(ts.t[i].alias[0] != '\0');
		assert_non_null(strstr(ts.t[i].name, "invented"));
		assert_int_equal(ts.t[i].active, 1);
	}
	free(buf);
}

static void
test_import_targets_columns(void **state)
{
	/* any column order, optional columns absent, CRLF line ends */
	static const char text[] = "lon_deg,lat_deg,name,id\r\n"
	    "-5.5,12.25,\"First, with a comma\",A1\r\n"
	    "\r\n"
	    "7,-3,Second,B.2\r\n";
	struct targets_seen ts = { 0 };
	struct import_report rep;

	(void)state;
	assert_int_equal(import_targets_csv(text, strlen(text), on_target,
	    &ts, &rep), ERRCODE_OK);
	assert_int_equal(ts.n, 2);
	assert_string_equal(ts.t[0].id, "A1");
	assert_string_equal(ts.t[0].name, "First, with a comma");
	check_near(ts.t[0].lat_deg, 12.25, 0.0, "deg", "as written");
	check_near(ts.t[0].lon_deg, -5.5, 0.0, "deg", "as written");
	/* defaults of absent optional columns (the column table) */
	check_near(ts.t[0].strength, 1.0, 0.0, "", "default strength");
	check_near(ts.t[0].height_m, 0.0, 0.0, "m", "default height");
	assert_int_equal(ts.t[0].active, 1);
	assert_int_equal(ts.t[0].dark_only, 0);
	assert_string_equal(ts.t[0].alias, "");
	assert_int_equal(ts.line[0], 2);
	assert_int_equal(ts.line[1], 4);
}

static void
test_import_targets_bad(void **state)
{
#define TH "id,name,alias,lat_deg,lon_deg,height_m,strength,dark_only,active\n"
	static const struct bad_case cases[] = {
		{ TH "A,Alpha,a,95,0,0,1,0,1\n", 2, "lat_deg",
		    "out of range -90..90" },
		{ TH "A,Alpha,a,5,east,0,1,0,1\n", 2, "lon_deg",
		    "not a number" },
		{ TH "A B,Alpha,a,5,0,0,1,0,1\n", 2, "id", "letters, digits" },
		{ TH "A,Alpha,a,5,0,0,0,0,1\n", 2, "strength", "out of range" },
		{ TH "A,Alpha,a,5,0,0,1,maybe,1\n", 2, "dark_only",
		    "true/false" },
		{ TH "A,,a,5,0,0,1,0,1\n", 2, "name", "empty" },
		{ TH "A,Alpha,a,5,0,0,1,0\n", 2, "", "row has 8 fields, the "
		    "header has 9" },
		{ "id,name,lat_deg\nA,B,1\n", 1, "lon_deg",
		    "required column missing" },
		{ "id,name,lat_deg,lon_deg,colour\n", 1, "colour",
		    "unknown column" },
		{ "id,name,lat_deg,lat_deg,lon_deg\n", 1, "lat_deg",
		    "column given twice" },
		{ "", 0, "", "empty file" },
		{ "# only a comment\n", 0, "", "empty file" },
	};
#undef TH

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		struct targets_seen ts = { 0 };
		struct import_report rep;
		char what[32];

		snprintf(what, sizeof what, "targets case %zu", i);
		assert_int_equal(import_targets_csv(cases[i].text,
		    strlen(cases[i].text), on_target, &ts, &rep),
		    ERRCODE_BAD_ARG);
		assert_int_equal(ts.n, 0);
		expect_error(&rep, cases[i].line, cases[i].field,
		    cases[i].part, what);
	}
}

#define AH IMPORT_ATTEMPTS_COLUMNS "\n"
#define AROW "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,6000,40,2," \
	"ranged,op-a,1.2,fine\n"

static void
test_import_attempts_good(void **state)
{
	static const char text[] = "# comment before the header\n" AH AROW
	    "OSPREY,2026-03-01T05:00:00Z,2026-03-01T05:20:00.5Z,0,0,0,"
	    "weather,\"op \"\"b\"\"\",,\"clouds, then rain\nclosed\"\r\n"
	    "TERN,2026-03-01T06:00:00+01:00,2026-03-01T05:30:00Z,10,0,0,"
	    "no_returns,,,";
	struct attempts_seen s;
	struct import_report rep;
	double u1, u2;

	(void)state;
	assert_int_equal(parse_attempts(text, &s, &rep), ERRCODE_OK);
	dump(&rep, "attempts good");
	assert_int_equal(s.n, 3);
	assert_int_equal(rep.records, 3);
	assert_int_equal(s.line[0], 3);
	assert_int_equal(s.line[1], 4);
	assert_int_equal(s.line[2], 6);	/* after the quoted newline */
	assert_string_equal(s.a[0].target, "HERON");
	assert_int_equal(s.a[0].shots, 6000);
	assert_int_equal(s.a[0].returns, 40);
	assert_int_equal(s.a[0].normal_points, 2);
	assert_int_equal(s.a[0].outcome, SITE_OUTCOME_RANGED);
	assert_string_equal(s.a[0].operator_name, "op-a");
	check_near(s.a[0].seeing_arcsec, 1.2, 0.0, "arcsec", "as written");
	/* 2026-03-01 = MJD 61100 (eraCal2jd) */
	assert_int_equal(eraCal2jd(2026, 3, 1, &u1, &u2), 0);
	check_near(s.a[0].start_mjd, u2 + 4.0 / 24.0, 1e-10, "d",
	    "start MJD (eraCal2jd + 4 h)");
	check_near((s.a[0].end_mjd - s.a[0].start_mjd) * 86400.0, 600.0, 1e-5,
	    "s", "10 minutes");
	assert_string_equal(s.a[1].operator_name, "op \"b\"");
	assert_string_equal(s.a[1].notes, "clouds, then rain\nclosed");
	assert_true(isnan(s.a[1].seeing_arcsec));
	assert_int_equal(s.a[1].outcome, SITE_OUTCOME_WEATHER);
	/* +01:00 offset: 06:00 local is 05:00 UTC */
	check_near(s.a[2].start_mjd, u2 + 5.0 / 24.0, 1e-10, "d",
	    "offset subtracted");
	assert_string_equal(s.a[2].notes, "");
}

static void
test_import_attempts_bad(void **state)
{
	static const struct bad_case cases[] = {
		/* wrong column count */
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,6000,40,"
		    "2,ranged,op,1.2\n", 2, "", "row has 9 fields, the header "
		    "has 10" },
		/* bad times */
		{ AH "HERON,2026-03-01 04:00:00Z,2026-03-01T04:10:00Z,1,1,0,"
		    "ranged,,,\n", 2, "start_utc", "expected 'T'" },
		{ AH "HERON,2026-02-30T04:00:00Z,2026-03-01T04:10:00Z,1,1,0,"
		    "ranged,,,\n", 2, "start_utc", "does not exist" },
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00,1,1,0,"
		    "ranged,,,\n", 2, "end_utc", "'Z' or +HH:MM" },
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T03:10:00Z,1,1,0,"
		    "ranged,,,\n", 2, "end_utc", "not after start_utc" },
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-03T04:10:00Z,1,1,0,"
		    "ranged,,,\n", 2, "end_utc", "longer than 24 hours" },
		/* counts */
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,-5,1,0,"
		    "ranged,,,\n", 2, "shots", "-5 is negative" },
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,5,1.5,0,"
		    "ranged,,,\n", 2, "returns", "not a whole number" },
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,5,"
		    "99999999999999999999999,0,ranged,,,\n", 2, "returns",
		    "too large" },
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,5,1,3,"
		    "ranged,,,\n", 2, "normal_points", "at least one return" },
		/* outcome */
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,5,1,0,"
		    "Ranged,,,\n", 2, "outcome", "not one of ranged" },
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,5,1,0,"
		    "success,,,\n", 2, "outcome", "not one of" },
		/* other fields */
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,5,1,0,"
		    "ranged,,-1,\n", 2, "seeing_arcsec", "out of range" },
		{ AH "HER ON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,5,1,0,"
		    "ranged,,,\n", 2, "target", "letters" },
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,5,1,0,"
		    "ranged,\"op\x01\",,\n", 2, "operator", "control" },
		/* RFC 4180 syntax */
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,5,1,0,"
		    "ranged,o\"p,,\n", 2, "operator", "quote inside an "
		    "unquoted field" },
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,5,1,0,"
		    "ranged,\"op\"x,,\n", 2, "operator", "after the closing "
		    "quote" },
		{ AH AROW "HERON,2026-03-02T04:00:00Z,2026-03-02T04:10:00Z,5,"
		    "1,0,ranged,op,,\"unfinished note\n", 3, "notes",
		    "never closes (truncated file?)" },
		{ AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,5,1,0,"
		    "ranged,op\r,,\n", 2, "operator", "carriage return" },
		/* truncated last line (no line end, cut inside a row) */
		{ AH AROW "OSPREY,2026-03-02T04:00:00Z,2026-03-02T0", 3, "",
		    "row has 3 fields" },
		/* header problems */
		{ "target,start_utc,end_utc,shots,returns,normal_points\n", 1,
		    "outcome", "required column missing" },
		{ IMPORT_ATTEMPTS_COLUMNS ",weather_kind\n", 1,
		    "weather_kind", "unknown column" },
	};

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		struct attempts_seen s;
		struct import_report rep;
		char what[32];

		snprintf(what, sizeof what, "attempts case %zu", i);
		assert_int_equal(parse_attempts(cases[i].text, &s, &rep),
		    ERRCODE_BAD_ARG);
		expect_error(&rep, cases[i].line, cases[i].field,
		    cases[i].part, what);
	}
}

/* Every bad row is reported, good rows still counted; the caller gets
   all lines at once. */
static void
test_import_attempts_all_errors(void **state)
{
	static const char text[] = AH AROW
	    "HERON,bad,2026-03-01T04:10:00Z,1,1,0,ranged,,,\n"
	    AROW
	    "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,-1,1,0,"
	    "ranged,,,\n"
	    "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,1,1,0,"
	    "lost,,,\n";
	struct attempts_seen s;
	struct import_report rep;

	(void)state;
	assert_int_equal(parse_attempts(text, &s, &rep), ERRCODE_BAD_ARG);
	assert_int_equal(rep.records, 2);
	assert_int_equal(rep.bad, 3);
	assert_int_equal(rep.nerrors, 3);
	expect_error(&rep, 3, "start_utc", "invalid UTC time", "all");
	expect_error(&rep, 5, "shots", "negative", "all");
	expect_error(&rep, 6, "outcome", "'lost'", "all");
}

static void
test_import_attempts_callback_stops(void **state)
{
	static const char text[] = AH AROW AROW AROW;
	struct attempts_seen s;
	struct import_report rep;
	static struct site_attempt store[MAXREC];

	(void)state;
	memset(&s, 0, sizeof s);
	s.a = store;
	s.stop_at_2 = ERRCODE_DB;
	assert_int_equal(import_attempts_csv(text, strlen(text), on_attempt,
	    &s, &rep), ERRCODE_DB);
	assert_int_equal(s.n, 2);
}

static void
test_import_error_format(void **state)
{
	struct attempts_seen s;
	struct import_report rep;
	char line[300];

	(void)state;
	parse_attempts(AH "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,"
	    "-2,1,0,ranged,,,\n", &s, &rep);
	import_error_format(&rep, 0, "log.csv", line, sizeof line);
	assert_string_equal(line, "log.csv:2: field 'shots': -2 is negative; "
	    "counts are whole numbers >= 0");
	import_error_format(&rep, 5, "log.csv", line, sizeof line);
	assert_string_equal(line, "log.csv: no such error");
}

/* Records beyond the reader's bounds are refused, and the rows after
   them still read with their own line numbers. */
static void
test_import_csv_limits(void **state)
{
	static char text[20000];
	struct attempts_seen s;
	struct import_report rep;
	size_t n;

	(void)state;
	n = (size_t)snprintf(text, sizeof text, "%s", AH);
	for (int i = 0; i < 40; i++)
		n += (size_t)snprintf(text + n, sizeof text - n, "x,");
	n += (size_t)snprintf(text + n, sizeof text - n, "x\n");
	n += (size_t)snprintf(text + n, sizeof text - n, "HERON,2026-03-01T04:"
	    "00:00Z,2026-03-01T04:10:00Z,5,1,0,ranged,op,,");
	memset(text + n, 'n', 9000);
	n += 9000;
	n += (size_t)snprintf(text + n, sizeof text - n, "\n%s", AROW);
	assert_int_equal(parse_attempts(text, &s, &rep), ERRCODE_BAD_ARG);
	expect_error(&rep, 2, "", "record longer than 8192 bytes or 32 "
	    "fields", "41 fields");
	expect_error(&rep, 3, "notes", "record longer than 8192", "9000 bytes");
	assert_int_equal(rep.bad, 2);
	assert_int_equal(s.n, 1);
	assert_int_equal(s.line[0], 4);
}

/* The many-error case keeps IMPORT_MAX_ERRORS and counts them all. */
static void
test_import_error_cap(void **state)
{
	static char text[16384];
	struct attempts_seen s;
	struct import_report rep;
	size_t n;

	(void)state;
	n = (size_t)snprintf(text, sizeof text, "%s", AH);
	for (int i = 0; i < 120; i++)
		n += (size_t)snprintf(text + n, sizeof text - n,
		    "HERON,2026-03-01T04:00:00Z,2026-03-01T04:10:00Z,-1,1,0,"
		    "ranged,,,\n");
	assert_int_equal(parse_attempts(text, &s, &rep), ERRCODE_BAD_ARG);
	assert_int_equal(rep.bad, 120);
	assert_int_equal(rep.nerrors, IMPORT_MAX_ERRORS);
}

/* The sample log: >= 300 rows over two years, each at night with the
   Moon above the station's limit, skewed to the quarters. */
static void
test_import_attempts_sample(void **state)
{
	struct attempts_seen s;
	struct import_report rep;
	struct site_station st;
	struct geom_site gs;
	struct geom_eop eop = { 0.0, 0.0, 0.0 };
	size_t len, slen, quarter = 0, syzygy = 0;
	double first = 1e9, last = -1e9;
	char *buf = sample("attempts.csv", &len);
	char *sbuf = sample("station.ini", &slen);
	size_t tlen;
	char *tbuf = sample("targets.csv", &tlen);
	struct targets_seen ts = { 0 };
	static struct site_attempt store[MAXREC];

	(void)state;
	assert_int_equal(import_targets_csv(tbuf, tlen, on_target, &ts, &rep),
	    ERRCODE_OK);
	assert_int_equal(import_station_ini(sbuf, slen, &st, &rep),
	    ERRCODE_OK);
	assert_int_equal(geom_site_init(&gs, st.lat_deg * ERFA_DD2R,
	    st.lon_deg * ERFA_DD2R, st.height_m, NULL), ERRCODE_OK);
	memset(&s, 0, sizeof s);
	s.a = store;
	assert_int_equal(import_attempts_csv(buf, len, on_attempt, &s, &rep),
	    ERRCODE_OK);
	dump(&rep, "attempts.csv");
	assert_int_equal(rep.bad, 0);
	assert_true(s.n >= 300);
	assert_true(s.n <= MAXREC);
	for (size_t i = 0; i < s.n; i++) {
		const struct site_attempt *a = &s.a[i];
		struct geom_instant g;
		double syn;
		size_t k;

		/* every attempt names a target of targets.csv */
		for (k = 0; k < ts.n; k++)
			if (strcmp(ts.t[k].id, a->target) == 0)
				break;
		assert_true(k < ts.n);
		if (a->start_mjd < first)
			first = a->start_mjd;
		if (a->end_mjd > last)
			last = a->end_mjd;
		assert_int_equal(geom_instant_at(&gs, &eop, ERFA_DJM0,
		    (a->start_mjd + a->end_mjd) / 2.0, GEOM_PREC_FAST, &g),
		    ERRCODE_OK);
		/* the station's limits (station.ini): Moon >= 20 deg, Sun
		   <= -12 deg at the mid-time */
		if (!(g.moon.el > 20.0 * ERFA_DD2R) ||
		    !(g.sun.el < -12.0 * ERFA_DD2R)) {
			print_error("attempts.csv line %zu: Moon el %.2f, Sun "
			    "el %.2f deg\n", s.line[i], g.moon.el * ERFA_DR2D,
			    g.sun.el * ERFA_DR2D);
			fail();
		}
		syn = g.moon.synodic * ERFA_DR2D;
		if (fabs(check_wrap180(syn - 90.0)) < 30.0 ||
		    fabs(check_wrap180(syn - 270.0)) < 30.0)
			quarter++;
		if (fabs(check_wrap180(syn)) < 30.0 ||
		    fabs(check_wrap180(syn - 180.0)) < 30.0)
			syzygy++;
	}
	/* two years: 2025-01 to 2026-11 is more than 690 days */
	assert_true(last - first > 690.0);
	/* the skew: quarter bins hold several times the syzygy bins
	   (common practice: real logs share it) */
	print_message("  quarter %zu, new/full %zu of %zu\n", quarter, syzygy,
	    s.n);
	assert_true(quarter > 3 * syzygy);
	free(buf);
	free(sbuf);
	free(tbuf);
}

/* The parsers allocate nothing: a failing allocator changes nothing. */
static void
test_import_no_allocation(void **state)
{
	struct attempts_seen s;
	struct import_report rep;
	struct site_station st;
	size_t len;
	char *buf = sample("attempts.csv", &len);
	char *ini;
	static struct site_attempt store[MAXREC];

	(void)state;
	memset(&s, 0, sizeof s);
	s.a = store;
	mem_fail_after(1);
	assert_int_equal(import_attempts_csv(buf, len, on_attempt, &s, &rep),
	    ERRCODE_OK);
	free(buf);
	buf = sample("station.ini", &len);
	assert_int_equal(import_station_ini(buf, len, &st, &rep), ERRCODE_OK);
	/* the switch is still armed: nothing called the allocator */
	assert_int_equal(mem_fail_after(0), 0);
	mem_fail_after(1);
	ini = mem_strdup("x");
	assert_null(ini);		/* and it does fire */
	mem_fail_after(0);
	free(buf);
}

/* ------------------------------------------------------------------ */
/* CRD                                                                 */
/* ------------------------------------------------------------------ */

static void
test_import_crd_sample(void **state)
{
	struct nps_seen ns;
	struct import_report rep;
	struct targets_seen ts = { 0 };
	struct site_station st;
	struct geom_site gs;
	struct geom_eop eop = { 0.0, 0.0, 0.0 };
	size_t len, tlen, slen;
	char *buf = sample("normalpoints.crd", &len);
	char *tbuf = sample("targets.csv", &tlen);
	char *sbuf = sample("station.ini", &slen);

	(void)state;
	memset(&ns, 0, sizeof ns);
	assert_int_equal(import_station_ini(sbuf, slen, &st, &rep),
	    ERRCODE_OK);
	assert_int_equal(import_targets_csv(tbuf, tlen, on_target, &ts, &rep),
	    ERRCODE_OK);
	assert_int_equal(import_crd(buf, len, on_np, &ns, &rep), ERRCODE_OK);
	dump(&rep, "normalpoints.crd");
	assert_int_equal(rep.bad, 0);
	assert_true(ns.n >= 10 && ns.n <= 64);
	assert_true(rep.skipped > 0);	/* 00, C0, 20 and 50 records */
	assert_int_equal(geom_site_init(&gs, st.lat_deg * ERFA_DD2R,
	    st.lon_deg * ERFA_DD2R, st.height_m, NULL), ERRCODE_OK);
	for (size_t i = 0; i < ns.n; i++) {
		const struct import_crd_np *np = &ns.np[i];
		struct geom_target gt;
		struct geom_target_view v;
		struct geom_instant g;
		size_t k;

		assert_string_equal(np->np.station_code, st.code);
		assert_int_equal(np->crd_version, 2);
		for (k = 0; k < ts.n; k++)
			if (strcmp(ts.t[k].alias, np->target_name) == 0)
				break;
		assert_true(k < ts.n);	/* every name maps through alias */
		/* the time of flight is the geometry core's round trip at
		   the epoch (how the file was made): this checks the
		   epoch to ~1 ms, as the round trip changes < 10 us/s */
		assert_int_equal(geom_target_from_selen(ts.t[k].lat_deg *
		    ERFA_DD2R, ts.t[k].lon_deg * ERFA_DD2R, ts.t[k].height_m,
		    &gt), ERRCODE_OK);
		assert_int_equal(geom_instant_at(&gs, &eop, ERFA_DJM0,
		    np->np.epoch_mjd, GEOM_PREC_FAST, &g), ERRCODE_OK);
		geom_target_view(&g, &gt, &v);
		check_near(np->np.tof_s, v.round_trip, 1e-8, "s",
		    "CRD time of flight vs geom round trip");
		/* lunar two-way times of flight, 2.3..2.8 s (Moon distance
		   356,000..407,000 km, common practice) */
		assert_true(np->np.tof_s > 2.3 && np->np.tof_s < 2.8);
		assert_true(np->np.photons > 0);
		assert_false(isnan(np->np.rms_ps));
	}
	free(buf);
	free(tbuf);
	free(sbuf);
}

#define CRD_V1_HEAD "h1 CRD  1 2026  3  2  1\n" \
	"h2 TSTP       9998 01 01  7\n" \
	"h3 testarr    na na na 0 2\n"

static void
test_import_crd_midnight(void **state)
{
	/* a version 1 session from 23:50 to 00:20, lower-case record
	   types, a full-rate record skipped */
	static const char text[] = CRD_V1_HEAD
	    "h4  1 2026  3  1 23 50  0 2026  3  2  0 20  0  0 1 0 0 1 0 2 0\n"
	    "10 86000.5 2.5 std1 2 0 0 0 0\n"
	    "11 86000.5 2.512345678901 std1 2 120.0 25 51.0 na na na 1.0 0\n"
	    "11 300.25 2.512000000000 std1 2 120.0 7 48.5 na na na 0.3 0\n"
	    "h8\n"
	    "h9\n";
	struct nps_seen ns;
	struct import_report rep;
	double d1, d2;

	(void)state;
	memset(&ns, 0, sizeof ns);
	assert_int_equal(import_crd(text, strlen(text), on_np, &ns, &rep),
	    ERRCODE_OK);
	dump(&rep, "midnight");
	assert_int_equal(ns.n, 2);
	assert_int_equal(rep.skipped, 1);
	assert_int_equal(eraCal2jd(2026, 3, 1, &d1, &d2), 0);
	/* 2026-03-01 + 86000.5 s; then 2026-03-02 + 300.25 s (eraCal2jd) */
	check_near(ns.np[0].np.epoch_mjd, d2 + 86000.5 / 86400.0, 1e-10, "d",
	    "epoch before midnight");
	check_near(ns.np[1].np.epoch_mjd, d2 + 1.0 + 300.25 / 86400.0, 1e-10,
	    "d", "epoch after midnight, next day");
	assert_string_equal(ns.np[0].target_name, "testarr");
	assert_string_equal(ns.np[0].np.station_code, "TSTP");
	check_near(ns.np[0].np.tof_s, 2.512345678901, 0.0, "s", "as written");
	assert_int_equal(ns.np[0].np.photons, 25);
	check_near(ns.np[1].np.rms_ps, 48.5, 0.0, "ps", "as written");
	assert_int_equal(ns.np[0].crd_version, 1);
	assert_int_equal(ns.np[0].session_line, 4);
	assert_int_equal(ns.line[1], 7);
}

static void
test_import_crd_leap_second(void **state)
{
	/* seconds of day 86400.5 exist only on a day with a leap second:
	   2016-12-31 has one (ERFA's table; IERS Bulletin C 52) */
	static const char good[] = CRD_V1_HEAD
	    "H4  1 2016 12 31 23 50  0 2017  1  1  0 10  0  0 1 0 0 1 0 2 0\n"
	    "11 86400.5 2.5 std1 2 120.0 25 51.0 na na na 1.0 0\n"
	    "H8\nH9\n";
	static const char bad[] = CRD_V1_HEAD
	    "H4  1 2016 12 30 23 50  0 2016 12 31  0 10  0  0 1 0 0 1 0 2 0\n"
	    "11 86400.5 2.5 std1 2 120.0 25 51.0 na na na 1.0 0\n"
	    "H8\nH9\n";
	struct nps_seen ns;
	struct import_report rep;
	double d1, d2;

	(void)state;
	memset(&ns, 0, sizeof ns);
	assert_int_equal(import_crd(good, strlen(good), on_np, &ns, &rep),
	    ERRCODE_OK);
	assert_int_equal(ns.n, 1);
	assert_int_equal(eraCal2jd(2016, 12, 31, &d1, &d2), 0);
	/* the UTC quasi-MJD of a leap-second day runs over 86401 s (ERFA) */
	check_near(ns.np[0].np.epoch_mjd, d2 + 86400.5 / 86401.0, 1e-10, "d",
	    "epoch inside the leap second");
	memset(&ns, 0, sizeof ns);
	assert_int_equal(import_crd(bad, strlen(bad), on_np, &ns, &rep),
	    ERRCODE_BAD_ARG);
	expect_error(&rep, 5, "seconds_of_day", "no such UTC time",
	    "no leap second that day");
}

static void
test_import_crd_bad(void **state)
{
#define H4OK "H4  1 2026  3  1  4  0  0 2026  3  1  5  0  0  0 1 0 0 1 0 2 0\n"
#define NPOK "11 14500.0 2.5 std1 2 120.0 25 51.0 na na na 1.0 0\n"
	static const struct bad_case cases[] = {
		{ "H2 TSTP 9998 01 01 7\n", 1, "H2", "first record must be "
		    "H1" },
		{ "H1 CPF 1 2026 3 2 1\nH9\n", 1, "H1", "expected 'H1 CRD" },
		{ "H1 CRD 3 2026 3 2 1\nH9\n", 1, "H1", "expected 'H1 CRD" },
		{ "", 0, "", "no H1 record" },
		{ CRD_V1_HEAD NPOK "H9\n", 4, "11", "outside a session" },
		{ CRD_V1_HEAD H4OK NPOK "H8\n", 6, "H9", "truncated" },
		{ CRD_V1_HEAD H4OK "11 14500.0 2.5 std1 2 120.0 25 51.0 na "
		    "na na 1.0\nH8\nH9\n", 5, "11", "12 fields" },
		{ CRD_V1_HEAD H4OK "11 14500.0 2.5 std1 2 120.0 25 51.0 na "
		    "na na 1.0 0 na\nH8\nH9\n", 5, "11", "14 fields" },
		{ CRD_V1_HEAD H4OK "11 14500.0 0.012 std1 2 120.0 25 51.0 na "
		    "na na 1.0 0\nH8\nH9\n", 5, "time_of_flight", "lunar" },
		{ CRD_V1_HEAD H4OK "11 14500.0 2.5 std1 2 120.0 -3 51.0 na "
		    "na na 1.0 0\nH8\nH9\n", 5, "return_count", "whole number" },
		{ CRD_V1_HEAD H4OK "11 14500.0 2.5 std1 2 120.0 3 -1 na "
		    "na na 1.0 0\nH8\nH9\n", 5, "bin_rms", "picoseconds" },
		{ CRD_V1_HEAD H4OK "11 1e9 2.5 std1 2 120.0 3 1 na "
		    "na na 1.0 0\nH8\nH9\n", 5, "seconds_of_day", "0..86400" },
		{ CRD_V1_HEAD H4OK "11 20000.0 2.5 std1 2 120.0 3 1 na "
		    "na na 1.0 0\nH8\nH9\n", 5, "seconds_of_day",
		    "after the end of the session" },
		{ CRD_V1_HEAD H4OK NPOK "Q7 1 2 3\nH8\nH9\n", 6, "",
		    "unknown record type 'Q7'" },
		{ CRD_V1_HEAD H4OK NPOK "H8\nH9\n" NPOK, 8, "11",
		    "after the H9" },
		{ CRD_V1_HEAD H4OK NPOK H4OK "H8\nH9\n", 6, "H4",
		    "before H8 closed" },
		{ CRD_V1_HEAD "H4  1 2026  2 30  4  0  0 2026  3  1  5  0  0 "
		    " 0 1 0 0 1 0 2 0\n" NPOK "H8\nH9\n", 4, "H4",
		    "bad session start" },
		{ CRD_V1_HEAD "H4  1 2026  3  1  4  0  0\n" NPOK "H8\nH9\n", 4,
		    "H4", "at least 14" },
		{ CRD_V1_HEAD "H4  1 2026  2 30  4  0  0 2026  3  1  5  0  0 "
		    " 0 1 0 0 1 0 2 0\n" NPOK "H8\nH9\n", 5, "11",
		    "session header on line 4 is invalid" },
		{ "H1 CRD 1 2026 3 2 1\nH4  1 2026  3  1  4  0  0 2026  3  1 "
		    " 5  0  0  0 1 0 0 1 0 2 0\nH8\nH9\n", 2, "H4",
		    "before the H2" },
		{ "H1 CRD 1 2026 3 2 1\nH2\n", 2, "H2",
		    "missing or bad station name" },
		{ "H1 CRD 1 2026 3 2 1\nH2 TSTP 9998 1 1 7\nH3 bad/name na\n",
		    3, "H3", "missing or bad target name" },
		{ CRD_V1_HEAD H4OK "H2 OTHR 9997 1 1 7\n" NPOK "H8\nH9\n", 5,
		    "H2", "station header inside the session opened on line 4" },
		{ CRD_V1_HEAD H4OK "H3 other na na na 0 2\n" NPOK "H8\nH9\n", 5,
		    "H3", "target header inside the session opened on line 4" },
	};
#undef H4OK
#undef NPOK

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		struct nps_seen ns;
		struct import_report rep;
		char what[32];

		memset(&ns, 0, sizeof ns);
		snprintf(what, sizeof what, "crd case %zu", i);
		assert_int_equal(import_crd(cases[i].text,
		    strlen(cases[i].text), on_np, &ns, &rep),
		    ERRCODE_BAD_ARG);
		expect_error(&rep, cases[i].line, cases[i].field,
		    cases[i].part, what);
	}
}

/* ------------------------------------------------------------------ */
/* IERS finals                                                         */
/* ------------------------------------------------------------------ */

/*
 * One finals2000A line built column by column from ReadMe.finals2000A
 * (python3-astropy): year 1-2, month 3-4, day 5-6, MJD 8-15 (F8.2), PM
 * flag 17, PM-x 19-27 (F9.6), its error 28-36, PM-y 38-46, its error
 * 47-55, UT1 flag 58, UT1-UTC 59-68 (F10.7), its error 69-78, LOD 80-86,
 * its error 87-93; nutation and Bulletin B columns after that.
 */
/* Write text at 1-based column first of line (no terminator). */
static void
put_col(char *line, size_t first, const char *text)
{
	memcpy(line + first - 1, text, strlen(text));
}

static void
finals_line(char *out, size_t cap, int y, int m, int d, double mjd, char pf,
    double x, double yp, char uf, double dut1)
{
	char line[200], f[40];

	memset(line, ' ', sizeof line);
	snprintf(f, sizeof f, "%2d%2d%2d", y % 100, m, d);
	put_col(line, 1, f);
	snprintf(f, sizeof f, "%8.2f", mjd);
	put_col(line, 8, f);
	line[16] = pf;
	snprintf(f, sizeof f, "%9.6f%9.6f", x, 0.000091);
	put_col(line, 19, f);
	snprintf(f, sizeof f, "%9.6f%9.6f", yp, 0.000087);
	put_col(line, 38, f);
	line[57] = uf;
	snprintf(f, sizeof f, "%10.7f%10.7f", dut1, 0.0000101);
	put_col(line, 59, f);
	snprintf(f, sizeof f, "%7.4f%7.4f", 1.2345, 0.0102);
	put_col(line, 80, f);
	/* nutation and Bulletin B columns, present but not used */
	put_col(line, 94, "  P    -0.766    0.199    -0.720    0.300   "
	    ".143000   .137000   .8075000   -18.637    -3.667");
	line[187] = '\0';
	snprintf(out, cap, "%.187s\n", line);
}

static void
test_import_finals_columns(void **state)
{
	char text[4000], l[240];
	struct site_eop_row rows[8];
	struct eop_seen es = { 0, 8, rows };
	struct import_report rep;
	size_t n = 0;

	(void)state;
	n += (size_t)snprintf(text + n, sizeof text - n, "# demo header, a "
	    "comment in our reader\n");
	/* 1999-12-31 = MJD 51543 and 2000-01-01 = MJD 51544 (eraCal2jd):
	   the two-digit year turns over between them (ReadMe) */
	finals_line(l, sizeof l, 1999, 12, 31, 51543.0, 'I', 0.043313,
	    0.377861, 'I', 0.3555338);
	n += (size_t)snprintf(text + n, sizeof text - n, "%s", l);
	finals_line(l, sizeof l, 2000, 1, 1, 51544.0, 'I', 0.043096,
	    0.378092, 'I', 0.3554019);
	n += (size_t)snprintf(text + n, sizeof text - n, "%s", l);
	finals_line(l, sizeof l, 2000, 1, 2, 51545.0, 'P', -0.5, 0.5, 'P',
	    -0.8999999);
	n += (size_t)snprintf(text + n, sizeof text - n, "%s", l);
	/* beyond the predictions: date only, skipped */
	n += (size_t)snprintf(text + n, sizeof text - n, " 0 1 3 51546.00\n");
	assert_int_equal(import_eop_finals(text, n, on_eop, &es, &rep),
	    ERRCODE_OK);
	dump(&rep, "finals");
	assert_int_equal(es.n, 3);
	assert_int_equal(rep.skipped, 1);
	/* the values put into the columns above */
	check_near(rows[0].mjd, 51543.0, 0.0, "d", "MJD");
	check_near(rows[0].xp_arcsec, 0.043313, 0.0, "arcsec", "PM-x A");
	check_near(rows[0].yp_arcsec, 0.377861, 0.0, "arcsec", "PM-y A");
	check_near(rows[0].dut1_s, 0.3555338, 0.0, "s", "UT1-UTC A");
	check_near(rows[1].mjd, 51544.0, 0.0, "d", "MJD");
	check_near(rows[2].dut1_s, -0.8999999, 0.0, "s", "UT1-UTC A");
	check_near(rows[2].xp_arcsec, -0.5, 0.0, "arcsec", "PM-x A");
}

static void
test_import_finals_bad(void **state)
{
	char good[240], text[2000];
	struct {
		int y, m, d;
		double mjd;
		char pf, uf;
		double x, dut1;
		const char *field, *part;
	} cases[] = {
		{ 2000, 1, 2, 51544.0, 'I', 'I', 0.1, 0.3, "MJD",
		    "is not the date" },
		{ 2000, 1, 1, 51544.0, 'X', 'I', 0.1, 0.3, "PM_flag",
		    "flag is not I" },
		{ 2000, 1, 1, 51544.0, 'I', 'I', 2.5, 0.3, "x",
		    "polar motion" },
		{ 2000, 1, 1, 51544.0, 'I', 'I', 0.1, 1.25, "UT1-UTC",
		    "beyond the 1 s" },
		{ 1999, 12, 31, 51543.0, 'I', 'I', 0.1, 0.3, "MJD",
		    "does not follow" },
	};
	struct site_eop_row rows[4];
	struct import_report rep;

	(void)state;
	finals_line(good, sizeof good, 2000, 1, 1, 51544.0, 'I', 0.1, 0.3,
	    'I', 0.35);
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		struct eop_seen es = { 0, 4, rows };
		char l[240], what[32];
		int n;

		finals_line(l, sizeof l, cases[i].y, cases[i].m, cases[i].d,
		    cases[i].mjd, cases[i].pf, cases[i].x, 0.3, cases[i].uf,
		    cases[i].dut1);
		/* the last case repeats a day after the good line */
		n = snprintf(text, sizeof text, "%s%s", i == 4 ? good : "", l);
		snprintf(what, sizeof what, "finals case %zu", i);
		assert_int_equal(import_eop_finals(text, (size_t)n, on_eop, &es,
		    &rep), ERRCODE_BAD_ARG);
		expect_error(&rep, i == 4 ? 2 : 1, cases[i].field,
		    cases[i].part, what);
	}
	/* truncated: the line stops inside UT1-UTC */
	{
		struct eop_seen es = { 0, 4, rows };
		int n = snprintf(text, sizeof text, "%s%.62s", good, good);

		assert_int_equal(import_eop_finals(text, (size_t)n, on_eop, &es,
		    &rep), ERRCODE_BAD_ARG);
		expect_error(&rep, 2, "UT1-UTC", "truncated?", "finals cut");
		assert_int_equal(es.n, 1);
	}
	/* not the format at all */
	{
		static const char csv[] = "mjd,dut1\n51544,0.3\n";
		struct eop_seen es = { 0, 4, rows };

		assert_int_equal(import_eop_finals(csv, strlen(csv), on_eop,
		    &es, &rep), ERRCODE_BAD_ARG);
		expect_error(&rep, 1, "date", "YYMMDD", "finals csv");
	}
}

static void
test_import_finals_sample(void **state)
{
	static struct site_eop_row rows[1200];
	struct eop_seen es = { 0, 1200, rows };
	struct import_report rep;
	struct eop_table t;
	struct geom_eop e;
	size_t len;
	char *buf = sample("eop.finals", &len);
	double d1, first, last, now;

	(void)state;
	assert_int_equal(import_eop_finals(buf, len, on_eop, &es, &rep),
	    ERRCODE_OK);
	dump(&rep, "eop.finals");
	assert_true(es.n > 0 && es.n <= 1200);
	t.rows = rows;
	t.n = es.n;
	assert_int_equal(eop_table_check(&t), ERRCODE_OK);
	/* it covers the sample log (2025-01-01 .. 2026-11-30) and the demo's
	   "now" (December 2026): MJDs from eraCal2jd */
	eraCal2jd(2025, 1, 1, &d1, &first);
	eraCal2jd(2026, 11, 30, &d1, &last);
	eraCal2jd(2026, 12, 31, &d1, &now);
	assert_true(rows[0].mjd <= first);
	assert_true(rows[es.n - 1].mjd >= now);
	assert_int_equal(eop_lookup(&t, last + 0.5, &e), EOP_SOURCE_TABLE);
	assert_non_null(strstr(buf, "DEMO VALUES, INVENTED"));
	free(buf);
}

/* ------------------------------------------------------------------ */
/* IERS EOP 14 C04, the real series from python3-astropy               */
/* ------------------------------------------------------------------ */

static void
test_import_c04_real(void **state)
{
	static struct site_eop_row rows[30000];
	struct eop_seen es = { 0, 30000, rows };
	struct import_report rep;
	struct eop_table t;
	struct geom_eop e;
	size_t len, jumps = 0, erfa_steps = 0;
	char *buf = slurp(C04_PATH, &len);

	(void)state;
	if (buf == NULL) {
		print_message("  %s missing (install python3-astropy)\n",
		    C04_PATH);
		skip();
	}
	assert_int_equal(import_eop_c04(buf, len, on_eop, &es, &rep),
	    ERRCODE_OK);
	dump(&rep, "eopc04");
	assert_true(es.n <= 30000);
	/* daily 1962-01-01 (MJD 37665) to 2022-11-29 (MJD 59912): first and
	   last rows of the file */
	check_near(rows[0].mjd, 37665.0, 0.0, "d", "first row (file)");
	check_near(rows[es.n - 1].mjd, 59912.0, 0.0, "d", "last row (file)");
	assert_int_equal(es.n, 59912 - 37665 + 1);
	t.rows = rows;
	t.n = es.n;
	assert_int_equal(eop_table_check(&t), ERRCODE_OK);
	for (size_t i = 0; i < es.n; i++) {
		/* the IERS rule: |UT1-UTC| < 0.9 s on every day */
		if (!(fabs(rows[i].dut1_s) < 0.9)) {
			print_error("MJD %.0f: UT1-UTC %.7f s\n", rows[i].mjd,
			    rows[i].dut1_s);
			fail();
		}
		if (i > 0) {
			double a, b;
			int y, m, d;
			double fd;

			eraJd2cal(ERFA_DJM0, rows[i - 1].mjd, &y, &m, &d, &fd);
			eraDat(y, m, d, 0.0, &a);
			eraJd2cal(ERFA_DJM0, rows[i].mjd, &y, &m, &d, &fd);
			eraDat(y, m, d, 0.0, &b);
			if (b - a > 0.99 && b - a < 1.01)
				erfa_steps++;
			/* UT1-TAI is smooth: it changes by the excess length
			   of day, at most 4.4 ms a day (the file's own LOD
			   column peaks at 4.355 ms, MJD 41419), so every step
			   of UT1-UTC, the 0.05 s and 0.1 s ones before 1972
			   too, is one of ERFA's */
			if (!(fabs((rows[i].dut1_s - b) -
			    (rows[i - 1].dut1_s - a)) < 0.005)) {
				print_error("UT1-TAI steps at MJD %.0f\n",
				    rows[i].mjd);
				fail();
			}
			if (rows[i].dut1_s - rows[i - 1].dut1_s > 0.5) {
				/* each +1 s jump falls where ERFA's
				   leap-second table steps by 1 s */
				jumps++;
				if (!(fabs(b - a - 1.0) < 1e-9)) {
					print_error("jump at MJD %.0f, ERFA "
					    "TAI-UTC %g -> %g\n", rows[i].mjd,
					    a, b);
					fail();
				}
			}
		}
	}
	/* 27 leap seconds from 1972-07-01 to 2017-01-01: TAI-UTC went from
	   10 s to 37 s (IERS Bulletin C; ERFA's table) */
	assert_int_equal(jumps, 27);
	assert_int_equal(erfa_steps, 27);
	/* interpolation across the real 2016-12-31 leap second: UT1-TAI is
	   continuous, so noon is the mean of the rows' UT1-TAI */
	assert_int_equal(eop_lookup(&t, 57753.5, &e), EOP_SOURCE_TABLE);
	check_near(e.dut1, (-0.4077492 - 36.0 + 0.5912977 - 37.0) / 2.0 +
	    36.0, 1e-9, "s", "dut1 at 2016-12-31T12:00Z (C04 rows)");
	free(buf);
}

static void
test_import_c04_bad(void **state)
{
	static const char head[] = "  EOP (IERS) 14 C04 TIME SERIES\n"
	    "      Date      MJD      x          y        UT1-UTC\n\n";
	static const struct {
		const char *row;
		size_t line;
		const char *field, *part;
	} cases[] = {
		{ "2016  12  31  57753   0.081284   0.263013  -0.40\n", 4,
		    "UT1-UTC", "truncated?" },
		{ "2016  12  31  57754   0.081284   0.263013  -0.4077492   "
		    "0.0009173\n", 4, "MJD", "is not the date" },
		{ "2016  13  31  57753   0.081284   0.263013  -0.4077492   "
		    "0.0009173\n", 4, "date", "year, month and day" },
		{ "2016  12  31  57753   0.0812x4   0.263013  -0.4077492   "
		    "0.0009173\n", 4, "x", "arcseconds" },
		{ "2016  12  31  57753   0.081284   0.263013  -0.4077492   "
		    "0.0009173\nsome text\n", 5, "", "text among" },
	};
	struct site_eop_row rows[4];

	(void)state;
	for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
		struct eop_seen es = { 0, 4, rows };
		struct import_report rep;
		char text[400], what[32];
		int n = snprintf(text, sizeof text, "%s%s", head, cases[i].row);

		snprintf(what, sizeof what, "c04 case %zu", i);
		assert_int_equal(import_eop_c04(text, (size_t)n, on_eop, &es,
		    &rep), ERRCODE_BAD_ARG);
		expect_error(&rep, cases[i].line, cases[i].field,
		    cases[i].part, what);
	}
}

static void
test_import_eop_detect(void **state)
{
	static const char finals[] = "# demo\n"
	    "2412 1 60645.00 I  0.196498 0.000090  0.492936 0.000090  I "
	    "0.0907574 0.0000120 -0.1848 0.0100\n";
	static const char c04_row[] = "1962   1   1  37665  -0.012700   "
	    "0.213000   0.0326338\n";
	static const char c04_head[] = "  EOP (IERS) 14 C04 TIME SERIES\n";
	static const char other[] = "mjd,dut1\n";
	struct site_eop_row rows[2];
	struct eop_seen es = { 0, 2, rows };
	struct import_report rep;

	(void)state;
	assert_int_equal(import_eop_detect(finals, strlen(finals)),
	    IMPORT_EOP_FINALS);
	assert_int_equal(import_eop_detect(c04_row, strlen(c04_row)),
	    IMPORT_EOP_C04);
	assert_int_equal(import_eop_detect(c04_head, strlen(c04_head)),
	    IMPORT_EOP_C04);
	assert_int_equal(import_eop_detect("123\n", 4), IMPORT_EOP_UNKNOWN);
	assert_int_equal(import_eop_detect("", 0), IMPORT_EOP_UNKNOWN);
	assert_int_equal(import_eop(finals, strlen(finals), on_eop, &es,
	    &rep), ERRCODE_OK);
	assert_int_equal(es.n, 1);
	assert_int_equal(import_eop(c04_row, strlen(c04_row), on_eop, &es,
	    &rep), ERRCODE_OK);
	assert_int_equal(es.n, 2);
	assert_int_equal(import_eop(other, strlen(other), on_eop, &es, &rep),
	    ERRCODE_BAD_ARG);	/* starts with a letter: read as C04 */
	assert_int_equal(import_eop("12345\n", 6, on_eop, &es, &rep),
	    ERRCODE_UNSUPPORTED);
	expect_error(&rep, 0, "", "neither", "eop unknown");
}

/* The README's table of station keys is the key table's own text. */
static void
test_import_keys_in_readme(void **state)
{
	const char *src = getenv("MOONRANGE_SOURCE_DIR");
	char path[1024];
	struct mbuf doc;
	size_t len, n;
	char *readme;
	const struct import_key *keys = import_station_keys(&n);

	(void)state;
	snprintf(path, sizeof path, "%s/README.md", src ? src : ".");
	readme = slurp(path, &len);
	assert_non_null(readme);
	mbuf_init(&doc);
	import_station_keys_doc(&doc);
	assert_int_equal(mbuf_status(&doc), ERRCODE_OK);
	if (strstr(readme, doc.data) == NULL) {
		print_error("README.md lacks the station key table; paste the "
		    "output of 'gen_sample_site keys .':\n%s", doc.data);
		fail();
	}
	/* one row per key */
	for (size_t k = 0; k < n; k++) {
		char row[96];

		snprintf(row, sizeof row, "| `[%s] %s` |", keys[k].section,
		    keys[k].name);
		assert_non_null(strstr(doc.data, row));
	}
	mbuf_free(&doc);
	free(readme);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_import_station_sample),
		cmocka_unit_test(test_import_station_defaults),
		cmocka_unit_test(test_import_station_set),
		cmocka_unit_test(test_import_station_derived_weather_in_range),
		cmocka_unit_test(test_import_station_bad),
		cmocka_unit_test(test_import_not_text),
		cmocka_unit_test(test_import_text_rules),
		cmocka_unit_test(test_import_truncated),
		cmocka_unit_test(test_import_targets_sample),
		cmocka_unit_test(test_import_targets_columns),
		cmocka_unit_test(test_import_targets_bad),
		cmocka_unit_test(test_import_attempts_good),
		cmocka_unit_test(test_import_attempts_bad),
		cmocka_unit_test(test_import_attempts_all_errors),
		cmocka_unit_test(test_import_attempts_callback_stops),
		cmocka_unit_test(test_import_error_format),
		cmocka_unit_test(test_import_error_cap),
		cmocka_unit_test(test_import_csv_limits),
		cmocka_unit_test(test_import_attempts_sample),
		cmocka_unit_test(test_import_no_allocation),
		cmocka_unit_test(test_import_crd_sample),
		cmocka_unit_test(test_import_crd_midnight),
		cmocka_unit_test(test_import_crd_leap_second),
		cmocka_unit_test(test_import_crd_bad),
		cmocka_unit_test(test_import_finals_columns),
		cmocka_unit_test(test_import_finals_bad),
		cmocka_unit_test(test_import_finals_sample),
		cmocka_unit_test(test_import_c04_real),
		cmocka_unit_test(test_import_c04_bad),
		cmocka_unit_test(test_import_eop_detect),
		cmocka_unit_test(test_import_keys_in_readme),
	};

	return cmocka_run_group_tests_name("import", tests, NULL, NULL);
}
