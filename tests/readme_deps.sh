#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# readme_deps.sh: the README's Quick start command (a) installs everything
# the test suite needs: every Debian package that .ci/run installs (but
# clang, CI's second compiler) and the npm packages of every tests/
# folder with a lockfile, so that a newcomer's ctest skips nothing.
# Usage: readme_deps.sh SOURCE_DIR
set -euo pipefail
src=${1:?usage: readme_deps.sh SOURCE_DIR}
fail() { echo "readme_deps: FAIL: $*"; exit 1; }

# Command (a): the line after the "# (a)" comment in the Quick start.
a=$(awk '/^# \(a\)/ { getline; print; exit }' "$src/README.md")
[[ -n $a ]] || fail "no command (a) in README.md's Quick start"

# The packages of every 'apt-get install' in .ci/run (continued lines
# joined; options and shell words dropped).
ci=$(sed -e ':a' -e '/\\$/N; s/\\\n//; ta' "$src/.ci/run" |
	grep -o 'apt-get install -y [^;&|)]*' | sed 's/apt-get install -y //' |
	tr ' ' '\n' | grep -E '^[a-z0-9][a-z0-9.+-]+$' | sort -u)
[[ -n $ci ]] || fail "no apt-get install in .ci/run"
readme=$(printf '%s\n' "$a" | grep -o 'apt-get install -y [^;&|)]*' |
	sed 's/apt-get install -y //' | tr ' ' '\n' | sort -u)
missing=$(comm -23 <(printf '%s\n' "$ci" | grep -vx clang) <(printf '%s\n' "$readme"))
[[ -z $missing ]] || fail "README (a) does not install: $(echo $missing)"
for p in chromium nodejs npm; do
	grep -qx "$p" <<<"$readme" || fail "README (a) does not install $p"
done

# Every npm lockfile of the tests is installed by (a).
n=0
for lock in "$src"/tests/*/package-lock.json; do
	d=tests/$(basename "$(dirname "$lock")")
	grep -qF "(cd $d && npm ci" <<<"$a" || fail "README (a) does not run npm ci in $d"
	n=$((n + 1))
done
((n > 0)) || fail "no tests/*/package-lock.json"
echo "readme_deps: ok ($(wc -l <<<"$ci") packages of .ci/run, $n npm folders)"
