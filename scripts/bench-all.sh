#!/usr/bin/env bash
# Every benchmark; each prints figures (no timed assertions). Run with `make bench`.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup.sh
export TACIT_SETUP_DONE=1

printf '\n==== evaluation economy of the open (two-guess) default against the plain secant\n'
cargo run --quiet --release --example bench_open
printf '\n==== compiled equations against hand-written Rust and meval\n'
cargo run --quiet --release --example bench_eval
printf '\n==== the per-point cost of a sweep against its evaluations\n'
cargo run --quiet --release --example bench_sweep
printf '\n==== proven roots against the sampling scan; Monte Carlo throughput\n'
cargo run --quiet --release --example bench_proof
printf '\n==== the WebAssembly module\n'
bash scripts/build-pkg.sh
node scripts/bench-wasm.mjs
printf '\n==== wasm against native, side by side: solves, a sweep, a sweep point against its evaluations\n'
node scripts/bench-ratios.mjs
printf '\n==== the offline page\n'
node scripts/build-page.mjs
node scripts/bench-page.mjs
printf '\n==== the page: size, first result painted against the wasm alone\n'
node scripts/bench-first-paint.mjs
printf '\n==== bracketing methods on the published test sets\n'
cargo run --quiet --release --example bench_methods
