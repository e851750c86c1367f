/* SPDX-License-Identifier: BSD-3-Clause */
/* render_ephem.c: the sky at an instant (moonrange ephem, GET /api/v1/now)
   as JSON and as a text table. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>
#include <jansson.h>

#include "core/tscale.h"
#include "formats/render_ephem.h"
#include "formats/render_json.h"
#include "formats/render_time.h"

#define R2D (ERFA_DR2D)

static int
set(json_t *obj, const char *key, json_t *val)
{
	return json_object_set_new(obj, key, val);
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
	bad |= set(root, "utc", render_json_utc(g->t.utc1, g->t.utc2, 0));
	bad |= set(root, "tt_jd", render_json_num(g->t.tt1 + g->t.tt2, 8));
	bad |= set(root, "dut1_s", render_json_num(g->t.dut1, 4));
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
	bad |= set(o, "lat_deg", render_json_num(g->site.lat * R2D, 7));
	bad |= set(o, "lon_deg", render_json_num(g->site.lon * R2D, 7));
	bad |= set(o, "height_m", render_json_num(g->site.height, 2));

	o = json_object();
	bad |= set(root, "moon", o);
	bad |= set(o, "az_deg", render_json_num(m->az * R2D, 6));
	bad |= set(o, "el_deg", render_json_num(m->el * R2D, 6));
	bad |= set(o, "el_apparent_deg", render_json_num(m->el_apparent * R2D,
	    6));
	bad |= set(o, "ha_deg", render_json_num(m->ha * R2D, 6));
	bad |= set(o, "ra_deg", render_json_num(m->ra * R2D, 6));
	bad |= set(o, "dec_deg", render_json_num(m->dec * R2D, 6));
	bad |= set(o, "range_km", render_json_num(m->range / 1e3, 4));
	bad |= set(o, "geocentric_range_km",
	    render_json_num(m->geocentric_range / 1e3, 4));
	bad |= set(o, "phase_angle_deg", render_json_num(m->phase_angle * R2D,
	    5));
	bad |= set(o, "illuminated_fraction",
	    render_json_num(m->illuminated_fraction, 6));
	bad |= set(o, "elongation_deg", render_json_num(m->elongation * R2D,
	    5));
	bad |= set(o, "synodic_angle_deg", render_json_num(m->synodic * R2D,
	    5));
	bad |= set(o, "mean_elongation_deg",
	    render_json_num(m->mean_elong * R2D, 5));
	bad |= set(o, "horizontal_parallax_deg",
	    render_json_num(m->parallax * R2D, 6));
	bad |= set(o, "round_trip_s", render_json_num(2.0 * m->range / GEOM_C,
	    9));

	o = json_object();
	bad |= set(root, "sun", o);
	bad |= set(o, "az_deg", render_json_num(g->sun.az * R2D, 5));
	bad |= set(o, "el_deg", render_json_num(g->sun.el * R2D, 5));
	bad |= set(o, "separation_deg", render_json_num(g->sun.separation * R2D,
	    5));

	o = json_object();
	bad |= set(root, "libration", o);
	o2 = json_object();
	bad |= set(o, "geocentric", o2);
	bad |= set(o2, "lon_deg", render_json_num(g->lib.geo_lon * R2D, 5));
	bad |= set(o2, "lat_deg", render_json_num(g->lib.geo_lat * R2D, 5));
	o2 = json_object();
	bad |= set(o, "topocentric", o2);
	bad |= set(o2, "lon_deg", render_json_num(g->lib.topo_lon * R2D, 5));
	bad |= set(o2, "lat_deg", render_json_num(g->lib.topo_lat * R2D, 5));

	o = json_object();
	bad |= set(root, "subsolar", o);
	bad |= set(o, "lon_deg", render_json_num(g->lib.subsolar_lon * R2D, 5));
	bad |= set(o, "lat_deg", render_json_num(g->lib.subsolar_lat * R2D, 5));
	bad |= set(o, "colongitude_deg",
	    render_json_num(g->lib.colongitude * R2D, 5));

	arr = json_array();
	bad |= set(root, "targets", arr);
	for (size_t i = 0; i < e->ntargets && arr != NULL; i++) {
		const struct geom_target_view *v = &e->targets[i].view;

		o = json_object();
		bad |= json_array_append_new(arr, o);
		bad |= set(o, "id", json_string(e->targets[i].id));
		bad |= set(o, "az_deg", render_json_num(v->az * R2D, 6));
		bad |= set(o, "el_deg", render_json_num(v->el * R2D, 6));
		bad |= set(o, "el_apparent_deg",
		    render_json_num(v->el_apparent * R2D, 6));
		bad |= set(o, "range_km", render_json_num(v->range / 1e3, 4));
		bad |= set(o, "round_trip_s", render_json_num(v->round_trip,
		    9));
		bad |= set(o, "offset_ra_arcsec",
		    render_json_num(v->offset_ra * R2D * 3600, 2));
		bad |= set(o, "offset_dec_arcsec",
		    render_json_num(v->offset_dec * R2D * 3600, 2));
		bad |= set(o, "sun_elevation_deg",
		    render_json_num(v->sun_elevation * R2D, 4));
		bad |= set(o, "sunlit", json_boolean(v->sunlit));
		bad |= set(o, "earth_elevation_deg",
		    render_json_num(v->earth_elevation * R2D, 4));
		bad |= set(o, "shadow",
		    json_string(eclipse_shadow_name(v->shadow)));
		bad |= set(o, "sun_visible_fraction",
		    render_json_num(v->sun_visible, 4));
		bad |= set(o, "tilt_deg",
		    render_json_num(e->targets[i].tilt * R2D, 3));
		bad |= set(o, "spread_ps",
		    render_json_num(e->targets[i].spread_ps, 1));
	}
	return render_json_dump(render_json_checked(root, bad), out);
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
	    tzone_format(e->time_zone, g->t.utc1, g->t.utc2, local,
	    sizeof local) == ERRCODE_OK)
		mbuf_printf(out, "  (%s)", local);
	mbuf_puts(out, "\n");
	if (e->wide)
		mbuf_printf(out, "Station %s%s%.5f, %.5f, %.1f m   DUT1 %+.4f s "
		    "(%s", e->station_name ? e->station_name : "",
		    e->station_name ? " " : "", g->site.lat * R2D,
		    g->site.lon * R2D, g->site.height, g->t.dut1,
		    e->dut1_source ? e->dut1_source : "option");
	else
		/* 80 columns: name, position and DUT1 on lines of their own. */
		mbuf_printf(out, "Station %s%s%.5f, %.5f, %.1f m\nDUT1 %+.4f s "
		    "(%s", e->station_name ? e->station_name : "",
		    e->station_name ? "\n        " : "", g->site.lat * R2D,
		    g->site.lon * R2D, g->site.height, g->t.dut1,
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
		/* Wide: the columns of old; else narrower ones in 80. */
		mbuf_printf(out, e->wide ?
		    "  %-12s %8s %7s %11s %11s %8s %8s %6s\n" :
		    "  %-10s %8s %7s %10s %10s %7s %7s %6s\n",
		    "id", "az", "el", "range km", "round s", "dRA\"", "dDec\"",
		    "sun el");
		for (size_t i = 0; i < e->ntargets; i++) {
			const struct geom_target_view *v = &e->targets[i].view;

			mbuf_printf(out, e->wide ?
			    "  %-12.12s %8.3f %7.3f %11.1f %11.7f %8.1f %8.1f "
			    "%6.1f %s\n" :
			    "  %-10.10s %8.3f %7.3f %10.1f %10.7f %7.1f %7.1f "
			    "%6.1f %s\n", e->targets[i].id, v->az * R2D,
			    v->el * R2D, v->range / 1e3, v->round_trip,
			    v->offset_ra * R2D * 3600,
			    v->offset_dec * R2D * 3600,
			    v->sun_elevation * R2D, v->sunlit ? "lit" : "dark");
		}
	}
	return mbuf_status(out);
}
