/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_log.c: "moonrange log", the station's observation log: add, list,
   import and export attempts. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli/cli.h"
#include "core/attempt.h"
#include "cli/cli_store.h"
#include "formats/render_site.h"
#include "query/qzone.h"

#define LOG_LIST_DEFAULT 20	/* attempts 'log list' shows by default */

/* The station's zone over [from, to] for local times, or NULL. */
static const struct tzone *
log_zone(const struct site_station *st, double from, double to,
    struct tzone *zone)
{
	return st->time_zone[0] != '\0' && qzone_load(st->time_zone, from, to,
	    zone) == ERRCODE_OK ? zone : NULL;
}

/* Copy s into a fixed field, refusing what does not fit. */
static int
copy_text(char *dst, size_t cap, const char *opt, const char *s)
{
	if (strlen(s) >= cap)
		return cli_usage_error("%s: longer than %zu bytes", opt, cap - 1);
	if (!import_text_ok(s, strcmp(opt, "--notes") == 0))
		return cli_usage_error("%s: must be UTF-8 text without control "
		    "characters%s", opt, strcmp(opt, "--notes") == 0 ? "" :
		    ", on one line");
	strcpy(dst, s);
	return CLI_EXIT_OK;
}

/* --- add ------------------------------------------------------------------ */

static int
log_add(const struct cli_args *a)
{
	static struct tzone zone;
	struct cli_store c;
	struct site_attempt at;
	struct mbuf out;
	char err[512];
	int st;
	enum errcode rc;

	memset(&at, 0, sizeof at);
	at.start_mjd = cli_real(a, "start", NAN);
	at.end_mjd = cli_real(a, "end", NAN);
	if ((st = copy_text(at.target, sizeof at.target, "--target",
	    cli_text(a, "target", ""))))
		return st;
	if (!(at.end_mjd > at.start_mjd))
		return cli_usage_error("--end: %s is not after --start %s",
		    cli_text(a, "end", ""), cli_text(a, "start", ""));
	if (at.end_mjd - at.start_mjd > 1.0)
		return cli_usage_error("--end: an attempt longer than a day "
		    "is not plausible");
	at.outcome = (enum site_outcome)site_outcome_parse(cli_text(a,
	    "outcome", ""));
	if (*cli_text(a, "operator", "") == '\0')
		return cli_usage_error("--operator: must not be empty");
	if ((st = copy_text(at.operator_name, sizeof at.operator_name,
	    "--operator", cli_text(a, "operator", ""))) ||
	    (cli_given(a, "notes") && (st = copy_text(at.notes,
	    sizeof at.notes, "--notes", cli_text(a, "notes", "")))))
		return st;
	at.shots = cli_whole(a, "shots", 0);
	at.returns = cli_whole(a, "returns", 0);
	at.normal_points = cli_whole(a, "normal-points", 0);
	at.seeing_arcsec = cli_real(a, "seeing", NAN);

	if ((st = cli_store_open(&c, cli_text(a, "db", NULL), 0)) !=
	    CLI_EXIT_OK)
		return st;
	if ((rc = store_station_get(c.s, &c.station, err, sizeof err)) ||
	    (rc = store_attempt_log(c.s, &at, err, sizeof err))) {
		st = cli_store_fail(rc, "log add: %s", err);
		goto out;
	}
	if (at.suspect != 0)
		cli_warn("log add: %s", attempt_warning(at.suspect, err,
		    sizeof err));
	mbuf_init(&out);
	if (cli_given(a, "json"))
		rc = render_site_attempt_json(&at, &out);
	else
		rc = render_site_attempts_text(&at, 1, 1, log_zone(&c.station,
		    at.start_mjd, at.start_mjd, &zone), &out);
	st = cli_emit_rendered(rc, &out);
	mbuf_free(&out);
out:
	cli_store_close(&c);
	return st;
}

/* --- list and export ------------------------------------------------------ */

