#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# load.sh: load and crash tests of "moonrange serve" on 127.0.0.1, bounded
# in time and count.
#   1. wrk against /status, /now and /windows while 2,000 authenticated
#      POSTs run: figures printed; fails on any non-2xx answer, socket
#      error or time-out, or a row count other than 2,000 new.
#   2. ROUNDS rounds of kill -9 during a POST stream: integrity_check ok
#      and every acknowledged (201) attempt stored.
#   3. ROUNDS rounds of kill -9 during a log import: integrity_check ok
#      and all rows or none.
#   4. A busy database (another process holds the write lock): /status
#      and /now still answer while a POST waits for the lock, which then
#      succeeds.
# usage: load.sh MOONRANGE_BINARY [WRK_SECONDS] [ROUNDS]
set -euo pipefail

BIN=${1:?usage: load.sh MOONRANGE_BINARY [WRK_SECONDS] [ROUNDS]}
WSECS=${2:-10}
ROUNDS=${3:-10}
PY=/usr/bin/python3
T=$(mktemp -d /tmp/moonrange-load-XXXXXX)
PID=
BG=()
# shellcheck source=tests/lib.sh
source "$(dirname "$0")/../lib.sh"
trap lib_cleanup EXIT
fail() { echo "FAIL: $*" >&2; tail -n 20 "$T/err" >&2 2>/dev/null || true; exit 1; }
command -v wrk > /dev/null || fail "wrk is not installed (apt-get install wrk)"

TOKEN=load-test-token-$RANDOM$RANDOM$RANDOM
printf '%s\n' "$TOKEN" > "$T/token"
chmod 600 "$T/token"

start_daemon() {	# $1: database
	: > "$T/out"
	"$BIN" serve --db "$1" --listen 127.0.0.1:0 --token-file "$T/token" \
		--refresh 600 --log-level warn > "$T/out" 2>> "$T/err" &
	PID=$!
	URL=$(lib_serve_url "$T/out" 300 0.05)
	[[ -n "$URL" ]] || fail "the daemon did not start"
}
stop_daemon() {
	kill -TERM "$PID"
	wait "$PID" || fail "exit status $? after SIGTERM"
	PID=
}
# One attempt as JSON: worker $1, number $2 (a distinct start each).
body() {
	local n=$(($1 * 100000 + $2))
	printf -v s '2027-%02d-%02dT%02d:%02d' $((1 + n / 40320 % 12)) \
		$((1 + n / 1440 % 28)) $((n / 60 % 24)) $((n % 60))
	printf '{"target":"HERON","start_utc":"%s:00Z","end_utc":"%s:30Z","shots":600,"returns":5,"normal_points":1,"outcome":"ranged","operator":"load %d"}' "$s" "$s" "$1"
}
post() {	# prints the status code
	curl -s -m 30 -o /dev/null -w '%{http_code}\n' -X POST \
		-H "Authorization: Bearer $TOKEN" \
		-H 'Content-Type: application/json' --data "$1" \
		"${URL}api/v1/attempts" || echo 000
}
rows() { sqlite3 "$1" 'SELECT count(*) FROM attempts'; }

# --- 1. wrk while 2,000 POSTs run ------------------------------------------
"$BIN" init --db "$T/db" > /dev/null
before=$(rows "$T/db")
start_daemon "$T/db"
poster() {	# 4 workers x 500 POSTs
	for i in $(seq 0 499); do post "$(body "$1" "$i")"; done > "$T/posts$1"
}
t0=$(date +%s%N)
for w in 1 2 3 4; do poster "$w" & BG+=($!); done
for p in status now "windows?days=3"; do
	wrk -t1 -c4 -d"${WSECS}s" --timeout 10s "${URL}api/v1/$p" \
		> "$T/wrk-${p%%\?*}" 2>&1 & BG+=($!)
done
for p in "${BG[@]}"; do wait "$p"; done
BG=()
t1=$(date +%s%N)
new=$(( $(rows "$T/db") - before ))
created=$(cat "$T"/posts? | grep -c '^201$' || true)
others=$(cat "$T"/posts? | grep -vc '^201$' || true)
ms=$(( (t1 - t0) / 1000000 ))
echo "load: 2000 POSTs in $((ms / 1000)).$((ms % 1000 / 100)) s: $created answered 201, $others otherwise, $new rows added"
for p in status now windows; do
	rps=$(sed -n 's/^Requests\/sec: *//p' "$T/wrk-$p")
	lat=$(awk '/Latency/ {print $2 " mean, " $4 " max"}' "$T/wrk-$p")
	n=$(awk '/requests in/ {print $1}' "$T/wrk-$p")
	echo "load: wrk /$p: $n requests, $rps req/s, latency $lat"
	if grep -q 'Non-2xx\|Socket errors' "$T/wrk-$p"; then
		cat "$T/wrk-$p" >&2
		fail "wrk /$p: errors or non-2xx answers"
	fi
	[[ ${n:-0} -gt 0 ]] || fail "wrk /$p: no request answered"
