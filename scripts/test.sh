#!/usr/bin/env bash
# test.sh — set up, build, and run the whole test suite through ctest.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/setup.sh"
cd "$KERF_ROOT"
ctest --test-dir build --output-on-failure -j2 --timeout 1800