static int
log_list(const struct cli_args *a)
{
	int export = a->cmd->mode;
	static struct tzone zone;
	struct cli_store c;
	struct store_query q;
	struct site_attempt *rows = NULL;
	size_t n = 0, total = 0;
	struct mbuf out;
	char err[512];
	int st, json = !export && cli_given(a, "json");
	int csv = !export && cli_given(a, "csv");
	/* list: the newest LOG_LIST_DEFAULT (or --limit N, or --all), newest
	   first (or --order oldest); export: all, oldest first. */
	long limit = export || cli_given(a, "all") ? 0 :
	    cli_whole(a, "limit", LOG_LIST_DEFAULT);
	int oldest = export || cli_whole(a, "order", 0) == 1;
	enum errcode rc;

	if ((st = cli_store_open(&c, cli_text(a, "db", NULL),
	    STORE_OPEN_READONLY)) != CLI_EXIT_OK)
		return st;
	store_query_init(&q);
	q.since_mjd = cli_real(a, "since", NAN);
	q.until_mjd = cli_real(a, "until", NAN);
	q.target = cli_text(a, "target", NULL);
	q.limit = (size_t)limit;
	q.newest_first = limit > 0 || !oldest;
	if ((rc = store_attempts_list(c.s, &q, &rows, &n, err, sizeof err)) ||
	    (!export && !json && !csv && (rc = store_attempts_count(c.s, &q,
	    &total, err, sizeof err)))) {
		st = cli_fail("%s: %s", c.path, err);
		goto out;
	}
	for (size_t i = 0; q.newest_first && oldest && i < n / 2; i++) {
		struct site_attempt tmp = rows[i];

		rows[i] = rows[n - 1 - i];
		rows[n - 1 - i] = tmp;
	}
	if (!export && !json && !csv)
		(void)store_station_get(c.s, &c.station, NULL, 0);
	mbuf_init(&out);
	if (export)
		rc = render_site_attempts_csv(rows, n, 0, &out);
	else if (json)
		rc = render_site_attempts_json(rows, n, &out);
	else if (csv)
		rc = render_site_attempts_csv(rows, n, 1, &out);
	else
		rc = render_site_attempts_text(rows, n, total, n > 0 ?
		    log_zone(&c.station, rows[n - 1].start_mjd < rows[0].start_mjd ?
		    rows[n - 1].start_mjd : rows[0].start_mjd,
		    rows[n - 1].start_mjd < rows[0].start_mjd ? rows[0].start_mjd :
		    rows[n - 1].start_mjd, &zone) : NULL, &out);
	st = rc != ERRCODE_OK ? cli_fail("%s", errcode_str(rc)) :
	    cli_emit(&out);
	mbuf_free(&out);
out:
	mem_free(rows);
	cli_store_close(&c);
	return st;
}

/* --- import --------------------------------------------------------------- */

static int
log_import(const struct cli_args *a)
{
	struct cli_store c;
	struct cli_store_counts n;
	const char *file = a->ops[0];
	int st;

	if ((st = cli_store_open(&c, cli_text(a, "db", NULL), 0)) ==
	    CLI_EXIT_OK && (st = cli_store_load(&c)) == CLI_EXIT_OK &&
	    (st = cli_store_import_file(&c, file, 'a', &n)) == CLI_EXIT_OK)
		printf("%s: %zu attempt%s read, %zu added, %zu already "
		    "present (skipped)\n", file, n.read,
		    n.read == 1 ? "" : "s", n.added, n.present);
	cli_store_close(&c);
	return st;
}

/* --- the table ----------------------------------------------------------- */

/* The columns of an import file, for --help. */
static void
import_more(FILE *f)
{
	char cols[] = RENDER_SITE_ATTEMPT_CSV_HEADER, text[sizeof cols * 2];
	size_t n = 0;

	for (const char *p = cols; *p; p++) {
		text[n++] = *p;
		if (*p == ',')
			text[n++] = ' ';
	}
	text[n] = '\0';
	fprintf(f, "\nColumns (a header line names them, in any order):\n");
	cli_wrap(f, text, 0, 2);
}

#define OPT_SINCE {.name = "since", .kind = CLI_TIME, .arg = "UTC", \
	.help = "attempts starting at or after this time"}
#define OPT_UNTIL {.name = "until", .kind = CLI_TIME, .arg = "UTC", \
	.help = "attempts starting before this time"}
#define OPT_TARGET {.name = "target", .kind = CLI_TEXT, .arg = "ID", \
	.help = "one target only"}
#define COUNT(n, h) {.name = (n), .kind = CLI_WHOLE, .arg = "N", .min = 0, \
	.max = 1000000000, .flags = CLI_REQUIRED, .help = (h)}

