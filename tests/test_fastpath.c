/* SPDX-License-Identifier: BSD-3-Clause */
/* test_fastpath.c: the fitted fast path against the direct ERFA chain over
   random spans 1900-2100: angles within 0.1", event times within 0.1 s. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "check.h"
#include "core/fastpath.h"
#include "core/window.h"

/*
 * The reference throughout is the direct chain at the same TT:
 * geom_bodies_at (eraMoon98, eraEpv00) and geom_earth_at at
 * GEOM_PREC_FULL (IAU 2006/2000A) combined by geom_instant_make, i.e.
 * what geom_instant_at computes; that chain is itself checked against
 * libnova (an independent library) in test_geom_ref.  The bounds, 0.1"
 * and 0.1 s, are those issue 13 sets for the fast path.
 */

#define D2R ERFA_DD2R
#define AS (ERFA_DR2AS)
#define DAY ERFA_DAYSEC
#define MAX_AS 0.1		/* arcseconds */
#define MAX_S 0.1		/* seconds */

/* A deterministic generator (64-bit LCG, Knuth's constants). */
static unsigned long long rng = 0x2545F4914F6CDD1DULL;

static double
uniform(double a, double b)
{
	rng = rng * 6364136223846793005ULL + 1442695040888963407ULL;
	return a + (b - a) * ((double)(rng >> 11) / 9007199254740992.0);
}

/* The direct chain at offset t of the track's base. */
static void
direct(const struct fast_track *ft, double t, struct geom_instant *g)
{
	struct tscale_instant ti;
	struct geom_bodies b;
	struct geom_earth e;

	assert_int_equal(tscale_from_tt(ft->base1, ft->base2 + t,
	    ft->eop.dut1, &ti), ERRCODE_OK);
	assert_int_equal(geom_bodies_at(ti.tt1, ti.tt2, &b), ERRCODE_OK);
	geom_earth_at(ti.tt1, ti.tt2, ti.ut11, ti.ut12, &ft->eop,
	    GEOM_PREC_FULL, &e);
	geom_instant_make(&ft->site, &ti, &b, &e, g);
}

struct worst {
	double moon, sun, radec, sep, phase, target, lib, syn, range;
};

static void
keep(double *w, double v)
{
	if (fabs(v) > *w)
		*w = fabs(v);
}

/* Every compared quantity at one instant, fast (full and light) vs
   direct. */
static void
compare_at(const struct fast_track *ft, double t,
    const struct geom_target *tg, struct worst *w)
{
	struct geom_instant gf, gd;
	struct geom_target_view vf, vd;
	struct fast_frame fr;
	double sun_el, el, dark;

	fast_instant(ft, t, &gf);
	direct(ft, t, &gd);
	keep(&w->moon, (gf.moon.el - gd.moon.el) * AS);
	keep(&w->moon, eraAnpm(gf.moon.az - gd.moon.az) * cos(gd.moon.el) *
	    AS);
	keep(&w->sun, (gf.sun.el - gd.sun.el) * AS);
	keep(&w->sun, eraAnpm(gf.sun.az - gd.sun.az) * cos(gd.sun.el) * AS);
	keep(&w->radec, eraAnpm(gf.moon.ra - gd.moon.ra) * cos(gd.moon.dec) *
	    AS);
	keep(&w->radec, (gf.moon.dec - gd.moon.dec) * AS);
	keep(&w->sep, (gf.sun.separation - gd.sun.separation) * AS);
	keep(&w->phase, (gf.moon.phase_angle - gd.moon.phase_angle) * AS);
	keep(&w->lib, eraAnpm(gf.lib.topo_lon - gd.lib.topo_lon) * AS);
	keep(&w->lib, (gf.lib.subsolar_lat - gd.lib.subsolar_lat) * AS);
	keep(&w->syn, eraAnpm(gf.moon.synodic - gd.moon.synodic) * AS);
	keep(&w->range, gf.moon.range - gd.moon.range);
	geom_target_view(&gf, tg, &vf);
	geom_target_view(&gd, tg, &vd);
	keep(&w->target, (vf.el - vd.el) * AS);
	keep(&w->target, (vf.sun_elevation - vd.sun_elevation) * AS);
	keep(&w->target, (vf.offset_ra - vd.offset_ra) * AS);
	keep(&w->target, (vf.offset_dec - vd.offset_dec) * AS);

	/* The light frame reads the same numbers. */
	fast_frame_at(ft, t, FAST_SUN | FAST_LUNAR, &fr);
	keep(&w->moon, (fast_elevation(ft, fr.moon_itrs) - gd.moon.el) * AS);
	keep(&w->sun, (fast_elevation(ft, fr.sun_itrs) - gd.sun.el) * AS);
	keep(&w->sep, (fast_separation(&fr) - gd.sun.separation) * AS);
	el = fast_target_el(ft, &fr, tg, &sun_el, &dark);
	keep(&w->target, (el - vd.el) * AS);
	keep(&w->target, (sun_el - vd.sun_elevation) * AS);
	keep(&w->target, (dark - vd.dark_margin) * AS);
}

