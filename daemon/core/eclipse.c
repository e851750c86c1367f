/* SPDX-License-Identifier: BSD-3-Clause */
/* eclipse.c: the Earth's shadow at the Moon, lunar eclipse search and the
   shadow state of a reflector. */
#include <math.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/eclipse.h"
#include "core/fastpath.h"
#include "core/geom.h"

/* The Earth's effective radius for its shadow (Danjon), m. */
#define EARTH_SHADOW_A (ECLIPSE_EARTH_A * ECLIPSE_FLAT_FACTOR * ECLIPSE_DANJON)
/* The Sun's radius from its semi-diameter at 1 au, m. */
#define SUN_RADIUS (ERFA_DAU * tan(ECLIPSE_SUN_SD_1AU * ERFA_DAS2R))
/* The Moon's radius for its semi-diameter, m. */
#define MOON_RADIUS (ECLIPSE_MOON_K * ECLIPSE_EARTH_A)


const char *
eclipse_kind_name(enum eclipse_kind k)
{
	switch (k) {
	case ECLIPSE_PENUMBRAL:
		return "penumbral";
	case ECLIPSE_PARTIAL:
		return "partial";
	case ECLIPSE_TOTAL:
		return "total";
	}
	return "unknown";
}

const char *
eclipse_contact_name(enum eclipse_contact c)
{
	static const char *const names[ECLIPSE_NCONTACTS] = {
	    "P1", "U1", "U2", "U3", "U4", "P4"};

	return (c >= 0 && c < ECLIPSE_NCONTACTS) ? names[c] : "unknown";
}

const char *
eclipse_shadow_name(enum eclipse_shadow s)
{
	switch (s) {
	case ECLIPSE_SHADOW_NONE:
		return "none";
	case ECLIPSE_SHADOW_PENUMBRA:
		return "penumbra";
	case ECLIPSE_SHADOW_UMBRA:
		return "umbra";
	}
	return "unknown";
}

