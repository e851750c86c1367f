/* SPDX-License-Identifier: BSD-3-Clause */
/* render_plan.c: ranked observing windows as JSON, CSV, iCalendar and
   text, and the operator's view of tonight. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>
#include <jansson.h>

#include "core/tscale.h"
#include "core/text.h"
#include "formats/render_json.h"
#include "formats/render_plan.h"
#include "formats/render_time.h"
#include "formats/render_site.h"
#include "formats/render_text.h"

#define R2D (ERFA_DR2D)

static int
set(json_t *o, const char *k, json_t *v)
{
	return json_object_set_new(o, k, v);
}

/* A window's or run's tilt_deg, spread_ps and eclipse (an object with
   kind, greatest and shadow, or null) set on o: 0, or non-zero when a
   member could not be set. */
static int
physics_json(json_t *o, const struct plan_physics *ph)
{
	json_t *e;
	int bad = 0;

	bad |= set(o, "tilt_deg", render_json_num(ph->tilt_deg, 3));
	bad |= set(o, "spread_ps", render_json_num(ph->spread_ps, 3));
	if (!ph->eclipse)
		return bad | set(o, "eclipse", json_null());
	e = json_object();
	if (e == NULL)
		return -1;
	bad |= set(e, "kind", json_string(eclipse_kind_name(ph->kind)));
	bad |= set(e, "greatest", render_json_mjd(ph->greatest_mjd, 0));
	bad |= set(e, "shadow", json_string(eclipse_shadow_name(ph->shadow)));
	return bad | set(o, "eclipse", e);
}

/* The same as five CSV fields, each followed by a comma: tilt_deg,
   spread_ps, eclipse_kind, eclipse_greatest, eclipse_shadow. */
static void
physics_csv(struct mbuf *out, const struct plan_physics *ph)
{
	char g[40];

	if (isfinite(ph->tilt_deg))
		mbuf_printf(out, "%.3f,%.3f,", ph->tilt_deg, ph->spread_ps);
	else
		mbuf_puts(out, ",,");
	if (!ph->eclipse) {
		mbuf_puts(out, ",,,");
		return;
	}
	render_utc_text(ph->greatest_mjd, 0, g, sizeof g);
	mbuf_printf(out, "%s,%s,%s,", eclipse_kind_name(ph->kind), g,
	    eclipse_shadow_name(ph->shadow));
}

int
render_plan_detail_json(json_t *o, const struct plan_physics *ph,
    const char (*reasons)[PLAN_REASON_LEN], size_t n)
{
	json_t *r = json_array();
	int bad = physics_json(o, ph);

	bad |= set(o, "reasons", r);
	for (size_t i = 0; i < n && r != NULL; i++)
		bad |= json_array_append_new(r, json_string(reasons[i]));
	return bad;
}

enum errcode
render_plan_detail_csv(struct mbuf *out, const struct plan_physics *ph,
    const char (*reasons)[PLAN_REASON_LEN], size_t n)
{
	struct mbuf rs;

	physics_csv(out, ph);
	mbuf_init(&rs);
	for (size_t k = 0; k < n; k++)
		mbuf_printf(&rs, "%s%s", k ? "; " : "", reasons[k]);
	if (mbuf_status(&rs) != ERRCODE_OK) {
		mbuf_free(&rs);
		return ERRCODE_NOMEM;
	}
	render_site_csv_field(out, rs.data != NULL ? rs.data : "");
	mbuf_puts(out, "\r\n");
	mbuf_free(&rs);
	return ERRCODE_OK;
}

