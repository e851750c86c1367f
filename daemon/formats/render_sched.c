/* SPDX-License-Identifier: BSD-3-Clause */
/* render_sched.c: the night plan as JSON, CSV, iCalendar, text and an SVG
   timeline of the night. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfam.h>
#include <jansson.h>

#include "core/text.h"
#include "formats/render_json.h"
#include "formats/render_plan.h"
#include "formats/render_time.h"
#include "formats/render_cov.h"
#include "formats/render_sched.h"
#include "formats/render_site.h"
#include "formats/render_text.h"

static void
iso(double mjd, char *buf, size_t len)
{
	if (tscale_format_utc(TEXT_MJD0, mjd, 0, buf, len) != ERRCODE_OK)
		snprintf(buf, len, "?");
}

static int
set(json_t *o, const char *k, json_t *v)
{
	return json_object_set_new(o, k, v);
}

static json_t *
run_json(const void *rec)
{
	const struct night_run *r = rec;
	json_t *o = json_object();
	int bad;

	if (o == NULL)
		return NULL;
	bad = set(o, "target", json_string(r->target));
	bad |= set(o, "start", render_json_mjd(r->start_mjd, 0));
	bad |= set(o, "end", render_json_mjd(r->end_mjd, 0));
	bad |= set(o, "calibration", json_boolean(r->calibration));
	bad |= set(o, "expected_returns", render_json_num(r->expected_returns,
	    3));
	bad |= set(o, "expected_normal_points",
	    render_json_num(r->expected_nps, 4));
	bad |= set(o, "value", render_json_num(r->value, 6));
	bad |= set(o, "value_phase", render_json_num(r->value_phase, 6));
	bad |= set(o, "value_orientation",
	    render_json_num(r->value_orientation, 6));
	bad |= set(o, "el_start_deg", render_json_num(r->el_start_deg, 2));
	bad |= set(o, "el_end_deg", render_json_num(r->el_end_deg, 2));
	bad |= set(o, "el_max_deg", render_json_num(r->el_max_deg, 2));
	bad |= set(o, "synodic_angle_deg", render_json_num(r->synodic_deg, 2));
	bad |= render_plan_detail_json(o, &r->phys, r->reasons, r->nreasons);
	return render_json_checked(o, bad);
}

enum errcode
render_sched_json(const struct render_sched *p, struct mbuf *out)
{
	const struct night_result *r = p->r;
	const struct night_settings *s = &r->settings;
	json_t *root = json_object(), *o;
	int bad = root == NULL;
	size_t visited = 0;

	if (bad)
		return ERRCODE_NOMEM;
	for (size_t j = 0; j < r->ntargets; j++)
		for (size_t i = 0; i < r->nruns; i++)
			if (strcmp(r->runs[i].target, r->targets[j].id) == 0) {
				visited++;
				break;
			}
	bad |= set(root, "method", json_string(night_method_name(r->method)));
	bad |= set(root, "from", render_json_mjd(r->from_mjd, 0));
	bad |= set(root, "to", render_json_mjd(r->to_mjd, 0));
	bad |= set(root, "total_value", render_json_num(r->total_value, 6));
	bad |= set(root, "expected_normal_points",
	    render_json_num(r->expected_nps, 4));
	bad |= set(root, "greedy_value", render_json_num(r->greedy_value, 6));
	bad |= set(root, "exact", json_boolean(r->exact));
	bad |= set(root, "targets_visited", json_integer((json_int_t)visited));
	bad |= set(root, "station", p->station_name ?
	    json_string(p->station_name) : json_null());
	bad |= set(root, "time_zone", p->time_zone ?
	    json_string(p->time_zone->name) : json_null());
	bad |= set(root, "why_empty", r->nruns == 0 && r->why_empty[0] ?
	    json_string(r->why_empty) : json_null());
	o = json_object();
	bad |= set(root, "settings", o);
	if (o != NULL) {
		bad |= set(o, "value_model",
		    json_string(value_model_name(s->value.model)));
		bad |= set(o, "value_harmonics",
		    json_integer(s->value.harmonics));
		bad |= set(o, "value_phase_weight",
		    render_json_num(s->value.phase_weight, 6));
		bad |= set(o, "value_orientation_weight",
		    render_json_num(s->value.orientation_weight, 6));
		bad |= set(o, "plan_run_min_s", render_json_num(s->run_min_s, 0));
		bad |= set(o, "plan_run_max_s", render_json_num(s->run_max_s, 0));
		bad |= set(o, "plan_switch_s", render_json_num(s->switch_s, 0));
		bad |= set(o, "plan_calibration_s", render_json_num(s->cal_s, 0));
		bad |= set(o, "plan_calibration_every_s",
		    render_json_num(s->cal_every_s, 0));
		bad |= set(o, "grid_s", render_json_num(s->grid_s, 0));
	}
	bad |= render_json_list(root, "runs", r->runs, r->nruns,
	    sizeof r->runs[0], run_json);
	return render_json_dump(render_json_checked(root, bad), out);
}

/* --- CSV --- */

