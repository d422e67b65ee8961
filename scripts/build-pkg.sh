#!/usr/bin/env bash
# Builds the ES-module package into dist/pkg/:
#   tacit.js, tacit.d.ts        the public wrapper (from js/): the browser entry, no Node import
#   tacit-node.js               the Node entry: tacit.js with an init that reads files
#   tacit_core.js, .d.ts, _bg.wasm   the wasm-bindgen output it wraps
#   tacit_core_bg.wasm.d.ts     types of the wasm subpath (a bundler's URL of the file)
#   README.md, LICENSE-MIT, LICENSE-APACHE, package.json
# Runs scripts/setup.sh first unless TACIT_SETUP_DONE=1.
# TACIT_NO_WASM_OPT=1 skips the size optimisation by wasm-opt (npm binaryen).
set -euo pipefail
cd "$(dirname "$0")/.."

if [ "${TACIT_SETUP_DONE:-}" != 1 ]; then
  TACIT_SKIP_BROWSER="${TACIT_SKIP_BROWSER:-1}" bash scripts/setup.sh
fi

say() { printf '[pkg] %s\n' "$*"; }

PROFILE=release-wasm
TARGET_DIR=$(cargo metadata --format-version 1 --no-deps | node -e 'let s="";process.stdin.on("data",d=>s+=d).on("end",()=>console.log(JSON.parse(s).target_directory))')
VERSION=$(cargo metadata --format-version 1 --no-deps | node -e 'let s="";process.stdin.on("data",d=>s+=d).on("end",()=>console.log(JSON.parse(s).packages.find(p=>p.name==="tacit").version))')
WASM="$TARGET_DIR/wasm32-unknown-unknown/$PROFILE/tacit.wasm"
OUT=dist/pkg

# The CLI must equal the wasm-bindgen crate in Cargo.lock, or it fails with a schema error.
WB_LOCK=$(awk '/^name = "wasm-bindgen"$/ {getline; gsub(/version = |"/, ""); print; exit}' Cargo.lock)
WB_CLI=$(wasm-bindgen --version | awk '{print $2}')
if [ "$WB_LOCK" != "$WB_CLI" ]; then
  echo "build-pkg: wasm-bindgen CLI $WB_CLI differs from the crate $WB_LOCK in Cargo.lock; run scripts/setup.sh" >&2
  exit 1
fi

say "cargo build --profile $PROFILE --target wasm32-unknown-unknown"
cargo build --lib --profile "$PROFILE" --target wasm32-unknown-unknown

rm -rf "$OUT"
mkdir -p "$OUT"
say "wasm-bindgen $(wasm-bindgen --version | awk '{print $2}') --target web"
wasm-bindgen --target web --out-dir "$OUT" --out-name tacit_core "$WASM"

if [ "${TACIT_NO_WASM_OPT:-}" != 1 ] && [ -x node_modules/.bin/wasm-opt ]; then
  say "wasm-opt -Os --converge (npm binaryen $(node -p 'require("./node_modules/binaryen/package.json").version'))"
  # rustc emits these features by default; wasm-opt must be told it may keep them.
  # -Os, not -Oz: -Oz is as small after gzip. The producers and target-features custom
  # sections are not needed once wasm-bindgen has run.
  node_modules/.bin/wasm-opt -Os --converge --strip-debug --strip-producers --strip-target-features \
    --enable-bulk-memory --enable-nontrapping-float-to-int \
    --enable-sign-ext --enable-mutable-globals --enable-reference-types --enable-multivalue \
    "$OUT/tacit_core_bg.wasm" -o "$OUT/tacit_core_bg.wasm.opt"
  mv "$OUT/tacit_core_bg.wasm.opt" "$OUT/tacit_core_bg.wasm"
else
  say "skipping wasm-opt"
fi

cp js/tacit.d.ts js/tacit-node.js js/README.md LICENSE-MIT LICENSE-APACHE "$OUT/"
sed "s/__TACIT_VERSION__/$VERSION/" js/tacit.js >"$OUT/tacit.js"
# wasm-bindgen's tacit_core_bg.wasm.d.ts types the raw exports of the instance, which only its
# own glue sees; an importer of the subpath gets what a bundler makes of a file: its URL.
cp js/tacit_core_bg.wasm.d.ts "$OUT/tacit_core_bg.wasm.d.ts"

# Conditional exports: browsers and bundlers get tacit.js, Node gets tacit-node.js ("browser"
# comes first for tools that set both conditions). Both have the same types.
cat >"$OUT/package.json" <<EOF
{
  "name": "tacit",
  "version": "$VERSION",
  "description": "Offline solver for implicit design equations (WebAssembly)",
  "license": "MIT OR Apache-2.0",
  "type": "module",
  "main": "./tacit-node.js",
  "module": "./tacit.js",
  "browser": "./tacit.js",
  "types": "./tacit.d.ts",
  "exports": {
    ".": {
      "types": "./tacit.d.ts",
      "browser": "./tacit.js",
      "node": "./tacit-node.js",
      "default": "./tacit.js"
    },
    "./tacit_core_bg.wasm": {
      "types": "./tacit_core_bg.wasm.d.ts",
      "default": "./tacit_core_bg.wasm"
    },
    "./package.json": "./package.json"
  },
  "files": [
    "tacit.js",
    "tacit-node.js",
    "tacit.d.ts",
    "tacit_core.js",
    "tacit_core.d.ts",
    "tacit_core_bg.wasm",
    "tacit_core_bg.wasm.d.ts",
    "README.md",
    "LICENSE-MIT",
    "LICENSE-APACHE"
  ],
  "sideEffects": false
}
EOF

RAW=$(wc -c <"$OUT/tacit_core_bg.wasm")
GZ=$(gzip -9 -c "$OUT/tacit_core_bg.wasm" | wc -c)
say "built $OUT (tacit $VERSION): tacit_core_bg.wasm $RAW bytes, $GZ gzipped"