static json_t *
window_json(const void *rec)
{
	const struct plan_window *w = rec;
	const struct score_window *f = &w->f;
	json_t *o = json_object();
	int bad;

	if (o == NULL)
		return NULL;
	bad = set(o, "rank", json_integer((json_int_t)f->rank));
	bad |= set(o, "target", json_string(w->target));
	bad |= set(o, "start", render_json_mjd(w->start_mjd, 0));
	bad |= set(o, "end", render_json_mjd(w->end_mjd, 0));
	bad |= set(o, "duration_s", render_json_num(f->duration_s, 0));
	bad |= set(o, "max_el_deg", render_json_num(f->max_el * R2D, 2));
	bad |= set(o, "max_el_utc", render_json_mjd(w->max_el_mjd, 0));
	bad |= set(o, "synodic_angle_deg", render_json_num(f->synodic * R2D,
	    2));
	bad |= set(o, "phase_bin", json_integer(f->phase_bin));
	bad |= set(o, "bin_count", json_integer(f->bin_count));
	bad |= set(o, "coverage_weight", render_json_num(f->coverage_weight,
	    6));
	bad |= set(o, "sunlit_fraction", render_json_num(f->sunlit_fraction,
	    4));
	bad |= set(o, "mean_airmass", render_json_num(f->mean_airmass, 4));
	bad |= set(o, "expected_returns",
	    render_json_num(f->expected_returns, 6));
	bad |= set(o, "score", render_json_num(f->score, 6));
	bad |= render_plan_detail_json(o, &w->phys, w->reasons, w->nreasons);
	return render_json_checked(o, bad);
}

enum errcode
render_windows_json(const struct render_plan *p, struct mbuf *out)
{
	const struct plan_result *r = p->r;
	const struct site_station *st = &r->station;
	json_t *root = json_object(), *o, *arr, *a2;
	int bad = root == NULL;

	if (bad)
		return ERRCODE_NOMEM;
	bad |= set(root, "from", render_json_mjd(r->from_mjd, 0));
	bad |= set(root, "to", render_json_mjd(r->to_mjd, 0));
	bad |= set(root, "dut1_s", render_json_num(r->eop.dut1, 4));
	bad |= set(root, "dut1_source", json_string(r->dut1_source != NULL ?
	    r->dut1_source : "none"));
	o = json_object();
	bad |= set(root, "station", o);
	if (o != NULL) {
		bad |= set(o, "name", p->station_name ?
		    json_string(p->station_name) : json_null());
		bad |= set(o, "lat_deg", render_json_num(st->lat_deg, 7));
		bad |= set(o, "lon_deg", render_json_num(st->lon_deg, 7));
		bad |= set(o, "height_m", render_json_num(st->height_m, 2));
		bad |= set(o, "time_zone", p->time_zone ?
		    json_string(p->time_zone->name) : json_null());
	}
	o = json_object();
	bad |= set(root, "limits", o);
	if (o != NULL) {
		bad |= set(o, "min_el_deg", render_json_num(st->min_el_deg, 4));
		bad |= set(o, "max_sun_el_deg",
		    render_json_num(st->max_sun_el_deg, 4));
		bad |= set(o, "min_sun_sep_deg",
		    render_json_num(st->min_sun_sep_deg, 4));
		bad |= set(o, "elevation", json_string("geometric"));
	}
	o = json_object();
	bad |= set(root, "model", o);
	if (o != NULL) {
		bad |= set(o, "zenith_tau", render_json_num(st->zenith_tau, 4));
		bad |= set(o, "fire_rate_hz", render_json_num(st->fire_rate_hz,
		    3));
		bad |= set(o, "coverage_bins", json_integer(r->settings.nbins));
		bad |= set(o, "coverage_alpha",
		    render_json_num(r->settings.alpha, 4));
		bad |= set(o, "coverage_k", render_json_num(r->settings.k, 4));
		bad |= set(o, "coverage_per_target",
		    json_boolean(r->settings.per_target));
		bad |= set(o, "base_efficiency",
		    render_json_num(r->model.base_efficiency, 9));
		bad |= set(o, "base_sunlit_factor",
		    render_json_num(r->model.base_sunlit, 6));
		bad |= set(o, "attempts_used",
		    json_integer(r->model.attempts_used));
		bad |= set(o, "attempts_skipped",
		    json_integer(r->model.attempts_skipped));
		arr = json_array();
		bad |= set(o, "pooled_bin_counts", arr);
		for (int b = 0; b < r->settings.nbins && arr != NULL; b++)
			bad |= json_array_append_new(arr,
			    json_integer(r->pooled[b]));
		arr = json_array();
		bad |= set(o, "targets", arr);
		for (size_t j = 0; j < r->nmodels && arr != NULL; j++) {
			const struct plan_target_model *m = &r->models[j];

			a2 = json_object();
			bad |= json_array_append_new(arr, a2);
			if (a2 == NULL)
				continue;
			bad |= set(a2, "id", json_string(m->id));
			bad |= set(a2, "strength", render_json_num(m->strength,
			    4));
			bad |= set(a2, "returns_per_shot_above_atmosphere",
			    render_json_num(m->y.rate, 9));
			bad |= set(a2, "returns_per_shot_at_zenith",
			    render_json_num(m->y.rate *
			    exp(-2.0 * st->zenith_tau), 9));
			bad |= set(a2, "link_returns_per_shot",
			    render_json_num(m->y.link_rate, 9));
			bad |= set(a2, "efficiency",
			    render_json_num(m->y.efficiency, 6));
			bad |= set(a2, "prior_returns_per_shot",
			    render_json_num(m->y.prior_rate, 9));
			bad |= set(a2, "sunlit_factor",
			    render_json_num(m->y.sunlit_factor, 6));
			bad |= set(a2, "attempts", json_integer(m->y.attempts));
		}
	}
	bad |= set(root, "total_windows", json_integer((json_int_t)r->total));
	bad |= render_json_list(root, "windows", r->w, r->n, sizeof r->w[0],
	    window_json);
	return render_json_dump(render_json_checked(root, bad), out);
}

