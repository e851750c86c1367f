/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_phases.c: "moonrange phases", principal lunar phases in a span. */
#include <stdio.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "cli/cli_store.h"
#include "core/text.h"
#include "formats/render_time.h"
#include "query/phquery.h"
#include "query/qzone.h"

int
cmd_phases(const struct cli_args *a)
{
	int json = cli_given(a, "json"), st;
	struct phquery_params pq;
	struct mbuf out;
	struct cli_store cs;
	const char *tz = cli_text(a, "tz", NULL), *db = cli_text(a, "db", NULL);
	char zone[sizeof cs.station.time_zone], err[256];
	struct cli_qparam q = {0};
	double now1, now2;
	enum errcode rc;

	cli_now(&now1, &now2);
	phquery_params_init(&pq, QPARAM_OPTION, (now1 - TEXT_MJD0) + now2);
	while (cli_query_next(a, PHQUERY_PARAMS, &q))
		if (phquery_param_set(&pq, q.name, q.value, err, sizeof err))
			return cli_usage_error("%s", err);
	if (db != NULL) {
		if ((st = cli_store_open(&cs, db, STORE_OPEN_READONLY)) ||
		    (st = cli_store_load(&cs))) {
			cli_store_close(&cs);
			return st;
		}
		snprintf(zone, sizeof zone, "%s", cs.station.time_zone);
		cli_store_close(&cs);
		if (qzone_known(zone))
			tz = zone;
		else if (zone[0] != '\0')
			cli_warn("%s: the station's time zone '%s' is not known "
			    "to this system; UTC only", db, zone);
	}
	mbuf_init(&out);
	rc = phquery_run(&pq, json ? PHQUERY_JSON : PHQUERY_TEXT, tz, &out, err,
	    sizeof err);
	return cli_finish(rc, &out, "%s", err);
}
