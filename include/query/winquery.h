/* SPDX-License-Identifier: BSD-3-Clause */
/* winquery.h: the windows query, from a filled plan query to rendered
   bytes, shared by the command line and the HTTP API. */
#ifndef MOONRANGE_WINQUERY_H
#define MOONRANGE_WINQUERY_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/mem.h"
#include "core/plan.h"
#include "formats/render_plan.h"

/* A renderer of a plan: render_windows_json, _csv, _ics, _text, ... */
typedef enum errcode (*winquery_render_fn)(const struct render_plan *p,
    struct mbuf *out);

/*
 * Run a query filled as above (by plan_db_load or plan_db_fill, span,
 * target and limit set) and append the result rendered by fn to out:
 * rp->r is set for the call and reset after it, the rest of rp is the
 * caller's.  *nwindows (may be NULL) gets the number of windows ranked.
 * The same path for "moonrange windows" / "tonight" and the daemon's
 * /api/v1/windows, so that both print the same bytes.
 * Returned (function value): plan_run's code with its sentence in
 * errbuf, or the renderer's (ERRCODE_NOMEM).
 */
enum errcode winquery_render(const struct plan_query *q,
    struct render_plan *rp, winquery_render_fn fn, struct mbuf *out,
    size_t *nwindows, char *errbuf, size_t errlen);

#endif
