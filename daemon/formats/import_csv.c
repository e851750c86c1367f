/* SPDX-License-Identifier: BSD-3-Clause */
/* import_csv.c: the CSV tables (RFC 4180): targets and ranging attempts. */
#include <ctype.h>
#include <errno.h>
#include <limits.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/geom.h"
#include "core/mem.h"
#include "core/text.h"
#include "core/tscale.h"
#include "formats/import.h"
#include "formats/import_util.h"

/* ------------------------------------------------------------------ */
/* CSV (RFC 4180)                                                      */
/* ------------------------------------------------------------------ */

#define CSV_STR2(x) #x
#define CSV_STR(x) CSV_STR2(x)

struct csv {
	const char *p, *end;
	size_t line;			/* current physical line */
	size_t rec_line;		/* first line of the last record */
	size_t nf;
	char *f[IMPORT_CSV_MAX_FIELDS];
	char store[IMPORT_CSV_MAX_RECORD + IMPORT_CSV_MAX_FIELDS];
	size_t used;
	char err[160];
	size_t err_col;			/* 0-based field of the error */
};

/* Skip to just past the end of the current physical line. */
static void
csv_skip_line(struct csv *c)
{
	const char *nl = memchr(c->p, '\n', (size_t)(c->end - c->p));

	if (nl == NULL) {
		c->p = c->end;
	} else {
		c->p = nl + 1;
		c->line++;
	}
}

static int
csv_fail(struct csv *c, const char *msg)
{
	snprintf(c->err, sizeof c->err, "%s", msg);
	c->err_col = c->nf;
	csv_skip_line(c);
	return -1;
}

/* Append one byte to the current field (the record store is bounded). */
static int
csv_put(struct csv *c, char ch)
{
	if (c->used + 1 >= sizeof c->store - 1)
		return -1;
	c->store[c->used++] = ch;
	return 0;
}

static int
csv_begin_field(struct csv *c)
{
	if (c->nf >= IMPORT_CSV_MAX_FIELDS)
		return -1;
	c->f[c->nf] = c->store + c->used;
	return 0;
}

/* Fields hold no NUL (import_begin), so the terminator ends each one. */
static int
csv_end_field(struct csv *c)
{
	if (c->used >= sizeof c->store)
		return -1;
	c->store[c->used++] = '\0';
	c->nf++;
	return 0;
}

/*
 * Read one record.  Returns 1 with the fields in c->f, 0 at the end of
 * the buffer, -1 for a malformed record (message in c->err; the rest of
 * its physical line is skipped).  Empty lines are skipped.
 */
static int
csv_next(struct csv *c)
{
	static const char too_long[] = "record longer than "
	    CSV_STR(IMPORT_CSV_MAX_RECORD) " bytes or "
	    CSV_STR(IMPORT_CSV_MAX_FIELDS) " fields";

	c->nf = 0;
	c->used = 0;
	c->err[0] = '\0';
	/* empty lines */
	while (c->p < c->end && (*c->p == '\n' || (*c->p == '\r' &&
	    c->p + 1 < c->end && c->p[1] == '\n'))) {
		c->p += (*c->p == '\r') ? 2 : 1;
		c->line++;
	}
	if (c->p >= c->end)
		return 0;
	c->rec_line = c->line;
	for (;;) {
		if (csv_begin_field(c) != 0)
			return csv_fail(c, too_long);
		if (c->p < c->end && *c->p == '"') {
			size_t open_line = c->line;

			c->p++;
			for (;;) {
				if (c->p >= c->end) {
					snprintf(c->err, sizeof c->err,
					    "quoted field opened on line %zu "
					    "never closes (truncated file?)",
					    open_line);
					c->err_col = c->nf;
					return -1;
				}
				if (*c->p == '"') {
					if (c->p + 1 < c->end &&
					    c->p[1] == '"') {
						if (csv_put(c, '"') != 0)
							return csv_fail(c,
							    too_long);
						c->p += 2;
						continue;
					}
					c->p++;
					break;
				}
				if (*c->p == '\n')
					c->line++;
				if (csv_put(c, *c->p++) != 0)
					return csv_fail(c, too_long);
			}
			if (c->p < c->end && *c->p != ',' && *c->p != '\n' &&
			    !(*c->p == '\r' && c->p + 1 < c->end &&
			    c->p[1] == '\n'))
				return csv_fail(c, "text after the closing "
				    "quote of a field");
		} else {
			while (c->p < c->end && *c->p != ',' &&
			    *c->p != '\n' && *c->p != '\r') {
				if (*c->p == '"')
					return csv_fail(c, "a quote inside an "
					    "unquoted field (quote the whole "
					    "field and double the quote)");
				if (csv_put(c, *c->p++) != 0)
					return csv_fail(c, too_long);
			}
			if (c->p < c->end && *c->p == '\r' &&
			    !(c->p + 1 < c->end && c->p[1] == '\n'))
				return csv_fail(c, "carriage return not "
				    "followed by a line feed");
		}
		if (csv_end_field(c) != 0)
			return csv_fail(c, too_long);
		if (c->p >= c->end)
			return 1;
		if (*c->p == ',') {
			c->p++;
			continue;
		}
		/* end of record: CRLF or LF */
		c->p += (*c->p == '\r') ? 2 : 1;
		c->line++;
		return 1;
	}
}

