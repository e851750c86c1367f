/* SPDX-License-Identifier: BSD-3-Clause */
/* render_cov.h: the coverage audit as JSON, CSV, a text table and an SVG
   chart, shared by the CLI and the HTTP API. */
#ifndef MOONRANGE_RENDER_COV_H
#define MOONRANGE_RENDER_COV_H

#include "core/coverage.h"
#include "core/errcode.h"
#include "core/mem.h"
#include "core/tzone.h"

/*
 * What a coverage report shows.  fill may be NULL (no gap-filling dates
 * were asked for, or no station to plan for); fill_note then says why in a
 * sentence ("" or NULL for nothing).  Everything is borrowed for the call.
 * The renderers append to out and return ERRCODE_OK or ERRCODE_NOMEM;
 * they read no clock, so the same data give the same bytes.
 */
/* The chart's palette: light for paper (the default), dark for a night
   page. */
enum render_cov_theme {
	RENDER_COV_LIGHT = 0,
	RENDER_COV_DARK
};

/* "light", "dark"; the parser gives -1 for anything else. */
const char *render_cov_theme_name(enum render_cov_theme t);
int render_cov_theme_parse(const char *s);

struct render_cov {
	const struct coverage_result *r;
	const struct coverage_fill *fill;
	const char *fill_note;
	const char *station_name;	/* for titles, may be NULL */
	const struct tzone *time_zone;		/* local times (qzone_load) in the
					   text table, or NULL */
	enum render_cov_theme theme;	/* the SVG's palette */
};

/* JSON: the field names are documented in README ("Coverage audit"). */
enum errcode render_cov_json(const struct render_cov *c, struct mbuf *out);

/* CSV (RFC 4180, CRLF): one row per (scope, key, bin). */
enum errcode render_cov_csv(const struct render_cov *c, struct mbuf *out);

/* A table for people, 80 columns for up to five targets. */
enum errcode render_cov_text(const struct render_cov *c, struct mbuf *out);

/*
 * SVG 1.1 chart: the axis from 0 to 360 degrees along a line with its
 * quarters named, one bar per bin (its count above it when there is
 * room), the pooled mean as a dashed line, empty bins as full-height
 * hatched bands with a cross and a word, sparse bins with a triangle,
 * and one small chart per target beneath on a common scale.  Title and
 * description for screen readers; well-formed XML; all text escaped;
 * text at least 14 of 400 units wide.
 */
enum errcode render_cov_svg(const struct render_cov *c, struct mbuf *out);

/* Append s to out with &, <, >, " and ' escaped for XML text or
   attributes. */
void render_cov_xml_escape(struct mbuf *out, const char *s);

#endif
