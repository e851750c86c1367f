// SPDX-License-Identifier: BSD-3-Clause
// bench_astro.mjs: the jobs of 'moonrange bench' done with astronomy-engine
// (npm, benchmark only), timed in-process; prints one JSON object.
//   node bench_astro.mjs year LAT LON H FROM TO MIN_EL REPEAT
//     rise and set of the Moon's centre through MIN_EL (degrees, airless)
//     and the culmination (highest altitude) between each rise and set;
//     {"version","cpu_ms","events":[[kind, unix_s, alt_deg]...]}
//   node bench_astro.mjs elev LAT LON H FROM N STRIDE REPEAT
//     the Moon's airless topocentric altitude at N one-minute instants;
//     {"version","cpu_ms","n","check":[[unix_s, alt_deg] every STRIDE-th]}
// Times are CPU time of this process (user + system), best of REPEAT.
// astronomy-engine: its own truncation of ELP for the Moon, apparent
// place of date (aberration on), its Espenak-Meeus Delta T for UT -> TT;
// Horizon without refraction; SearchAltitude uses the centre (radius 0).
import { createRequire } from 'node:module';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
const require = createRequire(import.meta.url);
const A = require('astronomy-engine');
const version = JSON.parse(readFileSync(join(dirname(require.resolve(
  'astronomy-engine')), 'package.json'), 'utf8')).version;

const [mode, ...arg] = process.argv.slice(2);
const cpuMs = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};
const best = (repeat, job) => {
  let out = null, ms = Infinity;
  for (let i = 0; i < repeat; i++) {
    const t0 = cpuMs();
    out = job();
    ms = Math.min(ms, cpuMs() - t0);
  }
  return { out, ms };
};

function altitude(obs, time) {
  const eq = A.Equator(A.Body.Moon, time, obs, true, true);
  return A.Horizon(time, obs, eq.ra, eq.dec).altitude;
}

// Highest altitude in [a, b] (AstroTime) by golden section to 1 s, as
// moonrange refines its culminations.
function culmination(obs, a, b) {
  const r = 0.6180339887498949;
  let lo = a.ut, hi = b.ut;
  const f = (ut) => altitude(obs, A.MakeTime(new Date(Date.UTC(2000, 0, 1, 12) + ut * 864e5)));
  let x1 = hi - r * (hi - lo), x2 = lo + r * (hi - lo), f1 = f(x1), f2 = f(x2);
  while (hi - lo > 1.0 / 86400) {
    if (f1 < f2) { lo = x1; x1 = x2; f1 = f2; x2 = lo + r * (hi - lo); f2 = f(x2); }
    else { hi = x2; x2 = x1; f2 = f1; x1 = hi - r * (hi - lo); f1 = f(x1); }
  }
  const ut = 0.5 * (lo + hi);
  return [ut, f(ut)];
}

const unix = (ut) => ut * 86400 + Date.UTC(2000, 0, 1, 12) / 1000;

if (mode === 'year') {
  const [lat, lon, h, from, to, minEl, repeat] = arg;
  const obs = new A.Observer(+lat, +lon, +h);
  const t0 = A.MakeTime(new Date(from)), t1 = A.MakeTime(new Date(to));
  const r = best(+repeat, () => {
    const ev = [];
    let t = t0, rise = null;
    // The first event may be a set (the Moon above MIN_EL at the start).
    for (;;) {
      const up = A.SearchAltitude(A.Body.Moon, obs, +1, t, t1.ut - t.ut, +minEl);
      const dn = A.SearchAltitude(A.Body.Moon, obs, -1, t, t1.ut - t.ut, +minEl);
      if (!up && !dn) break;
      if (up && (!dn || up.ut < dn.ut)) {
        ev.push(['r', unix(up.ut), +minEl]);
        rise = up;
        t = up.AddDays(1e-6);
      } else {
        if (rise) {
          const [cu, ca] = culmination(obs, rise, dn);
          ev.push(['c', unix(cu), ca]);
        }
        ev.push(['s', unix(dn.ut), +minEl]);
        rise = null;
        t = dn.AddDays(1e-6);
      }
    }
    return ev;
  });
  console.log(JSON.stringify({ version, cpu_ms: r.ms, events: r.out }));
} else if (mode === 'elev') {
  const [lat, lon, h, from, n, stride, repeat] = arg;
  const obs = new A.Observer(+lat, +lon, +h);
  const t0 = new Date(from).getTime();
  const r = best(+repeat, () => {
    const check = [];
    for (let i = 0; i < +n; i++) {
      const alt = altitude(obs, A.MakeTime(new Date(t0 + i * 60000)));
      if (i % +stride === 0) check.push([t0 / 1000 + i * 60, alt]);
    }
    return check;
  });
  console.log(JSON.stringify({ version, cpu_ms: r.ms, n: +n, check: r.out }));
} else {
  console.error('usage: bench_astro.mjs year|elev ...');
  process.exit(2);
}
