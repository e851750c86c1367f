/* SPDX-License-Identifier: BSD-3-Clause */
/* gen_sample_site.c: writes the invented observation log, CRD normal
   points and demo Earth-orientation file of sample-site/, reproducibly. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/geom.h"
#include "formats/import.h"
#include "core/mem.h"
#include "core/site.h"
#include "core/tscale.h"

/*
 * Usage: gen_sample_site attempts|crd|eop|keys SITE_DIR > FILE
 *
 * Reads SITE_DIR/station.ini and SITE_DIR/targets.csv with the importers,
 * and writes one file to stdout.  Everything is computed with the
 * geometry core from a fixed seed, so the same sources give the same
 * bytes.  Not run by CI: the files are committed; rerun after changing
 * the station or the targets (see DEVELOPERS.md).
 */

#define MAX_TARGETS 16
#define LOG_FIRST_MJD 60676.0	/* 2025-01-01 */
#define LOG_LAST_MJD 61374.0	/* 2026-11-30 */
#define EOP_FIRST_MJD 60645.0	/* 2024-12-01 */
#define EOP_LAST_MJD 61495.0	/* 2027-03-31 */
#define STEP_DAYS (10.0 / 1440.0)

struct site {
	struct site_station st;
	struct site_target tg[MAX_TARGETS];
	struct geom_target gt[MAX_TARGETS];
	size_t nt;
	struct geom_site gs;
};

/* xorshift64*: a small fixed-seed generator (Vigna 2016). */
static unsigned long long rng_state = 0x6d6f6f6e72616e67ULL;

static double
rnd(void)
{
	rng_state ^= rng_state >> 12;
	rng_state ^= rng_state << 25;
	rng_state ^= rng_state >> 27;
	return (double)((rng_state * 0x2545F4914F6CDD1DULL) >> 11) /
	    9007199254740992.0;
}

static char *
slurp(const char *path, size_t *len)
{
	FILE *f = fopen(path, "rb");
	char *buf;
	long n;

	if (f == NULL || fseek(f, 0, SEEK_END) != 0 || (n = ftell(f)) < 0 ||
	    fseek(f, 0, SEEK_SET) != 0) {
		perror(path);
		exit(1);
	}
	buf = malloc((size_t)n + 1);
	if (buf == NULL || fread(buf, 1, (size_t)n, f) != (size_t)n) {
		perror(path);
		exit(1);
	}
	fclose(f);
	*len = (size_t)n;
	return buf;
}

