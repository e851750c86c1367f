/* SPDX-License-Identifier: BSD-3-Clause */
/* render_json.c: what the JSON renderers share: rounded numbers, ISO
   times, dumping into an mbuf, and jansson's allocator. */
#include <math.h>

#include <jansson.h>

#include "core/mem.h"
#include "core/text.h"
#include "core/tscale.h"
#include "formats/render_json.h"

json_t *
render_json_num(double v, int decimals)
{
	double s = pow(10.0, decimals);

	if (!isfinite(v))
		return json_null();
	return json_real(round(v * s) / s);
}

json_t *
render_json_checked(json_t *o, int bad)
{
	if (bad) {
		json_decref(o);
		return NULL;
	}
	return o;
}

int
render_json_list(json_t *o, const char *key, const void *recs, size_t n,
    size_t size, json_t *(*item)(const void *rec))
{
	json_t *arr = json_array();
	/* json_object_set_new takes arr even when it fails. */
	int bad = json_object_set_new(o, key, arr) != 0;

	for (size_t i = 0; i < n && !bad; i++)
		bad = json_array_append_new(arr,
		    item((const char *)recs + i * size)) != 0;
	return bad;
}

/* json_dump_callback sink: append to the mbuf, fail once it has failed. */
static int
mbuf_sink(const char *buf, size_t size, void *data)
{
	struct mbuf *b = data;

	mbuf_add(b, buf, size);
	return mbuf_status(b) == ERRCODE_OK ? 0 : -1;
}

enum errcode
render_json_dump(json_t *root, struct mbuf *out)
{
	size_t mark = out->len;
	int rc;

	if (root == NULL)
		return ERRCODE_NOMEM;
	rc = json_dump_callback(root, mbuf_sink, out,
	    JSON_INDENT(2) | JSON_REAL_PRECISION(15));
	json_decref(root);
	if (rc != 0) {
		/* Drop a partial document (when the mbuf itself is intact). */
		if (mbuf_status(out) == ERRCODE_OK && out->data != NULL) {
			out->len = mark;
			out->data[mark] = '\0';
		}
		return ERRCODE_NOMEM;
	}
	mbuf_puts(out, "\n");
	return mbuf_status(out);
}

json_t *
render_json_utc(double utc1, double utc2, int ndp)
{
	char buf[48];

	if (!isfinite(utc1) || !isfinite(utc2) ||
	    tscale_format_utc(utc1, utc2, ndp, buf, sizeof buf) != ERRCODE_OK)
		return json_null();
	return json_string(buf);
}

json_t *
render_json_mjd(double mjd, int ndp)
{
	return render_json_utc(TEXT_MJD0, mjd, ndp);
}

void
render_json_setup(void)
{
	json_set_alloc_funcs(mem_alloc, mem_free);
}
