/* SPDX-License-Identifier: BSD-3-Clause */
/* test_sched.c: the night's scheduler on random instances: constraints,
   equality with brute force on small ones, never below greedy. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "rng.h"
#include "check.h"
#include "core/mem.h"
#include "core/sched.h"

#define PI 3.14159265358979323846
#define MAXT 8
#define MAXS 800

RNG_FILE(0xD1B54A32D192ED03ULL)

static int
irand(int lo, int hi)		/* lo..hi inclusive */
{
	return lo + (int)(urand() * (hi - lo + 1));
}

/* A random instance: windows as a few intervals per target, blackouts,
   returns rising and falling like an elevation arc, rotation vectors
   from random points on the near side, a log of held phases. */
struct inst {
	struct sched_problem p;
	struct value_settings vs;
	unsigned char avail[MAXT * MAXS], clear[MAXS];
	double ret[MAXT * MAXS], h[MAXT * MAXS * 4], syn[MAXS];
	double binw[MAXT * MAXS], npr[MAXT];
	struct value_phase ph[MAXT];
	size_t phase_of[MAXT];
};

static void
make(struct inst *in, size_t ns, size_t nt, int small)
{
	struct sched_problem *p = &in->p;
	double held[200];
	size_t nheld = (size_t)irand(0, 150);
	int per_target = urand() < 0.5;
	double d0 = urand() * 2 * PI;

	memset(in, 0, sizeof *in);
	value_settings_default(&in->vs);
	in->vs.harmonics = irand(1, 3);
	if (urand() < 0.15)
		in->vs.model = VALUE_MODEL_BINS;
	if (urand() < 0.1)
		in->vs.phase_weight = in->vs.orientation_weight = 0.0;
	else {
		in->vs.phase_weight = urand() * 3;
		in->vs.orientation_weight = urand() * 3;
	}
	for (size_t s = 0; s < ns; s++) {
		in->syn[s] = d0 + 0.0002 * (double)s;
		in->clear[s] = 1;
	}
	/* blackouts */
	for (int b = irand(0, 2); b > 0; b--) {
		size_t a = (size_t)irand(0, (int)ns - 1);
		size_t l = (size_t)irand(1, small ? 3 : (int)ns / 8 + 1);

		for (size_t s = a; s < a + l && s < ns; s++)
			in->clear[s] = 0;
	}
	for (size_t j = 0; j < nt; j++) {
		double lat = (urand() - 0.5) * 120, lon = (urand() - 0.5) * 140;
		double rho[3], peak = urand() * (double)ns;
		double width = (0.3 + urand()) * (double)ns;
		double amp = 5.0 + urand() * 200.0;

		rho[0] = cos(lat * PI / 180) * cos(lon * PI / 180);
		rho[1] = cos(lat * PI / 180) * sin(lon * PI / 180);
		rho[2] = sin(lat * PI / 180);
		for (int w = irand(1, 2); w > 0; w--) {
			size_t a = (size_t)irand(0, (int)ns - 1);
			size_t l = (size_t)irand(small ? 2 : (int)ns / 6,
			    small ? (int)ns : (int)ns);

			for (size_t s = a; s < a + l && s < ns; s++)
				in->avail[j * ns + s] = in->clear[s];
		}
		for (size_t s = 0; s < ns; s++) {
			double x = ((double)s - peak) / width;
			/* line of sight swings by libration and parallax:
			   a degree or so across the night */
			double ang = 0.02 * ((double)s / (double)ns - 0.5);
			double u[3] = {-cos(ang), -sin(ang), 0.01};

			in->ret[j * ns + s] = amp * exp(-x * x) *
			    (urand() < 0.05 ? 0.0 : 1.0);
			value_orient_vector(rho, u, in->h + (j * ns + s) * 4);
			in->binw[j * ns + s] = 0.5 + urand();
		}
		in->npr[j] = 0.005 + urand() * 0.05;
	}
	for (size_t i = 0; i < nheld; i++)
		held[i] = urand() < 0.7 ? d0 + (urand() - 0.5) :
		    urand() * 2 * PI;
	if (per_target) {
		for (size_t j = 0; j < nt; j++) {
			size_t a = (size_t)irand(0, (int)nheld);

			assert_int_equal(value_phase_build(&in->ph[j],
			    in->vs.harmonics, in->vs.phase_ridge, held, NULL,
			    a), ERRCODE_OK);
			in->phase_of[j] = j;
		}
		p->nphase = nt;
	} else {
		assert_int_equal(value_phase_build(&in->ph[0], in->vs.harmonics,
		    in->vs.phase_ridge, held, NULL, nheld), ERRCODE_OK);
		p->nphase = 1;
	}
	if (p->nphase == 0) {
		assert_int_equal(value_phase_build(&in->ph[0], in->vs.harmonics,
		    in->vs.phase_ridge, held, NULL, 0), ERRCODE_OK);
		p->nphase = 1;
	}
	p->nslots = ns;
	p->slot_s = 60.0;
	p->ntargets = nt;
	p->avail = in->avail;
	p->clear = in->clear;
	p->returns = in->ret;
	p->h = in->h;
	p->synodic = in->syn;
	p->bin_weight = in->binw;
	p->npr = in->npr;
	p->vs = &in->vs;
	p->phase0 = in->ph;
	p->phase_of = in->phase_of;
	if (small) {
		p->run_min = irand(1, 3);
		p->run_max = p->run_min + irand(0, 2);
		p->switch_slots = irand(0, 2);
		if (urand() < 0.5) {
			p->cal_slots = irand(1, 2);
			p->cal_every = p->run_max + irand(0, 6);
		}
	} else {
		p->run_min = irand(5, 15);
		p->run_max = p->run_min + irand(0, 30);
		p->switch_slots = irand(0, 5);
		if (urand() < 0.4) {
			p->cal_slots = irand(3, 10);
			p->cal_every = p->run_max + irand(30, 200);
		}
	}
}

