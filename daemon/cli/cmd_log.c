/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_log.c: "moonrange log", the station's observation log: add, list,
   import and export attempts. */
#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "formats/render_site.h"

static void
usage(FILE *f)
{
	fprintf(f,
	    "usage: moonrange log add --db FILE --target ID --start UTC --end UTC\n"
	    "                         --shots N --returns N --normal-points N\n"
	    "                         --outcome WORD --operator NAME\n"
	    "                         [--seeing ARCSEC] [--notes TEXT] [--json]\n"
	    "       moonrange log list --db FILE [--since UTC] [--until UTC]\n"
	    "                         [--target ID] [--limit N] [--json|--csv]\n"
	    "       moonrange log import --db FILE FILE.csv\n"
	    "       moonrange log export --db FILE [--csv] [--since UTC]\n"
	    "                         [--until UTC] [--target ID]\n"
	    "\n"
	    "The observation log: one row per ranging attempt.  On every insert\n"
	    "the synodic angle, mean elongation, target elevation and the Sun's\n"
	    "elevation at the target are computed at the attempt's mid-time and\n"
	    "stored with it.\n"
	    "\n"
	    "  add      log one attempt; prints the stored row\n"
	    "  list     attempts, oldest first (--limit: the newest N)\n"
	    "  import   a CSV file (columns: " RENDER_SITE_ATTEMPT_CSV_HEADER ")\n"
	    "           in one transaction: every bad row is reported with its\n"
	    "           line and nothing is stored; rows already present (same\n"
	    "           target and start) are skipped and counted\n"
	    "  export   the log as CSV (RFC 4180) in the import format\n"
	    "\n"
	    "  --outcome   one of ranged no_returns weather technical safety other\n"
	    "  --returns   return photons detected\n"
	    "  --since/--until  start time range, since inclusive, until exclusive\n"
	    "  --help      this text\n");
}

enum log_opt {
	O_DB = 256, O_TARGET, O_START, O_END, O_SHOTS, O_RETURNS, O_NP,
	O_OUTCOME, O_OPERATOR, O_SEEING, O_NOTES, O_JSON, O_CSV, O_SINCE,
	O_UNTIL, O_LIMIT, O_HELP
};

static const struct option log_opts[] = {
	{"db", required_argument, NULL, O_DB},
	{"target", required_argument, NULL, O_TARGET},
	{"start", required_argument, NULL, O_START},
	{"end", required_argument, NULL, O_END},
	{"shots", required_argument, NULL, O_SHOTS},
	{"returns", required_argument, NULL, O_RETURNS},
	{"normal-points", required_argument, NULL, O_NP},
	{"outcome", required_argument, NULL, O_OUTCOME},
	{"operator", required_argument, NULL, O_OPERATOR},
	{"seeing", required_argument, NULL, O_SEEING},
	{"notes", required_argument, NULL, O_NOTES},
	{"json", no_argument, NULL, O_JSON},
	{"csv", no_argument, NULL, O_CSV},
	{"since", required_argument, NULL, O_SINCE},
	{"until", required_argument, NULL, O_UNTIL},
	{"limit", required_argument, NULL, O_LIMIT},
	{"help", no_argument, NULL, O_HELP},
	{NULL, 0, NULL, 0}
};

/* Everything the four actions may be given. */
struct log_args {
	const char *db, *target, *outcome, *op, *notes;
	const char *start, *end;
	long shots, returns, nps;
	int have_shots, have_returns, have_nps;
	double seeing, since, until;
	long limit;
	int json, csv;
	const char *file;
	int help;
};

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

static int
count_opt(const char *opt, const char *s, long *v, int *have)
{
	if (cli_parse_long(s, 0, 1000000000L, v))
		return cli_usage_error("%s: '%s' is not a whole number "
		    "0..1000000000", opt, s);
	*have = 1;
	return CLI_EXIT_OK;
}

