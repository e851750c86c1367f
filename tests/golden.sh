#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# golden.sh: the outputs of valid queries on the sample site, byte for
# byte against tests/golden/ (command line in its text, --json, --csv,
# --ics and SVG forms, and the HTTP API's answers), so that a refactoring
# of the layers cannot change what users read.  Every instant is pinned
# (--at, --from/--to, since/until); the one clock-dependent line, the
# iCalendar DTSTAMP, is blanked on both sides.
# Usage: golden.sh MOONRANGE_BINARY SOURCE_DIR [--update]
#   --update rewrites tests/golden/ from the binary (review the diff).
set -euo pipefail
BIN=${1:?usage: golden.sh MOONRANGE_BINARY SOURCE_DIR [--update]}
SRC=${2:?usage: golden.sh MOONRANGE_BINARY SOURCE_DIR [--update]}
UPDATE=${3:-}
G=$SRC/tests/golden
T=$(mktemp -d "${TMPDIR:-/tmp}/moonrange-golden.XXXXXX")
# shellcheck source=tests/lib.sh
source "$(dirname "$0")/lib.sh"
PID=
cleanup() {
	if [[ -n "$PID" ]] && kill -0 "$PID" 2>/dev/null; then
		kill -TERM "$PID" 2>/dev/null || true
		wait "$PID" 2>/dev/null || true
	fi
	rm -rf "$T"
}
trap cleanup EXIT
bad=0
n=0

# The clock-dependent line of iCalendar output.
clean() { sed -E 's/^DTSTAMP:[0-9TZ]+\r?$/DTSTAMP:-/'; }

# check NAME FILE: compare (or, with --update, store) one output.
check() {
	local want=$G/$1
	n=$((n + 1))
	if [[ $UPDATE == --update ]]; then
		mkdir -p "$(dirname "$want")"
		clean < "$2" > "$want"
		return
	fi
	if [[ ! -f $want ]]; then
		echo "golden: $1: no such file in tests/golden (run with --update)"
		bad=1
	elif ! clean < "$2" | cmp -s - "$want"; then
		echo "golden: $1 differs:"
		clean < "$2" | diff "$want" - | head -20
		bad=1
	fi
}

# cli NAME ARGS...: run the command, which must succeed, and check stdout.
cli() {
	local name=$1
	shift
	if ! "$BIN" "$@" > "$T/out" 2> "$T/err"; then
		echo "golden: cli/$name: '$*' failed: $(cat "$T/err")"
		bad=1
		return
	fi
	check "cli/$name" "$T/out"
}

DB=$T/site.db
"$BIN" init --db "$DB" --site "$SRC/sample-site" > /dev/null
ST=38.9712,-114.3098,2950
AT=2027-03-15T04:00:00Z
SPAN=(--from 2027-03-14T00:00:00Z --to 2027-03-21T00:00:00Z)

