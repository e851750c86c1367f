/* SPDX-License-Identifier: BSD-3-Clause */
/* plan_cli.c: loading, running and printing a plan for the commands. */
#include "cli/cli.h"
#include "cli/plan_cli.h"
#include "formats/render_time.h"
#include "query/qzone.h"

int
plan_cli_site(const struct cli_args *a, struct plan_cli_opts *o)
{
	char err[256];

	o->db = cli_text(a, "db", NULL);
	o->tz = cli_text(a, "tz", NULL);
	o->limit = cli_text(a, "limit", NULL);
	o->have_station = cli_given(a, "station");
	if (o->have_station && cli_parse_station(cli_text(a, "station", NULL),
	    &o->lat, &o->lon, &o->h, err, sizeof err) != ERRCODE_OK)
		return cli_usage_error("%s", err);
	return CLI_EXIT_OK;
}

int
plan_cli_load(const char *db, double lat, double lon, double h,
    struct plan_query *q, struct plan_db *hold)
{
	char err[256];
	enum errcode rc;

	plan_query_init(q);
	plan_db_init(hold);
	if (db == NULL) {
		q->station.lat_deg = lat;
		q->station.lon_deg = lon;
		q->station.height_m = h;
		return CLI_EXIT_OK;
	}
	rc = plan_db_load(db, q, hold, err, sizeof err);
	if (rc == ERRCODE_OK)
		return CLI_EXIT_OK;
	plan_db_free(hold);
	if (rc == ERRCODE_NOMEM)
		return cli_fail("%s", errcode_str(rc));
	return cli_status_of(rc) == CLI_EXIT_USAGE ?
	    cli_usage_error("--db %s: %s", db, err) :
	    cli_fail("--db %s: %s", db, err);
}

int
plan_cli_run(struct winquery_params *p, struct plan_query *q,
    struct plan_db *hold, const char *zone, struct render_plan *rp,
    winquery_render_fn fn)
{
	static struct tzone tz;
	struct mbuf out;
	char err[256];
	enum errcode rc;

	mbuf_init(&out);
	rc = winquery_apply(p, q, err, sizeof err);
	if (rc == ERRCODE_OK && zone != NULL &&
	    qzone_load(zone, q->from_mjd, q->to_mjd, &tz) == ERRCODE_OK)
		rp->time_zone = &tz;
	if (rc == ERRCODE_OK)
		rc = winquery_render(p, q, rp, fn, &out, NULL, err,
		    sizeof err);
	plan_db_free(hold);
	return cli_finish(rc, &out, "%s", rc == ERRCODE_NOMEM ?
	    errcode_str(rc) : err);
}
