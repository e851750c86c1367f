/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_tonight.c: "moonrange tonight", the coming night at the station. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfam.h>

#include "cli/cli.h"
#include "core/geom.h"
#include "core/plan.h"
#include "core/text.h"
#include "cli/plan_cli.h"
#include "query/winquery.h"
#include "formats/render_time.h"
#include "formats/render_plan.h"

/* Minutes since local midnight of a UTC MJD in zone tz. */
static enum errcode
local_minutes(double mjd, const char *tz, double *min)
{
	char buf[48];
	int hh, mm;
	int y, mo, d, h, mi;
	double sec;

	if (render_local_time(TEXT_MJD0, mjd, tz, buf, sizeof buf) != ERRCODE_OK ||
	    sscanf(buf + 11, "%2d:%2d", &hh, &mm) != 2 ||
	    tscale_utc_fields(TEXT_MJD0, mjd, &y, &mo, &d, &h, &mi, &sec) !=
	    ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	*min = hh * 60.0 + mm + sec / 60.0;
	return ERRCODE_OK;
}

/* The UTC MJD of the local noon at or before mjd (one DST correction). */
static enum errcode
noon_before(double mjd, const char *tz, double *out)
{
	double m, t;

	if (local_minutes(mjd, tz, &m) != ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	m -= 720.0;
	if (m < 0)
		m += 1440.0;
	t = mjd - m / 1440.0;
	if (local_minutes(t, tz, &m) != ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	if (m > 1080.0)		/* DST moved it back past midnight */
		m -= 1440.0;
	*out = t - (m - 720.0) / 1440.0;
	return ERRCODE_OK;
}

/* Does a window of the night q (limit 0) end after now?  On a planning
   error, yes: plan_cli_run then reports it. */
static int
night_ahead(const struct plan_query *q, double now)
{
	struct plan_result r;
	int ahead = 0;

	if (plan_run(q, &r, NULL, 0) != ERRCODE_OK)
		return 1;
	for (size_t i = 0; i < r.n && !ahead; i++)
		ahead = r.w[i].end_mjd > now;
	plan_result_free(&r);
	return ahead;
}

static int
run(const struct cli_args *a)
{
	const char *tz;
	double now1, now2, now, from, to;
	int have_at = cli_time(a, "at", &now1, &now2);
	int json = cli_given(a, "json"), st;
	struct plan_cli_opts o = {NULL, NULL, 0, 0, 0, 0, NULL};
	struct winquery_params wp;
	char err[256];
	struct plan_query q;
	struct plan_db hold;
	struct render_plan rp;
	struct tscale_instant ti;

	if ((st = plan_cli_site(a, &o)) != CLI_EXIT_OK)
		return st;
	tz = o.tz;
	if (o.have_station && tz == NULL)
		return cli_usage_error("--tz: required with --station (an IANA "
		    "zone such as America/Denver)");
	if (!have_at)
		cli_now(&now1, &now2);
	now = (now1 - TEXT_MJD0) + now2;

	st = plan_cli_load(o.db, o.lat, o.lon, o.h, &q, &hold);
	if (st != CLI_EXIT_OK)
		return st;
	if (o.db != NULL) {
		if (tz == NULL)
			tz = q.station.time_zone;
		if (!render_zone_known(tz)) {
			plan_db_free(&hold);
			return cli_usage_error("station time_zone: unknown zone "
			    "'%s' (give --tz)", tz);
		}
	}
	if (noon_before(now, tz, &from) != ERRCODE_OK ||
	    noon_before(from + 1.5, tz, &to) != ERRCODE_OK) {
		plan_db_free(&hold);
		return cli_fail("cannot find local noon in zone %s", tz);
	}
	q.from_mjd = from;
	q.to_mjd = to;
	if (now - from > 0.5 && !night_ahead(&q, now)) {
		/* Past local midnight and this night is over: the next. */
		from = to;
		if (noon_before(from + 1.5, tz, &to) != ERRCODE_OK) {
			plan_db_free(&hold);
			return cli_fail("cannot find local noon in zone %s", tz);
		}
		q.from_mjd = from;
		q.to_mjd = to;
	}
	winquery_params_init(&wp, QPARAM_OPTION, now);
	wp.limit = 12;
	if (o.limit != NULL && winquery_param_set(&wp, "limit", o.limit, err,
	    sizeof err) != ERRCODE_OK) {
		plan_db_free(&hold);
		return cli_usage_error("%s", err);
	}
	wp.span.from_mjd = from;
	wp.span.to_mjd = to;
	memset(&rp, 0, sizeof rp);
	rp.station_name = q.station.name[0] != '\0' ? q.station.name : NULL;
	rp.time_zone = tz;
	rp.now_mjd = now;
	rp.now_synodic_deg = 0.0;
	if (tscale_from_utc(TEXT_MJD0, now, 0.0, &ti) == ERRCODE_OK)
		rp.now_synodic_deg = geom_synodic_at(ti.tt1, ti.tt2) *
		    ERFA_DR2D;
	return plan_cli_run(&wp, &q, &hold, &rp, json ? render_windows_json :
	    render_tonight_text);
}

static const struct cli_option options[] = {
	PLAN_CLI_OPT_DB("the station database"),
	PLAN_CLI_OPT_STATION("an ad-hoc station (plans the Moon's centre)"),
	PLAN_CLI_OPT_TZ("IANA zone (with --station; overrides --db's)"),
	{.name = "at", .kind = CLI_TIME, .arg = "UTC",
	    .help = "take this as now (default: the clock)"},
	PLAN_CLI_OPT_LIMIT("the best N windows (default 12)"),
	{.name = "json", .kind = CLI_FLAG,
	    .help = "the same windows as 'windows --json'"},
	CLI_OPT_END
};

const struct cli_command cmd_tonight = {
	.name = "tonight",
	.summary = "the coming night: ranked windows, best target now",
	.about = "The night from local noon to local noon (the station's IANA "
	    "time zone) that holds now, or, after local midnight once its "
	    "last window is over, the next one: ranked windows with local "
	    "time and UTC side by side, the best target now, when that "
	    "changes next, and the coverage of the phase now.\n\n"
	    "A planning aid only: laser-safety, aircraft and satellite "
	    "avoidance rules of the station decide.",
	.options = options,
	.one_of = 1u << 1,
	.run = run,
};
