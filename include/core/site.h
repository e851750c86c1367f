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
	/* the link budget (core/link.h); NaN or <= 0: the documented
	   default (site_station_link) */
	double pulse_energy_mj;		/* laser pulse energy */
	double aperture_m;		/* receive telescope diameter */
	double transmit_eff, receive_eff; /* optics efficiencies, 0..1 */
	double detector_qe;		/* detector quantum efficiency */
	double seeing_arcsec;		/* typical seeing, FWHM */
	double jitter_ps;		/* single-photon timing jitter (RMS);
					   NaN: not set */
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
	/* reflector physics; <= 0 or NaN: the documented default
	   (site_target_link, site_target_array) */
	long cube_count;		/* corner cubes; 1 = a single reflector */
	double cube_aperture_mm;	/* aperture of each (or of the one) */
	double normal_lat_deg, normal_lon_deg; /* array normal, selenographic
					   direction; NaN: +x (0, 0) */
	double extent_m;		/* panel extent along its face */
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
	double range_km;		/* station to target; NaN if unknown */
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

/* Documented defaults of the reflector fields (README "Link budget"):
   100 cubes of 38 mm, normal +x, extent 0.5 m (a single reflector,
   cube_count 1, has no extent: it does not spread the pulse). */
#define SITE_DEFAULT_CUBES 100
#define SITE_DEFAULT_CUBE_MM 38.0
#define SITE_DEFAULT_EXTENT_M 0.5

/* A new target record: zeroed, strength 1, active, physics defaults. */
void site_target_init(struct site_target *t);

/* The resolved array of a target: normal (selenographic, deg) and extent
   (m; 0 for a single reflector). */
void site_target_array(const struct site_target *t, double *normal_lat_deg,
    double *normal_lon_deg, double *extent_m);

struct link_station;
struct link_target;
/* The link-budget view of a station and of a target (defaults filled). */
void site_station_link(const struct site_station *st,
    struct link_station *out);
void site_target_link(const struct site_target *t, struct link_target *out);

/* Names of the outcome values as stored and accepted on input. */
const char *site_outcome_name(enum site_outcome o);
/* Parse an outcome name; returns -1 for an unknown one. */
int site_outcome_parse(const char *s);

#endif
