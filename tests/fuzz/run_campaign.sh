#!/usr/bin/env bash
# run_campaign.sh — a timed libFuzzer campaign on both harnesses; prints the figures.
#
#   tests/fuzz/run_campaign.sh [SECONDS_PER_HARNESS] [BUILD_DIR]
#
# Builds the harnesses in BUILD_DIR (default build-fuzz, clang with
# -DKERF_FUZZ=ON) if needed, starts each from a copy of its committed seed
# corpus (tests/fuzz/corpus/<harness>), and prints per harness: executions,
# executions per second, coverage (edges and features), corpus size and
# findings (crash-, leak-, timeout- and oom- files, kept in BUILD_DIR/findings).
# An input counts as a hang after 30 s: the slowest legitimate one, a loop
# stopped at the lowering's 65,536-iteration limit (regression-endless-loop),
# takes about 16 s of CPU in this sanitizer build, which lowers it twice
# (the campaign starts without the regression seeds: kerf_tests replays them).
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
SECONDS_EACH="${1:-300}"
BUILD="${2:-$ROOT/build-fuzz}"
if [ ! -x "$BUILD/tests/fuzz/fuzz_description" ] || [ ! -x "$BUILD/tests/fuzz/fuzz_algebra_expr" ]; then
  cmake -S "$ROOT" -B "$BUILD" -DCMAKE_CXX_COMPILER=clang++ -DKERF_FUZZ=ON -DCMAKE_BUILD_TYPE=RelWithDebInfo >/dev/null
  cmake --build "$BUILD" -j2 --target fuzz_description fuzz_algebra_expr >/dev/null
fi
mkdir -p "$BUILD/findings"
printf '%-20s %8s %12s %10s %8s %8s %6s %s\n' harness seconds executions exec/s edges features corpus findings
for h in fuzz_description:16384 fuzz_algebra_expr:256; do
  name="${h%%:*}"; maxlen="${h##*:}"
  work="$BUILD/corpus-work/$name"
  rm -rf "$work"; mkdir -p "$work"
  # Regression seeds are replayed by kerf_tests; the campaign starts from the valid ones.
  find "$ROOT/tests/fuzz/corpus/${name#fuzz_}" -maxdepth 1 -type f ! -name 'regression-*' -exec cp {} "$work/" \;
  log="$BUILD/findings/$name.log"
  before=$(ls "$BUILD/findings" | grep -c -E '^(crash|leak|timeout|oom)-' || true)
  set +e
  (cd "$BUILD/findings" && "$BUILD/tests/fuzz/$name" "$work" -max_total_time="$SECONDS_EACH" -max_len="$maxlen" \
      -timeout=30 -rss_limit_mb=2048 -print_final_stats=1 -jobs=1 >"$log" 2>&1)
  set -e
  after=$(ls "$BUILD/findings" | grep -c -E '^(crash|leak|timeout|oom)-' || true)
  execs=$(grep -E '^stat::number_of_executed_units:' "$log" | awk '{print $2}')
  rate=$(grep -E '^stat::average_exec_per_sec:' "$log" | awk '{print $2}')
  last=$(grep -E '#[0-9]+.*cov:' "$log" | tail -n1)
  cov=$(sed -n 's/.*cov: \([0-9]*\).*/\1/p' <<<"$last")
  ft=$(sed -n 's/.*ft: \([0-9]*\).*/\1/p' <<<"$last")
  corp=$(sed -n 's/.*corp: \([0-9]*\).*/\1/p' <<<"$last")
  printf '%-20s %8s %12s %10s %8s %8s %6s %s\n' "$name" "$SECONDS_EACH" "${execs:-?}" "${rate:-?}" "${cov:-?}" \
      "${ft:-?}" "${corp:-?}" "$((after - before))"
done
