/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_windows.c: "moonrange windows", ranked observing windows in a span. */
#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "core/plan.h"
#include "cli/plan_cli.h"
#include "formats/render_time.h"
#include "formats/render_plan.h"
#include "core/window.h"

#define MJD0 2400000.5

static void
usage(FILE *f)
{
	fprintf(f,
	    "usage: moonrange windows (--db FILE | --station LAT,LON,HEIGHT_M)\n"
	    "                         [--from UTC] [--to UTC | --days N]\n"
	    "                         [--target ID] [--limit N] [--min-el DEG]\n"
	    "                         [--max-sun-el DEG] [--min-sun-sep DEG]\n"
	    "                         [--tz ZONE] [--json | --csv | --ics]\n"
	    "\n"
	    "Every interval in which a target is above the minimum elevation,\n"
	    "the Sun is low enough at the station and far enough from the Moon,\n"
	    "outside blackouts (and, for dark-only targets, with the reflector\n"
	    "in lunar darkness), ranked together by expected returns times the\n"
	    "coverage weight of the lunar phase (README, \"Windows and\n"
	    "ranking\").\n"
	    "\n"
	    "  --db FILE          station, targets, blackouts, log and normal\n"
	    "                     points from a moonrange database\n"
	    "  --station LAT,LON,H  an ad-hoc station (deg, deg east, m): plans\n"
	    "                     the Moon's centre as target \"moon\" with\n"
	    "                     elevation >= %.0f, Sun <= %.0f, Sun-Moon >= %.0f deg\n"
	    "  --from UTC         start, ISO 8601 with Z (default: now)\n"
	    "  --to UTC           end (default: --days after the start)\n"
	    "  --days N           span in days (default 3, at most 3660)\n"
	    "  --target ID        only this target\n"
	    "  --limit N          the best N windows (default: all)\n"
	    "  --min-el DEG       override the minimum target elevation\n"
	    "  --max-sun-el DEG   override the maximum Sun elevation\n"
	    "  --min-sun-sep DEG  override the minimum Sun-Moon separation\n"
	    "  --tz ZONE          IANA zone for local times (default: the\n"
	    "                     station's)\n"
	    "  --json             {\"windows\":[...]} (fields in the README)\n"
	    "  --csv              RFC 4180 table\n"
	    "  --ics              iCalendar (RFC 5545), one event per window\n"
	    "  --help             this text\n"
	    "\n"
	    "Elevations are geometric. A planning aid only: laser-safety,\n"
	    "aircraft and satellite avoidance rules of the station decide.\n",
	    PLAN_DEFAULT_MIN_EL_DEG, PLAN_DEFAULT_MAX_SUN_EL_DEG,
	    PLAN_DEFAULT_MIN_SUN_SEP_DEG);
}

enum out_kind { OUT_TEXT, OUT_JSON, OUT_CSV, OUT_ICS };

