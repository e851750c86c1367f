/* SPDX-License-Identifier: BSD-3-Clause */
/* test_coverage.c: binning, metrics, the chi-square tail and fill dates of
   the coverage core, on hand-worked data sets. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include <libnova/lunar.h>
#include <libnova/sidereal_time.h>

#include "check.h"
#include "core/attempt.h"
#include "core/coverage.h"
#include "core/geom.h"
#include "core/tscale.h"

#define MJD0 2400000.5

/* --- metrics on hand-worked counts --- */

static void
test_coverage_uniform_spread(void **state)
{
	long n[12];
	struct coverage_metrics m;

	(void)state;
	for (int i = 0; i < 12; i++)
		n[i] = 5;
	coverage_metrics_of(n, 12, 1, &m);
	assert_int_equal(m.total, 60);
	assert_int_equal(m.filled_bins, 12);
	check_near(m.filled_fraction, 1.0, 0.0, "", "filled fraction");
	/* Hand-worked: p = 1/12 everywhere, H = ln 12, normalised 1. */
	check_near(m.entropy, 1.0, 1e-15, "", "entropy of a uniform spread");
	/* Hand-worked: every bin equals E = 5, so X^2 = 0 and P = 1. */
	check_near(m.chi2, 0.0, 0.0, "", "chi-square");
	assert_int_equal(m.chi2_dof, 11);
	check_near(m.chi2_p, 1.0, 0.0, "", "p-value");
	assert_true(m.chi2_reliable);	/* E = 5 >= 5 */
	check_near(m.longest_gap_deg, 0.0, 0.0, "deg", "no empty arc");
	assert_true(isnan(m.longest_gap_from_deg));
}

static void
test_coverage_single_bin(void **state)
{
	long n[12] = {0};
	struct coverage_metrics m;

	(void)state;
	n[3] = 10;
	coverage_metrics_of(n, 12, 1, &m);
	/* Hand-worked: one p = 1, H = 0. */
	check_near(m.entropy, 0.0, 0.0, "", "entropy of a single bin");
	/* Hand-worked: E = 10/12; X^2 = (10 - E)^2/E + 11 E = N (k - 1) =
	   110. */
	check_near(m.chi2, 110.0, 1e-12, "", "chi-square of a single bin");
	assert_int_equal(m.filled_bins, 1);
	assert_false(m.chi2_reliable);	/* E = 0.83 < 5 */
	/* Eleven empty bins from bin 4 round to bin 2: 330 deg from 120. */
	check_near(m.longest_gap_deg, 330.0, 0.0, "deg", "empty arc");
	check_near(m.longest_gap_from_deg, 120.0, 0.0, "deg", "arc start");
	/* Emptiest: every bin tied at zero, by index. */
	assert_int_equal(m.nemptiest, 11);
	assert_int_equal(m.emptiest[0], 0);
	assert_int_equal(m.emptiest[3], 4);
}

static void
test_coverage_entropy_hand_worked(void **state)
{
	long n[4] = {1, 1, 2, 0};
	struct coverage_metrics m;

	(void)state;
	coverage_metrics_of(n, 4, 1, &m);
	/* Hand-worked: p = 1/4, 1/4, 1/2: H = 1.5 ln 2, / ln 4 = 0.75. */
	check_near(m.entropy, 0.75, 1e-15, "", "entropy");
	/* Emptiest: bin 3 (0), then bins 0 and 1 (1), at least three. */
	assert_int_equal(m.nemptiest, 3);
	assert_int_equal(m.emptiest[0], 3);
	assert_int_equal(m.emptiest[1], 0);
	assert_int_equal(m.emptiest[2], 1);
}