enum errcode
render_sched_csv(const struct render_sched *p, struct mbuf *out)
{
	static const char *head[] = {"target", "start", "end",
	    "expected_returns", "expected_normal_points", "value",
	    "value_phase", "value_orientation", "el_start_deg", "el_end_deg",
	    "tilt_deg", "spread_ps", "eclipse_kind", "eclipse_greatest",
	    "eclipse_shadow", "reasons"};
	const size_t nh = sizeof head / sizeof head[0];

	for (size_t i = 0; i < nh; i++) {
		render_site_csv_field(out, head[i]);
		mbuf_puts(out, i + 1 == nh ? "\r\n" : ",");
	}
	for (size_t i = 0; i < p->r->nruns; i++) {
		const struct night_run *r = &p->r->runs[i];
		char a[40], b[40];

		iso(r->start_mjd, a, sizeof a);
		iso(r->end_mjd, b, sizeof b);
		render_site_csv_field(out, r->target);
		mbuf_printf(out, ",%s,%s,%.3f,%.4f,%.6f,%.6f,%.6f,", a, b,
		    r->expected_returns, r->expected_nps, r->value,
		    r->value_phase, r->value_orientation);
		if (r->calibration)
			mbuf_puts(out, ",,");
		else
			mbuf_printf(out, "%.2f,%.2f,", r->el_start_deg,
			    r->el_end_deg);
		if (render_plan_detail_csv(out, &r->phys, r->reasons,
		    r->nreasons) != ERRCODE_OK)
			return ERRCODE_NOMEM;
	}
	return mbuf_status(out);
}

/* --- iCalendar --- */

enum errcode
render_sched_ics(const struct render_sched *p, struct mbuf *out)
{
	char now[24], line[256];

	render_ics_time(p->now_mjd, now, sizeof now);
	render_ics_calendar_begin(out, "PRODID:-//moonrange//night plan "
	    MOONRANGE_VERSION "//EN");
	for (size_t i = 0; i < p->r->nruns; i++) {
		const struct night_run *r = &p->r->runs[i];
		char a[24], b[24];
		struct mbuf d;

		render_ics_time(r->start_mjd, a, sizeof a);
		render_ics_time(r->end_mjd, b, sizeof b);
		snprintf(line, sizeof line, "run-%s-%s@moonrange", r->target,
		    a);
		render_ics_event_begin(out, line, now, a, b);
		if (r->calibration)
			snprintf(line, sizeof line, "Calibration run");
		else
			snprintf(line, sizeof line, "Range %s (value %.3g, "
			    "%.1f normal points)", r->target, r->value,
			    r->expected_nps);
		render_ics_prop_text(out, "SUMMARY", line);
		mbuf_init(&d);
		render_ics_reasons_desc(out, &d, r->reasons, r->nreasons);
		render_ics_line(out, "TRANSP:OPAQUE");
		render_ics_line(out, "END:VEVENT");
	}
	render_ics_line(out, "END:VCALENDAR");
	return mbuf_status(out);
}

