/* SPDX-License-Identifier: BSD-3-Clause */
/* night.c: the night plan, from a planning query through the windows,
   the yield model and the value model to the scheduler's runs (pure
   core). */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/array.h"
#include "core/mem.h"
#include "core/night.h"
#include "core/text.h"
#include "core/window.h"

void
night_settings_default(struct night_settings *s)
{
	value_settings_default(&s->value);
	s->run_min_s = 600.0;
	s->run_max_s = 1800.0;
	s->switch_s = 120.0;
	s->cal_s = 300.0;
	s->cal_every_s = 0.0;
	s->grid_s = 60.0;
}

enum errcode
night_settings_check(const struct night_settings *s, char *errbuf,
    size_t errlen)
{
	const char *f;

	if (value_settings_check(&s->value, &f) != ERRCODE_OK)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "setting %s is "
		    "out of range", f);
	if (!(s->grid_s > 0) || s->grid_s > SCHED_MAX_SLOT_S)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "grid: must be "
		    "in 0..%.0f s", SCHED_MAX_SLOT_S);
	if (!(s->run_min_s >= s->grid_s) || s->run_min_s > 86400)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "setting "
		    "plan_run_min_s must be in %.0f..86400 s", s->grid_s);
	if (!(s->run_max_s >= s->run_min_s) || s->run_max_s > 86400)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "setting "
		    "plan_run_max_s must be at least plan_run_min_s and at "
		    "most 86400 s");
	if (!(s->switch_s >= 0) || s->switch_s > 86400)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "setting "
		    "plan_switch_s must be in 0..86400 s");
	if (!(s->cal_s >= s->grid_s) || s->cal_s > 86400)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "setting "
		    "plan_calibration_s must be in %.0f..86400 s", s->grid_s);
	if (!(s->cal_every_s == 0 || (s->cal_every_s >= s->run_max_s &&
	    s->cal_every_s <= 7 * 86400.0)))
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "setting "
		    "plan_calibration_every_s must be 0 (off) or between "
		    "plan_run_max_s and 604800 s");
	return ERRCODE_OK;
}

static const char *const method_names[] = {
	[SCHED_GREEDY] = "greedy", [SCHED_BEST] = "best"
};
#define NMETHODS ((int)(sizeof method_names / sizeof method_names[0]))

const char *
night_method_name(enum sched_method m)
{
	return method_names[m == SCHED_GREEDY ? SCHED_GREEDY : SCHED_BEST];
}

int
night_method_parse(const char *s)
{
	return text_name_index(s, method_names, NMETHODS);
}

void
night_result_free(struct night_result *r)
{
	if (r == NULL)
		return;
	mem_free(r->runs);
	mem_free(r->targets);
	mem_free(r->samples);
	r->runs = NULL;
	r->targets = NULL;
	r->samples = NULL;
	r->nruns = r->ntargets = r->nsamples = 0;
}

/* A reason of run r. */
#define add_reason(r, ...) \
	plan_reason_add((r)->reasons, &(r)->nreasons, __VA_ARGS__)

/* Working arrays, all mem_calloc'd; freed by work_free. */
struct work {
	unsigned char *avail, *clear;
	double *ret, *h, *syn, *binw, *el;
	double *moon_el, *sun_el, *sun_sep;
	unsigned long long *lit;
	struct value_phase *ph;
	size_t *phase_of;
	double *npr;
	double *prec;		/* nt x nslots: precision weight (jitter set) */
	struct logstats built;	/* the log's, when the query has none */
	long *counts;		/* (nt + 1) x nbins */
	struct window_node *nodes;
	struct geom_target *bodies;
};

static void
work_free(struct work *w)
{
	mem_free(w->avail);
	mem_free(w->clear);
	mem_free(w->ret);
	mem_free(w->h);
	mem_free(w->syn);
	mem_free(w->binw);
	mem_free(w->el);
	mem_free(w->moon_el);
	mem_free(w->sun_el);
	mem_free(w->sun_sep);
	mem_free(w->lit);
	mem_free(w->ph);
	mem_free(w->phase_of);
	mem_free(w->npr);
	mem_free(w->prec);
	logstats_free(&w->built);
	mem_free(w->counts);
	mem_free(w->nodes);
	mem_free(w->bodies);
}

