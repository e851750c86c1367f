/* SPDX-License-Identifier: BSD-3-Clause */
/* render_text.c: plain-text helpers the renderers share: words wrapped at
   79 columns and characters escaped by a table. */
#include <stdio.h>
#include <string.h>

#include "formats/render_text.h"

void
render_text_wrap(struct mbuf *b, const char *lead, const char *indent,
    const char *text)
{
	size_t col = strlen(lead);
	size_t ind = indent != NULL ? strlen(indent) : col;
	const char *p = text;

	mbuf_puts(b, lead);
	while (*p) {
		size_t n = strcspn(p, " ");

		if (col > ind && col + 1 + n > 79) {
			mbuf_printf(b, "\n%*s", (int)ind, "");
			col = ind;
		} else if (p != text) {
			mbuf_puts(b, " ");
			col++;
		}
		mbuf_add(b, p, n);
		col += n;
		p += n;
		while (*p == ' ')
			p++;
	}
	mbuf_puts(b, "\n");
}

void
render_text_escape(struct mbuf *out, const char *s,
    const char *const map[RENDER_TEXT_ASCII], const char *ctl)
{
	for (; *s; s++) {
		unsigned char c = (unsigned char)*s;

		if (c < RENDER_TEXT_ASCII && map[c] != NULL)
			mbuf_puts(out, map[c]);
		else if (c < 0x20 && ctl != NULL)
			mbuf_puts(out, ctl);
		else
			mbuf_add(out, s, 1);
	}
}
