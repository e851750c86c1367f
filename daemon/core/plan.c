/* SPDX-License-Identifier: BSD-3-Clause */
/* plan.c: the planning query, from site records to ranked windows. */
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/array.h"
#include "core/derive.h"
#include "core/eop.h"
#include "core/mem.h"
#include "core/plan.h"
#include "core/text.h"
#include "core/window.h"

void
plan_query_init(struct plan_query *q)
{
	memset(q, 0, sizeof *q);
	q->station.min_el_deg = PLAN_DEFAULT_MIN_EL_DEG;
	q->station.max_sun_el_deg = PLAN_DEFAULT_MAX_SUN_EL_DEG;
	q->station.min_sun_sep_deg = PLAN_DEFAULT_MIN_SUN_SEP_DEG;
	q->station.pressure_hpa = NAN;
	q->station.temperature_c = NAN;
	q->station.humidity = NAN;
	q->station.wavelength_nm = 532.0;
	q->station.zenith_tau = 0.1;
	q->station.fire_rate_hz = 10.0;
	score_settings_default(&q->settings);
}

void
plan_result_free(struct plan_result *r)
{
	if (r == NULL)
		return;
	mem_free(r->models);
	mem_free(r->w);
	r->models = NULL;
	r->w = NULL;
	r->n = r->nmodels = 0;
}

const char *
plan_phase_label(double deg)
{
	static const char *names[8] = {"new-moon", "waxing-crescent",
	    "first-quarter", "waxing-gibbous", "full-moon", "waning-gibbous",
	    "last-quarter", "waning-crescent"};
	double a = fmod(deg, 360.0);

	if (a < 0)
		a += 360.0;
	return names[(int)floor((a + 22.5) / 45.0) % 8];
}

/* Copy a target id (both SITE_ID_LEN). */
static void
copy_id(char *dst, const char *src)
{
	memcpy(dst, src, SITE_ID_LEN);
	dst[SITE_ID_LEN - 1] = '\0';
}

/* UTC MJD of a TT offset on the track. */
static double
mjd_of(const struct window_track *tr, double t)
{
	struct tscale_instant x;

	if (tscale_from_tt(tr->base1, tr->base2 + t, tr->eop.dut1, &x) !=
	    ERRCODE_OK)
		return NAN;
	return (x.utc1 - TEXT_MJD0) + x.utc2;
}

/* TT offset on the track of a UTC MJD. */
static enum errcode
offset_of(const struct window_track *tr, double mjd, double *t)
{
	struct tscale_instant x;
	enum errcode rc = tscale_from_utc(TEXT_MJD0, mjd, tr->eop.dut1, &x);

	if (rc != ERRCODE_OK)
		return rc;
	*t = (x.tt1 - tr->base1) + (x.tt2 - tr->base2);
	return ERRCODE_OK;
}

void
plan_reason_add(char (*reasons)[PLAN_REASON_LEN], size_t *n,
    const char *fmt, ...)
{
	va_list ap;

	if (*n >= PLAN_MAX_REASONS)
		return;
	va_start(ap, fmt);
	vsnprintf(reasons[(*n)++], PLAN_REASON_LEN, fmt, ap);
	va_end(ap);
}

/* A reason of window w. */
#define add_reason(w, ...) \
	plan_reason_add((w)->reasons, &(w)->nreasons, __VA_ARGS__)

/* "HH:MM" (with_date: "YYYY-MM-DD HH:MM") of a UTC MJD; "?" if none.
   buf holds 24 bytes. */
static void
hhmm_of(double mjd, char *buf, int with_date)
{
	int y, mo, d, hh, mi;
	double sec;

	snprintf(buf, 24, "?");
	if (tscale_utc_fields(TEXT_MJD0, mjd, &y, &mo, &d, &hh, &mi, &sec) !=
	    ERRCODE_OK)
		return;
	if (with_date)
		snprintf(buf, 24, "%04d-%02d-%02d %02d:%02d", y % 10000, mo % 100,
		    d % 100, hh % 100, mi % 100);
	else
		snprintf(buf, 24, "%02d:%02d", hh % 100, mi % 100);
}