/* --- CSV (RFC 4180) --- */

/* One field (RFC 4180 2.6 quoting, render_site's), then a comma or, for
   the last, CRLF. */
static void
csv_field(struct mbuf *b, const char *s, int last)
{
	render_site_csv_field(b, s);
	mbuf_puts(b, last ? "\r\n" : ",");
}

enum errcode
render_windows_csv(const struct render_plan *p, struct mbuf *out)
{
	static const char *head[] = {"rank", "target", "start", "end",
	    "duration_s", "max_el_deg", "max_el_utc", "synodic_angle_deg",
	    "phase_bin", "bin_count", "coverage_weight", "sunlit_fraction",
	    "mean_airmass", "expected_returns", "score", "tilt_deg",
	    "spread_ps", "eclipse_kind", "eclipse_greatest", "eclipse_shadow",
	    "reasons"};
	const size_t nh = sizeof head / sizeof head[0];

	for (size_t i = 0; i < nh; i++)
		csv_field(out, head[i], i + 1 == nh);
	for (size_t i = 0; i < p->r->n; i++) {
		const struct plan_window *w = &p->r->w[i];
		const struct score_window *f = &w->f;
		char a[40], b[40], m[40], line[512];

		render_utc_text(w->start_mjd, 0, a, sizeof a);
		render_utc_text(w->end_mjd, 0, b, sizeof b);
		render_utc_text(w->max_el_mjd, 0, m, sizeof m);
		snprintf(line, sizeof line, "%zu", f->rank);
		csv_field(out, line, 0);
		csv_field(out, w->target, 0);
		csv_field(out, a, 0);
		csv_field(out, b, 0);
		snprintf(line, sizeof line, "%.0f,%.2f,%s,%.2f,%d,%ld,%.6f,"
		    "%.4f,%.4f,%.6f,%.6f", f->duration_s, f->max_el * R2D, m,
		    f->synodic * R2D, f->phase_bin, f->bin_count,
		    f->coverage_weight, f->sunlit_fraction, f->mean_airmass,
		    f->expected_returns, f->score);
		mbuf_puts(out, line);
		mbuf_puts(out, ",");
		if (render_plan_detail_csv(out, &w->phys, w->reasons,
		    w->nreasons) != ERRCODE_OK)
			return ERRCODE_NOMEM;
	}
	return mbuf_status(out);
}

/* --- iCalendar (RFC 5545) --- */

