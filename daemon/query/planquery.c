/* SPDX-License-Identifier: BSD-3-Clause */
/* planquery.c: the night plan from the store: parameters, span, settings,
   planning and rendering, shared by the CLI and the HTTP API. */
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <string.h>

#include "core/text.h"
#include "core/tscale.h"
#include "formats/render_sched.h"
#include "formats/render_time.h"
#include "query/planquery.h"
#include "store/plan_db.h"
#include "store/store.h"
#include "query/qzone.h"

void
planquery_params_init(struct planquery_params *p, enum qparam_style style)
{
	memset(p, 0, sizeof *p);	/* fault NULL */
	p->style = style;
	p->at_mjd = NAN;
	p->from_mjd = NAN;
	p->to_mjd = NAN;
	p->method = SCHED_BEST;
}

/* ERRCODE_BAD_ARG with the sentence "NAME: " fmt..., NAME the canonical
   name (now p->fault) as p->style spells it. */
static enum errcode bad(struct planquery_params *p, const char *name,
    char *errbuf, size_t errlen, const char *fmt, ...) MEM_PRINTFLIKE(5, 6);

static enum errcode
bad(struct planquery_params *p, const char *name, char *errbuf,
    size_t errlen, const char *fmt, ...)
{
	char msg[240];
	va_list ap;

	va_start(ap, fmt);
	vsnprintf(msg, sizeof msg, fmt, ap);
	va_end(ap);
	p->fault = name;
	return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: %s",
	    qparam_name(p->style, name).s, msg);
}

static enum errcode
parse_mjd(struct planquery_params *p, const char *name, const char *value,
    double *mjd, char *errbuf, size_t errlen)
{
	char err[160];
	double u1, u2;

	if (tscale_parse_utc(value, &u1, &u2, err, sizeof err) != ERRCODE_OK)
		return bad(p, name, errbuf, errlen, "%s", err);
	*mjd = (u1 - TEXT_MJD0) + u2;
	return ERRCODE_OK;
}

enum errcode
planquery_param_set(struct planquery_params *p, const char *name,
    const char *value, char *errbuf, size_t errlen)
{
	if (value == NULL)
		value = "";
	p->fault = NULL;
	if (strcmp(name, "from") == 0)
		return parse_mjd(p, "from", value, &p->from_mjd, errbuf, errlen);
	if (strcmp(name, "to") == 0)
		return parse_mjd(p, "to", value, &p->to_mjd, errbuf, errlen);
	if (strcmp(name, "at") == 0)
		return parse_mjd(p, "at", value, &p->at_mjd, errbuf, errlen);
	if (strcmp(name, "method") == 0) {
		int m = night_method_parse(value);

		if (m < 0)
			return bad(p, "method", errbuf, errlen,
			    "'%.40s' is not best or greedy", value);
		p->method = (enum sched_method)m;
		return ERRCODE_OK;
	}
	return text_err(ERRCODE_NOT_FOUND, errbuf, errlen,
	    "unknown parameter '%.40s'", name);
}