/*
 * The first of ev[ne] (TT JDs) whose P1..P4 overlaps the TT offsets
 * t0..t1 on tr, or NULL; its P1, P4 and greatest eclipse as offsets.
 */
static const struct eclipse_event *
eclipse_overlap(const struct window_track *tr,
    const struct eclipse_event *ev, size_t ne, double t0, double t1,
    double *a, double *b, double *g)
{
	for (size_t i = 0; i < ne; i++) {
		*a = (ev[i].contact_tt1[ECLIPSE_P1] - tr->base1) +
		    (ev[i].contact_tt2[ECLIPSE_P1] - tr->base2);
		*b = (ev[i].contact_tt1[ECLIPSE_P4] - tr->base1) +
		    (ev[i].contact_tt2[ECLIPSE_P4] - tr->base2);
		*g = (ev[i].greatest_tt1 - tr->base1) +
		    (ev[i].greatest_tt2 - tr->base2);
		if (*b >= t0 && *a <= t1)
			return &ev[i];
	}
	return NULL;
}

/*
 * The first reason of a window that overlaps a lunar eclipse (P1..P4 of
 * one of ev[ne], TT JDs; t0, t1 the window's TT offsets on tr).
 */
static void
explain_eclipse(struct plan_window *w, const struct window_track *tr,
    const struct eclipse_event *ev, size_t ne, double t0, double t1)
{
	double a, b, g;
	const struct eclipse_event *e = eclipse_overlap(tr, ev, ne, t0, t1,
	    &a, &b, &g);
	char ga[24], pa[24], pb[24];

	if (e == NULL)
		return;
	hhmm_of(mjd_of(tr, g), ga, 1);
	hhmm_of(mjd_of(tr, a), pa, 0);
	hhmm_of(mjd_of(tr, b), pb, 0);
	add_reason(w, "%s lunar eclipse, greatest %s UTC (P1 %s, P4 %s): "
	    "a rare full-moon chance; in the umbra the reflector is "
	    "dark", eclipse_kind_name(e->kind), ga, pa, pb);
}

void
plan_physics_fill(const struct window_track *tr, double t0, double t1,
    double t, const struct geom_target *gt, const struct site_target *st,
    const struct eclipse_event *ev, size_t ne, struct plan_physics *out)
{
	struct geom_instant g;
	struct geom_target_view v;
	const struct eclipse_event *e;
	double tilt, spread, a, b, gr;

	memset(out, 0, sizeof *out);
	window_track_instant(tr, t, &g);
	array_of_target(&g, gt, st, &tilt, &spread);
	out->tilt_deg = tilt * ERFA_DR2D;
	out->spread_ps = spread;
	out->greatest_mjd = NAN;
	e = eclipse_overlap(tr, ev, ne, t0, t1, &a, &b, &gr);
	if (e == NULL)
		return;
	out->eclipse = 1;
	out->kind = e->kind;
	out->greatest_mjd = mjd_of(tr, gr);
	window_track_instant(tr, gr < t0 ? t0 : gr > t1 ? t1 : gr, &g);
	geom_target_view(&g, gt, &v);
	out->shadow = v.shadow;
}

static void
explain(struct plan_window *w, const struct plan_target_model *m,
    const struct score_settings *s, double tau)
{
	const struct score_window *f = &w->f;
	double width = 360.0 / s->nbins;
	double lo = f->phase_bin * width;
	char hhmm[24];

	if (s->alpha == 0.0)
		add_reason(w, "coverage weighting is off (alpha = 0)");
	else
		add_reason(w, "%s bin %.0f-%.0f deg has %ld normal points "
		    "%s against a mean of %.1f (weight %.2f)",
		    plan_phase_label(lo + width / 2), lo, lo + width,
		    f->bin_count, s->per_target ? "of this target" :
		    "of all targets", f->bin_mean, f->coverage_weight);
	if (f->bins_crossed > 0)
		add_reason(w, "the window crosses %d bin boundar%s; the weight "
		    "is the yield-weighted mean", f->bins_crossed,
		    f->bins_crossed == 1 ? "y" : "ies");
	hhmm_of(w->max_el_mjd, hhmm, 0);
	add_reason(w, "highest elevation %.1f deg at %s UTC; mean airmass %.2f, "
	    "two-way transmission %.2f at tau %.2f", f->max_el * ERFA_DR2D,
	    hhmm, f->mean_airmass, f->mean_transmission, tau);
	if (f->sunlit_fraction <= 0.0)
		add_reason(w, "in lunar darkness throughout");
	else
		add_reason(w, "sunlit for %.0f%% of the window (sunlit factor "
		    "%.2f)", 100.0 * f->sunlit_fraction, m->y.sunlit_factor);
	if (m->y.attempts > 0)
		add_reason(w, "%.3g returns per shot above the atmosphere "
		    "(%.2g of the link budget) learned from %ld logged attempts",
		    m->y.rate, m->y.efficiency, m->y.attempts);
	else
		add_reason(w, "no usable history: %.3g returns per shot above "
		    "the atmosphere from the link budget (strength %.2f)",
		    m->y.rate, m->strength);
}

