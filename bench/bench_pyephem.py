# SPDX-License-Identifier: BSD-3-Clause
"""bench_pyephem.py: the jobs of 'moonrange bench' done with PyEphem
(Debian python3-ephem, benchmark only), timed in-process; prints one JSON
object.  Run with /usr/bin/python3.

  bench_pyephem.py year LAT LON H FROM TO MIN_EL REPEAT
    rise and set of the Moon's centre through MIN_EL (degrees, airless:
    pressure 0) and the culmination (highest altitude, golden section to
    1 s) between each rise and set;
    {"version","cpu_ms","events":[[kind, unix_s, alt_deg]...]}
  bench_pyephem.py elev LAT LON H FROM N STRIDE REPEAT
    the Moon's airless topocentric altitude at N one-minute instants;
    {"version","cpu_ms","n","check":[[unix_s, alt_deg] every STRIDE-th]}

Times are CPU time of this process (time.process_time), best of REPEAT.
PyEphem (libastro): its Moon is Meeus's truncation of ELP 2000-82, the
apparent topocentric place of date; its Delta T its own table.
"""
import json
import math
import sys
import time

import ephem

UNIX0 = ephem.Date('1970/1/1 00:00:00')  # ephem dates: days from 1899-12-31 12h


def unix(d):
    return (float(d) - UNIX0) * 86400.0


def observer(lat, lon, h):
    o = ephem.Observer()
    o.lat = str(lat)
    o.lon = str(lon)
    o.elevation = float(h)
    o.pressure = 0.0      # no refraction: geometric altitudes
    return o


def best(repeat, job):
    out, ms = None, float('inf')
    for _ in range(repeat):
        t0 = time.process_time()
        out = job()
        ms = min(ms, (time.process_time() - t0) * 1e3)
    return out, ms


def altitude(o, m, d):
    o.date = d
    m.compute(o)
    return math.degrees(m.alt)


def culmination(o, m, a, b):
    r = 0.6180339887498949
    lo, hi = float(a), float(b)
    x1, x2 = hi - r * (hi - lo), lo + r * (hi - lo)
    f1, f2 = altitude(o, m, x1), altitude(o, m, x2)
    while hi - lo > 1.0 / 86400:
        if f1 < f2:
            lo, x1, f1 = x1, x2, f2
            x2 = lo + r * (hi - lo)
            f2 = altitude(o, m, x2)
        else:
            hi, x2, f2 = x2, x1, f1
            x1 = hi - r * (hi - lo)
            f1 = altitude(o, m, x1)
    t = 0.5 * (lo + hi)
    return t, altitude(o, m, t)


def year(lat, lon, h, start, end, min_el, repeat):
    t0 = ephem.Date(start.replace('T', ' ').rstrip('Z'))
    t1 = ephem.Date(end.replace('T', ' ').rstrip('Z'))

    def job():
        o = observer(lat, lon, h)
        o.horizon = str(min_el)
        m = ephem.Moon()
        ev, t, rise = [], t0, None
        while True:
            o.date = t
            try:
                up = o.next_rising(m, use_center=True)
            except (ephem.AlwaysUpError, ephem.NeverUpError):
                up = None
            o.date = t
            try:
                dn = o.next_setting(m, use_center=True)
            except (ephem.AlwaysUpError, ephem.NeverUpError):
                dn = None
            if up is not None and up >= t1:
                up = None
            if dn is not None and dn >= t1:
                dn = None
            if up is None and dn is None:
                break
            if up is not None and (dn is None or up < dn):
                ev.append(['r', unix(up), float(min_el)])
                rise, t = up, ephem.Date(up + 1e-6)
            else:
                if rise is not None:
                    ct, ca = culmination(o, m, rise, dn)
                    ev.append(['c', unix(ct), ca])
                ev.append(['s', unix(dn), float(min_el)])
                rise, t = None, ephem.Date(dn + 1e-6)
        return ev

    ev, ms = best(repeat, job)
    return {'version': ephem.__version__, 'cpu_ms': ms, 'events': ev}


def elev(lat, lon, h, start, n, stride, repeat):
    t0 = ephem.Date(start.replace('T', ' ').rstrip('Z'))

    def job():
        o = observer(lat, lon, h)
        m = ephem.Moon()
        check = []
        for i in range(n):
            a = altitude(o, m, t0 + i / 1440.0)
            if i % stride == 0:
                check.append([unix(t0) + i * 60.0, a])
        return check

    check, ms = best(repeat, job)
    return {'version': ephem.__version__, 'cpu_ms': ms, 'n': n,
            'check': check}


def main(argv):
    if len(argv) == 9 and argv[1] == 'year':
        out = year(float(argv[2]), float(argv[3]), float(argv[4]), argv[5],
                   argv[6], float(argv[7]), int(argv[8]))
    elif len(argv) == 9 and argv[1] == 'elev':
        out = elev(float(argv[2]), float(argv[3]), float(argv[4]), argv[5],
                   int(argv[6]), int(argv[7]), int(argv[8]))
    else:
        sys.stderr.write('usage: bench_pyephem.py year|elev ...\n')
        return 2
    print(json.dumps(out))
    return 0


if __name__ == '__main__':
    sys.exit(main(sys.argv))
