/* SPDX-License-Identifier: BSD-3-Clause */
/* geom.h: topocentric geometry of the Moon, the Sun and lunar targets. */
#ifndef MOONRANGE_GEOM_H
#define MOONRANGE_GEOM_H

#include <stddef.h>

#include "core/eclipse.h"
#include "core/errcode.h"
#include "core/tscale.h"

/*
 * The pure geometry core.  Angles are radians, distances metres, times
 * two-part JDs, unless a name says otherwise.  Nothing here allocates,
 * reads a clock or does I/O.
 *
 * Work is split by what it depends on, so that callers evaluating many
 * instants or many targets do each part once:
 *
 *   geom_site_init      station only          (once per station)
 *   geom_bodies_at      TT only               (Moon, Sun, synodic angle)
 *   geom_earth_at       TT, UT1, polar motion (Earth orientation)
 *   geom_instant_make   the three above       (everything shared by targets)
 *   geom_target_view    one instant, one target
 *
 * geom_instant_at() chains the first four for a single UTC instant.
 */

#define GEOM_MOON_RADIUS 1737400.0	/* IAU mean radius, m */
#define GEOM_C 299792458.0		/* speed of light, m/s */

/* --- station --- */

/* Weather for refraction. */
struct geom_weather {
	double pressure_hpa;	/* at the station, hPa */
	double temperature_c;	/* ambient, deg C */
	double humidity;	/* relative, 0..1 */
	double wavelength_um;	/* laser wavelength, micrometres */
};

struct geom_site {
	double lat;		/* WGS84 geodetic latitude, rad, north + */
	double lon;		/* longitude, rad, east + */
	double height;		/* above the WGS84 ellipsoid, m */
	struct geom_weather wx;	/* for apparent elevation */
	/* Filled by geom_site_init: */
	double itrs[3];		/* ITRS position, m */
	double enu[3][3];	/* rows: east, north, up unit vectors (ITRS) */
	double refa, refb;	/* eraRefco constants for wx, rad */
};

/*
 * Standard weather at a height: pressure from an isothermal atmosphere
 * (ERFA atco13 note 4), 15 C less 6.5 C per km, 50 % humidity, 532 nm.
 */
void geom_weather_standard(double height_m, struct geom_weather *wx);

/*
 * Initialise a station.
 *
 * Given:
 *   lat_rad, lon_rad  double  WGS84 geodetic latitude and east longitude
 *   height_m          double  height above the ellipsoid
 *   wx                weather for refraction, or NULL for standard weather
 * Returned:
 *   site              ITRS position, local east/north/up axes, refraction
 *                     constants
 * Returned (function value):
 *   ERRCODE_OK, or ERRCODE_BAD_ARG for a value out of range
 * Notes:
 *   eraRefco is accurate to about 1" above 15 deg elevation and degrades
 *   towards the horizon; the caller is expected to plan above ~10 deg.
 * Called:
 *   eraGd2gc, eraRefco, eraAnpm
 */
enum errcode geom_site_init(struct geom_site *site, double lat_rad,
    double lon_rad, double height_m, const struct geom_weather *wx);

/* --- Earth orientation --- */

struct geom_eop {
	double dut1;		/* UT1-UTC, s */
	double xp, yp;		/* polar motion, rad */
};

enum geom_precision {
	GEOM_PREC_FULL,		/* IAU 2006/2000A (eraPnm06a, eraGst06) */
	GEOM_PREC_FAST		/* IAU 2000B (eraPnm00b, eraGst00b): < 1 mas
				   from FULL over 1995-2050 */
};

struct geom_earth {
	double rbpn[3][3];	/* GCRS -> true equator and equinox of date */
	double rc2t[3][3];	/* GCRS -> ITRS */
};

