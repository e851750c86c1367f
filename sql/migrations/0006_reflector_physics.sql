-- SPDX-License-Identifier: BSD-3-Clause
-- 0006_reflector_physics.sql: the link budget of the station, the
-- reflector's cubes and array, and the range of each attempt (schema
-- version 6).  NULL is the documented default (README "Link budget").

ALTER TABLE station ADD COLUMN
  pulse_energy_mj REAL CONSTRAINT pulse_energy_mj
                    CHECK (pulse_energy_mj IS NULL
                           OR (pulse_energy_mj > 0 AND pulse_energy_mj <= 100000));
ALTER TABLE station ADD COLUMN
  aperture_m      REAL CONSTRAINT aperture_m
                    CHECK (aperture_m IS NULL
                           OR (aperture_m > 0 AND aperture_m <= 50));
ALTER TABLE station ADD COLUMN
  transmit_eff    REAL CONSTRAINT transmit_eff
                    CHECK (transmit_eff IS NULL
                           OR (transmit_eff > 0 AND transmit_eff <= 1));
ALTER TABLE station ADD COLUMN
  receive_eff     REAL CONSTRAINT receive_eff
                    CHECK (receive_eff IS NULL
                           OR (receive_eff > 0 AND receive_eff <= 1));
ALTER TABLE station ADD COLUMN
  detector_qe     REAL CONSTRAINT detector_qe
                    CHECK (detector_qe IS NULL
                           OR (detector_qe > 0 AND detector_qe <= 1));
ALTER TABLE station ADD COLUMN
  seeing_arcsec   REAL CONSTRAINT seeing_arcsec
                    CHECK (seeing_arcsec IS NULL
                           OR (seeing_arcsec > 0 AND seeing_arcsec <= 60));
ALTER TABLE station ADD COLUMN
  jitter_ps       REAL CONSTRAINT jitter_ps
                    CHECK (jitter_ps IS NULL
                           OR (jitter_ps > 0 AND jitter_ps <= 1000000));

ALTER TABLE targets ADD COLUMN
  cube_count      INTEGER CONSTRAINT cube_count
                    CHECK (cube_count IS NULL
                           OR cube_count BETWEEN 1 AND 100000);
ALTER TABLE targets ADD COLUMN
  cube_aperture_mm REAL CONSTRAINT cube_aperture_mm
                    CHECK (cube_aperture_mm IS NULL
                           OR (cube_aperture_mm > 0 AND cube_aperture_mm <= 5000));
ALTER TABLE targets ADD COLUMN
  normal_lat_deg  REAL CONSTRAINT normal_lat_deg
                    CHECK (normal_lat_deg IS NULL
                           OR normal_lat_deg BETWEEN -90 AND 90);
ALTER TABLE targets ADD COLUMN
  normal_lon_deg  REAL CONSTRAINT normal_lon_deg
                    CHECK (normal_lon_deg IS NULL
                           OR normal_lon_deg BETWEEN -180 AND 360);
ALTER TABLE targets ADD COLUMN
  extent_m        REAL CONSTRAINT extent_m
                    CHECK (extent_m IS NULL
                           OR extent_m BETWEEN 0 AND 100);

-- derived at the mid-time by the geometry core (derive.h); NULL for
-- attempts logged before version 6 (they count at the mean distance)
ALTER TABLE attempts ADD COLUMN
  range_km        REAL CONSTRAINT range_km
                    CHECK (range_km IS NULL
                           OR range_km BETWEEN 300000 AND 500000);
