/* SPDX-License-Identifier: BSD-3-Clause */
/* render.c: ephemeris and phase reports as JSON and text tables. */
#include <math.h>
#include <pthread.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>

#include <erfa.h>
#include <erfam.h>
#include <jansson.h>

#include "formats/render.h"

#define R2D (ERFA_DR2D)

static pthread_mutex_t tz_lock = PTHREAD_MUTEX_INITIALIZER;

int
render_zone_known(const char *tz)
{
	char path[512];

	if (tz == NULL || *tz == '\0' || strlen(tz) > 200 ||
	    strstr(tz, "..") != NULL || tz[0] == '/')
		return 0;
	if (strcmp(tz, "UTC") == 0)
		return 1;
	snprintf(path, sizeof path, "/usr/share/zoneinfo/%s", tz);
	return access(path, R_OK) == 0;
}

enum errcode
render_local_time(double utc1, double utc2, const char *tz, char *buf,
    size_t len)
{
	time_t t;
	struct tm tm;
	char *old;
	size_t n;

	if (!render_zone_known(tz))
		return ERRCODE_NOT_FOUND;
	t = (time_t)llround(tscale_to_posix(utc1, utc2));
	pthread_mutex_lock(&tz_lock);
	old = getenv("TZ");
	old = old != NULL ? strdup(old) : NULL;
	setenv("TZ", tz, 1);
	tzset();
	localtime_r(&t, &tm);
	n = strftime(buf, len, "%Y-%m-%d %H:%M %Z", &tm);
	if (old != NULL) {
		setenv("TZ", old, 1);
		free(old);
	} else {
		unsetenv("TZ");
	}
	tzset();
	pthread_mutex_unlock(&tz_lock);
	return n > 0 ? ERRCODE_OK : ERRCODE_BAD_ARG;
}

void
render_tt_iso(double tt1, double tt2, char *buf, size_t len)
{
	struct tscale_instant t;

	if (tscale_from_tt(tt1, tt2, 0.0, &t) != ERRCODE_OK ||
	    tscale_format_utc(t.utc1, t.utc2, 0, buf, len) != ERRCODE_OK)
		snprintf(buf, len, "?");
}

/* A real rounded to a number of decimals, so the JSON reads cleanly. */
static json_t *
num(double v, int decimals)
{
	double s = pow(10.0, decimals);

	if (!isfinite(v))
		return json_null();
	return json_real(round(v * s) / s);
}

static int
set(json_t *obj, const char *key, json_t *val)
{
	return json_object_set_new(obj, key, val);
}

/* json_dump_callback sink: append to the mbuf, fail once it has failed. */
static int
mbuf_sink(const char *buf, size_t size, void *data)
{
	struct mbuf *b = data;

	mbuf_add(b, buf, size);
	return mbuf_status(b) == ERRCODE_OK ? 0 : -1;
}

/*
 * Serialise straight into the caller's mbuf.  Not json_dumps: with
 * jansson 2.14, json_dumps was seen to return a document with an object
 * key missing when an allocation inside it failed (test_render's fault
 * loop), i.e. a wrong document reported as success.  The mbuf's failure
 * flag is sticky, so any failed append here is seen at the end.
 */
static enum errcode
dump(json_t *root, struct mbuf *out)
{
	size_t mark = out->len;
	int rc;

	if (root == NULL)
		return ERRCODE_NOMEM;
	rc = json_dump_callback(root, mbuf_sink, out,
	    JSON_INDENT(2) | JSON_REAL_PRECISION(15));
	json_decref(root);
	if (rc != 0) {
		/* Drop a partial document (when the mbuf itself is intact). */
		if (mbuf_status(out) == ERRCODE_OK && out->data != NULL) {
			out->len = mark;
			out->data[mark] = '\0';
		}
		return ERRCODE_NOMEM;
	}
	mbuf_puts(out, "\n");
	return mbuf_status(out);
}

static json_t *
iso_of_utc(double utc1, double utc2)
{
	char buf[40];

	if (tscale_format_utc(utc1, utc2, 0, buf, sizeof buf) != ERRCODE_OK)
		return json_null();
	return json_string(buf);
}