/* --- text --- */

enum errcode
render_sched_text(const struct render_sched *p, struct mbuf *out)
{
	const struct night_result *r = p->r;
	char d1[8], h1[8], z1[8], d2[8], h2[8], z2[8];
	size_t visited = 0;

	for (size_t j = 0; j < r->ntargets; j++)
		for (size_t i = 0; i < r->nruns; i++)
			if (strcmp(r->runs[i].target, r->targets[j].id) == 0) {
				visited++;
				break;
			}
	if (p->station_name != NULL)
		mbuf_printf(out, "%s\n", p->station_name);
	render_local_parts(r->from_mjd, p->time_zone, d1, h1, z1);
	render_local_parts(r->to_mjd, p->time_zone, d2, h2, z2);
	mbuf_printf(out, "Night plan (%s): %s %s to %s %s %s\n",
	    night_method_name(r->method), d1, h1, d2, h2, z2);
	mbuf_printf(out, "%2s %-12s %-11s %-11s %3s %7s %5s %7s\n", "#",
	    "target", p->time_zone ? "local" : "", "UTC", "min", "el deg",
	    "NPs", "value");
	for (size_t i = 0; i < r->nruns; i++) {
		const struct night_run *x = &r->runs[i];
		char l[24] = "", u[24], el[16] = "";

		if (p->time_zone != NULL) {
			render_local_parts(x->start_mjd, p->time_zone, d1, h1,
			    z1);
			render_local_parts(x->end_mjd, p->time_zone, d2, h2, z2);
			snprintf(l, sizeof l, "%s-%s", h1, h2);
		}
		render_local_parts(x->start_mjd, NULL, d1, h1, z1);
		render_local_parts(x->end_mjd, NULL, d2, h2, z2);
		snprintf(u, sizeof u, "%s-%s", h1, h2);
		if (!x->calibration)
			snprintf(el, sizeof el, "%.0f-%.0f", x->el_start_deg,
			    x->el_end_deg);
		mbuf_printf(out, "%2zu %-12.12s %-11s %-11s %3.0f %7s %5.2f "
		    "%7.4f\n", i + 1, x->target, l, u,
		    (x->end_mjd - x->start_mjd) * 1440.0, el, x->expected_nps,
		    x->value);
	}
	if (r->nruns == 0)
		mbuf_printf(out, "Nothing can be ranged: %s.\n",
		    r->why_empty[0] ? r->why_empty : "no window in the span");
	else
		mbuf_printf(out, "%zu run%s on %zu target%s: %.2f normal points "
		    "expected, value %.4f (greedy %.4f%s)\n", r->nruns,
		    r->nruns == 1 ? "" : "s", visited, visited == 1 ? "" : "s",
		    r->expected_nps, r->total_value, r->greedy_value,
		    r->exact ? ", proved optimal" : "");
	if (p->time_zone != NULL)
		mbuf_printf(out, "Local times: %s.\n", p->time_zone->name);
	return mbuf_status(out);
}

/* --- tonight --- */

/* "HH:MM ZZZ (HH:MM UTC)" of an MJD. */
static void
both_times(const struct render_sched *p, double mjd, char *buf, size_t len)
{
	char d1[8], h1[8], z1[8], d2[8], h2[8], z2[8];

	render_local_parts(mjd, NULL, d2, h2, z2);
	if (p->time_zone == NULL) {
		snprintf(buf, len, "%s %s UTC", d2, h2);
		return;
	}
	render_local_parts(mjd, p->time_zone, d1, h1, z1);
	snprintf(buf, len, "%s %s %s (%s UTC)", d1, h1, z1, h2);
}

