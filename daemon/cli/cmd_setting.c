/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_setting.c: "moonrange setting", the station-wide settings of the
   planner and the coverage audit. */
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "cli/cli_store.h"

/* The keys, their defaults and meaning, for --help. */
void
cmd_setting_more(FILE *f)
{
	const struct store_setting_info *k;

	fprintf(f, "\nSettings kept in the database (defaults apply until "
	    "set):\n");
	for (size_t i = 0; (k = store_setting_info(i)) != NULL; i++) {
		fprintf(f, "  %s (default %s)\n", k->key, k->def);
		cli_wrap(f, k->help, 0, 6);
	}
}

enum errcode
cmd_setting_list(struct cli_store *c, const struct cli_args *a, void *ctx,
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

enum errcode
cmd_setting_set(struct cli_store *c, const struct cli_args *a, void *ctx,
    struct mbuf *out, char *err, size_t errlen)
{
	(void)ctx;
	(void)out;
	return store_setting_set(c->s, a->ops[0], a->ops[1], err, errlen);
}
