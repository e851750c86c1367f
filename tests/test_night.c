/* SPDX-License-Identifier: BSD-3-Clause */
/* test_night.c: night plans on simulated stations with real geometry:
   every constraint, best never below greedy, several targets a night,
   the same plan for the same input. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "rng.h"
#include "check.h"
#include "fixture.h"
#include "sample_targets.h"
#include "core/mem.h"
#include "core/night.h"
#include "core/tscale.h"

#define NTG SAMPLE_TARGETS_N
#define NATT 200

RNG_FILE(0x853C49E6748FEA9BULL)

/* The invented targets of sample-site/targets.csv, and three more. */
static const struct {
	const char *id;
	double lat, lon, h, strength;
} targets[NTG] = SAMPLE_TARGETS;

struct world {
	struct plan_query q;
	struct site_target tg[NTG];
	struct site_attempt att[NATT];
	struct site_blackout bo[2];
};

/* The sample station (sample-site/station.ini). */
static void
sample_station(struct plan_query *q)
{
	plan_query_init(q);
	snprintf(q->station.name, sizeof q->station.name, "Kestrel Ridge");
	snprintf(q->station.code, sizeof q->station.code, "KSTR");
	q->station.lat_deg = 38.9712;
	q->station.lon_deg = -114.3098;
	q->station.height_m = 2950;
	snprintf(q->station.time_zone, sizeof q->station.time_zone,
	    "America/Los_Angeles");
	q->station.min_el_deg = 20;
	q->station.max_sun_el_deg = -12;
	q->station.min_sun_sep_deg = 30;
	q->station.zenith_tau = 0.12;
	q->station.fire_rate_hz = 20;
}

static void
add_targets(struct world *w, size_t n)
{
	for (size_t i = 0; i < n; i++) {
		struct site_target *t = &w->tg[i];

		memset(t, 0, sizeof *t);
		snprintf(t->id, sizeof t->id, "%s", targets[i].id);
		snprintf(t->name, sizeof t->name, "%s (invented)",
		    targets[i].id);
		t->lat_deg = targets[i].lat;
		t->lon_deg = targets[i].lon;
		t->height_m = targets[i].h;
		t->strength = targets[i].strength;
		t->active = 1;
	}
	w->q.targets = w->tg;
	w->q.ntargets = n;
}

/* A random station, date, target set, log and blackouts. */
static void
random_world(struct world *w, double *from)
{
	size_t nt = 2 + (size_t)(urand() * (NTG - 1));
	size_t na = (size_t)(urand() * NATT);

	memset(w, 0, sizeof *w);
	sample_station(&w->q);
	w->q.station.lat_deg = -50.0 + urand() * 100.0;
	w->q.station.lon_deg = -180.0 + urand() * 360.0;
	w->q.station.height_m = urand() * 3000.0;
	w->q.station.min_el_deg = 15.0 + urand() * 15.0;
	add_targets(w, nt);
	/* a night: 14 h from a random instant of 2025-2030 */
	*from = fixture_mjd("2025-01-01T00:00:00Z") + floor(urand() * 2000.0) +
	    urand();
	for (size_t i = 0; i < na; i++) {
		struct site_attempt *a = &w->att[i];

		memset(a, 0, sizeof *a);
		snprintf(a->target, sizeof a->target, "%s",
		    targets[(size_t)(urand() * (double)nt)].id);
		a->start_mjd = *from - 1.0 - urand() * 300.0;
		a->end_mjd = a->start_mjd + 0.01;
		a->shots = 6000;
		a->returns = (long)(urand() * 400.0);
		a->normal_points = a->returns / 60;
		a->outcome = a->returns > 0 ? SITE_OUTCOME_RANGED :
		    SITE_OUTCOME_NO_RETURNS;
		a->synodic_deg = urand() < 0.7 ? 60.0 + urand() * 60.0 :
		    urand() * 360.0;
		a->target_el_deg = 30.0 + urand() * 50.0;
		a->sun_el_target_deg = urand() * 40.0 - 20.0;
		a->seeing_arcsec = NAN;
	}
	w->q.attempts = w->att;
	w->q.nattempts = na;
	if (urand() < 0.5) {
		w->bo[0].start_mjd = *from + urand() * 0.5;
		w->bo[0].end_mjd = w->bo[0].start_mjd + urand() * 0.1;
		w->q.blackouts = w->bo;
		w->q.nblackouts = 1;
	}
	w->q.from_mjd = *from;
	w->q.to_mjd = *from + 14.0 / 24.0;
}

