/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_eop.c: "moonrange eop", the Earth-orientation table: import an IERS
   file, show what the table covers. */
#include <getopt.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "core/tscale.h"

static void
usage(FILE *f)
{
	fprintf(f,
	    "usage: moonrange eop import --db FILE [--c04] EOP_FILE\n"
	    "       moonrange eop status --db FILE\n"
	    "\n"
	    "The Earth orientation table (UT1-UTC and polar motion per day)\n"
	    "that ephem, log and the planner interpolate.  import reads the\n"
	    "IERS finals (Bulletin A) fixed columns (finals2000A.data,\n"
	    "finals.daily...) or, with --c04, the IERS EOP C04 series, in one\n"
	    "transaction; a day already in the table is replaced.\n"
	    "\n"
	    "  --c04    the file is in the C04 format\n"
	    "  --help   this text\n");
}

int
cmd_eop(int argc, char **argv)
{
	static const char *const actions[] = {"import", "status", NULL};
	static const struct option opts[] = {
		{"db", required_argument, NULL, 'd'},
		{"c04", no_argument, NULL, 'c'},
		{"help", no_argument, NULL, 'h'},
		{NULL, 0, NULL, 0}
	};
	struct cli_store c;
	struct cli_store_counts n;
	const char *db = NULL;
	char err[512], d0[40], d1[40];
	double first, last;
	int ch, which, act = 0, st, c04 = 0, import;
	enum errcode rc;

	if ((which = cli_store_action(argc, argv, actions, usage, &act)) >=
	    0)
		return which;
	import = act == 0;
	argc--;
	argv++;
	optind = 1;
	opterr = 0;
	while ((ch = getopt_long(argc, argv, "", opts, NULL)) != -1) {
		switch (ch) {
		case 'd': db = optarg; break;
		case 'c': c04 = 1; break;
		case 'h':
			usage(stdout);
			return CLI_EXIT_OK;
		default:
			return cli_bad_option("eop", argv[0],
			    argv[optind - 1]);
		}
	}
	if (import && optind + 1 != argc)
		return cli_usage_error("eop import: exactly one EOP file is "
		    "required");
	if (!import && optind < argc)
		return cli_extra_argument("eop", "status", argv[optind]);
	if ((st = cli_store_open(&c, db, import ? 0 : STORE_OPEN_READONLY)))
		return st;
	if (import) {
		st = cli_store_import_file(&c, argv[optind], c04 ? 'c' : 'e',
		    &n);
		if (st == CLI_EXIT_OK)
			printf("%s: %zu day%s read and stored\n", argv[optind],
			    n.read, n.read == 1 ? "" : "s");
	}
	if (st == CLI_EXIT_OK) {
		rc = store_eop_span(c.s, &first, &last, err, sizeof err);
		if (rc == ERRCODE_NOT_FOUND) {
			printf("EOP table: empty (DUT1 = 0 is used)\n");
		} else if (rc != ERRCODE_OK) {
			st = cli_fail("%s: %s", c.path, err);
		} else {
			(void)tscale_format_utc(2400000.5, first, 0, d0,
			    sizeof d0);
			(void)tscale_format_utc(2400000.5, last, 0, d1,
			    sizeof d1);
			printf("EOP table: MJD %.0f to %.0f (%.10s to %.10s)\n",
			    first, last, d0, d1);
		}
	}
	cli_store_close(&c);
	return st;
}
