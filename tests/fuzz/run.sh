#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# run.sh: run every libFuzzer harness of tests/fuzz for SECONDS each,
# from its seed corpus (tests/fuzz/corpus/<harness>/, read only: new
# inputs go to a scratch directory).  A crash stops the run and names the
# input, written to ARTIFACTS (default /tmp/moonrange-fuzz-artifacts):
# after fixing the defect, add that file to the harness's corpus.
# usage: run.sh BUILD_DIR [SECONDS] [HARNESS...]
#   bash tests/fuzz/run.sh build-fuzz 25          # .ci/run
#   bash tests/fuzz/run.sh build-fuzz 3600 fuzz_crd   # a longer run
set -euo pipefail

B=${1:?usage: run.sh BUILD_DIR [SECONDS] [HARNESS...]}
SECS=${2:-25}
shift $(( $# >= 2 ? 2 : 1 ))
HERE=$(cd "$(dirname "$0")" && pwd)
ART=${ARTIFACTS:-/tmp/moonrange-fuzz-artifacts}
HARNESSES=("$@")
if (( ${#HARNESSES[@]} == 0 )); then
	HARNESSES=(fuzz_utc fuzz_station fuzz_targets_csv fuzz_attempts_csv
	    fuzz_crd fuzz_iers fuzz_query fuzz_body)
fi
mkdir -p "$ART"
for h in "${HARNESSES[@]}"; do
	scratch=$(mktemp -d /tmp/moonrange-fuzz-XXXXXX)
	set +e
	"$B/tests/$h" -max_total_time="$SECS" -timeout=60 -rss_limit_mb=2048 \
	    -print_final_stats=1 -artifact_prefix="$ART/$h-" \
	    "$scratch" "$HERE/corpus/$h" > "$ART/$h.log" 2>&1
	st=$?
	set -e
	runs=$(sed -n 's/^stat::number_of_executed_units: *//p' "$ART/$h.log" || true)
	cov=$(grep -o 'cov: [0-9]*' "$ART/$h.log" | tail -1 || true)
	rm -rf "$scratch"
	if (( st != 0 )); then
		echo "FAIL: $h (exit $st); log and input in $ART:" >&2
		grep -E 'ERROR|SUMMARY|Test unit written' "$ART/$h.log" >&2 || tail -20 "$ART/$h.log" >&2
		exit 1
	fi
	echo "fuzz $h: ${SECS} s, ${runs:-?} inputs, ${cov:-cov: ?}, no crash"
done
