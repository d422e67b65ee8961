// Every number the page shows comes from the solver through this module: the calculation
// compiled once as a Problem (solve, the curve of f for the plot, the roots in a range, the
// sweep's job), the ask–tell Stepper, and the text check of own equations. Every x the
// Problem reports is already in the unit chosen on the page; nothing here converts units,
// scans or samples on its own.

import { problem as compile, Stepper, checkEquation as check, version as toolVersion, checkOwnTemplate, readOwnTemplates, writeOwnTemplates } from '../dist/pkg/tacit.js';

export const version = () => toolVersion;
export const checkEquation = (text) => check(text);
// Own templates: read, checked and written by the core (data only; nothing in them runs).
export const checkOwn = (t) => checkOwnTemplate(t);
export const readOwn = (text) => readOwnTemplates(text);
export const writeOwn = (list) => writeOwnTemplates(list);

/** Compiles and solves a built request ({ spec, opts }). Returns { r, problem }; the
 *  problem is kept for the plot, the roots and the sweep, and freed by the next solve.
 *  Throws the solver's error. */
export function solveBuilt(built) {
  const problem = compile(built.spec);
  try {
    return { r: problem.solve(built.opts), problem };
  } catch (e) {
    problem.free();
    throw e;
  }
}

/** f over the visited range, from the compiled problem (x in the unknown's unit). */
export function sampleCurve(problem, history) {
  if (!problem || problem.unknown === null) return null;
  const xs = history.map((r) => r.x).filter(Number.isFinite);
  if (xs.length < 2) return null;
  let lo = xs.reduce((a, b) => Math.min(a, b));
  let hi = xs.reduce((a, b) => Math.max(a, b));
  if (hi === lo) return null;
  // A margin around the visited points, for the plot.
  const pad = (hi - lo) * 0.05;
  lo -= pad;
  hi += pad;
  try {
    const s = problem.sample(lo, hi, 80);
    return s.x.map((x, i) => [x, s.f[i]]);
  } catch {
    return null;
  }
}

/** Every root in [lo, hi] (in the unit shown) of the last solve's problem. */
export const rootsIn = (last, lo, hi, opts = {}) => last.problem.roots(lo, hi, opts);

/** The job for the sweep worker: the problem as solved and the sweep of one of its knowns
 *  (from and to in the unit the input is given in; the core reports every point in the
 *  units on the page). */
export function sweepJob(built, input, from, to, n, spacing) {
  const sweep = { input, from, to, points: n, spacing, method: built.opts.method, tolerances: built.opts.tolerances };
  const g = built.kind === 'template' ? built.opts.guesses : built.start.guesses ?? built.start.bracket;
  if (g) sweep.guesses = g;
  return { job: { spec: built.spec, sweep } };
}

// Evaluation by hand.
export const createStepper = (opts) => Stepper.create(opts);
export const restoreStepper = (json) => Stepper.restore(json);