/* Basic-format UTC "YYYYMMDDTHHMMSSZ", rounded to the second. */
void
render_ics_time(double mjd, char *buf, size_t len)
{
	int y, mo, d, h, mi;
	double s;

	if (tscale_utc_fields(TEXT_MJD0, mjd + 0.5 / ERFA_DAYSEC, &y, &mo, &d, &h,
	    &mi, &s) != ERRCODE_OK) {
		snprintf(buf, len, "19700101T000000Z");
		return;
	}
	snprintf(buf, len, "%04d%02d%02dT%02d%02d%02dZ", y, mo, d, h, mi,
	    (int)floor(s));
}

/*
 * Append one content line, folded: at most 75 octets a line, each
 * continuation starting with a space (RFC 5545, 3.1); never inside a
 * UTF-8 sequence.
 */
void
render_ics_line(struct mbuf *b, const char *s)
{
	size_t n = strlen(s), col = 0;

	for (size_t i = 0; i < n; i++) {
		unsigned char c = (unsigned char)s[i];
		size_t clen = 1;

		if (c >= 0xC0)
			while (i + clen < n &&
			    ((unsigned char)s[i + clen] & 0xC0) == 0x80)
				clen++;
		if (col + clen > 75) {
			mbuf_puts(b, "\r\n ");
			col = 1;
		}
		mbuf_add(b, s + i, clen);
		col += clen;
		i += clen - 1;
	}
	mbuf_puts(b, "\r\n");
}

/* An iCalendar TEXT value's escapes (3.3.11); a CR is dropped. */
static const char *const ics_escapes[RENDER_TEXT_ASCII] = {
	['\\'] = "\\\\", [';'] = "\\;", [','] = "\\,", ['\n'] = "\\n",
	['\r'] = "",
};

/* A property "NAME:" with an escaped TEXT value, folded. */
void
render_ics_prop_text(struct mbuf *out, const char *name, const char *value)
{
	struct mbuf t;

	mbuf_init(&t);
	mbuf_puts(&t, name);
	mbuf_puts(&t, ":");
	render_text_escape(&t, value, ics_escapes, NULL);
	if (mbuf_status(&t) != ERRCODE_OK || t.data == NULL)
		out->failed = 1;
	else
		render_ics_line(out, t.data);
	mbuf_free(&t);
}

void
render_ics_calendar_begin(struct mbuf *out, const char *prodid)
{
	render_ics_line(out, "BEGIN:VCALENDAR");
	render_ics_line(out, "VERSION:2.0");
	render_ics_line(out, prodid);
	render_ics_line(out, "CALSCALE:GREGORIAN");
	render_ics_line(out, "METHOD:PUBLISH");
}

void
render_ics_event_begin(struct mbuf *out, const char *uid, const char *stamp,
    const char *start, const char *end)
{
	char line[256];

	render_ics_line(out, "BEGIN:VEVENT");
	snprintf(line, sizeof line, "UID:%s", uid);
	render_ics_line(out, line);
	snprintf(line, sizeof line, "DTSTAMP:%s", stamp);
	render_ics_line(out, line);
	snprintf(line, sizeof line, "DTSTART:%s", start);
	render_ics_line(out, line);
	snprintf(line, sizeof line, "DTEND:%s", end);
	render_ics_line(out, line);
}

void
render_ics_reasons_desc(struct mbuf *out, struct mbuf *d,
    const char (*reasons)[PLAN_REASON_LEN], size_t n)
{
	for (size_t k = 0; k < n; k++)
		mbuf_printf(d, "- %s\n", reasons[k]);
	mbuf_puts(d, "Planning aid only: follow the station's laser-"
	    "safety, aircraft and satellite avoidance rules.");
	if (mbuf_status(d) != ERRCODE_OK || d->data == NULL)
		out->failed = 1;
	else
		render_ics_prop_text(out, "DESCRIPTION", d->data);
	mbuf_free(d);
}

