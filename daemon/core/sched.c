/* SPDX-License-Identifier: BSD-3-Clause */
/* sched.c: greedy, branch-and-bound and beam search for the night's runs
   (pure core). */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "core/mem.h"
#include "core/sched.h"

/* A partial plan: where it ends and the information it holds. */
struct state {
	long last_end;		/* slot after the last run (0 at the start) */
	int last_target;	/* -1: no run yet */
	long cal_end;		/* end of the last calibration, -1: none */
	double g, nps;		/* value and normal points so far */
	struct value_orient o;
	struct value_phase *ph;	/* nphase states */
};

/* A move: a run, optionally after a calibration at cal. */
struct move {
	int target;
	long start;
	int len;
	long cal;		/* start slot of the calibration, -1: none */
};

struct ctx {
	const struct sched_problem *p;
	long ns;
	size_t nt;
	double *retpre;		/* nt x (ns + 1) prefix sums of returns */
	long *runlen;		/* nt x (ns + 1): available slots from s on */
	long *clearpre;		/* ns + 1 prefix counts of clear slots */
	double *ub;		/* ns + 1: bound on what slots s.. can add */
	double *rest;		/* ns + 1: what the greedy plan adds after s
				   (the beam's estimate of the future) */
	long nodes;
};

#define EPS_REL 1e-12

static int
beats(double a, double b)
{
	return a > b + EPS_REL * (1.0 + fabs(b));
}

enum errcode
sched_problem_check(const struct sched_problem *p, const char **field)
{
	const char *f = NULL;

	if (p->nslots == 0 || p->nslots > 1000000)
		f = "nslots";
	else if (!(p->slot_s > 0) || p->slot_s > SCHED_MAX_SLOT_S)
		f = "slot_s";
	else if (p->ntargets > 0 && (p->avail == NULL || p->returns == NULL ||
	    p->h == NULL || p->npr == NULL || p->phase_of == NULL))
		f = "targets";
	else if (p->synodic == NULL)
		f = "synodic";
	else if (p->vs == NULL || value_settings_check(p->vs, NULL))
		f = "value settings";
	else if (p->vs->model == VALUE_MODEL_BINS && p->ntargets > 0 &&
	    p->bin_weight == NULL)
		f = "bin_weight";
	else if (p->nphase == 0 || p->phase0 == NULL)
		f = "phase0";
	else if (p->run_min < 1 || p->run_max < p->run_min)
		f = "run_min";
	else if (p->switch_slots < 0)
		f = "switch_slots";
	else if (p->cal_every < 0 || (p->cal_every > 0 &&
	    (p->cal_slots < 1 || p->cal_every < p->run_min)))
		f = "cal_every";
	for (size_t j = 0; f == NULL && j < p->ntargets; j++)
		if (p->phase_of[j] >= p->nphase || !(p->npr[j] >= 0))
			f = "phase_of";
	if (field != NULL)
		*field = f;
	return f == NULL ? ERRCODE_OK : ERRCODE_BAD_ARG;
}

/* --- the value of one run against a state --- */

static void
state_root(const struct sched_problem *p, struct state *s,
    struct value_phase *ph)
{
	s->last_end = 0;
	s->last_target = -1;
	s->cal_end = -1;
	s->g = s->nps = 0.0;
	value_orient_init(&s->o, p->vs->orient_ridge);
	s->ph = ph;
	memcpy(ph, p->phase0, p->nphase * sizeof ph[0]);
}

static void
state_copy(const struct sched_problem *p, struct state *dst,
    const struct state *src)
{
	struct value_phase *ph = dst->ph;

	*dst = *src;
	dst->ph = ph;
	memcpy(ph, src->ph, p->nphase * sizeof ph[0]);
}

static double
run_returns(const struct ctx *c, int j, long s, int len)
{
	const double *pre = c->retpre + (size_t)j * (size_t)(c->ns + 1);

	return pre[s + len] - pre[s];
}

