/* SPDX-License-Identifier: BSD-3-Clause */
/* fastpath.c: Chebyshev fits of the Moon, the Sun and the Earth's
   orientation per segment, and cheap frames evaluated from them. */
#include <math.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/eclipse.h"
#include "core/fastpath.h"

#define MAX_SPAN_DAYS 4000.0
#define MOON_STRIDE 1		/* Moon nodes used: all */
#define ORI_STRIDE ((FAST_MOON_NODES - 1) / (FAST_ORI_NODES - 1))
#define SUN_STRIDE ((FAST_MOON_NODES - 1) / (FAST_SUN_NODES - 1))

/* Chebyshev series sum_{k<n} c[k] T_k(x) by Clenshaw's recurrence. */
static double
cheb(const double *c, int n, double x)
{
	double b0 = 0.0, b1 = 0.0, b2, x2 = 2.0 * x;

	for (int k = n - 1; k >= 1; k--) {
		b2 = b1;
		b1 = b0;
		b0 = c[k] + x2 * b1 - b2;
	}
	return c[0] + x * b0 - b1;
}

/* Coefficients of the derivative (in x) of a series of n terms. */
static void
cheb_deriv(const double *c, int n, double *d)
{
	double dk1 = 0.0, dk2 = 0.0;	/* d[k+1], d[k+2] */

	for (int k = n - 1; k >= 0; k--) {
		double dk = dk2 + 2.0 * (double)(k + 1) *
		    (k + 1 < n ? c[k + 1] : 0.0);

		d[k] = dk;
		dk2 = dk1;
		dk1 = dk;
	}
	d[0] *= 0.5;
}

/* Node k of n Chebyshev-Lobatto nodes, from x = 1 down to x = -1. */
static double
lobatto(int k, int n)
{
	return cos(ERFA_DPI * (double)k / (double)(n - 1));
}

/*
 * Inverse of the collocation matrix of a fit at n Lobatto nodes: on
 * values (m = n terms) or, with deriv, on values then first derivatives
 * (m = 2n terms, a Hermite fit).  inv is m x m, row-major.  Gauss-Jordan
 * with partial pivoting; returns 0, or -1 when singular.
 */
static int
fit_inverse(int n, int deriv, double *inv)
{
	enum { M = FAST_MOON_NC };
	double a[M][2 * M];
	int m = deriv ? 2 * n : n;

	for (int k = 0; k < n; k++) {
		double x = lobatto(k, n);
		double t0 = 1.0, t1 = x, d0 = 0.0, d1 = 1.0;

		for (int j = 0; j < m; j++) {
			double tj = j == 0 ? 1.0 : (j == 1 ? x : 0.0);
			double dj = j == 0 ? 0.0 : (j == 1 ? 1.0 : 0.0);

			if (j >= 2) {
				tj = 2.0 * x * t1 - t0;
				dj = 2.0 * t1 + 2.0 * x * d1 - d0;
				t0 = t1;
				t1 = tj;
				d0 = d1;
				d1 = dj;
			}
			a[k][j] = tj;
			if (deriv)
				a[n + k][j] = dj;
		}
	}
	for (int i = 0; i < m; i++)
		for (int j = 0; j < m; j++)
			a[i][m + j] = i == j ? 1.0 : 0.0;
	for (int c = 0; c < m; c++) {
		int p = c;

		for (int i = c + 1; i < m; i++)
			if (fabs(a[i][c]) > fabs(a[p][c]))
				p = i;
		if (a[p][c] == 0.0)
			return -1;
		if (p != c)
			for (int j = 0; j < 2 * m; j++) {
				double tmp = a[c][j];

				a[c][j] = a[p][j];
				a[p][j] = tmp;
			}
		{
			double piv = a[c][c];

			for (int j = 0; j < 2 * m; j++)
				a[c][j] /= piv;
		}
		for (int i = 0; i < m; i++) {
			double f = a[i][c];

			if (i == c || f == 0.0)
				continue;
			for (int j = 0; j < 2 * m; j++)
				a[i][j] -= f * a[c][j];
		}
	}
	for (int i = 0; i < m; i++)
		for (int j = 0; j < m; j++)
			inv[i * m + j] = a[i][m + j];
	return 0;
}

/* c = inv y, inv m x m. */
static void
fit_apply(const double *inv, int m, const double *y, double *c)
{
	for (int i = 0; i < m; i++) {
		double s = 0.0;

		for (int j = 0; j < m; j++)
			s += inv[i * m + j] * y[j];
		c[i] = s;
	}
}