/*
 * Earth orientation.
 *
 * Given:
 *   tt1,tt2   double  TT JD
 *   ut11,ut12 double  UT1 JD
 *   eop       polar motion xp, yp (rad); NULL for zero
 *   prec      FULL (IAU 2006/2000A) or FAST (IAU 2000B)
 * Returned:
 *   out       GCRS->true-of-date and GCRS->ITRS matrices
 * Notes:
 *   Equinox-based chain: NPB matrix, Greenwich apparent sidereal time
 *   consistent with it (eraGst06), polar motion with s'.  The FAST choice
 *   differs from FULL by about 1 mas over 1995-2050 (IERS Conventions
 *   2010, 5.5.1), far below the Moon theory's error.
 * References:
 *   IERS Conventions (2010), chapter 5.
 * Called:
 *   eraPnm06a, eraPnm00b, eraGst06, eraSp00, eraPom00, eraC2teqx
 */
void geom_earth_at(double tt1, double tt2, double ut11, double ut12,
    const struct geom_eop *eop, enum geom_precision prec,
    struct geom_earth *out);

/* --- bodies (geocentric, depend on TT only) --- */

struct geom_bodies {
	double tt1, tt2;	/* TT of validity */
	double moon_p[3];	/* Moon, GCRS, geometric, m */
	double moon_v[3];	/* its velocity, m/s */
	double sun_p[3];	/* Sun, GCRS, apparent (annual aberration), m */
	double synodic;		/* apparent ecliptic longitude Moon - Sun,
				   0..2pi, rad */
	double mean_elong;	/* Delaunay D (IERS 2003), 0..2pi, rad */
};

/*
 * Geocentric Moon and Sun.
 *
 * Given:
 *   tt1,tt2  double  TT JD (TDB taken equal)
 * Returned:
 *   out      Moon position and velocity (geometric GCRS, m, m/s), Sun
 *            (apparent GCRS, m), synodic angle and Delaunay D (rad)
 * Returned (function value):
 *   ERRCODE_OK
 * Notes:
 *   1. Moon: eraMoon98, Meeus's truncation of ELP-2000/82; ERFA quotes
 *      2.9" RMS (18.3" worst) in direction and 6.1 km RMS in distance
 *      over 1950-2100 against ELP/MPP02.
 *   2. Sun: minus ERFA's heliocentric Earth (eraEpv00, VSOP2000 fit,
 *      1900-2100), with annual aberration (eraAb) so that it is the
 *      apparent place; light deflection is nil at the Sun itself.
 *   3. Synodic angle: geom_synodic_of on the Moon and Sun just computed
 *      (each theory is evaluated once).
 *   4. D: IERS Conventions (2003) fundamental argument (eraFad03).
 * References:
 *   Meeus, Astronomical Algorithms, 2nd ed. (1998), ch. 47 and 49;
 *   IERS Conventions (2003), 5.7.
 * Called:
 *   eraMoon98, eraEpv00, eraAb, geom_synodic_of, eraFad03, eraAnp, eraPdp,
 *   eraPn, eraSxp
 */
enum errcode geom_bodies_at(double tt1, double tt2, struct geom_bodies *out);

/*
 * Synodic angle only, at TT (geom_bodies_at, then its synodic field).
 * Returns radians in 0..2pi.
 */
double geom_synodic_at(double tt1, double tt2);

/*
 * Synodic angle of given bodies.
 *
 * Given:
 *   tt1,tt2  double     TT JD of the bodies
 *   moon_p   double[3]  geocentric Moon, GCRS, geometric, m
 *   moon_v   double[3]  its velocity, m/s
 *   sun_p    double[3]  apparent geocentric Sun, GCRS, m
 * Returned (function value):
 *   apparent ecliptic longitude of the Moon (1.3 s of light time) minus
 *   that of the Sun, on the ecliptic of date, 0..2pi rad
 * Notes:
 *   Nutation in longitude cancels in the difference, so the mean
 *   ecliptic and equinox of date (eraEcm06) serve.
 * Called:
 *   eraEcm06, eraRxp, eraC2s, eraAnp
 */
double geom_synodic_of(double tt1, double tt2, const double moon_p[3],
    const double moon_v[3], const double sun_p[3]);

