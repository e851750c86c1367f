#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# core_purity.sh: the pure core (CORE_SOURCES and CORE_HEADERS of the top
# CMakeLists.txt, passed as arguments) includes only the C library's
# headers, ERFA's and the core's own headers, and calls no I/O, clock,
# environment or allocation function.
# Usage: core_purity.sh FILE...   (run from the source directory)
set -u
T=$(mktemp -d "${TMPDIR:-/tmp}/moonrange-purity.XXXXXX")
trap 'rm -rf "$T"' EXIT

# Headers outside the core that a core file must never include.
FORBIDDEN_INC='#[[:space:]]*include[[:space:]]*[<"](sqlite3|microhttpd|jansson|ini|mem|store|render[a-z_]*|import|cli[a-z_]*|pthread|unistd|time|sys/[a-z]+)\.h[>"]'
# Calls that read or write files, the clock or the environment, or that
# allocate behind the caller's back.
FORBIDDEN_CALL='\b(fopen|fclose|fread|fwrite|fprintf|printf|puts|fputs|getenv|setenv|malloc|calloc|realloc|free|mem_alloc|mem_calloc|mem_realloc|mem_free|clock_gettime|gettimeofday|localtime_r|gmtime_r|exit|abort)[[:space:]]*\(|\btime\(|\bsqlite3_|\bMHD_|\bjson_'

# check FILE...: print every violation; status 1 if any.
check() {
	local f h bad=0 headers=" "
	for f in "$@"; do
		case $f in *.h) headers="$headers$(basename "$f") " ;; esac
	done
	for f in "$@"; do
		if [ ! -r "$f" ]; then
			echo "core_purity: $f: missing"; bad=1; continue
		fi
		if grep -nE "$FORBIDDEN_INC" "$f"; then
			echo "core_purity: $f: includes a header outside the core"; bad=1
		fi
		if grep -nE "$FORBIDDEN_CALL" "$f"; then
			echo "core_purity: $f: calls I/O, clock, environment or allocation"; bad=1
		fi
		# Our own headers ("x.h") must be core headers.
		for h in $(sed -nE 's/^#[[:space:]]*include[[:space:]]*"([^"]+)".*/\1/p' "$f"); do
			case $headers in *" $h "*) ;; *)
				echo "core_purity: $f: includes \"$h\", not a core header"; bad=1 ;;
			esac
		done
	done
	return $bad
}

[ "$#" -gt 0 ] || { echo "usage: core_purity.sh FILE..."; exit 2; }

# The check itself must catch a planted violation of each kind.
printf '#include <sqlite3.h>\n' >"$T/a.c"
printf 'static void f(void) { (void)getenv("TZ"); }\n' >"$T/b.c"
printf '#include "render.h"\n' >"$T/c.c"
for f in a b c; do
	if check "$T/$f.c" "$T/core.h" >/dev/null 2>&1; then
		echo "core_purity: the check missed the planted $f.c"; exit 1
	fi
done
: >"$T/core.h"

check "$@" || exit 1
echo "core_purity: $# files clean"
