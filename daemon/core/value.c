/* SPDX-License-Identifier: BSD-3-Clause */
/* value.c: D-optimal information gains on the phase signals and on the
   Moon's orientation, and the value of a run (pure core). */
#include <math.h>
#include <string.h>

#include "core/text.h"
#include "core/value.h"

void
value_settings_default(struct value_settings *s)
{
	s->model = VALUE_MODEL_DESIGN;
	s->harmonics = 2;
	s->phase_ridge = 1.0;
	s->orient_ridge = 0.3;
	s->phase_weight = 1.0;
	s->orientation_weight = 1.0;
}

enum errcode
value_settings_check(const struct value_settings *s, const char **field)
{
	const char *f = NULL;

	if (s->model != VALUE_MODEL_DESIGN && s->model != VALUE_MODEL_BINS)
		f = "value_model";
	else if (s->harmonics < 1 || s->harmonics > VALUE_K_MAX)
		f = "value_harmonics";
	else if (!(s->phase_ridge > 0) || !isfinite(s->phase_ridge))
		f = "value_phase_ridge";
	else if (!(s->orient_ridge > 0) || !isfinite(s->orient_ridge))
		f = "value_orientation_ridge";
	else if (!(s->phase_weight >= 0) || !isfinite(s->phase_weight))
		f = "value_phase_weight";
	else if (!(s->orientation_weight >= 0) ||
	    !isfinite(s->orientation_weight))
		f = "value_orientation_weight";
	if (field != NULL)
		*field = f;
	return f == NULL ? ERRCODE_OK : ERRCODE_BAD_ARG;
}

static const char *const model_names[] = {
	[VALUE_MODEL_DESIGN] = "design", [VALUE_MODEL_BINS] = "bins"
};
#define NMODELS ((int)(sizeof model_names / sizeof model_names[0]))

const char *
value_model_name(enum value_model m)
{
	return model_names[m == VALUE_MODEL_BINS ? VALUE_MODEL_BINS :
	    VALUE_MODEL_DESIGN];
}

int
value_model_parse(const char *s)
{
	return text_name_index(s, model_names, NMODELS);
}

/* --- small dense algebra --- */

/* x^T A x for a symmetric dim x dim A. */
static double
quad(const double *a, const double *x, int dim)
{
	double s = 0.0;

	for (int i = 0; i < dim; i++) {
		double r = 0.0;

		for (int j = 0; j < dim; j++)
			r += a[i * dim + j] * x[j];
		s += x[i] * r;
	}
	return s > 0.0 ? s : 0.0;
}

/* A^-1 <- A^-1 - c (A^-1 x)(A^-1 x)^T / (1 + c x^T A^-1 x): the inverse of
   A + c x x^T (Sherman-Morrison). */
static void
sherman_morrison(double *ainv, const double *x, double c, int dim)
{
	double y[VALUE_PDIM_MAX], q = 0.0;

	if (!(c > 0))
		return;
	for (int i = 0; i < dim; i++) {
		y[i] = 0.0;
		for (int j = 0; j < dim; j++)
			y[i] += ainv[i * dim + j] * x[j];
		q += x[i] * y[i];
	}
	q = c / (1.0 + c * q);
	for (int i = 0; i < dim; i++)
		for (int j = 0; j < dim; j++)
			ainv[i * dim + j] -= q * y[i] * y[j];
}

/* Inverse of a symmetric positive definite a (dim x dim) by Cholesky;
   ERRCODE_BAD_ARG when it is not positive definite. */
