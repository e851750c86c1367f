-- SPDX-License-Identifier: BSD-3-Clause
-- schema.sql: the complete current schema of a moonrange database
-- (PRAGMA user_version 6).  A new database is created from this file; an
-- older one is brought up to date by migrations/NNNN_*.sql in order.
-- Both paths must give the same schema (tests/test_store.c checks it), so
-- a change here is also a new migration.
--
-- Every CHECK is named after the column it guards, so that the store can
-- tell which field a refused row got wrong.  Times are canonical ISO 8601
-- UTC text (three decimals of seconds; six for normal-point epochs) plus
-- the MJD of that text for range queries.

-- from 0001_site_and_log.sql
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
                    CHECK (fire_rate_hz > 0 AND fire_rate_hz <= 1000000),
  pulse_energy_mj REAL CONSTRAINT pulse_energy_mj
                    CHECK (pulse_energy_mj IS NULL
                           OR (pulse_energy_mj > 0 AND pulse_energy_mj <= 100000)),
  aperture_m      REAL CONSTRAINT aperture_m
                    CHECK (aperture_m IS NULL
                           OR (aperture_m > 0 AND aperture_m <= 50)),
  transmit_eff    REAL CONSTRAINT transmit_eff
                    CHECK (transmit_eff IS NULL
                           OR (transmit_eff > 0 AND transmit_eff <= 1)),
  receive_eff     REAL CONSTRAINT receive_eff
                    CHECK (receive_eff IS NULL
                           OR (receive_eff > 0 AND receive_eff <= 1)),
  detector_qe     REAL CONSTRAINT detector_qe
                    CHECK (detector_qe IS NULL
                           OR (detector_qe > 0 AND detector_qe <= 1)),
  seeing_arcsec   REAL CONSTRAINT seeing_arcsec
                    CHECK (seeing_arcsec IS NULL
                           OR (seeing_arcsec > 0 AND seeing_arcsec <= 60)),
  jitter_ps       REAL CONSTRAINT jitter_ps
                    CHECK (jitter_ps IS NULL
                           OR (jitter_ps > 0 AND jitter_ps <= 1000000))
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
                    CHECK (active IN (0, 1)),
  cube_count      INTEGER CONSTRAINT cube_count
                    CHECK (cube_count IS NULL
                           OR cube_count BETWEEN 1 AND 100000),
  cube_aperture_mm REAL CONSTRAINT cube_aperture_mm
                    CHECK (cube_aperture_mm IS NULL
                           OR (cube_aperture_mm > 0 AND cube_aperture_mm <= 5000)),
  normal_lat_deg  REAL CONSTRAINT normal_lat_deg
                    CHECK (normal_lat_deg IS NULL
                           OR normal_lat_deg BETWEEN -90 AND 90),
  normal_lon_deg  REAL CONSTRAINT normal_lon_deg
                    CHECK (normal_lon_deg IS NULL
                           OR normal_lon_deg BETWEEN -180 AND 360),
  extent_m        REAL CONSTRAINT extent_m
                    CHECK (extent_m IS NULL
                           OR extent_m BETWEEN 0 AND 100)
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
                           OR julianday(start_utc) - 2400000.5 - start_mjd
                                   BETWEEN -1e-6 AND 1.2e-5),
  end_utc         TEXT NOT NULL CONSTRAINT end_utc
                    CHECK (end_utc GLOB '[0-9][0-9][0-9][0-9]-[01][0-9]-[0-3][0-9]T[0-2][0-9]:[0-5][0-9]:[0-6][0-9].[0-9][0-9][0-9]Z'
                           AND coalesce(date(julianday(substr(end_utc, 1, 10)))
                                    = substr(end_utc, 1, 10), 0)
                           AND (julianday(end_utc) IS NOT NULL
                                OR substr(end_utc, 12, 8) = '23:59:60')),
  end_mjd         REAL NOT NULL CONSTRAINT end_mjd
                    CHECK (end_mjd > start_mjd
                           AND (julianday(end_utc) IS NULL
                                OR julianday(end_utc) - 2400000.5 - end_mjd
                                   BETWEEN -1e-6 AND 1.2e-5)),
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
                    CHECK (start_mjd >= 36934 AND start_mjd < 88069
                           AND (julianday(start_utc) IS NULL
                           OR julianday(start_utc) - 2400000.5 - start_mjd
                                   BETWEEN -1e-6 AND 1.2e-5)),
  end_utc         TEXT NOT NULL CONSTRAINT end_utc
                    CHECK (end_utc GLOB '[0-9][0-9][0-9][0-9]-[01][0-9]-[0-3][0-9]T[0-2][0-9]:[0-5][0-9]:[0-6][0-9].[0-9][0-9][0-9]Z'
                           AND coalesce(date(julianday(substr(end_utc, 1, 10)))
                                    = substr(end_utc, 1, 10), 0)
                           AND (julianday(end_utc) IS NOT NULL
                                OR substr(end_utc, 12, 8) = '23:59:60')),
  end_mjd         REAL NOT NULL CONSTRAINT end_mjd
                    CHECK (end_mjd > start_mjd AND end_mjd <= 88069
                           AND end_mjd - start_mjd <= 1.000000001
                           AND (julianday(end_utc) IS NULL
                                OR julianday(end_utc) - 2400000.5 - end_mjd
                                   BETWEEN -1e-6 AND 1.2e-5)),
  shots           INTEGER NOT NULL CONSTRAINT shots CHECK (shots >= 0),
  returns         INTEGER NOT NULL CONSTRAINT returns
                    CHECK (returns >= 0 AND returns <= 10 * shots),
  normal_points   INTEGER NOT NULL CONSTRAINT normal_points
                    CHECK (normal_points >= 0 AND normal_points <= returns),
  outcome         TEXT NOT NULL CONSTRAINT outcome
                    CHECK (outcome IN ('ranged', 'no_returns', 'weather',
                                       'technical', 'safety', 'other')
                           AND (outcome <> 'ranged'
                                OR (shots > 0 AND returns > 0))
                           AND (outcome <> 'no_returns'
                                OR (shots > 0 AND returns <= 10
                                    AND normal_points = 0))),
  -- text: no C0 control, DEL, C1 control or bidirectional override
  -- (notes may hold line feeds); core/attempt.h has the same rules
  operator        TEXT NOT NULL DEFAULT '' CONSTRAINT operator
                    CHECK (length(operator) <= 95
                           AND operator NOT GLOB '*[' || char(1, 2, 3, 4, 5,
                             6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18,
                             19, 20, 21, 22, 23, 24, 25, 26, 27, 28, 29, 30,
                             31, 127, 128, 129, 130, 131, 132, 133, 134, 135,
                             136, 137, 138, 139, 140, 141, 142, 143, 144, 145,
                             146, 147, 148, 149, 150, 151, 152, 153, 154, 155,
                             156, 157, 158, 159, 8234, 8235, 8236, 8237, 8238,
                             8294, 8295, 8296, 8297) || ']*'),
  seeing_arcsec   REAL CONSTRAINT seeing_arcsec
                    CHECK (seeing_arcsec IS NULL
                           OR (seeing_arcsec >= 0.01 AND seeing_arcsec <= 60)),
  notes           TEXT NOT NULL DEFAULT '' CONSTRAINT notes
                    CHECK (length(notes) <= 511
                           AND notes NOT GLOB '*[' || char(1, 2, 3, 4, 5,
                             6, 7, 8, 9, 11, 12, 13, 14, 15, 16, 17, 18,
                             19, 20, 21, 22, 23, 24, 25, 26, 27, 28, 29, 30,
                             31, 127, 128, 129, 130, 131, 132, 133, 134, 135,
                             136, 137, 138, 139, 140, 141, 142, 143, 144, 145,
                             146, 147, 148, 149, 150, 151, 152, 153, 154, 155,
                             156, 157, 158, 159, 8234, 8235, 8236, 8237, 8238,
                             8294, 8295, 8296, 8297) || ']*'),
  -- derived at the mid-time by the geometry core (derive.h)
  synodic_deg     REAL NOT NULL CONSTRAINT synodic_deg
                    CHECK (synodic_deg >= 0 AND synodic_deg < 360),
  mean_elong_deg  REAL NOT NULL CONSTRAINT mean_elong_deg
                    CHECK (mean_elong_deg >= 0 AND mean_elong_deg < 360),
  target_el_deg   REAL NOT NULL CONSTRAINT target_el_deg
                    CHECK (target_el_deg BETWEEN -90 AND 90),
  sun_el_target_deg REAL NOT NULL CONSTRAINT sun_el_target_deg
                    CHECK (sun_el_target_deg BETWEEN -90 AND 90),
  -- ATTEMPT_SUSPECT_* bits (core/attempt.h): 1 target below the horizon,
  -- 2 fired at under a tenth of the station's rate; left out of the yield
  suspect         INTEGER NOT NULL DEFAULT 0 CONSTRAINT suspect
                    CHECK (suspect BETWEEN 0 AND 3),
  range_km        REAL CONSTRAINT range_km
                    CHECK (range_km IS NULL
                           OR range_km BETWEEN 300000 AND 500000),
  CONSTRAINT start_unique UNIQUE (target_id, start_utc)
) STRICT;

