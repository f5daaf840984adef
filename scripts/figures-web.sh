#!/usr/bin/env bash
# Print the page's figures: Wasm and index sizes (raw and gzip), time from
# navigation to ready, check times in the worker, the single-file page's
# size and time to ready from file://. Printed, not asserted.
# Builds web/dist first unless it exists (pass --rebuild to force).
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
if [ "${1:-}" = "--rebuild" ] || [ ! -f "$ROOT/web/dist/index-manifest.json" ]; then
  bash "$ROOT/web/build.sh"
fi
node "$ROOT/web/build-single.mjs"
cd "$ROOT/tests/e2e"
[ -d node_modules/playwright-core ] || npm ci --no-audit --no-fund
node figures.mjs