enum errcode
render_windows_ics(const struct render_plan *p, struct mbuf *out)
{
	char now[24], line[256];

	render_ics_time(p->now_mjd, now, sizeof now);
	render_ics_calendar_begin(out, "PRODID:-//moonrange//observing windows "
	    MOONRANGE_VERSION "//EN");
	for (size_t i = 0; i < p->r->n; i++) {
		const struct plan_window *w = &p->r->w[i];
		const struct score_window *f = &w->f;
		char a[24], b[24], m[40];
		struct mbuf d;

		render_ics_time(w->start_mjd, a, sizeof a);
		render_ics_time(w->end_mjd, b, sizeof b);
		render_utc_text(w->max_el_mjd, 0, m, sizeof m);
		snprintf(line, sizeof line, "%s-%s@moonrange", w->target, a);
		render_ics_event_begin(out, line, now, a, b);
		snprintf(line, sizeof line, "Range %s (rank %zu, score %.4g)",
		    w->target, f->rank, f->score);
		render_ics_prop_text(out, "SUMMARY", line);
		mbuf_init(&d);
		mbuf_printf(&d, "rank %zu of %zu; score %.6g; expected returns "
		    "%.6g; coverage weight %.4f\n", f->rank, p->r->total,
		    f->score, f->expected_returns, f->coverage_weight);
		mbuf_printf(&d, "max elevation %.2f deg at %s; mean airmass "
		    "%.3f; sunlit fraction %.2f\n", f->max_el * R2D, m,
		    f->mean_airmass, f->sunlit_fraction);
		mbuf_printf(&d, "synodic angle %.2f deg; phase bin %d with %ld "
		    "normal points\n", f->synodic * R2D, f->phase_bin,
		    f->bin_count);
		render_ics_reasons_desc(out, &d, w->reasons, w->nreasons);
		render_ics_line(out, "TRANSP:TRANSPARENT");
		render_ics_line(out, "END:VEVENT");
	}
	render_ics_line(out, "END:VCALENDAR");
	return mbuf_status(out);
}

/* --- text --- */

/* A score for a table: whole numbers from 10 up (no exponent a person
   has to decode), three significant figures below and past 1e8. */
static void
score_text(double score, char *buf, size_t len)
{
	if (score >= 10.0 && score < 1e8)
		snprintf(buf, len, "%.0f", score);
	else
		snprintf(buf, len, "%.3g", score);
}

/*
 * Local "MM-DD HH:MM" and zone abbreviation of a UTC MJD; falls back to
 * UTC when there is no zone.
 */
void
render_local_parts(double mjd, const struct tzone *tz, char *day, char *hm,
    char *zone)
{
	char buf[48];

	strcpy(day, "?");
	strcpy(hm, "?");
	strcpy(zone, "");
	if (tz == NULL || tzone_format(tz, TEXT_MJD0, mjd, buf, sizeof buf) !=
	    ERRCODE_OK) {
		render_utc_text(mjd, 0, buf,
		    sizeof buf);	/* YYYY-MM-DDTHH:MM:SSZ */
		buf[16] = '\0';
		strcpy(zone, "UTC");
	} else if (strlen(buf) > 17) {
		snprintf(zone, 8, "%.7s", buf + 17);
	}
	if (strlen(buf) >= 16) {
		memcpy(day, buf + 5, 5);
		day[5] = '\0';
		memcpy(hm, buf + 11, 5);
		hm[5] = '\0';
	}
}

