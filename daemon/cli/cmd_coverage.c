/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_coverage.c: "moonrange coverage", the audit of phase coverage. */
#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "query/covquery.h"
#include "store/store.h"

static void
usage(FILE *f)
{
	fprintf(f,
	    "usage: moonrange coverage --db FILE [--source normal_points|attempts]\n"
	    "                          [--since UTC] [--until UTC] [--target ID]\n"
	    "                          [--station CODE] [--axis AXIS] [--bins N]\n"
	    "                          [--min-count M] [--horizon DAYS]\n"
	    "                          [--json | --csv | --svg FILE]\n"
	    "\n"
	    "How the normal points (or attempts) are spread over the lunar\n"
	    "cycle: counts per bin, per target, pooled and per year; the\n"
	    "emptiest bins, the share of bins filled, the longest empty arc,\n"
	    "normalised entropy and a chi-square test against a uniform\n"
	    "spread; and the coming windows that would fill the gaps.\n"
	    "\n"
	    "  --db FILE        the station database (moonrange init)\n"
	    "  --source S       normal_points (default: imported points and\n"
	    "                   those logged with attempts) or attempts\n"
	    "  --since UTC      only records at or after this time (ISO 8601)\n"
	    "  --until UTC      only records before this time\n"
	    "  --target ID      one target only\n"
	    "  --station CODE   one station only (imported files carry other\n"
	    "                   stations' codes: omit it for the network)\n"
	    "  --axis AXIS      synodic (default: 0 new moon, 180 full),\n"
	    "                   anomaly (mean anomaly l, 0 perigee), latitude\n"
	    "                   (argument of latitude F, 0 ascending node) or\n"
	    "                   hour_angle (of the Moon at this station)\n"
	    "  --bins N         bins of the circle, 4..72 (default 12)\n"
	    "  --min-count M    a bin is filled at M or more (default 1)\n"
	    "  --horizon DAYS   days searched for gap-filling windows, 0..366\n"
	    "                   (default 60; 0 = none)\n"
	    "  --json           machine-readable output (fields in README)\n"
	    "  --csv            counts as CSV (RFC 4180)\n"
	    "  --svg FILE       write the chart to FILE ('-' for stdout)\n"
	    "  --help           this text\n");
}

/* Write a buffer to a file (or stdout for "-"). */
static int
write_file(const char *path, struct mbuf *b)
{
	FILE *f;
	int bad;

	if (strcmp(path, "-") == 0)
		return cli_emit(b);
	if (mbuf_status(b) != ERRCODE_OK)
		return cli_fail("%s", errcode_str(ERRCODE_NOMEM));
	if ((f = fopen(path, "w")) == NULL)
		return cli_fail("--svg: cannot write '%s'", path);
	bad = fwrite(b->data, 1, b->len, f) != b->len;
	bad |= fclose(f) != 0;
	if (bad)
		return cli_fail("--svg: cannot write '%s'", path);
	return CLI_EXIT_OK;
}

/* A sentence "name: ..." from the shared query code, as "--option: ...". */
static int
option_error(const char *err)
{
	if (strncmp(err, "min_count", 9) == 0)
		return cli_usage_error("--min-count%s", err + 9);
	return cli_usage_error("--%s", err);
}

