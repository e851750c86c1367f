#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# coverage_cli.sh: "moonrange coverage" on the sample site, end to end:
# table, JSON, CSV and SVG show the gaps near new and full moon, the fill
# dates land in empty bins, and bad input exits 2 with one line.
# Exercises daemon/cli/cmd_coverage.c, daemon/query/covquery.c, daemon/core/coverage.c,
# daemon/formats/render_cov.c.  Usage: coverage_cli.sh MOONRANGE SOURCE_DIR
set -euo pipefail

bin=$1
src=$2
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
py=/usr/bin/python3
fail() { echo "FAIL: $*" >&2; exit 1; }

db=$tmp/demo.db
"$bin" init --db "$db" --site "$src/sample-site" >/dev/null

# --- the table ---------------------------------------------------------
"$bin" coverage --db "$db" --horizon 45 >"$tmp/table.txt"
grep -q "new moon" "$tmp/table.txt" || fail "table lacks the new-moon row"
grep -q "full moon" "$tmp/table.txt" || fail "table lacks the full-moon row"
grep -q "Metrics" "$tmp/table.txt" || fail "table lacks the metrics"
grep -q "^Fill dates " "$tmp/table.txt" || fail "no fill section"

# --- JSON: gaps near new and full moon, fill dates in empty bins --------
"$bin" coverage --db "$db" --json --horizon 45 >"$tmp/cov.json"
$py - "$tmp/cov.json" <<'EOF'
import json, sys
d = json.load(open(sys.argv[1]))
assert d["axis"] == "synodic" and d["bins"] == 12, d["axis"]
n = d["pooled"]["counts"]
m = d["pooled"]["metrics"]
assert len(n) == 12 and sum(n) == m["total"] > 0, n
mean = sum(n) / 12.0
# Near new moon: bins 11, 0 (330-30 deg); near full: bins 5, 6 (150-210).
new = min(n[11], n[0])
full = min(n[5], n[6])
quarters = min(max(n[2], n[3]), max(n[8], n[9]))
assert new < 0.5 * mean, ("no gap near new moon", n)
assert full < 0.5 * mean, ("no gap near full moon", n)
assert quarters > mean, ("quarters not the best sampled", n)
assert 0.0 <= m["entropy"] < 1.0 and m["chi_square_p"] < 0.05, m
for b in d["fill"]["bins"]:
    assert n[b["bin"]] == b["count"] < d["min_count"], b
print("pooled counts", n)
EOF

# --- fill dates with a higher threshold: the sparse full-moon bins get
# windows, and each date's synodic angle (from "moonrange ephem") lies in
# its bin ---------------------------------------------------------------
"$bin" coverage --db "$db" --json --min-count 5 --horizon 60 >"$tmp/fill.json"
$py - "$tmp/fill.json" >"$tmp/dates.txt" <<'EOF'
import json, sys
d = json.load(open(sys.argv[1]))
bins = {b["bin"]: b for b in d["fill"]["bins"]}
n = d["pooled"]["counts"]
assert 5 in bins or 6 in bins, ("full-moon bins not below 5", n)
got = 0
for b in bins.values():
    assert n[b["bin"]] < 5
    for x in b["dates"]:
        print(b["bin"], x["in_bin_start_utc"], x["in_bin_end_utc"])
        got += 1
assert got > 0, "no fill dates at all"
EOF
while read -r b t0 t1; do
	for t in "$t0" "$t1"; do
		syn=$("$bin" ephem --at "$t" --json | $py -c \
		    'import json,sys; print(json.load(sys.stdin)["moon"]["synodic_angle_deg"])')
		$py -c "import sys; s=float('$syn'); sys.exit(0 if int(s // 30) == $b else 1)" ||
		    fail "fill date $t has synodic angle $syn, not in bin $b"
	done
done <"$tmp/dates.txt"
[ -s "$tmp/dates.txt" ] || fail "no fill dates"