enum errcode
render_windows_text(const struct render_plan *p, struct mbuf *out)
{
	const struct plan_result *r = p->r;
	char a[40], b[40];

	render_utc_text(r->from_mjd, 0, a, sizeof a);
	render_utc_text(r->to_mjd, 0, b, sizeof b);
	if (p->station_name != NULL)
		mbuf_printf(out, "%s\n", p->station_name);
	mbuf_printf(out, "Windows %s to %s: %zu found, %zu shown\n", a, b,
	    r->total, r->n);
	mbuf_printf(out, "Limits: elevation >= %.1f deg, Sun <= %.1f deg, "
	    "Sun-Moon >= %.1f deg\n", r->station.min_el_deg,
	    r->station.max_sun_el_deg, r->station.min_sun_sep_deg);
	if (p->wide)
		mbuf_printf(out, "%4s %-10s %-17s %-17s %4s %5s %3s %5s %6s "
		    "%9s\n", "rank", "target", "UTC", p->time_zone ? "local" :
		    "", "min", "maxel", "bin", "n", "W", "score");
	else
		mbuf_printf(out, "%4s %-9s %-17s %s%4s %5s %3s %4s %5s %8s\n",
		    "rank", "target", "UTC", p->time_zone ? "local       " :
		    "", "min", "maxel", "bin", "n", "W", "score");
	for (size_t i = 0; i < r->n; i++) {
		const struct plan_window *w = &r->w[i];
		const struct score_window *f = &w->f;
		char d1[8], h1[8], z1[8], d2[8], h2[8], z2[8];
		char u1[24], u2[24], l[24], sc[24];

		render_local_parts(w->start_mjd, NULL, d1, h1, z1);
		render_local_parts(w->end_mjd, NULL, d2, h2, z2);
		snprintf(u1, sizeof u1, "%s %s-%s", d1, h1, h2);
		l[0] = '\0';
		if (p->time_zone != NULL) {
			render_local_parts(w->start_mjd, p->time_zone, d1, h1, z1);
			render_local_parts(w->end_mjd, p->time_zone, d2, h2, z2);
			/* 80 columns: the local hours; the date is UTC's. */
			if (p->wide)
				snprintf(l, sizeof l, "%s %s-%s", d1, h1, h2);
			else
				snprintf(l, sizeof l, "%s-%s ", h1, h2);
		}
		snprintf(u2, sizeof u2, "%.0f", f->duration_s / 60.0);
		score_text(f->score, sc, sizeof sc);
		if (p->wide)
			mbuf_printf(out, "%4zu %-10.10s %-17s %-17s %4s %5.1f "
			    "%3d %5ld %6.2f %9s\n", f->rank, w->target, u1, l,
			    u2, f->max_el * R2D, f->phase_bin, f->bin_count,
			    f->coverage_weight, sc);
		else
			mbuf_printf(out, "%4zu %-9.9s %-17s %s%4s %5.1f %3d "
			    "%4ld %5.2f %8s\n", f->rank, w->target, u1, l, u2,
			    f->max_el * R2D, f->phase_bin, f->bin_count,
			    f->coverage_weight, sc);
	}
	if (r->n == 0)
		mbuf_puts(out, "(no window meets every limit in the span)\n");
	if (p->time_zone != NULL)
		mbuf_printf(out, "Local times: %s.\n", p->time_zone->name);
	return mbuf_status(out);
}

/* Best open window at instant t (lowest rank), or NULL. */
static const struct plan_window *
best_at(const struct plan_result *r, double t)
{
	const struct plan_window *best = NULL;

	for (size_t i = 0; i < r->n; i++)
		if (r->w[i].start_mjd <= t && r->w[i].end_mjd > t &&
		    (best == NULL || r->w[i].f.rank < best->f.rank))
			best = &r->w[i];
	return best;
}

