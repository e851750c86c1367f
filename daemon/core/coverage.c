/* SPDX-License-Identifier: BSD-3-Clause */
/* coverage.c: binning over the lunar cycle and the coverage metrics. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/coverage.h"
#include "core/fastpath.h"
#include "core/mem.h"
#include "core/text.h"
#include "core/score.h"
#include "core/tscale.h"

/* --- names --- */

static const char *const axis_names[COVERAGE_AXIS__COUNT] = {
	"synodic", "anomaly", "latitude", "hour_angle"
};

static const char *const axis_labels[COVERAGE_AXIS__COUNT] = {
	"synodic angle", "mean anomaly l", "argument of latitude F",
	"hour angle"
};

static const char *const axis_marks[COVERAGE_AXIS__COUNT][4] = {
	{"new moon", "first quarter", "full moon", "last quarter"},
	{"perigee", "l 90", "apogee", "l 270"},
	{"ascending node", "north", "descending node", "south"},
	{"transit", "6 h west", "lower transit", "6 h east"},
};

static const char *const source_names[COVERAGE_SOURCE__COUNT] = {
	"normal_points", "attempts"
};

const char *
coverage_axis_name(enum coverage_axis a)
{
	return (unsigned)a < COVERAGE_AXIS__COUNT ? axis_names[a] : "?";
}

const char *
coverage_axis_label(enum coverage_axis a)
{
	return (unsigned)a < COVERAGE_AXIS__COUNT ? axis_labels[a] : "?";
}

const char *
coverage_axis_mark(enum coverage_axis a, int quarter)
{
	if ((unsigned)a >= COVERAGE_AXIS__COUNT || quarter < 0 || quarter > 3)
		return "?";
	return axis_marks[a][quarter];
}

int
coverage_axis_parse(const char *s)
{
	return text_name_index(s, axis_names, COVERAGE_AXIS__COUNT);
}

const char *
coverage_source_name(enum coverage_source s)
{
	return (unsigned)s < COVERAGE_SOURCE__COUNT ? source_names[s] : "?";
}

int
coverage_source_parse(const char *s)
{
	return text_name_index(s, source_names, COVERAGE_SOURCE__COUNT);
}

/* --- the spec --- */

void
coverage_spec_init(struct coverage_spec *s)
{
	memset(s, 0, sizeof *s);
	s->source = COVERAGE_SOURCE_NORMAL_POINTS;
	s->axis = COVERAGE_AXIS_SYNODIC;
	s->nbins = COVERAGE_BINS_DEFAULT;
	s->min_count = 1;
	s->since_mjd = NAN;
	s->until_mjd = NAN;
}

enum errcode
coverage_spec_check(const struct coverage_spec *s, char *errbuf,
    size_t errlen)
{
	const char *msg = NULL;

	if ((unsigned)s->source >= COVERAGE_SOURCE__COUNT)
		msg = "source: must be normal_points or attempts";
	else if ((unsigned)s->axis >= COVERAGE_AXIS__COUNT)
		msg = "axis: must be synodic, anomaly, latitude or hour_angle";
	else if (s->nbins < COVERAGE_BINS_MIN || s->nbins > COVERAGE_BINS_MAX)
		msg = "bins: must be a whole number in 4..72";
	else if (s->min_count < 1 || s->min_count > 1000000000L)
		msg = "min_count: must be a whole number >= 1";
	else if (!isnan(s->since_mjd) && !isfinite(s->since_mjd))
		msg = "since: not a finite time";
	else if (!isnan(s->until_mjd) && !isfinite(s->until_mjd))
		msg = "until: not a finite time";
	else if (!isnan(s->since_mjd) && !isnan(s->until_mjd) &&
	    s->until_mjd <= s->since_mjd)
		msg = "until: must be after since";
	if (msg == NULL)
		return ERRCODE_OK;
	if (errbuf != NULL && errlen > 0)
		snprintf(errbuf, errlen, "%s", msg);
	return ERRCODE_BAD_ARG;
}

/* --- the incomplete gamma function --- */

