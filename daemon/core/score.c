/* SPDX-License-Identifier: BSD-3-Clause */
/* score.c: yield model, coverage weights and the ranking of windows. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/link.h"
#include "core/mem.h"
#include "core/score.h"

void
score_settings_default(struct score_settings *s)
{
	s->nbins = 12;
	s->alpha = 1.0;
	s->k = 1.0;
	s->per_target = 0;
	s->prior_sunlit = 0.5;
	s->prior_weight = 20.0;
	s->step_s = 120.0;
}

enum errcode
score_settings_check(const struct score_settings *s, const char **field)
{
	const char *bad = NULL;

	if (s->nbins < SCORE_BINS_MIN || s->nbins > SCORE_BINS_MAX)
		bad = "coverage_bins";
	else if (!(s->alpha >= 0.0 && s->alpha <= 4.0))
		bad = "coverage_alpha";
	else if (!(s->k > 0.0 && s->k < 1e9))
		bad = "coverage_k";
	else if (!(s->prior_sunlit > 0.0 && s->prior_sunlit <= 10.0))
		bad = "prior_sunlit";
	else if (!(s->prior_weight > 0.0 && s->prior_weight < 1e15))
		bad = "prior_weight";
	else if (!(s->step_s >= 1.0 && s->step_s <= 120.0))
		bad = "step_s";
	if (field != NULL)
		*field = bad;
	return bad != NULL ? ERRCODE_BAD_ARG : ERRCODE_OK;
}

double
score_airmass(double el_rad)
{
	double h = el_rad * ERFA_DR2D;

	if (!(h > 0.0))
		h = 0.0;
	if (h > 90.0)
		h = 90.0;
	return 1.0 / (sin(h * ERFA_DD2R) + 0.50572 * pow(h + 6.07995, -1.6364));
}

double
score_transmission(double tau, double el_rad)
{
	return exp(-2.0 * tau * score_airmass(el_rad));
}

/* Does this attempt say something about the target's yield?  (Not when
   flagged suspicious on logging: attempt.h.) */
static int
usable(const struct site_attempt *a)
{
	return a->suspect == 0 && (a->outcome == SITE_OUTCOME_RANGED ||
	    a->outcome == SITE_OUTCOME_NO_RETURNS) && a->shots > 0 &&
	    a->returns >= 0 && isfinite(a->target_el_deg) &&
	    a->target_el_deg > 0.0 && isfinite(a->sun_el_target_deg);
}

double
score_range_factor(double range_m)
{
	double r;

	if (!(range_m > 0.0))
		return 1.0;
	r = LINK_R0 / range_m;
	return r * r * r * r;
}

double
score_link_factor(const struct site_station *st, double seeing_arcsec,
    double range_m)
{
	struct link_station ls;

	site_station_link(st, &ls);
	return link_rate_factor(&ls, seeing_arcsec, range_m > 0.0 ? range_m :
	    LINK_R0);
}

int
score_sums_add(struct score_sums *u, const struct link_station *ls, double tau,
    const struct site_attempt *a)
{
	double e;

	if (!usable(a))
		return 0;
	e = (double)a->shots *
	    score_transmission(tau, a->target_el_deg * ERFA_DD2R) *
	    link_rate_factor(ls, a->seeing_arcsec, a->range_km > 0.0 ?
	    a->range_km * 1e3 : LINK_R0);
	if (a->sun_el_target_deg > 0.0) {
		u->lit_returns += a->returns;
		u->lit_exposure += e;
	} else {
		u->dark_returns += a->returns;
		u->dark_exposure += e;
	}
	u->used++;
	return 1;
}

enum errcode
score_fit(const struct score_settings *s, const struct site_station *st,
    const struct site_target *targets, size_t nt,
    const struct site_attempt *att, size_t na, struct score_yield *yield,
    struct score_model *model)
{
	struct score_sums *u = mem_calloc(nt + 1, sizeof u[0]);
	struct link_station ls;
	enum errcode rc;

	if (u == NULL)
		return ERRCODE_NOMEM;
	site_station_link(st, &ls);
	for (size_t i = 0; i < na; i++) {
		size_t j;

		for (j = 0; j < nt; j++)
			if (strcmp(targets[j].id, att[i].target) == 0)
				break;
		if (j < nt)
			(void)score_sums_add(&u[j], &ls, st->zenith_tau,
			    &att[i]);
	}
	rc = score_fit_sums(s, st, targets, nt, u, (long)na, yield, model);
	mem_free(u);
	return rc;
}

