// Reading the set-up form into a solver request. Bad input throws FormError naming the
// value and marking its field; nothing typed is changed.

import { byId } from './dom.js';
import { parseNumber } from './format.js';
import { app, currentTemplate, currentVariables, unknownList, chosenUnit, FormError, readNumber } from './ctx.js';
import { withUncertainties } from './uncertainty.js';

const TOL_NAMES = { xRel: 'Relative step tolerance', xAbs: 'Absolute step tolerance', fAbs: 'Residual tolerance', maxEvals: 'Evaluation budget' };

/** Defaults by hand: a bench test or a week-long simulation rarely resolves more than four
 *  or five significant digits, and every evaluation costs hours, so by hand the step
 *  tolerance defaults to 1e-4 (relative) and the budget to 30 evaluations. */
export const BY_HAND_DEFAULTS = { xRel: 1e-4, maxEvals: 30 };

export function readTolerances() {
  const t = {};
  for (const k of Object.keys(TOL_NAMES)) {
    const el = byId(`tol-${k}`);
    el.removeAttribute('aria-invalid');
    const v = readNumber(app.S.tol[k], TOL_NAMES[k], el);
    if (v === null) {
      if (app.S.mode === 'external' && BY_HAND_DEFAULTS[k] !== undefined) t[k] = BY_HAND_DEFAULTS[k];
      continue;
    }
    if (k === 'maxEvals' && !(Number.isInteger(v) && v >= 2)) {
      el.setAttribute('aria-invalid', 'true');
      throw new FormError(`${TOL_NAMES[k]}: must be a whole number of at least 2, got ${app.S.tol[k]}`);
    }
    if (k !== 'maxEvals' && v < 0) {
      el.setAttribute('aria-invalid', 'true');
      throw new FormError(`${TOL_NAMES[k]}: must be 0 or more, got ${app.S.tol[k]}`);
    }
    t[k] = v;
  }
  return t;
}

export const startKind = () => (app.S.mode === 'template' && app.S.start.kind === 'bracket' ? 'guesses' : app.S.start.kind);

export function readStart() {
  const S = app.S;
  const kind = startKind();
  if (kind === 'default') return {};
  const ea = byId('start-a');
  const eb = byId('start-b');
  ea.removeAttribute('aria-invalid');
  eb.removeAttribute('aria-invalid');
  const a = readNumber(S.start.a, kind === 'bracket' ? 'Lower end of the bracket' : 'First guess', ea);
  const b = readNumber(S.start.b, kind === 'bracket' ? 'Upper end of the bracket' : 'Second guess', eb);
  if (a === null || b === null) throw new FormError(`Give both ${kind === 'bracket' ? 'ends of the bracket' : 'guesses'}, or let the solver choose.`);
  if (a === b) throw new FormError(`The two starting points must differ; both are ${a}.`);
  return kind === 'bracket' ? { bracket: [a, b] } : { guesses: [a, b] };
}

function readKnowns() {
  const out = {};
  const unknowns = unknownList();
  const missing = [];
  for (const v of currentVariables()) {
    if (unknowns.includes(v.symbol)) continue;
    const el = document.getElementById(`val-${v.symbol}`);
    el?.removeAttribute('aria-invalid');
    const entry = app.S.values[v.symbol] ?? { v: '', u: '' };
    const value = readNumber(entry.v, `Value of ${v.symbol}`, el);
    if (value === null) {
      el?.setAttribute('aria-invalid', 'true');
      missing.push(v.symbol);
      continue;
    }
    out[v.symbol] = { value, unit: chosenUnit(v.symbol) };
  }
  if (missing.length) throw new FormError(`Give a value for ${missing.join(', ')}, or choose ${missing.length === 1 ? 'it' : 'one'} under "Solve for".`);
  return out;
}

function readList(t) {
  const text = app.S.values[t.list.symbol]?.v ?? byId('list-text').value;
  const parts = text.split(/[\s,;]+/).filter(Boolean);
  const out = [];
  parts.forEach((p, i) => {
    const r = parseNumber(p);
    if (r.error) {
      byId('list-text').setAttribute('aria-invalid', 'true');
      throw new FormError(`${t.list.symbol}, item ${i + 1}: ${r.error}`);
    }
    out.push(r.value);
  });
  if (out.length < 2) throw new FormError(`${t.list.symbol} needs at least two values.`);
  return out;
}

const METHOD_WORDS = {
  auto: 'automatic (secant steps, then the bracketing hybrid once a sign change is seen)',
  secant: 'classic secant',
  hybrid: 'bracketing hybrid',
  illinois: 'Illinois false position',
  bisection: 'bisection',
};

