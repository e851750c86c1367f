/* SPDX-License-Identifier: BSD-3-Clause */
/* logstats.c: the ranging log as the planner's sufficient statistics. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfam.h>

#include "core/link.h"
#include "core/logstats.h"
#include "core/mem.h"

enum errcode
logstats_init(struct logstats *ls, const struct site_station *st, int nbins)
{
	struct link_station l;

	memset(ls, 0, sizeof *ls);
	if (nbins < SCORE_BINS_MIN || nbins > SCORE_BINS_MAX ||
	    !(st->zenith_tau >= 0.0) || !isfinite(st->zenith_tau))
		return ERRCODE_BAD_ARG;
	site_station_link(st, &l);
	ls->tau = st->zenith_tau;
	ls->seeing = l.seeing_arcsec;
	ls->nbins = nbins;
	return logstats_entry(ls, "") != NULL ? ERRCODE_OK : ERRCODE_NOMEM;
}

void
logstats_free(struct logstats *ls)
{
	if (ls == NULL)
		return;
	mem_free(ls->e);
	memset(ls, 0, sizeof *ls);
}

int
logstats_current(const struct logstats *ls, const struct site_station *st,
    int nbins)
{
	struct link_station l;

	site_station_link(st, &l);
	return ls->n > 0 && ls->nbins == nbins && ls->tau == st->zenith_tau &&
	    ls->seeing == l.seeing_arcsec;
}

const struct logstats_entry *
logstats_find(const struct logstats *ls, const char *id)
{
	for (size_t i = 0; i < ls->n; i++)
		if (strcmp(ls->e[i].id, id) == 0)
			return &ls->e[i];
	return NULL;
}

struct logstats_entry *
logstats_entry(struct logstats *ls, const char *id)
{
	struct logstats_entry *e;

	for (size_t i = 0; i < ls->n; i++)
		if (strcmp(ls->e[i].id, id) == 0)
			return &ls->e[i];
	if (ls->n == ls->cap) {
		size_t cap = ls->cap ? 2 * ls->cap : 8;
		struct logstats_entry *ne = mem_alloc(cap * sizeof ne[0]);

		if (ne == NULL)
			return NULL;
		if (ls->n > 0)
			memcpy(ne, ls->e, ls->n * sizeof ne[0]);
		mem_free(ls->e);
		ls->e = ne;
		ls->cap = cap;
	}
	e = &ls->e[ls->n++];
	memset(e, 0, sizeof *e);
	snprintf(e->id, sizeof e->id, "%s", id);
	return e;
}

enum errcode
logstats_add_attempt(struct logstats *ls, const struct site_attempt *a)
{
	struct logstats_entry *e[2];
	struct link_station l;

	/* The pool first: adding the target may move the array. */
	if (logstats_entry(ls, a->target) == NULL)
		return ERRCODE_NOMEM;
	e[0] = &ls->e[0];
	e[1] = logstats_entry(ls, a->target);
	link_station_default(&l);
	l.seeing_arcsec = ls->seeing;
	for (int i = 0; i < (a->target[0] != '\0' ? 2 : 1); i++) {
		e[i]->attempts++;
		(void)score_sums_add(&e[i]->y, &l, ls->tau, a);
		score_bin_add(e[i]->counts, ls->nbins, a->synodic_deg,
		    a->normal_points);
		if (a->normal_points > 0)
			value_moments_add(&e[i]->ph_att, a->synodic_deg *
			    ERFA_DD2R, (double)a->normal_points);
		if (a->returns > 0) {
			e[i]->ret_nps += a->normal_points;
			e[i]->ret_returns += a->returns;
		}
	}
	return ERRCODE_OK;
}

enum errcode
logstats_add_np(struct logstats *ls, const struct site_normal_point *p)
{
	struct logstats_entry *e[2];

	if (logstats_entry(ls, p->target) == NULL)
		return ERRCODE_NOMEM;
	e[0] = &ls->e[0];
	e[1] = logstats_entry(ls, p->target);
	for (int i = 0; i < (p->target[0] != '\0' ? 2 : 1); i++) {
		e[i]->nps++;
		score_bin_add(e[i]->counts, ls->nbins, p->synodic_deg, 1);
		value_moments_add(&e[i]->ph_np, p->synodic_deg * ERFA_DD2R, 1.0);
	}
	return ERRCODE_OK;
}

enum errcode
logstats_build(struct logstats *ls, const struct site_station *st, int nbins,
    const struct site_attempt *att, size_t na,
    const struct site_normal_point *nps, size_t nnp)
{
	enum errcode rc = logstats_init(ls, st, nbins);

	for (size_t i = 0; rc == ERRCODE_OK && i < nnp; i++)
		rc = logstats_add_np(ls, &nps[i]);
	for (size_t i = 0; rc == ERRCODE_OK && i < na; i++)
		rc = logstats_add_attempt(ls, &att[i]);
	if (rc != ERRCODE_OK)
		logstats_free(ls);
	return rc;
}
