/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_eop.c: "moonrange eop", the Earth-orientation table: import an IERS
   file, show what the table covers. */
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "core/text.h"
#include "cli/cli_store.h"
#include "core/text.h"
#include "core/tscale.h"

/* eop import (mode 1) and eop status: then the table's span. */
int
cmd_eop(const struct cli_args *a)
{
	int import = a->cmd->mode;
	struct cli_store c;
	struct cli_store_counts n;
	char err[512], d0[40], d1[40];
	double first, last;
	int st;
	enum errcode rc;

	if ((st = cli_store_open(&c, cli_text(a, "db", NULL), import ? 0 :
	    STORE_OPEN_READONLY)))
		return st;
	if (import) {
		st = cli_store_import_file(&c, a->ops[0], cli_given(a, "c04") ?
		    'c' : 'e', &n);
		if (st == CLI_EXIT_OK)
			printf("%s: %zu day%s read and stored\n", a->ops[0],
			    n.read, n.read == 1 ? "" : "s");
	}
	if (st == CLI_EXIT_OK) {
		rc = store_eop_span(c.s, &first, &last, err, sizeof err);
		if (rc == ERRCODE_NOT_FOUND) {
			printf("EOP table: empty (DUT1 = 0 is used)\n");
		} else if (rc != ERRCODE_OK) {
			st = cli_fail("%s: %s", c.path, err);
		} else {
			(void)tscale_format_utc(TEXT_MJD0, first, 0, d0,
			    sizeof d0);
			(void)tscale_format_utc(TEXT_MJD0, last, 0, d1,
			    sizeof d1);
			printf("EOP table: MJD %.0f to %.0f (%.10s to %.10s)\n",
			    first, last, d0, d1);
		}
	}
	cli_store_close(&c);
	return st;
}
