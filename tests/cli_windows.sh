#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# cli_windows.sh: black-box checks of "moonrange windows" and "tonight"
# (cmd_windows.c, cmd_tonight.c, render_plan.c): help, bad input with
# one-line errors and exit 2, JSON fields, and the iCalendar output
# against Debian's python3-icalendar (tests/ics_check.py).
# Usage: cli_windows.sh MOONRANGE_BINARY SOURCE_DIR
set -euo pipefail
bin=$1
src=$2
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
st=38.9712,-114.3098,2950   # the invented demo station
span=(--from 2027-03-14T00:00:00Z --to 2027-03-24T00:00:00Z)

fail() { echo "FAIL: $*" >&2; exit 1; }

# usage: expect_usage_error ARGS... : exit 2 and one "moonrange: error:" line
expect_usage_error() {
	local rc=0
	"$bin" "$@" >"$tmp/out" 2>"$tmp/err" || rc=$?
	[ "$rc" = 2 ] || fail "'$*' exited $rc, want 2"
	[ "$(wc -l <"$tmp/err")" = 1 ] || fail "'$*': not one line on stderr"
	grep -q '^moonrange: error: ' "$tmp/err" || fail "'$*': $(cat "$tmp/err")"
	[ ! -s "$tmp/out" ] || fail "'$*' printed to stdout"
}

"$bin" windows --help | grep -q -- '--min-sun-sep' || fail "windows --help"
"$bin" tonight --help | grep -q -- '--db' || fail "tonight --help"
expect_usage_error windows
expect_usage_error windows --station "$st" --db x.db
expect_usage_error windows --station 95,0,0
expect_usage_error windows --station "$st" --days -3
expect_usage_error windows --station "$st" --from 2027-13-01T00:00:00Z
expect_usage_error windows --station "$st" --limit 0
expect_usage_error windows --station "$st" --min-el 120
expect_usage_error windows --station "$st" --json --csv
expect_usage_error windows --station "$st" --target HERON "${span[@]}"
expect_usage_error windows --station "$st" --bogus
expect_usage_error windows --station "$st" --days 1e9
expect_usage_error windows --station "$st" --from 2027-03-24T00:00:00Z \
  --to 2027-03-14T00:00:00Z
grep -q -- '--to' "$tmp/err" || fail "reversed span names --to"
expect_usage_error windows --station "$st" --from 2027-01-01T00:00:00Z \
  --to 2047-01-01T00:00:00Z
grep -q -- '--to' "$tmp/err" || fail "span of many years names --to"
# The sentences of the windows query, as GET /api/v1/windows says them
# (test_api) with the parameter named as the command line names it.
expect_usage_error windows --station "$st" --target NOPE "${span[@]}"
[ "$(cat "$tmp/err")" = "moonrange: error: --target: no active target 'NOPE'" ] ||
  fail "unknown target: $(cat "$tmp/err")"
expect_usage_error windows --station "$st" --days 0x10
grep -q -- "--days: '0x10' is not a number of days above 0" "$tmp/err" ||
  fail "hex days: $(cat "$tmp/err")"
expect_usage_error phases --days 0x10
grep -q -- "--days: '0x10' is not a number of days above 0" "$tmp/err" ||
  fail "phases hex days: $(cat "$tmp/err")"
expect_usage_error tonight --station "$st"
expect_usage_error tonight --station "$st" --tz Mars/Olympus
expect_usage_error windows --db "$tmp/missing.db"
grep -q 'missing.db' "$tmp/err" || fail "--db error names the file"

# The Moon's centre, id "moon", default limits; JSON fields.
"$bin" windows --station "$st" "${span[@]}" --json >"$tmp/w.json"
/usr/bin/python3 - "$tmp/w.json" <<'PY'
import json, sys
d = json.load(open(sys.argv[1]))
want = ["rank", "target", "start", "end", "duration_s", "max_el_deg",
        "max_el_utc", "synodic_angle_deg", "phase_bin", "bin_count",
        "coverage_weight", "sunlit_fraction", "mean_airmass",
        "expected_returns", "score", "tilt_deg", "spread_ps", "eclipse",
        "reasons"]
assert d["windows"], "no windows"
for w in d["windows"]:
    assert sorted(w) == sorted(want), sorted(w)
    assert w["target"] == "moon"
    assert w["max_el_deg"] >= 20.0 - 1e-6
assert d["limits"] == {"min_el_deg": 20.0, "max_sun_el_deg": -12.0,
                       "min_sun_sep_deg": 20.0, "elevation": "geometric"}
assert [w["rank"] for w in d["windows"]] == list(range(1, len(d["windows"]) + 1))
print("json ok: %d windows" % len(d["windows"]))
PY