#define GAMMA_EPS 1e-15
#define GAMMA_ITMAX 1000
#define GAMMA_TINY 1e-300

/* P(a, x) by its series (A&S 6.5.29), for x < a + 1. */
static double
gamma_p_series(double a, double x)
{
	double ap = a, sum = 1.0 / a, del = sum;

	for (int i = 0; i < GAMMA_ITMAX; i++) {
		ap += 1.0;
		del *= x / ap;
		sum += del;
		if (fabs(del) < fabs(sum) * GAMMA_EPS)
			break;
	}
	return sum * exp(-x + a * log(x) - lgamma(a));
}

/* Q(a, x) by its continued fraction (A&S 6.5.31), modified Lentz, for
   x >= a + 1. */
static double
gamma_q_fraction(double a, double x)
{
	double b = x + 1.0 - a, c = 1.0 / GAMMA_TINY, d = 1.0 / b, h = d;

	for (int i = 1; i <= GAMMA_ITMAX; i++) {
		double an = -i * (i - a), del;

		b += 2.0;
		d = an * d + b;
		if (fabs(d) < GAMMA_TINY)
			d = GAMMA_TINY;
		c = b + an / c;
		if (fabs(c) < GAMMA_TINY)
			c = GAMMA_TINY;
		d = 1.0 / d;
		del = d * c;
		h *= del;
		if (fabs(del - 1.0) < GAMMA_EPS)
			break;
	}
	return exp(-x + a * log(x) - lgamma(a)) * h;
}

double
coverage_gamma_q(double a, double x)
{
	if (!(a > 0.0) || !(x >= 0.0) || !isfinite(a) || isnan(x))
		return NAN;
	if (x == 0.0)
		return 1.0;
	if (isinf(x))
		return 0.0;
	if (x < a + 1.0)
		return 1.0 - gamma_p_series(a, x);
	return gamma_q_fraction(a, x);
}

double
coverage_chi2_p(double x, int dof)
{
	if (dof < 1)
		return NAN;
	return coverage_gamma_q(0.5 * dof, 0.5 * x);
}

/* --- metrics --- */

void
coverage_metrics_of(const long *n, int nbins, long min_count,
    struct coverage_metrics *m)
{
	double width = 360.0 / nbins, e, h = 0.0, x2 = 0.0;
	int order[COVERAGE_BINS_MAX], best = 0, best_from = -1, start = -1;
	long total = 0, lo;

	memset(m, 0, sizeof *m);
	for (int i = 0; i < nbins; i++) {
		total += n[i];
		if (n[i] >= min_count)
			m->filled_bins++;
	}
	m->total = total;
	m->filled_fraction = (double)m->filled_bins / nbins;

	/* Emptiest: a stable insertion sort by count. */
	for (int i = 0; i < nbins; i++) {
		int j = i;

		while (j > 0 && n[order[j - 1]] > n[i]) {
			order[j] = order[j - 1];
			j--;
		}
		order[j] = i;
	}
	lo = n[order[0]];
	for (int i = 0; i < nbins; i++)
		if (i < COVERAGE_EMPTIEST || n[order[i]] == lo)
			m->emptiest[m->nemptiest++] = order[i];

	for (int i = 0; i < nbins; i++)
		if (n[i] >= min_count && 2.0 * (double)n[i] * nbins <
		    (double)total)
			m->sparse[m->nsparse++] = i;

	/* Longest run of gap bins, around the circle: start the walk just
	   after a filled bin so that no run is split at the 0/360 seam. */
	for (int i = 0; i < nbins; i++)
		if (n[i] >= min_count)
			start = i;
	if (start < 0) {
		best = nbins;
		best_from = 0;
	} else {
		int run = 0, run_from = 0;

		for (int k = 1; k <= nbins; k++) {
			int i = (start + k) % nbins;

			if (n[i] < min_count) {
				if (run++ == 0)
					run_from = i;
				if (run > best) {
					best = run;
					best_from = run_from;
				}
			} else {
				run = 0;
			}
		}
	}
	m->longest_gap_deg = best * width;
	m->longest_gap_from_deg = best_from < 0 ? NAN : best_from * width;