static void
test_coverage_chi_square_hand_worked(void **state)
{
	long n[4] = {10, 20, 30, 40};
	struct coverage_metrics m;
	double want;

	(void)state;
	coverage_metrics_of(n, 4, 1, &m);
	/* Hand-worked: E = 25; (225 + 25 + 25 + 225) / 25 = 20. */
	check_near(m.chi2, 20.0, 1e-12, "", "chi-square");
	assert_int_equal(m.chi2_dof, 3);
	/* Closed form for 3 degrees of freedom, Abramowitz & Stegun 26.4.4:
	   Q(x|3) = erfc(sqrt(x/2)) + sqrt(2x/pi) exp(-x/2). */
	want = erfc(sqrt(10.0)) + sqrt(40.0 / 3.14159265358979323846) *
	    exp(-10.0);
	check_near(m.chi2_p, want, 1e-14, "", "p-value, 3 dof");
}

/* The longest empty arc when the gap runs across the 0/360 seam. */
static void
test_coverage_empty_arc_wraps(void **state)
{
	long n[12] = {0, 0, 4, 1, 1, 2, 9, 3, 1, 0, 0, 0};
	long k[12] = {0, 0, 3, 3, 3, 0, 3, 3, 3, 3, 0, 0};
	long a[12] = {0};
	long one[12] = {0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 7};
	struct coverage_metrics m;

	(void)state;
	/* Bins 9, 10, 11, 0, 1: five bins = 150 deg starting at 270. */
	coverage_metrics_of(n, 12, 1, &m);
	check_near(m.longest_gap_deg, 150.0, 0.0, "deg", "arc over 0/360");
	check_near(m.longest_gap_from_deg, 270.0, 0.0, "deg", "arc start");
	/* Runs {5} and {10, 11, 0, 1}: the wrapped one is longer. */
	coverage_metrics_of(k, 12, 1, &m);
	check_near(m.longest_gap_deg, 120.0, 0.0, "deg", "wrapped run");
	check_near(m.longest_gap_from_deg, 300.0, 0.0, "deg", "its start");
	/* With min_count 4 only bins 2 and 6 are filled (n = 4 and 9):
	   runs 3..5 (3 bins) and 7..1 (7 bins, from 210 deg). */
	coverage_metrics_of(n, 12, 4, &m);
	assert_int_equal(m.filled_bins, 2);
	check_near(m.longest_gap_deg, 210.0, 0.0, "deg", "min_count 4");
	check_near(m.longest_gap_from_deg, 210.0, 0.0, "deg", "its start");
	/* Only the last bin filled: the gap is bins 0..10 = 330 deg. */
	coverage_metrics_of(one, 12, 1, &m);
	check_near(m.longest_gap_deg, 330.0, 0.0, "deg", "last bin only");
	check_near(m.longest_gap_from_deg, 0.0, 0.0, "deg", "its start");
	/* Nothing at all: the whole circle, undefined entropy and X^2. */
	coverage_metrics_of(a, 12, 1, &m);
	check_near(m.longest_gap_deg, 360.0, 0.0, "deg", "empty circle");
	check_near(m.longest_gap_from_deg, 0.0, 0.0, "deg", "its start");
	assert_true(isnan(m.entropy));
	assert_true(isnan(m.chi2));
	assert_true(isnan(m.chi2_p));
}

/*
 * Upper-tail critical values of the chi-square distribution from the
 * NIST/SEMATECH e-Handbook of Statistical Methods, section 1.3.6.7.4
 * ("Critical Values of the Chi-Square Distribution"), upper-tail table:
 * P(X >= x) = alpha at these x.  The table prints three decimals, so the
 * tolerance on alpha is the density times half a unit of the last digit.
 * Values quoted from memory; cross-checked with scipy.stats.chi2.isf
 * (Debian python3-scipy 1.10.1) to the printed digits.
 */
static const struct {
	int dof;
	double alpha, x;
} chi2_table[] = {
	{1, 0.05, 3.841},
	{2, 0.05, 5.991},
	{3, 0.05, 7.815},
	{10, 0.05, 18.307},
	{11, 0.10, 17.275},
	{11, 0.05, 19.675},
	{11, 0.01, 24.725},
	{11, 0.001, 31.264},
	{23, 0.05, 35.172},
};