static int
parse_args(int argc, char **argv, struct log_args *a)
{
	int c, st;

	memset(a, 0, sizeof *a);
	a->seeing = a->since = a->until = NAN;
	optind = 1;
	opterr = 0;
	while ((c = getopt_long(argc, argv, "", log_opts, NULL)) != -1) {
		st = CLI_EXIT_OK;
		switch (c) {
		case O_DB: a->db = optarg; break;
		case O_TARGET: a->target = optarg; break;
		case O_START: a->start = optarg; break;
		case O_END: a->end = optarg; break;
		case O_SHOTS:
			st = count_opt("--shots", optarg, &a->shots,
			    &a->have_shots);
			break;
		case O_RETURNS:
			st = count_opt("--returns", optarg, &a->returns,
			    &a->have_returns);
			break;
		case O_NP:
			st = count_opt("--normal-points", optarg, &a->nps,
			    &a->have_nps);
			break;
		case O_OUTCOME: a->outcome = optarg; break;
		case O_OPERATOR: a->op = optarg; break;
		case O_SEEING:
			if (cli_parse_double(optarg, 0.001, 60, &a->seeing))
				return cli_usage_error("--seeing: '%s' is not "
				    "a number of arcseconds in 0..60", optarg);
			break;
		case O_NOTES: a->notes = optarg; break;
		case O_JSON: a->json = 1; break;
		case O_CSV: a->csv = 1; break;
		case O_SINCE:
			st = cli_store_parse_mjd("--since", optarg, &a->since);
			break;
		case O_UNTIL:
			st = cli_store_parse_mjd("--until", optarg, &a->until);
			break;
		case O_LIMIT:
			if (cli_parse_long(optarg, 1, 100000000L, &a->limit))
				return cli_usage_error("--limit: '%s' is not a "
				    "whole number >= 1", optarg);
			break;
		case O_HELP: a->help = 1; break;
		default:
			return cli_bad_option("log", argv[0],
			    argv[optind - 1]);
		}
		if (st != CLI_EXIT_OK)
			return st;
	}
	if (optind < argc)
		a->file = argv[optind++];
	if (optind < argc)
		return cli_extra_argument("log", argv[0], argv[optind]);
	if (a->json && a->csv)
		return cli_usage_error("--json and --csv exclude each other");
	return CLI_EXIT_OK;
}

/* --- add ------------------------------------------------------------------ */

static int
log_add(const struct log_args *a)
{
	struct cli_store c;
	struct site_attempt at;
	struct mbuf out;
	char err[512];
	int oc, st;
	enum errcode rc;

	memset(&at, 0, sizeof at);
	if (a->target == NULL || a->start == NULL || a->end == NULL ||
	    !a->have_shots || !a->have_returns || !a->have_nps ||
	    a->outcome == NULL || a->op == NULL)
		return cli_usage_error("log add: --target, --start, --end, "
		    "--shots, --returns, --normal-points, --outcome and "
		    "--operator are required");
	if ((st = copy_text(at.target, sizeof at.target, "--target",
	    a->target)) ||
	    (st = cli_store_parse_mjd("--start", a->start, &at.start_mjd)) ||
	    (st = cli_store_parse_mjd("--end", a->end, &at.end_mjd)))
		return st;
	if (!(at.end_mjd > at.start_mjd))
		return cli_usage_error("--end: %s is not after --start %s",
		    a->end, a->start);
	if (at.end_mjd - at.start_mjd > 1.0)
		return cli_usage_error("--end: an attempt longer than a day "
		    "is not plausible");
	if ((oc = site_outcome_parse(a->outcome)) < 0)
		return cli_usage_error("--outcome: '%s' is not one of ranged "
		    "no_returns weather technical safety other", a->outcome);
	at.outcome = (enum site_outcome)oc;
	if (*a->op == '\0')
		return cli_usage_error("--operator: must not be empty");
	if ((st = copy_text(at.operator_name, sizeof at.operator_name,
	    "--operator", a->op)) ||
	    (a->notes != NULL && (st = copy_text(at.notes, sizeof at.notes,
	    "--notes", a->notes))))
		return st;
	at.shots = a->shots;
	at.returns = a->returns;
	at.normal_points = a->nps;
	at.seeing_arcsec = a->seeing;

	if ((st = cli_store_open(&c, a->db, 0)) != CLI_EXIT_OK)
		return st;
	if ((rc = store_station_get(c.s, &c.station, err, sizeof err)) ||
	    (rc = store_attempt_log(c.s, &at, err, sizeof err))) {
		st = cli_store_fail(rc, "log add: %s", err);
		goto out;
	}
	mbuf_init(&out);
	if (a->json)
		rc = render_site_attempt_json(&at, &out);
	else
		rc = render_site_attempts_text(&at, 1, c.station.time_zone,
		    &out);
	st = cli_emit_rendered(rc, &out);
	mbuf_free(&out);
out:
	cli_store_close(&c);
	return st;
}

