#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# cli_ephem.sh: black-box checks of "moonrange ephem" and "moonrange phases":
# the JSON holds every documented field, bad input exits 2 with one line
# naming the field, --help exits 0.
# Exercises: daemon/cli/cmd_ephem.c daemon/cli/cmd_phases.c daemon/cli/cli.c
#            daemon/cli/cmd_eclipses.c daemon/formats/render_eclipse.c
#            daemon/formats/render.c
set -u
BIN=${1:-${MOONRANGE_BIN:?set MOONRANGE_BIN or pass the binary}}
PY=/usr/bin/python3
TMP=$(mktemp -d)
trap 'rm -rf "$TMP"' EXIT
fails=0

fail() { echo "FAIL: $*"; fails=$((fails + 1)); }

# --- ephem --json: every field of the contract -------------------------
# The station and targets are invented test values.
if "$BIN" ephem --station 41.25,-105.5,2200 --target T-A=12.5,-20 \
    --target T-B=-3,31,-1500 --at 2027-03-01T04:00:00Z --dut1 0.12 \
    --json >"$TMP/ephem.json" 2>"$TMP/err"; then
	"$PY" - "$TMP/ephem.json" <<'PYEOF' || fail "ephem --json fields"
import json, sys
d = json.load(open(sys.argv[1]))
need = {
    "": ["utc", "tt_jd", "dut1_s", "station", "moon", "sun", "libration",
         "subsolar", "targets"],
    "station": ["lat_deg", "lon_deg", "height_m"],
    "moon": ["az_deg", "el_deg", "el_apparent_deg", "ha_deg", "ra_deg",
             "dec_deg", "range_km", "geocentric_range_km", "phase_angle_deg",
             "illuminated_fraction", "elongation_deg", "synodic_angle_deg",
             "mean_elongation_deg"],
    "sun": ["az_deg", "el_deg", "separation_deg"],
    "libration": ["geocentric", "topocentric"],
    "libration.geocentric": ["lon_deg", "lat_deg"],
    "libration.topocentric": ["lon_deg", "lat_deg"],
    "subsolar": ["lon_deg", "lat_deg", "colongitude_deg"],
}
bad = []
for path, keys in need.items():
    o = d
    for p in [p for p in path.split(".") if p]:
        o = o[p]
    for k in keys:
        if k not in o:
            bad.append(path + "." + k)
        elif path and not isinstance(o[k], (int, float, dict)):
            bad.append(path + "." + k + " (type)")
assert d["utc"] == "2027-03-01T04:00:00Z", d["utc"]
assert abs(d["dut1_s"] - 0.12) < 1e-9
assert len(d["targets"]) == 2
for t, tid in zip(d["targets"], ["T-A", "T-B"]):
    if t.get("id") != tid:
        bad.append("targets.id")
    for k in ["az_deg", "el_deg", "range_km", "round_trip_s",
              "offset_ra_arcsec", "offset_dec_arcsec", "sun_elevation_deg",
              "earth_elevation_deg"]:
        if not isinstance(t.get(k), (int, float)) or isinstance(t.get(k), bool):
            bad.append("targets." + k)
    if not isinstance(t.get("sunlit"), bool):
        bad.append("targets.sunlit")
    # round trip = 2 range / c (definition)
    assert abs(t["round_trip_s"] - 2 * t["range_km"] * 1e3 / 299792458.0) < 1e-6
for k in ["lon_deg"]:
    for w in ["geocentric", "topocentric"]:
        assert -180 <= d["libration"][w][k] <= 180
if bad:
    print("missing or mistyped:", bad)
    sys.exit(1)
PYEOF
else
	fail "ephem --json exited $?: $(cat "$TMP/err")"
fi

# --- phases --json ------------------------------------------------------
if "$BIN" phases --from 2027-01-01T00:00:00Z --to 2027-04-01T00:00:00Z \
    --json >"$TMP/phases.json" 2>"$TMP/err"; then
	"$PY" - "$TMP/phases.json" <<'PYEOF' || fail "phases --json fields"
import json, sys
d = json.load(open(sys.argv[1]))
ph = d["phases"]
kinds = ["new", "first_quarter", "full", "last_quarter"]
# 90 days hold 12 or 13 principal phases (29.53 d / 4 apart, common practice)
assert 11 <= len(ph) <= 13, len(ph)
for a, b in zip(ph, ph[1:]):
    assert kinds.index(b["kind"]) == (kinds.index(a["kind"]) + 1) % 4
for p in ph:
    assert set(p) >= {"kind", "utc"}, p
    assert p["kind"] in kinds
    assert p["utc"].endswith("Z") and len(p["utc"]) == 20
    assert "2027-01-01T00:00:00Z" <= p["utc"] < "2027-04-01T00:00:00Z"