enum errcode
score_fit_sums(const struct score_settings *s, const struct site_station *st,
    const struct site_target *targets, size_t nt,
    const struct score_sums *sums, long na, struct score_yield *yield,
    struct score_model *model)
{
	const double w = s->prior_weight;
	const double tau = st->zenith_tau;
	struct link_station ls;
	double rd = 0.0, xd = 0.0, lit_r = 0.0, lit_x = 0.0;

	if (!(tau >= 0.0) || !isfinite(tau))
		return ERRCODE_BAD_ARG;
	site_station_link(st, &ls);
	memset(model, 0, sizeof *model);
	for (size_t j = 0; j < nt; j++) {
		struct link_target lt;

		if (!(targets[j].strength > 0.0) || !isfinite(targets[j].strength))
			return ERRCODE_BAD_ARG;
		memset(&yield[j], 0, sizeof yield[j]);
		site_target_link(&targets[j], &lt);
		yield[j].link_rate = targets[j].strength *
		    link_photoelectrons(&ls, &lt, LINK_R0, 1.0);
		yield[j].dark_returns = (double)sums[j].dark_returns;
		yield[j].dark_exposure = sums[j].dark_exposure;
		yield[j].lit_returns = (double)sums[j].lit_returns;
		yield[j].lit_exposure = sums[j].lit_exposure;
		yield[j].attempts = sums[j].used;
		model->attempts_used += sums[j].used;
	}
	model->attempts_skipped = na - model->attempts_used;
	for (size_t j = 0; j < nt; j++) {
		rd += yield[j].dark_returns;
		xd += yield[j].link_rate * yield[j].dark_exposure;
	}
	model->base_efficiency = (w + rd) / (w + xd);
	for (size_t j = 0; j < nt; j++) {
		struct score_yield *y = &yield[j];

		y->efficiency = (model->base_efficiency * w + y->dark_returns) /
		    (w + y->link_rate * y->dark_exposure);
		y->rate = y->efficiency * y->link_rate;
		y->prior_rate = model->base_efficiency * y->link_rate;
		lit_r += y->lit_returns;
		lit_x += y->rate * y->lit_exposure;
	}
	model->base_sunlit = (s->prior_sunlit * w + lit_r) / (w + lit_x);
	for (size_t j = 0; j < nt; j++) {
		struct score_yield *y = &yield[j];

		y->sunlit_factor = (model->base_sunlit * w + y->lit_returns) /
		    (w + y->rate * y->lit_exposure);
	}
	return ERRCODE_OK;
}

int
score_bin_of(double synodic_deg, int nbins)
{
	double a = fmod(synodic_deg, 360.0);
	int b;

	if (a < 0.0)
		a += 360.0;
	b = (int)floor(a / (360.0 / nbins));
	return b >= nbins ? nbins - 1 : (b < 0 ? 0 : b);
}

void
score_bin_add(long *counts, int nbins, double synodic_deg, long weight)
{
	if (isfinite(synodic_deg) && weight > 0)
		counts[score_bin_of(synodic_deg, nbins)] += weight;
}

double
score_bin_mean(const long *counts, int nbins)
{
	double sum = 0.0;

	for (int i = 0; i < nbins; i++)
		sum += (double)counts[i];
	return sum / nbins;
}

double
score_coverage_weight(long n, double nbar, double k, double alpha)
{
	if (alpha == 0.0)
		return 1.0;
	return pow((nbar + k) / ((double)n + k), alpha);
}

/* R_j(t) of score.h. */
double
score_rate(double fire_rate_hz, const struct score_yield *y,
    double transmission, int sunlit)
{
	return fire_rate_hz * y->rate * transmission *
	    (sunlit ? y->sunlit_factor : 1.0);
}

/* Gauss-Legendre, 8 points on [-1, 1]: abscissae and weights
   (Abramowitz & Stegun, Handbook of Mathematical Functions (1964),
   table 25.4, n = 8). */
static const double gl_x[4] = {
	0.183434642495649804939476142360184,
	0.525532409916328985817739049189246,
	0.796666477413626739591553936475830,
	0.960289856497536231683560868569473,
};
static const double gl_w[4] = {
	0.362683783378361982965150449277196,
	0.313706645877887287337962201986601,
	0.222381034453374470544355994426241,
	0.101228536290376259152531354309962,
};