enum errcode
render_ephem_json(const struct render_ephem *e, struct mbuf *out)
{
	const struct geom_instant *g = e->g;
	const struct geom_moon_view *m = &g->moon;
	json_t *root = json_object(), *o, *o2, *arr;
	int bad = 0;

	if (root == NULL)
		return ERRCODE_NOMEM;
	bad |= set(root, "utc", iso_of_utc(g->t.utc1, g->t.utc2));
	bad |= set(root, "tt_jd", num(g->t.tt1 + g->t.tt2, 8));
	bad |= set(root, "dut1_s", num(g->t.dut1, 4));
	bad |= set(root, "dut1_source",
	    json_string(e->dut1_source ? e->dut1_source : "option"));
	bad |= set(root, "eop_last_utc",
	    e->eop_last_utc ? json_string(e->eop_last_utc) : json_null());
	bad |= set(root, "leap_second_table_dubious",
	    json_boolean(g->t.dubious));

	o = json_object();
	bad |= set(root, "station", o);
	if (e->station_name)
		bad |= set(o, "name", json_string(e->station_name));
	bad |= set(o, "lat_deg", num(g->site.lat * R2D, 7));
	bad |= set(o, "lon_deg", num(g->site.lon * R2D, 7));
	bad |= set(o, "height_m", num(g->site.height, 2));

	o = json_object();
	bad |= set(root, "moon", o);
	bad |= set(o, "az_deg", num(m->az * R2D, 6));
	bad |= set(o, "el_deg", num(m->el * R2D, 6));
	bad |= set(o, "el_apparent_deg", num(m->el_apparent * R2D, 6));
	bad |= set(o, "ha_deg", num(m->ha * R2D, 6));
	bad |= set(o, "ra_deg", num(m->ra * R2D, 6));
	bad |= set(o, "dec_deg", num(m->dec * R2D, 6));
	bad |= set(o, "range_km", num(m->range / 1e3, 4));
	bad |= set(o, "geocentric_range_km", num(m->geocentric_range / 1e3, 4));
	bad |= set(o, "phase_angle_deg", num(m->phase_angle * R2D, 5));
	bad |= set(o, "illuminated_fraction", num(m->illuminated_fraction, 6));
	bad |= set(o, "elongation_deg", num(m->elongation * R2D, 5));
	bad |= set(o, "synodic_angle_deg", num(m->synodic * R2D, 5));
	bad |= set(o, "mean_elongation_deg", num(m->mean_elong * R2D, 5));
	bad |= set(o, "horizontal_parallax_deg", num(m->parallax * R2D, 6));
	bad |= set(o, "round_trip_s", num(2.0 * m->range / GEOM_C, 9));

	o = json_object();
	bad |= set(root, "sun", o);
	bad |= set(o, "az_deg", num(g->sun.az * R2D, 5));
	bad |= set(o, "el_deg", num(g->sun.el * R2D, 5));
	bad |= set(o, "separation_deg", num(g->sun.separation * R2D, 5));

	o = json_object();
	bad |= set(root, "libration", o);
	o2 = json_object();
	bad |= set(o, "geocentric", o2);
	bad |= set(o2, "lon_deg", num(g->lib.geo_lon * R2D, 5));
	bad |= set(o2, "lat_deg", num(g->lib.geo_lat * R2D, 5));
	o2 = json_object();
	bad |= set(o, "topocentric", o2);
	bad |= set(o2, "lon_deg", num(g->lib.topo_lon * R2D, 5));
	bad |= set(o2, "lat_deg", num(g->lib.topo_lat * R2D, 5));

	o = json_object();
	bad |= set(root, "subsolar", o);
	bad |= set(o, "lon_deg", num(g->lib.subsolar_lon * R2D, 5));
	bad |= set(o, "lat_deg", num(g->lib.subsolar_lat * R2D, 5));
	bad |= set(o, "colongitude_deg", num(g->lib.colongitude * R2D, 5));

	arr = json_array();
	bad |= set(root, "targets", arr);
	for (size_t i = 0; i < e->ntargets && arr != NULL; i++) {
		const struct geom_target_view *v = &e->targets[i].view;

		o = json_object();
		bad |= json_array_append_new(arr, o);
		bad |= set(o, "id", json_string(e->targets[i].id));
		bad |= set(o, "az_deg", num(v->az * R2D, 6));
		bad |= set(o, "el_deg", num(v->el * R2D, 6));
		bad |= set(o, "el_apparent_deg", num(v->el_apparent * R2D, 6));
		bad |= set(o, "range_km", num(v->range / 1e3, 4));
		bad |= set(o, "round_trip_s", num(v->round_trip, 9));
		bad |= set(o, "offset_ra_arcsec", num(v->offset_ra * R2D * 3600, 2));
		bad |= set(o, "offset_dec_arcsec",
		    num(v->offset_dec * R2D * 3600, 2));
		bad |= set(o, "sun_elevation_deg", num(v->sun_elevation * R2D, 4));
		bad |= set(o, "sunlit", json_boolean(v->sunlit));
		bad |= set(o, "earth_elevation_deg",
		    num(v->earth_elevation * R2D, 4));
	}
	if (bad) {
		json_decref(root);
		return ERRCODE_NOMEM;
	}
	return dump(root, out);
}

