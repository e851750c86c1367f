/* SPDX-License-Identifier: BSD-3-Clause */
/* covquery.c: load records from the store, bin them, find fill dates and
   render the coverage audit. */
#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfam.h>

#include "covquery.h"
#include "render_cov.h"
#include "score.h"
#include "store.h"
#include "tscale.h"
#include "window.h"

#define MJD0 2400000.5

void
covquery_params_init(struct covquery_params *p)
{
	memset(p, 0, sizeof *p);
	coverage_spec_init(&p->spec);
	p->horizon_days = COVQUERY_HORIZON_DEFAULT;
	p->now_mjd = NAN;
}

static int
valid_word(const char *s, size_t max)
{
	size_t n = strlen(s);

	if (n == 0 || n >= max)
		return 0;
	for (; *s; s++)
		if (!isalnum((unsigned char)*s) && *s != '_' && *s != '-' &&
		    *s != '.')
			return 0;
	return 1;
}

static enum errcode
bad(char *errbuf, size_t errlen, const char *name, const char *value,
    const char *want)
{
	if (errbuf != NULL && errlen > 0)
		snprintf(errbuf, errlen, "%s: '%.60s' %s", name, value, want);
	return ERRCODE_BAD_ARG;
}

static enum errcode
parse_mjd(const char *name, const char *value, double *mjd, char *errbuf,
    size_t errlen)
{
	char err[160];
	double u1, u2;

	if (tscale_parse_utc(value, &u1, &u2, err, sizeof err) != ERRCODE_OK) {
		if (errbuf != NULL && errlen > 0)
			snprintf(errbuf, errlen, "%s: %s", name, err);
		return ERRCODE_BAD_ARG;
	}
	*mjd = (u1 - MJD0) + u2;
	return ERRCODE_OK;
}

static enum errcode
parse_whole(const char *s, long min, long max, long *out)
{
	long v = 0;

	if (*s == '\0' || strlen(s) > 10)
		return ERRCODE_BAD_ARG;
	for (const char *c = s; *c; c++) {
		if (!isdigit((unsigned char)*c))
			return ERRCODE_BAD_ARG;
		v = v * 10 + (*c - '0');
	}
	if (v < min || v > max)
		return ERRCODE_BAD_ARG;
	*out = v;
	return ERRCODE_OK;
}

enum errcode
covquery_param_set(struct covquery_params *p, const char *name,
    const char *value, char *errbuf, size_t errlen)
{
	struct coverage_spec *s = &p->spec;
	long v;
	int k;

	if (value == NULL)
		value = "";
	if (strcmp(name, "source") == 0) {
		if ((k = coverage_source_parse(value)) < 0)
			return bad(errbuf, errlen, name, value,
			    "is not normal_points or attempts");
		s->source = (enum coverage_source)k;
	} else if (strcmp(name, "axis") == 0) {
		if ((k = coverage_axis_parse(value)) < 0)
			return bad(errbuf, errlen, name, value, "is not synodic, "
			    "anomaly, latitude or hour_angle");
		s->axis = (enum coverage_axis)k;
	} else if (strcmp(name, "bins") == 0) {
		if (parse_whole(value, COVERAGE_BINS_MIN, COVERAGE_BINS_MAX, &v))
			return bad(errbuf, errlen, name, value,
			    "is not a whole number in 4..72");
		s->nbins = (int)v;
	} else if (strcmp(name, "min_count") == 0) {
		if (parse_whole(value, 1, 1000000000L, &v))
			return bad(errbuf, errlen, name, value,
			    "is not a whole number >= 1");
		s->min_count = v;
	} else if (strcmp(name, "since") == 0) {
		return parse_mjd(name, value, &s->since_mjd, errbuf, errlen);
	} else if (strcmp(name, "until") == 0) {
		return parse_mjd(name, value, &s->until_mjd, errbuf, errlen);
	} else if (strcmp(name, "target") == 0) {
		if (!valid_word(value, sizeof s->target))
			return bad(errbuf, errlen, name, value, "is not a target "
			    "id (1-32 letters, digits, '_', '-', '.')");
		snprintf(s->target, sizeof s->target, "%s", value);
	} else if (strcmp(name, "station") == 0) {
		if (!valid_word(value, sizeof s->station))
			return bad(errbuf, errlen, name, value,
			    "is not a station code (1-15 letters or digits)");
		snprintf(s->station, sizeof s->station, "%s", value);
	} else if (strcmp(name, "horizon") == 0) {
		if (parse_whole(value, 0, (long)COVQUERY_HORIZON_MAX, &v))
			return bad(errbuf, errlen, name, value,
			    "is not a whole number of days in 0..366");
		p->horizon_days = (double)v;
	} else {
		if (errbuf != NULL && errlen > 0)
			snprintf(errbuf, errlen, "unknown parameter '%.40s'",
			    name);
		return ERRCODE_NOT_FOUND;
	}
	return ERRCODE_OK;
}

