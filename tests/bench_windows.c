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

#include "core/derive.h"
#include "formats/import.h"
#include "core/mem.h"
#include "formats/render_json.h"
#include "core/plan.h"
#include "core/window.h"

/*
 * Not a test: it prints timings.  Run from a Release or RelWithDebInfo
 * build:
 *
 *   cmake --build build --target bench_windows && ./build/tests/bench_windows
 *
 * An optional argument sets the span in days (default 365).  The site is
 * read from sample-site/ under MOONRANGE_SOURCE_DIR (default: the source
 * tree it was built from).
 */

#define MJD0 2400000.5

static double
now_s(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_MONOTONIC, &ts);
	return (double)ts.tv_sec + (double)ts.tv_nsec * 1e-9;
}

/* A whole file into a new buffer (caller frees), or NULL. */
static char *
slurp(const char *dir, const char *name, size_t *len)
{
	char path[1024];
	FILE *f;
	char *buf;
	long n;

	snprintf(path, sizeof path, "%s/sample-site/%s", dir, name);
	if ((f = fopen(path, "rb")) == NULL)
		return NULL;
	fseek(f, 0, SEEK_END);
	n = ftell(f);
	fseek(f, 0, SEEK_SET);
	buf = malloc((size_t)n + 1);
	if (buf != NULL && fread(buf, 1, (size_t)n, f) != (size_t)n) {
		free(buf);
		buf = NULL;
	}
	fclose(f);
	if (buf != NULL)
		buf[n] = '\0';
	*len = (size_t)n;
	return buf;
}

struct load {
	struct site_station st;
	struct site_target tg[WINDOW_MAX_TARGETS];
	size_t nt;
	struct site_attempt *at;
	size_t na, cap;
};

static enum errcode
on_target(void *ctx, const struct site_target *t, size_t line)
{
	struct load *l = ctx;

	(void)line;
	if (l->nt < WINDOW_MAX_TARGETS && t->active)
		l->tg[l->nt++] = *t;
	return ERRCODE_OK;
}

static enum errcode
on_attempt(void *ctx, const struct site_attempt *a, size_t line)
{
	struct load *l = ctx;

	(void)line;
	for (size_t j = 0; j < l->nt; j++)
		if (strcmp(l->tg[j].id, a->target) == 0 && l->na < l->cap) {
			l->at[l->na] = *a;
			if (derive_attempt(&l->st, &l->tg[j], NULL,
			    &l->at[l->na]) == ERRCODE_OK)
				l->na++;
		}
	return ERRCODE_OK;
}

/* Station, targets and log of sample-site/ (invented demo data). */
static int
site_load(const char *dir, struct load *l)
{
	struct import_report rep;
	size_t n;
	char *b;

	memset(&rep, 0, sizeof rep);
	if ((b = slurp(dir, "station.ini", &n)) == NULL ||
	    import_station_ini(b, n, &l->st, &rep) != ERRCODE_OK)
		return -1;
	free(b);
	if ((b = slurp(dir, "targets.csv", &n)) == NULL ||
	    import_targets_csv(b, n, on_target, l, &rep) != ERRCODE_OK)
		return -1;
	free(b);
	l->cap = 4096;
	l->at = calloc(l->cap, sizeof l->at[0]);
	if (l->at == NULL || (b = slurp(dir, "attempts.csv", &n)) == NULL ||
	    import_attempts_csv(b, n, on_attempt, l, &rep) != ERRCODE_OK)
		return -1;
	free(b);
	return 0;
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
	struct geom_target body[WINDOW_MAX_TARGETS];
	struct window_target wt[WINDOW_MAX_TARGETS];
	struct window_limits lim;
	double open[WINDOW_MAX_TARGETS];
	size_t slot[WINDOW_MAX_TARGETS];
	size_t n = 0;
	int nb = q->settings.nbins;
	double mean = score_bin_mean(r->pooled, nb);

	(void)derive_site(&q->station, &site);
	lim.min_el = q->station.min_el_deg * ERFA_DD2R;
	lim.max_sun_el = q->station.max_sun_el_deg * ERFA_DD2R;
	lim.min_sun_sep = q->station.min_sun_sep_deg * ERFA_DD2R;
	for (int j = 0; j < (int)q->ntargets; j++) {
		(void)geom_target_from_selen(q->targets[j].lat_deg * ERFA_DD2R,
		    q->targets[j].lon_deg * ERFA_DD2R,
		    q->targets[j].height_m, &body[j]);
		wt[j].body = &body[j];
		wt[j].dark_only = q->targets[j].dark_only;
		open[j] = -1;
	}
	for (double t = q->from_mjd; t <= q->to_mjd; t += 60.0 / 86400.0) {
		struct geom_instant g;

		if (geom_instant_at(&site, NULL, MJD0, t, GEOM_PREC_FULL, &g))
			continue;
		for (int j = 0; j < (int)q->ntargets; j++) {
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
					    score_range_factor(v.range) *
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
	static struct load l;
	struct plan_query q;
	struct plan_result r;
	static struct naive_window nw[40000];
	const char *dir = getenv("MOONRANGE_SOURCE_DIR");
	double days = argc > 1 ? atof(argv[1]) : 365.0;
	double t0, t1, t2, fast, slow, sum_d = 0, max_d = 0;
	size_t nn, matched = 0;
	char err[200];

	if (!(days > 0 && days <= 3660)) {
		fprintf(stderr, "usage: bench_windows [DAYS]\n");
		return 2;
	}
	if (dir == NULL)
		dir = MOONRANGE_SOURCE_DIR;
	render_json_setup();
	if (site_load(dir, &l) != 0) {
		fprintf(stderr, "cannot read %s/sample-site\n", dir);
		return 1;
	}
	plan_query_init(&q);
	q.station = l.st;
	q.targets = l.tg;
	q.ntargets = l.nt;
	q.attempts = l.at;
	q.nattempts = l.na;
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
			if (strcmp(r.w[k].target, l.tg[nw[i].target].id) == 0)
				best = fmin(best, fabs(r.w[k].start_mjd -
				    nw[i].start));
		if (best * 86400.0 <= 60.0) {
			matched++;
			sum_d += best * 86400.0;
			max_d = fmax(max_d, best * 86400.0);
		}
	}
	printf("sample site (invented): %s, %zu targets, %zu logged attempts\n",
	    l.st.name, l.nt, l.na);
	printf("span %.0f days from 2027-01-01\n", days);
	printf("planner (track + edges + scores + ranking): %8.3f s, %zu "
	    "windows\n", fast, r.total);
	printf("naive 1-min full-precision baseline:        %8.3f s, %zu "
	    "windows\n", slow, nn);
	printf("speed-up: %.1fx\n", slow / fast);
	printf("naive windows matched within 60 s: %zu of %zu (mean start "
	    "offset %.1f s, max %.1f s)\n", matched, nn,
	    matched ? sum_d / (double)matched : 0.0, max_d);
	plan_result_free(&r);
	free(l.at);
	return 0;
}