static void
test_coverage_chi2_against_nist_table(void **state)
{
	(void)state;
	for (size_t i = 0; i < sizeof chi2_table / sizeof chi2_table[0]; i++) {
		double p = coverage_chi2_p(chi2_table[i].x, chi2_table[i].dof);

		/* NIST/SEMATECH 1.3.6.7.4, see the table's comment. */
		check_near(p, chi2_table[i].alpha, 3e-5 + 5e-4 *
		    chi2_table[i].alpha, "", "chi-square upper tail");
	}
	/* Lower-tail table of the same section: P(X < 5.578) = 0.10 at 11
	   degrees of freedom, so the upper tail is 0.90. */
	check_near(coverage_chi2_p(5.578, 11), 0.90, 1e-4, "",
	    "chi-square lower tail");
}

/* Both branches of Q (series and continued fraction) against the closed
   form for even degrees of freedom, Abramowitz & Stegun 26.4.21:
   Q(x|2m) = exp(-x/2) sum_{k<m} (x/2)^k / k!. */
static void
test_coverage_gamma_q_closed_form(void **state)
{
	(void)state;
	for (int m = 1; m <= 36; m++) {
		for (double x = 0.25; x < 150.0; x *= 1.7) {
			double h = 0.5 * x, term = 1.0, sum = 1.0, want;

			for (int k = 1; k < m; k++) {
				term *= h / k;
				sum += term;
			}
			want = exp(-h) * sum;
			/* A&S 26.4.21 (closed form, even dof). */
			check_near(coverage_chi2_p(x, 2 * m), want,
			    1e-13 + 1e-11 * want, "", "Q, even dof");
		}
	}
	assert_true(isnan(coverage_gamma_q(-1.0, 1.0)));
	assert_true(isnan(coverage_gamma_q(1.0, -1.0)));
	check_near(coverage_gamma_q(2.5, 0.0), 1.0, 0.0, "", "Q(a, 0)");
}

/* --- binning records --- */

static struct site_normal_point
np_at(const char *target, const char *station, double mjd, double syn)
{
	struct site_normal_point p;

	memset(&p, 0, sizeof p);
	snprintf(p.target, sizeof p.target, "%s", target);
	snprintf(p.station_code, sizeof p.station_code, "%s", station);
	p.epoch_mjd = mjd;
	p.synodic_deg = syn;
	p.mean_elong_deg = NAN;
	return p;
}

