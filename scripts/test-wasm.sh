#!/usr/bin/env bash
# The WebAssembly tests:
#   1. tests/wasm (wasm-bindgen-test) in Node;
#   2. the same tests in headless Chromium through chromedriver (Debian's chromium and
#      chromium-driver, whose major versions must match);
#   3. node --test tests/js/ against the built package dist/pkg (built first unless
#      TACIT_PKG_BUILT=1 says it is fresh);
#   4. node --test tests/package/: the package packed with npm pack, imported by name from
#      Node, bundled by esbuild, built by Vite, used in a module worker and served
#      unbundled, each opened in headless Chromium (skipped with TACIT_SKIP_BROWSER=1,
#      but for the Node cases).
# Runs scripts/setup.sh first unless TACIT_SETUP_DONE=1. TACIT_SKIP_BROWSER=1 skips step 2.
set -euo pipefail
cd "$(dirname "$0")/.."

if [ "${TACIT_SETUP_DONE:-}" != 1 ]; then
  bash scripts/setup.sh
fi

say() { printf '[test-wasm] %s\n' "$*"; }

export CARGO_TARGET_WASM32_UNKNOWN_UNKNOWN_RUNNER=wasm-bindgen-test-runner

say "wasm-bindgen-test in Node ($(node --version))"
cargo test --target wasm32-unknown-unknown --test wasm

if [ "${TACIT_SKIP_BROWSER:-}" != 1 ]; then
  CHROMIUM=${CHROMIUM:-$(command -v chromium || true)}
  CHROMEDRIVER=${CHROMEDRIVER:-$(command -v chromedriver || true)}
  if [ -z "$CHROMIUM" ] || [ -z "$CHROMEDRIVER" ]; then
    echo "test-wasm: chromium and chromedriver are needed (scripts/setup.sh installs them)" >&2
    exit 1
  fi
  browser_major=$("$CHROMIUM" --version | grep -oE '[0-9]+' | head -1)
  driver_major=$("$CHROMEDRIVER" --version | grep -oE '[0-9]+' | head -1)
  if [ "$browser_major" != "$driver_major" ]; then
    echo "test-wasm: $("$CHROMIUM" --version) and $("$CHROMEDRIVER" --version) differ; install matching versions" >&2
    exit 1
  fi
  profile=$(mktemp -d)
  trap 'rm -rf "$profile"' EXIT
  cat >"$profile/webdriver.json" <<EOF
{
  "goog:chromeOptions": {
    "binary": "$CHROMIUM",
    "args": ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
             "--disable-background-networking", "--disable-component-update", "--disable-sync",
             "--disable-dev-shm-usage", "--user-data-dir=$profile/user-data"]
  }
}
EOF
  say "wasm-bindgen-test in $("$CHROMIUM" --version) via chromedriver $driver_major"
  WASM_BINDGEN_USE_BROWSER=1 CHROMEDRIVER="$CHROMEDRIVER" \
    WASM_BINDGEN_TEST_WEBDRIVER_JSON="$profile/webdriver.json" \
    cargo test --target wasm32-unknown-unknown --test wasm
fi

if [ "${TACIT_PKG_BUILT:-}" != 1 ]; then
  TACIT_SETUP_DONE=1 bash scripts/build-pkg.sh
fi
say "node --test tests/js/ (the package as an embedding tool uses it)"
node --test tests/js/
if [ "${TACIT_SKIP_BROWSER:-}" != 1 ]; then
  say "node --test tests/package/ (Node by name, esbuild, Vite, a module worker, a static server)"
  node --test tests/package/
else
  say "node --test tests/package/node.test.mjs (the browser set-ups skipped)"
  node --test tests/package/node.test.mjs
fi
