/* SPDX-License-Identifier: BSD-3-Clause */
/* render_eclipse.c: lunar eclipses as JSON, CSV, iCalendar and text. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <jansson.h>

#include "core/tscale.h"
#include "formats/render_eclipse.h"
#include "formats/render_json.h"
#include "formats/render_plan.h"

#define MJD0 2400000.5

static void
iso(double mjd, char *buf, size_t len)
{
	if (!isfinite(mjd) || tscale_format_utc(MJD0, mjd, 0, buf, len))
		snprintf(buf, len, "%s", "");
}

enum errcode
render_eclipses_json(const struct render_eclipse *e, size_t n,
    struct mbuf *out)
{
	json_t *root = json_object(), *arr = json_array();
	int bad = root == NULL || arr == NULL ||
	    json_object_set_new(root, "eclipses", arr) != 0;

	for (size_t i = 0; i < n && !bad; i++) {
		json_t *o = json_object(), *c = json_object(), *up = NULL;

		bad |= o == NULL || c == NULL || json_array_append_new(arr, o);
		if (bad) {
			json_decref(c);
			break;
		}
		bad |= json_object_set_new(o, "kind",
		    json_string(eclipse_kind_name(e[i].kind)));
		bad |= json_object_set_new(o, "greatest",
		    render_json_mjd(e[i].greatest_mjd, 0));
		bad |= json_object_set_new(o, "umbral_magnitude",
		    render_json_num(e[i].umbral_mag, 4));
		bad |= json_object_set_new(o, "penumbral_magnitude",
		    render_json_num(e[i].penumbral_mag, 4));
		bad |= json_object_set_new(o, "contacts", c);
		if (e[i].moon_up_greatest >= 0) {
			up = json_object();
			bad |= json_object_set_new(o, "moon_up", up);
			if (up != NULL)
				bad |= json_object_set_new(up, "greatest",
				    json_boolean(e[i].moon_up_greatest));
		}
		for (int k = 0; k < ECLIPSE_NCONTACTS; k++) {
			const char *name = eclipse_contact_name(k);

			if (!isfinite(e[i].contact_mjd[k]))
				continue;
			bad |= json_object_set_new(c, name,
			    render_json_mjd(e[i].contact_mjd[k], 0));
			if (up != NULL && e[i].moon_up[k] >= 0)
				bad |= json_object_set_new(up, name,
				    json_boolean(e[i].moon_up[k]));
		}
	}
	return render_json_dump(render_json_checked(root, bad), out);
}

enum errcode
render_eclipses_csv(const struct render_eclipse *e, size_t n, int station,
    struct mbuf *out)
{
	char buf[40];

	mbuf_puts(out, "kind,greatest,umbral_magnitude,penumbral_magnitude,"
	    "P1,U1,U2,U3,U4,P4");
	mbuf_puts(out, station ? ",moon_up_greatest\r\n" : "\r\n");
	for (size_t i = 0; i < n; i++) {
		iso(e[i].greatest_mjd, buf, sizeof buf);
		mbuf_printf(out, "%s,%s,%.4f,%.4f", eclipse_kind_name(e[i].kind),
		    buf, e[i].umbral_mag, e[i].penumbral_mag);
		for (int k = 0; k < ECLIPSE_NCONTACTS; k++) {
			iso(e[i].contact_mjd[k], buf, sizeof buf);
			mbuf_printf(out, ",%s", buf);
		}
		if (station)
			mbuf_printf(out, ",%s", e[i].moon_up_greatest > 0 ?
			    "yes" : "no");
		mbuf_puts(out, "\r\n");
	}
	return mbuf_status(out);
}

/* First and last contact that occur (P1 and P4 always do). */
static void
span_of(const struct render_eclipse *e, double *a, double *b)
{
	*a = e->greatest_mjd;
	*b = e->greatest_mjd;
	for (int k = 0; k < ECLIPSE_NCONTACTS; k++)
		if (isfinite(e->contact_mjd[k])) {
			*a = fmin(*a, e->contact_mjd[k]);
			*b = fmax(*b, e->contact_mjd[k]);
		}
}

enum errcode
render_eclipses_ics(const struct render_eclipse *e, size_t n,
    struct mbuf *out)
{
	char line[160], t0[32], t1[32], g[40], desc[400];

	render_ics_line(out, "BEGIN:VCALENDAR");
	render_ics_line(out, "VERSION:2.0");
	render_ics_line(out, "PRODID:-//moonrange//eclipses//EN");
	for (size_t i = 0; i < n; i++) {
		double a, b;
		size_t len = 0;

		span_of(&e[i], &a, &b);
		render_ics_time(a, t0, sizeof t0);
		render_ics_time(b, t1, sizeof t1);
		render_ics_time(e[i].greatest_mjd, g, sizeof g);
		snprintf(line, sizeof line, "eclipse-%s@moonrange", g);
		render_ics_event_begin(out, line, g, t0, t1);
		snprintf(line, sizeof line, "%s lunar eclipse",
		    eclipse_kind_name(e[i].kind));
		render_ics_prop_text(out, "SUMMARY", line);
		iso(e[i].greatest_mjd, g, sizeof g);
		len += (size_t)snprintf(desc + len, sizeof desc - len,
		    "greatest %s, umbral magnitude %.4f, penumbral %.4f", g,
		    e[i].umbral_mag, e[i].penumbral_mag);
		for (int k = 0; k < ECLIPSE_NCONTACTS && len < sizeof desc;
		    k++) {
			if (!isfinite(e[i].contact_mjd[k]))
				continue;
			iso(e[i].contact_mjd[k], g, sizeof g);
			len += (size_t)snprintf(desc + len, sizeof desc - len,
			    "; %s %s", eclipse_contact_name(k), g);
		}
		render_ics_prop_text(out, "DESCRIPTION", desc);
		render_ics_line(out, "END:VEVENT");
	}
	render_ics_line(out, "END:VCALENDAR");
	return mbuf_status(out);
}

enum errcode
render_eclipses_text(const struct render_eclipse *e, size_t n, int station,
    struct mbuf *out)
{
	char buf[40];

	if (n == 0)
		mbuf_puts(out, "No lunar eclipse in the span.\n");
	for (size_t i = 0; i < n; i++) {
		iso(e[i].greatest_mjd, buf, sizeof buf);
		mbuf_printf(out, "%s lunar eclipse, greatest %s%s\n"
		    "  umbral magnitude %.4f, penumbral %.4f\n",
		    eclipse_kind_name(e[i].kind), buf, station ?
		    (e[i].moon_up_greatest > 0 ? " (Moon up)" :
		    " (Moon down)") : "", e[i].umbral_mag, e[i].penumbral_mag);
		for (int k = 0; k < ECLIPSE_NCONTACTS; k++) {
			if (!isfinite(e[i].contact_mjd[k]))
				continue;
			iso(e[i].contact_mjd[k], buf, sizeof buf);
			mbuf_printf(out, "  %s %s%s\n", eclipse_contact_name(k),
			    buf, station ? (e[i].moon_up[k] > 0 ? "  Moon up" :
			    "  Moon down") : "");
		}
	}
	return mbuf_status(out);
}
