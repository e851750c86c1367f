/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_eclipses.c: "moonrange eclipses", lunar eclipses in a time span. */
#include <math.h>
#include <stdio.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "core/derive.h"
#include "core/eclipse.h"
#include "core/geom.h"
#include "core/text.h"
#include "core/tscale.h"
#include "formats/render_eclipse.h"

#define MAX_ECLIPSES 1000	/* 400 years hold under 1000 */

/* UTC MJD of a TT JD; and whether the Moon is above the horizon then. */
static double
utc_of(double tt1, double tt2, const struct geom_site *site, int *up)
{
	struct tscale_instant t;
	struct geom_instant g;

	if (tscale_from_tt(tt1, tt2, 0.0, &t) != ERRCODE_OK)
		return NAN;
	if (site != NULL && up != NULL) {
		*up = geom_instant_at(site, NULL, t.utc1, t.utc2, GEOM_PREC_FAST,
		    &g) == ERRCODE_OK ? g.moon.el > 0.0 : -1;
	}
	return (t.utc1 - TEXT_MJD0) + t.utc2;
}

static int
run(const struct cli_args *a)
{
	static struct eclipse_event ev[MAX_ECLIPSES];
	static struct render_eclipse rows[MAX_ECLIPSES];
	double f1, f2, t1, t2;
	struct tscale_instant ta, tb;
	struct geom_site site;
	struct cli_store cs;
	const char *db = cli_text(a, "db", NULL);
	struct mbuf out;
	size_t n = 0;
	int st, have_site = 0;
	enum errcode rc;

	if (!cli_time(a, "from", &f1, &f2))
		cli_now(&f1, &f2);
	if (!cli_time(a, "to", &t1, &t2)) {
		t1 = f1;
		t2 = f2 + cli_real(a, "days", 365.0);
	}
	if (tscale_from_utc(f1, f2, 0.0, &ta) != ERRCODE_OK ||
	    tscale_from_utc(t1, t2, 0.0, &tb) != ERRCODE_OK)
		return cli_usage_error("--from/--to: outside the time scales' "
		    "range");
	if ((tb.tt1 - ta.tt1) + (tb.tt2 - ta.tt2) <= 0.0)
		return cli_usage_error("--to: must be after --from");
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
	rc = eclipse_find(ta.tt1, ta.tt2, tb.tt1, tb.tt2, ev, MAX_ECLIPSES, &n);
	if (rc == ERRCODE_BAD_ARG)
		return cli_usage_error("--to: the span is at most 400 years");
	if (rc != ERRCODE_OK)
		return cli_fail("eclipses: %s", errcode_str(rc));
	for (size_t i = 0; i < n; i++) {
		struct render_eclipse *r = &rows[i];
		const struct geom_site *s = have_site ? &site : NULL;

		r->kind = ev[i].kind;
		r->umbral_mag = ev[i].umbral_mag;
		r->penumbral_mag = ev[i].penumbral_mag;
		r->moon_up_greatest = -1;
		r->greatest_mjd = utc_of(ev[i].greatest_tt1, ev[i].greatest_tt2,
		    s, &r->moon_up_greatest);
		for (int k = 0; k < ECLIPSE_NCONTACTS; k++) {
			r->moon_up[k] = -1;
			r->contact_mjd[k] = ev[i].has[k] ?
			    utc_of(ev[i].contact_tt1[k], ev[i].contact_tt2[k], s,
			    &r->moon_up[k]) : NAN;
		}
	}
	mbuf_init(&out);
	if (cli_given(a, "json"))
		rc = render_eclipses_json(rows, n, &out);
	else if (cli_given(a, "csv"))
		rc = render_eclipses_csv(rows, n, have_site, &out);
	else if (cli_given(a, "ics"))
		rc = render_eclipses_ics(rows, n, &out);
	else
		rc = render_eclipses_text(rows, n, have_site, &out);
	st = cli_emit_rendered(rc, &out);
	mbuf_free(&out);
	return st;
}

static const struct cli_option options[] = {
	{.name = "from", .kind = CLI_TIME, .arg = "UTC",
	    .help = "start, ISO 8601 with Z (default: now)"},
	{.name = "to", .kind = CLI_TIME, .arg = "UTC", .group = 1,
	    .help = "end (default: --days after the start)"},
	{.name = "days", .kind = CLI_REAL, .arg = "N", .min = 1,
	    .max = 146000, .unit = "days", .group = 1,
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