size_t
fast_track_segments(double from, double to)
{
	if (!isfinite(from) || !isfinite(to) || !(to > from) ||
	    to - from > MAX_SPAN_DAYS)
		return 0;
	return (size_t)ceil((to - from) / FAST_SEG_DAYS);
}

/* TT-UT1 in days at offset t. */
static enum errcode
tt_ut1(const struct fast_track *ft, double t, double *d)
{
	struct tscale_instant ti;
	enum errcode rc = tscale_from_tt(ft->base1, ft->base2 + t,
	    ft->eop.dut1, &ti);

	if (rc != ERRCODE_OK)
		return rc;
	*d = (ti.tt1 - ti.ut11) + (ti.tt2 - ti.ut12);
	return ERRCODE_OK;
}

/* TT-UT1 over [a, b]: linear, or two linear pieces about one step. */
static enum errcode
fit_ut1(const struct fast_track *ft, double a, double b, struct fast_seg *s)
{
	double da, db, lo = a, hi = b, dlo, dhi;
	enum errcode rc;

	if ((rc = tt_ut1(ft, a, &da)) != ERRCODE_OK ||
	    (rc = tt_ut1(ft, b, &db)) != ERRCODE_OK)
		return rc;
	/* Before 1972 UTC drifts (<= 0.0013 s a day, 0.011 s a segment);
	   its steps and the leap seconds are >= 0.05 s. */
	if (fabs(db - da) * ERFA_DAYSEC < 0.03) {
		s->dut[0][0] = da;
		s->dut[0][1] = (db - da) / (b - a);
		s->dut[1][0] = db;
		s->dut[1][1] = s->dut[0][1];
		s->step = b + 1.0;
		return ERRCODE_OK;
	}
	while (hi - lo > 1e-9) {
		double m = 0.5 * (lo + hi), dm;

		if ((rc = tt_ut1(ft, m, &dm)) != ERRCODE_OK)
			return rc;
		if (fabs(dm - da) > 0.5 * fabs(db - da))
			hi = m;
		else
			lo = m;
	}
	if ((rc = tt_ut1(ft, lo, &dlo)) != ERRCODE_OK ||
	    (rc = tt_ut1(ft, hi, &dhi)) != ERRCODE_OK)
		return rc;
	s->dut[0][0] = da;
	s->dut[0][1] = lo > a ? (dlo - da) / (lo - a) : 0.0;
	s->dut[1][0] = dhi;
	s->dut[1][1] = b > hi ? (db - dhi) / (b - hi) : 0.0;
	s->step = hi;
	return ERRCODE_OK;
}

/* Apparent geocentric Sun (m) from the fitted geometric Sun and the
   Earth's velocity, as geom_bodies_at applies eraAb. */
static void
sun_apparent(const struct fast_seg *s, double x, double out[3])
{
	double p[3], v[3], u[3], ppr[3], d, v2;

	for (int i = 0; i < 3; i++) {
		p[i] = cheb(s->sun[i], FAST_SUN_NC, x);
		v[i] = cheb(s->beta[i], FAST_SUN_NODES, x);
	}
	d = sqrt(p[0] * p[0] + p[1] * p[1] + p[2] * p[2]);
	for (int i = 0; i < 3; i++)
		u[i] = p[i] / d;
	v2 = v[0] * v[0] + v[1] * v[1] + v[2] * v[2];
	eraAb(u, v, d / ERFA_DAU, sqrt(1.0 - v2), ppr);
	for (int i = 0; i < 3; i++)
		out[i] = d * ppr[i];
}

/* The collocation inverses, computed once per track. */
struct fits {
	double moon[FAST_MOON_NC * FAST_MOON_NC];	/* values, 13 nodes */
	double ori[FAST_ORI_NODES * FAST_ORI_NODES];	/* values, 7 nodes */
	double sun[FAST_SUN_NC * FAST_SUN_NC];		/* Hermite, 3 nodes */
	double beta[FAST_SUN_NODES * FAST_SUN_NODES];	/* values, 3 nodes */
};

enum { NQ = 8 };	/* X, Y, s, EO, ra, dec, W, synodic */

/* The models at a segment's end, which is the next segment's start. */
struct node_cache {
	int valid;
	double pvh[2][3], pvb[2][3];	/* eraEpv00 */
	double moon[2][3];		/* eraMoon98 */
	double q[NQ];			/* X, Y, s, EO, ra, dec, W, synodic */
};

