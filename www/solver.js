// Every number the page shows comes from the solver through this module: the solve, the
// curve of f for the plot, the roots in a range, the sweep's job, and units converted by
// the core's own table. Nothing here computes a number of its own beyond moving the
// solver's values between its SI form and the unit the user chose; that last part goes
// once the core's compiled problem reports every x in the user's unit.

import * as tacit from '../dist/pkg/tacit.js';
import { app, currentTemplate, unknownList } from './ctx.js';
import { fmt } from './format.js';

export const version = () => tacit.version;

/** The solve of a built request ({ kind, req }). Throws the solver's error. */
export function solveBuilt(built) {
  return built.kind === 'template' ? tacit.solveTemplate(built.req) : tacit.solveEquation(built.req);
}

export const checkEquation = (text) => tacit.checkEquation(text);

/** `x` in `from` converted to `to` by the core's unit table (x itself when either is empty). */
export function convert(x, from, to) {
  if (!from || !to || from === to || !Number.isFinite(x)) return x;
  return tacit.convertUnit(x, from, to);
}

/** A template's guesses for `v` in the unit `unit`. */
export function guessesIn(v, unit) {
  const g = v?.guesses;
  if (!Array.isArray(g) || g.length !== 2) return null;
  try {
    return g.map((x) => convert(Number(x), v.unit, unit));
  } catch {
    return null;
  }
}

/** A template's history (and bracket) is in the SI unit of the unknown; the page shows it
 *  in the result unit. Returns a function from SI values to the result unit. */
export function siToResultUnit(built) {
  if (built.kind !== 'template') return (x) => x;
  const v = currentTemplate()?.variables.find((x) => x.symbol === built.req.unknown);
  const si = app.units.get(v?.dimension)?.[0];
  const unit = built.req.resultUnit;
  if (!si || !unit || si === unit) return (x) => x;
  return (x) => convert(x, si, unit);
}

export function convertHistory(rows, conv) {
  let prev = null;
  return rows.map((r) => {
    const x = conv(r.x);
    const step = prev === null || r.step === null ? r.step : x - prev;
    prev = x;
    return { ...r, x, step, bracket: r.bracket ? r.bracket.map(conv) : r.bracket };
  });
}

/**
 * A template with one equation and no list or auxiliary unknown, as the same equation text
 * with the given values in SI units (the units its equations are written in). The text
 * calls (solveEquation, findRoots, sweep) are much quicker than repeated template solves,
 * so plots, scans and sweeps use this form when it exists.
 */
export function templateAsEquation(built) {
  if (built.kind !== 'template') return null;
  const t = currentTemplate();
  if (!t || t.list || t.raw.auxiliary?.length) return null;
  const check = tacit.checkEquation(t.equations);
  if (!check.ok || check.equations !== 1) return null;
  const variable = (sym) => t.variables.find((v) => v.symbol === sym);
  const siOf = (sym) => app.units.get(variable(sym)?.dimension)?.[0];
  const converter = (from, to) => (x) => convert(x, from, to);
  const knowns = {};
  const inputUnits = {};
  for (const e of built.req.values) {
    const si = siOf(e.symbol);
    if (!si) return null;
    knowns[e.symbol] = convert(e.value, e.unit, si);
    inputUnits[e.symbol] = e.unit;
  }
  const unknown = built.req.unknown;
  const v = variable(unknown);
  const si = siOf(unknown);
  if (!v || !si) return null;
  const unit = built.req.resultUnit ?? v.unit;
  const defaultToSI = converter(v.unit, si);
  const pair = (p) => (Array.isArray(p) && p.length === 2 ? p.map((x) => defaultToSI(Number(x))) : undefined);
  return {
    equations: t.equations,
    knowns,
    unknown,
    toSI: converter(unit, si),
    fromSI: converter(si, unit),
    inputToSI: (sym) => converter(inputUnits[sym], siOf(sym)),
    bounds: pair(v.bounds)?.map((x, i) => (Number.isFinite(x) ? x : i === 0 ? -Infinity : Infinity)),
    guesses: built.req.guesses ? built.req.guesses.map(converter(unit, si)) : pair(v.guesses),
  };
}

/** Samples f over the visited range with the solver's own residual: each sample is a
 *  solve started at two points with a budget of two evaluations, whose history gives f. */
export function sampleCurve(built, history, conv) {
  const xs = history.map((r) => r.x).filter(Number.isFinite);
  if (xs.length < 2) return null;
  let lo = xs.reduce((a, b) => Math.min(a, b));
  let hi = xs.reduce((a, b) => Math.max(a, b));
  if (hi === lo) return null;
  const pad = (hi - lo) * 0.05;
  lo -= pad;
  hi += pad;
  const n = 80;
  const out = [];
  const asEq = templateAsEquation(built);
  const callOnce = (a, b) => {
    const base = { ...built.req, method: 'secant', tolerances: { maxEvals: 2 }, history: true, sensitivities: false };
    delete base.bracket;
    try {
      if (asEq) {
        return tacit.solveEquation({ equations: asEq.equations, knowns: asEq.knowns, unknowns: [{ name: asEq.unknown, guesses: [asEq.toSI(a), asEq.toSI(b)] }], method: 'secant', tolerances: { maxEvals: 2 }, history: true }).history;
      }
      if (built.kind === 'template') return tacit.solveTemplate({ ...base, guesses: [a, b] }).history;
      return tacit.solveEquation({ ...base, unknowns: [{ name: unknownList()[0], guesses: [a, b] }] }).history;
    } catch {
      return [];
    }
  };
  for (let i = 0; i < n; i += 2) {
    const a = lo + ((hi - lo) * i) / (n - 1);
    const b = lo + ((hi - lo) * (i + 1)) / (n - 1);
    for (const row of callOnce(a, b).slice(0, 2)) if (row.kind === 'initial') out.push([conv(row.x), row.fx]);
  }
  out.sort((p, q) => p[0] - q[0]);
  return out;
}

