/* SPDX-License-Identifier: BSD-3-Clause */
/* window.c: tabulated ephemeris and the search for observing windows. */
#include <math.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/window.h"

#define EDGE_TOL (WINDOW_EDGE_TOL_S / ERFA_DAYSEC)
#define EXT_TOL (1.0 / ERFA_DAYSEC)	/* golden section to 1 s */
#define MARGIN (2.0 * WINDOW_GRID_DAYS + 2.0 * WINDOW_NODE_DAYS)

/* Constraint slots: two shared by all targets, two per target. */
enum { C_SUN = 0, C_SEP = 1, C_SHARED = 2 };
#define C_EL(j) (C_SHARED + 2 * (int)(j))
#define C_DARK(j) (C_SHARED + 2 * (int)(j) + 1)
#define C_MAX (C_SHARED + 2 * WINDOW_MAX_TARGETS)

/* The nodes are handed to the fast path as its segments. */
_Static_assert(sizeof(struct window_node) == sizeof(struct fast_seg),
    "a window node is one fitted segment");

size_t
window_track_nodes(double span_days)
{
	if (!(span_days > 0.0) || span_days > WINDOW_MAX_SPAN_DAYS)
		return 0;
	return fast_track_segments(-MARGIN, span_days + MARGIN);
}

enum errcode
window_track_init(struct window_track *tr, const struct geom_site *site,
    const struct geom_eop *eop, double tt1, double tt2, double span_days,
    struct window_node *nodes, size_t cap)
{
	size_t need = window_track_nodes(span_days);
	struct geom_eop e0 = {0.0, 0.0, 0.0};

	if (need == 0 || !isfinite(tt1) || !isfinite(tt2))
		return ERRCODE_BAD_ARG;
	if (cap < need)
		return ERRCODE_TOO_LARGE;
	memset(tr, 0, sizeof *tr);
	tr->site = *site;
	tr->eop = eop != NULL ? *eop : e0;
	tr->base1 = tt1;
	tr->base2 = tt2;
	tr->span = span_days;
	return fast_track_init(&tr->ft, site, &tr->eop, tt1, tt2, -MARGIN,
	    span_days + MARGIN, (struct fast_seg *)(void *)nodes, cap);
}

double
window_track_synodic(const struct window_track *tr, double t)
{
	return fast_synodic(&tr->ft, t);
}

void
window_track_instant(const struct window_track *tr, double t,
    struct geom_instant *out)
{
	fast_instant(&tr->ft, t, out);
}

/* --- the search --- */

struct diurnal;

struct ctx {
	const struct window_track *tr;
	const struct window_limits *lim;
	const struct window_target *tg;
	size_t nt;
	const struct window_interval *bo;
	size_t nbo;
	struct window *out;
	size_t cap, count;
	int active[C_MAX];
	unsigned need;		/* frame contents for the sampled constraints */
	int ngrid;		/* active constraints sampled on the grid */
	struct diurnal *diu[C_MAX];	/* followed transit by transit, or
					   NULL: sampled on the grid */
	double cphi, sphi, clam, slam;	/* station latitude, longitude */
};

/* What a frame must hold for constraint c. */
static unsigned
needs(const struct ctx *x, int c)
{
	size_t j;

	if (c < C_SHARED)
		return FAST_SUN;
	j = (size_t)(c - C_SHARED) / 2;
	if (x->tg[j].body == NULL)
		return 0;
	return (c - C_SHARED) % 2 == 0 ? FAST_LUNAR : FAST_LUNAR | FAST_SUN;
}

/* Value of constraint c in a frame: >= 0 where it holds. */
static double
cval(const struct ctx *x, int c, const struct fast_frame *f)
{
	const struct fast_track *ft = &x->tr->ft;
	double dark;
	size_t j;

	if (c == C_SUN)
		return x->lim->max_sun_el - fast_elevation(ft, f->sun_itrs);
	if (c == C_SEP)
		return fast_separation(f) - x->lim->min_sun_sep;
	j = (size_t)(c - C_SHARED) / 2;
	if (x->tg[j].body == NULL)	/* C_EL of the centre */
		return fast_elevation(ft, f->moon_itrs) - x->lim->min_el;
	if ((c - C_SHARED) % 2 == 0)
		return fast_target_el(ft, f, x->tg[j].body, NULL, NULL) -
		    x->lim->min_el;
	(void)fast_target_el(ft, f, x->tg[j].body, NULL, &dark);
	return dark;
}

