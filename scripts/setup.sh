#!/usr/bin/env bash
# Installs everything the build and the tests need on a fresh machine. Safe to re-run:
# each step checks first and does nothing when its tool is already in place.
set -euo pipefail
cd "$(dirname "$0")/.."

say() { printf '[setup] %s\n' "$*"; }

# The wasm-bindgen CLI must equal the wasm-bindgen crate in Cargo.lock exactly.
WB_VERSION=$(awk '/^name = "wasm-bindgen"$/ {getline; gsub(/version = |"/, ""); print; exit}' Cargo.lock)
if [ -z "$WB_VERSION" ]; then
  echo "setup: cannot read the wasm-bindgen version from Cargo.lock" >&2
  exit 1
fi

if ! rustup target list --installed | grep -qx wasm32-unknown-unknown; then
  say "adding the wasm32-unknown-unknown target"
  rustup target add wasm32-unknown-unknown
fi

if ! command -v wasm-bindgen >/dev/null || [ "$(wasm-bindgen --version | awk '{print $2}')" != "$WB_VERSION" ]; then
  say "installing wasm-bindgen-cli $WB_VERSION (takes a few minutes)"
  cargo install wasm-bindgen-cli --version "$WB_VERSION" --locked
fi

if [ "${TACIT_SKIP_BROWSER:-}" != 1 ]; then
  if ! command -v chromium >/dev/null || ! command -v chromedriver >/dev/null; then
    say "installing Debian's chromium and chromium-driver"
    SUDO=""
    [ "$(id -u)" = 0 ] || SUDO=sudo
    $SUDO apt-get update -q
    DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -q chromium chromium-driver
  fi
fi

# xz packs the page's wasm and script with LZMA (scripts/build-page.mjs; without it the page
# falls back to gzip and is larger).
if ! command -v xz >/dev/null; then
  say "installing Debian's xz-utils"
  SUDO=""
  [ "$(id -u)" = 0 ] || SUDO=sudo
  $SUDO apt-get update -q
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -q xz-utils
fi

# npm records what it installed in node_modules/.package-lock.json; a newer lock file means a change.
if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  say "installing npm packages"
  npm ci --no-audit --no-fund
fi
say "ready"