static void
test_coverage_bins_and_filters(void **state)
{
	struct coverage_result *r = calloc(1, sizeof *r);
	struct coverage_spec s;
	struct site_normal_point np[7];
	struct site_attempt att[2];
	struct coverage_input in;

	(void)state;
	assert_non_null(r);
	/* 2026-01-15 is MJD 61055; 2027-01-15 is MJD 61420 (hand-worked from
	   MJD 51544 = 2000-01-01: 9497 days to 2026-01-01, + 14). */
	np[0] = np_at("alpha", "7001", 61055.0, 0.0);	/* bin 0 */
	np[1] = np_at("alpha", "7001", 61055.1, 29.999);	/* bin 0 */
	np[2] = np_at("beta", "7001", 61055.2, 30.0);	/* bin 1 */
	np[3] = np_at("beta", "7002", 61420.0, 359.99);	/* bin 11 */
	np[4] = np_at("alpha", "7002", 61420.0, 185.0);	/* bin 6 */
	np[5] = np_at("alpha", "7001", 61420.5, 720.0 + 95.0); /* bin 3 */
	np[6] = np_at("gamma", "7001", 61420.5, 95.0);	/* bin 3 */
	memset(att, 0, sizeof att);
	snprintf(att[0].target, sizeof att[0].target, "beta");
	att[0].start_mjd = 61420.0;
	att[0].end_mjd = 61420.1;
	att[0].normal_points = 4;
	att[0].synodic_deg = 200.0;			/* bin 6 */
	snprintf(att[1].target, sizeof att[1].target, "beta");
	att[1].start_mjd = 61420.2;
	att[1].end_mjd = 61420.3;
	att[1].normal_points = 0;			/* no points */
	att[1].synodic_deg = 10.0;
	in.np = np;
	in.nnp = 7;
	in.att = att;
	in.natt = 2;

	coverage_spec_init(&s);
	snprintf(s.own_station, sizeof s.own_station, "7001");
	assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_OK);
	assert_int_equal(r->records, 8);
	assert_int_equal(r->pooled.n[0], 2);
	assert_int_equal(r->pooled.n[1], 1);
	assert_int_equal(r->pooled.n[3], 2);
	assert_int_equal(r->pooled.n[6], 5);	/* 1 point + 4 logged */
	assert_int_equal(r->pooled.n[11], 1);
	assert_int_equal(r->pooled.m.total, 11);
	/* Targets sorted by id. */
	assert_int_equal(r->ntargets, 3);
	assert_string_equal(r->targets[0].id, "alpha");
	assert_string_equal(r->targets[1].id, "beta");
	assert_string_equal(r->targets[2].id, "gamma");
	assert_int_equal(r->targets[1].c.n[6], 4);
	assert_int_equal(r->targets[0].c.m.total, 4);
	/* Years 2026 (3 points) and 2027 (8). */
	assert_int_equal(r->nyears, 2);
	assert_int_equal(r->years[0].year, 2026);
	assert_int_equal(r->years[0].c.m.total, 3);
	assert_int_equal(r->years[1].year, 2027);
	assert_int_equal(r->years[1].c.m.total, 8);

	/* Station filter: 7002 has two normal points; the log is 7001's. */
	snprintf(s.station, sizeof s.station, "7002");
	assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_OK);
	assert_int_equal(r->pooled.m.total, 2);
	/* Own station: its points and the logged ones. */
	snprintf(s.station, sizeof s.station, "7001");
	assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_OK);
	assert_int_equal(r->pooled.m.total, 9);

	/* Target and time filters; until is exclusive. */
	s.station[0] = '\0';
	snprintf(s.target, sizeof s.target, "beta");
	s.since_mjd = 61055.2;
	s.until_mjd = 61420.0;
	assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_OK);
	assert_int_equal(r->pooled.m.total, 1);
	assert_int_equal(r->pooled.n[1], 1);

	/* Source attempts: one count each, normal points unused. */
	coverage_spec_init(&s);
	s.source = COVERAGE_SOURCE_ATTEMPTS;
	assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_OK);
	assert_int_equal(r->pooled.m.total, 2);
	assert_int_equal(r->pooled.n[6], 1);
	assert_int_equal(r->pooled.n[0], 1);
	assert_int_equal(r->suspect, 0);

	/* A suspect attempt is left out and counted, as the yield model
	   leaves it out (README, coverage JSON fields); only those within
	   the filters are counted. */
	att[0].suspect = ATTEMPT_SUSPECT_BELOW_HORIZON;
	assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_OK);
	assert_int_equal(r->pooled.m.total, 1);
	assert_int_equal(r->pooled.n[6], 0);
	assert_int_equal(r->pooled.n[0], 1);
	assert_int_equal(r->records, 1);
	assert_int_equal(r->suspect, 1);
	snprintf(s.target, sizeof s.target, "alpha");
	assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_OK);
	assert_int_equal(r->suspect, 0);
	s.target[0] = '\0';
	att[0].suspect = 0;

	/* More distinct targets than a result holds: refused, not cut. */
	{
		static struct site_normal_point many[COVERAGE_MAX_TARGETS + 1];
		struct coverage_input big = {many, COVERAGE_MAX_TARGETS + 1,
		    NULL, 0};

		for (int i = 0; i <= COVERAGE_MAX_TARGETS; i++) {
			char id[16];

			snprintf(id, sizeof id, "t%03d", i);
			many[i] = np_at(id, "7001", 61055.0, 10.0);
		}
		coverage_spec_init(&s);
		assert_int_equal(coverage_compute(&s, &big, r),
		    ERRCODE_TOO_LARGE);
		big.nnp = COVERAGE_MAX_TARGETS;
		assert_int_equal(coverage_compute(&s, &big, r), ERRCODE_OK);
		assert_int_equal(r->ntargets, COVERAGE_MAX_TARGETS);
	}

	/* A bad spec is refused. */
	s.nbins = 3;
	assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_BAD_ARG);
	s.nbins = 73;
	assert_int_equal(coverage_spec_check(&s, NULL, 0), ERRCODE_BAD_ARG);
	free(r);
}

