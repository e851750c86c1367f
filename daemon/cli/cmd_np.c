/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_np.c: "moonrange np", normal points: import CRD files, list them. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cli_store.h"

static int
np_count(const struct cli_args *a)
{
	struct store_query q;
	struct cli_store c;
	char err[512];
	size_t count = 0;
	int st;

	store_query_init(&q);
	q.since_mjd = cli_real(a, "since", NAN);
	q.until_mjd = cli_real(a, "until", NAN);
	q.target = cli_text(a, "target", NULL);
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

static int
np_import(const struct cli_args *a)
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


static const struct cli_option import_options[] = {CLI_OPT_DB, CLI_OPT_END};

static const struct cli_option count_options[] = {
	CLI_OPT_DB,
	{.name = "since", .kind = CLI_TIME, .arg = "UTC",
	    .help = "points at or after this time"},
	{.name = "until", .kind = CLI_TIME, .arg = "UTC",
	    .help = "points before this time"},
	{.name = "target", .kind = CLI_TEXT, .arg = "ID",
	    .help = "one target only"},
	{.name = "station", .kind = CLI_TEXT, .arg = "CODE",
	    .help = "one station only"},
	CLI_OPT_END
};

static const struct cli_command np_import_cmd = {
	.name = "import",
	.summary = "CRD files, one transaction each",
	.about = "Import normal points from CRD files, each in one "
	    "transaction: the target name of each session (H3) is mapped to a "
	    "target through its alias (or id); epoch, time of flight, "
	    "photons, RMS and the station code of the file (H2) are stored "
	    "with the synodic angle, mean elongation, target elevation (this "
	    "station's points only) and the Sun's elevation at the target.  "
	    "Records of unused types are skipped; a malformed line is "
	    "reported with its number and nothing of that file is stored.  "
	    "Importing a file again adds nothing.",
	.options = import_options,
	.operands = "CRD_FILE...",
	.nmin = 1,
	.nmax = -1,
	.run = np_import,
};

static const struct cli_command np_count_cmd = {
	.name = "count",
	.summary = "how many normal points are stored",
	.about = "The number of stored normal points that match.",
	.options = count_options,
	.run = np_count,
};

static const struct cli_command *const actions[] = {
	&np_import_cmd, &np_count_cmd, NULL
};

const struct cli_command cmd_np = {
	.name = "np",
	.summary = "normal points: import CRD files, count them",
	.about = "Normal points in the ILRS consolidated ranging data format "
	    "(CRD).",
	.actions = actions,
};