	m->chi2_dof = nbins - 1;
	if (total == 0) {
		m->entropy = NAN;
		m->chi2 = NAN;
		m->chi2_p = NAN;
		return;
	}
	e = (double)total / nbins;
	for (int i = 0; i < nbins; i++) {
		double p = (double)n[i] / (double)total, d = (double)n[i] - e;

		if (n[i] > 0)
			h -= p * log(p);
		x2 += d * d / e;
	}
	m->entropy = h / log((double)nbins);
	/* Rounding can leave -0 or 1 + 1e-16; keep the documented range. */
	if (m->entropy < 0.0)
		m->entropy = 0.0;
	if (m->entropy > 1.0)
		m->entropy = 1.0;
	m->chi2 = x2;
	m->chi2_p = coverage_chi2_p(x2, m->chi2_dof);
	m->chi2_reliable = e >= 5.0;
}

/* --- angles --- */

/* One binning rule for the audit and the planner's coverage weight. */
int
coverage_bin_of(double deg, int nbins)
{
	return score_bin_of(deg, nbins);
}

/*
 * The angle of an axis at a UTC MJD, on the direct chain (ft NULL) or on
 * a fitted track (the fast path: within 0.04" of it, so a sample changes
 * bin only within that of a boundary).  UT1 is UTC and polar motion nil
 * either way.
 */
static enum errcode
axis_eval(enum coverage_axis axis, const struct geom_site *site,
    const struct fast_track *ft, double utc_mjd, double *deg)
{
	struct tscale_instant t;
	struct geom_instant g;
	struct geom_eop eop = {0.0, 0.0, 0.0};
	struct fast_frame f;
	double c, a, off = 0.0;

	if (!isfinite(utc_mjd))
		return ERRCODE_BAD_TIME;
	if (axis == COVERAGE_AXIS_HOUR_ANGLE && site == NULL)
		return ERRCODE_BAD_ARG;
	if (tscale_from_utc(TEXT_MJD0, utc_mjd, 0.0, &t) != ERRCODE_OK)
		return ERRCODE_BAD_TIME;
	if (ft != NULL)
		off = (t.tt1 - ft->base1) + (t.tt2 - ft->base2);
	c = ((t.tt1 - ERFA_DJ00) + t.tt2) / ERFA_DJC;
	switch (axis) {
	case COVERAGE_AXIS_SYNODIC:
		a = ft != NULL ? fast_synodic(ft, off) :
		    geom_synodic_at(t.tt1, t.tt2);
		break;
	case COVERAGE_AXIS_ANOMALY:
		a = eraFal03(c);
		break;
	case COVERAGE_AXIS_LATITUDE:
		a = eraFaf03(c);
		break;
	case COVERAGE_AXIS_HOUR_ANGLE:
		if (ft != NULL) {
			fast_frame_at(ft, off, 0, &f);
			a = eraAnpm(ft->site.lon - atan2(f.moon_itrs[1],
			    f.moon_itrs[0]));
		} else {
			if (geom_instant_at(site, &eop, TEXT_MJD0, utc_mjd,
			    GEOM_PREC_FAST, &g) != ERRCODE_OK)
				return ERRCODE_BAD_TIME;
			a = g.moon.ha;
		}
		break;
	case COVERAGE_AXIS__COUNT:
	default:
		return ERRCODE_BAD_ARG;
	}
	*deg = eraAnp(a) * ERFA_DR2D;
	if (*deg >= 360.0)
		*deg = 0.0;
	return ERRCODE_OK;
}

enum errcode
coverage_axis_value(enum coverage_axis axis, const struct geom_site *site,
    double utc_mjd, double *deg)
{
	return axis_eval(axis, site, NULL, utc_mjd, deg);
}

/* --- binning --- */

/* One record reduced to what binning needs. */
struct rec {
	const char *target;
	const char *station;
	double epoch_mjd;
	double synodic_deg;
	long weight;
};

