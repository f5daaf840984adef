#!/usr/bin/env bash
# Import figures (printed, never asserted): vocab-build time, peak memory and
# index size for large invented LOINC and RxNorm files (bench/imports.py).
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
cd "$ROOT"
cargo build --release --quiet -p vocab-build
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
python3 bench/imports.py vocab-build/tests/data/import/Loinc.csv "$tmp"
V=target/release/vocab-build
measure() {
  local what=$1 out=$2
  shift 2
  /usr/bin/time -f "%e %M" -o "$tmp/time" "$V" "$@" --out "$out" 2>/dev/null
  read -r secs kb < "$tmp/time"
  echo "$what: ${secs} s, peak ${kb} KB, index $(stat -c %s "$out") bytes"
}
measure "LOINC table, 100000 rows ($(stat -c %s "$tmp/Loinc.csv") bytes)" "$tmp/loinc.rcx" \
  --loinc "$tmp/Loinc.csv" --release-date 2024-08-06
measure "RxNorm, 300000 names, 20000 retired ($(stat -c %s "$tmp/rrf/RXNCONSO.RRF") bytes)" "$tmp/rx.rcx" \
  --rxnorm "$tmp/rrf" --release-date 2025-01-06
