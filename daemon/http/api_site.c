/* SPDX-License-Identifier: BSD-3-Clause */
/* api_site.c: the handlers of the station and the sky now: status, site,
   targets, now. */
#include <math.h>
#include <pthread.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include <erfam.h>
#include <jansson.h>

#include "http/api.h"
#include "http/api_int.h"
#include "core/text.h"
#include "query/winquery.h"
#include "query/covquery.h"
#include "core/array.h"
#include "core/derive.h"
#include "core/eop.h"
#include "core/geom.h"
#include "core/plan.h"
#include "store/plan_db.h"
#include "formats/render_json.h"
#include "formats/render_ephem.h"
#include "formats/render_site.h"
#include "store/store.h"
#include "core/tscale.h"

/* --- handlers --- */

void
api_h_status(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	json_t *root = json_object(), *o;
	const struct api_site *s = &ctx->site;
	double now_mjd = (req->now1 - ERFA_DJM0) + req->now2;
	double up = tscale_to_posix(req->now1, req->now2) - ctx->start_posix;
	double su1, su2;
	size_t active = 0;
	int bad = root == NULL;

	if (bad)
		goto out;
	for (size_t i = 0; i < s->ntargets; i++)
		active += s->targets[i].active != 0;
	if (tscale_from_posix(ctx->start_posix, &su1, &su2) != ERRCODE_OK)
		su1 = su2 = NAN;
	bad |= json_object_set_new(root, "version",
	    json_string(MOONRANGE_VERSION));
	bad |= json_object_set_new(root, "api", json_string("v1"));
	bad |= json_object_set_new(root, "now_utc",
	    render_json_utc(req->now1, req->now2, 0));
	bad |= json_object_set_new(root, "started_utc", render_json_utc(su1,
	    su2, 0));
	bad |= json_object_set_new(root, "uptime_s",
	    json_integer((json_int_t)(up > 0 ? floor(up) : 0)));
	bad |= json_object_set_new(root, "database",
	    ctx->db_path ? json_string(ctx->db_path) : json_null());
	bad |= json_object_set_new(root, "station",
	    s->station.name[0] ? json_string(s->station.name) : json_null());
	bad |= json_object_set_new(root, "targets_active",
	    json_integer((json_int_t)active));
	bad |= json_object_set_new(root, "writes_enabled",
	    json_boolean(ctx->token_len > 0 && !ctx->db_read_only));
	bad |= json_object_set_new(root, "token_file",
	    ctx->token_file ? json_string(ctx->token_file) : json_null());

	o = json_object();
	bad |= json_object_set_new(root, "plan", o);
	if (o != NULL) {
		bad |= json_object_set_new(o, "last_utc", ctx->planned ?
		    render_json_utc(ctx->plan_utc1,
		    ctx->plan_utc2, 0) : json_null());
		bad |= json_object_set_new(o, "refresh_s",
		    render_json_num(ctx->refresh_s, 0));
		bad |= json_object_set_new(o, "days", ctx->planned ?
		    render_json_num(ctx->plan_days_used, 3) : json_null());
		bad |= json_object_set_new(o, "windows", ctx->planned ?
		    json_integer((json_int_t)ctx->plan_nwindows) : json_null());
	}

	o = json_object();
	bad |= json_object_set_new(root, "eop", o);
	if (o != NULL) {
		int covers = s->neop > 0 && now_mjd >= s->eop[0].mjd &&
		    now_mjd <= s->eop[s->neop - 1].mjd;

		bad |= json_object_set_new(o, "rows",
		    json_integer((json_int_t)s->neop));
		bad |= json_object_set_new(o, "first_utc", s->neop ?
		    render_json_mjd(s->eop[0].mjd, 0) : json_null());
		bad |= json_object_set_new(o, "last_utc", s->neop ?
		    render_json_mjd(s->eop[s->neop - 1].mjd, 0) :
		    json_null());
		bad |= json_object_set_new(o, "covers_now",
		    json_boolean(covers));
	}
out:
	api_json_reply(resp, root, bad);
}

/* The station and the targets: the renderers of "station show --json"
   and "target list --json". */
void
api_h_site(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	enum errcode rc;

	(void)req;
	if (!api_site_loaded(ctx, resp))
		return;
	rc = render_site_station_json(&ctx->site.station, &resp->body);
	api_ok_or_error(resp, rc, 200, "application/json");
}

void
api_h_targets(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	enum errcode rc;

	(void)req;
	rc = render_site_targets_json(ctx->site.targets, ctx->site.ntargets,
	    &resp->body);
	api_ok_or_error(resp, rc, 200, "application/json");
}