/** Every root in [lo, hi] (in the unit shown) of the last solve's equation:
 *  { roots: [{x, kind}], evaluations, limits }. */
export function rootsIn(last, lo, hi) {
  const asEq = templateAsEquation(last.built);
  if (asEq) {
    const [a, b] = [asEq.toSI(lo), asEq.toSI(hi)].sort((p, q) => p - q);
    const found = tacit.findRoots({ equations: asEq.equations, knowns: asEq.knowns, unknown: asEq.unknown, range: [a, b] });
    found.roots = found.roots.map((rt) => ({ ...rt, x: asEq.fromSI(rt.x) })).sort((p, q) => p.x - q.x);
    // The core's own words quote the spacing in SI units; say it without the number.
    found.limits = `Scanned ${found.samples} evenly spaced points: roots closer together than their spacing, or where f touches zero without changing sign, can be missed.`;
    return found;
  }
  if (last.built.kind === 'template') return scanTemplate(last.built, lo, hi);
  return tacit.findRoots({ equations: app.S.equations, knowns: last.built.req.knowns, unknown: unknownList()[0], range: [lo, hi] });
}

/** Roots of a template's equation in [lo, hi] (in the result unit), from the solver's
 *  own residual: sampled on a grid, each sign change then solved from its two ends. */
function scanTemplate(built, lo, hi) {
  const n = 200;
  const conv = siToResultUnit(built);
  const pts = [];
  let evaluations = 0;
  for (let i = 0; i < n; i += 2) {
    const a = lo + ((hi - lo) * i) / (n - 1);
    const b = lo + ((hi - lo) * (i + 1)) / (n - 1);
    const r = tacit.solveTemplate({ ...built.req, guesses: [a, b], method: 'secant', tolerances: { maxEvals: 2 }, history: true, sensitivities: false });
    evaluations += r.evaluations;
    for (const row of r.history.slice(0, 2)) pts.push([conv(row.x), row.fx]);
  }
  pts.sort((p, q) => p[0] - q[0]);
  const roots = [];
  for (let i = 1; i < pts.length; i++) {
    const [xa, fa] = pts[i - 1];
    const [xb, fb] = pts[i];
    if (!Number.isFinite(fa) || !Number.isFinite(fb)) continue;
    if (fa === 0) { roots.push({ x: xa, fx: 0, kind: 'sign-change', converged: true }); continue; }
    if (Math.sign(fa) !== Math.sign(fb) && fb !== 0) {
      const r = tacit.solveTemplate({ ...built.req, guesses: [xa, xb], history: false, sensitivities: false });
      evaluations += r.evaluations;
      if (r.converged && r.value >= Math.min(xa, xb) - Math.abs(xb - xa) && r.value <= Math.max(xa, xb) + Math.abs(xb - xa)) roots.push({ x: r.value, fx: r.residual, kind: 'sign-change', converged: true });
    }
  }
  return { roots, evaluations, limits: `Scanned ${pts.length} points ${fmt((hi - lo) / (pts.length - 1), 3)} apart: roots closer together than that, or roots where f touches zero without changing sign, can be missed.` };
}

/** The job for the sweep worker: { job, finish? } with the inputs back in the page's units. */
export function sweepJob(built, input, from, to, n) {
  const asEq = templateAsEquation(built);
  if (asEq) {
    const knowns = { ...asEq.knowns };
    delete knowns[input];
    const toSI = asEq.inputToSI(input);
    const request = { equations: asEq.equations, knowns, unknown: asEq.unknown, input, from: toSI(from), to: toSI(to), points: n, method: built.req.method, tolerances: built.req.tolerances };
    if (asEq.guesses) request.guesses = asEq.guesses;
    if (asEq.bounds) request.bounds = asEq.bounds;
    return {
      job: { kind: 'equation', request },
      // Back to the units on the page: the inputs as typed, the unknown in its chosen unit.
      finish: (result) => ({ ...result, input: result.input.map((_, i) => (i === n - 1 ? to : from + ((to - from) * i) / (n - 1))), root: result.root.map(asEq.fromSI) }),
    };
  }
  if (built.kind === 'template') {
    return { job: { kind: 'template', request: { ...built.req, history: false, sensitivities: false }, input, from, to, points: n } };
  }
  const knowns = { ...built.req.knowns };
  delete knowns[input];
  const request = { equations: app.S.equations, knowns, unknown: unknownList()[0], input, from, to, points: n, method: built.req.method, tolerances: built.req.tolerances };
  const g = built.start.guesses ?? built.start.bracket;
  if (g) request.guesses = g;
  return { job: { kind: 'equation', request } };
}

// Evaluation by hand.
export const createStepper = (opts) => tacit.Stepper.create(opts);
export const restoreStepper = (json) => tacit.Stepper.restore(json);
