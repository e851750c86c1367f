/* SPDX-License-Identifier: BSD-3-Clause */
/* test_render_cov.c: the coverage audit's JSON, CSV, text and SVG. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include <jansson.h>

#include "check.h"
#include "core/coverage.h"
#include "core/mem.h"
#include "formats/render_json.h"
#include "formats/render_cov.h"
#include "core/tzone.h"

#define MJD0 2400000.5

/* A small result: 12 bins, three targets, two years, a gap at new and
   full moon; built through coverage_compute from records. */
static struct coverage_result *
sample_result(void)
{
	static const struct {
		const char *target;
		double mjd, syn;
	} rows[] = {
		{"alpha", 61055.0, 45.0}, {"alpha", 61056.0, 80.0},
		{"alpha", 61057.0, 95.0}, {"b<&>\"eta'", 61058.0, 100.0},
		{"b<&>\"eta'", 61420.0, 130.0}, {"gamma", 61421.0, 250.0},
		{"gamma", 61422.0, 265.0}, {"gamma", 61423.0, 275.0},
		{"alpha", 61424.0, 290.0}, {"alpha", 61425.0, 300.0},
		{"alpha", 61426.0, 320.0}, {"gamma", 61427.0, 95.0},
		{"alpha", 61428.0, 240.0}, {"alpha", 61429.0, 70.0},
	};
	struct site_normal_point np[sizeof rows / sizeof rows[0]];
	struct coverage_input in = {np, sizeof rows / sizeof rows[0], NULL, 0};
	struct coverage_result *r = calloc(1, sizeof *r);
	struct coverage_spec s;

	assert_non_null(r);
	memset(np, 0, sizeof np);
	for (size_t i = 0; i < in.nnp; i++) {
		snprintf(np[i].target, sizeof np[i].target, "%s", rows[i].target);
		np[i].epoch_mjd = rows[i].mjd;
		np[i].synodic_deg = rows[i].syn;
	}
	coverage_spec_init(&s);
	assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_OK);
	return r;
}

/* Hand-counted pooled bins of sample_result (30 deg bins). */
static const long sample_counts[12] = {0, 1, 2, 3, 1, 0, 0, 0, 3, 2, 2, 0};

static void
test_render_cov_counts_of_sample(void **state)
{
	struct coverage_result *r = sample_result();

	(void)state;
	for (int b = 0; b < 12; b++)
		assert_int_equal(r->pooled.n[b], sample_counts[b]);
	free(r);
}

/* Number of occurrences of needle in hay. */
static int
count_of(const char *hay, const char *needle)
{
	int n = 0;

	for (const char *p = strstr(hay, needle); p; p = strstr(p + 1, needle))
		n++;
	return n;
}

/* The buffer is well-formed XML, checked by xmllint (Debian
   libxml2-utils, test-only) on a temporary file. */
static void
assert_well_formed(const struct mbuf *b)
{
	char path[] = "/tmp/moonrange-cov-XXXXXX", cmd[128];
	FILE *f;
	int fd;

	fd = mkstemp(path);
	assert_true(fd >= 0);
	f = fdopen(fd, "w");
	assert_non_null(f);
	assert_int_equal(fwrite(b->data, 1, b->len, f), b->len);
	assert_int_equal(fclose(f), 0);
	snprintf(cmd, sizeof cmd, "xmllint --noout %s", path);
	assert_int_equal(system(cmd), 0);
	unlink(path);
}