# --- CSV: one row per bin and scope, CRLF ------------------------------
"$bin" coverage --db "$db" --csv --horizon 0 >"$tmp/cov.csv"
$py - "$tmp/cov.csv" "$tmp/cov.json" <<'EOF'
import csv, json, sys
raw = open(sys.argv[1], "rb").read()
assert raw.count(b"\r\n") == raw.count(b"\n"), "CSV lines must end CRLF"
rows = list(csv.DictReader(open(sys.argv[1], newline="")))
d = json.load(open(sys.argv[2]))
pooled = [int(r["count"]) for r in rows if r["scope"] == "pooled"]
assert pooled == d["pooled"]["counts"], (pooled, d["pooled"]["counts"])
assert len(rows) == 12 * (1 + len(d["targets"]) + len(d["years"]))
EOF

# --- SVG: well-formed, one mark per bin labelled with its count --------
"$bin" coverage --db "$db" --horizon 0 --svg "$tmp/cov.svg"
xmllint --noout "$tmp/cov.svg" || fail "SVG is not well-formed XML"
marks=$(xmllint --xpath 'count(//*[local-name()="path"][starts-with(@class,"bin")])' "$tmp/cov.svg")
[ "$marks" = 12 ] || fail "SVG has $marks bin marks, want 12"
$py - "$tmp/cov.json" "$tmp/cov.svg" <<'EOF'
import json, sys, xml.etree.ElementTree as ET
d = json.load(open(sys.argv[1]))
ns = "{http://www.w3.org/2000/svg}"
root = ET.parse(sys.argv[2]).getroot()
labels = {int(t.get("data-bin")): int(t.text)
          for t in root.iter(ns + "text") if t.get("class") == "count"}
assert [labels[i] for i in range(12)] == d["pooled"]["counts"], labels
assert root.find(ns + "title") is not None and root.find(ns + "desc") is not None
EOF

# --- the chart's palette: light by default, dark on request ------------
grep -q 'class="theme-light"' "$tmp/cov.svg" || fail "the default chart is not light"
"$bin" coverage --db "$db" --horizon 0 --theme dark --svg "$tmp/dark.svg"
xmllint --noout "$tmp/dark.svg" || fail "dark SVG is not well-formed XML"
grep -q 'class="theme-dark"' "$tmp/dark.svg" || fail "--theme dark is not dark"

# --- the same bytes twice (no clock in the output without fill dates) ---
"$bin" coverage --db "$db" --json --horizon 0 >"$tmp/a.json"
"$bin" coverage --db "$db" --json --horizon 0 >"$tmp/b.json"
cmp -s "$tmp/a.json" "$tmp/b.json" || fail "two runs differ"

# --- bad input: exit 2 and one line naming the field --------------------
expect_usage() {
	local want=$1; shift
	set +e
	"$bin" coverage "$@" >"$tmp/out" 2>"$tmp/err"
	local st=$?
	set -e
	[ "$st" = 2 ] || fail "'$*' exited $st, want 2"
	[ "$(wc -l <"$tmp/err")" = 1 ] || fail "'$*': not one line on stderr"
	grep -q "^moonrange: error: .*$want" "$tmp/err" ||
	    fail "'$*': stderr does not name $want: $(cat "$tmp/err")"
	[ ! -s "$tmp/out" ] || fail "'$*' printed to stdout"
}
expect_usage "bins" --db "$db" --bins 3
expect_usage "bins" --db "$db" --bins 12x
expect_usage "--min-count" --db "$db" --min-count 0
expect_usage "axis" --db "$db" --axis phase
expect_usage "since" --db "$db" --since 2026-13-01T00:00:00Z
expect_usage "until" --db "$db" --since 2026-06-01T00:00:00Z --until 2026-01-01T00:00:00Z
expect_usage "target" --db "$db" --target NOSUCH
expect_usage "horizon" --db "$db" --horizon -5
expect_usage "db" --db "$tmp/missing.db"
expect_usage "db"
expect_usage "--theme" --db "$db" --theme grey --svg "$tmp/x.svg"
expect_usage "--theme" --db "$db" --theme dark
"$bin" coverage --help | grep -q -- "--min-count" || fail "--help"
echo "coverage_cli: ok"
