/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_ephem.c: "moonrange ephem", the geometry of one instant. */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <erfam.h>

#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "core/eop.h"
#include "core/text.h"
#include "cli/cli_store.h"
#include "core/array.h"
#include "core/derive.h"
#include "core/geom.h"
#include "formats/import_util.h"
#include "formats/render_time.h"
#include "formats/render_ephem.h"
#include "query/qzone.h"

#define EPHEM_MAX_TARGETS 64

/* The built-in demonstration station (invented): a ridge in a desert
   range, used when neither --station nor a database is given. */
#define DEMO_NAME "Kestrel Ridge (demo)"
#define DEMO_LAT 38.9712
#define DEMO_LON -114.3098
#define DEMO_HEIGHT 2950.0
#define DEMO_TZ "America/Los_Angeles"

/* Parse "ID=LAT,LON[,H]" into an id (copied into idbuf) and a target. */
static int
parse_target(const char *arg, char *idbuf, size_t idlen,
    struct geom_target *t)
{
	const char *eq = strchr(arg, '=');
	char tmp[128], *f[3];
	double lat, lon, h = 0.0;
	int n, ok = eq != NULL && (size_t)(eq - arg) < idlen;

	if (ok) {
		memcpy(idbuf, arg, (size_t)(eq - arg));
		idbuf[eq - arg] = '\0';
		ok = import_valid_ident(idbuf, 32, 1);
	}
	if (!ok)
		return cli_usage_error("--target '%s': expected ID=LAT,LON"
		    "[,HEIGHT_M] with an ID of 1-32 letters, digits, '_', "
		    "'-' or '.'", arg);
	if (strlen(eq + 1) >= sizeof tmp)
		return cli_usage_error("--target '%s': too long", arg);
	strcpy(tmp, eq + 1);
	n = cli_split_fields(tmp, f, 3);
	if (n < 2 || n > 3)
		return cli_usage_error("--target '%s': expected LAT,LON[,HEIGHT_M]"
		    " after '='", arg);
	if (cli_parse_double(f[0], -90, 90, &lat))
		return cli_usage_error("--target %s: latitude '%s' is not a "
		    "number in -90..90", idbuf, f[0]);
	if (cli_parse_double(f[1], -180, 360, &lon))
		return cli_usage_error("--target %s: longitude '%s' is not a "
		    "number in -180..360", idbuf, f[1]);
	if (n == 3 && cli_parse_double(f[2], -20000, 20000, &h))
		return cli_usage_error("--target %s: height '%s' is not a "
		    "number of metres in -20000..20000", idbuf, f[2]);
	if (geom_target_from_selen(lat * ERFA_DD2R, lon * ERFA_DD2R, h, t))
		return cli_usage_error("--target %s: position out of range",
		    idbuf);
	return CLI_EXIT_OK;
}

/*
 * From the database: the station (position and weather), its active
 * targets after any given with --target, and unless eop is NULL (DUT1
 * given) the Earth orientation at the instant with its source and the
 * table's last day.
 */
static int
load_db(struct cli_store *cs, const char *db, double utc1, double utc2,
    char ids[][33], struct geom_target *targets, size_t *ntargets,
    struct geom_site *site, struct geom_eop *eop, const char **source,
    char *eop_last)
{
	double last;
	int st;

	if ((st = cli_store_open(cs, db, STORE_OPEN_READONLY)) ||
	    (st = cli_store_load(cs)))
		return st;
	if (derive_site(&cs->station, site))
		return cli_fail("%s: the stored station is out of range", db);
	for (size_t i = 0; i < cs->ntargets; i++) {
		const struct site_target *t = &cs->targets[i];

		if (!t->active)
			continue;
		if (*ntargets == EPHEM_MAX_TARGETS)
			return cli_usage_error("%s: more than %d targets", db,
			    EPHEM_MAX_TARGETS);
		snprintf(ids[*ntargets], 33, "%s", t->id);
		if (geom_target_from_selen(t->lat_deg * ERFA_DD2R,
		    t->lon_deg * ERFA_DD2R, t->height_m, &targets[*ntargets]))
			return cli_fail("%s: target %s is out of range", db,
			    t->id);
		(*ntargets)++;
	}
	if (cs->neop > 0) {
		last = cs->eop[cs->neop - 1].mjd;
		(void)tscale_format_utc(TEXT_MJD0, last, 0, eop_last, 40);
		eop_last[10] = '\0';	/* the day */
	}
	if (eop != NULL)
		*source = eop_source_name(eop_lookup_rows(cs->eop, cs->neop,
		    (utc1 - TEXT_MJD0) + utc2, eop));
	return CLI_EXIT_OK;
}

