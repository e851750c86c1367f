/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_target.c: "moonrange target", the lunar targets of the station:
   add, list, set, retire. */
#include <ctype.h>
#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cli.h"
#include "cli/cli_store.h"
#include "formats/render_site.h"

static void
usage(FILE *f)
{
	fprintf(f,
	    "usage: moonrange target add --db FILE ID --name TEXT --lat DEG --lon DEG\n"
	    "                     [--height M] [--alias NAME] [--strength X]\n"
	    "                     [--dark-only yes|no]\n"
	    "       moonrange target set --db FILE ID [any option of add]\n"
	    "                     [--active yes|no]\n"
	    "       moonrange target retire --db FILE ID\n"
	    "       moonrange target list --db FILE [--all] [--json]\n"
	    "\n"
	    "Lunar retroreflector targets.  A retired target stays in the log\n"
	    "and in coverage audits but is no longer planned.\n"
	    "\n"
	    "  ID           1-32 letters, digits, '_', '-' or '.'\n"
	    "  --lat/--lon  selenographic latitude and east longitude, degrees\n"
	    "               (-90..90, -180..180)\n"
	    "  --height M   above the 1737.4 km mean radius (default 0)\n"
	    "  --alias NAME the target's name in CRD files (default none)\n"
	    "  --strength X relative return strength, over 0 up to 1000\n"
	    "               (default 1)\n"
	    "  --dark-only  plan only while the target is in lunar darkness\n"
	    "  --all        list retired targets too\n"
	    "  --help       this text\n");
}

static int
valid_ident(const char *s, size_t max)
{
	size_t n = strlen(s);

	if (n == 0 || n > max)
		return 0;
	for (size_t i = 0; i < n; i++)
		if (!isalnum((unsigned char)s[i]) && s[i] != '_' &&
		    s[i] != '-' && s[i] != '.')
			return 0;
	return 1;
}

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
		if (*e->alias != '\0' && !valid_ident(e->alias,
		    sizeof t->alias - 1))
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

static int
number(const char *opt, const char *s, double lo, double hi, double *v)
{
	if (cli_parse_double(s, lo, hi, v))
		return cli_usage_error("%s: '%s' is not a number in %g..%g",
		    opt, s, lo, hi);
	return CLI_EXIT_OK;
}

static int
yesno(const char *opt, const char *s, int *v)
{
	if (cli_store_parse_bool(s, v))
		return cli_usage_error("%s: '%s' is not yes or no", opt, s);
	return CLI_EXIT_OK;
}

int
cmd_target(int argc, char **argv)
{
	static const struct option opts[] = {
		{"db", required_argument, NULL, 'd'},
		{"name", required_argument, NULL, 'n'},
		{"alias", required_argument, NULL, 'a'},
		{"lat", required_argument, NULL, 'y'},
		{"lon", required_argument, NULL, 'x'},
		{"height", required_argument, NULL, 'z'},
		{"strength", required_argument, NULL, 's'},
		{"dark-only", required_argument, NULL, 'k'},
		{"active", required_argument, NULL, 'A'},
		{"all", no_argument, NULL, 'L'},
		{"json", no_argument, NULL, 'j'},
		{"help", no_argument, NULL, 'h'},
		{NULL, 0, NULL, 0}
	};
	static const char *const actions[] = {"add", "set", "retire", "list",
	    NULL};
	struct target_edit e = {NULL, NULL, NAN, NAN, NAN, NAN, -1, -1};
	struct site_target t, *list = NULL;
	struct cli_store c;
	struct mbuf out;
	const char *db = NULL, *id = NULL;
	char err[512];
	int ch, st = CLI_EXIT_OK, which = -1, all = 0, json = 0;
	size_t n = 0;
	enum errcode rc;

	if ((st = cli_store_action(argc, argv, actions, usage, &which)) >= 0)
		return st;
	st = CLI_EXIT_OK;
	argc--;
	argv++;
	optind = 1;
	opterr = 0;
	while ((ch = getopt_long(argc, argv, "", opts, NULL)) != -1) {
		switch (ch) {
		case 'd': db = optarg; break;
		case 'n': e.name = optarg; break;
		case 'a': e.alias = optarg; break;
		case 'y': st = number("--lat", optarg, -90, 90, &e.lat); break;
		case 'x': st = number("--lon", optarg, -180, 180, &e.lon); break;
		case 'z':
			st = number("--height", optarg, -20000, 20000,
			    &e.height);
			break;
		case 's':
			st = number("--strength", optarg, 1e-6, 1000,
			    &e.strength);
			break;
		case 'k': st = yesno("--dark-only", optarg, &e.dark_only); break;
		case 'A': st = yesno("--active", optarg, &e.active); break;
		case 'L': all = 1; break;
		case 'j': json = 1; break;
		case 'h':
			usage(stdout);
			return CLI_EXIT_OK;
		default:
			return cli_bad_option("target", argv[0],
			    argv[optind - 1]);
		}
		if (st != CLI_EXIT_OK)
			return st;
	}
	if (optind < argc)
		id = argv[optind++];
	if (optind < argc)
		return cli_extra_argument("target", argv[0], argv[optind]);
	if (which == 3 && id != NULL)
		return cli_extra_argument("target", "list", id);
	if (which != 3 && (id == NULL || !valid_ident(id, SITE_ID_LEN - 1)))
		return cli_usage_error("target %s: an ID of 1-32 letters, "
		    "digits, '_', '-' or '.' is required", argv[0]);
	if (which == 0 && (e.name == NULL || isnan(e.lat) || isnan(e.lon)))
		return cli_usage_error("target add: --name, --lat and --lon are "
		    "required");
	if (which == 0 && e.active >= 0)
		return cli_usage_error("target add: --active is for 'target "
		    "set'");
	if ((st = cli_store_open(&c, db, which == 3 ? STORE_OPEN_READONLY :
	    0)))
		return st;
	switch (which) {
	case 0:
		memset(&t, 0, sizeof t);
		strcpy(t.id, id);
		t.strength = 1.0;
		t.active = 1;
		if ((st = apply(&t, &e)) != CLI_EXIT_OK)
			break;
		if ((rc = store_target_add(c.s, &t, err, sizeof err)))
			st = cli_store_fail(rc, "target add: %s", err);
		else
			printf("target %s added\n", t.id);
		break;
	case 1:
	case 2:
		if ((rc = store_target_get(c.s, id, &t, err, sizeof err))) {
			st = cli_store_fail(rc, "target %s: %s", argv[0], err);
			break;
		}
		if (which == 2)
			e.active = 0;
		if ((st = apply(&t, &e)) != CLI_EXIT_OK)
			break;
		if ((rc = store_target_update(c.s, &t, err, sizeof err)))
			st = cli_store_fail(rc, "target %s: %s", argv[0], err);
		else
			printf("target %s %s\n", t.id, which == 2 ? "retired" :
			    "updated");
		break;
	default:
		if ((rc = store_targets_list(c.s, !all, &list, &n, err,
		    sizeof err))) {
			st = cli_fail("%s: %s", c.path, err);
			break;
		}
		mbuf_init(&out);
		if (json)
			rc = render_site_targets_json(list, n, &out);
		else
			rc = render_site_targets_text(list, n, &out);
		st = cli_emit_rendered(rc, &out);
		mbuf_free(&out);
		mem_free(list);
		break;
	}
	cli_store_close(&c);
	return st;
}
