#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# sighup_stress.sh: SIGHUP every 50 ms while 3 workers POST attempts and
# 3 workers GET /status, /now, /targets and /windows, on 127.0.0.1, for a
# bounded number of seconds.  Passes when the daemon is alive throughout,
# every 201 is a row in the database, no answer is a 5xx, and it stops on
# SIGTERM with exit status 0 (a ThreadSanitizer build exits non-zero when
# it saw a race).  The reload once shared the handlers' SQLite connection
# without their lock and crashed here.
# usage: sighup_stress.sh MOONRANGE_BINARY [SECONDS]
set -euo pipefail

BIN=${1:?usage: sighup_stress.sh MOONRANGE_BINARY [SECONDS]}
SECS=${2:-5}
T=$(mktemp -d /tmp/moonrange-hup-XXXXXX)
PID=
BG=()
# shellcheck source=tests/lib.sh
source "$(dirname "$0")/../lib.sh"
trap lib_cleanup EXIT
fail() { echo "FAIL: $*" >&2; tail -n 40 "$T/err" >&2 || true; exit 1; }

"$BIN" init --db "$T/db" > /dev/null
before=$(sqlite3 "$T/db" 'SELECT count(*) FROM attempts')
TOKEN=hup-stress-token-$RANDOM$RANDOM$RANDOM
printf '%s\n' "$TOKEN" > "$T/token"
chmod 600 "$T/token"
"$BIN" serve --db "$T/db" --listen 127.0.0.1:0 --token-file "$T/token" \
	--refresh 10 --log-level warn > "$T/out" 2> "$T/err" &
PID=$!
URL=$(lib_serve_url "$T/out" 300 0.1)
[[ -n "$URL" ]] || fail "the daemon did not start"
END=$((SECONDS + SECS))

post_worker() {	# $1: worker number; one line per answer: status code
	local i=0 n code
	while ((SECONDS < END)); do
		n=$(($1 * 20000 + i))
		printf -v start '2027-%02d-%02dT%02d:%02d' \
			$((1 + n / 40320 % 12)) $((1 + n / 1440 % 28)) \
			$((n / 60 % 24)) $((n % 60))
		code=$(curl -s -m 30 -o /dev/null -w '%{http_code}' -X POST \
			-H "Authorization: Bearer $TOKEN" \
			-H 'Content-Type: application/json' \
			--data "{\"target\":\"HERON\",\"start_utc\":\"$start:00Z\",\"end_utc\":\"$start:30Z\",\"shots\":600,\"returns\":5,\"normal_points\":1,\"outcome\":\"ranged\",\"operator\":\"hup$1\"}" \
			"${URL}api/v1/attempts" || echo 000)
		echo "$code"
		i=$((i + 1))
	done > "$T/post$1"
}
get_worker() {
	local paths=(status now targets "windows?days=2")
	local i=0
	while ((SECONDS < END)); do
		curl -s -m 30 -o /dev/null -w '%{http_code}\n' \
			"${URL}api/v1/${paths[i % 4]}" || echo 000
		i=$((i + 1))
	done > "$T/get$1"
}
for w in 1 2 3; do
	post_worker "$w" & BG+=($!)
	get_worker "$w" & BG+=($!)
done
hups=0
while ((SECONDS < END)); do
	kill -0 "$PID" 2>/dev/null || fail "the daemon died after $hups SIGHUPs"
	kill -HUP "$PID"
	hups=$((hups + 1))
	sleep 0.05
done
for w in "${BG[@]}"; do wait "$w" || true; done
BG=()
kill -0 "$PID" 2>/dev/null || fail "the daemon died after $hups SIGHUPs"
kill -TERM "$PID"
set +e
wait "$PID"; st=$?
set -e
PID=
[[ $st -eq 0 ]] || fail "exit status $st after SIGTERM ($hups SIGHUPs)"
if grep -q 'ThreadSanitizer\|AddressSanitizer\|runtime error' "$T/err"; then
	fail "sanitizer report"
fi
posted=$(cat "$T"/post? | grep -c '^201$' || true)
bad=$(cat "$T"/post? "$T"/get? | grep -vc '^[24][0-9][0-9]$' || true)
gets=$(cat "$T"/get? | grep -c '^200$' || true)
rows=$(( $(sqlite3 "$T/db" 'SELECT count(*) FROM attempts') - before ))
echo "sighup_stress: ${SECS} s, $hups SIGHUPs, $posted POSTs stored, $gets GETs answered 200, $bad other answers"
[[ $bad -eq 0 ]] || fail "$bad answers were 5xx or no answer: $(cat "$T"/post? "$T"/get? | sort | uniq -c | tr '\n' ' ')"
[[ $posted -gt 0 && $gets -gt 0 ]] || fail "no request got through"
[[ $rows -eq $posted ]] || fail "$posted POSTs answered 201 but $rows rows were added"
[[ $(sqlite3 "$T/db" 'PRAGMA integrity_check') == ok ]] || fail "integrity"
echo "sighup_stress.sh: ok"
