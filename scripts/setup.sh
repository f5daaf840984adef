#!/usr/bin/env bash
# Installs what a fresh machine lacks for building and testing rollcall, and
# nothing it already has: the Wasm target, Trunk and wasm-bindgen-cli (cargo),
# Chromium and ChromeDriver (apt, for browser tests), and the npm packages of
# tests/e2e (playwright-core, binaryen@132 for wasm-opt). Safe to run again.
#   scripts/setup.sh          everything
#   scripts/setup.sh --page   only what building and serving the page needs
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/.." && pwd)
export PATH="$HOME/.cargo/bin:$PATH"
want_browser=1
[ "${1:-}" = "--page" ] && want_browser=0
say() { printf 'setup: %s\n' "$*" >&2; }

if ! rustup target list --installed | grep -qx wasm32-unknown-unknown; then
  say "adding the wasm32-unknown-unknown target"
  rustup target add wasm32-unknown-unknown
fi

if ! trunk --version 2>/dev/null | grep -q '0.21.14'; then
  say "installing trunk 0.21.14 (takes about 9 minutes)"
  cargo install trunk --version 0.21.14 --locked
fi

# wasm-bindgen-cli must equal the wasm-bindgen crate version in Cargo.lock.
wb=$(awk '/^name = "wasm-bindgen"$/{getline; gsub(/version = |"/, ""); print; exit}' "$ROOT/Cargo.lock")
if ! wasm-bindgen --version 2>/dev/null | grep -q " $wb\$"; then
  say "installing wasm-bindgen-cli $wb"
  # Without --locked: its own lockfile pins crates this toolchain cannot build.
  cargo install wasm-bindgen-cli --version "$wb"
fi

# npm ci again whenever the lockfile changed since the last install.
E2E="$ROOT/tests/e2e"
if [ ! -x "$E2E/node_modules/.bin/wasm-opt" ] || ! cmp -s "$E2E/package-lock.json" "$E2E/node_modules/.rollcall-lock"; then
  say "installing npm packages of tests/e2e (playwright-core, binaryen@132, axe-core, the FHIR schema)"
  (cd "$E2E" && npm ci --no-audit --no-fund && cp package-lock.json node_modules/.rollcall-lock)
fi

if [ "$want_browser" = 1 ] && { [ ! -x /usr/bin/chromium ] || [ ! -x /usr/bin/chromedriver ]; }; then
  say "installing chromium and chromium-driver (apt)"
  sudo=""
  [ "$(id -u)" = 0 ] || sudo="sudo"
  $sudo apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq chromium chromium-driver
fi

(cd "$ROOT" && cargo fetch --quiet)
say "ready"
