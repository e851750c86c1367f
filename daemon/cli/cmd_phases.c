/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_phases.c: "moonrange phases", principal lunar phases in a span. */
#include <getopt.h>
#include <stdio.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "core/geom.h"
#include "formats/render_time.h"
#include "formats/render_phases.h"

#define PHASES_MAX 5000		/* ~100 years of phases */

static void
usage(FILE *f)
{
	fprintf(f,
	    "usage: moonrange phases [--from UTC] [--to UTC | --days N]\n"
	    "                        [--tz ZONE | --db FILE] [--json]\n"
	    "\n"
	    "Every new moon, first quarter, full moon and last quarter in the\n"
	    "span, each to better than a second on the synodic angle (the\n"
	    "Moon's apparent ecliptic longitude minus the Sun's).\n"
	    "\n"
	    "  --from UTC   start, ISO 8601 with Z (default: now)\n"
	    "  --to UTC     end (default: --days after the start)\n"
	    "  --days N     length of the span in days (default 30, max 36600)\n"
	    "  --tz ZONE    also show local time in this IANA zone (text table)\n"
	    "  --db FILE    also show local time in the stored station's zone\n"
	    "  --json       machine-readable output: {\"phases\":[{kind,utc}]}\n"
	    "  --help       this text\n");
}

int
cmd_phases(int argc, char **argv)
{
	static const struct option opts[] = {
		{"from", required_argument, NULL, 'f'},
		{"to", required_argument, NULL, 't'},
		{"days", required_argument, NULL, 'd'},
		{"tz", required_argument, NULL, 'z'},
		{"db", required_argument, NULL, 'D'},
		{"json", no_argument, NULL, 'j'},
		{"help", no_argument, NULL, 'h'},
		{NULL, 0, NULL, 0}
	};
	static struct geom_phase_event ev[PHASES_MAX];
	double f1 = 0, f2 = 0, t1 = 0, t2 = 0, days = 30.0;
	int have_from = 0, have_to = 0, have_days = 0, json = 0, c, st;
	struct tscale_instant a, b;
	struct render_phases rp;
	struct mbuf out;
	struct cli_store cs;
	const char *tz = NULL, *db = NULL;
	char zone[sizeof cs.station.time_zone];
	size_t n = 0;
	enum errcode rc;

	optind = 1;
	opterr = 0;
	while ((c = getopt_long(argc, argv, "", opts, NULL)) != -1) {
		switch (c) {
		case 'f':
			if (cli_parse_time("--from", optarg, &f1, &f2))
				return CLI_EXIT_USAGE;
			have_from = 1;
			break;
		case 't':
			if (cli_parse_time("--to", optarg, &t1, &t2))
				return CLI_EXIT_USAGE;
			have_to = 1;
			break;
		case 'd':
			if (cli_parse_double(optarg, 0.0, 36600.0, &days))
				return cli_usage_error("--days: '%s' is not a "
				    "number in 0..36600", optarg);
			have_days = 1;
			break;
		case 'z':
			if (!render_zone_known(optarg))
				return cli_usage_error("--tz: '%s' is not a time "
				    "zone known to this system (an IANA name such "
				    "as Europe/Madrid)", optarg);
			tz = optarg;
			break;
		case 'D':
			db = optarg;
			break;
		case 'j':
			json = 1;
			break;
		case 'h':
			usage(stdout);
			return CLI_EXIT_OK;
		default:
			return cli_bad_option("phases", NULL, argv[optind - 1]);
		}
	}
	if (optind < argc)
		return cli_extra_argument("phases", NULL, argv[optind]);
	if (have_to && have_days)
		return cli_usage_error("--to and --days: give one, not both");
	if (tz != NULL && db != NULL)
		return cli_usage_error("--tz and --db: give one, not both");
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
	if (tscale_from_utc(f1, f2, 0.0, &a) || tscale_from_utc(t1, t2, 0.0, &b))
		return cli_usage_error("--from/--to: outside the convertible "
		    "range");
	if (tscale_tt_diff(a.tt1, a.tt2, b.tt1, b.tt2) < 0)
		return cli_usage_error("--to: must not be before --from");
	if (tscale_tt_diff(a.tt1, a.tt2, b.tt1, b.tt2) > 36600.0 * 86400.0)
		return cli_usage_error("--to: span longer than 36600 days");
	rc = geom_phases_find(a.tt1, a.tt2, b.tt1, b.tt2, ev, PHASES_MAX, &n);
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
