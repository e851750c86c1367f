/* SPDX-License-Identifier: BSD-3-Clause */
/* render_phases.c: the Moon's principal phases in a span (moonrange
   phases, GET /api/v1/phases) as JSON and as a text table. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>
#include <jansson.h>

#include "core/tscale.h"
#include "formats/render_phases.h"
#include "formats/render_json.h"
#include "formats/render_time.h"

static int
set(json_t *obj, const char *key, json_t *val)
{
	return json_object_set_new(obj, key, val);
}

void
render_phases_init(struct render_phases *p, double from1, double from2,
    double to1, double to2, const struct geom_phase_event *ev, size_t n)
{
	*p = (struct render_phases){ .from1 = from1, .from2 = from2,
	    .to1 = to1, .to2 = to2, .ev = ev, .n = n };
}

enum errcode
render_phases_json(const struct render_phases *p, struct mbuf *out)
{
	json_t *root = json_object(), *arr = json_array();
	char buf[40];
	int bad = 0;

	if (root == NULL || arr == NULL) {
		json_decref(root);
		json_decref(arr);
		return ERRCODE_NOMEM;
	}
	bad |= set(root, "from", render_json_utc(p->from1, p->from2, 0));
	bad |= set(root, "to", render_json_utc(p->to1, p->to2, 0));
	bad |= set(root, "phases", arr);
	for (size_t i = 0; i < p->n; i++) {
		json_t *o = json_object();

		render_tt_iso(p->ev[i].tt1, p->ev[i].tt2, buf, sizeof buf);
		bad |= json_array_append_new(arr, o);
		bad |= set(o, "kind", json_string(geom_phase_name(p->ev[i].kind)));
		bad |= set(o, "utc", json_string(buf));
	}
	return render_json_dump(render_json_checked(root, bad), out);
}

enum errcode
render_phases_text(const struct render_phases *p, struct mbuf *out)
{
	static const char *label[] = {"New moon", "First quarter",
	    "Full moon", "Last quarter"};
	char buf[40], local[48];

	mbuf_printf(out, "%-14s %-21s %s\n", "Phase", "UTC",
	    p->time_zone ? "Local" : "");
	for (size_t i = 0; i < p->n; i++) {
		struct tscale_instant t;

		render_tt_iso(p->ev[i].tt1, p->ev[i].tt2, buf, sizeof buf);
		local[0] = '\0';
		if (p->time_zone != NULL &&
		    tscale_from_tt(p->ev[i].tt1, p->ev[i].tt2, 0.0, &t) == 0)
			(void)tzone_format(p->time_zone, t.utc1, t.utc2,
			    local, sizeof local);
		mbuf_printf(out, "%-14s %-21s %s\n", label[p->ev[i].kind], buf,
		    local);
	}
	if (p->n == 0)
		mbuf_puts(out, "(no principal phase in the span)\n");
	return mbuf_status(out);
}
