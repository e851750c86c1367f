/* SPDX-License-Identifier: BSD-3-Clause */
/* cli_table.c: the command table, every command and action of moonrange
   with its summary, description, options (value kinds and bounds),
   operands and run function, in the order of 'moonrange --help'. */
#include <stddef.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "query/eclquery.h"
#include "store/store.h"

/* --- rows several tables share --------------------------------------------
 * What differs between the commands (the help, the group of options that
 * exclude each other, the flags) is an argument; the kind and the value's
 * name are said once here.  Options with bounds (CLI_REAL, CLI_WHOLE,
 * CLI_WORD) are written out where they are used. */

#define OPT_END {.name = NULL}
#define CMD_END {.name = NULL}

/* The station database, required. */
#define OPT_DB(h) {.name = "db", .kind = CLI_DB, .arg = "FILE", \
	.flags = CLI_REQUIRED, .help = (h)}
/* The station database, one of group g (or optional for g 0). */
#define OPT_DB_G(g, h) {.name = "db", .kind = CLI_DB, .arg = "FILE", \
	.group = (g), .help = (h)}
/* An ad-hoc station instead of the database (group 1). */
#define OPT_STATION_G1(h) {.name = "station", .kind = CLI_TEXT, \
	.arg = "LAT,LON,H", .group = 1, .help = (h)}
/* An IANA time zone. */
#define OPT_TZ_G(g, h) {.name = "tz", .kind = CLI_ZONE, .arg = "ZONE", \
	.group = (g), .help = (h)}
/* A time checked by the table ("now" or ISO 8601). */
#define OPT_UTC(n, f, h) {.name = (n), .kind = CLI_TIME, .arg = "UTC", \
	.flags = (f), .help = (h)}
/* Text the command or its query checks. */
#define OPT_TEXT(n, a, h) {.name = (n), .kind = CLI_TEXT, .arg = (a), \
	.help = (h)}
#define OPT_TEXT_G(n, a, g, h) {.name = (n), .kind = CLI_TEXT, .arg = (a), \
	.group = (g), .help = (h)}
/* A flag (group g: one of several output formats, or 0). */
#define OPT_FLAG_G(n, g, h) {.name = (n), .kind = CLI_FLAG, .group = (g), \
	.help = (h)}

/* The span of a query (its rules are the query's): --from, and --to or
   --days in group g. */
#define OPT_SPAN_G(g, days_help) \
	OPT_TEXT("from", "UTC", "start, ISO 8601 with Z (default: now)"), \
	OPT_TEXT_G("to", "UTC", g, "end (default: --days after the start)"), \
	OPT_TEXT_G("days", "N", g, days_help)

/* The selection of the log, the blackouts and the normal points. */
#define OPT_SINCE_UNTIL(what) \
	OPT_UTC("since", 0, what " at or after this time"), \
	OPT_UTC("until", 0, what " before this time")

/* --- the options of each command -------------------------------------- */

static const struct cli_option ephem_opts[] = {
	OPT_DB_G(1, "use the stored station, its active targets and its Earth "
	    "orientation table (DUT1 and polar motion interpolated when the "
	    "table covers the instant)"),
	OPT_STATION_G1("geodetic latitude, east longitude (deg) and WGS84 "
	    "height (m); default: a demo station"),
	{.name = "target", .kind = CLI_TEXT, .arg = "ID=LAT,LON[,H]",
	    .flags = CLI_MANY, .help = "selenographic latitude, east longitude "
	    "(deg) and height above 1737.4 km (m); repeat for several targets "
	    "(at most 64)"},
	OPT_UTC("at", 0, "instant, ISO 8601 with Z (default: now)"),
	{.name = "dut1", .kind = CLI_REAL, .arg = "SECONDS", .min = -0.9,
	    .max = 0.9, .unit = "seconds", .help = "UT1-UTC, |DUT1| <= 0.9 "
	    "(default: from the table, else 0; dut1_source says which)"},
	OPT_TZ_G(0, "local time in this IANA zone in the table (default: the "
	    "station's zone)"),
	OPT_FLAG_G("wide", 0, "the station and DUT1 on one line, wider than 80 "
	    "columns"),
	OPT_FLAG_G("json", 0, "machine-readable output (see README)"),
	OPT_END
};

