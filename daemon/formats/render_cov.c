/* SPDX-License-Identifier: BSD-3-Clause */
/* render_cov.c: coverage audit to JSON, CSV, a text table and SVG. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <jansson.h>

#include "core/text.h"
#include "formats/render_json.h"
#include "formats/render_time.h"
#include "formats/render_cov.h"
#include "formats/render_site.h"
#include "formats/render_text.h"
#include "core/tscale.h"

/* --- shared bits --- */

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
	bad |= json_object_set_new(m, "entropy", render_json_num(x->entropy,
	    6));
	bad |= json_object_set_new(m, "chi_square", render_json_num(x->chi2,
	    6));
	bad |= json_object_set_new(m, "chi_square_dof",
	    json_integer(x->chi2_dof));
	/* Full precision: a p-value of 4.07e-50 is not 0. */
	bad |= json_object_set_new(m, "chi_square_p", isfinite(x->chi2_p) ?
	    json_real(x->chi2_p) : json_null());
	bad |= json_object_set_new(m, "chi_square_reliable",
	    json_boolean(x->chi2_reliable));
	return render_json_checked(o, bad);
}

/* Append to arr the counts c (jcounts) with key set to value (a new
   reference, taken): 0, or non-zero when it could not be built. */
static int
jcounts_add(json_t *arr, const struct coverage_counts *c,
    const struct coverage_spec *s, const char *key, json_t *value)
{
	json_t *o = jcounts(c, s->nbins, s->min_count);

	if (o == NULL || json_array_append_new(arr, o) != 0) {
		json_decref(value);
		return -1;
	}
	return json_object_set_new(o, key, value);
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
	bad |= json_object_set_new(o, "from_utc", render_json_mjd(f->from_mjd,
	    0));
	bad |= json_object_set_new(o, "to_utc", render_json_mjd(f->to_mjd, 0));
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
			    render_json_mjd(d->window_start_mjd, 0));
			bad |= json_object_set_new(x, "window_end_utc",
			    render_json_mjd(d->window_end_mjd, 0));
			bad |= json_object_set_new(x, "in_bin_start_utc",
			    render_json_mjd(d->in_bin_start_mjd, 0));
			bad |= json_object_set_new(x, "in_bin_end_utc",
			    render_json_mjd(d->in_bin_end_mjd, 0));
			bad |= json_object_set_new(x, "score",
			    render_json_num(d->score, 6));
		}
	}
	return render_json_checked(o, bad);
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
		bad |= json_object_set_new(o, "since_utc",
		    render_json_mjd(s->since_mjd, 0));
		bad |= json_object_set_new(o, "until_utc",
		    render_json_mjd(s->until_mjd, 0));
		bad |= json_object_set_new(o, "target", jstr_or_null(s->target));
		bad |= json_object_set_new(o, "station",
		    jstr_or_null(s->station));
	}
	bad |= json_object_set_new(root, "station_name",
	    jstr_or_null(c->station_name));
	bad |= json_object_set_new(root, "records", json_integer(r->records));
	bad |= json_object_set_new(root, "skipped", json_integer(r->skipped));
	bad |= json_object_set_new(root, "suspect", json_integer(r->suspect));
	arr = json_array();
	bad |= json_object_set_new(root, "bin_ranges", arr);
	for (int b = 0; b < s->nbins && arr != NULL && !bad; b++) {
		o = json_object();
		bad |= json_array_append_new(arr, o);
		bad |= json_object_set_new(o, "bin", json_integer(b));
		bad |= json_object_set_new(o, "from_deg",
		    render_json_num(edge(r, b), 6));
		bad |= json_object_set_new(o, "to_deg", render_json_num(edge(r,
		    b + 1), 6));
	}
	bad |= json_object_set_new(root, "pooled",
	    jcounts(&r->pooled, s->nbins, s->min_count));
	arr = json_array();
	bad |= json_object_set_new(root, "targets", arr);
	for (size_t i = 0; i < r->ntargets && arr != NULL && !bad; i++)
		bad |= jcounts_add(arr, &r->targets[i].c, s, "id",
		    json_string(r->targets[i].id));
	arr = json_array();
	bad |= json_object_set_new(root, "years", arr);
	for (size_t i = 0; i < r->nyears && arr != NULL && !bad; i++)
		bad |= jcounts_add(arr, &r->years[i].c, s, "year",
		    json_integer(r->years[i].year));
	bad |= json_object_set_new(root, "fill",
	    c->fill != NULL ? jfill(r, c->fill) : json_null());
	bad |= json_object_set_new(root, "fill_note",
	    jstr_or_null(c->fill_note));
	return render_json_dump(render_json_checked(root, bad), out);
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

	render_utc_text(mjd, 0, full, sizeof full);
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
			if (c->time_zone != NULL && tzone_format(c->time_zone,
			    TEXT_MJD0, d->in_bin_start_mjd, local,
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
	render_utc_text(s->since_mjd, 0, a, sizeof a);
	render_utc_text(s->until_mjd, 0, b, sizeof b);
	mbuf_printf(out, "Filters: since %s, until %s, target %s, station %s\n",
	    isnan(s->since_mjd) ? "-" : a, isnan(s->until_mjd) ? "-" : b,
	    s->target[0] ? s->target : "all",
	    s->station[0] ? s->station : "all");
	if (s->source == COVERAGE_SOURCE_ATTEMPTS)
		mbuf_printf(out, "Records: %ld attempts, %ld skipped, %ld "
		    "suspect left out\n", r->records, r->skipped, r->suspect);
	else
		mbuf_printf(out, "Records: %ld counted (%ld normal points), %ld "
		    "skipped, %ld suspect left out\n", r->records,
		    r->pooled.m.total, r->skipped, r->suspect);
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

/* XML 1.0's five entities; tab, newline and CR as they are (every other
   control character is not allowed in XML 1.0 and becomes "?"). */
static const char *const xml_escapes[RENDER_TEXT_ASCII] = {
	['&'] = "&amp;", ['<'] = "&lt;", ['>'] = "&gt;", ['"'] = "&quot;",
	['\''] = "&apos;", ['\t'] = "\t", ['\n'] = "\n", ['\r'] = "\r",
};

void
render_cov_xml_escape(struct mbuf *out, const char *s)
{
	render_text_escape(out, s, xml_escapes, "?");
}

/*
 * The chart: the axis angle along a line from 0 to 360 degrees, one bar
 * per bin, the pooled mean as a dashed line, and beneath it one small
 * chart per target on a common scale.  Its user units are sized so that
 * the smallest text (14 units) stays at least 12 px when the 400-unit
 * width is shown in a 350 px phone column.  Empty (below min_count) bins
 * are the loudest marks: a hatched band the full height of the plot with
 * a cross beneath and the word "empty" (or "gap") in it, in the ink of
 * greatest contrast after the text; sparse bins get a hollow triangle.
 * Every text carries its own size and fill as presentation attributes
 * (no <style>), so the chart looks the same embedded in any page.
 */
#define SVG_W 400.0
#define SVG_X0 44.0		/* the line's 0 degrees */
#define SVG_X1 388.0		/* its 360 degrees */
#define SVG_PY0 110.0		/* top of the pooled plot */
#define SVG_PY1 240.0		/* its baseline */
#define SVG_FONT 14		/* every text but the heading */
#define SVG_HEAD 16
#define SVG_MULT_H 56.0		/* one target's block */
#define SVG_MULT_PLOT 32.0	/* its bars' full height */
#define SVG_MAX_LINES 16	/* targets drawn; the rest are counted */
#define SVG_LABEL_MIN_W 24.0	/* bin width that takes a count label */

/* The two themes' inks.  Contrast against the ground (WCAG 2 formula),
   the empty-bin ink highest of all marks (text aside): dark 8.3 (Moon
   7.4, sparse 6.0, axis 5.8, bar edge 5.7, mean 5.4), light 8.2 (axis
   4.8, sparse 4.0, bar edge 3.7, mean 3.4, Moon 3.1). */
struct svg_ink {
	const char *ground, *ink, *dim, *rule, *axis;
	const char *bar, *bar_edge, *sparse, *gap, *gap_band, *mean;
	const char *lit, *unlit;	/* the Moon glyphs */
};

static const struct svg_ink svg_dark = {
	"#1f1a16", "#e9e2d4", "#b3a998", "#4a3f36", "#9e9584",
	"#5f7d69", "#7d9c86", "#b8924e", "#ff9a70", "#3a1d14", "#7f93a6",
	"#b3a998", "#1f1a16"
};

static const struct svg_ink svg_light = {
	"#ffffff", "#1d2329", "#4d5760", "#c9ced2", "#6b747c",
	"#a9bfb0", "#6f8c79", "#9a7b2c", "#9b1c14", "#fbe9e6", "#6f8fae",
	"#ffffff", "#8a939b"
};

const char *
render_cov_theme_name(enum render_cov_theme t)
{
	return t == RENDER_COV_DARK ? "dark" : "light";
}

int
render_cov_theme_parse(const char *s)
{
	if (s != NULL && strcmp(s, "light") == 0)
		return RENDER_COV_LIGHT;
	if (s != NULL && strcmp(s, "dark") == 0)
		return RENDER_COV_DARK;
	return -1;
}

/* x of an angle on the line. */
static double
svg_x(double deg)
{
	return SVG_X0 + (SVG_X1 - SVG_X0) * deg / 360.0;
}

/* Text at x, y in ink of size px; attrs ("" for none) go in as they are. */
static void
svg_text(struct mbuf *out, double x, double y, const char *anchor,
    int px, const char *ink, const char *attrs, const char *text)
{
	mbuf_printf(out, "<text x=\"%.1f\" y=\"%.1f\" text-anchor=\"%s\" "
	    "font-size=\"%d\" fill=\"%s\"%s%s>", x, y, anchor, px, ink,
	    attrs[0] ? " " : "", attrs);
	render_cov_xml_escape(out, text);
	mbuf_puts(out, "</text>\n");
}

static int
svg_is_sparse(const struct coverage_metrics *m, int b)
{
	for (int i = 0; i < m->nsparse; i++)
		if (m->sparse[i] == b)
			return 1;
	return 0;
}

/* The cross under an empty bin, centred at x, y, half size h. */
static void
svg_cross(struct mbuf *out, double x, double y, double h, const char *ink,
    int b)
{
	mbuf_printf(out, "<path class=\"gap-mark\" data-bin=\"%d\" "
	    "fill=\"none\" stroke=\"%s\" stroke-width=\"3\" "
	    "stroke-linecap=\"round\" d=\"M%.1f %.1fL%.1f %.1fM%.1f %.1f"
	    "L%.1f %.1f\"/>\n", b, ink, x - h, y - h, x + h, y + h, x - h,
	    y + h, x + h, y - h);
}

/* The hollow triangle under a sparse bin. */
static void
svg_triangle(struct mbuf *out, double x, double y, double h, const char *ink,
    int b)
{
	mbuf_printf(out, "<path class=\"sparse-mark\" data-bin=\"%d\" "
	    "fill=\"none\" stroke=\"%s\" stroke-width=\"2\" "
	    "stroke-linejoin=\"round\" d=\"M%.1f %.1fL%.1f %.1fL%.1f %.1fZ\"/>\n",
	    b, ink, x, y - h, x + h, y + h * 0.8, x - h, y + h * 0.8);
}

/* A Moon at quarter q of the synodic axis, lit part in k->lit. */
static void
svg_moon(struct mbuf *out, const struct svg_ink *k, double x, double y,
    int q)
{
	const double r = 6.0;

	mbuf_printf(out, "<circle cx=\"%.1f\" cy=\"%.1f\" r=\"%.1f\" "
	    "fill=\"%s\" stroke=\"%s\" stroke-width=\"1.2\"/>", x, y, r,
	    q == 2 ? k->lit : k->unlit, k->axis);
	if (q == 1 || q == 3)	/* the lit half: right waxing, left waning */
		mbuf_printf(out, "<path fill=\"%s\" d=\"M%.1f %.1fA%.1f %.1f 0 0 "
		    "%d %.1f %.1fZ\"/>", k->lit, x, y - r, r, r, q == 1 ? 1 : 0,
		    x, y + r);
	mbuf_puts(out, "\n");
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
	mbuf_printf(out, ", %.4g degrees each, as bars along a line from 0 "
	    "(%s) to 360 degrees, with the quarters marked and the pooled "
	    "mean of %.1f per bin as a dashed line. Bins below %ld are "
	    "crossed and hatched over the full height; bins under half the "
	    "mean carry a triangle. Pooled counts by bin:",
	    r->bin_width_deg, coverage_axis_mark(r->spec.axis, 0),
	    (double)m->total / r->spec.nbins, r->spec.min_count);
	for (int b = 0; b < r->spec.nbins; b++)
		mbuf_printf(out, "%s %ld", b ? "," : "", r->pooled.n[b]);
	mbuf_printf(out, ". Total %ld; %d of %d bins filled; longest empty "
	    "arc %.4g degrees.", m->total, m->filled_bins, r->spec.nbins,
	    m->longest_gap_deg);
	for (size_t i = 0; i < r->ntargets; i++) {
		mbuf_puts(out, " Target ");
		render_cov_xml_escape(out, r->targets[i].id);
		mbuf_puts(out, " (a small chart beneath, on one scale for all "
		    "targets):");
		for (int b = 0; b < r->spec.nbins; b++)
			mbuf_printf(out, "%s %ld", b ? "," : "",
			    r->targets[i].c.n[b]);
		mbuf_puts(out, ".");
	}
	mbuf_puts(out, "</desc>\n");
}

/* Quarter names above the plot (0 and 180 on one row, 90 and 270 on the
   next, so that long names do not meet), guide lines at every quarter
   and the degrees beneath. */
static void
svg_axis(struct mbuf *out, const struct coverage_result *r,
    const struct svg_ink *k)
{
	static const char *const anchor[4] = {
		"start", "middle", "middle", "middle"
	};
	char buf[32];

	for (int q = 0; q < 4; q++) {
		double x = svg_x(90.0 * q);

		svg_text(out, q == 0 ? x - 20.0 : x, q % 2 ? 84.0 : 66.0,
		    anchor[q], SVG_FONT, k->ink, "class=\"quarter\"",
		    coverage_axis_mark(r->spec.axis, q));
	}
	mbuf_printf(out, "<g class=\"guides\" stroke=\"%s\" stroke-width=\"1\" "
	    "stroke-dasharray=\"3 3\">\n", k->rule);
	for (int q = 0; q <= 4; q++)
		mbuf_printf(out, "<path d=\"M%.1f %.1fV%.1f\"/>\n",
		    svg_x(90.0 * q), SVG_PY0 - 6.0, SVG_PY1);
	mbuf_puts(out, "</g>\n");
	if (r->spec.axis == COVERAGE_AXIS_SYNODIC)
		for (int q = 0; q <= 4; q++)
			svg_moon(out, k, svg_x(90.0 * q), SVG_PY0 - 12.0, q % 4);
	mbuf_printf(out, "<path stroke=\"%s\" stroke-width=\"1.5\" "
	    "d=\"M%.1f %.1fH%.1f\"/>\n", k->axis, SVG_X0, SVG_PY1, SVG_X1);
	for (int q = 0; q <= 4; q++) {
		snprintf(buf, sizeof buf, "%d\xc2\xb0", 90 * q);
		svg_text(out, svg_x(90.0 * q), SVG_PY1 + 34.0, q == 0 ? "start" :
		    q == 4 ? "end" : "middle", SVG_FONT, k->dim, "", buf);
	}
}

/* The pooled bars, the marks of empty and sparse bins, the counts and
   the mean. */
static void
svg_pooled(struct mbuf *out, const struct coverage_result *r,
    const struct svg_ink *k, long max)
{
	const struct coverage_spec *s = &r->spec;
	const struct coverage_metrics *m = &r->pooled.m;
	double w = (SVG_X1 - SVG_X0) / s->nbins, span = SVG_PY1 - SVG_PY0 - 22.0;
	double mean = (double)m->total / s->nbins;
	int label = w >= SVG_LABEL_MIN_W;
	char buf[64];

	mbuf_puts(out, "<g class=\"bins\">\n");
	for (int b = 0; b < s->nbins; b++) {
		long n = r->pooled.n[b];
		double x = SVG_X0 + b * w + 1.0, h = span * (double)n / (double)max;

		if (n < s->min_count) {
			/* A band the full height: the gap is the chart's
			   loudest mark, whatever the scale. */
			mbuf_printf(out, "<path class=\"bin gap\" data-bin=\"%d\" "
			    "data-count=\"%ld\" fill=\"url(#cov-gap)\" "
			    "stroke=\"%s\" stroke-width=\"1.5\" "
			    "d=\"M%.1f %.1fH%.1fV%.1fH%.1fZ\"/>\n", b, n, k->gap,
			    x, SVG_PY1, x + w - 2.0, SVG_PY0, x);
			svg_cross(out, x + w / 2.0 - 1.0, SVG_PY1 + 13.0,
			    w >= 16.0 ? 6.0 : w / 2.0 - 1.0, k->gap, b);
			if (w >= 16.0) {
				char attrs[96];

				snprintf(attrs, sizeof attrs, "class=\"gap-label\" "
				    "font-weight=\"bold\" transform=\"rotate(-90 "
				    "%.1f %.1f)\"", x + w / 2.0 + 4.0,
				    SVG_PY1 - 8.0);
				svg_text(out, x + w / 2.0 + 4.0, SVG_PY1 - 8.0,
				    "start", SVG_FONT, k->gap, attrs,
				    s->min_count > 1 ? "gap" : "empty");
			}
		} else {
			mbuf_printf(out, "<path class=\"bin%s\" data-bin=\"%d\" "
			    "data-count=\"%ld\" fill=\"%s\" stroke=\"%s\" "
			    "stroke-width=\"1\" d=\"M%.1f %.1fH%.1fV%.1fH%.1fZ\"/>\n",
			    svg_is_sparse(m, b) ? " sparse" : "", b, n, k->bar,
			    k->bar_edge, x, SVG_PY1, x + w - 2.0, SVG_PY1 - h, x);
			if (svg_is_sparse(m, b))
				svg_triangle(out, x + w / 2.0 - 1.0,
				    SVG_PY1 + 13.0, w >= 16.0 ? 6.0 :
				    w / 2.0 - 1.0, k->sparse, b);
		}
		if (label) {
			char attrs[64];

			snprintf(buf, sizeof buf, "%ld", n);
			snprintf(attrs, sizeof attrs, "%sclass=\"count\" "
			    "data-bin=\"%d\"", n < s->min_count ?
			    "font-weight=\"bold\" " : "", b);
			svg_text(out, x + w / 2.0 - 1.0, n < s->min_count ?
			    SVG_PY0 + 16.0 : SVG_PY1 - h - 5.0, "middle",
			    SVG_FONT, n < s->min_count ? k->gap : k->ink,
			    attrs, buf);
		}
	}
	mbuf_puts(out, "</g>\n");
	if (m->total > 0) {
		double y = SVG_PY1 - span * mean / (double)max;

		mbuf_printf(out, "<path class=\"mean\" stroke=\"%s\" "
		    "stroke-width=\"2\" stroke-dasharray=\"8 4\" "
		    "d=\"M%.1f %.1fH%.1f\"/>\n", k->mean, SVG_X0, y, SVG_X1);
	}
	snprintf(buf, sizeof buf, "%ld", max);
	svg_text(out, SVG_X0 - 6.0, SVG_PY1 - span + 5.0, "end", SVG_FONT,
	    k->dim, "", buf);
	svg_text(out, SVG_X0 - 6.0, SVG_PY1, "end", SVG_FONT, k->dim, "", "0");
}

/* What the marks mean, beneath the degrees. */
static double
svg_legend(struct mbuf *out, const struct coverage_result *r,
    const struct svg_ink *k, double y)
{
	char buf[80];

	mbuf_printf(out, "<rect class=\"gap-mark key\" x=\"%.1f\" y=\"%.1f\" "
	    "width=\"14\" height=\"16\" fill=\"url(#cov-gap)\" stroke=\"%s\" "
	    "stroke-width=\"1.5\"/>\n", SVG_X0 - 36.0, y - 13.0, k->gap);
	svg_cross(out, SVG_X0 - 10.0, y - 5.0, 5.0, k->gap, -1);
	if (r->spec.min_count > 1)
		snprintf(buf, sizeof buf, "gap: fewer than %ld in the bin",
		    r->spec.min_count);
	else
		snprintf(buf, sizeof buf, "empty: nothing in the bin");
	svg_text(out, SVG_X0 + 4.0, y, "start", SVG_FONT, k->ink, "", buf);
	y += 22.0;
	svg_triangle(out, SVG_X0 - 10.0, y - 5.0, 6.0, k->sparse, -1);
	svg_text(out, SVG_X0 + 4.0, y, "start", SVG_FONT, k->ink, "",
	    "sparse: under half the mean");
	y += 22.0;
	mbuf_printf(out, "<path stroke=\"%s\" stroke-width=\"2\" "
	    "stroke-dasharray=\"8 4\" d=\"M%.1f %.1fH%.1f\"/>\n", k->mean,
	    SVG_X0 - 36.0, y - 5.0, SVG_X0 - 2.0);
	snprintf(buf, sizeof buf, "mean: %.1f per bin, all targets",
	    (double)r->pooled.m.total / r->spec.nbins);
	svg_text(out, SVG_X0 + 4.0, y, "start", SVG_FONT, k->ink, "", buf);
	return y;
}

/* One small chart per target on a common scale, from y down; returns
   the y beneath the last. */
static double
svg_multiples(struct mbuf *out, const struct coverage_result *r,
    const struct svg_ink *k, double y)
{
	const struct coverage_spec *s = &r->spec;
	size_t nshow = r->ntargets < SVG_MAX_LINES ? r->ntargets :
	    SVG_MAX_LINES;
	double w = (SVG_X1 - SVG_X0) / s->nbins;
	long tmax = 1;
	char buf[96];

	if (r->ntargets == 0)
		return y;
	for (size_t i = 0; i < r->ntargets; i++)
		for (int b = 0; b < s->nbins; b++)
			if (r->targets[i].c.n[b] > tmax)
				tmax = r->targets[i].c.n[b];
	snprintf(buf, sizeof buf, "By target, one scale (largest bin %ld)",
	    tmax);
	svg_text(out, SVG_X0 - 36.0, y, "start", SVG_FONT, k->ink,
	    "font-weight=\"bold\"", buf);
	y += 8.0;
	for (size_t i = 0; i < nshow; i++) {
		const struct coverage_counts *tc = &r->targets[i].c;
		double base = y + SVG_MULT_H - 8.0;

		mbuf_puts(out, "<g class=\"target\" data-target=\"");
		render_cov_xml_escape(out, r->targets[i].id);
		mbuf_puts(out, "\">\n");
		snprintf(buf, sizeof buf, "%s: %ld, %d of %d bins",
		    r->targets[i].id, tc->m.total, tc->m.filled_bins, s->nbins);
		svg_text(out, SVG_X0, y + 16.0, "start", SVG_FONT, k->dim, "",
		    buf);
		mbuf_printf(out, "<path stroke=\"%s\" stroke-width=\"1\" "
		    "d=\"M%.1f %.1fH%.1f\"/>\n", k->rule, SVG_X0, base, SVG_X1);
		for (int b = 0; b < s->nbins; b++) {
			long n = tc->n[b];
			double x = SVG_X0 + b * w + 1.0;

			if (n < s->min_count)
				mbuf_printf(out, "<path class=\"gap-mark small\" "
				    "data-bin=\"%d\" stroke=\"%s\" "
				    "stroke-width=\"3\" d=\"M%.1f %.1fH%.1f\"/>\n",
				    b, k->gap, x + 1.0, base + 3.0,
				    x + w - 3.0);
			else
				mbuf_printf(out, "<rect class=\"tbin\" "
				    "data-bin=\"%d\" data-count=\"%ld\" "
				    "x=\"%.1f\" y=\"%.1f\" width=\"%.1f\" "
				    "height=\"%.1f\" fill=\"%s\"/>\n", b, n, x,
				    base - SVG_MULT_PLOT * (double)n / (double)tmax,
				    w - 2.0, SVG_MULT_PLOT * (double)n / (double)tmax,
				    k->bar);
		}
		mbuf_puts(out, "</g>\n");
		y += SVG_MULT_H;
	}
	if (r->ntargets > nshow) {
		snprintf(buf, sizeof buf, "%zu more targets: see the CSV",
		    r->ntargets - nshow);
		svg_text(out, SVG_X0, y + 10.0, "start", SVG_FONT, k->dim, "",
		    buf);
		y += 24.0;
	}
	return y;
}

enum errcode
render_cov_svg(const struct render_cov *c, struct mbuf *out)
{
	const struct coverage_result *r = c->r;
	const struct coverage_spec *s = &r->spec;
	const struct coverage_metrics *m = &r->pooled.m;
	const struct svg_ink *k = c->theme == RENDER_COV_DARK ? &svg_dark :
	    &svg_light;
	size_t nshow = r->ntargets < SVG_MAX_LINES ? r->ntargets :
	    SVG_MAX_LINES;
	double h, y;
	long max = 1;
	char buf[200];

	for (int b = 0; b < s->nbins; b++)
		if (r->pooled.n[b] > max)
			max = r->pooled.n[b];
	h = SVG_PY1 + 140.0 + (r->ntargets ? 8.0 : 0.0) +
	    (double)nshow * SVG_MULT_H + (r->ntargets > nshow ? 24.0 : 0.0) +
	    56.0;

	mbuf_printf(out, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
	    "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" "
	    "width=\"%.0f\" height=\"%.0f\" viewBox=\"0 0 %.0f %.0f\" "
	    "role=\"img\" aria-labelledby=\"cov-title cov-desc\" "
	    "class=\"theme-%s\" font-family=\"DejaVu Sans, Noto Sans, "
	    "sans-serif\">\n", SVG_W, h, SVG_W, h,
	    render_cov_theme_name(c->theme));
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
	mbuf_printf(out, "<defs><pattern id=\"cov-gap\" width=\"6\" "
	    "height=\"6\" patternUnits=\"userSpaceOnUse\" "
	    "patternTransform=\"rotate(45)\"><rect width=\"6\" height=\"6\" "
	    "fill=\"%s\"/><path d=\"M0 0V6\" stroke=\"%s\" "
	    "stroke-width=\"1.6\"/></pattern></defs>\n", k->gap_band, k->gap);
	mbuf_printf(out, "<rect class=\"ground\" width=\"%.0f\" height=\"%.0f\" "
	    "fill=\"%s\"/>\n", SVG_W, h, k->ground);
	snprintf(buf, sizeof buf, "%s by %s",
	    s->source == COVERAGE_SOURCE_ATTEMPTS ? "Attempts" :
	    "Normal points", coverage_axis_label(s->axis));
	svg_text(out, 8.0, 22.0, "start", SVG_HEAD, k->ink,
	    "font-weight=\"bold\"", buf);
	if (m->total > 0)
		snprintf(buf, sizeof buf, "%ld in %d bins of %.4g\xc2\xb0: "
		    "%d %s, %d sparse", m->total, s->nbins, r->bin_width_deg,
		    s->nbins - m->filled_bins, s->min_count > 1 ? "gaps" :
		    "empty", m->nsparse);
	else
		snprintf(buf, sizeof buf, "no records match the query");
	svg_text(out, 8.0, 42.0, "start", SVG_FONT, k->dim, "", buf);

	svg_axis(out, r, k);
	svg_pooled(out, r, k, max);
	y = svg_legend(out, r, k, SVG_PY1 + 62.0);
	y = svg_multiples(out, r, k, y + 32.0);

	/* The numbers under the chart, on two lines to fit the width. */
	if (m->total > 0) {
		snprintf(buf, sizeof buf, "filled %d of %d bins; longest empty "
		    "arc %.4g\xc2\xb0", m->filled_bins, s->nbins,
		    m->longest_gap_deg);
		svg_text(out, 8.0, y + 22.0, "start", SVG_FONT, k->dim, "", buf);
		snprintf(buf, sizeof buf, "entropy %.3f; chi-square %.1f, "
		    "%d dof, p %.3g", m->entropy, m->chi2, m->chi2_dof,
		    m->chi2_p);
		svg_text(out, 8.0, y + 42.0, "start", SVG_FONT, k->dim, "", buf);
	}
	mbuf_puts(out, "</svg>\n");
	return mbuf_status(out);
}
