#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# serve.sh: black-box test of "moonrange serve" on 127.0.0.1 with a
# temporary database of the sample site: startup refusals, the bound URL,
# the event log, SIGHUP, a write, and a SIGTERM that lets a request in
# flight finish.  Exercises daemon/cli/cmd_serve.c, daemon/http/web.c, api.c, log.c.
set -euo pipefail

BIN=${1:?usage: serve.sh MOONRANGE_BINARY}
T=$(mktemp -d /tmp/moonrange-serve-XXXXXX)
PID=
cleanup() {
	if [[ -n "$PID" ]] && kill -0 "$PID" 2>/dev/null; then
		kill -KILL "$PID" 2>/dev/null || true
	fi
	rm -rf "$T"
}
trap cleanup EXIT

fail() { echo "FAIL: $*" >&2; echo "--- stderr of the daemon:" >&2; cat "$T/err" >&2 || true; exit 1; }

# Wait until FILE holds a line matching RE (at most 10 s).
wait_for() {
	for _ in $(seq 100); do
		grep -Eq "$2" "$1" 2>/dev/null && return 0
		sleep 0.1
	done
	fail "no line /$2/ in $1"
}

"$BIN" init --db "$T/db" > /dev/null
TOKEN=serve-test-token-$RANDOM$RANDOM$RANDOM
printf '%s\n' "$TOKEN" > "$T/token"
chmod 600 "$T/token"

# --- refusals: exit 2 and one error line naming the problem ---
set +e
"$BIN" serve --db "$T/db" --listen 0.0.0.0:0 2> "$T/e1"; st=$?
set -e
[[ $st -eq 2 ]] || fail "non-loopback without token: exit $st"
grep -q '^moonrange: error: --listen 0.0.0.0: .*--token-file' "$T/e1" || fail "message: $(cat "$T/e1")"
set +e
"$BIN" serve 2> "$T/e2"; st=$?
"$BIN" serve --db "$T/db" --listen 127.0.0.1:99999 2> "$T/e3"; st3=$?
"$BIN" serve --db "$T/db" --refresh 1 2> "$T/e4"; st4=$?
printf 'short\n' > "$T/short"
"$BIN" serve --db "$T/db" --token-file "$T/short" 2> "$T/e5"; st5=$?
"$BIN" serve --db "$T/missing.db" --listen 127.0.0.1:0 2> "$T/e6"; st6=$?
set -e
[[ $st -eq 2 ]] && grep -q -- '--db FILE is required' "$T/e2" || fail "no --db"
[[ $st3 -eq 2 ]] && grep -q 'port' "$T/e3" || fail "bad port"
[[ $st4 -eq 2 ]] && grep -q -- '--refresh' "$T/e4" || fail "bad refresh"
[[ $st5 -eq 2 ]] && grep -q -- '--token-file' "$T/e5" || fail "short token"
[[ $st6 -ne 0 ]] && grep -q 'missing.db' "$T/e6" || fail "missing database"
"$BIN" serve --help | grep -q -- '--token-file' || fail "serve --help"
"$BIN" demo --help | grep -q -- '--data-dir' || fail "demo --help"

# --- start on an ephemeral port ---
"$BIN" serve --db "$T/db" --listen 127.0.0.1:0 --token-file "$T/token" \
	--refresh 10 > "$T/out" 2> "$T/err" &
