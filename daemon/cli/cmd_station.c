/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_station.c: "moonrange station", show and change the stored station. */
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "cli/cli_store.h"
#include "formats/render_site.h"

/* The keys of the station file, for --help. */
void
cmd_station_more(FILE *f)
{
	size_t n = 0;
	const struct import_key *k = import_station_keys(&n);

	fprintf(f, "\nKeys (as in station.ini):\n");
	for (size_t i = 0; i < n; i++) {
		fprintf(f, "  %s.%s\n", k[i].section, k[i].name);
		cli_wrap(f, k[i].help, 0, 6);
	}
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

/* station show, and station set (mode 1). */
int
cmd_station(const struct cli_args *a)
{
	int set = a->cmd->mode;
	struct site_station st;
	struct cli_store c;
	struct mbuf out;
	char err[512];
	int status;
	enum errcode rc;

	if ((status = cli_store_open(&c, cli_text(a, "db", NULL), set ? 0 :
	    STORE_OPEN_READONLY)))
		return status;
	if ((rc = store_station_get(c.s, &st, err, sizeof err))) {
		status = cli_store_fail(rc, "%s: %s", c.path, err);
		goto out;
	}
	for (int i = 0; set && i < a->nops; i++)
		if ((status = set_one(&st, a->ops[i])) != CLI_EXIT_OK)
			goto out;
	if (set && (status = cli_store_check_zone(&st, "station set")) !=
	    CLI_EXIT_OK)
		goto out;
	if (set && (rc = store_station_put(c.s, &st, err, sizeof err))) {
		status = cli_store_fail(rc, "station set: %s", err);
		goto out;
	}
	mbuf_init(&out);
	if (cli_given(a, "json"))
		rc = render_site_station_json(&st, &out);
	else
		rc = render_site_station_text(&st, &out);
	status = cli_emit_rendered(rc, &out);
	mbuf_free(&out);
out:
	cli_store_close(&c);
	return status;
}
