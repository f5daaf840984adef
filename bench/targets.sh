#!/usr/bin/env bash
# Every speed and size target of the project in one run: each figure as
# measured, its target, and the ratio of the two (printed, never asserted).
#  - the CLI against a plain Python dict lookup over the history TSV
#    (bench/compare.py, whole processes, the Elixhauser v2026.1 list);
#  - the ICD-10-CM index, gzip -9;
#  - the page (tests/e2e/figures.mjs, headless Chromium, web/dist served by a
#    server that does not compress): bytes until ready, navigation to ready,
#    10,000 and 100,000 lines through the module API, the Wasm gzip -9.
# RUNS (default 7) sets the runs per median. Builds the CLI and web/dist.
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
cd "$ROOT"
export PATH="$HOME/.cargo/bin:$ROOT/tests/e2e/node_modules/.bin:$PATH"
RUNS=${RUNS:-7}
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
cargo build --release --quiet -p rollcall --bin rollcall
zcat tests/data/elixhauser-ahrq-v2026.1.csv.gz > "$tmp/elix.csv"
zcat vocab-build/sources/icd10cm-history-FY2016-FY2027.tsv.gz > "$tmp/history.tsv"
python3 bench/compare.py "$tmp" "$RUNS" "$tmp/cli.json"
bash web/build.sh >/dev/null
node web/build-single.mjs >/dev/null
(cd tests/e2e && RUNS="$RUNS" FIGURES_JSON="$tmp/page.json" node figures.mjs)
python3 - "$tmp/cli.json" "$tmp/page.json" vocab/icd10cm.rcx <<'PY'
import gzip, json, sys
cli = json.load(open(sys.argv[1]))
page = json.load(open(sys.argv[2]))
index_gz = len(gzip.compress(open(sys.argv[3], "rb").read(), 9))
# (what, measured, target, unit, True when more is better)
rows = [
    ("CLI against the Python lookup, Elixhauser list", cli["cli_ratio"], 20, "x faster", True),
    ("ICD-10-CM index, gzip -9", index_gz, 520_000, "bytes", False),
    ("bytes fetched until ready, server that does not compress", page["bytes_until_ready"], 1_000_000, "bytes", False),
    ("navigation to ready, localhost", page["ready_ms"], 400, "ms", False),
    ("10,000 lines through open/check, in the worker", page["api_check_10000_ms"], 30, "ms", False),
    ("100,000 lines, same path", page["api_check_100000_ms"], 300, "ms", False),
    ("Wasm before the first check, gzip -9", page["wasm_gzip_bytes"], 250_000, "bytes", False),
]
print()
print(f"{'what':<60} {'measured':>14} {'target':>12}  measured/target")
for what, got, target, unit, more in rows:
    met = got >= target if more else got <= target
    fmt = (lambda v: f"{v:,.1f}") if unit in ("ms", "x faster") else (lambda v: f"{v:,.0f}")
    print(f"{what:<60} {fmt(got):>14} {fmt(target):>12}  {got / target:6.2f} {unit:<8} {'met' if met else 'NOT MET'}")
PY
