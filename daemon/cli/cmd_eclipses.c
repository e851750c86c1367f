/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_eclipses.c: "moonrange eclipses", lunar eclipses in a time span. */
#include <stdio.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "cli/cli_store.h"
#include "core/derive.h"
#include "core/geom.h"
#include "core/text.h"
#include "query/eclquery.h"

int
cmd_eclipses(const struct cli_args *a)
{
	double f1, f2, t1, t2;
	struct geom_site site;
	struct cli_store cs;
	const char *db = cli_text(a, "db", NULL);
	enum eclquery_format fmt = cli_given(a, "json") ? ECLQUERY_JSON :
	    cli_given(a, "csv") ? ECLQUERY_CSV : cli_given(a, "ics") ?
	    ECLQUERY_ICS : ECLQUERY_TEXT;
	struct mbuf out;
	char err[256];
	int st, have_site = 0;
	enum errcode rc;

	if (!cli_time(a, "from", &f1, &f2))
		cli_now(&f1, &f2);
	if (!cli_time(a, "to", &t1, &t2)) {
		t1 = f1;
		t2 = f2 + cli_real(a, "days", ECLQUERY_DAYS_DEFAULT);
	}
	if (db != NULL) {
		if ((st = cli_store_open(&cs, db, STORE_OPEN_READONLY)) ||
		    (st = cli_store_load(&cs))) {
			cli_store_close(&cs);
			return st;
		}
		have_site = derive_site(&cs.station, &site) == ERRCODE_OK;
		cli_store_close(&cs);
		if (!have_site)
			return cli_fail("%s: the station's position is out of "
			    "range", db);
	}
	mbuf_init(&out);
	rc = eclquery_run((f1 - TEXT_MJD0) + f2, (t1 - TEXT_MJD0) + t2,
	    have_site ? &site : NULL, fmt, &out, err, sizeof err);
	if (rc != ERRCODE_OK) {
		mbuf_free(&out);
		return rc == ERRCODE_BAD_ARG ? cli_usage_error("--%s", err) :
		    cli_fail("%s", err);
	}
	st = cli_emit(&out);
	mbuf_free(&out);
	return st;
}
