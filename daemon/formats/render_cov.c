/* SPDX-License-Identifier: BSD-3-Clause */
/* render_cov.c: coverage audit to JSON, CSV, a text table and SVG. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <jansson.h>

#include "formats/render_json.h"
#include "formats/render_time.h"
#include "formats/render_cov.h"
#include "formats/render_site.h"
#include "core/tscale.h"

#define MJD0 2400000.5

/* --- shared bits --- */

static void
utc_of_mjd(double mjd, char *buf, size_t len)
{
	if (!isfinite(mjd) ||
	    tscale_format_utc(MJD0, mjd, 0, buf, len) != ERRCODE_OK)
		snprintf(buf, len, "?");
}

/* A bin's lower and upper edge in degrees. */
static double
edge(const struct coverage_result *r, int b)
{
	return b * r->bin_width_deg;
}

/* --- JSON --- */

static json_t *
jstr_or_null(const char *s)
{
	return s != NULL && *s != '\0' ? json_string(s) : json_null();
}

static json_t *
jutc(double mjd)
{
	char buf[40];

	if (isnan(mjd))
		return json_null();
	utc_of_mjd(mjd, buf, sizeof buf);
	return json_string(buf);
}

static json_t *
jcounts(const struct coverage_counts *c, int nbins, long min_count)
{
	json_t *o = json_object(), *arr = json_array(), *m = json_object();
	json_t *em = json_array(), *sp = json_array();
	const struct coverage_metrics *x = &c->m;
	int bad = o == NULL || arr == NULL || m == NULL || em == NULL ||
	    sp == NULL;

	for (int b = 0; b < nbins && !bad; b++)
		bad |= json_array_append_new(arr, json_integer(c->n[b]));
	for (int i = 0; i < x->nemptiest && !bad; i++)
		bad |= json_array_append_new(em, json_integer(x->emptiest[i]));
	for (int i = 0; i < x->nsparse && !bad; i++)
		bad |= json_array_append_new(sp, json_integer(x->sparse[i]));
	if (bad) {
		json_decref(o);
		json_decref(arr);
		json_decref(m);
		json_decref(em);
		json_decref(sp);
		return NULL;
	}
	bad |= json_object_set_new(o, "counts", arr);
	bad |= json_object_set_new(o, "metrics", m);
	bad |= json_object_set_new(m, "total", json_integer(x->total));
	bad |= json_object_set_new(m, "filled_bins",
	    json_integer(x->filled_bins));
	bad |= json_object_set_new(m, "filled_fraction",
	    render_json_num(x->filled_fraction, 6));
	bad |= json_object_set_new(m, "bins_below_min_count",
	    json_integer(nbins - x->filled_bins));
	bad |= json_object_set_new(m, "min_count", json_integer(min_count));
	bad |= json_object_set_new(m, "emptiest_bins", em);
	bad |= json_object_set_new(m, "sparse_bins", sp);
	bad |= json_object_set_new(m, "longest_empty_arc_deg",
	    render_json_num(x->longest_gap_deg, 6));
	bad |= json_object_set_new(m, "longest_empty_arc_from_deg",
	    render_json_num(x->longest_gap_from_deg, 6));
	bad |= json_object_set_new(m, "entropy", render_json_num(x->entropy, 6));
	bad |= json_object_set_new(m, "chi_square", render_json_num(x->chi2, 6));
	bad |= json_object_set_new(m, "chi_square_dof",
	    json_integer(x->chi2_dof));
	bad |= json_object_set_new(m, "chi_square_p", render_json_num(x->chi2_p, 8));
	bad |= json_object_set_new(m, "chi_square_reliable",
	    json_boolean(x->chi2_reliable));
	if (bad) {
		json_decref(o);
		return NULL;
	}
	return o;
}

static json_t *
jfill(const struct coverage_result *r, const struct coverage_fill *f)
{
	json_t *o = json_object(), *bins = json_array();
	int bad = o == NULL || bins == NULL;

	if (bad) {
		json_decref(o);
		json_decref(bins);
		return NULL;
	}
	bad |= json_object_set_new(o, "bins", bins);
	bad |= json_object_set_new(o, "from_utc", jutc(f->from_mjd));
	bad |= json_object_set_new(o, "to_utc", jutc(f->to_mjd));
	bad |= json_object_set_new(o, "windows_examined",
	    json_integer((json_int_t)f->windows));
	for (size_t i = 0; i < f->nbins && !bad; i++) {
		const struct coverage_fill_bin *fb = &f->bins[i];
		json_t *b = json_object(), *dates = json_array();

		bad |= json_array_append_new(bins, b);
		bad |= json_object_set_new(b, "bin", json_integer(fb->bin));
		bad |= json_object_set_new(b, "from_deg",
		    render_json_num(edge(r, fb->bin), 6));
		bad |= json_object_set_new(b, "to_deg",
		    render_json_num(edge(r, fb->bin + 1), 6));
		bad |= json_object_set_new(b, "count", json_integer(fb->count));
		bad |= json_object_set_new(b, "dates", dates);
		for (size_t k = 0; k < fb->ndates && !bad; k++) {
			const struct coverage_fill_date *d = &fb->dates[k];
			json_t *x = json_object();

			bad |= json_array_append_new(dates, x);
			bad |= json_object_set_new(x, "target",
			    json_string(d->target));
			bad |= json_object_set_new(x, "window_start_utc",
			    jutc(d->window_start_mjd));
			bad |= json_object_set_new(x, "window_end_utc",
			    jutc(d->window_end_mjd));
			bad |= json_object_set_new(x, "in_bin_start_utc",
			    jutc(d->in_bin_start_mjd));
			bad |= json_object_set_new(x, "in_bin_end_utc",
			    jutc(d->in_bin_end_mjd));
			bad |= json_object_set_new(x, "score", render_json_num(d->score, 6));
		}
	}
	if (bad) {
		json_decref(o);
		return NULL;
	}
	return o;
}

