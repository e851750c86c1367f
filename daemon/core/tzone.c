/* SPDX-License-Identifier: BSD-3-Clause */
/* tzone.c: local civil time from a table of UTC offsets. */
#include <math.h>
#include <stdio.h>

#include "core/tscale.h"
#include "core/tzone.h"

void
tzone_civil(long long days, int *year, int *month, int *day)
{
	long long z = days + 719468, era, doe, yoe, y, doy, mp, d, m;

	era = (z >= 0 ? z : z - 146096) / 146097;
	doe = z - era * 146097;
	yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365;
	y = yoe + era * 400;
	doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
	mp = (5 * doy + 2) / 153;
	d = doy - (153 * mp + 2) / 5 + 1;
	m = mp < 10 ? mp + 3 : mp - 9;
	*year = (int)(y + (m <= 2));
	*month = (int)m;
	*day = (int)d;
}

long long
tzone_days(int year, int month, int day)
{
	long long y = year - (month <= 2), era, yoe, doy, doe;

	era = (y >= 0 ? y : y - 399) / 400;
	yoe = y - era * 400;
	doy = (153 * (month > 2 ? month - 3 : month + 9) + 2) / 5 + day - 1;
	doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
	return era * 146097 + doe - 719468;
}

void
tzone_utc(struct tzone *z)
{
	z->name[0] = '\0';
	(void)snprintf(z->name, sizeof z->name, "UTC");
	z->first_s = -(1LL << 52);
	z->last_s = 1LL << 52;
	z->n = 1;
	z->span[0].from_s = z->first_s;
	z->span[0].offset_s = 0;
	(void)snprintf(z->span[0].abbr, sizeof z->span[0].abbr, "UTC");
}

enum errcode
tzone_local(const struct tzone *z, double utc1, double utc2,
    struct tzone_parts *out)
{
	double p = tscale_to_posix(utc1, utc2);
	long long t, local, days, sod;
	size_t lo, hi;

	if (z == NULL || z->n == 0 || !isfinite(p))
		return ERRCODE_NOT_FOUND;
	t = llround(p);
	if (t < z->first_s || t > z->last_s)
		return ERRCODE_NOT_FOUND;
	/* The last span starting at or before t. */
	lo = 0;
	hi = z->n;
	while (hi - lo > 1) {
		size_t mid = lo + (hi - lo) / 2;

		if (z->span[mid].from_s <= t)
			lo = mid;
		else
			hi = mid;
	}
	local = t + z->span[lo].offset_s;
	days = local >= 0 ? local / 86400 : -((-local + 86399) / 86400);
	sod = local - days * 86400;
	tzone_civil(days, &out->year, &out->month, &out->day);
	out->hour = (int)(sod / 3600);
	out->minute = (int)(sod % 3600 / 60);
	out->second = (int)(sod % 60);
	out->abbr = z->span[lo].abbr;
	return ERRCODE_OK;
}

enum errcode
tzone_format(const struct tzone *z, double utc1, double utc2, char *buf,
    size_t len)
{
	struct tzone_parts lp;
	enum errcode rc;
	int n;

	if ((rc = tzone_local(z, utc1, utc2, &lp)) != ERRCODE_OK)
		return rc;
	n = snprintf(buf, len, "%04d-%02d-%02d %02d:%02d %s", lp.year,
	    lp.month, lp.day, lp.hour, lp.minute, lp.abbr);
	return n > 0 && (size_t)n < len ? ERRCODE_OK : ERRCODE_BAD_ARG;
}
