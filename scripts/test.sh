#!/usr/bin/env bash
# Runs every test: the native core, CLI and vocab-build tests (against the
# official files), the Wasm binding tests in headless Chromium, and the
# end-to-end page tests, then a short fuzz pass. Installs missing tools first.
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
cd "$ROOT"
bash scripts/setup.sh
export PATH="$HOME/.cargo/bin:$ROOT/tests/e2e/node_modules/.bin:$PATH"
echo "== native tests (core, CLI, vocab-build)"
cargo test --profile fast --workspace --exclude rollcall-web
echo "== Wasm binding tests in headless Chromium"
(cd web && CHROMEDRIVER=/usr/bin/chromedriver cargo test --target wasm32-unknown-unknown)
echo "== page end-to-end tests in headless Chromium"
bash tests/e2e/run.sh
echo "== fuzzing, 60 s per target (fails on any new crash input)"
bash scripts/fuzz.sh 60
echo "== all tests passed"