static enum errcode
spd_inverse(const double *a, double *inv, int dim)
{
	double l[VALUE_PDIM_MAX * VALUE_PDIM_MAX];
	double li[VALUE_PDIM_MAX * VALUE_PDIM_MAX];

	memset(l, 0, sizeof l);
	memset(li, 0, sizeof li);
	for (int j = 0; j < dim; j++) {
		double d = a[j * dim + j];

		for (int k = 0; k < j; k++)
			d -= l[j * dim + k] * l[j * dim + k];
		if (!(d > 0))
			return ERRCODE_BAD_ARG;
		l[j * dim + j] = sqrt(d);
		for (int i = j + 1; i < dim; i++) {
			double s = a[i * dim + j];

			for (int k = 0; k < j; k++)
				s -= l[i * dim + k] * l[j * dim + k];
			l[i * dim + j] = s / l[j * dim + j];
		}
	}
	/* L^-1 by forward substitution, then A^-1 = L^-T L^-1. */
	for (int c = 0; c < dim; c++)
		for (int i = c; i < dim; i++) {
			double s = i == c ? 1.0 : 0.0;

			for (int k = c; k < i; k++)
				s -= l[i * dim + k] * li[k * dim + c];
			li[i * dim + c] = s / l[i * dim + i];
		}
	for (int i = 0; i < dim; i++)
		for (int j = 0; j < dim; j++) {
			double s = 0.0;

			for (int k = i > j ? i : j; k < dim; k++)
				s += li[k * dim + i] * li[k * dim + j];
			inv[i * dim + j] = s;
		}
	return ERRCODE_OK;
}

/* --- phase --- */

void
value_phase_features(double d_rad, int k, double *f)
{
	f[0] = 1.0;
	for (int m = 1; m <= k; m++) {
		f[2 * m - 1] = cos(m * d_rad);
		f[2 * m] = sin(m * d_rad);
	}
}

void
value_moments_add(struct value_moments *m, double d_rad, double w)
{
	if (!isfinite(d_rad) || !(w > 0) || !isfinite(w))
		return;
	m->w += w;
	for (int n = 1; n <= VALUE_MOMENTS; n++) {
		m->c[n - 1] += w * cos(n * d_rad);
		m->s[n - 1] += w * sin(n * d_rad);
	}
}

void
value_moments_sum(const struct value_moments *a, const struct value_moments *b,
    struct value_moments *out)
{
	out->w = a->w + b->w;
	for (int n = 0; n < VALUE_MOMENTS; n++) {
		out->c[n] = a->c[n] + b->c[n];
		out->s[n] = a->s[n] + b->s[n];
	}
}

/* sum w cos nD and sum w sin nD for any integer n (|n| <= 2K). */
static double
mom_c(const struct value_moments *m, int n)
{
	n = n < 0 ? -n : n;
	return n == 0 ? m->w : m->c[n - 1];
}

static double
mom_s(const struct value_moments *m, int n)
{
	if (n == 0)
		return 0.0;
	return n < 0 ? -m->s[-n - 1] : m->s[n - 1];
}

/* sum w f_r f_c, f_0 = 1, f_(2a-1) = cos aD, f_(2a) = sin aD. */
static double
mom_entry(const struct value_moments *m, int r, int c)
{
	int a = (r + 1) / 2, b = (c + 1) / 2;
	int ca = r == 0 || r % 2 == 1, cb = c == 0 || c % 2 == 1;

	if (r == 0 && c == 0)
		return m->w;
	if (r == 0)
		return cb ? mom_c(m, b) : mom_s(m, b);
	if (c == 0)
		return ca ? mom_c(m, a) : mom_s(m, a);
	if (ca && cb)		/* cos a cos b */
		return 0.5 * (mom_c(m, a - b) + mom_c(m, a + b));
	if (!ca && !cb)		/* sin a sin b */
		return 0.5 * (mom_c(m, a - b) - mom_c(m, a + b));
	if (ca)			/* cos a sin b */
		return 0.5 * (mom_s(m, a + b) - mom_s(m, a - b));
	return 0.5 * (mom_s(m, a + b) + mom_s(m, a - b));	/* sin a cos b */
}

