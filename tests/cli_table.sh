#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# cli_table.sh: the command table seen from outside: every command and
# action has --help, -h and "help CMD" alike, within 80 columns; mistyped
# commands, actions and options get a suggestion; repeated, ambiguous,
# malformed and valueless options are refused with one line naming them.
# Exercises: daemon/cli/cli.c daemon/cli/cli_args.c daemon/cli/cli_help.c
# Usage: cli_table.sh MOONRANGE_BINARY SOURCE_DIR
set -u
M=$1
SRC=$2
# shellcheck source=tests/lib.sh
source "$(dirname "$0")/lib.sh"
lib_tmpdir cli-table

# expect_usage NAME PATTERN ARGS...: exit 2, one line naming PATTERN.
expect_usage() {
	local name=$1 pat=$2 st
	shift 2
	"$M" "$@" >"$T/out" 2>"$T/err"
	st=$?
	if [ "$st" -ne 2 ]; then
		bad "$name (exit $st, want 2)"
	elif [ "$(wc -l <"$T/err")" -ne 1 ] || [ -s "$T/out" ]; then
		bad "$name (not one line on stderr only)"; sed 's/^/#   /' "$T/err"
	elif ! grep -q '^moonrange: error: ' "$T/err" ||
	    ! grep -qF -- "$pat" "$T/err"; then
		bad "$name (no '$pat')"; sed 's/^/#   /' "$T/err"
	else
		ok "$name"
	fi
}

# --- every command and action: --help, -h, help CMD, 80 columns -----------
cmds=$("$M" --help | sed -n 's/^  \([a-z]*\) .*/\1/p')
check "the command list is not empty" "[ \$(echo '$cmds' | wc -w) -ge 10 ]"
paths=""
for c in $cmds; do
	paths="$paths $c"
	acts=$("$M" "$c" --help | sed -n '/^Actions:/,/^$/s/^  \([a-z]*\) .*/\1/p')
	for a in $acts; do paths="$paths $c:$a"; done
done
for p in $paths; do
	words=${p/:/ }
	# shellcheck disable=SC2086
	"$M" $words --help >"$T/h1" 2>&1; s1=$?
	# shellcheck disable=SC2086
	"$M" $words -h >"$T/h2" 2>&1
	# shellcheck disable=SC2086
	"$M" help $words >"$T/h3" 2>&1
	check "$words --help exits 0 with its usage" "[ $s1 = 0 ] && head -1 '$T/h1' | grep -q '^usage: moonrange $words'"
	check "$words: -h and 'help $words' print the same" "cmp -s '$T/h1' '$T/h2' && cmp -s '$T/h1' '$T/h3'"
	check "$words --help fits 80 columns" "awk 'length(\$0) > 80 { exit 1 }' '$T/h1'"
done
check "moonrange --help fits 80 columns" "'$M' --help | awk 'length(\$0) > 80 { exit 1 }'"
check "moonrange -h is --help" "cmp -s <('$M' -h) <('$M' --help)"
check "moonrange help is --help" "cmp -s <('$M' help) <('$M' --help)"

# --- suggestions -------------------------------------------------------------
expect_usage "mistyped command" "did you mean 'tonight'?" tonigt
expect_usage "mistyped action" "did you mean 'list'?" log lsit
expect_usage "mistyped option" "did you mean --json?" windows --jsn
expect_usage "help of a mistyped command" "did you mean 'phases'?" help phasse
expect_usage "nothing near: no suggestion" "unknown command 'zzzzzzzz'" zzzzzzzz
check "... and no guess" "! grep -q 'did you mean' '$T/err'"

# --- option rules --------------------------------------------------------------
expect_usage "a repeated option is refused" "--days: given twice" phases --days 3 --days 4
expect_usage "a repeated flag is refused" "--json: given twice" phases --json --json
expect_usage "an option without its value" "--from: a value is required" phases --from
expect_usage "a flag with a value" "--json: takes no value" phases --json=yes
expect_usage "an ambiguous prefix" "ambiguous" windows --min 3
expect_usage "options that exclude each other" "--csv" windows --station 1,2,3 --json --csv
expect_usage "hex is not a number" "--days" phases --days 0x10
expect_usage "an exponent is not a plain decimal" "--dut1" ephem --dut1 1e-1
expect_usage "a word outside the list" "--log-level" serve --db x --log-level loud
expect_usage "an unknown short option" "'-x'" phases -x
expect_usage "an operand too many" "unexpected argument 'extra'" phases extra
expect_usage "a missing operand" "ID is required" target retire --db x
expect_usage "a required option" "--db FILE is required" init
expect_usage "one of a group is required" "--station" windows
check "--opt=value is --opt value" "cmp -s <('$M' phases --from=2027-01-01T00:00:00Z --days=31) <('$M' phases --from 2027-01-01T00:00:00Z --days 31)"
check "a unique prefix is the option" "cmp -s <('$M' phases --fr 2027-01-01T00:00:00Z --da 31) <('$M' phases --from 2027-01-01T00:00:00Z --days 31)"
expect_usage "-- ends the options" "unexpected argument '--json'" phases -- --json

# --- booleans: the one vocabulary, any case (as the CSV importer) -----------
DB=$T/b.db
"$M" init --db "$DB" --site "$SRC/sample-site" >/dev/null
check "target set --dark-only YES is taken" "'$M' target set --db '$DB' HERON --dark-only YES >/dev/null"
check "... and stored" "'$M' target list --db '$DB' --json | /usr/bin/python3 -c 'import json,sys; t=[x for x in json.load(sys.stdin)[\"targets\"] if x[\"id\"]==\"HERON\"][0]; sys.exit(0 if t[\"dark_only\"] else 1)'"
check "target set --dark-only Off is taken" "'$M' target set --db '$DB' HERON --dark-only Off >/dev/null"
expect_usage "a word that is not a boolean" "--dark-only: 'maybe'" target set --db "$DB" HERON --dark-only maybe

# --- tables for people fit 80 columns; --wide gives the old layout ---------
span=(--from 2027-03-14T00:00:00Z --to 2027-03-24T00:00:00Z)
"$M" windows --db "$DB" "${span[@]}" >"$T/w80.txt"
"$M" windows --db "$DB" "${span[@]}" --wide >"$T/wwide.txt"
check "windows on the sample site fits 80 columns" "[ -s '$T/w80.txt' ] && awk 'length(\$0) > 80 { exit 1 }' '$T/w80.txt'"
check "... the same windows as --wide, in the same order" "[ \"\$(awk 'NR > 4 { print \$1, \$2, \$3, \$4 }' '$T/w80.txt')\" = \"\$(awk 'NR > 4 { print \$1, \$2, \$3, \$4 }' '$T/wwide.txt')\" ]"
check "windows --wide keeps the local dates (89 columns)" "awk 'length(\$0) > 80 { f = 1 } END { exit !f }' '$T/wwide.txt'"
for args in "--db $DB" "" "--station 41.25,-105.5,2200 --target T-A=12.5,-20 --tz Europe/Madrid"; do
	# shellcheck disable=SC2086
	"$M" ephem $args --at 2027-03-01T04:00:00Z >"$T/e80.txt"
	check "ephem ${args:-(demo station)} fits 80 columns" "[ -s '$T/e80.txt' ] && awk 'length(\$0) > 80 { exit 1 }' '$T/e80.txt'"
done
check "ephem --wide: station and DUT1 on one line" "'$M' ephem --db '$DB' --at 2027-03-01T04:00:00Z --wide | grep -q '^Station .* m   DUT1 '"

echo "1..$n"
[ "$fails" -eq 0 ]
