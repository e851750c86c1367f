/* SPDX-License-Identifier: BSD-3-Clause */
/* test_value.c: the identities of the science-value model (phase and
   orientation information, the value of a run). */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "rng.h"
#include "check.h"
#include "core/value.h"

#define PI 3.14159265358979323846
#define D2R (PI / 180.0)

RNG_FILE(0x9E3779B97F4A7C15ULL)

/* ln det of a symmetric positive definite matrix by Gaussian elimination
   without pivoting (fine for SPD; Golub & Van Loan 2013, 4.2), written
   here independently of value.c's Cholesky inverse. */
static double
logdet(double *a, int dim)
{
	double s = 0.0;

	for (int k = 0; k < dim; k++) {
		s += log(a[k * dim + k]);
		for (int i = k + 1; i < dim; i++) {
			double f = a[i * dim + k] / a[k * dim + k];

			for (int j = k; j < dim; j++)
				a[i * dim + j] -= f * a[k * dim + j];
		}
	}
	return s;
}

/* M = ridge I + sum f f^T, summed here. */
static void
info_matrix(double *m, int k, double ridge, const double *d, size_t n)
{
	int dim = 2 * k + 1;
	double f[VALUE_PDIM_MAX];

	memset(m, 0, sizeof(double) * (size_t)(dim * dim));
	for (int i = 0; i < dim; i++)
		m[i * dim + i] = ridge;
	for (size_t p = 0; p < n; p++) {
		value_phase_features(d[p], k, f);
		for (int i = 0; i < dim; i++)
			for (int j = 0; j < dim; j++)
				m[i * dim + j] += f[i] * f[j];
	}
}

/* Empty M = lambda I: f^T M^-1 f = |f|^2 / lambda = (1 + K) / lambda,
   since cos^2 + sin^2 = 1 for each harmonic (derivation). */
static void
test_value_empty_leverage(void **state)
{
	struct value_phase p;

	(void)state;
	assert_int_equal(value_phase_build(&p, 2, 0.5, NULL, NULL, 0),
	    ERRCODE_OK);
	/* want (1 + 2) / 0.5 = 6 (derivation above) */
	check_near(value_phase_leverage(&p, 1.234), 6.0, 1e-12, "",
	    "leverage, empty M");
	/* want 1/2 ln(1 + 2 * 6) = 1/2 ln 13 (the gain's definition) */
	check_near(value_phase_gain(&p, 0.3, 2.0, 1.0), 0.5 * log(13.0),
	    1e-12, "nat", "gain of 2 points, empty M");
}

/* N equally spaced angles, N > 2K: sum f f^T = diag(N, N/2, ..., N/2)
   (discrete orthogonality of the trigonometric functions), so
   f^T M^-1 f = 1/(lambda + N) + K/(lambda + N/2) at every D. */
static void
test_value_uniform_design(void **state)
{
	double d[24];
	struct value_phase p;
	const int k = 3;
	const double lambda = 0.1;

	(void)state;
	for (int i = 0; i < 24; i++)
		d[i] = 2.0 * PI * i / 24.0 + 0.1;
	assert_int_equal(value_phase_build(&p, k, lambda, d, NULL, 24),
	    ERRCODE_OK);
	for (double x = 0.0; x < 2 * PI; x += 0.37)
		/* want: the closed form above */
		check_near(value_phase_leverage(&p, x), 1.0 / (lambda + 24.0) +
		    k / (lambda + 12.0), 1e-12, "", "leverage, uniform design");
}

/* The gain is the change of 1/2 ln det M (matrix determinant lemma,
   Harville, Matrix Algebra from a Statistician's Perspective, 1997,
   18.1), and the Sherman-Morrison update equals a rebuild. */
static void
test_value_gain_is_logdet_change(void **state)
{
	double d[40], m0[81], m1[81];
	struct value_phase p, q;

	(void)state;
	for (int trial = 0; trial < 50; trial++) {
		int k = 1 + trial % VALUE_K_MAX, dim = 2 * k + 1;
		size_t n = (size_t)(urand() * 30);
		double x = urand() * 2 * PI, g, want;

		for (size_t i = 0; i < n; i++)
			d[i] = urand() * 2 * PI;
		assert_int_equal(value_phase_build(&p, k, 0.3, d, NULL, n),
		    ERRCODE_OK);
		info_matrix(m0, k, 0.3, d, n);
		d[n] = x;
		info_matrix(m1, k, 0.3, d, n + 1);
		g = value_phase_gain(&p, x, 1.0, 1.0);
		want = 0.5 * (logdet(m1, dim) - logdet(m0, dim));
		/* want: 1/2 ln det(M + f f^T) - 1/2 ln det M (the lemma) */
		check_near(g, want, 1e-9, "nat", "gain vs log-det change");
		/* gain >= 0: M^-1 is positive definite (derivation) */
		assert_true(g >= 0.0);
		value_phase_add(&p, x, 1.0, 1.0);
		assert_int_equal(value_phase_build(&q, k, 0.3, d, NULL, n + 1),
		    ERRCODE_OK);
		for (int i = 0; i < dim * dim; i++)
			/* want: the rebuilt inverse (Sherman-Morrison is
			   exact, Golub & Van Loan 2013, 2.1.4) */
			check_near(p.minv[i], q.minv[i], 1e-9, "",
			    "updated inverse vs rebuilt");
	}
}