/* The models at a segment boundary (eraEpv00 and eraMoon98). */
struct bound {
	double pvh[2][3], pvb[2][3];	/* Earth heliocentric, barycentric */
	double pvm[2][3];		/* Moon, geocentric */
};

/*
 * Two segments that share their Sun: the models at the pair's three
 * boundaries (b[0], b[1], b[2], at u = -1, 0, 1 on the pair) and the
 * middle of the one being fitted, at u = um (-0.5 or 0.5).
 */
struct sun_pair {
	const struct bound *b;
	double um;
};

/* Moon / (Earth + Moon) mass (IAU 2009 Earth/Moon mass ratio
   81.30056907, quoted from memory): the Earth-Moon barycentre is the
   Earth plus this times the geocentric Moon.  The same share of the Moon
   is added back where it was taken off, so an error of 1e-6 in it moves
   the fitted Sun by under a metre. */
#define MOON_EMB (1.0 / (1.0 + 81.30056907))

/*
 * The Earth (heliocentric position and velocity, barycentric velocity;
 * au, au/d) at the middle of a segment of a pair, without eraEpv00: the
 * Earth-Moon barycentre, whose path has no monthly wobble, by a Hermite
 * fit of the pair's boundaries (over 16 d within 0.0003" of a Kepler
 * orbit), less MOON_EMB times the Moon there (pvm); the Sun's barycentric
 * velocity quadratic between the boundaries.
 */
static void
pair_middle(const struct fits *fi, const struct sun_pair *sp, double len,
    const double pvm[2][3], double pvh[2][3], double pvb[2][3])
{
	const double um = sp->um, w[3] = {0.5 * um * (um - 1.0),
	    1.0 - um * um, 0.5 * um * (um + 1.0)};	/* u = -1, 0, 1 */
	const struct bound *b = sp->b;

	for (int i = 0; i < 3; i++) {
		double y[FAST_SUN_NC], c[FAST_SUN_NC], d[FAST_SUN_NC], sb = 0.0;

		for (int j = 0; j < FAST_SUN_NODES; j++) {	/* u = 1, 0, -1 */
			const struct bound *q = &b[FAST_SUN_NODES - 1 - j];

			y[j] = q->pvh[0][i] + MOON_EMB * q->pvm[0][i];
			y[FAST_SUN_NODES + j] = (q->pvh[1][i] + MOON_EMB *
			    q->pvm[1][i]) * len;
		}
		fit_apply(fi->sun, FAST_SUN_NC, y, c);
		cheb_deriv(c, FAST_SUN_NC, d);
		pvh[0][i] = cheb(c, FAST_SUN_NC, um) - MOON_EMB * pvm[0][i];
		pvh[1][i] = cheb(d, FAST_SUN_NC, um) / len -
		    MOON_EMB * pvm[1][i];
		for (int j = 0; j < 3; j++)
			sb += w[j] * (b[j].pvb[1][i] - b[j].pvh[1][i]);
		pvb[0][i] = pvh[0][i];		/* not read */
		pvb[1][i] = pvh[1][i] + sb;
	}
}

/* The models at offset t. */
static void
boundary(const struct fast_track *ft, double t, struct bound *b)
{
	(void)eraEpv00(ft->base1, ft->base2 + t, b->pvh, b->pvb);
	eraMoon98(ft->base1, ft->base2 + t, b->pvm);
}

/* Fit one segment starting at offset a; nc holds the models at a (when
   valid) and receives them at its end; its synodic angle there unwraps
   this segment's.  sp (or NULL): the segment's pair, which gives the
   models at both ends and the Sun in the middle. */
static void
fit_segment(const struct fast_track *ft, const struct fits *fi, double a,
    struct fast_seg *s, struct node_cache *nc, const struct sun_pair *sp)
{
	const double h = 0.5 * ft->len;
	double ym[3][FAST_MOON_NC], yq[NQ][FAST_ORI_NODES], cq[FAST_ORI_NODES];
	double ys[3][FAST_SUN_NC], yb[3][FAST_SUN_NODES];
	double mp[FAST_MOON_NODES][3], mv[FAST_MOON_NODES][3];
	double pvmid[2][3];
	const struct node_cache prev = *nc;	/* at a; nc is rewritten */
	const struct bound *b0 = NULL, *b1 = NULL;	/* start, end */

