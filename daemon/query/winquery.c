/* SPDX-License-Identifier: BSD-3-Clause */
/* winquery.c: the windows query, from a filled plan query to rendered bytes,
   shared by the command line and the HTTP API. */
#include <stdio.h>
#include <string.h>

#include "query/winquery.h"

enum errcode
winquery_render(const struct plan_query *q, struct render_plan *rp,
    winquery_render_fn fn, struct mbuf *out, size_t *nwindows, char *errbuf,
    size_t errlen)
{
	struct plan_result res;
	enum errcode rc;

	memset(&res, 0, sizeof res);
	rc = plan_run(q, &res, errbuf, errlen);
	if (rc != ERRCODE_OK) {
		plan_result_free(&res);
		return rc;
	}
	rp->r = &res;
	rc = fn(rp, out);
	rp->r = NULL;
	if (rc != ERRCODE_OK)
		snprintf(errbuf, errlen, "%s", errcode_str(rc));
	if (nwindows != NULL)
		*nwindows = res.n;
	plan_result_free(&res);
	return rc;
}