/* Adding points at a phase lowers the gain of the next point there: the
   leverage f^T (M + c f f^T)^-1 f = l / (1 + c l) < l (Sherman-Morrison,
   derivation). */
static void
test_value_gain_falls_as_phase_fills(void **state)
{
	struct value_phase p;
	double d0 = 100.0 * D2R, prev;

	(void)state;
	assert_int_equal(value_phase_build(&p, 2, 1.0, NULL, NULL, 0),
	    ERRCODE_OK);
	prev = value_phase_gain(&p, d0, 1.0, 1.0);
	for (int i = 0; i < 20; i++) {
		double g;

		value_phase_add(&p, d0 + 0.01 * i, 1.0, 1.0);
		g = value_phase_gain(&p, d0, 1.0, 1.0);
		assert_true(g < prev);
		assert_true(g >= 0.0);
		prev = g;
	}
}

/* K = 1, points only near the quarters (90 and 270 deg): sin D is pinned
   down, cos D is not, so the gain peaks where |cos D| = 1, at D = 0 and
   180 deg (f^T M^-1 f with M nearly diag(n+l, l, n+l) is largest there:
   derivation). */
static void
test_value_quarters_known_new_full_gain_most(void **state)
{
	double d[40];
	struct value_phase p;
	double best = -1.0, best_d = -1.0;

	(void)state;
	for (int i = 0; i < 40; i++)
		d[i] = (i % 2 ? 270.0 : 90.0) * D2R + (urand() - 0.5) * 10 * D2R;
	assert_int_equal(value_phase_build(&p, 1, 0.1, d, NULL, 40),
	    ERRCODE_OK);
	for (int deg = 0; deg < 360; deg++) {
		double g = value_phase_gain(&p, deg * D2R, 1.0, 1.0);

		if (g > best) {
			best = g;
			best_d = deg;
		}
	}
	/* want 0 or 180 deg (derivation above); a few degrees of slack for
	   the scatter of the points */
	assert_true(fabs(check_wrap180(best_d - 0.0)) <= 6.0 ||
	    fabs(check_wrap180(best_d - 180.0)) <= 6.0);
	assert_true(value_phase_gain(&p, 0.0, 1.0, 1.0) >
	    5.0 * value_phase_gain(&p, 90.0 * D2R, 1.0, 1.0));
	assert_true(value_phase_gain(&p, PI, 1.0, 1.0) >
	    5.0 * value_phase_gain(&p, 270.0 * D2R, 1.0, 1.0));
	/* The default order K = 2 too: at the quarters cos 2D = -1 and
	   sin 2D = 0, so the points there leave cos D unknown; a night at
	   new or full moon (D = 0, 180) outranks one at a quarter
	   (derivation as above). */
	assert_int_equal(value_phase_build(&p, 2, 1.0, d, NULL, 40),
	    ERRCODE_OK);
	assert_true(value_phase_gain(&p, 0.0, 2.0, 1.0) >
	    value_phase_gain(&p, 90.0 * D2R, 2.0, 1.0));
	assert_true(value_phase_gain(&p, PI, 2.0, 1.0) >
	    value_phase_gain(&p, 270.0 * D2R, 2.0, 1.0));
}

/* A target at the sub-Earth point: rho antiparallel to the line of
   sight, rho x u = 0 (derivation). */
static void
test_value_sub_earth_no_rotation_leverage(void **state)
{
	double u[3] = {-0.6, 0.8, 0.0}, rho[3], h[4];
	struct value_orient o;

	(void)state;
	for (int i = 0; i < 3; i++)
		rho[i] = -1737400.0 * u[i];
	value_orient_vector(rho, u, h);
	check_near(h[0], 1.0, 0.0, "", "offset column");
	for (int i = 1; i < 4; i++)
		/* want 0: rho x u = 0 for parallel vectors */
		check_near(h[i], 0.0, 1e-12, "", "rotation leverage");
	/* n points on it only inform the offset: with N = mu I the leverage
	   is 1/mu (derivation) */
	value_orient_init(&o, 2.0);
	check_near(value_orient_leverage(&o, h), 0.5, 1e-15, "",
	    "leverage 1/mu");
	/* |rho x u| / |rho| = sin of the angle between them (derivation):
	   a limb target at 90 deg from the line of sight has 1 */
	rho[0] = 0.0;
	rho[1] = 0.0;
	rho[2] = 1737400.0;
	value_orient_vector(rho, u, h);
	check_near(h[1] * h[1] + h[2] * h[2] + h[3] * h[3], 1.0, 1e-12, "",
	    "limb target leverage");
}

