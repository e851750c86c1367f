/* SPDX-License-Identifier: BSD-3-Clause */
/* test_window.c: window edges against libnova, constraint properties at
   1-minute samples, short windows at culmination, blackouts, bad input. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>
#include <libnova/julian_day.h>
#include <libnova/lunar.h>
#include <libnova/nutation.h>
#include <libnova/parallax.h>
#include <libnova/precession.h>
#include <libnova/transform.h>

#include "check.h"
#include "fixture.h"
#include "core/window.h"

#define D2R ERFA_DD2R
#define DAY ERFA_DAYSEC
#define MJD0 2400000.5

/* A deterministic generator for the random cases (64-bit LCG, Knuth). */
static unsigned long long rng_state = 0x9E3779B97F4A7C15ULL;

static double
urand(void)
{
	rng_state = rng_state * 6364136223846793005ULL + 1442695040888963407ULL;
	return (double)(rng_state >> 11) / 9007199254740992.0;
}

static double
uniform(double a, double b)
{
	return a + (b - a) * urand();
}

struct fixture {
	struct geom_site site;
	struct window_track tr;
	struct window_node *nodes;
};

/* A track over span days from a UTC ISO time. */
static void
fixture_open(struct fixture *fx, double lat_deg, double lon_deg, double h,
    const char *utc, double span)
{
	struct tscale_instant t;
	size_t nn = window_track_nodes(span);

	assert_int_equal(geom_site_init(&fx->site, lat_deg * D2R,
	    lon_deg * D2R, h, NULL), ERRCODE_OK);
	fixture_instant(utc, &t);
	fx->nodes = calloc(nn, sizeof fx->nodes[0]);
	assert_non_null(fx->nodes);
	assert_int_equal(window_track_init(&fx->tr, &fx->site, NULL, t.tt1,
	    t.tt2, span, fx->nodes, nn), ERRCODE_OK);
}

static void
fixture_close(struct fixture *fx)
{
	free(fx->nodes);
}

/* --- the independent reference: libnova's Moon (ELP 2000-82B) --- */

/*
 * Geometric topocentric elevation of the Moon's centre from libnova, at a
 * TT offset on the track (UT1 = UTC: the tracks here use DUT1 = 0).
 *
 * libnova 0.16's ln_get_lunar_equ_coords refers its place to the mean
 * equator and equinox of J2000 (in 2027 it reads ~0.38 deg of RA less
 * than a place of date: 27 years of general precession), while
 * ln_get_hrz_from_equ turns with apparent sidereal time.  So the place is
 * precessed to the date (ln_get_equ_prec) and nutated to the true equator
 * and equinox (ln_get_nutation; Meeus, Astronomical Algorithms, 2nd ed.,
 * eq. 23.1) before libnova's parallax and horizon transforms.  The
 * ELP series is truncated at 1e-6 rad (0.2"; 40 times faster than the
 * full series, which moves the place by < 0.5").
 */
static double
nova_moon_el_deg(const struct fixture *fx, double t)
{
	struct tscale_instant ti;
	struct ln_equ_posn mean, equ, par;
	struct ln_lnlat_posn obs;
	struct ln_hrz_posn hrz;
	struct ln_nutation nut;
	double jd_tt, jd_ut, au, eps, ra, dec;

	assert_int_equal(tscale_from_tt(fx->tr.base1, fx->tr.base2 + t, 0.0,
	    &ti), ERRCODE_OK);
	jd_tt = ti.tt1 + ti.tt2;
	jd_ut = ti.ut11 + ti.ut12;
	ln_get_lunar_equ_coords_prec(jd_tt, &mean, 1e-6);
	ln_get_equ_prec(&mean, jd_tt, &equ);
	ln_get_nutation(jd_tt, &nut);
	eps = nut.ecliptic * D2R;
	ra = equ.ra * D2R;
	dec = equ.dec * D2R;
	equ.ra += (cos(eps) + sin(eps) * sin(ra) * tan(dec)) * nut.longitude -
	    cos(ra) * tan(dec) * nut.obliquity;
	equ.dec += sin(eps) * cos(ra) * nut.longitude + sin(ra) * nut.obliquity;
	au = ln_get_lunar_earth_dist(jd_tt) * 1000.0 / ERFA_DAU;
	obs.lat = fx->site.lat * ERFA_DR2D;
	obs.lng = fx->site.lon * ERFA_DR2D;
	ln_get_parallax(&equ, au, &obs, fx->site.height, jd_ut, &par);
	equ.ra += par.ra;
	equ.dec += par.dec;
	ln_get_hrz_from_equ(&equ, &obs, jd_ut, &hrz);
	return hrz.alt;
}

