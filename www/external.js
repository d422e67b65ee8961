// Evaluation by hand: for a model the page cannot compute (a rig, a spreadsheet, a long
// simulation) the page asks where to evaluate, the engineer types f there, and the solver
// takes the next step. The work is kept in this browser and in the link; nothing kept is
// ever replaced or removed without asking, and a copy is put aside before it is.

import { h, clear, byId } from './dom.js';
import { fmt, full, parseNumber } from './format.js';
import { app, notify, writeUrl, FormError, confirmInPage } from './ctx.js';
import { createStepper, restoreStepper } from './solver.js';
import { readStart, readTolerances, settingsFacts } from './request.js';
import { showResult, hideResults } from './result.js';
import { showHistory } from './history.js';
import { writeExternal, backupExternal } from './storage.js';

/** Digits of the point asked for. The step tolerance by hand defaults to 1e-4 (relative),
 *  so evaluating at x rounded to 7 significant digits (at most 5e-7 away, relative) moves
 *  nothing the tolerance can see; the exact value is shown beside it for a model that
 *  takes more digits. */
export const ASK_DIGITS = 7;

function persist() {
  const S = app.S;
  S.external.stepper = app.stepper ? app.stepper.save() : '';
  // Only a live evaluation is written; removing the kept one is for discard() alone.
  if (app.stepper) writeExternal({ stepper: S.external.stepper, label: S.external.label });
  writeUrl();
}

export function restoreKept(json, where) {
  try {
    app.stepper = restoreStepper(json);
    return true;
  } catch (e) {
    app.stepper = null;
    notify(`The evaluation by hand kept in ${where} could not be restored: ${e.message}. The kept copy was left as it was; nothing was deleted.`);
    return false;
  }
}

function pointsOf(st) {
  try {
    const record = JSON.parse(st.save());
    return Array.isArray(record.points) ? record.points.length : 0;
  } catch {
    return 0;
  }
}

export async function begin() {
  const S = app.S;
  const err = byId('ext-error');
  err.textContent = '';
  let start;
  let tolerances;
  try {
    if (S.start.kind === 'default') throw new FormError('Choose "Two guesses" or "A bracket" under "Where to start the search" and give both points.');
    start = readStart();
    tolerances = readTolerances();
  } catch (e) {
    if (!(e instanceof FormError)) throw e;
    byId('ext-ask').hidden = false;
    byId('ext-x').textContent = '—';
    err.textContent = e.message;
    return;
  }
  if (app.stepper && pointsOf(app.stepper) > 0) {
    const n = pointsOf(app.stepper);
    const yes = await confirmInPage(byId('ext-actions'), `An evaluation is in progress with ${n} value${n === 1 ? '' : 's'} recorded. Begin a new one? The current one is put aside under a backup key in this browser.`, 'Begin a new one', 'Keep the current one');
    if (!yes) return;
    const key = backupExternal();
    if (key) notify(`The earlier evaluation was put aside under the storage key ${key}.`, 'info');
  }
  try {
    app.stepper?.free();
    app.stepper = createStepper({ ...start, method: S.method, tolerances, history: true });
  } catch (e) {
    err.textContent = e.message;
    return;
  }
  persist();
  renderExternal();
  byId('ext-fx').focus();
}

export async function discard() {
  if (!app.stepper) return;
  const yes = await confirmInPage(byId('ext-actions'), 'Discard this evaluation? A copy is put aside under a backup key in this browser first.', 'Discard it', 'Keep it');
  if (!yes) return;
  const key = writeExternal(null);
  app.stepper.free();
  app.stepper = null;
  persist();
  renderExternal();
  hideResults();
  notify(`The evaluation was discarded${key ? `; a copy was kept under the storage key ${key}` : ''}.`, 'info');
}

export function tell(ev) {
  ev.preventDefault();
  const err = byId('ext-error');
  err.textContent = '';
  if (!app.stepper) return;
  const text = byId('ext-fx').value.trim();
  let fx;
  if (/^(nan|undefined|fail(ed)?)$/i.test(text)) fx = NaN;
  else {
    const r = parseNumber(text);
    if (r.empty || r.error) {
      err.textContent = r.empty ? 'Type the value of f at this x (or NaN if the model failed there).' : `Value of f: ${r.error}`;
      return;
    }
    fx = r.value;
  }
  try {
    app.stepper.tell(fx);
  } catch (e) {
    err.textContent = e.message;
    return;
  }
  byId('ext-fx').value = '';
  persist();
  renderExternal();
  byId(app.stepper.done ? 'result' : 'ext-fx').focus?.();
}

export function setLabel(text) {
  app.S.external.label = text;
  byId('calc-title').textContent = text || 'Evaluation by hand';
  persist();
}

export function renderExternal() {
  const st = app.stepper;
  byId('start').hidden = Boolean(st);
  const ask = byId('ext-ask');
  const prog = clear(byId('ext-progress'));
  byId('ext-discard').hidden = !st;
  byId('ext-begin').textContent = st ? 'Begin a new evaluation…' : 'Begin';
  byId('ext-begin').className = st ? 'quiet' : 'primary';
  if (!st) {
    ask.hidden = true;
    prog.append(h('p', { class: 'hint' }, 'No evaluation in progress.'));
    return;
  }
  const x = st.next();
  const record = JSON.parse(st.save());
  const points = Array.isArray(record.points) ? record.points : [];
  if (x !== null) {
    ask.hidden = false;
    byId('ext-x').textContent = fmt(x, ASK_DIGITS);
    byId('ext-x').setAttribute('data-value', full(x));
    byId('ext-x-full').textContent = `exact value ${full(x)}`;
  } else ask.hidden = true;
  prog.append(h('p', null, `${points.length} evaluation${points.length === 1 ? '' : 's'} recorded.`));
  const r = st.result;
  const label = app.S.external.label || 'f';
  const tol = record.tolerances ?? {};
  const settings = settingsFacts({ method: record.method, tolerances: { xRel: tol.x_rel, xAbs: tol.x_abs, fAbs: tol.f_abs, maxEvals: tol.max_evals }, ...record.start });
  if (r) {
    showResult(r, { answers: [{ symbol: 'x', value: r.root, unit: '' }], settings, notes: [], caution: '', residualLabel: `f, the value typed (${label})` });
    showHistory(r.history, null, 'x', `f (${label})`);
  } else {
    byId('result').hidden = true;
    showHistory(st.history, null, 'x', `f (${label})`);
    byId('plot-function-caption').textContent = `${label} at the points evaluated so far`;
  }
}