PID=$!
wait_for "$T/out" '^moonrange: serving http://127\.0\.0\.1:[0-9]+/$'
URL=$(sed -n 's/^moonrange: serving //p' "$T/out")
PORT=${URL##*:}
PORT=${PORT%/}
[[ $PORT -gt 0 ]] || fail "port $PORT"
wait_for "$T/err" 'plan refreshed \(start\)'

curl -s -D "$T/h" -o "$T/status" "${URL}api/v1/status"
grep -q '^HTTP/1.1 200' "$T/h" || fail "status: $(head -1 "$T/h")"
grep -qi "^Content-Security-Policy: default-src 'self'" "$T/h" || fail "CSP"
grep -qi '^X-Content-Type-Options: nosniff' "$T/h" || fail "nosniff"
grep -q '"last_utc": "20' "$T/status" || fail "no plan time in status"
curl -s -o /dev/null -w '%{http_code}' "${URL}" | grep -q 200 || fail "page"

# --- a path carrying a line break and an escape stays one plain log line ---
curl -s -o /dev/null --path-as-is "${URL}x%0a2027-01-01T00:00:00.000Z%20error%20forged%1b%5b31m"
wait_for "$T/err" 'GET /x 2027-01-01T00:00:00.000Z error forged\?\[31m -> 404'
if grep -q $'\x1b' "$T/err"; then
	fail "a control character reached the log"
fi

# --- a write, then the plan is recomputed ---
code=$(curl -s -o "$T/post" -w '%{http_code}' -X POST \
	-H "Authorization: Bearer $TOKEN" -H 'Content-Type: application/json' \
	--data '{"target":"HERON","start_utc":"2027-01-10T03:00:00Z","end_utc":"2027-01-10T03:20:00Z","shots":12000,"returns":40,"normal_points":1,"outcome":"ranged","operator":"blackbox"}' \
	"${URL}api/v1/attempts")
[[ $code == 201 ]] || fail "POST gave $code: $(cat "$T/post")"
wait_for "$T/err" 'plan refreshed \(data changed\)'
[[ $("$BIN" log list --db "$T/db" --json | grep -c '"operator": "blackbox"') -eq 1 ]] \
	|| fail "the CLI does not see the posted attempt"

# --- SIGHUP re-reads the site ---
kill -HUP "$PID"
wait_for "$T/err" 'SIGHUP: site reloaded \(5 targets'

# --- SIGTERM with a request in flight: it still gets its answer ---
BODY='{"target":"TERN","start_utc":"2027-01-11T03:00:00Z","end_utc":"2027-01-11T03:20:00Z","shots":9000,"returns":0,"normal_points":0,"outcome":"no_returns","operator":"inflight"}'
exec 3<>"/dev/tcp/127.0.0.1/$PORT"
printf 'POST /api/v1/attempts HTTP/1.1\r\nHost: 127.0.0.1\r\nConnection: close\r\nAuthorization: Bearer %s\r\nContent-Type: application/json\r\nContent-Length: %d\r\n\r\n%s' \
	"$TOKEN" "${#BODY}" "${BODY:0:40}" >&3
sleep 0.3
kill -TERM "$PID"
sleep 0.3
# The request began before the signal: send the rest of its body now.
printf '%s' "${BODY:40}" >&3
cat <&3 > "$T/inflight" || true
exec 3<&-
grep -q '^HTTP/1.1 201' "$T/inflight" || fail "in-flight request: $(head -c 300 "$T/inflight")"
set +e
wait "$PID"; st=$?
set -e
PID=
[[ $st -eq 0 ]] || fail "exit status $st after SIGTERM"
grep -q 'signal SIGTERM: shutting down' "$T/err" || fail "no shutdown line"
grep -q 'stopped, database closed' "$T/err" || fail "no stop line"
[[ $(sqlite3 "$T/db" 'PRAGMA integrity_check') == ok ]] || fail "integrity"
[[ $("$BIN" log list --db "$T/db" --json | grep -c '"operator": "inflight"') -eq 1 ]] \
	|| fail "the in-flight attempt was not stored"

# --- the event log: timestamp, level, message; never the token ---
if grep -Ev '^[0-9]{4}-[0-9]{2}-[0-9]{2}T[0-9]{2}:[0-9]{2}:[0-9]{2}\.[0-9]{3}Z (debug|info |warn |error) ' "$T/err"; then
	fail "a log line without time and level"
fi
if grep -qF "$TOKEN" "$T/err" "$T/out"; then
	fail "the token appears in the log"
fi
echo "serve.sh: ok"
