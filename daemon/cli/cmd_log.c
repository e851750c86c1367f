/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_log.c: "moonrange log", the station's observation log: add, list,
   import and export attempts. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
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

int
cmd_log_add(const struct cli_args *a)
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

int
cmd_log_list(const struct cli_args *a)
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
	cli_store_query(a, &q);
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
	st = cli_emit_rendered(rc, &out);
	mbuf_free(&out);
out:
	mem_free(rows);
	cli_store_close(&c);
	return st;
}

/* --- import --------------------------------------------------------------- */

/* What the attempts file gave. */
static void
said(const char *file, const struct cli_store_counts *n)
{
	printf("%s: %zu attempt%s read, %zu added, %zu already present "
	    "(skipped)\n", file, n->read, n->read == 1 ? "" : "s", n->added,
	    n->present);
}

int
cmd_log_import(const struct cli_args *a)
{
	return cli_store_import_ops(a, 'a', said);
}

/* The columns of an import file, for --help. */
void
cmd_log_import_more(FILE *f)
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
