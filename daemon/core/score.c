/* SPDX-License-Identifier: BSD-3-Clause */
/* score.c: yield model, coverage weights and the ranking of windows. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/score.h"

void
score_settings_default(struct score_settings *s)
{
	s->nbins = 12;
	s->alpha = 1.0;
	s->k = 1.0;
	s->per_target = 0;
	s->prior_rate = 1e-3;
	s->prior_sunlit = 0.5;
	s->prior_exposure = 2e4;
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
	else if (!(s->prior_rate > 0.0 && s->prior_rate <= 1.0))
		bad = "prior_rate";
	else if (!(s->prior_sunlit > 0.0 && s->prior_sunlit <= 10.0))
		bad = "prior_sunlit";
	else if (!(s->prior_exposure > 0.0 && s->prior_exposure < 1e15))
		bad = "prior_exposure";
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

/* Does this attempt say something about the target's yield? */
static int
usable(const struct site_attempt *a)
{
	return (a->outcome == SITE_OUTCOME_RANGED ||
	    a->outcome == SITE_OUTCOME_NO_RETURNS) && a->shots > 0 &&
	    a->returns >= 0 && isfinite(a->target_el_deg) &&
	    a->target_el_deg > 0.0 && isfinite(a->sun_el_target_deg);
}

enum errcode
score_fit(const struct score_settings *s, double tau,
    const struct site_target *targets, size_t nt,
    const struct site_attempt *att, size_t na, struct score_yield *yield,
    struct score_model *model)
{
	const double e0 = s->prior_exposure;
	double rd = 0.0, sed = 0.0, lit_r = 0.0, lit_e = 0.0;