	s->mid = a + h;
	if (sp != NULL) {
		b0 = &sp->b[sp->um < 0.0 ? 0 : 1];
		b1 = b0 + 1;
	}
	/* The Moon at every node. */
	for (int k = 0; k < FAST_MOON_NODES; k++) {
		double pv[2][3];
		double t = s->mid + h * lobatto(k, FAST_MOON_NODES);

		if (sp != NULL && (k == 0 || k == FAST_MOON_NODES - 1))
			memcpy(pv, k == 0 ? b1->pvm : b0->pvm, sizeof pv);
		else if (k == FAST_MOON_NODES - 1 && prev.valid)
			memcpy(pv, prev.moon, sizeof pv);
		else
			eraMoon98(ft->base1, ft->base2 + t, pv);
		if (k == (FAST_MOON_NODES - 1) / 2)
			memcpy(pvmid, pv, sizeof pv);
		if (k == 0)
			memcpy(nc->moon, pv, sizeof pv);
		for (int i = 0; i < 3; i++) {
			mp[k][i] = pv[0][i] * ERFA_DAU;
			mv[k][i] = pv[1][i] * ERFA_DAU / ERFA_DAYSEC;
			ym[i][k] = mp[k][i];
		}
	}
	for (int i = 0; i < 3; i++) {
		fit_apply(fi->moon, FAST_MOON_NC, ym[i], s->moon[i]);
		cheb_deriv(s->moon[i], FAST_MOON_NC, s->dmoon[i]);
	}
	/* The Sun (before the orientation nodes: the synodic angle reads
	   it). */
	for (int j = 0; j < FAST_SUN_NODES; j++) {
		double pvh[2][3], pvb[2][3];
		double t = s->mid + h * lobatto(j, FAST_SUN_NODES);

		if (sp != NULL && j != 1) {
			memcpy(pvh, j == 0 ? b1->pvh : b0->pvh, sizeof pvh);
			memcpy(pvb, j == 0 ? b1->pvb : b0->pvb, sizeof pvb);
		} else if (sp != NULL) {
			pair_middle(fi, sp, ft->len, (const double (*)[3])pvmid,
			    pvh, pvb);
		} else if (j == FAST_SUN_NODES - 1 && prev.valid) {
			memcpy(pvh, prev.pvh, sizeof pvh);
			memcpy(pvb, prev.pvb, sizeof pvb);
		} else {
			(void)eraEpv00(ft->base1, ft->base2 + t, pvh, pvb);
		}
		if (j == 0) {
			memcpy(nc->pvh, pvh, sizeof pvh);
			memcpy(nc->pvb, pvb, sizeof pvb);
		}
		for (int i = 0; i < 3; i++) {
			ys[i][j] = -pvh[0][i] * ERFA_DAU;
			ys[i][FAST_SUN_NODES + j] = -pvh[1][i] * ERFA_DAU * h;
			yb[i][j] = pvb[1][i] * ERFA_AULT / ERFA_DAYSEC;
		}
	}
	for (int i = 0; i < 3; i++) {
		fit_apply(fi->sun, FAST_SUN_NC, ys[i], s->sun[i]);
		fit_apply(fi->beta, FAST_SUN_NODES, yb[i], s->beta[i]);
	}
	/* Earth orientation, the Moon's frame and the synodic angle at every
	   ORI_STRIDE-th Moon node, in time order (x = -1 first) so that the
	   synodic angle unwraps. */
	for (int j = FAST_ORI_NODES - 1; j >= 0; j--) {
		int k = j * ORI_STRIDE;
		double x = lobatto(k, FAST_MOON_NODES);
		double tt2 = ft->base2 + s->mid + h * x;
		double rbpn[3][3], cx, cy, cs, sun[3], ang[3], syn;

		if (j == FAST_ORI_NODES - 1 && prev.valid) {
			for (int q = 0; q < NQ; q++)
				yq[q][j] = prev.q[q];
			continue;
		}

		{
			/* eraPnm06a with IAU 2000B nutation. */
			double t = ((ft->base1 - ERFA_DJ00) + tt2) / ERFA_DJC;
			double fj2 = -2.7774e-6 * t, dp, de, epsa;
			double rb[3][3], rp[3][3], rbp[3][3], rn[3][3];

			eraNut00b(ft->base1, tt2, &dp, &de);
			dp += dp * (0.4697e-6 + fj2);
			de += de * fj2;
			eraPn06(ft->base1, tt2, dp, de, &epsa, rb, rp, rbp,
			    rn, rbpn);
		}
		eraBpn2xy(rbpn, &cx, &cy);
		cs = eraS06(ft->base1, tt2, cx, cy);
		yq[0][j] = cx;
		yq[1][j] = cy;
		yq[2][j] = cs;
		yq[3][j] = eraEors(rbpn, cs);
		geom_lunar_angles(ft->base1, tt2, ang);
		yq[4][j] = ang[0];
		yq[5][j] = ang[1];
		yq[6][j] = ang[2];
		sun_apparent(s, x, sun);
		syn = geom_synodic_of(ft->base1, tt2, mp[k], mv[k], sun);
		if (j < FAST_ORI_NODES - 1)	/* unwrap on the later node */
			syn = yq[7][j + 1] + eraAnpm(syn - yq[7][j + 1]);
		else if (prev.valid)
			syn = prev.q[7] + eraAnpm(syn - prev.q[7]);
		yq[7][j] = syn;
	}
	for (int q = 0; q < NQ; q++)
		nc->q[q] = yq[q][0];
	nc->valid = 1;
	eraEcm06(ft->base1, ft->base2 + s->mid, s->ecm);
	for (int q = 0; q < NQ; q++) {
		fit_apply(fi->ori, FAST_ORI_NODES, yq[q], cq);
		if (q < 4)
			memcpy(s->ori[q], cq, sizeof cq);
		else if (q < 7)
			memcpy(s->lun[q - 4], cq, sizeof cq);
		else
			memcpy(s->syn, cq, sizeof cq);
	}
}

