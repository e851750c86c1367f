/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_plan.c: "moonrange plan", the night's runs: which target to range,
   when, in what order. */
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "core/text.h"
#include "query/planquery.h"
#include "store/store.h"

/* The options that are parameters of the shared query (planquery's
   names). */
static const char *const query_params[] = {"at", "from", "to", "method"};

/* planquery_param_set with the query's parameters as void *. */
static enum errcode
set_param(void *params, const char *name, const char *value, char *errbuf,
    size_t errlen)
{
	return planquery_param_set(params, name, value, errbuf, errlen);
}

static int
run(const struct cli_args *a)
{
	const char *db_path = cli_text(a, "db", NULL);
	enum planquery_format fmt = cli_given(a, "json") ? PLANQUERY_JSON :
	    cli_given(a, "csv") ? PLANQUERY_CSV : cli_given(a, "ics") ?
	    PLANQUERY_ICS : PLANQUERY_TEXT;
	struct planquery_params p;
	struct store *db = NULL;
	struct mbuf out;
	char err[300];
	double u1, u2;
	int st;
	enum errcode rc;

	planquery_params_init(&p);
	cli_now(&u1, &u2);
	p.at_mjd = (u1 - TEXT_MJD0) + u2;
	if ((st = cli_query_params(a, query_params, sizeof query_params /
	    sizeof query_params[0], set_param, &p, "--")) != CLI_EXIT_OK)
		return st;
	if ((st = cli_query_db(db_path, &db)) != CLI_EXIT_OK)
		return st;
	mbuf_init(&out);
	err[0] = '\0';
	rc = planquery_run(db, &p, fmt, &out, err, sizeof err);
	store_close(db);
	if (rc != ERRCODE_OK) {
		mbuf_free(&out);
		if (cli_status_of(rc) == CLI_EXIT_USAGE)
			return cli_usage_error("%s%s", strncmp(err, "from", 4) &&
			    strncmp(err, "to", 2) ? "" : "--", err[0] ? err :
			    errcode_str(rc));
		return cli_fail("plan: %s", err[0] ? err : errcode_str(rc));
	}
	st = cli_emit(&out);
	mbuf_free(&out);
	return st;
}

static const struct cli_option options[] = {
	CLI_OPT_DB,
	{.name = "at", .kind = CLI_TEXT, .arg = "UTC",
	    .help = "take this as now (ISO 8601; default: the clock); the "
	    "plan runs from now to the next local noon"},
	{.name = "from", .kind = CLI_TEXT, .arg = "UTC",
	    .help = "with --to: plan this span (at most 4 days) as if it "
	    "were now at --from"},
	{.name = "to", .kind = CLI_TEXT, .arg = "UTC",
	    .help = "the end of the span"},
	{.name = "method", .kind = CLI_TEXT, .arg = "M",
	    .help = "best (default; never below greedy) or greedy (the "
	    "baseline)"},
	{.name = "json", .kind = CLI_FLAG, .group = 1,
	    .help = "JSON, as GET /api/v1/plan"},
	{.name = "csv", .kind = CLI_FLAG, .group = 1,
	    .help = "CSV (RFC 4180), one row per run"},
	{.name = "ics", .kind = CLI_FLAG, .group = 1,
	    .help = "iCalendar (RFC 5545), one event per run"},
	CLI_OPT_END
};

const struct cli_command cmd_plan = {
	.name = "plan",
	.summary = "the night plan: which target to range, when, in what "
	    "order",
	.about = "The sequence of runs (target, start, end) that buys the most "
	    "science from now to the next local noon: the value of each run "
	    "is the information its expected normal points add on the phase "
	    "signals and on the Moon's orientation within the night (README, "
	    "\"The night plan\"). Runs lie inside windows and outside "
	    "blackouts, last plan_run_min_s to plan_run_max_s, with "
	    "plan_switch_s between targets and calibrations as the settings "
	    "say. A table of 80 columns with station local time and UTC.\n\n"
	    "A planning aid only: laser-safety, aircraft and satellite "
	    "avoidance rules of the station decide.",
	.options = options,
	.run = run,
};
