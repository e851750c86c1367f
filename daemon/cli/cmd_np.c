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

int
cmd_np_import(const struct cli_args *a)
{
	struct cli_store c;
	struct cli_store_counts n;
	int st;

	if ((st = cli_store_open(&c, cli_text(a, "db", NULL), 0)))
		return st;
	if ((st = cli_store_load(&c)) != CLI_EXIT_OK)
		goto out;
	/* One transaction per file: a bad file leaves the others stored. */
	for (int i = 0; i < a->nops; i++) {
		int fst = cli_store_import_file(&c, a->ops[i], 'n', &n);

		if (fst == CLI_EXIT_OK)
			printf("%s: %zu normal point%s read, %zu added, %zu "
			    "already present, %zu records of unused types "
			    "skipped\n", a->ops[i], n.read, n.read == 1 ? "" :
			    "s", n.added, n.present, n.unused);
		else if (st == CLI_EXIT_OK || fst == CLI_EXIT_FAIL ||
		    fst == CLI_EXIT_INTERRUPTED)
			st = fst;
		if (fst == CLI_EXIT_INTERRUPTED)
			break;		/* the files before it are stored */
	}
out:
	cli_store_close(&c);
	return st;
}
