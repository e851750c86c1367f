/* SPDX-License-Identifier: BSD-3-Clause */
/* test_plan.c: the planning query end to end: factors against an
   independent integral, the JSON, CSV and iCalendar renderers, the
   database path and the CLI's bytes, bad input, allocation failures. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include <erfa.h>
#include <erfam.h>
#include <jansson.h>

#include "check.h"
#include "fixture.h"
#include "core/derive.h"
#include "core/mem.h"
#include "core/plan.h"
#include "store/plan_db.h"
#include "formats/render_json.h"
#include "formats/render_plan.h"
#include "store/store.h"
#include "query/qzone.h"

#define D2R ERFA_DD2R
#define MJD0 2400000.5

/* A zone table for the text renderers (qzone_load: the C library). */
static struct tzone denver;

/* --- an invented site --- */

#define NT 3
#define NA 60
#define NNP 200

struct site {
	struct site_station st;
	struct site_target tg[NT];
	struct site_attempt at[NA];
	struct site_normal_point np[NNP];
	struct site_blackout bo[1];
};

static void
site_make(struct site *s)
{
	static const struct {
		const char *id;
		double lat, lon, strength;
		int dark;
	} t[NT] = {
		{"HERON", 12.5, -8.25, 1.0, 0},		/* invented */
		{"LARK", -21.75, 14.5, 0.6, 0},		/* invented */
		{"OWL", 3.1, 31.9, 0.3, 1},		/* invented */
	};
	double t0 = fixture_mjd("2026-09-01T03:00:00Z");

	memset(s, 0, sizeof *s);
	snprintf(s->st.name, sizeof s->st.name, "Gravel Flat (invented)");
	snprintf(s->st.code, sizeof s->st.code, "GRV1");
	s->st.lat_deg = 34.25;
	s->st.lon_deg = -107.6;
	s->st.height_m = 2100.0;
	snprintf(s->st.time_zone, sizeof s->st.time_zone, "America/Denver");
	s->st.min_el_deg = 20.0;
	s->st.max_sun_el_deg = -10.0;
	s->st.min_sun_sep_deg = 25.0;
	s->st.pressure_hpa = 780.0;
	s->st.temperature_c = 8.0;
	s->st.humidity = 0.3;
	s->st.wavelength_nm = 532.0;
	s->st.zenith_tau = 0.15;
	s->st.fire_rate_hz = 20.0;
	for (int j = 0; j < NT; j++) {
		snprintf(s->tg[j].id, sizeof s->tg[j].id, "%s", t[j].id);
		snprintf(s->tg[j].name, sizeof s->tg[j].name, "Array %s "
		    "(invented)", t[j].id);
		s->tg[j].lat_deg = t[j].lat;
		s->tg[j].lon_deg = t[j].lon;
		s->tg[j].strength = t[j].strength;
		s->tg[j].dark_only = t[j].dark;
		s->tg[j].active = 1;
	}
	/* Attempts every ~3 days, angles derived as the store does. */
	for (int i = 0; i < NA; i++) {
		struct site_attempt *a = &s->at[i];

		snprintf(a->target, sizeof a->target, "%s", t[i % NT].id);
		a->start_mjd = t0 + 3.03 * i;
		a->end_mjd = a->start_mjd + 600.0 / 86400.0;
		a->shots = 12000;
		a->returns = 20 + 7 * (i % 5);
		a->normal_points = 1 + i % 3;
		a->outcome = SITE_OUTCOME_RANGED;
		a->seeing_arcsec = NAN;
		snprintf(a->operator_name, sizeof a->operator_name, "op");
		assert_int_equal(derive_attempt(&s->st, &s->tg[i % NT], NULL,
		    a), ERRCODE_OK);
	}
	/* Normal points bunched at the quarters (synthetic). */
	for (int i = 0; i < NNP; i++) {
		struct site_normal_point *p = &s->np[i];

		snprintf(p->target, sizeof p->target, "%s", t[i % NT].id);
		snprintf(p->station_code, sizeof p->station_code, "GRV1");
		p->epoch_mjd = t0 - 400 + i;
		p->tof_s = 2.5;
		p->photons = 30;
		p->rms_ps = 50;
		p->synodic_deg = (i % 2 ? 90.0 : 270.0) + (i % 17) - 8.0;
		p->mean_elong_deg = p->synodic_deg;
		p->target_el_deg = 40;
		p->sun_el_target_deg = -5;
	}
	s->bo[0].start_mjd = fixture_mjd("2027-03-20T08:00:00Z");
	s->bo[0].end_mjd = fixture_mjd("2027-03-20T08:30:00Z");
	snprintf(s->bo[0].reason, sizeof s->bo[0].reason, "maintenance");
}

