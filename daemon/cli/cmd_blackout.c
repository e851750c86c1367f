/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_blackout.c: "moonrange blackout", spans when the station does not
   range (maintenance, airspace closures): add, list, remove. */
#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "formats/render_site.h"

static void
usage(FILE *f)
{
	fprintf(f,
	    "usage: moonrange blackout add --db FILE --start UTC --end UTC\n"
	    "                             [--reason TEXT]\n"
	    "       moonrange blackout list --db FILE [--since UTC] [--until UTC]\n"
	    "                             [--json]\n"
	    "       moonrange blackout remove --db FILE ID\n"
	    "\n"
	    "Blackouts: spans in which no window is planned.  list shows those\n"
	    "overlapping --since..--until (default: all).\n"
	    "\n"
	    "  --help   this text\n");
}

int
cmd_blackout(int argc, char **argv)
{
	static const struct option opts[] = {
		{"db", required_argument, NULL, 'd'},
		{"start", required_argument, NULL, 's'},
		{"end", required_argument, NULL, 'e'},
		{"reason", required_argument, NULL, 'r'},
		{"since", required_argument, NULL, 'S'},
		{"until", required_argument, NULL, 'U'},
		{"json", no_argument, NULL, 'j'},
		{"help", no_argument, NULL, 'h'},
		{NULL, 0, NULL, 0}
	};
	static const char *const actions[] = {"add", "list", "remove",
	    NULL};
	struct site_blackout b, *list = NULL;
	struct cli_store c;
	struct mbuf out;
	const char *db = NULL, *reason = "";
	double since = NAN, until = NAN;
	char err[512];
	int ch, st = CLI_EXIT_OK, which = -1, json = 0;
	long id = 0;
	size_t n = 0;
	enum errcode rc;

	if ((st = cli_store_action(argc, argv, actions, usage, &which)) >= 0)
		return st;
	st = CLI_EXIT_OK;
	memset(&b, 0, sizeof b);
	b.start_mjd = b.end_mjd = NAN;
	argc--;
	argv++;
	optind = 1;
	opterr = 0;
	while ((ch = getopt_long(argc, argv, "", opts, NULL)) != -1) {
		switch (ch) {
		case 'd': db = optarg; break;
		case 's':
			st = cli_store_parse_mjd("--start", optarg, &b.start_mjd);
			break;
		case 'e':
			st = cli_store_parse_mjd("--end", optarg, &b.end_mjd);
			break;
		case 'r': reason = optarg; break;
		case 'S': st = cli_store_parse_mjd("--since", optarg, &since); break;
		case 'U': st = cli_store_parse_mjd("--until", optarg, &until); break;
		case 'j': json = 1; break;
		case 'h':
			usage(stdout);
			return CLI_EXIT_OK;
		default:
			return cli_usage_error("blackout %s: unknown or "
			    "incomplete option '%s' (see 'moonrange blackout "
			    "--help')", argv[0], argv[optind - 1]);
		}
		if (st != CLI_EXIT_OK)
			return st;
	}
	if (which == 2) {
		if (optind + 1 != argc || cli_parse_long(argv[optind], 1,
		    2000000000L, &id))
			return cli_usage_error("blackout remove: one blackout "
			    "id (a whole number, see 'blackout list') is "
			    "required");
	} else if (optind < argc) {
		return cli_extra_argument("blackout", argv[0], argv[optind]);
	}
	if (which == 0) {
		if (isnan(b.start_mjd) || isnan(b.end_mjd))
			return cli_usage_error("blackout add: --start and --end "
			    "are required");
		if (!(b.end_mjd > b.start_mjd))
			return cli_usage_error("--end: not after --start");
		if (strlen(reason) >= sizeof b.reason ||
		    !import_text_ok(reason, 0))
			return cli_usage_error("--reason: at most %zu bytes of "
			    "UTF-8 text on one line", sizeof b.reason - 1);
		strcpy(b.reason, reason);
	}
	if ((st = cli_store_open(&c, db, which == 1 ? STORE_OPEN_READONLY :
	    0)))
		return st;
	switch (which) {
	case 0:
		if ((rc = store_blackout_add(c.s, &b, err, sizeof err)))
			st = cli_store_fail(rc, "blackout add: %s", err);
		else
			printf("blackout %ld added\n", b.id);
		break;
	case 2:
		if ((rc = store_blackout_remove(c.s, id, err, sizeof err)))
			st = cli_store_fail(rc, "blackout remove: %s", err);
		else
			printf("blackout %ld removed\n", id);
		break;
	default:
		if ((rc = store_blackouts_list(c.s, since, until, &list, &n,
		    err, sizeof err))) {
			st = cli_store_fail(rc, "%s: %s", c.path, err);
			break;
		}
		mbuf_init(&out);
		if (json)
			rc = render_site_blackouts_json(list, n, &out);
		else
			rc = render_site_blackouts_text(list, n, &out);
		st = cli_emit_rendered(rc, &out);
		mbuf_free(&out);
		mem_free(list);
		break;
	}
	cli_store_close(&c);
	return st;
}