/*
 * libnova's crossing of el = lim near t0: the sign change is bracketed
 * in +-60 s (an edge further than that from libnova's is a failure
 * anyway, the tolerance being 10 s) and refined to 0.01 s by regula
 * falsi with the Illinois modification (bisection where a step would
 * leave the bracket).
 */
static int
nova_crossing(const struct fixture *fx, double t0, double lim, double *root)
{
	double a = t0 - 60.0 / DAY, b = t0 + 60.0 / DAY;
	double fa = nova_moon_el_deg(fx, a) - lim;
	double fb = nova_moon_el_deg(fx, b) - lim;
	int side = 0;

	if ((fa >= 0) == (fb >= 0))
		return 0;
	for (int i = 0; i < 60 && b - a > 0.01 / DAY; i++) {
		double m = (fa * b - fb * a) / (fa - fb), fm;

		if (!(m > a && m < b))
			m = 0.5 * (a + b);
		fm = nova_moon_el_deg(fx, m) - lim;
		if (fabs(fm) < 1e-7) {	/* 1e-7 deg: ~1e-4 s of time */
			*root = m;
			return 1;
		}
		if ((fm >= 0) == (fa >= 0)) {
			a = m;
			fa = fm;
			if (side == +1)
				fb /= 2.0;
			side = +1;
		} else {
			b = m;
			fb = fm;
			if (side == -1)
				fa /= 2.0;
			side = -1;
		}
	}
	*root = 0.5 * (a + b);
	return 1;
}

/*
 * Number of libnova crossings of lim in the span, stepping as far as the
 * elevation cannot reach lim: |dh/dt| = w cos(lat) |sin A| for a body at
 * rest in the sky (w the rotation rate, 0.2507 deg/min for the stars,
 * less for the Moon), plus the Moon's own motion in declination and the
 * change of its parallax, well under 0.02 deg/min; floor 60 s (two
 * crossings of 10 deg within a minute would need a culmination within
 * ~1e-4 deg of the limit).
 */
static long
nova_crossings_count(const struct fixture *fx, double lim)
{
	const double rate = 0.2507 * cos(fx->site.lat) + 0.02;	/* deg/min */
	long n = 0;
	double prev = nova_moon_el_deg(fx, 0.0) - lim, t = 0.0;

	while (t < fx->tr.span) {
		double step = fmax(60.0, 60.0 * fabs(prev) / rate) / DAY, f;

		t = fmin(t + step, fx->tr.span);
		f = nova_moon_el_deg(fx, t) - lim;
		n += (f >= 0) != (prev >= 0);
		prev = f;
	}
	return n;
}

/*
 * Rising and setting of the Moon's centre through 10 deg over a year at
 * two invented stations, against libnova.
 *
 * Tolerance 10 s: libnova's ELP 2000-82B Moon and ERFA's eraMoon98
 * (Meeus's truncation) differ by up to ~20" in direction (about 12" seen
 * here in declination); the Moon's elevation at 10 deg changes by
 * roughly 15" cos(lat) |sin(az)| per second, >= ~4"/s at rising and
 * setting for these latitudes, so 20" is at most ~5 s of time; the
 * sidereal-time and parallax models add well under 1 s.
 */
static void
check_against_libnova(double lat, double lon, double h, size_t min_windows)
{
	struct fixture fx;
	struct window_limits lim = {10.0 * D2R, ERFA_DPI, 0.0};
	struct window_target tg = {NULL, 0};
	static struct window w[2000];
	size_t n = 0, edges = 0;
	double worst = 0.0;

	fixture_open(&fx, lat, lon, h, "2027-01-01T00:00:00Z", 365.0);
	assert_int_equal(window_find(&fx.tr, &lim, &tg, 1, NULL, 0, w, 2000,
	    &n), ERRCODE_OK);
	/* About one a day (the Moon returns every 24.8 h on average); fewer
	   at high latitude, where it stays low for part of each month. */
	assert_true(n > min_windows);
	for (size_t i = 0; i < n; i++) {
		double e[2] = {w[i].start, w[i].end};

		for (int k = 0; k < 2; k++) {
			double root = 0.0, d;

			if (e[k] <= 0.0 || e[k] >= fx.tr.span)
				continue;	/* clipped at the span */
			assert_true(nova_crossing(&fx, e[k], 10.0, &root));
			d = fabs(root - e[k]) * DAY;
			if (d > worst)
				worst = d;
			/* libnova 0.16, ELP 2000-82B: tolerance justified above */
			check_near(e[k] * DAY, root * DAY, 10.0, "s",
			    "Moon crossing of 10 deg vs libnova");
			edges++;
		}
	}
	/* Every libnova crossing is matched: none missed, none extra. */
	assert_int_equal((long)edges, nova_crossings_count(&fx, 10.0));
	print_message("station %.2f %.2f: %zu edges, worst %.2f s from "
	    "libnova\n", lat, lon, edges, worst);
	fixture_close(&fx);
}