/* Selenocentric unit position from latitude and longitude. */
static void
selen(double lat_deg, double lon_deg, double r[3])
{
	r[0] = 1737400.0 * cos(lat_deg * D2R) * cos(lon_deg * D2R);
	r[1] = 1737400.0 * cos(lat_deg * D2R) * sin(lon_deg * D2R);
	r[2] = 1737400.0 * sin(lat_deg * D2R);
}

/* After points on one reflector, a second one far across the face gains
   more than one close by, and more than a third point on the first: its
   h has a larger part outside the span of the first (derivation: the
   leverage is h^T N^-1 h with N^-1 smallest along the first h). */
static void
test_value_far_pair_beats_close_pair(void **state)
{
	double u[3] = {-1.0, 0.0, 0.0};	/* line of sight: Earth at +x */
	double ra[3], rnear[3], rfar[3], ha[4], hn[4], hf[4];
	struct value_orient o;
	double g_near, g_far, g_same;

	(void)state;
	selen(20.0, -25.0, ra);
	selen(24.0, -20.0, rnear);
	selen(-5.0, 40.0, rfar);
	value_orient_vector(ra, u, ha);
	value_orient_vector(rnear, u, hn);
	value_orient_vector(rfar, u, hf);
	value_orient_init(&o, 1.0);
	value_orient_add(&o, ha, 3.0);
	g_near = value_orient_gain(&o, hn, 3.0);
	g_far = value_orient_gain(&o, hf, 3.0);
	g_same = value_orient_gain(&o, ha, 3.0);
	assert_true(g_far > g_near);
	assert_true(g_far > g_same);
	assert_true(g_far - g_near > 0.01);
}

/* Both weights 0: the value is the expected normal points (the model's
   definition); otherwise the weighted sum. */
static void
test_value_weights_zero_counts_points(void **state)
{
	struct value_settings s;

	(void)state;
	value_settings_default(&s);
	assert_int_equal(value_settings_check(&s, NULL), ERRCODE_OK);
	check_near(value_combine(&s, 4.0, 0.25, 0.5), 0.75, 1e-15, "",
	    "default weights 1 and 1");
	s.phase_weight = 0.0;
	s.orientation_weight = 0.0;
	/* want n = 4 (definition) */
	check_near(value_combine(&s, 4.0, 0.25, 0.5), 4.0, 0.0, "",
	    "both weights 0");
	s.phase_weight = 2.0;
	check_near(value_combine(&s, 4.0, 0.25, 0.5), 0.5, 1e-15, "",
	    "phase only");
}

static void
test_value_settings_and_yield(void **state)
{
	struct value_settings s;
	const char *field = NULL;

	(void)state;
	value_settings_default(&s);
	s.harmonics = VALUE_K_MAX + 1;
	assert_int_equal(value_settings_check(&s, &field), ERRCODE_BAD_ARG);
	assert_string_equal(field, "value_harmonics");
	value_settings_default(&s);
	s.orientation_weight = -1.0;
	assert_int_equal(value_settings_check(&s, &field), ERRCODE_BAD_ARG);
	assert_string_equal(field, "value_orientation_weight");
	assert_int_equal(value_model_parse("bins"), VALUE_MODEL_BINS);
	assert_int_equal(value_model_parse("design"), VALUE_MODEL_DESIGN);
	assert_int_equal(value_model_parse("Design"), -1);
	/* No history: the prior (definition of the shrinkage). */
	check_near(value_np_per_return(0, 0), VALUE_NPR_PRIOR, 0, "",
	    "npr prior");
	/* Much history: tends to the observed 0.1 (posterior mean
	   (0.02 * 500 + 10000) / (500 + 1e5) = 0.099602: arithmetic) */
	check_near(value_np_per_return(1e4, 1e5), 0.0996019900497512, 1e-12,
	    "", "npr shrunk");
	/* Capped by length: 600 s allow 2 points (600 / 300). */
	check_near(value_expected_nps(0.1, 100.0, 600.0), 2.0, 0, "",
	    "np cap");
	check_near(value_expected_nps(0.01, 100.0, 600.0), 1.0, 1e-15, "",
	    "np from returns");
	check_near(value_expected_nps(0.01, 0.0, 600.0), 0.0, 0, "",
	    "no returns");
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_value_empty_leverage),
		cmocka_unit_test(test_value_uniform_design),
		cmocka_unit_test(test_value_gain_is_logdet_change),
		cmocka_unit_test(test_value_gain_falls_as_phase_fills),
		cmocka_unit_test(test_value_quarters_known_new_full_gain_most),
		cmocka_unit_test(test_value_sub_earth_no_rotation_leverage),
		cmocka_unit_test(test_value_far_pair_beats_close_pair),
		cmocka_unit_test(test_value_weights_zero_counts_points),
		cmocka_unit_test(test_value_settings_and_yield),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