CREATE INDEX attempts_start ON attempts (start_mjd);

-- from 0004_attempt_rules.sql: attempts of an older database that the
-- rules of version 4 refuse, kept as they were for the station to review
CREATE TABLE attempts_set_aside (
  id              INTEGER PRIMARY KEY,
  target_id       TEXT NOT NULL,
  start_utc       TEXT NOT NULL,
  end_utc         TEXT NOT NULL,
  shots           INTEGER NOT NULL,
  returns         INTEGER NOT NULL,
  normal_points   INTEGER NOT NULL,
  outcome         TEXT NOT NULL,
  operator        TEXT NOT NULL,
  seeing_arcsec   REAL,
  notes           TEXT NOT NULL
) STRICT;

-- from 0002_normal_points_and_eop.sql
CREATE TABLE normal_points (
  id              INTEGER PRIMARY KEY,
  target_id       TEXT NOT NULL REFERENCES targets (id),
  station_code    TEXT NOT NULL CONSTRAINT station_code
                    CHECK (length(station_code) BETWEEN 1 AND 15),
  epoch_utc       TEXT NOT NULL CONSTRAINT epoch_utc
                    CHECK (epoch_utc GLOB '[0-9][0-9][0-9][0-9]-[01][0-9]-[0-3][0-9]T[0-2][0-9]:[0-5][0-9]:[0-6][0-9].[0-9][0-9][0-9][0-9][0-9][0-9]Z'
                           AND coalesce(date(julianday(substr(epoch_utc, 1, 10)))
                                    = substr(epoch_utc, 1, 10), 0)
                           AND (julianday(epoch_utc) IS NOT NULL
                                OR substr(epoch_utc, 12, 8) = '23:59:60')),
  epoch_mjd       REAL NOT NULL CONSTRAINT epoch_mjd
                    CHECK (julianday(epoch_utc) IS NULL
                           OR julianday(epoch_utc) - 2400000.5 - epoch_mjd
                                   BETWEEN -1e-6 AND 1.2e-5),
  -- two-way time of flight: the Earth-Moon range (356 000-407 000 km)
  -- gives 2.3-2.8 s; a wider band is accepted
  tof_s           REAL NOT NULL CONSTRAINT tof_s
                    CHECK (tof_s BETWEEN 2.0 AND 3.0),
  photons         INTEGER NOT NULL CONSTRAINT photons CHECK (photons >= 0),
  rms_ps          REAL CONSTRAINT rms_ps
                    CHECK (rms_ps IS NULL OR rms_ps >= 0),
  synodic_deg     REAL NOT NULL CONSTRAINT synodic_deg
                    CHECK (synodic_deg >= 0 AND synodic_deg < 360),
  mean_elong_deg  REAL NOT NULL CONSTRAINT mean_elong_deg
                    CHECK (mean_elong_deg >= 0 AND mean_elong_deg < 360),
  -- elevation at this station; NULL for points of other stations
  target_el_deg   REAL CONSTRAINT target_el_deg
                    CHECK (target_el_deg IS NULL
                           OR target_el_deg BETWEEN -90 AND 90),
  sun_el_target_deg REAL NOT NULL CONSTRAINT sun_el_target_deg
                    CHECK (sun_el_target_deg BETWEEN -90 AND 90),
  CONSTRAINT epoch_unique UNIQUE (station_code, target_id, epoch_utc)
) STRICT;