PYEOF
else
	fail "phases --json exited $?: $(cat "$TMP/err")"
fi

# --- phases --tz: local time beside UTC ---------------------------------
# Every principal phase of January 2027 falls in CET, UTC+1 in Madrid in
# winter (tzdata, common practice).
if "$BIN" phases --from 2027-01-01T00:00:00Z --days 31 --tz Europe/Madrid \
    >"$TMP/ph_tz.txt" 2>"$TMP/err"; then
	grep -q '^Phase  *UTC  *Local$' "$TMP/ph_tz.txt" ||
	    fail "phases --tz: no Local column"
	"$PY" - "$TMP/ph_tz.txt" <<'PYEOF' || fail "phases --tz: local = UTC + 1 h"
import datetime, sys
rows = [l.split() for l in open(sys.argv[1]) if l[:1] != "P"]
rows = [r for r in rows if len(r) >= 5]
assert len(rows) >= 4, rows
for r in rows:
    utc = datetime.datetime.strptime(r[-4], "%Y-%m-%dT%H:%M:%SZ")
    loc = datetime.datetime.strptime(r[-3] + " " + r[-2], "%Y-%m-%d %H:%M")
    assert r[-1] == "CET", r
    assert utc.replace(second=0) + datetime.timedelta(hours=1) == loc, r
PYEOF
else
	fail "phases --tz exited $?: $(cat "$TMP/err")"
fi
# ephem: the demo station's zone by default, --tz for any station; the
# instant 2027-03-01T04:00Z is 05:00 CET (UTC+1 in winter, tzdata).
"$BIN" ephem --station 41.25,-105.5,2200 --at 2027-03-01T04:00:00Z \
    --tz Europe/Madrid | head -1 | grep -q '(2027-03-01 05:00 CET)$' ||
    fail "ephem --tz: local time beside UTC"
"$BIN" ephem --at 2027-03-01T04:00:00Z | head -1 | grep -q '(2027-02-28 20:00 PST)$' ||
    fail "ephem: the demo station's local time (UTC-8 in winter, tzdata)"
"$BIN" phases --from 2027-01-01T00:00:00Z --days 31 >"$TMP/ph_utc.txt" &&
    ! grep -q 'Local' "$TMP/ph_utc.txt" || fail "phases without a zone: UTC only"

# --- bad input: exit 2, one line "moonrange: error: ..." naming the field
# expect_bad FIELD ARGS...: the message must contain FIELD.
expect_bad() {
	local field=$1
	shift
	"$BIN" "$@" >"$TMP/out" 2>"$TMP/err"
	local st=$?
	local lines
	lines=$(wc -l <"$TMP/err")
	if [ "$st" -ne 2 ]; then
		fail "'$*' exited $st, want 2"
	elif [ "$lines" -ne 1 ]; then
		fail "'$*' wrote $lines lines to stderr, want 1"
	elif ! grep -q '^moonrange: error: ' "$TMP/err"; then
		fail "'$*': message lacks 'moonrange: error: ': $(cat "$TMP/err")"
	elif ! grep -qF -- "$field" "$TMP/err"; then
		fail "'$*': message does not name $field: $(cat "$TMP/err")"
	elif [ -s "$TMP/out" ]; then
		fail "'$*' wrote to stdout on error"
	fi
}

