/* SPDX-License-Identifier: BSD-3-Clause */
/* render_log.h: the observation log (attempts) as JSON, for the CLI and the API. */
#ifndef MOONRANGE_RENDER_LOG_H
#define MOONRANGE_RENDER_LOG_H

#include <stddef.h>

#include "errcode.h"
#include "mem.h"
#include "site.h"

/*
 * One attempt as a JSON object: id, target, start_utc, end_utc (ISO 8601,
 * milliseconds), shots, returns, normal_points, outcome, operator,
 * seeing_arcsec (null when not given), notes, and the angles computed at
 * the mid-time: synodic_angle_deg, mean_elongation_deg, target_el_deg,
 * sun_el_target_deg.  Appends to out; ERRCODE_OK or ERRCODE_NOMEM.
 */
enum errcode render_attempt_json(const struct site_attempt *a,
    struct mbuf *out);

/* {"attempts":[...]} in the given order. */
enum errcode render_attempts_json(const struct site_attempt *a, size_t n,
    struct mbuf *out);

#endif
