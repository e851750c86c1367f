/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_bench.c: "moonrange bench", the performance jobs of the project
   timed beside a naive full-ERFA baseline and general-purpose libraries. */
#include <errno.h>
#include <fcntl.h>
#include <math.h>
#include <signal.h>
#include <spawn.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>

#include <arpa/inet.h>
#include <netinet/in.h>
#include <sys/resource.h>
#include <sys/socket.h>
#include <sys/stat.h>
#include <sys/wait.h>

#include <erfa.h>
#include <erfam.h>
#include <jansson.h>

#include "cli/bench_net.h"
#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "cli/plan_cli.h"
#include "core/fastpath.h"
#include "core/geom.h"
#include "core/plan.h"
#include "core/text.h"
#include "core/tscale.h"
#include "core/window.h"

#ifndef MOONRANGE_SOURCE_DIR
#define MOONRANGE_SOURCE_DIR "."
#endif

extern char **environ;

/* The year job of issue 13: the Moon's centre above 20 deg at a station
   at 37.2 N 3.4 W 2850 m through 2027, no Sun limits. */
#define Y_LAT 37.2
#define Y_LON (-3.4)
#define Y_H 2850.0
#define Y_FROM "2027-01-01T00:00:00Z"
#define Y_TO "2028-01-01T00:00:00Z"
#define Y_MIN_EL 20.0
#define N_MINUTES 525600
#define UNIX_MJD 40587.0

struct bench {
	int repeat;
	double naive_frac;	/* share of the year the baselines measure */
	double wrk_s;
	long attempts;
	const char *scripts, *site;
	char self[1024], tmp[256], err[300];
	int have_ephem, have_ae, have_wrk;
};

/* A line on stderr saying which job runs. */
static void
progress(const char *what)
{
	fprintf(stderr, "bench: %s\n", what);
}

/* --- timing --- */

static double
cpu_ms(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
	return (double)ts.tv_sec * 1e3 + (double)ts.tv_nsec * 1e-6;
}

static double
wall_ms(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_MONOTONIC, &ts);
	return (double)ts.tv_sec * 1e3 + (double)ts.tv_nsec * 1e-6;
}

/*
 * Run argv (argv[0] searched in PATH) with stdout to out (NULL:
 * /dev/null) and stderr to the scratch file err (NULL: /dev/null), in
 * directory dir (NULL: here).
 * *cpu: its user + system CPU, *wall its wall time, ms.  Returns its exit
 * status, or -1 when it could not start or died of a signal.
 */
static const char *errfile;	/* stderr of children, or NULL */

static int
run_child(char *const argv[], const char *out, const char *dir, double *cpu,
    double *wall)
{
	posix_spawn_file_actions_t fa;
	struct rusage r0, r1;
	pid_t pid;
	int st, rc;
	double w0 = wall_ms();
	char cwd[1024];

	if (dir != NULL && (getcwd(cwd, sizeof cwd) == NULL || chdir(dir) != 0))
		return -1;
	posix_spawn_file_actions_init(&fa);
	posix_spawn_file_actions_addopen(&fa, 1, out != NULL ? out :
	    "/dev/null", O_WRONLY | O_CREAT | O_TRUNC, 0600);
	posix_spawn_file_actions_addopen(&fa, 2, errfile != NULL ? errfile :
	    "/dev/null", O_WRONLY | O_CREAT | O_TRUNC, 0600);
	rc = posix_spawnp(&pid, argv[0], &fa, NULL, argv, environ);
	posix_spawn_file_actions_destroy(&fa);
	if (dir != NULL && chdir(cwd) != 0)
		rc = -1;
	if (rc != 0)
		return -1;
	/* The children's usage grows by this child's when it is reaped. */
	getrusage(RUSAGE_CHILDREN, &r0);
	if (waitpid(pid, &st, 0) != pid)
		return -1;
	getrusage(RUSAGE_CHILDREN, &r1);
	if (wall != NULL)
		*wall = wall_ms() - w0;
	if (cpu != NULL)
		*cpu = (double)(r1.ru_utime.tv_sec + r1.ru_stime.tv_sec -
		    r0.ru_utime.tv_sec - r0.ru_stime.tv_sec) * 1e3 +
		    (double)(r1.ru_utime.tv_usec + r1.ru_stime.tv_usec -
		    r0.ru_utime.tv_usec - r0.ru_stime.tv_usec) * 1e-3;
	return WIFEXITED(st) ? WEXITSTATUS(st) : -1;
}

/* Best (lowest) CPU and wall of repeat runs of argv; -1 if one failed. */
static int
best_child(const struct bench *b, char *const argv[], double *cpu,
    double *wall)
{
	*cpu = *wall = INFINITY;
	for (int i = 0; i < b->repeat; i++) {
		double c, w;

		if (run_child(argv, NULL, NULL, &c, &w) != 0)
			return -1;
		*cpu = fmin(*cpu, c);
		*wall = fmin(*wall, w);
	}
	return 0;
}

/* A library script's JSON answer (stdout), or NULL. */
static json_t *
run_script(const struct bench *b, char *const argv[], double *cpu)
{
	char path[512];
	json_t *j;

	snprintf(path, sizeof path, "%s/script.json", b->tmp);
	if (run_child(argv, path, b->scripts, cpu, NULL) != 0)
		return NULL;
	j = json_load_file(path, 0, NULL);
	unlink(path);
	return j;
}

