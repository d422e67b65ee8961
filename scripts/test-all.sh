#!/usr/bin/env bash
# The full test suite (the README's test command, run by .ci/run).
set -euo pipefail
cd "$(dirname "$0")/.."

stage() { printf '\n==== %s\n' "$*"; }

stage "setup"
bash scripts/setup.sh
export TACIT_SETUP_DONE=1

stage "format and lints"
cargo fmt --all -- --check
cargo clippy --all-targets -- -D warnings
cargo clippy --lib --target wasm32-unknown-unknown -- -D warnings

stage "native tests"
cargo test --all-targets
cargo test --doc

stage "wasm package"
bash scripts/build-pkg.sh

stage "wasm tests in Node and headless Chromium, then the package used from Node"
TACIT_PKG_BUILT=1 bash scripts/test-wasm.sh

stage "the offline page, end to end in headless Chromium"
node scripts/build-page.mjs
node --test tests/e2e/

stage "all stages passed"