/* Fill r's computed fields for a run (r->target, start, len set). */
static void
run_gain(const struct sched_problem *p, const struct state *st,
    double returns, struct sched_run *r)
{
	size_t j = (size_t)r->target;
	size_t mid = r->start + (r->len - 1) / 2;
	const double *h = p->h + (j * p->nslots + mid) * VALUE_ODIM;
	double d = p->synodic[mid];
	double n, w;

	r->returns = returns;
	n = r->nps = value_expected_nps(p->npr[j], returns,
	    (double)r->len * p->slot_s);
	/* A normal point of a tilted array is worth w of an untilted
	   one's information (its variance grows by the pulse spread). */
	w = r->precision_weight = p->precision != NULL ?
	    p->precision[j * p->nslots + mid] : 1.0;
	if (p->vs->model == VALUE_MODEL_BINS) {
		r->phase_leverage = p->bin_weight[j * p->nslots + mid];
		r->phase = n * w * r->phase_leverage;
	} else {
		const struct value_phase *ph = &st->ph[p->phase_of[j]];

		r->phase_leverage = value_phase_leverage(ph, d);
		r->phase = value_phase_gain(ph, d, n, w);
	}
	r->orient_leverage = value_orient_leverage(&st->o, h);
	r->orientation = value_orient_gain(&st->o, h, n * w);
	r->value = value_combine(p->vs, n * w, r->phase, r->orientation);
}

/* Take a run whose gain r holds into the state. */
static void
run_apply(const struct sched_problem *p, struct state *st,
    const struct sched_run *r)
{
	size_t j = (size_t)r->target;
	size_t mid = r->start + (r->len - 1) / 2;

	if (p->vs->model == VALUE_MODEL_DESIGN)
		value_phase_add(&st->ph[p->phase_of[j]], p->synodic[mid],
		    r->nps, r->precision_weight);
	value_orient_add(&st->o, p->h + (j * p->nslots + mid) * VALUE_ODIM,
	    r->nps * r->precision_weight);
	st->g += r->value;
	st->nps += r->nps;
	st->last_end = (long)(r->start + r->len);
	st->last_target = r->target;
}

enum errcode
sched_evaluate(const struct sched_problem *p, struct sched_run *runs,
    size_t n, double *total)
{
	struct value_phase *ph;
	struct state st;
	unsigned char *seen;
	enum errcode rc = sched_problem_check(p, NULL);

	if (rc != ERRCODE_OK)
		return rc;
	ph = mem_calloc(p->nphase, sizeof ph[0]);
	seen = mem_calloc(p->ntargets + 1, 1);
	if (ph == NULL || seen == NULL) {
		mem_free(ph);
		mem_free(seen);
		return ERRCODE_NOMEM;
	}
	state_root(p, &st, ph);
	for (size_t i = 0; i < n; i++) {
		struct sched_run *r = &runs[i];
		int j = r->target;
		double ret = 0.0;

		if (r->len == 0 || r->start + r->len > p->nslots ||
		    (j != SCHED_CALIBRATION && (j < 0 ||
		    (size_t)j >= p->ntargets))) {
			rc = ERRCODE_BAD_ARG;
			break;
		}
		if (j == SCHED_CALIBRATION) {
			r->returns = r->nps = r->phase = r->orientation = 0.0;
			r->value = r->phase_leverage = r->orient_leverage = 0.0;
			r->visit = 0;
			st.cal_end = (long)(r->start + r->len);
			continue;
		}
		for (size_t s = r->start; s < r->start + r->len; s++)
			ret += p->returns[(size_t)j * p->nslots + s];
		run_gain(p, &st, ret, r);
		r->visit = !seen[j];
		seen[j] = 1;
		run_apply(p, &st, r);
	}
	if (total != NULL)
		*total = st.g;
	mem_free(ph);
	mem_free(seen);
	return rc;
}

