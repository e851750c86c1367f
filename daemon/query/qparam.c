/* SPDX-License-Identifier: BSD-3-Clause */
/* qparam.c: parameter names as each transport spells them, and the rules
   of a from/to/days span. */
#include <ctype.h>
#include <math.h>
#include <string.h>

#include "core/text.h"
#include "core/tscale.h"
#include "query/qparam.h"

struct qparam_spelling
qparam_name(enum qparam_style style, const char *name)
{
	struct qparam_spelling sp;
	size_t i = 0;

	if (style == QPARAM_OPTION) {
		sp.s[i++] = '-';
		sp.s[i++] = '-';
	}
	for (; name != NULL && *name != '\0' && i + 1 < sizeof sp.s; name++)
		sp.s[i++] = (style == QPARAM_OPTION && *name == '_') ? '-' :
		    *name;
	sp.s[i] = '\0';
	return sp;
}

int
qparam_word(const char *s, size_t max)
{
	size_t n = strlen(s);

	if (n == 0 || n >= max)
		return 0;
	for (; *s; s++)
		if (!isalnum((unsigned char)*s) && *s != '_' && *s != '-' &&
		    *s != '.')
			return 0;
	return 1;
}

void
qspan_init(struct qspan *s)
{
	s->from_mjd = NAN;
	s->to_mjd = NAN;
	s->days = NAN;
}

/* A UTC time: "now" or ISO 8601. */
static enum errcode
span_time(const char *name, const char *value, double now_mjd, double *mjd,
    enum qparam_style style, char *errbuf, size_t errlen)
{
	char err[160];
	double u1, u2;

	if (strcmp(value, "now") == 0) {
		*mjd = now_mjd;
		return ERRCODE_OK;
	}
	if (tscale_parse_utc(value, &u1, &u2, err, sizeof err) != ERRCODE_OK)
		return text_err(ERRCODE_BAD_TIME, errbuf, errlen, "%s: %s",
		    qparam_name(style, name).s, err);
	*mjd = (u1 - TEXT_MJD0) + u2;
	return ERRCODE_OK;
}

enum errcode
qspan_set(struct qspan *s, const char *name, const char *value,
    double now_mjd, double max_days, enum qparam_style style,
    const char **fault, char *errbuf, size_t errlen)
{
	enum errcode rc = ERRCODE_OK;

	if (value == NULL)
		value = "";
	if (strcmp(name, "from") == 0) {
		*fault = "from";
		rc = span_time("from", value, now_mjd, &s->from_mjd, style,
		    errbuf, errlen);
	} else if (strcmp(name, "to") == 0) {
		*fault = "to";
		rc = span_time("to", value, now_mjd, &s->to_mjd, style,
		    errbuf, errlen);
	} else if (strcmp(name, "days") == 0) {
		*fault = "days";
		if (text_parse_real(value, 0.0, max_days, &s->days) !=
		    ERRCODE_OK || !(s->days > 0.0))
			rc = text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: "
			    "'%.40s' is not a number of days above 0 and at "
			    "most %.0f", qparam_name(style, "days").s, value,
			    max_days);
	} else {
		return ERRCODE_NOT_FOUND;
	}
	if (rc == ERRCODE_OK)
		*fault = NULL;
	return rc;
}

enum errcode
qspan_resolve(const struct qspan *s, double now_mjd, double default_days,
    double max_days, enum qparam_style style, double *from_mjd,
    double *to_mjd, const char **fault, char *errbuf, size_t errlen)
{
	double from = isnan(s->from_mjd) ? now_mjd : s->from_mjd;
	double days = isnan(s->days) ? default_days : s->days;
	double to = isnan(s->to_mjd) ? from + days : s->to_mjd;

	if (!isnan(s->to_mjd) && !isnan(s->days)) {
		*fault = "days";
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen,
		    "%s and %s: give one, not both", qparam_name(style, "to").s,
		    qparam_name(style, "days").s);
	}
	*fault = "to";
	if (!(to > from))
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: the span "
		    "must end after %s (default now)", qparam_name(style,
		    "to").s, qparam_name(style, "from").s);
	/* days was checked against max_days when it was set; to - from of
	   from + days can exceed it by a rounding (issue 11, defect 8). */
	if ((isnan(s->to_mjd) ? days : to - from) > max_days)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: the span "
		    "is longer than %.0f days", qparam_name(style, "to").s,
		    max_days);
	*fault = NULL;
	*from_mjd = from;
	*to_mjd = to;
	return ERRCODE_OK;
}