static void
test_render_cov_svg_is_xml_with_one_mark_per_bin(void **state)
{
	struct coverage_result *r = sample_result();
	struct render_cov c = {r, NULL, NULL, "Test & <station>", NULL, RENDER_COV_LIGHT};
	char key[64];
	struct mbuf b;

	(void)state;
	mbuf_init(&b);
	assert_int_equal(render_cov_svg(&c, &b), ERRCODE_OK);
	assert_well_formed(&b);

	assert_non_null(strstr(b.data, "<title id=\"cov-title\">"));
	assert_non_null(strstr(b.data, "<desc id=\"cov-desc\">"));
	assert_non_null(strstr(b.data, "Test &amp; &lt;station&gt;"));
	assert_non_null(strstr(b.data, "b&lt;&amp;&gt;&quot;eta&apos;"));
	assert_null(strstr(b.data, "b<&"));
	/* One bar per bin, carrying its count... */
	assert_int_equal(count_of(b.data, "<path class=\"bin"), 12);
	for (int k = 0; k < 12; k++) {
		const char *p;

		snprintf(key, sizeof key, "data-bin=\"%d\" data-count=\"%ld\"",
		    k, sample_counts[k]);
		assert_non_null(strstr(b.data, key));
		/* ...and one label whose text is that count. */
		snprintf(key, sizeof key, "class=\"count\" data-bin=\"%d\">", k);
		assert_int_equal(count_of(b.data, key), 1);
		p = strstr(b.data, key) + strlen(key);
		assert_int_equal(strtol(p, NULL, 10), sample_counts[k]);
	}
	/* Empty bins: bins 0, 5, 6, 7 and 11 (sample_counts), each a
	   full-height hatched band with a cross beneath and the word. */
	assert_int_equal(count_of(b.data, "<path class=\"bin gap\""), 5);
	assert_int_equal(count_of(b.data, ">empty</text>"), 5);
	for (int k = 0; k < 12; k++) {
		snprintf(key, sizeof key, "class=\"gap-mark\" data-bin=\"%d\"",
		    k);
		assert_int_equal(count_of(b.data, key),
		    sample_counts[k] == 0 ? 1 : 0);
	}
	/* The quarters named along the line, the pooled mean as a line,
	   and one small chart per target. */
	assert_int_equal(count_of(b.data, "class=\"quarter\">new moon<"), 1);
	assert_int_equal(count_of(b.data, "class=\"quarter\">first quarter<"),
	    1);
	assert_int_equal(count_of(b.data, "class=\"quarter\">full moon<"), 1);
	assert_int_equal(count_of(b.data, "class=\"quarter\">last quarter<"),
	    1);
	assert_int_equal(count_of(b.data, "<path class=\"mean\""), 1);
	assert_int_equal(count_of(b.data, "<g class=\"target\""), 3);
	/* Every target's chart has one mark per bin: a bar or a gap. */
	assert_int_equal(count_of(b.data, "<rect class=\"tbin\"") +
	    count_of(b.data, "class=\"gap-mark small\""), 3 * 12);
	/* No text smaller than 14 units of the 400-unit width (12 px when
	   the chart is shown 343 px wide). */
	assert_non_null(strstr(b.data, "viewBox=\"0 0 400 "));
	for (const char *p = strstr(b.data, "font-size=\""); p != NULL;
	    p = strstr(p + 1, "font-size=\""))
		assert_true(strtol(p + 11, NULL, 10) >= 14);
	assert_int_equal(count_of(b.data, "<text "),
	    count_of(b.data, "font-size=\""));
	mbuf_free(&b);
	free(r);
}

/* Relative luminance (WCAG 2) of the first "#rrggbb" after key in hay. */
static double
luminance_after(const char *hay, const char *key)
{
	const char *p = strstr(hay, key);
	double c[3];
	unsigned v;

	assert_non_null(p);
	p = strchr(p + strlen(key), '#');
	assert_non_null(p);
	assert_int_equal(sscanf(p, "#%6x", &v), 1);
	for (int i = 0; i < 3; i++) {
		double x = (double)((v >> (16 - 8 * i)) & 0xff) / 255.0;

		c[i] = x <= 0.03928 ? x / 12.92 : pow((x + 0.055) / 1.055, 2.4);
	}
	return 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2];
}

/* WCAG 2 contrast ratio of two luminances. */
static double
contrast(double a, double b)
{
	return a > b ? (a + 0.05) / (b + 0.05) : (b + 0.05) / (a + 0.05);
}

/* Both themes: the dark one on a dark ground (for the night page), the
   light one on a light ground (for paper); in each the empty bins' ink
   has a higher contrast with the ground than any other mark's (the
   formula is WCAG 2.x's relative luminance and contrast ratio). */