AT=--at=2027-03-01T04:00:00Z
expect_bad --station ephem --station 91,0,0 $AT
expect_bad --station ephem --station 10,20 $AT
expect_bad --station ephem --station 10,abc,0 $AT
expect_bad --station ephem --station 10,20,20000 $AT
expect_bad --station ephem --station "" $AT
expect_bad --station ephem --station 10,,20,30 $AT
expect_bad --station ephem --station 10,20,30, $AT
expect_bad --station ephem --station 10,20,30,40 $AT
expect_bad --station ephem --station "10,20, 30" $AT
expect_bad --station ephem --station 10,20,0x1e $AT
expect_bad --station ephem --station 10,20,nan $AT
expect_bad --target ephem --target T1=95,0 $AT
expect_bad --target ephem --target T1=1,,2 $AT
expect_bad --target ephem --target T1=1,2, $AT
expect_bad --target ephem --target T1=0x10,2 $AT
expect_bad --target ephem --target T1=0,400 $AT
expect_bad --target ephem --target T1 $AT
expect_bad --target ephem --target =1,2 $AT
expect_bad --target ephem --target "bad id=1,2" $AT
expect_bad --target ephem --target T1=1,2,3,4 $AT
expect_bad --target ephem --target T1=1,2,99999 $AT
expect_bad --target ephem --target T1=1,2 --target T1=3,4 $AT
expect_bad --at ephem --at 2027-13-01T00:00:00Z
expect_bad --at ephem --at 2027-03-01T04:00:00
expect_bad --at ephem --at 2017-06-30T23:59:60Z
expect_bad --at ephem --at yesterday
expect_bad --dut1 ephem --dut1 1.5 $AT
expect_bad --dut1 ephem --dut1 abc $AT
expect_bad --dut1 ephem --dut1 1e-1 $AT
expect_bad --dut1 ephem --dut1 "" $AT
expect_bad --bogus ephem --bogus $AT
expect_bad "unexpected argument" ephem $AT extra
expect_bad --from phases --from 2027-02-30T00:00:00Z --to 2027-04-01T00:00:00Z
expect_bad --to phases --from 2027-01-01T00:00:00Z --to 2027-01-01T25:00:00Z
expect_bad --to phases --from 2027-02-01T00:00:00Z --to 2027-01-01T00:00:00Z
expect_bad --days phases --from 2027-01-01T00:00:00Z --days -3
expect_bad --bogus phases --bogus
expect_bad --tz phases --from 2027-01-01T00:00:00Z --tz Mars/Olympus
expect_bad --tz ephem --tz Mars/Olympus $AT
expect_bad --tz phases --from 2027-01-01T00:00:00Z --tz ../../etc/passwd
expect_bad --tz phases --from 2027-01-01T00:00:00Z --tz ""
expect_bad --db phases --from 2027-01-01T00:00:00Z --tz UTC --db x.db
expect_bad "$TMP/none.db" phases --db "$TMP/none.db"
expect_bad "unknown command" nosuchcommand
# Whatever the value holds, the message stays one line of text: a newline
# or a byte that is not UTF-8 is shown as '?', a long value is cut.
expect_bad "'2027?foo'" ephem --at $'2027\nfoo'
expect_bad "'Eu?rope'" phases --tz $'Eu\xffrope'
expect_bad "..." ephem --target "T1=$(printf '1%.0s' $(seq 1 5000))"
[ "$(wc -c <"$TMP/err")" -le 600 ] || fail "a 5000-byte value gives a message of $(wc -c <"$TMP/err") bytes"

# --- eclipses: the 2025-2030 list (count and kinds as test_eclipse
# checks against published predictions and astronomy-engine), a contact
# that does not occur is absent, mid-totality of 2025-03-14 puts a target
# in the umbra, bad spans exit 2 ----------------------------------------
if "$BIN" eclipses --from 2025-01-01T00:00:00Z --to 2031-01-01T00:00:00Z \
    --json >"$TMP/ecl.json" 2>"$TMP/err"; then
	"$PY" - "$TMP/ecl.json" <<'PYEOF' || fail "eclipses --json"
import json, sys
e = json.load(open(sys.argv[1]))["eclipses"]
kinds = [x["kind"] for x in e]
assert len(e) == 14, len(e)
assert kinds.count("total") == 6 and kinds.count("partial") == 4, kinds
for x in e:
    c = x["contacts"]
    assert set(["P1", "P4"]) <= set(c), x
    assert ("U2" in c) == (x["kind"] == "total"), x
    assert ("U1" in c) == (x["kind"] != "penumbral"), x
    assert c["P1"] < x["greatest"] < c["P4"], x
assert e[0]["greatest"].startswith("2025-03-14T06:58"), e[0]
PYEOF
else
	fail "eclipses --json exited non-zero: $(cat "$TMP/err")"
fi
"$BIN" ephem --station 32,-105,2000 --target X=0,0 \
    --at 2025-03-14T06:58:48Z --json >"$TMP/tot.json" &&
	"$PY" -c 'import json,sys; t=json.load(open(sys.argv[1]))["targets"][0]; assert t["shadow"] == "umbra" and t["sunlit"] is False and t["sun_visible_fraction"] == 0 and t["sun_elevation_deg"] > 0 and "tilt_deg" in t and "spread_ps" in t, t' "$TMP/tot.json" ||
	fail "ephem at mid-totality: umbra, not sunlit"
# Windows across the eclipse carry it (first reason); a week later none.
"$BIN" windows --station 32,-105,2000 --from 2025-03-13T18:00:00Z \
    --to 2025-03-14T18:00:00Z --json >"$TMP/win.json" &&
	"$PY" -c 'import json,sys; w=json.load(open(sys.argv[1]))["windows"]; assert w and w[0]["reasons"][0].startswith("total lunar eclipse, greatest 2025-03-14 06:58 UTC"), w' "$TMP/win.json" ||
	fail "windows across the 2025-03-14 eclipse carry it"