/* --- events of the year job --- */

enum { EV_RISE, EV_CULM, EV_SET };

struct event {
	int kind;
	double t;		/* POSIX seconds */
	double alt;		/* deg (culminations) */
};

struct events {
	struct event *e;
	size_t n, cap;
};

static void
ev_add(struct events *v, int kind, double t, double alt)
{
	if (v->n == v->cap) {
		size_t cap = v->cap ? 2 * v->cap : 1024;
		struct event *e = mem_realloc(v->e, cap * sizeof *e);

		if (e == NULL)
			return;
		v->e = e;
		v->cap = cap;
	}
	v->e[v->n].kind = kind;
	v->e[v->n].t = t;
	v->e[v->n++].alt = alt;
}

static double
unix_of_mjd(double mjd)
{
	return (mjd - UNIX_MJD) * ERFA_DAYSEC;
}

/* Events of a library's answer. */
static void
ev_from_json(json_t *j, struct events *v)
{
	json_t *a = json_object_get(j, "events"), *x;
	size_t i;

	json_array_foreach(a, i, x) {
		const char *k = json_string_value(json_array_get(x, 0));

		if (k == NULL)
			continue;
		ev_add(v, k[0] == 'r' ? EV_RISE : k[0] == 'c' ? EV_CULM : EV_SET,
		    json_number_value(json_array_get(x, 1)),
		    json_number_value(json_array_get(x, 2)));
	}
}

/* Largest |dt| (s) of rises and sets, of culminations, and |dalt| (")
   of culminations, matching each event of a to the nearest of its kind
   in b within 1 h; *nmatch counts the matches, *nmiss the rest. */
struct disagree {
	double rs_s, culm_s, culm_as;
	size_t nmatch, nmiss;
};

static void
ev_compare(const struct events *a, const struct events *b,
    struct disagree *d)
{
	memset(d, 0, sizeof *d);
	for (size_t i = 0; i < a->n; i++) {
		const struct event *x = &a->e[i], *best = NULL;

		for (size_t k = 0; k < b->n; k++)
			if (b->e[k].kind == x->kind && fabs(b->e[k].t - x->t) <
			    3600.0 && (best == NULL || fabs(b->e[k].t - x->t) <
			    fabs(best->t - x->t)))
				best = &b->e[k];
		if (best == NULL) {
			d->nmiss++;
			continue;
		}
		d->nmatch++;
		if (x->kind == EV_CULM) {
			d->culm_s = fmax(d->culm_s, fabs(best->t - x->t));
			d->culm_as = fmax(d->culm_as, fabs(best->alt - x->alt) *
			    3600.0);
		} else {
			d->rs_s = fmax(d->rs_s, fabs(best->t - x->t));
		}
	}
}

/* A library's year job: its in-process CPU ms (NAN on failure), and its
   events into v. */
static double
script_events(const struct bench *b, char *const argv[], struct events *v)
{
	double c, ms = NAN;
	json_t *j = run_script(b, argv, &c);

	if (j != NULL) {
		ms = json_number_value(json_object_get(j, "cpu_ms"));
		ev_from_json(j, v);
		json_decref(j);
	}
	return ms;
}

/* A library script as a whole process: its best CPU ms over the runs. */
static double
best_script(const struct bench *b, char *const argv[])
{
	double best = INFINITY, c;

	for (int i = 0; i < b->repeat; i++) {
		json_t *j = run_script(b, argv, &c);

		if (j != NULL) {
			best = fmin(best, c);
			json_decref(j);
		}
	}
	return best;
}

/* --- moonrange in-process --- */

static int
year_query(struct plan_query *q, struct plan_db *hold)
{
	double f1, f2, t1, t2;
	int st = plan_cli_load(NULL, Y_LAT, Y_LON, Y_H, q, hold);

	if (st != CLI_EXIT_OK)
		return st;
	if (tscale_parse_utc(Y_FROM, &f1, &f2, NULL, 0) ||
	    tscale_parse_utc(Y_TO, &t1, &t2, NULL, 0))
		return CLI_EXIT_FAIL;
	q->station.min_el_deg = Y_MIN_EL;
	q->station.max_sun_el_deg = 90.0;
	q->station.min_sun_sep_deg = 0.0;
	q->from_mjd = (f1 - TEXT_MJD0) + f2;
	q->to_mjd = (t1 - TEXT_MJD0) + t2;
	return CLI_EXIT_OK;
}

