/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_np.c: "moonrange np", normal points: import CRD files, list them. */
#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cli_store.h"

static void
usage(FILE *f)
{
	fprintf(f,
	    "usage: moonrange np import --db FILE CRD_FILE...\n"
	    "       moonrange np count --db FILE [--since UTC] [--until UTC]\n"
	    "                          [--target ID] [--station CODE]\n"
	    "\n"
	    "Normal points in the ILRS consolidated ranging data format (CRD).\n"
	    "import reads each file in one transaction: the target name of\n"
	    "each session (H3) is mapped to a target through its alias (or\n"
	    "id); epoch, time of flight, photons, RMS and the station code of\n"
	    "the file (H2) are stored with the synodic angle, mean elongation,\n"
	    "target elevation (this station's points only) and the Sun's\n"
	    "elevation at the target.  Records of unused types are skipped;\n"
	    "a malformed line is reported with its number and nothing of that\n"
	    "file is stored.  Importing a file again adds nothing.\n"
	    "\n"
	    "  --help   this text\n");
}

int
cmd_np(int argc, char **argv)
{
	static const char *const actions[] = {"import", "count", NULL};
	static const struct option opts[] = {
		{"db", required_argument, NULL, 'd'},
		{"since", required_argument, NULL, 's'},
		{"until", required_argument, NULL, 'u'},
		{"target", required_argument, NULL, 't'},
		{"station", required_argument, NULL, 'c'},
		{"help", no_argument, NULL, 'h'},
		{NULL, 0, NULL, 0}
	};
	struct store_query q;
	struct cli_store c;
	struct cli_store_counts n;
	const char *db = NULL;
	char err[512];
	int ch, which, act = 0, st, import;
	size_t count = 0;

	if ((which = cli_store_action(argc, argv, actions, usage, &act)) >=
	    0)
		return which;
	import = act == 0;
	store_query_init(&q);
	argc--;
	argv++;
	optind = 1;
	opterr = 0;
	while ((ch = getopt_long(argc, argv, "", opts, NULL)) != -1) {
		switch (ch) {
		case 'd': db = optarg; break;
		case 's':
			if ((st = cli_store_parse_mjd("--since", optarg,
			    &q.since_mjd)))
				return st;
			break;
		case 'u':
			if ((st = cli_store_parse_mjd("--until", optarg,
			    &q.until_mjd)))
				return st;
			break;
		case 't': q.target = optarg; break;
		case 'c': q.station_code = optarg; break;
		case 'h':
			usage(stdout);
			return CLI_EXIT_OK;
		default:
			return cli_bad_option("np", argv[0],
			    argv[optind - 1]);
		}
	}
	if (import && optind >= argc)
		return cli_usage_error("np import: at least one CRD file is "
		    "required");
	if (!import && optind < argc)
		return cli_extra_argument("np", "count", argv[optind]);
	if ((st = cli_store_open(&c, db, import ? 0 : STORE_OPEN_READONLY)))
		return st;
	if (!import) {
		if (store_nps_count(c.s, &q, &count, err, sizeof err))
			st = cli_fail("%s: %s", c.path, err);
		else
			printf("%zu\n", count);
		cli_store_close(&c);
		return st;
	}
	if ((st = cli_store_load(&c)) != CLI_EXIT_OK)
		goto out;
	/* One transaction per file: a bad file leaves the others stored. */
	for (int i = optind; i < argc; i++) {
		int fst = cli_store_import_file(&c, argv[i], 'n', &n);

		if (fst == CLI_EXIT_OK)
			printf("%s: %zu normal point%s read, %zu added, %zu "
			    "already present, %zu records of unused types "
			    "skipped\n", argv[i], n.read, n.read == 1 ? "" : "s",
			    n.added, n.present, n.unused);
		else if (st == CLI_EXIT_OK || fst == CLI_EXIT_FAIL)
			st = fst;
	}
out:
	cli_store_close(&c);
	return st;
}
