/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_blackout.c: "moonrange blackout", spans when the station does not
   range (maintenance, airspace closures): add, list, remove. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "cli/cli_store.h"
#include "formats/render_site.h"

static enum errcode
add_job(struct cli_store *c, const struct cli_args *a, void *ctx,
    struct mbuf *out, char *err, size_t errlen)
{
	struct site_blackout *b = ctx;
	enum errcode rc;

	(void)a;
	if ((rc = store_blackout_add(c->s, b, err, errlen)) == ERRCODE_OK)
		mbuf_printf(out, "blackout %ld added\n", b->id);
	return rc;
}

int
cmd_blackout_add(const struct cli_args *a)
{
	const char *reason = cli_text(a, "reason", "");
	struct site_blackout b;

	memset(&b, 0, sizeof b);
	b.start_mjd = cli_real(a, "start", NAN);
	b.end_mjd = cli_real(a, "end", NAN);
	if (!(b.end_mjd > b.start_mjd))
		return cli_usage_error("--end: not after --start");
	if (strlen(reason) >= sizeof b.reason || !import_text_ok(reason, 0))
		return cli_usage_error("--reason: at most %zu bytes of UTF-8 "
		    "text on one line", sizeof b.reason - 1);
	strcpy(b.reason, reason);
	return cli_store_run(a, 0, add_job, &b);
}

enum errcode
cmd_blackout_list(struct cli_store *c, const struct cli_args *a, void *ctx,
    struct mbuf *out, char *err, size_t errlen)
{
	struct site_blackout *list = NULL;
	size_t n = 0;
	enum errcode rc;

	(void)ctx;
	if ((rc = store_blackouts_list(c->s, cli_real(a, "since", NAN),
	    cli_real(a, "until", NAN), &list, &n, err, errlen)))
		return rc;
	rc = cli_given(a, "json") ? render_site_blackouts_json(list, n, out) :
	    render_site_blackouts_text(list, n, out);
	mem_free(list);
	return rc;
}

static enum errcode
remove_job(struct cli_store *c, const struct cli_args *a, void *ctx,
    struct mbuf *out, char *err, size_t errlen)
{
	long id = *(long *)ctx;
	enum errcode rc;

	(void)a;
	if ((rc = store_blackout_remove(c->s, id, err, errlen)) == ERRCODE_OK)
		mbuf_printf(out, "blackout %ld removed\n", id);
	return rc;
}

int
cmd_blackout_remove(const struct cli_args *a)
{
	long id = 0;

	if (cli_parse_long(a->ops[0], 1, 2000000000L, &id))
		return cli_usage_error("blackout remove: one blackout id (a "
		    "whole number, see 'blackout list') is required");
	return cli_store_run(a, 0, remove_job, &id);
}