static int
passes(const struct coverage_spec *s, const struct rec *r)
{
	if (!isnan(s->since_mjd) && !(r->epoch_mjd >= s->since_mjd))
		return 0;
	if (!isnan(s->until_mjd) && !(r->epoch_mjd < s->until_mjd))
		return 0;
	if (s->target[0] != '\0' && strcmp(s->target, r->target) != 0)
		return 0;
	if (s->station[0] != '\0' && strcmp(s->station, r->station) != 0)
		return 0;
	return r->weight > 0;
}

/* Slot of a target id in the result, added in sorted place if new. */
static struct coverage_counts *
target_slot(struct coverage_result *out, const char *id)
{
	size_t lo = 0, hi = out->ntargets;

	while (lo < hi) {
		size_t mid = (lo + hi) / 2;
		int c = strcmp(out->targets[mid].id, id);

		if (c == 0)
			return &out->targets[mid].c;
		if (c < 0)
			lo = mid + 1;
		else
			hi = mid;
	}
	if (out->ntargets == COVERAGE_MAX_TARGETS)
		return NULL;
	memmove(&out->targets[lo + 1], &out->targets[lo],
	    (out->ntargets - lo) * sizeof out->targets[0]);
	memset(&out->targets[lo], 0, sizeof out->targets[0]);
	snprintf(out->targets[lo].id, sizeof out->targets[lo].id, "%s", id);
	out->ntargets++;
	return &out->targets[lo].c;
}

static struct coverage_counts *
year_slot(struct coverage_result *out, int year)
{
	size_t i = 0;

	while (i < out->nyears && out->years[i].year < year)
		i++;
	if (i < out->nyears && out->years[i].year == year)
		return &out->years[i].c;
	if (out->nyears == COVERAGE_MAX_YEARS)
		return NULL;
	memmove(&out->years[i + 1], &out->years[i],
	    (out->nyears - i) * sizeof out->years[0]);
	memset(&out->years[i], 0, sizeof out->years[0]);
	out->years[i].year = year;
	out->nyears++;
	return &out->years[i].c;
}

static enum errcode
add_record(const struct coverage_spec *s, const struct rec *r,
    struct coverage_result *out)
{
	struct coverage_counts *tc, *yc;
	double deg = r->synodic_deg, fd;
	int iy, im, id, b;

	if (!passes(s, r))
		return ERRCODE_OK;
	if (s->axis != COVERAGE_AXIS_SYNODIC || !isfinite(deg)) {
		if (coverage_axis_value(s->axis, &s->site, r->epoch_mjd, &deg)) {
			out->skipped++;
			return ERRCODE_OK;
		}
	}
	if (eraJd2cal(TEXT_MJD0, r->epoch_mjd, &iy, &im, &id, &fd) != 0) {
		out->skipped++;
		return ERRCODE_OK;
	}
	if ((tc = target_slot(out, r->target)) == NULL ||
	    (yc = year_slot(out, iy)) == NULL)
		return ERRCODE_TOO_LARGE;
	b = coverage_bin_of(deg, s->nbins);
	out->pooled.n[b] += r->weight;
	tc->n[b] += r->weight;
	yc->n[b] += r->weight;
	out->records++;
	return ERRCODE_OK;
}

enum errcode
coverage_begin(const struct coverage_spec *spec, struct coverage_result *out)
{
	if (coverage_spec_check(spec, NULL, 0) != ERRCODE_OK)
		return ERRCODE_BAD_ARG;
	memset(out, 0, sizeof *out);
	out->spec = *spec;
	out->bin_width_deg = 360.0 / spec->nbins;
	return ERRCODE_OK;
}

enum errcode
coverage_add_np(const struct coverage_spec *spec,
    const struct site_normal_point *p, struct coverage_result *out)
{
	struct rec r;

	if (spec->source != COVERAGE_SOURCE_NORMAL_POINTS)
		return ERRCODE_OK;
	r.target = p->target;
	r.station = p->station_code;
	r.epoch_mjd = p->epoch_mjd;
	r.synodic_deg = p->synodic_deg;
	r.weight = 1;
	return add_record(spec, &r, out);
}

