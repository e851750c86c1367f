/* SPDX-License-Identifier: BSD-3-Clause */
/* text.c: strict numbers and booleans, error sentences, UTF-8 checks. */
#include <ctype.h>
#include <errno.h>
#include <limits.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core/text.h"

/* Does s hold a strict decimal real (see text_parse_real), whole? */
static int
strict_real(const char *s)
{
	const char *p = s;
	int digits = 0;

	if (*p == '+' || *p == '-')
		p++;
	for (; isdigit((unsigned char)*p); p++)
		digits++;
	if (*p == '.')
		for (p++; isdigit((unsigned char)*p); p++)
			digits++;
	if (digits == 0)
		return 0;
	if (*p == 'e' || *p == 'E') {
		p++;
		if (*p == '+' || *p == '-')
			p++;
		if (!isdigit((unsigned char)*p))
			return 0;
		while (isdigit((unsigned char)*p))
			p++;
	}
	return *p == '\0';
}

enum errcode
text_parse_real(const char *s, double min, double max, double *out)
{
	char *end;
	double v;

	if (s == NULL || !strict_real(s))
		return ERRCODE_BAD_ARG;
	errno = 0;
	v = strtod(s, &end);
	if (errno == ERANGE || *end != '\0' || !isfinite(v) || v < min ||
	    v > max)
		return ERRCODE_BAD_ARG;
	*out = v;
	return ERRCODE_OK;
}

enum errcode
text_parse_long(const char *s, long min, long max, long *out)
{
	const char *p = s;
	char *end;
	long v;

	if (s == NULL)
		return ERRCODE_BAD_ARG;
	if (*p == '+' || *p == '-')
		p++;
	if (!isdigit((unsigned char)*p))
		return ERRCODE_BAD_ARG;
	for (; isdigit((unsigned char)*p); p++)
		;
	if (*p != '\0')
		return ERRCODE_BAD_ARG;
	errno = 0;
	v = strtol(s, &end, 10);
	if (errno == ERANGE || *end != '\0' || v < min || v > max)
		return ERRCODE_BAD_ARG;
	*out = v;
	return ERRCODE_OK;
}

int
text_casecmp(const char *a, const char *b)
{
	for (; *a && *b; a++, b++) {
		int x = tolower((unsigned char)*a);
		int y = tolower((unsigned char)*b);

		if (x != y)
			return x - y;
	}
	return (unsigned char)*a - (unsigned char)*b;
}

int
text_name_index(const char *s, const char *const *names, int n)
{
	for (int i = 0; i < n && s != NULL; i++)
		if (strcmp(s, names[i]) == 0)
			return i;
	return -1;
}

enum errcode
text_parse_bool(const char *s, int *out)
{
	static const char *const yes[] = { "1", "true", "yes", "on" };
	static const char *const no[] = { "0", "false", "no", "off" };

	if (s == NULL)
		return ERRCODE_BAD_ARG;
	for (size_t i = 0; i < sizeof yes / sizeof yes[0]; i++) {
		if (text_casecmp(s, yes[i]) == 0) {
			*out = 1;
			return ERRCODE_OK;
		}
		if (text_casecmp(s, no[i]) == 0) {
			*out = 0;
			return ERRCODE_OK;
		}
	}
	return ERRCODE_BAD_ARG;
}

size_t
text_utf8_seq(const unsigned char *p, size_t n)
{
	unsigned c = p[0];
	size_t len;
	unsigned long cp;

	if (n == 0)
		return 0;
	if (c < 0x80)
		return 1;
	if (c >= 0xC2 && c <= 0xDF) {
		len = 2;
		cp = c & 0x1Fu;
	} else if (c >= 0xE0 && c <= 0xEF) {
		len = 3;
		cp = c & 0x0Fu;
	} else if (c >= 0xF0 && c <= 0xF4) {
		len = 4;
		cp = c & 0x07u;
	} else {
		return 0;
	}
	if (n < len)
		return 0;
	for (size_t i = 1; i < len; i++) {
		if ((p[i] & 0xC0u) != 0x80u)
			return 0;
		cp = (cp << 6) | (p[i] & 0x3Fu);
	}
	if ((len == 3 && cp < 0x800) || (len == 4 && cp < 0x10000) ||
	    cp > 0x10FFFF || (cp >= 0xD800 && cp <= 0xDFFF))
		return 0;
	return len;
}

