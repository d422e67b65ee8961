// Every export called with garbage: wrong types, NaN, Infinity, huge strings, deep
// nesting, empty objects, callbacks that throw or return strings. Each call must return
// or throw an ordinary error (a TacitError for the public API), never trap the
// instance; afterwards the same instance still solves correctly.
import { test } from "node:test";
import assert from "node:assert/strict";
import { readFile } from "node:fs/promises";

const pkg = new URL("../../dist/pkg/", import.meta.url);
const tacit = await import(new URL("tacit.js", pkg));
const core = await import(new URL("tacit_core.js", pkg));
await tacit.init(await readFile(new URL("tacit_core_bg.wasm", pkg)));

const cyclic = {};
cyclic.self = cyclic;
let deepObject = {};
for (let i = 0; i < 100_000; i++) deepObject = { a: deepObject };
const deepArray = JSON.parse("[".repeat(5_000) + "]".repeat(5_000));
const throwingGetter = Object.defineProperty({}, "guesses", {
  enumerable: true,
  get() {
    throw new Error("getter says no");
  },
});
const hostileProxy = new Proxy(
  {},
  {
    get() {
      throw new Error("proxy says no");
    },
    ownKeys() {
      throw new Error("proxy says no");
    },
  },
);

const huge = "x".repeat(5_000_000);
const GARBAGE = [
  undefined,
  null,
  true,
  0,
  -0,
  NaN,
  Infinity,
  -Infinity,
  1e308,
  -1,
  2 ** 53 + 1,
  "",
  "{",
  "[]",
  "{}",
  "null",
  '{"guesses":[1,2]}',
  "\u0000\uD800",
  huge,
  "[".repeat(200_000),
  "(".repeat(99_000) + "x",
  {},
  [],
  [1, 2],
  [NaN, NaN],
  [Infinity, -Infinity],
  { a: 1 },
  { guesses: [1, 1] },
  { guesses: [NaN, 1] },
  { guesses: "1,2" },
  { bracket: [0, 1], tolerances: { maxEvals: -5 } },
  { bracket: [0, 1], tolerances: { maxEvals: 1e12 } },
  { bracket: [0, 1], bounds: [2, 1] },
  { equations: huge },
  { equations: "x = " + "(".repeat(50_000) + "1" + ")".repeat(50_000) },
  { equations: "x^2 = 2", knowns: { x: "2" } },
  { equations: "x^2 = y", knowns: { y: NaN } },
  { equations: 5 },
  { id: "no-such-template", values: {}, unknown: "x" },
  { id: {}, values: [], unknown: 7 },
  { range: [0, 1], samples: 1e12, equations: "x" },
  { range: [1, 0], equations: "x" },
  { equations: "x = a", input: "a", from: 0, to: 1, points: 1e9 },
  { x0: [] },
  { x0: new Array(10_000).fill(1) },
  { x0: [NaN] },
  deepObject,
  deepArray,
  cyclic,
  throwingGetter,
  hostileProxy,
  Symbol("s"),
  10n,
  () => 1,
  new Float64Array(3),
  new ArrayBuffer(8),
  new Date(0),
  /regex/,
  Promise.resolve(1),
  new Map([[1, 2]]),
];

const CALLBACKS = [
  () => {
    throw new Error("rig offline");
  },
  () => {
    throw "a thrown string";
  },
  () => "1.5",
  () => undefined,
  () => null,
  () => ({}),
  () => [1, 2],
  () => NaN,
  () => Infinity,
  () => Promise.resolve(1),
  () => 10n,
  (x) => (Array.isArray(x) ? x.map(String) : String(x)),
  (x) => (Array.isArray(x) ? [] : [x]),
  (x) => (Array.isArray(x) ? new Array(x.length + 1).fill(0) : { valueOf: () => x }),
  (x) => (Array.isArray(x) ? [NaN] : new Number(x)),
];

/** Calls `run`; it may return or throw, but a throw must not be a trap. */
function survive(label, run, { tacitOnly }) {
  try {
    const out = run();
    if (out && typeof out.then === "function") return out.catch((e) => check(label, e, tacitOnly));
  } catch (e) {
    check(label, e, tacitOnly);
  }
  return undefined;
}

function check(label, e, tacitOnly) {
  assert.ok(!(e instanceof WebAssembly.RuntimeError), `${label}: trapped: ${e && e.message}`);
  if (tacitOnly) {
    assert.ok(e instanceof tacit.TacitError, `${label}: threw ${e && e.constructor && e.constructor.name}: ${e}`);
    assert.equal(typeof e.code, "string", `${label}: no code`);
    assert.ok(e.code.length > 0 && e.message.length > 0, `${label}: empty code or message`);
    assert.notEqual(e.code, "internal-panic", `${label}: ${e.message}`);
    assert.notEqual(e.code, "internal", `${label}: ${e.message}`);
  }
}

