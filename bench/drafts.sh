#!/usr/bin/env bash
# Figures for reading drafts (printed, never asserted):
#  1. a 100,000-line markdown draft (bullets, bold codes, labels) read and
#     checked as a whole CLI process, against the same codes as a plain
#     list, as a ratio (median of runs);
#  2. mistyped codes that lead back to the code meant (examples/typo_eval).
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
cd "$ROOT"
cargo build --release --quiet -p rollcall --bin rollcall
cargo build --profile fast --quiet -p rollcall --example typo_eval
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
zcat vocab-build/sources/icd10cm-history-FY2016-FY2027.tsv.gz > "$tmp/history.tsv"
python3 - "$tmp" "${RUNS:-7}" <<'PY'
import random, statistics, subprocess, sys, time
tmp, runs = sys.argv[1], int(sys.argv[2])
rows = [l.rstrip("\n").split("\t") for l in open(f"{tmp}/history.tsv")][1:]
live = [(c, d) for c, f, t, d in rows if f <= "20260101" <= t and d]
rng = random.Random(2026)
pick = [live[rng.randrange(len(live))] for _ in range(100_000)]
dot = lambda c: c if len(c) <= 3 else c[:3] + "." + c[3:]
with open(f"{tmp}/plain.txt", "w") as f:
    for c, d in pick:
        f.write(f"{dot(c)}\t{d}\n")
with open(f"{tmp}/draft.md", "w") as f:
    f.write("# Draft code list\n\nHere are the codes, grouped as asked.\n\n")
    for i, (c, d) in enumerate(pick[:-4]):
        if i % 1000 == 0:
            f.write(f"## Group {i // 1000 + 1}\n")
        f.write(f"- **{dot(c)}** – {d}\n")
def median(path):
    cmd = ["target/release/rollcall", "check", path, "--on", "2026-01-01", "--format", "json"]
    times = []
    for _ in range(runs):
        t = time.perf_counter()
        subprocess.run(cmd, stdout=subprocess.DEVNULL, check=False)
        times.append((time.perf_counter() - t) * 1000)
    return statistics.median(times)
p, m = median(f"{tmp}/plain.txt"), median(f"{tmp}/draft.md")
print(f"100,000 codes, whole process, JSON out, median of {runs}: plain list {p:.0f} ms; markdown draft {m:.0f} ms; ratio {m / p:.2f} (target <= 1.5)")
PY
target/fast/examples/typo_eval 2000
