#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# cli_errors.sh: the messages of common mistakes, one clear line each
# naming the option: a directory or an empty file as --db, a database in
# a directory that does not exist, a reversed --since/--until, and a
# listening port another program holds (demo and serve).
# Exercises: daemon/cli/cli_args.c daemon/cli/cmd_init.c
#            daemon/cli/cmd_coverage.c daemon/cli/cmd_serve.c daemon/http/web.c
# Usage: cli_errors.sh MOONRANGE_BINARY SOURCE_DIR
set -u
M=$1
SRC=$2
T=$(mktemp -d "${TMPDIR:-/tmp}/moonrange-cli-errors.XXXXXX")
HOLDER=
cleanup() {
	[ -n "$HOLDER" ] && kill "$HOLDER" 2>/dev/null
	rm -rf "$T"
}
trap cleanup EXIT
# shellcheck source=tests/lib.sh
source "$(dirname "$0")/lib.sh"

# expect NAME STATUS PATTERN ARGS...: exit STATUS, exactly one stderr line,
# "moonrange: error: " and PATTERN in it, nothing on stdout.
expect() {
	local name=$1 want=$2 pat=$3 st
	shift 3
	"$M" "$@" >"$T/out" 2>"$T/err"
	st=$?
	if [ "$st" -ne "$want" ]; then
		bad "$name (exit $st, want $want)"; sed 's/^/#   /' "$T/err"
	elif [ "$(wc -l <"$T/err")" -ne 1 ]; then
		bad "$name ($(wc -l <"$T/err") lines on stderr)"; sed 's/^/#   /' "$T/err"
	elif ! grep -q '^moonrange: error: ' "$T/err" || ! grep -qF -- "$pat" "$T/err"; then
		bad "$name (no '$pat')"; sed 's/^/#   /' "$T/err"
	else
		ok "$name"
	fi
}

DB=$T/site.db
"$M" init --db "$DB" --site "$SRC/sample-site" >/dev/null
mkdir "$T/dir"
: >"$T/empty.db"

# --- a directory as --db ------------------------------------------------------
for c in "log list" "target list" "station show" "np count" "eop status" \
    "setting list" "blackout list" coverage windows tonight phases ephem serve; do
	# shellcheck disable=SC2086
	expect "$c: a directory as --db" 2 "--db: '$T/dir' is a directory, not a database file" $c --db "$T/dir"
done
expect "init: a directory as --db" 2 "--db: '$T/dir' is a directory" init --db "$T/dir"

# --- an empty file as --db ------------------------------------------------------
for c in "log list" coverage windows serve; do
	# shellcheck disable=SC2086
	expect "$c: an empty file as --db" 2 "--db: '$T/empty.db' is an empty file, not a moonrange database" $c --db "$T/empty.db"
done
[ -s "$T/empty.db" ] && bad "the empty file was written" || ok "the empty file is left empty"

# --- init into a directory that does not exist -----------------------------------
expect "init: missing parent directory" 2 "--db: the directory '$T/none/deeper' does not exist" init --db "$T/none/deeper/x.db"
check_tmp=$(ls "$T" | grep -c 'init-' || true)
[ "$check_tmp" = 0 ] && ok "no temporary file named or left" || bad "a temporary file was left"
grep -q 'init-' "$T/err" && bad "the message shows the temporary file name" || ok "the message shows no temporary file name"

# --- a reversed span ---------------------------------------------------------------
expect "coverage: --until before --since" 2 "--until: must be after --since" coverage --db "$DB" --since 2026-06-01T00:00:00Z --until 2026-01-01T00:00:00Z

# --- a port another program holds ----------------------------------------------------
/usr/bin/python3 - "$T/port" <<'PYEOF' &
import socket, sys, time
s = socket.socket()
s.bind(("127.0.0.1", 0))
s.listen(1)
open(sys.argv[1], "w").write(str(s.getsockname()[1]))
time.sleep(60)
PYEOF
HOLDER=$!
for _ in $(seq 1 100); do [ -s "$T/port" ] && break; sleep 0.05; done
PORT=$(cat "$T/port")
expect "serve: the port is taken" 1 "try --listen 127.0.0.1:0" serve --db "$DB" --listen "127.0.0.1:$PORT"
"$M" demo --data-dir "$T/demo" --listen "127.0.0.1:$PORT" >"$T/demo.out" 2>"$T/demo.err"
st=$?
if [ "$st" -ne 0 ] && [ "$(wc -l <"$T/demo.err")" -eq 1 ] &&
    grep -q "^moonrange: error: --listen: .*port $PORT.*try --listen 127.0.0.1:0" "$T/demo.err"; then
	ok "demo: the port is taken: one line suggesting --listen 127.0.0.1:0"
else
	bad "demo: the port is taken (exit $st)"; sed 's/^/#   /' "$T/demo.err"
fi

echo "1..$n"
[ "$fails" -eq 0 ]