enum errcode
render_cov_json(const struct render_cov *c, struct mbuf *out)
{
	const struct coverage_result *r = c->r;
	const struct coverage_spec *s = &r->spec;
	json_t *root = json_object(), *o, *arr;
	int bad = root == NULL;

	if (bad)
		return ERRCODE_NOMEM;
	bad |= json_object_set_new(root, "axis",
	    json_string(coverage_axis_name(s->axis)));
	bad |= json_object_set_new(root, "axis_label",
	    json_string(coverage_axis_label(s->axis)));
	bad |= json_object_set_new(root, "source",
	    json_string(coverage_source_name(s->source)));
	bad |= json_object_set_new(root, "bins", json_integer(s->nbins));
	bad |= json_object_set_new(root, "bin_width_deg",
	    render_json_num(r->bin_width_deg, 6));
	bad |= json_object_set_new(root, "min_count",
	    json_integer(s->min_count));
	o = json_object();
	bad |= json_object_set_new(root, "filters", o);
	if (o != NULL) {
		bad |= json_object_set_new(o, "since_utc", jutc(s->since_mjd));
		bad |= json_object_set_new(o, "until_utc", jutc(s->until_mjd));
		bad |= json_object_set_new(o, "target", jstr_or_null(s->target));
		bad |= json_object_set_new(o, "station",
		    jstr_or_null(s->station));
	}
	bad |= json_object_set_new(root, "station_name",
	    jstr_or_null(c->station_name));
	bad |= json_object_set_new(root, "records", json_integer(r->records));
	bad |= json_object_set_new(root, "skipped", json_integer(r->skipped));
	arr = json_array();
	bad |= json_object_set_new(root, "bin_ranges", arr);
	for (int b = 0; b < s->nbins && arr != NULL && !bad; b++) {
		o = json_object();
		bad |= json_array_append_new(arr, o);
		bad |= json_object_set_new(o, "bin", json_integer(b));
		bad |= json_object_set_new(o, "from_deg", render_json_num(edge(r, b), 6));
		bad |= json_object_set_new(o, "to_deg", render_json_num(edge(r, b + 1), 6));
	}
	bad |= json_object_set_new(root, "pooled",
	    jcounts(&r->pooled, s->nbins, s->min_count));
	arr = json_array();
	bad |= json_object_set_new(root, "targets", arr);
	for (size_t i = 0; i < r->ntargets && arr != NULL && !bad; i++) {
		o = jcounts(&r->targets[i].c, s->nbins, s->min_count);
		bad |= json_array_append_new(arr, o);
		if (o != NULL)
			bad |= json_object_set_new(o, "id",
			    json_string(r->targets[i].id));
	}
	arr = json_array();
	bad |= json_object_set_new(root, "years", arr);
	for (size_t i = 0; i < r->nyears && arr != NULL && !bad; i++) {
		o = jcounts(&r->years[i].c, s->nbins, s->min_count);
		bad |= json_array_append_new(arr, o);
		if (o != NULL)
			bad |= json_object_set_new(o, "year",
			    json_integer(r->years[i].year));
	}
	bad |= json_object_set_new(root, "fill",
	    c->fill != NULL ? jfill(r, c->fill) : json_null());
	bad |= json_object_set_new(root, "fill_note",
	    jstr_or_null(c->fill_note));
	if (bad) {
		json_decref(root);
		return ERRCODE_NOMEM;
	}
	return render_json_dump(root, out);
}

/* --- CSV --- */

static void
csv_rows(struct mbuf *out, const struct coverage_result *r,
    const char *scope, const char *key, const struct coverage_counts *c)
{
	for (int b = 0; b < r->spec.nbins; b++) {
		mbuf_printf(out, "%s,%s,", coverage_axis_name(r->spec.axis),
		    scope);
		render_site_csv_field(out, key);
		mbuf_printf(out, ",%d,%.6g,%.6g,%ld,%d\r\n", b, edge(r, b),
		    edge(r, b + 1), c->n[b],
		    c->n[b] < r->spec.min_count ? 1 : 0);
	}
}

