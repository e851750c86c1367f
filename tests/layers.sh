#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# layers.sh: the house rules of daemon/ and include/, checked on the files
# themselves.
#
#  1. Layer order.  The folders are the layers, lowest first:
#       core < formats < store < query < http < cli  (daemon/main.c on top)
#     A file may include our own headers of its own layer and of the layers
#     below it only, always as "<layer>/<name>.h".
#  2. Library headers.  sqlite3.h only in store/, microhttpd.h only in
#     http/web.c, jansson.h and ini.h not in core/.
#  3. The pure core (CORE_SOURCES and CORE_HEADERS of the top CMakeLists.txt,
#     passed as arguments) calls no I/O, clock or environment function and
#     allocates only through the injectable wrapper of core/mem.h.
#  4. formats/ (parsers and renderers, memory to memory) calls no I/O,
#     clock or environment function either: local times come to the
#     renderers as a table (core/tzone.h), read by the query layer.
#
# Before checking the tree, the check is run on planted violations of each
# kind and must catch every one.
# Usage: layers.sh CORE_FILE...   (run from the source directory)
set -u
T=$(mktemp -d "${TMPDIR:-/tmp}/moonrange-layers.XXXXXX")
trap 'rm -rf "$T"' EXIT

LAYERS="core formats store query http cli main"

# rank LAYER: position in LAYERS (0 = lowest); empty if not a layer.
rank() {
	local i=0 l
	for l in $LAYERS; do
		[ "$l" = "$1" ] && { echo $i; return; }
		i=$((i + 1))
	done
}

# layer_of PATH: the layer a file belongs to, from its folder.
layer_of() {
	case $1 in
	*/daemon/main.c | daemon/main.c) echo main ;;
	*) basename "$(dirname "$1")" ;;
	esac
}

# check_layers FILE...: rules 1 and 2.
check_layers() {
	local f l r inc il ir bad=0
	for f in "$@"; do
		l=$(layer_of "$f"); r=$(rank "$l")
		if [ -z "$r" ]; then
			echo "layers: $f: not inside a layer folder"; bad=1; continue
		fi
		while IFS= read -r inc; do
			case $inc in
			*/*) il=${inc%%/*}; ir=$(rank "$il")
			     if [ -z "$ir" ] || [ "$il" = main ]; then
				echo "layers: $f: includes \"$inc\", no such layer"; bad=1
			     elif [ "$ir" -gt "$r" ]; then
				echo "layers: $f ($l) includes \"$inc\" of the higher layer $il"; bad=1
			     fi ;;
			*) echo "layers: $f: includes \"$inc\" without its layer folder"; bad=1 ;;
			esac
		done < <(sed -nE 's/^#[[:space:]]*include[[:space:]]*"([^"]+)".*/\1/p' "$f")
		if grep -qE '^#[[:space:]]*include[[:space:]]*<sqlite3\.h>' "$f" && [ "$l" != store ]; then
			echo "layers: $f: includes sqlite3.h outside store/"; bad=1
		fi
		if grep -qE '^#[[:space:]]*include[[:space:]]*<microhttpd\.h>' "$f" && [ "$(basename "$f")" != web.c -o "$l" != http ]; then
			echo "layers: $f: includes microhttpd.h outside http/web.c"; bad=1
		fi
		if grep -qE '^#[[:space:]]*include[[:space:]]*<(jansson|ini)\.h>' "$f" && [ "$l" = core ]; then
			echo "layers: $f: includes a JSON or INI library header in core/"; bad=1
		fi
	done
	return $bad
}

# Rule 3: headers a core file never includes, calls it never makes.
FORBIDDEN_INC='#[[:space:]]*include[[:space:]]*<(pthread|unistd|time|sys/[a-z]+)\.h>'
FORBIDDEN_CALL='\b(fopen|fclose|fread|fwrite|fprintf|printf|puts|fputs|getenv|setenv|unsetenv|tzset|clock_gettime|gettimeofday|localtime_r|gmtime_r|mktime|access|exit|abort)[[:space:]]*\(|\btime\(|\bsqlite3_|\bMHD_|\bjson_'
FORBIDDEN_ALLOC='\b(malloc|calloc|realloc|free)[[:space:]]*\('

