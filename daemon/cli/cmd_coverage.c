/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_coverage.c: "moonrange coverage", the audit of phase coverage. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "cli/cli_store.h"
#include "core/text.h"
#include "query/covquery.h"
#include "store/store.h"

/* Write a buffer to a file (or stdout for "-"). */
static int
write_file(const char *path, struct mbuf *b)
{
	FILE *f;
	int bad;

	if (strcmp(path, "-") == 0)
		return cli_emit(b);
	if (mbuf_status(b) != ERRCODE_OK)
		return cli_fail("%s", errcode_str(ERRCODE_NOMEM));
	if ((f = fopen(path, "w")) == NULL)
		return cli_fail("--svg: cannot write '%s'", path);
	bad = fwrite(b->data, 1, b->len, f) != b->len;
	bad |= fclose(f) != 0;
	if (bad)
		return cli_fail("--svg: cannot write '%s'", path);
	return CLI_EXIT_OK;
}

/* The options that are parameters of the shared query, by the names of
   covquery_param_set, in the order they are checked. */
#define QUERY_PARAMS "source,since,until,target,station,axis,bins," \
	"min_count,horizon,theme"

int
cmd_coverage(const struct cli_args *a)
{
	const char *db_path = cli_text(a, "db", NULL);
	const char *svg_path = cli_text(a, "svg", NULL);
	enum covquery_format fmt = cli_given(a, "json") ? COVQUERY_JSON :
	    cli_given(a, "csv") ? COVQUERY_CSV : svg_path != NULL ?
	    COVQUERY_SVG : COVQUERY_TEXT;
	struct covquery_params p;
	struct store *db = NULL;
	struct mbuf out;
	char err[256];
	struct cli_qparam q = {0};
	double u1, u2;
	int st;
	enum errcode rc;

	if (cli_given(a, "theme") && svg_path == NULL)
		return cli_usage_error("--theme: only with --svg (it is the "
		    "chart's palette)");
	covquery_params_init(&p);
	p.style = QPARAM_OPTION;
	while (cli_query_next(a, QUERY_PARAMS, &q))
		if (covquery_param_set(&p, q.name, q.value, err, sizeof err))
			return cli_usage_error("%s", err);
	if (covquery_params_check(&p, err, sizeof err) != ERRCODE_OK)
		return cli_usage_error("%s", err);
	if (p.spec.axis == COVERAGE_AXIS_HOUR_ANGLE && p.spec.station[0] == '\0')
		cli_warn("--axis hour_angle: the hour angle is this station's; "
		    "points of other stations are binned by it too (give "
		    "--station CODE)");
	cli_now(&u1, &u2);
	p.now_mjd = (u1 - TEXT_MJD0) + u2;

	if ((st = cli_query_db(db_path, &db)) != CLI_EXIT_OK)
		return st;
	mbuf_init(&out);
	err[0] = '\0';
	rc = covquery_run(db, &p, fmt, &out, err, sizeof err);
	store_close(db);
	if (rc == ERRCODE_OK && svg_path != NULL) {
		st = write_file(svg_path, &out);
		mbuf_free(&out);
		return st;
	}
	/* The query's sentence names the parameter; "coverage:" says
	   where anything else comes from. */
	return cli_finish(rc, &out, "%s%s", err[0] && cli_status_of(rc) ==
	    CLI_EXIT_USAGE ? "" : "coverage: ", err[0] ? err :
	    errcode_str(rc));
}