/* A table format: its columns and how to convert a row. */
struct csv_column {
	const char *name;
	int required;
};

struct csv_table {
	const struct csv_column *cols;
	size_t ncols;
	const char *colnames;		/* for messages */
	int map[IMPORT_CSV_MAX_FIELDS];	/* file column -> table column */
	int where[IMPORT_CSV_MAX_FIELDS];	/* table column -> file column,
						   -1 absent */
	size_t nfile;
};

/*
 * Skip comment lines before the header, read it and map its columns.
 * Returns ERRCODE_OK, ERRCODE_BAD_ARG (errors in rep; the table cannot be
 * read without a good header).
 */
static enum errcode
csv_header(struct csv *c, struct csv_table *t, struct import_report *rep)
{
	int r;

	while (c->p < c->end && *c->p == '#')
		csv_skip_line(c);
	r = csv_next(c);
	if (r == 0) {
		import_err(rep, 0, "", "empty file: a header row naming the "
		    "columns is required");
		rep->bad++;
		return ERRCODE_BAD_ARG;
	}
	if (r < 0) {
		import_err(rep, c->rec_line, "", "header row: %s", c->err);
		rep->bad++;
		return ERRCODE_BAD_ARG;
	}
	for (size_t j = 0; j < t->ncols; j++)
		t->where[j] = -1;
	t->nfile = c->nf;
	for (size_t i = 0; i < c->nf; i++) {
		char name[64];
		size_t j;

		import_trim(c->f[i], name, sizeof name);
		for (j = 0; j < t->ncols; j++)
			if (text_casecmp(name, t->cols[j].name) == 0)
				break;
		if (j == t->ncols) {
			import_err(rep, c->rec_line, name, "unknown column "
			    "(known: %s)", t->colnames);
			rep->bad++;
			continue;
		}
		if (t->where[j] >= 0) {
			import_err(rep, c->rec_line, name,
			    "column given twice");
			rep->bad++;
			continue;
		}
		t->where[j] = (int)i;
		t->map[i] = (int)j;
	}
	for (size_t j = 0; j < t->ncols; j++)
		if (t->cols[j].required && t->where[j] < 0) {
			import_err(rep, c->rec_line, t->cols[j].name,
			    "required column missing from the header row");
			rep->bad++;
		}
	return rep->bad > 0 ? ERRCODE_BAD_ARG : ERRCODE_OK;
}

/* The value of table column j in the current record ("" if absent). */
static const char *
csv_get(const struct csv *c, const struct csv_table *t, size_t j)
{
	return t->where[j] >= 0 ? c->f[t->where[j]] : "";
}

/* Shared loop: header, then each row through conv (which reports its
   own errors and returns 0 good, -1 bad) and the callback. */
typedef int (*csv_row_fn)(const struct csv *c, const struct csv_table *t,
    struct import_report *rep, void *rec);

/* The caller's callback: exactly one of the two is set. */
struct csv_job {
	import_target_fn target;
	import_attempt_fn attempt;
	void *ctx;
};

static enum errcode
csv_emit(const struct csv_job *job, const void *rec, size_t line)
{
	if (job->target != NULL)
		return job->target(job->ctx, rec, line);
	return job->attempt(job->ctx, rec, line);
}

