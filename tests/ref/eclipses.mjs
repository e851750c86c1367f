// SPDX-License-Identifier: BSD-3-Clause
// eclipses.mjs: lunar eclipses from astronomy-engine, the independent
// reference of tests/test_eclipse.c (tests only).  Prints one line per
// eclipse with greatest eclipse at or after FROM and before TO (ISO 8601):
//   kind peak_unix_s umbral_mag penumbral_mag P1 U1 U2 U3 U4 P4
// (contacts in POSIX seconds, "-" for one that does not occur).
//
// astronomy-engine's shadow model: the Earth is a sphere of 6371 km mean
// radius plus an 88 km effective atmosphere (6459 km); the Sun a sphere of
// 695700 km; the umbra and penumbra are the cones tangent to both, their
// radii taken in the plane through the Moon's centre perpendicular to the
// Sun-Earth axis (the Sun corrected for light time and aberration); the
// Moon a sphere of 1737.4 km.  Its Moon is its own truncation of Chapront's
// ELP, its Sun VSOP87, its time scale UT from its Espenak-Meeus Delta T.
// Kind and peak are its SearchLunarEclipse's; the magnitudes are formed
// from its own shadow radii at the peak (public GeoVector and GeoMoon with
// the constants above), as (radius + R_moon - r) / (2 R_moon).
//
// Contacts depend on the shadow's size far more than the peak does (a
// grazing phase's length changes by minutes for a few km of radius), and
// its semi-durations average the two halves of a phase.  So each contact
// is found here with its ephemeris and the same cone geometry, by its own
// root search (Search), but with the shadow model of moonrange: Earth
// 6378.137 km x 0.998340 x (1 + 1/85) = 6442.4 km (Danjon), Moon
// 0.2725076 x 6378.137 = 1738.1 km; the Sun stays at its 695700 km.
import { createRequire } from 'node:module';
const require = createRequire(import.meta.url);
const A = require('astronomy-engine');

const from = new Date(process.argv[2] || '2025-01-01T00:00:00Z');
const to = new Date(process.argv[3] || '2031-01-01T00:00:00Z');
const SUN_R = 695700.0, EARTH_R = 6371.0 + 88.0, MOON_R = 1737.4;

const DANJON_EARTH_R = 6378.137 * 0.998340 * (1 + 1 / 85), DANJON_MOON_R = 0.2725076 * 6378.137;

// Its cone geometry: r the Moon's distance from the axis, k and p the
// umbra's and penumbra's radii in the plane through the Moon (km).
function shadow(time, earthR) {
  const s = A.GeoVector(A.Body.Sun, time, true);
  const m = A.GeoMoon(time);
  const d = { x: -s.x, y: -s.y, z: -s.z };
  const u = (d.x * m.x + d.y * m.y + d.z * m.z) / (d.x * d.x + d.y * d.y + d.z * d.z);
  const r = A.KM_PER_AU * Math.hypot(u * d.x - m.x, u * d.y - m.y, u * d.z - m.z);
  const k = SUN_R - (1.0 + u) * (SUN_R - earthR);
  const p = -SUN_R + (1.0 + u) * (SUN_R + earthR);
  return { r, k, p };
}

function magnitudes(time) {
  const { r, k, p } = shadow(time, EARTH_R);
  return [(k + MOON_R - r) / (2 * MOON_R), (p + MOON_R - r) / (2 * MOON_R)];
}

// Contacts with moonrange's shadow model, around its own least distance.
function contacts(peak) {
  const f = (t) => shadow(t, DANJON_EARTH_R).r;
  const tm = A.Search((t) => f(t.AddDays(1 / 86400)) - f(t.AddDays(-1 / 86400)),
    peak.AddDays(-0.05), peak.AddDays(0.05)) || peak;
  const at = shadow(tm, DANJON_EARTH_R);
  const lims = [(s) => s.p + DANJON_MOON_R, (s) => s.k + DANJON_MOON_R,
    (s) => s.k - DANJON_MOON_R];
  const out = ['-', '-', '-', '-', '-', '-'];
  lims.forEach((lim, i) => {
    if (!(at.r < lim(at)))
      return;
    const g = (t) => { const s = shadow(t, DANJON_EARTH_R); return s.r - lim(s); };
    const before = A.Search((t) => -g(t), tm.AddDays(-0.3), tm, { dt_tolerance_seconds: 0.1 });
    const after = A.Search(g, tm, tm.AddDays(0.3), { dt_tolerance_seconds: 0.1 });
    out[i] = (before.date.getTime() / 1000).toFixed(1);
    out[5 - i] = (after.date.getTime() / 1000).toFixed(1);
  });
  return out;
}

let e = A.SearchLunarEclipse(from);
while (e.peak.date < to) {
  const [um, pm] = magnitudes(e.peak);
  console.log([e.kind, (e.peak.date.getTime() / 1000).toFixed(1), um.toFixed(5),
    pm.toFixed(5), ...contacts(e.peak)].join(' '));
  e = A.NextLunarEclipse(e.peak);
}