/** The settings of a request in words, for the result and the record. */
export function settingsFacts(req, unit = '') {
  const t = req.tolerances ?? {};
  const u = unit ? ` ${unit}` : '';
  const start = req.bracket ? `bracket from ${req.bracket.join(' to ')}${u}` : req.guesses ? `guesses ${req.guesses.join(' and ')}${u}` : "the solver's own starting points";
  return [
    ['Method', METHOD_WORDS[req.method] ?? String(req.method)],
    ['Start', start],
    ['Step tolerance', `relative ${t.xRel ?? '10⁻¹² (default)'}, absolute ${t.xAbs ?? '0 (default)'}`],
    ['Residual tolerance', t.fAbs === undefined ? '0 (default: only a step or an exact zero ends the search)' : String(t.fAbs)],
    ['Evaluation budget', String(t.maxEvals ?? '200 (default)')],
  ];
}

/**
 * The unit to show each of the template's other quantities in: the unit the user chose
 * for a quantity of the same kind (a velocity in ft/s when a length is in ft is not
 * guessed; only the same dimension counts). The core converts.
 */
function outputUnits(t) {
  const out = {};
  for (const o of [...(t.auxiliary ?? []), ...(t.outputs ?? [])]) {
    if (!o.dimension || o.dimension === 'dimensionless') continue;
    const same = t.variables.find((v) => v.dimension === o.dimension && chosenUnit(v.symbol));
    const unit = same ? chosenUnit(same.symbol) : null;
    if (unit && unit !== o.unit) out[o.symbol] = unit;
  }
  return out;
}

/** An own template is solved as its equation set with units: every known in the unit
 *  chosen, the answer in the unit asked for; the template's guesses and bounds (in its own
 *  unit) go with the unknown when the answer is asked in that unit. */
function ownRequest(t, base) {
  const S = app.S;
  const knowns = {};
  const units = {};
  for (const [s, { value, unit }] of Object.entries(readKnowns())) {
    knowns[s] = value;
    if (unit) units[s] = unit;
  }
  const v = t.variables.find((x) => x.symbol === S.unknown);
  const ru = chosenUnit(S.unknown);
  if (ru) units[S.unknown] = ru;
  const { guesses, bracket, ...rest } = base;
  const unknown = { name: S.unknown };
  const own = ru === v.unit;
  if (guesses ?? (own && v.guesses)) unknown.guesses = guesses ?? v.guesses;
  if (own && v.bounds) unknown.bounds = v.bounds;
  const spec = { equations: t.equations, knowns, units, unknowns: [unknown] };
  const opts = { history: true, sensitivities: true, ...rest };
  return { kind: 'equation', own: true, spec, opts, req: { ...spec, ...opts }, start: { guesses: unknown.guesses } };
}

/** Builds the request for the current calculation. Throws FormError for bad input. */
export function buildRequest() {
  const S = app.S;
  const base = { method: S.method, tolerances: readTolerances(), ...readStart() };
  if (S.mode === 'template') {
    const t = currentTemplate();
    if (!t) throw new FormError('Choose a template from the catalogue first.');
    if (!S.unknown) throw new FormError('Choose the quantity to find under "Solve for".');
    if (t.own) return ownRequest(t, base);
    // Every known with its unit; a list input (cash flows) as a list of numbers in its unit.
    const values = Object.fromEntries(Object.entries(readKnowns()).map(([symbol, { value, unit }]) => [symbol, unit ? { value, unit } : value]));
    if (t.list) values[t.list.symbol] = readList(t);
    const spec = { template: t.id, values, unknown: S.unknown };
    const ru = chosenUnit(S.unknown);
    if (ru) spec.resultUnit = ru;
    const ou = outputUnits(t);
    if (Object.keys(ou).length) spec.outputUnits = ou;
    const opts = { history: true, sensitivities: true, ...base };
    withUncertainties(spec, opts, Object.keys(values).filter((s) => s !== t.list?.symbol), 1);
    return { kind: 'template', spec, opts, req: { ...spec, ...opts } };
  }
  if (S.mode === 'custom') {
    const c = app.customCheck;
    if (!c) throw new FormError('Write an equation first.');
    if (!c.ok) throw new FormError(`The equations do not read correctly: ${c.message}`);
    const unknowns = unknownList();
    if (unknowns.length === 0) throw new FormError('Choose the variable to find under "Solve for".');
    if (unknowns.length !== c.equations) throw new FormError(`${c.equations} equation${c.equations === 1 ? '' : 's'} need${c.equations === 1 ? 's' : ''} exactly ${c.equations} unknown${c.equations === 1 ? '' : 's'}; ${unknowns.length} ${unknowns.length === 1 ? 'is' : 'are'} chosen under "Solve for".`);
    const knowns = Object.fromEntries(Object.entries(readKnowns()).map(([k, v]) => [k, v.value]));
    const { guesses, bracket, ...rest } = base;
    let spec = unknowns;
    if (unknowns.length === 1 && (guesses || bracket)) spec = [{ name: unknowns[0], guesses: guesses ?? bracket }];
    const opts = { history: true, sensitivities: true, ...rest };
    const problemSpec = { equations: S.equations, knowns, unknowns: spec };
    withUncertainties(problemSpec, opts, Object.keys(knowns), unknowns.length);
    return { kind: 'equation', spec: problemSpec, opts, req: { ...problemSpec, ...opts }, start: { guesses, bracket } };
  }
  throw new FormError('This mode has no Solve button.');
}
