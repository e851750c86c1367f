/* SPDX-License-Identifier: BSD-3-Clause */
/* covquery.c: load records from the store, bin them, find fill dates and
   render the coverage audit. */
#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfam.h>

#include "core/text.h"
#include "query/covquery.h"
#include "core/plan.h"
#include "store/plan_db.h"
#include "formats/render_cov.h"
#include "store/store.h"
#include "core/tscale.h"
#include "query/qzone.h"

void
covquery_params_init(struct covquery_params *p)
{
	memset(p, 0, sizeof *p);
	coverage_spec_init(&p->spec);
	p->horizon_days = COVQUERY_HORIZON_DEFAULT;
	p->now_mjd = NAN;
}

/* A bad value: the sentence names the parameter as the transport does. */
static enum errcode
bad(struct covquery_params *p, char *errbuf, size_t errlen,
    const char *name, const char *value, const char *want)
{
	p->fault = name;
	return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: '%.60s' %s",
	    qparam_name(p->style, name).s, value, want);
}

static enum errcode
parse_mjd(struct covquery_params *p, const char *name, const char *value,
    double *mjd, char *errbuf, size_t errlen)
{
	char err[160];
	double u1, u2;

	if (tscale_parse_utc(value, &u1, &u2, err, sizeof err) != ERRCODE_OK) {
		p->fault = name;
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: %s",
		    qparam_name(p->style, name).s, err);
	}
	*mjd = (u1 - TEXT_MJD0) + u2;
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
	p->fault = NULL;
	if (strcmp(name, "source") == 0) {
		if ((k = coverage_source_parse(value)) < 0)
			return bad(p, errbuf, errlen, name, value,
			    "is not normal_points or attempts");
		s->source = (enum coverage_source)k;
	} else if (strcmp(name, "axis") == 0) {
		if ((k = coverage_axis_parse(value)) < 0)
			return bad(p, errbuf, errlen, name, value, "is not synodic, "
			    "anomaly, latitude or hour_angle");
		s->axis = (enum coverage_axis)k;
	} else if (strcmp(name, "bins") == 0) {
		if (text_parse_long(value, COVERAGE_BINS_MIN, COVERAGE_BINS_MAX,
		    &v))
			return bad(p, errbuf, errlen, name, value,
			    "is not a whole number in 4..72");
		s->nbins = (int)v;
	} else if (strcmp(name, "min_count") == 0) {
		if (text_parse_long(value, 1, 1000000000L, &v))
			return bad(p, errbuf, errlen, name, value,
			    "is not a whole number >= 1");
		s->min_count = v;
	} else if (strcmp(name, "since") == 0) {
		return parse_mjd(p, name, value, &s->since_mjd, errbuf,
		    errlen);
	} else if (strcmp(name, "until") == 0) {
		return parse_mjd(p, name, value, &s->until_mjd, errbuf,
		    errlen);
	} else if (strcmp(name, "target") == 0) {
		if (!qparam_word(value, sizeof s->target))
			return bad(p, errbuf, errlen, name, value, "is not a target "
			    "id (1-32 letters, digits, '_', '-', '.')");
		snprintf(s->target, sizeof s->target, "%s", value);
	} else if (strcmp(name, "station") == 0) {
		if (!qparam_word(value, sizeof s->station))
			return bad(p, errbuf, errlen, name, value,
			    "is not a station code (1-15 letters or digits)");
		snprintf(s->station, sizeof s->station, "%s", value);
	} else if (strcmp(name, "horizon") == 0) {
		if (text_parse_long(value, 0, (long)COVQUERY_HORIZON_MAX, &v))
			return bad(p, errbuf, errlen, name, value,
			    "is not a whole number of days in 0..366");
		p->horizon_days = (double)v;
	} else if (strcmp(name, "theme") == 0) {
		if ((k = render_cov_theme_parse(value)) < 0)
			return bad(p, errbuf, errlen, name, value,
			    "is not light or dark");
		p->theme = (enum render_cov_theme)k;
	} else {
		return text_err(ERRCODE_NOT_FOUND, errbuf, errlen,
		    "unknown parameter '%.40s'", name);
	}
	return ERRCODE_OK;
}

enum errcode
covquery_params_check(struct covquery_params *p, char *errbuf,
    size_t errlen)
{
	const struct coverage_spec *s = &p->spec;

	p->fault = NULL;
	if (!isnan(s->since_mjd) && !isnan(s->until_mjd) &&
	    !(s->until_mjd > s->since_mjd)) {
		p->fault = "until";
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: must be "
		    "after %s", qparam_name(p->style, "until").s,
		    qparam_name(p->style, "since").s);
	}
	return coverage_spec_check(s, errbuf, errlen);
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

/*
 * Plan and score every window of the station's active targets over the
 * horizon exactly as "moonrange windows" does (plan_run), and hand them to
 * the coverage core, which keeps those falling in bins below the
 * threshold.
 */
