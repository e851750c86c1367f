/* SPDX-License-Identifier: BSD-3-Clause */
/* render_log.c: attempts of the observation log as JSON. */
#include <math.h>

#include <erfam.h>
#include <jansson.h>

#include "render.h"
#include "render_log.h"
#include "tscale.h"

static json_t *
mjd_iso(double mjd)
{
	char buf[40];

	if (!isfinite(mjd) ||
	    tscale_format_utc(ERFA_DJM0, mjd, 3, buf, sizeof buf) != ERRCODE_OK)
		return json_null();
	return json_string(buf);
}

/* The object of one attempt, or NULL when out of memory. */
static json_t *
attempt_object(const struct site_attempt *a)
{
	json_t *o = json_object();
	int bad = o == NULL;

	if (bad)
		return NULL;
	bad |= json_object_set_new(o, "id", json_integer(a->id));
	bad |= json_object_set_new(o, "target", json_string(a->target));
	bad |= json_object_set_new(o, "start_utc", mjd_iso(a->start_mjd));
	bad |= json_object_set_new(o, "end_utc", mjd_iso(a->end_mjd));
	bad |= json_object_set_new(o, "shots", json_integer(a->shots));
	bad |= json_object_set_new(o, "returns", json_integer(a->returns));
	bad |= json_object_set_new(o, "normal_points",
	    json_integer(a->normal_points));
	bad |= json_object_set_new(o, "outcome",
	    json_string(site_outcome_name(a->outcome)));
	bad |= json_object_set_new(o, "operator", json_string(a->operator_name));
	bad |= json_object_set_new(o, "seeing_arcsec",
	    render_json_num(a->seeing_arcsec, 2));
	bad |= json_object_set_new(o, "notes", json_string(a->notes));
	bad |= json_object_set_new(o, "synodic_angle_deg",
	    render_json_num(a->synodic_deg, 4));
	bad |= json_object_set_new(o, "mean_elongation_deg",
	    render_json_num(a->mean_elong_deg, 4));
	bad |= json_object_set_new(o, "target_el_deg",
	    render_json_num(a->target_el_deg, 4));
	bad |= json_object_set_new(o, "sun_el_target_deg",
	    render_json_num(a->sun_el_target_deg, 4));
	if (bad) {
		json_decref(o);
		return NULL;
	}
	return o;
}

enum errcode
render_attempt_json(const struct site_attempt *a, struct mbuf *out)
{
	json_t *o = attempt_object(a);

	return o == NULL ? ERRCODE_NOMEM : render_json_dump(o, out);
}

enum errcode
render_attempts_json(const struct site_attempt *a, size_t n, struct mbuf *out)
{
	json_t *root = json_object(), *arr = json_array();
	int bad = root == NULL || arr == NULL;

	if (bad) {
		json_decref(root);
		json_decref(arr);
		return ERRCODE_NOMEM;
	}
	bad |= json_object_set_new(root, "attempts", arr);
	for (size_t i = 0; i < n && !bad; i++) {
		json_t *o = attempt_object(&a[i]);

		bad |= o == NULL || json_array_append_new(arr, o) != 0;
	}
	if (bad) {
		json_decref(root);
		return ERRCODE_NOMEM;
	}
	return render_json_dump(root, out);
}