static void
test_window_edges_match_libnova_north(void **state)
{
	(void)state;
	check_against_libnova(38.9712, -114.3098, 2950.0, 300);	/* invented */
}

static void
test_window_edges_match_libnova_south(void **state)
{
	(void)state;
	check_against_libnova(-31.48, 115.62, 60.0, 300);		/* invented */
}

/* --- properties at 1-minute samples, full ERFA chain --- */

static int
in_blackout(const struct window_interval *b, size_t nb, double t)
{
	for (size_t i = 0; i < nb; i++)
		if (t >= b[i].start && t < b[i].end)
			return 1;
	return 0;
}

static void
test_window_property_random_cases(void **state)
{
	const double tol = 1.0 / DAY;	/* search tolerance: 1 s */
	int cases_with_windows = 0;

	(void)state;
	for (int cs = 0; cs < 20; cs++) {
		struct fixture fx;
		struct geom_target body;
		struct window_target tg;
		struct window_limits lim;
		struct window_interval bo[2];
		static struct window w[200];
		size_t n = 0, nb;
		double span = uniform(1.0, 2.5);
		char utc[96];
		long inside = 0;

		snprintf(utc, sizeof utc, "%04d-%02d-%02dT%02d:00:00Z",
		    2020 + (int)uniform(0, 15), 1 + (int)uniform(0, 12),
		    1 + (int)uniform(0, 28), (int)uniform(0, 24));
		fixture_open(&fx, uniform(-65, 65), uniform(-180, 180),
		    uniform(0, 3000), utc, span);
		lim.min_el = uniform(5, 40) * D2R;
		lim.max_sun_el = (urand() < 0.3 ? 90.0 : uniform(-18, 5)) * D2R;
		lim.min_sun_sep = (urand() < 0.3 ? 0.0 : uniform(5, 40)) * D2R;
		assert_int_equal(geom_target_from_selen(uniform(-60, 60) * D2R,
		    uniform(-80, 80) * D2R, 0.0, &body), ERRCODE_OK);
		tg.body = urand() < 0.25 ? NULL : &body;
		tg.dark_only = urand() < 0.5;
		nb = (size_t)uniform(0, 3);
		for (size_t i = 0; i < nb; i++) {
			bo[i].start = uniform(0, span);
			bo[i].end = bo[i].start + uniform(0.01, 0.3);
		}
		assert_int_equal(window_find(&fx.tr, &lim, &tg, 1, bo, nb, w,
		    200, &n), ERRCODE_OK);
		for (size_t i = 0; i < n; i++) {
			assert_true(w[i].end > w[i].start);
			assert_true(w[i].start >= 0 && w[i].end <= span);
			if (i > 0)	/* maximal: disjoint, in order */
				assert_true(w[i].start >= w[i - 1].end);
		}
		for (double t = 0.0; t < span; t += 60.0 / DAY) {
			struct tscale_instant ti;
			struct geom_instant g;
			int holds, in = 0;
			double edge = 1e9;

			assert_int_equal(tscale_from_tt(fx.tr.base1,
			    fx.tr.base2 + t, 0.0, &ti), ERRCODE_OK);
			assert_int_equal(geom_instant_at(&fx.site, NULL,
			    ti.utc1, ti.utc2, GEOM_PREC_FULL, &g), ERRCODE_OK);
			holds = window_constraints_hold(&g, &lim, &tg) &&
			    !in_blackout(bo, nb, t);
			for (size_t i = 0; i < n; i++) {
				in |= t >= w[i].start && t <= w[i].end;
				edge = fmin(edge, fmin(fabs(t - w[i].start),
				    fabs(t - w[i].end)));
			}
			inside += in;
			if (holds != in && edge > tol) {
				print_error("case %d %s t=%.6f d: constraints "
				    "%s but %s a window (%.1f s from an edge)\n",
				    cs, utc, t, holds ? "hold" : "fail",
				    in ? "inside" : "outside", edge * DAY);
				fail();
			}
		}
		fixture_close(&fx);
		print_message("case %d: %zu windows, %ld of %ld samples inside\n",
		    cs, n, inside, (long)ceil(span * DAY / 60.0));
		cases_with_windows += n > 0;
	}
	/* The property is exercised inside windows too, not only where
	   the random limits leave none (7 of the 20 cases have windows
	   with this generator). */
	assert_true(cases_with_windows >= 5);
}

