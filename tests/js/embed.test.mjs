// The built package dist/pkg used exactly as an embedding tool would: import, init with
// the wasm bytes, solve, drive a stepper to the end, save and restore it mid-way.
// Build first: scripts/build-pkg.sh. Run: node --test tests/js/
import { test } from "node:test";
import assert from "node:assert/strict";
import { readFile } from "node:fs/promises";

const pkg = new URL("../../dist/pkg/", import.meta.url);
const tacit = await import(new URL("tacit.js", pkg));
await tacit.init(await readFile(new URL("tacit_core_bg.wasm", pkg)));

const close = (actual, expected, rel, what) =>
  assert.ok(
    Math.abs(actual - expected) <= rel * Math.abs(expected),
    `${what}: ${actual} is not within ${rel} (relative) of ${expected}`,
  );

test("package.json describes an ES module with types", async () => {
  const meta = JSON.parse(await readFile(new URL("package.json", pkg), "utf8"));
  assert.equal(meta.name, "tacit");
  assert.equal(meta.type, "module");
  assert.equal(meta.types, "./tacit.d.ts");
  assert.match(meta.version, /^\d+\.\d+\.\d+/);
  assert.equal(tacit.version, meta.version);
  for (const f of meta.files) await readFile(new URL(f, pkg));
});

test("init twice is harmless, and init rejects a wrong argument", async () => {
  await tacit.init();
  await assert.rejects(() => tacit.init(42), { code: "bad-type" });
});

test("a template in chosen units: Colebrook friction factor", () => {
  const Re = 360000;
  const eps = 0.15e-3; // m
  const D = 0.3; // m
  const r = tacit.solveTemplate({
    id: "pipes.colebrook",
    values: { Re, eps: { value: 0.15, unit: "mm" }, D: { value: D / 0.0254, unit: "in" } },
    unknown: "f",
    history: true,
  });
  assert.equal(r.converged, true);
  assert.equal(r.value, r.root);
  // The Colebrook (1939) equation itself, evaluated here with JS Math at the answer.
  const f = r.value;
  const residual = 1 / Math.sqrt(f) + 2 * Math.log10(eps / (3.7 * D) + 2.51 / (Re * Math.sqrt(f)));
  assert.ok(Math.abs(residual) < 1e-9, `Colebrook residual ${residual}`);
  // Swamee and Jain (1976) explicit form, stated to be within about 1 % of Colebrook.
  const fSJ = 0.25 / Math.log10(eps / (3.7 * D) + 5.74 / Re ** 0.9) ** 2;
  close(f, fSJ, 0.015, "f against Swamee–Jain");
  assert.equal(r.history.length, r.evaluations);
  assert.ok(r.notes.length > 0);
});

test("a two-branch template returns both roots: area ratio to Mach number", () => {
  // NACA Report 1135 (1953) isentropic flow table, gamma = 1.4, A/A* = 2.0:
  // M = 0.3059 subsonic and M = 2.197 supersonic (table values recalled from memory).
  const r = tacit.solveTemplate({ id: "gas.area-mach", values: { AR: 2, g: 1.4 }, unknown: "M" });
  assert.equal(r.converged, true);
  const roots = [r.value, ...r.otherRoots.map((o) => o.value)].sort((a, b) => a - b);
  assert.equal(r.branch, "supersonic");
  assert.equal(r.otherRoots[0].label, "subsonic");
  assert.equal(roots.length, 2);
  close(roots[0], 0.3059, 1e-3, "subsonic M");
  close(roots[1], 2.197, 1e-3, "supersonic M");
  // And each satisfies the area–Mach relation (NACA 1135 eq. 80) evaluated with JS Math.
  for (const M of roots) {
    const ar = (1 / M) * ((2 / 2.4) * (1 + 0.2 * M * M)) ** (2.4 / 0.8);
    close(ar, 2, 1e-9, `A/A* at M = ${M}`);
  }
});

test("a template with a list input: rate of return of cash flows", () => {
  const flows = [-1000, 300, 400, 500, 200];
  const r = tacit.solveTemplate({ id: "finance.irr", values: { c: flows }, unknown: "r" });
  assert.equal(r.converged, true);
  // The internal rate of return is the rate at which the net present value is zero
  // (its definition; common practice, no source), evaluated here in JS.
  // `value`, `root` and `unknowns` are all in the result unit; `rootSi` is the plain fraction.
  assert.equal(r.unknowns.r, r.value);
  assert.equal(r.root, r.value);
  const rate = r.rootSi;
  close(tacit.convertUnit(rate, "1", r.unit), r.value, 1e-12, "rate in its unit");
  const npv = flows.reduce((sum, c, k) => sum + c / (1 + rate) ** k, 0);
  assert.ok(Math.abs(npv) < 1e-6, `NPV at ${rate} is ${npv}`);
});