# Overrides reach the planner; --limit keeps the best.
"$bin" windows --station "$st" "${span[@]}" --min-el 40 --limit 2 --json \
	>"$tmp/w40.json"
/usr/bin/python3 - "$tmp/w40.json" <<'PY'
import json, sys
d = json.load(open(sys.argv[1]))
assert d["limits"]["min_el_deg"] == 40.0
assert len(d["windows"]) <= 2 and d["total_windows"] >= len(d["windows"])
PY

# iCalendar against an independent parser, times against the JSON.
"$bin" windows --station "$st" "${span[@]}" --ics >"$tmp/w.ics"
/usr/bin/python3 "$src/tests/ics_check.py" "$tmp/w.ics" "$tmp/w.json"

# CSV: header and one record per window.
"$bin" windows --station "$st" "${span[@]}" --csv >"$tmp/w.csv"
head -1 "$tmp/w.csv" | grep -q '^rank,target,start,end,duration_s,' ||
	fail "csv header"
/usr/bin/python3 - "$tmp/w.csv" "$tmp/w.json" <<'PY'
import csv, json, sys
rows = list(csv.reader(open(sys.argv[1], newline="")))
d = json.load(open(sys.argv[2]))
assert len(rows) == len(d["windows"]) + 1
assert all(len(r) == 21 for r in rows)  # 16 + tilt, spread, eclipse kind, greatest, shadow
assert rows[1][1] == "moon" and rows[1][2] == d["windows"][0]["start"]
PY

# tonight on an ad-hoc station, pinned now: 80 columns.
"$bin" tonight --station "$st" --tz America/Los_Angeles \
	--at 2027-03-20T05:00:00Z >"$tmp/t.txt"
grep -q '^Range now: moon until 03-19 22:30 PDT (05:30 UTC)$' "$tmp/t.txt" ||
  fail "tonight: the run now"
grep -q '^  now: elevation [0-9.]* deg, azimuth [0-9.]* deg$' "$tmp/t.txt" ||
  fail "tonight: elevation and azimuth now"
grep -q '^Next runs:$' "$tmp/t.txt" || fail "tonight: next runs"
awk 'length($0) > 80 { exit 1 }' "$tmp/t.txt" || fail "tonight wider than 80"
grep -q 'Lunar eclipse' "$tmp/t.txt" && fail "tonight: no eclipse that night"
# The night of the 2025-03-14 total eclipse says so, within 80 columns.
"$bin" tonight --station "$st" --tz America/Los_Angeles \
	--at 2025-03-14T04:00:00Z >"$tmp/te.txt" || fail "tonight at the eclipse"
grep -q '^Lunar eclipse tonight: total, greatest 2025-03-14T06:58:4[0-9]Z$' \
  "$tmp/te.txt" || fail "tonight: the eclipse is announced"
awk 'length($0) > 80 { exit 1 }' "$tmp/te.txt" || fail "eclipse notice wider than 80"
# The sample site through a real database: every target, the DB's limits,
# dark-only targets never sunlit, iCalendar of the database's windows.
"$bin" init --db "$tmp/site.db" --site "$src/sample-site" >/dev/null
"$bin" windows --db "$tmp/site.db" "${span[@]}" --json >"$tmp/d.json"
"$bin" windows --db "$tmp/site.db" "${span[@]}" --ics >"$tmp/d.ics"
/usr/bin/python3 "$src/tests/ics_check.py" "$tmp/d.ics" "$tmp/d.json"
/usr/bin/python3 - "$tmp/d.json" <<'PY'
import json, sys
d = json.load(open(sys.argv[1]))
ids = {w["target"] for w in d["windows"]}
assert ids <= {"HERON", "OSPREY", "PLOVER", "SANDPIPER", "TERN"}, ids
assert len(ids) >= 4, ids
assert d["limits"]["min_sun_sep_deg"] == 30.0      # sample-site/station.ini
assert d["dut1_source"] == "table"                 # sample-site/eop.finals
for w in d["windows"]:
    if w["target"] == "TERN":                      # dark_only = 1
        assert w["sunlit_fraction"] == 0.0, w
    s = w["score"]; e = w["expected_returns"]; c = w["coverage_weight"]
    assert abs(s - e * c) <= 1e-5 * max(1.0, s), w  # rounded JSON values
PY
"$bin" tonight --db "$tmp/site.db" --at 2027-03-20T05:00:00Z >"$tmp/t2.txt"
awk 'length($0) > 80 { exit 1 }' "$tmp/t2.txt" || fail "tonight --db wider than 80"
grep -q 'America/Los_Angeles' "$tmp/t2.txt" || fail "tonight: station zone"
# Late morning, this night's windows over: the next night is shown
# (2026-12-24 11:00 PST; the sample site's windows end by 05:44 PST).
"$bin" tonight --db "$tmp/site.db" --at 2026-12-24T19:00:00Z >"$tmp/t3.txt"
grep -q '^Tonight: 12-24 12:00 PST to 12-25 12:00 PST' "$tmp/t3.txt" ||
  fail "tonight: after the night's last window, the next night"