/* --- list and export ------------------------------------------------------ */

static int
log_list(const struct log_args *a, int export)
{
	struct cli_store c;
	struct store_query q;
	struct site_attempt *rows = NULL;
	size_t n = 0;
	struct mbuf out;
	char err[512];
	int st;
	enum errcode rc;

	if (export && a->json)
		return cli_usage_error("log export: the export format is CSV");
	if ((st = cli_store_open(&c, a->db, STORE_OPEN_READONLY)) !=
	    CLI_EXIT_OK)
		return st;
	store_query_init(&q);
	q.since_mjd = a->since;
	q.until_mjd = a->until;
	q.target = a->target;
	if (a->limit > 0 && !export) {
		/* The newest N, shown oldest first. */
		q.limit = (size_t)a->limit;
		q.newest_first = 1;
	}
	if ((rc = store_attempts_list(c.s, &q, &rows, &n, err, sizeof err))) {
		st = cli_fail("%s: %s", c.path, err);
		goto out;
	}
	for (size_t i = 0; q.newest_first && i < n / 2; i++) {
		struct site_attempt tmp = rows[i];

		rows[i] = rows[n - 1 - i];
		rows[n - 1 - i] = tmp;
	}
	if (!export && !a->json && !a->csv)
		(void)store_station_get(c.s, &c.station, NULL, 0);
	mbuf_init(&out);
	if (export)
		rc = render_site_attempts_csv(rows, n, 0, &out);
	else if (a->json)
		rc = render_site_attempts_json(rows, n, &out);
	else if (a->csv)
		rc = render_site_attempts_csv(rows, n, 1, &out);
	else
		rc = render_site_attempts_text(rows, n,
		    c.station.time_zone[0] ? c.station.time_zone : NULL, &out);
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
log_import(const struct log_args *a)
{
	struct cli_store c;
	struct cli_store_counts n;
	int st;

	if (a->file == NULL)
		return cli_usage_error("log import: a CSV file is required");
	if ((st = cli_store_open(&c, a->db, 0)) == CLI_EXIT_OK &&
	    (st = cli_store_load(&c)) == CLI_EXIT_OK &&
	    (st = cli_store_import_file(&c, a->file, 'a', &n)) == CLI_EXIT_OK)
		printf("%s: %zu attempt%s read, %zu added, %zu already "
		    "present (skipped)\n", a->file, n.read,
		    n.read == 1 ? "" : "s", n.added, n.present);
	cli_store_close(&c);
	return st;
}

/* --- dispatch ------------------------------------------------------------- */

int
cmd_log(int argc, char **argv)
{
	static const char *const actions[] = {"add", "list", "import",
	    "export", NULL};
	struct log_args a;
	int st, which = -1;

	if ((st = cli_store_action(argc, argv, actions, usage, &which)) >= 0)
		return st;
	if ((st = parse_args(argc - 1, argv + 1, &a)) != CLI_EXIT_OK)
		return st;
	if (a.help) {
		usage(stdout);
		return CLI_EXIT_OK;
	}
	if (a.file != NULL && which != 2)
		return cli_extra_argument("log", argv[1], a.file);
	switch (which) {
	case 0:
		return log_add(&a);
	case 1:
		return log_list(&a, 0);
	case 2:
		return log_import(&a);
	default:
		return log_list(&a, 1);
	}
}