static double
cfun(const struct ctx *x, int c, double t)
{
	struct fast_frame f;

	fast_frame_at(&x->tr->ft, t, needs(x, c), &f);
	return cval(x, c, &f);
}

/* Every active constraint sampled on the grid at one grid time, from one
   frame. */
static void
sample_all(const struct ctx *x, double t, double *f)
{
	const struct fast_track *ft = &x->tr->ft;
	struct fast_frame fr;

	if (x->ngrid == 0)
		return;
	fast_frame_at(ft, t, x->need, &fr);
	if (x->active[C_SUN] && x->diu[C_SUN] == NULL)
		f[C_SUN] = cval(x, C_SUN, &fr);
	if (x->active[C_SEP])
		f[C_SEP] = cval(x, C_SEP, &fr);
	for (size_t j = 0; j < x->nt; j++) {
		double dark;
		int el = x->diu[C_EL(j)] == NULL;

		if (x->tg[j].body == NULL) {
			if (el)
				f[C_EL(j)] = cval(x, C_EL(j), &fr);
			continue;
		}
		if (!el && !x->active[C_DARK(j)])
			continue;
		f[C_EL(j)] = fast_target_el(ft, &fr, x->tg[j].body, NULL,
		    x->active[C_DARK(j)] ? &dark : NULL) - x->lim->min_el;
		if (x->active[C_DARK(j)])
			f[C_DARK(j)] = dark;
	}
}

/* One constraint of one context, as a function for geom_root_illinois. */
struct edge_goal {
	const struct ctx *x;
	int c;
};

static double
edge_goal_value(void *ctx, double t)
{
	const struct edge_goal *g = ctx;

	return cfun(g->x, g->c, t);
}

/* Root of constraint c bracketed by [a, b]; after the step cap, the middle
   of the last bracket (well inside EDGE_TOL for these smooth functions). */
static double
refine(const struct ctx *x, int c, double a, double fa, double b, double fb)
{
	struct edge_goal g = {x, c};
	double root;

	(void)geom_root_illinois(edge_goal_value, &g, a, fa, b, fb, EDGE_TOL,
	    80, &root);
	return root;
}

/*
 * Extremum of sgn * f over [a, b] by golden section (sgn +1: maximum);
 * returns its time and sets *fe to f there.
 */
static double
extremum(const struct ctx *x, int c, double a, double b, double sgn,
    double *fe)
{
	const double r = 0.618033988749894848;
	double x1 = b - r * (b - a), x2 = a + r * (b - a);
	double f1 = sgn * cfun(x, c, x1), f2 = sgn * cfun(x, c, x2);

	while (b - a > EXT_TOL) {
		if (f1 < f2) {
			a = x1;
			x1 = x2;
			f1 = f2;
			x2 = a + r * (b - a);
			f2 = sgn * cfun(x, c, x2);
		} else {
			b = x2;
			x2 = x1;
			f2 = f1;
			x1 = b - r * (b - a);
			f1 = sgn * cfun(x, c, x1);
		}
	}
	if (f1 > f2) {
		*fe = sgn * f1;
		return x1;
	}
	*fe = sgn * f2;
	return x2;
}

/*
 * Roots near a grid sample that is an extremum of the wrong sign:
 * fl, fm, fr at times tl, (tl + tr) / 2, tr.  Writes 0 or 2 roots.
 */
static int
triple_roots(const struct ctx *x, int c, double tl, double fl, double fm,
    double tr, double fr, double roots[2])
{
	double sgn, te, fe;

	if ((fl >= 0) != (fm >= 0) || (fr >= 0) != (fm >= 0))
		return 0;
	if (fm < 0 && fm > fl && fm >= fr)
		sgn = 1.0;		/* a maximum still below the limit */
	else if (fm >= 0 && fm < fl && fm <= fr)
		sgn = -1.0;		/* a minimum still above it */
	else
		return 0;
	te = extremum(x, c, tl, tr, sgn, &fe);
	if ((fe >= 0) == (fm >= 0))
		return 0;
	roots[0] = refine(x, c, tl, fl, te, fe);
	roots[1] = refine(x, c, te, fe, tr, fr);
	return 2;
}

struct event {
	double t;
	int c;
};