/*
 * The yield model of the nt planned targets tg, fitted with every active
 * target of the query (the planned ones alone when none is active, i.e.
 * the Moon's centre).  yield[nt] in the order of tg.
 */
static enum errcode
fit_all(const struct plan_query *q, const struct logstats *ls,
    const struct site_target *tg, size_t nt, struct score_yield *yield,
    struct score_model *model)
{
	struct site_target *act = NULL;
	struct score_yield *ay = NULL;
	struct score_sums *u = NULL;
	const struct logstats_entry *e;
	size_t na = 0;
	enum errcode rc;

	for (size_t i = 0; i < q->ntargets; i++)
		na += q->targets[i].active ? 1 : 0;
	act = mem_calloc(na + nt, sizeof act[0]);
	ay = mem_calloc(na + nt, sizeof ay[0]);
	u = mem_calloc(na + nt, sizeof u[0]);
	if (act == NULL || ay == NULL || u == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	if (na == 0) {
		memcpy(act, tg, nt * sizeof act[0]);
		na = nt;
	} else {
		na = 0;
		for (size_t i = 0; i < q->ntargets; i++)
			if (q->targets[i].active)
				act[na++] = q->targets[i];
	}
	/* The sums of each fitted target: the first of a repeated id, as a
	   search of the attempts' target would find. */
	for (size_t i = 0; i < na; i++) {
		size_t k = 0;

		while (k < i && strcmp(act[k].id, act[i].id) != 0)
			k++;
		if (k == i && (e = logstats_find(ls, act[i].id)) != NULL)
			u[i] = e->y;
	}
	rc = score_fit_sums(&q->settings, &q->station, act, na, u,
	    ls->e[0].attempts, ay, model);
	if (rc != ERRCODE_OK)
		goto out;
	for (size_t j = 0; j < nt; j++) {
		size_t i = 0;

		while (i < na && strcmp(act[i].id, tg[j].id) != 0)
			i++;
		if (i == na) {		/* cannot happen: tg is drawn from act */
			rc = ERRCODE_NOT_FOUND;
			goto out;
		}
		yield[j] = ay[i];
	}
out:
	mem_free(act);
	mem_free(ay);
	mem_free(u);
	return rc;
}

enum errcode
plan_station_site(const struct site_station *st, struct geom_site *site)
{
	struct geom_weather wx;
	struct site_station sw_st;

	/* Standard weather for what the station does not say. */
	geom_weather_standard(st->height_m, &wx);
	sw_st = *st;
	if (!isfinite(sw_st.pressure_hpa))
		sw_st.pressure_hpa = wx.pressure_hpa;
	if (!isfinite(sw_st.temperature_c))
		sw_st.temperature_c = wx.temperature_c;
	if (!isfinite(sw_st.humidity))
		sw_st.humidity = wx.humidity;
	if (!isfinite(sw_st.wavelength_nm))
		sw_st.wavelength_nm = wx.wavelength_um * 1000.0;
	return derive_site(&sw_st, site);
}

enum errcode
plan_run(const struct plan_query *q, struct plan_result *out, char *errbuf,
    size_t errlen)
{
	const struct site_station *st = &q->station;
	struct geom_site site;
	struct geom_target bodies[WINDOW_MAX_TARGETS];
	struct window_target wt[WINDOW_MAX_TARGETS];
	struct site_target tg[WINDOW_MAX_TARGETS];
	struct score_yield yield[WINDOW_MAX_TARGETS];
	long *counts = NULL;	/* (nt + 1) x nbins: per target, then pooled */
	struct window_node *nodes = NULL;
	struct window_interval *bo = NULL;
	struct window *win = NULL;
	struct score_window *sw = NULL;
	struct window_track tr;
	struct window_limits lim;
	struct tscale_instant a, b;
	struct geom_eop eop;
	const char *field;
	size_t nt = 0, nn, cap, nw = 0, nbo = 0, keep;
	double span;
	int nb = q->settings.nbins;
	struct logstats built;
	const struct logstats *ls = q->stats;
	enum errcode rc;

	memset(out, 0, sizeof *out);
	memset(&built, 0, sizeof built);
	if (score_settings_check(&q->settings, &field) != ERRCODE_OK)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "setting %s is out of range", field);
	if (!isfinite(st->min_el_deg) || st->min_el_deg < -5 ||
	    st->min_el_deg > 89)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "%s: must be a number of degrees in -5..89", "min_el");
	if (!isfinite(st->max_sun_el_deg) || st->max_sun_el_deg < -90 ||
	    st->max_sun_el_deg > 90)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "%s: must be a number of degrees in -90..90", "max_sun_el");
	if (!isfinite(st->min_sun_sep_deg) || st->min_sun_sep_deg < 0 ||
	    st->min_sun_sep_deg > 180)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "%s: must be a number of degrees in 0..180", "min_sun_sep");
	if (!isfinite(st->zenith_tau) || st->zenith_tau < 0 ||
	    st->zenith_tau > 5)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "%s: must be in 0..5", "zenith_tau");
	if (!(st->fire_rate_hz > 0) || st->fire_rate_hz > 1e6)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "%s: must be in 0..1e6 shots per second", "fire_rate_hz");

	if (plan_station_site(st, &site) != ERRCODE_OK)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "%s: latitude, longitude, height or weather out of range",
		    "station");

	/* The targets planned. */
	for (size_t i = 0; i < q->ntargets; i++) {
		const struct site_target *t = &q->targets[i];

		if (!t->active || (q->target != NULL &&
		    strcmp(q->target, t->id) != 0))
			continue;
		if (nt == WINDOW_MAX_TARGETS)
			return text_err(ERRCODE_TOO_LARGE, errbuf, errlen,
			    "targets: more than %d active targets",
			    WINDOW_MAX_TARGETS);
		if (geom_target_from_selen(t->lat_deg * ERFA_DD2R,
		    t->lon_deg * ERFA_DD2R, t->height_m, &bodies[nt]) !=
		    ERRCODE_OK)
			return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
			    "target %s: selenographic position out of range",
			    t->id);
		tg[nt] = *t;
		wt[nt].body = &bodies[nt];
		wt[nt].dark_only = t->dark_only;
		nt++;
	}
	if (nt == 0) {
		int any = 0;

		for (size_t i = 0; i < q->ntargets; i++)
			any |= q->targets[i].active;
		if (q->target != NULL && (any ||
		    strcmp(q->target, PLAN_MOON_ID) != 0))
			return text_err(ERRCODE_NOT_FOUND, errbuf, errlen,
			    "target: no active target '%s'", q->target);
		site_target_init(&tg[0]);
		snprintf(tg[0].id, sizeof tg[0].id, "%s", PLAN_MOON_ID);
		snprintf(tg[0].name, sizeof tg[0].name, "Moon (centre)");
		wt[0].body = NULL;
		wt[0].dark_only = 0;
		nt = 1;
	}

	/* Span and track. */
	if (!isfinite(q->from_mjd) || !isfinite(q->to_mjd) ||
	    !(q->to_mjd > q->from_mjd))
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "%s: the span must end after it starts", "to");
	/* Earth orientation: the table at the span's middle, else as given. */
	eop = q->eop;
	out->dut1_source = (eop.dut1 != 0.0 || eop.xp != 0.0 ||
	    eop.yp != 0.0) ? "option" : "none";
	if (q->eop_rows != NULL && q->neop > 0) {
		struct eop_table et = {q->eop_rows, q->neop};
		struct geom_eop e2;

		if (eop_lookup(&et, 0.5 * (q->from_mjd + q->to_mjd), &e2) ==
		    EOP_SOURCE_TABLE) {
			eop = e2;
			out->dut1_source = "table";
		}
	}
	if (tscale_from_utc(TEXT_MJD0, q->from_mjd, eop.dut1, &a) !=
	    ERRCODE_OK || tscale_from_utc(TEXT_MJD0, q->to_mjd, eop.dut1, &b) !=
	    ERRCODE_OK)
		return text_err(ERRCODE_BAD_TIME, errbuf, errlen,
		    "%s: outside the convertible range", "from/to");
	span = tscale_tt_diff(a.tt1, a.tt2, b.tt1, b.tt2) / ERFA_DAYSEC;
	if (span > WINDOW_MAX_SPAN_DAYS)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "to: span longer than %.0f days",
		    WINDOW_MAX_SPAN_DAYS);
	nn = window_track_nodes(span);
	nodes = mem_calloc(nn, sizeof nodes[0]);
	counts = mem_calloc((nt + 1) * (size_t)nb, sizeof counts[0]);
	out->models = mem_calloc(nt, sizeof out->models[0]);
	if (q->nblackouts > 0)
		bo = mem_calloc(q->nblackouts, sizeof bo[0]);
	if (nodes == NULL || counts == NULL || out->models == NULL ||
	    (q->nblackouts > 0 && bo == NULL)) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	rc = window_track_init(&tr, &site, &eop, a.tt1, a.tt2, span, nodes,
	    nn);
	if (rc != ERRCODE_OK) {
		text_err(rc, errbuf, errlen, "%s: cannot tabulate the span",
		    "from/to");
		goto out;
	}
	for (size_t i = 0; i < q->nblackouts; i++) {
		double s0, s1;

		if (offset_of(&tr, q->blackouts[i].start_mjd, &s0) ||
		    offset_of(&tr, q->blackouts[i].end_mjd, &s1))
			continue;
		if (s1 <= 0.0 || s0 >= span || !(s1 > s0))
			continue;
		bo[nbo].start = s0;
		bo[nbo++].end = s1;
	}

	/* The log's statistics: given, or built from the arrays. */
	if (ls == NULL) {
		if ((rc = logstats_build(&built, st, nb, q->attempts,
		    q->nattempts, q->nps, q->nnps)) != ERRCODE_OK) {
			(void)text_err(rc, errbuf, errlen, "log: %s",
			    errcode_str(rc));
			goto out;
		}
		ls = &built;
	} else if (!logstats_current(ls, st, nb)) {
		rc = text_err(ERRCODE_BAD_ARG, errbuf, errlen, "log "
		    "statistics: taken under another zenith tau, seeing or "
		    "number of bins than the query's");
		goto out;
	}

	/* Coverage counts: normal points and the log's normal points. */
	memcpy(counts + nt * (size_t)nb, ls->e[0].counts,
	    (size_t)nb * sizeof counts[0]);
	for (size_t j = 0; j < nt; j++) {
		const struct logstats_entry *e = logstats_find(ls, tg[j].id);

		if (e != NULL)
			memcpy(counts + j * (size_t)nb, e->counts,
			    (size_t)nb * sizeof counts[0]);
	}
	memcpy(out->pooled, counts + nt * (size_t)nb,
	    (size_t)nb * sizeof counts[0]);

	/* Yield model, fitted over every active target whatever --target
	   selects: the pooled base rate and sunlit factor (the priors of
	   each target) must not depend on which windows are listed. */
	rc = fit_all(q, ls, tg, nt, yield, &out->model);
	if (rc != ERRCODE_OK) {
		if (rc == ERRCODE_BAD_ARG)
			text_err(rc, errbuf, errlen, "%s: a target strength is "
			    "not positive", "targets");
		goto out;
	}
	out->nmodels = nt;
	for (size_t j = 0; j < nt; j++) {
		copy_id(out->models[j].id, tg[j].id);
		out->models[j].strength = tg[j].strength;
		out->models[j].y = yield[j];
	}

	/* Windows: a first guess of the room, then exactly what is needed. */
	lim.min_el = st->min_el_deg * ERFA_DD2R;
	lim.max_sun_el = st->max_sun_el_deg * ERFA_DD2R;
	lim.min_sun_sep = st->min_sun_sep_deg * ERFA_DD2R;
	cap = (size_t)(span * 2.0 + 8.0) * nt;
	if (cap > PLAN_MAX_WINDOWS)
		cap = PLAN_MAX_WINDOWS;
	for (;;) {
		win = mem_calloc(cap, sizeof win[0]);
		if (win == NULL) {
			rc = ERRCODE_NOMEM;
			goto out;
		}
		rc = window_find(&tr, &lim, wt, nt, bo, nbo, win, cap, &nw);
		if (rc != ERRCODE_TOO_LARGE || nw > PLAN_MAX_WINDOWS)
			break;
		mem_free(win);
		cap = nw;
	}
	if (rc != ERRCODE_OK) {
		text_err(rc, errbuf, errlen,
		    "%s: too many windows; shorten the "
		    "span", "to");
		goto out;
	}
	sw = mem_calloc(nw, sizeof sw[0]);
	if (sw == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	{
		struct score_params sp;

		sp.tr = &tr;
		sp.s = &q->settings;
		sp.tau = st->zenith_tau;
		sp.fire_rate_hz = st->fire_rate_hz;
		for (size_t i = 0; i < nw; i++) {
			struct score_target t;
			size_t j = win[i].target;

			t.body = wt[j].body;
			t.yield = yield[j];
			t.counts = q->settings.per_target ?
			    counts + j * (size_t)nb : counts + nt * (size_t)nb;
			rc = score_window(&sp, &t, &win[i], &sw[i]);
			if (rc != ERRCODE_OK)
				goto out;
		}
	}
	score_rank(sw, nw);
	keep = (q->limit > 0 && q->limit < nw) ? q->limit : nw;
	out->total = nw;
	out->w = mem_calloc(keep, sizeof out->w[0]);
	if (out->w == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	/* Lunar eclipses of the span, searched on the track: the windows
	   that overlap one say so first.  P1..P4 lie within 0.14 d of
	   greatest eclipse, so 0.2 d of margin holds every eclipse that
	   can overlap the span. */
	if (eclipse_find_track(&tr.ft, -0.2, span + 0.2, out->ecl,
	    PLAN_MAX_ECLIPSES, &out->necl) != ERRCODE_OK)
		out->necl = 0;
	for (size_t i = 0; i < keep; i++) {
		struct plan_window *pw = &out->w[i];

		pw->f = sw[i];
		copy_id(pw->target, tg[sw[i].target].id);
		pw->start_mjd = mjd_of(&tr, sw[i].start);
		pw->end_mjd = mjd_of(&tr, sw[i].end);
		pw->max_el_mjd = mjd_of(&tr, sw[i].max_el_t);
		explain_eclipse(pw, &tr, out->ecl, out->necl, sw[i].start,
		    sw[i].end);
		plan_physics_fill(&tr, sw[i].start, sw[i].end, sw[i].max_el_t,
		    &bodies[sw[i].target], &tg[sw[i].target], out->ecl, out->necl,
		    &pw->phys);
		if (strcmp(pw->target, PLAN_MOON_ID) == 0)
			pw->phys.tilt_deg = pw->phys.spread_ps = NAN;
		explain(pw, &out->models[sw[i].target], &q->settings,
		    st->zenith_tau);
	}
	out->n = keep;
	out->eop = eop;
	out->from_mjd = q->from_mjd;
	out->to_mjd = q->to_mjd;
	out->station = *st;
	out->settings = q->settings;
	rc = ERRCODE_OK;
out:
	mem_free(nodes);
	mem_free(counts);
	mem_free(bo);
	mem_free(win);
	mem_free(sw);
	logstats_free(&built);
	if (rc != ERRCODE_OK)
		plan_result_free(out);
	return rc;
}