#define PART_PER_STEP 60.0	/* longest part: 60 step_s (2 h at 120 s) */
/* The dark margin changes by at most ~0.55 deg/h (the Sun's motion over a
   lunar site, 360 deg per synodic month; the Earth's shadow as seen from
   the Moon about as fast): 1 deg/h bounds it, so a scan step of
   margin / (1 deg/h) cannot step over a change (from 1 min to 2 h). */
#define DARK_RATE (ERFA_DD2R * 24.0)	/* rad per day */
#define SCAN_MIN (1.0 / 1440.0)
#define SCAN_MAX (2.0 / 24.0)
#define CUT_TOL (0.001 / ERFA_DAYSEC)	/* cuts refined to 1 ms */
#define MAX_CUTS (SCORE_BINS_MAX + 64)

/* The Moon's centre stands for lit/dark at selenographic 0, 0. */
static const struct geom_target centre_point = {{GEOM_MOON_RADIUS, 0.0, 0.0}};

/* Elevation of a target (or the Moon's centre) at t; *dark (if not NULL)
   its dark margin (geom_target_view's dark_margin: > 0 when dark). */
static double
target_el_range(const struct window_track *tr, const struct geom_target *body,
    double t, double *dark, double *range)
{
	struct fast_frame f;
	double el;

	/* The centre's range reads the Moon alone: no lunar frame. */
	fast_frame_at(&tr->ft, t, dark != NULL ? FAST_SUN | FAST_LUNAR :
	    (body != NULL ? FAST_LUNAR : 0), &f);
	if (range != NULL) {
		double topo[3], radial[3];

		*range = body != NULL ? fast_target_topo(&f, body, topo,
		    radial) : sqrt(f.moon_itrs[0] * f.moon_itrs[0] +
		    f.moon_itrs[1] * f.moon_itrs[1] +
		    f.moon_itrs[2] * f.moon_itrs[2]);
	}
	if (body != NULL)
		return fast_target_el(&tr->ft, &f, body, NULL, dark);
	el = fast_elevation(&tr->ft, f.moon_itrs);
	if (dark != NULL)
		(void)fast_target_el(&tr->ft, &f, &centre_point, NULL, dark);
	return el;
}

static double
target_el(const struct window_track *tr, const struct geom_target *body,
    double t, double *dark)
{
	return target_el_range(tr, body, t, dark, NULL);
}

/* Root-finding goal: the dark margin of a target. */
struct cut_goal {
	const struct window_track *tr;
	const struct geom_target *body;
};

static double
dark_goal(void *ctx, double t)
{
	const struct cut_goal *g = ctx;
	double dark;

	(void)target_el(g->tr, g->body, t, &dark);
	return dark;
}

static int
cmp_double(const void *pa, const void *pb)
{
	double a = *(const double *)pa, b = *(const double *)pb;

	return (a > b) - (a < b);
}

/*
 * Cuts of [start, end]: the ends, the phase-bin boundaries and the
 * target's lit/dark changes (scanned in steps its dark margin allows),
 * sorted.
 * Returns their number; *nbins the bin boundaries among them.
 */
static int
window_cuts(const struct score_params *p, const struct score_target *t,
    const struct window *w, double *cuts, int *nbins)
{
	const double width = ERFA_D2PI / p->s->nbins;
	const struct geom_target *body = t->body != NULL ? t->body :
	    &centre_point;
	struct cut_goal g = {p->tr, body};
	double s0 = window_track_synodic(p->tr, w->start);
	double s1 = window_track_synodic(p->tr, w->end);
	int n = 0;
	double ta, da;

	cuts[n++] = w->start;
	*nbins = 0;
	for (double b = (floor(s0 / width) + 1.0) * width;
	    b < s1 && n < SCORE_BINS_MAX + 1; b += width) {
		struct fast_synodic_goal sg = {&p->tr->ft, b};
		double r;

		(void)geom_root_illinois(fast_synodic_less, &sg, w->start,
		    s0 - b, w->end, s1 - b, CUT_TOL, 100, &r);
		cuts[n++] = r;
		(*nbins)++;
	}
	ta = w->start;
	da = dark_goal(&g, ta);
	while (ta < w->end && n < MAX_CUTS - 1) {
		double tb = fmin(w->end, ta + fmin(SCAN_MAX, fmax(SCAN_MIN,
		    fabs(da) / DARK_RATE)));
		double db = dark_goal(&g, tb), r;

		if ((da > 0.0) != (db > 0.0)) {
			(void)geom_root_illinois(dark_goal, &g, ta, da, tb, db,
			    CUT_TOL, 100, &r);
			cuts[n++] = r;
		}
		ta = tb;
		da = db;
	}
	cuts[n++] = w->end;
	qsort(cuts, (size_t)n, sizeof cuts[0], cmp_double);
	return n;
}