/*
 * --- elevations followed from one meridian transit to the next ---
 *
 * A body's topocentric elevation e at a station of geodetic latitude phi
 * is, for its hour angle H (from the ITRS meridian, west +) and
 * declination d (from the ITRS equator),
 *
 *   sin e = sin phi sin d + cos phi cos d cos H.
 *
 * H grows steadily (about 14 to 15.5 deg/h for the Moon, 15 for the
 * Sun) while d drifts slowly (topocentric Moon: under 0.5 deg/h), so e
 * has one maximum near each upper transit (H = 0) and one minimum near
 * each lower transit (H = pi), and is monotone between those extrema.
 * The extremum is displaced from the transit by at most about
 * 9 min / (cos phi cos d), where e differs from its value at the transit
 * by at most 0.036 deg / (cos phi cos d) (the rate of d times the
 * displacement).  So, walking the transits in turn (each found by a few
 * secant steps on H):
 *
 *   a transit whose value is more than DIU_SLACK / (cos phi cos d) on
 *   either side of the limit stands for its extremum (same side);
 *   a closer one is replaced by its extremum, found by golden section
 *   over DIU_HALF_W / (cos phi cos d) on each side (a window of seconds
 *   at culmination is not missed);
 *   between consecutive points e crosses the limit once if they lie on
 *   opposite sides, else not at all.
 *
 * Each crossing starts from the hour angle the formula gives at the
 * transit's declination and is refined by secant steps kept inside the
 * bracket, to DIU_ROOT_TOL.  The grid of WINDOW_GRID_DAYS is then needed
 * only for the separation and lunar darkness; beyond DIU_MAX_LAT the
 * elevations too are sampled on it.
 */
#define DIU_MAX_LAT (80.0 * ERFA_DD2R)
#define DIU_SLACK (0.1 * ERFA_DD2R)		/* ~3 x the bound above */
#define DIU_HALF_W (20.0 / 1440.0)		/* ~2 x the displacement */
#define DIU_HA_TOL 1e-5				/* transits, rad (0.14 s) */
#define DIU_ROOT_TOL (0.01 / ERFA_DAYSEC)	/* crossings, days */
#define DIU_CELL 0.25			/* cell when nothing is sampled, d */
#define DIU_QUEUE 8
#define DIU_MOON_RATE (ERFA_D2PI * 0.96614)	/* mean dH/dt, rad/day */
#define DIU_SUN_RATE (ERFA_D2PI * 1.0)

struct diurnal {
	int c;			/* constraint slot */
	double sgn;		/* g = sgn (e - lim): +1 C_EL, -1 C_SUN */
	double lim;		/* the elevation limit, rad */
	double p, gp, hp, dp;	/* last point: time, g, hour angle
				   (unwrapped), declination */
	double k;		/* its transit: hour angle k pi */
	double rate;		/* hour-angle rate, rad/day, last measured */
	double q[DIU_QUEUE];	/* crossings found and not yet taken */
	int nq;
	int sign;		/* g >= 0 after the crossings taken */
};

/* g of d at t; *ha the body's hour angle, *dec its declination. */
static double
diu_value(const struct ctx *x, const struct diurnal *d, double t,
    double *ha, double *dec)
{
	const struct fast_track *ft = &x->tr->ft;
	struct fast_frame f;
	double topo[3], radial[3], m, e;
	const double *v = topo;

	fast_frame_at(ft, t, needs(x, d->c), &f);
	if (d->c == C_SUN) {
		v = f.sun_itrs;
	} else {
		size_t j = (size_t)(d->c - C_SHARED) / 2;

		if (x->tg[j].body == NULL)
			v = f.moon_itrs;
		else
			(void)fast_target_topo(&f, x->tg[j].body, topo,
			    radial);
	}
	m = v[0] * x->clam + v[1] * x->slam;	/* towards the meridian */
	e = v[1] * x->clam - v[0] * x->slam;	/* towards the east */
	*ha = atan2(-e, m);
	*dec = atan2(v[2], sqrt(m * m + e * e));
	return d->sgn * (fast_elevation(ft, v) - d->lim);
}

/* The transit after d's point, at hour angle (d->k + 1) pi: its time;
   *g, *hu (unwrapped hour angle), *dec there.  A transit beyond the
   fitted range gives the range's end instead (*edge 1): the elevation is
   monotone from the last extremum up to it just the same. */
