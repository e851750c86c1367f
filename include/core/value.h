/* SPDX-License-Identifier: BSD-3-Clause */
/* value.h: the science value of normal points, as information gained on
   the phase signals and on the Moon's orientation within a night (pure
   core). */
#ifndef MOONRANGE_VALUE_H
#define MOONRANGE_VALUE_H

#include <stddef.h>

#include "core/errcode.h"

/*
 * Two kinds of information, both measured by the D-optimal criterion,
 * the log-determinant of an information matrix (Kiefer & Wolfowitz 1960;
 * Atkinson, Donev & Tobias 2007, ch. 9 and 10):
 *
 * Phase.  The signals are periodic in the synodic angle D, modelled as a
 * harmonic series of order K with features
 *
 *   f(D) = (1, cos D, sin D, ..., cos KD, sin KD)          (2K + 1 terms)
 *
 * The normal points held give M = lambda I + sum_i w_i f(D_i) f(D_i)^T;
 * n more points of weight w at D gain
 *
 *   g_phase = 1/2 ln(1 + n w f(D)^T M^-1 f(D))
 *
 * which is 1/2 ln det(M + n w f f^T) - 1/2 ln det M (the matrix
 * determinant lemma): gains of successive runs add up to the gain of the
 * whole plan, whatever their order.
 *
 * Orientation.  A small rotation dtheta of the Moon moves the range to a
 * target at selenocentric rho by (rho x u) . dtheta, u the unit line of
 * sight from the station.  With a common range offset as a fourth
 * unknown, a normal point on target j carries h_j = (1, (rho_j x u) /
 * |rho_j|); the night's matrix is N = mu I + sum n h h^T and n more points
 * gain
 *
 *   g_orient = 1/2 ln(1 + n h^T N^-1 h).
 *
 * The value of a run of n expected normal points is
 *
 *   v = w_phase g_phase + w_orient g_orient,  or n when both weights are 0.
 *
 * Under value_model "bins" the phase term is n W(b) instead, W the
 * coverage weight of the bin of D (score.h), from the counts held.
 */

#define VALUE_K_MAX 4			/* harmonic order, 1..VALUE_K_MAX */
#define VALUE_PDIM_MAX (2 * VALUE_K_MAX + 1)
#define VALUE_ODIM 4			/* offset + three rotation angles */

enum value_model {
	VALUE_MODEL_DESIGN = 0,		/* D-optimal phase gain */
	VALUE_MODEL_BINS		/* n W(b), the coverage weight */
};

struct value_settings {
	enum value_model model;		/* design */
	int harmonics;			/* K, 1..VALUE_K_MAX (2) */
	double phase_ridge;		/* lambda > 0 (1) */
	double orient_ridge;		/* mu > 0 (0.3) */
	double phase_weight;		/* w_phase >= 0 (1) */
	double orientation_weight;	/* w_orient >= 0 (1) */
};

/* The defaults above. */
void value_settings_default(struct value_settings *s);

/* ERRCODE_BAD_ARG when a field is out of range; *field (may be NULL)
   names it by its setting key. */
enum errcode value_settings_check(const struct value_settings *s,
    const char **field);

/* "design" / "bins", and the parser (-1 when unknown). */
const char *value_model_name(enum value_model m);
int value_model_parse(const char *s);

/* --- phase information --- */

/* f(D) for order K into f[2K + 1]; D in radians. */
void value_phase_features(double d_rad, int k, double *f);

/*
 * The inverse of a phase information matrix.  dim = 2K + 1; minv is
 * dim x dim, row-major.
 */
struct value_phase {
	int k, dim;
	double minv[VALUE_PDIM_MAX * VALUE_PDIM_MAX];
};

/*
 * M = ridge I + sum_i w_i f(D_i) f(D_i)^T, inverted.
 *
 * Given:
 *   k        harmonic order, 1..VALUE_K_MAX
 *   ridge    lambda > 0
 *   d_rad    n synodic angles, rad (NaN entries are skipped)
 *   w        n weights >= 0, or NULL for 1 each
 * Returned:
 *   p        the inverse
 * Returned (function value):
 *   ERRCODE_OK; ERRCODE_BAD_ARG for k or ridge out of range
 * Notes:
 *   M is summed through the moments (value_phase_from_moments), then
 *   inverted by Cholesky factorisation (Golub & Van
 *   Loan, Matrix Computations, 4th ed., 2013, 4.2); with lambda > 0 it is
 *   positive definite.
 * Called:
 *   value_moments_add, value_phase_from_moments
 */
enum errcode value_phase_build(struct value_phase *p, int k, double ridge,
    const double *d_rad, const double *w, size_t n);