static void
test_render_cov_svg_themes(void **state)
{
	struct coverage_result *r = sample_result();
	static const char *const others[] = {
		"<path class=\"mean\" stroke=\"",
		"<path class=\"bin\" data-bin=\"1\" data-count=\"1\" fill=\"",
		"class=\"sparse-mark\" data-bin=\"-1\" fill=\"none\" stroke=\"",
	};

	(void)state;
	for (int t = 0; t < 2; t++) {
		struct render_cov c = {r, NULL, NULL, NULL, NULL,
		    t ? RENDER_COV_DARK : RENDER_COV_LIGHT};
		double ground, gap;
		struct mbuf b;

		mbuf_init(&b);
		assert_int_equal(render_cov_svg(&c, &b), ERRCODE_OK);
		assert_well_formed(&b);
		assert_non_null(strstr(b.data, t ? "class=\"theme-dark\"" :
		    "class=\"theme-light\""));
		ground = luminance_after(b.data, "<rect class=\"ground\" "
		    "width=\"400\" height=\"");
		if (t)
			assert_true(ground < 0.05);
		else
			assert_true(ground > 0.9);
		gap = luminance_after(b.data, "class=\"gap-mark\" data-bin="
		    "\"0\" fill=\"none\" stroke=\"");
		for (size_t i = 0; i < 3; i++)
			assert_true(contrast(gap, ground) >
			    contrast(luminance_after(b.data, others[i]),
			    ground));
		/* The bars' edge: the stroke after the first bar's fill. */
		assert_true(contrast(gap, ground) > contrast(luminance_after(
		    strstr(b.data, others[1]), " stroke=\""), ground));
		mbuf_free(&b);
	}
	free(r);
}

/* No records at all, and the smallest and largest bin counts: still
   well-formed, one mark per bin, undefined metrics as null in JSON. */
static void
test_render_cov_empty_and_bin_limits(void **state)
{
	static const int nb[3] = {4, 12, 72};
	struct coverage_result *r = calloc(1, sizeof *r);
	struct coverage_input in = {NULL, 0, NULL, 0};

	(void)state;
	assert_non_null(r);
	for (int k = 0; k < 3; k++) {
		struct render_cov c = {r, NULL, NULL, NULL, NULL, RENDER_COV_LIGHT};
		struct coverage_spec s;
		json_error_t jerr;
		json_t *root, *m;
		struct mbuf b;

		coverage_spec_init(&s);
		s.nbins = nb[k];
		assert_int_equal(coverage_compute(&s, &in, r), ERRCODE_OK);
		mbuf_init(&b);
		assert_int_equal(render_cov_svg(&c, &b), ERRCODE_OK);
		assert_int_equal(count_of(b.data, "<path class=\"bin"), nb[k]);
		assert_int_equal(count_of(b.data, "<path class=\"bin gap\""),
		    nb[k]);
		assert_non_null(strstr(b.data, "no records match the query"));
		assert_well_formed(&b);
		mbuf_free(&b);

		mbuf_init(&b);
		assert_int_equal(render_cov_json(&c, &b), ERRCODE_OK);
		root = json_loads(b.data, 0, &jerr);
		assert_non_null(root);
		m = json_object_get(json_object_get(root, "pooled"), "metrics");
		assert_true(json_is_null(json_object_get(m, "entropy")));
		assert_true(json_is_null(json_object_get(m, "chi_square_p")));
		check_near(json_real_value(json_object_get(m,
		    "longest_empty_arc_deg")), 360.0, 0.0, "deg", "empty arc");
		json_decref(root);
		mbuf_free(&b);
	}
	free(r);
}

/* Fill dates over MJD 61440..61500 in one bin: target alpha in it from
   61450.25 to 61450.5, score 2.5 (invented). */
static void
fill_one(struct coverage_fill *fill, int bin)
{
	memset(fill, 0, sizeof *fill);
	fill->from_mjd = 61440.0;
	fill->to_mjd = 61500.0;
	fill->nbins = 1;
	fill->bins[0].bin = bin;
	fill->bins[0].ndates = 1;
	snprintf(fill->bins[0].dates[0].target, SITE_ID_LEN, "alpha");
	fill->bins[0].dates[0].in_bin_start_mjd = 61450.25;
	fill->bins[0].dates[0].in_bin_end_mjd = 61450.5;
	fill->bins[0].dates[0].score = 2.5;
}