static double
diu_transit(const struct ctx *x, struct diurnal *d, double *g, double *hu,
    double *dec, int *edge)
{
	const double target = (d->k + 1.0) * ERFA_DPI;
	double t0 = d->p, h0 = d->hp, lo, hi;
	double t1 = d->p + (target - d->hp) / d->rate, h1 = target;

	fast_track_range(&x->tr->ft, &lo, &hi);
	*edge = 0;
	for (int it = 0; it < 16; it++) {
		double ha, slope;

		if (!(t1 > lo && t1 < hi)) {
			t1 = t1 > lo ? hi : lo;
			*edge = 1;
		}
		*g = diu_value(x, d, t1, &ha, dec);
		if (*edge) {
			*hu = target + eraAnpm(ha - target);
			return t1;
		}
		h1 = target + eraAnpm(ha - target);
		if (fabs(h1 - target) < DIU_HA_TOL)
			break;
		slope = (h1 - h0) / (t1 - t0);
		if (!(slope > 0.5 * d->rate && slope < 2.0 * d->rate))
			slope = d->rate;
		t0 = t1;
		h0 = h1;
		t1 += (target - h1) / slope;
	}
	if (t1 > d->p && h1 > d->hp)
		d->rate = (h1 - d->hp) / (t1 - d->p);
	*hu = h1;
	return t1;
}

/* The crossing of d's limit in [a, b] (g fa at a, of the other sign at
   b), starting from guess: secant steps kept inside the bracket. */
static double
diu_root(const struct ctx *x, const struct diurnal *d, double a, double fa,
    double b, double guess)
{
	double t0 = guess, f0, t1, f1, ha, dec, el, der;

	if (!(t0 > a && t0 < b))
		t0 = 0.5 * (a + b);
	f0 = diu_value(x, d, t0, &ha, &dec);
	if (f0 == 0.0)
		return t0;
	if ((f0 > 0.0) == (fa > 0.0)) {
		a = t0;
		fa = f0;
	} else {
		b = t0;
	}
	/* First step along de/dt = -cos phi cos d sin H (dH/dt) / cos e. */
	el = d->lim + d->sgn * f0;
	der = -d->sgn * x->cphi * cos(dec) * sin(ha) * d->rate / cos(el);
	t1 = der != 0.0 ? t0 - f0 / der : 0.5 * (a + b);
	for (int it = 0; it < 60; it++) {
		double t2;

		if (!(t1 > a && t1 < b))
			t1 = 0.5 * (a + b);
		f1 = diu_value(x, d, t1, &ha, &dec);
		if (f1 == 0.0 || fabs(t1 - t0) < DIU_ROOT_TOL ||
		    b - a < DIU_ROOT_TOL)
			return t1;
		if ((f1 > 0.0) == (fa > 0.0)) {
			a = t1;
			fa = f1;
		} else {
			b = t1;
		}
		t2 = f1 != f0 ? t1 - f1 * (t1 - t0) / (f1 - f0) :
		    0.5 * (a + b);
		t0 = t1;
		f0 = f1;
		t1 = t2;
	}
	return t1;
}

/* Follow d to its next point (a transit, or the extremum near it), and
   queue the crossing between the two when there is one (queue: 1). */
static void
diu_step(const struct ctx *x, struct diurnal *d, int queue)
{
	int edge;
	double g, hu, dec, t = diu_transit(x, d, &g, &hu, &dec, &edge);
	double k = d->k + 1.0, q = x->cphi * cos(dec);
	int upper = fmod(fabs(k), 2.0) == 0.0;
	double sg = (upper == (d->sgn > 0.0)) ? 1.0 : -1.0;	/* g max */

	if (!edge && fabs(g) < DIU_SLACK / fmax(q, 0.02)) {
		double w = fmin(0.2, DIU_HALF_W / fmax(q, 0.1)), fe;
		double te = extremum(x, d->c, t - w, t + w, sg, &fe);

		if (sg * fe > sg * g) {
			hu += d->rate * (te - t);
			t = te;
			g = fe;
		}
	}
	if (queue && (d->gp >= 0.0) != (g >= 0.0) && d->nq < DIU_QUEUE) {
		/* The crossing's hour angle from the upper transit's
		   declination; upper: the crossing is a rise before t. */
		double dd = upper ? dec : d->dp, cu = x->cphi * cos(dd);
		double c = (sin(d->lim) - x->sphi * sin(dd)) /
		    (cu > 1e-9 ? cu : 1e-9);
		double h0 = acos(fmax(-1.0, fmin(1.0, c)));
		double guess = upper ? t - h0 / d->rate : d->p + h0 / d->rate;

		d->q[d->nq++] = diu_root(x, d, d->p, d->gp, t, guess);
	}
	d->p = t;
	d->gp = g;
	d->hp = hu;
	d->dp = dec;
	d->k = k;
}

