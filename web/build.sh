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
# The workbook reader, a Wasm module of its own that the worker loads the
# first time a workbook is dropped (calamine stays out of the checker's Wasm).
# The same steps as Trunk's for the checker: wasm-bindgen, then wasm-opt -O3.
(cd "$ROOT" && cargo build --quiet --offline --target wasm32-unknown-unknown --profile wasm-release -p rollcall-workbook)
TARGET_DIR=$(cd "$ROOT" && cargo metadata --format-version 1 --no-deps --offline | node -e 'let s="";process.stdin.on("data",d=>s+=d).on("end",()=>console.log(JSON.parse(s).target_directory))')
BOOK=$(mktemp -d)
trap 'rm -rf "$BOOK"' EXIT
wasm-bindgen --target no-modules --no-modules-global rollcall_workbook --no-typescript \
  --out-dir "$BOOK" --out-name rollcall-workbook \
  "$TARGET_DIR/wasm32-unknown-unknown/wasm-release/rollcall_workbook.wasm"
wasm-opt -O3 --enable-bulk-memory --enable-nontrapping-float-to-int --enable-sign-ext \
  --enable-reference-types --enable-multivalue --enable-mutable-globals \
  "$BOOK/rollcall-workbook_bg.wasm" -o dist/rollcall-workbook_bg.wasm
cp "$BOOK/rollcall-workbook.js" dist/rollcall-workbook.js
# Integrity of the script, modules and both Wasm files; CSP hashes of inline scripts.
node "$WEB/post-build.mjs" "$WEB/dist"
