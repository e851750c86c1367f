/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_setting.c: "moonrange setting", the station-wide settings of the
   planner and the coverage audit. */
#include <getopt.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cli_store.h"

static void
usage(FILE *f)
{
	const struct store_setting_info *k;

	fprintf(f,
	    "usage: moonrange setting list --db FILE\n"
	    "       moonrange setting set --db FILE KEY VALUE\n"
	    "\n"
	    "Settings kept in the database (defaults apply until set):\n");
	for (size_t i = 0; (k = store_setting_info(i)) != NULL; i++)
		fprintf(f, "  %-16s default %-8s %s\n", k->key, k->def, k->help);
	fprintf(f, "\n  --help   this text\n");
}

int
cmd_setting(int argc, char **argv)
{
	static const char *const actions[] = {"list", "set", NULL};
	static const struct option opts[] = {
		{"db", required_argument, NULL, 'd'},
		{"help", no_argument, NULL, 'h'},
		{NULL, 0, NULL, 0}
	};
	const struct store_setting_info *k;
	struct cli_store c;
	const char *db = NULL;
	char err[512], v[64];
	int ch, which, act = 0, st, list;
	enum errcode rc;

	if ((which = cli_store_action(argc, argv, actions, usage, &act)) >=
	    0)
		return which;
	list = act == 0;
	argc--;
	argv++;
	optind = 1;
	opterr = 0;
	while ((ch = getopt_long(argc, argv, "", opts, NULL)) != -1) {
		switch (ch) {
		case 'd': db = optarg; break;
		case 'h':
			usage(stdout);
			return CLI_EXIT_OK;
		default:
			return cli_usage_error("setting %s: unknown or "
			    "incomplete option '%s' (see 'moonrange setting "
			    "--help')", argv[0], argv[optind - 1]);
		}
	}
	if (list ? optind != argc : optind + 2 != argc)
		return cli_usage_error(list ? "setting list: no arguments" :
		    "setting set: KEY and VALUE are required");
	if ((st = cli_store_open(&c, db, list ? STORE_OPEN_READONLY : 0)))
		return st;
	if (!list) {
		if ((rc = store_setting_set(c.s, argv[optind], argv[optind + 1],
		    err, sizeof err)))
			st = cli_store_fail(rc, "setting set: %s", err);
	} else {
		for (size_t i = 0; (k = store_setting_info(i)) != NULL; i++) {
			if ((rc = store_setting_get(c.s, k->key, v, sizeof v,
			    err, sizeof err))) {
				st = cli_store_fail(rc, "%s: %s", c.path, err);
				break;
			}
			printf("%-16s %s\n", k->key, v);
		}
	}
	cli_store_close(&c);
	return st;
}