enum errcode
render_cov_csv(const struct render_cov *c, struct mbuf *out)
{
	const struct coverage_result *r = c->r;
	char year[16];

	mbuf_puts(out, "axis,scope,key,bin,from_deg,to_deg,count,"
	    "below_min_count\r\n");
	csv_rows(out, r, "pooled", "", &r->pooled);
	for (size_t i = 0; i < r->ntargets; i++)
		csv_rows(out, r, "target", r->targets[i].id, &r->targets[i].c);
	for (size_t i = 0; i < r->nyears; i++) {
		snprintf(year, sizeof year, "%d", r->years[i].year);
		csv_rows(out, r, "year", year, &r->years[i].c);
	}
	return mbuf_status(out);
}

/* --- text --- */

#define TEXT_TARGET_COLS 5

/* Quarter mark of a bin, when one of 0/90/180/270 falls inside it. */
static const char *
bin_mark(const struct coverage_result *r, int b)
{
	for (int q = 0; q < 4; q++) {
		double a = 90.0 * q;

		if (a >= edge(r, b) && a < edge(r, b + 1))
			return coverage_axis_mark(r->spec.axis, q);
	}
	return "";
}

static void
text_metrics_line(struct mbuf *out, const char *name,
    const struct coverage_result *r, const struct coverage_metrics *m)
{
	char arc[32], filled[16];

	snprintf(filled, sizeof filled, "%d/%d", m->filled_bins,
	    r->spec.nbins);
	if (isnan(m->longest_gap_from_deg))
		snprintf(arc, sizeof arc, "none");
	else
		snprintf(arc, sizeof arc, "%.0f from %.0f", m->longest_gap_deg,
		    m->longest_gap_from_deg);
	mbuf_printf(out, "  %-10.10s %7ld %7s  %-12s", name, m->total, filled,
	    arc);
	if (m->total == 0)
		mbuf_printf(out, " %7s %9s %9s\n", "-", "-", "-");
	else
		mbuf_printf(out, " %7.3f %9.2f %9.3g%s\n", m->entropy, m->chi2,
		    m->chi2_p, m->chi2_reliable ? "" : " (few)");
}

#define TEXT_METRICS_HEAD \
	"             points  filled  empty arc    entropy    chi-sq         p\n"

/* "YYYY-MM-DDTHH:MMZ" of a UTC MJD (minutes: the fill dates are found
   to 5 minutes). */
static void
utc_minutes(double mjd, char *buf, size_t len)
{
	char full[40];

	utc_of_mjd(mjd, full, sizeof full);
	if (strlen(full) >= 16)
		snprintf(buf, len, "%.16sZ", full);
	else
		snprintf(buf, len, "%s", full);
}

/* The fill dates: for each gap bin, its next dates with target, score
   and the station's local time of the entry into the bin. */
static void
text_fill(struct mbuf *out, const struct render_cov *c)
{
	const struct coverage_result *r = c->r;
	const struct coverage_fill *f = c->fill;
	char a[40], b[40], local[48];

	utc_minutes(f->from_mjd, a, sizeof a);
	utc_minutes(f->to_mjd, b, sizeof b);
	mbuf_printf(out, "\nFill dates %s to %s (%zu windows)\n", a, b,
	    f->windows);
	if (f->nbins == 0) {
		mbuf_puts(out, "  no bin is below the threshold\n");
		return;
	}
	mbuf_printf(out, "    %-27s %-10s %9s  %s\n", "in the bin (UTC)",
	    "target", "score", c->time_zone ? "local start" : "");
	for (size_t i = 0; i < f->nbins; i++) {
		const struct coverage_fill_bin *fb = &f->bins[i];

		mbuf_printf(out, "  bin %d (%.4g-%.4g deg, %ld):%s\n", fb->bin,
		    edge(r, fb->bin), edge(r, fb->bin + 1), fb->count,
		    fb->ndates ? "" : " no window in the horizon");
		for (size_t k = 0; k < fb->ndates; k++) {
			const struct coverage_fill_date *d = &fb->dates[k];

			utc_minutes(d->in_bin_start_mjd, a, sizeof a);
			utc_minutes(d->in_bin_end_mjd, b, sizeof b);
			mbuf_printf(out, d->score >= 1000.0 ?
			    "    %s to %-6s %-10s %9.0f" :
			    "    %s to %-6s %-10s %9.4g", a,
			    strncmp(a, b, 11) == 0 ? b + 11 : b, d->target,
			    d->score);
			if (c->time_zone != NULL && render_local_time(MJD0,
			    d->in_bin_start_mjd, c->time_zone, local,
			    sizeof local) == ERRCODE_OK)
				mbuf_printf(out, "  %s", local);
			mbuf_puts(out, "\n");
		}
	}
}