/* Start d at offset 0: its sign there, and its crossings from 0 on. */
static void
diu_init(const struct ctx *x, struct diurnal *d, int c, double sgn,
    double lim, double rate)
{
	double ha, dec, g0;

	memset(d, 0, sizeof *d);
	d->c = c;
	d->sgn = sgn;
	d->lim = lim;
	d->rate = rate;
	g0 = diu_value(x, d, 0.0, &ha, &dec);
	d->sign = g0 >= 0.0;
	/* From 0 back to the transit before it. */
	d->p = 0.0;
	d->gp = g0;
	d->hp = ha;
	d->dp = dec;
	d->k = (ha >= 0.0 ? 0.0 : -1.0) - 1.0;
	diu_step(x, d, 0);
	if (d->p > 0.0 && (g0 >= 0.0) != (d->gp >= 0.0))
		d->q[d->nq++] = diu_root(x, d, 0.0, g0, d->p,
		    0.5 * d->p);	/* moved past 0 to its extremum */
	while (d->p <= 0.0)
		diu_step(x, d, 1);
	/* Crossings before 0 are the past: the sign at 0 is measured. */
	while (d->nq > 0 && d->q[0] < 0.0) {
		memmove(d->q, d->q + 1, (size_t)(d->nq - 1) * sizeof d->q[0]);
		d->nq--;
	}
}

/* Make sure every crossing before t (at most the span's end) is queued. */
static void
diu_reach(const struct ctx *x, struct diurnal *d, double t)
{
	t = fmin(t, x->tr->span);
	while (d->p < t)
		diu_step(x, d, 1);
}

/* Sign of d's g at t (>= the crossings taken). */
static int
diu_sign_at(const struct ctx *x, struct diurnal *d, double t)
{
	int s = d->sign;

	diu_reach(x, d, t);
	for (int i = 0; i < d->nq && d->q[i] < t; i++)
		s = !s;
	return s;
}

/* Take d's crossings before t as events into ev[nev..] (room to cap). */
static int
diu_take(const struct ctx *x, struct diurnal *d, double t, struct event *ev,
    int nev, int cap)
{
	int k = 0;

	diu_reach(x, d, t);
	while (k < d->nq && d->q[k] < t) {
		if (nev < cap) {
			ev[nev].t = d->q[k];
			ev[nev++].c = d->c;
		}
		d->sign = !d->sign;
		k++;
	}
	memmove(d->q, d->q + k, (size_t)(d->nq - k) * sizeof d->q[0]);
	d->nq -= k;
	return nev;
}

/* Append [a, b] less every blackout to the output. */
static void
emit(struct ctx *x, size_t target, double a, double b)
{
	double cur = a;

	while (cur < b) {
		double next = b;
		int inside = 0;

		for (size_t i = 0; i < x->nbo; i++) {
			const struct window_interval *w = &x->bo[i];

			if (w->start <= cur && w->end > cur) {
				cur = w->end;	/* skip to its end */
				inside = 1;
			}
		}
		if (inside)
			continue;
		for (size_t i = 0; i < x->nbo; i++)
			if (x->bo[i].start > cur && x->bo[i].start < next)
				next = x->bo[i].start;
		if (next > cur) {
			if (x->count < x->cap) {
				x->out[x->count].target = target;
				x->out[x->count].start = cur;
				x->out[x->count].end = next;
			}
			x->count++;
		}
		cur = next;
	}
}

/* Roots of constraint c inside the cell [ga, gb). */
static int
cell_roots(const struct ctx *x, int c, double ga, double fa, double gb,
    double fb, const double *tp, int ntp, const double *tc, int ntc,
    struct event *ev, int nev)
{
	if ((fa >= 0) != (fb >= 0)) {
		ev[nev].t = refine(x, c, ga, fa, gb, fb);
		ev[nev++].c = c;
		return nev;
	}
	for (int i = 0; i < ntp; i++)
		if (tp[i] >= ga && tp[i] < gb) {
			ev[nev].t = tp[i];
			ev[nev++].c = c;
		}
	for (int i = 0; i < ntc; i++)
		if (tc[i] >= ga && tc[i] < gb) {
			ev[nev].t = tc[i];
			ev[nev++].c = c;
		}
	return nev;
}

