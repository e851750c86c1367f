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
	unsigned need;		/* frame contents for all active constraints */
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

/* Every active constraint at one grid time, from one frame. */
static void
sample_all(const struct ctx *x, double t, double *f)
{
	const struct fast_track *ft = &x->tr->ft;
	struct fast_frame fr;

	fast_frame_at(ft, t, x->need, &fr);
	if (x->active[C_SUN])
		f[C_SUN] = cval(x, C_SUN, &fr);
	if (x->active[C_SEP])
		f[C_SEP] = cval(x, C_SEP, &fr);
	for (size_t j = 0; j < x->nt; j++) {
		double dark;

		if (x->tg[j].body == NULL) {
			f[C_EL(j)] = cval(x, C_EL(j), &fr);
			continue;
		}
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

struct event {
	double t;
	int c;
};

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
	const double h = WINDOW_GRID_DAYS;
	size_t m;
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
	for (int c = 0; c < nc; c++)
		if (x.active[c])
			x.need |= needs(&x, c);
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

		memcpy(f[0], f[1], sizeof f[0]);
		memcpy(f[1], f[2], sizeof f[1]);
		sample_all(&x, gi, f[2]);
		if (i < 2)
			continue;
		/* Triple centred at i - 1. */
		memcpy(trp, trc, sizeof trp);
		memcpy(ntrp, ntrc, sizeof ntrp);
		for (int c = 0; c < nc; c++) {
			ntrc[c] = 0;
			if (x.active[c])
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
				if (x.active[c])
					ns = cell_roots(&x, c, ga, f[0][c], gb,
					    f[1][c], trp[c], ntrp[c], trc[c],
					    ntrc[c], sev, ns);
			for (size_t j = 0; j < ntargets; j++) {
				int lf[C_MAX], ne = ns;

				memcpy(ev, sev, (size_t)ns * sizeof ev[0]);
				for (int c = C_EL(j); c <= C_DARK(j); c++)
					if (x.active[c])
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
