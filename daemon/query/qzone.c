/* SPDX-License-Identifier: BSD-3-Clause */
/* qzone.c: reading an IANA zone's offsets with the C library, once per
   query. */
#include <math.h>
#include <pthread.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>

#include "core/text.h"
#include "core/tscale.h"
#include "query/qzone.h"

#define QZONE_STEP_S (6 * 3600)	/* sampling step; offsets last longer */

static pthread_mutex_t qzone_lock = PTHREAD_MUTEX_INITIALIZER;

int
qzone_known(const char *name)
{
	char path[512];

	if (name == NULL || *name == '\0' || strlen(name) > 200 ||
	    strstr(name, "..") != NULL || name[0] == '/')
		return 0;
	if (strcmp(name, "UTC") == 0)
		return 1;
	snprintf(path, sizeof path, "/usr/share/zoneinfo/%s", name);
	return access(path, R_OK) == 0;
}

/* Offset and abbreviation at POSIX second t (TZ already set). */
static void
zone_at(long long t, long *offset, char *abbr, size_t len)
{
	time_t tt = (time_t)t;
	struct tm tm;
	long long local;

	localtime_r(&tt, &tm);
	local = tzone_days(tm.tm_year + 1900, tm.tm_mon + 1, tm.tm_mday) *
	    86400 + tm.tm_hour * 3600 + tm.tm_min * 60 + tm.tm_sec;
	*offset = (long)(local - t);
	if (strftime(abbr, len, "%Z", &tm) == 0)
		abbr[0] = '\0';
}

/* Append a span starting at t. */
static enum errcode
add_span(struct tzone *z, long long t, long offset, const char *abbr)
{
	struct tzone_span *s;

	if (z->n == TZONE_MAX_SPANS)
		return ERRCODE_TOO_LARGE;
	s = &z->span[z->n++];
	s->from_s = t;
	s->offset_s = offset;
	snprintf(s->abbr, sizeof s->abbr, "%s", abbr);
	return ERRCODE_OK;
}

static enum errcode
fill(struct tzone *z, long long t0, long long t1)
{
	char abbr[TZONE_ABBR_LEN], a2[TZONE_ABBR_LEN];
	long off, o2;
	enum errcode rc;

	zone_at(t0, &off, abbr, sizeof abbr);
	if ((rc = add_span(z, t0, off, abbr)) != ERRCODE_OK)
		return rc;
	for (long long t = t0; t < t1; t += QZONE_STEP_S) {
		long long lo = t, hi = t + QZONE_STEP_S > t1 ? t1 :
		    t + QZONE_STEP_S;

		zone_at(hi, &o2, a2, sizeof a2);
		if (o2 == off && strcmp(a2, abbr) == 0)
			continue;
		/* The first second of the new offset, by bisection. */
		while (hi - lo > 1) {
			long long mid = lo + (hi - lo) / 2;
			long om;
			char am[TZONE_ABBR_LEN];

			zone_at(mid, &om, am, sizeof am);
			if (om == off && strcmp(am, abbr) == 0)
				lo = mid;
			else
				hi = mid;
		}
		zone_at(hi, &off, abbr, sizeof abbr);
		if ((rc = add_span(z, hi, off, abbr)) != ERRCODE_OK)
			return rc;
		t = hi - QZONE_STEP_S > t ? hi - QZONE_STEP_S : t;
	}
	return ERRCODE_OK;
}

enum errcode
qzone_load(const char *name, double from_mjd, double to_mjd,
    struct tzone *out)
{
	long long t0, t1;
	char *old;
	enum errcode rc;

	memset(out, 0, sizeof *out);
	if (!qzone_known(name))
		return ERRCODE_NOT_FOUND;
	if (!isfinite(from_mjd) || !isfinite(to_mjd) || to_mjd < from_mjd)
		return ERRCODE_BAD_ARG;
	if (strcmp(name, "UTC") == 0) {
		tzone_utc(out);
		return ERRCODE_OK;
	}
	snprintf(out->name, sizeof out->name, "%s", name);
	t0 = llround(tscale_to_posix(TEXT_MJD0, from_mjd - 2.0));
	t1 = llround(tscale_to_posix(TEXT_MJD0, to_mjd + 2.0));
	out->first_s = t0;
	out->last_s = t1;
	pthread_mutex_lock(&qzone_lock);
	old = getenv("TZ");
	old = old != NULL ? strdup(old) : NULL;
	setenv("TZ", name, 1);
	tzset();
	rc = fill(out, t0, t1);
	if (old != NULL) {
		setenv("TZ", old, 1);
		free(old);
	} else {
		unsetenv("TZ");
	}
	tzset();
	pthread_mutex_unlock(&qzone_lock);
	if (rc != ERRCODE_OK)
		out->n = 0;
	return rc;
}

enum errcode
qzone_format(const char *name, double mjd, char *buf, size_t len)
{
	struct tzone z;
	enum errcode rc;

	if ((rc = qzone_load(name, mjd, mjd, &z)) != ERRCODE_OK)
		return rc;
	return tzone_format(&z, TEXT_MJD0, mjd, buf, len);
}
