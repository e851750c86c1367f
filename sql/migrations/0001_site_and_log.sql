-- SPDX-License-Identifier: BSD-3-Clause
-- 0001_site_and_log.sql: the station, its targets, blackouts and the
-- observation log (schema version 1).
--
-- Every CHECK is named after the column it guards, so that the store can
-- tell which field a refused row got wrong.  Times are canonical ISO 8601
-- UTC text with three decimals of seconds plus the MJD of that text.

CREATE TABLE station (
  id              INTEGER PRIMARY KEY CONSTRAINT id CHECK (id = 1),
  name            TEXT NOT NULL CONSTRAINT name
                    CHECK (length(name) BETWEEN 1 AND 95),
  code            TEXT NOT NULL CONSTRAINT code
                    CHECK (length(code) BETWEEN 1 AND 15
                           AND code NOT GLOB '*[^A-Za-z0-9_.-]*'),
  lat_deg         REAL NOT NULL CONSTRAINT lat_deg
                    CHECK (lat_deg BETWEEN -90 AND 90),
  lon_deg         REAL NOT NULL CONSTRAINT lon_deg
                    CHECK (lon_deg BETWEEN -180 AND 360),
  height_m        REAL NOT NULL CONSTRAINT height_m
                    CHECK (height_m BETWEEN -500 AND 10000),
  time_zone       TEXT NOT NULL CONSTRAINT time_zone
                    CHECK (length(time_zone) BETWEEN 1 AND 63
                           AND time_zone NOT GLOB '*[^A-Za-z0-9_/+-]*'),
  min_el_deg      REAL NOT NULL CONSTRAINT min_el_deg
                    CHECK (min_el_deg BETWEEN 0 AND 90),
  max_sun_el_deg  REAL NOT NULL CONSTRAINT max_sun_el_deg
                    CHECK (max_sun_el_deg BETWEEN -90 AND 90),
  min_sun_sep_deg REAL NOT NULL CONSTRAINT min_sun_sep_deg
                    CHECK (min_sun_sep_deg BETWEEN 0 AND 180),
  pressure_hpa    REAL NOT NULL CONSTRAINT pressure_hpa
                    CHECK (pressure_hpa BETWEEN 0 AND 1100),
  temperature_c   REAL NOT NULL CONSTRAINT temperature_c
                    CHECK (temperature_c BETWEEN -80 AND 60),
  humidity        REAL NOT NULL CONSTRAINT humidity
                    CHECK (humidity BETWEEN 0 AND 1),
  wavelength_nm   REAL NOT NULL CONSTRAINT wavelength_nm
                    CHECK (wavelength_nm BETWEEN 200 AND 3000),
  zenith_tau      REAL NOT NULL CONSTRAINT zenith_tau
                    CHECK (zenith_tau BETWEEN 0 AND 10),
  fire_rate_hz    REAL NOT NULL CONSTRAINT fire_rate_hz
                    CHECK (fire_rate_hz > 0 AND fire_rate_hz <= 1000000)
) STRICT;

CREATE TABLE targets (
  id              TEXT PRIMARY KEY CONSTRAINT id
                    CHECK (length(id) BETWEEN 1 AND 32
                           AND id NOT GLOB '*[^A-Za-z0-9_.-]*'),
  name            TEXT NOT NULL CONSTRAINT name
                    CHECK (length(name) BETWEEN 1 AND 95),
  alias           TEXT NOT NULL DEFAULT '' CONSTRAINT alias
                    CHECK (length(alias) <= 95),
  lat_deg         REAL NOT NULL CONSTRAINT lat_deg
                    CHECK (lat_deg BETWEEN -90 AND 90),
  lon_deg         REAL NOT NULL CONSTRAINT lon_deg
                    CHECK (lon_deg BETWEEN -180 AND 360),
  height_m        REAL NOT NULL DEFAULT 0 CONSTRAINT height_m
                    CHECK (height_m BETWEEN -20000 AND 20000),
  strength        REAL NOT NULL CONSTRAINT strength
                    CHECK (strength > 0 AND strength <= 1000),
  dark_only       INTEGER NOT NULL DEFAULT 0 CONSTRAINT dark_only
                    CHECK (dark_only IN (0, 1)),
  active          INTEGER NOT NULL DEFAULT 1 CONSTRAINT active
                    CHECK (active IN (0, 1))
) STRICT;

CREATE UNIQUE INDEX targets_alias ON targets (alias) WHERE alias <> '';