/*
 * The phase moments of weighted synodic angles, from which M is exact for
 * any order K <= VALUE_K_MAX: the products of f(D) f(D)^T are harmonics
 * of D up to 2K (cos a cos b = (cos (a-b) + cos (a+b)) / 2 and the like),
 * so M needs only sum w, sum w cos nD and sum w sin nD for n <= 2K.
 * A log keeps them as it grows (core/logstats.h).
 */
#define VALUE_MOMENTS (2 * VALUE_K_MAX)
struct value_moments {
	double w;			/* sum w */
	double c[VALUE_MOMENTS];	/* c[n - 1] = sum w cos nD */
	double s[VALUE_MOMENTS];	/* s[n - 1] = sum w sin nD */
};

/* Add a point of weight w at D (rad); NaN D or w <= 0 is left out. */
void value_moments_add(struct value_moments *m, double d_rad, double w);

/* out = a + b, term by term (out may be a or b). */
void value_moments_sum(const struct value_moments *a,
    const struct value_moments *b, struct value_moments *out);

/*
 * M = ridge I + sum w f f^T from the moments, inverted: the one rule of
 * value_phase_build.  k, ridge and the value as value_phase_build's.
 */
enum errcode value_phase_from_moments(struct value_phase *p, int k,
    double ridge, const struct value_moments *m);

/* f(D)^T M^-1 f(D) >= 0, the leverage of a point at D. */
double value_phase_leverage(const struct value_phase *p, double d_rad);

/* 1/2 ln(1 + n w f^T M^-1 f): 0 for n w <= 0. */
double value_phase_gain(const struct value_phase *p, double d_rad, double n,
    double w);

/*
 * Add n w f(D) f(D)^T to M, updating the inverse by the Sherman-Morrison
 * formula (Golub & Van Loan 2013, 2.1.4).
 */
void value_phase_add(struct value_phase *p, double d_rad, double n, double w);

/* --- orientation information --- */

/*
 * h = (1, (rho x u) / |rho|) of a target.
 *
 * Given:
 *   rho   selenocentric position of the target, lunar body-fixed, m
 *   u     unit line of sight from the station to the target, the same
 *         frame
 * Returned:
 *   h     4 components; rho = 0 (the Moon's centre) gives (1, 0, 0, 0)
 * Notes:
 *   A rotation dtheta moves the target by dtheta x rho, which changes the
 *   range by u . (dtheta x rho) = dtheta . (rho x u).
 */
void value_orient_vector(const double rho[3], const double u[3],
    double h[VALUE_ODIM]);

/* The inverse of the night's 4 x 4 matrix N. */
struct value_orient {
	double ninv[VALUE_ODIM * VALUE_ODIM];
};

/* N = ridge I (ridge > 0): an empty night. */
void value_orient_init(struct value_orient *o, double ridge);

/* h^T N^-1 h >= 0. */
double value_orient_leverage(const struct value_orient *o,
    const double h[VALUE_ODIM]);

/* 1/2 ln(1 + n h^T N^-1 h): 0 for n <= 0. */
double value_orient_gain(const struct value_orient *o,
    const double h[VALUE_ODIM], double n);

/* Add n h h^T to N (Sherman-Morrison on the inverse). */
void value_orient_add(struct value_orient *o, const double h[VALUE_ODIM],
    double n);

/* --- a run --- */

/*
 * The value of n expected normal points with the given phase term
 * (g_phase, or n W under the bins model) and orientation gain:
 * w_phase phase + w_orient orient, or n when both weights are 0.
 */
double value_combine(const struct value_settings *s, double n, double phase,
    double orient);

/*
 * Normal points per detected return, from the log: the station's sums of
 * normal points and returns over its ranged attempts, shrunk to the prior
 * VALUE_NPR_PRIOR with the weight of VALUE_NPR_PRIOR_RETURNS returns
 * (the posterior mean of a gamma-Poisson rate, as score_fit does for
 * returns per shot).
 */
#define VALUE_NPR_PRIOR 0.02		/* one normal point per 50 returns
					   (common practice: a lunar normal
					   point wants tens of returns) */
#define VALUE_NPR_PRIOR_RETURNS 500.0
double value_np_per_return(double sum_np, double sum_returns);

/* At most one normal point per VALUE_NP_SPAN_S of ranging (common
   practice: a lunar normal point is formed over minutes of data). */
#define VALUE_NP_SPAN_S 300.0

/* Expected normal points of a run: min(npr returns, length / span). */
double value_expected_nps(double npr, double returns, double length_s);

#endif
