#!/usr/bin/env bash
# setup.sh — shared by demo.sh and test.sh: install what is missing, then
# configure and build kerf into build/. Sourced, not run on its own.
set -euo pipefail

KERF_ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
APT_PACKAGES=(cmake g++ make python3 python3-pip libfmt-dev libcli11-dev libgtest-dev
              libbenchmark-dev libcadical-dev nlohmann-json3-dev iverilog verilator graphviz)

missing=()
for p in "${APT_PACKAGES[@]}"; do
  dpkg -s "$p" >/dev/null 2>&1 || missing+=("$p")
done
if [ "${#missing[@]}" -gt 0 ]; then
  if [ "$(id -u)" -eq 0 ] && command -v apt-get >/dev/null; then
    echo "kerf setup: installing ${missing[*]}"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq
    apt-get install -y -qq "${missing[@]}" >/dev/null
  else
    echo "kerf setup: missing packages: ${missing[*]}" >&2
    echo "  install them with: sudo apt-get install ${missing[*]}" >&2
    exit 1
  fi
fi

if ! python3 -c 'import pyslang, sys; sys.exit(0 if pyslang.__version__ == "12.1.0" else 1)' >/dev/null 2>&1; then
  echo "kerf setup: installing pyslang (requirements.txt)"
  python3 -m pip install -q -r "$KERF_ROOT/requirements.txt" 2>/dev/null ||
    python3 -m pip install -q --break-system-packages -r "$KERF_ROOT/requirements.txt"
fi

cmake -S "$KERF_ROOT" -B "$KERF_ROOT/build" -DCMAKE_BUILD_TYPE=RelWithDebInfo >/dev/null
cmake --build "$KERF_ROOT/build" -j"$(nproc)"
