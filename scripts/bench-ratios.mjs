// wasm/native speed ratios, measured side by side in one run (figures, never asserted):
//   - a template solve, a text-equation solve, a solve of a function (a JS callback against
//     a Rust closure) and a 1000-point sweep, each through the public conveniences of the
//     built package (solveTemplate, solveEquation, solveFunction, sweep) in Node, against
//     the same jobs through the core in Rust (examples/bench_ratios.rs);
//   - the per-point cost of the sweep against the cost of its own evaluations (evaluations
//     per point × the cost of one evaluation of the compiled residual).
// The native example and the wasm rounds alternate, ROUNDS times, and the best of each side
// is kept, so that other work on a shared machine weighs on both alike.
// Goals (issue 10): every ratio >= 0.5; sweep overhead per point <= 2× its evaluations' cost.
//
// Needs dist/pkg (scripts/build-pkg.sh). Usage: node scripts/bench-ratios.mjs [seconds per
// workload per round, default 0.5] [rounds, default 3]
import { readFile } from "node:fs/promises";
import { execFileSync } from "node:child_process";
import { join } from "node:path";
import { fileURLToPath } from "node:url";

const root = fileURLToPath(new URL("../", import.meta.url));
const seconds = Number(process.argv[2] ?? 0.5);
const rounds = Number(process.argv[3] ?? 3);

// The same requests as examples/bench_ratios.rs.
const COLEBROOK = "1/sqrt(f) = -2*log10(eps/(3.7*D) + 2.51/(Re*sqrt(f)))";
const TEMPLATE = { id: "pipes.colebrook", values: { Re: 360000, eps: { value: 0.15, unit: "mm" }, D: { value: 300, unit: "mm" } }, unknown: "f" };
const EQUATION = {
  equations: COLEBROOK,
  knowns: { Re: 360000, eps: 0.00015, D: 0.3 },
  unknowns: [{ name: "f", guesses: [0.008, 0.08], bounds: [0.002, 0.2] }],
};
const SWEEP = {
  equations: COLEBROOK,
  knowns: { Re: 10000, eps: 0.00015, D: 0.3 },
  unknown: "f",
  input: "Re",
  from: 10000,
  to: 10000000,
  points: 1000,
  guesses: [0.008, 0.08],
  bounds: [0.002, 0.2],
};
const SAMPLE_POINTS = 100_000;
const colebrook = (f) => 1 / Math.sqrt(f) + 2 * Math.log10(0.15e-3 / (3.7 * 0.3) + 2.51 / (360000 * Math.sqrt(f)));

const pkg = join(root, "dist/pkg");
const tacit = await import(join(pkg, "tacit.js"));
await tacit.init(await readFile(join(pkg, "tacit_core_bg.wasm")));

// The native side, built once.
execFileSync("cargo", ["build", "--quiet", "--release", "--example", "bench_ratios"], { cwd: root, stdio: ["ignore", "inherit", "inherit"] });
const targetDir = JSON.parse(execFileSync("cargo", ["metadata", "--format-version", "1", "--no-deps"], { cwd: root, encoding: "utf8" })).target_directory;
const nativeBin = join(targetDir, "release/examples/bench_ratios");

/** Best rate over 3 slices of `budget` seconds, after a 200 ms warm-up (as the native side). */
function rate(run, budget = seconds) {
  const warm = performance.now() + 200;
  while (performance.now() < warm) run();
  let best = 0;
  for (let slice = 0; slice < 3; slice++) {
    let n = 0;
    const start = performance.now();
    const end = start + (budget * 1000) / 3;
    do {
      run();
      n += 1;
    } while (performance.now() < end);
    best = Math.max(best, n / ((performance.now() - start) / 1000));
  }
  return best;
}

// The cost of one evaluation in wasm: the compiled problem's sample() once the package has
// problem(); before, a findRoots scan of the same range (its samples are evaluations).
const sampleWasm = tacit.problem
  ? (() => {
      const p = tacit.problem(EQUATION);
      return { how: "problem().sample", run: () => p.sample(0.01, 0.05, SAMPLE_POINTS) };
    })()
  : {
      how: "findRoots scan",
      run: () => tacit.findRoots({ equations: COLEBROOK, knowns: EQUATION.knowns, unknown: "f", range: [0.01, 0.05], samples: SAMPLE_POINTS }),
    };

let sweepEvaluations = 0;
const wasmJobs = {
  template: () => tacit.solveTemplate(TEMPLATE),
  equation: () => tacit.solveEquation(EQUATION),
  function: () => tacit.solveFunction(colebrook, { guesses: [0.008, 0.08] }),
  sweep: () => {
    const r = tacit.sweep(SWEEP);
    sweepEvaluations = r.evaluations.reduce((a, b) => a + b, 0);
  },
  sample: sampleWasm.run,
};

const best = { native: {}, wasm: {} };
let nativeSweepEvaluations = 0;
for (let round = 0; round < rounds; round++) {
  const out = execFileSync(nativeBin, [String(seconds)], { encoding: "utf8" });
  for (const line of out.trim().split("\n")) {
    const r = JSON.parse(line);
    best.native[r.name] = Math.max(best.native[r.name] ?? 0, r.perSecond);
    if (r.name === "sweep") nativeSweepEvaluations = r.evaluations;
  }
  for (const [name, run] of Object.entries(wasmJobs)) best.wasm[name] = Math.max(best.wasm[name] ?? 0, rate(run));
}

const f = (x, d = 0) => x.toLocaleString("en-US", { maximumFractionDigits: d, minimumFractionDigits: d });
console.log(`wasm (Node ${process.version}) against native, best of ${rounds} alternating rounds of ${seconds} s a workload:`);
console.log("  workload                                native /s      wasm /s   wasm/native");
const rows = [
  ["template", "template solve (pipes.colebrook)"],
  ["equation", "text-equation solve (Colebrook)"],
  ["function", "function solve (JS callback / closure)"],
  ["sweep", "1000-point sweep (Re 1e4 to 1e7)"],
];
for (const [name, label] of rows) {
  const n = best.native[name];
  const w = best.wasm[name];
  console.log(`  ${label.padEnd(38)} ${f(n, 1).padStart(10)}  ${f(w, 1).padStart(11)}   ${(w / n).toFixed(2).padStart(11)}`);
}
console.log("  goal: every ratio >= 0.5");

const perPoint = (side, evaluations) => {
  const pointNs = 1e9 / (best[side].sweep * SWEEP.points);
  const evalNs = 1e9 / (best[side].sample * SAMPLE_POINTS);
  const evalsPerPoint = evaluations / SWEEP.points;
  const own = evalsPerPoint * evalNs;
  return { pointNs, evalNs, evalsPerPoint, own, overhead: (pointNs - own) / own };
};
console.log("\nsweep cost per point against its evaluations' own cost:");
console.log("  side     per point   evaluations/point   one evaluation   evaluations' cost   overhead / evaluations");
for (const [side, evaluations, how] of [
  ["native", nativeSweepEvaluations, "Problem::sample"],
  ["wasm", sweepEvaluations, sampleWasm.how],
]) {
  const p = perPoint(side, evaluations);
  console.log(
    `  ${side.padEnd(6)} ${f(p.pointNs / 1000, 2).padStart(8)} µs   ${f(p.evalsPerPoint, 2).padStart(17)}   ${f(p.evalNs, 0).padStart(10)} ns   ${f(p.own / 1000, 2).padStart(14)} µs   ${f(p.overhead, 1).padStart(20)}×   (one evaluation by ${how})`,
  );
}
console.log("  goal: overhead per point <= 2× the evaluations' own cost");