static void
query_of(const struct site *s, struct plan_query *q, const char *from,
    const char *to)
{
	plan_query_init(q);
	q->station = s->st;
	q->targets = s->tg;
	q->ntargets = NT;
	q->attempts = s->at;
	q->nattempts = NA;
	q->nps = s->np;
	q->nnps = NNP;
	q->blackouts = s->bo;
	q->nblackouts = 1;
	q->from_mjd = fixture_mjd(from);
	q->to_mjd = fixture_mjd(to);
}

/* --- factors and an independent integral --- */

static void
test_plan_factors_against_full_chain(void **state)
{
	struct site s;
	struct plan_query q;
	struct plan_result r;
	struct geom_site site;
	char err[200];

	(void)state;
	site_make(&s);
	query_of(&s, &q, "2027-03-16T00:00:00Z", "2027-03-22T00:00:00Z");
	assert_int_equal(plan_run(&q, &r, err, sizeof err), ERRCODE_OK);
	assert_true(r.n >= 6);
	assert_int_equal(derive_site(&s.st, &site), ERRCODE_OK);
	for (size_t i = 0; i < r.n; i++) {
		const struct plan_window *w = &r.w[i];
		const struct score_window *f = &w->f;
		const struct plan_target_model *m = &r.models[f->target];
		struct geom_target body;
		double e = 0, lit = 0, x = 0, elmax = -1, dt;
		size_t j = f->target;
		int nstep;

		assert_int_equal(f->rank, i + 1);
		if (i > 0)
			assert_true(f->score <= r.w[i - 1].f.score);
		assert_true(w->nreasons >= 3);
		/* The factors reproduce the score. */
		check_near(f->score, f->expected_returns * f->coverage_weight,
		    1e-9 * f->score, "", "score = expected returns x W");
		if (f->bins_crossed == 0)
			check_near(f->coverage_weight,
			    score_coverage_weight(f->bin_count, f->bin_mean,
			    q.settings.k, q.settings.alpha), 1e-12, "",
			    "W from the bin count");
		/* Independent: a midpoint sum on the full ERFA chain, the
		   window cut into whole steps of at most 30 s. */
		assert_int_equal(geom_target_from_selen(s.tg[j].lat_deg * D2R,
		    s.tg[j].lon_deg * D2R, 0.0, &body), ERRCODE_OK);
		nstep = (int)ceil(f->duration_s / 30.0);
		dt = (w->end_mjd - w->start_mjd) / nstep;
		for (int k = 0; k < nstep; k++) {
			struct geom_instant g;
			struct geom_target_view v;
			double xx, t = w->start_mjd + (k + 0.5) * dt;
			double ds = dt * 86400.0;

			assert_int_equal(geom_instant_at(&site, NULL, MJD0, t,
			    GEOM_PREC_FULL, &g), ERRCODE_OK);
			geom_target_view(&g, &body, &v);
			xx = score_airmass(v.el);
			/* (R0/R)^4 with R0 = 384400 km (core/link.h) */
			e += s.st.fire_rate_hz * m->y.rate *
			    exp(-2.0 * s.st.zenith_tau * xx) *
			    pow(384400e3 / v.range, 4.0) *
			    (v.sunlit ? m->y.sunlit_factor : 1.0) * ds;
			lit += v.sunlit ? ds : 0.0;
			x += xx * ds;
			elmax = fmax(elmax, v.el);
			/* And the window's constraints hold throughout. */
			assert_true(v.el >= s.st.min_el_deg * D2R - 1e-4);
		}
		/* Tolerance: the midpoint rule's error over 30 s steps of a
		   smooth integrand (well under 0.1 %), and the sunlit factor
		   switching inside a step (one step of a window of hours). */
		check_near(f->expected_returns, e, 0.01 * e + 1e-9, "returns",
		    "expected returns vs full-chain sum");
		check_near(f->sunlit_fraction, lit / f->duration_s, 0.02, "",
		    "sunlit fraction vs full chain");
		check_near(f->mean_airmass, x / f->duration_s,
		    0.01 * f->mean_airmass, "", "mean airmass vs full chain");
		/* The maximum: the ends, and 1 s samples for 2 min around the
		   time the planner gives (the 30 s samples above would find
		   a higher point anywhere else). */
		for (int k = -121; k <= 120; k++) {
			struct geom_instant g;
			struct geom_target_view v;
			double t = k < -120 ? w->start_mjd : k == 120 ?
			    w->end_mjd : w->max_el_mjd + k / 86400.0;

			if (t < w->start_mjd || t > w->end_mjd)
				continue;
			assert_int_equal(geom_instant_at(&site, NULL, MJD0, t,
			    GEOM_PREC_FULL, &g), ERRCODE_OK);
			geom_target_view(&g, &body, &v);
			elmax = fmax(elmax, v.el);
		}
		/* 1": the 1 s samples miss at most ~0.01" of a maximum
		   between them, the track is within 0.2". */
		check_near(f->max_el, elmax, 5e-6, "rad", "max elevation");
	}
	plan_result_free(&r);
}