static double
dot3(const double a[3], const double b[3])
{
	return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

void
eclipse_geo_at(const double sun[3], const double moon[3],
    struct eclipse_geo *out)
{
	double rs = sqrt(dot3(sun, sun)), rm = sqrt(dot3(moon, moon));
	double anti[3] = {-sun[0], -sun[1], -sun[2]};
	double pim = asin(EARTH_SHADOW_A / rm);
	double pis = asin(EARTH_SHADOW_A / rs);
	double ss = asin(SUN_RADIUS / rs);

	out->sigma = geom_sep(moon, anti);
	out->umbra = pim + pis - ss;
	out->penumbra = pim + pis + ss;
	out->moon_sd = asin(MOON_RADIUS / rm);
	out->umbral_mag = (out->umbra + out->moon_sd - out->sigma) /
	    (2.0 * out->moon_sd);
	out->penumbral_mag = (out->penumbra + out->moon_sd - out->sigma) /
	    (2.0 * out->moon_sd);
}

/*
 * Fraction of the area of a disc of radius a covered by a disc of radius
 * b whose centre is c away (plane geometry; a, b > 0, c >= 0).
 */
static double
disc_overlap(double a, double b, double c)
{
	double x, y, l1, l2;

	if (c >= a + b)
		return 0.0;
	if (c <= fabs(a - b))
		return a <= b ? 1.0 : (b * b) / (a * a);
	x = (a * a - b * b + c * c) / (2.0 * c);
	y = sqrt(fmax(0.0, a * a - x * x));
	l1 = a * a * acos(fmax(-1.0, fmin(1.0, x / a))) - x * y;
	l2 = b * b * acos(fmax(-1.0, fmin(1.0, (c - x) / b))) - (c - x) * y;
	return fmin(1.0, fmax(0.0, (l1 + l2) / (ERFA_DPI * a * a)));
}

void
eclipse_point_at(const double sun[3], const double point[3],
    struct eclipse_point *out)
{
	double ds[3], de[3], rs, re, s, e, theta;

	for (int i = 0; i < 3; i++) {
		ds[i] = sun[i] - point[i];
		de[i] = -point[i];
	}
	rs = sqrt(dot3(ds, ds));
	re = sqrt(dot3(de, de));
	s = asin(fmin(1.0, SUN_RADIUS / rs));
	e = asin(fmin(1.0, EARTH_SHADOW_A / re));
	theta = geom_sep(ds, de);
	out->umbra_margin = e - s - theta;
	if (theta + s <= e) {
		out->shadow = ECLIPSE_SHADOW_UMBRA;
		out->sun_visible = 0.0;
	} else if (theta < s + e) {
		out->shadow = ECLIPSE_SHADOW_PENUMBRA;
		out->sun_visible = 1.0 - disc_overlap(s, e, theta);
	} else {
		out->shadow = ECLIPSE_SHADOW_NONE;
		out->sun_visible = 1.0;
	}
}

/* Geocentric Moon taken back by its light time, and the Sun, at TT. */
static enum errcode
bodies_seen(double tt1, double tt2, double sun[3], double moon[3])
{
	struct geom_bodies b;
	enum errcode rc = geom_bodies_at(tt1, tt2, &b);
	double tau;

	if (rc != ERRCODE_OK)
		return rc;
	tau = sqrt(dot3(b.moon_p, b.moon_p)) / GEOM_C;
	for (int i = 0; i < 3; i++) {
		moon[i] = b.moon_p[i] - tau * b.moon_v[i];
		sun[i] = b.sun_p[i];
	}
	return ERRCODE_OK;
}

enum errcode
eclipse_geo_tt(double tt1, double tt2, struct eclipse_geo *out)
{
	double sun[3], moon[3];
	enum errcode rc = bodies_seen(tt1, tt2, sun, moon);

	if (rc == ERRCODE_OK)
		eclipse_geo_at(sun, moon, out);
	return rc;
}

/* The search's function of time: sigma less one of the limits. */
struct contact_goal {
	double tt1;
	enum eclipse_contact which;	/* ECLIPSE_NCONTACTS: sigma alone */
};

static double
contact_limit(const struct eclipse_geo *g, enum eclipse_contact c)
{
	switch (c) {
	case ECLIPSE_P1:
	case ECLIPSE_P4:
		return g->penumbra + g->moon_sd;
	case ECLIPSE_U1:
	case ECLIPSE_U4:
		return g->umbra + g->moon_sd;
	case ECLIPSE_U2:
	case ECLIPSE_U3:
		return g->umbra - g->moon_sd;
	case ECLIPSE_NCONTACTS:
		break;
	}
	return 0.0;
}

static double
contact_fn(void *ctx, double tt2)
{
	const struct contact_goal *goal = ctx;
	struct eclipse_geo g;

	if (eclipse_geo_tt(goal->tt1, tt2, &g) != ERRCODE_OK)
		return NAN;
	return g.sigma - contact_limit(&g, goal->which);
}

/* Least of f over [a, b] by golden section to tol; the middle of the
   last bracket. */
static double
golden_min(geom_root_fn f, void *ctx, double a, double b, double tol)
{
	const double r = 0.618033988749894848;
	double x1 = b - r * (b - a), x2 = a + r * (b - a);
	double f1 = f(ctx, x1), f2 = f(ctx, x2);

	while (b - a > tol) {
		if (f1 < f2) {
			b = x2;
			x2 = x1;
			f2 = f1;
			x1 = b - r * (b - a);
			f1 = f(ctx, x1);
		} else {
			a = x1;
			x1 = x2;
			f1 = f2;
			x2 = a + r * (b - a);
			f2 = f(ctx, x2);
		}
	}
	return 0.5 * (a + b);
}

/* Least sigma in [a, b] (TT days, second part) by golden section. */
static double
least_sigma(double tt1, double a, double b)
{
	struct contact_goal goal = {tt1, ECLIPSE_NCONTACTS};

	return golden_min(contact_fn, &goal, a, b, 0.01 / ERFA_DAYSEC);
}

/* Sign of the Moon's ecliptic latitude relative to the anti-solar point,
   for the Sun and Moon at TT tt1 + tt2. */
static double
north_sign(double tt1, double tt2, const double sun[3], const double moon[3])
{
	double rm[3][3], m[3], sn[3], em[3], es[3], lm, bm, ls, bs;

	memcpy(m, moon, sizeof m);
	memcpy(sn, sun, sizeof sn);
	eraEcm06(tt1, tt2, rm);
	eraRxp(rm, m, em);
	eraRxp(rm, sn, es);
	eraC2s(em, &lm, &bm);
	eraC2s(es, &ls, &bs);
	return (bm + bs) >= 0.0 ? 1.0 : -1.0;
}

/* The event of greatest eclipse at tt1 + t0 for the Sun and Moon there,
   g their shadow: magnitudes, gamma and kind; no contact yet. */
static void
event_at(double tt1, double t0, const double sun[3], const double moon[3],
    const struct eclipse_geo *g, struct eclipse_event *ev)
{
	double rm = ECLIPSE_EARTH_A / sin(g->moon_sd) * ECLIPSE_MOON_K;

	memset(ev, 0, sizeof *ev);
	ev->greatest_tt1 = tt1;
	ev->greatest_tt2 = t0;
	ev->umbral_mag = g->umbral_mag;
	ev->penumbral_mag = g->penumbral_mag;
	ev->gamma = north_sign(tt1, t0, sun, moon) * rm * sin(g->sigma) /
	    ECLIPSE_EARTH_A;
	ev->kind = g->umbral_mag >= 1.0 ? ECLIPSE_TOTAL :
	    (g->umbral_mag > 0.0 ? ECLIPSE_PARTIAL : ECLIPSE_PENUMBRAL);
}

/* 1 when contact c lies before greatest eclipse (P1, U1, U2). */
static int
contact_before(int c)
{
	return c < ECLIPSE_U3;
}

/*
 * A contact in [a, b] as the root of f (sigma less the contact's limit),
 * on its side of greatest eclipse (before: 1 for P1, U1, U2; the
 * greatest-eclipse end of the bracket inside the limit, the other end
 * outside): *has 0 when the greatest-eclipse end is not inside (the
 * contact does not occur), else 1 and its time in *root.
 */
static enum errcode
contact_in(geom_root_fn f, void *ctx, int before, double a, double b,
    int *has, double *root)
{
	double fa = f(ctx, a), fb = f(ctx, b);
	enum errcode rc;

	*has = 0;
	if (!isfinite(fa) || !isfinite(fb))
		return ERRCODE_BAD_TIME;
	if (!((before ? fb : fa) < 0.0))
		return ERRCODE_OK;
	if (!((before ? fa : fb) > 0.0))
		return ERRCODE_NO_CONVERGE;
	rc = geom_root_illinois(f, ctx, a, fa, b, fb, 1e-7, 100, root);
	*has = rc == ERRCODE_OK;
	return rc;
}

/* Examine the full moon at tt1 + tt2; *found 1 when it is eclipsed. */
static enum errcode
examine(double tt1, double full2, struct eclipse_event *ev, int *found)
{
	struct contact_goal goal = {tt1, ECLIPSE_NCONTACTS};
	struct eclipse_geo g;
	double t0, sun[3], moon[3];
	enum errcode rc;

	*found = 0;
	/* At full moon (opposition in longitude) sigma is the latitude of
	   the Moon from the shadow's axis; the least sigma of the passage is
	   that times the cosine of the path's tilt to the ecliptic (under
	   7 deg: >= 0.99).  With margins of 5% and 0.002 rad (the limit moves
	   by ~0.005 deg in 0.3 d) a passage that cannot touch the penumbra
	   needs no search. */
	rc = eclipse_geo_tt(tt1, full2, &g);
	if (rc != ERRCODE_OK)
		return rc;
	if (0.95 * g.sigma > g.penumbra + g.moon_sd + 0.002)
		return ERRCODE_OK;
	t0 = least_sigma(tt1, full2 - 0.3, full2 + 0.3);
	rc = bodies_seen(tt1, t0, sun, moon);
	if (rc != ERRCODE_OK)
		return rc;
	eclipse_geo_at(sun, moon, &g);
	if (!(g.penumbral_mag > 0.0))
		return ERRCODE_OK;
	event_at(tt1, t0, sun, moon, &g, ev);
	for (int c = 0; c < ECLIPSE_NCONTACTS; c++) {
		int before = contact_before(c);

		goal.which = (enum eclipse_contact)c;
		rc = contact_in(contact_fn, &goal, before, before ? t0 - 0.3 :
		    t0, before ? t0 : t0 + 0.3, &ev->has[c],
		    &ev->contact_tt2[c]);
		if (rc != ERRCODE_OK)
			return rc;
		ev->contact_tt1[c] = ev->has[c] ? tt1 : 0.0;
	}
	*found = 1;
	return ERRCODE_OK;
}

/* Append ev to out (room cap, *count so far); past cap, only count it
   and set *rc to ERRCODE_TOO_LARGE. */
static void
keep(const struct eclipse_event *ev, struct eclipse_event *out, size_t cap,
    size_t *count, enum errcode *rc)
{
	if (*count < cap)
		out[*count] = *ev;
	else
		*rc = ERRCODE_TOO_LARGE;
	(*count)++;
}

enum errcode
eclipse_find(double from1, double from2, double to1, double to2,
    struct eclipse_event *out, size_t cap, size_t *n)
{
	struct geom_phase_event ph[64];
	double span = (to1 - from1) + (to2 - from2);
	double chunk = 400.0;	/* days per phase search: < 64 phases */
	size_t count = 0;
	enum errcode rc = ERRCODE_OK;

	*n = 0;
	if (!isfinite(from1) || !isfinite(from2) || !isfinite(span) ||
	    span < 0.0 || span > 400 * 366.0)
		return ERRCODE_BAD_ARG;
	for (double a = -0.6; a < span + 0.6; a += chunk) {
		double b = fmin(a + chunk, span + 0.6);
		size_t np = 0;
		enum errcode r2 = geom_phases_find_kinds(from1, from2 + a,
		    from1, from2 + b, 1u << GEOM_PHASE_FULL, ph,
		    sizeof ph / sizeof ph[0], &np);

		if (r2 != ERRCODE_OK)
			return r2;
		for (size_t i = 0; i < np; i++) {
			struct eclipse_event ev;
			double off;
			int found;

			if (ph[i].kind != GEOM_PHASE_FULL)
				continue;
			r2 = examine(ph[i].tt1, ph[i].tt2, &ev, &found);
			if (r2 != ERRCODE_OK)
				return r2;
			if (!found)
				continue;
			off = (ev.greatest_tt1 - from1) + (ev.greatest_tt2 - from2);
			if (off >= 0.0 && off < span)
				keep(&ev, out, cap, &count, &rc);
		}
	}
	*n = count;
	return rc;
}

/* --- the search on a fitted track --- */

/* sigma less a limit on the fitted bodies, of the TT offset t. */
struct fit_goal {
	const struct fast_track *ft;
	enum eclipse_contact which;	/* ECLIPSE_NCONTACTS: sigma alone */
};

static double
fit_fn(void *ctx, double t)
{
	const struct fit_goal *goal = ctx;
	double sun[3], moon[3];
	struct eclipse_geo g;

	fast_bodies_seen(goal->ft, t, sun, moon);
	eclipse_geo_at(sun, moon, &g);
	return g.sigma - contact_limit(&g, goal->which);
}

/*
 * The direct chain near one eclipse, without an eraEpv00 at each step:
 * the Moon by eraMoon98 at each instant (as bodies_seen), the apparent
 * Sun of bodies_seen at a centre instant plus the fitted Sun's change
 * since (the fit's error is smooth: its change over hours is far below
 * its 0.01" bound, and the Sun moves 0.2 deg in the 5 h of an eclipse).
 */
struct near_goal {
	const struct fast_track *ft;
	double tt1, tc;			/* the centre, TT tt1 + tc */
	double sun[3];			/* direct apparent Sun there, m */
	double fit[3];			/* fitted apparent Sun there, m */
	enum eclipse_contact which;	/* ECLIPSE_NCONTACTS: sigma alone */
};

/* The Sun and Moon of the near chain at TT tt1 + tt2. */
static void
near_bodies(const struct near_goal *g, double tt2, double sun[3],
    double moon[3])
{
	double pv[2][3], mp[3], mv[3], fs[3], fm[3], tau;

	eraMoon98(g->tt1, tt2, pv);
	eraSxp(ERFA_DAU, pv[0], mp);
	eraSxp(ERFA_DAU / ERFA_DAYSEC, pv[1], mv);
	tau = sqrt(dot3(mp, mp)) / GEOM_C;
	fast_bodies_seen(g->ft, (g->tt1 - g->ft->base1) + (tt2 -
	    g->ft->base2), fs, fm);
	for (int i = 0; i < 3; i++) {
		moon[i] = mp[i] - tau * mv[i];
		sun[i] = g->sun[i] + (fs[i] - g->fit[i]);
	}
}

static double
near_fn(void *ctx, double tt2)
{
	const struct near_goal *g = ctx;
	double sun[3], moon[3];
	struct eclipse_geo geo;

	near_bodies(g, tt2, sun, moon);
	eclipse_geo_at(sun, moon, &geo);
	return geo.sigma - contact_limit(&geo, g->which);
}

/* Centre the near chain at TT tt1 + tc (one evaluation of the direct
   chain). */
static enum errcode
near_init(struct near_goal *g, const struct fast_track *ft, double tt1,
    double tc)
{
	double moon[3];

	g->ft = ft;
	g->tt1 = tt1;
	g->tc = tc;
	g->which = ECLIPSE_NCONTACTS;
	fast_bodies_seen(ft, (tt1 - ft->base1) + (tc - ft->base2), g->fit,
	    moon);
	return bodies_seen(tt1, tc, g->sun, moon);
}

/*
 * Least sigma near tt2: the vertex of the parabola through sigma^2 at
 * tt2 and +-2 s (the relative motion is straight to ~1e-5 over seconds,
 * so sigma^2 is a parabola in time to far better than 1 ms).  Returns 0,
 * or -1 when the vertex is not inside the three points.
 */
static int
near_vertex(struct near_goal *g, double tt2, double *t0)
{
	const double h = 2.0 / ERFA_DAYSEC;
	double fm, f0, fp, den, dt;

	g->which = ECLIPSE_NCONTACTS;
	fm = near_fn(g, tt2 - h);
	f0 = near_fn(g, tt2);
	fp = near_fn(g, tt2 + h);
	fm *= fm;
	f0 *= f0;
	fp *= fp;
	den = fp - 2.0 * f0 + fm;
	if (!(den > 0.0))
		return -1;
	dt = 0.5 * h * (fm - fp) / den;
	if (!(fabs(dt) < h))
		return -1;
	*t0 = tt2 + dt;
	return 0;
}

/*
 * One full moon at offset tf on the track: as examine, with the search on
 * the fit and the last steps on the near chain (one eraEpv00 for the
 * eclipse).  lo, hi: the offsets the fit covers.
 */
static enum errcode
examine_fit(const struct fast_track *ft, double tf, double lo, double hi,
    struct eclipse_event *ev, int *found)
{
	struct fit_goal fg = {ft, ECLIPSE_NCONTACTS};
	struct contact_goal goal = {ft->base1, ECLIPSE_NCONTACTS};
	struct near_goal ng;
	const double b2 = ft->base2, near = 1.0 / ERFA_DAYSEC;
	struct eclipse_geo g;
	double sun[3], moon[3], tg, t0;
	enum errcode rc;

	*found = 0;
	/* The screen of examine on the fitted bodies (within 0.01"). */
	fast_bodies_seen(ft, tf, sun, moon);
	eclipse_geo_at(sun, moon, &g);
	if (0.95 * g.sigma > g.penumbra + g.moon_sd + 0.002)
		return ERRCODE_OK;
	tg = golden_min(fit_fn, &fg, fmax(lo, tf - 0.3), fmin(hi, tf + 0.3),
	    0.05 / ERFA_DAYSEC);
	rc = near_init(&ng, ft, ft->base1, b2 + tg);
	if (rc != ERRCODE_OK)
		return rc;
	if (near_vertex(&ng, b2 + tg, &t0) != 0)
		t0 = least_sigma(ft->base1, b2 + tf - 0.3, b2 + tf + 0.3);
	near_bodies(&ng, t0, sun, moon);
	eclipse_geo_at(sun, moon, &g);
	if (!(g.penumbral_mag > 0.0))
		return ERRCODE_OK;
	event_at(ft->base1, t0, sun, moon, &g, ev);
	for (int c = 0; c < ECLIPSE_NCONTACTS; c++) {
		int before = contact_before(c), has = 0;
		double a, b, r;

		goal.which = fg.which = ng.which = (enum eclipse_contact)c;
		if (!(g.sigma - contact_limit(&g, goal.which) < 0.0))
			continue;	/* it does not occur */
		/* On the fit to 0.05 s, then a bracket of +-1 s of it on the
		   near chain; the whole side on the direct chain when that
		   fails. */
		a = before ? fmax(lo, t0 - b2 - 0.3) : t0 - b2;
		b = before ? t0 - b2 : fmin(hi, t0 - b2 + 0.3);
		{
			double fa = fit_fn(&fg, a), fb = fit_fn(&fg, b);

			if ((fa > 0.0) != (fb > 0.0) &&
			    geom_root_illinois(fit_fn, &fg, a, fa, b, fb,
			    0.05 / ERFA_DAYSEC, 100, &r) == ERRCODE_OK) {
				a = fmax(a, r - near);
				b = fmin(b, r + near);
				rc = contact_in(near_fn, &ng, before, b2 + a,
				    b2 + b, &has, &ev->contact_tt2[c]);
				if (rc != ERRCODE_OK && rc != ERRCODE_NO_CONVERGE)
					return rc;
			}
		}
		if (!has) {
			rc = contact_in(contact_fn, &goal, before, before ?
			    t0 - 0.3 : t0, before ? t0 : t0 + 0.3, &has,
			    &ev->contact_tt2[c]);
			if (rc != ERRCODE_OK)
				return rc;
		}
		ev->has[c] = has;
		ev->contact_tt1[c] = has ? ft->base1 : 0.0;
	}
	*found = 1;
	return ERRCODE_OK;
}

enum errcode
eclipse_find_track(const struct fast_track *ft, double from, double to,
    struct eclipse_event *out, size_t cap, size_t *n)
{
	const double pi = ERFA_DPI, step = 1.0;
	double lo, hi, a, b, sa, sb;
	size_t count = 0;
	enum errcode rc = ERRCODE_OK;

	*n = 0;
	fast_track_range(ft, &lo, &hi);
	if (!isfinite(from) || !isfinite(to) || !(to >= from) ||
	    from - ECLIPSE_TRACK_MARGIN < lo || to + ECLIPSE_TRACK_MARGIN > hi)
		return ERRCODE_BAD_ARG;
	/* Full moons (the unwrapped synodic angle at pi + 2 k pi) in steps
	   of a day over [from, to] widened by the margin. */
	a = from - ECLIPSE_TRACK_MARGIN;
	sa = fast_synodic(ft, a);
	while (a < to + ECLIPSE_TRACK_MARGIN) {
		b = fmin(a + step, to + ECLIPSE_TRACK_MARGIN);
		sb = fast_synodic(ft, b);
		for (double k = floor((sa - pi) / (2.0 * pi)) + 1.0;
		    pi + 2.0 * pi * k <= sb; k++) {
			struct fast_synodic_goal sg = {ft, pi + 2.0 * pi * k};
			struct eclipse_event ev;
			double tf, off;
			int found;
			enum errcode r2;

			if (geom_root_illinois(fast_synodic_less, &sg, a, sa - sg.ang, b,
			    sb - sg.ang, 1.0 / ERFA_DAYSEC, 100, &tf) !=
			    ERRCODE_OK)
				return ERRCODE_NO_CONVERGE;
			r2 = examine_fit(ft, tf, lo, hi, &ev, &found);
			if (r2 != ERRCODE_OK)
				return r2;
			if (!found)
				continue;
			off = (ev.greatest_tt1 - ft->base1) +
			    (ev.greatest_tt2 - ft->base2);
			if (off >= from && off < to)
				keep(&ev, out, cap, &count, &rc);
		}
		a = b;
		sa = sb;
	}
	*n = count;
	return rc;
}