int
cmd_ephem(const struct cli_args *a)
{
	static char ids[EPHEM_MAX_TARGETS][33];
	struct geom_target targets[EPHEM_MAX_TARGETS];
	struct render_target_row rows[EPHEM_MAX_TARGETS];
	size_t ntargets = 0;
	double lat = DEMO_LAT, lon = DEMO_LON, h = DEMO_HEIGHT;
	double utc1 = 0, utc2 = 0, dut1 = cli_real(a, "dut1", 0.0);
	int json = cli_given(a, "json"), demo = 1, st;
	int have_at = cli_time(a, "at", &utc1, &utc2);
	int have_dut1 = cli_given(a, "dut1");
	const char *dut1_source = have_dut1 ? "option" : "none";
	const char *db = cli_text(a, "db", NULL), *tz = cli_text(a, "tz", NULL);
	char err[200], eop_last[40];
	struct cli_store cs;
	struct geom_site site;
	struct geom_eop eop = {0.0, 0.0, 0.0};
	struct geom_instant g;
	struct render_ephem rep;
	static struct tzone zone;
	const char *zname;
	struct mbuf out;
	enum errcode rc;

	if (cli_given(a, "station")) {
		if (cli_parse_station(cli_text(a, "station", NULL), &lat, &lon,
		    &h, err, sizeof err))
			return cli_usage_error("%s", err);
		demo = 0;
	}
	for (int i = 0; i < cli_given(a, "target"); i++) {
		if (ntargets == EPHEM_MAX_TARGETS)
			return cli_usage_error("--target: at most %d targets",
			    EPHEM_MAX_TARGETS);
		st = parse_target(cli_nth(a, "target", i), ids[ntargets],
		    sizeof ids[ntargets], &targets[ntargets]);
		if (st != CLI_EXIT_OK)
			return st;
		for (size_t k = 0; k < ntargets; k++)
			if (strcmp(ids[k], ids[ntargets]) == 0)
				return cli_usage_error("--target: id '%s' "
				    "given twice", ids[k]);
		ntargets++;
	}
	if (!have_at)
		cli_now(&utc1, &utc2);

	memset(&cs, 0, sizeof cs);
	eop_last[0] = '\0';
	if (db != NULL) {
		st = load_db(&cs, db, utc1, utc2, ids, targets, &ntargets, &site,
		    have_dut1 ? NULL : &eop, &dut1_source, eop_last);
		if (st != CLI_EXIT_OK) {
			cli_store_close(&cs);
			return st;
		}
		demo = 0;
	} else if (geom_site_init(&site, lat * ERFA_DD2R, lon * ERFA_DD2R, h,
	    NULL)) {
		return cli_usage_error("--station: position out of range");
	}
	if (have_dut1 || db == NULL)
		eop.dut1 = dut1;
	rc = geom_instant_at(&site, &eop, utc1, utc2, GEOM_PREC_FULL, &g);
	if (rc != ERRCODE_OK) {
		cli_store_close(&cs);
		return cli_usage_error("--at: %s", errcode_str(rc));
	}
	for (size_t i = 0; i < ntargets; i++) {
		rows[i].id = ids[i];
		geom_target_view(&g, &targets[i], &rows[i].view);
		array_of_target(&g, &targets[i], db != NULL ?
		    cli_store_target(&cs, ids[i]) : NULL, &rows[i].tilt,
		    &rows[i].spread_ps);
	}
	memset(&rep, 0, sizeof rep);
	rep.g = &g;
	rep.targets = rows;
	rep.ntargets = ntargets;
	rep.dut1_source = dut1_source;
	rep.wide = cli_given(a, "wide");
	rep.station_name = demo ? DEMO_NAME : db != NULL ? cs.station.name :
	    NULL;
	zname = tz != NULL ? tz : demo ? DEMO_TZ : db != NULL ?
	    cs.station.time_zone : NULL;
	if (zname != NULL && qzone_load(zname, (g.t.utc1 - TEXT_MJD0) +
	    g.t.utc2, (g.t.utc1 - TEXT_MJD0) + g.t.utc2, &zone) == ERRCODE_OK)
		rep.time_zone = &zone;
	rep.eop_last_utc = eop_last[0] ? eop_last : NULL;
	mbuf_init(&out);
	rc = json ? render_ephem_json(&rep, &out) : render_ephem_text(&rep,
	    &out);
	st = cli_emit_rendered(rc, &out);
	mbuf_free(&out);
	cli_store_close(&cs);
	return st;
}
