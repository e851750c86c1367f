/* SPDX-License-Identifier: BSD-3-Clause */
/* geom.c: Moon, Sun, station and lunar-target geometry on top of ERFA. */
#include <math.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/geom.h"

#define DEG (ERFA_DD2R)
#define WGS84_A 6378137.0	/* WGS84 equatorial radius, m */

double
geom_wrap_pi(double a)
{
	return eraAnpm(a);
}

double
geom_wrap_2pi(double a)
{
	return eraAnp(a);
}

/*
 * Small const-correct vector helpers.  ERFA 2.0's prototypes take
 * non-const pointers even for inputs, so the core uses these for plain
 * vector algebra and calls ERFA for the astronomy.
 */
static void
vsub(const double a[3], const double b[3], double out[3])
{
	for (int i = 0; i < 3; i++)
		out[i] = a[i] - b[i];
}

static void
vaxpy(const double a[3], double s, const double b[3], double out[3])
{
	for (int i = 0; i < 3; i++)
		out[i] = a[i] + s * b[i];
}

static double
vdot(const double a[3], const double b[3])
{
	return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

static double
vnorm(const double a[3])
{
	return sqrt(vdot(a, a));
}

static void
vscale(double s, const double a[3], double out[3])
{
	for (int i = 0; i < 3; i++)
		out[i] = s * a[i];
}

/* out = r a (r given as rows) */
static void
mxv(const double (*r)[3], const double a[3], double out[3])
{
	double t[3];

	for (int i = 0; i < 3; i++)
		t[i] = r[i][0] * a[0] + r[i][1] * a[1] + r[i][2] * a[2];
	memcpy(out, t, sizeof t);
}

/* out = r^T a */
static void
mtxv(const double (*r)[3], const double a[3], double out[3])
{
	double t[3];

	for (int i = 0; i < 3; i++)
		t[i] = r[0][i] * a[0] + r[1][i] * a[1] + r[2][i] * a[2];
	memcpy(out, t, sizeof t);
}

double
geom_sep(const double a[3], const double b[3])
{
	double c[3];

	c[0] = a[1] * b[2] - a[2] * b[1];
	c[1] = a[2] * b[0] - a[0] * b[2];
	c[2] = a[0] * b[1] - a[1] * b[0];
	return atan2(vnorm(c), vdot(a, b));
}

/* Longitude and latitude of a vector. */
static void
vangles(const double a[3], double *lon, double *lat)
{
	double xy = sqrt(a[0] * a[0] + a[1] * a[1]);

	*lon = (xy == 0.0) ? 0.0 : atan2(a[1], a[0]);
	*lat = (xy == 0.0 && a[2] == 0.0) ? 0.0 : atan2(a[2], xy);
}

/* Unit vector from a to b and the distance. */
static double
diff_unit(const double b[3], const double a[3], double u[3])
{
	double d[3], r;

	vsub(b, a, d);
	r = vnorm(d);
	vscale(r > 0 ? 1.0 / r : 0.0, d, u);
	return r;
}

void
geom_weather_standard(double height_m, struct geom_weather *wx)
{
	double tc = 15.0 - 0.0065 * height_m;
	double tsl = 273.15 + tc;

	wx->temperature_c = tc;
	wx->pressure_hpa = 1013.25 * exp(-height_m / (29.3 * tsl));
	wx->humidity = 0.5;
	wx->wavelength_um = 0.532;
}

enum errcode
geom_site_init(struct geom_site *site, double lat_rad, double lon_rad,
    double height_m, const struct geom_weather *wx)
{
	double sp, cp, sl, cl;

	if (!isfinite(lat_rad) || fabs(lat_rad) > ERFA_DPI / 2.0 ||
	    !isfinite(lon_rad) || fabs(lon_rad) > ERFA_D2PI ||
	    !isfinite(height_m) || height_m < -500.0 || height_m > 10000.0)
		return ERRCODE_BAD_ARG;
	memset(site, 0, sizeof *site);
	site->lat = lat_rad;
	site->lon = eraAnpm(lon_rad);
	site->height = height_m;
	if (wx != NULL)
		site->wx = *wx;
	else
		geom_weather_standard(height_m, &site->wx);
	if (!isfinite(site->wx.pressure_hpa) ||
	    !isfinite(site->wx.temperature_c) ||
	    !isfinite(site->wx.humidity) ||
	    !isfinite(site->wx.wavelength_um) || site->wx.pressure_hpa < 0 ||
	    site->wx.pressure_hpa > 1200 || site->wx.temperature_c < -80 ||
	    site->wx.temperature_c > 60 || site->wx.humidity < 0 ||
	    site->wx.humidity > 1 || site->wx.wavelength_um < 0.2 ||
	    site->wx.wavelength_um > 20)
		return ERRCODE_BAD_ARG;
	if (eraGd2gc(ERFA_WGS84, site->lon, lat_rad, height_m, site->itrs) != 0)
		return ERRCODE_BAD_ARG;
	sp = sin(lat_rad);
	cp = cos(lat_rad);
	sl = sin(site->lon);
	cl = cos(site->lon);
	site->enu[0][0] = -sl;
	site->enu[0][1] = cl;
	site->enu[0][2] = 0.0;
	site->enu[1][0] = -sp * cl;
	site->enu[1][1] = -sp * sl;
	site->enu[1][2] = cp;
	site->enu[2][0] = cp * cl;
	site->enu[2][1] = cp * sl;
	site->enu[2][2] = sp;
	eraRefco(site->wx.pressure_hpa, site->wx.temperature_c,
	    site->wx.humidity, site->wx.wavelength_um, &site->refa,
	    &site->refb);
	return ERRCODE_OK;
}

double
geom_refract(double el, double refa, double refb)
{
	const double celmin = 1e-6, selmin = 0.05;
	double xy = cos(el), zt = sin(el);
	double r = xy > celmin ? xy : celmin;
	double z = zt > selmin ? zt : selmin;
	double tz = r / z, w = refb * tz * tz;
	double del = (refa + w) * tz / (1.0 + (refa + 3.0 * w) / (z * z));
	double cosdel = 1.0 - del * del / 2.0;
	double f = cosdel - del * z / r;

	return atan2(cosdel * zt + del * r, xy * f);
}

void
geom_earth_at(double tt1, double tt2, double ut11, double ut12,
    const struct geom_eop *eop, enum geom_precision prec,
    struct geom_earth *out)
{
	double gst, rpom[3][3];
	double xp = eop != NULL ? eop->xp : 0.0;
	double yp = eop != NULL ? eop->yp : 0.0;

	switch (prec) {
	case GEOM_PREC_FAST:
		eraPnm00b(tt1, tt2, out->rbpn);
		break;
	case GEOM_PREC_FULL:
		eraPnm06a(tt1, tt2, out->rbpn);
		break;
	}
	gst = eraGst06(ut11, ut12, tt1, tt2, out->rbpn);
	eraPom00(xp, yp, eraSp00(tt1, tt2), rpom);
	eraC2teqx(out->rbpn, gst, rpom, out->rc2t);
}

/* Apparent geocentric Sun (GCRS, au) from ERFA's Earth ephemeris. */
static void
sun_apparent_au(double tt1, double tt2, double sun[3])
{
	double pvh[2][3], pvb[2][3], u[3], d, v[3], v2, ppr[3];

	(void)eraEpv00(tt1, tt2, pvh, pvb);	/* +1 outside 1900-2100 */
	eraSxp(-1.0, pvh[0], sun);
	eraPn(sun, &d, u);
	eraSxp(ERFA_AULT / ERFA_DAYSEC, pvb[1], v);	/* velocity / c */
	v2 = eraPdp(v, v);
	eraAb(u, v, d, sqrt(1.0 - v2), ppr);
	eraSxp(d, ppr, sun);
}

double
geom_synodic_of(double tt1, double tt2, const double moon_p[3],
    const double moon_v[3], const double sun_p[3])
{
	double moon[3], sun[3], rm[3][3], em[3], es[3], tau, lm, ls, r;

	/* Light time from the Moon (about 1.3 s), in seconds. */
	tau = vnorm(moon_p) / GEOM_C;
	vaxpy(moon_p, -tau, moon_v, moon);
	memcpy(sun, sun_p, sizeof sun);
	eraEcm06(tt1, tt2, rm);
	eraRxp(rm, moon, em);
	eraRxp(rm, sun, es);
	eraC2s(em, &lm, &r);
	eraC2s(es, &ls, &r);
	return eraAnp(lm - ls);
}

double
geom_synodic_at(double tt1, double tt2)
{
	struct geom_bodies b;

	(void)geom_bodies_at(tt1, tt2, &b);
	return b.synodic;
}

enum errcode
geom_bodies_at(double tt1, double tt2, struct geom_bodies *out)
{
	double pv[2][3], t;

	if (!isfinite(tt1) || !isfinite(tt2))
		return ERRCODE_BAD_TIME;
	out->tt1 = tt1;
	out->tt2 = tt2;
	eraMoon98(tt1, tt2, pv);
	eraSxp(ERFA_DAU, pv[0], out->moon_p);
	eraSxp(ERFA_DAU / ERFA_DAYSEC, pv[1], out->moon_v);
	sun_apparent_au(tt1, tt2, out->sun_p);
	eraSxp(ERFA_DAU, out->sun_p, out->sun_p);
	out->synodic = geom_synodic_of(tt1, tt2, out->moon_p, out->moon_v,
	    out->sun_p);
	t = ((tt1 - ERFA_DJ00) + tt2) / ERFA_DJC;
	out->mean_elong = eraAnp(eraFad03(t));
	return ERRCODE_OK;
}

void
geom_lunar_angles(double tt1, double tt2, double ang[3])
{
	double d = (tt1 - ERFA_DJ00) + tt2;
	double t = d / 36525.0;
	double e[14];
	double ra, dec, w;

	e[1] = 125.045 - 0.0529921 * d;
	e[2] = 250.089 - 0.1059842 * d;
	e[3] = 260.008 + 13.0120009 * d;
	e[4] = 176.625 + 13.3407154 * d;
	e[5] = 357.529 + 0.9856003 * d;
	e[6] = 311.589 + 26.4057084 * d;
	e[7] = 134.963 + 13.0649930 * d;
	e[8] = 276.617 + 0.3287146 * d;
	e[9] = 34.226 + 1.7484877 * d;
	e[10] = 15.134 - 0.1589763 * d;
	e[11] = 119.743 + 0.0036096 * d;
	e[12] = 239.961 + 0.1643573 * d;
	e[13] = 25.053 + 12.9590088 * d;
	for (int i = 1; i <= 13; i++)
		e[i] = fmod(e[i], 360.0) * DEG;

	ra = 269.9949 + 0.0031 * t - 3.8787 * sin(e[1]) - 0.1204 * sin(e[2]) +
	    0.0700 * sin(e[3]) - 0.0172 * sin(e[4]) + 0.0072 * sin(e[6]) -
	    0.0052 * sin(e[10]) + 0.0043 * sin(e[13]);
	dec = 66.5392 + 0.0130 * t + 1.5419 * cos(e[1]) + 0.0239 * cos(e[2]) -
	    0.0278 * cos(e[3]) + 0.0068 * cos(e[4]) - 0.0029 * cos(e[6]) +
	    0.0009 * cos(e[7]) + 0.0008 * cos(e[10]) - 0.0009 * cos(e[13]);
	w = 38.3213 + 13.17635815 * d - 1.4e-12 * d * d +
	    3.5610 * sin(e[1]) + 0.1208 * sin(e[2]) - 0.0642 * sin(e[3]) +
	    0.0158 * sin(e[4]) + 0.0252 * sin(e[5]) - 0.0066 * sin(e[6]) -
	    0.0047 * sin(e[7]) - 0.0046 * sin(e[8]) + 0.0028 * sin(e[9]) +
	    0.0052 * sin(e[10]) + 0.0040 * sin(e[11]) + 0.0019 * sin(e[12]) -
	    0.0044 * sin(e[13]);
	ang[0] = ra * DEG;
	ang[1] = dec * DEG;
	ang[2] = w * DEG;
}

void
geom_lunar_matrix(const double ang[3], double r[3][3])
{
	eraIr(r);
	eraRz(ang[0] + ERFA_DPI / 2.0, r);
	eraRx(ERFA_DPI / 2.0 - ang[1], r);
	eraRz(fmod(ang[2], ERFA_D2PI), r);
}

/* Azimuth and elevation of a GCRS topocentric vector. */
static void
horizon(const struct geom_site *site, const double (*rc2t)[3],
    const double v_gcrs[3], double *az, double *el, double itrs[3])
{
	double e, n, u;

	mxv(rc2t, v_gcrs, itrs);
	e = vdot(site->enu[0], itrs);
	n = vdot(site->enu[1], itrs);
	u = vdot(site->enu[2], itrs);
	*az = eraAnp(atan2(e, n));
	*el = atan2(u, sqrt(e * e + n * n));
}

/* Selenographic longitude and latitude of a GCRS direction. */
static void
selenographic(const double (*rot)[3], const double v[3], double *lon,
    double *lat)
{
	double b[3];

	mxv(rot, v, b);
	vangles(b, lon, lat);
	*lon = eraAnpm(*lon);
}

void
geom_instant_make(const struct geom_site *site,
    const struct tscale_instant *t, const struct geom_bodies *b,
    const struct geom_earth *e, struct geom_instant *out)
{
	double d0[3], tau, itrs[3], tod[3], tmp[3], v[3];
	struct geom_moon_view *m = &out->moon;

	out->site = *site;
	out->t = *t;
	out->b = *b;
	out->e = *e;
	mtxv(e->rc2t, site->itrs, out->site_gcrs);

	vsub(b->moon_p, out->site_gcrs, d0);
	tau = vnorm(d0) / GEOM_C;
	out->light_time = tau;
	vaxpy(b->moon_p, -tau, b->moon_v, out->moon_ret);
	vsub(out->moon_ret, out->site_gcrs, out->moon_topo);
	vsub(b->sun_p, out->site_gcrs, out->sun_topo);
	{
		double ang[3];

		geom_lunar_angles(t->tt1, t->tt2 - tau / ERFA_DAYSEC, ang);
		geom_lunar_matrix(ang, out->lunar_rot);
	}

	horizon(site, e->rc2t, out->moon_topo, &m->az, &m->el, itrs);
	m->el_apparent = geom_refract(m->el, site->refa, site->refb);
	m->ha = eraAnpm(site->lon - atan2(itrs[1], itrs[0]));
	mxv(e->rbpn, out->moon_topo, tod);
	vangles(tod, &m->ra, &m->dec);
	m->ra = eraAnp(m->ra);
	m->range = vnorm(out->moon_topo);
	m->geocentric_range = vnorm(b->moon_p);
	m->parallax = asin(WGS84_A / m->geocentric_range);

	vsub(b->sun_p, out->moon_ret, tmp);
	vscale(-1.0, out->moon_topo, v);
	m->phase_angle = geom_sep(tmp, v);
	m->illuminated_fraction = (1.0 + cos(m->phase_angle)) / 2.0;
	m->elongation = geom_sep(out->moon_topo, out->sun_topo);
	m->synodic = b->synodic;
	m->mean_elong = b->mean_elong;

	horizon(site, e->rc2t, out->sun_topo, &out->sun.az, &out->sun.el,
	    itrs);
	out->sun.separation = m->elongation;

	vscale(-1.0, out->moon_ret, v);
	selenographic((const double (*)[3])out->lunar_rot, v, &out->lib.geo_lon, &out->lib.geo_lat);
	vscale(-1.0, out->moon_topo, v);
	selenographic((const double (*)[3])out->lunar_rot, v, &out->lib.topo_lon,
	    &out->lib.topo_lat);
	selenographic((const double (*)[3])out->lunar_rot, tmp, &out->lib.subsolar_lon,
	    &out->lib.subsolar_lat);
	out->lib.colongitude = eraAnp(ERFA_DPI / 2.0 - out->lib.subsolar_lon);
}

enum errcode
geom_instant_at(const struct geom_site *site, const struct geom_eop *eop,
    double utc1, double utc2, enum geom_precision prec,
    struct geom_instant *out)
{
	struct tscale_instant t;
	struct geom_bodies b;
	struct geom_earth e;
	enum errcode rc;

	rc = tscale_from_utc(utc1, utc2, eop != NULL ? eop->dut1 : 0.0, &t);
	if (rc != ERRCODE_OK)
		return rc;
	rc = geom_bodies_at(t.tt1, t.tt2, &b);
	if (rc != ERRCODE_OK)
		return rc;
	geom_earth_at(t.tt1, t.tt2, t.ut11, t.ut12, eop, prec, &e);
	geom_instant_make(site, &t, &b, &e, out);
	return ERRCODE_OK;
}

enum errcode
geom_target_from_selen(double lat, double lon, double height,
    struct geom_target *out)
{
	if (!isfinite(lat) || fabs(lat) > ERFA_DPI / 2.0 || !isfinite(lon) ||
	    fabs(lon) > ERFA_D2PI || !isfinite(height) ||
	    fabs(height) > 20000.0)
		return ERRCODE_BAD_ARG;
	eraS2p(lon, lat, GEOM_MOON_RADIUS + height, out->body);
	return ERRCODE_OK;
}

enum errcode
geom_target_from_xyz(double x, double y, double z, struct geom_target *out)
{
	double r;

	if (!isfinite(x) || !isfinite(y) || !isfinite(z))
		return ERRCODE_BAD_ARG;
	r = sqrt(x * x + y * y + z * z);
	if (r < 1500e3 || r > 2000e3)
		return ERRCODE_BAD_ARG;
	out->body[0] = x;
	out->body[1] = y;
	out->body[2] = z;
	return ERRCODE_OK;
}

void
geom_target_view(const struct geom_instant *g, const struct geom_target *t,
    struct geom_target_view *out)
{
	double radial[3], pos[3], topo[3], itrs[3], nrm[3], u[3], r;
	double tod[3], ra, dec;
	const struct geom_moon_view *m = &g->moon;
	struct eclipse_point ep;

	mtxv(g->lunar_rot, t->body, radial);
	vaxpy(g->moon_ret, 1.0, radial, pos);
	vsub(pos, g->site_gcrs, topo);
	horizon(&g->site, g->e.rc2t, topo, &out->az, &out->el, itrs);
	out->el_apparent = geom_refract(out->el, g->site.refa, g->site.refb);
	out->range = vnorm(topo);
	out->round_trip = 2.0 * out->range / GEOM_C;

	mxv(g->e.rbpn, topo, tod);
	vangles(tod, &ra, &dec);
	out->offset_ra = eraAnpm(ra - m->ra) * cos(m->dec);
	out->offset_dec = dec - m->dec;

	r = vnorm(radial);
	vscale(1.0 / r, radial, nrm);
	diff_unit(g->b.sun_p, pos, u);
	out->sun_elevation = asin(fmax(-1.0, fmin(1.0, vdot(nrm, u))));
	diff_unit(g->site_gcrs, pos, u);
	out->earth_elevation = asin(fmax(-1.0, fmin(1.0, vdot(nrm, u))));
	eclipse_point_at(g->b.sun_p, pos, &ep);
	out->shadow = ep.shadow;
	out->sun_visible = ep.sun_visible;
	out->sunlit = out->sun_elevation > 0.0 &&
	    ep.shadow != ECLIPSE_SHADOW_UMBRA;
	out->dark_margin = fmax(-out->sun_elevation, ep.umbra_margin);
}

const char *
geom_phase_name(enum geom_phase_kind kind)
{
	switch (kind) {
	case GEOM_PHASE_NEW:
		return "new";
	case GEOM_PHASE_FIRST_QUARTER:
		return "first_quarter";
	case GEOM_PHASE_FULL:
		return "full";
	case GEOM_PHASE_LAST_QUARTER:
		return "last_quarter";
	}
	return "unknown";
}

/* Signed distance of the synodic angle at tt from a target angle, rad. */
static double
synodic_offset(double tt1, double tt2, double target)
{
	return eraAnpm(geom_synodic_at(tt1, tt2) - target);
}

enum errcode
geom_root_illinois(geom_root_fn f, void *ctx, double a, double fa, double b,
    double fb, double tol, int maxit, double *root)
{
	int side = 0;

	for (int i = 0; i < maxit; i++) {
		double m, fm;

		if (!(b - a > tol)) {
			*root = 0.5 * (a + b);
			return ERRCODE_OK;
		}
		m = (fa * b - fb * a) / (fa - fb);
		if (!(m > a && m < b))
			m = 0.5 * (a + b);
		fm = f(ctx, m);
		if (fm == 0.0) {
			*root = m;
			return ERRCODE_OK;
		}
		if ((fm > 0) == (fb > 0)) {
			b = m;
			fb = fm;
			if (side == -1)
				fa /= 2.0;
			side = -1;
		} else {
			a = m;
			fa = fm;
			if (side == +1)
				fb /= 2.0;
			side = +1;
		}
	}
	*root = 0.5 * (a + b);
	return (b - a > tol) ? ERRCODE_NO_CONVERGE : ERRCODE_OK;
}

/* The synodic angle's offset from a target angle, for geom_root_illinois. */
struct phase_goal {
	double tt1;		/* first part of the TT JD */
	double target;		/* angle sought, rad */
};

static double
phase_goal_offset(void *ctx, double tt2)
{
	const struct phase_goal *g = ctx;

	return synodic_offset(g->tt1, tt2, g->target);
}

/* 1 when a phase of a kind in mask lies in the unwrapped (da, db]. */
static int
phase_wanted_in(double da, double db, unsigned mask)
{
	const double eps = 1e-6;	/* rad: only widens the test */

	for (int k = (int)floor((da - eps) / (ERFA_DPI / 2.0)) + 1;
	    k * (ERFA_DPI / 2.0) <= db + eps; k++)
		if (mask & (1u << (((k % 4) + 4) % 4)))
			return 1;
	return 0;
}

enum errcode
geom_phases_find(double from1, double from2, double to1, double to2,
    struct geom_phase_event *out, size_t cap, size_t *n)
{
	return geom_phases_find_kinds(from1, from2, to1, to2,
	    GEOM_PHASE_MASK_ALL, out, cap, n);
}

enum errcode
geom_phases_find_kinds(double from1, double from2, double to1, double to2,
    unsigned kinds, struct geom_phase_event *out, size_t cap, size_t *n)
{
	const double step = 0.5;
	double span = (to1 - from1) + (to2 - from2);
	double base = from1, a = from2, end = from2 + span;
	double pa;
	size_t count = 0;
	int per_coarse;
	enum errcode rc = ERRCODE_OK;

	*n = 0;
	if (!isfinite(span) || span < 0.0 || span > 400 * 366.0)
		return ERRCODE_BAD_ARG;
	kinds &= GEOM_PHASE_MASK_ALL;
	/* Half-day steps grouped in coarse steps (2 d, or 4 d for one kind:
	   at most 62 deg of the angle) that are skipped whole when they hold
	   no phase sought: the half-day brackets, and so the results, are
	   those of a scan of every half day. */
	per_coarse = (kinds & (kinds - 1u)) ? 4 : 8;
	pa = geom_synodic_at(base, a);
	while (a < end) {
		double c = a, pc;
		int m = 0;

		while (m < per_coarse && c < end) {
			c = fmin(c + step, end);
			m++;
		}
		pc = geom_synodic_at(base, c);
		if (!phase_wanted_in(pa, pa + eraAnpm(pc - pa), kinds)) {
			a = c;
			pa = pc;
			continue;
		}
		for (int j = 0; j < m; j++) {
			double b = fmin(a + step, end);
			double pb = (j == m - 1) ? pc : geom_synodic_at(base, b);
			double da = pa, db = pa + eraAnpm(pb - pa);	/* unwrapped */

			for (int k = (int)floor(da / (ERFA_DPI / 2.0)) + 1;
			    k * (ERFA_DPI / 2.0) <= db; k++) {
				double target = eraAnp(k * (ERFA_DPI / 2.0));
				int kind = ((k % 4) + 4) % 4;
				double fa, fb, root;
				enum errcode r2;

				if (!(kinds & (1u << kind)))
					continue;
				fa = synodic_offset(base, a, target);
				fb = synodic_offset(base, b, target);
				if (fa == 0.0) {
					root = a;
				} else {
					struct phase_goal goal = {base, target};

					/* Smooth and monotone over the half-day
					   bracket: a handful of steps to 9 ms. */
					r2 = geom_root_illinois(phase_goal_offset,
					    &goal, a, fa, b, fb, 1e-7, 60, &root);
					if (r2 != ERRCODE_OK)
						return r2;
				}
				if (root >= end || root < from2)
					continue;
				if (count < cap) {
					out[count].kind = (enum geom_phase_kind)kind;
					out[count].tt1 = base;
					out[count].tt2 = root;
				} else {
					rc = ERRCODE_TOO_LARGE;
				}
				count++;
			}
			a = b;
			pa = pb;
		}
	}
	*n = count;
	return rc;
}