enum errcode
fast_track_init(struct fast_track *ft, const struct geom_site *site,
    const struct geom_eop *eop, double tt1, double tt2, double from,
    double to, struct fast_seg *seg, size_t cap)
{
	struct fits fi;
	struct node_cache nc;
	struct bound bd[3];
	size_t n = fast_track_segments(from, to), bk = (size_t)-1;
	enum errcode rc;

	if (n == 0 || !isfinite(tt1) || !isfinite(tt2))
		return ERRCODE_BAD_ARG;
	if (cap < n)
		return ERRCODE_TOO_LARGE;
	if (fit_inverse(FAST_MOON_NODES, 0, fi.moon) != 0 ||
	    fit_inverse(FAST_ORI_NODES, 0, fi.ori) != 0 ||
	    fit_inverse(FAST_SUN_NODES, 1, fi.sun) != 0 ||
	    fit_inverse(FAST_SUN_NODES, 0, fi.beta) != 0)
		return ERRCODE_BAD_ARG;	/* not reached: fixed nodes */
	memset(ft, 0, sizeof *ft);
	ft->site = *site;
	if (eop != NULL)
		ft->eop = *eop;
	ft->base1 = tt1;
	ft->base2 = tt2;
	ft->t0 = from;
	ft->len = FAST_SEG_DAYS;
	ft->seg = seg;
	ft->n = n;
	nc.valid = 0;
	eraPom00(ft->eop.xp, ft->eop.yp,
	    eraSp00(tt1, tt2 + from + 0.5 * (double)n * ft->len), ft->rpom);
	for (size_t k = 0; k < n; k++) {
		double a = from + (double)k * ft->len;
		struct sun_pair sp;

		rc = fit_ut1(ft, a, a + ft->len, &seg[k]);
		if (rc != ERRCODE_OK)
			return rc;
		seg[k].era = eraEra00(tt1, tt2 + a - seg[k].dut[0][0]);
		if (n < 2) {
			fit_segment(ft, &fi, a, &seg[k], &nc, NULL);
			continue;
		}
		/* Pairs of segments (the last pair overlaps the one before
		   when n is odd); each boundary's models computed once. */
		{
			size_t p0 = 2 * (k / 2) < n - 2 ? 2 * (k / 2) : n - 2;
			int keep = 0;	/* boundaries of the last pair kept */

			if (bk != (size_t)-1 && p0 > bk && p0 <= bk + 2) {
				keep = (int)(bk + 3 - p0);
				memmove(bd, bd + (p0 - bk), (size_t)keep *
				    sizeof bd[0]);
			}
			if (p0 != bk)
				for (int i = keep; i < 3; i++)
					boundary(ft, from + (double)(p0 +
					    (size_t)i) * ft->len, &bd[i]);
			bk = p0;
			sp.b = bd;
			sp.um = k == p0 ? -0.5 : 0.5;
		}
		fit_segment(ft, &fi, a, &seg[k], &nc, &sp);
	}
	return ERRCODE_OK;
}

