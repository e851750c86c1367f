/* SPDX-License-Identifier: BSD-3-Clause */
/* render_site.c: station, targets, blackouts and the log as JSON, CSV and
   text tables. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <jansson.h>

#include "core/text.h"
#include "formats/render_json.h"
#include "formats/render_time.h"
#include "core/attempt.h"
#include "formats/render_site.h"
#include "core/link.h"
#include "core/tscale.h"

/*
 * Serialise root (a reference that is consumed) into out with render.c's
 * render_json_dump (same layout as every moonrange JSON document, written
 * straight into the mbuf so a failed allocation inside jansson cannot
 * give a damaged document: test_render_site_allocation_failure); failed
 * says a member could not be added.
 */
static enum errcode
finish(json_t *root, int failed, struct mbuf *out)
{
	return render_json_dump(render_json_checked(root, failed), out);
}

/* {"key": [item(rec) for each of the n records of size bytes at recs]}
   into out (render_json_list). */
static enum errcode
list_json(const char *key, const void *recs, size_t n, size_t size,
    json_t *(*item)(const void *rec), struct mbuf *out)
{
	json_t *root = json_object();

	return finish(root, root == NULL ||
	    render_json_list(root, key, recs, n, size, item), out);
}

/* --- attempts ------------------------------------------------------------- */

static json_t *
attempt_obj(const void *rec)
{
	const struct site_attempt *a = rec;
	json_t *o = json_pack("{s:I, s:s, s:o, s:o, s:o, s:I, s:I, s:I, s:s, "
	    "s:s, s:o, s:s, s:o, s:o, s:o, s:o}",
	    "id", (json_int_t)a->id,
	    "target", a->target,
	    "start_utc", render_json_mjd(a->start_mjd, 3),
	    "end_utc", render_json_mjd(a->end_mjd, 3),
	    "duration_s",
	    render_json_num((a->end_mjd - a->start_mjd) * 86400.0, 3),
	    "shots", (json_int_t)a->shots,
	    "returns", (json_int_t)a->returns,
	    "normal_points", (json_int_t)a->normal_points,
	    "outcome", site_outcome_name(a->outcome),
	    "operator", a->operator_name,
	    "seeing_arcsec", render_json_num(a->seeing_arcsec, 3),
	    "notes", a->notes,
	    "synodic_deg", render_json_num(a->synodic_deg, 6),
	    "mean_elong_deg", render_json_num(a->mean_elong_deg, 6),
	    "target_el_deg", render_json_num(a->target_el_deg, 6),
	    "sun_el_target_deg", render_json_num(a->sun_el_target_deg, 6));
	char warn[300];

	/* Suspicious (core/attempt.h): stored, flagged, and said so. */
	if (o != NULL && a->suspect != 0 &&
	    json_object_set_new(o, "warning", json_string(attempt_warning(
	    a->suspect, warn, sizeof warn))) != 0) {
		json_decref(o);
		o = NULL;
	}
	return o;
}

enum errcode
render_site_attempts_json(const struct site_attempt *a, size_t n,
    struct mbuf *out)
{
	return list_json("attempts", a, n, sizeof *a, attempt_obj, out);
}

enum errcode
render_site_attempt_json(const struct site_attempt *a, struct mbuf *out)
{
	return finish(attempt_obj(a), 0, out);
}

void
render_site_csv_field(struct mbuf *out, const char *s)
{
	size_t n = strlen(s);

	if (strpbrk(s, ",\"\r\n") == NULL && (n == 0 ||
	    (s[0] != ' ' && s[n - 1] != ' '))) {
		mbuf_add(out, s, n);
		return;
	}
	mbuf_add(out, "\"", 1);
	for (const char *p = s; *p; p++) {
		if (*p == '"')
			mbuf_add(out, "\"", 1);
		mbuf_add(out, p, 1);
	}
	mbuf_add(out, "\"", 1);
}

/* A number for CSV: shortest text that reads back to the same double
   (up to 17 digits), empty when absent. */
static void
csv_real(struct mbuf *out, double v)
{
	char buf[40];

	if (!isfinite(v))
		return;
	for (int prec = 1; prec <= 17; prec++) {
		snprintf(buf, sizeof buf, "%.*g", prec, v);
		if (strtod(buf, NULL) == v)
			break;
	}
	mbuf_puts(out, buf);
}

