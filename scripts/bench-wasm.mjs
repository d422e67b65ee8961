// Figures for the WebAssembly package (printed, never asserted):
//   - the .wasm size, raw and gzipped (goal: at most 250 KB raw);
//   - the cost of one call across the JS–wasm boundary;
//   - solves per second in Node against native, in one run (goal: wasm at least 50 %).
// Needs dist/pkg (scripts/build-pkg.sh). Runs `cargo run --release --example
// bench_native_solve` for the native figures unless TACIT_BENCH_NO_NATIVE=1.
// Usage: node scripts/bench-wasm.mjs [seconds per workload, default 1]
import { readFile } from "node:fs/promises";
import { gzipSync } from "node:zlib";
import { execFileSync } from "node:child_process";
import { fileURLToPath } from "node:url";

const root = new URL("../", import.meta.url);
const pkg = new URL("dist/pkg/", root);
const seconds = Number(process.argv[2] ?? 1);

// The same workloads as examples/bench_native_solve.rs.
const TEMPLATE = { id: "pipes.colebrook", values: { Re: 360000, eps: { value: 0.15, unit: "mm" }, D: { value: 300, unit: "mm" } }, unknown: "f" };
const EQUATION = {
  equations: "1/sqrt(f) = -2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))",
  knowns: { Re: 360000, eps: 0.00015, D: 0.3 },
  unknowns: [{ name: "f", guesses: [0.008, 0.08], bounds: [0.002, 0.2] }],
};
const OPTIONS = { guesses: [0.008, 0.08] };
const colebrook = (f) => 1 / Math.sqrt(f) + 2 * Math.log10(0.15e-3 / (3.7 * 0.3) + 2.51 / (360000 * Math.sqrt(f)));

const bytes = await readFile(new URL("tacit_core_bg.wasm", pkg));
const tacit = await import(new URL("tacit.js", pkg));
const core = await import(new URL("tacit_core.js", pkg));
await tacit.init(bytes);

const kb = (n) => `${(n / 1024).toFixed(1)} KiB`;
const raw = bytes.length;
const gz = gzipSync(bytes, { level: 9 }).length;
console.log(`wasm size: ${raw} bytes (${kb(raw)}) raw, ${gz} bytes (${kb(gz)}) gzipped; goal <= 250 KB raw (${raw <= 250_000 ? "met" : "not met"})`);

// The best of ROUNDS timed rounds (each `seconds / ROUNDS` long), so that other work on
// a shared machine lowers the figure less; the native example does the same.
const ROUNDS = 3;
function rate(run, budget = seconds) {
  // Warm up long enough for V8 to move the hot wasm functions to its optimising tier.
  const warm = performance.now() + 300;
  while (performance.now() < warm) run();
  let best = 0;
  for (let round = 0; round < ROUNDS; round++) {
    let n = 0;
    const start = performance.now();
    const end = start + (budget * 1000) / ROUNDS;
    while (performance.now() < end) {
      for (let i = 0; i < 50; i++) run();
      n += 50;
    }
    best = Math.max(best, n / ((performance.now() - start) / 1000));
  }
  return best;
}

function perCallNs(run, calls = 2_000_000) {
  for (let i = 0; i < 10_000; i++) run();
  const start = performance.now();
  for (let i = 0; i < calls; i++) run();
  return ((performance.now() - start) * 1e6) / calls;
}

// --- boundary cost
const handle = core.StepperHandle.create('{"guesses":[1,2]}');
const stepper = tacit.Stepper.create({ guesses: [1, 2] });
let sink = 0;
const noop = () => {
  sink += 1;
};
const jsBase = perCallNs(noop);
console.log("\nper-call cost (ns, mean over 2e6 calls):");
console.log(`  empty JS function call                    ${jsBase.toFixed(1)}`);
console.log(`  raw export StepperHandle.next() -> f64     ${perCallNs(() => (sink += handle.next())).toFixed(1)}`);
console.log(`  raw getter StepperHandle.done -> bool      ${perCallNs(() => (sink += handle.done ? 1 : 0)).toFixed(1)}`);
console.log(`  wrapper Stepper.next() (checks, try/catch) ${perCallNs(() => (sink += stepper.next())).toFixed(1)}`);
console.log(`  raw convertUnit(1, "m", "ft") (2 strings)  ${perCallNs(() => (sink += core.convertUnit(1, "m", "ft")), 500_000).toFixed(1)}`);
console.log(`  raw version() -> string                    ${perCallNs(() => (sink += core.version().length), 500_000).toFixed(1)}`);
handle.free();
stepper.free();

// --- throughput
const templateJson = JSON.stringify(TEMPLATE);
const equationJson = JSON.stringify(EQUATION);
const wasm = {
  template: rate(() => core.solveTemplate(templateJson)),
  equation: rate(() => core.solveEquation(equationJson)),
  function: rate(() => tacit.solveFunction(colebrook, OPTIONS)),
};
const wrapped = {
  template: rate(() => tacit.solveTemplate(TEMPLATE)),
  equation: rate(() => tacit.solveEquation(EQUATION)),
};

let native = {};
if (process.env.TACIT_BENCH_NO_NATIVE !== "1") {
  const out = execFileSync(
    "cargo",
    ["run", "--quiet", "--release", "--example", "bench_native_solve", "--", String(seconds)],
    { cwd: fileURLToPath(root), encoding: "utf8", stdio: ["ignore", "pipe", "inherit"] },
  );
  for (const line of out.trim().split("\n")) {
    const r = JSON.parse(line);
    native[r.name] = r.solvesPerSecond;
  }
}

console.log(`\nsolves per second, best of ${ROUNDS} rounds (same requests; the JSON text is made once for the raw calls):`);
console.log("  workload                         native     wasm raw   wasm/native   wasm via wrapper (JSON.stringify/parse)");
const row = (name, label) => {
  const n = native[name];
  const w = wasm[name];
  const ratio = n ? `${((100 * w) / n).toFixed(0)} %` : "-";
  const wr = wrapped[name] ? wrapped[name].toFixed(0) : "-";
  console.log(`  ${label.padEnd(32)} ${(n ? n.toFixed(0) : "-").padStart(8)}   ${w.toFixed(0).padStart(8)}   ${ratio.padStart(11)}   ${wr.padStart(8)}`);
};
row("template", "template pipes.colebrook");
row("equation", "text equation (Colebrook)");
row("function", "scalar f(x): JS callback vs Rust closure");
console.log("\ngoal: wasm throughput >= 50 % of native on the same solves");
if (sink === 0.5) console.log(""); // keeps the measured calls observable