int
text_utf8_valid(const char *s, size_t n)
{
	const unsigned char *p = (const unsigned char *)s;
	size_t k;

	for (size_t i = 0; i < n; i += k)
		if ((k = text_utf8_seq(p + i, n - i)) == 0)
			return 0;
	return 1;
}

size_t
text_utf8_cut(const char *s, size_t max)
{
	const unsigned char *p = (const unsigned char *)s;
	size_t i = 0, k, n = strlen(s);

	if (n > max)
		n = max;
	while (i < n && (k = text_utf8_seq(p + i, n - i)) != 0)
		i += k;
	return i;
}

/* The code point of the valid sequence of len bytes at p. */
static unsigned long
utf8_cp(const unsigned char *p, size_t len)
{
	unsigned long cp;

	if (len == 1)
		return p[0];
	cp = p[0] & (len == 2 ? 0x1Fu : len == 3 ? 0x0Fu : 0x07u);
	for (size_t i = 1; i < len; i++)
		cp = (cp << 6) | (p[i] & 0x3Fu);
	return cp;
}

size_t
text_unsafe_at(const char *s, size_t n, int allow_newline)
{
	const unsigned char *p = (const unsigned char *)s;
	unsigned long cp;
	size_t k;

	for (size_t i = 0; i < n; i += k) {
		if ((k = text_utf8_seq(p + i, n - i)) == 0)
			return i;
		cp = utf8_cp(p + i, k);
		if ((cp < 0x20 && !(cp == '\n' && allow_newline)) ||
		    (cp >= 0x7F && cp <= 0x9F) ||
		    (cp >= 0x202A && cp <= 0x202E) ||
		    (cp >= 0x2066 && cp <= 0x2069))
			return i;
	}
	return n;
}

enum errcode
text_field_check(const char *field, const char *s, size_t cap,
    int allow_newline, char *errbuf, size_t errlen)
{
	size_t n = strnlen(s, cap), at;

	if (n == cap)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: longer "
		    "than %zu bytes", field, cap - 1);
	if ((at = text_unsafe_at(s, n, allow_newline)) < n)
		return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: byte %zu "
		    "is not UTF-8 or is a control or bidirectional-override "
		    "character%s", field, at + 1, allow_newline ?
		    " (only line feeds are allowed)" : "");
	return ERRCODE_OK;
}

char *
text_quote(const char *s, size_t n, char *out, size_t outlen)
{
	static const char hex[] = "0123456789ABCDEF";
	const unsigned char *p = (const unsigned char *)s;
	size_t o = 0, k;

	if (outlen == 0)
		return out;
	for (size_t i = 0; i < n; i += k) {
		k = text_utf8_seq(p + i, n - i);
		if (k == 0 || p[i] < 0x20 || p[i] == 0x7F) {
			if (o + 4 >= outlen)
				break;
			out[o++] = '\\';
			out[o++] = 'x';
			out[o++] = hex[p[i] >> 4];
			out[o++] = hex[p[i] & 0xF];
			k = 1;
		} else {
			if (o + k >= outlen)
				break;
			memcpy(out + o, p + i, k);
			o += k;
		}
	}
	out[o] = '\0';
	return out;
}

enum errcode
text_verr(enum errcode code, char *errbuf, size_t errlen, const char *fmt,
    va_list ap)
{
	int n;

	if (errbuf == NULL || errlen == 0)
		return code;
	n = vsnprintf(errbuf, errlen, fmt, ap);
	if (n < 0) {
		errbuf[0] = '\0';
		return code;
	}
	/* Cut where a character ends: the tail may have been cut inside one,
	   and a quoted value may hold bytes that are not UTF-8 at all. */
	errbuf[text_utf8_cut(errbuf, errlen - 1)] = '\0';
	return code;
}

enum errcode
text_err(enum errcode code, char *errbuf, size_t errlen, const char *fmt,
    ...)
{
	va_list ap;

	va_start(ap, fmt);
	code = text_verr(code, errbuf, errlen, fmt, ap);
	va_end(ap);
	return code;
}
