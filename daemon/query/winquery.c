/* SPDX-License-Identifier: BSD-3-Clause */
/* winquery.c: the windows query: parameters by name, applied to a filled
   plan query, run and rendered; shared by the command line and the HTTP
   API. */
#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "core/text.h"
#include "query/winquery.h"

void
winquery_params_init(struct winquery_params *p, enum qparam_style style,
    double now_mjd)
{
	memset(p, 0, sizeof *p);	/* fault NULL, limit 0 */
	qspan_init(&p->span);
	p->style = style;
	p->now_mjd = now_mjd;
	p->min_el_deg = NAN;
	p->max_sun_el_deg = NAN;
	p->min_sun_sep_deg = NAN;
}

/* The limit overrides: name, range, where. */
struct winquery_angle {
	const char *name;
	double min, max;
	size_t off;
};

static const struct winquery_angle angles[] = {
	{"min_el", -5.0, 89.0, offsetof(struct winquery_params, min_el_deg)},
	{"max_sun_el", -90.0, 90.0,
	    offsetof(struct winquery_params, max_sun_el_deg)},
	{"min_sun_sep", 0.0, 180.0,
	    offsetof(struct winquery_params, min_sun_sep_deg)},
};

enum errcode
winquery_param_set(struct winquery_params *p, const char *name,
    const char *value, char *errbuf, size_t errlen)
{
	enum errcode rc;
	long v;

	if (value == NULL)
		value = "";
	p->fault = NULL;
	rc = qspan_set(&p->span, name, value, p->now_mjd, WINQUERY_DAYS_MAX,
	    p->style, &p->fault, errbuf, errlen);
	if (rc != ERRCODE_NOT_FOUND)
		return rc;
	for (size_t i = 0; i < sizeof angles / sizeof angles[0]; i++) {
		double *dst = (double *)(void *)((char *)p + angles[i].off);

		if (strcmp(name, angles[i].name) != 0)
			continue;
		if (text_parse_real(value, angles[i].min, angles[i].max, dst) !=
		    ERRCODE_OK) {
			p->fault = angles[i].name;
			return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: "
			    "'%.40s' is not a number of degrees in %.0f..%.0f",
			    qparam_name(p->style, name).s, value,
			    angles[i].min, angles[i].max);
		}
		return ERRCODE_OK;
	}
	if (strcmp(name, "target") == 0) {
		if (!qparam_word(value, SITE_ID_LEN)) {
			p->fault = "target";
			return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: "
			    "'%.40s' is not a target id (1-32 letters, digits, "
			    "'_', '-', '.')", qparam_name(p->style, name).s,
			    value);
		}
		snprintf(p->target, sizeof p->target, "%s", value);
	} else if (strcmp(name, "limit") == 0) {
		if (text_parse_long(value, 1, PLAN_MAX_WINDOWS, &v) !=
		    ERRCODE_OK) {
			p->fault = "limit";
			return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: "
			    "'%.40s' is not a whole number in 1..%d",
			    qparam_name(p->style, name).s, value,
			    PLAN_MAX_WINDOWS);
		}
		p->limit = (size_t)v;
	} else {
		return text_err(ERRCODE_NOT_FOUND, errbuf, errlen,
		    "unknown parameter '%.40s'", name);
	}
	return ERRCODE_OK;
}

enum errcode
winquery_apply(struct winquery_params *p, struct plan_query *q,
    char *errbuf, size_t errlen)
{
	enum errcode rc;

	p->fault = NULL;
	rc = qspan_resolve(&p->span, p->now_mjd, WINQUERY_DAYS_DEFAULT,
	    WINQUERY_DAYS_MAX, p->style, &q->from_mjd, &q->to_mjd, &p->fault,
	    errbuf, errlen);
	if (rc != ERRCODE_OK)
		return rc;
	q->target = p->target[0] != '\0' ? p->target : NULL;
	q->limit = p->limit;
	if (isfinite(p->min_el_deg))
		q->station.min_el_deg = p->min_el_deg;
	if (isfinite(p->max_sun_el_deg))
		q->station.max_sun_el_deg = p->max_sun_el_deg;
	if (isfinite(p->min_sun_sep_deg))
		q->station.min_sun_sep_deg = p->min_sun_sep_deg;
	return ERRCODE_OK;
}

enum errcode
winquery_render(struct winquery_params *p, const struct plan_query *q,
    struct render_plan *rp, winquery_render_fn fn, struct mbuf *out,
    size_t *nwindows, char *errbuf, size_t errlen)
{
	enum qparam_style style = p != NULL ? p->style : QPARAM_QUERY;
	struct plan_result res;
	const char *fault = NULL;
	enum errcode rc;

	memset(&res, 0, sizeof res);
	rc = plan_run(q, &res, errbuf, errlen);
	if (rc == ERRCODE_NOT_FOUND && q->target != NULL) {
		fault = "target";
		text_err(rc, errbuf, errlen, "%s: no active target '%s'",
		    qparam_name(style, "target").s, q->target);
	} else if (rc == ERRCODE_TOO_LARGE && errbuf != NULL &&
	    strncmp(errbuf, "to:", 3) == 0) {	/* not the targets' count */
		fault = "to";
		text_err(rc, errbuf, errlen, "%s: more than %d windows in the "
		    "span: shorten it or set %s", qparam_name(style, "to").s,
		    PLAN_MAX_WINDOWS, qparam_name(style, "limit").s);
	}
	if (p != NULL)
		p->fault = fault;
	if (rc != ERRCODE_OK) {
		plan_result_free(&res);
		return rc;
	}
	rp->r = &res;
	rc = fn(rp, out);
	rp->r = NULL;
	if (rc != ERRCODE_OK)
		text_err(rc, errbuf, errlen, "%s", errcode_str(rc));
	if (nwindows != NULL)
		*nwindows = res.n;
	plan_result_free(&res);
	return rc;
}