/* --- a window's score does not depend on what else is listed --- */

static void
test_plan_score_independent_of_filter(void **state)
{
	struct site s;
	struct plan_query q;
	struct plan_result all, one, top;
	size_t found = 0;

	(void)state;
	site_make(&s);
	query_of(&s, &q, "2027-03-16T00:00:00Z", "2027-03-20T00:00:00Z");
	assert_int_equal(plan_run(&q, &all, NULL, 0), ERRCODE_OK);
	q.target = "LARK";
	assert_int_equal(plan_run(&q, &one, NULL, 0), ERRCODE_OK);
	q.target = NULL;
	q.limit = 3;
	assert_int_equal(plan_run(&q, &top, NULL, 0), ERRCODE_OK);
	assert_true(one.n > 0);
	assert_int_equal(top.n, 3);
	/* The filtered run's model is the unfiltered one (same log). */
	check_near(one.model.base_efficiency, all.model.base_efficiency, 0.0, "",
	    "pooled base rate with --target");
	for (size_t i = 0; i < one.n; i++)
		for (size_t j = 0; j < all.n; j++) {
			if (strcmp(all.w[j].target, "LARK") != 0 ||
			    all.w[j].start_mjd != one.w[i].start_mjd)
				continue;
			/* Same inputs, same arithmetic: equal to rounding. */
			check_near(one.w[i].f.score, all.w[j].f.score,
			    1e-12 * all.w[j].f.score, "", "score with --target");
			check_near(one.w[i].f.expected_returns,
			    all.w[j].f.expected_returns,
			    1e-12 * all.w[j].f.expected_returns, "returns",
			    "expected returns with --target");
			found++;
		}
	assert_int_equal(found, one.n);
	for (size_t i = 0; i < top.n; i++) {
		assert_string_equal(top.w[i].target, all.w[i].target);
		check_near(top.w[i].f.score, all.w[i].f.score, 0.0, "",
		    "score with --limit");
	}
	plan_result_free(&all);
	plan_result_free(&one);
	plan_result_free(&top);
}

/* --- renderers --- */

static void
render_all(const struct plan_result *r, struct mbuf *json, struct mbuf *csv,
    struct mbuf *ics, struct mbuf *text, struct mbuf *tonight)
{
	struct render_plan rp;

	memset(&rp, 0, sizeof rp);
	rp.r = r;
	rp.station_name = r->station.name;
	assert_int_equal(qzone_load("America/Denver", r->from_mjd,
	    r->to_mjd, &denver), ERRCODE_OK);
	rp.time_zone = &denver;
	rp.now_mjd = fixture_mjd("2027-03-18T04:00:00Z");
	rp.now_synodic_deg = 150.0;
	assert_int_equal(render_windows_json(&rp, json), ERRCODE_OK);
	assert_int_equal(render_windows_csv(&rp, csv), ERRCODE_OK);
	assert_int_equal(render_windows_ics(&rp, ics), ERRCODE_OK);
	assert_int_equal(render_windows_text(&rp, text), ERRCODE_OK);
	assert_int_equal(render_tonight_text(&rp, tonight), ERRCODE_OK);
}

