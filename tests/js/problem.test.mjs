// The Problem class of the package: one compiled problem, every x in the unit the user
// chose, no silent defaults, names that stay strings, sweeps in chunks that can be
// followed and stopped.
import { test } from "node:test";
import assert from "node:assert/strict";
import { readFile } from "node:fs/promises";

const pkg = new URL("../../dist/pkg/", import.meta.url);
const tacit = await import(new URL("tacit.js", pkg));
await tacit.init(await readFile(new URL("tacit_core_bg.wasm", pkg)));

const close = (a, b, rel, what) => assert.ok(Math.abs(a - b) <= rel * Math.abs(b), `${what}: ${a} is not within ${rel} of ${b}`);

const PENG_ROBINSON = {
  template: "thermo.peng-robinson",
  unknown: "V",
  resultUnit: "cm^3/mol",
  // Propane, the demo scenario's critical constants, at 300 K and 9 bar.
  values: { T: 300, P: [9, "bar"], Tc: 369.83, Pc: 42.48, w: 0.152 },
};

test("mixed units: root, unknowns, bracket, history and other roots all in the result unit", () => {
  const p = tacit.problem(PENG_ROBINSON);
  try {
    assert.equal(p.unknown, "V");
    assert.equal(p.unit, "cm^3/mol");
    const r = p.solve({ history: true });
    assert.equal(r.converged, true);
    assert.equal(r.unit, "cm^3/mol");
    assert.equal(r.unknowns.V, r.root);
    assert.equal(r.value, r.root);
    close(r.rootSi, r.root * 1e-6, 1e-12, "rootSi in m³/mol");
    // Ideal gas RT/P = 8.314462618·300/9e5 m³/mol = 2771 cm³/mol (CODATA 2018 R); the
    // vapour-like root of a real gas lies below it.
    assert.ok(r.root > 2000 && r.root < 2771.5, `${r.root}`);
    close(r.history.at(-1).x, r.root, 1e-6, "last history x in cm³/mol");
    for (const o of r.otherRoots) assert.ok(o.value > 10 && o.value < 3000, `other root ${o.value} in cm³/mol`);
    // The same through the convenience, and the scan of the Problem in the same unit.
    const same = tacit.solveTemplate({ id: PENG_ROBINSON.template, unknown: "V", resultUnit: "cm^3/mol", values: PENG_ROBINSON.values });
    assert.equal(same.root, r.root);
    const scan = p.roots(40, 3000);
    assert.equal(scan.unit, "cm^3/mol");
    assert.ok(scan.roots.some((x) => Math.abs(x.x - r.root) < 1e-6 * r.root), JSON.stringify(scan.roots));
    assert.ok(scan.roots.every((x) => typeof x.label === "string" || x.label === null));
    const s = p.sample(1000, 3000, 5);
    assert.deepEqual(s.x, [1000, 1500, 2000, 2500, 3000]);
    assert.equal(s.f.length, 5);
    assert.equal(p.residual(s.x[2]), s.f[2]);
  } finally {
    p.free();
  }
});

test("no silent defaults: a missing known is an error naming every one", () => {
  // Colebrook with only Re given used a roughness and diameter nobody gave (issue 10).
  for (const call of [
    () => tacit.solveTemplate({ id: "pipes.colebrook", values: { Re: 1e5 }, unknown: "f" }),
    () => tacit.problem({ template: "pipes.colebrook", values: { Re: 1e5 }, unknown: "f" }),
  ]) {
    assert.throws(call, (e) => e instanceof tacit.TacitError && e.code === "missing-value" && /eps/.test(e.message) && /\bD\b/.test(e.message));
  }
  const r = tacit.solveTemplate({ id: "pipes.colebrook", values: { Re: 1e5 }, unknown: "f", useScenarioDefaults: true });
  assert.equal(r.converged, true);
});