/* Segment holding t (clamped into the track) and x in it. */
static const struct fast_seg *
locate(const struct fast_track *ft, double *t, double *x)
{
	double end = ft->t0 + (double)ft->n * ft->len;
	size_t k;

	if (!(*t > ft->t0))
		*t = ft->t0;
	if (*t > end)
		*t = end;
	k = (size_t)((*t - ft->t0) / ft->len);
	if (k >= ft->n)
		k = ft->n - 1;
	*x = (*t - ft->seg[k].mid) * 2.0 / ft->len;
	return &ft->seg[k];
}

/* TT-UT1 (days) at t inside segment s. */
static double
seg_ut1(const struct fast_track *ft, const struct fast_seg *s, double t)
{
	if (t < s->step)
		return s->dut[0][0] + s->dut[0][1] * (t - (s->mid - 0.5 *
		    ft->len));
	return s->dut[1][0] + s->dut[1][1] * (t - s->step);
}

/*
 * GCRS->CIRS from X, Y, s in closed form (IERS Conventions 2010, eq.
 * 5.10, with a = 1 / (1 + Z)), the same matrix as eraC2ixys.
 */
static void
c2i_xys(double x, double y, double s, double r[3][3])
{
	double z = sqrt(1.0 - x * x - y * y), a = 1.0 / (1.0 + z);
	/* |s| < 1e-6 rad over 1900-2100: cos and sin to 1e-19 by series. */
	double q[3][3], cs = 1.0 - 0.5 * s * s, ss = -s * (1.0 - s * s / 6.0);

	q[0][0] = 1.0 - a * x * x;
	q[0][1] = -a * x * y;
	q[0][2] = -x;
	q[1][0] = -a * x * y;
	q[1][1] = 1.0 - a * y * y;
	q[1][2] = -y;
	q[2][0] = x;
	q[2][1] = y;
	q[2][2] = 1.0 - a * (x * x + y * y);
	/* r = R3(-s) q */
	for (int j = 0; j < 3; j++) {
		r[0][j] = cs * q[0][j] + ss * q[1][j];
		r[1][j] = -ss * q[0][j] + cs * q[1][j];
		r[2][j] = q[2][j];
	}
}

/* Earth rotation angle at t in segment s, from the track's UT1. */
static double
seg_era(const struct fast_track *ft, const struct fast_seg *s, double t)
{
	/* ERA at the segment's start plus the rotation since (IERS 2010
	   eq. 5.15: 1.00273781191135448 turns a UT1 day). */
	return s->era + ERFA_D2PI * 1.00273781191135448 *
	    ((t - (s->mid - 0.5 * ft->len)) - (seg_ut1(ft, s, t) -
	    s->dut[0][0]));
}

/* GCRS->CIRS and GCRS->ITRS at x in segment s for a given Earth rotation
   angle and polar-motion matrix. */
static void
orient(const struct fast_seg *s, double x, double era,
    const double (*rpom)[3], double rc2i[3][3], double rc2t[3][3])
{
	double ce, se, m[3][3];

	c2i_xys(cheb(s->ori[0], FAST_ORI_NODES, x),
	    cheb(s->ori[1], FAST_ORI_NODES, x),
	    cheb(s->ori[2], FAST_ORI_NODES, x), rc2i);
	ce = cos(era);
	se = sin(era);
	for (int j = 0; j < 3; j++) {	/* m = R3(era) rc2i */
		m[0][j] = ce * rc2i[0][j] + se * rc2i[1][j];
		m[1][j] = -se * rc2i[0][j] + ce * rc2i[1][j];
		m[2][j] = rc2i[2][j];
	}
	for (int i = 0; i < 3; i++)	/* rc2t = rpom m */
		for (int j = 0; j < 3; j++)
			rc2t[i][j] = rpom[i][0] * m[0][j] + rpom[i][1] * m[1][j] +
			    rpom[i][2] * m[2][j];
}

static void
mxv(const double (*r)[3], const double a[3], double out[3])
{
	for (int i = 0; i < 3; i++)
		out[i] = r[i][0] * a[0] + r[i][1] * a[1] + r[i][2] * a[2];
}

static double
vnorm(const double a[3])
{
	return sqrt(a[0] * a[0] + a[1] * a[1] + a[2] * a[2]);
}

/* The frame at x of segment s, for an Earth rotation angle and a
   polar-motion matrix. */
static void
frame(const struct fast_track *ft, const struct fast_seg *s, double t,
    double x, double era, const double (*rpom)[3], unsigned need,
    struct fast_frame *f)
{
	double rc2i[3][3], d[3], mi[3];
	const double dxdt = 2.0 / (ft->len * ERFA_DAYSEC);	/* per s */