	if (!(tau >= 0.0) || !isfinite(tau))
		return ERRCODE_BAD_ARG;
	memset(model, 0, sizeof *model);
	for (size_t j = 0; j < nt; j++) {
		if (!(targets[j].strength > 0.0) || !isfinite(targets[j].strength))
			return ERRCODE_BAD_ARG;
		memset(&yield[j], 0, sizeof yield[j]);
	}
	for (size_t i = 0; i < na; i++) {
		const struct site_attempt *a = &att[i];
		size_t j;
		double e;

		for (j = 0; j < nt; j++)
			if (strcmp(targets[j].id, a->target) == 0)
				break;
		if (j == nt || !usable(a)) {
			model->attempts_skipped++;
			continue;
		}
		e = (double)a->shots *
		    score_transmission(tau, a->target_el_deg * ERFA_DD2R);
		if (a->sun_el_target_deg > 0.0) {
			yield[j].lit_returns += (double)a->returns;
			yield[j].lit_exposure += e;
		} else {
			yield[j].dark_returns += (double)a->returns;
			yield[j].dark_exposure += e;
		}
		yield[j].attempts++;
		model->attempts_used++;
	}
	for (size_t j = 0; j < nt; j++) {
		rd += yield[j].dark_returns;
		sed += targets[j].strength * yield[j].dark_exposure;
	}
	model->base_rate = (s->prior_rate * e0 + rd) / (e0 + sed);
	for (size_t j = 0; j < nt; j++) {
		struct score_yield *y = &yield[j];

		y->prior_rate = targets[j].strength * model->base_rate;
		y->rate = (y->prior_rate * e0 + y->dark_returns) /
		    (e0 + y->dark_exposure);
		lit_r += y->lit_returns / y->rate;
		lit_e += y->lit_exposure;
	}
	model->base_sunlit = (s->prior_sunlit * e0 + lit_r) / (e0 + lit_e);
	for (size_t j = 0; j < nt; j++) {
		struct score_yield *y = &yield[j];

		y->sunlit_factor = (model->base_sunlit * e0 +
		    y->lit_returns / y->rate) / (e0 + y->lit_exposure);
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

/* Elevation and lit state of a target (or the Moon's centre) at t. */
static double
target_el(const struct window_track *tr, const struct geom_target *body,
    double t, int *sunlit)
{
	static const struct geom_target centre_point = {
	    {GEOM_MOON_RADIUS, 0.0, 0.0}};
	struct geom_instant g;
	struct geom_target_view v;

	window_track_instant(tr, t, &g);
	geom_target_view(&g, body != NULL ? body : &centre_point, &v);
	if (sunlit != NULL)
		*sunlit = v.sunlit;
	return body != NULL ? v.el : g.moon.el;
}

/* Time of the synodic angle ang (unwrapped, rad) inside [a, b]. */
static double
synodic_time(const struct window_track *tr, double a, double b, double ang)
{
	while (b - a > 0.1 / ERFA_DAYSEC) {
		double m = 0.5 * (a + b);

		if (window_track_synodic(tr, m) < ang)
			a = m;
		else
			b = m;
	}
	return 0.5 * (a + b);
}

enum errcode
score_window(const struct score_params *p, const struct score_target *t,
    const struct window *w, struct score_window *out)
{
	const struct score_settings *s = p->s;
	const double width = ERFA_D2PI / s->nbins;
	double cuts[SCORE_BINS_MAX + 2];
	double s0, s1, mid, best_t = w->start, best_el = -10.0;
	double sum_x = 0.0, sum_tr = 0.0, lit_s = 0.0, er = 0.0, sc = 0.0;
	double dur = (w->end - w->start) * ERFA_DAYSEC;
	int ncut = 0;

	if (!(w->end >= w->start) || score_settings_check(s, NULL) != ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	memset(out, 0, sizeof *out);
	out->target = w->target;
	out->start = w->start;
	out->end = w->end;
	out->duration_s = dur;
	out->bin_mean = score_bin_mean(t->counts, s->nbins);

	/* Cut the window at bin boundaries of the synodic angle. */
	s0 = window_track_synodic(p->tr, w->start);
	s1 = window_track_synodic(p->tr, w->end);
	cuts[ncut++] = w->start;
	for (double b = (floor(s0 / width) + 1.0) * width;
	    b < s1 && ncut < SCORE_BINS_MAX + 1; b += width)
		cuts[ncut++] = synodic_time(p->tr, w->start, w->end, b);
	cuts[ncut++] = w->end;
	out->bins_crossed = ncut - 2;

	for (int c = 0; c + 1 < ncut; c++) {
		double a = cuts[c], b = cuts[c + 1];
		double len = (b - a) * ERFA_DAYSEC;
		int nstep = (int)ceil(len / s->step_s);
		double dt, wgt;
		int bin;

		if (nstep < 1)
			nstep = 1;
		dt = (b - a) / nstep;
		bin = score_bin_of(eraAnp(window_track_synodic(p->tr,
		    0.5 * (a + b))) * ERFA_DR2D, s->nbins);
		wgt = score_coverage_weight(t->counts[bin], out->bin_mean, s->k,
		    s->alpha);
		for (int i = 0; i < nstep; i++) {
			double ti = a + (i + 0.5) * dt, el, x, trm, r;
			int lit;

			el = target_el(p->tr, t->body, ti, &lit);
			x = score_airmass(el);
			trm = exp(-2.0 * p->tau * x);
			r = p->fire_rate_hz * t->yield.rate * trm *
			    (lit ? t->yield.sunlit_factor : 1.0);
			er += r * dt * ERFA_DAYSEC;
			sc += r * wgt * dt * ERFA_DAYSEC;
			sum_x += x * dt;
			sum_tr += trm * dt;
			lit_s += lit ? dt : 0.0;
			if (el > best_el) {
				best_el = el;
				best_t = ti;
			}
		}
	}
	/* Ends too, then golden section around the best sample. */
	{
		double ea = target_el(p->tr, t->body, w->start, NULL);
		double eb = target_el(p->tr, t->body, w->end, NULL);
		double step = fmin(s->step_s / ERFA_DAYSEC, w->end - w->start);
		double a = fmax(w->start, best_t - step);
		double b = fmin(w->end, best_t + step);
		const double r = 0.618033988749894848;

		while (b - a > 1.0 / ERFA_DAYSEC) {
			double x1 = b - r * (b - a), x2 = a + r * (b - a);

			if (target_el(p->tr, t->body, x1, NULL) <
			    target_el(p->tr, t->body, x2, NULL))
				a = x1;
			else
				b = x2;
		}
		{
			double tm = 0.5 * (a + b);
			double em = target_el(p->tr, t->body, tm, NULL);

			if (em > best_el) {
				best_el = em;
				best_t = tm;
			}
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

		out->mean_airmass = sum_x / span;
		out->mean_transmission = sum_tr / span;
		out->sunlit_fraction = lit_s / span;
	} else {
		int lit;
		double el = target_el(p->tr, t->body, w->start, &lit);

		out->mean_airmass = score_airmass(el);
		out->mean_transmission = exp(-2.0 * p->tau * out->mean_airmass);
		out->sunlit_fraction = lit ? 1.0 : 0.0;
	}
	out->expected_returns = er;
	out->score = sc;
	out->coverage_weight = er > 0.0 ? sc / er :
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