enum errcode
render_sched_tonight(const struct render_sched *p, struct mbuf *out)
{
	const struct night_result *r = p->r;
	const struct night_run *now = NULL, *why = NULL;
	char t1[64], t2[64], line[200];
	size_t first_next = r->nruns, shown = 0, visited = 0;

	for (size_t j = 0; j < r->ntargets; j++)
		for (size_t i = 0; i < r->nruns; i++)
			if (strcmp(r->runs[i].target, r->targets[j].id) == 0) {
				visited++;
				break;
			}
	for (size_t i = 0; i < r->nruns; i++) {
		if (r->runs[i].start_mjd <= p->now_mjd &&
		    p->now_mjd < r->runs[i].end_mjd)
			now = &r->runs[i];
		else if (r->runs[i].start_mjd > p->now_mjd &&
		    first_next == r->nruns)
			first_next = i;
	}
	if (p->station_name != NULL)
		mbuf_printf(out, "%s\n", p->station_name);
	{
		char d1[8], h1[8], z1[8], d2[8], h2[8], z2[8];

		render_local_parts(r->from_mjd, p->time_zone, d1, h1, z1);
		render_local_parts(r->to_mjd, p->time_zone, d2, h2, z2);
		mbuf_printf(out, "Tonight: %s %s %s to %s %s %s, plan (%s)\n",
		    d1, h1, z1, d2, h2, z2, night_method_name(r->method));
	}
	both_times(p, p->now_mjd, t1, sizeof t1);
	mbuf_printf(out, "Now: %s\n", t1);
	if (r->nruns == 0) {
		render_text_wrap(out, "Nothing can be ranged tonight: ", NULL,
		    r->why_empty[0] ? r->why_empty : "no window");
		if (isfinite(p->next_night_mjd)) {
			both_times(p, p->next_night_mjd, t1, sizeof t1);
			mbuf_printf(out, "The next plannable night starts %s.\n",
			    t1);
		} else {
			mbuf_puts(out, "No plannable night in the next 30 "
			    "days.\n");
		}
		return mbuf_status(out);
	}
	if (now != NULL) {
		both_times(p, now->end_mjd, t1, sizeof t1);
		if (now->calibration)
			mbuf_printf(out, "Now: calibration until %s\n", t1);
		else
			mbuf_printf(out, "Range now: %s until %s\n", now->target,
			    t1);
		if (!now->calibration && isfinite(p->now_el_deg))
			mbuf_printf(out, "  now: elevation %.1f deg, azimuth "
			    "%.1f deg\n", p->now_el_deg, p->now_az_deg);
		if (!now->calibration)
			mbuf_printf(out, "  %.2f normal points expected, value "
			    "%.4f\n", now->expected_nps, now->value);
		why = now;
	} else if (first_next < r->nruns) {
		both_times(p, r->runs[first_next].start_mjd, t1, sizeof t1);
		mbuf_printf(out, "Nothing to range now; next: %s at %s\n",
		    r->runs[first_next].target, t1);
		why = &r->runs[first_next];
	}
	if (first_next < r->nruns)
		mbuf_puts(out, "Next runs:\n");
	for (size_t i = first_next; i < r->nruns && shown < p->next_runs;
	    i++, shown++) {
		const struct night_run *x = &r->runs[i];

		both_times(p, x->start_mjd, t1, sizeof t1);
		render_local_parts(x->end_mjd, p->time_zone, t2, t2 + 8,
		    t2 + 16);
		snprintf(line, sizeof line, "%2zu %-12.12s %s to %s, %3.0f min, "
		    "value %.3f", i + 1, x->target, t1, t2 + 8,
		    (x->end_mjd - x->start_mjd) * 1440.0, x->value);
		mbuf_printf(out, "  %.77s\n", line);
	}
	if (shown < r->nruns - first_next && first_next < r->nruns)
		mbuf_printf(out, "  ... %zu more (moonrange plan)\n",
		    r->nruns - first_next - shown);
	mbuf_printf(out, "The night: %zu run%s on %zu target%s, %.1f normal "
	    "points expected,\n  value %.3f (greedy %.3f)\n", r->nruns,
	    r->nruns == 1 ? "" : "s", visited, visited == 1 ? "" : "s",
	    r->expected_nps, r->total_value, r->greedy_value);
	if (why != NULL)
		for (size_t k = 0; k < why->nreasons; k++)
			render_text_wrap(out, k == 0 ? "Why: " : "     ", NULL,
			    why->reasons[k]);
	if (p->time_zone != NULL)
		mbuf_printf(out, "Local times: %s.\n", p->time_zone->name);
	return mbuf_status(out);
}