enum errcode
coverage_add_attempt(const struct coverage_spec *spec,
    const struct site_attempt *a, struct coverage_result *out)
{
	struct rec r;

	r.target = a->target;
	r.station = spec->own_station;
	r.epoch_mjd = 0.5 * (a->start_mjd + a->end_mjd);
	r.synodic_deg = a->synodic_deg;
	r.weight = spec->source == COVERAGE_SOURCE_ATTEMPTS ? 1 :
	    a->normal_points;
	if (spec->station[0] != '\0' && spec->own_station[0] == '\0')
		return ERRCODE_OK;
	/* A suspect attempt (target below the horizon, far fewer shots
	   than the rate allows) most likely has a wrong time or count, so
	   its phase is not to be trusted: left out and counted, as the
	   yield model leaves it out. */
	if (a->suspect != 0) {
		if (passes(spec, &r))
			out->suspect++;
		return ERRCODE_OK;
	}
	return add_record(spec, &r, out);
}

void
coverage_end(const struct coverage_spec *spec, struct coverage_result *out)
{
	coverage_metrics_of(out->pooled.n, spec->nbins, spec->min_count,
	    &out->pooled.m);
	for (size_t i = 0; i < out->ntargets; i++)
		coverage_metrics_of(out->targets[i].c.n, spec->nbins,
		    spec->min_count, &out->targets[i].c.m);
	for (size_t i = 0; i < out->nyears; i++)
		coverage_metrics_of(out->years[i].c.n, spec->nbins,
		    spec->min_count, &out->years[i].c.m);
}

enum errcode
coverage_compute(const struct coverage_spec *spec,
    const struct coverage_input *in, struct coverage_result *out)
{
	enum errcode rc;

	if ((rc = coverage_begin(spec, out)) != ERRCODE_OK)
		return rc;
	for (size_t i = 0; i < in->nnp; i++)
		if ((rc = coverage_add_np(spec, &in->np[i], out)) != ERRCODE_OK)
			return rc;
	for (size_t i = 0; i < in->natt; i++)
		if ((rc = coverage_add_attempt(spec, &in->att[i], out)) !=
		    ERRCODE_OK)
			return rc;
	coverage_end(spec, out);
	return ERRCODE_OK;
}

/* --- fill dates --- */

/*
 * Keep the COVERAGE_FILL_PER_BIN earliest opportunities of a bin.  Dates
 * whose parts in the bin overlap are one opportunity (the same night,
 * another target): the one with the higher score stays.
 */
static void
fill_insert(struct coverage_fill_bin *fb, const struct coverage_fill_date *d)
{
	size_t i;

	for (i = 0; i < fb->ndates; i++) {
		struct coverage_fill_date *o = &fb->dates[i];

		if (d->in_bin_start_mjd <= o->in_bin_end_mjd &&
		    o->in_bin_start_mjd <= d->in_bin_end_mjd) {
			if (!(d->score > o->score))
				return;
			/* Replace it, then restore the order by start. */
			memmove(o, o + 1, (fb->ndates - i - 1) * sizeof *o);
			fb->ndates--;
			break;
		}
	}
	i = fb->ndates;
	if (i == COVERAGE_FILL_PER_BIN) {
		if (fb->dates[i - 1].in_bin_start_mjd <= d->in_bin_start_mjd)
			return;
		i--;
	} else {
		fb->ndates++;
	}
	while (i > 0 && fb->dates[i - 1].in_bin_start_mjd > d->in_bin_start_mjd) {
		fb->dates[i] = fb->dates[i - 1];
		i--;
	}
	fb->dates[i] = *d;
}

/* A fitted track over [from_mjd, to_mjd] UTC for the fill, or NULL (too
   long, out of range or no memory: the direct chain is used).  The
   caller frees *seg with mem_free. */