"$BIN" windows --station 32,-105,2000 --from 2025-03-20T18:00:00Z \
    --to 2025-03-21T18:00:00Z --json >"$TMP/win2.json" &&
	"$PY" -c 'import json,sys; w=json.load(open(sys.argv[1]))["windows"]; assert not any("eclipse" in r for x in w for r in x["reasons"]), w' "$TMP/win2.json" ||
	fail "windows a week later carry no eclipse"
# On the sample site (Nevada: the Moon up through the 2025-03-14 total
# eclipse) each window and each plan run across it carries the eclipse as
# a field (kind total), and its tilt_deg and spread_ps equal ephem's for
# the same target at the same instant (the window's highest elevation,
# the run's middle) within ephem's rounding (0.001 deg, 0.1 ps).
SRC=$(cd "$(dirname "$0")/.." && pwd)
if "$BIN" init --db "$TMP/ecl.db" --site "$SRC/sample-site" >/dev/null &&
    "$BIN" windows --db "$TMP/ecl.db" --from 2025-03-14T00:00:00Z \
    --to 2025-03-14T14:00:00Z --json >"$TMP/ew.json" &&
    "$BIN" plan --db "$TMP/ecl.db" --from 2025-03-14T04:00:00Z \
    --to 2025-03-14T12:00:00Z --json >"$TMP/ep.json"; then
	"$PY" - "$BIN" "$TMP/ecl.db" "$TMP/ew.json" "$TMP/ep.json" <<'PYEOF' || fail "windows and plan runs across the 2025-03-14 eclipse: eclipse, tilt_deg, spread_ps"
import datetime, json, subprocess, sys
binary, db = sys.argv[1], sys.argv[2]
wins = json.load(open(sys.argv[3]))["windows"]
runs = [r for r in json.load(open(sys.argv[4]))["runs"] if not r["calibration"]]
def ephem(at):
    out = subprocess.run([binary, "ephem", "--db", db, "--at", at, "--json"],
                         check=True, capture_output=True, text=True).stdout
    return {t["id"]: t for t in json.loads(out)["targets"]}
def iso(s):
    return datetime.datetime.strptime(s, "%Y-%m-%dT%H:%M:%SZ")
def check(x, at):
    t = ephem(at)[x["target"]]
    assert abs(x["tilt_deg"] - t["tilt_deg"]) <= 0.0011, (x, t)
    assert abs(x["spread_ps"] - t["spread_ps"]) <= 0.06, (x, t)
assert wins and runs
for w in wins:
    e = w["eclipse"]
    assert e["kind"] == "total" and e["greatest"].startswith("2025-03-14T06:58"), w
    assert e["shadow"] in ("umbra", "penumbra", "none"), w
    check(w, w["max_el_utc"])
# a run over mid-totality sees the umbra; every run before P4 carries it
mid = iso("2025-03-14T06:58:48Z")
assert any(iso(r["start"]) <= mid <= iso(r["end"]) and
           r["eclipse"]["shadow"] == "umbra" for r in runs), runs
for r in runs:
    if iso(r["end"]) < iso("2025-03-14T09:00:00Z"):
        assert r["eclipse"]["kind"] == "total", r
    if iso(r["start"]) > iso("2025-03-14T11:00:00Z"):
        assert r["eclipse"] is None, r
    m = iso(r["start"]) + (iso(r["end"]) - iso(r["start"])) / 2
    check(r, m.strftime("%Y-%m-%dT%H:%M:%SZ"))
PYEOF
else
	fail "windows/plan on the sample site across the 2025-03-14 eclipse"
fi
for bad in "--days 0" "--to 2000-01-01T00:00:00Z" "--from yesterday" \
    "--json --csv"; do
	# shellcheck disable=SC2086
	"$BIN" eclipses $bad >/dev/null 2>"$TMP/err"
	[ $? -eq 2 ] || fail "eclipses $bad: want exit 2"
	[ "$(wc -l <"$TMP/err")" -eq 1 ] || fail "eclipses $bad: one line"
done

# --- --help on every subcommand ----------------------------------------
for cmd in ephem phases eclipses; do
	if ! "$BIN" "$cmd" --help >"$TMP/out" 2>"$TMP/err"; then
		fail "$cmd --help exited non-zero"
	elif ! grep -q "usage: moonrange $cmd" "$TMP/out"; then
		fail "$cmd --help prints no usage"
	fi
done
"$BIN" --help >/dev/null || fail "moonrange --help exited non-zero"

if [ "$fails" -ne 0 ]; then
	echo "$fails check(s) failed"
	exit 1
fi
echo "cli_ephem: all checks passed"
