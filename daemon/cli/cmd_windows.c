/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_windows.c: "moonrange windows", ranked observing windows in a span. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "core/plan.h"
#include "cli/plan_cli.h"
#include "query/winquery.h"
#include "formats/render_time.h"
#include "formats/render_plan.h"
#include "core/text.h"
#include "core/window.h"
#include "query/qzone.h"

/* The planner's default limits, for --help. */
void
cmd_windows_more(FILE *f)
{
	char text[400];

	snprintf(text, sizeof text, "With --station the Moon's centre is "
	    "planned as target \"moon\" with elevation >= %.0f, Sun <= %.0f "
	    "and Sun-Moon >= %.0f deg.  Elevations are geometric.  A planning "
	    "aid only: laser-safety, aircraft and satellite avoidance rules of "
	    "the station decide.", PLAN_DEFAULT_MIN_EL_DEG,
	    PLAN_DEFAULT_MAX_SUN_EL_DEG, PLAN_DEFAULT_MIN_SUN_SEP_DEG);
	fputc('\n', f);
	cli_wrap(f, text, 0, 0);
}

enum out_kind { OUT_TEXT, OUT_JSON, OUT_CSV, OUT_ICS };

int
cmd_windows(const struct cli_args *a)
{
	const char *tz;
	double now1, now2;
	int kind = cli_given(a, "json") ? OUT_JSON : cli_given(a, "csv") ?
	    OUT_CSV : cli_given(a, "ics") ? OUT_ICS : OUT_TEXT, st;
	struct plan_cli_opts o = {NULL, NULL, 0, 0, 0, 0, NULL};
	struct winquery_params wp;
	struct plan_query q;
	struct plan_db hold;
	struct render_plan rp;
	char err[256];
	struct cli_qparam qp = {0};

	if ((st = plan_cli_site(a, &o)) != CLI_EXIT_OK)
		return st;
	cli_now(&now1, &now2);
	winquery_params_init(&wp, QPARAM_OPTION, (now1 - TEXT_MJD0) + now2);
	while (cli_query_next(a, WINQUERY_PARAMS, &qp))
		if (winquery_param_set(&wp, qp.name, qp.value, err, sizeof err))
			return cli_usage_error("%s", err);

	st = plan_cli_load(o.db, o.lat, o.lon, o.h, &q, &hold);
	if (st != CLI_EXIT_OK)
		return st;
	tz = o.tz;
	if (tz == NULL && q.station.time_zone[0] != '\0' &&
	    qzone_known(q.station.time_zone))
		tz = q.station.time_zone;

	memset(&rp, 0, sizeof rp);
	rp.station_name = q.station.name[0] != '\0' ? q.station.name : NULL;
	rp.wide = cli_given(a, "wide");
	rp.now_mjd = wp.now_mjd;
	return plan_cli_run(&wp, &q, &hold, tz, &rp, kind == OUT_JSON ?
	    render_windows_json : kind == OUT_CSV ? render_windows_csv :
	    kind == OUT_ICS ? render_windows_ics : render_windows_text);
}