static enum errcode
add_target(void *ctx, const struct site_target *t, size_t line)
{
	struct site *s = ctx;

	(void)line;
	if (s->nt == MAX_TARGETS)
		return ERRCODE_TOO_LARGE;
	s->tg[s->nt] = *t;
	if (geom_target_from_selen(t->lat_deg * ERFA_DD2R,
	    t->lon_deg * ERFA_DD2R, t->height_m, &s->gt[s->nt]) != ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	s->nt++;
	return ERRCODE_OK;
}

static void
load_site(const char *dir, struct site *s)
{
	struct import_report rep;
	struct geom_weather wx;
	char path[1024];
	size_t len;
	char *buf;

	memset(s, 0, sizeof *s);
	snprintf(path, sizeof path, "%s/station.ini", dir);
	buf = slurp(path, &len);
	if (import_station_ini(buf, len, &s->st, &rep) != ERRCODE_OK) {
		fprintf(stderr, "%s: %zu errors\n", path, rep.bad);
		exit(1);
	}
	free(buf);
	snprintf(path, sizeof path, "%s/targets.csv", dir);
	buf = slurp(path, &len);
	if (import_targets_csv(buf, len, add_target, s, &rep) != ERRCODE_OK) {
		fprintf(stderr, "%s: %zu errors\n", path, rep.bad);
		exit(1);
	}
	free(buf);
	wx.pressure_hpa = s->st.pressure_hpa;
	wx.temperature_c = s->st.temperature_c;
	wx.humidity = s->st.humidity;
	wx.wavelength_um = s->st.wavelength_nm / 1000.0;
	if (geom_site_init(&s->gs, s->st.lat_deg * ERFA_DD2R,
	    s->st.lon_deg * ERFA_DD2R, s->st.height_m, &wx) != ERRCODE_OK) {
		fprintf(stderr, "bad station\n");
		exit(1);
	}
}

static void
at(const struct site *s, double mjd, struct geom_instant *g)
{
	static const struct geom_eop eop = { 0.0, 0.0, 0.0 };

	if (geom_instant_at(&s->gs, &eop, ERFA_DJM0, mjd, GEOM_PREC_FAST, g)
	    != ERRCODE_OK) {
		fprintf(stderr, "geometry failed at MJD %.5f\n", mjd);
		exit(1);
	}
}

/* Is the instant usable: night, Moon high enough, far enough from Sun? */
static int
usable(const struct site *s, const struct geom_instant *g)
{
	return g->moon.el > s->st.min_el_deg * ERFA_DD2R &&
	    g->sun.el < s->st.max_sun_el_deg * ERFA_DD2R &&
	    g->sun.separation > s->st.min_sun_sep_deg * ERFA_DD2R;
}

static void
iso(double mjd, char *buf)
{
	if (tscale_format_utc(ERFA_DJM0, mjd, 0, buf, 32) != ERRCODE_OK) {
		fprintf(stderr, "format failed\n");
		exit(1);
	}
}

/* Outcome drawn with the station's invented frequencies. */
static enum site_outcome
draw_outcome(void)
{
	double u = rnd();

	if (u < 0.62)
		return SITE_OUTCOME_RANGED;
	if (u < 0.76)
		return SITE_OUTCOME_NO_RETURNS;
	if (u < 0.88)
		return SITE_OUTCOME_WEATHER;
	if (u < 0.95)
		return SITE_OUTCOME_TECHNICAL;
	if (u < 0.97)
		return SITE_OUTCOME_SAFETY;
	return SITE_OUTCOME_OTHER;
}

static const char *const operators[] = {
	"op-amber", "op-birch", "op-cedar", "op-dune",
};

static const char *
notes_for(enum site_outcome o)
{
	double u = rnd();

	switch (o) {
	case SITE_OUTCOME_RANGED:
		return u < 0.1 ? "strong returns, stable beam" :
		    u < 0.2 ? "returns faded late, thin cirrus" : "";
	case SITE_OUTCOME_NO_RETURNS:
		return u < 0.5 ? "no signal above background; offset "
		    "pointing tried" : "";
	case SITE_OUTCOME_WEATHER:
		return u < 0.5 ? "clouds over the target, \"closed dome\"" :
		    "wind above limit";
	case SITE_OUTCOME_TECHNICAL:
		return u < 0.5 ? "laser cooling fault" : "timer resync\n"
		    "second attempt refused";
	case SITE_OUTCOME_SAFETY:
		return "aircraft reported; firing halted by the spotter";
	case SITE_OUTCOME_OTHER:
	case SITE_OUTCOME__COUNT:
		break;
	}
	return "test of new filter";
}

/* RFC 4180 field: quoted when it holds a comma, quote or line break. */
static void
csv_field(const char *s)
{
	if (strpbrk(s, ",\"\r\n") == NULL) {
		fputs(s, stdout);
		return;
	}
	putchar('"');
	for (; *s; s++) {
		if (*s == '"')
			putchar('"');
		putchar(*s);
	}
	putchar('"');
}

/*
 * The log: nights are taken with a probability that favours the quarter
 * phases (weight 0.06 + 0.94 sin^4 of the synodic angle), as real logs
 * do; on each, one to three attempts at instants when the Moon is above
 * the station's minimum elevation at night.
 */
static void
gen_attempts(const struct site *s)
{
	struct geom_instant g;

	printf("# moonrange sample site: observation log.  INVENTED DEMO "
	    "DATA, written by\n# tests/tools/gen_sample_site (fixed seed); "
	    "no real station, operator or\n# measurement.  Columns: "
	    "README.md, \"Sample site files\".\n");
	printf("%s\n", IMPORT_ATTEMPTS_COLUMNS);
	for (double day = LOG_FIRST_MJD; day <= LOG_LAST_MJD; day += 1.0) {
		double ok[144];
		size_t nok = 0, natt, done = 0;
		double w, syn;

		at(s, day + 0.35, &g);	/* ~01:24 local */
		syn = g.moon.synodic;
		w = 0.06 + 0.94 * pow(fabs(sin(syn)), 4.0);
		if (rnd() > w * 0.95)
			continue;
		for (double t = day; t < day + 1.0 - 1e-9; t += STEP_DAYS) {
			at(s, t, &g);
			if (usable(s, &g) && nok < 144)
				ok[nok++] = t;
		}
		if (nok < 3)
			continue;
		natt = 1 + (size_t)(rnd() * 3.0);
		for (size_t i = 0; i < nok && done < natt; i++) {
			double start, end, dur, X, rate;
			struct geom_target_view v;
			enum site_outcome o;
			long shots, returns, np;
			size_t k;
			char a[32], b[32];

			if (rnd() > 0.25)
				continue;
			dur = (6.0 + rnd() * 14.0) / 1440.0;
			start = ok[i] + rnd() * STEP_DAYS * 0.5;
			end = start + dur;
			at(s, end, &g);
			if (!usable(s, &g))
				continue;
			at(s, start + dur / 2, &g);
			k = (size_t)(rnd() * (double)s->nt);
			geom_target_view(&g, &s->gt[k], &v);
			if (s->tg[k].dark_only && v.sunlit)
				k = 0;
			geom_target_view(&g, &s->gt[k], &v);
			o = draw_outcome();
			shots = (long)(dur * 86400.0 * s->st.fire_rate_hz *
			    (0.7 + 0.3 * rnd()));
			X = 1.0 / (sin(v.el) + 0.50572 * pow(v.el * ERFA_DR2D +
			    6.07995, -1.6364));
			rate = 0.004 * s->tg[k].strength *
			    exp(-2.0 * s->st.zenith_tau * X) *
			    (v.sunlit ? 0.6 : 1.0) * (0.5 + rnd());
			switch (o) {
			case SITE_OUTCOME_RANGED:
				returns = 20 + (long)((double)shots * rate);
				np = 1 + returns / (40 + (long)(rnd() * 80));
				break;
			case SITE_OUTCOME_NO_RETURNS:
				returns = (long)(rnd() * 4.0);
				np = 0;
				break;
			case SITE_OUTCOME_WEATHER:
			case SITE_OUTCOME_SAFETY:
				shots = (long)((double)shots * rnd() * 0.3);
				returns = 0;
				np = 0;
				break;
			case SITE_OUTCOME_TECHNICAL:
			case SITE_OUTCOME_OTHER:
			case SITE_OUTCOME__COUNT:
			default:
				shots = (long)((double)shots * rnd() * 0.6);
				returns = (long)((double)shots * rate * 0.5);
				np = returns / 200;
				break;
			}
			iso(start, a);
			iso(end, b);
			printf("%s,%s,%s,%ld,%ld,%ld,%s,", s->tg[k].id, a, b,
			    shots, returns, np, site_outcome_name(o));
			csv_field(operators[(size_t)(rnd() * 4.0)]);
			if (rnd() < 0.9)
				printf(",%.1f,", 0.8 + 2.7 * rnd());
			else
				printf(",,");
			csv_field(notes_for(o));
			printf("\n");
			done++;
			i += 3;	/* the next attempt starts 30 min later */
		}
	}
}

/* CRD normal points: three invented sessions in late 2026, two targets. */
static void
gen_crd(const struct site *s)
{
	static const struct {
		double day;		/* search from this MJD, 12 days */
		size_t target;		/* index in targets.csv */
	} sess[] = {
		{ 61314.0, 0 },		/* 2026-10-01 (last quarter) */
		{ 61329.0, 1 },		/* 2026-10-16 (first quarter) */
		{ 61343.0, 0 },		/* 2026-10-30 (last quarter) */
	};
	struct geom_instant g;
	struct geom_target_view v;

	printf("H1 CRD  2 2026 11 20 18\n");
	printf("00 moonrange sample site: INVENTED DEMO DATA, written by "
	    "tests/tools/gen_sample_site\n");
	printf("00 times of flight are geometric round trips from the "
	    "moonrange geometry core\n");
	printf("H2 %-10s 9917 01 01  7 na\n", s->st.code);
	for (size_t i = 0; i < sizeof sess / sizeof sess[0]; i++) {
		const struct site_target *tg = &s->tg[sess[i].target];
		double t0 = -1.0, t;
		int y, m, d, ih[4], y2, m2, d2, ih2[4];
		double end;
		size_t npts = 0;

		for (t = sess[i].day; t < sess[i].day + 12.0; t += STEP_DAYS) {
			at(s, t, &g);
			geom_target_view(&g, &s->gt[sess[i].target], &v);
			if (!usable(s, &g) || v.el < 35.0 * ERFA_DD2R)
				continue;
			at(s, t + 50.0 / 1440.0, &g);
			geom_target_view(&g, &s->gt[sess[i].target], &v);
			if (usable(s, &g) && v.el > 35.0 * ERFA_DD2R) {
				t0 = t;
				break;
			}
		}
		if (t0 < 0) {
			fprintf(stderr, "no session on MJD %.0f\n",
			    sess[i].day);
			exit(1);
		}
		t0 = floor(t0 * 1440.0 + 0.5) / 1440.0;
		end = t0 + 45.0 / 1440.0;
		eraD2dtf("UTC", 0, ERFA_DJM0, t0, &y, &m, &d, ih);
		eraD2dtf("UTC", 0, ERFA_DJM0, end, &y2, &m2, &d2, ih2);
		printf("H3 %-10s na na na 0 2\n", tg->alias);
		printf("H4  1 %4d %2d %2d %2d %2d %2d %4d %2d %2d %2d %2d %2d"
		    "  0 1 0 0 1 0 2 0\n", y, m, d, ih[0], ih[1], ih[2], y2, m2,
		    d2, ih2[0], ih2[1], ih2[2]);
		printf("C0 0 %.3f std1 las1 det1 tim1\n", s->st.wavelength_nm);
		printf("20 %.3f %.2f %.2f %2.0f 1\n",
		    (t0 - floor(t0)) * 86400.0, s->st.pressure_hpa,
		    s->st.temperature_c + 273.15, s->st.humidity * 100.0);
		for (int k = 0; k < 9; k++) {
			/* bins of 300 s, epochs at their centres, whole s */
			double sod = floor((t0 - floor(t0)) * 86400.0 + 0.5) +
			    150.0 + 300.0 * k;
			long count = 8 + (long)(rnd() * 30.0);

			t = floor(t0) + sod / 86400.0;
			at(s, t, &g);
			geom_target_view(&g, &s->gt[sess[i].target], &v);
			if (!usable(s, &g) || rnd() < 0.2)
				continue;	/* a bin without enough returns */
			printf("11 %.7f %.12f std1 2 300.0 %ld %.1f na na na "
			    "%.1f 0 na\n", sod, v.round_trip, count,
			    35.0 + rnd() * 40.0, (double)count / 30.0);
			npts++;
		}
		printf("50 std1 %.1f na na na 0\n", 40.0 + rnd() * 20.0);
		printf("H8\n");
		if (npts == 0) {
			fprintf(stderr, "empty session\n");
			exit(1);
		}
	}
	printf("H9\n");
}

/* Demo Earth orientation in the finals2000A columns (invented). */
static void
gen_eop(void)
{
	printf("# moonrange sample site: Earth orientation in the columns of "
	    "the IERS\n# finals2000A format (Bulletin A part).  DEMO VALUES, "
	    "INVENTED: smooth\n# made-up curves, NOT IERS data; never use "
	    "them for real pointing.\n# Written by "
	    "tests/tools/gen_sample_site.  Lines starting with '#' are\n"
	    "# comments for moonrange's reader (not part of the IERS "
	    "format).\n");
	for (double mjd = EOP_FIRST_MJD; mjd <= EOP_LAST_MJD; mjd += 1.0) {
		int y, m, d;
		double fd, ph = 2.0 * ERFA_DPI * (mjd - 61000.0) / 433.0;
		double yr = 2.0 * ERFA_DPI * (mjd - 61000.0) / 365.25;
		double dut1 = 0.045 - 0.00012 * (mjd - 61000.0) +
		    0.018 * sin(yr);
		double dnext = -0.00012 + 0.018 * cos(yr) * 2.0 * ERFA_DPI /
		    365.25;
		char flag = mjd <= LOG_LAST_MJD ? 'I' : 'P';

		eraJd2cal(ERFA_DJM0, mjd, &y, &m, &d, &fd);
		printf("%2d%2d%2d %8.2f %c %9.6f%9.6f %9.6f%9.6f  %c%10.7f"
		    "%10.7f %7.4f%7.4f\n", y % 100, m, d, mjd, flag,
		    0.12 + 0.18 * cos(ph), flag == 'I' ? 0.00009 : 0.0025,
		    0.33 + 0.18 * sin(ph), flag == 'I' ? 0.00009 : 0.0025,
		    flag, dut1, flag == 'I' ? 0.0000120 : 0.0040000,
		    -dnext * 1000.0, 0.0100);
	}
}

int
main(int argc, char **argv)
{
	struct site s;

	if (argc != 3) {
		fprintf(stderr, "usage: gen_sample_site attempts|crd|eop|keys "
		    "SITE_DIR\n");
		return 2;
	}
	if (strcmp(argv[1], "eop") == 0) {
		gen_eop();
		return 0;
	}
	if (strcmp(argv[1], "keys") == 0) {
		struct mbuf doc;

		mbuf_init(&doc);
		import_station_keys_doc(&doc);
		if (mbuf_status(&doc) != ERRCODE_OK)
			return 1;
		fputs(doc.data, stdout);
		mbuf_free(&doc);
		return 0;
	}
	load_site(argv[2], &s);
	if (strcmp(argv[1], "attempts") == 0)
		gen_attempts(&s);
	else if (strcmp(argv[1], "crd") == 0)
		gen_crd(&s);
	else {
		fprintf(stderr, "gen_sample_site: unknown file '%s'\n",
		    argv[1]);
		return 2;
	}
	return 0;
}