static const struct cli_option phases_opts[] = {
	OPT_SPAN_G(1, "length of the span in days (default 30, max 36600)"),
	OPT_TZ_G(2, "also show local time in this IANA zone (text table)"),
	OPT_DB_G(2, "also show local time in the stored station's zone"),
	OPT_FLAG_G("json", 0, "machine-readable output: "
	    "{\"phases\":[{kind,utc}]}"),
	OPT_END
};

static const struct cli_option eclipses_opts[] = {
	OPT_UTC("from", 0, "start, ISO 8601 with Z (default: now)"),
	{.name = "to", .kind = CLI_TIME, .arg = "UTC", .group = 1,
	    .help = "end (default: --days after the start)"},
	{.name = "days", .kind = CLI_REAL, .arg = "N", .min = 1,
	    .max = ECLQUERY_DAYS_MAX, .unit = "days", .group = 1,
	    .help = "length of the span in days (default 365)"},
	OPT_FLAG_G("json", 2, "{\"eclipses\":[{kind, greatest, "
	    "umbral_magnitude, penumbral_magnitude, contacts{P1..P4}}]}"),
	OPT_FLAG_G("csv", 2, "one row per eclipse (RFC 4180)"),
	OPT_FLAG_G("ics", 2, "iCalendar, one event per eclipse (first to last "
	    "contact)"),
	OPT_DB_G(0, "the station: whether the Moon is up at each phase"),
	OPT_END
};

static const struct cli_option windows_opts[] = {
	OPT_DB_G(1, "station, targets, blackouts, log and normal points from a "
	    "moonrange database"),
	OPT_STATION_G1("an ad-hoc station (deg, deg east, m): plans the Moon's "
	    "centre as target \"moon\" with the limits below"),
	OPT_SPAN_G(2, "span in days (default 3, at most 3660)"),
	OPT_TEXT("target", "ID", "only this target"),
	OPT_TEXT("limit", "N", "the best N windows (default: all)"),
	OPT_TEXT("min-el", "DEG", "override the minimum target elevation "
	    "(-5..89)"),
	OPT_TEXT("max-sun-el", "DEG", "override the maximum Sun elevation"),
	OPT_TEXT("min-sun-sep", "DEG", "override the minimum Sun-Moon "
	    "separation (0..180)"),
	OPT_TZ_G(0, "IANA zone for local times (default: the station's)"),
	OPT_FLAG_G("wide", 0, "the table with local dates, 89 columns "
	    "(default: 80, local hours only)"),
	OPT_FLAG_G("json", 3, "{\"windows\":[...]} (fields in the README)"),
	OPT_FLAG_G("csv", 3, "RFC 4180 table"),
	OPT_FLAG_G("ics", 3, "iCalendar (RFC 5545), one event per window"),
	OPT_END
};

static const struct cli_option tonight_opts[] = {
	OPT_DB_G(1, "the station database"),
	OPT_STATION_G1("an ad-hoc station (plans the Moon's centre)"),
	OPT_TZ_G(0, "IANA zone: the station's with --station; with --db the "
	    "clock shown (the night stays the station's)"),
	OPT_UTC("at", 0, "take this as now (default: the clock)"),
	OPT_TEXT("limit", "N", "the next N runs (default 6)"),
	OPT_FLAG_G("json", 0, "the plan of the rest of the night as 'plan "
	    "--json'"),
	OPT_END
};

static const struct cli_option plan_opts[] = {
	OPT_DB("the station database"),
	OPT_TEXT("at", "UTC", "take this as now (ISO 8601; default: the "
	    "clock); the plan runs from now to the next local noon"),
	OPT_TEXT("from", "UTC", "with --to: plan this span (at most 4 days) as "
	    "if it were now at --from"),
	OPT_TEXT("to", "UTC", "the end of the span"),
	OPT_TEXT("method", "M", "best (default; never below greedy) or greedy "
	    "(the baseline)"),
	OPT_FLAG_G("json", 1, "JSON, as GET /api/v1/plan"),
	OPT_FLAG_G("csv", 1, "CSV (RFC 4180), one row per run"),
	OPT_FLAG_G("ics", 1, "iCalendar (RFC 5545), one event per run"),
	OPT_END
};

