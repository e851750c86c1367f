#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# cli_log.sh: "moonrange log list" as a station reads it (newest first, the
# newest 20 unless --limit or --all, operator and notes, 80 columns), and
# long imports: progress with a total on a terminal only, and an
# interrupted import that says nothing was stored and stores nothing.
# Exercises: daemon/cli/cmd_log.c daemon/cli/cli_store.c
#            daemon/formats/render_site.c
# Usage: cli_log.sh MOONRANGE_BINARY SOURCE_DIR
set -u
M=$1
SRC=$2
T=$(mktemp -d "${TMPDIR:-/tmp}/moonrange-cli-log.XXXXXX")
trap 'rm -rf "$T"' EXIT
PY=/usr/bin/python3
# shellcheck source=tests/lib.sh
source "$(dirname "$0")/lib.sh"
q() { sqlite3 "$DB" "$1"; }

DB=$T/site.db
"$M" init --db "$DB" --site "$SRC/sample-site" >/dev/null
TOTAL=$(q 'SELECT count(*) FROM attempts')
"$M" log add --db "$DB" --target HERON --start 2026-12-01T05:00:00Z \
    --end 2026-12-01T05:20:00Z --shots 9000 --returns 44 --normal-points 2 \
    --outcome ranged --operator 'Zoë Invented-Operator' \
    --notes 'a long note that will not fit in the column' >/dev/null 2>&1
TOTAL=$((TOTAL + 1))

# --- the default table -------------------------------------------------------
"$M" log list --db "$DB" >"$T/list.txt"
check "header names operator and notes" "head -1 '$T/list.txt' | grep -q 'operator *notes\$'"
check "the newest 20 rows" "[ \$(sed '1d;\$d' '$T/list.txt' | wc -l) = 20 ]"
check "the count says how many of how many" "tail -1 '$T/list.txt' | grep -qx '20 attempts shown, the newest of $TOTAL'"
NEWEST=$(q 'SELECT id FROM attempts ORDER BY start_mjd DESC LIMIT 1')
check "newest first" "[ \"\$(sed -n 2p '$T/list.txt' | awk '{print \$1}')\" = '$NEWEST' ]"
check "the operator is shown, cut to fit" "sed -n 2p '$T/list.txt' | grep -q 'Zoë Inve… a long note…\$'"
check "every line fits 80 columns (characters)" "$PY -c 'import sys; sys.exit(max(len(l.rstrip(\"\\n\")) for l in open(sys.argv[1], encoding=\"utf-8\")) > 80)' '$T/list.txt'"
check "local start time in the station's zone" "sed -n 2p '$T/list.txt' | grep -q '2026-11-30 21:00 PST'"
ids=$(sed '1d;$d' "$T/list.txt" | awk '{print $1}' | tr '\n' ' ')
want=$(q 'SELECT id FROM attempts ORDER BY start_mjd DESC LIMIT 20' | tr '\n' ' ')
check "the rows are the 20 newest, in order" "[ '$ids' = '$want' ]"

# --- --all, --limit, --order ----------------------------------------------------
check "--all lists every attempt" "[ \$('$M' log list --db '$DB' --all | sed '1d;\$d' | wc -l) = $TOTAL ] && '$M' log list --db '$DB' --all | tail -1 | grep -qx '$TOTAL attempts'"
ids=$("$M" log list --db "$DB" --limit 5 --order oldest | sed '1d;$d' | awk '{print $1}' | tr '\n' ' ')
want=$(q 'SELECT id FROM (SELECT id, start_mjd FROM attempts ORDER BY start_mjd DESC LIMIT 5) ORDER BY start_mjd' | tr '\n' ' ')
check "--limit 5 --order oldest: the newest five, oldest first" "[ '$ids' = '$want' ]"
check "--json: the newest 20, newest first" "'$M' log list --db '$DB' --json | $PY -c 'import json,sys; a=json.load(sys.stdin)[\"attempts\"]; s=[x[\"start_utc\"] for x in a]; sys.exit(0 if len(a)==20 and s==sorted(s, reverse=True) else 1)'"
"$M" log list --db "$DB" --all --limit 3 >/dev/null 2>"$T/err"
check "--all and --limit exclude each other" "[ \$? = 2 ] && grep -q -- '--all' '$T/err'"
check "help states the default" "'$M' log list --help | grep -q 'newest 20'"

# --- long imports ----------------------------------------------------------------
# 30000 invented rows (about 2.7 MB): long enough to show progress.
mkdir -p "$T/empty"
cp "$SRC"/sample-site/station.ini "$SRC"/sample-site/targets.csv "$T/empty/"
lib_big_attempts_csv "$T/big.csv" 2027 30000
B=$T/big.db
"$M" init --db "$B" --site "$T/empty" >/dev/null
"$M" log import --db "$B" "$T/big.csv" >"$T/imp.out" 2>"$T/imp.err"
check "an import into a pipe: no progress text" "[ ! -s '$T/imp.err' ] && grep -q '30000 attempts read, 30000 added' '$T/imp.out'"
if command -v script >/dev/null; then
	"$M" init --db "$T/tty.db" --site "$T/empty" --force >/dev/null
	# On a terminal (script(1) gives one): "line N of 30001 (P%)".
	script -qec "'$M' log import --db '$T/tty.db' '$T/big.csv'; echo EXIT=\$?" \
	    /dev/null >"$T/tty.out" 2>&1 &
	SP=$!
	for _ in $(seq 1 400); do
		grep -q 'line [0-9]* of 30001 ([0-9]*%)' "$T/tty.out" 2>/dev/null && break
		sleep 0.05
	done
	check "on a terminal: progress with the total and a percentage" "grep -q 'moonrange: .*big.csv: line [0-9]* of 30001 ([0-9]*%)' '$T/tty.out'"
	# Ctrl-C: the moonrange process under script's shell gets SIGINT.
	MP=
	for c in $(pgrep -P "$SP"); do
		MP=$(pgrep -P "$c" | head -1)
	done
	if [ -n "$MP" ]; then
		kill -INT "$MP"
		wait "$SP"
		tr '\r' '\n' <"$T/tty.out" >"$T/tty.txt"
		check "SIGINT: says nothing was stored" "grep -q '^moonrange: error: .*big.csv: interrupted; nothing of it was stored' '$T/tty.txt'"
		check "SIGINT: exit status 130" "grep -q '^EXIT=130' '$T/tty.txt'"
		check "SIGINT: nothing stored" "[ \"\$(sqlite3 '$T/tty.db' 'SELECT count(*) FROM attempts')\" = 0 ]"
		check "SIGINT: the database is intact" "[ \"\$(sqlite3 '$T/tty.db' 'PRAGMA integrity_check')\" = ok ]"
	else
		wait "$SP"
		bad "SIGINT: the import ended before it could be interrupted"
	fi
else
	echo "# skip: script(1) not installed (bsdutils)"
fi

echo "1..$n"
[ "$fails" -eq 0 ]