/* A track of span days from a TT JD (two parts), random station. */
static struct fast_seg *
open_track2(struct fast_track *ft, double tt1, double tt2, double span,
    const struct geom_eop *eop)
{
	struct geom_site site;
	size_t n = fast_track_segments(0.0, span);
	struct fast_seg *seg = calloc(n, sizeof *seg);

	assert_non_null(seg);
	assert_int_equal(geom_site_init(&site, uniform(-70, 70) * D2R,
	    uniform(-180, 180) * D2R, uniform(0, 3000), NULL), ERRCODE_OK);
	assert_int_equal(fast_track_init(ft, &site, eop, tt1, tt2, 0.0, span,
	    seg, n), ERRCODE_OK);
	return seg;
}

static struct fast_seg *
open_track(struct fast_track *ft, double tt, double span,
    const struct geom_eop *eop)
{
	return open_track2(ft, tt, 0.0, span, eop);
}

static void
test_fastpath_angles_random_spans(void **state)
{
	struct worst w;
	int ninst = 0;

	(void)state;
	memset(&w, 0, sizeof w);
	for (int k = 0; k < 40; k++) {
		struct fast_track ft;
		struct geom_target tg;
		struct geom_eop eop;
		/* TT JD 1900-01-02 .. 2099-12-01 (eraEpv00's span). */
		double tt = floor(uniform(2415022.0, 2488050.0)) + 0.5;
		double span = uniform(1.0, 40.0);
		struct fast_seg *seg;

		eop.dut1 = uniform(-0.9, 0.9);
		eop.xp = uniform(-0.5, 0.5) * ERFA_DAS2R;
		eop.yp = uniform(-0.5, 0.5) * ERFA_DAS2R;
		seg = open_track(&ft, tt, span, &eop);
		assert_int_equal(geom_target_from_selen(uniform(-1.2, 1.2),
		    uniform(-1.5, 1.5), 0.0, &tg), ERRCODE_OK);
		for (int i = 0; i < 40; i++, ninst++)
			compare_at(&ft, uniform(0.0, span), &tg, &w);
		free(seg);
	}
	printf("%d instants, worst (arcsec): Moon %.4f Sun %.4f ra/dec %.4f "
	    "separation %.4f phase %.4f target %.4f libration %.4f synodic "
	    "%.4f; range %.2f m\n", ninst, w.moon, w.sun, w.radec, w.sep,
	    w.phase, w.target, w.lib, w.syn, w.range);
	assert_true(w.moon <= MAX_AS);
	assert_true(w.sun <= MAX_AS);
	assert_true(w.radec <= MAX_AS);
	assert_true(w.sep <= MAX_AS);
	assert_true(w.phase <= MAX_AS);
	assert_true(w.target <= MAX_AS);
	assert_true(w.lib <= MAX_AS);
	assert_true(w.syn <= MAX_AS);
	/* 0.1" at the Moon's distance is 190 m; the range is far closer. */
	assert_true(w.range <= 10.0);
}

/* Elevation of the Moon's centre minus a limit, by either path. */
struct el_goal {
	const struct fast_track *ft;
	double min_el;
	int use_direct;
};

static double
el_goal(void *ctx, double t)
{
	const struct el_goal *g = ctx;
	struct geom_instant gd;
	struct fast_frame f;

	if (g->use_direct) {
		direct(g->ft, t, &gd);
		return gd.moon.el - g->min_el;
	}
	fast_frame_at(g->ft, t, 0, &f);
	return fast_elevation(g->ft, f.moon_itrs) - g->min_el;
}

/* The root of one path near t (bracket +-20 s), to 1 ms. */
static double
root_near(struct el_goal *g, double t)
{
	double a = t - 20.0 / DAY, b = t + 20.0 / DAY, r;
	double fa = el_goal(g, a), fb = el_goal(g, b);

	assert_true((fa >= 0) != (fb >= 0));
	assert_int_equal(geom_root_illinois(el_goal, g, a, fa, b, fb,
	    0.001 / DAY, 200, &r), ERRCODE_OK);
	return r;
}

