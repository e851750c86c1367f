/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_setting.c: "moonrange setting", the station-wide settings of the
   planner and the coverage audit. */
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cli_store.h"

/* The keys, their defaults and meaning, for --help. */
static void
more(FILE *f)
{
	const struct store_setting_info *k;

	fprintf(f, "\nSettings kept in the database (defaults apply until "
	    "set):\n");
	for (size_t i = 0; (k = store_setting_info(i)) != NULL; i++) {
		fprintf(f, "  %s (default %s)\n", k->key, k->def);
		cli_wrap(f, k->help, 0, 6);
	}
}

static enum errcode
list_job(struct cli_store *c, const struct cli_args *a, void *ctx,
    struct mbuf *out, char *err, size_t errlen)
{
	const struct store_setting_info *k;
	char v[64];
	enum errcode rc;

	(void)a;
	(void)ctx;
	for (size_t i = 0; (k = store_setting_info(i)) != NULL; i++) {
		if ((rc = store_setting_get(c->s, k->key, v, sizeof v, err,
		    errlen)))
			return rc;
		mbuf_printf(out, "%-16s %s\n", k->key, v);
	}
	return ERRCODE_OK;
}

static int
setting_list(const struct cli_args *a)
{
	return cli_store_run(a, STORE_OPEN_READONLY, list_job, NULL);
}

static enum errcode
set_job(struct cli_store *c, const struct cli_args *a, void *ctx,
    struct mbuf *out, char *err, size_t errlen)
{
	(void)ctx;
	(void)out;
	return store_setting_set(c->s, a->ops[0], a->ops[1], err, errlen);
}

static int
setting_set(const struct cli_args *a)
{
	return cli_store_run(a, 0, set_job, NULL);
}

static const struct cli_option options[] = {
	CLI_OPT_DB,
	CLI_OPT_END
};

static const struct cli_command setting_list_cmd = {
	.name = "list",
	.summary = "every setting and its value",
	.about = "Every setting with its value (the default until set).",
	.options = options,
	.run = setting_list,
};

static const struct cli_command setting_set_cmd = {
	.name = "set",
	.summary = "change one setting",
	.about = "Change one setting; the value is checked per key.",
	.options = options,
	.operands = "KEY VALUE",
	.nmin = 2,
	.nmax = 2,
	.run = setting_set,
	.more = more,
};

static const struct cli_command *const actions[] = {
	&setting_list_cmd, &setting_set_cmd, NULL
};

const struct cli_command cmd_setting = {
	.name = "setting",
	.summary = "settings of the planner and the audit",
	.about = "Station-wide settings of the planner and the coverage "
	    "audit, kept in the database.",
	.actions = actions,
	.more = more,
};