static void
test_coverage_bin_edges(void **state)
{
	(void)state;
	assert_int_equal(coverage_bin_of(0.0, 12), 0);
	assert_int_equal(coverage_bin_of(29.9999999, 12), 0);
	assert_int_equal(coverage_bin_of(30.0, 12), 1);
	assert_int_equal(coverage_bin_of(359.9999999, 12), 11);
	assert_int_equal(coverage_bin_of(360.0, 12), 0);
	assert_int_equal(coverage_bin_of(-0.5, 12), 11);
	assert_int_equal(coverage_bin_of(90.0, 4), 1);
	assert_int_equal(coverage_bin_of(5.0, 72), 1);
}

static void
test_coverage_names(void **state)
{
	(void)state;
	for (int a = 0; a < COVERAGE_AXIS__COUNT; a++)
		assert_int_equal(coverage_axis_parse(coverage_axis_name(a)), a);
	for (int s = 0; s < COVERAGE_SOURCE__COUNT; s++)
		assert_int_equal(coverage_source_parse(coverage_source_name(s)),
		    s);
	assert_int_equal(coverage_axis_parse("phase"), -1);
	assert_int_equal(coverage_source_parse(""), -1);
	assert_string_equal(coverage_axis_mark(COVERAGE_AXIS_SYNODIC, 2),
	    "full moon");
}

/* --- axes --- */

static void
test_coverage_fundamental_arguments_at_j2000(void **state)
{
	struct tscale_instant t;
	double utc, deg;

	(void)state;
	/* J2000.0 = 2000-01-01T12:00:00 TT = 11:58:55.816 UTC. */
	assert_int_equal(tscale_from_tt(2451545.0, 0.0, 0.0, &t), ERRCODE_OK);
	utc = (t.utc1 - MJD0) + t.utc2;
	assert_int_equal(coverage_axis_value(COVERAGE_AXIS_ANOMALY, NULL, utc,
	    &deg), ERRCODE_OK);
	/* IERS Conventions (2003) eq. (5.43): l = 134.96340251 deg at J2000;
	   Meeus, Astronomical Algorithms 2nd ed., eq. (47.4): M' =
	   134.9633964 deg (both quoted from memory; they agree to 6e-6
	   deg, the tolerance covers both). */
	check_near(deg, 134.96340251, 1e-5, "deg", "mean anomaly at J2000");
	assert_int_equal(coverage_axis_value(COVERAGE_AXIS_LATITUDE, NULL, utc,
	    &deg), ERRCODE_OK);
	/* IERS Conventions (2003) eq. (5.43): F = 93.27209062 deg; Meeus eq.
	   (47.5): F = 93.2720950 deg (quoted from memory, as above). */
	check_near(deg, 93.27209062, 1e-5, "deg", "argument of latitude");
	assert_int_equal(coverage_axis_value(COVERAGE_AXIS_HOUR_ANGLE, NULL,
	    utc, &deg), ERRCODE_BAD_ARG);

	/* Meeus, Astronomical Algorithms 2nd ed., example 47.a: 1992 April
	   12, 0h TD (JDE 2448724.5): M' = 5.150833 deg, F = 219.889721 deg
	   (quoted from memory; reproduced by Meeus's eqs. 47.4-47.5 evaluated
	   independently, and within 3e-6 deg of IERS 2003). */
	assert_int_equal(tscale_from_tt(2448724.5, 0.0, 0.0, &t), ERRCODE_OK);
	utc = (t.utc1 - MJD0) + t.utc2;
	assert_int_equal(coverage_axis_value(COVERAGE_AXIS_ANOMALY, NULL, utc,
	    &deg), ERRCODE_OK);
	check_near(deg, 5.150833, 1e-5, "deg", "M' of Meeus example 47.a");
	assert_int_equal(coverage_axis_value(COVERAGE_AXIS_LATITUDE, NULL, utc,
	    &deg), ERRCODE_OK);
	check_near(deg, 219.889721, 1e-5, "deg", "F of Meeus example 47.a");
	assert_int_equal(coverage_axis_value(COVERAGE_AXIS_SYNODIC, NULL, NAN,
	    &deg), ERRCODE_BAD_TIME);
}

