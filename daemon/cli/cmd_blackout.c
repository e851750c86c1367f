/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_blackout.c: "moonrange blackout", spans when the station does not
   range (maintenance, airspace closures): add, list, remove. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "formats/render_site.h"

static int
blackout_add(const struct cli_args *a)
{
	const char *reason = cli_text(a, "reason", "");
	struct site_blackout b;
	struct cli_store c;
	char err[512];
	int st;
	enum errcode rc;

	memset(&b, 0, sizeof b);
	b.start_mjd = cli_real(a, "start", NAN);
	b.end_mjd = cli_real(a, "end", NAN);
	if (!(b.end_mjd > b.start_mjd))
		return cli_usage_error("--end: not after --start");
	if (strlen(reason) >= sizeof b.reason || !import_text_ok(reason, 0))
		return cli_usage_error("--reason: at most %zu bytes of UTF-8 "
		    "text on one line", sizeof b.reason - 1);
	strcpy(b.reason, reason);
	if ((st = cli_store_open(&c, cli_text(a, "db", NULL), 0)))
		return st;
	if ((rc = store_blackout_add(c.s, &b, err, sizeof err)))
		st = cli_store_fail(rc, "blackout add: %s", err);
	else
		printf("blackout %ld added\n", b.id);
	cli_store_close(&c);
	return st;
}

static int
blackout_list(const struct cli_args *a)
{
	struct site_blackout *list = NULL;
	struct cli_store c;
	struct mbuf out;
	char err[512];
	size_t n = 0;
	int st;
	enum errcode rc;

	if ((st = cli_store_open(&c, cli_text(a, "db", NULL),
	    STORE_OPEN_READONLY)))
		return st;
	if ((rc = store_blackouts_list(c.s, cli_real(a, "since", NAN),
	    cli_real(a, "until", NAN), &list, &n, err, sizeof err))) {
		st = cli_store_fail(rc, "%s: %s", c.path, err);
	} else {
		mbuf_init(&out);
		if (cli_given(a, "json"))
			rc = render_site_blackouts_json(list, n, &out);
		else
			rc = render_site_blackouts_text(list, n, &out);
		st = cli_emit_rendered(rc, &out);
		mbuf_free(&out);
		mem_free(list);
	}
	cli_store_close(&c);
	return st;
}

static int
blackout_remove(const struct cli_args *a)
{
	struct cli_store c;
	char err[512];
	long id = 0;
	int st;
	enum errcode rc;

	if (cli_parse_long(a->ops[0], 1, 2000000000L, &id))
		return cli_usage_error("blackout remove: one blackout id (a "
		    "whole number, see 'blackout list') is required");
	if ((st = cli_store_open(&c, cli_text(a, "db", NULL), 0)))
		return st;
	if ((rc = store_blackout_remove(c.s, id, err, sizeof err)))
		st = cli_store_fail(rc, "blackout remove: %s", err);
	else
		printf("blackout %ld removed\n", id);
	cli_store_close(&c);
	return st;
}

/* --- the table ----------------------------------------------------------- */


static const struct cli_option add_options[] = {
	CLI_OPT_DB,
	{.name = "start", .kind = CLI_TIME, .arg = "UTC",
	    .flags = CLI_REQUIRED, .help = "start of the blackout"},
	{.name = "end", .kind = CLI_TIME, .arg = "UTC", .flags = CLI_REQUIRED,
	    .help = "its end, after the start"},
	{.name = "reason", .kind = CLI_TEXT, .arg = "TEXT",
	    .help = "why (one line)"},
	CLI_OPT_END
};

static const struct cli_option list_options[] = {
	CLI_OPT_DB,
	{.name = "since", .kind = CLI_TIME, .arg = "UTC",
	    .help = "blackouts ending after this time"},
	{.name = "until", .kind = CLI_TIME, .arg = "UTC",
	    .help = "blackouts starting before this time"},
	{.name = "json", .kind = CLI_FLAG, .help = "{\"blackouts\":[...]}"},
	CLI_OPT_END
};

static const struct cli_option remove_options[] = {CLI_OPT_DB, CLI_OPT_END};

static const struct cli_command blackout_add_cmd = {
	.name = "add",
	.summary = "add a span without ranging",
	.about = "Add a blackout: no window is planned from --start to --end.",
	.options = add_options,
	.run = blackout_add,
};

static const struct cli_command blackout_list_cmd = {
	.name = "list",
	.summary = "the blackouts overlapping a span (default: all)",
	.about = "The blackouts overlapping --since..--until (default: all).",
	.options = list_options,
	.run = blackout_list,
};

static const struct cli_command blackout_remove_cmd = {
	.name = "remove",
	.summary = "remove a blackout by its id",
	.about = "Remove a blackout by the id 'blackout list' shows.",
	.options = remove_options,
	.operands = "ID",
	.nmin = 1,
	.nmax = 1,
	.run = blackout_remove,
};

static const struct cli_command *const actions[] = {
	&blackout_add_cmd, &blackout_list_cmd, &blackout_remove_cmd, NULL
};

const struct cli_command cmd_blackout = {
	.name = "blackout",
	.summary = "spans without ranging: add, list, remove",
	.about = "Blackouts: spans in which no window is planned "
	    "(maintenance, airspace closures).",
	.actions = actions,
};