	f->t = t;
	f->have = need & (FAST_SUN | FAST_LUNAR);
	orient(s, x, era, rpom, rc2i, f->rc2t);
	for (int i = 0; i < 3; i++) {
		f->moon_p[i] = cheb(s->moon[i], FAST_MOON_NC, x);
		f->moon_v[i] = cheb(s->dmoon[i], FAST_VEL_NC, x) * dxdt;
		f->site_gcrs[i] = f->rc2t[0][i] * ft->site.itrs[0] +
		    f->rc2t[1][i] * ft->site.itrs[1] +
		    f->rc2t[2][i] * ft->site.itrs[2];
		d[i] = f->moon_p[i] - f->site_gcrs[i];
	}
	f->tau = vnorm(d) / GEOM_C;
	for (int i = 0; i < 3; i++)
		f->moon_ret[i] = f->moon_p[i] - f->tau * f->moon_v[i];
	mxv((const double (*)[3])f->rc2t, f->moon_ret, mi);
	for (int i = 0; i < 3; i++)
		f->moon_itrs[i] = mi[i] - ft->site.itrs[i];
	if (need & FAST_SUN) {
		double si[3];

		sun_apparent(s, x, f->sun_p);
		mxv((const double (*)[3])f->rc2t, f->sun_p, si);
		for (int i = 0; i < 3; i++)
			f->sun_itrs[i] = si[i] - ft->site.itrs[i];
	}
	if (need & FAST_LUNAR) {
		double ang[3], xr = x - f->tau * dxdt;

		for (int i = 0; i < 3; i++)
			ang[i] = cheb(s->lun[i], FAST_ORI_NODES, xr);
		geom_lunar_matrix(ang, f->lunar_rot);
	}
}

void
fast_frame_at(const struct fast_track *ft, double t, unsigned need,
    struct fast_frame *f)
{
	double x;
	const struct fast_seg *s = locate(ft, &t, &x);

	frame(ft, s, t, x, seg_era(ft, s, t), (const double (*)[3])ft->rpom,
	    need, f);
}

void
fast_frame_earth(const struct fast_track *ft, double t, double ut11,
    double ut12, const struct geom_eop *eop, unsigned need,
    struct fast_frame *f)
{
	double x, rpom[3][3];
	const struct fast_seg *s = locate(ft, &t, &x);

	eraPom00(eop->xp, eop->yp, eraSp00(ft->base1, ft->base2 + t), rpom);
	frame(ft, s, t, x, eraEra00(ut11, ut12), (const double (*)[3])rpom,
	    need, f);
}

double
fast_elevation(const struct fast_track *ft, const double v[3])
{
	const double (*enu)[3] = ft->site.enu;
	double e = enu[0][0] * v[0] + enu[0][1] * v[1] + enu[0][2] * v[2];
	double n = enu[1][0] * v[0] + enu[1][1] * v[1] + enu[1][2] * v[2];
	double u = enu[2][0] * v[0] + enu[2][1] * v[1] + enu[2][2] * v[2];

	return atan2(u, sqrt(e * e + n * n));
}

double
fast_separation(const struct fast_frame *f)
{
	return geom_sep(f->moon_itrs, f->sun_itrs);
}

double
fast_target_topo(const struct fast_frame *f, const struct geom_target *t,
    double topo[3], double radial[3])
{
	double ri[3];

	for (int i = 0; i < 3; i++)	/* radial = lunar_rot^T body */
		radial[i] = f->lunar_rot[0][i] * t->body[0] +
		    f->lunar_rot[1][i] * t->body[1] +
		    f->lunar_rot[2][i] * t->body[2];
	mxv((const double (*)[3])f->rc2t, radial, ri);
	for (int i = 0; i < 3; i++)
		topo[i] = f->moon_itrs[i] + ri[i];
	return vnorm(topo);
}

double
fast_target_el(const struct fast_track *ft, const struct fast_frame *f,
    const struct geom_target *t, double *sun_el, double *dark)
{
	double radial[3], topo[3], se = 0.0;

	(void)fast_target_topo(f, t, topo, radial);
	if (sun_el != NULL || dark != NULL) {
		double u[3], pos[3], r = vnorm(radial), d, c;

		for (int i = 0; i < 3; i++) {
			pos[i] = f->moon_ret[i] + radial[i];
			u[i] = f->sun_p[i] - pos[i];
		}
		d = vnorm(u);
		c = (radial[0] * u[0] + radial[1] * u[1] + radial[2] * u[2]) /
		    (r * d);
		se = asin(fmax(-1.0, fmin(1.0, c)));
		if (sun_el != NULL)
			*sun_el = se;
		if (dark != NULL) {
			struct eclipse_point ep;

			eclipse_point_at(f->sun_p, pos, &ep);
			*dark = fmax(-se, ep.umbra_margin);
		}
	}
	return fast_elevation(ft, topo);
}

