/* SPDX-License-Identifier: BSD-3-Clause */
/* import.h: parsers for the station file, CSV logs, CRD normal points and
   IERS Earth-orientation files, all from memory buffers. */
#ifndef MOONRANGE_IMPORT_H
#define MOONRANGE_IMPORT_H

#include <stdarg.h>
#include <stddef.h>

#include "core/errcode.h"
#include "core/mem.h"
#include "core/site.h"

/*
 * Every parser reads a complete buffer (not a file: the caller reads it, so
 * the parsers can be fuzzed) and hands each good record to a callback.
 * Bad records are collected in the report with their line number and the
 * field at fault; parsing continues so that every bad line is reported at
 * once.  A callback returning non-OK stops the parse and that code is
 * returned.  The parsers allocate nothing (records are built in bounded
 * stack buffers) and keep no pointer into the buffer after returning;
 * the buffer need not end with a NUL.
 *
 * Return value: ERRCODE_OK when every record was good; ERRCODE_BAD_ARG
 * when at least one record was bad (see the report); ERRCODE_IO for a
 * buffer that is not text (NUL bytes, invalid UTF-8) or is truncated in
 * a way that makes it unreadable; a callback's code if it stopped.
 */

#define IMPORT_MAX_ERRORS 50	/* errors kept in a report (all counted) */

struct import_error {
	size_t line;			/* 1-based; 0 for the whole file */
	char field[32];			/* column or key at fault, "" if none */
	char message[160];		/* a sentence, no trailing period */
};

struct import_report {
	size_t records;			/* good records handed to the callback */
	size_t bad;			/* bad records (all, not only kept) */
	size_t skipped;			/* CRD records of types not used;
					   finals rows without values */
	size_t nerrors;			/* errors kept, <= IMPORT_MAX_ERRORS */
	struct import_error errors[IMPORT_MAX_ERRORS];
};

void import_report_init(struct import_report *rep);

/* Keep one error in rep (the first IMPORT_MAX_ERRORS are kept; the
   caller counts rep->bad): the one writer of a report's sentences, for
   the importers and for the command line's checks of imported records. */
void import_err(struct import_report *rep, size_t line, const char *field,
    const char *fmt, ...) MEM_PRINTFLIKE(4, 5);
void import_verr(struct import_report *rep, size_t line, const char *field,
    const char *fmt, va_list ap) MEM_PRINTFLIKE(4, 0);

/* Format error i as "FILE:LINE: field 'F': message" into buf. */
void import_error_format(const struct import_report *rep, size_t i,
    const char *file, char *buf, size_t len);

/* --- text --- */

/* 1 when s is valid UTF-8 (RFC 3629) without control characters (tab,
   CR and LF allowed only when multiline), else 0; NULL gives 0.  The
   rule of every text field the importers accept, for command-line
   values too. */
int import_text_ok(const char *s, int multiline);

/* --- station file (INI) --- */

/*
 * The station file's keys: one table gives each key its section, type,
 * range, default and help text.  The parser, `station set` and the
 * README's table of keys all come from it.
 */
enum import_key_type {
	IMPORT_KEY_TEXT = 0,		/* free text, 1..max bytes of UTF-8 */
	IMPORT_KEY_CODE,		/* 1..max of [A-Za-z0-9_-] */
	IMPORT_KEY_TZ,			/* IANA zone name syntax */
	IMPORT_KEY_REAL			/* decimal number in [min, max] */
};

struct import_key {
	const char *section;		/* "station", "limits", ... */
	const char *name;		/* "lat_deg", ... */
	enum import_key_type type;
	double min, max;		/* REAL: inclusive range; text: max
					   length in bytes (min unused) */
	int required;			/* 1: no default, must be given */
	double def;			/* REAL default; NaN: derived (help
					   says from what) */
	const char *help;		/* one line, with the unit */
};

/* The table (static storage) and its length. */
const struct import_key *import_station_keys(size_t *n);

/*
 * The key table as a Markdown table (key, type/range, default, help),
 * appended to out; the README's station-file section is this text.
 */
struct mbuf;
void import_station_keys_doc(struct mbuf *out);

/* Fill *st with every default (text empty, derived values from the
   height; required numbers NaN). */
void import_station_defaults(struct site_station *st);

/*
 * Set one key from its text, validated as in the file: ERRCODE_NOT_FOUND
 * for an unknown section/name, ERRCODE_BAD_ARG for a bad value, each with
 * a sentence in errbuf (may be NULL).  Derived defaults are not redone
 * (see import_station_finish).
 */
enum errcode import_station_set(struct site_station *st,
    const char *section, const char *name, const char *value,
    char *errbuf, size_t errlen);

/* Replace NaN pressure and temperature by the standard atmosphere at
   st->height_m (geom_weather_standard); import_station_ini calls it. */
