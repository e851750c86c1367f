/* SPDX-License-Identifier: BSD-3-Clause */
/* site.h: the station's data model, shared by the importers, the store,
   the planner and the renderers. */
#ifndef MOONRANGE_SITE_H
#define MOONRANGE_SITE_H

#include <stddef.h>

/*
 * Plain records with fixed-size text fields, so that they can be copied,
 * held in caller-owned arrays and passed to the pure core without any
 * ownership rules.  Times are UTC modified Julian Dates (UTC quasi-JD
 * minus 2400000.5: the precision of a double is ~1 us); the store keeps
 * them as ISO 8601 text beside the number.  Angles are degrees, as the
 * files and the database hold them.  A value that is absent is NaN.
 */

#define SITE_ID_LEN 33		/* target id: 1-32 of [A-Za-z0-9_.-] */
#define SITE_NAME_LEN 96
#define SITE_CODE_LEN 16
#define SITE_TZ_LEN 64
#define SITE_NOTES_LEN 512
#define SITE_OUTCOME_LEN 16

struct site_station {
	char name[SITE_NAME_LEN];
	char code[SITE_CODE_LEN];	/* station code used in CRD files */
	double lat_deg, lon_deg;	/* WGS84 geodetic, east + */
	double height_m;		/* above the ellipsoid */
	char time_zone[SITE_TZ_LEN];	/* IANA name, e.g. "America/Denver" */
	/* planning limits */
	double min_el_deg;		/* target elevation >= this */
	double max_sun_el_deg;		/* Sun at the station <= this */
	double min_sun_sep_deg;		/* Sun-Moon separation >= this */
	/* weather defaults (refraction) and the laser */
	double pressure_hpa, temperature_c, humidity;
	double wavelength_nm;
	double zenith_tau;		/* zenith optical depth at the laser
					   wavelength (one way) */
	double fire_rate_hz;		/* shots per second */
};

struct site_target {
	char id[SITE_ID_LEN];		/* short id used everywhere */
	char name[SITE_NAME_LEN];	/* human name */
	char alias[SITE_NAME_LEN];	/* name used in CRD files ("" none) */
	double lat_deg, lon_deg;	/* selenographic, east + */
	double height_m;		/* above 1737.4 km */
	double strength;		/* relative return strength, > 0 */
	int dark_only;			/* plan only when the target is dark */
	int active;			/* 0 = retired */
};

struct site_blackout {
	long id;			/* store row id, 0 before insert */
	double start_mjd, end_mjd;	/* UTC, end > start */
	char reason[SITE_NAME_LEN];
};

/* Outcome of an attempt (the log's closed vocabulary). */
enum site_outcome {
	SITE_OUTCOME_RANGED = 0,
	SITE_OUTCOME_NO_RETURNS,
	SITE_OUTCOME_WEATHER,
	SITE_OUTCOME_TECHNICAL,
	SITE_OUTCOME_SAFETY,
	SITE_OUTCOME_OTHER,
	SITE_OUTCOME__COUNT
};

struct site_attempt {
	long id;			/* store row id, 0 before insert */
	char target[SITE_ID_LEN];
	double start_mjd, end_mjd;	/* UTC */
	long shots;			/* fired, >= 0 */
	long returns;			/* return photons detected, >= 0 */
	long normal_points;		/* formed, >= 0 */
	enum site_outcome outcome;
	char operator_name[SITE_NAME_LEN];
	double seeing_arcsec;		/* NaN when not given */
	char notes[SITE_NOTES_LEN];
	/* computed at the mid-time by the geometry core on insert */
	double synodic_deg, mean_elong_deg;
	double target_el_deg, sun_el_target_deg;
	unsigned suspect;		/* ATTEMPT_SUSPECT_* bits (attempt.h):
					   stored, left out of the yield */
};

struct site_normal_point {
	long id;
	char target[SITE_ID_LEN];	/* our target id (mapped via alias) */
	char station_code[SITE_CODE_LEN]; /* station of the file */
	double epoch_mjd;		/* UTC */
	double tof_s;			/* two-way time of flight */
	long photons;			/* returns in the bin */
	double rms_ps;			/* bin RMS, picoseconds */
	double synodic_deg, mean_elong_deg; /* computed at the epoch; */
	/* target_el_deg is NaN for points of another station */
	double target_el_deg, sun_el_target_deg;
};

struct site_eop_row {
	double mjd;			/* UTC day, 0h */
	double dut1_s;			/* UT1-UTC */
	double xp_arcsec, yp_arcsec;	/* polar motion */
};

/* Names of the outcome values as stored and accepted on input. */
const char *site_outcome_name(enum site_outcome o);
/* Parse an outcome name; returns -1 for an unknown one. */
int site_outcome_parse(const char *s);

#endif
