/* SPDX-License-Identifier: BSD-3-Clause */
/* render_time.c: times as text for the renderers: UTC of an MJD or a TT
   date (local times come from core/tzone.h). */
#include <math.h>
#include <stdio.h>

#include "core/text.h"
#include "core/tscale.h"
#include "formats/render_time.h"

void
render_utc_text(double mjd, int ndp, char *buf, size_t len)
{
	if (!isfinite(mjd) ||
	    tscale_format_utc(TEXT_MJD0, mjd, ndp, buf, len) != ERRCODE_OK)
		snprintf(buf, len, "?");
}

void
render_tt_iso(double tt1, double tt2, char *buf, size_t len)
{
	struct tscale_instant t;

	if (tscale_from_tt(tt1, tt2, 0.0, &t) != ERRCODE_OK ||
	    tscale_format_utc(t.utc1, t.utc2, 0, buf, len) != ERRCODE_OK)
		snprintf(buf, len, "?");
}