static const struct cli_option add_options[] = {
	CLI_OPT_DB,
	{.name = "target", .kind = CLI_TEXT, .arg = "ID",
	    .flags = CLI_REQUIRED, .help = "the target ranged"},
	{.name = "start", .kind = CLI_TIME, .arg = "UTC",
	    .flags = CLI_REQUIRED, .help = "start of the attempt"},
	{.name = "end", .kind = CLI_TIME, .arg = "UTC", .flags = CLI_REQUIRED,
	    .help = "its end, after the start and within a day"},
	COUNT("shots", "laser shots fired"),
	COUNT("returns", "return photons detected"),
	COUNT("normal-points", "normal points formed"),
	{.name = "outcome", .kind = CLI_WORD, .arg = "WORD",
	    .words = "ranged no_returns weather technical safety other",
	    .flags = CLI_REQUIRED, .help = "one of ranged no_returns weather "
	    "technical safety other"},
	{.name = "operator", .kind = CLI_TEXT, .arg = "NAME",
	    .flags = CLI_REQUIRED, .help = "who ranged"},
	{.name = "seeing", .kind = CLI_REAL, .arg = "ARCSEC", .min = 0.001,
	    .max = 60, .unit = "arcseconds", .help = "seeing, arcseconds"},
	{.name = "notes", .kind = CLI_TEXT, .arg = "TEXT",
	    .help = "free text (may span lines)"},
	{.name = "json", .kind = CLI_FLAG,
	    .help = "print the stored row as JSON"},
	CLI_OPT_END
};

static const struct cli_option list_options[] = {
	CLI_OPT_DB, OPT_SINCE, OPT_UNTIL, OPT_TARGET,
	{.name = "limit", .kind = CLI_WHOLE, .arg = "N", .min = 1,
	    .max = 100000000, .group = 2,
	    .help = "the newest N attempts (default 20)"},
	{.name = "all", .kind = CLI_FLAG, .group = 2,
	    .help = "every matching attempt"},
	{.name = "order", .kind = CLI_WORD, .arg = "WORD",
	    .words = "newest oldest",
	    .help = "newest first (default) or oldest first, as the API's "
	    "order="},
	{.name = "json", .kind = CLI_FLAG, .group = 1,
	    .help = "{\"attempts\":[...]} (fields in the README)"},
	{.name = "csv", .kind = CLI_FLAG, .group = 1,
	    .help = "RFC 4180, with the id and the derived angles"},
	CLI_OPT_END
};

static const struct cli_option import_options[] = {CLI_OPT_DB, CLI_OPT_END};

static const struct cli_option export_options[] = {
	CLI_OPT_DB,
	{.name = "csv", .kind = CLI_FLAG,
	    .help = "CSV (the only format; accepted for clarity)"},
	OPT_SINCE, OPT_UNTIL, OPT_TARGET,
	CLI_OPT_END
};

static const struct cli_command log_add_cmd = {
	.name = "add",
	.summary = "log one attempt; prints the stored row",
	.about = "Log one ranging attempt.  The synodic angle, mean "
	    "elongation, target elevation and the Sun's elevation at the "
	    "target are computed at the attempt's mid-time and stored with "
	    "it.",
	.options = add_options,
	.run = log_add,
};

static const struct cli_command log_list_cmd = {
	.name = "list",
	.summary = "the newest attempts (20 unless --limit N or --all)",
	.about = "The attempts of the log, newest first: the newest 20 "
	    "unless --limit N or --all says otherwise.  The table shows the "
	    "start in the station's time zone, the target, outcome, returns, "
	    "normal points, operator and notes (cut to fit 80 columns); "
	    "--csv and --json hold every field.  --since is inclusive, --until "
	    "exclusive.",
	.options = list_options,
	.run = log_list,
};

static const struct cli_command log_import_cmd = {
	.name = "import",
	.summary = "attempts from a CSV file, all or nothing",
	.about = "Import a CSV file (the columns below) in one transaction: "
	    "every bad row is reported with its line "
	    "and nothing is stored; rows already present (same target and "
	    "start) are skipped and counted.",
	.options = import_options,
	CLI_ONE_OPERAND("FILE.csv"),
	.run = log_import,
	.more = import_more,
};

static const struct cli_command log_export_cmd = {
	.name = "export",
	.summary = "the log as CSV (RFC 4180) in the import format",
	.about = "The log as CSV (RFC 4180) in the format 'log import' "
	    "reads.",
	.options = export_options,
	.run = log_list,
	.mode = 1,
};

static const struct cli_command *const actions[] = {
	&log_add_cmd, &log_list_cmd, &log_import_cmd, &log_export_cmd, NULL
};

const struct cli_command cmd_log = {
	.name = "log",
	.summary = "the observation log: add, list, import, export attempts",
	.about = "The observation log: one row per ranging attempt, with the "
	    "synodic angle, mean elongation, target elevation and the Sun's "
	    "elevation at the target computed at the attempt's mid-time and "
	    "stored with it.",
	.actions = actions,
};