enum errcode
render_tonight_text(const struct render_plan *p, struct mbuf *out)
{
	const struct plan_result *r = p->r;
	const struct tzone *tz = p->time_zone;
	const struct plan_window *now = best_at(r, p->now_mjd), *nx;
	double width = 360.0 / r->settings.nbins, tnext = INFINITY;
	int bin = score_bin_of(p->now_synodic_deg, r->settings.nbins);
	double mean = score_bin_mean(r->pooled, r->settings.nbins);
	char d[8], h[8], z[8], d2[8], h2[8], z2[8], u[40];

	render_local_parts(r->from_mjd, tz, d, h, z);
	render_local_parts(r->to_mjd, tz, d2, h2, z2);
	render_utc_text(r->from_mjd, 0, u, sizeof u);
	mbuf_printf(out, "Tonight at %.60s\n", p->station_name ?
	    p->station_name : "the station");
	mbuf_printf(out, "Night %.4s-%s %s to %s %s %s\n", u, d, h, d2, h2, z2);
	render_local_parts(p->now_mjd, tz, d, h, z);
	render_utc_text(p->now_mjd, 0, u, sizeof u);
	mbuf_printf(out, "Now %s %s %s (%s)\n", d, h, z, u);
	{
		char line[256];

		snprintf(line, sizeof line, "synodic angle %.1f deg (%s); bin %d "
		    "(%.0f-%.0f deg) holds %ld normal points against a mean of "
		    "%.1f", p->now_synodic_deg,
		    plan_phase_label(p->now_synodic_deg), bin, bin * width,
		    (bin + 1) * width, r->pooled[bin], mean);
		render_text_wrap(out, "Phase now: ", "           ", line);
	}

	/* The next instant after now at which the best open window changes. */
	for (size_t i = 0; i < r->n; i++) {
		double e[2] = {r->w[i].start_mjd, r->w[i].end_mjd};

		for (int k = 0; k < 2; k++)
			if (e[k] > p->now_mjd && e[k] < tnext &&
			    best_at(r, e[k]) != now)
				tnext = e[k];
	}
	if (now != NULL) {
		render_local_parts(now->end_mjd, tz, d, h, z);
		mbuf_printf(out, "Best now: %s (rank %zu), open until %s %s\n",
		    now->target, now->f.rank, h, z);
	} else {
		mbuf_puts(out, "Best now: no target meets every limit\n");
	}
	if (isfinite(tnext)) {
		nx = best_at(r, tnext);
		render_local_parts(tnext, tz, d, h, z);
		render_utc_text(tnext, 0, u, sizeof u);
		mbuf_printf(out, "Next change: %s %s (%.5s UTC) -> %s\n", h, z,
		    u + 11, nx != NULL ? nx->target : "nothing open");
	} else {
		mbuf_puts(out, "Next change: none before the night ends\n");
	}
	mbuf_printf(out, "\n%4s %-10s %-11s %-11s %4s %5s %4s %3s %5s %8s\n",
	    "rank", "target", "local", "UTC", "min", "maxel", "lit%", "bin",
	    "W", "score");
	for (size_t i = 0; i < r->n; i++) {
		const struct plan_window *w = &r->w[i];
		const struct score_window *f = &w->f;
		char lt[16], ut[16], sc[24];

		render_local_parts(w->start_mjd, tz, d, h, z);
		render_local_parts(w->end_mjd, tz, d2, h2, z2);
		snprintf(lt, sizeof lt, "%s-%s", h, h2);
		render_local_parts(w->start_mjd, NULL, d, h, z);
		render_local_parts(w->end_mjd, NULL, d2, h2, z2);
		snprintf(ut, sizeof ut, "%s-%s", h, h2);
		score_text(f->score, sc, sizeof sc);
		mbuf_printf(out, "%4zu %-10.10s %-11s %-11s %4.0f %5.1f %4.0f "
		    "%3d %5.2f %8s%s\n", f->rank, w->target, lt, ut,
		    f->duration_s / 60.0, f->max_el * R2D,
		    100.0 * f->sunlit_fraction, f->phase_bin,
		    f->coverage_weight, sc,
		    w->end_mjd <= p->now_mjd ? " past" :
		    (w == now ? " <now" : ""));
	}
	if (r->n == 0)
		mbuf_puts(out, "(no window meets every limit tonight)\n");
	else
		for (size_t k = 0; k < r->w[0].nreasons; k++)
			render_text_wrap(out, k == 0 ? "\nWhy #1:\n  - " :
			    "  - ", "    ", r->w[0].reasons[k]);
	mbuf_puts(out, "\n");
	{
		char line[256];

		snprintf(line, sizeof line, "Local times are %s. Planning aid "
		    "only: the laser-safety officer, aircraft and satellite "
		    "avoidance and sun interlocks decide, under local rules.",
		    tz != NULL ? tz->name : "UTC");
		render_text_wrap(out, "", "", line);
	}
	return mbuf_status(out);
}
