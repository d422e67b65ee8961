// What every part of the page shares: the calculation's state, the catalogue, the probe
// the tests read, notices, reading typed numbers, and the hooks through which one part
// asks another to act. The page's modules import downwards only (no cycles: the page
// builder's joiner runs each module once, in dependency order), so a part that must call
// a part above it (the roots list asks for a solve) goes through `hooks`, which app.js
// fills in.

import { h, byId } from './dom.js';
import { parseNumber } from './format.js';
import { defaultState, encodeFragment } from './state.js';

export const app = {
  S: defaultState(),
  templates: [],
  byId: new Map(),
  units: new Map(),
  nav: null,
  wasm: null,
  saved: [],
  lastResult: null,
  lastWritten: '',
  stepper: null,
  sweepResult: null,
  customCheck: null,
};

// For the end-to-end tests and the benchmark: read-only facts about the page's progress.
export const probe = { marks: {}, ready: false, solves: 0, firstSolveMs: null, lastSweepMs: null, sweeps: 0, workerStarts: 0 };
globalThis.tacitPage = probe;

/** Filled in by app.js: solve(), markStale(), renderSetup(), renderStart(), renderSweepInputs(). */
export const hooks = {};

export const CAUTION = 'Results support, and do not replace, checks by a licensed professional under local codes.';

export function notify(text, kind = 'warn') {
  const box = byId('notices');
  const close = h('button', { type: 'button', class: 'quiet', 'aria-label': 'Dismiss this message' }, 'Dismiss');
  const n = h('div', { class: `notice ${kind}`, 'data-kind': kind }, h('p', null, text), close);
  close.addEventListener('click', () => n.remove());
  box.append(n);
  return n;
}

export function currentTemplate() {
  return app.S.mode === 'template' ? app.byId.get(app.S.template) ?? null : null;
}

/** The variables of the current calculation: [{ symbol, meaning, units, unit, … }]. */
export function currentVariables() {
  if (app.S.mode === 'template') return currentTemplate()?.variables ?? [];
  if (app.S.mode === 'custom') return (app.customCheck?.ok ? app.customCheck.variables : []).map((s) => ({ symbol: s, meaning: '', units: [], unit: '' }));
  return [];
}

export const unknownList = () => app.S.unknown.split(',').filter(Boolean);
export const variableOf = (sym) => currentVariables().find((v) => v.symbol === sym);
export const meaningOf = (sym) => variableOf(sym)?.meaning ?? '';

/** The unit chosen for a quantity (its template default when none was chosen). */
export function chosenUnit(sym) {
  const v = variableOf(sym);
  if (!v || !v.units.length) return '';
  if (app.S.unknown === sym && app.S.resultUnit && v.units.includes(app.S.resultUnit)) return app.S.resultUnit;
  const u = app.S.values[sym]?.u;
  return u && v.units.includes(u) ? u : v.unit;
}

export function writeUrl() {
  const frag = encodeFragment(app.S);
  app.lastWritten = frag;
  if (location.hash !== frag) history.replaceState(null, '', frag);
}

/** Any edit to what the solve depends on: the result shown is now out of date until the
 *  next solve, and the link says so too. */
export function edited() {
  app.S.unsolved = true;
  hooks.markStale?.();
  writeUrl();
}

export class FormError extends Error {}

export function readNumber(text, what, el) {
  const r = parseNumber(text);
  if (r.error) {
    if (el) el.setAttribute('aria-invalid', 'true');
    throw new FormError(`${what}: ${r.error}`);
  }
  return r.empty ? null : r.value;
}

/** A confirmation inside the page (no browser dialog): replaces `box`'s content with the
 *  question and two buttons until one is chosen. Resolves true for `yes`. */
export function confirmInPage(box, question, yes, no) {
  return new Promise((resolve) => {
    const saved = [...box.childNodes];
    const bYes = h('button', { type: 'button', class: 'danger' }, yes);
    const bNo = h('button', { type: 'button' }, no);
    const q = h('div', { class: 'confirm', role: 'alertdialog', 'aria-label': question }, h('p', null, question), bYes, bNo);
    box.replaceChildren(q);
    const done = (v) => {
      box.replaceChildren(...saved);
      resolve(v);
    };
    bYes.addEventListener('click', () => done(true));
    bNo.addEventListener('click', () => done(false));
    q.addEventListener('keydown', (e) => { if (e.key === 'Escape') done(false); });
    bNo.focus();
  });
}