/* Every constraint of a plan, checked against plan_run's windows (which
   already leave the blackouts out) and the blackouts themselves. */
static void
check_night(const struct world *w, const struct night_result *r)
{
	const struct night_settings *s = &r->settings;
	struct plan_query q = w->q;
	struct plan_result pr;
	const double eps = 1e-6 / 86400.0 * 1e3;	/* 1 ms */
	double cal_end = -1.0;

	q.limit = 0;
	q.target = NULL;
	assert_int_equal(plan_run(&q, &pr, NULL, 0), ERRCODE_OK);
	for (size_t i = 0; i < r->nruns; i++) {
		const struct night_run *x = &r->runs[i];
		double len = (x->end_mjd - x->start_mjd) * 86400.0;
		int inside = 0;

		assert_true(x->start_mjd >= r->from_mjd - eps);
		assert_true(x->end_mjd <= r->to_mjd + eps);
		if (i > 0) {
			const struct night_run *p = &r->runs[i - 1];
			double gap = (x->start_mjd - p->end_mjd) * 86400.0;

			/* no overlap; the switch time between targets */
			assert_true(gap >= -1e-3);
			if (strcmp(p->target, x->target) != 0)
				assert_true(gap >= s->switch_s - 1e-3);
		}
		for (size_t b = 0; b < q.nblackouts; b++)
			assert_true(x->end_mjd <= q.blackouts[b].start_mjd + eps ||
			    x->start_mjd >= q.blackouts[b].end_mjd - eps);
		if (x->calibration) {
			check_near(len, s->cal_s, 1e-3, "s", "calibration length");
			cal_end = x->end_mjd;
			continue;
		}
		assert_true(len >= s->run_min_s - 1e-3);
		assert_true(len <= s->run_max_s + 1e-3);
		for (size_t k = 0; k < pr.n && !inside; k++)
			inside = strcmp(pr.w[k].target, x->target) == 0 &&
			    x->start_mjd >= pr.w[k].start_mjd - eps &&
			    x->end_mjd <= pr.w[k].end_mjd + eps;
		assert_true(inside);
		if (s->cal_every_s > 0) {
			assert_true(cal_end > 0);
			assert_true((x->end_mjd - cal_end) * 86400.0 <=
			    s->cal_every_s + 1e-3);
		}
	}
	plan_result_free(&pr);
}

/* >= 200 simulated nights: constraints, and best never below greedy. */
static void
test_night_simulated_nights(void **state)
{
	static struct world w;
	double sum = 0.0, worst = INFINITY;
	int n = 0, planned = 0, above = 0;

	(void)state;
	for (int k = 0; k < 200; k++) {
		struct night_settings s;
		struct night_result g, b;
		double from;

		random_world(&w, &from);
		night_settings_default(&s);
		if (urand() < 0.3) {
			s.cal_every_s = 3600.0 + urand() * 7200.0;
			s.cal_s = 300.0;
		}
		if (urand() < 0.2)
			s.value.model = VALUE_MODEL_BINS;
		assert_int_equal(night_plan(&w.q, &s, SCHED_GREEDY, &g, NULL, 0),
		    ERRCODE_OK);
		assert_int_equal(night_plan(&w.q, &s, SCHED_BEST, &b, NULL, 0),
		    ERRCODE_OK);
		check_night(&w, &g);
		check_night(&w, &b);
		assert_true(b.total_value >= g.total_value);
		if (g.total_value > 0) {
			double r = b.total_value / g.total_value;

			planned++;
			sum += r;
			above += r > 1.0 + 1e-12;
			if (r < worst)
				worst = r;
		} else {
			/* nothing plannable: the plan says why */
			assert_int_equal(b.nruns, 0);
			assert_true(strlen(b.why_empty) > 0);
		}
		n++;
		night_result_free(&g);
		night_result_free(&b);
	}
	printf("simulated nights: %d, with runs %d; best/greedy mean %.4f, "
	    "worst %.4f, above greedy on %d\n", n, planned,
	    planned ? sum / planned : NAN, worst, above);
	assert_true(planned >= 60);
	assert_true(worst >= 1.0);
	assert_true(sum / planned > 1.0);
}