/*
 * Orientation of the Moon (IAU WGCCRE 2009).
 *
 * Given:
 *   tt1,tt2  double  TT JD
 * Returned:
 *   ang      right ascension and declination of the lunar pole and the
 *            prime meridian angle W (not wrapped, so it is smooth in
 *            time), GCRS, rad
 * Notes:
 *   The model's periodic terms E1..E13; its body-fixed frame
 *   approximates the mean-Earth/polar-axis frame to about 150 m on the
 *   surface.
 * References:
 *   Archinal et al. (2011), Celest. Mech. Dyn. Astr. 109, 101, table 2.
 */
void geom_lunar_angles(double tt1, double tt2, double ang[3]);

/*
 * GCRS -> lunar body-fixed rotation from geom_lunar_angles' angles.
 *
 * Called:
 *   eraIr, eraRz, eraRx
 */
void geom_lunar_matrix(const double ang[3], double r[3][3]);

/* --- the instant --- */

struct geom_moon_view {
	double az, el;		/* topocentric, az from north through east;
				   el geometric (airless) */
	double el_apparent;	/* refracted with the site's weather */
	double ha;		/* local hour angle, -pi..pi, west + */
	double ra, dec;		/* topocentric apparent, true equator and
				   equinox of date */
	double range;		/* station to Moon centre, m */
	double geocentric_range; /* m */
	double phase_angle;	/* Sun-Moon-station angle */
	double illuminated_fraction; /* (1 + cos i) / 2 */
	double elongation;	/* Sun-Moon angle seen from the station */
	double synodic;		/* see geom_bodies */
	double mean_elong;	/* see geom_bodies */
	double parallax;	/* horizontal parallax asin(Re / r), Re WGS84 */
};

struct geom_sun_view {
	double az, el;		/* topocentric, geometric */
	double separation;	/* Sun-Moon angle seen from the station */
};

struct geom_libration {
	double geo_lon, geo_lat;	/* sub-Earth point, selenographic */
	double topo_lon, topo_lat;	/* sub-station point */
	double subsolar_lon, subsolar_lat; /* sub-solar point */
	double colongitude;		/* 90 deg - subsolar_lon, 0..2pi */
};

struct geom_instant {
	struct geom_site site;	/* copy of the station */
	struct tscale_instant t;
	struct geom_bodies b;
	struct geom_earth e;
	double site_gcrs[3];	/* station, GCRS, m */
	double light_time;	/* one way, station to Moon centre, s */
	double moon_topo[3];	/* Moon centre from station, GCRS, retarded, m */
	double sun_topo[3];	/* Sun from station, GCRS, m */
	double moon_ret[3];	/* geocentric Moon at t - light_time, m */
	double lunar_rot[3][3];	/* GCRS -> lunar body-fixed (IAU 2009),
				   at t - light_time */
	struct geom_moon_view moon;
	struct geom_sun_view sun;
	struct geom_libration lib;
};

/*
 * Everything shared by all targets at one instant.
 *
 * Given:
 *   site  initialised station
 *   t     the instant on every time scale
 *   b     geocentric bodies at t.tt
 *   e     Earth orientation at t
 * Returned:
 *   out   vectors, Moon and Sun views, librations
 * Notes:
 *   1. Topocentric vectors are exact differences of geocentric ones, so
 *      the Moon's ~1 deg parallax is fully included.
 *   2. Light time: the Moon is taken at t - tau (tau = range / c, about
 *      1.28 s) using its geocentric velocity.  Annual aberration and the
 *      Earth's own motion over tau cancel to first order for the Moon;
 *      diurnal aberration (< 0.32") is neglected.
 *   3. Elevations are geometric; el_apparent adds refraction for the
 *      station's weather (geom_refract).
 *   4. Librations and the sub-solar point use the IAU 2009 rotation of
 *      the Moon at t - tau.
 * Called:
 *   geom_lunar_angles, geom_lunar_matrix, geom_refract, eraAnp, eraAnpm
 */