/* Running sums of the quadrature. */
struct sums {
	double er, sc, x, trm, lit;	/* returns, score, airmass, T, lit */
	double rf;			/* (R0/R)^4 */
	double best_el, best_t, best_h;	/* best node and its half-spacing */
};

/* One Gauss-Legendre part [a, b], lit state and weight constant. */
static void
integrate_part(const struct score_params *p, const struct score_target *t,
    double a, double b, int lit, double wgt, struct sums *u)
{
	double c = 0.5 * (a + b), h = 0.5 * (b - a);
	double r0 = score_rate(p->fire_rate_hz, &t->yield, 1.0, lit);

	for (int i = 0; i < 8; i++) {
		double xi = (i < 4 ? -1.0 : 1.0) * gl_x[i % 4];
		double wi = gl_w[i % 4] * h;	/* days */
		double ti = c + xi * h;
		double range, el = target_el_range(p->tr, t->body, ti, NULL,
		    &range);
		double x = score_airmass(el), trm = exp(-2.0 * p->tau * x);
		double rf = score_range_factor(range);
		double r = r0 * trm * rf;

		u->er += r * wi * ERFA_DAYSEC;
		u->sc += r * wgt * wi * ERFA_DAYSEC;
		u->x += x * wi;
		u->trm += trm * wi;
		u->rf += rf * wi;
		u->lit += lit ? wi : 0.0;
		if (el > u->best_el) {
			u->best_el = el;
			u->best_t = ti;
			u->best_h = h * 0.5;
		}
	}
}

/*
 * The highest elevation of a target in [lo, hi] near tc (elevation ec,
 * h the spacing of the quadrature nodes about it): the vertex of the
 * parabola through the elevations at tc - h, tc, tc + h, then again
 * about each vertex with the spacing cut to the last move (at least
 * 0.5 s), until a move under 0.05 s (near its top the elevation is a
 * parabola in time to ~1e-4 of its curvature per second, so three or four
 * rounds reach it); golden section over [tc - h, tc + h] to 1 s when a
 * parabola is not concave.  Returns its time, *e the elevation.
 */
static double
highest(const struct score_params *p, const struct geom_target *body,
    double lo, double hi, double tc, double ec, double h, double *e)
{
	const double r = 0.618033988749894848, tol = 0.05 / ERFA_DAYSEC;
	double a = fmax(lo, tc - h), b = fmin(hi, tc + h), x1, x2, f1, f2;

	for (int it = 0; it < 12; it++) {
		double em = target_el(p->tr, body, tc - h, NULL);
		double ep = target_el(p->tr, body, tc + h, NULL);
		double den = em - 2.0 * ec + ep, dt, tv;

		if (!(den < 0.0))
			break;		/* not concave: golden section */
		dt = 0.5 * h * (em - ep) / den;
		tv = fmin(hi, fmax(lo, tc + fmax(-2.0 * h, fmin(2.0 * h,
		    dt))));
		if (fabs(tv - tc) < tol || tv == lo || tv == hi) {
			*e = target_el(p->tr, body, tv, NULL);
			return tv;
		}
		h = fmax(fabs(tv - tc), 0.5 / ERFA_DAYSEC);
		tc = tv;
		ec = target_el(p->tr, body, tc, NULL);
	}
	x1 = b - r * (b - a);
	x2 = a + r * (b - a);
	f1 = target_el(p->tr, body, x1, NULL);
	f2 = target_el(p->tr, body, x2, NULL);
	while (b - a > 1.0 / ERFA_DAYSEC) {
		if (f1 < f2) {
			a = x1;
			x1 = x2;
			f1 = f2;
			x2 = a + r * (b - a);
			f2 = target_el(p->tr, body, x2, NULL);
		} else {
			b = x2;
			x2 = x1;
			f2 = f1;
			x1 = b - r * (b - a);
			f1 = target_el(p->tr, body, x1, NULL);
		}
	}
	*e = target_el(p->tr, body, 0.5 * (a + b), NULL);
	return 0.5 * (a + b);
}

