#!/usr/bin/env bash
# Build the single-file page web/dist-single/rollcall.html (the page, the
# Wasm, the worker and the bundled index in one HTML file that works from
# file:// with no network) from web/dist; builds web/dist first if missing.
# Prints its size.
set -euo pipefail
WEB=$(cd "$(dirname "$0")" && pwd)
if [ "${1:-}" = "--rebuild" ] || [ ! -f "$WEB/dist/index-manifest.json" ]; then
  bash "$WEB/build.sh"
fi
node "$WEB/build-single.mjs" "$WEB/dist" "$WEB/dist-single/rollcall.html"