CREATE TABLE blackouts (
  id              INTEGER PRIMARY KEY,
  start_utc       TEXT NOT NULL CONSTRAINT start_utc
                    CHECK (start_utc GLOB '[0-9][0-9][0-9][0-9]-[01][0-9]-[0-3][0-9]T[0-2][0-9]:[0-5][0-9]:[0-6][0-9].[0-9][0-9][0-9]Z'
                           AND coalesce(date(julianday(substr(start_utc, 1, 10)))
                                    = substr(start_utc, 1, 10), 0)
                           AND (julianday(start_utc) IS NOT NULL
                                OR substr(start_utc, 12, 8) = '23:59:60')),
  start_mjd       REAL NOT NULL CONSTRAINT start_mjd
                    CHECK (julianday(start_utc) IS NULL
                           OR abs(julianday(start_utc) - 2400000.5 - start_mjd) < 1e-6),
  end_utc         TEXT NOT NULL CONSTRAINT end_utc
                    CHECK (end_utc GLOB '[0-9][0-9][0-9][0-9]-[01][0-9]-[0-3][0-9]T[0-2][0-9]:[0-5][0-9]:[0-6][0-9].[0-9][0-9][0-9]Z'
                           AND coalesce(date(julianday(substr(end_utc, 1, 10)))
                                    = substr(end_utc, 1, 10), 0)
                           AND (julianday(end_utc) IS NOT NULL
                                OR substr(end_utc, 12, 8) = '23:59:60')),
  end_mjd         REAL NOT NULL CONSTRAINT end_mjd
                    CHECK (end_mjd > start_mjd
                           AND (julianday(end_utc) IS NULL
                                OR abs(julianday(end_utc) - 2400000.5 - end_mjd) < 1e-6)),
  reason          TEXT NOT NULL DEFAULT '' CONSTRAINT reason
                    CHECK (length(reason) <= 95)
) STRICT;

CREATE INDEX blackouts_start ON blackouts (start_mjd);

CREATE TABLE attempts (
  id              INTEGER PRIMARY KEY,
  target_id       TEXT NOT NULL REFERENCES targets (id),
  start_utc       TEXT NOT NULL CONSTRAINT start_utc
                    CHECK (start_utc GLOB '[0-9][0-9][0-9][0-9]-[01][0-9]-[0-3][0-9]T[0-2][0-9]:[0-5][0-9]:[0-6][0-9].[0-9][0-9][0-9]Z'
                           AND coalesce(date(julianday(substr(start_utc, 1, 10)))
                                    = substr(start_utc, 1, 10), 0)
                           AND (julianday(start_utc) IS NOT NULL
                                OR substr(start_utc, 12, 8) = '23:59:60')),
  start_mjd       REAL NOT NULL CONSTRAINT start_mjd
                    CHECK (julianday(start_utc) IS NULL
                           OR abs(julianday(start_utc) - 2400000.5 - start_mjd) < 1e-6),
  end_utc         TEXT NOT NULL CONSTRAINT end_utc
                    CHECK (end_utc GLOB '[0-9][0-9][0-9][0-9]-[01][0-9]-[0-3][0-9]T[0-2][0-9]:[0-5][0-9]:[0-6][0-9].[0-9][0-9][0-9]Z'
                           AND coalesce(date(julianday(substr(end_utc, 1, 10)))
                                    = substr(end_utc, 1, 10), 0)
                           AND (julianday(end_utc) IS NOT NULL
                                OR substr(end_utc, 12, 8) = '23:59:60')),
  end_mjd         REAL NOT NULL CONSTRAINT end_mjd
                    CHECK (end_mjd > start_mjd
                           AND (julianday(end_utc) IS NULL
                                OR abs(julianday(end_utc) - 2400000.5 - end_mjd) < 1e-6)),
  shots           INTEGER NOT NULL CONSTRAINT shots CHECK (shots >= 0),
  returns         INTEGER NOT NULL CONSTRAINT returns CHECK (returns >= 0),
  normal_points   INTEGER NOT NULL CONSTRAINT normal_points
                    CHECK (normal_points >= 0),
  outcome         TEXT NOT NULL CONSTRAINT outcome
                    CHECK (outcome IN ('ranged', 'no_returns', 'weather',
                                       'technical', 'safety', 'other')),
  operator        TEXT NOT NULL DEFAULT '' CONSTRAINT operator
                    CHECK (length(operator) <= 95),
  seeing_arcsec   REAL CONSTRAINT seeing_arcsec
                    CHECK (seeing_arcsec IS NULL
                           OR (seeing_arcsec > 0 AND seeing_arcsec <= 60)),
  notes           TEXT NOT NULL DEFAULT '' CONSTRAINT notes
                    CHECK (length(notes) <= 511),
  -- derived at the mid-time by the geometry core (derive.h)
  synodic_deg     REAL NOT NULL CONSTRAINT synodic_deg
                    CHECK (synodic_deg >= 0 AND synodic_deg < 360),
  mean_elong_deg  REAL NOT NULL CONSTRAINT mean_elong_deg
                    CHECK (mean_elong_deg >= 0 AND mean_elong_deg < 360),
  target_el_deg   REAL NOT NULL CONSTRAINT target_el_deg
                    CHECK (target_el_deg BETWEEN -90 AND 90),
  sun_el_target_deg REAL NOT NULL CONSTRAINT sun_el_target_deg
                    CHECK (sun_el_target_deg BETWEEN -90 AND 90),
  CONSTRAINT start_unique UNIQUE (target_id, start_utc)
) STRICT;

CREATE INDEX attempts_start ON attempts (start_mjd);