# check_core FILE...: rule 3.
check_core() {
	local f bad=0
	for f in "$@"; do
		if [ ! -r "$f" ]; then
			echo "layers: $f: missing"; bad=1; continue
		fi
		if [ "$(layer_of "$f")" != core ]; then
			echo "layers: $f: listed as core but not in a core/ folder"; bad=1
		fi
		if grep -nE "$FORBIDDEN_INC" "$f"; then
			echo "layers: $f: includes a system header the core must not use"; bad=1
		fi
		if grep -nE "$FORBIDDEN_CALL" "$f"; then
			echo "layers: $f: calls I/O, clock or environment"; bad=1
		fi
		# core/mem.c is the allocator itself.
		if [ "$(basename "$f")" != mem.c ] && grep -nE "$FORBIDDEN_ALLOC" "$f"; then
			echo "layers: $f: allocates outside core/mem.h"; bad=1
		fi
	done
	return $bad
}

# check_formats FILE...: rule 4.
check_formats() {
	local f bad=0
	for f in "$@"; do
		if grep -nE "$FORBIDDEN_CALL" "$f" | grep -v sqlite3_ | grep -v json_ | grep -q .; then
			grep -nE "$FORBIDDEN_CALL" "$f" | grep -v sqlite3_ | grep -v json_
			echo "layers: $f: formats/ calls I/O, clock or environment"; bad=1
		fi
	done
	return $bad
}

[ "$#" -gt 0 ] || { echo "usage: layers.sh CORE_FILE..."; exit 2; }

# The check must catch a planted violation of each kind.
mkdir -p "$T/daemon/core" "$T/daemon/formats" "$T/daemon/store" "$T/daemon/http" "$T/daemon/stray"
printf '#include "store/store.h"\n' >"$T/daemon/core/up.c"
printf '#include "http/api.h"\n' >"$T/daemon/formats/up.c"
printf '#include "cli/cli.h"\n' >"$T/daemon/store/up.c"
printf '#include "geom.h"\n' >"$T/daemon/formats/flat.c"
printf '#include <sqlite3.h>\n' >"$T/daemon/formats/sql.c"
printf '#include <microhttpd.h>\n' >"$T/daemon/http/api.c"
printf '#include <jansson.h>\n' >"$T/daemon/core/json.c"
printf 'int x;\n' >"$T/daemon/stray/x.c"
for f in core/up formats/up store/up formats/flat formats/sql http/api core/json stray/x; do
	if check_layers "$T/daemon/$f.c" >/dev/null 2>&1; then
		echo "layers: the check missed the planted daemon/$f.c"; exit 1
	fi
done
printf 'static void f(void) { (void)getenv("TZ"); }\n' >"$T/daemon/core/env.c"
printf 'static void *f(void) { return malloc(4); }\n' >"$T/daemon/core/alloc.c"
printf 'static void f(void) { fprintf(stderr, "x"); }\n' >"$T/daemon/core/io.c"
for f in env alloc io; do
	if check_core "$T/daemon/core/$f.c" >/dev/null 2>&1; then
		echo "layers: the check missed the planted daemon/core/$f.c"; exit 1
	fi
done
printf 'static void f(void) { setenv("TZ", "UTC", 1); tzset(); }\n' >"$T/daemon/formats/tz.c"
if check_formats "$T/daemon/formats/tz.c" >/dev/null 2>&1; then
	echo "layers: the check missed the planted daemon/formats/tz.c"; exit 1
fi

bad=0
files=$(find daemon include -name '*.c' -o -name '*.h' | sort)
check_layers $files || bad=1
check_core "$@" || bad=1
check_formats $(find daemon/formats -name '*.c' | sort) || bad=1
[ $bad -eq 0 ] || exit 1
echo "layers: $(echo $files | wc -w) files in order, $# core files pure"