static void
test_plan_renderers(void **state)
{
	static const char *fields[] = {"rank", "target", "start", "end",
	    "duration_s", "max_el_deg", "max_el_utc", "synodic_angle_deg",
	    "phase_bin", "bin_count", "coverage_weight", "sunlit_fraction",
	    "mean_airmass", "expected_returns", "score", "tilt_deg",
	    "spread_ps", "eclipse", "reasons"};
	const size_t nf = sizeof fields / sizeof fields[0];
	struct site s;
	struct plan_query q;
	struct plan_result r;
	struct mbuf js, cs, ic, tx, tn;
	json_t *root, *arr;
	json_error_t jerr;
	size_t lines = 0, events = 0;
	const char *p;

	(void)state;
	site_make(&s);
	query_of(&s, &q, "2027-03-16T00:00:00Z", "2027-03-19T00:00:00Z");
	assert_int_equal(plan_run(&q, &r, NULL, 0), ERRCODE_OK);
	assert_true(r.n > 0);
	mbuf_init(&js);
	mbuf_init(&cs);
	mbuf_init(&ic);
	mbuf_init(&tx);
	mbuf_init(&tn);
	render_all(&r, &js, &cs, &ic, &tx, &tn);

	/* JSON: {"windows":[...]} with exactly the documented fields. */
	root = json_loads(js.data, 0, &jerr);
	assert_non_null(root);
	arr = json_object_get(root, "windows");
	assert_true(json_is_array(arr));
	assert_int_equal(json_array_size(arr), r.n);
	for (size_t i = 0; i < json_array_size(arr); i++) {
		json_t *o = json_array_get(arr, i);

		assert_int_equal(json_object_size(o), nf);
		for (size_t k = 0; k < nf; k++)
			assert_non_null(json_object_get(o, fields[k]));
		assert_true(json_is_array(json_object_get(o, "reasons")));
	}
	json_decref(root);

	/* CSV (RFC 4180): CRLF records, a header, 20 fields a record (the
	   JSON's, with the eclipse as three: kind, greatest, shadow). */
	for (p = cs.data; *p; p++) {
		if (*p == '\n')
			assert_true(p > cs.data && p[-1] == '\r');
	}
	{
		int inq = 0;
		size_t nfld = 1;

		for (p = cs.data; *p; p++) {
			if (*p == '"')
				inq = !inq;
			else if (!inq && *p == ',')
				nfld++;
			else if (!inq && *p == '\n') {
				assert_int_equal(nfld, nf + 2);
				nfld = 1;
				lines++;
			}
		}
		assert_false(inq);
		assert_int_equal(lines, r.n + 1);
	}
	assert_true(strncmp(cs.data, "rank,target,start,end,", 22) == 0);

	/* iCalendar (RFC 5545): CRLF, <= 75 octets a line, one VEVENT a
	   window, UID = target and start. */
	lines = 0;
	for (p = ic.data; *p;) {
		const char *e = strstr(p, "\r\n");

		assert_non_null(e);
		assert_true(e - p <= 75);
		assert_null(memchr(p, '\n', (size_t)(e - p)));
		if (strncmp(p, "BEGIN:VEVENT", 12) == 0)
			events++;
		p = e + 2;
		lines++;
	}
	assert_int_equal(events, r.n);
	assert_non_null(strstr(ic.data, "BEGIN:VCALENDAR\r\nVERSION:2.0\r\n"
	    "PRODID:"));
	assert_non_null(strstr(ic.data, "DTSTAMP:20270318T040000Z\r\n"));
	{
		char uid[80], st[24];
		int y, mo, d, h, mi;
		double sec;

		assert_int_equal(tscale_utc_fields(MJD0, r.w[0].start_mjd +
		    0.5 / 86400.0, &y, &mo, &d, &h, &mi, &sec), ERRCODE_OK);
		snprintf(st, sizeof st, "%04d%02d%02dT%02d%02d%02dZ", y, mo, d,
		    h, mi, (int)sec);
		snprintf(uid, sizeof uid, "UID:%s-%s@moonrange\r\n",
		    r.w[0].target, st);
		assert_non_null(strstr(ic.data, uid));
	}

	/* Tonight: 80 columns. */
	for (p = tn.data; *p;) {
		const char *e = strchr(p, '\n');

		assert_non_null(e);
		assert_true(e - p <= 80);
		p = e + 1;
	}
	assert_non_null(strstr(tn.data, "Best now:"));
	assert_non_null(strstr(tx.data, "America/Denver"));
	assert_non_null(strstr(js.data, "\"dut1_source\": \"none\""));
	mbuf_free(&js);
	mbuf_free(&cs);
	mbuf_free(&ic);
	mbuf_free(&tx);
	mbuf_free(&tn);
	plan_result_free(&r);
}