/* The planned targets' records, in plan_run's model order. */
static const struct site_target *
find_target(const struct plan_query *q, const char *id)
{
	for (size_t i = 0; i < q->ntargets; i++)
		if (strcmp(q->targets[i].id, id) == 0)
			return &q->targets[i];
	return NULL;
}

/*
 * Why no run fits: the limit that leaves no slot.  E: a target above
 * min_el; S: the Sun below max_sun_el; P: the Sun-Moon separation at
 * least min_sun_sep; B: outside blackouts.  A limit is named when the
 * others leave slots it closes.
 */
static void
explain_empty(const struct plan_query *q, const struct night_settings *ns,
    const struct work *w, size_t nt, size_t nslots, size_t nwin,
    char *why, size_t len)
{
	const struct site_station *st = &q->station;
	size_t e = 0, es = 0, ep = 0, esp = 0, espb = 0;

	for (size_t k = 0; k < nslots; k++) {
		double best = -90.0;
		int s, p;

		for (size_t j = 0; j < nt; j++)
			if (w->el[j * nslots + k] > best)
				best = w->el[j * nslots + k];
		if (best < st->min_el_deg)
			continue;
		e++;
		s = w->sun_el[k] <= st->max_sun_el_deg;
		p = w->sun_sep[k] >= st->min_sun_sep_deg;
		es += s;
		ep += p;
		esp += s && p;
		espb += s && p && w->clear[k];
	}
	if (e == 0)
		snprintf(why, len, "the Moon stays below the minimum elevation "
		    "(min_el %.0f deg) all span", st->min_el_deg);
	else if (esp == 0 && es > 0)
		snprintf(why, len, "while the Moon is up at night it is within "
		    "min_sun_sep (%.0f deg) of the Sun (near new moon)",
		    st->min_sun_sep_deg);
	else if (esp == 0 && ep > 0)
		snprintf(why, len, "the Moon is above %.0f deg only while the "
		    "Sun is above max_sun_el (%.0f deg)", st->min_el_deg,
		    st->max_sun_el_deg);
	else if (esp == 0)
		snprintf(why, len, "the Moon is up only in daylight or twilight "
		    "(Sun above max_sun_el %.0f deg) and within min_sun_sep "
		    "(%.0f deg) of the Sun: near new moon", st->max_sun_el_deg,
		    st->min_sun_sep_deg);
	else if (espb == 0)
		snprintf(why, len, "blackouts cover every slot the limits "
		    "leave");
	else if (nwin == 0)
		snprintf(why, len, "no target meets every limit at once "
		    "(dark-only targets are sunlit)");
	else
		snprintf(why, len, "no window is as long as plan_run_min_s "
		    "(%.0f s) plus the switch and calibration times",
		    ns->run_min_s);
}

