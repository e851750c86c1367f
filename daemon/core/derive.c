/* SPDX-License-Identifier: BSD-3-Clause */
/* derive.c: phase and pointing angles of attempts and normal points. */
#include <math.h>
#include <string.h>

#include <erfam.h>

#include "core/derive.h"
#include "core/text.h"

enum errcode
derive_site(const struct site_station *st, struct geom_site *out)
{
	struct geom_weather wx;

	wx.pressure_hpa = st->pressure_hpa;
	wx.temperature_c = st->temperature_c;
	wx.humidity = st->humidity;
	wx.wavelength_um = st->wavelength_nm / 1000.0;
	return geom_site_init(out, st->lat_deg * ERFA_DD2R,
	    st->lon_deg * ERFA_DD2R, st->height_m, &wx);
}

/* Degrees in 0 <= x < 360 (rounding can make 2pi read as 360). */
static double
deg_0_360(double rad)
{
	double d = geom_wrap_2pi(rad) * ERFA_DR2D;

	return d >= 360.0 ? 0.0 : d;
}

enum errcode
derive_at(const struct site_station *st, const struct site_target *t,
    const struct geom_eop *eop, double utc_mjd, struct derive_angles *out)
{
	static const struct geom_eop zero = {0.0, 0.0, 0.0};
	struct geom_site site;
	struct geom_target tg;
	struct geom_target_view v;
	struct geom_instant g;
	enum errcode rc;

	if (!isfinite(utc_mjd))
		return ERRCODE_BAD_TIME;
	if ((rc = derive_site(st, &site)) != ERRCODE_OK)
		return rc;
	if (geom_target_from_selen(t->lat_deg * ERFA_DD2R,
	    t->lon_deg * ERFA_DD2R, t->height_m, &tg) != ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	rc = geom_instant_at(&site, eop != NULL ? eop : &zero, TEXT_MJD0,
	    utc_mjd, GEOM_PREC_FULL, &g);
	if (rc != ERRCODE_OK)
		return rc;
	geom_target_view(&g, &tg, &v);
	out->synodic_deg = deg_0_360(g.moon.synodic);
	out->mean_elong_deg = deg_0_360(g.moon.mean_elong);
	out->target_el_deg = v.el * ERFA_DR2D;
	out->sun_el_target_deg = v.sun_elevation * ERFA_DR2D;
	out->range_km = v.range / 1e3;
	return ERRCODE_OK;
}

enum errcode
derive_attempt(const struct site_station *st, const struct site_target *t,
    const struct geom_eop *eop, struct site_attempt *a)
{
	struct derive_angles d;
	enum errcode rc;

	rc = derive_at(st, t, eop, a->start_mjd + 0.5 * (a->end_mjd -
	    a->start_mjd), &d);
	if (rc != ERRCODE_OK)
		return rc;
	a->synodic_deg = d.synodic_deg;
	a->mean_elong_deg = d.mean_elong_deg;
	a->target_el_deg = d.target_el_deg;
	a->sun_el_target_deg = d.sun_el_target_deg;
	a->range_km = d.range_km;
	return ERRCODE_OK;
}

enum errcode
derive_normal_point(const struct site_station *st,
    const struct site_target *t, const struct geom_eop *eop,
    struct site_normal_point *np)
{
	struct derive_angles d;
	enum errcode rc;

	if ((rc = derive_at(st, t, eop, np->epoch_mjd, &d)) != ERRCODE_OK)
		return rc;
	np->synodic_deg = d.synodic_deg;
	np->mean_elong_deg = d.mean_elong_deg;
	np->target_el_deg = d.target_el_deg;
	np->sun_el_target_deg = d.sun_el_target_deg;
	return ERRCODE_OK;
}