/* The station as the geometry core wants it. */
static enum errcode
site_of(const struct site_station *st, struct geom_site *site)
{
	struct geom_weather wx;

	geom_weather_standard(st->height_m, &wx);
	if (isfinite(st->pressure_hpa))
		wx.pressure_hpa = st->pressure_hpa;
	if (isfinite(st->temperature_c))
		wx.temperature_c = st->temperature_c;
	if (isfinite(st->humidity))
		wx.humidity = st->humidity;
	if (isfinite(st->wavelength_nm) && st->wavelength_nm > 0)
		wx.wavelength_um = st->wavelength_nm / 1000.0;
	return geom_site_init(site, st->lat_deg * ERFA_DD2R,
	    st->lon_deg * ERFA_DD2R, st->height_m, &wx);
}

/* --- what would fill the gaps: the window planner over the horizon --- */

/* Everything the planner holds for one horizon, freed at one place. */
struct plan {
	struct site_target *targets;
	size_t nt;
	struct geom_target *bodies;
	struct window_target *wt;
	struct score_yield *yield;
	struct site_attempt *att;
	size_t na;
	struct site_blackout *bo;
	size_t nbo;
	struct window_interval *iv;
	struct window_node *nodes;
	struct window *win;
	struct coverage_window *cw;
	struct coverage_result *w_counts;	/* synodic counts for W */
};

static void
plan_free(struct plan *pl)
{
	mem_free(pl->targets);
	mem_free(pl->bodies);
	mem_free(pl->wt);
	mem_free(pl->yield);
	mem_free(pl->att);
	mem_free(pl->bo);
	mem_free(pl->iv);
	mem_free(pl->nodes);
	mem_free(pl->win);
	mem_free(pl->cw);
	mem_free(pl->w_counts);
}

/* n elements of size sz, NULL-safe for n = 0. */
static void *
alloc_n(size_t n, size_t sz)
{
	return mem_calloc(n ? n : 1, sz);
}

/* TT offset (days since the track base) of a UTC MJD. */
static double
tt_offset(const struct window_track *tr, double utc_mjd)
{
	struct tscale_instant t;

	if (tscale_from_utc(MJD0, utc_mjd, 0.0, &t) != ERRCODE_OK)
		return NAN;
	return tscale_tt_diff(tr->base1, tr->base2, t.tt1, t.tt2) / 86400.0;
}

/* UTC MJD of a TT offset on the track. */
static double
utc_of_offset(const struct window_track *tr, double off)
{
	struct tscale_instant t;

	if (tscale_from_tt(tr->base1, tr->base2 + off, 0.0, &t) != ERRCODE_OK)
		return NAN;
	return (t.utc1 - MJD0) + t.utc2;
}

/*
 * Plan every window of the station's active targets over the horizon,
 * score each one as the planner does (yield learned from the log, the
 * coverage weight of the station's settings) and hand them to the
 * coverage core, which keeps those falling in bins below the threshold.
 */