static void
sort_events(struct event *ev, int n)
{
	for (int i = 1; i < n; i++) {
		struct event e = ev[i];
		int j = i - 1;

		while (j >= 0 && ev[j].t > e.t) {
			ev[j + 1] = ev[j];
			j--;
		}
		ev[j + 1] = e;
	}
}

struct tstate {
	int open;
	double start;
};

static int
all_hold(const int *flag, size_t j)
{
	return flag[C_SUN] && flag[C_SEP] && flag[C_EL(j)] && flag[C_DARK(j)];
}

enum errcode
window_find(const struct window_track *tr, const struct window_limits *lim,
    const struct window_target *targets, size_t ntargets,
    const struct window_interval *blackouts, size_t nblackouts,
    struct window *out, size_t cap, size_t *n)
{
	struct ctx x;
	double f[3][C_MAX];		/* samples at i-2, i-1, i */
	double trp[C_MAX][2], trc[C_MAX][2];	/* triple roots at i-2, i-1 */
	int ntrp[C_MAX], ntrc[C_MAX], flag[C_MAX];
	struct tstate st[WINDOW_MAX_TARGETS];
	struct diurnal diu[C_MAX];
	double h;
	size_t m, nf;
	int nc;

	*n = 0;
	if (ntargets == 0 || ntargets > WINDOW_MAX_TARGETS ||
	    !isfinite(lim->min_el) || !isfinite(lim->max_sun_el) ||
	    !isfinite(lim->min_sun_sep) || (nblackouts > 0 && blackouts == NULL))
		return ERRCODE_BAD_ARG;
	memset(&x, 0, sizeof x);
	x.tr = tr;
	x.lim = lim;
	x.tg = targets;
	x.nt = ntargets;
	x.bo = blackouts;
	x.nbo = nblackouts;
	x.out = out;
	x.cap = cap;
	nc = C_SHARED + 2 * (int)ntargets;
	x.active[C_SUN] = lim->max_sun_el < ERFA_DPI / 2.0;
	x.active[C_SEP] = lim->min_sun_sep > 0.0;
	for (size_t j = 0; j < ntargets; j++) {
		x.active[C_EL(j)] = 1;
		x.active[C_DARK(j)] = targets[j].dark_only &&
		    targets[j].body != NULL;
	}
	/* Elevations followed transit by transit; the rest on the grid. */
	x.cphi = cos(tr->site.lat);
	x.sphi = sin(tr->site.lat);
	x.clam = cos(tr->site.lon);
	x.slam = sin(tr->site.lon);
	if (fabs(tr->site.lat) < DIU_MAX_LAT) {
		if (x.active[C_SUN])
			x.diu[C_SUN] = &diu[C_SUN];
		for (size_t j = 0; j < ntargets; j++)
			x.diu[C_EL(j)] = &diu[C_EL(j)];
	}
	for (int c = 0; c < nc; c++)
		if (x.active[c] && x.diu[c] == NULL) {
			x.need |= needs(&x, c);
			x.ngrid++;
		}
	for (int c = 0; c < nc; c++)
		if (x.diu[c] != NULL)
			diu_init(&x, x.diu[c], c, c == C_SUN ? -1.0 : 1.0,
			    c == C_SUN ? lim->max_sun_el : lim->min_el,
			    c == C_SUN ? DIU_SUN_RATE : DIU_MOON_RATE);
	h = x.ngrid > 0 ? WINDOW_GRID_DAYS : DIU_CELL;
	nf = (size_t)nc * sizeof f[0][0];
	for (int c = 0; c < nc; c++) {
		f[0][c] = f[1][c] = f[2][c] = 1.0;	/* inactive: holds */
		ntrp[c] = ntrc[c] = 0;
		flag[c] = 1;
	}
	memset(st, 0, sizeof st);