CREATE INDEX normal_points_epoch ON normal_points (epoch_mjd);

CREATE TABLE eop (
  mjd             INTEGER PRIMARY KEY CONSTRAINT mjd
                    CHECK (mjd BETWEEN 30000 AND 100000),
  date_utc        TEXT NOT NULL CONSTRAINT date_utc
                    CHECK (date_utc = date(mjd + 2400000.5)),
  -- the IERS keeps |UT1-UTC| below 0.9 s
  dut1_s          REAL NOT NULL CONSTRAINT dut1_s
                    CHECK (abs(dut1_s) < 1.0),
  xp_arcsec       REAL NOT NULL CONSTRAINT xp_arcsec
                    CHECK (abs(xp_arcsec) < 2.0),
  yp_arcsec       REAL NOT NULL CONSTRAINT yp_arcsec
                    CHECK (abs(yp_arcsec) < 2.0)
) STRICT;

-- from 0003_settings.sql, remade by 0005_plan_settings.sql
-- (the columns of 0006_reflector_physics.sql are in the tables above,
-- where ALTER TABLE puts them)
CREATE TABLE settings (
  key             TEXT PRIMARY KEY CONSTRAINT key
                    CHECK (key IN ('coverage_bins', 'coverage_alpha',
                                   'coverage_k', 'coverage_scope',
                                   'plan_days', 'value_model',
                                   'value_harmonics', 'value_phase_weight',
                                   'value_orientation_weight',
                                   'plan_run_min_s', 'plan_run_max_s',
                                   'plan_switch_s', 'plan_calibration_s',
                                   'plan_calibration_every_s')),
  value           TEXT NOT NULL CONSTRAINT value
                    CHECK (CASE key
                      WHEN 'coverage_bins' THEN
                        value NOT GLOB '*[^0-9]*' AND value <> ''
                        AND CAST(value AS INTEGER) BETWEEN 4 AND 72
                      WHEN 'coverage_alpha' THEN
                        value GLOB '[0-9]*' AND value NOT GLOB '*[^0-9.]*'
                        AND CAST(value AS REAL) BETWEEN 0 AND 4
                      WHEN 'coverage_k' THEN
                        value GLOB '[0-9]*' AND value NOT GLOB '*[^0-9.]*'
                        AND CAST(value AS REAL) > 0
                        AND CAST(value AS REAL) <= 1000
                      WHEN 'coverage_scope' THEN
                        value IN ('pooled', 'per_target')
                      WHEN 'plan_days' THEN
                        value NOT GLOB '*[^0-9]*' AND value <> ''
                        AND CAST(value AS INTEGER) BETWEEN 1 AND 30
                      WHEN 'value_model' THEN
                        value IN ('design', 'bins')
                      WHEN 'value_harmonics' THEN
                        value NOT GLOB '*[^0-9]*' AND value <> ''
                        AND CAST(value AS INTEGER) BETWEEN 1 AND 4
                      WHEN 'value_phase_weight' THEN
                        value GLOB '[0-9]*' AND value NOT GLOB '*[^0-9.]*'
                        AND CAST(value AS REAL) BETWEEN 0 AND 100
                      WHEN 'value_orientation_weight' THEN
                        value GLOB '[0-9]*' AND value NOT GLOB '*[^0-9.]*'
                        AND CAST(value AS REAL) BETWEEN 0 AND 100
                      WHEN 'plan_run_min_s' THEN
                        value NOT GLOB '*[^0-9]*' AND value <> ''
                        AND CAST(value AS INTEGER) BETWEEN 60 AND 14400
                      WHEN 'plan_run_max_s' THEN
                        value NOT GLOB '*[^0-9]*' AND value <> ''
                        AND CAST(value AS INTEGER) BETWEEN 60 AND 14400
                      WHEN 'plan_switch_s' THEN
                        value NOT GLOB '*[^0-9]*' AND value <> ''
                        AND CAST(value AS INTEGER) BETWEEN 0 AND 3600
                      WHEN 'plan_calibration_s' THEN
                        value NOT GLOB '*[^0-9]*' AND value <> ''
                        AND CAST(value AS INTEGER) BETWEEN 60 AND 3600
                      WHEN 'plan_calibration_every_s' THEN
                        value NOT GLOB '*[^0-9]*' AND value <> ''
                        AND CAST(value AS INTEGER) BETWEEN 0 AND 86400
                      ELSE 0 END)
) STRICT;
