#!/usr/bin/env bash
# Benchmark figures for the README (printed, never asserted):
#  1. rollcall CLI versus a plain Python dict lookup over the history TSV,
#     end to end on the Elixhauser v2026.1 list, as a ratio;
#  2. lookups per second in the index;
#  3. index bytes versus gzip -9 and xz -9 of the source TSV.
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
cd "$ROOT"
cargo build --release --quiet -p rollcall --bin rollcall --example lookups
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
zcat tests/data/elixhauser-ahrq-v2026.1.csv.gz > "$tmp/elix.csv"
zcat vocab-build/sources/icd10cm-history-FY2016-FY2027.tsv.gz > "$tmp/history.tsv"
python3 bench/compare.py "$tmp" "${RUNS:-15}"
target/release/examples/lookups vocab/icd10cm.rcx
python3 - "$tmp/history.tsv" vocab/icd10cm.rcx <<'PY'
import gzip, lzma, sys
tsv = open(sys.argv[1], "rb").read()
idx = open(sys.argv[2], "rb").read()
print(f"source history TSV: {len(tsv):,} bytes; gzip -9 {len(gzip.compress(tsv, 9)):,}; xz -9 {len(lzma.compress(tsv, preset=9)):,}")
print(f"index (codes, dates, hierarchy, descriptions): {len(idx):,} bytes; gzip -9 {len(gzip.compress(idx, 9)):,}; xz -9 {len(lzma.compress(idx, preset=9)):,}")
PY