enum errcode
render_site_attempts_csv(const struct site_attempt *a, size_t n, int derived,
    struct mbuf *out)
{
	char t0[40], t1[40];

	if (derived)
		mbuf_puts(out, "id,");
	mbuf_puts(out, RENDER_SITE_ATTEMPT_CSV_HEADER);
	if (derived)
		mbuf_puts(out, ",synodic_deg,mean_elong_deg,target_el_deg,"
		    "sun_el_target_deg");
	mbuf_add(out, "\r\n", 2);
	for (size_t i = 0; i < n; i++) {
		render_utc_text(a[i].start_mjd, 3, t0, sizeof t0);
		render_utc_text(a[i].end_mjd, 3, t1, sizeof t1);
		if (derived)
			mbuf_printf(out, "%ld,", a[i].id);
		render_site_csv_field(out, a[i].target);
		mbuf_printf(out, ",%s,%s,%ld,%ld,%ld,%s,", t0, t1, a[i].shots,
		    a[i].returns, a[i].normal_points,
		    site_outcome_name(a[i].outcome));
		render_site_csv_field(out, a[i].operator_name);
		mbuf_add(out, ",", 1);
		csv_real(out, a[i].seeing_arcsec);
		mbuf_add(out, ",", 1);
		render_site_csv_field(out, a[i].notes);
		if (derived) {
			mbuf_printf(out, ",%.6f,%.6f,%.6f,%.6f",
			    a[i].synodic_deg, a[i].mean_elong_deg,
			    a[i].target_el_deg, a[i].sun_el_target_deg);
		}
		mbuf_add(out, "\r\n", 2);
	}
	return mbuf_status(out);
}

/*
 * Append s as a cell of width characters (code points): control
 * characters as spaces, cut with "\u2026" when longer, padded with spaces
 * unless last (then only cut).
 */
static void
text_cell(struct mbuf *out, const char *s, size_t width, int last)
{
	const unsigned char *p = (const unsigned char *)s;
	size_t chars = 0, i = 0, len = strlen(s), k, total = 0;

	for (size_t q = 0; q < len; q += k, total++)
		if ((k = text_utf8_seq(p + q, len - q)) == 0)
			k = 1;
	while (i < len) {
		if ((k = text_utf8_seq(p + i, len - i)) == 0)
			k = 1;
		if (chars + 1 == width && total > width) {
			mbuf_puts(out, "\u2026");
			chars++;
			break;
		}
		if (p[i] < 0x20 || p[i] == 0x7F || (k == 1 && p[i] >= 0x80))
			mbuf_add(out, " ", 1);
		else
			mbuf_add(out, s + i, k);
		i += k;
		chars++;
	}
	while (!last && chars++ < width)
		mbuf_add(out, " ", 1);
}

enum errcode
render_site_attempts_text(const struct site_attempt *a, size_t n,
    size_t total, const struct tzone *tz, struct mbuf *out)
{
	char t0[48], utc[48];

	mbuf_printf(out, "%5s %-21s %-9s %-10s %5s %2s %-9s %s\n", "id",
	    tz != NULL ? "start (local)" : "start", "target", "outcome", "ret",
	    "NP", "operator", "notes");
	for (size_t i = 0; i < n; i++) {
		if (tz == NULL || tzone_format(tz, TEXT_MJD0, a[i].start_mjd,
		    t0, sizeof t0) != ERRCODE_OK) {
			/* "YYYY-MM-DDTHH:MM:SSZ" as "YYYY-MM-DD HH:MM UTC" */
			render_utc_text(a[i].start_mjd, 0, utc, sizeof utc);
			snprintf(t0, sizeof t0, "%.10s %.5s UTC", utc,
			    strlen(utc) >= 16 ? utc + 11 : "?");
		}
		mbuf_printf(out, "%5ld ", a[i].id);
		text_cell(out, t0, 21, 0);
		mbuf_add(out, " ", 1);
		text_cell(out, a[i].target, 9, 0);
		mbuf_printf(out, " %-10s %5ld %2ld ",
		    site_outcome_name(a[i].outcome), a[i].returns,
		    a[i].normal_points);
		text_cell(out, a[i].operator_name, 9, a[i].notes[0] == '\0');
		if (a[i].notes[0] != '\0') {
			mbuf_add(out, " ", 1);
			text_cell(out, a[i].notes, 12, 1);
		}
		mbuf_add(out, "\n", 1);
	}
	if (n == 0)
		mbuf_puts(out, "(no attempts match)\n");
	else if (total > n)
		mbuf_printf(out, "%zu attempt%s shown, the newest of %zu\n", n,
		    n == 1 ? "" : "s", total);
	else
		mbuf_printf(out, "%zu attempt%s\n", n, n == 1 ? "" : "s");
	return mbuf_status(out);
}