/* Every constraint of sched.h, checked here from its statement. */
static void
check_plan(const struct inst *in, const struct sched_plan *pl)
{
	const struct sched_problem *p = &in->p;
	long cal_end = -1, prev_end = -1;
	int prev = -2;
	double sum = 0.0;

	for (size_t i = 0; i < pl->n; i++) {
		const struct sched_run *r = &pl->runs[i];
		long s = (long)r->start, e = (long)(r->start + r->len);

		assert_true(e <= (long)p->nslots);
		/* no overlap, in time order; switch gap between kinds */
		if (prev_end >= 0)
			assert_true(s >= prev_end + (prev != r->target ?
			    p->switch_slots : 1));
		if (r->target == SCHED_CALIBRATION) {
			assert_true(p->cal_every > 0);
			assert_int_equal((long)r->len, p->cal_slots);
			for (long t = s; t < e; t++)
				assert_true(p->clear[t]);	/* blackouts */
			cal_end = e;
		} else {
			assert_true((long)r->len >= p->run_min);
			assert_true((long)r->len <= p->run_max);
			for (long t = s; t < e; t++) {
				/* inside a window, outside blackouts */
				assert_true(in->avail[(size_t)r->target *
				    p->nslots + (size_t)t]);
				assert_true(p->clear[t]);
			}
			if (p->cal_every > 0) {
				/* calibration cadence */
				assert_true(cal_end >= 0);
				assert_true(e - cal_end <= p->cal_every);
			}
			assert_true(r->value > 0.0);
		}
		sum += r->value;
		prev_end = e;
		prev = r->target;
	}
	/* the total is the sum of the runs' values (sched.h) */
	check_near(pl->value, sum, 1e-9 * (1 + sum), "", "plan total");
	assert_true(sched_feasible(p, pl->runs, pl->n));
}

static void
test_sched_constraints_random(void **state)
{
	static struct inst in;

	(void)state;
	for (int k = 0; k < 60; k++) {
		struct sched_plan g, b;

		make(&in, (size_t)irand(30, 500), (size_t)irand(1, 6), 0);
		assert_int_equal(sched_solve(&in.p, SCHED_GREEDY, &g),
		    ERRCODE_OK);
		assert_int_equal(sched_solve(&in.p, SCHED_BEST, &b), ERRCODE_OK);
		check_plan(&in, &g);
		check_plan(&in, &b);
		assert_true(b.value >= g.value);
		sched_plan_free(&g);
		sched_plan_free(&b);
	}
}

/* --- brute force over every plan, with calibrations anywhere --- */

struct brute {
	const struct inst *in;
	struct sched_run r[64];
	size_t n;
	double best;
	long plans;
};