void geom_instant_make(const struct geom_site *site,
    const struct tscale_instant *t, const struct geom_bodies *b,
    const struct geom_earth *e, struct geom_instant *out);

/* The whole chain for one UTC instant. */
enum errcode geom_instant_at(const struct geom_site *site,
    const struct geom_eop *eop, double utc1, double utc2,
    enum geom_precision prec, struct geom_instant *out);

/* --- lunar targets --- */

struct geom_target {
	double body[3];		/* lunar body-fixed (IAU mean-Earth approx.), m */
};

/* From selenographic latitude, east longitude (rad) and height above the
   1737.4 km mean radius (m).  ERRCODE_BAD_ARG if out of range. */
enum errcode geom_target_from_selen(double lat, double lon, double height,
    struct geom_target *out);

/* From body-fixed x, y, z in metres (norm within 1500..2000 km). */
enum errcode geom_target_from_xyz(double x, double y, double z,
    struct geom_target *out);

struct geom_target_view {
	double az, el;		/* topocentric, geometric */
	double el_apparent;	/* refracted */
	double range;		/* station to target, m */
	double round_trip;	/* two-way light time, s (geometric, no
				   atmosphere or relativity) */
	double offset_ra;	/* (ra_t - ra_c) cos(dec_c), rad */
	double offset_dec;	/* dec_t - dec_c, rad */
	double sun_elevation;	/* Sun above the target's local horizon
				   (sphere), rad */
	int sunlit;		/* sun_elevation > 0 and not in the umbra */
	double earth_elevation;	/* station above the local horizon, rad */
	enum eclipse_shadow shadow; /* the target in the Earth's shadow */
	double sun_visible;	/* visible fraction of the solar disc (1 out
				   of the shadow, 0 in the umbra) */
	double dark_margin;	/* rad, > 0 when dark: max(-sun_elevation,
				   umbra margin), continuous for searches */
};

/*
 * One target at one instant.
 *
 * Given:
 *   g   the instant (geom_instant_make)
 *   t   target, body-fixed
 * Returned:
 *   out topocentric az/el, range, round trip, offset from the Moon's
 *       centre, Sun and Earth elevations at the target
 * Notes:
 *   1. The target's light time differs from the centre's by < 6 ms; the
 *      centre's is used (error < 0.01").
 *   2. Local lunar horizon: plane normal to the radius (sphere model, no
 *      terrain).  Sunlit means the Sun's centre is above it.
 *   3. Round trip is geometric 2 * range / c: no troposphere, no
 *      relativistic delay, no station or reflector motion during flight.
 *   4. The Earth's shadow at the target (eclipse_point_at, Danjon's
 *      rule): sunlit is false in the umbra; dark_margin > 0 exactly when
 *      the target is dark (Sun below its horizon, or in the umbra).
 * Called:
 *   geom_refract, eclipse_point_at, eraAnpm, eraAnp
 */
void geom_target_view(const struct geom_instant *g,
    const struct geom_target *t, struct geom_target_view *out);

/* --- helpers shared with other modules --- */

/*
 * Refracted elevation.
 *
 * Given:
 *   el          double  geometric (airless) elevation, rad
 *   refa, refb  double  constants from eraRefco, rad
 * Returned (function value):
 *   apparent elevation, rad
 * Notes:
 *   The same closed form ERFA applies in eraAtioq: the unrefracted unit
 *   vector is moved towards the zenith by (A + B tan^2 z) tan z with a
 *   Newton-style denominator, and the elevation's sine is clamped at 0.05
 *   so that the model stays bounded below ~3 deg, where it is not
 *   meaningful anyway.
 * References:
 *   ERFA eraRefco and eraAtioq (after SOFA); Green, Spherical Astronomy
 *   (1987), section 4.31.
 */
double geom_refract(double el, double refa, double refb);

/* Angle between two vectors, rad (atan2 of cross and dot: robust near 0
   and pi, as eraSepp). */