/* --- a short window at culmination --- */

static void
test_window_short_window_at_culmination(void **state)
{
	struct fixture fx;
	struct window_target tg = {NULL, 0};
	struct window_limits lim;
	struct window w[8];
	size_t n = 0;
	double best = -1, tbest = 0;

	(void)state;
	fixture_open(&fx, 38.9712, -114.3098, 2950.0, "2027-03-19T00:00:00Z",
	    1.0);
	/* The Moon's highest point in the day, by a 10 s scan of the track. */
	for (double t = 0; t < 1.0; t += 10.0 / DAY) {
		struct geom_instant g;

		window_track_instant(&fx.tr, t, &g);
		if (g.moon.el > best) {
			best = g.moon.el;
			tbest = t;
		}
	}
	lim.min_el = best - 0.01 * D2R;	/* 36" below the top */
	lim.max_sun_el = ERFA_DPI;
	lim.min_sun_sep = 0.0;
	assert_int_equal(window_find(&fx.tr, &lim, &tg, 1, NULL, 0, w, 8, &n),
	    ERRCODE_OK);
	assert_int_equal(n, 1);
	assert_true(w[0].start <= tbest && w[0].end >= tbest);
	/* Minutes long, far shorter than one 20 min grid cell. */
	assert_true((w[0].end - w[0].start) * DAY < 900.0);
	assert_true((w[0].end - w[0].start) * DAY > 60.0);
	fixture_close(&fx);
}

/* --- predicted edges against a dense search on the direct chain --- */

/* One elevation constraint of the dense reference: a target (NULL: the
   Moon's centre) above lim, or (sun) the Sun below lim. */
struct dense {
	const struct fixture *fx;
	const struct geom_target *body;
	int sun;
	double lim;
};

/* The constraint's value (>= 0 where it holds) on the direct ERFA chain
   (geom_instant_at, GEOM_PREC_FULL) at a TT offset. */
static double
dense_direct(void *ctx, double t)
{
	const struct dense *d = ctx;
	struct tscale_instant ti;
	struct geom_instant g;
	struct geom_target_view v;

	assert_int_equal(tscale_from_tt(d->fx->tr.base1, d->fx->tr.base2 + t,
	    0.0, &ti), ERRCODE_OK);
	assert_int_equal(geom_instant_at(&d->fx->site, NULL, ti.utc1, ti.utc2,
	    GEOM_PREC_FULL, &g), ERRCODE_OK);
	if (d->sun)
		return d->lim - g.sun.el;
	if (d->body == NULL)
		return g.moon.el - d->lim;
	geom_target_view(&g, d->body, &v);
	return v.el - d->lim;
}

/* The same on the fit, for the 10 s scan that only locates crossings. */
static double
dense_fit(const struct dense *d, double t)
{
	const struct fast_track *ft = &d->fx->tr.ft;
	struct fast_frame f;

	fast_frame_at(ft, t, d->sun ? FAST_SUN : FAST_LUNAR, &f);
	if (d->sun)
		return d->lim - fast_elevation(ft, f.sun_itrs);
	if (d->body == NULL)
		return fast_elevation(ft, f.moon_itrs) - d->lim;
	return fast_target_el(ft, &f, d->body, NULL, NULL) - d->lim;
}

/*
 * The crossings of the constraint in (0, span): a scan of the fit every
 * 10 s finds each sign change (a window or gap of 20 s or more cannot
 * fall between two samples), and each is refined on the direct chain by
 * regula falsi to 1 ms (bracket widened by one step each side when the
 * fit's crossing sits at the bracket's end).  Returns their number.
 */