enum errcode
night_plan(const struct plan_query *q0, const struct night_settings *ns,
    enum sched_method method, struct night_result *out, char *errbuf,
    size_t errlen)
{
	struct plan_query q = *q0;
	struct plan_result pr;
	struct work w;
	struct geom_site site;
	struct window_track tr;
	struct tscale_instant a;
	struct sched_problem sp;
	struct sched_plan plan;
	double span_s, g;
	size_t nt, nslots, nn, nb, step;
	int per_target;
	enum errcode rc;

	memset(out, 0, sizeof *out);
	memset(&w, 0, sizeof w);
	memset(&plan, 0, sizeof plan);
	memset(&pr, 0, sizeof pr);
	if ((rc = night_settings_check(ns, errbuf, errlen)) != ERRCODE_OK)
		return rc;
	if (!(q.to_mjd > q.from_mjd))
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "to: the span "
		    "must end after it starts");
	if (q.to_mjd - q.from_mjd > NIGHT_MAX_DAYS)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "to: a plan spans "
		    "at most %.0f days", NIGHT_MAX_DAYS);
	g = ns->grid_s;
	span_s = (q.to_mjd - q.from_mjd) * ERFA_DAYSEC;
	nslots = (size_t)floor(span_s / g + 1e-9);
	if (nslots < 1)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "to: the span is "
		    "shorter than one %.0f s slot", g);
	q.target = NULL;
	q.limit = 0;
	/* The log's statistics, built once for plan_run and the value. */
	if (q.stats == NULL) {
		if ((rc = logstats_build(&w.built, &q.station,
		    q.settings.nbins, q.attempts, q.nattempts, q.nps,
		    q.nnps)) != ERRCODE_OK)
			return text_err(rc, errbuf, errlen, "log: %s",
			    rc == ERRCODE_BAD_ARG ? "zenith_tau or coverage_bins "
			    "out of range" : errcode_str(rc));
		q.stats = &w.built;
	}
	if ((rc = plan_run(&q, &pr, errbuf, errlen)) != ERRCODE_OK)
		goto out;
	nt = pr.nmodels;
	if (nt > 64) {
		rc = text_err(ERRCODE_TOO_LARGE, errbuf, errlen, "targets: more "
		    "than 64 to plan");
		goto out;
	}
	nb = (size_t)pr.settings.nbins;
	per_target = pr.settings.per_target;
	w.avail = mem_calloc(nt * nslots + 1, 1);
	w.clear = mem_calloc(nslots, 1);
	w.ret = mem_calloc(nt * nslots + 1, sizeof(double));
	w.h = mem_calloc(nt * nslots * VALUE_ODIM + 1, sizeof(double));
	w.syn = mem_calloc(nslots, sizeof(double));
	w.binw = mem_calloc(nt * nslots + 1, sizeof(double));
	w.el = mem_calloc(nt * nslots + 1, sizeof(double));
	w.moon_el = mem_calloc(nslots, sizeof(double));
	w.sun_el = mem_calloc(nslots, sizeof(double));
	w.sun_sep = mem_calloc(nslots, sizeof(double));
	w.lit = mem_calloc(nslots, sizeof(unsigned long long));
	w.ph = mem_calloc(nt + 1, sizeof(struct value_phase));
	w.phase_of = mem_calloc(nt + 1, sizeof(size_t));
	w.npr = mem_calloc(nt + 1, sizeof(double));
	w.prec = mem_calloc(nt * nslots + 1, sizeof(double));
	w.counts = mem_calloc((nt + 1) * nb, sizeof(long));
	w.bodies = mem_calloc(nt + 1, sizeof(struct geom_target));
	nn = window_track_nodes((q.to_mjd - q.from_mjd) + 1e-3);
	w.nodes = mem_calloc(nn, sizeof(struct window_node));
	if (!w.avail || !w.clear || !w.ret || !w.h || !w.syn || !w.binw ||
	    !w.el || !w.moon_el || !w.sun_el || !w.sun_sep || !w.lit ||
	    !w.ph || !w.phase_of || !w.npr || !w.prec || !w.counts ||
	    !w.bodies || !w.nodes) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	out->targets = mem_calloc(nt + 1, sizeof out->targets[0]);
	if (out->targets == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}

	/* The targets' bodies (NULL body: the Moon's centre). */
	for (size_t j = 0; j < nt; j++) {
		const struct site_target *t = find_target(&q, pr.models[j].id);

		snprintf(out->targets[j].id, sizeof out->targets[j].id, "%s",
		    pr.models[j].id);
		snprintf(out->targets[j].name, sizeof out->targets[j].name,
		    "%s", t != NULL ? t->name : "Moon (centre)");
		if (t == NULL) {
			memset(&w.bodies[j], 0, sizeof w.bodies[j]);
		} else if (geom_target_from_selen(t->lat_deg * ERFA_DD2R,
		    t->lon_deg * ERFA_DD2R, t->height_m, &w.bodies[j]) !=
		    ERRCODE_OK) {
			rc = text_err(ERRCODE_BAD_ARG, errbuf, errlen, "target %s: "
			    "selenographic position out of range", t->id);
			goto out;
		}
	}
	out->ntargets = nt;

	/* The track over the span, with plan_run's Earth orientation. */
	if ((rc = plan_station_site(&q.station, &site)) != ERRCODE_OK ||
	    (rc = tscale_from_utc(TEXT_MJD0, q.from_mjd,
	    pr.eop.dut1, &a)) != ERRCODE_OK ||
	    (rc = window_track_init(&tr, &site, &pr.eop, a.tt1, a.tt2,
	    (q.to_mjd - q.from_mjd) + 1e-3, w.nodes, nn)) != ERRCODE_OK) {
		rc = text_err(rc, errbuf, errlen, "from/to: cannot tabulate the "
		    "span");
		goto out;
	}

	/* Slots: usable, clear of blackouts, geometry at the middle. */
	for (size_t k = 0; k < nslots; k++) {
		double t0 = q.from_mjd + (double)k * g / ERFA_DAYSEC;
		double t1 = t0 + g / ERFA_DAYSEC;

		w.clear[k] = 1;
		for (size_t b = 0; b < q.nblackouts; b++)
			if (q.blackouts[b].start_mjd < t1 &&
			    q.blackouts[b].end_mjd > t0)
				w.clear[k] = 0;
	}
	for (size_t i = 0; i < pr.n; i++) {
		const struct plan_window *pw = &pr.w[i];
		size_t j = pw->f.target;
		double k0 = ceil((pw->start_mjd - q.from_mjd) * ERFA_DAYSEC / g -
		    1e-6);
		double k1 = floor((pw->end_mjd - q.from_mjd) * ERFA_DAYSEC / g +
		    1e-6);

		if (j >= nt)
			continue;
		for (double k = k0 < 0 ? 0 : k0; k < k1 && k < (double)nslots;
		    k++)
			w.avail[j * nslots + (size_t)k] = w.clear[(size_t)k];
	}
	for (size_t k = 0; k < nslots; k++) {
		double t = ((double)k + 0.5) * g / ERFA_DAYSEC;
		struct geom_instant gi;

		window_track_instant(&tr, t, &gi);
		w.syn[k] = window_track_synodic(&tr, t);
		w.moon_el[k] = gi.moon.el * ERFA_DR2D;
		w.sun_el[k] = gi.sun.el * ERFA_DR2D;
		w.sun_sep[k] = gi.sun.separation * ERFA_DR2D;
		for (size_t j = 0; j < nt; j++) {
			struct geom_target_view v;
			double los[3], u[3], r;
			static const struct geom_target centre = {
			    {GEOM_MOON_RADIUS, 0.0, 0.0}};
			int moon = w.bodies[j].body[0] == 0.0 &&
			    w.bodies[j].body[1] == 0.0 &&
			    w.bodies[j].body[2] == 0.0;

			geom_target_view(&gi, moon ? &centre : &w.bodies[j], &v);
			if (moon)
				v.el = gi.moon.el;
			w.el[j * nslots + k] = v.el * ERFA_DR2D;
			if (v.sunlit)
				w.lit[k] |= 1ULL << j;
			w.ret[j * nslots + k] = score_rate(
			    q.station.fire_rate_hz, &pr.models[j].y,
			    score_transmission(q.station.zenith_tau, v.el) *
			    score_range_factor(moon ? gi.moon.range : v.range),
			    v.sunlit) * g;
			/* line of sight in the lunar frame */
			eraRxp(gi.lunar_rot, gi.moon_topo, los);
			for (int c = 0; c < 3; c++)
				los[c] += w.bodies[j].body[c];
			r = sqrt(los[0] * los[0] + los[1] * los[1] +
			    los[2] * los[2]);
			for (int c = 0; c < 3; c++)
				u[c] = los[c] / r;
			value_orient_vector(w.bodies[j].body, u,
			    w.h + (j * nslots + k) * VALUE_ODIM);
			/* Precision: jitter^2 / (jitter^2 + spread^2) of a
			   return, when the station gives its jitter. */
			w.prec[j * nslots + k] = 1.0;
			if (isfinite(q.station.jitter_ps) &&
			    q.station.jitter_ps > 0.0 && !moon) {
				double tilt, spread, jj;

				array_of_target(&gi, &w.bodies[j],
				    find_target(&q, pr.models[j].id), &tilt,
				    &spread);
				jj = q.station.jitter_ps * q.station.jitter_ps;
				w.prec[j * nslots + k] = jj / (jj + spread *
				    spread);
			}
		}
	}

	/* Information held on the phase: normal points and the log's. */
	{
		size_t npools = per_target ? nt : 1;
		const struct logstats_entry *pool = &q.stats->e[0];
		double npr;

		for (size_t k = 0; k < npools; k++) {
			const struct logstats_entry *e = per_target ?
			    logstats_find(q.stats, pr.models[k].id) : pool;
			struct value_moments m;

			memset(&m, 0, sizeof m);
			if (e != NULL)
				value_moments_sum(&e->ph_np, &e->ph_att, &m);
			rc = value_phase_from_moments(&w.ph[k],
			    ns->value.harmonics, ns->value.phase_ridge, &m);
			if (rc != ERRCODE_OK)
				goto out;
		}
		for (size_t j = 0; j < nt; j++)
			w.phase_of[j] = per_target ? j : 0;
		npr = value_np_per_return((double)pool->ret_nps,
		    (double)pool->ret_returns);
		for (size_t j = 0; j < nt; j++)
			w.npr[j] = npr;
		sp.nphase = npools;
	}

	/* The coverage weight W of each slot (value_model bins). */
	memcpy(w.counts + nt * nb, pr.pooled, nb * sizeof(long));
	for (size_t j = 0; j < nt; j++) {
		const struct logstats_entry *e = logstats_find(q.stats,
		    pr.models[j].id);

		if (e != NULL)
			memcpy(w.counts + j * nb, e->counts, nb * sizeof(long));
	}
	for (size_t j = 0; j < nt; j++) {
		const long *c = w.counts + (per_target ? j : nt) * nb;
		double mean = score_bin_mean(c, (int)nb);

		for (size_t k = 0; k < nslots; k++) {
			int b = score_bin_of(eraAnp(w.syn[k]) * ERFA_DR2D,
			    (int)nb);

			w.binw[j * nslots + k] = score_coverage_weight(c[b],
			    mean, pr.settings.k, pr.settings.alpha);
		}
	}

	/* The scheduler. */
	sp.nslots = nslots;
	sp.slot_s = g;
	sp.ntargets = nt;
	sp.avail = w.avail;
	sp.clear = w.clear;
	sp.returns = w.ret;
	sp.h = w.h;
	sp.synodic = w.syn;
	sp.bin_weight = w.binw;
	sp.npr = w.npr;
	sp.precision = w.prec;
	sp.vs = &ns->value;
	sp.phase0 = w.ph;
	sp.phase_of = w.phase_of;
	sp.run_min = (int)ceil(ns->run_min_s / g - 1e-9);
	sp.run_max = (int)floor(ns->run_max_s / g + 1e-9);
	sp.switch_slots = (int)ceil(ns->switch_s / g - 1e-9);
	sp.cal_slots = (int)ceil(ns->cal_s / g - 1e-9);
	sp.cal_every = ns->cal_every_s > 0 ?
	    (int)floor(ns->cal_every_s / g + 1e-9) : 0;
	if ((rc = sched_solve(&sp, method, &plan)) != ERRCODE_OK) {
		text_err(rc, errbuf, errlen, "plan: %s", errcode_str(rc));
		goto out;
	}

	/* The runs, with their reasons. */
	out->runs = mem_calloc(plan.n + 1, sizeof out->runs[0]);
	step = (size_t)(NIGHT_SAMPLE_S / g);
	if (step < 1)
		step = 1;
	out->samples = mem_calloc(nslots / step + 2, sizeof out->samples[0]);
	if (out->runs == NULL || out->samples == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	for (size_t i = 0; i < plan.n; i++) {
		const struct sched_run *r = &plan.runs[i];
		struct night_run *o = &out->runs[i];
		size_t mid = r->start + (r->len - 1) / 2;
		double ta = (double)r->start * g / ERFA_DAYSEC;
		double tb = (double)(r->start + r->len) * g / ERFA_DAYSEC;

		o->start_mjd = q.from_mjd + (double)r->start * g / ERFA_DAYSEC;
		o->end_mjd = q.from_mjd + (double)(r->start + r->len) * g /
		    ERFA_DAYSEC;
		o->synodic_deg = eraAnp(w.syn[mid]) * ERFA_DR2D;
		if (r->target == SCHED_CALIBRATION) {
			o->calibration = 1;
			snprintf(o->target, sizeof o->target, "%s",
			    NIGHT_CALIBRATION_ID);
			o->el_start_deg = o->el_end_deg = o->el_max_deg = NAN;
			o->phys.tilt_deg = o->phys.spread_ps = NAN;
			o->phys.greatest_mjd = NAN;
			add_reason(o, "calibration on the ground target: due "
			    "every %.0f min of ranging",
			    ns->cal_every_s / 60.0);
			continue;
		}
		{
			size_t j = (size_t)r->target;
			const double *el = w.el + j * nslots;
			double hi = -90.0;
			int rank = 0;

			for (size_t s = r->start; s < r->start + r->len; s++)
				if (el[s] > hi)
					hi = el[s];
			for (size_t k = 0; k < i; k++)
				rank += plan.runs[k].target == r->target;
			snprintf(o->target, sizeof o->target, "%s",
			    out->targets[j].id);
			o->expected_returns = r->returns;
			o->expected_nps = r->nps;
			o->value = r->value;
			o->value_phase = r->phase;
			o->value_orientation = r->orientation;
			o->el_start_deg = el[r->start];
			o->el_end_deg = el[r->start + r->len - 1];
			o->el_max_deg = hi;
			plan_physics_fill(&tr, ta, tb, 0.5 * (ta + tb),
			    &w.bodies[j], find_target(&q, o->target), pr.ecl,
			    pr.necl, &o->phys);
			if (find_target(&q, o->target) == NULL)
				o->phys.tilt_deg = o->phys.spread_ps = NAN;
			if (rank == 0)
				add_reason(o, "first run on %s in this plan: "
				    "rotation leverage h'N^-1h %.3f",
				    o->target, r->orient_leverage);
			else
				add_reason(o, "run %d on %s in this plan: "
				    "rotation leverage %.3f after the runs "
				    "before it", rank + 1, o->target,
				    r->orient_leverage);
			if (ns->value.model == VALUE_MODEL_BINS)
				add_reason(o, "phase %.0f deg (%s): coverage "
				    "weight %.2f", o->synodic_deg,
				    plan_phase_label(o->synodic_deg),
				    r->phase_leverage);
			else
				add_reason(o, "phase %.0f deg (%s): leverage "
				    "f'M^-1f %.4f against the normal points "
				    "held", o->synodic_deg,
				    plan_phase_label(o->synodic_deg),
				    r->phase_leverage);
			add_reason(o, "elevation %.0f to %.0f deg (highest "
			    "%.0f); %.0f returns, %.2f normal points "
			    "expected", o->el_start_deg, o->el_end_deg, hi,
			    r->returns, r->nps);
			add_reason(o, "value %.3f = %.2f x phase %.4f + %.2f x "
			    "orientation %.4f", r->value,
			    ns->value.phase_weight, r->phase,
			    ns->value.orientation_weight, r->orientation);
		}
	}
	out->nruns = plan.n;
	for (size_t k = 0; k < nslots; k += step) {
		struct night_sample *s = &out->samples[out->nsamples++];

		s->mjd = q.from_mjd + ((double)k + 0.5) * g / ERFA_DAYSEC;
		s->moon_el_deg = w.moon_el[k];
		s->sun_el_deg = w.sun_el[k];
		s->lit = w.lit[k];
		for (size_t j = 0; j < nt; j++)
			if (w.avail[j * nslots + k])
				s->open |= 1ULL << j;
	}
	if (plan.n == 0)
		explain_empty(&q, ns, &w, nt, nslots, pr.n, out->why_empty,
		    sizeof out->why_empty);
	out->method = method;
	out->from_mjd = q.from_mjd;
	out->to_mjd = q.to_mjd;
	out->total_value = plan.value;
	out->expected_nps = plan.nps;
	out->greedy_value = plan.greedy_value;
	out->exact = plan.exact;
	out->nodes = plan.nodes;
	out->nwindows = pr.n;
	out->station = q.station;
	out->settings = *ns;
	rc = ERRCODE_OK;
out:
	sched_plan_free(&plan);
	plan_result_free(&pr);
	work_free(&w);
	if (rc != ERRCODE_OK)
		night_result_free(out);
	return rc;
}