/* --- SVG timeline --- */

#define SW 960.0	/* width */
#define SL 130.0	/* left margin (row labels) */
#define SR 20.0		/* right margin */
#define ST 56.0		/* top of the elevation chart */
#define SE 170.0	/* height of the elevation chart */
#define SROW 30.0	/* height of a target row */

static double
xof(const struct night_result *r, double mjd)
{
	double f = (mjd - r->from_mjd) / (r->to_mjd - r->from_mjd);

	if (f < 0)
		f = 0;
	if (f > 1)
		f = 1;
	return SL + f * (SW - SL - SR);
}

static double
yof(double el)
{
	if (el < -10)
		el = -10;
	if (el > 90)
		el = 90;
	return ST + SE * (90.0 - el) / 100.0;
}

static void
svg_text(struct mbuf *out, double x, double y, const char *anchor,
    const char *cls, const char *text)
{
	mbuf_printf(out, "<text x=\"%.1f\" y=\"%.1f\" text-anchor=\"%s\""
	    "%s%s%s>", x, y, anchor, cls[0] ? " class=\"" : "", cls,
	    cls[0] ? "\"" : "");
	render_cov_xml_escape(out, text);
	mbuf_puts(out, "</text>\n");
}

/* Is a sample in a span of kind 0 daylight, 1 twilight (Sun between the
   station's limit and the horizon), 2 target j sunlit, 3 j in a window? */
static int
span_on(const struct night_result *r, const struct night_sample *x,
    int kind, size_t j)
{
	switch (kind) {
	case 0:
		return x->sun_el_deg > 0.0;
	case 1:
		return x->sun_el_deg <= 0.0 &&
		    x->sun_el_deg > r->station.max_sun_el_deg;
	case 2:
		return ((x->lit >> j) & 1ULL) != 0;
	default:
		return ((x->open >> j) & 1ULL) != 0;
	}
}

/* Spans of samples where span_on holds, as rects from y to y + h. */
static void
svg_spans(struct mbuf *out, const struct night_result *r, int kind,
    size_t j, double y, double h, const char *cls)
{
	size_t n = r->nsamples;
	double half = n > 1 ? 0.5 * (r->samples[1].mjd - r->samples[0].mjd) :
	    0.0;

	for (size_t i = 0; i < n;) {
		const struct night_sample *s = &r->samples[i];
		int on;
		size_t k = i;

		on = span_on(r, s, kind, j);
		while (k < n && span_on(r, &r->samples[k], kind, j) == on)
			k++;
		if (on) {
			double a = xof(r, s->mjd - half);
			double b = xof(r, r->samples[k - 1].mjd + half);

			mbuf_printf(out, "<rect class=\"%s\" x=\"%.1f\" "
			    "y=\"%.1f\" width=\"%.1f\" height=\"%.1f\"/>\n",
			    cls, a, y, b - a, h);
		}
		i = k;
	}
}

