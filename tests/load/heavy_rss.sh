#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# heavy_rss.sh: the daemon's memory stays bounded under concurrent long
# window queries, on 127.0.0.1.  One query of DAYS days gives the peak
# resident size of one (VmHWM of /proc/PID/status); then 4 such queries
# at once, each with its own start, must all answer 200 and leave the peak
# below that of one plus MARGIN_MB (the bodies waiting to be sent).  Four
# 10-year queries at once once raised the daemon to 237 MB.
# usage: heavy_rss.sh MOONRANGE_BINARY [DAYS] [MARGIN_MB]
set -euo pipefail

BIN=${1:?usage: heavy_rss.sh MOONRANGE_BINARY [DAYS] [MARGIN_MB]}
DAYS=${2:-1000}
MARGIN=${3:-12}
# shellcheck source=tests/lib.sh
source "$(dirname "$0")/../lib.sh"
PID= BG=()
lib_tmpdir rss
trap lib_cleanup EXIT
fail() { echo "FAIL: $*" >&2; tail -n 20 "$T/err" >&2 || true; exit 1; }
hwm_kb() { sed -n 's/^VmHWM:[[:space:]]*\([0-9]*\) kB/\1/p' "/proc/$PID/status"; }

"$BIN" init --db "$T/db" > /dev/null
"$BIN" serve --db "$T/db" --listen 127.0.0.1:0 \
	--log-level warn > "$T/out" 2> "$T/err" &
PID=$!
URL=$(lib_serve_url "$T/out" 300 0.1)
[[ -n "$URL" ]] || fail "the daemon did not start"

code=$(curl -s -m 300 -o "$T/one" -w '%{http_code}' \
	"${URL}api/v1/windows?from=2026-01-01T00:00:00.123Z&days=$DAYS")
[[ "$code" = 200 ]] || fail "one query of $DAYS days: status $code"
one=$(hwm_kb)
for i in 1 2 3 4; do
	curl -s -m 600 -o "$T/b$i" -w '%{http_code}\n' \
		"${URL}api/v1/windows?from=2027-0$i-01T00:00:00Z&days=$DAYS" \
		> "$T/code$i" &
	BG+=($!)
done
for p in "${BG[@]}"; do wait "$p" || true; done
BG=()
for i in 1 2 3 4; do
	[[ "$(cat "$T/code$i")" = 200 ]] || fail "query $i: $(cat "$T/code$i")"
done
four=$(hwm_kb)
kill -0 "$PID" || fail "the daemon died"
echo "peak resident size: one query of $DAYS days $((one / 1024)) MB," \
	"four at once $((four / 1024)) MB (bound $((one / 1024 + MARGIN)) MB)"
((four <= one + MARGIN * 1024)) || fail "four queries at once: peak $((four / 1024)) MB"
kill -TERM "$PID"
wait "$PID" || fail "the daemon did not stop cleanly"
PID=
echo "PASS"