enum errcode
render_cov_text(const struct render_cov *c, struct mbuf *out)
{
	const struct coverage_result *r = c->r;
	const struct coverage_spec *s = &r->spec;
	const struct coverage_metrics *pm = &r->pooled.m;
	size_t ncol = r->ntargets < TEXT_TARGET_COLS ? r->ntargets :
	    TEXT_TARGET_COLS;
	char a[40], b[40];

	mbuf_printf(out, "Coverage of %s by %s\n",
	    s->source == COVERAGE_SOURCE_ATTEMPTS ? "attempts" :
	    "normal points", coverage_axis_label(s->axis));
	if (c->station_name != NULL)
		mbuf_printf(out, "Station: %s\n", c->station_name);
	mbuf_printf(out, "%d bins of %.4g deg; a bin is filled at >= %ld\n",
	    s->nbins, r->bin_width_deg, s->min_count);
	utc_of_mjd(s->since_mjd, a, sizeof a);
	utc_of_mjd(s->until_mjd, b, sizeof b);
	mbuf_printf(out, "Filters: since %s, until %s, target %s, station %s\n",
	    isnan(s->since_mjd) ? "-" : a, isnan(s->until_mjd) ? "-" : b,
	    s->target[0] ? s->target : "all",
	    s->station[0] ? s->station : "all");
	if (s->source == COVERAGE_SOURCE_ATTEMPTS)
		mbuf_printf(out, "Records: %ld attempts, %ld skipped\n",
		    r->records, r->skipped);
	else
		mbuf_printf(out, "Records: %ld counted (%ld normal points), %ld "
		    "skipped\n", r->records, r->pooled.m.total, r->skipped);
	mbuf_printf(out, "gap = fewer than %ld; sparse = fewer than half the "
	    "mean of %.1f\n\n", s->min_count,
	    (double)r->pooled.m.total / s->nbins);

	mbuf_printf(out, "  bin deg      %-14s %6s", "mark", "pooled");
	for (size_t i = 0; i < ncol; i++)
		mbuf_printf(out, " %6.6s", r->targets[i].id);
	mbuf_puts(out, "\n");
	for (int k = 0; k < s->nbins; k++) {
		snprintf(a, sizeof a, "%.0f-%.0f", edge(r, k), edge(r, k + 1));
		mbuf_printf(out, "  %3d %-7s  %-14.14s %6ld", k, a,
		    bin_mark(r, k), r->pooled.n[k]);
		for (size_t i = 0; i < ncol; i++)
			mbuf_printf(out, " %6ld", r->targets[i].c.n[k]);
		if (r->pooled.n[k] < s->min_count)
			mbuf_puts(out, " gap");
		for (int i = 0; i < pm->nsparse; i++)
			if (pm->sparse[i] == k)
				mbuf_puts(out, " sparse");
		mbuf_puts(out, "\n");
	}
	if (r->ntargets > ncol)
		mbuf_printf(out, "  (%zu more targets: see --json or --csv)\n",
		    r->ntargets - ncol);

	mbuf_puts(out, "\nEmptiest bins:");
	for (int i = 0; i < pm->nemptiest; i++)
		mbuf_printf(out, " %d (%ld)", pm->emptiest[i],
		    r->pooled.n[pm->emptiest[i]]);
	mbuf_puts(out, "\n\nMetrics (empty arc in degrees)\n" TEXT_METRICS_HEAD);
	text_metrics_line(out, "pooled", r, pm);
	for (size_t i = 0; i < r->ntargets; i++)
		text_metrics_line(out, r->targets[i].id, r, &r->targets[i].c.m);
	if (r->nyears > 0) {
		mbuf_puts(out, "\nBy year\n" TEXT_METRICS_HEAD);
		for (size_t i = 0; i < r->nyears; i++) {
			snprintf(a, sizeof a, "%d", r->years[i].year);
			text_metrics_line(out, a, r, &r->years[i].c.m);
		}
	}
	mbuf_printf(out, "\nchi-sq: against a uniform spread, %d degrees of "
	    "freedom; (few) = fewer than 5\nexpected per bin, p is rough.\n",
	    pm->chi2_dof);

	if (c->fill != NULL)
		text_fill(out, c);
	if (c->fill_note != NULL && *c->fill_note != '\0')
		mbuf_printf(out, "\n%s\n", c->fill_note);
	return mbuf_status(out);
}

/* --- SVG --- */

void
render_cov_xml_escape(struct mbuf *out, const char *s)
{
	for (; *s; s++) {
		switch (*s) {
		case '&':
			mbuf_puts(out, "&amp;");
			break;
		case '<':
			mbuf_puts(out, "&lt;");
			break;
		case '>':
			mbuf_puts(out, "&gt;");
			break;
		case '"':
			mbuf_puts(out, "&quot;");
			break;
		case '\'':
			mbuf_puts(out, "&apos;");
			break;
		default:
			/* Control characters are not allowed in XML 1.0. */
			if ((unsigned char)*s < 0x20 && *s != '\t' &&
			    *s != '\n' && *s != '\r')
				mbuf_puts(out, "?");
			else
				mbuf_add(out, s, 1);
		}
	}
}