static void
test_coverage_hour_angle_rate(void **state)
{
	struct geom_site site;
	struct geom_weather wx;
	double a, b, rate;

	(void)state;
	geom_weather_standard(2000.0, &wx);
	assert_int_equal(geom_site_init(&site, 0.6, -1.9, 2000.0, &wx),
	    ERRCODE_OK);
	for (double mjd = 61400.0; mjd < 61430.0; mjd += 1.37) {
		assert_int_equal(coverage_axis_value(COVERAGE_AXIS_HOUR_ANGLE,
		    &site, mjd, &a), ERRCODE_OK);
		assert_int_equal(coverage_axis_value(COVERAGE_AXIS_HOUR_ANGLE,
		    &site, mjd + 1.0 / 24.0, &b), ERRCODE_OK);
		rate = fmod(b - a + 360.0, 360.0);
		/* The Moon's hour angle gains the sidereal rate 15.041 deg/h
		   less its own motion in right ascension (0.4-0.7 deg/h
		   geocentric, more with topocentric parallax): common
		   practice, 13.9..14.8 deg/h. */
		assert_true(rate > 13.9 && rate < 14.8);
	}
}

/* The hour-angle axis against an independent library: libnova (Debian
   libnova-dev, test-only; its own lunar theory ELP 2000-82B and its own
   sidereal time).  libnova's Moon is geocentric, so the topocentric hour
   angle differs by the diurnal parallax in hour angle, at most about
   0.95 deg cos(lat) / cos(dec) (Meeus, Astronomical Algorithms 2nd ed.,
   ch. 40): the tolerance is 1.6 deg, against bins of 5 deg and more. */
static void
test_coverage_hour_angle_against_libnova(void **state)
{
	struct geom_site site;
	struct geom_weather wx;
	const double lat = 38.9712, lon = -114.3098;	/* invented site */

	(void)state;
	geom_weather_standard(2950.0, &wx);
	assert_int_equal(geom_site_init(&site, lat * 3.14159265358979323846 /
	    180.0, lon * 3.14159265358979323846 / 180.0, 2950.0, &wx),
	    ERRCODE_OK);
	for (double mjd = 61000.0; mjd < 61400.0; mjd += 7.31) {
		struct ln_equ_posn equ;
		double deg, want;

		assert_int_equal(coverage_axis_value(COVERAGE_AXIS_HOUR_ANGLE,
		    &site, mjd, &deg), ERRCODE_OK);
		ln_get_lunar_equ_coords(mjd + MJD0, &equ);
		want = ln_get_apparent_sidereal_time(mjd + MJD0) * 15.0 + lon -
		    equ.ra;
		/* libnova, see above. */
		check_near(check_wrap180(deg - want), 0.0, 1.6, "deg",
		    "hour angle vs libnova");
	}
}

/* The synodic angle of the records' epochs is used when synodic_deg is
   absent, and matches the geometry core. */
static void
test_coverage_synodic_from_epoch(void **state)
{
	struct coverage_result *r = calloc(1, sizeof *r);
	struct geom_phase_event ev[8];
	struct site_normal_point np;
	struct coverage_input in = {&np, 1, NULL, 0};
	struct coverage_spec s;
	struct tscale_instant t;
	size_t n;

	(void)state;
	assert_non_null(r);
	/* The first full moon after 2027-01-01 (MJD 61406). */
	assert_int_equal(geom_phases_find(MJD0, 61406.0, MJD0, 61440.0, ev, 8,
	    &n), ERRCODE_OK);
	for (size_t i = 0; i < n; i++) {
		if (ev[i].kind != GEOM_PHASE_FULL)
			continue;
		assert_int_equal(tscale_from_tt(ev[i].tt1, ev[i].tt2, 0.0, &t),
		    ERRCODE_OK);
		/* Six hours after full moon (~3 deg): bin 6 of 12. */
		np = np_at("alpha", "", (t.utc1 - MJD0) + t.utc2 + 0.25, NAN);
		coverage_spec_init(&s);
		assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_OK);
		assert_int_equal(r->pooled.n[6], 1);
		/* Six hours before: bin 5. */
		np.epoch_mjd -= 0.5;
		assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_OK);
		assert_int_equal(r->pooled.n[5], 1);
		break;
	}
	free(r);
}