done
[[ $others -eq 0 ]] || fail "$others POSTs were not answered 201: $(cat "$T"/posts? | sort | uniq -c | tr '\n' ' ')"
[[ $new -eq 2000 ]] || fail "$new rows added, want 2000"
stop_daemon
[[ $(sqlite3 "$T/db" 'PRAGMA integrity_check') == ok ]] || fail "integrity after the load"

# --- 2. kill -9 during a POST stream -----------------------------------------
lost=0
for r in $(seq "$ROUNDS"); do
	start_daemon "$T/db"
	( i=0; while :; do
		b=$(body $((10 + r)) "$i")
		if [[ $(post "$b") == 201 ]]; then
			echo "$b" | sed 's/.*"start_utc":"\([^"]*\)".*/\1/' >> "$T/acked$r"
		fi
		i=$((i + 1))
	done ) & BG+=($!)
	sleep "0.$((RANDOM % 9 + 1))"
	kill -KILL "$PID"
	wait "$PID" 2>/dev/null || true
	PID=
	kill "${BG[0]}" 2>/dev/null || true
	wait "${BG[0]}" 2>/dev/null || true
	BG=()
	[[ $(sqlite3 "$T/db" 'PRAGMA integrity_check') == ok ]] || fail "round $r: integrity"
	acked=0
	if [[ -f "$T/acked$r" ]]; then
		while read -r s; do
			acked=$((acked + 1))
			s=${s%Z}
			c=$(sqlite3 "$T/db" "SELECT count(*) FROM attempts WHERE start_utc = '$s.000Z' AND operator = 'load $((10 + r))'")
			[[ $c -eq 1 ]] || lost=$((lost + 1))
		done < "$T/acked$r"
	fi
	echo "load: kill -9 round $r during POSTs: $acked acknowledged, integrity ok"
done
[[ $lost -eq 0 ]] || fail "$lost acknowledged attempts lost"

# --- 3. kill -9 during an import ---------------------------------------------
"$BIN" init --db "$T/imp" > /dev/null
base=$(rows "$T/imp")
lib_big_attempts_csv "$T/big.csv" 2028 20000
for r in $(seq "$ROUNDS"); do
	"$BIN" log import --db "$T/imp" "$T/big.csv" > /dev/null 2>&1 & ip=$!
	sleep "0.$((RANDOM % 9 + 1))"
	kill -KILL "$ip" 2>/dev/null || true
	wait "$ip" 2>/dev/null || true
	[[ $(sqlite3 "$T/imp" 'PRAGMA integrity_check') == ok ]] || fail "import round $r: integrity"
	n=$(( $(rows "$T/imp") - base ))
	[[ $n -eq 0 || $n -eq 20000 ]] || fail "import round $r: $n rows, want 0 or 20000"
	echo "load: kill -9 round $r during an import: $n of 20000 rows, integrity ok"
	if [[ $n -eq 20000 ]]; then	# it finished first: start again
		sqlite3 "$T/imp" "DELETE FROM attempts WHERE start_utc >= '2028'"
	fi
done

# --- 4. a busy database ------------------------------------------------------
start_daemon "$T/db"
$PY - "$T/db" 4 <<'PYEOF' & BG+=($!)
import sqlite3, sys, time
c = sqlite3.connect(sys.argv[1], isolation_level=None, timeout=30)
c.execute("BEGIN IMMEDIATE")
open(sys.argv[1] + ".locked", "w").close()
time.sleep(float(sys.argv[2]))
c.execute("ROLLBACK")
PYEOF
for _ in $(seq 100); do [[ -f "$T/db.locked" ]] && break; sleep 0.05; done
post "$(body 99 1)" > "$T/busy-post" & BG+=($!)
sleep 0.5
for p in status now; do
	code=$(curl -s -m 3 -o /dev/null -w '%{http_code}' "${URL}api/v1/$p" || echo 000)
	[[ $code == 200 ]] || fail "busy database: /$p answered $code while a POST waited"
done
[[ ! -s "$T/busy-post" ]] || fail "busy database: the POST did not wait for the lock"
echo "load: busy database: /status and /now answered while a POST waited for the lock"
for p in "${BG[@]}"; do wait "$p"; done
BG=()
[[ $(cat "$T/busy-post") == 201 ]] || fail "busy database: the POST answered $(cat "$T/busy-post") after the lock"
stop_daemon
echo "load.sh: ok"
