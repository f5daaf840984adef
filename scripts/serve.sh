#!/usr/bin/env bash
# Builds the page with the bundled ICD-10-CM index and serves it on
# http://127.0.0.1:${PORT:-8080}/ (installs missing tools first).
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
bash "$ROOT/scripts/setup.sh" --page
bash "$ROOT/web/build.sh"
echo "serving the page at http://127.0.0.1:${PORT:-8080}/ (Ctrl-C stops)"
exec node "$ROOT/tests/e2e/serve.mjs" "$ROOT/web/dist" "${PORT:-8080}"