int
sched_feasible(const struct sched_problem *p, const struct sched_run *runs,
    size_t n)
{
	long last_end = -1, cal_end = -1;
	int last_kind = -2;	/* -2 nothing, -1 calibration, else target */

	for (size_t i = 0; i < n; i++) {
		const struct sched_run *r = &runs[i];
		long s = (long)r->start, e = (long)(r->start + r->len);
		long gap;

		if (r->len == 0 || r->start + r->len > p->nslots)
			return 0;
		gap = last_kind == -2 ? 0 : last_kind != r->target ?
		    p->switch_slots : 1;
		if (last_end >= 0 && s < last_end + gap)
			return 0;
		if (r->target == SCHED_CALIBRATION) {
			if (p->cal_every <= 0 || (long)r->len != p->cal_slots)
				return 0;
			for (long t = s; t < e; t++)
				if (p->clear != NULL && !p->clear[t])
					return 0;
			cal_end = e;
		} else {
			size_t j = (size_t)r->target;

			if (r->target < 0 || j >= p->ntargets ||
			    (long)r->len < p->run_min ||
			    (long)r->len > p->run_max)
				return 0;
			for (long t = s; t < e; t++)
				if (!p->avail[j * p->nslots + (size_t)t])
					return 0;
			if (p->cal_every > 0 && (cal_end < 0 ||
			    e - cal_end > p->cal_every))
				return 0;
		}
		last_end = e;
		last_kind = r->target;
	}
	return 1;
}

/* --- tables --- */

static void
ctx_free(struct ctx *c)
{
	mem_free(c->retpre);
	mem_free(c->runlen);
	mem_free(c->clearpre);
	mem_free(c->ub);
	mem_free(c->rest);
}

/* Largest value of x over [s - w + 1, s + w - 1], for every s. */
static void
window_max(const double *x, long n, long w, double *out)
{
	for (long s = 0; s < n; s++) {
		long a = s - w + 1 < 0 ? 0 : s - w + 1;
		long b = s + w - 1 >= n ? n - 1 : s + w - 1;
		double m = x[a];

		for (long t = a + 1; t <= b; t++)
			if (x[t] > m)
				m = x[t];
		out[s] = m;
	}
}