static void
brute_rec(struct brute *b, long last_end, int last, long cal_end)
{
	const struct sched_problem *p = &b->in->p;
	double v;

	assert_int_equal(sched_evaluate(p, b->r, b->n, &v), ERRCODE_OK);
	b->plans++;
	if (v > b->best)
		b->best = v;
	if (b->n + 1 >= sizeof b->r / sizeof b->r[0])
		return;
	for (int k = (p->cal_every > 0 ? -1 : 0); k < (int)p->ntargets; k++) {
		long gap = last == -2 ? 0 : last != k ? p->switch_slots : 1;
		long s0 = last_end < 0 ? 0 : last_end + gap;

		for (long s = s0; s < (long)p->nslots; s++) {
			int lo = k < 0 ? p->cal_slots : p->run_min;
			int hi = k < 0 ? p->cal_slots : p->run_max;

			for (int l = lo; l <= hi; l++) {
				long e = s + l;
				int ok = e <= (long)p->nslots;

				for (long t = s; ok && t < e; t++)
					ok = k < 0 ? p->clear[t] :
					    b->in->avail[(size_t)k * p->nslots +
					    (size_t)t];
				if (ok && k >= 0 && p->cal_every > 0)
					ok = cal_end >= 0 &&
					    e - cal_end <= p->cal_every;
				if (!ok)
					continue;
				memset(&b->r[b->n], 0, sizeof b->r[0]);
				b->r[b->n].target = k < 0 ? SCHED_CALIBRATION : k;
				b->r[b->n].start = (size_t)s;
				b->r[b->n].len = (size_t)l;
				b->n++;
				brute_rec(b, e, k, k < 0 ? e : cal_end);
				b->n--;
			}
		}
	}
}

static void
test_sched_equals_brute_force(void **state)
{
	static struct inst in;
	long total_plans = 0;

	(void)state;
	for (int k = 0; k < 40; k++) {
		struct sched_plan b;
		struct brute br;

		make(&in, (size_t)irand(6, 12), (size_t)irand(1, 3), 1);
		memset(&br, 0, sizeof br);
		br.in = &in;
		brute_rec(&br, -1, -2, -1);
		total_plans += br.plans;
		assert_int_equal(sched_solve(&in.p, SCHED_BEST, &b), ERRCODE_OK);
		check_plan(&in, &b);
		assert_int_equal(b.exact, 1);
		/* want: the best of every plan, enumerated above */
		check_near(b.value, br.best, 1e-9 * (1 + br.best), "",
		    "branch and bound vs brute force");
		sched_plan_free(&b);
	}
	/* Sixteen slots, three targets: the largest size asked for. */
	for (int k = 0; k < 4; k++) {
		struct sched_plan b;
		struct brute br;

		make(&in, 16, 3, 1);
		in.p.run_min = 3;
		in.p.run_max = 4;
		memset(&br, 0, sizeof br);
		br.in = &in;
		brute_rec(&br, -1, -2, -1);
		total_plans += br.plans;
		assert_int_equal(sched_solve(&in.p, SCHED_BEST, &b), ERRCODE_OK);
		assert_int_equal(b.exact, 1);
		check_near(b.value, br.best, 1e-9 * (1 + br.best), "",
		    "branch and bound vs brute force, 16 slots");
		sched_plan_free(&b);
	}
	printf("brute force: %ld plans enumerated over 44 instances\n",
	    total_plans);
}

/* 240 simulated nights of 8 to 14 hours on a one-minute grid. */
static void
test_sched_never_below_greedy(void **state)
{
	static struct inst in;
	double sum = 0.0, worst = INFINITY, bestr = 0.0;
	int n = 0, above = 0;

	(void)state;
	for (int k = 0; k < 240; k++) {
		struct sched_plan g, b;
		double r;

		make(&in, (size_t)irand(480, 800), (size_t)irand(2, MAXT), 0);
		assert_int_equal(sched_solve(&in.p, SCHED_GREEDY, &g),
		    ERRCODE_OK);
		assert_int_equal(sched_solve(&in.p, SCHED_BEST, &b), ERRCODE_OK);
		check_plan(&in, &b);
		assert_true(b.value >= g.value);
		check_near(b.greedy_value, g.value, 1e-9 * (1 + g.value), "",
		    "greedy value reported by best");
		if (g.value > 0) {
			r = b.value / g.value;
			sum += r;
			n++;
			above += r > 1.0 + 1e-12;
			if (r < worst)
				worst = r;
			if (r > bestr)
				bestr = r;
		}
		sched_plan_free(&g);
		sched_plan_free(&b);
	}
	printf("best/greedy over %d simulated nights: mean %.4f, worst %.4f, "
	    "largest %.4f, above greedy on %d\n", n, sum / n, worst, bestr,
	    above);
	assert_true(n >= 200);
	assert_true(worst >= 1.0);
	assert_true(sum / n > 1.0);
}

