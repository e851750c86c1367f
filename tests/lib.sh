# SPDX-License-Identifier: BSD-3-Clause
# lib.sh: what the black-box scripts share, sourced by tests/*.sh and
# tests/load/*.sh: TAP check lines, the daemon's URL once it serves,
# stopping what a script started, and a large invented attempts CSV.

# TAP lines of the black-box checks: ok NAME, bad NAME, check NAME EXPR
# (EXPR is eval'd); n counts the checks, fails the failures.
fails=0
n=0
ok() { n=$((n + 1)); echo "ok $n - $1"; }
bad() { n=$((n + 1)); fails=$((fails + 1)); echo "not ok $n - $1"; }
check() { if eval "$2"; then ok "$1"; else bad "$1"; fi; }

# lib_serve_url OUT TRIES PAUSE: wait (TRIES times PAUSE seconds at most)
# for the "moonrange: serving URL" line in the daemon's stdout file OUT;
# print URL, or nothing when the daemon did not start.
lib_serve_url() {
	for _ in $(seq "$2"); do
		grep -q '^moonrange: serving http' "$1" 2>/dev/null && break
		sleep "$3"
	done
	sed -n 's/^moonrange: serving //p' "$1"
}

# lib_tmpdir NAME: a new scratch directory T (moonrange-NAME.XXXXXX under
# $TMPDIR, else /tmp), removed when the script exits.
lib_tmpdir() {
	T=$(mktemp -d "${TMPDIR:-/tmp}/moonrange-$1.XXXXXX")
	trap 'rm -rf "$T"' EXIT
}

# lib_cleanup: the EXIT trap of a script that keeps its background jobs in
# the array BG, the daemon's process id in PID and its files under T.
lib_cleanup() {
	local p
	for p in ${BG[@]+"${BG[@]}"}; do kill "$p" 2>/dev/null || true; done
	if [[ -n "${PID:-}" ]] && kill -0 "$PID" 2>/dev/null; then
		kill -KILL "$PID" 2>/dev/null || true
	fi
	rm -rf "$T"
}

# lib_big_attempts_csv FILE YEAR N: N invented attempts on the sample
# targets, one every 3 minutes from YEAR-01-01, as an attempts CSV (CRLF).
lib_big_attempts_csv() {
	/usr/bin/python3 - "$@" <<'PYEOF'
import sys, datetime
t0 = datetime.datetime(int(sys.argv[2]), 1, 1)
with open(sys.argv[1], "w", newline="") as f:
    f.write("target,start_utc,end_utc,shots,returns,normal_points,outcome,"
            "operator,seeing_arcsec,notes\r\n")
    for i in range(int(sys.argv[3])):
        s = t0 + datetime.timedelta(minutes=3 * i)
        e = s + datetime.timedelta(minutes=2)
        f.write("%s,%sZ,%sZ,%d,%d,0,no_returns,op,,invented row %d\r\n" % (
            ("HERON", "OSPREY", "PLOVER")[i % 3], s.isoformat(),
            e.isoformat(), 1000 + i % 1000, i % 7, i))
PYEOF
}
