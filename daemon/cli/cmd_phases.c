/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_phases.c: "moonrange phases", principal lunar phases in a span. */
#include <stdio.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "core/geom.h"
#include "formats/render_time.h"
#include "formats/render_phases.h"

#define PHASES_MAX 5000		/* ~100 years of phases */

static int
run(const struct cli_args *a)
{
	static struct geom_phase_event ev[PHASES_MAX];
	double f1 = 0, f2 = 0, t1 = 0, t2 = 0, days = cli_real(a, "days", 30.0);
	int have_from = cli_time(a, "from", &f1, &f2);
	int have_to = cli_time(a, "to", &t1, &t2);
	int json = cli_given(a, "json"), st;
	struct tscale_instant ta, tb;
	struct render_phases rp;
	struct mbuf out;
	struct cli_store cs;
	const char *tz = cli_text(a, "tz", NULL), *db = cli_text(a, "db", NULL);
	char zone[sizeof cs.station.time_zone];
	size_t n = 0;
	enum errcode rc;

	if (db != NULL) {
		if ((st = cli_store_open(&cs, db, STORE_OPEN_READONLY)) ||
		    (st = cli_store_load(&cs))) {
			cli_store_close(&cs);
			return st;
		}
		snprintf(zone, sizeof zone, "%s", cs.station.time_zone);
		cli_store_close(&cs);
		if (render_zone_known(zone))
			tz = zone;
		else if (zone[0] != '\0')
			cli_warn("%s: the station's time zone '%s' is not known "
			    "to this system; UTC only", db, zone);
	}
	if (!have_from)
		cli_now(&f1, &f2);
	if (!have_to) {
		t1 = f1;
		t2 = f2 + days;
	}
	if (tscale_from_utc(f1, f2, 0.0, &ta) ||
	    tscale_from_utc(t1, t2, 0.0, &tb))
		return cli_usage_error("--from/--to: outside the convertible "
		    "range");
	if (tscale_tt_diff(ta.tt1, ta.tt2, tb.tt1, tb.tt2) < 0)
		return cli_usage_error("--to: must not be before --from");
	if (tscale_tt_diff(ta.tt1, ta.tt2, tb.tt1, tb.tt2) > 36600.0 * 86400.0)
		return cli_usage_error("--to: span longer than 36600 days");
	rc = geom_phases_find(ta.tt1, ta.tt2, tb.tt1, tb.tt2, ev, PHASES_MAX, &n);
	if (rc != ERRCODE_OK)
		return cli_fail("phase search: %s", errcode_str(rc));
	rp.from1 = f1;
	rp.from2 = f2;
	rp.to1 = t1;
	rp.to2 = t2;
	rp.ev = ev;
	rp.n = n;
	rp.time_zone = tz;
	mbuf_init(&out);
	rc = json ? render_phases_json(&rp, &out) : render_phases_text(&rp, &out);
	if (rc != ERRCODE_OK) {
		mbuf_free(&out);
		return cli_fail("%s", errcode_str(rc));
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
	{.name = "days", .kind = CLI_REAL, .arg = "N", .min = 0,
	    .max = 36600, .group = 1,
	    .help = "length of the span in days (default 30, max 36600)"},
	{.name = "tz", .kind = CLI_ZONE, .arg = "ZONE", .group = 2,
	    .help = "also show local time in this IANA zone (text table)"},
	{.name = "db", .kind = CLI_TEXT, .arg = "FILE", .group = 2,
	    .help = "also show local time in the stored station's zone"},
	{.name = "json", .kind = CLI_FLAG,
	    .help = "machine-readable output: {\"phases\":[{kind,utc}]}"},
	CLI_OPT_END
};

const struct cli_command cmd_phases = {
	.name = "phases",
	.summary = "new moon, quarters and full moon in a time span",
	.about = "Every new moon, first quarter, full moon and last quarter "
	    "in the span, each to better than a second on the synodic angle "
	    "(the Moon's apparent ecliptic longitude minus the Sun's).",
	.options = options,
	.run = run,
};