/* The geocentric Moon (light time from the geocentre) and apparent Sun
   at x in s, from the fitted series (dxdt: dx per second). */
static void
seg_bodies(const struct fast_seg *s, double x, double dxdt, double sun[3],
    double moon[3])
{
	double v[3], tau;

	for (int i = 0; i < 3; i++) {
		moon[i] = cheb(s->moon[i], FAST_MOON_NC, x);
		v[i] = cheb(s->dmoon[i], FAST_VEL_NC, x) * dxdt;
	}
	tau = vnorm(moon) / GEOM_C;
	for (int i = 0; i < 3; i++)
		moon[i] -= tau * v[i];
	sun_apparent(s, x, sun);
}

void
fast_bodies_seen(const struct fast_track *ft, double t, double sun[3],
    double moon[3])
{
	double x;
	const struct fast_seg *s = locate(ft, &t, &x);

	seg_bodies(s, x, 2.0 / (ft->len * ERFA_DAYSEC), sun, moon);
}

/* Synodic angle (unwrapped) at x in s, from the fitted bodies. */
static double
seg_synodic(const struct fast_seg *s, double x, double dxdt)
{
	double m[3], sun[3], em[3], es[3], lm, ls, coarse;

	seg_bodies(s, x, dxdt, sun, m);
	mxv((const double (*)[3])s->ecm, m, em);
	mxv((const double (*)[3])s->ecm, sun, es);
	lm = atan2(em[1], em[0]);
	ls = atan2(es[1], es[0]);
	coarse = cheb(s->syn, FAST_ORI_NODES, x);
	return coarse + eraAnpm(lm - ls - coarse);
}

double
fast_synodic(const struct fast_track *ft, double t)
{
	double x;
	const struct fast_seg *s = locate(ft, &t, &x);

	return seg_synodic(s, x, 2.0 / (ft->len * ERFA_DAYSEC));
}

void
fast_instant(const struct fast_track *ft, double t, struct geom_instant *out)
{
	struct fast_frame f;
	struct geom_bodies b;
	struct geom_earth e;
	struct tscale_instant ti;
	double x, rc2i[3][3], dut;
	const struct fast_seg *s = locate(ft, &t, &x);

	fast_frame_at(ft, t, FAST_SUN, &f);
	memcpy(b.moon_p, f.moon_p, sizeof b.moon_p);
	memcpy(b.moon_v, f.moon_v, sizeof b.moon_v);
	memcpy(b.sun_p, f.sun_p, sizeof b.sun_p);
	b.tt1 = ft->base1;
	b.tt2 = ft->base2 + t;
	b.synodic = eraAnp(seg_synodic(s, x, 2.0 / (ft->len * ERFA_DAYSEC)));
	b.mean_elong = eraAnp(eraFad03(((ft->base1 - ERFA_DJ00) + b.tt2) /
	    ERFA_DJC));
	orient(s, x, seg_era(ft, s, t), (const double (*)[3])ft->rpom, rc2i,
	    e.rc2t);
	memcpy(e.rbpn, rc2i, sizeof e.rbpn);	/* true of date = R3(EO) */
	eraRz(cheb(s->ori[3], FAST_ORI_NODES, x), e.rbpn);

	dut = seg_ut1(ft, s, t);
	memset(&ti, 0, sizeof ti);
	ti.tt1 = ft->base1;
	ti.tt2 = ft->base2 + t;
	ti.tai1 = ti.tt1;
	ti.tai2 = ti.tt2 - 32.184 / ERFA_DAYSEC;
	ti.ut11 = ti.tt1;
	ti.ut12 = ti.tt2 - dut;
	ti.dut1 = ft->eop.dut1;
	ti.utc1 = ti.ut11;
	ti.utc2 = ti.ut12 - ft->eop.dut1 / ERFA_DAYSEC;
	geom_instant_make(&ft->site, &ti, &b, &e, out);
}

void
fast_track_range(const struct fast_track *ft, double *lo, double *hi)
{
	*lo = ft->t0;
	*hi = ft->t0 + (double)ft->n * ft->len;
}

double
fast_synodic_less(void *ctx, double t)
{
	const struct fast_synodic_goal *g = ctx;

	return fast_synodic(g->ft, t) - g->ang;
}