/* --- station -------------------------------------------------------------- */

enum errcode
render_site_station_json(const struct site_station *st, struct mbuf *out)
{
	struct link_station ls;
	json_t *root;

	site_station_link(st, &ls);
	root = json_pack("{s:s, s:s, s:o, s:o, s:o, s:s, s:o, s:o, "
	    "s:o, s:o, s:o, s:o, s:o, s:o, s:o, s:o, s:o, s:o, s:o, s:o, s:o, "
	    "s:o}",
	    "name", st->name,
	    "code", st->code,
	    "lat_deg", render_json_num(st->lat_deg, 7),
	    "lon_deg", render_json_num(st->lon_deg, 7),
	    "height_m", render_json_num(st->height_m, 3),
	    "time_zone", st->time_zone,
	    "min_el_deg", render_json_num(st->min_el_deg, 4),
	    "max_sun_el_deg", render_json_num(st->max_sun_el_deg, 4),
	    "min_sun_sep_deg", render_json_num(st->min_sun_sep_deg, 4),
	    "pressure_hpa", render_json_num(st->pressure_hpa, 2),
	    "temperature_c", render_json_num(st->temperature_c, 2),
	    "humidity", render_json_num(st->humidity, 3),
	    "wavelength_nm", render_json_num(st->wavelength_nm, 3),
	    "zenith_tau", render_json_num(st->zenith_tau, 4),
	    "fire_rate_hz", render_json_num(st->fire_rate_hz, 3),
	    "pulse_energy_mj", render_json_num(ls.pulse_energy_j * 1e3, 3),
	    "aperture_m", render_json_num(ls.aperture_m, 3),
	    "transmit_efficiency", render_json_num(ls.transmit_eff, 4),
	    "receive_efficiency", render_json_num(ls.receive_eff, 4),
	    "quantum_efficiency", render_json_num(ls.detector_qe, 4),
	    "seeing_arcsec", render_json_num(ls.seeing_arcsec, 3),
	    "jitter_ps", render_json_num(st->jitter_ps, 2));

	return finish(root, 0, out);
}

enum errcode
render_site_station_text(const struct site_station *st, struct mbuf *out)
{
	struct link_station ls;

	site_station_link(st, &ls);
	mbuf_printf(out, "%s (%s)\n", st->name, st->code);
	mbuf_printf(out, "  %-22s %.6f, %.6f deg, %.1f m (WGS84)\n", "position",
	    st->lat_deg, st->lon_deg, st->height_m);
	mbuf_printf(out, "  %-22s %s\n", "time zone", st->time_zone);
	mbuf_printf(out, "  %-22s %.1f deg\n", "min target elevation",
	    st->min_el_deg);
	mbuf_printf(out, "  %-22s %.1f deg\n", "max sun elevation",
	    st->max_sun_el_deg);
	mbuf_printf(out, "  %-22s %.1f deg\n", "min sun-moon separation",
	    st->min_sun_sep_deg);
	mbuf_printf(out, "  %-22s %.1f hPa, %.1f C, %.0f %% humidity\n",
	    "weather defaults", st->pressure_hpa, st->temperature_c,
	    st->humidity * 100.0);
	mbuf_printf(out, "  %-22s %.1f nm, %.1f Hz, zenith tau %.3f\n", "laser",
	    st->wavelength_nm, st->fire_rate_hz, st->zenith_tau);
	mbuf_printf(out, "  %-22s %.1f mJ, %.2f m aperture, efficiencies "
	    "%.2f out, %.2f in, QE %.2f\n", "link budget",
	    ls.pulse_energy_j * 1e3, ls.aperture_m, ls.transmit_eff,
	    ls.receive_eff, ls.detector_qe);
	mbuf_printf(out, "  %-22s %.2f arcsec\n", "typical seeing",
	    ls.seeing_arcsec);
	if (isfinite(st->jitter_ps))
		mbuf_printf(out, "  %-22s %.1f ps\n", "timing jitter",
		    st->jitter_ps);
	return mbuf_status(out);
}