cli ephem.txt ephem --db "$DB" --at "$AT" --wide
cli ephem_80.txt ephem --db "$DB" --at "$AT"
cli ephem.json ephem --db "$DB" --at "$AT" --json
cli ephem_station.txt ephem --station "$ST" --at "$AT" --dut1 0.1 --tz Europe/Berlin --wide
cli ephem_station.json ephem --station "$ST" --at "$AT" --target X=10,20,0 --json
cli phases.txt phases --from 2027-01-01T00:00:00Z --days 90
cli phases_tz.txt phases --from 2027-01-01T00:00:00Z --to 2027-03-01T00:00:00Z --db "$DB"
cli phases.json phases --from 2027-01-01T00:00:00Z --days 90 --json
cli windows.txt windows --db "$DB" "${SPAN[@]}" --wide
cli windows_80.txt windows --db "$DB" "${SPAN[@]}"
cli windows.json windows --db "$DB" "${SPAN[@]}" --json
cli windows.csv windows --db "$DB" "${SPAN[@]}" --csv
cli windows.ics windows --db "$DB" "${SPAN[@]}" --ics
cli windows_target.json windows --db "$DB" --from 2027-03-14T00:00:00Z --days 10 --target HERON --limit 3 --json
cli windows_limits.txt windows --db "$DB" "${SPAN[@]}" --min-el 30 --max-sun-el -18 --min-sun-sep 40 --tz UTC --wide
cli windows_station.json windows --station "$ST" "${SPAN[@]}" --json
cli tonight.txt tonight --db "$DB" --at 2027-03-15T20:00:00Z
cli tonight.json tonight --db "$DB" --at 2027-03-15T20:00:00Z --json
cli tonight_station.txt tonight --station "$ST" --tz America/Denver --at 2027-03-15T20:00:00Z --limit 3
cli plan.txt plan --db "$DB" --at 2027-03-15T20:00:00Z
cli plan.json plan --db "$DB" --from 2027-03-15T20:00:00Z --to 2027-03-16T20:00:00Z --json
cli plan_greedy.csv plan --db "$DB" --at 2027-03-15T20:00:00Z --method greedy --csv
cli coverage.txt coverage --db "$DB" --horizon 0
cli coverage.json coverage --db "$DB" --horizon 0 --json
cli coverage.csv coverage --db "$DB" --horizon 0 --csv
cli coverage.svg coverage --db "$DB" --horizon 0 --svg -
cli coverage_attempts.json coverage --db "$DB" --source attempts --axis anomaly --bins 8 --min-count 2 --since 2025-06-01T00:00:00Z --until 2026-06-01T00:00:00Z --target HERON --horizon 0 --json
cli station.txt station show --db "$DB"
cli station.json station show --db "$DB" --json
cli targets.txt target list --db "$DB" --all
cli targets.json target list --db "$DB" --all --json
cli settings.txt setting list --db "$DB"
cli blackouts.txt blackout list --db "$DB" --since 2025-01-01T00:00:00Z --until 2028-01-01T00:00:00Z
cli log.txt log list --db "$DB" --since 2026-01-01T00:00:00Z --until 2026-03-01T00:00:00Z --all
cli log.json log list --db "$DB" --since 2026-01-01T00:00:00Z --until 2026-03-01T00:00:00Z --json --all --order oldest
cli log_export.csv log export --db "$DB" --csv --since 2026-01-01T00:00:00Z
cli np_count.txt np count --db "$DB" --since 2025-01-01T00:00:00Z --until 2027-01-01T00:00:00Z

# --- the HTTP API, on an ephemeral loopback port ---
"$BIN" serve --db "$DB" --listen 127.0.0.1:0 --refresh 86400 \
	> "$T/serve.out" 2> "$T/serve.err" &
PID=$!
URL=$(lib_serve_url "$T/serve.out" 100 0.1)
if [[ -z $URL ]]; then
	echo "golden: the daemon did not start: $(cat "$T/serve.err")"
	exit 1
fi

# api NAME PATH: GET, which must answer 200, and check the body.
api() {
	local code
	code=$(curl -s --max-time 60 -o "$T/body" -w '%{http_code}' "$URL$2")
	if [[ $code != 200 ]]; then
		echo "golden: api/$1: GET $2 answered $code: $(head -c 300 "$T/body")"
		bad=1
		return
	fi
	check "api/$1" "$T/body"
}

F=from=2027-03-14T00:00:00Z\&to=2027-03-21T00:00:00Z
api site.json api/v1/site
api targets.json api/v1/targets
api now.json "api/v1/now?at=$AT"
api phases.json "api/v1/phases?from=2027-01-01T00:00:00Z&days=90"
api windows.json "api/v1/windows?$F"
api windows_target.json "api/v1/windows?from=2027-03-14T00:00:00Z&days=10&target=HERON&limit=3"
api windows.ics "api/v1/windows.ics?$F"
api coverage.json "api/v1/coverage?horizon=0"
api coverage.csv "api/v1/coverage.csv?horizon=0"
api coverage.svg "api/v1/coverage.svg?horizon=0"
api coverage_attempts.json "api/v1/coverage?source=attempts&axis=anomaly&bins=8&min_count=2&since=2025-06-01T00:00:00Z&until=2026-06-01T00:00:00Z&target=HERON&horizon=0"
api attempts.json "api/v1/attempts?since=2026-01-01T00:00:00Z&until=2026-03-01T00:00:00Z&limit=20"
api attempts_oldest.json "api/v1/attempts?since=2026-01-01T00:00:00Z&until=2026-03-01T00:00:00Z&order=oldest&limit=20"
api attempt_1.json api/v1/attempts/1

if [[ $UPDATE == --update ]]; then
	echo "golden: wrote $n files into $G"
	exit 0
fi
[[ $bad == 0 ]] || exit 1
echo "golden: $n outputs as before"
