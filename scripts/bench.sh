#!/usr/bin/env bash
# Prints the scale table of the README: one row per size (tab-separated).
# Usage: scripts/bench.sh [SIZES...]   (default: 10000 100000 1000000)
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet --bin tubecert
sizes=("${@:-10000 100000 1000000}")
first=1
for n in ${sizes[@]}; do
  if [ $first -eq 1 ]; then target/release/tubecert bench --generators "$n"; first=0
  else target/release/tubecert bench --generators "$n" --no-header; fi
done
# Maps between two large complexes (search in the Hom complex of the reduced models).
target/release/tubecert bench --generators 20000 --source-generators 20000 --no-header
# Hom questions between reduced complexes over F2[U,V] (T(13,14)^⊗3 and T(11,12)^⊗3).
target/release/tubecert bench --case reduced-identity --no-header
target/release/tubecert bench --case reduced-uv --no-header
