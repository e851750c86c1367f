/* SPDX-License-Identifier: BSD-3-Clause */
/* qparam.h: what the queries share: the one mapping of a parameter's name
   to each transport's spelling, and the one set of rules of a time span
   given as from/to/days. */
#ifndef MOONRANGE_QPARAM_H
#define MOONRANGE_QPARAM_H

#include <stddef.h>

#include "core/errcode.h"

/*
 * A query's parameters have one canonical name each, the name of the HTTP
 * query string ("min_el").  A query speaks of a parameter in its error
 * sentences as the transport that called it names it: QPARAM_QUERY gives
 * "min_el", QPARAM_OPTION gives "--min-el".  The adapters say which at
 * the start (winquery_params_init, ...) and read back the canonical name
 * of the parameter at fault (for the API's "field" member); no adapter
 * rewrites a query's sentence.
 */
enum qparam_style {
	QPARAM_QUERY = 0,	/* HTTP query string: the canonical name */
	QPARAM_OPTION		/* command line: "--" and '_' as '-' */
};

#define QPARAM_NAME_MAX 40

/* A parameter's name as a transport spells it (see qparam_name). */
struct qparam_spelling {
	char s[QPARAM_NAME_MAX];
};

/* The canonical name as style spells it, by value, so that it can stand
   in an argument list: qparam_name(st, "to").s. */
struct qparam_spelling qparam_name(enum qparam_style style,
    const char *name);

/* 1 when s is 1..max-1 characters of [A-Za-z0-9_.-] (a target id, a
   station code), else 0: the one rule of such a parameter. */
int qparam_word(const char *s, size_t max);

/* --- the span: from, to, days ---------------------------------------------- */

/*
 * A span as given: from and to (UTC MJD) and days, NaN when not given.
 * The rules, the same for every query: "now" or ISO 8601 UTC for the
 * times; from defaults to now; to to from + days; days to the query's
 * default; to and days exclude each other; the span ends after it
 * starts and lasts at most the query's maximum.
 */
struct qspan {
	double from_mjd, to_mjd, days;
};

void qspan_init(struct qspan *s);

/*
 * Take parameter name ("from", "to" or "days") with its text value.
 * now_mjd (UTC) stands for "now"; max_days bounds days.
 *
 * Returned (function value):
 *   ERRCODE_OK; ERRCODE_BAD_TIME (from, to) or ERRCODE_BAD_ARG (days)
 *   with a sentence naming the parameter as style spells it in errbuf and
 *   its canonical name in *fault; ERRCODE_NOT_FOUND when name is not a
 *   span parameter (nothing written).
 */
enum errcode qspan_set(struct qspan *s, const char *name, const char *value,
    double now_mjd, double max_days, enum qparam_style style,
    const char **fault, char *errbuf, size_t errlen);

/*
 * The span in UTC MJDs by the rules above.  Errors as qspan_set
 * (ERRCODE_BAD_ARG, naming "days" when both to and days were given, else
 * "to").
 */
enum errcode qspan_resolve(const struct qspan *s, double now_mjd,
    double default_days, double max_days, enum qparam_style style,
    double *from_mjd, double *to_mjd, const char **fault, char *errbuf,
    size_t errlen);

#endif