static enum errcode
csv_run(const char *buf, size_t len, const struct csv_column *cols,
    size_t ncols, const char *colnames, csv_row_fn conv, void *rec,
    const struct csv_job *job, struct import_report *rep)
{
	struct csv c;
	struct csv_table t;
	enum errcode rc;
	int r;

	if ((rc = import_begin(buf, len, rep)) != ERRCODE_OK)
		return rc;
	memset(&t, 0, sizeof t);
	t.cols = cols;
	t.ncols = ncols;
	t.colnames = colnames;
	c.p = buf + import_bom_len(buf, len);
	c.end = buf + len;
	c.line = 1;
	c.rec_line = 1;
	if ((rc = csv_header(&c, &t, rep)) != ERRCODE_OK)
		return rc;
	while ((r = csv_next(&c)) != 0) {
		if (r < 0) {
			import_err(rep, c.rec_line, c.err_col < t.nfile ?
			    t.cols[t.map[c.err_col]].name : "", "%s", c.err);
			rep->bad++;
			continue;
		}
		if (c.nf != t.nfile) {
			import_err(rep, c.rec_line, "", "row has %zu fields, "
			    "the header has %zu", c.nf, t.nfile);
			rep->bad++;
			continue;
		}
		if (conv(&c, &t, rep, rec) != 0) {
			rep->bad++;
			continue;
		}
		if ((rc = csv_emit(job, rec, c.rec_line)) != ERRCODE_OK)
			return rc;
		rep->records++;
	}
	return import_status(rep);
}

/* --- targets --- */

enum { TC_ID, TC_NAME, TC_ALIAS, TC_LAT, TC_LON, TC_HEIGHT, TC_STRENGTH,
    TC_DARK, TC_ACTIVE, TC_CUBES, TC_CUBE_MM, TC_NLAT, TC_NLON, TC_EXTENT,
    TC__N };

static const struct csv_column target_cols[TC__N] = {
	{ "id", 1 }, { "name", 1 }, { "alias", 0 }, { "lat_deg", 1 },
	{ "lon_deg", 1 }, { "height_m", 0 }, { "strength", 0 },
	{ "dark_only", 0 }, { "active", 0 }, { "cube_count", 0 },
	{ "cube_aperture_mm", 0 }, { "normal_lat_deg", 0 },
	{ "normal_lon_deg", 0 }, { "extent_m", 0 },
};

/* Column j of the record trimmed into v (size len): 1 when it fitted, 0
   when the cell is too long for v (v then holds its start). */
static int
cell(const struct csv *c, const struct csv_table *t, size_t j, char *v,
    size_t len)
{
	const char *raw = csv_get(c, t, j);

	import_trim(raw, v, len);
	return strlen(raw) < len;
}

/* A number column in [lo, hi], or dflt when empty and allowed. */
static int
row_real(const struct csv *c, const struct csv_table *t, size_t j,
    double lo, double hi, double dflt, struct import_report *rep,
    double *out)
{
	char v[64];
	int fits = cell(c, t, j, v, sizeof v);

	if (v[0] == '\0') {
		if (t->cols[j].required) {
			import_err(rep, c->rec_line, t->cols[j].name,
			    "empty; a number is required");
			return -1;
		}
		*out = dflt;	/* NaN for "not given" */
		return 0;
	}
	if (!fits || text_parse_real(v, -HUGE_VAL, HUGE_VAL, out) != 0) {
		import_err(rep, c->rec_line, t->cols[j].name, "'%.40s' is not "
		    "a number", v);
		return -1;
	}
	if (*out < lo || *out > hi) {
		import_err(rep, c->rec_line, t->cols[j].name, "%g is out of "
		    "range %g..%g", *out, lo, hi);
		return -1;
	}
	return 0;
}

static int
row_text(const struct csv *c, const struct csv_table *t, size_t j,
    int multiline, char *dst, size_t cap, struct import_report *rep)
{
	const char *raw = csv_get(c, t, j);
	size_t n = strlen(raw);

	if (n >= cap) {
		import_err(rep, c->rec_line, t->cols[j].name,
		    "longer than %zu "
		    "bytes", cap - 1);
		return -1;
	}
	if (!import_valid_text(raw, multiline)) {
		import_err(rep, c->rec_line, t->cols[j].name, "control "
		    "characters are not allowed");
		return -1;
	}
	memcpy(dst, raw, n + 1);
	return 0;
}