/* The year job in this process: best CPU ms, and its events. */
static int
year_moonrange(const struct bench *b, struct events *v, double *ms)
{
	struct plan_query q;
	struct plan_db hold;
	int st = year_query(&q, &hold);

	if (st != CLI_EXIT_OK)
		return st;
	*ms = INFINITY;
	for (int k = 0; k < b->repeat; k++) {
		struct plan_result r;
		char err[256];
		double t0 = cpu_ms();

		memset(&r, 0, sizeof r);
		if (plan_run(&q, &r, err, sizeof err) != ERRCODE_OK) {
			plan_result_free(&r);
			return cli_fail("bench: %s", err);
		}
		*ms = fmin(*ms, cpu_ms() - t0);
		if (k == 0)
			for (size_t i = 0; i < r.n; i++) {
				const struct plan_window *w = &r.w[i];
				int in_a = w->start_mjd > q.from_mjd;
				int in_b = w->end_mjd < q.to_mjd;

				if (in_a)
					ev_add(v, EV_RISE,
					    unix_of_mjd(w->start_mjd), Y_MIN_EL);
				if (in_a && in_b)
					ev_add(v, EV_CULM,
					    unix_of_mjd(w->max_el_mjd),
					    w->f.max_el * ERFA_DR2D);
				if (in_b)
					ev_add(v, EV_SET,
					    unix_of_mjd(w->end_mjd), Y_MIN_EL);
			}
		plan_result_free(&r);
	}
	plan_db_free(&hold);
	return CLI_EXIT_OK;
}

/* The station of the year job. */
static void
year_site(struct geom_site *site)
{
	(void)geom_site_init(site, Y_LAT * ERFA_DD2R, Y_LON * ERFA_DD2R, Y_H,
	    NULL);
}

/* TT JD (two parts) of a POSIX time. */
static void
tt_of_unix(double u, double *tt1, double *tt2)
{
	struct tscale_instant t;

	(void)tscale_from_utc(TEXT_MJD0, UNIX_MJD + u / ERFA_DAYSEC, 0.0, &t);
	*tt1 = t.tt1;
	*tt2 = t.tt2;
}

/*
 * The naive baseline: the full chain (geom_instant_at, IAU 2006/2000A)
 * every minute over the first frac of the year; rises and sets by linear
 * interpolation between minutes, culminations by a parabola through the
 * highest minute and its neighbours.  Returns CPU ms for the measured
 * part.
 */
static double
year_naive(double frac, struct events *v)
{
	struct geom_site site;
	double u0, u1, f1, f2, t0 = cpu_ms(), prev = NAN, prev2 = NAN;
	long n;
	int up = -1;

	year_site(&site);
	(void)tscale_parse_utc(Y_FROM, &f1, &f2, NULL, 0);
	u0 = unix_of_mjd((f1 - TEXT_MJD0) + f2);
	(void)tscale_parse_utc(Y_TO, &f1, &f2, NULL, 0);
	u1 = unix_of_mjd((f1 - TEXT_MJD0) + f2);
	n = (long)((u1 - u0) / 60.0 * frac);
	for (long i = 0; i < n; i++) {
		struct geom_instant g;
		double u = u0 + 60.0 * (double)i, el;

		if (geom_instant_at(&site, NULL, TEXT_MJD0, UNIX_MJD + u /
		    ERFA_DAYSEC, GEOM_PREC_FULL, &g) != ERRCODE_OK)
			continue;
		el = g.moon.el * ERFA_DR2D - Y_MIN_EL;
		if (i > 0 && (el >= 0) != (prev >= 0)) {
			double tr = u - 60.0 * el / (el - prev);

			if (el >= 0) {
				ev_add(v, EV_RISE, tr, Y_MIN_EL);
				up = 1;
			} else {
				ev_add(v, EV_SET, tr, Y_MIN_EL);
				up = 0;
			}
		}
		if (i > 1 && up == 1 && prev > prev2 && prev >= el) {
			double den = prev2 - 2.0 * prev + el;
			double x = den != 0.0 ? 0.5 * (prev2 - el) / den : 0.0;

			ev_add(v, EV_CULM, u - 60.0 + 60.0 * x, Y_MIN_EL + prev -
			    0.25 * (prev2 - el) * x);
		}
		prev2 = prev;
		prev = el;
	}
	return cpu_ms() - t0;
}

/*
 * The 525,600 elevations through the fast path (track included): best
 * CPU ms; and the largest difference (") from the direct chain at every
 * 1000th instant in *vs_direct.
 */
static double
elev_moonrange(const struct bench *b, double *vs_direct,
    struct window_track *keep, struct window_node **keep_nodes)
{
	struct geom_site site;
	double f1, f2, best = INFINITY, sink = 0.0;
	struct tscale_instant t;
	size_t nn = window_track_nodes(N_MINUTES / 1440.0);
	struct window_node *nodes = mem_calloc(nn, sizeof *nodes);
	struct window_track tr;

	if (nodes == NULL)
		return NAN;
	year_site(&site);
	(void)tscale_parse_utc(Y_FROM, &f1, &f2, NULL, 0);
	(void)tscale_from_utc(f1, f2, 0.0, &t);
	for (int k = 0; k < b->repeat; k++) {
		double c0 = cpu_ms();

		(void)window_track_init(&tr, &site, NULL, t.tt1, t.tt2,
		    N_MINUTES / 1440.0, nodes, nn);
		for (long i = 0; i < N_MINUTES; i++) {
			struct fast_frame fr;
			double tt1, tt2;

			/* UTC minutes to TT offsets: TT-UTC is constant in
			   2027 (no leap second), as tscale_from_utc gives. */
			tt1 = t.tt1;
			tt2 = t.tt2 + (double)i / 1440.0;
			fast_frame_at(&tr.ft, (tt1 - tr.base1) + (tt2 -
			    tr.base2), 0, &fr);
			sink += fast_elevation(&tr.ft, fr.moon_itrs);
		}
		best = fmin(best, cpu_ms() - c0);
	}
	*vs_direct = 0.0;
	for (long i = 0; i < N_MINUTES; i += 1000) {
		struct geom_instant g;
		struct fast_frame fr;

		(void)geom_instant_at(&site, NULL, f1, f2 + (double)i / 1440.0,
		    GEOM_PREC_FULL, &g);
		fast_frame_at(&tr.ft, (double)i / 1440.0, 0, &fr);
		*vs_direct = fmax(*vs_direct, fabs(fast_elevation(&tr.ft,
		    fr.moon_itrs) - g.moon.el) * ERFA_DR2AS);
	}
	if (sink == 12345.678)	/* keeps the loop */
		fputc(' ', stderr);
	*keep = tr;
	*keep_nodes = nodes;
	return best;
}

