-- SPDX-License-Identifier: BSD-3-Clause
-- 0005_plan_settings.sql: the settings of the night plan, the value model
-- (value_*) and the scheduler (plan_run_*, plan_switch_s,
-- plan_calibration_*) join the settings table's CHECK (schema version 5).
-- SQLite cannot change a CHECK in place: the rows move to a copy, the
-- table is made anew and they move back.

CREATE TABLE settings_0003 AS SELECT key, value FROM settings;
DROP TABLE settings;
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
INSERT INTO settings (key, value) SELECT key, value FROM settings_0003;
DROP TABLE settings_0003;