int
cmd_windows(int argc, char **argv)
{
	static const struct option opts[] = {
		{"db", required_argument, NULL, 'D'},
		{"station", required_argument, NULL, 's'},
		{"from", required_argument, NULL, 'f'},
		{"to", required_argument, NULL, 't'},
		{"days", required_argument, NULL, 'd'},
		{"target", required_argument, NULL, 'T'},
		{"limit", required_argument, NULL, 'l'},
		{"min-el", required_argument, NULL, 'e'},
		{"max-sun-el", required_argument, NULL, 'S'},
		{"min-sun-sep", required_argument, NULL, 'p'},
		{"tz", required_argument, NULL, 'z'},
		{"json", no_argument, NULL, 'j'},
		{"csv", no_argument, NULL, 'c'},
		{"ics", no_argument, NULL, 'i'},
		{"help", no_argument, NULL, 'h'},
		{NULL, 0, NULL, 0}
	};
	const char *target = NULL, *tz;
	double f1 = 0, f2 = 0, t1 = 0, t2 = 0, days = 3.0;
	double min_el = NAN, max_sun = NAN, min_sep = NAN, now1, now2;
	int have_from = 0, have_to = 0, have_days = 0;
	int kind = OUT_TEXT, nkind = 0, c, st;
	struct plan_cli_opts o = {NULL, NULL, 0, 0, 0, 0, 0};
	struct plan_query q;
	struct plan_db hold;
	struct render_plan rp;

	optind = 1;
	opterr = 0;
	while ((c = getopt_long(argc, argv, "", opts, NULL)) != -1) {
		if ((st = plan_cli_option(c, optarg, &o)) >= 0) {
			if (st != CLI_EXIT_OK)
				return st;
			continue;
		}
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
			if (cli_parse_double(optarg, 0.0, 3660.0, &days) ||
			    !(days > 0))
				return cli_usage_error("--days: '%s' is not a "
				    "number of days above 0 and at most 3660",
				    optarg);
			have_days = 1;
			break;
		case 'T':
			target = optarg;
			break;
		case 'e':
			if (cli_parse_double(optarg, -5.0, 89.0, &min_el))
				return cli_usage_error("--min-el: '%s' is not a "
				    "number of degrees in -5..89", optarg);
			break;
		case 'S':
			if (cli_parse_double(optarg, -90.0, 90.0, &max_sun))
				return cli_usage_error("--max-sun-el: '%s' is "
				    "not a number of degrees in -90..90",
				    optarg);
			break;
		case 'p':
			if (cli_parse_double(optarg, 0.0, 180.0, &min_sep))
				return cli_usage_error("--min-sun-sep: '%s' is "
				    "not a number of degrees in 0..180",
				    optarg);
			break;
		case 'j':
			kind = OUT_JSON;
			nkind++;
			break;
		case 'c':
			kind = OUT_CSV;
			nkind++;
			break;
		case 'i':
			kind = OUT_ICS;
			nkind++;
			break;
		case 'h':
			usage(stdout);
			return CLI_EXIT_OK;
		default:
			return cli_usage_error("windows: unknown or incomplete "
			    "option '%s' (see 'moonrange windows --help')",
			    argv[optind - 1]);
		}
	}
	if ((st = plan_cli_opts_check(&o, "windows", argc, argv)) !=
	    CLI_EXIT_OK)
		return st;
	if (have_to && have_days)
		return cli_usage_error("--to and --days: give one, not both");
	if (nkind > 1)
		return cli_usage_error("--json, --csv and --ics: give one");
	cli_now(&now1, &now2);
	if (!have_from) {
		f1 = now1;
		f2 = now2;
	}
	if (!have_to) {
		t1 = f1;
		t2 = f2 + days;
	}

	if (!(((t1 - f1) + (t2 - f2)) > 0.0))
		return cli_usage_error("--to: the span must end after --from "
		    "(default now)");
	if ((t1 - f1) + (t2 - f2) > WINDOW_MAX_SPAN_DAYS)
		return cli_usage_error("--to: the span is longer than %.0f days",
		    WINDOW_MAX_SPAN_DAYS);

	st = plan_cli_load(o.db, o.lat, o.lon, o.h, &q, &hold);
	if (st != CLI_EXIT_OK)
		return st;
	if (isfinite(min_el))
		q.station.min_el_deg = min_el;
	if (isfinite(max_sun))
		q.station.max_sun_el_deg = max_sun;
	if (isfinite(min_sep))
		q.station.min_sun_sep_deg = min_sep;
	q.from_mjd = (f1 - MJD0) + f2;
	q.to_mjd = (t1 - MJD0) + t2;
	q.target = target;
	q.limit = (size_t)o.limit;
	tz = o.tz;
	if (tz == NULL && q.station.time_zone[0] != '\0' &&
	    render_zone_known(q.station.time_zone))
		tz = q.station.time_zone;

	memset(&rp, 0, sizeof rp);
	rp.station_name = q.station.name[0] != '\0' ? q.station.name : NULL;
	rp.time_zone = tz;
	rp.now_mjd = (now1 - MJD0) + now2;
	return plan_cli_run(&q, &hold, &rp, kind == OUT_JSON ?
	    render_windows_json : kind == OUT_CSV ? render_windows_csv :
	    kind == OUT_ICS ? render_windows_ics : render_windows_text);
}
