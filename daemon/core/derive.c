/* SPDX-License-Identifier: BSD-3-Clause */
/* derive.c: phase and pointing angles of attempts and normal points. */
#include <math.h>
#include <string.h>

#include <erfa.h>
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
	struct derive_cache c;

	derive_cache_init(&c);
	return derive_at_cached(&c, st, t, eop, utc_mjd, out);
}

enum errcode
derive_at_direct(const struct site_station *st, const struct site_target *t,
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

void
derive_cache_init(struct derive_cache *c)
{
	memset(c, 0, sizeof *c);
}

enum errcode
derive_at_cached(struct derive_cache *c, const struct site_station *st,
    const struct site_target *t, const struct geom_eop *eop, double utc_mjd,
    struct derive_angles *out)
{
	static const struct geom_eop zero = {0.0, 0.0, 0.0};
	struct tscale_instant ti;
	struct geom_target tg;
	struct fast_frame f;
	double off, sun_el, el;
	enum errcode rc;

	if (eop == NULL)
		eop = &zero;
	if (!isfinite(utc_mjd))
		return ERRCODE_BAD_TIME;
	if (geom_target_from_selen(t->lat_deg * ERFA_DD2R,
	    t->lon_deg * ERFA_DD2R, t->height_m, &tg) != ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	if ((rc = tscale_from_utc(TEXT_MJD0, utc_mjd, eop->dut1, &ti)) !=
	    ERRCODE_OK)
		return rc;
	off = c->valid ? (ti.tt1 - c->ft.base1) + (ti.tt2 - c->ft.base2) : -1;
	if (!c->valid || !(off >= 0.0 && off < FAST_SEG_DAYS) ||
	    c->lat_deg != st->lat_deg || c->lon_deg != st->lon_deg ||
	    c->height_m != st->height_m) {
		struct geom_site site;
		/* Segments on a fixed grid from J2000: a record's angles do
		   not depend on which records came before it. */
		double k = floor(((ti.tt1 - ERFA_DJ00) + ti.tt2) /
		    FAST_SEG_DAYS);

		c->valid = 0;
		if ((rc = derive_site(st, &site)) != ERRCODE_OK)
			return rc;
		rc = fast_track_init(&c->ft, &site, &zero, ERFA_DJ00,
		    k * FAST_SEG_DAYS, 0.0, FAST_SEG_DAYS, c->seg, 1);
		if (rc != ERRCODE_OK)
			return rc == ERRCODE_BAD_ARG ? ERRCODE_BAD_TIME : rc;
		c->valid = 1;
		c->lat_deg = st->lat_deg;
		c->lon_deg = st->lon_deg;
		c->height_m = st->height_m;
		off = (ti.tt1 - c->ft.base1) + (ti.tt2 - c->ft.base2);
	}
	fast_frame_earth(&c->ft, off, ti.ut11, ti.ut12, eop,
	    FAST_SUN | FAST_LUNAR, &f);
	el = fast_target_el(&c->ft, &f, &tg, &sun_el, NULL);
	{
		/* Station to target: the Moon at t - tau plus the target's
		   radius vector (body-fixed to GCRS), less the station. */
		double d[3];

		for (int i = 0; i < 3; i++)
			d[i] = f.moon_ret[i] - f.site_gcrs[i] +
			    f.lunar_rot[0][i] * tg.body[0] +
			    f.lunar_rot[1][i] * tg.body[1] +
			    f.lunar_rot[2][i] * tg.body[2];
		out->range_km = sqrt(d[0] * d[0] + d[1] * d[1] + d[2] * d[2]) /
		    1e3;
	}
	out->synodic_deg = deg_0_360(fast_synodic(&c->ft, off));
	out->mean_elong_deg = deg_0_360(eraFad03(((ti.tt1 - ERFA_DJ00) +
	    ti.tt2) / ERFA_DJC));
	out->target_el_deg = el * ERFA_DR2D;
	out->sun_el_target_deg = sun_el * ERFA_DR2D;
	return ERRCODE_OK;
}

/* Mid-time of an attempt, UTC MJD. */
static double
attempt_mid(const struct site_attempt *a)
{
	return a->start_mjd + 0.5 * (a->end_mjd - a->start_mjd);
}

/* The four stored fields of a record (an attempt's or a point's). */
static void
put(const struct derive_angles *d, double *syn, double *elong, double *el,
    double *sun)
{
	*syn = d->synodic_deg;
	*elong = d->mean_elong_deg;
	*el = d->target_el_deg;
	*sun = d->sun_el_target_deg;
}

#define attempt_set(a, d) (put((d), &(a)->synodic_deg, \
	&(a)->mean_elong_deg, &(a)->target_el_deg, &(a)->sun_el_target_deg), \
	(a)->range_km = (d)->range_km)
#define np_set(p, d) put((d), &(p)->synodic_deg, &(p)->mean_elong_deg, \
	&(p)->target_el_deg, &(p)->sun_el_target_deg)

enum errcode
derive_attempt_cached(struct derive_cache *c, const struct site_station *st,
    const struct site_target *t, const struct geom_eop *eop,
    struct site_attempt *a)
{
	struct derive_angles d;
	enum errcode rc = derive_at_cached(c, st, t, eop, attempt_mid(a), &d);

	if (rc == ERRCODE_OK)
		attempt_set(a, &d);
	return rc;
}

enum errcode
derive_normal_point_cached(struct derive_cache *c,
    const struct site_station *st, const struct site_target *t,
    const struct geom_eop *eop, struct site_normal_point *np)
{
	struct derive_angles d;
	enum errcode rc = derive_at_cached(c, st, t, eop, np->epoch_mjd, &d);

	if (rc == ERRCODE_OK)
		np_set(np, &d);
	return rc;
}

enum errcode
derive_attempt(const struct site_station *st, const struct site_target *t,
    const struct geom_eop *eop, struct site_attempt *a)
{
	struct derive_angles d;
	enum errcode rc;

	rc = derive_at(st, t, eop, attempt_mid(a), &d);
	if (rc != ERRCODE_OK)
		return rc;
	attempt_set(a, &d);
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
	np_set(np, &d);
	return ERRCODE_OK;
}
