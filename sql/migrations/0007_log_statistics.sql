-- SPDX-License-Identifier: BSD-3-Clause
-- 0007_log_statistics.sql: the ranging log as the planner's sufficient
-- statistics (core/logstats.h), kept current by the store in the
-- transaction of every write of an attempt or a normal point (schema
-- version 7).  DEVELOPERS.md, "Log statistics", says how.
--
-- Every write of a record bumps log_gen (the triggers below, whoever
-- writes); the statistics hold the log_gen they reflect (stats_gen) and
-- the rule, zenith tau, typical seeing and number of bins they were taken
-- under.  Statistics that differ from the log or the station in any of
-- these are stale: readers then compute them from the records, and the
-- next writer rebuilds them.  A file migrated here starts stale.

CREATE TABLE logstats_meta (
  id              INTEGER PRIMARY KEY CONSTRAINT id CHECK (id = 1),
  log_gen         INTEGER NOT NULL DEFAULT 0,
  stats_gen       INTEGER NOT NULL DEFAULT -1,
  rule            INTEGER NOT NULL DEFAULT 0,
  zenith_tau      REAL,
  seeing_arcsec   REAL,
  nbins           INTEGER
) STRICT;

INSERT INTO logstats_meta (id) VALUES (1);

-- Per target ('' for every record pooled): attempts, normal points, the
-- yield sums of the usable attempts (exposures under zenith_tau and
-- seeing_arcsec of the meta row) and the normal points and returns of the
-- attempts with returns.
CREATE TABLE logstats (
  target_id       TEXT PRIMARY KEY,
  attempts        INTEGER NOT NULL,
  nps             INTEGER NOT NULL,
  used            INTEGER NOT NULL,
  dark_returns    INTEGER NOT NULL,
  dark_exposure   REAL NOT NULL,
  lit_returns     INTEGER NOT NULL,
  lit_exposure    REAL NOT NULL,
  ret_nps         INTEGER NOT NULL,
  ret_returns     INTEGER NOT NULL
) STRICT;

-- Normal points per synodic-angle bin (nbins of the meta row).
CREATE TABLE logstats_bins (
  target_id       TEXT NOT NULL,
  bin             INTEGER NOT NULL,
  count           INTEGER NOT NULL,
  PRIMARY KEY (target_id, bin)
) STRICT, WITHOUT ROWID;

-- Phase moments: harmonic n 0..8, c = sum w cos nD, s = sum w sin nD, of
-- the normal points (weight 1) and of the attempts (normal_points).
CREATE TABLE logstats_phase (
  target_id       TEXT NOT NULL,
  source          TEXT NOT NULL CONSTRAINT source
                    CHECK (source IN ('normal_points', 'attempts')),
  n               INTEGER NOT NULL,
  c               REAL NOT NULL,
  s               REAL NOT NULL,
  PRIMARY KEY (target_id, source, n)
) STRICT, WITHOUT ROWID;

CREATE TRIGGER attempts_insert_gen AFTER INSERT ON attempts
BEGIN
  UPDATE logstats_meta SET log_gen = log_gen + 1 WHERE id = 1;
END;
CREATE TRIGGER attempts_update_gen AFTER UPDATE ON attempts
BEGIN
  UPDATE logstats_meta SET log_gen = log_gen + 1 WHERE id = 1;
END;
CREATE TRIGGER attempts_delete_gen AFTER DELETE ON attempts
BEGIN
  UPDATE logstats_meta SET log_gen = log_gen + 1 WHERE id = 1;
END;
CREATE TRIGGER nps_insert_gen AFTER INSERT ON normal_points
BEGIN
  UPDATE logstats_meta SET log_gen = log_gen + 1 WHERE id = 1;
END;
CREATE TRIGGER nps_update_gen AFTER UPDATE ON normal_points
BEGIN
  UPDATE logstats_meta SET log_gen = log_gen + 1 WHERE id = 1;
END;
CREATE TRIGGER nps_delete_gen AFTER DELETE ON normal_points
BEGIN
  UPDATE logstats_meta SET log_gen = log_gen + 1 WHERE id = 1;
END;
