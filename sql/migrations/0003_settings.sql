-- SPDX-License-Identifier: BSD-3-Clause
-- 0003_settings.sql: station-wide settings of the planner and the audit
-- (schema version 3).  Keys never set take their defaults (store.c).

CREATE TABLE settings (
  key             TEXT PRIMARY KEY CONSTRAINT key
                    CHECK (key IN ('coverage_bins', 'coverage_alpha',
                                   'coverage_k', 'coverage_scope',
                                   'plan_days')),
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
                      ELSE 0 END)
) STRICT;
