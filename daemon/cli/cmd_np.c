/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_np.c: "moonrange np", normal points: import CRD files, list them. */
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "cli/cli_store.h"

int
cmd_np_count(const struct cli_args *a)
{
	struct store_query q;
	struct cli_store c;
	char err[512];
	size_t count = 0;
	int st;

	cli_store_query(a, &q);
	q.station_code = cli_text(a, "station", NULL);
	if ((st = cli_store_open(&c, cli_text(a, "db", NULL),
	    STORE_OPEN_READONLY)))
		return st;
	if (store_nps_count(c.s, &q, &count, err, sizeof err))
		st = cli_fail("%s: %s", c.path, err);
	else
		printf("%zu\n", count);
	cli_store_close(&c);
	return st;
}

/* What a CRD file gave. */
static void
said(const char *file, const struct cli_store_counts *n)
{
	printf("%s: %zu normal point%s read, %zu added, %zu already present, "
	    "%zu records of unused types skipped\n", file, n->read,
	    n->read == 1 ? "" : "s", n->added, n->present, n->unused);
}

int
cmd_np_import(const struct cli_args *a)
{
	return cli_store_import_ops(a, 'n', said);
}
