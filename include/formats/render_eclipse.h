/* SPDX-License-Identifier: BSD-3-Clause */
/* render_eclipse.h: lunar eclipses (moonrange eclipses) as JSON, CSV,
   iCalendar and text. */
#ifndef MOONRANGE_RENDER_ECLIPSE_H
#define MOONRANGE_RENDER_ECLIPSE_H

#include <stddef.h>

#include "core/eclipse.h"
#include "core/errcode.h"
#include "core/mem.h"

/* The instants of one eclipse in UTC, for the renderers. */
struct render_eclipse {
	enum eclipse_kind kind;
	double greatest_mjd;			/* UTC MJD */
	double umbral_mag, penumbral_mag;
	double contact_mjd[ECLIPSE_NCONTACTS];	/* NaN: does not occur */
	int moon_up[ECLIPSE_NCONTACTS];		/* -1 unknown (no station),
						   0 below, 1 above the
						   station's horizon */
	int moon_up_greatest;			/* likewise */
};

/*
 * {"eclipses":[{"kind", "greatest", "umbral_magnitude",
 * "penumbral_magnitude", "contacts":{"P1",...}, and with a station
 * "moon_up":{"greatest", "P1",...}}]}; a contact that does not occur is
 * absent.  Times ISO 8601 UTC to the second.
 */
enum errcode render_eclipses_json(const struct render_eclipse *e, size_t n,
    struct mbuf *out);
/* kind,greatest,umbral_magnitude,penumbral_magnitude,P1,...,P4 (empty
   when a contact does not occur), moon_up_greatest (with a station). */
enum errcode render_eclipses_csv(const struct render_eclipse *e, size_t n,
    int station, struct mbuf *out);
/* One VEVENT per eclipse from its first to its last contact. */
enum errcode render_eclipses_ics(const struct render_eclipse *e, size_t n,
    struct mbuf *out);
enum errcode render_eclipses_text(const struct render_eclipse *e, size_t n,
    int station, struct mbuf *out);

#endif
