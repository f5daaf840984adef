#!/usr/bin/env bash
# Runs every fuzz target for SECONDS each (default 600; CI uses 60) from the
# committed corpus in fuzz/corpus/, one target at a time in one process, and
# fails when any target writes a new crash, timeout or out-of-memory input
# to fuzz/artifacts/ (an input slower than 20 s is listed as slow-unit-*
# and reported, not failed: under the sanitizer on a busy machine a costly
# but linear input can take that long; a stall past -timeout fails). Installs cargo-fuzz if it is missing. A kept input
# belongs in fuzz/regressions/<target>/ (tests/fuzz_regressions.rs replays
# it on stable) once the fault is fixed. New corpus inputs go to a scratch
# directory, so the working tree stays clean; FUZZ_KEEP=1 adds them to
# fuzz/corpus/ instead (then minimise with cargo fuzz cmin before committing).
set -euo pipefail
SECONDS_EACH=${1:-600}
ROOT=$(cd "$(dirname "$0")/.." && pwd)
cd "$ROOT"
export PATH="$HOME/.cargo/bin:$PATH"
if ! cargo fuzz --version >/dev/null 2>&1; then
    echo "== installing cargo-fuzz"
    cargo install cargo-fuzz --locked || cargo install cargo-fuzz
fi
# cargo-fuzz passes nightly-only flags (sanitizers, coverage): the stable
# compiler accepts them with RUSTC_BOOTSTRAP.
export RUSTC_BOOTSTRAP=1
# FUZZ_TARGETS="a b" runs only those.
read -r -a TARGETS <<< "${FUZZ_TARGETS:-check_text index_bytes mixed_list compare_lists search_words}"
before=$(find fuzz/artifacts -type f 2>/dev/null | sort || true)
scratch=$(mktemp -d)
trap 'rm -rf "$scratch"' EXIT
status=0
for t in "${TARGETS[@]}"; do
    echo "== fuzzing $t for ${SECONDS_EACH}s"
    mkdir -p "fuzz/corpus/$t" "$scratch/$t"
    # libFuzzer writes new inputs to the first directory and reads them all.
    if [ "${FUZZ_KEEP:-0}" = 1 ]; then dirs=("fuzz/corpus/$t"); else dirs=("$scratch/$t" "fuzz/corpus/$t"); fi
    if ! cargo fuzz run "$t" "${dirs[@]}" -- \
        -max_total_time="$SECONDS_EACH" \
        -dict=fuzz/rollcall.dict -timeout=60 -report_slow_units=20 -rss_limit_mb=4096 \
        -print_final_stats=1; then
        echo "!! $t failed"
        status=1
    fi
done
after=$(find fuzz/artifacts -type f 2>/dev/null | sort || true)
new=$(comm -13 <(echo "$before") <(echo "$after") | sed '/^$/d')
slow=$(echo "$new" | grep '/slow-unit-' || true)
bad=$(echo "$new" | grep -v '/slow-unit-' || true)
if [ -n "$slow" ]; then
    echo "== slow inputs (not failures; time them with cargo fuzz run TARGET FILE):"
    echo "$slow"
fi
if [ -n "$bad" ]; then
    echo "!! new fuzz artifacts (reproduce with cargo fuzz run TARGET FILE):"
    echo "$bad"
    status=1
fi
exit $status
