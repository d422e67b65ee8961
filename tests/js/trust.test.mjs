// The trust issue's reproductions through the package, as an embedding tool or the page
// would send them: no request may kill the instance, nested solves are refused with a
// clear error, and no JS entry point calls a pole or a jump "converged".
// Build first: scripts/build-pkg.sh. Run: node --test tests/js/
import { test } from "node:test";
import assert from "node:assert/strict";
import { readFile } from "node:fs/promises";

const pkg = new URL("../../dist/pkg/", import.meta.url);
const tacit = await import(new URL("tacit.js", pkg));
await tacit.init(await readFile(new URL("tacit_core_bg.wasm", pkg)));

function stillSolves() {
  const r = tacit.solveEquation({ equations: "x^2 = 2", unknowns: [{ name: "x", guesses: [1, 2] }] });
  assert.equal(r.converged, true);
  assert.ok(Math.abs(r.root - Math.SQRT2) < 1e-12);
}

test("the 1e7-budget request with history is a clear error, and the instance lives", () => {
  // Trust issue: this trapped with "unreachable" after about 100 s.
  const started = Date.now();
  assert.throws(
    () =>
      tacit.solveEquation({
        equations: "x^2 + 1",
        unknowns: [{ name: "x", guesses: [1, 2] }],
        method: "secant",
        tolerances: { maxEvals: 1e7 },
        history: true,
      }),
    (e) => e.code === "bad-tolerance" && /maxEvals/.test(e.message) && /1000000/.test(e.message),
  );
  // The largest budget returns a result with a bounded history, in seconds.
  const r = tacit.solveEquation({
    equations: "x^2 + 1",
    unknowns: [{ name: "x", guesses: [1, 2] }],
    method: "secant",
    tolerances: { maxEvals: 1e6 },
    history: true,
  });
  assert.equal(r.converged, false);
  assert.equal(r.certificate, null);
  assert.ok(r.history.length <= 4000);
  assert.equal(r.history.length + r.historyDropped, r.evaluations);
  assert.ok(Date.now() - started < 60_000);
  stillSolves();
});

test("solveFunction with the same options is an error, not a borrow failure", () => {
  // Trust issue: "attempted to take ownership of Rust value while it was borrowed".
  assert.throws(
    () => tacit.solveFunction((x) => x * x + 1, { guesses: [1, 2], method: "secant", tolerances: { maxEvals: 1e7 }, history: true }),
    { code: "bad-tolerance" },
  );
  const r = tacit.solveFunction((x) => x * x + 1, { guesses: [1, 2], method: "secant", tolerances: { maxEvals: 1e6 }, history: true });
  assert.equal(r.converged, false);
  assert.ok(r.history.length <= 4000);
  stillSolves();
});

test("nested solves are refused at the documented depth, for scalar and system callbacks", () => {
  // Trust issue: a callback that starts another solve overflowed the wasm stack at
  // about 1000 levels; the system case was reported as callback-threw.
  let deepest = 0;
  const scalar = (level) => (x) => {
    deepest = Math.max(deepest, level);
    const inner = tacit.solveFunction(scalar(level + 1), { guesses: [1, 2] });
    return x - inner.root;
  };
  assert.throws(() => tacit.solveFunction(scalar(1), { guesses: [1, 2] }), { code: "nesting-too-deep" });
  assert.equal(deepest, tacit.MAX_NESTING);
  const system = () => {
    tacit.solveSystemFunction(system, { x0: [1] });
    return [0];
  };
  assert.throws(() => tacit.solveSystemFunction(system, { x0: [1] }), { code: "nesting-too-deep" });
  const roots = () => {
    tacit.findRoots({ f: roots, range: [0, 1], samples: 3 });
    return 1;
  };
  assert.throws(() => tacit.findRoots({ f: roots, range: [0, 1], samples: 3 }), { code: "nesting-too-deep" });
  // A few levels are fine: an outer solve whose f solves an inner equation.
  const r = tacit.solveFunction(
    (a) => tacit.solveFunction((x) => x * x - a, { guesses: [1, 2] }).root - 3,
    { guesses: [1, 20] },
  );
  assert.equal(r.converged, true);
  assert.ok(Math.abs(r.root - 9) < 1e-9);
  stillSolves();
});

test("poles and jumps are not converged through the JS entry points", async () => {
  // Trust issue: 1/(x-1) on [0, 2] returned converged-step at 0.999999999998.
  for (const method of ["auto", "hybrid", "bisection", "illinois"]) {
    const r = tacit.solveFunction((x) => 1 / (x - 1), { bracket: [0, 2], method });
    assert.equal(r.converged, false, method);
    assert.equal(r.status, "discontinuity", method);
    const ra = await tacit.solveFunctionAsync(async (x) => Math.floor(x) - 0.5, { bracket: [0, 2.5], method });
    assert.equal(ra.converged, false, method);
    assert.equal(ra.status, "discontinuity", method);
  }
  // Math.cosh from 5 and 6, classic secant (trust issue).
  const c = tacit.solveFunction(Math.cosh, { guesses: [5, 6], method: "secant" });
  assert.equal(c.converged, false);
  // A converged answer carries its evidence.
  const ok = tacit.solveFunction((x) => x * x - 2, { bracket: [0, 2] });
  assert.equal(ok.converged, true);
  assert.equal(ok.certificate.kind, "bracket");
  assert.ok(ok.certificate.residual <= ok.certificate.bound);
  // The range scan lists jumps apart (trust issue: floor(x) - 0.5 gave a root at 1).
  const scan = tacit.findRoots({ f: (x) => Math.floor(x) - 0.5, range: [-0.3, 3.7] });
  assert.equal(scan.roots.length, 0);
  assert.equal(scan.discontinuities.length, 1);
  stillSolves();
});
