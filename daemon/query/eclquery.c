/* SPDX-License-Identifier: BSD-3-Clause */
/* eclquery.c: lunar eclipses in a span, with the Moon's visibility from
   a station, rendered for the command line and the API. */
#include <math.h>

#include "core/eclipse.h"
#include "core/mem.h"
#include "core/text.h"
#include "core/tscale.h"
#include "formats/render_eclipse.h"
#include "query/eclquery.h"

#define MAX_ECLIPSES 1000	/* 400 years hold under 1000 */

/* UTC MJD of a TT JD; *up: the Moon above the site's horizon (-1 none). */
static double
utc_of(double tt1, double tt2, const struct geom_site *site, int *up)
{
	struct tscale_instant t;
	struct geom_instant g;

	*up = -1;
	if (tscale_from_tt(tt1, tt2, 0.0, &t) != ERRCODE_OK)
		return NAN;
	if (site != NULL)
		*up = geom_instant_at(site, NULL, t.utc1, t.utc2, GEOM_PREC_FAST,
		    &g) == ERRCODE_OK ? g.moon.el > 0.0 : -1;
	return (t.utc1 - TEXT_MJD0) + t.utc2;
}

enum errcode
eclquery_run(double from_mjd, double to_mjd, const struct geom_site *site,
    enum eclquery_format fmt, struct mbuf *out, char *errbuf, size_t errlen)
{
	struct eclipse_event *ev = NULL;
	struct render_eclipse *rows = NULL;
	struct tscale_instant a, b;
	size_t n = 0;
	enum errcode rc;

	if (tscale_from_utc(TEXT_MJD0, from_mjd, 0.0, &a) != ERRCODE_OK ||
	    tscale_from_utc(TEXT_MJD0, to_mjd, 0.0, &b) != ERRCODE_OK)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "from: outside "
		    "the time scales' range");
	if (!(to_mjd > from_mjd) || to_mjd - from_mjd > ECLQUERY_DAYS_MAX)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "to: must be "
		    "after from, at most %.0f days", ECLQUERY_DAYS_MAX);
	ev = mem_calloc(MAX_ECLIPSES, sizeof ev[0]);
	rows = mem_calloc(MAX_ECLIPSES, sizeof rows[0]);
	if (ev == NULL || rows == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	rc = eclipse_find(a.tt1, a.tt2, b.tt1, b.tt2, ev, MAX_ECLIPSES, &n);
	if (rc != ERRCODE_OK) {
		(void)text_err(rc, errbuf, errlen, "eclipses: %s",
		    errcode_str(rc));
		goto out;
	}
	for (size_t i = 0; i < n; i++) {
		struct render_eclipse *r = &rows[i];

		r->kind = ev[i].kind;
		r->umbral_mag = ev[i].umbral_mag;
		r->penumbral_mag = ev[i].penumbral_mag;
		r->greatest_mjd = utc_of(ev[i].greatest_tt1, ev[i].greatest_tt2,
		    site, &r->moon_up_greatest);
		for (int k = 0; k < ECLIPSE_NCONTACTS; k++) {
			r->moon_up[k] = -1;
			r->contact_mjd[k] = ev[i].has[k] ?
			    utc_of(ev[i].contact_tt1[k], ev[i].contact_tt2[k], site,
			    &r->moon_up[k]) : NAN;
		}
	}
	switch (fmt) {
	case ECLQUERY_JSON:
		rc = render_eclipses_json(rows, n, out);
		break;
	case ECLQUERY_CSV:
		rc = render_eclipses_csv(rows, n, site != NULL, out);
		break;
	case ECLQUERY_ICS:
		rc = render_eclipses_ics(rows, n, out);
		break;
	case ECLQUERY_TEXT:
		rc = render_eclipses_text(rows, n, site != NULL, out);
		break;
	}
out:
	mem_free(ev);
	mem_free(rows);
	return rc;
}
