/* SPDX-License-Identifier: BSD-3-Clause */
/* attempt.c: the one validation of a logged attempt and its suspicion
   checks (rules in attempt.h). */
#include <math.h>
#include <string.h>

#include "core/attempt.h"
#include "core/text.h"

/* The length of an attempt in seconds, to the millisecond the store
   keeps (MJD differences carry ~1e-6 s of rounding). */
static double
duration_s(const struct site_attempt *a)
{
	return round((a->end_mjd - a->start_mjd) * 86400.0 * 1e3) / 1e3;
}

/* A rule broken: the member and one sentence naming it. */
static enum errcode
refuse(const char **field, const char *name, char *errbuf, size_t errlen,
    const char *why)
{
	if (field != NULL)
		*field = name;
	return text_err(ERRCODE_BAD_ARG, errbuf, errlen, "%s: %s", name, why);
}

enum errcode
attempt_check(const struct site_attempt *a, double fire_rate_hz,
    const char **field, char *errbuf, size_t errlen)
{
	char why[200];
	double days, max_shots;
	enum errcode e;

	if (field != NULL)
		*field = NULL;
	if (strnlen(a->target, sizeof a->target) == 0 ||
	    strnlen(a->target, sizeof a->target) == sizeof a->target)
		return refuse(field, "target", errbuf, errlen, "required, a "
		    "target id of 1 to 32 characters");
	if (!isfinite(a->start_mjd) || a->start_mjd < ATTEMPT_MJD_MIN ||
	    a->start_mjd >= ATTEMPT_MJD_MAX)
		return (void)refuse(field, "start_utc", errbuf, errlen,
		    "outside 1960-01-01 to 2100-01-01, the span the geometry "
		    "covers"), ERRCODE_BAD_TIME;
	if (!isfinite(a->end_mjd) || !(a->end_mjd > a->start_mjd))
		return refuse(field, "end_utc", errbuf, errlen, "must be after "
		    "start_utc");
	days = a->end_mjd - a->start_mjd;
	if (days > ATTEMPT_MAX_DAYS)
		return refuse(field, "end_utc", errbuf, errlen, "an attempt "
		    "lasts at most one day");
	if (a->end_mjd > ATTEMPT_MJD_MAX)
		return (void)refuse(field, "end_utc", errbuf, errlen,
		    "outside 1960-01-01 to 2100-01-01, the span the geometry "
		    "covers"), ERRCODE_BAD_TIME;
	if (a->shots < 0)
		return refuse(field, "shots", errbuf, errlen, "a whole number "
		    ">= 0");
	if (a->returns < 0)
		return refuse(field, "returns", errbuf, errlen, "a whole number "
		    ">= 0");
	if (a->normal_points < 0)
		return refuse(field, "normal_points", errbuf, errlen, "a whole "
		    "number >= 0");
	if (a->normal_points > a->returns) {
		text_err(ERRCODE_BAD_ARG, why, sizeof why, "%ld normal points "
		    "from %ld returns: each needs at least one return",
		    a->normal_points, a->returns);
		return refuse(field, "normal_points", errbuf, errlen, why);
	}
	if ((double)a->returns > (double)ATTEMPT_RETURNS_PER_SHOT *
	    (double)a->shots) {
		text_err(ERRCODE_BAD_ARG, why, sizeof why, "%ld returns from "
		    "%ld shots: at most %d per shot", a->returns, a->shots,
		    ATTEMPT_RETURNS_PER_SHOT);
		return refuse(field, "returns", errbuf, errlen, why);
	}
	if (isfinite(fire_rate_hz) && fire_rate_hz > 0.0) {
		max_shots = fire_rate_hz * duration_s(a) *
		    ATTEMPT_RATE_MARGIN + ATTEMPT_SHOTS_SLACK;
		if ((double)a->shots > max_shots) {
			text_err(ERRCODE_BAD_ARG, why, sizeof why, "%ld shots "
			    "in %.0f s: more than the station's %g Hz allows "
			    "(at most %.0f)", a->shots, duration_s(a),
			    fire_rate_hz, floor(max_shots));
			return refuse(field, "shots", errbuf, errlen, why);
		}
	}
	switch (a->outcome) {
	case SITE_OUTCOME_RANGED:
		if (a->shots == 0 || a->returns == 0)
			return refuse(field, "outcome", errbuf, errlen, "ranged "
			    "needs shots > 0 and returns > 0");
		break;
	case SITE_OUTCOME_NO_RETURNS:
		if (a->shots == 0 || a->returns > ATTEMPT_NOISE_MAX ||
		    a->normal_points != 0)
			return refuse(field, "outcome", errbuf, errlen,
			    "no_returns needs shots > 0, normal_points 0 and "
			    "at most " ATTEMPT_STR(ATTEMPT_NOISE_MAX)
			    " returns (noise)");
		break;
	case SITE_OUTCOME_WEATHER:
	case SITE_OUTCOME_TECHNICAL:
	case SITE_OUTCOME_SAFETY:
	case SITE_OUTCOME_OTHER:
		break;
	case SITE_OUTCOME__COUNT:
	default:
		return refuse(field, "outcome", errbuf, errlen, "one of ranged, "
		    "no_returns, weather, technical, safety, other");
	}
	if ((e = text_field_check("operator", a->operator_name,
	    sizeof a->operator_name, 0, errbuf, errlen))) {
		if (field != NULL)
			*field = "operator";
		return e;
	}
	if ((e = text_field_check("notes", a->notes, sizeof a->notes, 1,
	    errbuf, errlen))) {
		if (field != NULL)
			*field = "notes";
		return e;
	}
	if (!isnan(a->seeing_arcsec) && !(a->seeing_arcsec >=
	    ATTEMPT_SEEING_MIN && a->seeing_arcsec <= ATTEMPT_SEEING_MAX))
		return refuse(field, "seeing_arcsec", errbuf, errlen, "a number "
		    "of arcseconds from 0.01 to 60, or empty");
	return ERRCODE_OK;
}