/* Geometry of the chart, in SVG user units. */
#define SVG_W 900.0
#define SVG_H 650.0
#define SVG_CX 360.0
#define SVG_CY 332.0
#define SVG_R0 62.0		/* inner radius: the hub */
#define SVG_R1 205.0		/* bar length at the largest count */
#define SVG_GAP_R 16.0		/* visible depth of an empty bin */
#define SVG_STYLES 6
#define SVG_MAX_LINES 16	/* targets drawn; the rest are counted */

/* Stroke dashes, markers and inks of target lines: dash and marker alone
   tell the targets apart; the ink helps where colour is seen. */
static const char *const svg_dash[SVG_STYLES] = {
	"none", "7 4", "2 3", "9 3 2 3", "1 6", "12 5"
};
static const char *const svg_ink[SVG_STYLES] = {
	"#1d3557", "#8a3b12", "#2f6b3a", "#6a2c70", "#7a6a00", "#0b6e6e"
};

/* Point at angle deg (clockwise from the top) and radius rad. */
static void
polar(double deg, double rad, double *x, double *y)
{
	double a = deg * 3.14159265358979323846 / 180.0;

	*x = SVG_CX + rad * sin(a);
	*y = SVG_CY - rad * cos(a);
}

/* Radius of a bar of count n: the sector's area (from the hub) grows in
   proportion to the count, so that small bins stay visible and the eye
   compares areas fairly. */
static double
bar_radius(double n, double max)
{
	return sqrt(SVG_R0 * SVG_R0 + (SVG_R1 * SVG_R1 - SVG_R0 * SVG_R0) *
	    n / max);
}

/* Marker shape k centred at x, y. */
static void
svg_marker(struct mbuf *out, int k, double x, double y, const char *ink)
{
	switch (k % SVG_STYLES) {
	case 0:
		mbuf_printf(out, "<circle cx=\"%.1f\" cy=\"%.1f\" r=\"3.6\" "
		    "fill=\"%s\"/>", x, y, ink);
		break;
	case 1:
		mbuf_printf(out, "<rect x=\"%.1f\" y=\"%.1f\" width=\"6.4\" "
		    "height=\"6.4\" fill=\"#ffffff\" stroke=\"%s\" "
		    "stroke-width=\"1.6\"/>", x - 3.2, y - 3.2, ink);
		break;
	case 2:
		mbuf_printf(out, "<path d=\"M%.1f %.1fL%.1f %.1fL%.1f %.1fZ\" "
		    "fill=\"%s\"/>", x, y - 4.2, x + 3.8, y + 2.6, x - 3.8,
		    y + 2.6, ink);
		break;
	case 3:
		mbuf_printf(out, "<path d=\"M%.1f %.1fL%.1f %.1fL%.1f %.1fL%.1f "
		    "%.1fZ\" fill=\"#ffffff\" stroke=\"%s\" "
		    "stroke-width=\"1.6\"/>", x, y - 4.4, x + 4.0, y, x,
		    y + 4.4, x - 4.0, y, ink);
		break;
	case 4:
		mbuf_printf(out, "<path d=\"M%.1f %.1fL%.1f %.1fM%.1f %.1fL%.1f "
		    "%.1f\" stroke=\"%s\" stroke-width=\"2\"/>", x - 3.6,
		    y - 3.6, x + 3.6, y + 3.6, x - 3.6, y + 3.6, x + 3.6,
		    y - 3.6, ink);
		break;
	default:
		mbuf_printf(out, "<path d=\"M%.1f %.1fL%.1f %.1fM%.1f %.1fL%.1f "
		    "%.1f\" stroke=\"%s\" stroke-width=\"2\"/>", x - 4.2, y,
		    x + 4.2, y, x, y - 4.2, x, y + 4.2, ink);
		break;
	}
}

/* One bin's bar: a ring sector from the hub to radius rad. */
static void
svg_sector(struct mbuf *out, const struct coverage_result *r, int b,
    double rad, const char *cls, const char *fill)
{
	double a0 = edge(r, b) + 0.6, a1 = edge(r, b + 1) - 0.6;
	double x0, y0, x1, y1, x2, y2, x3, y3;

	polar(a0, SVG_R0, &x0, &y0);
	polar(a0, rad, &x1, &y1);
	polar(a1, rad, &x2, &y2);
	polar(a1, SVG_R0, &x3, &y3);
	mbuf_printf(out, "<path class=\"%s\" data-bin=\"%d\" data-count=\"%ld\" "
	    "fill=\"%s\" stroke=\"#3c4a52\" stroke-width=\"0.8\" "
	    "d=\"M%.2f %.2fL%.2f %.2fA%.2f %.2f 0 0 1 %.2f %.2fL%.2f %.2f"
	    "A%.2f %.2f 0 0 0 %.2f %.2fZ\"/>\n", cls, b, r->pooled.n[b], fill,
	    x0, y0, x1, y1, rad, rad, x2, y2, x3, y3, SVG_R0, SVG_R0, x0, y0);
}

