"""Times the rollcall CLI against the plain Python lookup, whole processes,
alternating runs, and prints medians and the ratio.

usage: python3 compare.py TMPDIR RUNS [JSON]   (TMPDIR holds elix.csv and history.tsv;
JSON, when given, is a file to write the medians and the ratio to)
"""
import json
import statistics
import subprocess
import sys
import time

tmp, runs = sys.argv[1], int(sys.argv[2])
cases = {
    "rollcall check --on 2026-01-01": ["target/release/rollcall", "check", f"{tmp}/elix.csv", "--on", "2026-01-01"],
    "rollcall check --from 2015-10-01 --to 2026-09-30": [
        "target/release/rollcall", "check", f"{tmp}/elix.csv", "--from", "2015-10-01", "--to", "2026-09-30"],
    "python dict lookup (on 2026-01-01)": [
        sys.executable, "bench/python_lookup.py", f"{tmp}/history.tsv", f"{tmp}/elix.csv", "icd10cm", "20260101"],
}
times = {k: [] for k in cases}
for _ in range(runs + 1):  # the first round warms caches and is dropped
    for name, cmd in cases.items():
        t = time.perf_counter()
        subprocess.run(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        times[name].append(time.perf_counter() - t)
med = {k: statistics.median(v[1:]) for k, v in times.items()}
py = med["python dict lookup (on 2026-01-01)"]
print(f"Elixhauser v2026.1 list (4,690 codes), median of {runs} runs, whole process:")
for k, v in med.items():
    extra = "" if k.startswith("python") else f"  ({py / v:.1f}x faster than the Python lookup)"
    print(f"  {k:<52} {v * 1000:7.1f} ms{extra}")
if len(sys.argv) > 3:
    with open(sys.argv[3], "w") as f:
        json.dump({"cli_ms": med["rollcall check --on 2026-01-01"] * 1000, "python_ms": py * 1000,
                   "cli_ratio": py / med["rollcall check --on 2026-01-01"]}, f)