test("names stay strings: variables called NaN and Infinity, and y = Infinity*x", () => {
  const r = tacit.solveEquation({
    equations: "y = Infinity*x + NaN",
    knowns: { y: 0, Infinity: 2, NaN: 0 },
    unknowns: ["x"],
    sensitivities: true,
  });
  assert.equal(r.converged, true);
  assert.equal(r.unknowns.x, 0);
  assert.ok(r.sensitivities.map((d) => d.input).includes("Infinity"));
  for (const d of r.sensitivities) assert.equal(typeof d.input, "string");
  for (const b of r.blocks) for (const u of b.unknowns) assert.equal(typeof u, "string");
  // y = Infinity*x with Infinity a name: x = y / Infinity.
  const q = tacit.solveEquation({ equations: "y = Infinity*x", knowns: { y: 6, Infinity: 3 } });
  close(q.root, 2, 1e-12, "x");
  assert.equal(q.unknown, "x");
  // A sweep's input name stays a string too.
  const sw = tacit.sweep({ equations: "y = Infinity*x", knowns: { y: 6 }, unknown: "x", input: "Infinity", from: 1, to: 3, points: 3 });
  assert.equal(sw.inputName, "Infinity");
  assert.deepEqual(sw.root.map((x) => Math.round(x * 1e9) / 1e9), [6, 3, 2]);
  // The first history row's step is the number NaN.
  const h = tacit.solveEquation({ equations: "x^2 = 2", history: true });
  assert.ok(Number.isNaN(h.history[0].step));
});

test("a request that is not what it claims is a clear error", () => {
  assert.throws(
    () => tacit.solveEquation({ equations: NaN }),
    (e) => e.code === "bad-request" && /request\.equations/.test(e.message) && /string/.test(e.message),
  );
  assert.throws(() => tacit.solveEquation(NaN), (e) => e.code === "bad-type");
  assert.throws(
    () => tacit.problem({ equations: "x = 1", knwons: {} }),
    (e) => e.code === "bad-request" && /knwons/.test(e.message),
  );
  assert.throws(
    () => tacit.solveTemplate({ id: "pipes.colebrook", unknown: "f", values: { Re: 1e5, eps: { value: 0.1, unit: "mm", extra: 1 }, D: 0.3 } }),
    (e) => e.code === "bad-request" && /values\.eps/.test(e.message) && /extra/.test(e.message),
  );
  assert.throws(() => tacit.problem({ equations: "x^2 = a", knowns: { a: NaN } }), (e) => e.code === "non-finite-input");
  const p = tacit.problem({ equations: "x^2 = 2" });
  p.free();
  assert.throws(() => p.solve(), (e) => e.code === "problem-freed");
});

test("a sweep in chunks: progress, only new points, and a stop that keeps what was done", async () => {
  const p = tacit.problem({ equations: "x^2 = a", knowns: { a: 1 }, unknown: "x", units: { x: "m", a: "m^2" } });
  try {
    const seen = [];
    const r = await p.sweep({ input: "a", from: 1, to: 100, points: 50, guesses: [1, 2] }, { chunk: 7, onProgress: (q) => seen.push(q.done) });
    assert.equal(r.input.length, 50);
    assert.equal(r.done, 50);
    assert.deepEqual(seen, [7, 14, 21, 28, 35, 42, 49, 50]);
    r.root.forEach((x, i) => close(x, Math.sqrt(r.input[i]), 1e-9, `root at a = ${r.input[i]}`));
    assert.equal(r.inputUnit, "m^2");
    assert.equal(r.unit, "m");
    // The same as the one-go convenience.
    const once = tacit.sweep({ equations: "x^2 = a", knowns: { a: 1 }, unknown: "x", units: { x: "m", a: "m^2" }, input: "a", from: 1, to: 100, points: 50, guesses: [1, 2] });
    assert.deepEqual(once.root, r.root);

    const stop = new AbortController();
    await assert.rejects(
      p.sweep({ input: "a", from: 1, to: 100, points: 1000 }, { chunk: 10, signal: stop.signal, onProgress: (q) => q.done >= 30 && stop.abort() }),
      (e) => e.code === "aborted" && e.partial.done === 30 && e.partial.root.length === 30,
    );
    const already = new AbortController();
    already.abort();
    await assert.rejects(p.sweep({ input: "a", from: 1, to: 2, points: 2 }, { signal: already.signal }), (e) => e.code === "aborted" && e.partial === null);
    await assert.rejects(p.sweep({ input: "a", from: 1, to: 2, points: 2 }, { chunk: 0 }), (e) => e.code === "bad-request");
  } finally {
    p.free();
  }
});

test("a template's roots in a range carry their branch labels", () => {
  // NACA Report 1135 (1953), γ = 1.4, A/A* = 2: M = 0.3059 and 2.197 (recalled from memory).
  const p = tacit.problem({ template: "gas.area-mach", values: { AR: 2, g: 1.4 }, unknown: "M" });
  const scan = p.roots(0.05, 5);
  p.free();
  const labels = Object.fromEntries(scan.roots.map((r) => [r.label, r.x]));
  close(labels.subsonic, 0.3059, 2e-3, "subsonic");
  close(labels.supersonic, 2.197, 1e-3, "supersonic");
});
