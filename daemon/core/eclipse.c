/* SPDX-License-Identifier: BSD-3-Clause */
/* eclipse.c: the Earth's shadow at the Moon, lunar eclipse search and the
   shadow state of a reflector. */
#include <math.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/eclipse.h"
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

/* Least sigma in [a, b] (TT days, second part) by golden section. */
static double
least_sigma(double tt1, double a, double b)
{
	const double r = 0.618033988749894848;
	struct contact_goal goal = {tt1, ECLIPSE_NCONTACTS};
	double x1 = b - r * (b - a), x2 = a + r * (b - a);
	double f1 = contact_fn(&goal, x1), f2 = contact_fn(&goal, x2);

	while (b - a > 0.01 / ERFA_DAYSEC) {
		if (f1 < f2) {
			b = x2;
			x2 = x1;
			f2 = f1;
			x1 = b - r * (b - a);
			f1 = contact_fn(&goal, x1);
		} else {
			a = x1;
			x1 = x2;
			f1 = f2;
			x2 = a + r * (b - a);
			f2 = contact_fn(&goal, x2);
		}
	}
	return 0.5 * (a + b);
}

/* Sign of the Moon's ecliptic latitude relative to the anti-solar point. */
static double
north_sign(double tt1, double tt2)
{
	double sun[3], moon[3], rm[3][3], em[3], es[3], lm, bm, ls, bs;

	if (bodies_seen(tt1, tt2, sun, moon) != ERRCODE_OK)
		return 1.0;
	eraEcm06(tt1, tt2, rm);
	eraRxp(rm, moon, em);
	eraRxp(rm, sun, es);
	eraC2s(em, &lm, &bm);
	eraC2s(es, &ls, &bs);
	return (bm + bs) >= 0.0 ? 1.0 : -1.0;
}

/* Examine the full moon at tt1 + tt2; *found 1 when it is eclipsed. */
static enum errcode
examine(double tt1, double full2, struct eclipse_event *ev, int *found)
{
	struct contact_goal goal = {tt1, ECLIPSE_NCONTACTS};
	struct eclipse_geo g;
	double t0, rm;
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
	rc = eclipse_geo_tt(tt1, t0, &g);
	if (rc != ERRCODE_OK)
		return rc;
	if (!(g.penumbral_mag > 0.0))
		return ERRCODE_OK;
	memset(ev, 0, sizeof *ev);
	ev->greatest_tt1 = tt1;
	ev->greatest_tt2 = t0;
	ev->umbral_mag = g.umbral_mag;
	ev->penumbral_mag = g.penumbral_mag;
	rm = ECLIPSE_EARTH_A / sin(g.moon_sd) * ECLIPSE_MOON_K;
	ev->gamma = north_sign(tt1, t0) * rm * sin(g.sigma) / ECLIPSE_EARTH_A;
	ev->kind = g.umbral_mag >= 1.0 ? ECLIPSE_TOTAL :
	    (g.umbral_mag > 0.0 ? ECLIPSE_PARTIAL : ECLIPSE_PENUMBRAL);
	for (int c = 0; c < ECLIPSE_NCONTACTS; c++) {
		int before = c < ECLIPSE_U3 ? 1 : 0;
		double a = before ? t0 - 0.3 : t0, b = before ? t0 : t0 + 0.3;
		double fa, fb, root;

		goal.which = (enum eclipse_contact)c;
		fa = contact_fn(&goal, a);
		fb = contact_fn(&goal, b);
		if (!isfinite(fa) || !isfinite(fb))
			return ERRCODE_BAD_TIME;
		/* It occurs when sigma at greatest is inside the limit. */
		if (!((before ? fb : fa) < 0.0))
			continue;
		if (!((before ? fa : fb) > 0.0))
			return ERRCODE_NO_CONVERGE;
		rc = geom_root_illinois(contact_fn, &goal, a, fa, b, fb, 1e-7, 100,
		    &root);
		if (rc != ERRCODE_OK)
			return rc;
		ev->has[c] = 1;
		ev->contact_tt1[c] = tt1;
		ev->contact_tt2[c] = root;
	}
	*found = 1;
	return ERRCODE_OK;
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
			if (off < 0.0 || off >= span)
				continue;
			if (count < cap)
				out[count] = ev;
			else
				rc = ERRCODE_TOO_LARGE;
			count++;
		}
	}
	*n = count;
	return rc;
}