/* The naive baseline of the elevations: CPU ms for n instants. */
static double
elev_naive(long n)
{
	struct geom_site site;
	double f1, f2, t0 = cpu_ms(), sink = 0.0;

	year_site(&site);
	(void)tscale_parse_utc(Y_FROM, &f1, &f2, NULL, 0);
	for (long i = 0; i < n; i++) {
		struct geom_instant g;

		if (geom_instant_at(&site, NULL, f1, f2 + (double)i / 1440.0,
		    GEOM_PREC_FULL, &g) == ERRCODE_OK)
			sink += g.moon.el;
	}
	if (sink == 12345.678)
		fputc(' ', stderr);
	return cpu_ms() - t0;
}

/* Largest |el| difference (") between a library's check list and the
   fast path on the year's track. */
static double
elev_vs(json_t *j, const struct window_track *tr)
{
	json_t *a = json_object_get(j, "check"), *x;
	size_t i;
	double worst = 0.0;

	json_array_foreach(a, i, x) {
		double u = json_number_value(json_array_get(x, 0));
		double alt = json_number_value(json_array_get(x, 1));
		double tt1, tt2;
		struct fast_frame fr;

		tt_of_unix(u, &tt1, &tt2);
		fast_frame_at(&tr->ft, (tt1 - tr->base1) + (tt2 - tr->base2), 0,
		    &fr);
		worst = fmax(worst, fabs(fast_elevation(&tr->ft, fr.moon_itrs) *
		    ERFA_DR2D - alt) * 3600.0);
	}
	return worst;
}

/* --- the big log and the daemon --- */

/* A CSV of n invented attempts on the sample site's targets. */
static int
write_big_log(const struct bench *b, const char *path)
{
	static const char *const tg[] = {"HERON", "OSPREY", "PLOVER",
	    "SANDPIPER", "TERN"};	/* the sample site's targets */
	static const char *const oc[] = {"ranged", "ranged", "no_returns",
	    "weather", "technical"};
	FILE *f = fopen(path, "w");
	unsigned long long s = 0x9E3779B97F4A7C15ULL;
	double start = 17532.0 * ERFA_DAYSEC;	/* 2018-01-01, POSIX s */

	if (f == NULL)
		return -1;
	fprintf(f, "target,start_utc,end_utc,shots,returns,normal_points,"
	    "outcome,operator,seeing_arcsec,notes\n");
	for (long i = 0; i < b->attempts; i++) {
		char a[32], z[32];
		time_t t0, t1;
		struct tm tm;
		unsigned r;

		s = s * 6364136223846793005ULL + 1442695040888963407ULL;
		r = (unsigned)(s >> 33);
		start += 600.0 + (double)(r % 1200);
		t0 = (time_t)start;
		t1 = t0 + 300 + (time_t)(r % 600);
		gmtime_r(&t0, &tm);
		strftime(a, sizeof a, "%Y-%m-%dT%H:%M:%SZ", &tm);
		gmtime_r(&t1, &tm);
		strftime(z, sizeof z, "%Y-%m-%dT%H:%M:%SZ", &tm);
		{
			const char *o = oc[(r >> 8) % 5];
			unsigned ret = o == oc[0] ? 1 + r % 40 : 0;
			unsigned np = ret < r % 3 ? ret : r % 3;

			fprintf(f, "%s,%s,%s,%u,%u,%u,%s,op-bench,1.%u,\n",
			    tg[r % 5], a, z, 2000 + r % 3000, ret, np, o,
			    r % 9);
		}
	}
	return fclose(f) == 0 ? 0 : -1;
}

struct wrk_result {
	double rps, p99_ms;
	long timeouts, errors;
	int ok;
};

/* wrk on one URL: 2 threads, 16 connections, b->wrk_s seconds. */
static void
run_wrk(const struct bench *b, const char *url, struct wrk_result *w)
{
	char d[32], path[512], line[512];
	char *argv[] = {"wrk", "-t2", "-c16", d, "--timeout", "2s",
	    "--latency", (char *)url, NULL};
	FILE *f;

	memset(w, 0, sizeof *w);
	snprintf(d, sizeof d, "-d%.0fs", b->wrk_s);
	snprintf(path, sizeof path, "%s/wrk.txt", b->tmp);
	if (run_child(argv, path, NULL, NULL, NULL) != 0 ||
	    (f = fopen(path, "r")) == NULL)
		return;
	while (fgets(line, sizeof line, f) != NULL) {
		char *p = line;
		long c, r, wr, to;

		while (*p == ' ')
			p++;
		if (strncmp(p, "Requests/sec:", 13) == 0) {
			w->rps = strtod(p + 13, NULL);
			w->ok = 1;
		} else if (strncmp(p, "99%", 3) == 0) {
			w->p99_ms = bench_wrk_ms(p + 3 + strspn(p + 3, " "));
		} else if (sscanf(p, "Socket errors: connect %ld, read %ld, "
		    "write %ld, timeout %ld", &c, &r, &wr, &to) == 4) {
			w->timeouts = to;
			w->errors = c + r + wr;
		} else if (strncmp(p, "Non-2xx", 7) == 0) {
			w->errors += strtol(p + strcspn(p, "0123456789"), NULL,
			    10);
		}
	}
	fclose(f);
	unlink(path);
}

