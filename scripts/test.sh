#!/usr/bin/env bash
# test.sh — set up, build, and run the whole test suite through ctest.
# The build time is printed before the tests; ctest ends with the test time.
set -euo pipefail
start=$(date +%s)
source "$(dirname "${BASH_SOURCE[0]}")/setup.sh"
echo "kerf test.sh: set-up and build took $(( $(date +%s) - start )) s"
cd "$KERF_ROOT"
ctest --test-dir build --output-on-failure -j2 --timeout 1800
