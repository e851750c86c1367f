/* SPDX-License-Identifier: BSD-3-Clause */
/* phquery.c: the phases query: a span by the shared rules, the phase
   search of the core, the renderers. */
#include <string.h>

#include "core/geom.h"
#include "core/text.h"
#include "core/tscale.h"
#include "formats/render_phases.h"
#include "query/phquery.h"
#include "query/qzone.h"

void
phquery_params_init(struct phquery_params *p, enum qparam_style style,
    double now_mjd)
{
	memset(p, 0, sizeof *p);	/* fault NULL, limit 0 */
	qspan_init(&p->span);
	p->style = style;
	p->now_mjd = now_mjd;
}

enum errcode
phquery_param_set(struct phquery_params *p, const char *name,
    const char *value, char *errbuf, size_t errlen)
{
	enum errcode rc;

	p->fault = NULL;
	rc = qspan_set(&p->span, name, value, p->now_mjd, PHQUERY_DAYS_MAX,
	    p->style, &p->fault, errbuf, errlen);
	if (rc == ERRCODE_NOT_FOUND)
		text_err(rc, errbuf, errlen, "unknown parameter '%.40s'", name);
	return rc;
}

enum errcode
phquery_run(struct phquery_params *p, enum phquery_format fmt,
    const char *time_zone, struct mbuf *out, char *errbuf, size_t errlen)
{
	struct geom_phase_event *ev;
	struct tscale_instant a, b;
	struct render_phases rp;
	struct tzone zone;
	double from, to;
	size_t n = 0;
	enum errcode rc;

	rc = qspan_resolve(&p->span, p->now_mjd, PHQUERY_DAYS_DEFAULT,
	    PHQUERY_DAYS_MAX, p->style, &from, &to, &p->fault, errbuf,
	    errlen);
	if (rc != ERRCODE_OK)
		return rc;
	if (tscale_from_utc(TEXT_MJD0, from, 0.0, &a) != ERRCODE_OK ||
	    tscale_from_utc(TEXT_MJD0, to, 0.0, &b) != ERRCODE_OK) {
		p->fault = "from";
		return text_err(ERRCODE_BAD_TIME, errbuf, errlen, "%s: outside "
		    "the convertible range", qparam_name(p->style, "from").s);
	}
	if ((ev = mem_calloc(PHQUERY_MAX_EVENTS, sizeof *ev)) == NULL)
		return text_err(ERRCODE_NOMEM, errbuf, errlen, "%s",
		    errcode_str(ERRCODE_NOMEM));
	rc = geom_phases_find(a.tt1, a.tt2, b.tt1, b.tt2, ev,
	    PHQUERY_MAX_EVENTS, &n);
	if (rc != ERRCODE_OK) {
		text_err(rc, errbuf, errlen, "phase search: %s",
		    errcode_str(rc));
	} else {
		render_phases_init(&rp, TEXT_MJD0, from, TEXT_MJD0, to, ev, n);
		if (time_zone != NULL && qzone_load(time_zone, from, to,
		    &zone) == ERRCODE_OK)
			rp.time_zone = &zone;
		rc = fmt == PHQUERY_JSON ? render_phases_json(&rp, out) :
		    render_phases_text(&rp, out);
		if (rc != ERRCODE_OK)
			text_err(rc, errbuf, errlen, "%s", errcode_str(rc));
	}
	mem_free(ev);
	return rc;
}