static const struct cli_option coverage_opts[] = {
	OPT_DB("the station database (moonrange init)"),
	OPT_TEXT("source", "S", "normal_points (default: imported points and "
	    "those logged with attempts) or attempts"),
	OPT_TEXT("since", "UTC", "only records at or after this time (ISO "
	    "8601)"),
	OPT_TEXT("until", "UTC", "only records before this time"),
	OPT_TEXT("target", "ID", "one target only"),
	OPT_TEXT("station", "CODE", "one station only (imported files carry "
	    "other stations' codes: omit it for the network)"),
	OPT_TEXT("axis", "AXIS", "synodic (default: 0 new moon, 180 full), "
	    "anomaly (mean anomaly l, 0 perigee), latitude (argument of "
	    "latitude F, 0 ascending node) or hour_angle (of the Moon at this "
	    "station)"),
	OPT_TEXT("bins", "N", "bins of the circle, 4..72 (default 12)"),
	OPT_TEXT("min-count", "M", "a bin is filled at M or more (default 1)"),
	OPT_TEXT("horizon", "DAYS", "days searched for gap-filling windows, "
	    "0..366 (default 60; 0 = none)"),
	OPT_FLAG_G("json", 1, "machine-readable output (fields in README)"),
	OPT_FLAG_G("csv", 1, "counts as CSV (RFC 4180)"),
	OPT_TEXT_G("svg", "FILE", 1, "write the chart to FILE ('-' for "
	    "stdout)"),
	OPT_TEXT("theme", "T", "the chart's palette: light (default, for "
	    "paper) or dark"),
	OPT_END
};

static const struct cli_option init_opts[] = {
	{.name = "db", .kind = CLI_TEXT, .arg = "FILE", .flags = CLI_REQUIRED,
	    .help = "the database to create (refused if it exists)"},
	OPT_TEXT("site", "DIR", "the site directory (default: the sample "
	    "site, below)"),
	OPT_FLAG_G("force", 0, "replace an existing database (only once the "
	    "new one is complete)"),
	OPT_END
};

/* The database alone: what most actions on it take. */
static const struct cli_option db_opts[] = {
	OPT_DB("the station database"),
	OPT_END
};

static const struct cli_option station_opts[] = {
	OPT_DB("the station database"),
	OPT_FLAG_G("json", 0, "the station as JSON"),
	OPT_END
};

/* target add requires what target set may change. */
#define OPT_TARGET_FIELDS(f) \
	{.name = "name", .kind = CLI_TEXT, .arg = "TEXT", .flags = (f), \
	    .help = "the target's name (one line)"}, \
	{.name = "lat", .kind = CLI_REAL, .arg = "DEG", .min = -90, \
	    .max = 90, .flags = (f), \
	    .help = "selenographic latitude, degrees (-90..90)"}, \
	{.name = "lon", .kind = CLI_REAL, .arg = "DEG", .min = -180, \
	    .max = 180, .flags = (f), \
	    .help = "selenographic east longitude, degrees (-180..180)"}, \
	{.name = "height", .kind = CLI_REAL, .arg = "M", .min = -20000, \
	    .max = 20000, .help = "above the 1737.4 km mean radius " \
	    "(default 0)"}, \
	OPT_TEXT("alias", "NAME", "the target's name in CRD files (default " \
	    "none)"), \
	{.name = "strength", .kind = CLI_REAL, .arg = "X", .min = 1e-6, \
	    .max = 1000, .help = "relative return strength, over 0 up to " \
	    "1000 (default 1)"}, \
	{.name = "dark-only", .kind = CLI_BOOL, .arg = "yes|no", \
	    .help = "plan only while the target is in lunar darkness"}

static const struct cli_option target_add_opts[] = {
	OPT_DB("the station database"),
	OPT_TARGET_FIELDS(CLI_REQUIRED),
	OPT_END
};

static const struct cli_option target_set_opts[] = {
	OPT_DB("the station database"),
	OPT_TARGET_FIELDS(0),
	{.name = "active", .kind = CLI_BOOL, .arg = "yes|no",
	    .help = "planned (yes) or retired (no)"},
	OPT_END
};