function assertStillSolves() {
  // Reference: Math.SQRT2 (ECMAScript built-in).
  const r = tacit.solveEquation({ equations: "x^2 = 2", unknowns: [{ name: "x", guesses: [1, 2] }] });
  assert.equal(r.converged, true);
  assert.ok(Math.abs(r.root - Math.SQRT2) < 1e-12);
  const f = tacit.solveFunction((x) => x * x - 2, { bracket: [0, 2] });
  assert.ok(Math.abs(f.root - Math.SQRT2) < 1e-12);
  const s = tacit.Stepper.create({ guesses: [1, 2] });
  while (!s.done) s.tell(s.next() ** 2 - 2);
  assert.ok(Math.abs(s.result.root - Math.SQRT2) < 1e-12);
  s.free();
  const t = tacit.solveTemplate({ id: "gas.area-mach", values: { AR: 2, g: 1.4 }, unknown: "M" });
  assert.equal(t.converged, true);
  assert.equal(t.otherRoots.length, 1);
}

test("the public API answers garbage with TacitErrors", async () => {
  const opts = { tacitOnly: true };
  const calls = [];
  for (const g of GARBAGE) {
    calls.push(
      ["solveEquation", () => tacit.solveEquation(g)],
      ["solveTemplate", () => tacit.solveTemplate(g)],
      ["findRoots", () => tacit.findRoots(g)],
      ["sweep", () => tacit.sweep(g)],
      ["checkEquation", () => tacit.checkEquation(g)],
      ["convertUnit value", () => tacit.convertUnit(g, "m", "ft")],
      ["convertUnit from", () => tacit.convertUnit(1, g, "ft")],
      ["convertUnit to", () => tacit.convertUnit(1, "m", g)],
      ["Stepper.create", () => tacit.Stepper.create(g)],
      ["Stepper.restore", () => tacit.Stepper.restore(g)],
      ["solveFunction f", () => tacit.solveFunction(g, { guesses: [1, 2] })],
      ["solveFunction opts", () => tacit.solveFunction((x) => x, g)],
      ["solveFunctionAsync f", () => tacit.solveFunctionAsync(g, { guesses: [1, 2] })],
      ["solveFunctionAsync opts", () => tacit.solveFunctionAsync((x) => x, g)],
      ["solveSystemFunction F", () => tacit.solveSystemFunction(g, { x0: [1, 2] })],
      ["solveSystemFunction opts", () => tacit.solveSystemFunction((x) => x, g)],
      ["init", () => tacit.init(g)],
      ["initSync", () => tacit.initSync(g)],
    );
    for (const key of ["equations", "knowns", "unknowns", "units", "method", "tolerances", "history", "sensitivities", "range", "samples", "input", "from", "points"]) {
      calls.push([`solveEquation .${key}`, () => tacit.solveEquation({ equations: "x^2 = a", knowns: { a: 2 }, [key]: g })]);
      calls.push([`sweep .${key}`, () => tacit.sweep({ equations: "x^2 = a", input: "a", from: 1, to: 2, points: 3, [key]: g })]);
      calls.push([`findRoots .${key}`, () => tacit.findRoots({ equations: "x^2 = 2", range: [0, 2], [key]: g })]);
    }
    for (const key of ["id", "values", "unknown", "resultUnit", "guesses", "method", "tolerances", "history", "sensitivities"]) {
      calls.push([`solveTemplate .${key}`, () => tacit.solveTemplate({ id: "pipes.colebrook", values: { Re: 1e5 }, unknown: "f", [key]: g })]);
    }
    calls.push([`solveTemplate values.Re`, () => tacit.solveTemplate({ id: "pipes.colebrook", values: { Re: g }, unknown: "f" })]);
    calls.push([`solveTemplate values.D.unit`, () => tacit.solveTemplate({ id: "pipes.colebrook", values: { D: { value: 1, unit: g } }, unknown: "f" })]);
    for (const key of ["guesses", "bracket", "method", "tolerances", "bounds", "history"]) {
      calls.push([`Stepper.create .${key}`, () => tacit.Stepper.create({ guesses: [1, 2], [key]: g })]);
    }
    calls.push([`tolerances.xRel`, () => tacit.solveFunction((x) => x, { guesses: [1, 2], tolerances: { xRel: g } })]);
    calls.push([`units.a`, () => tacit.solveEquation({ equations: "x^2 = a", knowns: { a: 2 }, units: { a: g, x: "m" } })]);
    calls.push([`unknowns[0]`, () => tacit.solveEquation({ equations: "x^2 = 2", unknowns: [g] })]);
    calls.push([`unknowns[0].guesses`, () => tacit.solveEquation({ equations: "x^2 = 2", unknowns: [{ name: "x", guesses: g }] })]);
    calls.push([`stepper.tell`, () => {
      const s = tacit.Stepper.create({ guesses: [1, 2] });
      try {
        s.tell(g);
      } finally {
        s.free();
      }
    }]);
  }
  for (const [label, run] of calls) await survive(label, run, opts);
  assertStillSolves();
});