static void
test_render_cov_json_fields(void **state)
{
	struct coverage_result *r = sample_result();
	struct coverage_fill fill;
	struct render_cov c = {r, &fill, NULL, NULL, NULL, RENDER_COV_LIGHT};
	json_t *root, *pooled, *m, *counts;
	json_error_t jerr;
	struct mbuf b;

	(void)state;
	fill_one(&fill, 5);
	fill.bins[0].dates[0].window_start_mjd = 61450.2;
	fill.bins[0].dates[0].window_end_mjd = 61450.5;
	mbuf_init(&b);
	assert_int_equal(render_cov_json(&c, &b), ERRCODE_OK);
	root = json_loads(b.data, 0, &jerr);
	assert_non_null(root);
	assert_string_equal(json_string_value(json_object_get(root, "axis")),
	    "synodic");
	assert_int_equal(json_integer_value(json_object_get(root, "bins")), 12);
	pooled = json_object_get(root, "pooled");
	counts = json_object_get(pooled, "counts");
	assert_int_equal(json_array_size(counts), 12);
	for (size_t k = 0; k < 12; k++)
		assert_int_equal(json_integer_value(json_array_get(counts, k)),
		    sample_counts[k]);
	m = json_object_get(pooled, "metrics");
	assert_int_equal(json_integer_value(json_object_get(m, "total")), 14);
	assert_int_equal(json_integer_value(json_object_get(m, "filled_bins")),
	    7);
	/* Bins 5, 6, 7: 90 deg from 150 (hand-counted above). */
	check_near(json_real_value(json_object_get(m,
	    "longest_empty_arc_deg")), 90.0, 0.0, "deg", "JSON empty arc");
	check_near(json_real_value(json_object_get(m,
	    "longest_empty_arc_from_deg")), 150.0, 0.0, "deg", "its start");
	assert_non_null(json_object_get(m, "entropy"));
	assert_non_null(json_object_get(m, "chi_square_p"));
	assert_int_equal(json_array_size(json_object_get(root, "targets")), 3);
	assert_int_equal(json_array_size(json_object_get(root, "years")), 2);
	assert_string_equal(json_string_value(json_object_get(
	    json_array_get(json_object_get(json_array_get(json_object_get(
	    json_object_get(root, "fill"), "bins"), 0), "dates"), 0),
	    "in_bin_start_utc")), "2027-02-14T06:00:00Z");
	json_decref(root);
	mbuf_free(&b);
	free(r);
}

/* A p-value far below 1e-8 keeps its digits in the JSON (it was rounded
   to 8 decimals, so 4.07e-50 printed as 0.0): the value parsed back is the
   value rendered, to double precision. */
static void
test_render_cov_json_p_value_precision(void **state)
{
	struct coverage_result *r = sample_result();
	struct render_cov c = {r, NULL, NULL, NULL, NULL, RENDER_COV_LIGHT};
	json_t *root, *m;
	json_error_t jerr;
	struct mbuf b;
	double p;

	(void)state;
	r->pooled.m.chi2_p = 4.07e-50;
	mbuf_init(&b);
	assert_int_equal(render_cov_json(&c, &b), ERRCODE_OK);
	root = json_loads(b.data, 0, &jerr);
	assert_non_null(root);
	m = json_object_get(json_object_get(root, "pooled"), "metrics");
	p = json_real_value(json_object_get(m, "chi_square_p"));
	check_near(p, 4.07e-50, 4.07e-50 * 1e-14, "", "p-value kept");
	json_decref(root);
	mbuf_free(&b);
	free(r);
}

static void
test_render_cov_csv_rows(void **state)
{
	struct coverage_result *r = sample_result();
	struct render_cov c = {r, NULL, NULL, NULL, NULL, RENDER_COV_LIGHT};
	struct mbuf b;

	(void)state;
	mbuf_init(&b);
	assert_int_equal(render_cov_csv(&c, &b), ERRCODE_OK);
	/* Header + 12 rows each for pooled, 3 targets and 2 years; CRLF. */
	assert_int_equal(count_of(b.data, "\r\n"), 1 + 12 * 6);
	assert_int_equal(count_of(b.data, "\n"), 1 + 12 * 6);
	assert_non_null(strstr(b.data, "synodic,pooled,,3,90,120,3,0\r\n"));
	assert_non_null(strstr(b.data, "synodic,pooled,,0,0,30,0,1\r\n"));
	/* A field with a quote is quoted, its quote doubled (RFC 4180). */
	assert_non_null(strstr(b.data, ",target,\"b<&>\"\"eta'\",0,"));
	mbuf_free(&b);
	free(r);
}