/* One daemon line: wrk on url, its rate, p99 and failures. */
static void
wrk_row(const struct bench *b, const char *job, const char *url)
{
	struct wrk_result wr;
	char a[64], d[128];

	progress(job);
	run_wrk(b, url, &wr);
	snprintf(a, sizeof a, !wr.ok ? "wrk failed" : wr.rps > 0.0 ?
	    "%.1f req/s" : "no answer in the run", wr.rps);
	snprintf(d, sizeof d, "p99 %.2f ms, %ld time-outs, %ld errors",
	    wr.p99_ms, wr.timeouts, wr.errors);
	printf("| %s | %s | - | - | - | - | %s |\n", job, a, d);
	fflush(stdout);
}

/* --- the table --- */

static void
cell_ms(char *buf, size_t len, double ms)
{
	if (!isfinite(ms))
		snprintf(buf, len, "-");
	else if (ms >= 1000.0)
		snprintf(buf, len, "%.2f s", ms / 1e3);
	else if (ms >= 10.0)
		snprintf(buf, len, "%.0f ms", ms);
	else
		snprintf(buf, len, "%.1f ms", ms);
}

static void
row(const char *job, const char *mr, const char *naive, const char *pe,
    const char *ae, const char *ratio, const char *dis)
{
	printf("| %s | %s | %s | %s | %s | %s | %s |\n", job, mr, naive, pe, ae,
	    ratio, dis);
	fflush(stdout);
}

/* "a / b x" or "-". */
static void
cell_ratio(char *buf, size_t len, double lib, double ours)
{
	if (isfinite(lib) && isfinite(ours) && ours > 0.0)
		snprintf(buf, len, "%.1fx", lib / ours);
	else
		snprintf(buf, len, "-");
}

/* --- the jobs --- */