double geom_sep(const double a[3], const double b[3]);

/* Angle wrapped into -pi..pi and 0..2pi. */
double geom_wrap_pi(double a);
double geom_wrap_2pi(double a);

/* A function of one time (days) to search for a root; ctx is the caller's. */
typedef double (*geom_root_fn)(void *ctx, double t);

/*
 * Root of f in [a, b] (a < b) where f(a) = fa and f(b) = fb differ in sign,
 * by the Illinois variant of regula falsi, with a bisection step wherever
 * an iterate would leave the bracket.  Stops at f = 0 or when the bracket
 * is no wider than tol.  Sets *root; returns ERRCODE_NO_CONVERGE after
 * maxit steps, *root then being the middle of the last bracket.
 */
enum errcode geom_root_illinois(geom_root_fn f, void *ctx, double a,
    double fa, double b, double fb, double tol, int maxit, double *root);

/* --- phases --- */

enum geom_phase_kind {
	GEOM_PHASE_NEW = 0,
	GEOM_PHASE_FIRST_QUARTER,
	GEOM_PHASE_FULL,
	GEOM_PHASE_LAST_QUARTER
};

struct geom_phase_event {
	enum geom_phase_kind kind;
	double tt1, tt2;	/* TT of the event, to < 0.1 s */
};

/* "new", "first_quarter", "full", "last_quarter". */
const char *geom_phase_name(enum geom_phase_kind kind);

/*
 * Principal phases in a TT span.
 *
 * Given:
 *   from1,2, to1,2  double  TT JD span, [from, to)
 *   cap             size_t  room in out
 * Returned:
 *   out             events in time order
 *   n               number found
 * Returned (function value):
 *   ERRCODE_OK, ERRCODE_BAD_ARG (span reversed or over 400 years),
 *   ERRCODE_TOO_LARGE (more than cap: the first cap are written and *n
 *   is the number found), ERRCODE_NO_CONVERGE
 * Notes:
 *   Each event is where the synodic angle (geom_synodic_at) equals
 *   0, 90, 180 or 270 deg.  The angle grows by 11-14 deg a day and never
 *   stalls, so a half-day grid brackets every crossing exactly once;
 *   regula falsi refines it to 9 ms.  The result is as good as the Moon and
 *   Sun theories: a 1" error in longitude is ~2 s in time.
 * References:
 *   Meeus, Astronomical Algorithms, 2nd ed. (1998), ch. 49 (definition).
 * Called:
 *   geom_phases_find_kinds
 */
enum errcode geom_phases_find(double from1, double from2, double to1,
    double to2, struct geom_phase_event *out, size_t cap, size_t *n);

/* Bit (1u << kind) of each enum geom_phase_kind; all four. */
#define GEOM_PHASE_MASK_ALL 0xfu

/*
 * Principal phases of the kinds asked for in a TT span.
 *
 * Given:
 *   from1,2, to1,2  double    TT JD span, [from, to)
 *   kinds           unsigned  bit (1u << kind) per kind sought
 *   cap             size_t    room in out
 * Returned:
 *   out             events in time order
 *   n               number found
 * Returned (function value):
 *   as geom_phases_find
 * Notes:
 *   The events are bit for bit those of geom_phases_find of those kinds:
 *   the same half-day brackets and refinement.  The angle is first taken
 *   every 2 d (4 d for a single kind, at most 62 deg of the angle) and the
 *   half days of a coarse step are evaluated only when it holds a phase
 *   sought, so full moons alone cost about a quarter of a half-day scan.
 *   geom_phases_find is this function with GEOM_PHASE_MASK_ALL.
 * Called:
 *   geom_synodic_at, geom_root_illinois, eraAnp, eraAnpm
 */
enum errcode geom_phases_find_kinds(double from1, double from2, double to1,
    double to2, unsigned kinds, struct geom_phase_event *out, size_t cap,
    size_t *n);

#endif
