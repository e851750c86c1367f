/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_eclipses.c: "moonrange eclipses", lunar eclipses in a time span. */
#include <stdio.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "core/derive.h"
#include "core/geom.h"
#include "core/text.h"
#include "query/eclquery.h"

static int
run(const struct cli_args *a)
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

static const struct cli_option options[] = {
	{.name = "from", .kind = CLI_TIME, .arg = "UTC",
	    .help = "start, ISO 8601 with Z (default: now)"},
	{.name = "to", .kind = CLI_TIME, .arg = "UTC", .group = 1,
	    .help = "end (default: --days after the start)"},
	{.name = "days", .kind = CLI_REAL, .arg = "N", .min = 1,
	    .max = ECLQUERY_DAYS_MAX, .unit = "days", .group = 1,
	    .help = "length of the span in days (default 365)"},
	{.name = "json", .kind = CLI_FLAG, .group = 2,
	    .help = "{\"eclipses\":[{kind, greatest, umbral_magnitude, "
	    "penumbral_magnitude, contacts{P1..P4}}]}"},
	{.name = "csv", .kind = CLI_FLAG, .group = 2,
	    .help = "one row per eclipse (RFC 4180)"},
	{.name = "ics", .kind = CLI_FLAG, .group = 2,
	    .help = "iCalendar, one event per eclipse (first to last contact)"},
	{.name = "db", .kind = CLI_DB, .arg = "FILE",
	    .help = "the station: whether the Moon is up at each phase"},
	CLI_OPT_END
};

const struct cli_command cmd_eclipses = {
	.name = "eclipses",
	.summary = "lunar eclipses in a time span: kind, magnitudes, contacts",
	.about = "Every lunar eclipse whose greatest eclipse falls in the "
	    "span: its kind (penumbral, partial, total), the umbral and "
	    "penumbral magnitudes at greatest eclipse and the contacts P1, "
	    "U1, U2, U3, U4, P4 that occur, from the core's Sun and Moon with "
	    "the Earth's shadow enlarged by Danjon's rule (README, \"Lunar "
	    "eclipses\").  With --db, whether the Moon is above the station's "
	    "horizon at each of them.",
	.options = options,
	.run = run,
};