static enum errcode
plan_fill(struct store *db, const struct site_station *st,
    const struct covquery_params *p, const struct coverage_result *res,
    struct coverage_fill *fill, char *errbuf, size_t errlen)
{
	struct plan pl;
	struct store_settings set;
	struct score_settings ss;
	struct score_model model;
	struct score_params sp;
	struct window_limits lim;
	struct window_track tr;
	struct coverage_spec ws;
	struct coverage_input in;
	struct site_normal_point *np = NULL;
	struct store_query q;
	struct tscale_instant t0;
	size_t nn, cap, nw = 0, nnp = 0, k = 0;
	double from = p->now_mjd, to = p->now_mjd + p->horizon_days;
	enum errcode rc;

	memset(&pl, 0, sizeof pl);
	if ((rc = store_settings_get(db, &set, errbuf, errlen)) != ERRCODE_OK)
		return rc;
	score_settings_default(&ss);
	ss.nbins = set.coverage_bins;
	ss.alpha = set.coverage_alpha;
	ss.k = set.coverage_k;
	ss.per_target = set.coverage_per_target;

	if ((rc = store_targets_list(db, 1, &pl.targets, &pl.nt, errbuf,
	    errlen)) != ERRCODE_OK)
		goto out;
	if (pl.nt > WINDOW_MAX_TARGETS)
		pl.nt = WINDOW_MAX_TARGETS;
	pl.bodies = alloc_n(pl.nt, sizeof *pl.bodies);
	pl.wt = alloc_n(pl.nt, sizeof *pl.wt);
	pl.yield = alloc_n(pl.nt, sizeof *pl.yield);
	pl.w_counts = mem_alloc(sizeof *pl.w_counts);
	if (!pl.bodies || !pl.wt || !pl.yield || !pl.w_counts) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	for (size_t j = 0; j < pl.nt; j++) {
		const struct site_target *t = &pl.targets[j];

		if ((rc = geom_target_from_selen(t->lat_deg * ERFA_DD2R,
		    t->lon_deg * ERFA_DD2R, t->height_m, &pl.bodies[j])))
			goto out;
		pl.wt[j].body = &pl.bodies[j];
		pl.wt[j].dark_only = t->dark_only;
	}

	/* The yield model from the whole log, the weight from every normal
	   point on the synodic angle (the planner's own inputs). */
	store_query_init(&q);
	if ((rc = store_attempts_list(db, &q, &pl.att, &pl.na, errbuf,
	    errlen)) != ERRCODE_OK)
		goto out;
	if ((rc = score_fit(&ss, st->zenith_tau, pl.targets, pl.nt, pl.att,
	    pl.na, pl.yield, &model)) != ERRCODE_OK)
		goto out;
	if ((rc = store_nps_list(db, &q, &np, &nnp, errbuf, errlen)))
		goto out;
	coverage_spec_init(&ws);
	ws.nbins = ss.nbins;
	snprintf(ws.own_station, sizeof ws.own_station, "%s", st->code);
	in.np = np;
	in.nnp = nnp;
	in.att = pl.att;
	in.natt = pl.na;
	rc = coverage_compute(&ws, &in, pl.w_counts);
	mem_free(np);
	if (rc != ERRCODE_OK)
		goto out;

