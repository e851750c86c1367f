/* SPDX-License-Identifier: BSD-3-Clause */
/* import_util.c: what the importers share: the error report, the text
   checks, the value parsers and the line splitter. */
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

#include "core/text.h"
#include "core/tscale.h"
#include "formats/import.h"
#include "formats/import_util.h"

/* ------------------------------------------------------------------ */
/* reports                                                             */
/* ------------------------------------------------------------------ */

void
import_report_init(struct import_report *rep)
{
	memset(rep, 0, sizeof *rep);
}

void
import_verr(struct import_report *rep, size_t line, const char *field,
    const char *fmt, va_list ap)
{
	struct import_error *e;

	if (rep->nerrors >= IMPORT_MAX_ERRORS)
		return;
	e = &rep->errors[rep->nerrors++];
	e->line = line;
	(void)text_err(ERRCODE_OK, e->field, sizeof e->field, "%s",
	    field ? field : "");
	(void)text_verr(ERRCODE_OK, e->message, sizeof e->message, fmt, ap);
}

void
import_err(struct import_report *rep, size_t line, const char *field,
    const char *fmt, ...)
{
	va_list ap;

	va_start(ap, fmt);
	import_verr(rep, line, field, fmt, ap);
	va_end(ap);
}

void
import_error_format(const struct import_report *rep, size_t i,
    const char *file, char *buf, size_t len)
{
	const struct import_error *e;
	char where[64];

	if (len == 0)
		return;
	if (rep == NULL || i >= rep->nerrors) {
		snprintf(buf, len, "%s: no such error", file ? file : "input");
		return;
	}
	e = &rep->errors[i];
	if (e->line > 0)
		snprintf(where, sizeof where, ":%zu", e->line);
	else
		where[0] = '\0';
	if (e->field[0] != '\0')
		snprintf(buf, len, "%s%s: field '%s': %s", file ? file : "input",
		    where, e->field, e->message);
	else
		snprintf(buf, len, "%s%s: %s", file ? file : "input", where,
		    e->message);
}

enum errcode
import_status(const struct import_report *rep)
{
	return rep->bad > 0 ? ERRCODE_BAD_ARG : ERRCODE_OK;
}

/* ------------------------------------------------------------------ */
/* text checks                                                         */
/* ------------------------------------------------------------------ */

enum errcode
import_begin(const char *buf, size_t len, struct import_report *rep)
{
	const unsigned char *p = (const unsigned char *)buf;
	size_t line = 1, col = 1, n;

	import_report_init(rep);
	if (buf == NULL && len > 0)
		return ERRCODE_BAD_ARG;
	for (size_t i = 0; i < len; i += n, col++) {
		if (p[i] == '\0') {
			import_err(rep, line, "", "NUL byte at column %zu: "
			    "this is not a text file", col);
			rep->bad++;
			return ERRCODE_IO;
		}
		if ((n = text_utf8_seq(p + i, len - i)) == 0) {
			import_err(rep, line, "",
			    "invalid UTF-8 byte 0x%02X at "
			    "column %zu: the file must be UTF-8 text", p[i],
			    col);
			rep->bad++;
			return ERRCODE_IO;
		}
		if (p[i] == '\n') {
			line++;
			col = 0;
		}
	}
	return ERRCODE_OK;
}

size_t
import_bom_len(const char *buf, size_t len)
{
	return (len >= 3 && memcmp(buf, "\xEF\xBB\xBF", 3) == 0) ? 3 : 0;
}

/* ------------------------------------------------------------------ */
/* values                                                              */
/* ------------------------------------------------------------------ */

const char *
import_trim(const char *s, char *out, size_t cap)
{
	size_t n;

	while (*s == ' ' || *s == '\t')
		s++;
	n = strlen(s);
	while (n > 0 && (s[n - 1] == ' ' || s[n - 1] == '\t'))
		n--;
	if (n >= cap)
		n = cap - 1;
	memcpy(out, s, n);
	out[n] = '\0';
	return out;
}

