/* SPDX-License-Identifier: BSD-3-Clause */
/* bench_sched.c: a benchmark, not a test: the night plan of the sample
   station with 8 targets (a night of 14 h on a one-minute grid), best and
   greedy, timed over repeated runs; prints times and ratios. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "core/night.h"
#include "sample_targets.h"
#include "core/tscale.h"

static const struct {
	const char *id;
	double lat, lon, h, strength;
} targets[SAMPLE_TARGETS_N] = SAMPLE_TARGETS;

static double
seconds(void)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

int
main(int argc, char **argv)
{
	static struct site_target tg[8];
	struct plan_query q;
	struct night_settings s;
	struct night_result r;
	double u1, u2, t0, tb = 0, tg_ = 0, vb = 0, vg = 0;
	int reps = argc > 1 ? atoi(argv[1]) : 10;
	size_t runs = 0;

	if (reps < 1)
		reps = 1;
	plan_query_init(&q);
	q.station.lat_deg = 38.9712;	/* sample-site/station.ini */
	q.station.lon_deg = -114.3098;
	q.station.height_m = 2950;
	q.station.min_el_deg = 20;
	q.station.max_sun_el_deg = -12;
	q.station.min_sun_sep_deg = 30;
	q.station.zenith_tau = 0.12;
	q.station.fire_rate_hz = 20;
	for (size_t i = 0; i < 8; i++) {
		snprintf(tg[i].id, sizeof tg[i].id, "%s", targets[i].id);
		tg[i].lat_deg = targets[i].lat;
		tg[i].lon_deg = targets[i].lon;
		tg[i].height_m = targets[i].h;
		tg[i].strength = targets[i].strength;
		tg[i].active = 1;
	}
	q.targets = tg;
	q.ntargets = 8;
	if (tscale_parse_utc("2027-03-20T00:00:00Z", &u1, &u2, NULL, 0) !=
	    ERRCODE_OK)
		return 1;
	q.from_mjd = (u1 - 2400000.5) + u2;
	q.to_mjd = q.from_mjd + 14.0 / 24.0;
	night_settings_default(&s);
	for (int k = 0; k < reps; k++) {
		t0 = seconds();
		if (night_plan(&q, &s, SCHED_GREEDY, &r, NULL, 0) != ERRCODE_OK)
			return 1;
		tg_ += seconds() - t0;
		vg = r.total_value;
		night_result_free(&r);
		t0 = seconds();
		if (night_plan(&q, &s, SCHED_BEST, &r, NULL, 0) != ERRCODE_OK)
			return 1;
		tb += seconds() - t0;
		vb = r.total_value;
		runs = r.nruns;
		night_result_free(&r);
	}
	printf("night of 14 h, 8 targets, 840 one-minute slots, %d runs each\n",
	    reps);
	printf("night_plan greedy: %8.2f ms (windows, geometry, greedy)\n",
	    1e3 * tg_ / reps);
	printf("night_plan best:   %8.2f ms (the same and the search)\n",
	    1e3 * tb / reps);
	printf("search alone (best - greedy): %.2f ms; best/greedy time "
	    "%.2f\n", 1e3 * (tb - tg_) / reps, tb / tg_);
	printf("plan: %zu runs, value best %.4f, greedy %.4f (ratio %.4f)\n",
	    runs, vb, vg, vg > 0 ? vb / vg : NAN);
	return 0;
}
