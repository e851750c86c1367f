/* SPDX-License-Identifier: BSD-3-Clause */
/* bench_windows.c: a year of windows and ranking for the invented demo
   site, timed beside a naive 1-minute full-precision baseline. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include <erfa.h>
#include <erfam.h>

#include "derive.h"
#include "mem.h"
#include "plan.h"
#include "window.h"

/*
 * Not a test: it prints timings.  Run from a Release or RelWithDebInfo
 * build:
 *
 *   cmake --build build --target bench_windows && ./build/tests/bench_windows
 *
 * An optional argument sets the span in days (default 365).
 */

#define MJD0 2400000.5
#define NT 4

static double
now_s(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_MONOTONIC, &ts);
	return (double)ts.tv_sec + (double)ts.tv_nsec * 1e-9;
}

/* The invented demo station and targets (cf. cmd_ephem.c's demo). */
static void
site_make(struct site_station *st, struct site_target *tg)
{
	static const struct {
		const char *id;
		double lat, lon, strength;
		int dark;
	} t[NT] = {
		{"NORTH", 12.5, -8.25, 1.0, 0},
		{"SOUTH", -21.75, 14.5, 0.7, 0},
		{"EAST", 4.2, 33.9, 0.4, 1},
		{"WEST", -2.8, -37.1, 0.5, 0},
	};

	memset(st, 0, sizeof *st);
	snprintf(st->name, sizeof st->name, "Kestrel Ridge (demo)");
	st->lat_deg = 38.9712;
	st->lon_deg = -114.3098;
	st->height_m = 2950.0;
	snprintf(st->time_zone, sizeof st->time_zone, "America/Los_Angeles");
	st->min_el_deg = 20.0;
	st->max_sun_el_deg = -12.0;
	st->min_sun_sep_deg = 20.0;
	st->pressure_hpa = 710.0;
	st->temperature_c = 5.0;
	st->humidity = 0.3;
	st->wavelength_nm = 532.0;
	st->zenith_tau = 0.12;
	st->fire_rate_hz = 20.0;
	memset(tg, 0, NT * sizeof tg[0]);
	for (int j = 0; j < NT; j++) {
		snprintf(tg[j].id, sizeof tg[j].id, "%s", t[j].id);
		tg[j].lat_deg = t[j].lat;
		tg[j].lon_deg = t[j].lon;
		tg[j].strength = t[j].strength;
		tg[j].dark_only = t[j].dark;
		tg[j].active = 1;
	}
}

struct naive_window {
	int target;
	double start, end, score;
};

/*
 * The baseline: the full IAU 2006/2000A chain at every minute, every
 * constraint at every sample, windows as runs of good samples, scores as
 * 1-minute sums of R W.
 */
static size_t
naive(const struct plan_query *q, const struct plan_result *r,
    struct naive_window *out, size_t cap)
{
	struct geom_site site;
	struct geom_target body[NT];
	struct window_target wt[NT];
	struct window_limits lim;
	double open[NT];
	size_t slot[NT];
	size_t n = 0;
	int nb = q->settings.nbins;
	double mean = score_bin_mean(r->pooled, nb);