	/* Grid g(i) = (i - 1) h, i = 0..m; cells [g(i), g(i+1)], i >= 1. */
	m = 2 + (size_t)ceil(tr->span / h);
	for (size_t i = 0; i <= m; i++) {
		double gi = ((double)i - 1.0) * h;

		memcpy(f[0], f[1], nf);
		memcpy(f[1], f[2], nf);
		sample_all(&x, gi, f[2]);
		for (int c = 0; c < nc; c++)
			if (x.diu[c] != NULL)
				f[2][c] = diu_sign_at(&x, x.diu[c], gi) ? 1.0 :
				    -1.0;
		if (i < 2)
			continue;
		/* Triple centred at i - 1. */
		memcpy(trp, trc, (size_t)nc * sizeof trp[0]);
		memcpy(ntrp, ntrc, (size_t)nc * sizeof ntrp[0]);
		for (int c = 0; c < nc; c++) {
			ntrc[c] = 0;
			if (x.active[c] && x.diu[c] == NULL)
				ntrc[c] = triple_roots(&x, c, gi - 2 * h,
				    f[0][c], f[1][c], gi, f[2][c],
				    trc[c]);
		}
		if (i < 3)
			continue;
		/* Cell [g(i-2), g(i-1)] = [ga, gb]. */
		{
			double ga = gi - 2 * h, gb = gi - h;
			struct event sev[8], ev[16];
			int ns = 0;

			if (ga >= tr->span)
				break;
			if (i == 3) {	/* state at the span start */
				for (int c = 0; c < nc; c++)
					flag[c] = f[0][c] >= 0;
				for (size_t j = 0; j < ntargets; j++)
					if (all_hold(flag, j)) {
						st[j].open = 1;
						st[j].start = 0.0;
					}
			}
			for (int c = 0; c < C_SHARED; c++)
				if (x.diu[c] != NULL)
					ns = diu_take(&x, x.diu[c], gb, sev, ns,
					    8);
				else if (x.active[c])
					ns = cell_roots(&x, c, ga, f[0][c], gb,
					    f[1][c], trp[c], ntrp[c], trc[c],
					    ntrc[c], sev, ns);
			for (size_t j = 0; j < ntargets; j++) {
				int lf[C_MAX], ne = ns;

				memcpy(ev, sev, (size_t)ns * sizeof ev[0]);
				for (int c = C_EL(j); c <= C_DARK(j); c++)
					if (x.diu[c] != NULL)
						ne = diu_take(&x, x.diu[c], gb,
						    ev, ne, 16);
					else if (x.active[c])
						ne = cell_roots(&x, c, ga,
						    f[0][c], gb, f[1][c],
						    trp[c], ntrp[c], trc[c],
						    ntrc[c], ev, ne);
				sort_events(ev, ne);
				memcpy(lf, flag, sizeof lf);
				for (int k = 0; k < ne; k++) {
					double t = ev[k].t;
					int ok;

					if (t >= tr->span)
						break;
					lf[ev[k].c] = !lf[ev[k].c];
					ok = all_hold(lf, j);
					if (ok && !st[j].open) {
						st[j].open = 1;
						st[j].start = t;
					} else if (!ok && st[j].open) {
						st[j].open = 0;
						emit(&x, j, st[j].start, t);
					}
				}
			}
			/* Resynchronise with the samples at the cell's end. */
			for (int c = 0; c < nc; c++)
				flag[c] = f[1][c] >= 0;
			if (gb < tr->span)
				for (size_t j = 0; j < ntargets; j++) {
					int ok = all_hold(flag, j);

					if (ok && !st[j].open) {
						st[j].open = 1;
						st[j].start = gb;
					} else if (!ok && st[j].open) {
						st[j].open = 0;
						emit(&x, j, st[j].start, gb);
					}
				}
		}
	}
	for (size_t j = 0; j < ntargets; j++)
		if (st[j].open && st[j].start < tr->span)
			emit(&x, j, st[j].start, tr->span);
	*n = x.count;
	return x.count > cap ? ERRCODE_TOO_LARGE : ERRCODE_OK;
}

int
window_constraints_hold(const struct geom_instant *g,
    const struct window_limits *lim, const struct window_target *target)
{
	struct geom_target_view v;
	double el = g->moon.el;

	if (lim->max_sun_el < ERFA_DPI / 2.0 && g->sun.el > lim->max_sun_el)
		return 0;
	if (lim->min_sun_sep > 0.0 && g->sun.separation < lim->min_sun_sep)
		return 0;
	if (target->body != NULL) {
		geom_target_view(g, target->body, &v);
		el = v.el;
		if (target->dark_only && !(v.dark_margin > 0.0))
			return 0;
	}
	return el >= lim->min_el;
}