static int
jobs_libraries(struct bench *b)
{
	struct events ours = {0}, naive = {0}, pe = {0}, ae = {0};
	struct disagree dn, dp, da;
	double ms, naive_ms, pe_ms = NAN, ae_ms = NAN, pe_proc = NAN;
	double ae_proc = NAN, mr_proc, mr_wall, c;
	char rep[8], a[64], z[64], n1[64], r[64], d[512], lat[16], lon[16];
	char h[16], el[16], nmin[16], nsub[16], s1000[16], s100[16];
	struct window_track tr;
	struct window_node *nodes = NULL;
	double vs_direct = NAN, pe_vs = NAN, ae_vs = NAN;
	long nsub_n = (long)(N_MINUTES * b->naive_frac);
	int st;

	snprintf(rep, sizeof rep, "%d", b->repeat);
	snprintf(lat, sizeof lat, "%.1f", Y_LAT);
	snprintf(lon, sizeof lon, "%.1f", Y_LON);
	snprintf(h, sizeof h, "%.0f", Y_H);
	snprintf(el, sizeof el, "%.0f", Y_MIN_EL);
	snprintf(nmin, sizeof nmin, "%d", N_MINUTES);
	snprintf(nsub, sizeof nsub, "%ld", nsub_n);
	snprintf(s1000, sizeof s1000, "1000");
	snprintf(s100, sizeof s100, "%ld", (long)(1000 * b->naive_frac));

	progress("the year job in this process");
	if ((st = year_moonrange(b, &ours, &ms)) != CLI_EXIT_OK)
		return st;
	progress("the year job, naive baseline");
	naive_ms = year_naive(b->naive_frac, &naive) / b->naive_frac;
	if (b->have_ephem) {
		char *argv[] = {"/usr/bin/python3", "bench_pyephem.py", "year",
		    lat, lon, h, Y_FROM, Y_TO, el, rep, NULL};

		progress("the year job, PyEphem");
		pe_ms = script_events(b, argv, &pe);
	}
	if (b->have_ae) {
		char *argv[] = {"node", "bench_astro.mjs", "year", lat, lon, h,
		    Y_FROM, Y_TO, el, rep, NULL};

		progress("the year job, astronomy-engine");
		ae_ms = script_events(b, argv, &ae);
	}
	printf("| job | moonrange | naive baseline (full ERFA every minute) "
	    "| PyEphem | astronomy-engine | faster library / moonrange | "
	    "largest disagreement |\n|---|---|---|---|---|---|---|\n");
	cell_ms(a, sizeof a, ms);
	cell_ms(n1, sizeof n1, naive_ms);
	cell_ms(z, sizeof z, pe_ms);
	cell_ms(r, sizeof r, ae_ms);
	ev_compare(&ours, &pe, &dp);
	ev_compare(&ours, &ae, &da);
	ev_compare(&ours, &naive, &dn);
	snprintf(d, sizeof d, "%zu events; PyEphem: rise/set %.2f s, "
	    "culmination %.1f s and %.2f\" (%zu unmatched); astronomy-engine: "
	    "rise/set %.2f s, culmination %.1f s and %.2f\" (%zu unmatched); "
	    "naive (its %.0f days): rise/set %.2f s, culmination %.1f s",
	    ours.n, dp.rs_s, dp.culm_s, dp.culm_as, dp.nmiss, da.rs_s,
	    da.culm_s, da.culm_as, da.nmiss, 365.0 * b->naive_frac, dn.rs_s,
	    dn.culm_s);
	{
		char ratio[64], nn2[80];

		cell_ratio(ratio, sizeof ratio, isfinite(pe_ms) && isfinite(ae_ms)
		    ? fmin(pe_ms, ae_ms) : isfinite(pe_ms) ? pe_ms : ae_ms, ms);
		snprintf(nn2, sizeof nn2, "%s (%.0f days x %.0f)", n1,
		    365.0 * b->naive_frac, 1.0 / b->naive_frac);
		row("a year (2027) of Moon-centre 20 deg windows at 37.2 N "
		    "3.4 W 2850 m, in-process", a, nn2, b->have_ephem ? z :
		    "not installed", b->have_ae ? r : "not installed", ratio, d);
	}

	/* Whole process: moonrange and the libraries' scripts, one run each
	   time (best of repeat), start-up included. */
	progress("the year job as whole processes");
	{
		char *argv[] = {b->self, "windows", "--station", "37.2,-3.4,2850",
		    "--from", Y_FROM, "--to", Y_TO, "--min-el", "20",
		    "--max-sun-el", "90", "--min-sun-sep", "0", "--json", NULL};
		char one[] = "1", ratio[64];

		if (best_child(b, argv, &mr_proc, &mr_wall) != 0)
			return cli_fail("bench: the windows command failed");
		if (b->have_ephem) {
			char *pv[] = {"/usr/bin/python3", "bench_pyephem.py",
			    "year", lat, lon, h, Y_FROM, Y_TO, el, one, NULL};

			pe_proc = best_script(b, pv);
		}
		if (b->have_ae) {
			char *av[] = {"node", "bench_astro.mjs", "year", lat, lon,
			    h, Y_FROM, Y_TO, el, one, NULL};

			ae_proc = best_script(b, av);
		}
		cell_ms(a, sizeof a, mr_proc);
		cell_ms(z, sizeof z, pe_proc);
		cell_ms(r, sizeof r, ae_proc);
		cell_ratio(ratio, sizeof ratio, fmin(pe_proc, ae_proc), mr_proc);
		snprintf(d, sizeof d, "wall %.0f ms for moonrange", mr_wall);
		row("the same, whole process (start-up included)", a, "-",
		    b->have_ephem ? z : "not installed", b->have_ae ? r :
		    "not installed", ratio, d);
	}

	/* 525,600 elevations. */
	progress("525,600 elevations");
	ms = elev_moonrange(b, &vs_direct, &tr, &nodes);
	naive_ms = elev_naive(nsub_n) / b->naive_frac;
	if (b->have_ephem) {
		char *argv[] = {"/usr/bin/python3", "bench_pyephem.py", "elev",
		    lat, lon, h, Y_FROM, nsub, s100, rep, NULL};
		json_t *j = run_script(b, argv, &c);

		if (j != NULL) {
			pe_ms = json_number_value(json_object_get(j, "cpu_ms")) /
			    b->naive_frac;
			pe_vs = elev_vs(j, &tr);
			json_decref(j);
		}
	}
	if (b->have_ae) {
		char *argv[] = {"node", "bench_astro.mjs", "elev", lat, lon, h,
		    Y_FROM, nmin, s1000, rep, NULL};
		json_t *j = run_script(b, argv, &c);

		if (j != NULL) {
			ae_ms = json_number_value(json_object_get(j, "cpu_ms"));
			ae_vs = elev_vs(j, &tr);
			json_decref(j);
		}
	}
	{
		char ratio[64], per[64], nn2[96], pe2[96], ae2[96], a2[160];

		snprintf(per, sizeof per, "%.0f ns each",
		    ms * 1e6 / N_MINUTES);
		cell_ms(a, sizeof a, ms);
		snprintf(a2, sizeof a2, "%s (%s)", a, per);
		cell_ms(n1, sizeof n1, naive_ms);
		snprintf(nn2, sizeof nn2, "%s (%.0f us each)", n1,
		    naive_ms * 1e3 / N_MINUTES);
		cell_ms(z, sizeof z, pe_ms);
		snprintf(pe2, sizeof pe2, "%s (%.1f us each)", z,
		    pe_ms * 1e3 / N_MINUTES);
		cell_ms(r, sizeof r, ae_ms);
		snprintf(ae2, sizeof ae2, "%s (%.1f us each)", r,
		    ae_ms * 1e3 / N_MINUTES);
		cell_ratio(ratio, sizeof ratio, isfinite(pe_ms) &&
		    isfinite(ae_ms) ? fmin(pe_ms, ae_ms) : isfinite(pe_ms) ?
		    pe_ms : ae_ms, ms);
		snprintf(d, sizeof d, "elevation vs the direct ERFA chain "
		    "%.4f\"; vs PyEphem %.2f\"; vs astronomy-engine %.2f\"",
		    vs_direct, pe_vs, ae_vs);
		row("Moon topocentric elevation at 525,600 one-minute instants "
		    "(fit included)", a2, nn2, b->have_ephem ? pe2 :
		    "not installed", b->have_ae ? ae2 : "not installed", ratio,
		    d);
	}
	mem_free(nodes);
	mem_free(ours.e);
	mem_free(naive.e);
	mem_free(pe.e);
	mem_free(ae.e);
	return CLI_EXIT_OK;
}