static const struct cli_option target_list_opts[] = {
	OPT_DB("the station database"),
	OPT_FLAG_G("all", 0, "list retired targets too"),
	OPT_FLAG_G("json", 0, "{\"targets\":[...]}"),
	OPT_END
};

static const struct cli_option blackout_add_opts[] = {
	OPT_DB("the station database"),
	OPT_UTC("start", CLI_REQUIRED, "start of the blackout"),
	OPT_UTC("end", CLI_REQUIRED, "its end, after the start"),
	OPT_TEXT("reason", "TEXT", "why (one line)"),
	OPT_END
};

static const struct cli_option blackout_list_opts[] = {
	OPT_DB("the station database"),
	OPT_UTC("since", 0, "blackouts ending after this time"),
	OPT_UTC("until", 0, "blackouts starting before this time"),
	OPT_FLAG_G("json", 0, "{\"blackouts\":[...]}"),
	OPT_END
};

/* A count of the log, required. */
#define OPT_COUNT(n, h) {.name = (n), .kind = CLI_WHOLE, .arg = "N", \
	.min = 0, .max = 1000000000, .flags = CLI_REQUIRED, .help = (h)}

static const struct cli_option log_add_opts[] = {
	OPT_DB("the station database"),
	{.name = "target", .kind = CLI_TEXT, .arg = "ID",
	    .flags = CLI_REQUIRED, .help = "the target ranged"},
	OPT_UTC("start", CLI_REQUIRED, "start of the attempt"),
	OPT_UTC("end", CLI_REQUIRED, "its end, after the start and within a "
	    "day"),
	OPT_COUNT("shots", "laser shots fired"),
	OPT_COUNT("returns", "return photons detected"),
	OPT_COUNT("normal-points", "normal points formed"),
	{.name = "outcome", .kind = CLI_WORD, .arg = "WORD",
	    .words = "ranged no_returns weather technical safety other",
	    .flags = CLI_REQUIRED, .help = "one of ranged no_returns weather "
	    "technical safety other"},
	{.name = "operator", .kind = CLI_TEXT, .arg = "NAME",
	    .flags = CLI_REQUIRED, .help = "who ranged"},
	{.name = "seeing", .kind = CLI_REAL, .arg = "ARCSEC", .min = 0.001,
	    .max = 60, .unit = "arcseconds", .help = "seeing, arcseconds"},
	OPT_TEXT("notes", "TEXT", "free text (may span lines)"),
	OPT_FLAG_G("json", 0, "print the stored row as JSON"),
	OPT_END
};

static const struct cli_option log_list_opts[] = {
	OPT_DB("the station database"),
	OPT_SINCE_UNTIL("attempts starting"),
	OPT_TEXT("target", "ID", "one target only"),
	{.name = "limit", .kind = CLI_WHOLE, .arg = "N", .min = 1,
	    .max = 100000000, .group = 2,
	    .help = "the newest N attempts (default 20)"},
	OPT_FLAG_G("all", 2, "every matching attempt"),
	{.name = "order", .kind = CLI_WORD, .arg = "WORD",
	    .words = "newest oldest",
	    .help = "newest first (default) or oldest first, as the API's "
	    "order="},
	OPT_FLAG_G("json", 1, "{\"attempts\":[...]} (fields in the README)"),
	OPT_FLAG_G("csv", 1, "RFC 4180, with the id and the derived angles"),
	OPT_END
};

static const struct cli_option log_export_opts[] = {
	OPT_DB("the station database"),
	OPT_FLAG_G("csv", 0, "CSV (the only format; accepted for clarity)"),
	OPT_SINCE_UNTIL("attempts starting"),
	OPT_TEXT("target", "ID", "one target only"),
	OPT_END
};

static const struct cli_option np_count_opts[] = {
	OPT_DB("the station database"),
	OPT_SINCE_UNTIL("points"),
	OPT_TEXT("target", "ID", "one target only"),
	OPT_TEXT("station", "CODE", "one station only"),
	OPT_END
};

static const struct cli_option eop_import_opts[] = {
	OPT_DB("the station database"),
	OPT_FLAG_G("c04", 0, "the file is in the IERS EOP C04 format"),
	OPT_END
};

