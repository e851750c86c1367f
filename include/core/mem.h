/* SPDX-License-Identifier: BSD-3-Clause */
/* mem.h: the one allocation wrapper, and a growable text buffer. */
#ifndef MOONRANGE_MEM_H
#define MOONRANGE_MEM_H

#include <stdarg.h>
#include <stddef.h>

#include "core/errcode.h"

#if defined(__GNUC__) || defined(__clang__)
#define MEM_PRINTFLIKE(f, a) __attribute__((format(printf, f, a)))
#else
#define MEM_PRINTFLIKE(f, a)
#endif

/*
 * Every heap allocation of moonrange (and of jansson, see
 * render_json_setup in formats/render_json.h)
 * goes through these, so that tests can count allocations and make the
 * n-th one fail.  They return NULL on failure and never abort; mem_free
 * accepts NULL.
 */
void *mem_alloc(size_t size);
void *mem_calloc(size_t n, size_t size);
void *mem_realloc(void *p, size_t size);
void mem_free(void *p);
char *mem_strdup(const char *s);	/* NULL in, NULL out */

/* Test hook: the n-th allocation from now fails (1 = the next one); 0
   turns it off.  Returns the number of allocations since the last call. */
long mem_fail_after(long n);

/*
 * A growable NUL-terminated text buffer.  A failed append leaves the
 * buffer valid but marked failed; mbuf_status() then returns
 * ERRCODE_NOMEM, so callers check once at the end.  The data pointer is
 * owned by the buffer: valid until the next append or mbuf_free; take it
 * with mbuf_take (caller frees with mem_free).
 */
struct mbuf {
	char *data;
	size_t len, cap;
	int failed;
};

void mbuf_init(struct mbuf *b);
void mbuf_free(struct mbuf *b);
void mbuf_add(struct mbuf *b, const char *s, size_t n);
void mbuf_puts(struct mbuf *b, const char *s);
void mbuf_printf(struct mbuf *b, const char *fmt, ...) MEM_PRINTFLIKE(2, 3);
void mbuf_vprintf(struct mbuf *b, const char *fmt, va_list ap)
    MEM_PRINTFLIKE(2, 0);
enum errcode mbuf_status(const struct mbuf *b);
char *mbuf_take(struct mbuf *b);

#endif