static enum errcode
plan_fill(struct store *db, const struct covquery_params *p,
    const struct coverage_result *res, struct coverage_fill *fill,
    char *errbuf, size_t errlen)
{
	struct plan_query q;
	struct plan_db hold;
	struct plan_result pr;
	struct coverage_window *cw = NULL;
	enum errcode rc;

	plan_query_init(&q);
	plan_db_init(&hold);
	memset(&pr, 0, sizeof pr);
	if ((rc = plan_db_fill(db, &q, &hold, errbuf, errlen)) != ERRCODE_OK)
		return rc;
	q.from_mjd = p->now_mjd;
	q.to_mjd = p->now_mjd + p->horizon_days;
	q.target = res->spec.target[0] ? res->spec.target : NULL;
	q.limit = 0;
	if ((rc = plan_run(&q, &pr, errbuf, errlen)) != ERRCODE_OK)
		goto out;
	if ((cw = mem_calloc(pr.n ? pr.n : 1, sizeof *cw)) == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	for (size_t i = 0; i < pr.n; i++) {
		snprintf(cw[i].target, sizeof cw[i].target, "%s",
		    pr.w[i].target);
		cw[i].start_mjd = pr.w[i].start_mjd;
		cw[i].end_mjd = pr.w[i].end_mjd;
		cw[i].score = pr.w[i].f.score;
	}
	rc = coverage_fill_compute(res, cw, pr.n, q.from_mjd, q.to_mjd, fill);
out:
	mem_free(cw);
	plan_result_free(&pr);
	plan_db_free(&hold);
	return rc;
}

/* The audit fed one record at a time from the store. */
struct audit_walk {
	const struct coverage_spec *spec;
	struct coverage_result *res;
};

static enum errcode
audit_np(void *ctx, const struct site_normal_point *p)
{
	struct audit_walk *w = ctx;

	return coverage_add_np(w->spec, p, w->res);
}

static enum errcode
audit_attempt(void *ctx, const struct site_attempt *a)
{
	struct audit_walk *w = ctx;

	return coverage_add_attempt(w->spec, a, w->res);
}

enum errcode
covquery_run(struct store *db, struct covquery_params *p,
    enum covquery_format fmt, struct mbuf *out, char *errbuf,
    size_t errlen)
{
	struct coverage_result *res = NULL;
	struct coverage_fill *fill = NULL;
	struct coverage_spec spec = p->spec;
	struct audit_walk w;
	struct site_station st;
	struct site_target tg;
	struct store_query q;
	struct render_cov rc;
	static const double st_zone_epoch = 51544.5;	/* J2000, when no now */
	struct tzone zone;
	int have_station;
	enum errcode rc_;

	if ((rc_ = covquery_params_check(p, errbuf, errlen)) != ERRCODE_OK)
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
		p->fault = "axis";
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: "
		    "hour_angle needs the station in the database (moonrange "
		    "init)", qparam_name(p->style, "axis").s);
	}
	if (spec.target[0] != '\0') {
		rc_ = store_target_get(db, spec.target, &tg, NULL, 0);
		if (rc_ == ERRCODE_NOT_FOUND) {
			p->fault = "target";
			return text_err(rc_, errbuf, errlen, "%s: no target "
			    "'%s' in the database", qparam_name(p->style,
			    "target").s, spec.target);
		}
		if (rc_ != ERRCODE_OK)
			return rc_;
	}

	/* The records are streamed into the audit, never held: a log of
	   any length costs the same memory. */
	if ((res = mem_alloc(sizeof *res)) == NULL) {
		rc_ = ERRCODE_NOMEM;
		goto out;
	}
	if ((rc_ = coverage_begin(&spec, res)) != ERRCODE_OK)
		goto out;
	w.spec = &spec;
	w.res = res;
	store_query_init(&q);
	q.since_mjd = spec.since_mjd;
	q.until_mjd = spec.until_mjd;
	q.target = spec.target[0] ? spec.target : NULL;
	q.station_code = spec.station[0] ? spec.station : NULL;
	if (spec.source == COVERAGE_SOURCE_NORMAL_POINTS)
		rc_ = store_nps_each(db, &q, audit_np, &w, errbuf, errlen);
	/* The store selects attempts by start; the audit counts them at
	   their mid-time, so look one day further back (attempts are
	   shorter) and let the core apply the exact bound. */
	q.station_code = NULL;
	if (!isnan(q.since_mjd))
		q.since_mjd -= 1.0;
	if (rc_ == ERRCODE_OK && (spec.station[0] == '\0' ||
	    strcmp(spec.station, spec.own_station) == 0))
		rc_ = store_attempts_each(db, &q, audit_attempt, &w, errbuf,
		    errlen);
	if (rc_ != ERRCODE_OK) {
		if (rc_ == ERRCODE_TOO_LARGE)
			text_err(rc_, errbuf, errlen, "more than %d targets or "
			    "%d years match: narrow the query with %s, %s or %s",
			    COVERAGE_MAX_TARGETS, COVERAGE_MAX_YEARS,
			    qparam_name(p->style, "target").s,
			    qparam_name(p->style, "since").s,
			    qparam_name(p->style, "until").s);
		goto out;
	}
	coverage_end(&spec, res);

	memset(&rc, 0, sizeof rc);
	rc.r = res;
	rc.station_name = have_station ? st.name : NULL;
	if (have_station) {
		double z0 = isfinite(p->now_mjd) ? p->now_mjd : st_zone_epoch;

		if (qzone_load(st.time_zone, z0, z0 + p->horizon_days,
		    &zone) == ERRCODE_OK)
			rc.time_zone = &zone;
	}
	rc.theme = p->theme;
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
		if ((rc_ = plan_fill(db, p, res, fill, errbuf, errlen)))
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
	return rc_;
}
