#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# skips.sh: after ctest, name each skipped test and say why.  A test that
# skips (exit 77, SKIP_RETURN_CODE) writes one line, its reason, to
# DIR/NAME.txt; ctest runs this script after its summary
# (CTEST_CUSTOM_POST_TEST) and clears DIR before the tests.
# Usage: skips.sh DIR
dir=${1:?usage: skips.sh DIR}
shopt -s nullglob
files=("$dir"/*.txt)
((${#files[@]} == 0)) && exit 0
echo
echo "SKIPPED (did not run, so not passed): ${#files[@]} test(s)"
for f in "${files[@]}"; do
	printf '  %s: %s\n' "$(basename "$f" .txt)" "$(head -c 400 "$f" | tr -d '\n')"
done
exit 0
