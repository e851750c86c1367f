/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_plan.c: "moonrange plan", the night's runs: which target to range,
   when, in what order. */
#include <stdio.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "cli/cli_store.h"
#include "core/text.h"
#include "query/planquery.h"
#include "store/store.h"

/* The options that are parameters of the shared query (planquery's
   names), in the order they are checked. */
#define QUERY_PARAMS "at,from,to,method"

int
cmd_plan(const struct cli_args *a)
{
	const char *db_path = cli_text(a, "db", NULL);
	enum planquery_format fmt = cli_given(a, "json") ? PLANQUERY_JSON :
	    cli_given(a, "csv") ? PLANQUERY_CSV : cli_given(a, "ics") ?
	    PLANQUERY_ICS : PLANQUERY_TEXT;
	struct planquery_params p;
	struct store *db = NULL;
	struct mbuf out;
	char err[300];
	struct cli_qparam q = {0};
	double u1, u2;
	int st;
	enum errcode rc;

	planquery_params_init(&p, QPARAM_OPTION);
	cli_now(&u1, &u2);
	p.at_mjd = (u1 - TEXT_MJD0) + u2;
	while (cli_query_next(a, QUERY_PARAMS, &q))
		if (planquery_param_set(&p, q.name, q.value, err, sizeof err))
			return cli_usage_error("%s", err);
	if ((st = cli_query_db(db_path, &db)) != CLI_EXIT_OK)
		return st;
	mbuf_init(&out);
	err[0] = '\0';
	rc = planquery_run(db, &p, fmt, &out, err, sizeof err);
	store_close(db);
	/* Bad input names its parameter as an option; a failure says it
	   comes from the plan. */
	return cli_finish(rc, &out, "%s%s", cli_status_of(rc) !=
	    CLI_EXIT_USAGE ? "plan: " : "", err[0] ? err : errcode_str(rc));
}
