#!/usr/bin/env bash
# End-to-end tests of the page: build the CLI and the page, then drive the
# page in Debian's Chromium (playwright-core; no browser download) against a
# local static server. Exits non-zero on any failure.
set -euo pipefail
E2E=$(cd "$(dirname "$0")" && pwd)
ROOT=$(cd "$E2E/../.." && pwd)
cd "$E2E"
cmp -s package-lock.json node_modules/.rollcall-lock || { npm ci --no-audit --no-fund && cp package-lock.json node_modules/.rollcall-lock; }
# vocab-build and index-manifest too: site-index.test.mjs builds a site's
# own index and its manifest with them.
(cd "$ROOT" && cargo build --profile fast --quiet -p rollcall --bin rollcall -p vocab-build --bin vocab-build \
  -p rollcall-web --bin index-manifest --features rollcall-web/manifest-tool)
bash "$ROOT/web/build.sh"
node "$ROOT/web/build-single.mjs"
mkdir -p out
# Test files named on the command line run alone (e.g. run.sh site-index.test.mjs).
TESTS=(page.test.mjs embed.test.mjs search.test.mjs card.test.mjs export.test.mjs work.test.mjs drafts.test.mjs workbook.test.mjs site-index.test.mjs)
[ $# -eq 0 ] || TESTS=("$@")
node --test --test-concurrency=1 --test-reporter=spec "${TESTS[@]}"