"$bin" tonight --db "$tmp/site.db" --at 2026-12-24T08:00:00Z >"$tmp/t3.txt"
grep -q '^Tonight: 12-24 00:00 PST to 12-24 12:00 PST' "$tmp/t3.txt" ||
  fail "tonight: at local midnight, the night under way"
# --tz changes the clock shown, never the night.
"$bin" tonight --db "$tmp/site.db" --at 2026-12-24T08:00:00Z --tz UTC >"$tmp/t4.txt"
grep -q '^Tonight: 12-24 08:00 UTC to 12-24 20:00 UTC' "$tmp/t4.txt" ||
  fail "tonight --tz: the station's night in another clock"
# Near new moon: nothing can be ranged, the limit named, the next night.
"$bin" tonight --db "$tmp/site.db" --at 2027-03-08T05:00:00Z >"$tmp/t5.txt"
grep -q '^Nothing can be ranged tonight: ' "$tmp/t5.txt" &&
  grep -q 'min_sun_sep' "$tmp/t5.txt" ||
  fail "tonight: the limit near new moon"
grep -q '^The next plannable night starts ' "$tmp/t5.txt" ||
  fail "tonight: the next plannable night"
# plan: 80 columns, the JSON fields, greedy never above best, bad input.
"$bin" plan --help | grep -q -- '--method' || fail "plan --help"
expect_usage_error plan --db "$tmp/site.db" --method fast
expect_usage_error plan --db "$tmp/site.db" --from 2027-03-20T00:00:00Z
expect_usage_error plan --db "$tmp/site.db" --from 2027-03-20T00:00:00Z --to 2027-03-30T00:00:00Z
expect_usage_error plan --db "$tmp/site.db" --json --csv
"$bin" plan --db "$tmp/site.db" --at 2027-03-20T03:00:00Z >"$tmp/p.txt"
awk 'length($0) > 80 { exit 1 }' "$tmp/p.txt" || fail "plan wider than 80"
grep -q 'America/Los_Angeles' "$tmp/p.txt" || fail "plan: station zone"
"$bin" plan --db "$tmp/site.db" --at 2027-03-20T03:00:00Z --json >"$tmp/pb.json"
"$bin" plan --db "$tmp/site.db" --at 2027-03-20T03:00:00Z --json \
	--method greedy >"$tmp/pg.json"
"$bin" plan --db "$tmp/site.db" --at 2027-03-20T03:00:00Z --ics >"$tmp/p.ics"
grep -q '^BEGIN:VEVENT' "$tmp/p.ics" || fail "plan --ics"
/usr/bin/python3 - "$tmp/pb.json" "$tmp/pg.json" <<'PY'
import json, sys
b = json.load(open(sys.argv[1])); g = json.load(open(sys.argv[2]))
for k in ("method", "from", "to", "total_value", "expected_normal_points", "runs"):
    assert k in b, k
for r in b["runs"]:
    for k in ("target", "start", "end", "expected_returns",
              "expected_normal_points", "value", "value_phase",
              "value_orientation", "reasons"):
        assert k in r, k
assert b["method"] == "best" and g["method"] == "greedy"
assert b["from"] == "2027-03-20T03:00:00Z"
assert b["total_value"] >= g["total_value"], (b["total_value"], g["total_value"])
assert len({r["target"] for r in b["runs"]}) >= 3
PY
# A window's score is the same with --target (the yield model is fitted
# over every active target).
w12=(--from 2026-12-24T00:00:00Z --to 2026-12-25T00:00:00Z --json)
"$bin" windows --db "$tmp/site.db" "${w12[@]}" >"$tmp/all.json"
"$bin" windows --db "$tmp/site.db" "${w12[@]}" --target OSPREY >"$tmp/one.json"
/usr/bin/python3 - "$tmp/all.json" "$tmp/one.json" <<'PY'
import json, sys
a = json.load(open(sys.argv[1]))["windows"]
o = json.load(open(sys.argv[2]))["windows"]
assert o and all(w["target"] == "OSPREY" for w in o), o
for w in o:
    m = [x for x in a if x["target"] == "OSPREY" and x["start"] == w["start"]]
    assert len(m) == 1 and m[0]["score"] == w["score"], (w, m)
PY
expect_usage_error windows --db "$tmp/site.db" --target NOPE "${span[@]}"
grep -q "NOPE" "$tmp/err" || fail "unknown target is named"
echo "cli_windows ok"