test("the catalogue has full metadata, enough to build a form", () => {
  const list = tacit.catalogue();
  assert.ok(list.length > 0);
  for (const t of list) {
    assert.equal(typeof t.id, "string");
    assert.equal(typeof t.title, "string");
    assert.equal(typeof t.equations, "string");
    assert.ok(Array.isArray(t.variables) && t.variables.length > 0);
    for (const v of t.variables) {
      assert.equal(typeof v.symbol, "string");
      assert.equal(typeof v.unit, "string");
      assert.ok(Array.isArray(v.units));
    }
  }
  assert.throws(() => tacit.solveTemplate({ id: "no.such", values: {}, unknown: "x" }), (e) => e instanceof tacit.TacitError);
});

test("a text equation with a definition, solved for the diameter", () => {
  // Continuity Q = V·A with A = πD²/4, so D = sqrt(4Q/(πV)) (closed form, common practice).
  const r = tacit.solveEquation({
    equations: "A := pi*D^2/4\nQ = V*A",
    knowns: { Q: 0.1, V: 2 },
    unknowns: [{ name: "D", bounds: [0, 10] }],
    history: true,
    sensitivities: true,
  });
  assert.equal(r.converged, true);
  assert.match(r.status, /^converged|exact-zero/);
  close(r.unknowns.D, Math.sqrt((4 * 0.1) / (Math.PI * 2)), 1e-12, "D");
  assert.equal(r.root, r.unknowns.D);
  close(r.definitions.A, 0.05, 1e-11, "A");
  assert.equal(r.history.length, r.evaluations);
  assert.ok(Number.isNaN(r.history[0].step), "the first step is NaN, restored from JSON");
  // D ∝ Q^(1/2) V^(-1/2): relative sensitivities +1/2 and -1/2 (closed form).
  const byInput = Object.fromEntries(r.sensitivities.map((s) => [s.input, s.relative]));
  close(byInput.Q, 0.5, 1e-6, "dD/dQ relative");
  close(byInput.V, -0.5, 1e-6, "dD/dV relative");
});

test("equation errors carry a code and a position", () => {
  assert.throws(
    () => tacit.solveEquation({ equations: "y = 2*x +", knowns: { y: 1 } }),
    (e) => e instanceof tacit.TacitError && typeof e.code === "string" && e.position === 9,
  );
  const c = tacit.checkEquation("y = 2*x +");
  assert.equal(c.ok, false);
  assert.equal(c.position, 9);
  assert.match(c.caret, /\^$/);
  assert.deepEqual(tacit.checkEquation("y = m*x + c"), {
    ok: true,
    variables: ["y", "m", "x", "c"],
    definitions: [],
    equations: 1,
  });
});

test("own equations in chosen units, and a dimension mismatch", () => {
  // 100 gpm in a 4-inch bore, in ft/s: 100 * 231 in^3 / 60 s over pi * 2^2 in^2, over
  // 12 in/ft (NIST SP 811 B.8: 1 gal = 231 in^3).
  const r = tacit.solveEquation({
    equations: "A := pi*D^2/4\nQ = V*A",
    knowns: { Q: 100, D: 4 },
    units: { Q: "gpm", D: "in", V: "ft/s" },
    unknowns: ["V"],
  });
  close(r.unknowns.V, (100 * 231) / 60 / (Math.PI * 4) / 12, 1e-12, "V in ft/s");
  assert.equal(r.units.V, "ft/s");
  assert.throws(
    () => tacit.solveEquation({ equations: "hf = Q", knowns: { Q: 1 }, units: { hf: "ft", Q: "gpm" } }),
    (e) =>
      e instanceof tacit.TacitError &&
      e.code === "dimension-mismatch" &&
      e.position === 3 &&
      /a length/.test(e.message) &&
      /a volume flow/.test(e.message),
  );
});

