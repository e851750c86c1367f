/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_tonight.c: "moonrange tonight", the coming night at the station. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfam.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "core/geom.h"
#include "core/plan.h"
#include "core/text.h"
#include "core/tscale.h"
#include "cli/plan_cli.h"
#include "core/night.h"
#include "formats/render_sched.h"
#include "formats/render_time.h"
#include "query/planquery.h"
#include "store/store.h"
#include "query/qzone.h"

/* Elevation and azimuth (deg) of target id now, from the station of q. */
static void
pointing_now(const struct plan_query *q, const char *id, double now,
    double *el, double *az)
{
	struct geom_site site;
	struct geom_instant g;
	struct geom_target body;
	struct geom_target_view v;

	*el = *az = NAN;
	if (plan_station_site(&q->station, &site) != ERRCODE_OK ||
	    geom_instant_at(&site, &q->eop, TEXT_MJD0, now, GEOM_PREC_FAST,
	    &g) != ERRCODE_OK)
		return;
	for (size_t i = 0; i < q->ntargets; i++) {
		const struct site_target *t = &q->targets[i];

		if (strcmp(t->id, id) != 0 ||
		    geom_target_from_selen(t->lat_deg * ERFA_DD2R,
		    t->lon_deg * ERFA_DD2R, t->height_m, &body) != ERRCODE_OK)
			continue;
		geom_target_view(&g, &body, &v);
		*el = v.el * ERFA_DR2D;
		*az = v.az * ERFA_DR2D;
		return;
	}
	*el = g.moon.el * ERFA_DR2D;	/* the Moon's centre */
	*az = g.moon.az * ERFA_DR2D;
}

#define NEXT_NIGHTS 30

/* UTC MJD of a TT JD (NaN if it cannot be converted). */
static double
mjd_of_tt(double tt1, double tt2)
{
	struct tscale_instant t;

	if (tscale_from_tt(tt1, tt2, 0.0, &t) != ERRCODE_OK)
		return NAN;
	return (t.utc1 - TEXT_MJD0) + t.utc2;
}

/* A line for each lunar eclipse whose P1..P4 overlaps [from, to) (UTC
   MJDs): a rare full-moon chance the operator should know of ahead. */
static void
eclipse_notice(double from, double to, struct mbuf *out)
{
	struct eclipse_event ev[4];
	struct tscale_instant a, b;
	size_t n = 0;

	if (tscale_from_utc(TEXT_MJD0, from - 0.5, 0.0, &a) != ERRCODE_OK ||
	    tscale_from_utc(TEXT_MJD0, to + 0.5, 0.0, &b) != ERRCODE_OK ||
	    eclipse_find(a.tt1, a.tt2, b.tt1, b.tt2, ev, 4, &n) != ERRCODE_OK)
		return;
	for (size_t i = 0; i < n; i++) {
		double p1 = mjd_of_tt(ev[i].contact_tt1[ECLIPSE_P1],
		    ev[i].contact_tt2[ECLIPSE_P1]);
		double p4 = mjd_of_tt(ev[i].contact_tt1[ECLIPSE_P4],
		    ev[i].contact_tt2[ECLIPSE_P4]);
		double g = mjd_of_tt(ev[i].greatest_tt1, ev[i].greatest_tt2);
		char gs[40], ps[40], qs[40];

		if (!(p4 > from && p1 < to) ||
		    tscale_format_utc(TEXT_MJD0, g, 0, gs, sizeof gs) ||
		    tscale_format_utc(TEXT_MJD0, p1, 0, ps, sizeof ps) ||
		    tscale_format_utc(TEXT_MJD0, p4, 0, qs, sizeof qs))
			continue;
		mbuf_printf(out, "Lunar eclipse tonight: %s, greatest %s\n"
		    "  (P1 %s, P4 %s): a rare full-moon chance; reflectors in "
		    "the\n  umbra are dark (moonrange eclipses).\n",
		    eclipse_kind_name(ev[i].kind), gs, ps + 11, qs + 11);
	}
}