/* --- the database and the CLI print the same bytes --- */

static char *
slurp(const char *path)
{
	FILE *f = fopen(path, "rb");
	char *buf;
	long n;

	assert_non_null(f);
	fseek(f, 0, SEEK_END);
	n = ftell(f);
	fseek(f, 0, SEEK_SET);
	buf = calloc((size_t)n + 1, 1);
	assert_non_null(buf);
	assert_int_equal(fread(buf, 1, (size_t)n, f), (size_t)n);
	fclose(f);
	return buf;
}

static void
test_plan_db_and_cli_same_bytes(void **state)
{
	struct site s;
	struct store *st = NULL;
	struct plan_query q;
	struct plan_db hold;
	struct plan_result r;
	struct render_plan rp;
	struct mbuf js;
	char db[300], outp[300], cmd[1200], err[200];
	const char *bin = getenv("MOONRANGE_BIN");
	char *cli;

	(void)state;
	site_make(&s);
	snprintf(db, sizeof db, "%s/site.db", fixture_dir);
	assert_int_equal(store_open(db, STORE_OPEN_CREATE, &st, err,
	    sizeof err), ERRCODE_OK);
	assert_int_equal(store_station_put(st, &s.st, err, sizeof err),
	    ERRCODE_OK);
	for (int j = 0; j < NT; j++)
		assert_int_equal(store_target_add(st, &s.tg[j], err,
		    sizeof err), ERRCODE_OK);
	for (int i = 0; i < NA; i++)
		assert_int_equal(store_attempt_add(st, &s.at[i], err,
		    sizeof err), ERRCODE_OK);
	for (int i = 0; i < NNP; i++)
		assert_int_equal(store_np_add(st, &s.np[i], NULL, err,
		    sizeof err), ERRCODE_OK);
	assert_int_equal(store_blackout_add(st, &s.bo[0], err, sizeof err),
	    ERRCODE_OK);
	for (int d = 0; d < 4; d++) {	/* an invented EOP table */
		struct site_eop_row row = {fixture_mjd("2027-03-15T00:00:00Z") + d,
		    0.25, 0.1, 0.3};

		assert_int_equal(store_eop_put(st, &row, err, sizeof err),
		    ERRCODE_OK);
	}
	store_close(st);

	plan_query_init(&q);
	plan_db_init(&hold);
	assert_int_equal(plan_db_load(db, &q, &hold, err, sizeof err),
	    ERRCODE_OK);
	assert_int_equal(hold.ntargets, NT);
	/* The log as its stored statistics, current after the adds. */
	assert_int_equal(hold.stale, 0);
	assert_int_equal(hold.stats.e[0].attempts, NA);
	assert_int_equal(hold.stats.e[0].nps, NNP);
	q.from_mjd = fixture_mjd("2027-03-16T00:00:00Z");
	q.to_mjd = fixture_mjd("2027-03-18T00:00:00Z");
	assert_int_equal(plan_run(&q, &r, err, sizeof err), ERRCODE_OK);
	/* DUT1 from the table at the span's middle (constant rows). */
	assert_string_equal(r.dut1_source, "table");
	check_near(r.eop.dut1, 0.25, 1e-12, "s", "DUT1 of the table");
	memset(&rp, 0, sizeof rp);
	rp.r = &r;
	rp.station_name = q.station.name;
	assert_int_equal(qzone_load(q.station.time_zone, r.from_mjd, r.to_mjd,
	    &denver), ERRCODE_OK);
	rp.time_zone = &denver;
	mbuf_init(&js);
	assert_int_equal(render_windows_json(&rp, &js), ERRCODE_OK);

	assert_non_null(bin);
	snprintf(outp, sizeof outp, "%s/cli.json", fixture_dir);
	snprintf(cmd, sizeof cmd, "'%s' windows --db '%s' --from "
	    "2027-03-16T00:00:00Z --to 2027-03-18T00:00:00Z --json > '%s'",
	    bin, db, outp);
	assert_int_equal(system(cmd), 0);
	cli = slurp(outp);
	assert_string_equal(cli, js.data);
	free(cli);

	/* tonight (the night plan) on the database, pinned "now", fits 80
	   columns. */
	snprintf(cmd, sizeof cmd, "'%s' tonight --db '%s' --at "
	    "2027-03-18T04:00:00Z > '%s'", bin, db, outp);
	assert_int_equal(system(cmd), 0);
	cli = slurp(outp);
	assert_non_null(strstr(cli, "Gravel Flat (invented)\nTonight: "));
	assert_non_null(strstr(cli, "MDT"));
	for (const char *p = cli; *p;) {
		const char *e = strchr(p, '\n');

		assert_non_null(e);
		assert_true(e - p <= 80);
		p = e + 1;
	}
	free(cli);
	mbuf_free(&js);
	plan_result_free(&r);
	plan_db_free(&hold);
}

