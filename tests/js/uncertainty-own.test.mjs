// Through the package: the uncertainty of an answer with its Monte Carlo trials in
// chunks (followed and stopped), proven roots, and templates of one's own.
import { test } from "node:test";
import assert from "node:assert/strict";
import { readFile } from "node:fs/promises";

const pkg = new URL("../../dist/pkg/", import.meta.url);
const tacit = await import(new URL("tacit.js", pkg));
await tacit.init(await readFile(new URL("tacit_core_bg.wasm", pkg)));

const close = (a, b, rel, what) => assert.ok(Math.abs(a - b) <= rel * Math.abs(b), `${what}: ${a} is not within ${rel} of ${b}`);

// R = V/I, V = 12 V ± 3 %, I = 2 A ± 4 %: u(R)/R = 5 % (GUM §5.1.6, relative
// uncertainties of a quotient in quadrature; closed form).
const OHM = {
  equations: "V = I*R",
  knowns: { V: 12000, I: 2000 },
  units: { V: "mV", I: "mA", R: "ohm" },
  unknown: "R",
  uncertainties: { V: { percent: 3 }, I: { percent: 4 } },
};

test("uncertainty: the law of propagation, then Monte Carlo in chunks with progress", async () => {
  const p = tacit.problem(OHM);
  try {
    const seen = [];
    const u = await p.uncertainty({ uncertainty: { trials: 20000, seed: 3 } }, { chunk: 5000, onProgress: (s) => seen.push(s.done) });
    assert.deepEqual(seen, [5000, 10000, 15000, 20000]);
    assert.equal(u.unit, "ohm");
    close(u.value, 6, 1e-12, "R");
    close(u.standard, 0.3, 1e-12, "u(R)");
    assert.equal(u.monteCarlo.trials, 20000);
    assert.equal(u.monteCarlo.histogram.counts.length, 40);
    const counted = u.monteCarlo.histogram.counts.reduce((a, b) => a + b, 0) + u.monteCarlo.histogram.below + u.monteCarlo.histogram.above;
    assert.equal(counted, u.monteCarlo.trials - u.monteCarlo.failed);
    // Chunked equals one go (same seed): the solve's own result.
    const r = p.solve({ uncertainty: { trials: 20000, seed: 3 } });
    assert.deepEqual(r.uncertainty.R.monteCarlo.interval, u.monteCarlo.interval);
  } finally {
    p.free();
  }
});

test("uncertainty: an aborted run rejects with the law of propagation's result", async () => {
  const p = tacit.problem(OHM);
  try {
    const ac = new AbortController();
    await assert.rejects(
      p.uncertainty({ uncertainty: { trials: 100000 } }, { chunk: 1000, signal: ac.signal, onProgress: () => ac.abort() }),
      (e) => e.code === "aborted" && e.partial.monteCarlo === null && Math.abs(e.partial.standard - 0.3) < 1e-12,
    );
  } finally {
    p.free();
  }
});

test("proven roots through the Problem: regions cover the range, a scan's miss found", () => {
  // Two roots inside one sample spacing: 1 − 2·exp(−((x − 1.0013)/1e-3)²) = 0 at
  // x = 1.0013 ± 1e-3·sqrt(ln 2) (closed form).
  const p = tacit.problem({ equations: "1 - 2*exp(-((x - 1.0013)/1e-3)^2) = 0", unknown: "x" });
  try {
    const scan = p.roots(0, 2, {});
    assert.equal(scan.roots.length, 0);
    const proof = p.roots(0, 2, { proven: true });
    assert.equal(proof.proven, true);
    assert.equal(proof.regions[0].lo, 0);
    assert.equal(proof.regions.at(-1).hi, 2);
    const roots = proof.regions.filter((g) => g.kind === "unique").map((g) => g.root);
    const d = 1e-3 * Math.sqrt(Math.log(2));
    assert.equal(roots.length, 2);
    close(roots[0], 1.0013 - d, 1e-12, "lower root");
    close(roots[1], 1.0013 + d, 1e-12, "upper root");
  } finally {
    p.free();
  }
});

const OWN = {
  id: "my.head-loss",
  title: "Head loss in the pump main",
  equations: "# head loss\nh = f*L/D*v^2/(2*g)\nv := Q/(pi*D^2/4)",
  variables: [
    { name: "h", unit: "ft", value: 12 },
    { name: "f", unit: "1", value: 0.02 },
    { name: "L", unit: "ft", value: 1500 },
    { name: "D", unit: "in", value: 8 },
    { name: "g", unit: "ft/s^2", value: 32.174 },
    { name: "Q", unit: "gpm", guesses: [100, 500] },
  ],
  unknown: "Q",
};

test("own templates: written, read back, and bad fields named", () => {
  const text = tacit.writeOwnTemplates([OWN]);
  const back = tacit.readOwnTemplates(text);
  assert.equal(back.length, 1);
  assert.equal(back[0].equations, OWN.equations);
  assert.deepEqual(back[0].variables[5].guesses, [100, 500]);
  assert.deepEqual(tacit.checkOwnTemplate(OWN).id, "my.head-loss");
  const bad = JSON.parse(text);
  bad.templates[0].variables[2].unit = "gpm";
  assert.throws(() => tacit.readOwnTemplates(JSON.stringify(bad)), (e) => e.code === "dimension-mismatch" && /templates\[0\]\.equations/.test(e.message));
  assert.throws(() => tacit.readOwnTemplates("{"), (e) => e instanceof tacit.TacitError);
  assert.throws(() => tacit.readOwnTemplates(42), (e) => e.code === "bad-type");
  assert.throws(() => tacit.checkOwnTemplate({ ...OWN, colour: "red" }), (e) => /colour/.test(e.message));
});