	(void)derive_site(&q->station, &site);
	lim.min_el = q->station.min_el_deg * ERFA_DD2R;
	lim.max_sun_el = q->station.max_sun_el_deg * ERFA_DD2R;
	lim.min_sun_sep = q->station.min_sun_sep_deg * ERFA_DD2R;
	for (int j = 0; j < NT; j++) {
		(void)geom_target_from_selen(q->targets[j].lat_deg * ERFA_DD2R,
		    q->targets[j].lon_deg * ERFA_DD2R, 0.0, &body[j]);
		wt[j].body = &body[j];
		wt[j].dark_only = q->targets[j].dark_only;
		open[j] = -1;
	}
	for (double t = q->from_mjd; t <= q->to_mjd; t += 60.0 / 86400.0) {
		struct geom_instant g;

		if (geom_instant_at(&site, NULL, MJD0, t, GEOM_PREC_FULL, &g))
			continue;
		for (int j = 0; j < NT; j++) {
			int ok = window_constraints_hold(&g, &lim, &wt[j]);

			if (ok) {
				struct geom_target_view v;
				const struct score_yield *y = &r->models[j].y;
				int b = score_bin_of(g.moon.synodic * ERFA_DR2D,
				    nb);

				geom_target_view(&g, &body[j], &v);
				if (open[j] < 0) {
					open[j] = t;
					slot[j] = n++;
					if (slot[j] < cap) {
						out[slot[j]].target = j;
						out[slot[j]].start = t;
						out[slot[j]].end = q->to_mjd;
						out[slot[j]].score = 0;
					}
				}
				if (slot[j] < cap)
					out[slot[j]].score += 60.0 *
					    q->station.fire_rate_hz * y->rate *
					    score_transmission(
					    q->station.zenith_tau, v.el) *
					    (v.sunlit ? y->sunlit_factor : 1) *
					    score_coverage_weight(r->pooled[b],
					    mean, q->settings.k,
					    q->settings.alpha);
			} else if (open[j] >= 0) {
				if (slot[j] < cap)
					out[slot[j]].end = t;
				open[j] = -1;
			}
		}
	}
	return n;
}

int
main(int argc, char **argv)
{
	struct site_station st;
	struct site_target tg[NT];
	struct site_normal_point np[240];
	struct plan_query q;
	struct plan_result r;
	static struct naive_window nw[40000];
	double days = argc > 1 ? atof(argv[1]) : 365.0;
	double t0, t1, t2, fast, slow, sum_d = 0, max_d = 0;
	size_t nn, matched = 0;
	char err[200];

	if (!(days > 0 && days <= 3660)) {
		fprintf(stderr, "usage: bench_windows [DAYS]\n");
		return 2;
	}
	mem_install();
	site_make(&st, tg);
	memset(np, 0, sizeof np);
	for (int i = 0; i < 240; i++) {	/* bunched at the quarters */
		snprintf(np[i].target, sizeof np[i].target, "%s", tg[i % NT].id);
		np[i].synodic_deg = (i % 2 ? 90.0 : 270.0) + (i % 21) - 10.0;
	}
	plan_query_init(&q);
	q.station = st;
	q.targets = tg;
	q.ntargets = NT;
	q.nps = np;
	q.nnps = 240;
	q.from_mjd = 61406.0;	/* 2027-01-01 */
	q.to_mjd = q.from_mjd + days;

	t0 = now_s();
	if (plan_run(&q, &r, err, sizeof err) != ERRCODE_OK) {
		fprintf(stderr, "plan_run: %s\n", err);
		return 1;
	}
	t1 = now_s();
	nn = naive(&q, &r, nw, sizeof nw / sizeof nw[0]);
	t2 = now_s();
	fast = t1 - t0;
	slow = t2 - t1;

	/* Agreement: each naive window against the planner's of the same
	   target whose start is nearest. */
	for (size_t i = 0; i < nn && i < sizeof nw / sizeof nw[0]; i++) {
		double best = 1e9;

		for (size_t k = 0; k < r.n; k++)
			if (strcmp(r.w[k].target, tg[nw[i].target].id) == 0)
				best = fmin(best, fabs(r.w[k].start_mjd -
				    nw[i].start));
		if (best * 86400.0 <= 60.0) {
			matched++;
			sum_d += best * 86400.0;
			max_d = fmax(max_d, best * 86400.0);
		}
	}
	printf("span %.0f days, %d targets, invented demo station\n", days, NT);
	printf("planner (track + edges + scores + ranking): %8.3f s, %zu "
	    "windows\n", fast, r.total);
	printf("naive 1-min full-precision baseline:        %8.3f s, %zu "
	    "windows\n", slow, nn);
	printf("speed-up: %.1fx\n", slow / fast);
	printf("naive windows matched within 60 s: %zu of %zu (mean start "
	    "offset %.1f s, max %.1f s)\n", matched, nn,
	    matched ? sum_d / (double)matched : 0.0, max_d);
	plan_result_free(&r);
	return 0;
}
