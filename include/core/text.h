/* SPDX-License-Identifier: BSD-3-Clause */
/* text.h: the one strict parser of numbers and booleans, the one error
   sentence writer, and UTF-8 text checks, for every way in (command line,
   query string, JSON body, CSV and station files). */
#ifndef MOONRANGE_TEXT_H
#define MOONRANGE_TEXT_H

#include <stdarg.h>
#include <stddef.h>

#include "core/errcode.h"
#include "core/mem.h"	/* MEM_PRINTFLIKE */

/* The Modified Julian Date of JD 0: MJD = JD - TEXT_MJD0.  (ERFA's
   ERFA_DJM0; named here so that no layer has to redefine it.) */
#define TEXT_MJD0 2400000.5

/* --- numbers ------------------------------------------------------------- */

/*
 * A strict decimal real: [+-]digits[.digits][(e|E)[+-]digits] with at
 * least one digit before or after the point.  No leading or trailing
 * space, hex (0x10), inf or nan, all of which strtod would take.
 *
 * Returned (function value):
 *   ERRCODE_OK and *out set; ERRCODE_BAD_ARG (not such a number, or out of
 *   [min, max], or overflow); *out untouched then.
 */
enum errcode text_parse_real(const char *s, double min, double max,
    double *out);

/*
 * A strict whole number: [+-]digits (decimal only, no space, no hex), in
 * [min, max].  Returns ERRCODE_OK and sets *out, or ERRCODE_BAD_ARG.
 */
enum errcode text_parse_long(const char *s, long min, long max, long *out);

/* --- booleans ------------------------------------------------------------ */

/*
 * The one name-to-enum lookup: the index of s among names[0..n) (exact,
 * case-sensitive), or -1 when s is NULL or none of them.  For an enum
 * whose values run 0..n-1 and whose names stand in a table in that order.
 */
int text_name_index(const char *s, const char *const *names, int n);

/*
 * The one boolean vocabulary: 1/0, true/false, yes/no, on/off, in any
 * letter case.  Returns ERRCODE_OK and sets *out to 1 or 0, or
 * ERRCODE_BAD_ARG.
 */
enum errcode text_parse_bool(const char *s, int *out);

/* ASCII comparison ignoring letter case (locale-free), as strcasecmp. */
int text_casecmp(const char *a, const char *b);

/* --- error sentences ------------------------------------------------------ */

/*
 * Write one sentence into a caller's error buffer (redis anet style):
 * errbuf may be NULL (the caller opted out) and errlen 0.  The text is
 * cut at a whole UTF-8 character, never inside one, so a message quoting
 * user input stays valid UTF-8.  Returns code, so that a caller can write
 * "return text_err(ERRCODE_BAD_ARG, errbuf, errlen, ...)".
 */
enum errcode text_err(enum errcode code, char *errbuf, size_t errlen,
    const char *fmt, ...) MEM_PRINTFLIKE(4, 5);
enum errcode text_verr(enum errcode code, char *errbuf, size_t errlen,
    const char *fmt, va_list ap) MEM_PRINTFLIKE(4, 0);

/* --- UTF-8 --------------------------------------------------------------- */

/* Length of the UTF-8 sequence at p (1-4, at most n bytes read), or 0
   when it is not valid UTF-8 (overlong, surrogate, above U+10FFFF,
   truncated). */
size_t text_utf8_seq(const unsigned char *p, size_t n);

/* Is s valid UTF-8 throughout? */
int text_utf8_valid(const char *s, size_t n);

/* The longest prefix of s, at most max bytes, that ends on a character
   boundary (s need not be valid UTF-8 past that point). */
size_t text_utf8_cut(const char *s, size_t max);

/*
 * Where the first character that a stored text field may not hold begins
 * in s[0..n): a byte that is not valid UTF-8, a C0 control (U+0000-001F;
 * U+000A line feed allowed when allow_newline), DEL (U+007F), a C1
 * control (U+0080-009F), or a bidirectional embedding, override or
 * isolate (U+202A-202E, U+2066-2069), which could make a text read
 * differently from what it holds.  Returns n when there is none.
 */
size_t text_unsafe_at(const char *s, size_t n, int allow_newline);

/*
 * The one check of a stored text field (station name and code, target
 * id, name and alias, blackout reason, attempt operator and notes): s must
 * be terminated within cap bytes (at most cap - 1 characters' bytes, as a
 * char[cap] member holds) and hold nothing text_unsafe_at finds.  Returns
 * ERRCODE_OK, or ERRCODE_BAD_ARG with "FIELD: why" in errbuf.
 */
enum errcode text_field_check(const char *field, const char *s, size_t cap,
    int allow_newline, char *errbuf, size_t errlen);

/*
 * Copy s[0..n) into out (outlen bytes, always terminated) for quoting in
 * a message: valid printable UTF-8 as it is, every other byte (invalid
 * UTF-8, C0, DEL) as the four characters \xNN, so that the copy is valid
 * UTF-8 whatever s holds.  Cut at a whole character or escape.  Returns
 * out.
 */
char *text_quote(const char *s, size_t n, char *out, size_t outlen);

#endif