/* The sample station on a long night (2027-03-20, about 8 h of windows,
   as the issue describes): defaults visit at least three targets. */
static void
test_night_sample_long_night(void **state)
{
	static struct world w;
	struct night_settings s;
	struct night_result r, r2;
	size_t visited = 0;

	(void)state;
	memset(&w, 0, sizeof w);
	sample_station(&w.q);
	add_targets(&w, 5);
	w.tg[4].dark_only = 1;		/* TERN, as in targets.csv */
	w.q.from_mjd = fixture_mjd("2027-03-20T00:00:00Z");
	w.q.to_mjd = fixture_mjd("2027-03-20T14:00:00Z");
	night_settings_default(&s);
	assert_int_equal(night_plan(&w.q, &s, SCHED_BEST, &r, NULL, 0),
	    ERRCODE_OK);
	check_night(&w, &r);
	for (size_t j = 0; j < r.ntargets; j++)
		for (size_t i = 0; i < r.nruns; i++)
			if (strcmp(r.runs[i].target, r.targets[j].id) == 0) {
				visited++;
				break;
			}
	printf("sample night: %zu runs on %zu targets, value %.4f (greedy "
	    "%.4f)\n", r.nruns, visited, r.total_value, r.greedy_value);
	assert_true(visited >= 3);
	/* the same input, the same plan */
	assert_int_equal(night_plan(&w.q, &s, SCHED_BEST, &r2, NULL, 0),
	    ERRCODE_OK);
	assert_int_equal(r.nruns, r2.nruns);
	for (size_t i = 0; i < r.nruns; i++) {
		assert_string_equal(r.runs[i].target, r2.runs[i].target);
		assert_true(r.runs[i].start_mjd == r2.runs[i].start_mjd);
		assert_true(r.runs[i].value == r2.runs[i].value);
	}
	night_result_free(&r);
	night_result_free(&r2);
}

/* Near new moon nothing can be ranged; the plan names the limit
   (2027-03-08 is within a day of a new moon: geom_phases_find). */
static void
test_night_new_moon_says_why(void **state)
{
	static struct world w;
	struct night_settings s;
	struct night_result r;
	struct geom_phase_event ev[8];
	size_t n = 0;
	double from = fixture_mjd("2027-03-01T00:00:00Z");
	double new_moon = NAN;

	(void)state;
	assert_int_equal(geom_phases_find(2400000.5, from, 2400000.5,
	    from + 30.0, ev, 8, &n), ERRCODE_OK);
	for (size_t i = 0; i < n; i++)
		if (ev[i].kind == GEOM_PHASE_NEW) {
			new_moon = (ev[i].tt1 - 2400000.5) + ev[i].tt2;
			break;
		}
	assert_true(isfinite(new_moon));
	memset(&w, 0, sizeof w);
	sample_station(&w.q);
	add_targets(&w, 4);
	w.q.from_mjd = new_moon - 0.3;
	w.q.to_mjd = new_moon + 0.3;
	night_settings_default(&s);
	assert_int_equal(night_plan(&w.q, &s, SCHED_BEST, &r, NULL, 0),
	    ERRCODE_OK);
	assert_int_equal(r.nruns, 0);
	assert_non_null(strstr(r.why_empty, "min_sun_sep"));
	night_result_free(&r);
}

static void
test_night_bad_settings(void **state)
{
	struct night_settings s;
	char err[160];

	(void)state;
	night_settings_default(&s);
	assert_int_equal(night_settings_check(&s, err, sizeof err), ERRCODE_OK);
	s.run_max_s = 300;
	assert_int_equal(night_settings_check(&s, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "plan_run_max_s"));
	night_settings_default(&s);
	s.cal_every_s = 600;
	assert_int_equal(night_settings_check(&s, err, sizeof err),
	    ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "plan_calibration_every_s"));
	assert_int_equal(night_method_parse("greedy"), SCHED_GREEDY);
	assert_int_equal(night_method_parse("best"), SCHED_BEST);
	assert_int_equal(night_method_parse("fast"), -1);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_night_bad_settings),
		cmocka_unit_test(test_night_new_moon_says_why),
		cmocka_unit_test(test_night_sample_long_night),
		cmocka_unit_test(test_night_simulated_nights),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