	/* The track over the horizon (DUT1 taken as 0: < 1 s on edges). */
	if ((rc = tscale_from_utc(MJD0, from, 0.0, &t0)) != ERRCODE_OK)
		goto out;
	nn = window_track_nodes(p->horizon_days);
	if ((pl.nodes = alloc_n(nn, sizeof *pl.nodes)) == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	if ((rc = window_track_init(&tr, &res->spec.site, NULL, t0.tt1, t0.tt2,
	    p->horizon_days, pl.nodes, nn)) != ERRCODE_OK)
		goto out;
	if ((rc = store_blackouts_list(db, from, to, &pl.bo, &pl.nbo, errbuf,
	    errlen)) != ERRCODE_OK)
		goto out;
	if ((pl.iv = alloc_n(pl.nbo, sizeof *pl.iv)) == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	for (size_t i = 0; i < pl.nbo; i++) {
		pl.iv[i].start = tt_offset(&tr, pl.bo[i].start_mjd);
		pl.iv[i].end = tt_offset(&tr, pl.bo[i].end_mjd);
	}
	lim.min_el = st->min_el_deg * ERFA_DD2R;
	lim.max_sun_el = st->max_sun_el_deg * ERFA_DD2R;
	lim.min_sun_sep = st->min_sun_sep_deg * ERFA_DD2R;

	cap = pl.nt * (size_t)(p->horizon_days + 2.0) * 2 + 16;
	for (int pass = 0; pass < 2; pass++) {
		mem_free(pl.win);
		if ((pl.win = alloc_n(cap, sizeof *pl.win)) == NULL) {
			rc = ERRCODE_NOMEM;
			goto out;
		}
		rc = window_find(&tr, &lim, pl.wt, pl.nt, pl.iv, pl.nbo, pl.win,
		    cap, &nw);
		if (rc != ERRCODE_TOO_LARGE)
			break;
		cap = nw;
	}
	if (rc != ERRCODE_OK)
		goto out;

	if ((pl.cw = alloc_n(nw, sizeof *pl.cw)) == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	sp.tr = &tr;
	sp.s = &ss;
	sp.tau = st->zenith_tau;
	sp.fire_rate_hz = st->fire_rate_hz;
	for (size_t i = 0; i < nw; i++) {
		const struct window *w = &pl.win[i];
		const struct coverage_counts *cc = &pl.w_counts->pooled;
		struct score_target stg;
		struct score_window sw;

		if (ss.per_target)
			for (size_t j = 0; j < pl.w_counts->ntargets; j++)
				if (strcmp(pl.w_counts->targets[j].id,
				    pl.targets[w->target].id) == 0)
					cc = &pl.w_counts->targets[j].c;
		stg.body = &pl.bodies[w->target];
		stg.yield = pl.yield[w->target];
		stg.counts = cc->n;
		if ((rc = score_window(&sp, &stg, w, &sw)) != ERRCODE_OK)
			goto out;
		snprintf(pl.cw[k].target, sizeof pl.cw[k].target, "%s",
		    pl.targets[w->target].id);
		pl.cw[k].start_mjd = utc_of_offset(&tr, w->start);
		pl.cw[k].end_mjd = utc_of_offset(&tr, w->end);
		pl.cw[k].score = sw.score;
		if (isfinite(pl.cw[k].start_mjd) && isfinite(pl.cw[k].end_mjd))
			k++;
	}
	rc = coverage_fill_compute(res, pl.cw, k, from, to, fill);
out:
	plan_free(&pl);
	return rc;
}

enum errcode
covquery_run(struct store *db, const struct covquery_params *p,
    enum covquery_format fmt, struct mbuf *out, char *errbuf,
    size_t errlen)
{
	struct coverage_result *res = NULL;
	struct coverage_fill *fill = NULL;
	struct coverage_spec spec = p->spec;
	struct site_normal_point *np = NULL;
	struct site_attempt *att = NULL;
	struct site_station st;
	struct site_target tg;
	struct store_query q;
	struct coverage_input in;
	struct render_cov rc;
	int have_station;
	enum errcode rc_;
	size_t nnp = 0, natt = 0;

	if ((rc_ = coverage_spec_check(&spec, errbuf, errlen)) != ERRCODE_OK)
		return rc_;
	rc_ = store_station_get(db, &st, errbuf, errlen);
	if (rc_ != ERRCODE_OK && rc_ != ERRCODE_NOT_FOUND)
		return rc_;
	have_station = rc_ == ERRCODE_OK;
	if (have_station) {
		snprintf(spec.own_station, sizeof spec.own_station, "%s",
		    st.code);
		if (site_of(&st, &spec.site) != ERRCODE_OK)
			have_station = 0;
	}
	if (!have_station && spec.axis == COVERAGE_AXIS_HOUR_ANGLE) {
		if (errbuf != NULL && errlen > 0)
			snprintf(errbuf, errlen, "axis: hour_angle needs the "
			    "station in the database (moonrange init)");
		return ERRCODE_BAD_ARG;
	}
	if (spec.target[0] != '\0') {
		rc_ = store_target_get(db, spec.target, &tg, NULL, 0);
		if (rc_ == ERRCODE_NOT_FOUND) {
			if (errbuf != NULL && errlen > 0)
				snprintf(errbuf, errlen, "target: no target "
				    "'%s' in the database", spec.target);
			return rc_;
		}
		if (rc_ != ERRCODE_OK)
			return rc_;
	}

	store_query_init(&q);
	q.since_mjd = spec.since_mjd;
	q.until_mjd = spec.until_mjd;
	q.target = spec.target[0] ? spec.target : NULL;
	q.station_code = spec.station[0] ? spec.station : NULL;
	if (spec.source == COVERAGE_SOURCE_NORMAL_POINTS &&
	    (rc_ = store_nps_list(db, &q, &np, &nnp, errbuf, errlen)))
		goto out;
	/* The store selects attempts by start; the audit counts them at
	   their mid-time, so look one day further back (attempts are
	   shorter) and let the core apply the exact bound. */
	q.station_code = NULL;
	if (!isnan(q.since_mjd))
		q.since_mjd -= 1.0;
	if (spec.station[0] == '\0' || strcmp(spec.station,
	    spec.own_station) == 0) {
		if ((rc_ = store_attempts_list(db, &q, &att, &natt, errbuf,
		    errlen)))
			goto out;
	}

	if ((res = mem_alloc(sizeof *res)) == NULL) {
		rc_ = ERRCODE_NOMEM;
		goto out;
	}
	in.np = np;
	in.nnp = nnp;
	in.att = att;
	in.natt = natt;
	if ((rc_ = coverage_compute(&spec, &in, res)) != ERRCODE_OK) {
		if (rc_ == ERRCODE_TOO_LARGE && errbuf != NULL && errlen > 0)
			snprintf(errbuf, errlen, "more than %d targets or %d "
			    "years match: narrow the query with --target, "
			    "--since or --until", COVERAGE_MAX_TARGETS,
			    COVERAGE_MAX_YEARS);
		goto out;
	}

	memset(&rc, 0, sizeof rc);
	rc.r = res;
	rc.station_name = have_station ? st.name : NULL;
	rc.time_zone = have_station ? st.time_zone : NULL;
	if (p->horizon_days > 0 && !have_station) {
		rc.fill_note = "No gap-filling dates: the database has no "
		    "station to plan for.";
	} else if (p->horizon_days > 0 && !isfinite(p->now_mjd)) {
		rc.fill_note = "No gap-filling dates: no start time given.";
	} else if (p->horizon_days > 0) {
		if ((fill = mem_alloc(sizeof *fill)) == NULL) {
			rc_ = ERRCODE_NOMEM;
			goto out;
		}
		if ((rc_ = plan_fill(db, &st, p, res, fill, errbuf, errlen)))
			goto out;
		rc.fill = fill;
	}
	switch (fmt) {
	case COVQUERY_JSON:
		rc_ = render_cov_json(&rc, out);
		break;
	case COVQUERY_CSV:
		rc_ = render_cov_csv(&rc, out);
		break;
	case COVQUERY_SVG:
		rc_ = render_cov_svg(&rc, out);
		break;
	case COVQUERY_TEXT:
	default:
		rc_ = render_cov_text(&rc, out);
		break;
	}
out:
	mem_free(fill);
	mem_free(res);
	mem_free(np);
	mem_free(att);
	return rc_;
}