/* Minutes since local midnight of a UTC MJD in zone tz. */
static enum errcode
local_minutes(double mjd, const char *tz, double *min)
{
	char buf[48];
	int hh, mm, y, mo, d, h, mi;
	double sec;

	if (qzone_format(tz, mjd, buf, sizeof buf) != ERRCODE_OK || sscanf(buf + 11, "%2d:%2d", &hh, &mm) != 2 ||
	    tscale_utc_fields(TEXT_MJD0, mjd, &y, &mo, &d, &h, &mi, &sec) !=
	    ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	*min = hh * 60.0 + mm + sec / 60.0;
	return ERRCODE_OK;
}

enum errcode
planquery_noon_after(double mjd, const char *tz, double *out)
{
	double m, t;

	if (local_minutes(mjd, tz, &m) != ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	m = 720.0 - m;
	if (m <= 1e-6)
		m += 1440.0;
	t = mjd + m / 1440.0;
	/* A change of the clock in between moves noon by its size. */
	if (local_minutes(t, tz, &m) != ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	if (m > 1080.0)
		m -= 1440.0;
	t -= (m - 720.0) / 1440.0;
	if (t <= mjd)
		t += 1.0;
	*out = t;
	return ERRCODE_OK;
}

enum errcode
planquery_span(struct planquery_params *p, const char *tz,
    double *from_mjd, double *to_mjd, char *errbuf, size_t errlen)
{
	int hf = isfinite(p->from_mjd), ht = isfinite(p->to_mjd);

	p->fault = NULL;
	if (hf != ht)
		return bad(p, hf ? "to" : "from", errbuf, errlen,
		    "give from and to together");
	if (hf) {
		struct night_settings ns;

		/* night_plan's own checks of the span, made here so that
		   the sentence names the parameter as the transport does */
		night_settings_default(&ns);
		if (!(p->to_mjd > p->from_mjd))
			return bad(p, "to", errbuf, errlen,
			    "must be after from");
		if (p->to_mjd - p->from_mjd > NIGHT_MAX_DAYS)
			return bad(p, "to", errbuf, errlen,
			    "a plan spans at most %.0f days", NIGHT_MAX_DAYS);
		if ((p->to_mjd - p->from_mjd) * 86400.0 / ns.grid_s +
		    1e-9 < 1.0)
			return bad(p, "to", errbuf, errlen,
			    "the span is shorter than one %.0f s slot",
			    ns.grid_s);
		*from_mjd = p->from_mjd;
		*to_mjd = p->to_mjd;
		return ERRCODE_OK;
	}
	if (!isfinite(p->at_mjd))
		return bad(p, "at", errbuf, errlen, "no time given");
	*from_mjd = p->at_mjd;
	if (planquery_noon_after(p->at_mjd, tz, to_mjd) != ERRCODE_OK) {
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "station time_zone: unknown zone '%.60s'",
		    tz != NULL ? tz : "");
	}
	return ERRCODE_OK;
}

enum errcode
planquery_settings(struct store *db, struct night_settings *s, char *errbuf,
    size_t errlen)
{
	struct store_settings set;
	enum errcode rc;

	night_settings_default(s);
	if ((rc = store_settings_get(db, &set, errbuf, errlen)) != ERRCODE_OK)
		return rc;
	s->value.model = set.value_bins ? VALUE_MODEL_BINS :
	    VALUE_MODEL_DESIGN;
	s->value.harmonics = set.value_harmonics;
	s->value.phase_weight = set.value_phase_weight;
	s->value.orientation_weight = set.value_orientation_weight;
	s->run_min_s = set.plan_run_min_s;
	s->run_max_s = set.plan_run_max_s;
	s->switch_s = set.plan_switch_s;
	s->cal_s = set.plan_calibration_s;
	s->cal_every_s = set.plan_calibration_every_s;
	return night_settings_check(s, errbuf, errlen);
}

enum errcode
planquery_night(struct store *db, double from_mjd, double to_mjd,
    enum sched_method method, struct night_result *out, char *errbuf,
    size_t errlen)
{
	struct plan_query q;
	struct plan_db hold;
	struct night_settings ns;
	enum errcode rc;

	memset(out, 0, sizeof *out);
	plan_query_init(&q);
	plan_db_init(&hold);
	if ((rc = plan_db_fill(db, &q, &hold, errbuf, errlen)) != ERRCODE_OK)
		return rc;
	if ((rc = planquery_settings(db, &ns, errbuf, errlen)) == ERRCODE_OK) {
		q.from_mjd = from_mjd;
		q.to_mjd = to_mjd;
		rc = night_plan(&q, &ns, method, out, errbuf, errlen);
	}
	plan_db_free(&hold);
	return rc;
}

enum errcode
planquery_run(struct store *db, struct planquery_params *p,
    enum planquery_format fmt, struct mbuf *out, char *errbuf, size_t errlen)
{
	struct tzone zone;
	struct site_station st;
	struct night_result r;
	struct render_sched rs;
	double from, to;
	enum errcode rc;

	rc = store_station_get(db, &st, errbuf, errlen);
	if (rc == ERRCODE_NOT_FOUND)
		return text_err(rc, errbuf, errlen, "the database holds no "
		    "station yet (run 'moonrange init')");
	if (rc != ERRCODE_OK)
		return rc;
	if ((rc = planquery_span(p, st.time_zone, &from, &to, errbuf,
	    errlen)) != ERRCODE_OK)
		return rc;
	if ((rc = planquery_night(db, from, to, p->method, &r, errbuf,
	    errlen)) != ERRCODE_OK)
		return rc;
	memset(&rs, 0, sizeof rs);
	rs.r = &r;
	rs.station_name = st.name;
	if (qzone_load(st.time_zone, from, to, &zone) == ERRCODE_OK)
		rs.time_zone = &zone;
	rs.now_mjd = isfinite(p->from_mjd) ? p->from_mjd : p->at_mjd;
	switch (fmt) {
	case PLANQUERY_JSON:
		rc = render_sched_json(&rs, out);
		break;
	case PLANQUERY_CSV:
		rc = render_sched_csv(&rs, out);
		break;
	case PLANQUERY_ICS:
		rc = render_sched_ics(&rs, out);
		break;
	case PLANQUERY_SVG:
		rc = render_sched_svg(&rs, out);
		break;
	case PLANQUERY_TEXT:
	default:
		rc = render_sched_text(&rs, out);
		break;
	}
	night_result_free(&r);
	return rc;
}
