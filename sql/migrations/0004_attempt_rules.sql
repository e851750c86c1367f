-- SPDX-License-Identifier: BSD-3-Clause
-- 0004_attempt_rules.sql: one set of rules for an attempt whatever the
-- way in (schema version 4).
--
-- * Days holding a leap second: a stored MJD is ERFA's UTC quasi-JD, in
--   which such a day is 86,401 s long, so that it runs up to 1/86401 day
--   behind SQLite's julianday() of the same text (86,400 s days); the
--   time CHECKs of blackouts, attempts and normal points allow that
--   (2016-12-31T11:00:00Z was refused).
-- * Attempts: the rules of core/attempt.h that a column can hold
--   (normal_points <= returns, returns <= 10 x shots, outcome consistent
--   with the counts, 1960-2100, at most a day long, seeing >= 0.01 arcsec,
--   text without control or bidirectional-override characters) and the
--   suspect flag.  Rows of an older file that these rules refuse move to
--   attempts_set_aside unchanged, for the station to review; the rest
--   keep their ids.  Existing rows are flagged from their stored
--   elevation and the station's fire rate.

ALTER TABLE blackouts RENAME TO blackouts_v3;
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
INSERT INTO blackouts SELECT * FROM blackouts_v3;
DROP TABLE blackouts_v3;
CREATE INDEX blackouts_start ON blackouts (start_mjd);

ALTER TABLE attempts RENAME TO attempts_v3;
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
  CONSTRAINT start_unique UNIQUE (target_id, start_utc)
) STRICT;
INSERT OR IGNORE INTO attempts (id, target_id, start_utc, start_mjd, end_utc, end_mjd, shots, returns, normal_points, outcome, operator, seeing_arcsec, notes, synodic_deg, mean_elong_deg, target_el_deg, sun_el_target_deg, suspect)
  SELECT id, target_id, start_utc, start_mjd, end_utc, end_mjd, shots, returns, normal_points, outcome, operator, seeing_arcsec, notes, synodic_deg, mean_elong_deg, target_el_deg, sun_el_target_deg,
         (CASE WHEN target_el_deg < 0 THEN 1 ELSE 0 END)
         | (CASE WHEN outcome IN ('ranged', 'no_returns')
                  AND shots < 0.1 * (end_mjd - start_mjd) * 86400
                              * coalesce((SELECT fire_rate_hz FROM station), 0)
                 THEN 2 ELSE 0 END)
  FROM attempts_v3;
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
INSERT INTO attempts_set_aside
  SELECT id, target_id, start_utc, end_utc, shots, returns, normal_points,
         outcome, operator, seeing_arcsec, notes
  FROM attempts_v3 WHERE id NOT IN (SELECT id FROM attempts);
DROP TABLE attempts_v3;
CREATE INDEX attempts_start ON attempts (start_mjd);

ALTER TABLE normal_points RENAME TO normal_points_v3;
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
INSERT INTO normal_points SELECT * FROM normal_points_v3;
DROP TABLE normal_points_v3;
CREATE INDEX normal_points_epoch ON normal_points (epoch_mjd);