static int
row_bool(const struct csv *c, const struct csv_table *t, size_t j, int dflt,
    struct import_report *rep, int *out)
{
	char v[16];
	int fits = cell(c, t, j, v, sizeof v);

	if (v[0] == '\0') {
		*out = dflt;
		return 0;
	}
	if (!fits || text_parse_bool(v, out) != 0) {
		import_err(rep, c->rec_line, t->cols[j].name, "'%.15s' is not "
		    "0/1, true/false or yes/no", v);
		return -1;
	}
	return 0;
}

static int
row_ident(const struct csv *c, const struct csv_table *t, size_t j,
    char *dst, size_t cap, int allow_empty, struct import_report *rep)
{
	char v[SITE_NAME_LEN];
	int fits = cell(c, t, j, v, sizeof v);

	if (v[0] == '\0' && allow_empty) {
		dst[0] = '\0';
		return 0;
	}
	if (!fits || !import_valid_ident(v, cap - 1, 1)) {
		import_err(rep, c->rec_line, t->cols[j].name, "'%.40s' is not "
		    "1-%zu letters, digits, '_', '-' or '.'", v, cap - 1);
		return -1;
	}
	snprintf(dst, cap, "%s", v);
	return 0;
}

static int
target_row(const struct csv *c, const struct csv_table *t,
    struct import_report *rep, void *rec)
{
	struct site_target *tg = rec;
	double cubes;

	site_target_init(tg);
	if (row_ident(c, t, TC_ID, tg->id, sizeof tg->id, 0, rep) ||
	    row_text(c, t, TC_NAME, 0, tg->name, sizeof tg->name, rep) ||
	    row_ident(c, t, TC_ALIAS, tg->alias, sizeof tg->alias, 1, rep) ||
	    row_real(c, t, TC_LAT, -90, 90, NAN, rep, &tg->lat_deg) ||
	    row_real(c, t, TC_LON, -180, 180, NAN, rep, &tg->lon_deg) ||
	    row_real(c, t, TC_HEIGHT, -20000, 20000, 0.0, rep,
	    &tg->height_m) ||
	    row_real(c, t, TC_STRENGTH, 1e-6, 1000, 1.0, rep,
	    &tg->strength) ||
	    row_bool(c, t, TC_DARK, 0, rep, &tg->dark_only) ||
	    row_bool(c, t, TC_ACTIVE, 1, rep, &tg->active) ||
	    row_real(c, t, TC_CUBES, 1, 100000, SITE_DEFAULT_CUBES, rep,
	    &cubes) ||
	    row_real(c, t, TC_CUBE_MM, 0.1, 5000, SITE_DEFAULT_CUBE_MM, rep,
	    &tg->cube_aperture_mm) ||
	    row_real(c, t, TC_NLAT, -90, 90, NAN, rep, &tg->normal_lat_deg) ||
	    row_real(c, t, TC_NLON, -180, 360, NAN, rep,
	    &tg->normal_lon_deg) ||
	    row_real(c, t, TC_EXTENT, 0, 100, NAN, rep, &tg->extent_m))
		return -1;
	if (cubes != floor(cubes)) {
		import_err(rep, c->rec_line, "cube_count", "%g is not a whole "
		    "number", cubes);
		return -1;
	}
	tg->cube_count = (long)cubes;
	if (tg->name[0] == '\0') {
		import_err(rep, c->rec_line, "name", "empty; a name is "
		    "required");
		return -1;
	}
	return 0;
}

enum errcode
import_targets_csv(const char *buf, size_t len, import_target_fn fn,
    void *ctx, struct import_report *rep)
{
	struct site_target tg;
	struct csv_job job = { fn, NULL, ctx };

	return csv_run(buf, len, target_cols, TC__N, IMPORT_TARGETS_COLUMNS,
	    target_row, &tg, &job, rep);
}

/* --- attempts --- */

enum { AC_TARGET, AC_START, AC_END, AC_SHOTS, AC_RETURNS, AC_NP, AC_OUTCOME,
    AC_OPERATOR, AC_SEEING, AC_NOTES, AC__N };

static const struct csv_column attempt_cols[AC__N] = {
	{ "target", 1 }, { "start_utc", 1 }, { "end_utc", 1 },
	{ "shots", 1 }, { "returns", 1 }, { "normal_points", 1 },
	{ "outcome", 1 }, { "operator", 0 }, { "seeing_arcsec", 0 },
	{ "notes", 0 },
};