static const struct fast_track *
fill_track(const struct coverage_spec *s, double from_mjd, double to_mjd,
    struct fast_track *ft, struct fast_seg **seg)
{
	struct tscale_instant a;
	size_t n;

	*seg = NULL;
	if (!(to_mjd > from_mjd) || to_mjd - from_mjd > 3000.0 ||
	    tscale_from_utc(TEXT_MJD0, from_mjd, 0.0, &a) != ERRCODE_OK)
		return NULL;
	n = fast_track_segments(-0.01, to_mjd - from_mjd + 0.01);
	if (n == 0 || (*seg = mem_calloc(n, sizeof **seg)) == NULL)
		return NULL;
	if (fast_track_init(ft, &s->site, NULL, a.tt1, a.tt2, -0.01,
	    to_mjd - from_mjd + 0.01, *seg, n) != ERRCODE_OK) {
		mem_free(*seg);
		*seg = NULL;
		return NULL;
	}
	return ft;
}

enum errcode
coverage_fill_compute(const struct coverage_result *r,
    const struct coverage_window *w, size_t nw, double from_mjd,
    double to_mjd, struct coverage_fill *out)
{
	struct fast_track ftrack;
	const struct fast_track *ft = NULL;
	struct fast_seg *seg = NULL;
	enum errcode rc = ERRCODE_OK;
	const struct coverage_spec *s = &r->spec;
	const struct coverage_counts *basis = &r->pooled;
	int slot[COVERAGE_BINS_MAX];
	double step = COVERAGE_FILL_STEP_S / 86400.0;

	memset(out, 0, sizeof *out);
	out->from_mjd = from_mjd;
	out->to_mjd = to_mjd;
	if (s->target[0] != '\0')
		for (size_t i = 0; i < r->ntargets; i++)
			if (strcmp(r->targets[i].id, s->target) == 0)
				basis = &r->targets[i].c;
	for (int b = 0; b < s->nbins; b++) {
		slot[b] = -1;
		if (basis->n[b] < s->min_count) {
			slot[b] = (int)out->nbins;
			out->bins[out->nbins].bin = b;
			out->bins[out->nbins].count = basis->n[b];
			out->nbins++;
		}
	}
	if (out->nbins == 0)
		return ERRCODE_OK;
	ft = fill_track(s, from_mjd, to_mjd, &ftrack, &seg);

	for (size_t k = 0; k < nw && rc == ERRCODE_OK; k++) {
		double t0 = w[k].start_mjd, t1 = w[k].end_mjd, t, deg;
		struct coverage_fill_date cur;
		int prev = -1, b;

		if (s->target[0] != '\0' && strcmp(s->target, w[k].target) != 0)
			continue;
		if (t0 < from_mjd)
			t0 = from_mjd;
		if (t1 > to_mjd)
			t1 = to_mjd;
		if (!(t1 > t0))
			continue;
		out->windows++;
		memset(&cur, 0, sizeof cur);
		snprintf(cur.target, sizeof cur.target, "%s", w[k].target);
		cur.window_start_mjd = w[k].start_mjd;
		cur.window_end_mjd = w[k].end_mjd;
		cur.score = w[k].score;
		/* Walk the window; each run of samples in one gap bin is one
		   date for that bin. */
		for (long i = 0;; i++) {
			t = t0 + (double)i * step;
			if (t > t1)
				t = t1;
			rc = axis_eval(s->axis, &s->site, ft, t, &deg);
			if (rc != ERRCODE_OK)
				break;
			b = coverage_bin_of(deg, s->nbins);
			if (b != prev) {
				if (prev >= 0 && slot[prev] >= 0)
					fill_insert(&out->bins[slot[prev]],
					    &cur);
				cur.in_bin_start_mjd = t;
				prev = b;
			}
			cur.in_bin_end_mjd = t;
			if (t >= t1)
				break;
		}
		if (rc == ERRCODE_OK && prev >= 0 && slot[prev] >= 0)
			fill_insert(&out->bins[slot[prev]], &cur);
	}
	mem_free(seg);
	return rc;
}