static enum errcode
ctx_init(struct ctx *c, const struct sched_problem *p)
{
	size_t ns1;
	double *lev = NULL, *levmax = NULL, *slot = NULL;
	int counts = p->vs->phase_weight == 0.0 &&
	    p->vs->orientation_weight == 0.0;

	memset(c, 0, sizeof *c);
	c->p = p;
	c->ns = (long)p->nslots;
	c->nt = p->ntargets;
	ns1 = p->nslots + 1;
	c->retpre = mem_calloc((c->nt ? c->nt : 1) * ns1, sizeof(double));
	c->runlen = mem_calloc((c->nt ? c->nt : 1) * ns1, sizeof(long));
	c->clearpre = mem_calloc(ns1, sizeof(long));
	c->ub = mem_calloc(ns1, sizeof(double));
	lev = mem_calloc(p->nslots, sizeof(double));
	levmax = mem_calloc(p->nslots, sizeof(double));
	slot = mem_calloc(p->nslots, sizeof(double));
	if (c->retpre == NULL || c->runlen == NULL || c->clearpre == NULL ||
	    c->ub == NULL || lev == NULL || levmax == NULL || slot == NULL) {
		mem_free(lev);
		mem_free(levmax);
		mem_free(slot);
		ctx_free(c);
		return ERRCODE_NOMEM;
	}
	for (long s = 0; s < c->ns; s++)
		c->clearpre[s + 1] = c->clearpre[s] +
		    (p->clear == NULL || p->clear[s] ? 1 : 0);
	for (size_t j = 0; j < c->nt; j++) {
		double *pre = c->retpre + j * ns1;
		long *rl = c->runlen + j * ns1;
		const unsigned char *av = p->avail + j * p->nslots;
		const double *ret = p->returns + j * p->nslots;
		struct value_orient o0;

		for (long s = 0; s < c->ns; s++)
			pre[s + 1] = pre[s] + (ret[s] > 0 ? ret[s] : 0.0);
		rl[c->ns] = 0;
		for (long s = c->ns - 1; s >= 0; s--)
			rl[s] = av[s] ? rl[s + 1] + 1 : 0;
		/* Bound per slot (sched.h note 3): the largest marginal rate
		   of value per normal point over any run that holds s. */
		value_orient_init(&o0, p->vs->orient_ridge);
		for (long s = 0; s < c->ns; s++) {
			const double *h = p->h + (j * p->nslots + (size_t)s) *
			    VALUE_ODIM;
			double ph;

			if (p->vs->model == VALUE_MODEL_BINS)
				ph = p->bin_weight[j * p->nslots + (size_t)s];
			else
				ph = 0.5 * value_phase_leverage(
				    &p->phase0[p->phase_of[j]], p->synodic[s]);
			lev[s] = counts ? 1.0 : p->vs->phase_weight * ph +
			    p->vs->orientation_weight * 0.5 *
			    value_orient_leverage(&o0, h);
		}
		window_max(lev, c->ns, p->run_max, levmax);
		for (long s = 0; s < c->ns; s++) {
			double u = av[s] ? p->npr[j] * (ret[s] > 0 ? ret[s] :
			    0.0) * levmax[s] : 0.0;

			if (u > slot[s])
				slot[s] = u;
		}
	}
	c->ub[c->ns] = 0.0;
	for (long s = c->ns - 1; s >= 0; s--)
		c->ub[s] = c->ub[s + 1] + slot[s];
	mem_free(lev);
	mem_free(levmax);
	mem_free(slot);
	return ERRCODE_OK;
}

/* --- moves --- */

/* First slot a run of target j may start at after the state. */
static long
run_lb(const struct ctx *c, const struct state *st, int j)
{
	if (st->last_target < 0)
		return st->last_end;
	if (st->last_target == j)	/* else it would be one longer run */
		return st->last_end + 1;
	return st->last_end + c->p->switch_slots;
}

/* Latest start of a calibration that ends switch_slots before slot s and
   begins after the state, or -1. */
static long
cal_place(const struct ctx *c, const struct state *st, long s)
{
	const struct sched_problem *p = c->p;
	long lb = st->last_target < 0 ? st->last_end :
	    st->last_end + p->switch_slots;

	for (long t = s - p->switch_slots - p->cal_slots; t >= lb; t--)
		if (c->clearpre[t + p->cal_slots] - c->clearpre[t] ==
		    p->cal_slots)
			return t;
	return -1;
}

/* Longest feasible length of a run of j from s (0 when under run_min);
   cal_end is the calibration it follows (-1 none). */
static int
len_max(const struct ctx *c, int j, long s, long cal_end)
{
	const struct sched_problem *p = c->p;
	long l = c->runlen[(size_t)j * (size_t)(c->ns + 1) + (size_t)s];

	if (l > p->run_max)
		l = p->run_max;
	if (p->cal_every > 0) {
		long room = cal_end < 0 ? 0 : cal_end + p->cal_every - s;

		if (room < l)
			l = room;
	}
	return l >= p->run_min ? (int)l : 0;
}

/*
 * The earliest start of target j at or after from, with (withcal) or
 * without a calibration before it: the start, its longest length and the
 * calibration's slot.  0 when none.
 */