/* "12.3456" degrees as text with a sign, fixed width. */
static void
line_kv(struct mbuf *b, const char *label, int decimals, double v,
    const char *unit)
{
	mbuf_printf(b, "  %-26s %10.*f %s\n", label, decimals, v, unit);
}

enum errcode
render_ephem_text(const struct render_ephem *e, struct mbuf *out)
{
	const struct geom_instant *g = e->g;
	const struct geom_moon_view *m = &g->moon;
	char utc[40], local[48];

	if (tscale_format_utc(g->t.utc1, g->t.utc2, 0, utc, sizeof utc))
		snprintf(utc, sizeof utc, "?");
	mbuf_printf(out, "Ephemeris at %s", utc);
	if (e->time_zone != NULL &&
	    render_local_time(g->t.utc1, g->t.utc2, e->time_zone, local,
	    sizeof local) == ERRCODE_OK)
		mbuf_printf(out, "  (%s)", local);
	mbuf_puts(out, "\n");
	mbuf_printf(out, "Station %s%s%.5f, %.5f, %.1f m   DUT1 %+.4f s (%s",
	    e->station_name ? e->station_name : "", e->station_name ? " " : "",
	    g->site.lat * R2D, g->site.lon * R2D, g->site.height, g->t.dut1,
	    e->dut1_source ? e->dut1_source : "option");
	if (e->eop_last_utc != NULL)
		mbuf_printf(out, "; EOP table ends %s", e->eop_last_utc);
	mbuf_puts(out, ")\n");
	if (g->t.dubious)
		mbuf_puts(out, "Note: ERFA's leap-second table may be out of "
		    "date for this year.\n");
	mbuf_puts(out, "\nMoon (centre)\n");
	line_kv(out, "azimuth", 4, m->az * R2D, "deg");
	line_kv(out, "elevation (geometric)", 4, m->el * R2D, "deg");
	line_kv(out, "elevation (refracted)", 4, m->el_apparent * R2D,
	    "deg");
	line_kv(out, "hour angle", 4, m->ha * R2D, "deg");
	line_kv(out, "right ascension (of date)", 4, m->ra * R2D, "deg");
	line_kv(out, "declination (of date)", 4, m->dec * R2D, "deg");
	line_kv(out, "range", 1, m->range / 1e3, "km");
	line_kv(out, "phase angle", 3, m->phase_angle * R2D, "deg");
	line_kv(out, "illuminated fraction", 4, m->illuminated_fraction,
	    "");
	line_kv(out, "synodic angle", 3, m->synodic * R2D, "deg");
	line_kv(out, "mean elongation D", 3, m->mean_elong * R2D, "deg");
	line_kv(out, "Sun-Moon separation", 3, g->sun.separation * R2D,
	    "deg");
	mbuf_puts(out, "\nSun\n");
	line_kv(out, "azimuth", 4, g->sun.az * R2D, "deg");
	line_kv(out, "elevation", 4, g->sun.el * R2D, "deg");
	mbuf_puts(out, "\nLibration and illumination\n");
	mbuf_printf(out, "  %-26s %+9.4f %+9.4f deg (lon, lat)\n",
	    "geocentric", g->lib.geo_lon * R2D, g->lib.geo_lat * R2D);
	mbuf_printf(out, "  %-26s %+9.4f %+9.4f deg\n", "topocentric",
	    g->lib.topo_lon * R2D, g->lib.topo_lat * R2D);
	mbuf_printf(out, "  %-26s %+9.4f %+9.4f deg\n", "sub-solar point",
	    g->lib.subsolar_lon * R2D, g->lib.subsolar_lat * R2D);
	line_kv(out, "colongitude", 3, g->lib.colongitude * R2D, "deg");
	if (e->ntargets > 0) {
		mbuf_puts(out, "\nTargets\n");
		mbuf_printf(out, "  %-12s %8s %7s %11s %11s %8s %8s %6s\n",
		    "id", "az", "el", "range km", "round s", "dRA\"", "dDec\"",
		    "sun el");
		for (size_t i = 0; i < e->ntargets; i++) {
			const struct geom_target_view *v = &e->targets[i].view;

			mbuf_printf(out,
			    "  %-12.12s %8.3f %7.3f %11.1f %11.7f %8.1f %8.1f "
			    "%6.1f %s\n", e->targets[i].id, v->az * R2D,
			    v->el * R2D, v->range / 1e3, v->round_trip,
			    v->offset_ra * R2D * 3600,
			    v->offset_dec * R2D * 3600,
			    v->sun_elevation * R2D, v->sunlit ? "lit" : "dark");
		}
	}
	return mbuf_status(out);
}