/* --- bad input --- */

static void
test_plan_bad_input(void **state)
{
	struct site s;
	struct plan_query q;
	struct plan_result r;
	char err[200];

	(void)state;
	site_make(&s);
	query_of(&s, &q, "2027-03-16T00:00:00Z", "2027-03-17T00:00:00Z");
	q.target = "NOPE";
	assert_int_equal(plan_run(&q, &r, err, sizeof err), ERRCODE_NOT_FOUND);
	assert_non_null(strstr(err, "NOPE"));
	q.target = "moon";	/* only without targets */
	assert_int_equal(plan_run(&q, &r, err, sizeof err), ERRCODE_NOT_FOUND);
	q.target = NULL;
	q.to_mjd = q.from_mjd - 1;
	assert_int_equal(plan_run(&q, &r, err, sizeof err), ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "to"));
	query_of(&s, &q, "2027-03-16T00:00:00Z", "2027-03-17T00:00:00Z");
	q.station.min_el_deg = 95;
	assert_int_equal(plan_run(&q, &r, err, sizeof err), ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "min_el"));
	query_of(&s, &q, "2027-03-16T00:00:00Z", "2027-03-17T00:00:00Z");
	q.settings.nbins = 2;
	assert_int_equal(plan_run(&q, &r, err, sizeof err), ERRCODE_BAD_ARG);
	assert_non_null(strstr(err, "coverage_bins"));
	/* No targets: the Moon's centre, id "moon". */
	query_of(&s, &q, "2027-03-16T00:00:00Z", "2027-03-18T00:00:00Z");
	q.ntargets = 0;
	assert_int_equal(plan_run(&q, &r, err, sizeof err), ERRCODE_OK);
	assert_true(r.n > 0);
	assert_string_equal(r.w[0].target, "moon");
	plan_result_free(&r);
}

/* --- allocation failures --- */

static void
test_plan_allocation_failure(void **state)
{
	struct site s;
	struct plan_query q;
	long k;
	int done = 0;

	(void)state;
	site_make(&s);
	query_of(&s, &q, "2027-03-16T00:00:00Z", "2027-03-17T00:00:00Z");
	for (k = 1; k < 5000 && !done; k++) {
		struct plan_result r;
		struct render_plan rp;
		struct mbuf b;
		enum errcode rc;

		mem_fail_after(k);
		rc = plan_run(&q, &r, NULL, 0);
		assert_true(rc == ERRCODE_OK || rc == ERRCODE_NOMEM);
		if (rc == ERRCODE_OK) {
			memset(&rp, 0, sizeof rp);
			rp.r = &r;
			if (qzone_load("America/Denver", r.from_mjd,
			    r.to_mjd, &denver) == ERRCODE_OK)
				rp.time_zone = &denver;
			mbuf_init(&b);
			rc = render_windows_json(&rp, &b);
			if (rc == ERRCODE_OK)
				rc = render_windows_csv(&rp, &b);
			if (rc == ERRCODE_OK)
				rc = render_windows_ics(&rp, &b);
			if (rc == ERRCODE_OK)
				rc = render_tonight_text(&rp, &b);
			assert_true(rc == ERRCODE_OK || rc == ERRCODE_NOMEM);
			done = rc == ERRCODE_OK;
			mbuf_free(&b);
			plan_result_free(&r);
		}
	}
	mem_fail_after(0);
	assert_true(done);
	assert_true(k > 5);	/* failures were injected along the way */
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_plan_factors_against_full_chain),
		cmocka_unit_test(test_plan_score_independent_of_filter),
		cmocka_unit_test(test_plan_renderers),
		cmocka_unit_test(test_plan_db_and_cli_same_bytes),
		cmocka_unit_test(test_plan_bad_input),
		cmocka_unit_test(test_plan_allocation_failure),
	};

	render_json_setup();
	return cmocka_run_group_tests_name("plan", tests, fixture_dir_setup,
	    fixture_dir_teardown);
}