static size_t
dense_crossings(const struct dense *d, double *out, size_t cap)
{
	const double step = 10.0 / DAY, span = d->fx->tr.span;
	double prev = dense_fit(d, 0.0);
	size_t n = 0;

	for (double t = step; t < span + step; t += step) {
		double b = fmin(t, span), f = dense_fit(d, b), a = b - step;
		double fa, fb, r;

		if ((f >= 0) != (prev >= 0)) {
			fa = dense_direct((void *)d, a);
			fb = dense_direct((void *)d, b);
			if ((fa >= 0) == (fb >= 0)) {
				a -= step;
				b += step;
				fa = dense_direct((void *)d, a);
				fb = dense_direct((void *)d, b);
			}
			assert_true((fa >= 0) != (fb >= 0));
			assert_int_equal(geom_root_illinois(dense_direct,
			    (void *)d, a, fa, b, fb, 0.001 / DAY, 200, &r),
			    ERRCODE_OK);
			assert_true(n < cap);
			out[n++] = r;
		}
		prev = f;
	}
	return n;
}

/* The top (or with sgn -1 the bottom) of the constraint's value near t
   by a 10 s scan of the fit over +-14 h. */
static double
dense_extreme(const struct dense *d, double t, double sgn)
{
	double best = -1e9;

	for (double u = fmax(0.0, t - 14.0 / 24.0); u < fmin(d->fx->tr.span,
	    t + 14.0 / 24.0); u += 10.0 / DAY)
		best = fmax(best, sgn * dense_fit(d, u));
	return sgn * best;
}

/*
 * window_find's edges (elevations followed transit by transit and
 * refined on the fit) against the crossings of a dense search: every
 * crossing matched one to one within 0.2 s, none missed, none extra.
 * The reference is the direct ERFA chain (the project's full path,
 * geom_instant_at), located by a 10 s scan; the fit is within 0.01" of
 * it, i.e. milliseconds of time at these rates.  30 random stations
 * (|lat| < 78) and spans of 12 days (one in five of 0.05-1 d, to try
 * the span's ends) in 1950-2080, the Moon's centre or a
 * lunar target; in half the cases the limit lies 2e-5 to 0.02 deg under
 * a culmination (windows from about 30 s to a quarter of an hour);
 * and the Sun's limit alone, likewise grazing in half the cases.
 */
static void
test_window_edges_match_dense_direct(void **state)
{
	double worst = 0.0, shortest = 1e9;
	size_t total = 0;

	(void)state;
	for (int cs = 0; cs < 30; cs++) {
		struct fixture fx;
		struct geom_target body;
		struct window_target tg;
		struct window_limits lim;
		struct dense d;
		static struct window w[400];
		static double ref[800];
		size_t n = 0, nr;
		char utc[96];
		int sun = cs % 3 == 2, graze = (cs / 3) % 2;
		double span = cs % 5 == 4 ? uniform(0.05, 1.0) : 12.0;

		snprintf(utc, sizeof utc, "%04d-%02d-%02dT%02d:%02d:00Z",
		    1950 + (int)uniform(0, 130), 1 + (int)uniform(0, 12),
		    1 + (int)uniform(0, 28), (int)uniform(0, 24),
		    (int)uniform(0, 60));
		fixture_open(&fx, uniform(-78, 78), uniform(-180, 180),
		    uniform(0, 4000), utc, span);
		assert_int_equal(geom_target_from_selen(uniform(-70, 70) * D2R,
		    uniform(-85, 85) * D2R, 0.0, &body), ERRCODE_OK);
		d.fx = &fx;
		d.sun = sun;
		d.body = !sun && urand() < 0.5 ? &body : NULL;
		d.lim = 0.0;
		if (graze) {	/* just under the body's top of a day */
			double tc = uniform(0.1, 0.9) * span, top = sun ?
			    -dense_extreme(&d, tc, -1.0) :
			    dense_extreme(&d, tc, 1.0);

			d.lim = top - pow(10.0, uniform(-4.7, -1.7)) * D2R;
		} else {
			d.lim = sun ? uniform(-18, 40) * D2R :
			    uniform(-2, 60) * D2R;
		}
		tg.body = d.body;
		tg.dark_only = 0;
		lim.min_el = sun ? -ERFA_DPI / 2.0 : d.lim;
		lim.max_sun_el = sun ? d.lim : ERFA_DPI;
		lim.min_sun_sep = 0.0;
		assert_int_equal(window_find(&fx.tr, &lim, &tg, 1, NULL, 0, w,
		    400, &n), ERRCODE_OK);
		nr = dense_crossings(&d, ref, 800);
		{
			size_t k = 0;

			for (size_t i = 0; i < n; i++) {
				double e[2] = {w[i].start, w[i].end};

				shortest = fmin(shortest, (w[i].end -
				    w[i].start) * DAY);
				for (int j = 0; j < 2; j++) {
					if (e[j] <= 0.0 || e[j] >= span)
						continue;	/* clipped */
					assert_true(k < nr);
					/* the direct chain, 10 s scan: above */
					check_near(e[j] * DAY, ref[k] * DAY,
					    0.2, "s", "edge vs dense direct");
					worst = fmax(worst, fabs(e[j] -
					    ref[k]) * DAY);
					k++;
				}
			}
			if (k != nr)
				print_error("case %d %s: %zu edges, %zu dense "
				    "crossings\n", cs, utc, k, nr);
			assert_int_equal(k, nr);
			total += nr;
		}
		fixture_close(&fx);
	}
	print_message("%zu edges within %.3f s of the dense direct search; "
	    "shortest window or gap %.0f s\n", total, worst, shortest);
}