static int
earliest(const struct ctx *c, const struct state *st, int j, int withcal,
    long *start, int *lmax, long *cal)
{
	const struct sched_problem *p = c->p;
	long s = run_lb(c, st, j);
	const long *rl = c->runlen + (size_t)j * (size_t)(c->ns + 1);

	if (withcal) {
		long lb = (st->last_target < 0 ? st->last_end : st->last_end +
		    p->switch_slots) + p->cal_slots + p->switch_slots;

		if (lb > s)
			s = lb;
	} else if (p->cal_every > 0 && st->cal_end < 0) {
		return 0;
	}
	for (; s + p->run_min <= c->ns; s++) {
		long ce = st->cal_end, cs = -1;
		int l;

		if (rl[s] < p->run_min)
			continue;
		if (withcal) {
			if ((cs = cal_place(c, st, s)) < 0)
				continue;
			ce = cs + p->cal_slots;
		}
		l = len_max(c, j, s, ce);
		if (l == 0) {
			if (!withcal)	/* the cadence only gets worse */
				return 0;
			continue;
		}
		*start = s;
		*lmax = l;
		*cal = cs;
		return 1;
	}
	return 0;
}

/* Value of a move against st into r (and its calibration end). */
static void
move_value(const struct ctx *c, const struct state *st,
    const struct move *m, struct sched_run *r)
{
	memset(r, 0, sizeof *r);
	r->target = m->target;
	r->start = (size_t)m->start;
	r->len = (size_t)m->len;
	run_gain(c->p, st, run_returns(c, m->target, m->start, m->len), r);
}

static void
move_apply(const struct ctx *c, struct state *st, const struct move *m,
    const struct sched_run *r)
{
	if (m->cal >= 0)
		st->cal_end = m->cal + c->p->cal_slots;
	run_apply(c->p, st, r);
}

/* --- the plan being built --- */

struct runbuf {
	struct sched_run *r;
	size_t n, cap;
};

static void
push_move(struct runbuf *b, const struct ctx *c, const struct move *m,
    const struct sched_run *r)
{
	if (m->cal >= 0 && b->n < b->cap) {
		memset(&b->r[b->n], 0, sizeof b->r[0]);
		b->r[b->n].target = SCHED_CALIBRATION;
		b->r[b->n].start = (size_t)m->cal;
		b->r[b->n].len = (size_t)c->p->cal_slots;
		b->n++;
	}
	if (b->n < b->cap)
		b->r[b->n++] = *r;
}

/* --- greedy --- */

static void
greedy(struct ctx *c, struct state *st, struct runbuf *out)
{
	const struct sched_problem *p = c->p;

	for (;;) {
		struct move best = {0, 0, 0, -1};
		struct sched_run br, r;
		double brate = 0.0;
		int found = 0;

		for (int withcal = 0; withcal <= (p->cal_every > 0) && !found;
		    withcal++)
			for (size_t j = 0; j < c->nt; j++) {
				struct move m;
				int lmax;

				m.target = (int)j;
				if (!earliest(c, st, (int)j, withcal, &m.start,
				    &lmax, &m.cal))
					continue;
				for (m.len = p->run_min; m.len <= lmax;
				    m.len++) {
					double rate;

					c->nodes++;
					move_value(c, st, &m, &r);
					if (!(r.value > 0))
						continue;
					rate = r.value / (double)(m.start +
					    m.len - st->last_end);
					if (!found || beats(rate, brate)) {
						found = 1;
						brate = rate;
						best = m;
						br = r;
					}
				}
			}
		if (!found)
			return;
		push_move(out, c, &best, &br);
		move_apply(c, st, &best, &br);
	}
}

/* --- exact: depth-first branch and bound over every move --- */

struct dfs {
	struct ctx *c;
	struct state *stack;	/* depth + 1 states */
	long maxdepth;
	struct runbuf cur, best;
	double best_g;
	int aborted;
};

