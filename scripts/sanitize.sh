#!/usr/bin/env bash
# sanitize.sh — the checking build and its tests, run by .ci/run after the suite.
#
# Builds kerf and kerf_tests with clang, AddressSanitizer and UndefinedBehaviorSanitizer
# (-DKERF_SANITIZE=ON: -fno-sanitize-recover=undefined) in their own directory, runs every
# unit test on it and a named subset of the end-to-end groups against that kerf. Any
# sanitizer report fails the step: the reports go to files (log_path) that are counted at
# the end, so one in a run whose non-zero exit a case expected (the bad-input catalogue
# expects failures) still fails it. Installs clang when it is missing (Debian's package).
#
#   bash scripts/sanitize.sh
#   KERF_SAN_BUILD=DIR          build directory (default build-san/ in the checkout)
#   KERF_SAN_GROUPS=REGEX       ctest -R of the end-to-end cases (default below)
#   KERF_SAN_CMAKE_ARGS="..."   extra configure options (e.g. a compiler launcher)
#   KERF_SAN_JOBS=N             build and test jobs (default 2)
#
# The default groups are the bad-input catalogue, the reader's cases and the equivalence
# pairs (the EPFL benchmarks run inside those), 87 of the 342 end-to-end cases (scale18):
# the step's time on 2 cores is in docs/scale.md (scale17). The address-space-limit case
# is left out: AddressSanitizer's shadow memory cannot run under that limit (it would skip).
set -euo pipefail

KERF_ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
BUILD="${KERF_SAN_BUILD:-$KERF_ROOT/build-san}"
GROUPS_RE="${KERF_SAN_GROUPS:-^e2e\.(errors|reader|equiv|equiv_kept)\.}"
EXCLUDE_RE='^e2e\.errors\.memory_exhausted$'
JOBS="${KERF_SAN_JOBS:-2}"
start=$(date +%s)

if ! command -v clang++ >/dev/null; then
  if [ "$(id -u)" -eq 0 ] && command -v apt-get >/dev/null; then
    echo "kerf sanitize: installing clang"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq
    apt-get install -y -qq clang >/dev/null
  else
    echo "kerf sanitize: clang++ is missing; install it with: sudo apt-get install clang" >&2
    exit 1
  fi
fi

# shellcheck disable=SC2086  # KERF_SAN_CMAKE_ARGS is a list of options
cmake -S "$KERF_ROOT" -B "$BUILD" -DCMAKE_BUILD_TYPE=RelWithDebInfo \
      -DCMAKE_CXX_COMPILER=clang++ -DKERF_SANITIZE=ON ${KERF_SAN_CMAKE_ARGS:-} >/dev/null
cmake --build "$BUILD" -j"$JOBS" --target kerf kerf_tests
built=$(date +%s)
echo "kerf sanitize: the sanitized build took $(( built - start )) s"

logs="$BUILD/sanitizer-reports"
rm -rf "$logs"
mkdir -p "$logs"
export ASAN_OPTIONS="halt_on_error=1:detect_leaks=1:log_path=$logs/asan"
export UBSAN_OPTIONS="halt_on_error=1:print_stacktrace=1:log_path=$logs/ubsan"

status=0
"$BUILD/tests/kerf_tests" --gtest_brief=1 || status=1
units=$(date +%s)
echo "kerf sanitize: the unit tests took $(( units - built )) s"
ctest --test-dir "$BUILD" --output-on-failure -j"$JOBS" --timeout 1800 \
      -R "$GROUPS_RE" -E "$EXCLUDE_RE" || status=1
echo "kerf sanitize: the end-to-end cases took $(( $(date +%s) - units )) s"

reports=$(find "$logs" -type f -size +0c | sort)
if [ -n "$reports" ]; then
  echo "kerf sanitize: sanitizer reports:" >&2
  for f in $reports; do
    echo "---- $f" >&2
    cat "$f" >&2
  done
  status=1
fi
echo "kerf sanitize: $(echo -n "$reports" | grep -c . || true) sanitizer reports; step took $(( $(date +%s) - start )) s"
exit "$status"