static const struct cli_option serve_opts[] = {
	OPT_DB("the station database (see 'moonrange init')"),
	OPT_TEXT("listen", "ADDR:PORT", "numeric address and port; an address "
	    "other than loopback needs --token-file"),
	OPT_TEXT("web", "DIR", "the page's files"),
	OPT_TEXT("token-file", "FILE", "bearer token (one line) required for "
	    "POST; without it writes are off"),
	{.name = "refresh", .kind = CLI_REAL, .arg = "SECONDS", .min = 10,
	    .max = 86400, .unit = "seconds",
	    .help = "plan refresh interval, 10..86400"},
	{.name = "log-level", .kind = CLI_WORD, .arg = "LEVEL",
	    .words = "debug info warn error",
	    .help = "debug, info, warn or error (default info)"},
	OPT_END
};

static const struct cli_option demo_opts[] = {
	OPT_TEXT("data-dir", "DIR", "default $XDG_DATA_HOME/moonrange, else "
	    "~/.local/share/moonrange"),
	OPT_TEXT("listen", "ADDR:PORT", "as for 'moonrange serve'"),
	OPT_TEXT("web", "DIR", "as for 'moonrange serve'"),
	OPT_TEXT("refresh", "SECONDS", "as for 'moonrange serve'"),
	OPT_END
};

static const struct cli_option bench_opts[] = {
	{.name = "repeat", .kind = CLI_WHOLE, .arg = "N", .min = 1, .max = 20,
	    .help = "runs of each job; the best is shown (default 3)"},
	{.name = "naive-share", .kind = CLI_REAL, .arg = "F", .min = 0.01,
	    .max = 1, .help = "share of the year the naive baseline and "
	    "PyEphem's elevations measure, scaled up (default 0.1)"},
	{.name = "seconds", .kind = CLI_REAL, .arg = "S", .min = 1, .max = 60,
	    .help = "length of each wrk run (default 5)"},
	{.name = "attempts", .kind = CLI_WHOLE, .arg = "N", .min = 1000,
	    .max = 1000000, .help = "attempts in the big log (default 200000)"},
	OPT_TEXT("scripts", "DIR", "the library scripts and astronomy-engine's "
	    "node_modules (default: bench/ of the source tree)"),
	OPT_TEXT("site", "DIR", "the sample site (default: that of the source "
	    "tree)"),
	OPT_FLAG_G("no-site", 0, "only the jobs compared with the libraries"),
	OPT_END
};

/* A planning aid's last words in the plan's and tonight's help. */
#define PLANNING_AID "A planning aid only: laser-safety, aircraft and " \
	"satellite avoidance rules of the station decide."

/* --- the commands -------------------------------------------------------- */

