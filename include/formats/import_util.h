/* SPDX-License-Identifier: BSD-3-Clause */
/* import_util.h: what the importers of formats/ share (the error report,
   text checks, value parsers, the line splitter); internal to the
   import_*.c files, not for other layers. */
#ifndef MOONRANGE_IMPORT_UTIL_H
#define MOONRANGE_IMPORT_UTIL_H

#include <stddef.h>

#include "core/errcode.h"
#include "core/mem.h"	/* MEM_PRINTFLIKE */
#include "formats/import.h"

/*
 * Nothing in the importers allocates: records are assembled in fixed
 * buffers on the stack (bounded by IMPORT_CSV_MAX_RECORD and the line
 * limits of each format) and libinih, as Debian builds it, reads lines
 * into a stack buffer.
 */

/* What import_parse_count found. */
enum import_count_status { IMPORT_COUNT_OK = 0, IMPORT_COUNT_NOT_INT,
    IMPORT_COUNT_NEGATIVE, IMPORT_COUNT_TOO_BIG };

/* A cursor over the lines of a buffer (import_lines_next). */
struct import_lines {
	const char *p, *end;
	size_t line;		/* of the line last returned */
};

/* The final status of a parse. */
enum errcode import_status(const struct import_report *rep);

/*
 * The start of every parse: rep emptied (import_report_init), and the
 * whole buffer checked to be text: no NUL byte, valid UTF-8.  On failure
 * one error names the line and column and ERRCODE_IO is returned; no
 * record has been handed on.
 */
enum errcode import_begin(const char *buf, size_t len,
    struct import_report *rep);

/* Skip a UTF-8 byte-order mark. */
size_t import_bom_len(const char *buf, size_t len);

/* Copy s without leading and trailing blanks into out (size cap). */
const char *import_trim(const char *s, char *out, size_t cap);

/* A non-negative whole number of at most LONG_MAX. */
enum import_count_status import_parse_count(const char *s, long *v);

/* 1..maxlen characters of [A-Za-z0-9_.-] (the target id rule), or of
   [A-Za-z0-9_-] when dot is 0. */
int import_valid_ident(const char *s, size_t maxlen, int dot);

/* Valid UTF-8 without control characters (tab and newline too, unless
   multiline).  Files were checked whole; command-line values and
   "station set" are checked here. */
int import_valid_text(const char *s, int multiline);

/* UTC MJD of an ISO 8601 text. */
enum errcode import_parse_utc_mjd(const char *s, double *mjd, char *err,
    size_t errlen);

/* Next physical line without its CR/LF; 0 at the end.  *terminated says
   whether it ended with a line feed. */
int import_lines_next(struct import_lines *it, const char **s, size_t *n,
    int *terminated);

/* Is the line empty or only blanks? */
int import_blank(const char *s, size_t n);

/* Split at blanks into at most max tokens in buf; returns the count (or
   max + 1 if there were more). */
size_t import_tokenize(const char *s, size_t n, char *buf, size_t cap,
    char **tok, size_t max);

#endif
