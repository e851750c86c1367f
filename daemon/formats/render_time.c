/* SPDX-License-Identifier: BSD-3-Clause */
/* render_time.c: times as text for the renderers: UTC of a TT date, and
   local civil time in an IANA zone. */
#include <math.h>
#include <pthread.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>

#include "core/text.h"
#include "core/tscale.h"
#include "formats/render_time.h"

static pthread_mutex_t tz_lock = PTHREAD_MUTEX_INITIALIZER;

int
render_zone_known(const char *tz)
{
	char path[512];

	if (tz == NULL || *tz == '\0' || strlen(tz) > 200 ||
	    strstr(tz, "..") != NULL || tz[0] == '/')
		return 0;
	if (strcmp(tz, "UTC") == 0)
		return 1;
	snprintf(path, sizeof path, "/usr/share/zoneinfo/%s", tz);
	return access(path, R_OK) == 0;
}

enum errcode
render_local_time(double utc1, double utc2, const char *tz, char *buf,
    size_t len)
{
	time_t t;
	struct tm tm;
	char *old;
	size_t n;

	if (!render_zone_known(tz))
		return ERRCODE_NOT_FOUND;
	t = (time_t)llround(tscale_to_posix(utc1, utc2));
	pthread_mutex_lock(&tz_lock);
	old = getenv("TZ");
	old = old != NULL ? strdup(old) : NULL;
	setenv("TZ", tz, 1);
	tzset();
	localtime_r(&t, &tm);
	n = strftime(buf, len, "%Y-%m-%d %H:%M %Z", &tm);
	if (old != NULL) {
		setenv("TZ", old, 1);
		free(old);
	} else {
		unsetenv("TZ");
	}
	tzset();
	pthread_mutex_unlock(&tz_lock);
	return n > 0 ? ERRCODE_OK : ERRCODE_BAD_ARG;
}

void
render_utc_text(double mjd, int ndp, char *buf, size_t len)
{
	if (!isfinite(mjd) ||
	    tscale_format_utc(TEXT_MJD0, mjd, ndp, buf, len) != ERRCODE_OK)
		snprintf(buf, len, "?");
}

void
render_tt_iso(double tt1, double tt2, char *buf, size_t len)
{
	struct tscale_instant t;

	if (tscale_from_tt(tt1, tt2, 0.0, &t) != ERRCODE_OK ||
	    tscale_format_utc(t.utc1, t.utc2, 0, buf, len) != ERRCODE_OK)
		snprintf(buf, len, "?");
}
