-- SPDX-License-Identifier: BSD-3-Clause
-- 0002_normal_points_and_eop.sql: imported normal points and the Earth
-- orientation table (schema version 2).

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
                           OR abs(julianday(epoch_utc) - 2400000.5 - epoch_mjd) < 1e-6),
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