static void
dfs_rec(struct dfs *d, long depth)
{
	struct ctx *c = d->c;
	const struct sched_problem *p = c->p;
	struct state *st = &d->stack[depth];

	if (++c->nodes > SCHED_EXACT_NODES) {
		d->aborted = 1;
		return;
	}
	if (beats(st->g, d->best_g)) {
		d->best_g = st->g;
		memcpy(d->best.r, d->cur.r, d->cur.n * sizeof d->cur.r[0]);
		d->best.n = d->cur.n;
	}
	if (depth + 1 >= d->maxdepth ||
	    !beats(st->g + c->ub[st->last_end], d->best_g))
		return;
	for (int withcal = 0; withcal <= (p->cal_every > 0); withcal++)
		for (size_t j = 0; j < c->nt; j++) {
			long s0 = run_lb(c, st, (int)j);

			if (!withcal && p->cal_every > 0 && st->cal_end < 0)
				continue;
			for (long s = s0; s + p->run_min <= c->ns; s++) {
				struct move m = {(int)j, s, 0, -1};
				long ce = st->cal_end;
				int lmax;

				if (withcal) {
					if ((m.cal = cal_place(c, st, s)) < 0)
						continue;
					ce = m.cal + p->cal_slots;
				}
				lmax = len_max(c, (int)j, s, ce);
				for (m.len = p->run_min; m.len <= lmax;
				    m.len++) {
					struct sched_run r;
					size_t keep = d->cur.n;

					move_value(c, st, &m, &r);
					if (!(r.value > 0) || !beats(st->g +
					    r.value + c->ub[s + m.len],
					    d->best_g))
						continue;
					state_copy(p, &d->stack[depth + 1], st);
					move_apply(c, &d->stack[depth + 1], &m,
					    &r);
					push_move(&d->cur, c, &m, &r);
					dfs_rec(d, depth + 1);
					d->cur.n = keep;
					if (d->aborted)
						return;
				}
			}
		}
}

/* --- beam search --- */

struct node {
	long parent;		/* -1: the root */
	struct move m;
	struct sched_run r;
};

struct cand {
	long from;		/* index in the current beam */
	struct move m;
	struct sched_run r;
	double g, f;
	long order;
};

static int
cand_cmp(const void *pa, const void *pb)
{
	const struct cand *a = pa, *b = pb;

	if (a->f != b->f)
		return a->f > b->f ? -1 : 1;
	if (a->g != b->g)
		return a->g > b->g ? -1 : 1;
	return a->order < b->order ? -1 : (a->order > b->order);
}

/* Restricted moves of a state: per target, its earliest start with and
   (when needed soon) without a calibration, at three lengths. */
static size_t
beam_moves(const struct ctx *c, const struct state *st, struct move *mv,
    size_t cap)
{
	const struct sched_problem *p = c->p;
	size_t n = 0;

	for (size_t j = 0; j < c->nt; j++)
		for (int withcal = 0; withcal <= (p->cal_every > 0);
		    withcal++) {
			struct move m = {(int)j, 0, 0, -1};
			int lmax, lens[3];

			if (!earliest(c, st, (int)j, withcal, &m.start, &lmax,
			    &m.cal))
				continue;
			lens[0] = p->run_min;
			lens[1] = (p->run_min + lmax) / 2;
			lens[2] = lmax;
			for (int k = 0; k < 3 && n < cap; k++) {
				if (k > 0 && lens[k] == lens[k - 1])
					continue;
				m.len = lens[k];
				mv[n++] = m;
			}
			if (!withcal && lmax == p->run_max)
				break;	/* no need to calibrate yet */
		}
	return n;
}