unsigned
attempt_suspect(const struct site_attempt *a, double fire_rate_hz,
    char *warn, size_t warnlen)
{
	unsigned bits = 0;
	double secs = duration_s(a);
	int fired = a->outcome == SITE_OUTCOME_RANGED ||
	    a->outcome == SITE_OUTCOME_NO_RETURNS;

	if (isfinite(a->target_el_deg) && a->target_el_deg < 0.0)
		bits |= ATTEMPT_SUSPECT_BELOW_HORIZON;
	if (fired && isfinite(fire_rate_hz) && fire_rate_hz > 0.0 &&
	    secs > 0.0 && (double)a->shots < ATTEMPT_LOW_RATE * fire_rate_hz *
	    secs)
		bits |= ATTEMPT_SUSPECT_LOW_RATE;
	attempt_warning(bits, warn, warnlen);
	return bits;
}

const char *
attempt_warning(unsigned bits, char *warn, size_t warnlen)
{
	if (warn == NULL || warnlen == 0)
		return "";
	warn[0] = '\0';
	if ((bits & ATTEMPT_SUSPECT_ALL) == 0)
		return warn;
	text_err(ERRCODE_OK, warn, warnlen, "stored, but left out of the "
	    "yield model: %s%s%s",
	    (bits & ATTEMPT_SUSPECT_BELOW_HORIZON) ? "the target was below "
	    "the horizon at mid-time (local time typed with Z?)" : "",
	    (bits & ATTEMPT_SUSPECT_ALL) == ATTEMPT_SUSPECT_ALL ? "; " : "",
	    (bits & ATTEMPT_SUSPECT_LOW_RATE) ? "fewer than a tenth of the "
	    "shots the station's rate gives over the attempt" : "");
	return warn;
}