int
cmd_tonight(const struct cli_args *a)
{
	static struct tzone zone;
	const char *night_tz, *show_tz;
	double now1, now2, now, to;
	int have_at = cli_time(a, "at", &now1, &now2);
	int json = cli_given(a, "json"), st;
	struct plan_cli_opts o = {NULL, NULL, 0, 0, 0, 0, NULL};
	long next_runs = 6;
	struct plan_query q;
	struct plan_db hold;
	struct night_settings ns;
	struct night_result r;
	struct render_sched rs;
	struct mbuf out;
	char err[300];
	enum errcode rc;

	if ((st = plan_cli_site(a, &o)) != CLI_EXIT_OK)
		return st;
	if (o.limit != NULL && text_parse_long(o.limit, 1, 1000, &next_runs) !=
	    ERRCODE_OK)
		return cli_usage_error("--limit: '%s' is not a whole number in "
		    "1..1000", o.limit);
	if (o.have_station && o.tz == NULL)
		return cli_usage_error("--tz: required with --station (an IANA "
		    "zone such as America/Denver)");
	if (!have_at)
		cli_now(&now1, &now2);
	now = (now1 - TEXT_MJD0) + now2;
	night_settings_default(&ns);
	if (o.db != NULL) {
		struct store *db = NULL;

		rc = store_open(o.db, STORE_OPEN_READONLY, &db, err, sizeof err);
		if (rc == ERRCODE_OK)
			rc = planquery_settings(db, &ns, err, sizeof err);
		store_close(db);
		if (rc == ERRCODE_NOT_FOUND)
			return cli_usage_error("--db: no database '%s'", o.db);
		if (rc != ERRCODE_OK)
			return cli_fail("--db '%s': %s", o.db, err);
	}
	st = plan_cli_load(o.db, o.lat, o.lon, o.h, &q, &hold);
	if (st != CLI_EXIT_OK)
		return st;
	/* The night is the station's; --tz changes the clock shown only. */
	night_tz = o.db != NULL ? q.station.time_zone : o.tz;
	show_tz = o.tz != NULL ? o.tz : night_tz;
	if (!qzone_known(night_tz)) {
		plan_db_free(&hold);
		return cli_usage_error("station time_zone: unknown zone '%s'",
		    night_tz);
	}
	if (planquery_noon_after(now, night_tz, &to) != ERRCODE_OK) {
		plan_db_free(&hold);
		return cli_fail("cannot find local noon in zone %s", night_tz);
	}
	q.from_mjd = now;
	q.to_mjd = to;
	memset(&rs, 0, sizeof rs);
	rs.now_el_deg = rs.now_az_deg = NAN;
	rs.next_night_mjd = NAN;
	rc = night_plan(&q, &ns, SCHED_BEST, &r, err, sizeof err);
	if (rc != ERRCODE_OK) {
		plan_db_free(&hold);
		return cli_status_of(rc) == CLI_EXIT_USAGE ?
		    cli_usage_error("tonight: %s", err) :
		    cli_fail("tonight: %s", err);
	}
	/* After local midnight with the night's runs over: tonight is the
	   coming night. */
	if (r.nruns == 0 && to - now < 0.5) {
		struct night_result n2;
		double from = to;

		if (planquery_noon_after(from, night_tz, &q.to_mjd) ==
		    ERRCODE_OK) {
			q.from_mjd = from;
			if (night_plan(&q, &ns, SCHED_BEST, &n2, NULL, 0) ==
			    ERRCODE_OK) {
				night_result_free(&r);
				r = n2;
			}
		}
	}
	/* Nothing tonight: when does a plannable night start? */
	for (int k = 0; k < NEXT_NIGHTS && r.nruns == 0 && !json; k++) {
		struct night_result n2;
		double from = q.to_mjd;

		if (planquery_noon_after(from, night_tz, &q.to_mjd) !=
		    ERRCODE_OK)
			break;
		q.from_mjd = from;
		if (night_plan(&q, &ns, SCHED_GREEDY, &n2, NULL, 0) !=
		    ERRCODE_OK)
			break;
		if (n2.nruns > 0)
			rs.next_night_mjd = n2.runs[0].start_mjd;
		night_result_free(&n2);
		if (isfinite(rs.next_night_mjd))
			break;
	}
	for (size_t i = 0; i < r.nruns; i++)
		if (!r.runs[i].calibration && r.runs[i].start_mjd <= now &&
		    now < r.runs[i].end_mjd)
			pointing_now(&q, r.runs[i].target, now, &rs.now_el_deg,
			    &rs.now_az_deg);
	rs.r = &r;
	rs.station_name = q.station.name[0] != '\0' ? q.station.name : NULL;
	if (qzone_load(show_tz, q.from_mjd, isfinite(rs.next_night_mjd) &&
	    rs.next_night_mjd > q.to_mjd ? rs.next_night_mjd + 1.0 : q.to_mjd,
	    &zone) == ERRCODE_OK)
		rs.time_zone = &zone;
	rs.now_mjd = now;
	rs.next_runs = (size_t)next_runs;
	mbuf_init(&out);
	rc = json ? render_sched_json(&rs, &out) :
	    render_sched_tonight(&rs, &out);
	if (rc == ERRCODE_OK && !json)
		eclipse_notice(q.from_mjd, q.to_mjd, &out);
	night_result_free(&r);
	plan_db_free(&hold);
	st = cli_emit_rendered(rc, &out);
	mbuf_free(&out);
	return st;
}