const struct cli_command cli_commands[] = {
	{.name = "ephem",
	    .summary = "positions of the Moon, the Sun and each target at an "
	    "instant",
	    .about = "Topocentric position of the Moon and the Sun, the lunar "
	    "phase and librations, and for each target its pointing, range, "
	    "round-trip time and the Sun's elevation at the reflector.",
	    .options = ephem_opts, .run = cmd_ephem},
	{.name = "phases",
	    .summary = "new moon, quarters and full moon in a time span",
	    .about = "Every new moon, first quarter, full moon and last "
	    "quarter in the span, each to better than a second on the synodic "
	    "angle (the Moon's apparent ecliptic longitude minus the Sun's).",
	    .options = phases_opts, .run = cmd_phases},
	{.name = "eclipses",
	    .summary = "lunar eclipses in a time span: kind, magnitudes, "
	    "contacts",
	    .about = "Every lunar eclipse whose greatest eclipse falls in the "
	    "span: its kind (penumbral, partial, total), the umbral and "
	    "penumbral magnitudes at greatest eclipse and the contacts P1, "
	    "U1, U2, U3, U4, P4 that occur, from the core's Sun and Moon with "
	    "the Earth's shadow enlarged by Danjon's rule (README, \"Lunar "
	    "eclipses\").  With --db, whether the Moon is above the station's "
	    "horizon at each of them.",
	    .options = eclipses_opts, .run = cmd_eclipses},
	{.name = "windows",
	    .summary = "observing windows in a span, ranked by yield and phase "
	    "coverage",
	    .about = "Every interval in which a target is above the minimum "
	    "elevation, the Sun is low enough at the station and far enough "
	    "from the Moon, outside blackouts (and, for dark-only targets, "
	    "with the reflector in lunar darkness), ranked together by "
	    "expected returns times the coverage weight of the lunar phase "
	    "(README, \"Windows and ranking\").",
	    .options = windows_opts, .one_of = 1u << 1, .run = cmd_windows,
	    .more = cmd_windows_more},
	{.name = "tonight",
	    .summary = "tonight around the plan: the run now, the next runs",
	    .about = "The night plan from now to the next local noon (the "
	    "station's IANA time zone): the run now with the time it ends and "
	    "the target's elevation and azimuth now, the next runs, the "
	    "night's expected normal points and value, and why; when nothing "
	    "can be ranged, the limit that prevents it and when the next "
	    "plannable night starts. Local time and UTC side by side.\n\n"
	    PLANNING_AID,
	    .options = tonight_opts, .one_of = 1u << 1, .run = cmd_tonight},
	{.name = "plan",
	    .summary = "the night plan: which target to range, when, in what "
	    "order",
	    .about = "The sequence of runs (target, start, end) that buys the "
	    "most science from now to the next local noon: the value of each "
	    "run is the information its expected normal points add on the "
	    "phase signals and on the Moon's orientation within the night "
	    "(README, \"The night plan\"). Runs lie inside windows and outside "
	    "blackouts, last plan_run_min_s to plan_run_max_s, with "
	    "plan_switch_s between targets and calibrations as the settings "
	    "say. A table of 80 columns with station local time and UTC.\n\n"
	    PLANNING_AID,
	    .options = plan_opts, .run = cmd_plan},
	{.name = "coverage",
	    .summary = "how the normal points spread over the lunar cycle",
	    .about = "How the normal points (or attempts) are spread over the "
	    "lunar cycle: counts per bin, per target, pooled and per year; "
	    "the emptiest bins, the share of bins filled, the longest empty "
	    "arc, normalised entropy and a chi-square test against a uniform "
	    "spread; and the coming windows that would fill the gaps.",
	    .options = coverage_opts, .run = cmd_coverage},
	{.name = "init",
	    .summary = "create a station database from a site directory",
	    .about = "Create a station database and load a site directory into "
	    "it, all or nothing: station.ini, targets.csv, then the Earth "
	    "orientation file (eop.finals, IERS finals columns, or eop.c04), "
	    "attempts.csv and every *.crd normal-point file.  Only station.ini "
	    "and targets.csv are required.  Errors name the file, line and "
	    "field.",
	    .options = init_opts, .run = cmd_init, .more = cmd_init_more},
	{.name = "station",
	    .summary = "show or change the stored station",
	    .about = "The station record (one per database): show it, or "
	    "change keys of the station file, validated as in station.ini.",
	    .more = cmd_station_more,
	    .actions = (const struct cli_command[]){
		{.name = "show", .summary = "the stored station",
		    .about = "The station record (one per database).",
		    .options = station_opts, .run = cmd_station},
		{.name = "set",
		    .summary = "change keys of the station, all or none",
		    .about = "Change keys of the station file, validated as "
		    "in station.ini, all or none; prints the station.",
		    .options = station_opts,
		    .operands = "SECTION.KEY=VALUE...", .nmin = 1, .nmax = -1,
		    .run = cmd_station, .mode = 1, .more = cmd_station_more},
		CMD_END}},
	{.name = "target",
	    .summary = "the lunar targets: add, list, set, retire",
	    .about = "Lunar retroreflector targets.  A retired target stays in "
	    "the log and in coverage audits but is no longer planned.",
	    .actions = (const struct cli_command[]){
		{.name = "add", .summary = "add a target",
		    .about = "Add a target.  ID: 1-32 letters, digits, '_', "
		    "'-' or '.'.",
		    .options = target_add_opts, CLI_ONE_OPERAND("ID"),
		    .run = cmd_target_write, .mode = 2},
		{.name = "set", .summary = "change fields of a target",
		    .about = "Change the given fields of a target; the others "
		    "stay.",
		    .options = target_set_opts, CLI_ONE_OPERAND("ID"),
		    .run = cmd_target_write},
		{.name = "retire",
		    .summary = "stop planning a target (it stays in the log)",
		    .about = "Retire a target: it stays in the log and in "
		    "coverage audits but is no longer planned ('target set ID "
		    "--active yes' brings it back).",
		    .options = db_opts, CLI_ONE_OPERAND("ID"),
		    .run = cmd_target_write, .mode = 1},
		{.name = "list",
		    .summary = "the targets (--all: retired ones too)",
		    .about = "The active targets, or with --all every target.",
		    .options = target_list_opts, .job = cmd_target_list,
		    .db_flags = STORE_OPEN_READONLY},
		CMD_END}},
	{.name = "blackout",
	    .summary = "spans without ranging: add, list, remove",
	    .about = "Blackouts: spans in which no window is planned "
	    "(maintenance, airspace closures).",
	    .actions = (const struct cli_command[]){
		{.name = "add", .summary = "add a span without ranging",
		    .about = "Add a blackout: no window is planned from "
		    "--start to --end.",
		    .options = blackout_add_opts, .run = cmd_blackout_add},
		{.name = "list",
		    .summary = "the blackouts overlapping a span (default: "
		    "all)",
		    .about = "The blackouts overlapping --since..--until "
		    "(default: all).",
		    .options = blackout_list_opts,
		    .job = cmd_blackout_list,
		    .db_flags = STORE_OPEN_READONLY},
		{.name = "remove", .summary = "remove a blackout by its id",
		    .about = "Remove a blackout by the id 'blackout list' "
		    "shows.",
		    .options = db_opts, CLI_ONE_OPERAND("ID"),
		    .run = cmd_blackout_remove},
		CMD_END}},
	{.name = "setting",
	    .summary = "settings of the planner and the audit",
	    .about = "Station-wide settings of the planner and the coverage "
	    "audit, kept in the database.",
	    .more = cmd_setting_more,
	    .actions = (const struct cli_command[]){
		{.name = "list", .summary = "every setting and its value",
		    .about = "Every setting with its value (the default until "
		    "set).",
		    .options = db_opts, .job = cmd_setting_list,
		    .db_flags = STORE_OPEN_READONLY},
		{.name = "set", .summary = "change one setting",
		    .about = "Change one setting; the value is checked per "
		    "key.",
		    .options = db_opts, .operands = "KEY VALUE", .nmin = 2,
		    .nmax = 2, .job = cmd_setting_set,
		    .more = cmd_setting_more},
		CMD_END}},
	{.name = "log",
	    .summary = "the observation log: add, list, import, export "
	    "attempts",
	    .about = "The observation log: one row per ranging attempt, with "
	    "the synodic angle, mean elongation, target elevation and the "
	    "Sun's elevation at the target computed at the attempt's mid-time "
	    "and stored with it.",
	    .actions = (const struct cli_command[]){
		{.name = "add",
		    .summary = "log one attempt; prints the stored row",
		    .about = "Log one ranging attempt.  The synodic angle, "
		    "mean elongation, target elevation and the Sun's elevation "
		    "at the target are computed at the attempt's mid-time and "
		    "stored with it.",
		    .options = log_add_opts, .run = cmd_log_add},
		{.name = "list",
		    .summary = "the newest attempts (20 unless --limit N or "
		    "--all)",
		    .about = "The attempts of the log, newest first: the "
		    "newest 20 unless --limit N or --all says otherwise.  The "
		    "table shows the start in the station's time zone, the "
		    "target, outcome, returns, normal points, operator and "
		    "notes (cut to fit 80 columns); --csv and --json hold "
		    "every field.  --since is inclusive, --until exclusive.",
		    .options = log_list_opts, .run = cmd_log_list},
		{.name = "import",
		    .summary = "attempts from a CSV file, all or nothing",
		    .about = "Import a CSV file (the columns below) in one "
		    "transaction: every bad row is reported with its line and "
		    "nothing is stored; rows already present (same target and "
		    "start) are skipped and counted.",
		    .options = db_opts, CLI_ONE_OPERAND("FILE.csv"),
		    .run = cmd_log_import, .more = cmd_log_import_more},
		{.name = "export",
		    .summary = "the log as CSV (RFC 4180) in the import format",
		    .about = "The log as CSV (RFC 4180) in the format 'log "
		    "import' reads.",
		    .options = log_export_opts, .run = cmd_log_list,
		    .mode = 1},
		CMD_END}},
	{.name = "np",
	    .summary = "normal points: import CRD files, count them",
	    .about = "Normal points in the ILRS consolidated ranging data "
	    "format (CRD).",
	    .actions = (const struct cli_command[]){
		{.name = "import", .summary = "CRD files, one transaction each",
		    .about = "Import normal points from CRD files, each in one "
		    "transaction: the target name of each session (H3) is "
		    "mapped to a target through its alias (or id); epoch, time "
		    "of flight, photons, RMS and the station code of the file "
		    "(H2) are stored with the synodic angle, mean elongation, "
		    "target elevation (this station's points only) and the "
		    "Sun's elevation at the target.  Records of unused types "
		    "are skipped; a malformed line is reported with its number "
		    "and nothing of that file is stored.  Importing a file "
		    "again adds nothing.",
		    .options = db_opts, .operands = "CRD_FILE...", .nmin = 1,
		    .nmax = -1, .run = cmd_np_import},
		{.name = "count",
		    .summary = "how many normal points are stored",
		    .about = "The number of stored normal points that match.",
		    .options = np_count_opts, .run = cmd_np_count},
		CMD_END}},
	{.name = "eop",
	    .summary = "the Earth orientation table: import IERS files",
	    .about = "The Earth orientation table (UT1-UTC and polar motion "
	    "per day) that ephem, log and the planner interpolate.",
	    .actions = (const struct cli_command[]){
		{.name = "import",
		    .summary = "an IERS finals or C04 file, in one transaction",
		    .about = "Read the IERS finals (Bulletin A) fixed columns "
		    "(finals2000A.data, finals.daily...) or, with --c04, the "
		    "IERS EOP C04 series, in one transaction; a day already in "
		    "the table is replaced.  Prints what the table then "
		    "covers.",
		    .options = eop_import_opts, CLI_ONE_OPERAND("EOP_FILE"),
		    .run = cmd_eop, .mode = 1},
		{.name = "status", .summary = "the days the table covers",
		    .about = "The first and last day of the Earth orientation "
		    "table.",
		    .options = db_opts, .run = cmd_eop},
		CMD_END}},
	{.name = "serve",
	    .summary = "run the daemon: JSON API and station page over HTTP",
	    .about = "Run the daemon in the foreground: the JSON API under "
	    "/api/v1/ and the station page, with a plan of the coming days "
	    "refreshed every --refresh seconds and after each logged attempt. "
	    "One line per event goes to stderr.  SIGHUP re-reads the site "
	    "from the database; SIGTERM or SIGINT stop it cleanly.",
	    .options = serve_opts, .run = cmd_serve, .more = cmd_serve_more},
	{.name = "demo",
	    .summary = "create a demo database from sample-site/ and serve it",
	    .about = "Serve the invented sample site: on first use, create "
	    "DIR/demo.db from sample-site/ and a random write token in "
	    "DIR/token (mode 0600), then run 'moonrange serve' on them and "
	    "print the URL.",
	    .options = demo_opts, .run = cmd_demo},
	{.name = "bench",
	    .summary = "time the planner's jobs beside general-purpose "
	    "libraries",
	    .about = "Runs the performance jobs of the project and prints one "
	    "Markdown table: a year of Moon-centre windows and 525,600 "
	    "elevations by moonrange, by the naive baseline (the full ERFA "
	    "chain every minute), by PyEphem (/usr/bin/python3 with Debian's "
	    "python3-ephem) and by astronomy-engine (npm, in bench/ of the "
	    "source tree: cd bench && npm ci), with ratios and the largest "
	    "disagreement in event times and angles; then the sample site's "
	    "windows and coverage, a generated log's import and queries, and "
	    "the daemon under wrk on loopback.  A library that is missing is "
	    "named and skipped.  Takes a few minutes.",
	    .options = bench_opts, .run = cmd_bench},
	CMD_END
};
