/* SPDX-License-Identifier: BSD-3-Clause */
/* mem.c: allocation wrapper with a failure switch, and text buffers. */
#include <stdatomic.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core/mem.h"

/*
 * The failure switch is the one piece of mutable file-scope state outside
 * main.c.  It exists for tests only and is never set in normal runs.
 */
static atomic_long fail_countdown;
static atomic_long alloc_count;	/* atomic: the daemon allocates from
				   several threads at once */

static int
should_fail(void)
{
	atomic_fetch_add_explicit(&alloc_count, 1, memory_order_relaxed);
	if (atomic_load_explicit(&fail_countdown, memory_order_relaxed) > 0 &&
	    atomic_fetch_sub(&fail_countdown, 1) == 1)
		return 1;
	return 0;
}

long
mem_fail_after(long n)
{
	long c = atomic_exchange(&alloc_count, 0);

	atomic_store(&fail_countdown, n > 0 ? n : 0);
	return c;
}

void *
mem_alloc(size_t size)
{
	if (should_fail())
		return NULL;
	return malloc(size == 0 ? 1 : size);
}

void *
mem_calloc(size_t n, size_t size)
{
	if (should_fail())
		return NULL;
	return calloc(n == 0 ? 1 : n, size == 0 ? 1 : size);
}

void *
mem_realloc(void *p, size_t size)
{
	if (should_fail())
		return NULL;
	return realloc(p, size == 0 ? 1 : size);
}

void
mem_free(void *p)
{
	free(p);
}

char *
mem_strdup(const char *s)
{
	size_t n;
	char *d;

	if (s == NULL)
		return NULL;
	n = strlen(s) + 1;
	if ((d = mem_alloc(n)) != NULL)
		memcpy(d, s, n);
	return d;
}

void
mbuf_init(struct mbuf *b)
{
	b->data = NULL;
	b->len = b->cap = 0;
	b->failed = 0;
}

void
mbuf_free(struct mbuf *b)
{
	mem_free(b->data);
	mbuf_init(b);
}

static int
reserve(struct mbuf *b, size_t extra)
{
	size_t need, cap;
	char *p;

	if (b->failed)
		return 0;
	if (extra > ((size_t)-1) / 2 - b->len) {
		b->failed = 1;
		return 0;
	}
	need = b->len + extra + 1;
	if (need <= b->cap)
		return 1;
	cap = b->cap ? b->cap : 256;
	while (cap < need)
		cap *= 2;
	if ((p = mem_realloc(b->data, cap)) == NULL) {
		b->failed = 1;
		return 0;
	}
	b->data = p;
	b->cap = cap;
	return 1;
}

void
mbuf_add(struct mbuf *b, const char *s, size_t n)
{
	if (!reserve(b, n))
		return;
	memcpy(b->data + b->len, s, n);
	b->len += n;
	b->data[b->len] = '\0';
}

void
mbuf_puts(struct mbuf *b, const char *s)
{
	mbuf_add(b, s, strlen(s));
}

void
mbuf_vprintf(struct mbuf *b, const char *fmt, va_list ap)
{
	va_list ap2;
	int n;

	va_copy(ap2, ap);
	n = vsnprintf(NULL, 0, fmt, ap2);
	va_end(ap2);
	if (n < 0) {
		b->failed = 1;
		return;
	}
	if (!reserve(b, (size_t)n))
		return;
	vsnprintf(b->data + b->len, (size_t)n + 1, fmt, ap);
	b->len += (size_t)n;
}

void
mbuf_printf(struct mbuf *b, const char *fmt, ...)
{
	va_list ap;

	va_start(ap, fmt);
	mbuf_vprintf(b, fmt, ap);
	va_end(ap);
}

enum errcode
mbuf_status(const struct mbuf *b)
{
	return b->failed ? ERRCODE_NOMEM : ERRCODE_OK;
}

char *
mbuf_take(struct mbuf *b)
{
	char *p;

	if (b->failed) {
		mbuf_free(b);
		return NULL;
	}
	if (b->data == NULL) {
		if (!reserve(b, 0)) {
			mbuf_free(b);
			return NULL;
		}
		b->data[0] = '\0';	/* an empty buffer is the empty string */
	}
	p = b->data;
	mbuf_init(b);
	return p;
}