static void
test_render_cov_text_table(void **state)
{
	static struct tzone utc;
	struct coverage_result *r = sample_result();
	struct render_cov c = {r, NULL, "fill dates: none here", NULL, NULL, RENDER_COV_LIGHT};
	struct coverage_fill fill;
	struct mbuf b;

	(void)state;
	mbuf_init(&b);
	assert_int_equal(render_cov_text(&c, &b), ERRCODE_OK);
	assert_non_null(strstr(b.data, "new moon"));
	assert_non_null(strstr(b.data, "full moon"));
	assert_int_equal(count_of(b.data, " gap\n"), 5);
	assert_non_null(strstr(b.data, "fill dates: none here"));
	mbuf_free(&b);

	/* Fill dates with UTC and the station's local time; a span across
	   midnight UTC keeps both dates. */
	fill_one(&fill, 6);
	fill.bins[0].ndates = 2;
	snprintf(fill.bins[0].dates[1].target, SITE_ID_LEN, "gamma");
	fill.bins[0].dates[1].in_bin_start_mjd = 61451.875;
	fill.bins[0].dates[1].in_bin_end_mjd = 61452.125;
	fill.bins[0].dates[1].score = 1.0;
	c.fill = &fill;
	c.fill_note = NULL;
	tzone_utc(&utc);
	c.time_zone = &utc;
	mbuf_init(&b);
	assert_int_equal(render_cov_text(&c, &b), ERRCODE_OK);
	/* MJD 61450 = 2027-02-14 (61406 = 2027-01-01, + 44 days). */
	assert_non_null(strstr(b.data, "    2027-02-14T06:00Z to 12:00Z "
	    "alpha            2.5  2027-02-14 06:00 UTC\n"));
	assert_non_null(strstr(b.data, "2027-02-15T21:00Z to "
	    "2027-02-16T03:00Z gamma"));
	mbuf_free(&b);
	free(r);
}

/* Every allocation of each renderer failing in turn gives ERRCODE_NOMEM
   (or success once past the last allocation), never a crash or leak. */
static void
test_render_cov_allocation_failure(void **state)
{
	struct coverage_result *r = sample_result();
	struct render_cov c = {r, NULL, NULL, "station", NULL, RENDER_COV_LIGHT};
	enum errcode (*fn[4])(const struct render_cov *, struct mbuf *) = {
		render_cov_json, render_cov_csv, render_cov_text, render_cov_svg
	};

	(void)state;
	for (int k = 0; k < 4; k++) {
		struct mbuf ref;
		int ok = 0;

		/* Without failures, for comparison: a run that reports
		   success under failures must give these very bytes. */
		mbuf_init(&ref);
		assert_int_equal(fn[k](&c, &ref), ERRCODE_OK);
		for (long n = 1; n < 5000 && !ok; n++) {
			struct mbuf b;
			enum errcode rc;

			mbuf_init(&b);
			mem_fail_after(n);
			rc = fn[k](&c, &b);
			mem_fail_after(0);
			assert_true(rc == ERRCODE_OK || rc == ERRCODE_NOMEM);
			ok = rc == ERRCODE_OK;
			if (ok)
				assert_string_equal(b.data, ref.data);
			mbuf_free(&b);
		}
		assert_true(ok);
		mbuf_free(&ref);
	}
	free(r);
}

int
main(void)
{
	const struct CMUnitTest tests[] = {
		cmocka_unit_test(test_render_cov_counts_of_sample),
		cmocka_unit_test(test_render_cov_svg_is_xml_with_one_mark_per_bin),
		cmocka_unit_test(test_render_cov_svg_themes),
		cmocka_unit_test(test_render_cov_empty_and_bin_limits),
		cmocka_unit_test(test_render_cov_json_fields),
		cmocka_unit_test(test_render_cov_json_p_value_precision),
		cmocka_unit_test(test_render_cov_csv_rows),
		cmocka_unit_test(test_render_cov_text_table),
		cmocka_unit_test(test_render_cov_allocation_failure),
	};

	render_json_setup();
	return cmocka_run_group_tests_name("render_cov", tests, NULL, NULL);
}