#define ATTEMPT_MAX_DAYS 1.0	/* one attempt lasts at most a day */

static int
row_time(const struct csv *c, const struct csv_table *t, size_t j,
    struct import_report *rep, double *mjd)
{
	char v[64], err[160];

	if (!cell(c, t, j, v, sizeof v)) {
		import_err(rep, c->rec_line, t->cols[j].name, "too long for a "
		    "UTC time");
		return -1;
	}
	if (import_parse_utc_mjd(v, mjd, err, sizeof err) != ERRCODE_OK) {
		import_err(rep, c->rec_line, t->cols[j].name, "%s", err);
		return -1;
	}
	return 0;
}

static int
row_count(const struct csv *c, const struct csv_table *t, size_t j,
    struct import_report *rep, long *out)
{
	char v[32];

	if (!cell(c, t, j, v, sizeof v)) {
		import_err(rep, c->rec_line, t->cols[j].name, "too long for a "
		    "count");
		return -1;
	}
	switch (import_parse_count(v, out)) {
	case IMPORT_COUNT_OK:
		return 0;
	case IMPORT_COUNT_NEGATIVE:
		import_err(rep, c->rec_line, t->cols[j].name,
		    "%s is negative; "
		    "counts are whole numbers >= 0", v);
		return -1;
	case IMPORT_COUNT_TOO_BIG:
		import_err(rep, c->rec_line, t->cols[j].name, "%.30s is too "
		    "large", v);
		return -1;
	case IMPORT_COUNT_NOT_INT:
		break;
	}
	import_err(rep, c->rec_line, t->cols[j].name, "'%.30s' is not a whole "
	    "number >= 0", v);
	return -1;
}

static int
attempt_row(const struct csv *c, const struct csv_table *t,
    struct import_report *rep, void *rec)
{
	struct site_attempt *a = rec;
	char v[32];
	int o;

	memset(a, 0, sizeof *a);
	a->synodic_deg = a->mean_elong_deg = NAN;
	a->target_el_deg = a->sun_el_target_deg = NAN;
	if (row_ident(c, t, AC_TARGET, a->target, sizeof a->target, 0, rep) ||
	    row_time(c, t, AC_START, rep, &a->start_mjd) ||
	    row_time(c, t, AC_END, rep, &a->end_mjd))
		return -1;
	if (!(a->end_mjd > a->start_mjd)) {
		import_err(rep, c->rec_line, "end_utc", "end is not after "
		    "start_utc");
		return -1;
	}
	if (a->end_mjd - a->start_mjd > ATTEMPT_MAX_DAYS) {
		import_err(rep, c->rec_line, "end_utc", "attempt longer than "
		    "24 hours");
		return -1;
	}
	if (row_count(c, t, AC_SHOTS, rep, &a->shots) ||
	    row_count(c, t, AC_RETURNS, rep, &a->returns) ||
	    row_count(c, t, AC_NP, rep, &a->normal_points))
		return -1;
	if (a->normal_points > a->returns) {
		import_err(rep, c->rec_line, "normal_points", "%ld normal "
		    "points from %ld returns: each needs at least one return",
		    a->normal_points, a->returns);
		return -1;
	}
	import_trim(csv_get(c, t, AC_OUTCOME), v, sizeof v);
	if ((o = site_outcome_parse(v)) < 0) {
		import_err(rep, c->rec_line, "outcome",
		    "'%.20s' is not one of "
		    "ranged no_returns weather technical safety other", v);
		return -1;
	}
	a->outcome = (enum site_outcome)o;
	if (row_text(c, t, AC_OPERATOR, 0, a->operator_name,
	    sizeof a->operator_name, rep) ||
	    row_real(c, t, AC_SEEING, 0.01, 60, NAN, rep, &a->seeing_arcsec) ||
	    row_text(c, t, AC_NOTES, 1, a->notes, sizeof a->notes, rep))
		return -1;
	return 0;
}

enum errcode
import_attempts_csv(const char *buf, size_t len, import_attempt_fn fn,
    void *ctx, struct import_report *rep)
{
	struct site_attempt a;
	struct csv_job job = { NULL, fn, ctx };

	return csv_run(buf, len, attempt_cols, AC__N, IMPORT_ATTEMPTS_COLUMNS,
	    attempt_row, &a, &job, rep);
}
