#!/usr/bin/env bash
# Build the page into web/dist with Trunk, offline, using the pinned tools:
# wasm-bindgen (cargo install) and wasm-opt (npm binaryen@132 in tests/e2e).
set -euo pipefail
WEB=$(cd "$(dirname "$0")" && pwd)
ROOT=$(cd "$WEB/.." && pwd)
E2E="$ROOT/tests/e2e"
if [ ! -x "$E2E/node_modules/.bin/wasm-opt" ]; then
  (cd "$E2E" && npm ci --no-audit --no-fund)
fi
export PATH="$E2E/node_modules/.bin:$HOME/.cargo/bin:$PATH"
for tool in trunk wasm-bindgen wasm-opt; do
  command -v "$tool" >/dev/null || { echo "build.sh: $tool is not on PATH (see web/README.md)" >&2; exit 1; }
done
[ -f "$ROOT/vocab/icd10cm.rcx" ] || { echo "build.sh: vocab/icd10cm.rcx is missing; build the index first" >&2; exit 1; }
(cd "$ROOT" && cargo fetch --quiet)
cd "$WEB"
trunk build "$@"
test -s dist/index-manifest.json || { echo "build.sh: the manifest was not written" >&2; exit 1; }
# Integrity of the script, modules and Wasm; CSP hashes of inline scripts.
node "$WEB/post-build.mjs" "$WEB/dist"
