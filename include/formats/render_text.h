/* SPDX-License-Identifier: BSD-3-Clause */
/* render_text.h: plain-text helpers the renderers share: words wrapped at
   79 columns and characters escaped by a table. */
#ifndef MOONRANGE_RENDER_TEXT_H
#define MOONRANGE_RENDER_TEXT_H

#include "core/mem.h"

/* Text wrapped at 79 columns: lead, the words of text, and each further
   line indented by as many spaces as indent holds (NULL: as lead); a
   newline at the end. */
void render_text_wrap(struct mbuf *b, const char *lead, const char *indent,
    const char *text);

/* The size of an escape table: one entry per ASCII byte. */
#define RENDER_TEXT_ASCII 128

/*
 * Append s with each ASCII byte that map[] names replaced by its text (""
 * drops it); every other control byte (below 0x20) replaced by ctl when
 * ctl is not NULL; the rest as it is.
 */
void render_text_escape(struct mbuf *out, const char *s,
    const char *const map[RENDER_TEXT_ASCII], const char *ctl);

#endif
