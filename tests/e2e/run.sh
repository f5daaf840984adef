#!/usr/bin/env bash
# End-to-end tests of the page: build the CLI and the page, then drive the
# page in Debian's Chromium (playwright-core; no browser download) against a
# local static server. Exits non-zero on any failure.
set -euo pipefail
E2E=$(cd "$(dirname "$0")" && pwd)
ROOT=$(cd "$E2E/../.." && pwd)
cd "$E2E"
cmp -s package-lock.json node_modules/.rollcall-lock || { npm ci --no-audit --no-fund && cp package-lock.json node_modules/.rollcall-lock; }
(cd "$ROOT" && cargo build --profile fast --quiet -p rollcall --bin rollcall)
bash "$ROOT/web/build.sh"
node "$ROOT/web/build-single.mjs"
mkdir -p out
node --test --test-concurrency=1 --test-reporter=spec page.test.mjs embed.test.mjs search.test.mjs card.test.mjs export.test.mjs work.test.mjs drafts.test.mjs workbook.test.mjs