static enum errcode
beam(struct ctx *c, struct runbuf *best, double *best_g)
{
	const struct sched_problem *p = c->p;
	size_t width = SCHED_BEAM_WIDTH;
	size_t maxmoves = c->nt * 6 + 1;
	long gens = c->ns / p->run_min + 2;
	size_t poolcap = width * (size_t)gens + 1, npool = 0, ncur = 1;
	struct node *pool = mem_calloc(poolcap, sizeof *pool);
	struct state *cur = mem_calloc(width, sizeof *cur);
	struct state *nxt = mem_calloc(width, sizeof *nxt);
	long *curnode = mem_calloc(width, sizeof *curnode);
	long *nxtnode = mem_calloc(width, sizeof *nxtnode);
	struct value_phase *phc = mem_calloc(width * p->nphase, sizeof *phc);
	struct value_phase *phn = mem_calloc(width * p->nphase, sizeof *phn);
	struct cand *cand = mem_calloc(width * maxmoves, sizeof *cand);
	struct move *mv = mem_calloc(maxmoves, sizeof *mv);
	long best_node = -2;
	enum errcode rc = ERRCODE_OK;

	if (pool == NULL || cur == NULL || nxt == NULL || curnode == NULL ||
	    nxtnode == NULL || phc == NULL || phn == NULL || cand == NULL ||
	    mv == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	for (size_t i = 0; i < width; i++) {
		cur[i].ph = phc + i * p->nphase;
		nxt[i].ph = phn + i * p->nphase;
	}
	state_root(p, &cur[0], cur[0].ph);
	curnode[0] = -1;
	while (ncur > 0) {
		size_t nc = 0, nn = 0;

		for (size_t i = 0; i < ncur; i++) {
			size_t nm = beam_moves(c, &cur[i], mv, maxmoves);

			for (size_t k = 0; k < nm; k++) {
				struct cand *x = &cand[nc];

				c->nodes++;
				move_value(c, &cur[i], &mv[k], &x->r);
				if (!(x->r.value > 0))
					continue;
				x->g = cur[i].g + x->r.value;
				if (!beats(x->g + c->ub[mv[k].start +
				    mv[k].len], *best_g))
					continue;	/* cannot win */
				x->f = x->g + c->rest[mv[k].start + mv[k].len];
				x->from = (long)i;
				x->m = mv[k];
				x->order = (long)nc;
				nc++;
			}
		}
		qsort(cand, nc, sizeof cand[0], cand_cmp);
		for (size_t k = 0; k < nc && nn < width && npool < poolcap;
		    k++) {
			struct cand *x = &cand[k];
			struct node *nd = &pool[npool];

			state_copy(p, &nxt[nn], &cur[x->from]);
			move_apply(c, &nxt[nn], &x->m, &x->r);
			nd->parent = curnode[x->from];
			nd->m = x->m;
			nd->r = x->r;
			nxtnode[nn] = (long)npool++;
			if (beats(nxt[nn].g, *best_g)) {
				*best_g = nxt[nn].g;
				best_node = nxtnode[nn];
			}
			nn++;
		}
		{
			struct state *t = cur;
			long *tn = curnode;

			cur = nxt;
			nxt = t;
			curnode = nxtnode;
			nxtnode = tn;
		}
		ncur = nn;
	}
	if (best_node >= -1) {
		long len = 0;

		for (long k = best_node; k >= 0; k = pool[k].parent)
			len++;
		best->n = 0;
		{
			struct node **chain = mem_calloc((size_t)len + 1,
			    sizeof *chain);
			long i = len;

			if (chain == NULL) {
				rc = ERRCODE_NOMEM;
				goto out;
			}
			for (long k = best_node; k >= 0; k = pool[k].parent)
				chain[--i] = &pool[k];
			for (i = 0; i < len; i++)
				push_move(best, c, &chain[i]->m, &chain[i]->r);
			mem_free(chain);
		}
	}
out:
	mem_free(pool);
	mem_free(cur);
	mem_free(nxt);
	mem_free(curnode);
	mem_free(nxtnode);
	mem_free(phc);
	mem_free(phn);
	mem_free(cand);
	mem_free(mv);
	return rc;
}

/* --- the driver --- */

void
sched_plan_free(struct sched_plan *plan)
{
	if (plan == NULL)
		return;
	mem_free(plan->runs);
	plan->runs = NULL;
	plan->n = 0;
}

enum errcode
sched_solve(const struct sched_problem *p, enum sched_method method,
    struct sched_plan *out)
{
	struct ctx c;
	struct state root;
	struct value_phase *ph = NULL;
	struct runbuf g = {NULL, 0, 0}, b = {NULL, 0, 0};
	double gval = 0.0;
	enum errcode rc;

	memset(out, 0, sizeof *out);
	if ((rc = sched_problem_check(p, NULL)) != ERRCODE_OK)
		return rc;
	if ((rc = ctx_init(&c, p)) != ERRCODE_OK)
		return rc;
	g.cap = b.cap = 2 * p->nslots + 2;
	g.r = mem_calloc(g.cap, sizeof g.r[0]);
	b.r = mem_calloc(b.cap, sizeof b.r[0]);
	ph = mem_calloc(p->nphase, sizeof ph[0]);
	if (g.r == NULL || b.r == NULL || ph == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	state_root(p, &root, ph);
	greedy(&c, &root, &g);
	gval = root.g;
	/* The greedy plan's value still to come after each slot, a run's
	   value spread evenly over its slots. */
	if ((c.rest = mem_calloc(p->nslots + 1, sizeof(double))) == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	for (size_t i = 0; i < g.n; i++)
		for (size_t t = 0; t < g.r[i].len; t++)
			c.rest[g.r[i].start + t] += g.r[i].value /
			    (double)g.r[i].len;
	for (long t = c.ns - 1; t >= 0; t--)
		c.rest[t] += c.rest[t + 1];
	out->greedy_value = gval;
	memcpy(b.r, g.r, g.n * sizeof g.r[0]);
	b.n = g.n;
	if (method == SCHED_BEST) {
		double best_g = gval;
		int exact = 0;

		if (c.ns <= SCHED_EXACT_MAX_SLOTS &&
		    c.nt <= SCHED_EXACT_MAX_TARGETS) {
			struct dfs d;
			long maxdepth = c.ns / p->run_min + 2;

			memset(&d, 0, sizeof d);
			d.c = &c;
			d.maxdepth = maxdepth;
			d.best_g = best_g;
			d.stack = mem_calloc((size_t)maxdepth, sizeof *d.stack);
			d.cur.cap = d.best.cap = b.cap;
			d.cur.r = mem_calloc(b.cap, sizeof b.r[0]);
			d.best.r = b.r;
			d.best.n = b.n;
			{
				struct value_phase *sp = mem_calloc(
				    (size_t)maxdepth * p->nphase, sizeof *sp);

				if (d.stack == NULL || d.cur.r == NULL ||
				    sp == NULL) {
					mem_free(d.stack);
					mem_free(d.cur.r);
					mem_free(sp);
					rc = ERRCODE_NOMEM;
					goto out;
				}
				for (long i = 0; i < maxdepth; i++)
					d.stack[i].ph = sp + i * (long)p->nphase;
				state_root(p, &d.stack[0], d.stack[0].ph);
				dfs_rec(&d, 0);
				mem_free(sp);
			}
			mem_free(d.stack);
			mem_free(d.cur.r);
			b.n = d.best.n;
			best_g = d.best_g;
			exact = !d.aborted;
		}
		if (!exact && (rc = beam(&c, &b, &best_g)) != ERRCODE_OK)
			goto out;
		out->exact = exact;
	}
	out->nodes = c.nodes;
	if ((rc = sched_evaluate(p, b.r, b.n, &out->value)) != ERRCODE_OK)
		goto out;
	if (method == SCHED_BEST && out->value < gval) {
		/* Cannot happen (the incumbent only changes when beaten);
		   kept so that the guarantee never rests on rounding. */
		memcpy(b.r, g.r, g.n * sizeof g.r[0]);
		b.n = g.n;
		if ((rc = sched_evaluate(p, b.r, b.n, &out->value)))
			goto out;
	}
	for (size_t i = 0; i < b.n; i++)
		out->nps += b.r[i].nps;
	out->runs = b.r;
	out->n = b.n;
	b.r = NULL;
out:
	mem_free(g.r);
	mem_free(b.r);
	mem_free(ph);
	ctx_free(&c);
	return rc;
}
