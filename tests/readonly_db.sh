#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# readonly_db.sh: a daemon whose database file it may not write (mode
# 0444, run as an unprivileged user) says writes_enabled false in /status
# and answers a POST with 503 naming the cause, not 500; reads work.
# Needs root to drop to an unprivileged user (setpriv); skipped (77)
# otherwise.
# usage: readonly_db.sh MOONRANGE_BINARY
set -euo pipefail
BIN=${1:?usage: readonly_db.sh MOONRANGE_BINARY}
[[ $(id -u) -eq 0 ]] && command -v setpriv > /dev/null || exit 77
T=$(mktemp -d /tmp/moonrange-ro-XXXXXX)
PID=
# shellcheck source=tests/lib.sh
source "$(dirname "$0")/lib.sh"
trap lib_cleanup EXIT
fail() { echo "FAIL: $*" >&2; cat "$T/err" >&2 || true; exit 1; }
"$BIN" init --db "$T/db" > /dev/null
printf 'readonly-test-token-%s\n' "$RANDOM$RANDOM" > "$T/token"
chmod 1777 "$T"	# -shm and -wal beside the file
chmod 444 "$T/db"
chown 65534 "$T/token"
chmod 600 "$T/token"
cp "$BIN" "$T/moonrange"	# a copy the unprivileged user can run
chmod 755 "$T/moonrange"
setpriv --reuid=65534 --regid=65534 --clear-groups "$T/moonrange" serve \
	--db "$T/db" --listen 127.0.0.1:0 --token-file "$T/token" \
	> "$T/out" 2> "$T/err" &
PID=$!
for _ in $(seq 200); do grep -q serving "$T/out" 2>/dev/null && break; sleep 0.05; done
URL=$(sed -n 's/^moonrange: serving //p' "$T/out")
[[ -n "$URL" ]] || fail "the daemon did not start"
grep -q 'cannot be written' "$T/err" || fail "no warning at start"
curl -s "${URL}api/v1/status" | grep -q '"writes_enabled": false' || fail "/status says writes are enabled"
code=$(curl -s -o "$T/post" -w '%{http_code}' -X POST \
	-H "Authorization: Bearer $(cat "$T/token")" -H 'Content-Type: application/json' \
	--data '{"target":"HERON","start_utc":"2027-01-10T03:00:00Z","end_utc":"2027-01-10T03:10:00Z","shots":600,"returns":1,"normal_points":0,"outcome":"ranged","operator":"ro"}' \
	"${URL}api/v1/attempts")
[[ $code == 503 ]] || fail "POST answered $code: $(cat "$T/post")"
grep -q 'read-only' "$T/post" || fail "the 503 does not say why"
code=$(curl -s -o /dev/null -w '%{http_code}' "${URL}api/v1/attempts?limit=1")
[[ $code == 200 ]] || fail "reads answered $code"
echo "readonly_db.sh: ok"