/* The first line of the last child's stderr into buf. */
static void
child_error(char *buf, size_t len)
{
	FILE *f = errfile != NULL ? fopen(errfile, "r") : NULL;

	buf[0] = '\0';
	if (f != NULL) {
		if (fgets(buf, (int)len, f) != NULL)
			buf[strcspn(buf, "\n|")] = '\0';
		fclose(f);
	}
}

/* One moonrange command as a whole process: best CPU, and wall. */
static int
job_cmd(const struct bench *b, const char *job, char *const argv[])
{
	double c, w;
	char a[64], d[256];

	progress(job);
	if (best_child(b, argv, &c, &w) != 0) {
		child_error(d, sizeof d);
		row(job, "failed", "-", "-", "-", "-", d);
		return -1;
	}
	cell_ms(a, sizeof a, c);
	snprintf(d, sizeof d, "wall %.0f ms", w);
	row(job, a, "-", "-", "-", "-", d);
	return 0;
}

static int
jobs_site(struct bench *b)
{
	char db[512], big[512], csv[512], port_s[32], listen[64], url[128];
	char a[64], d[256], ncsv[32];
	double c, w;
	pid_t pid = 0;
	int port;

	snprintf(db, sizeof db, "%s/site.db", b->tmp);
	snprintf(big, sizeof big, "%s/big.db", b->tmp);
	snprintf(csv, sizeof csv, "%s/big.csv", b->tmp);
	{
		char *argv[] = {b->self, "init", "--db", db, "--site",
		    (char *)b->site, NULL};
		char *argv2[] = {b->self, "init", "--db", big, "--site",
		    (char *)b->site, NULL};

		if (run_child(argv, NULL, NULL, NULL, NULL) != 0 ||
		    run_child(argv2, NULL, NULL, NULL, NULL) != 0)
			return cli_fail("bench: cannot initialise a database "
			    "from %s", b->site);
	}
	{
		char *y1[] = {b->self, "windows", "--db", db, "--from",
		    "2027-01-01T00:00:00Z", "--days", "365", "--json", NULL};
		char *y10[] = {b->self, "windows", "--db", db, "--from",
		    "2027-01-01T00:00:00Z", "--days", "3650", "--json", NULL};
		char *cov[] = {b->self, "coverage", "--db", db, NULL};
		char *d3[] = {b->self, "windows", "--db", db, "--from",
		    "2027-03-14T00:00:00Z", "--days", "3", "--json", NULL};

		job_cmd(b, "`windows --db` on the sample site, 1 year", y1);
		job_cmd(b, "`windows --db` on the sample site, 10 years", y10);
		job_cmd(b, "`coverage` on the sample site (fill dates, 60-day "
		    "horizon)", cov);
		job_cmd(b, "`windows --db` over 3 days, sample site", d3);
	}
	progress("writing the big log");
	if (write_big_log(b, csv) != 0)
		return cli_fail("bench: cannot write %s", csv);
	snprintf(ncsv, sizeof ncsv, "%ld", b->attempts);
	{
		char *imp[] = {b->self, "log", "import", "--db", big, csv, NULL};
		char job[96];

		snprintf(job, sizeof job, "`log import` of %s attempts", ncsv);
		progress(job);
		if (run_child(imp, NULL, NULL, &c, &w) != 0) {
			child_error(d, sizeof d);
			row(job, "failed", "-", "-", "-", "-", d);
		} else {
			cell_ms(a, sizeof a, c);
			snprintf(d, sizeof d, "wall %.2f s (run once)", w / 1e3);
			row(job, a, "-", "-", "-", "-", d);
		}
	}
	{
		char *d3[] = {b->self, "windows", "--db", big, "--from",
		    "2027-03-14T00:00:00Z", "--days", "3", "--json", NULL};
		char job[96];

		snprintf(job, sizeof job, "`windows --db` over 3 days with a "
		    "%s-attempt log", ncsv);
		job_cmd(b, job, d3);
	}
	if (!b->have_wrk) {
		row("daemon lines", "wrk not installed", "-", "-", "-", "-", "-");
		return CLI_EXIT_OK;
	}
	port = bench_free_port();
	snprintf(port_s, sizeof port_s, "%d", port);
	snprintf(listen, sizeof listen, "127.0.0.1:%d", port);
	{
		char *argv[] = {b->self, "serve", "--db", big, "--listen", listen,
		    "--log-level", "error", NULL};
		posix_spawn_file_actions_t fa;

		progress("starting the daemon on the big log");
		posix_spawn_file_actions_init(&fa);
		posix_spawn_file_actions_addopen(&fa, 1, "/dev/null", O_WRONLY,
		    0);
		posix_spawn_file_actions_addopen(&fa, 2, "/dev/null", O_WRONLY,
		    0);
		if (port == 0 || posix_spawn(&pid, b->self, &fa, NULL, argv,
		    environ) != 0)
			pid = 0;
		posix_spawn_file_actions_destroy(&fa);
	}
	if (pid == 0 || !bench_wait_port(port)) {
		row("daemon lines", "the daemon did not start", "-", "-", "-",
		    "-", "-");
	} else {
		char job[128];

		snprintf(url, sizeof url, "http://127.0.0.1:%d/api/v1/now", port);
		snprintf(job, sizeof job, "daemon `GET /api/v1/now`, 16 "
		    "connections, %.0f s", b->wrk_s);
		wrk_row(b, job, url);
		snprintf(url, sizeof url,
		    "http://127.0.0.1:%d/api/v1/windows?days=3", port);
		snprintf(job, sizeof job, "daemon `GET /api/v1/windows?days=3` "
		    "with a %s-attempt log, 16 connections, %.0f s", ncsv,
		    b->wrk_s);
		wrk_row(b, job, url);
		snprintf(a, sizeof a, "%.1f MB", bench_peak_rss_mb(pid));
		snprintf(job, sizeof job, "daemon peak resident memory (VmHWM) "
		    "with a %s-attempt log", ncsv);
		row(job, a, "-", "-", "-", "-", "after the runs above");
	}
	if (pid != 0) {
		kill(pid, SIGTERM);
		waitpid(pid, NULL, 0);
	}
	(void)port_s;
	return CLI_EXIT_OK;
}

