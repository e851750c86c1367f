/* SPDX-License-Identifier: BSD-3-Clause */
/* site.c: names of the closed vocabularies of the data model. */
#include <string.h>

#include "core/site.h"

const char *
site_outcome_name(enum site_outcome o)
{
	switch (o) {
	case SITE_OUTCOME_RANGED:
		return "ranged";
	case SITE_OUTCOME_NO_RETURNS:
		return "no_returns";
	case SITE_OUTCOME_WEATHER:
		return "weather";
	case SITE_OUTCOME_TECHNICAL:
		return "technical";
	case SITE_OUTCOME_SAFETY:
		return "safety";
	case SITE_OUTCOME_OTHER:
		return "other";
	case SITE_OUTCOME__COUNT:
		break;
	}
	return "other";
}

int
site_outcome_parse(const char *s)
{
	for (int i = 0; i < SITE_OUTCOME__COUNT; i++)
		if (s != NULL && strcmp(s, site_outcome_name(i)) == 0)
			return i;
	return -1;
}