enum import_count_status
import_parse_count(const char *s, long *v)
{
	const char *p = s;
	long n = 0;

	if (*p == '+')
		p++;
	else if (*p == '-') {
		int any = 0;

		for (p++; isdigit((unsigned char)*p); p++)
			any = 1;
		return (any && *p == '\0') ? IMPORT_COUNT_NEGATIVE :
		    IMPORT_COUNT_NOT_INT;
	}
	if (!isdigit((unsigned char)*p))
		return IMPORT_COUNT_NOT_INT;
	for (; isdigit((unsigned char)*p); p++) {
		int d = *p - '0';

		if (n > (LONG_MAX - d) / 10)
			return IMPORT_COUNT_TOO_BIG;
		n = n * 10 + d;
	}
	if (*p != '\0')
		return IMPORT_COUNT_NOT_INT;
	*v = n;
	return IMPORT_COUNT_OK;
}

int
import_valid_ident(const char *s, size_t maxlen, int dot)
{
	size_t n = strlen(s);

	if (n == 0 || n > maxlen)
		return 0;
	for (size_t i = 0; i < n; i++)
		if (!isalnum((unsigned char)s[i]) && s[i] != '_' &&
		    s[i] != '-' && !(dot && s[i] == '.'))
			return 0;
	return 1;
}

int
import_valid_text(const char *s, int multiline)
{
	const unsigned char *p = (const unsigned char *)s;
	size_t len = strlen(s), n;

	for (size_t i = 0; i < len; i += n) {
		unsigned char c = p[i];

		if ((n = text_utf8_seq(p + i, len - i)) == 0 || c == 0x7F)
			return 0;
		if (c < 0x20 && !(multiline && (c == '\n' || c == '\t' ||
		    c == '\r')))
			return 0;
	}
	return 1;
}

int
import_text_ok(const char *s, int multiline)
{
	return s != NULL && import_valid_text(s, multiline);
}

enum errcode
import_parse_utc_mjd(const char *s, double *mjd, char *err, size_t errlen)
{
	double u1, u2;
	enum errcode rc;

	if ((rc = tscale_parse_utc(s, &u1, &u2, err, errlen)) != ERRCODE_OK)
		return rc;
	*mjd = (u1 - ERFA_DJM0) + u2;
	return ERRCODE_OK;
}

/* ------------------------------------------------------------------ */
/* line-oriented formats                                               */
/* ------------------------------------------------------------------ */

int
import_lines_next(struct import_lines *it, const char **s, size_t *n,
    int *terminated)
{
	const char *nl;

	if (it->p >= it->end)
		return 0;
	nl = memchr(it->p, '\n', (size_t)(it->end - it->p));
	*s = it->p;
	*n = nl ? (size_t)(nl - it->p) : (size_t)(it->end - it->p);
	*terminated = nl != NULL;
	it->p = nl ? nl + 1 : it->end;
	if (*n > 0 && (*s)[*n - 1] == '\r')
		(*n)--;
	it->line++;
	return 1;
}

int
import_blank(const char *s, size_t n)
{
	for (size_t i = 0; i < n; i++)
		if (s[i] != ' ' && s[i] != '\t')
			return 0;
	return 1;
}

size_t
import_tokenize(const char *s, size_t n, char *buf, size_t cap, char **tok,
    size_t max)
{
	size_t nt = 0, used = 0, i = 0;

	while (i < n) {
		size_t start;

		while (i < n && (s[i] == ' ' || s[i] == '\t'))
			i++;
		if (i >= n)
			break;
		start = i;
		while (i < n && s[i] != ' ' && s[i] != '\t')
			i++;
		if (nt == max)
			return max + 1;
		if (used + (i - start) + 1 > cap)
			return max + 1;
		tok[nt] = buf + used;
		memcpy(buf + used, s + start, i - start);
		used += i - start;
		buf[used++] = '\0';
		nt++;
	}
	return nt;
}
