#!/usr/bin/env bash
# Times of inputs that once took quadratic time (printed, never asserted):
#  1. `find` with one 100,000-character word (the misspelt-word automaton);
#  2. `check` of a line whose label is one 100,000-character word;
#  3. `compare` on HPO of the root (HP:0000001) against one branch
#     (HP:0000118): about a thousand differences, each wanting the nearest
#     code of the other list by category.
# Median of RUNS (default 5) whole-process runs of the `fast` profile.
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
cd "$ROOT"
cargo build --profile fast --quiet -p rollcall --bin rollcall
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
python3 - "$tmp" "${RUNS:-5}" <<'PY'
import subprocess, sys, time, statistics
tmp, runs = sys.argv[1], int(sys.argv[2])
word = "a" * 100_000
open(f"{tmp}/label.txt", "w").write("E11.9 " + "diabetes" * 12_500 + "\n")
open(f"{tmp}/root.txt", "w").write("HP:0000001\n")
open(f"{tmp}/branch.txt", "w").write("HP:0000118\n")
cli = "target/fast/rollcall"
cases = [
    ("find, one 100,000-character word", [cli, "find", word]),
    ("check, a label of one 100,000-character word", [cli, "check", f"{tmp}/label.txt", "--on", "2024-01-01"]),
    ("compare on HPO, root against one branch", [cli, "compare", f"{tmp}/root.txt", f"{tmp}/branch.txt", "--system", "hpo"]),
]
for name, cmd in cases:
    times = []
    for _ in range(runs):
        t = time.perf_counter()
        subprocess.run(cmd, stdout=subprocess.DEVNULL, check=False)
        times.append((time.perf_counter() - t) * 1000)
    print(f"{name}: median {statistics.median(times):.0f} ms over {runs} runs")
PY
