/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_target.c: "moonrange target", the lunar targets of the station:
   add, list, set, retire. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "cli/cli_store.h"
#include "formats/import_util.h"
#include "formats/render_site.h"

/* Which fields an option set touched, applied over a stored target. */
struct target_edit {
	const char *name, *alias;
	double lat, lon, height, strength;
	int dark_only, active;		/* -1: not given */
};

static int
apply(struct site_target *t, const struct target_edit *e)
{
	if (e->name != NULL) {
		if (*e->name == '\0' || strlen(e->name) >= sizeof t->name ||
		    !import_text_ok(e->name, 0))
			return cli_usage_error("--name: 1..%zu bytes of UTF-8 "
			    "text on one line", sizeof t->name - 1);
		strcpy(t->name, e->name);
	}
	if (e->alias != NULL) {
		if (*e->alias != '\0' && !import_valid_ident(e->alias,
		    sizeof t->alias - 1, 1))
			return cli_usage_error("--alias: '%s' is not 1..%zu "
			    "letters, digits, '_', '-' or '.'", e->alias,
			    sizeof t->alias - 1);
		strcpy(t->alias, e->alias);
	}
	if (!isnan(e->lat))
		t->lat_deg = e->lat;
	if (!isnan(e->lon))
		t->lon_deg = e->lon;
	if (!isnan(e->height))
		t->height_m = e->height;
	if (!isnan(e->strength))
		t->strength = e->strength;
	if (e->dark_only >= 0)
		t->dark_only = e->dark_only;
	if (e->active >= 0)
		t->active = e->active;
	return CLI_EXIT_OK;
}

/* The fields the options of a touched, for target set (mode 0), retire
   (mode 1, which only retires) and add (mode 2). */
static void
edit_of(const struct cli_args *a, struct target_edit *e, int mode)
{
	/* retire has only --db: ask for no other option (the table asserts
	   that an option read is one of the command's) */
	struct target_edit retire = {NULL, NULL, NAN, NAN, NAN, NAN, -1, 0};

	if (mode == 1) {
		*e = retire;
		return;
	}
	e->name = cli_text(a, "name", NULL);
	e->alias = cli_text(a, "alias", NULL);
	e->lat = cli_real(a, "lat", NAN);
	e->lon = cli_real(a, "lon", NAN);
	e->height = cli_real(a, "height", NAN);
	e->strength = cli_real(a, "strength", NAN);
	e->dark_only = (int)cli_whole(a, "dark-only", -1);
	e->active = mode == 0 ? (int)cli_whole(a, "active", -1) : -1;
}

/* The operand ID, checked. */
static int
check_id(const struct cli_args *a)
{
	if (!import_valid_ident(a->ops[0], SITE_ID_LEN - 1, 1))
		return cli_usage_error("%s: an ID of 1-32 letters, digits, "
		    "'_', '-' or '.' is required", a->path);
	return CLI_EXIT_OK;
}

int
cmd_target_write(const struct cli_args *a)
{
	int mode = a->cmd->mode, add = mode == 2;
	struct target_edit e;
	struct site_target t;
	struct cli_store c;
	char err[512];
	int st;
	enum errcode rc = ERRCODE_OK;

	if ((st = check_id(a)) != CLI_EXIT_OK)
		return st;
	edit_of(a, &e, mode);
	if ((st = cli_store_open(&c, cli_text(a, "db", NULL), 0)))
		return st;
	if (add) {
		site_target_init(&t);
		strcpy(t.id, a->ops[0]);
	} else {
		rc = store_target_get(c.s, a->ops[0], &t, err, sizeof err);
	}
	if (rc != ERRCODE_OK)
		st = cli_store_fail(rc, "%s: %s", a->path, err);
	else if ((st = apply(&t, &e)) != CLI_EXIT_OK)
		;
	else if ((rc = add ? store_target_add(c.s, &t, err, sizeof err) :
	    store_target_update(c.s, &t, err, sizeof err)))
		st = cli_store_fail(rc, "%s: %s", a->path, err);
	else
		printf("target %s %s\n", t.id, add ? "added" : mode == 1 ?
		    "retired" : "updated");
	cli_store_close(&c);
	return st;
}

enum errcode
cmd_target_list(struct cli_store *c, const struct cli_args *a, void *ctx,
    struct mbuf *out, char *err, size_t errlen)
{
	struct site_target *list = NULL;
	size_t n = 0;
	enum errcode rc;

	(void)ctx;
	if ((rc = store_targets_list(c->s, !cli_given(a, "all"), &list, &n,
	    err, errlen)))
		return rc;
	rc = cli_given(a, "json") ? render_site_targets_json(list, n, out) :
	    render_site_targets_text(list, n, out);
	mem_free(list);
	return rc;
}
