#!/usr/bin/env bash
# Benchmark figures for the README (printed, never asserted):
#  1. rollcall CLI versus a plain Python dict lookup over the history TSV,
#     end to end on the Elixhauser v2026.1 list, as a ratio;
#  2. lookups per second in the index;
#  3. index bytes versus gzip -9 and xz -9 of the source TSV;
#  4. compare on the Elixhauser list; 5. the same check with a system column.
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
# 4. compare: the Elixhauser list against itself less its CANCER_SOLID rows,
#    whole process, median of runs.
grep -v '^CANCER_SOLID,' "$tmp/elix.csv" > "$tmp/elix-less.csv"
python3 - "$tmp" "${RUNS:-15}" <<'PY'
import subprocess, sys, time, statistics
tmp, runs = sys.argv[1], int(sys.argv[2])
cmd = ["target/release/rollcall", "compare", f"{tmp}/elix.csv", f"{tmp}/elix-less.csv",
       "--from", "2015-10-01", "--to", "2026-09-30", "--format", "json"]
times = []
for _ in range(runs):
    t = time.perf_counter()
    subprocess.run(cmd, stdout=subprocess.DEVNULL, check=False)
    times.append((time.perf_counter() - t) * 1000)
print(f"compare Elixhauser (4,690 rows) with itself less CANCER_SOLID, JSON out: median {statistics.median(times):.0f} ms over {runs} runs")
PY
# 5. a system column: the Elixhauser list as it is, then with a system column
#    naming ICD-10-CM on every row (the per-system path: one more parse, the
#    rows blanked and merged), whole process, median of runs.
python3 - "$tmp" "${RUNS:-15}" <<'PY'
import csv, io, subprocess, sys, time, statistics
tmp, runs = sys.argv[1], int(sys.argv[2])
rows = list(csv.reader(open(f"{tmp}/elix.csv", newline="")))
out = io.StringIO()
w = csv.writer(out, lineterminator="\n")
w.writerow(["system"] + rows[0])
for r in rows[1:]:
    w.writerow(["ICD-10-CM"] + r)
open(f"{tmp}/elix-system.csv", "w").write(out.getvalue())
def median(path):
    cmd = ["target/release/rollcall", "check", path, "--on", "2026-01-01", "--format", "json"]
    times = []
    for _ in range(runs):
        t = time.perf_counter()
        subprocess.run(cmd, stdout=subprocess.DEVNULL, check=False)
        times.append((time.perf_counter() - t) * 1000)
    return statistics.median(times)
plain, column = median(f"{tmp}/elix.csv"), median(f"{tmp}/elix-system.csv")
print(f"check Elixhauser (4,690 rows), JSON out: median {plain:.0f} ms as it is, {column:.0f} ms with a system column on every row ({runs} runs)")
PY
# 6. HPO: every term of the release in one list (a stress test of the graph
#    rules: redundancy through every parent, roll-ups and sibling gaps), and
#    the index size.
zcat vocab-build/sources/hp-2025-01-16.obo.gz | sed -n 's/^id: \(HP:[0-9]*\)$/\1/p' > "$tmp/hpo-all.txt"
python3 - "$tmp" "${RUNS:-15}" vocab/hpo.rcx <<'PY'
import gzip, subprocess, sys, time, statistics
tmp, runs, idx = sys.argv[1], int(sys.argv[2]), sys.argv[3]
cmd = ["target/release/rollcall", "check", f"{tmp}/hpo-all.txt", "--system", "hpo", "--format", "json"]
times = []
for _ in range(runs):
    t = time.perf_counter()
    subprocess.run(cmd, stdout=subprocess.DEVNULL, check=False)
    times.append((time.perf_counter() - t) * 1000)
n = sum(1 for _ in open(f"{tmp}/hpo-all.txt"))
b = open(idx, "rb").read()
print(f"check all {n:,} HPO terms in one list, JSON out: median {statistics.median(times):.0f} ms over {runs} runs")
print(f"HPO index: {len(b):,} bytes; gzip -9 {len(gzip.compress(b, 9)):,}")
PY
