#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# roundtrip.sh: "log export" then "log import" into a fresh database
# gives the same log, after writes from every way in: log add, POST
# /api/v1/attempts (the form's path) and log import, including text with
# quotes, commas, line breaks and accented letters, a leap-second day,
# the largest accepted values and attempts stored as suspicious.  The
# second export must equal the first byte for byte.
# usage: roundtrip.sh MOONRANGE_BINARY SOURCE_DIR
set -euo pipefail
BIN=${1:?usage: roundtrip.sh MOONRANGE_BINARY SOURCE_DIR}
SRC=${2:?}
T=$(mktemp -d /tmp/moonrange-rt-XXXXXX)
PID=
# shellcheck source=tests/lib.sh
source "$(dirname "$0")/lib.sh"
trap lib_cleanup EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

mkdir "$T/site"
cp "$SRC"/sample-site/station.ini "$SRC"/sample-site/targets.csv \
	"$SRC"/sample-site/eop.finals "$T/site/"
"$BIN" init --db "$T/a.db" --site "$T/site" > /dev/null
"$BIN" init --db "$T/b.db" --site "$T/site" > /dev/null

# 1. log add: odd text, a leap-second day, the limits of the rules.
add() { "$BIN" log add --db "$T/a.db" "$@" > /dev/null 2>> "$T/warn"; }
add --target HERON --start 2016-12-31T11:00:00Z --end 2016-12-31T11:10:00Z \
	--shots 12000 --returns 30 --normal-points 2 --outcome ranged \
	--operator 'Zoë "Z" Ärnström, jr.' --notes $'two\nlines, "quoted"'
add --target TERN --start 2015-06-30T23:59:00Z --end 2015-06-30T23:59:60.5Z \
	--shots 1220 --returns 12200 --normal-points 12200 --outcome ranged \
	--operator op --seeing 0.01
add --target OSPREY --start 2027-01-10T03:00:00Z --end 2027-01-11T03:00:00Z \
	--shots 10 --returns 10 --normal-points 0 --outcome no_returns \
	--operator 'low rate' --seeing 60
# 2. the API (the form posts the same body).
TOKEN=roundtrip-token-$RANDOM$RANDOM$RANDOM
printf '%s\n' "$TOKEN" > "$T/token"
chmod 600 "$T/token"
"$BIN" serve --db "$T/a.db" --listen 127.0.0.1:0 --token-file "$T/token" \
	--log-level error > "$T/out" 2> "$T/err" &
PID=$!
for _ in $(seq 200); do grep -q serving "$T/out" 2>/dev/null && break; sleep 0.05; done
URL=$(sed -n 's/^moonrange: serving //p' "$T/out")
for b in \
	'{"target":"PLOVER","start_utc":"2027-02-01T04:00:00.123Z","end_utc":"2027-02-01T04:20:00Z","shots":20000,"returns":1,"normal_points":1,"outcome":"ranged","operator":"api, \"quoted\"","notes":"tab-free\nnewline ok; ünïcödé","seeing_arcsec":1.25}' \
	'{"target":"SANDPIPER","start_utc":"2027-02-01T04:00:00+01:00","end_utc":"2027-02-01T04:00:01+01:00","shots":0,"returns":0,"normal_points":0,"outcome":"weather","operator":"o"}'; do
	code=$(curl -s -o "$T/post" -w '%{http_code}' -X POST \
		-H "Authorization: Bearer $TOKEN" -H 'Content-Type: application/json' \
		--data "$b" "${URL}api/v1/attempts")
	[[ $code == 201 ]] || fail "POST $code: $(cat "$T/post")"
done
kill -TERM "$PID"; wait "$PID"; PID=
# 3. log import.
cat > "$T/in.csv" <<'CSV'
target,start_utc,end_utc,shots,returns,normal_points,outcome,operator,seeing_arcsec,notes
HERON,2027-03-01T04:00:00Z,2027-03-01T04:10:00Z,600,0,0,no_returns,imp,,"a ""b"", c"
TERN,2027-03-02T04:00:00.5Z,2027-03-02T04:10:00Z,100,5,1,technical,imp,2.5,
CSV
"$BIN" log import --db "$T/a.db" "$T/in.csv" > /dev/null 2>> "$T/warn"

n=$(sqlite3 "$T/a.db" 'SELECT count(*) FROM attempts')
[[ $n -eq 7 ]] || fail "$n attempts stored, want 7"
"$BIN" log export --db "$T/a.db" > "$T/e1.csv"
"$BIN" log import --db "$T/b.db" "$T/e1.csv" > /dev/null 2> "$T/imp.err" ||
	fail "import of the export: $(cat "$T/imp.err")"
"$BIN" log export --db "$T/b.db" > "$T/e2.csv"
cmp -s "$T/e1.csv" "$T/e2.csv" || { diff "$T/e1.csv" "$T/e2.csv" >&2; fail "exports differ"; }
# The suspect flags are recomputed alike.
[[ $(sqlite3 "$T/a.db" 'SELECT group_concat(suspect) FROM (SELECT suspect FROM attempts ORDER BY start_mjd)') == \
   $(sqlite3 "$T/b.db" 'SELECT group_concat(suspect) FROM (SELECT suspect FROM attempts ORDER BY start_mjd)') ]] ||
	fail "suspect flags differ"
echo "roundtrip.sh: ok ($n attempts from log add, the API and log import; export, import, export identical)"