enum errcode
value_phase_from_moments(struct value_phase *p, int k, double ridge,
    const struct value_moments *mo)
{
	double m[VALUE_PDIM_MAX * VALUE_PDIM_MAX];
	int dim = 2 * k + 1;

	if (k < 1 || k > VALUE_K_MAX || !(ridge > 0) || !isfinite(ridge))
		return ERRCODE_BAD_ARG;
	memset(p, 0, sizeof *p);
	p->k = k;
	p->dim = dim;
	for (int r = 0; r < dim; r++)
		for (int c = 0; c < dim; c++)
			m[r * dim + c] = mom_entry(mo, r, c) +
			    (r == c ? ridge : 0.0);
	return spd_inverse(m, p->minv, dim);
}

enum errcode
value_phase_build(struct value_phase *p, int k, double ridge,
    const double *d_rad, const double *w, size_t n)
{
	struct value_moments m;

	memset(&m, 0, sizeof m);
	for (size_t i = 0; i < n; i++)
		value_moments_add(&m, d_rad[i], w != NULL ? w[i] : 1.0);
	return value_phase_from_moments(p, k, ridge, &m);
}

double
value_phase_leverage(const struct value_phase *p, double d_rad)
{
	double f[VALUE_PDIM_MAX];

	value_phase_features(d_rad, p->k, f);
	return quad(p->minv, f, p->dim);
}

double
value_phase_gain(const struct value_phase *p, double d_rad, double n,
    double w)
{
	if (!(n * w > 0))
		return 0.0;
	return 0.5 * log1p(n * w * value_phase_leverage(p, d_rad));
}

void
value_phase_add(struct value_phase *p, double d_rad, double n, double w)
{
	double f[VALUE_PDIM_MAX];

	value_phase_features(d_rad, p->k, f);
	sherman_morrison(p->minv, f, n * w, p->dim);
}

/* --- orientation --- */

void
value_orient_vector(const double rho[3], const double u[3],
    double h[VALUE_ODIM])
{
	double r = sqrt(rho[0] * rho[0] + rho[1] * rho[1] + rho[2] * rho[2]);

	h[0] = 1.0;
	if (!(r > 0)) {
		h[1] = h[2] = h[3] = 0.0;
		return;
	}
	h[1] = (rho[1] * u[2] - rho[2] * u[1]) / r;
	h[2] = (rho[2] * u[0] - rho[0] * u[2]) / r;
	h[3] = (rho[0] * u[1] - rho[1] * u[0]) / r;
}

void
value_orient_init(struct value_orient *o, double ridge)
{
	memset(o, 0, sizeof *o);
	for (int i = 0; i < VALUE_ODIM; i++)
		o->ninv[i * VALUE_ODIM + i] = 1.0 / ridge;
}

double
value_orient_leverage(const struct value_orient *o,
    const double h[VALUE_ODIM])
{
	return quad(o->ninv, h, VALUE_ODIM);
}

double
value_orient_gain(const struct value_orient *o, const double h[VALUE_ODIM],
    double n)
{
	if (!(n > 0))
		return 0.0;
	return 0.5 * log1p(n * value_orient_leverage(o, h));
}

void
value_orient_add(struct value_orient *o, const double h[VALUE_ODIM],
    double n)
{
	sherman_morrison(o->ninv, h, n, VALUE_ODIM);
}

/* --- a run --- */

double
value_combine(const struct value_settings *s, double n, double phase,
    double orient)
{
	if (s->phase_weight == 0.0 && s->orientation_weight == 0.0)
		return n;
	return s->phase_weight * phase + s->orientation_weight * orient;
}

double
value_np_per_return(double sum_np, double sum_returns)
{
	if (!(sum_np >= 0) || !(sum_returns >= 0))
		return VALUE_NPR_PRIOR;
	return (VALUE_NPR_PRIOR * VALUE_NPR_PRIOR_RETURNS + sum_np) /
	    (VALUE_NPR_PRIOR_RETURNS + sum_returns);
}

double
value_expected_nps(double npr, double returns, double length_s)
{
	double a = npr * returns, b = length_s / VALUE_NP_SPAN_S;

	if (!(a > 0) || !(b > 0))
		return 0.0;
	return a < b ? a : b;
}
