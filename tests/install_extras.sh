#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# install_extras.sh: what 'cmake --install' puts beside the program for
# users: the manual page renders (man -l and groff without warnings, and
# 'man moonrange' finds it under the prefix) and documents every command
# and action; bash completion proposes commands, actions, options, an
# option's words and the sample site's target ids from --db.
# Exercises: daemon/cli/cli_help.c completion/moonrange.bash CMakeLists.txt
# Usage: install_extras.sh BUILD_DIR SOURCE_DIR
set -u
B=$1
SRC=$2
# shellcheck source=tests/lib.sh
source "$(dirname "$0")/lib.sh"
lib_tmpdir install

P=$T/prefix
cmake --install "$B" --prefix "$P" >"$T/install.log" 2>&1 ||
    { cat "$T/install.log"; echo "not ok - cmake --install failed"; exit 1; }
M=$P/bin/moonrange
PAGE=$P/share/man/man1/moonrange.1
COMP=$P/share/bash-completion/completions/moonrange

# --- the manual page -----------------------------------------------------------
check "the manual page is installed in man1" "[ -s '$PAGE' ]"
if command -v man >/dev/null; then
	check "man -l renders it" "man -l -P cat '$PAGE' >'$T/man.txt' 2>'$T/man.err' && grep -q '^NAME' '$T/man.txt'"
	check "'man moonrange' finds it under the prefix" "MANPATH='$P/share/man' man -P cat moonrange 2>/dev/null | grep -q 'MOONRANGE(1)'"
else
	echo "# skip: man not installed (Debian man-db)"
fi
if command -v groff >/dev/null; then
	check "groff reads it without a warning" "[ -z \"\$(groff -man -Tutf8 -ww -z '$PAGE' 2>&1)\" ]"
	groff -man -Tutf8 "$PAGE" 2>/dev/null | sed 's/\x1b\[[0-9;]*m//g; s/.\x08//g' >"$T/page.txt"
	# Every command and action of the help is a section of the page.
	for c in $("$M" --help | sed -n 's/^  \([a-z]*\) .*/\1/p'); do
		acts=$("$M" "$c" --help | sed -n '/^Actions:/,/^$/s/^  \([a-z]*\) .*/\1/p')
		if [ -z "$acts" ]; then
			check "the page documents '$c'" "grep -q '^   moonrange $c\$' '$T/page.txt'"
		else
			for a in $acts; do
				check "the page documents '$c $a'" "grep -q '^   moonrange $c $a\$' '$T/page.txt'"
			done
		fi
	done
	check "the page documents an option with its value" "grep -q -- '--days N' '$T/page.txt'"
else
	echo "# skip: groff not installed (Debian groff-base)"
fi

# --- bash completion -----------------------------------------------------------
check "the completion file is installed" "[ -s '$COMP' ]"
DB=$T/site.db
"$M" init --db "$DB" --site "$SRC/sample-site" >/dev/null
# complete WORDS...: the candidates bash offers after "moonrange WORDS", the
# last word being the one typed so far.
complete_words() {
	bash -c '
		source "$1"; shift
		COMP_WORDS=("$@"); COMP_CWORD=$(($# - 1))
		_moonrange
		printf "%s\n" "${COMPREPLY[@]}"' _ "$COMP" "$M" "$@"
}
check "commands" "complete_words '' | grep -qx windows && complete_words '' | grep -qx tonight && complete_words '' | grep -qx help"
check "commands by prefix" "[ \"\$(complete_words to)\" = tonight ]"
check "actions" "[ \"\$(complete_words log '' | sort | tr '\n' ' ')\" = 'add export import list ' ]"
check "options of a command" "complete_words windows --d | grep -qx -- --days && complete_words windows --d | grep -qx -- --db"
check "options of an action" "complete_words log list -- | grep -qx -- --all"
check "the words of an option" "[ \"\$(complete_words serve --log-level '' | sort | tr '\n' ' ')\" = 'debug error info warn ' ]"
targets=$(complete_words windows --db "$DB" --target '' | sort | tr '\n' ' ')
check "target ids from --db (the sample site's)" "[ '$targets' = 'HERON OSPREY PLOVER SANDPIPER TERN ' ]"
check "target ids as the operand of 'target set'" "complete_words target set --db '$DB' '' | grep -qx SANDPIPER"
check "target ids by prefix" "[ \"\$(complete_words log add --db '$DB' --target OS)\" = OSPREY ]"
check "no database: no ids, no error text" "[ -z \"\$(complete_words windows --db '$T/none.db' --target '' 2>&1)\" ]"
check "file names where a file goes" "complete_words init --db '$T/si' | grep -qx '$T/site.db'"

echo "1..$n"
[ "$fails" -eq 0 ]
