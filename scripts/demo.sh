#!/usr/bin/env bash
# demo.sh — set up, build, and run kerf on a bundled sample.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/setup.sh"
cd "$KERF_ROOT"
sample=samples/uart_regsel.v
echo
echo "== kerf stats $sample"
build/kerf stats "$sample"
echo
echo "== kerf restructure $sample -v   (rewritten file on stdout, summary on stderr)"
build/kerf restructure "$sample" -v