/* --- fill dates --- */

static void
test_coverage_fill_dates_fall_in_their_bin(void **state)
{
	struct coverage_result *r = calloc(1, sizeof *r);
	struct coverage_fill *f = calloc(1, sizeof *f);
	struct geom_phase_event ev[8];
	struct coverage_window w[5];
	struct tscale_instant t;
	double full = 0, first = 0, deg;
	size_t n;

	(void)state;
	assert_non_null(r);
	assert_non_null(f);
	assert_int_equal(geom_phases_find(MJD0, 61406.0, MJD0, 61440.0, ev, 8,
	    &n), ERRCODE_OK);
	for (size_t i = 0; i < n; i++) {
		assert_int_equal(tscale_from_tt(ev[i].tt1, ev[i].tt2, 0.0, &t),
		    ERRCODE_OK);
		if (ev[i].kind == GEOM_PHASE_FULL && full == 0)
			full = (t.utc1 - MJD0) + t.utc2;
		if (ev[i].kind == GEOM_PHASE_FIRST_QUARTER && first == 0)
			first = (t.utc1 - MJD0) + t.utc2;
	}
	assert_true(full > 0 && first > 0);

	/* A synthetic coverage: every bin holds 3 but 5 and 6 (either side of
	   full moon), which are empty. */
	coverage_spec_init(&r->spec);
	r->bin_width_deg = 30.0;
	for (int b = 0; b < 12; b++)
		r->pooled.n[b] = (b == 5 || b == 6) ? 0 : 3;
	/* Windows: 4 h across full moon; 3 h at first quarter (bin 3,
	   filled); 2 h beginning 2 days after full (bin 6); and one after
	   the horizon. */
	memset(w, 0, sizeof w);
	snprintf(w[0].target, sizeof w[0].target, "alpha");
	w[0].start_mjd = full - 2.0 / 24;
	w[0].end_mjd = full + 2.0 / 24;
	w[0].score = 7.5;
	snprintf(w[1].target, sizeof w[1].target, "beta");
	w[1].start_mjd = first;
	w[1].end_mjd = first + 3.0 / 24;
	w[1].score = 9.0;
	snprintf(w[2].target, sizeof w[2].target, "beta");
	w[2].start_mjd = full + 2.0;
	w[2].end_mjd = full + 2.0 + 2.0 / 24;
	w[2].score = 3.25;
	snprintf(w[3].target, sizeof w[3].target, "alpha");
	w[3].start_mjd = full + 40.0;
	w[3].end_mjd = full + 40.1;
	/* The same night as w[0] for another target, starting after full
	   moon: it overlaps w[0] in bin 6 only, with a lower score there. */
	snprintf(w[4].target, sizeof w[4].target, "gamma");
	w[4].start_mjd = full + 1.0 / 24;
	w[4].end_mjd = full + 3.0 / 24;
	w[4].score = 5.0;
	assert_int_equal(coverage_fill_compute(r, w, 5, full - 20.0,
	    full + 20.0, f), ERRCODE_OK);
	assert_int_equal(f->windows, 4);
	assert_int_equal(f->nbins, 2);
	assert_int_equal(f->bins[0].bin, 5);
	assert_int_equal(f->bins[1].bin, 6);
	/* Bin 5: the first half of the full-moon window. */
	assert_int_equal(f->bins[0].ndates, 1);
	assert_string_equal(f->bins[0].dates[0].target, "alpha");
	check_near(f->bins[0].dates[0].score, 7.5, 0.0, "", "score");
	/* Bin 6: the second half (alpha outscores gamma the same night),
	   then the window two days later. */
	assert_int_equal(f->bins[1].ndates, 2);
	assert_string_equal(f->bins[1].dates[0].target, "alpha");
	assert_string_equal(f->bins[1].dates[1].target, "beta");
	/* The split falls at full moon, to the sampling step. */
	check_near((f->bins[1].dates[0].in_bin_start_mjd - full) * 86400.0,
	    0.0, COVERAGE_FILL_STEP_S, "s", "entry into bin 6 at full moon");
	/* Every date's in-bin span lies in its bin (the geometry core).  The
	   fill samples the fitted track, within 0.004" of the direct
	   synodic angle (test_fastpath); the sample 24 steps into the
	   first window falls on full moon itself (the window starts 2 h
	   before it), i.e. on a bin boundary to the phase search's 9 ms, so
	   within 0.01" of a boundary either side is that bin. */
	for (size_t i = 0; i < f->nbins; i++) {
		for (size_t k = 0; k < f->bins[i].ndates; k++) {
			const struct coverage_fill_date *d = &f->bins[i].dates[k];
			const double e = 0.01 / 3600.0;

			assert_int_equal(coverage_axis_value(
			    COVERAGE_AXIS_SYNODIC, NULL, d->in_bin_start_mjd,
			    &deg), ERRCODE_OK);
			assert_true(coverage_bin_of(deg, 12) == f->bins[i].bin ||
			    coverage_bin_of(deg + e, 12) == f->bins[i].bin);
			assert_int_equal(coverage_axis_value(
			    COVERAGE_AXIS_SYNODIC, NULL, d->in_bin_end_mjd,
			    &deg), ERRCODE_OK);
			assert_true(coverage_bin_of(deg, 12) == f->bins[i].bin ||
			    coverage_bin_of(deg - e, 12) == f->bins[i].bin);
		}
	}

	/* With a target set, only its windows count. */
	snprintf(r->spec.target, sizeof r->spec.target, "beta");
	memcpy(r->targets[0].id, "beta", 5);
	r->targets[0].c = r->pooled;
	r->ntargets = 1;
	assert_int_equal(coverage_fill_compute(r, w, 5, full - 20.0,
	    full + 20.0, f), ERRCODE_OK);
	assert_int_equal(f->bins[0].ndates, 0);
	assert_int_equal(f->bins[1].ndates, 1);

	/* A better score the same night replaces the date. */
	r->spec.target[0] = '\0';
	w[4].score = 9.5;
	assert_int_equal(coverage_fill_compute(r, w, 5, full - 20.0,
	    full + 20.0, f), ERRCODE_OK);
	assert_int_equal(f->bins[1].ndates, 2);
	assert_string_equal(f->bins[1].dates[0].target, "gamma");
	check_near(f->bins[1].dates[0].score, 9.5, 0.0, "", "best score");
	assert_string_equal(f->bins[0].dates[0].target, "alpha");
	free(r);
	free(f);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_coverage_uniform_spread),
		cmocka_unit_test(test_coverage_single_bin),
		cmocka_unit_test(test_coverage_entropy_hand_worked),
		cmocka_unit_test(test_coverage_chi_square_hand_worked),
		cmocka_unit_test(test_coverage_empty_arc_wraps),
		cmocka_unit_test(test_coverage_chi2_against_nist_table),
		cmocka_unit_test(test_coverage_gamma_q_closed_form),
		cmocka_unit_test(test_coverage_bins_and_filters),
		cmocka_unit_test(test_coverage_bin_edges),
		cmocka_unit_test(test_coverage_names),
		cmocka_unit_test(test_coverage_fundamental_arguments_at_j2000),
		cmocka_unit_test(test_coverage_hour_angle_rate),
		cmocka_unit_test(test_coverage_hour_angle_against_libnova),
		cmocka_unit_test(test_coverage_synodic_from_epoch),
		cmocka_unit_test(test_coverage_fill_dates_fall_in_their_bin),
	};

	return cmocka_run_group_tests_name("coverage", tests, NULL, NULL);
}