static void
test_sched_bad_problem_and_alloc_failures(void **state)
{
	static struct inst in;
	struct sched_plan b;
	const char *field = NULL;
	long nalloc;

	(void)state;
	make(&in, 200, 4, 0);
	in.p.run_min = 0;
	assert_int_equal(sched_problem_check(&in.p, &field), ERRCODE_BAD_ARG);
	assert_string_equal(field, "run_min");
	assert_int_equal(sched_solve(&in.p, SCHED_BEST, &b), ERRCODE_BAD_ARG);
	in.p.run_min = 5;
	in.p.slot_s = 61.0;
	assert_int_equal(sched_problem_check(&in.p, &field), ERRCODE_BAD_ARG);
	assert_string_equal(field, "slot_s");
	in.p.slot_s = 60.0;
	/* Every allocation failing in turn: NOMEM, never a crash. */
	mem_fail_after(0);
	assert_int_equal(sched_solve(&in.p, SCHED_BEST, &b), ERRCODE_OK);
	sched_plan_free(&b);
	nalloc = mem_fail_after(0);
	for (long i = 1; i <= nalloc; i++) {
		enum errcode rc;

		mem_fail_after(i);
		rc = sched_solve(&in.p, SCHED_BEST, &b);
		mem_fail_after(0);
		assert_true(rc == ERRCODE_NOMEM || rc == ERRCODE_OK);
		sched_plan_free(&b);
	}
}

/* The same problem gives the same plan (sched.h note 5). */
static void
test_sched_deterministic(void **state)
{
	static struct inst in;
	struct sched_plan a, b;

	(void)state;
	make(&in, 600, 6, 0);
	assert_int_equal(sched_solve(&in.p, SCHED_BEST, &a), ERRCODE_OK);
	assert_int_equal(sched_solve(&in.p, SCHED_BEST, &b), ERRCODE_OK);
	assert_int_equal(a.n, b.n);
	assert_memory_equal(a.runs, b.runs, a.n * sizeof a.runs[0]);
	sched_plan_free(&a);
	sched_plan_free(&b);
}

/*
 * Precision weighting (detector.jitter_ps set): each normal point of a
 * run counts w = jitter^2 / (jitter^2 + spread^2) of an untilted one's
 * information.  The same runs evaluated with w = 1 everywhere give the
 * unweighted value exactly, with w = 0 no information at all, and with
 * w = 1/2 less than with 1; each run records its weight.
 */
static void
test_sched_precision_weight(void **state)
{
	static struct inst in;
	static double w1[MAXT * MAXS], w0[MAXT * MAXS], wh[MAXT * MAXS];
	struct sched_plan a;
	double v_null, v1, v0, vh;

	(void)state;
	make(&in, 300, 4, 0);
	in.vs.phase_weight = in.vs.orientation_weight = 1.0;
	for (size_t i = 0; i < MAXT * MAXS; i++) {
		w1[i] = 1.0;
		w0[i] = 0.0;
		wh[i] = 0.5;
	}
	assert_int_equal(sched_solve(&in.p, SCHED_GREEDY, &a), ERRCODE_OK);
	assert_true(a.n > 0);
	assert_int_equal(sched_evaluate(&in.p, a.runs, a.n, &v_null),
	    ERRCODE_OK);
	in.p.precision = w1;
	assert_int_equal(sched_evaluate(&in.p, a.runs, a.n, &v1), ERRCODE_OK);
	check_near(v1, v_null, 1e-12 * fabs(v_null), "", "w = 1: unweighted");
	in.p.precision = wh;
	assert_int_equal(sched_evaluate(&in.p, a.runs, a.n, &vh), ERRCODE_OK);
	for (size_t i = 0; i < a.n; i++)
		if (a.runs[i].target != SCHED_CALIBRATION)
			check_near(a.runs[i].precision_weight, 0.5, 0.0, "",
			    "recorded weight");
	in.p.precision = w0;
	assert_int_equal(sched_evaluate(&in.p, a.runs, a.n, &v0), ERRCODE_OK);
	check_near(v0, 0.0, 1e-12, "", "w = 0: no information");
	assert_true(vh > 0.0 && vh < v1);
	in.p.precision = NULL;
	sched_plan_free(&a);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_sched_precision_weight),
		cmocka_unit_test(test_sched_constraints_random),
		cmocka_unit_test(test_sched_equals_brute_force),
		cmocka_unit_test(test_sched_never_below_greedy),
		cmocka_unit_test(test_sched_bad_problem_and_alloc_failures),
		cmocka_unit_test(test_sched_deterministic),
	};

	return cmocka_run_group_tests(tests, NULL, NULL);
}