enum errcode
render_sched_svg(const struct render_sched *p, struct mbuf *out)
{
	const struct night_result *r = p->r;
	size_t nrows = r->ntargets, ncal = 0;
	double h, rows_top = ST + SE + 34.0, x, y;
	char buf[320], d1[8], h1[8], z1[8];

	for (size_t i = 0; i < r->nruns; i++)
		ncal += r->runs[i].calibration;
	if (ncal > 0)
		nrows++;
	h = rows_top + SROW * (double)nrows + 64.0;
	mbuf_printf(out, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
	    "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" "
	    "width=\"%.0f\" height=\"%.0f\" viewBox=\"0 0 %.0f %.0f\" "
	    "role=\"img\" aria-labelledby=\"plan-title plan-desc\">\n",
	    SW, h, SW, h);
	mbuf_puts(out, "<title id=\"plan-title\">Night plan");
	if (p->station_name != NULL) {
		mbuf_puts(out, " - ");
		render_cov_xml_escape(out, p->station_name);
	}
	mbuf_puts(out, "</title>\n<desc id=\"plan-desc\">");
	snprintf(buf, sizeof buf, "Moon elevation across the night with the "
	    "minimum elevation, twilight and daylight shaded, each target's "
	    "sunlit and dark spans and windows, and %zu planned runs as "
	    "numbered bars, one row per target.", r->nruns);
	render_cov_xml_escape(out, buf);
	mbuf_puts(out, "</desc>\n<style>"
	    "text{font-family:sans-serif;font-size:13px;fill:#e4e8ee}"
	    ".head{font-size:16px;font-weight:bold}.small{font-size:12px;"
	    "fill:#aab4c0}.day{fill:#4a4226}.twi{fill:#2a3050}"
	    ".lit{fill:#5b6470}.open{fill:none;stroke:#8fb3d9;"
	    "stroke-width:1.5}.run{fill:#e0a040;stroke:#fff3d6;"
	    "stroke-width:1}.cal{fill:#7fc48a;stroke:#e8ffe8}"
	    ".runlabel{font-size:12px;fill:#111;font-weight:bold}"
	    ".moon{fill:none;stroke:#f0f0f0;stroke-width:2}"
	    ".minel{stroke:#ff7a7a;stroke-width:1.5;stroke-dasharray:6 4}"
	    ".grid{stroke:#39424e;stroke-width:1}"
	    ".now{stroke:#6fe0ff;stroke-width:2.5}</style>\n");
	mbuf_printf(out, "<rect width=\"%.0f\" height=\"%.0f\" "
	    "fill=\"#12161c\"/>\n", SW, h);
	render_local_parts(r->from_mjd, p->time_zone, d1, h1, z1);
	snprintf(buf, sizeof buf, "Night plan (%s) from %s %s %s: %zu runs, "
	    "%.1f normal points expected, value %.3f",
	    night_method_name(r->method), d1, h1, z1, r->nruns,
	    r->expected_nps, r->total_value);
	svg_text(out, 16.0, 24.0, "start", "head", buf);
	svg_text(out, 16.0, 44.0, "start", "small", "Shading: daylight "
	    "(brown), twilight (blue); grey in a row: target sunlit; outline: "
	    "window; bars: planned runs, numbered in order");

	/* Daylight and twilight over the chart and the rows. */
	svg_spans(out, r, 0, 0, ST, rows_top + SROW * (double)nrows - ST,
	    "day");
	svg_spans(out, r, 1, 0, ST, rows_top + SROW * (double)nrows - ST,
	    "twi");
	/* Elevation grid, the minimum elevation, the Moon. */
	for (int el = 0; el <= 90; el += 30) {
		y = yof(el);
		mbuf_printf(out, "<line class=\"grid\" x1=\"%.1f\" y1=\"%.1f\" "
		    "x2=\"%.1f\" y2=\"%.1f\"/>\n", SL, y, SW - SR, y);
		snprintf(buf, sizeof buf, "%d\xc2\xb0", el);
		svg_text(out, SL - 8.0, y + 4.0, "end", "small", buf);
	}
	svg_text(out, 16.0, ST + 14.0, "start", "", "Moon elevation");
	y = yof(r->station.min_el_deg);
	mbuf_printf(out, "<line class=\"minel\" x1=\"%.1f\" y1=\"%.1f\" "
	    "x2=\"%.1f\" y2=\"%.1f\"/>\n", SL, y, SW - SR, y);
	snprintf(buf, sizeof buf, "minimum %.0f\xc2\xb0",
	    r->station.min_el_deg);
	svg_text(out, 16.0, y + 4.0, "start", "small", buf);
	if (r->nsamples > 0) {
		mbuf_puts(out, "<polyline class=\"moon\" points=\"");
		for (size_t i = 0; i < r->nsamples; i++)
			mbuf_printf(out, "%s%.1f,%.1f", i ? " " : "",
			    xof(r, r->samples[i].mjd),
			    yof(r->samples[i].moon_el_deg));
		mbuf_puts(out, "\"/>\n");
	}
	/* Hour ticks, local time (UTC without a zone). */
	for (double t = ceil(r->from_mjd * 24.0) / 24.0; t <= r->to_mjd;
	    t += 1.0 / 24.0) {
		x = xof(r, t);
		mbuf_printf(out, "<line class=\"grid\" x1=\"%.1f\" y1=\"%.1f\" "
		    "x2=\"%.1f\" y2=\"%.1f\"/>\n", x, ST + SE, x,
		    rows_top + SROW * (double)nrows);
		render_local_parts(t, p->time_zone, d1, h1, z1);
		svg_text(out, x, ST + SE + 20.0, "middle", "small", h1);
	}
	/* One row per target: lit spans, windows, runs. */
	for (size_t j = 0; j < nrows; j++) {
		int cal = j == r->ntargets;
		const char *id = cal ? NIGHT_CALIBRATION_ID : r->targets[j].id;

		y = rows_top + SROW * (double)j;
		mbuf_printf(out, "<g class=\"row\" data-target=\"%s\">\n", id);
		svg_text(out, 16.0, y + SROW / 2 + 5.0, "start", "", id);
		if (!cal) {
			svg_spans(out, r, 2, j, y + 10.0, SROW - 20.0, "lit");
			svg_spans(out, r, 3, j, y + 4.0, SROW - 8.0, "open");
		}
		for (size_t i = 0; i < r->nruns; i++) {
			const struct night_run *x1 = &r->runs[i];
			double a, b;

			if (strcmp(x1->target, id) != 0)
				continue;
			a = xof(r, x1->start_mjd);
			b = xof(r, x1->end_mjd);
			mbuf_printf(out, "<rect class=\"%s\" x=\"%.1f\" "
			    "y=\"%.1f\" width=\"%.1f\" height=\"%.1f\" "
			    "rx=\"3\"><title>", cal ? "cal" : "run", a,
			    y + 6.0, b - a, SROW - 12.0);
			render_local_parts(x1->start_mjd, p->time_zone, d1, h1,
			    z1);
			snprintf(buf, sizeof buf, "run %zu: %s from %s %s, "
			    "%.0f min, value %.3f", i + 1, id, h1, z1,
			    (x1->end_mjd - x1->start_mjd) * 1440.0, x1->value);
			render_cov_xml_escape(out, buf);
			mbuf_puts(out, "</title></rect>\n");
			snprintf(buf, sizeof buf, "%zu", i + 1);
			if (b - a >= 14.0)
				svg_text(out, 0.5 * (a + b), y + SROW / 2 + 4.0,
				    "middle", "runlabel", buf);
		}
		mbuf_puts(out, "</g>\n");
	}
	/* Now. */
	if (p->now_mjd >= r->from_mjd && p->now_mjd <= r->to_mjd) {
		x = xof(r, p->now_mjd);
		mbuf_printf(out, "<line class=\"now\" id=\"plan-now\" x1=\"%.1f\" "
		    "y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>\n", x, ST - 4.0, x,
		    rows_top + SROW * (double)nrows);
		svg_text(out, x, rows_top + SROW * (double)nrows + 18.0,
		    "middle", "", "now");
	}
	if (r->nruns == 0) {
		snprintf(buf, sizeof buf, "Nothing can be ranged: %s",
		    r->why_empty[0] ? r->why_empty : "no window");
		svg_text(out, 16.0, h - 16.0, "start", "", buf);
	} else {
		snprintf(buf, sizeof buf, "Times in %s",
		    p->time_zone ? p->time_zone->name : "UTC");
		svg_text(out, 16.0, h - 16.0, "start", "small", buf);
	}
	mbuf_puts(out, "</svg>\n");
	return mbuf_status(out);
}
