/* SPDX-License-Identifier: BSD-3-Clause */
/* phquery.h: the phases query (new moon, quarters, full moon in a span),
   shared by "moonrange phases" and GET /api/v1/phases. */
#ifndef MOONRANGE_PHQUERY_H
#define MOONRANGE_PHQUERY_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/mem.h"
#include "query/qparam.h"

#define PHQUERY_DAYS_DEFAULT 30.0
#define PHQUERY_DAYS_MAX 36600.0	/* a century */
#define PHQUERY_MAX_EVENTS 5000		/* ~100 years of principal phases */

/* The parameters by their canonical names, comma separated. */
#define PHQUERY_PARAMS "from,to,days"

/* The query as given (see struct winquery_params for style and fault). */
struct phquery_params {
	enum qparam_style style;
	const char *fault;
	double now_mjd;			/* UTC: "now", and the default from */
	struct qspan span;
};

void phquery_params_init(struct phquery_params *p, enum qparam_style style,
    double now_mjd);

/*
 * Set from, to or days (qspan rules; days at most PHQUERY_DAYS_MAX).
 * Errors as winquery_param_set.
 */
enum errcode phquery_param_set(struct phquery_params *p, const char *name,
    const char *value, char *errbuf, size_t errlen);

enum phquery_format { PHQUERY_TEXT = 0, PHQUERY_JSON };

/*
 * Find the phases of the span and append them rendered in fmt to out;
 * time_zone (an IANA name the system knows, or NULL) adds local times to
 * the text table, converted here (qzone_load), not in the renderer.  Returns ERRCODE_OK, a span error (ERRCODE_BAD_ARG or
 * ERRCODE_BAD_TIME naming the parameter, p->fault set), ERRCODE_NOMEM or
 * the phase search's code.  On failure out may hold a part of the
 * output: the caller discards it.
 */
enum errcode phquery_run(struct phquery_params *p, enum phquery_format fmt,
    const char *time_zone, struct mbuf *out, char *errbuf, size_t errlen);

#endif