int
cmd_coverage(int argc, char **argv)
{
	static const struct option opts[] = {
		{"db", required_argument, NULL, 'D'},
		{"source", required_argument, NULL, 's'},
		{"since", required_argument, NULL, 'a'},
		{"until", required_argument, NULL, 'u'},
		{"target", required_argument, NULL, 't'},
		{"station", required_argument, NULL, 'S'},
		{"axis", required_argument, NULL, 'x'},
		{"bins", required_argument, NULL, 'b'},
		{"min-count", required_argument, NULL, 'm'},
		{"horizon", required_argument, NULL, 'H'},
		{"json", no_argument, NULL, 'j'},
		{"csv", no_argument, NULL, 'c'},
		{"svg", required_argument, NULL, 'g'},
		{"help", no_argument, NULL, 'h'},
		{NULL, 0, NULL, 0}
	};
	/* Option letter to the shared parameter name (covquery_param_set). */
	static const struct {
		int opt;
		const char *name, *flag;
	} params[] = {
		{'s', "source", "--source"}, {'a', "since", "--since"},
		{'u', "until", "--until"}, {'t', "target", "--target"},
		{'S', "station", "--station"}, {'x', "axis", "--axis"},
		{'b', "bins", "--bins"}, {'m', "min_count", "--min-count"},
		{'H', "horizon", "--horizon"},
	};
	const char *db_path = NULL, *svg_path = NULL;
	enum covquery_format fmt = COVQUERY_TEXT;
	struct covquery_params p;
	struct store *db = NULL;
	struct mbuf out;
	char err[256];
	double u1, u2;
	int c, nfmt = 0, st;
	enum errcode rc;

	covquery_params_init(&p);
	optind = 1;
	opterr = 0;
	while ((c = getopt_long(argc, argv, "", opts, NULL)) != -1) {
		size_t i;

		for (i = 0; i < sizeof params / sizeof params[0]; i++)
			if (params[i].opt == c)
				break;
		if (i < sizeof params / sizeof params[0]) {
			if (covquery_param_set(&p, params[i].name, optarg, err,
			    sizeof err) != ERRCODE_OK)
				return option_error(err);
			continue;
		}
		switch (c) {
		case 'D':
			db_path = optarg;
			break;
		case 'j':
			fmt = COVQUERY_JSON;
			nfmt++;
			break;
		case 'c':
			fmt = COVQUERY_CSV;
			nfmt++;
			break;
		case 'g':
			fmt = COVQUERY_SVG;
			svg_path = optarg;
			nfmt++;
			break;
		case 'h':
			usage(stdout);
			return CLI_EXIT_OK;
		default:
			return cli_usage_error("coverage: unknown or incomplete "
			    "option '%s' (see 'moonrange coverage --help')",
			    argv[optind - 1]);
		}
	}
	if (optind < argc)
		return cli_usage_error("coverage: unexpected argument '%s'",
		    argv[optind]);
	if (db_path == NULL)
		return cli_usage_error("coverage: --db FILE is required");
	if (nfmt > 1)
		return cli_usage_error("--json, --csv and --svg: give one");
	if (coverage_spec_check(&p.spec, err, sizeof err) != ERRCODE_OK)
		return option_error(err);
	if (p.spec.axis == COVERAGE_AXIS_HOUR_ANGLE && p.spec.station[0] == '\0')
		cli_warn("--axis hour_angle: the hour angle is this station's; "
		    "points of other stations are binned by it too (give "
		    "--station CODE)");
	cli_now(&u1, &u2);
	p.now_mjd = (u1 - 2400000.5) + u2;

	rc = store_open(db_path, STORE_OPEN_READONLY, &db, err, sizeof err);
	if (rc != ERRCODE_OK)
		return rc == ERRCODE_NOT_FOUND ?
		    cli_usage_error("--db: no database '%s'", db_path) :
		    cli_fail("--db '%s': %s", db_path, err);
	mbuf_init(&out);
	err[0] = '\0';
	rc = covquery_run(db, &p, fmt, &out, err, sizeof err);
	store_close(db);
	if (rc != ERRCODE_OK) {
		mbuf_free(&out);
		if (cli_status_of(rc) == CLI_EXIT_USAGE)
			return err[0] ? option_error(err) :
			    cli_usage_error("coverage: %s", errcode_str(rc));
		return cli_fail("coverage: %s", err[0] ? err : errcode_str(rc));
	}
	st = svg_path != NULL ? write_file(svg_path, &out) : cli_emit(&out);
	mbuf_free(&out);
	return st;
}