test("callbacks that throw or return garbage give callback errors", async () => {
  for (const [i, cb] of CALLBACKS.entries()) {
    for (const [label, run] of [
      ["solveFunction", () => tacit.solveFunction(cb, { guesses: [1, 2] })],
      ["solveFunctionAsync", () => tacit.solveFunctionAsync(cb, { guesses: [1, 2] })],
      ["solveSystemFunction", () => tacit.solveSystemFunction(cb, { x0: [1, 2] })],
      ["findRoots", () => tacit.findRoots({ f: cb, range: [0, 3] })],
    ]) {
      let threw = null;
      try {
        const r = await run();
        // Returning NaN or Infinity is a legal value: the solve ends with an honest status.
        if ("roots" in r && !("converged" in r)) {
          assert.ok(r.roots.every((root) => !root.converged), `${label} with callback ${i} claims a root`);
        } else {
          assert.equal(r.converged, false, `${label} with callback ${i} claims convergence`);
        }
      } catch (e) {
        threw = e;
      }
      if (threw !== null) {
        check(`${label} callback ${i}`, threw, true);
        assert.match(threw.code, /^callback-|^no-unknowns|^system-solver-unavailable/, `${label} callback ${i}: ${threw.code}`);
      }
    }
  }
  assertStillSolves();
});

test("one long text shared by many fields is refused before it fills the memory", () => {
  // 3 MB of text, used as the unit of 10 000 names: 30 GB if each were copied.
  const long = "m".repeat(3_000_000);
  const units = {};
  for (let i = 0; i < 10_000; i++) units[`v${i}`] = long;
  assert.throws(
    () => tacit.solveEquation({ equations: "x = 1", units }),
    (e) => e instanceof tacit.TacitError && e.code === "bad-request" && /limit/.test(e.message),
  );
  assertStillSolves();
});

test("a throwing callback's own error is kept as the cause", () => {
  const boom = new Error("rig offline");
  assert.throws(
    () =>
      tacit.solveFunction(() => {
        throw boom;
      }, { guesses: [1, 2] }),
    (e) => e instanceof tacit.TacitError && e.code === "callback-threw" && e.cause === boom && /rig offline/.test(e.message),
  );
  assert.throws(
    () => tacit.solveFunction(() => "3", { guesses: [1, 2] }),
    (e) => e instanceof tacit.TacitError && e.code === "callback-bad-value" && /string/.test(e.message),
  );
});

test("a stepper misused: tell when done, after free, restore of tampered text", () => {
  const s = tacit.Stepper.create({ bracket: [0, 2] });
  while (!s.done) s.tell(s.next() - 1);
  assert.throws(() => s.tell(1), { code: "nothing-pending" });
  const saved = s.save();
  s.free();
  s.free();
  assert.throws(() => s.save(), { code: "stepper-freed" });
  for (const bad of [
    saved.slice(0, saved.length / 2),
    saved.replace(/"points":\[\[/, '"points":[[1e300,'),
    saved.replace(/"version":\d+/, '"version":99'),
    saved.replace('"max_evals":200', '"max_evals":1e300'),
    saved.replace('"format":"tacit-stepper"', '"format":"other"'),
    saved + saved,
  ]) {
    assert.throws(() => tacit.Stepper.restore(bad), { code: "bad-saved-stepper" });
  }
  assert.throws(() => new tacit.Stepper(), { code: "bad-call" });
  assertStillSolves();
});

test("the raw wasm-bindgen exports never trap either", () => {
  const raw = [
    core.solveEquation,
    core.solveTemplate,
    core.findRoots,
    core.sweep,
    core.checkEquation,
    core.catalogue,
    core.unitsCatalogue,
    core.lastPanic,
    core.version,
  ].filter((f) => typeof f === "function");
  for (const f of raw) {
    for (const g of GARBAGE) survive(`${f.name}(${typeof g})`, () => f(g), { tacitOnly: false });
  }
  for (const g of GARBAGE) {
    for (const h of GARBAGE.slice(0, 25)) {
      survive("convertUnit", () => core.convertUnit(g, h, h), { tacitOnly: false });
      survive("solveSystemFunction", () => core.solveSystemFunction(g, h), { tacitOnly: false });
      survive("findRootsFunction", () => core.findRootsFunction(g, h), { tacitOnly: false });
    }
    survive("StepperHandle.create", () => core.StepperHandle.create(g), { tacitOnly: false });
    survive("StepperHandle.restore", () => core.StepperHandle.restore(g), { tacitOnly: false });
    const h = core.StepperHandle.create({ guesses: [1, 2] });
    survive("StepperHandle.tell", () => h.tell(g), { tacitOnly: false });
    h.free();
    survive("freed handle", () => h.next(), { tacitOnly: false });
  }
  survive("a raw callback that throws", () => core.findRootsFunction(() => {
    throw new Error("x");
  }, { range: [0, 1] }), { tacitOnly: false });
  survive("a raw system callback that returns a plain array", () => core.solveSystemFunction(() => [0, 0], { x0: [1, 2] }), { tacitOnly: false });
  assert.equal(core.lastPanic(), undefined, "no panic happened");
  assertStillSolves();
});
