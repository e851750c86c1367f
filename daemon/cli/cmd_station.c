/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_station.c: "moonrange station", show and change the stored station. */
#include <getopt.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "formats/render_site.h"

static void
usage(FILE *f)
{
	size_t n = 0;
	const struct import_key *k = import_station_keys(&n);

	fprintf(f,
	    "usage: moonrange station show --db FILE [--json]\n"
	    "       moonrange station set --db FILE SECTION.KEY=VALUE...\n"
	    "\n"
	    "The station record (one per database).  set changes keys of the\n"
	    "station file, validated as in station.ini, all or none:\n"
	    "\n");
	for (size_t i = 0; i < n; i++)
		fprintf(f, "  %s.%s\n      %s\n", k[i].section, k[i].name,
		    k[i].help);
	fprintf(f, "\n  --help   this text\n");
}

/* Apply "SECTION.KEY=VALUE" to st; CLI status. */
static int
set_one(struct site_station *st, const char *arg)
{
	char sec[64], err[300];
	const char *dot = strchr(arg, '.'), *eq = strchr(arg, '=');

	if (dot == NULL || eq == NULL || dot > eq ||
	    (size_t)(dot - arg) >= sizeof sec)
		return cli_usage_error("station set: '%s' is not "
		    "SECTION.KEY=VALUE (see 'moonrange station --help')", arg);
	memcpy(sec, arg, (size_t)(dot - arg));
	sec[dot - arg] = '\0';
	{
		char key[64];
		size_t kl = (size_t)(eq - dot - 1);

		if (kl >= sizeof key)
			return cli_usage_error("station set: key too long in "
			    "'%s'", arg);
		memcpy(key, dot + 1, kl);
		key[kl] = '\0';
		if (import_station_set(st, sec, key, eq + 1, err, sizeof err))
			return cli_usage_error("station set: %s", err);
	}
	return CLI_EXIT_OK;
}

int
cmd_station(int argc, char **argv)
{
	static const char *const actions[] = {"show", "set", NULL};
	static const struct option opts[] = {
		{"db", required_argument, NULL, 'd'},
		{"json", no_argument, NULL, 'j'},
		{"help", no_argument, NULL, 'h'},
		{NULL, 0, NULL, 0}
	};
	struct site_station st;
	struct cli_store c;
	struct mbuf out;
	const char *db = NULL;
	char err[512];
	int ch, which, act = 0, json = 0, show, status;
	enum errcode rc;

	if ((which = cli_store_action(argc, argv, actions, usage, &act)) >=
	    0)
		return which;
	show = act == 0;
	argc--;
	argv++;
	optind = 1;
	opterr = 0;
	while ((ch = getopt_long(argc, argv, "", opts, NULL)) != -1) {
		switch (ch) {
		case 'd': db = optarg; break;
		case 'j': json = 1; break;
		case 'h':
			usage(stdout);
			return CLI_EXIT_OK;
		default:
			return cli_usage_error("station %s: unknown or "
			    "incomplete option '%s' (see 'moonrange station "
			    "--help')", argv[0], argv[optind - 1]);
		}
	}
	if (show && optind < argc)
		return cli_extra_argument("station", "show", argv[optind]);
	if (!show && optind >= argc)
		return cli_usage_error("station set: give at least one "
		    "SECTION.KEY=VALUE");
	if ((status = cli_store_open(&c, db, show ? STORE_OPEN_READONLY : 0)))
		return status;
	if ((rc = store_station_get(c.s, &st, err, sizeof err))) {
		status = cli_store_fail(rc, "%s: %s", c.path, err);
		goto out;
	}
	for (int i = optind; i < argc && !show; i++)
		if ((status = set_one(&st, argv[i])) != CLI_EXIT_OK)
			goto out;
	if (!show && (rc = store_station_put(c.s, &st, err, sizeof err))) {
		status = cli_store_fail(rc, "station set: %s", err);
		goto out;
	}
	if (!show)
		cli_store_warn_zone(&st);
	mbuf_init(&out);
	if (json)
		rc = render_site_station_json(&st, &out);
	else
		rc = render_site_station_text(&st, &out);
	status = cli_emit_rendered(rc, &out);
	mbuf_free(&out);
out:
	cli_store_close(&c);
	return status;
}