struct api_now_site *
api_now_site_make(const struct api_site *s)
{
	struct api_now_site *n = mem_calloc(1, sizeof *n);
	size_t k = 0;

	if (n == NULL)
		return NULL;
	atomic_init(&n->refs, 1);
	n->station = s->station;
	n->site_ok = derive_site(&s->station, &n->site) == ERRCODE_OK;
	n->targets = mem_calloc(s->ntargets + 1, sizeof *n->targets);
	n->gt = mem_calloc(s->ntargets + 1, sizeof *n->gt);
	n->eop = mem_calloc(s->neop + 1, sizeof *n->eop);
	if (n->targets == NULL || n->gt == NULL || n->eop == NULL) {
		api_now_site_put(n);
		return NULL;
	}
	for (size_t i = 0; i < s->ntargets; i++) {
		const struct site_target *t = &s->targets[i];

		if (!t->active || geom_target_from_selen(t->lat_deg * ERFA_DD2R,
		    t->lon_deg * ERFA_DD2R, t->height_m, &n->gt[k]) !=
		    ERRCODE_OK)
			continue;
		n->targets[k++] = *t;
	}
	n->ntargets = k;
	if (s->neop > 0)
		memcpy(n->eop, s->eop, s->neop * sizeof *s->eop);
	n->neop = s->neop;
	/* The table's last day, as "ephem --db" reports it. */
	if (s->neop == 0 || tscale_format_utc(ERFA_DJM0,
	    s->eop[s->neop - 1].mjd, 0, n->eop_last, sizeof n->eop_last))
		n->eop_last[0] = '\0';
	n->eop_last[10] = '\0';
	return n;
}

void
api_now_site_put(struct api_now_site *n)
{
	if (n == NULL || atomic_fetch_sub(&n->refs, 1) != 1)
		return;
	mem_free(n->targets);
	mem_free(n->gt);
	mem_free(n->eop);
	mem_free(n);
}

/* GET /api/v1/now: as "ephem --db --json", from the site's snapshot
   without holding the context's lock while it computes. */
void
api_h_now(struct api_ctx *ctx, const struct api_request *req,
    struct api_response *resp)
{
	struct api_now_site *ns;
	struct render_target_row *rows = NULL;
	struct geom_eop eop = {0.0, 0.0, 0.0};
	struct geom_instant g;
	struct render_ephem rep;
	enum eop_source src;
	double u1 = req->now1, u2 = req->now2;
	enum errcode rc;

	pthread_mutex_lock(&ctx->lock);
	ns = ctx->now_site;
	if (ns != NULL)
		atomic_fetch_add(&ns->refs, 1);
	else if (api_site_loaded(ctx, resp))
		api_error(resp, ERRCODE_NOMEM, NULL, NULL);
	pthread_mutex_unlock(&ctx->lock);
	if (ns == NULL)
		return;
	if (ns->station.name[0] == '\0') {
		api_error(resp, ERRCODE_CONFIG, NULL,
		    "the daemon has no station loaded");
		goto done;
	}
	if (api_param(req, "at") && api_param_time(req, "at", &u1, &u2, resp))
		goto done;
	if (!ns->site_ok) {
		api_error(resp, ERRCODE_CONFIG, NULL,
		    "the station's position is out of range");
		goto done;
	}
	src = eop_lookup_rows(ns->eop, ns->neop, (u1 - TEXT_MJD0) + u2, &eop);
	rows = mem_calloc(ns->ntargets + 1, sizeof *rows);
	if (rows == NULL) {
		rc = ERRCODE_NOMEM;
		goto out;
	}
	rc = geom_instant_at(&ns->site, &eop, u1, u2, GEOM_PREC_FULL, &g);
	if (rc != ERRCODE_OK) {
		api_error(resp, rc, "at",
		    "at: the instant cannot be converted");
		goto done;
	}
	for (size_t i = 0; i < ns->ntargets; i++) {
		rows[i].id = ns->targets[i].id;
		geom_target_view(&g, &ns->gt[i], &rows[i].view);
		array_of_target(&g, &ns->gt[i], &ns->targets[i],
		    &rows[i].tilt, &rows[i].spread_ps);
	}
	memset(&rep, 0, sizeof rep);
	rep.g = &g;
	rep.targets = rows;
	rep.ntargets = ns->ntargets;
	rep.dut1_source = eop_source_name(src);
	rep.eop_last_utc = ns->eop_last[0] ? ns->eop_last : NULL;
	rep.station_name = ns->station.name;
	rc = render_ephem_json(&rep, &resp->body);
out:
	api_ok_or_error(resp, rc, 200, "application/json");
done:
	mem_free(rows);
	api_now_site_put(ns);
}