/* --- blackouts, output room, bad input --- */

static void
test_window_blackout_splits_and_room(void **state)
{
	struct fixture fx;
	struct window_target tg = {NULL, 0};
	struct window_limits lim = {10.0 * D2R, ERFA_DPI, 0.0};
	struct window w[16], w2[16];
	struct window_interval bo;
	size_t n = 0, n2 = 0;

	(void)state;
	fixture_open(&fx, 38.9712, -114.3098, 2950.0, "2027-03-19T00:00:00Z",
	    3.0);
	assert_int_equal(window_find(&fx.tr, &lim, &tg, 1, NULL, 0, w, 16, &n),
	    ERRCODE_OK);
	assert_true(n >= 2);
	bo.start = w[0].start + 0.25 * (w[0].end - w[0].start);
	bo.end = w[0].start + 0.5 * (w[0].end - w[0].start);
	assert_int_equal(window_find(&fx.tr, &lim, &tg, 1, &bo, 1, w2, 16, &n2),
	    ERRCODE_OK);
	assert_int_equal(n2, n + 1);
	check_near(w2[0].end, bo.start, 1e-12, "d", "cut at blackout start");
	check_near(w2[1].start, bo.end, 1e-12, "d", "resumes at its end");
	check_near(w2[1].end, w[0].end, 1e-12, "d", "same end");
	/* Too little room: TOO_LARGE, n counts all, the first cap written. */
	assert_int_equal(window_find(&fx.tr, &lim, &tg, 1, NULL, 0, w2, 1, &n2),
	    ERRCODE_TOO_LARGE);
	assert_int_equal(n2, n);
	check_near(w2[0].start, w[0].start, 0, "d", "first written");
	fixture_close(&fx);
}

static void
test_window_bad_input(void **state)
{
	struct fixture fx;
	struct window_target tg = {NULL, 0};
	struct window_limits lim = {10.0 * D2R, ERFA_DPI, 0.0};
	struct window w[4];
	struct window_track tr;
	struct window_node nd[4];
	size_t n;

	(void)state;
	fixture_open(&fx, 10.0, 10.0, 0.0, "2027-03-19T00:00:00Z", 1.0);
	assert_int_equal(window_find(&fx.tr, &lim, &tg, 0, NULL, 0, w, 4, &n),
	    ERRCODE_BAD_ARG);
	lim.min_el = NAN;
	assert_int_equal(window_find(&fx.tr, &lim, &tg, 1, NULL, 0, w, 4, &n),
	    ERRCODE_BAD_ARG);
	assert_int_equal(window_track_nodes(0.0), 0);
	assert_int_equal(window_track_nodes(-1.0), 0);
	assert_int_equal(window_track_nodes(WINDOW_MAX_SPAN_DAYS + 1), 0);
	/* One node short of what the span needs. */
	assert_int_equal(window_track_init(&tr, &fx.site, NULL, fx.tr.base1,
	    fx.tr.base2, 1.0, nd, window_track_nodes(1.0) - 1),
	    ERRCODE_TOO_LARGE);
	assert_int_equal(window_track_init(&tr, &fx.site, NULL, fx.tr.base1,
	    fx.tr.base2, -1.0, nd, 4), ERRCODE_BAD_ARG);
	fixture_close(&fx);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_window_edges_match_libnova_north),
		cmocka_unit_test(test_window_edges_match_libnova_south),
		cmocka_unit_test(test_window_property_random_cases),
		cmocka_unit_test(test_window_short_window_at_culmination),
		cmocka_unit_test(test_window_edges_match_dense_direct),
		cmocka_unit_test(test_window_blackout_splits_and_room),
		cmocka_unit_test(test_window_bad_input),
	};

	return cmocka_run_group_tests_name("window", tests, NULL, NULL);
}