/* Remove the scratch directory's files and the directory. */
static void
cleanup(const struct bench *b)
{
	static const char *const files[] = {"site.db", "big.db", "big.csv",
	    "big.db-wal", "big.db-shm", "site.db-wal", "site.db-shm",
	    "script.json", "wrk.txt", "stderr.txt"};
	char path[600];

	for (size_t i = 0; i < sizeof files / sizeof files[0]; i++) {
		snprintf(path, sizeof path, "%s/%s", b->tmp, files[i]);
		unlink(path);
	}
	rmdir(b->tmp);
}

static int
have(const char *dir, char *const argv[])
{
	return run_child(argv, NULL, dir, NULL, NULL) == 0;
}

int
cmd_bench(const struct cli_args *a)
{
	struct bench b;
	ssize_t n;
	int st;
	char ae_pkg[600];
	struct stat sb;

	memset(&b, 0, sizeof b);
	b.repeat = (int)cli_whole(a, "repeat", 3);
	b.naive_frac = cli_real(a, "naive-share", 0.1);
	b.wrk_s = cli_real(a, "seconds", 5.0);
	b.attempts = cli_whole(a, "attempts", 200000);
	b.scripts = cli_text(a, "scripts", MOONRANGE_SOURCE_DIR "/bench");
	b.site = cli_text(a, "site", MOONRANGE_SOURCE_DIR "/sample-site");
	n = readlink("/proc/self/exe", b.self, sizeof b.self - 1);
	if (n <= 0)
		return cli_fail("bench: cannot find this program's path");
	b.self[n] = '\0';
	snprintf(b.tmp, sizeof b.tmp, "%s/moonrange-bench.XXXXXX",
	    getenv("TMPDIR") != NULL ? getenv("TMPDIR") : "/tmp");
	if (mkdtemp(b.tmp) == NULL)
		return cli_fail("bench: cannot make a scratch directory: %s",
		    strerror(errno));
	snprintf(b.err, sizeof b.err, "%s/stderr.txt", b.tmp);
	errfile = b.err;
	{
		char *pe[] = {"/usr/bin/python3", "-c", "import ephem", NULL};
		char *wrk[] = {"wrk", "--version", NULL};

		b.have_ephem = have(NULL, pe);
		snprintf(ae_pkg, sizeof ae_pkg,
		    "%s/node_modules/astronomy-engine/package.json", b.scripts);
		if (stat(ae_pkg, &sb) == 0) {
			char *nd[] = {"node", "--version", NULL};

			b.have_ae = have(NULL, nd);
		}
		/* wrk --version exits 1 after printing its version. */
		b.have_wrk = run_child(wrk, NULL, NULL, NULL, NULL) >= 0;
	}
	printf("moonrange bench: best of %d, times are CPU (user + system) "
	    "of the process unless marked wall; %ld processors online\n\n",
	    b.repeat, sysconf(_SC_NPROCESSORS_ONLN));
	if (!b.have_ephem)
		printf("PyEphem: not installed (Debian python3-ephem, for "
		    "/usr/bin/python3)\n");
	if (!b.have_ae)
		printf("astronomy-engine: not installed (cd %s && npm ci)\n",
		    b.scripts);
	if (!b.have_wrk)
		printf("wrk: not installed (Debian wrk); the daemon lines are "
		    "skipped\n");
	st = jobs_libraries(&b);
	if (st == CLI_EXIT_OK && !cli_given(a, "no-site"))
		st = jobs_site(&b);
	cleanup(&b);
	errfile = NULL;
	return st;
}