enum errcode
score_window(const struct score_params *p, const struct score_target *t,
    const struct window *w, struct score_window *out)
{
	const struct score_settings *s = p->s;
	const double part_max = PART_PER_STEP * s->step_s / ERFA_DAYSEC;
	double cuts[MAX_CUTS], mid, best_t, best_el;
	double dur = (w->end - w->start) * ERFA_DAYSEC;
	struct sums u;
	int ncut, nbcross;

	if (!(w->end >= w->start) || score_settings_check(s, NULL) != ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	memset(out, 0, sizeof *out);
	memset(&u, 0, sizeof u);
	u.best_el = -10.0;
	u.best_t = w->start;
	out->target = w->target;
	out->start = w->start;
	out->end = w->end;
	out->duration_s = dur;
	out->bin_mean = score_bin_mean(t->counts, s->nbins);

	/* Pieces between cuts have one bin and one lit state; each is cut
	   into equal parts of at most part_max for the quadrature. */
	ncut = window_cuts(p, t, w, cuts, &nbcross);
	out->bins_crossed = nbcross;
	for (int c = 0; c + 1 < ncut; c++) {
		double a = cuts[c], b = cuts[c + 1], pm = 0.5 * (a + b), dark;
		int bin, lit, nparts;
		double wgt;

		if (!(b > a))
			continue;
		bin = score_bin_of(eraAnp(window_track_synodic(p->tr, pm)) *
		    ERFA_DR2D, s->nbins);
		wgt = score_coverage_weight(t->counts[bin], out->bin_mean, s->k,
		    s->alpha);
		(void)target_el(p->tr, t->body, pm, &dark);
		lit = dark <= 0.0;
		nparts = (int)ceil((b - a) / part_max);
		if (nparts < 1)
			nparts = 1;
		for (int k = 0; k < nparts; k++)
			integrate_part(p, t, a + (b - a) * k / nparts,
			    a + (b - a) * (k + 1) / nparts, lit, wgt, &u);
	}
	/* The highest elevation: parabolas about the best node, then the
	   window's ends. */
	best_t = u.best_t;
	best_el = u.best_el;
	{
		double ea = target_el(p->tr, t->body, w->start, NULL);
		double eb = target_el(p->tr, t->body, w->end, NULL);
		double em, tm = highest(p, t->body, w->start, w->end, best_t,
		    best_el, fmax(u.best_h, 60.0 / ERFA_DAYSEC), &em);

		if (em > best_el) {
			best_el = em;
			best_t = tm;
		}
		if (ea > best_el) {
			best_el = ea;
			best_t = w->start;
		}
		if (eb > best_el) {
			best_el = eb;
			best_t = w->end;
		}
	}
	out->max_el = best_el;
	out->max_el_t = best_t;
	mid = 0.5 * (w->start + w->end);
	out->synodic = eraAnp(window_track_synodic(p->tr, mid));
	out->phase_bin = score_bin_of(out->synodic * ERFA_DR2D, s->nbins);
	out->bin_count = t->counts[out->phase_bin];
	if (w->end > w->start) {
		double span = w->end - w->start;

		out->mean_airmass = u.x / span;
		out->mean_transmission = u.trm / span;
		out->mean_range_factor = u.rf / span;
		out->sunlit_fraction = u.lit / span;
	} else {
		double dark, range, el = target_el_range(p->tr, t->body,
		    w->start, &dark, &range);

		out->mean_airmass = score_airmass(el);
		out->mean_transmission = exp(-2.0 * p->tau * out->mean_airmass);
		out->mean_range_factor = score_range_factor(range);
		out->sunlit_fraction = dark <= 0.0 ? 1.0 : 0.0;
	}
	out->expected_returns = u.er;
	out->score = u.sc;
	out->coverage_weight = u.er > 0.0 ? u.sc / u.er :
	    score_coverage_weight(out->bin_count, out->bin_mean, s->k,
	    s->alpha);
	return ERRCODE_OK;
}

static int
cmp_rank(const void *pa, const void *pb)
{
	const struct score_window *a = pa, *b = pb;

	if (a->score != b->score)
		return a->score > b->score ? -1 : 1;
	if (a->start != b->start)
		return a->start < b->start ? -1 : 1;
	if (a->target != b->target)
		return a->target < b->target ? -1 : 1;
	return 0;
}

void
score_rank(struct score_window *w, size_t n)
{
	if (n > 1)
		qsort(w, n, sizeof w[0], cmp_rank);
	for (size_t i = 0; i < n; i++)
		w[i].rank = i + 1;
}