static void
svg_text(struct mbuf *out, double x, double y, const char *anchor,
    const char *attrs, const char *text)
{
	mbuf_printf(out, "<text x=\"%.1f\" y=\"%.1f\" text-anchor=\"%s\"%s%s>",
	    x, y, anchor, attrs[0] ? " " : "", attrs);
	render_cov_xml_escape(out, text);
	mbuf_puts(out, "</text>\n");
}

static void
svg_desc(struct mbuf *out, const struct render_cov *c)
{
	const struct coverage_result *r = c->r;
	const struct coverage_metrics *m = &r->pooled.m;
	char buf[96];

	mbuf_puts(out, "<desc id=\"cov-desc\">");
	snprintf(buf, sizeof buf, "Counts of %s in %d bins of the ",
	    r->spec.source == COVERAGE_SOURCE_ATTEMPTS ? "attempts" :
	    "normal points", r->spec.nbins);
	render_cov_xml_escape(out, buf);
	render_cov_xml_escape(out, coverage_axis_label(r->spec.axis));
	mbuf_printf(out, ", %.4g degrees each, drawn clockwise from the top "
	    "(0 degrees, %s). Bar area is proportional to the pooled "
	    "count; bins below %ld are hatched, bins under half the mean "
	    "dotted. Pooled counts by bin:",
	    r->bin_width_deg, coverage_axis_mark(r->spec.axis, 0),
	    r->spec.min_count);
	for (int b = 0; b < r->spec.nbins; b++)
		mbuf_printf(out, "%s %ld", b ? "," : "", r->pooled.n[b]);
	mbuf_printf(out, ". Total %ld; %d of %d bins filled; longest empty "
	    "arc %.4g degrees.", m->total, m->filled_bins, r->spec.nbins,
	    m->longest_gap_deg);
	for (size_t i = 0; i < r->ntargets; i++) {
		mbuf_puts(out, " Target ");
		render_cov_xml_escape(out, r->targets[i].id);
		mbuf_printf(out, " (line style %zu, scaled to its own fullest "
		    "bin):", i % SVG_STYLES + 1);
		for (int b = 0; b < r->spec.nbins; b++)
			mbuf_printf(out, "%s %ld", b ? "," : "",
			    r->targets[i].c.n[b]);
		mbuf_puts(out, ".");
	}
	mbuf_puts(out, "</desc>\n");
}

/* Legend, to the right of the ring. */
static void
svg_legend(struct mbuf *out, const struct coverage_result *r)
{
	double x = 712.0, y = 96.0;
	char buf[80];

	svg_text(out, x, y, "start", "class=\"head\"", "Legend");
	y += 22.0;
	mbuf_printf(out, "<rect x=\"%.1f\" y=\"%.1f\" width=\"18\" height=\"12\" "
	    "fill=\"#c8d3c0\" stroke=\"#3c4a52\" stroke-width=\"0.8\"/>\n", x,
	    y - 10.0);
	svg_text(out, x + 26.0, y, "start", "", "all targets (bar)");
	y += 22.0;
	mbuf_printf(out, "<rect x=\"%.1f\" y=\"%.1f\" width=\"18\" height=\"12\" "
	    "fill=\"url(#cov-gap)\" stroke=\"#3c4a52\" stroke-width=\"0.8\"/>\n",
	    x, y - 10.0);
	snprintf(buf, sizeof buf, "below %ld (gap)", r->spec.min_count);
	svg_text(out, x + 26.0, y, "start", "", buf);
	y += 22.0;
	mbuf_printf(out, "<rect x=\"%.1f\" y=\"%.1f\" width=\"18\" height=\"12\" "
	    "fill=\"url(#cov-sparse)\" stroke=\"#3c4a52\" stroke-width=\"0.8\"/>\n",
	    x, y - 10.0);
	svg_text(out, x + 26.0, y, "start", "", "under half the mean");
	svg_text(out, x + 26.0, y + 14.0, "start", "", "(sparse)");
	y += 14.0;
	size_t nlines = r->ntargets < SVG_MAX_LINES ? r->ntargets :
	    SVG_MAX_LINES;

	for (size_t i = 0; i < nlines; i++) {
		int k = (int)(i % SVG_STYLES);

		y += 22.0;
		mbuf_printf(out, "<g class=\"legend-target\" data-target=\"");
		render_cov_xml_escape(out, r->targets[i].id);
		mbuf_printf(out, "\"><path d=\"M%.1f %.1fH%.1f\" fill=\"none\" "
		    "stroke=\"%s\" stroke-width=\"1.8\" stroke-dasharray=\"%s\"/>",
		    x - 4.0, y - 4.0, x + 22.0, svg_ink[k], svg_dash[k]);
		svg_marker(out, (int)i, x + 9.0, y - 4.0, svg_ink[k]);
		mbuf_puts(out, "</g>\n");
		snprintf(buf, sizeof buf, "%s (%ld)", r->targets[i].id,
		    r->targets[i].c.m.total);
		svg_text(out, x + 30.0, y, "start", "", buf);
	}
	if (r->ntargets > nlines) {
		y += 22.0;
		snprintf(buf, sizeof buf, "%zu more targets not drawn",
		    r->ntargets - nlines);
		svg_text(out, x - 4.0, y, "start", "", buf);
	}
	if (r->ntargets > 0) {
		svg_text(out, x - 4.0, y + 24.0, "start", "", "Each line is one");
		svg_text(out, x - 4.0, y + 38.0, "start", "",
		    "target, scaled to its");
		svg_text(out, x - 4.0, y + 52.0, "start", "", "own fullest bin.");
	}
}