test("a JS function, sync and async, gives the same root", async () => {
  // Reference: Math.cbrt (ECMAScript built-in).
  const f = (x) => x ** 3 - 10;
  const sync = tacit.solveFunction(f, { guesses: [1, 3] });
  const later = await tacit.solveFunctionAsync(
    (x) => new Promise((resolve) => setTimeout(() => resolve(f(x)), 1)),
    { guesses: [1, 3] },
  );
  assert.equal(sync.converged, true);
  close(sync.root, Math.cbrt(10), 1e-12, "root");
  assert.deepEqual(later, sync);
});

test("a stepper driven to the end, saved and restored mid-way", async () => {
  // An "expensive external model": each value arrives asynchronously.
  const model = async (x) => Math.cos(x) - x; // root 0.739085133215161 (Dottie number, recalled from memory)
  const opts = { bracket: [0, 1], history: true, tolerances: { xRel: 1e-14 } };

  const whole = tacit.Stepper.create(opts);
  while (!whole.done) whole.tell(await model(whole.next()));
  const expected = whole.result;
  assert.equal(expected.converged, true);
  close(expected.root, 0.739085133215161, 1e-12, "root");

  const first = tacit.Stepper.create(opts);
  for (let i = 0; i < 3; i++) first.tell(await model(first.next()));
  const saved = first.save();
  first.free();
  assert.equal(typeof saved, "string");
  JSON.parse(saved);

  // ... the browser closes; days later:
  const resumed = tacit.Stepper.restore(saved);
  assert.equal(resumed.evaluations, 3);
  // The history so far is replayed too: the same rows as the uninterrupted solve's first three.
  assert.deepEqual(resumed.history, expected.history.slice(0, 3));
  assert.deepEqual(resumed.history.slice(0, 2).map((r) => r.kind), ["initial", "initial"]);
  assert.equal(resumed.done, false);
  assert.equal(resumed.result, null);
  let x;
  while ((x = resumed.next()) !== null) resumed.tell(await model(x));
  assert.deepEqual(resumed.result, expected);
  assert.throws(() => resumed.tell(0), { code: "nothing-pending" });
  resumed.free();
  assert.throws(() => resumed.next(), { code: "stepper-freed" });
});

test("a tampered saved stepper is a clear error", () => {
  const s = tacit.Stepper.create({ guesses: [1, 2] });
  s.tell(s.next() ** 2 - 2);
  s.tell(s.next() ** 2 - 2);
  const saved = JSON.parse(s.save());
  saved.points[1][0] += 0.25;
  assert.throws(
    () => tacit.Stepper.restore(JSON.stringify(saved)),
    (e) => e instanceof tacit.TacitError && e.code === "bad-saved-stepper" && /points\[1\]/.test(e.message),
  );
  assert.throws(() => tacit.Stepper.restore("{}"), { code: "bad-saved-stepper" });
  assert.throws(() => tacit.Stepper.restore(42), { code: "bad-saved-stepper" });
});

test("all roots in a range, of text and of a JS function", () => {
  // sin has roots at 0, π, 2π in [-1, 7] (common practice, no source).
  const r = tacit.findRoots({ f: Math.sin, range: [-1, 7] });
  assert.equal(r.roots.length, 3);
  close(r.roots[1].x, Math.PI, 1e-12, "second root");
  const t = tacit.findRoots({ equations: "x^2 = 2", range: [-3, 3] });
  assert.deepEqual(
    t.roots.map((root) => root.kind),
    ["sign-change", "sign-change"],
  );
  close(t.roots[1].x, Math.SQRT2, 1e-12, "√2");
});

test("a sweep continues from root to root", () => {
  const s = tacit.sweep({ equations: "x^2 = a", input: "a", from: 1, to: 100, points: 12, guesses: [1, 2], bounds: [0, Infinity] });
  assert.equal(s.input.length, 12);
  assert.equal(s.input[11], 100);
  s.input.forEach((a, i) => close(s.root[i], Math.sqrt(a), 1e-11, `root at a = ${a}`));
  assert.ok(s.converged.every(Boolean));
  assert.equal(s.totalEvaluations, s.evaluations.reduce((p, q) => p + q, 0));
});

test("units convert and list", () => {
  // NIST SP 811 (2008) Appendix B.8: 1 psi = 6.894 757 E+03 Pa.
  close(tacit.convertUnit(1, "psi", "Pa"), 6.894757e3, 1e-6, "psi");
  assert.throws(() => tacit.convertUnit(1, "m", "kg"), (e) => e instanceof tacit.TacitError);
  assert.ok(tacit.units().some((d) => d.dimension === "length" && d.units[0] === "m"));
});