static void
test_fastpath_event_times_random_spans(void **state)
{
	double worst = 0.0;
	int nev = 0;

	(void)state;
	for (int k = 0; k < 12; k++) {
		struct geom_site site;
		struct window_track tr;
		struct window_node *nodes;
		struct window_limits lim;
		struct window_target tgt = {NULL, 0};
		struct window win[64];
		double tt = floor(uniform(2415022.0, 2488050.0)) + 0.5;
		double span = uniform(2.0, 10.0);
		size_t nn = window_track_nodes(span), nw;
		struct el_goal gf, gd;

		assert_int_equal(geom_site_init(&site, uniform(-60, 60) * D2R,
		    uniform(-180, 180) * D2R, uniform(0, 3000), NULL),
		    ERRCODE_OK);
		nodes = calloc(nn, sizeof *nodes);
		assert_non_null(nodes);
		assert_int_equal(window_track_init(&tr, &site, NULL, tt, 0.0,
		    span, nodes, nn), ERRCODE_OK);
		lim.min_el = uniform(5.0, 30.0) * D2R;
		lim.max_sun_el = ERFA_DPI;
		lim.min_sun_sep = 0.0;
		assert_int_equal(window_find(&tr, &lim, &tgt, 1, NULL, 0, win,
		    64, &nw), ERRCODE_OK);
		gf.ft = gd.ft = &tr.ft;
		gf.min_el = gd.min_el = lim.min_el;
		gf.use_direct = 0;
		gd.use_direct = 1;
		for (size_t i = 0; i < nw; i++)
			for (int e = 0; e < 2; e++) {
				double t = e ? win[i].end : win[i].start;
				double tf, td;

				if (t <= 0.0 || t >= span)
					continue;	/* the span's ends */
				tf = root_near(&gf, t);
				td = root_near(&gd, t);
				/* window_find's own edge is within its
				   tolerance of the fitted root. */
				assert_true(fabs(tf - t) * DAY <=
				    WINDOW_EDGE_TOL_S);
				keep(&worst, (tf - td) * DAY);
				nev++;
			}
		free(nodes);
	}
	printf("%d rise/set events, worst %.4f s from the direct chain\n",
	    nev, worst);
	assert_true(nev > 20);
	assert_true(worst <= MAX_S);
}

/* Over the leap second at the end of 2016 (IERS Bulletin C 52) the
   Earth rotation angle follows UT1 = UTC + DUT1 as the direct chain. */
static void
test_fastpath_leap_second(void **state)
{
	struct fast_track ft;
	struct fast_seg *seg;
	struct worst w;
	struct geom_target tg;
	struct geom_eop eop = {0.4, 0.0, 0.0};
	struct tscale_instant t0;
	double u1, u2;

	(void)state;
	memset(&w, 0, sizeof w);
	assert_int_equal(tscale_parse_utc("2016-12-29T00:00:00Z", &u1, &u2,
	    NULL, 0), ERRCODE_OK);
	assert_int_equal(tscale_from_utc(u1, u2, eop.dut1, &t0), ERRCODE_OK);
	seg = open_track2(&ft, t0.tt1, t0.tt2, 6.0, &eop);
	assert_int_equal(geom_target_from_selen(0.2, 0.3, 0.0, &tg),
	    ERRCODE_OK);
	/* The leap second ends 3 days in (TT = UTC + 69.184 s after it):
	   sample +-2 minutes around it. */
	for (int i = -120; i <= 120; i += 3)
		compare_at(&ft, 3.0 + (double)i / DAY + 69.184 / DAY, &tg, &w);
	printf("leap second: worst Moon %.4f\" Sun %.4f\"\n", w.moon, w.sun);
	assert_true(w.moon <= MAX_AS);
	assert_true(w.sun <= MAX_AS);
	free(seg);
}

static void
test_fastpath_synodic_unwrapped(void **state)
{
	struct fast_track ft;
	struct fast_seg *seg;
	double prev;

	(void)state;
	seg = open_track(&ft, 2461406.5, 90.0, NULL);
	prev = fast_synodic(&ft, 0.0);
	/* The synodic angle grows 11-14 deg a day (Meeus ch. 49, common
	   practice): unwrapped it rises without a jump. */
	for (int i = 1; i <= 900; i++) {
		double s = fast_synodic(&ft, 0.1 * i);

		assert_true(s > prev);
		assert_true(s - prev < 2.0 * D2R);
		check_near(eraAnp(s), geom_synodic_at(2461406.5, 0.1 * i),
		    MAX_AS / AS + 1e-9, "rad", "synodic");
		prev = s;
	}
	free(seg);
}

static void
test_fastpath_bad_input(void **state)
{
	struct fast_track ft;
	struct fast_seg seg[2];
	struct geom_site site;

	(void)state;
	assert_int_equal(geom_site_init(&site, 0.5, 0.5, 0.0, NULL),
	    ERRCODE_OK);
	assert_int_equal(fast_track_segments(1.0, 1.0), 0);
	assert_int_equal(fast_track_segments(0.0, 5000.0), 0);
	assert_int_equal(fast_track_segments(0.0, NAN), 0);
	assert_int_equal(fast_track_init(&ft, &site, NULL, 2451545.0, 0.0,
	    0.0, 30.0, seg, 2), ERRCODE_TOO_LARGE);
	assert_int_equal(fast_track_init(&ft, &site, NULL, NAN, 0.0, 0.0,
	    1.0, seg, 2), ERRCODE_BAD_ARG);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_fastpath_angles_random_spans),
		cmocka_unit_test(test_fastpath_event_times_random_spans),
		cmocka_unit_test(test_fastpath_leap_second),
		cmocka_unit_test(test_fastpath_synodic_unwrapped),
		cmocka_unit_test(test_fastpath_bad_input),
	};

	return cmocka_run_group_tests_name("fastpath", tests, NULL, NULL);
}