/* --- targets -------------------------------------------------------------- */

static json_t *
target_obj(const void *rec)
{
	const struct site_target *t = rec;
	struct link_target lt;
	double nlat, nlon, ext;

	site_target_link(t, &lt);
	site_target_array(t, &nlat, &nlon, &ext);
	return json_pack("{s:s, s:s, s:s, s:o, s:o, s:o, s:o, s:b, s:b, s:I, "
	    "s:o, s:o, s:o, s:o}",
	    "id", t->id,
	    "name", t->name,
	    "alias", t->alias,
	    "lat_deg", render_json_num(t->lat_deg, 6),
	    "lon_deg", render_json_num(t->lon_deg, 6),
	    "height_m", render_json_num(t->height_m, 2),
	    "strength", render_json_num(t->strength, 4),
	    "dark_only", t->dark_only,
	    "active", t->active,
	    "cube_count", (json_int_t)lt.cube_count,
	    "cube_aperture_mm", render_json_num(lt.cube_aperture_m * 1e3, 2),
	    "normal_lat_deg", render_json_num(nlat, 4),
	    "normal_lon_deg", render_json_num(nlon, 4),
	    "extent_m", render_json_num(ext, 3));
}

enum errcode
render_site_targets_json(const struct site_target *t, size_t n,
    struct mbuf *out)
{
	return list_json("targets", t, n, sizeof *t, target_obj, out);
}

enum errcode
render_site_targets_text(const struct site_target *t, size_t n,
    struct mbuf *out)
{
	mbuf_printf(out, "%-12s %-24s %-12s %8s %9s %6s %-5s %s\n", "id",
	    "name", "alias", "lat", "lon", "str", "dark", "state");
	for (size_t i = 0; i < n; i++)
		mbuf_printf(out, "%-12.12s %-24.24s %-12.12s %8.3f %9.3f %6.2f "
		    "%-5s %s\n", t[i].id, t[i].name, t[i].alias, t[i].lat_deg,
		    t[i].lon_deg, t[i].strength, t[i].dark_only ? "yes" : "no",
		    t[i].active ? "active" : "retired");
	if (n == 0)
		mbuf_puts(out, "(no targets)\n");
	return mbuf_status(out);
}

/* --- blackouts ------------------------------------------------------------ */

static json_t *
blackout_obj(const void *rec)
{
	const struct site_blackout *b = rec;

	return json_pack("{s:I, s:o, s:o, s:s}", "id", (json_int_t)b->id,
	    "start_utc", render_json_mjd(b->start_mjd, 3),
	    "end_utc", render_json_mjd(b->end_mjd, 3),
	    "reason", b->reason);
}

enum errcode
render_site_blackouts_json(const struct site_blackout *b, size_t n,
    struct mbuf *out)
{
	return list_json("blackouts", b, n, sizeof *b, blackout_obj, out);
}

enum errcode
render_site_blackouts_text(const struct site_blackout *b, size_t n,
    struct mbuf *out)
{
	char t0[40], t1[40];

	mbuf_printf(out, "%5s %-20s %-20s %s\n", "id", "start UTC", "end UTC",
	    "reason");
	for (size_t i = 0; i < n; i++) {
		render_utc_text(b[i].start_mjd, 0, t0, sizeof t0);
		render_utc_text(b[i].end_mjd, 0, t1, sizeof t1);
		mbuf_printf(out, "%5ld %-20s %-20s %s\n", b[i].id, t0, t1,
		    b[i].reason);
	}
	if (n == 0)
		mbuf_puts(out, "(no blackouts)\n");
	return mbuf_status(out);
}