void import_station_finish(struct site_station *st);

/*
 * Parse the station INI into *st (all keys validated, unknown keys are
 * errors naming the key, missing required keys too).  Section and key
 * names are case-sensitive; ';' and '#' start a comment line, ';' also
 * an inline comment; each key may be given once; lines are at most 196
 * bytes.  Unset pressure and temperature come from the standard
 * atmosphere at height_m (geom_weather_standard).
 */
enum errcode import_station_ini(const char *buf, size_t len,
    struct site_station *st, struct import_report *rep);

/* --- CSV (RFC 4180, header row required) --- */

/*
 * Column names.  The header row names the columns, in any order; the
 * required ones must be present, unknown ones are errors.  Lines starting
 * with '#' before the header are comments (an extension); empty lines are
 * skipped.  A record is at most IMPORT_CSV_MAX_RECORD bytes and
 * IMPORT_CSV_MAX_FIELDS fields.  These are also the headers `log export`
 * writes, so that export and import round-trip.
 */
#define IMPORT_TARGETS_COLUMNS \
	"id,name,alias,lat_deg,lon_deg,height_m,strength,dark_only,active," \
	"cube_count,cube_aperture_mm,normal_lat_deg,normal_lon_deg,extent_m"
#define IMPORT_ATTEMPTS_COLUMNS \
	"target,start_utc,end_utc,shots,returns,normal_points,outcome," \
	"operator,seeing_arcsec,notes"
#define IMPORT_CSV_MAX_RECORD 8192
#define IMPORT_CSV_MAX_FIELDS 32

typedef enum errcode (*import_target_fn)(void *ctx,
    const struct site_target *t, size_t line);
typedef enum errcode (*import_attempt_fn)(void *ctx,
    const struct site_attempt *a, size_t line);

enum errcode import_targets_csv(const char *buf, size_t len,
    import_target_fn fn, void *ctx, struct import_report *rep);
enum errcode import_attempts_csv(const char *buf, size_t len,
    import_attempt_fn fn, void *ctx, struct import_report *rep);

/* --- CRD normal points --- */

/*
 * One normal point with the header context it appeared under.  target_name
 * is the CRD target name (H3), to be mapped through the targets' alias;
 * station_code the station of the session (H2).  np->target is left "",
 * the derived angles NaN.  The epoch is the H4 start date plus the
 * record's seconds of day, the next day when they fall more than 60 s
 * before the H4 start (a session across midnight); times of flight
 * outside 2..3 s (not a lunar two-way time) are refused; a bin RMS of
 * "na" is NaN.  A file must open with H1 and close with H9.
 */
struct import_crd_np {
	char target_name[SITE_NAME_LEN];
	struct site_normal_point np;
	int crd_version;		/* 1 or 2, from H1 */
	size_t session_line;		/* line of the session's H4 */
};

typedef enum errcode (*import_np_fn)(void *ctx, const struct import_crd_np *np,
    size_t line);

enum errcode import_crd(const char *buf, size_t len, import_np_fn fn,
    void *ctx, struct import_report *rep);

/* --- IERS Earth orientation (finals / Bulletin A columns, and C04) --- */

typedef enum errcode (*import_eop_fn)(void *ctx, const struct site_eop_row *r,
    size_t line);

/*
 * finals2000A (also finals.data/.daily/.all): fixed columns as in the
 * IERS ReadMe.finals2000A; the Bulletin A polar motion (columns 19-27,
 * 38-46) and UT1-UTC (59-68) are used, Bulletin B ignored.  Rows with no
 * Bulletin A values (dates beyond the predictions) are skipped and
 * counted in rep->skipped.  Lines starting with '#' are comments (a
 * moonrange extension, used by the demo file).  Each row's YYMMDD must
 * agree with its MJD; MJDs must increase.
 *
 * EOP 14 C04 (eopc04_IAU2000.62-now): the text header is skipped; data
 * rows give year, month, day (columns 1-12), MJD (13-19), x (20-30), y
 * (31-41), UT1-UTC (42-53).
 */
enum errcode import_eop_finals(const char *buf, size_t len, import_eop_fn fn,
    void *ctx, struct import_report *rep);
enum errcode import_eop_c04(const char *buf, size_t len, import_eop_fn fn,
    void *ctx, struct import_report *rep);

enum import_eop_format {
	IMPORT_EOP_UNKNOWN = 0,
	IMPORT_EOP_FINALS,
	IMPORT_EOP_C04
};

/* Guess the format from the first non-comment lines (no parse). */
enum import_eop_format import_eop_detect(const char *buf, size_t len);

/* Detect and parse; ERRCODE_UNSUPPORTED (one error in rep) when the
   buffer is neither format. */
enum errcode import_eop(const char *buf, size_t len, import_eop_fn fn,
    void *ctx, struct import_report *rep);

#endif