enum errcode
render_cov_svg(const struct render_cov *c, struct mbuf *out)
{
	const struct coverage_result *r = c->r;
	const struct coverage_spec *s = &r->spec;
	const struct coverage_metrics *m = &r->pooled.m;
	long max = 1;
	char buf[200];
	double x, y;

	for (int b = 0; b < s->nbins; b++)
		if (r->pooled.n[b] > max)
			max = r->pooled.n[b];

	mbuf_printf(out, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
	    "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" "
	    "width=\"%.0f\" height=\"%.0f\" viewBox=\"0 0 %.0f %.0f\" "
	    "role=\"img\" aria-labelledby=\"cov-title cov-desc\">\n",
	    SVG_W, SVG_H, SVG_W, SVG_H);
	snprintf(buf, sizeof buf, "Coverage of %s by %s",
	    s->source == COVERAGE_SOURCE_ATTEMPTS ? "attempts" :
	    "normal points", coverage_axis_label(s->axis));
	mbuf_puts(out, "<title id=\"cov-title\">");
	render_cov_xml_escape(out, buf);
	if (c->station_name != NULL) {
		mbuf_puts(out, " - ");
		render_cov_xml_escape(out, c->station_name);
	}
	mbuf_puts(out, "</title>\n");
	svg_desc(out, c);
	mbuf_puts(out,
	    "<defs><pattern id=\"cov-gap\" width=\"6\" height=\"6\" "
	    "patternUnits=\"userSpaceOnUse\" patternTransform=\"rotate(45)\">"
	    "<rect width=\"6\" height=\"6\" fill=\"#fbf1e4\"/>"
	    "<path d=\"M0 0V6\" stroke=\"#b4532a\" stroke-width=\"2.2\"/>"
	    "</pattern>"
	    "<pattern id=\"cov-sparse\" width=\"5\" height=\"5\" "
	    "patternUnits=\"userSpaceOnUse\">"
	    "<rect width=\"5\" height=\"5\" fill=\"#eef0e2\"/>"
	    "<circle cx=\"2.5\" cy=\"2.5\" r=\"1.1\" fill=\"#7d6a2e\"/>"
	    "</pattern></defs>\n"
	    "<style>text{font-family:sans-serif;font-size:12px;fill:#24313a}"
	    ".head{font-size:15px;font-weight:bold}.count{font-size:11px}"
	    ".dense .count{font-size:8px}"
	    ".mark{font-size:12px;font-style:italic}</style>\n");
	mbuf_printf(out, "<rect width=\"%.0f\" height=\"%.0f\" "
	    "fill=\"#fdfcf8\"/>\n", SVG_W, SVG_H);
	svg_text(out, 24.0, 30.0, "start", "class=\"head\"", buf);
	snprintf(buf, sizeof buf, "%d bins of %.4g deg, clockwise from the "
	    "top; %ld in all, largest bar %ld", s->nbins, r->bin_width_deg,
	    m->total, max);
	svg_text(out, 24.0, 48.0, "start", "", buf);

	/* Guide rings at quarters of the largest count. */
	mbuf_puts(out, "<g class=\"guides\" fill=\"none\" stroke=\"#b9c2c7\" "
	    "stroke-width=\"0.6\">\n");
	for (int q = 1; q <= 4; q++)
		mbuf_printf(out, "<circle cx=\"%.0f\" cy=\"%.0f\" r=\"%.2f\"/>\n",
		    SVG_CX, SVG_CY, bar_radius(q, 4.0));
	for (int q = 0; q < 4; q++) {
		double x0, y0, x1, y1;

		polar(90.0 * q, SVG_R0 - 8.0, &x0, &y0);
		polar(90.0 * q, SVG_R1 + 30.0, &x1, &y1);
		mbuf_printf(out, "<path d=\"M%.2f %.2fL%.2f %.2f\" "
		    "stroke-dasharray=\"3 3\"/>\n", x0, y0, x1, y1);
	}
	mbuf_puts(out, "</g>\n");

	/* The bars: one mark per bin. */
	mbuf_puts(out, "<g class=\"bins\">\n");
	for (int b = 0; b < s->nbins; b++) {
		long n = r->pooled.n[b];
		double rad = bar_radius((double)n, (double)max);

		int sparse = 0;

		for (int i = 0; i < m->nsparse; i++)
			sparse |= m->sparse[i] == b;
		if (n < s->min_count) {
			if (rad < SVG_R0 + SVG_GAP_R)
				rad = SVG_R0 + SVG_GAP_R;
			svg_sector(out, r, b, rad, "bin gap", "url(#cov-gap)");
		} else if (sparse) {
			if (rad < SVG_R0 + SVG_GAP_R)
				rad = SVG_R0 + SVG_GAP_R;
			svg_sector(out, r, b, rad, "bin sparse",
			    "url(#cov-sparse)");
		} else {
			svg_sector(out, r, b, rad, "bin", "#c8d3c0");
		}
	}
	mbuf_puts(out, "</g>\n");

	/* Count labels just outside the ring. */
	mbuf_puts(out, s->nbins > 24 ? "<g class=\"counts dense\">\n" :
	    "<g class=\"counts\">\n");
	for (int b = 0; b < s->nbins; b++) {
		char attrs[48];

		polar(edge(r, b) + 0.5 * r->bin_width_deg, SVG_R1 + 14.0, &x,
		    &y);
		snprintf(buf, sizeof buf, "%ld", r->pooled.n[b]);
		snprintf(attrs, sizeof attrs, "class=\"count\" data-bin=\"%d\"",
		    b);
		svg_text(out, x, y + 4.0, "middle", attrs, buf);
	}
	mbuf_puts(out, "</g>\n");

	/* Per-target lines through the bin centres, each scaled to its own
	   fullest bin so that every target's shape over the cycle shows. */
	for (size_t i = 0; i < r->ntargets && i < SVG_MAX_LINES; i++) {
		const long *tn = r->targets[i].c.n;
		int k = (int)(i % SVG_STYLES);
		long tmax = 1;

		for (int b = 0; b < s->nbins; b++)
			if (tn[b] > tmax)
				tmax = tn[b];
		mbuf_puts(out, "<g class=\"target\" data-target=\"");
		render_cov_xml_escape(out, r->targets[i].id);
		mbuf_printf(out, "\"><path fill=\"none\" stroke=\"%s\" "
		    "stroke-width=\"1.8\" stroke-dasharray=\"%s\" d=\"",
		    svg_ink[k], svg_dash[k]);
		for (int b = 0; b < s->nbins; b++) {
			polar(edge(r, b) + 0.5 * r->bin_width_deg,
			    bar_radius((double)tn[b], (double)tmax), &x, &y);
			mbuf_printf(out, "%s%.2f %.2f", b ? "L" : "M", x, y);
		}
		mbuf_puts(out, "Z\"/>");
		for (int b = 0; b < s->nbins; b++) {
			polar(edge(r, b) + 0.5 * r->bin_width_deg,
			    bar_radius((double)tn[b], (double)tmax), &x, &y);
			svg_marker(out, (int)i, x, y, svg_ink[k]);
		}
		mbuf_puts(out, "</g>\n");
	}

	/* Quarter labels outside the counts. */
	for (int q = 0; q < 4; q++) {
		static const char *const anchor[4] = {
			"middle", "start", "middle", "end"
		};

		polar(90.0 * q, SVG_R1 + 40.0, &x, &y);
		snprintf(buf, sizeof buf, "%s (%d)",
		    coverage_axis_mark(s->axis, q), 90 * q);
		svg_text(out, x, y + (q == 2 ? 10.0 : q == 0 ? -2.0 : 4.0),
		    anchor[q], "class=\"mark\"", buf);
	}
	snprintf(buf, sizeof buf, "%s", coverage_axis_name(s->axis));
	svg_text(out, SVG_CX, SVG_CY + 4.0, "middle", "class=\"mark\"", buf);

	svg_legend(out, r);

	/* The numbers under the chart. */
	if (m->total > 0)
		snprintf(buf, sizeof buf, "filled %d/%d bins, longest empty "
		    "arc %.4g deg, entropy %.3f, chi-square %.1f (%d dof, "
		    "p %.3g)", m->filled_bins, s->nbins, m->longest_gap_deg,
		    m->entropy, m->chi2, m->chi2_dof, m->chi2_p);
	else
		snprintf(buf, sizeof buf, "no records match the query");
	svg_text(out, 24.0, SVG_H - 20.0, "start", "", buf);
	mbuf_puts(out, "</svg>\n");
	return mbuf_status(out);
}
