#!/usr/bin/env bash
# Peak memory and wall time of `check` on a 1,000,000-line list (printed,
# never asserted), for the json, text and csv outputs:
#  - labelled: every code of the ICD-10-CM history with its description,
#    cycled to LINES lines (so most codes are on 13 or 14 lines);
#  - plain: the same codes without their labels.
# The study period is FY2020-FY2024, so retired, not-yet-valid and
# partial-period codes are among them.
#
# LINES (default 1000000) sets the list's length. SAVE=DIR keeps each output
# in DIR; SAME=DIR compares each output with the one kept there (cmp), so a
# change can be shown to leave every byte the same.
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
cd "$ROOT"
LINES=${LINES:-1000000}
cargo build --profile fast --quiet -p rollcall --bin rollcall
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
zcat vocab-build/sources/icd10cm-history-FY2016-FY2027.tsv.gz | tail -n +2 | cut -f1,4 > "$tmp/rows.tsv"
# The rows over and over, to LINES lines; a tab between code and label.
awk -v n="$LINES" '{ row[NR] = $0 } END { for (i = 0; i < n; i++) print row[i % NR + 1] }' "$tmp/rows.tsv" > "$tmp/labelled.tsv"
cut -f1 "$tmp/labelled.tsv" > "$tmp/plain.txt"
mkdir "$tmp/out"
cli=target/fast/rollcall
if [ -n "${SAVE:-}" ]; then mkdir -p "$SAVE"; fi
printf '%-10s %-6s %12s %9s %14s %s\n' list format "peak RSS MB" "wall s" "output bytes" same
for list in labelled plain; do
  for format in json text csv; do
    out="$tmp/out/$list.$format"
    /usr/bin/time -f '%M %e' -o "$tmp/time" "$cli" check "$tmp/$list".t* \
      --from 2019-10-01 --to 2024-09-30 --format "$format" > "$out" || true
    # (time puts "Command exited with non-zero status 1" first: findings)
    read -r kb secs < <(tail -n 1 "$tmp/time")
    same=""
    if [ -n "${SAME:-}" ]; then
      if cmp -s "$out" "$SAME/$list.$format"; then same="same bytes"; else same="DIFFERS"; fi
    fi
    printf '%-10s %-6s %12.0f %9s %14s %s\n' "$list" "$format" "$((kb / 1024))" "$secs" "$(wc -c < "$out")" "$same"
    if [ -n "${SAVE:-}" ]; then cp "$out" "$SAVE/"; fi
  done
done