enum errcode
render_phases_json(const struct render_phases *p, struct mbuf *out)
{
	json_t *root = json_object(), *arr = json_array();
	char buf[40];
	int bad = 0;

	if (root == NULL || arr == NULL) {
		json_decref(root);
		json_decref(arr);
		return ERRCODE_NOMEM;
	}
	bad |= set(root, "from", iso_of_utc(p->from1, p->from2));
	bad |= set(root, "to", iso_of_utc(p->to1, p->to2));
	bad |= set(root, "phases", arr);
	for (size_t i = 0; i < p->n; i++) {
		json_t *o = json_object();

		render_tt_iso(p->ev[i].tt1, p->ev[i].tt2, buf, sizeof buf);
		bad |= json_array_append_new(arr, o);
		bad |= set(o, "kind", json_string(geom_phase_name(p->ev[i].kind)));
		bad |= set(o, "utc", json_string(buf));
	}
	if (bad) {
		json_decref(root);
		return ERRCODE_NOMEM;
	}
	return dump(root, out);
}

enum errcode
render_phases_text(const struct render_phases *p, struct mbuf *out)
{
	static const char *label[] = {"New moon", "First quarter",
	    "Full moon", "Last quarter"};
	char buf[40], local[48];

	mbuf_printf(out, "%-14s %-21s %s\n", "Phase", "UTC",
	    p->time_zone ? "Local" : "");
	for (size_t i = 0; i < p->n; i++) {
		struct tscale_instant t;

		render_tt_iso(p->ev[i].tt1, p->ev[i].tt2, buf, sizeof buf);
		local[0] = '\0';
		if (p->time_zone != NULL &&
		    tscale_from_tt(p->ev[i].tt1, p->ev[i].tt2, 0.0, &t) == 0)
			(void)render_local_time(t.utc1, t.utc2, p->time_zone,
			    local, sizeof local);
		mbuf_printf(out, "%-14s %-21s %s\n", label[p->ev[i].kind], buf,
		    local);
	}
	if (p->n == 0)
		mbuf_puts(out, "(no principal phase in the span)\n");
	return mbuf_status(out);
}

json_t *
render_json_num(double v, int decimals)
{
	return num(v, decimals);
}

enum errcode
render_json_dump(json_t *root, struct mbuf *out)
{
	return dump(root, out);
}

void
render_json_setup(void)
{
	json_set_alloc_funcs(mem_alloc, mem_free);
}
