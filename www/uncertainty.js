// The uncertainty of the answer. Each known may carry a standard uncertainty (in its unit,
// or a percentage of its value); the solve returns the law of propagation's result at once
// (JCGM 100:2008), and the Monte Carlo check (JCGM 101:2008) runs in a worker of its own,
// with progress and a Cancel button. Every figure comes from the core, in the unknown's unit.

import { h, clear, byId } from './dom.js';
import { fmt, full, prettyUnit } from './format.js';
import { symbolMathML } from './mathml.js';
import { app, probe, edited, writeUrl, chosenUnit, FormError, readNumber } from './ctx.js';
import { histogramSvg } from './histogram.js';

export const DEFAULT_TRIALS = 100000;
const MAX_TRIALS = 1000000;

// ---- input: the uncertainty column of the quantities table ----------------------------

const absWords = (sym) => (app.S.mode === 'custom' ? 'your units' : prettyUnit(chosenUnit(sym)) || 'absolute');

/** The cell of a known: its standard uncertainty as typed and how it is given. */
export function uncertaintyCell(sym) {
  const S = app.S;
  const e = S.unc[sym] ?? { v: '', pct: false };
  const input = h('input', { type: 'text', id: `unc-${sym}`, inputmode: 'decimal', autocomplete: 'off', value: e.v, placeholder: 'exact', 'aria-label': `Standard uncertainty of ${sym} (empty: exact)` });
  const kind = h('select', { id: `unc-kind-${sym}`, 'aria-label': `Uncertainty of ${sym} given in` },
    h('option', { value: 'abs' }, absWords(sym)), h('option', { value: 'pct' }, '% of the value'));
  kind.value = e.pct ? 'pct' : 'abs';
  const put = () => {
    S.unc[sym] = { v: input.value, pct: kind.value === 'pct' };
    input.removeAttribute('aria-invalid');
    edited();
  };
  input.addEventListener('input', put);
  kind.addEventListener('change', put);
  return h('td', { class: 'unc' }, h('span', { class: 'pm', 'aria-hidden': 'true' }, '±'), input, kind);
}

/** The answer row's cell: ± the combined standard uncertainty of the last solve. */
export function answerUncertaintyCell(sym) {
  return h('td', { class: 'unc' }, h('output', { id: `answer-u-${sym}`, class: 'answer-u' }));
}

export function updateAnswerUncertainty() {
  const U = app.uncertainty;
  for (const out of document.querySelectorAll('.answer-u')) {
    const mine = U && !app.S.unsolved && out.id === `answer-u-${U.sym}`;
    out.textContent = mine ? `± ${fmt(U.linear.standard, 3)}${U.unit ? ` ${U.unit}` : ''} (u)` : '';
  }
}

/** Adds the knowns' uncertainties to a request (the Monte Carlo trials are left to the
 *  worker). Throws FormError naming the value. */
export function withUncertainties(spec, opts, knowns, unknowns) {
  const out = {};
  for (const sym of knowns) {
    const e = app.S.unc[sym];
    const el = document.getElementById(`unc-${sym}`);
    el?.removeAttribute('aria-invalid');
    const u = e ? readNumber(e.v, `Uncertainty of ${sym}`, el) : null;
    if (u === null || u === 0) continue;
    if (u < 0) {
      el?.setAttribute('aria-invalid', 'true');
      throw new FormError(`Uncertainty of ${sym}: a standard uncertainty is 0 or more, got ${e.v} (leave it empty for an exact value).`);
    }
    out[sym] = e.pct ? { percent: u } : u;
  }
  if (!Object.keys(out).length) return;
  if (unknowns > 1) throw new FormError('The uncertainty of the answer is found for one unknown: clear the uncertainties, or solve for one quantity.');
  spec.uncertainties = out;
  opts.uncertainty = { trials: 0 };
}

/** Keeps the "absolute" choice naming the known's unit when the unit is changed. */
export function wireUncertainty() {
  byId('vars').addEventListener('change', (ev) => {
    const sym = ev.target.id?.startsWith('unit-') ? ev.target.id.slice(5) : null;
    const opt = sym && document.querySelector(`#unc-kind-${sym} option[value=abs]`);
    if (opt) opt.textContent = absWords(sym);
  });
  byId('mc-run').addEventListener('click', runMonteCarlo);
  byId('mc-cancel').addEventListener('click', cancelMonteCarlo);
  byId('mc-trials').addEventListener('input', (e) => {
    // The trials change the check, not the answer: kept in the link, nothing goes out of date.
    app.S.trials = e.target.value;
    e.target.removeAttribute('aria-invalid');
    writeUrl();
  });
}

// ---- result: the law of propagation at once, Monte Carlo from the worker ---------------

const fact = (term, value, attrs) => h('div', null, h('dt', null, term), h('dd', attrs ?? null, value));
const withUnit = (x, U, d = 4) => `${fmt(x, d)}${U.unit ? ` ${U.unit}` : ''}`;
const pair = ([a, b], U) => `${fmt(a, 6)} to ${fmt(b, 6)}${U.unit ? ` ${U.unit}` : ''}`;

/** After a solve: the card of the uncertainty, and the Monte Carlo check started. */
export function showUncertainty(built, r, sym) {
  stopRun();
  const lin = r.converged ? r.uncertainty?.[sym] : null;
  const card = byId('uncertainty');
  card.classList.remove('stale');
  card.hidden = !lin;
  app.uncertainty = lin ? { built, sym, linear: lin, unit: prettyUnit(lin.unit ?? ''), mc: null } : null;
  if (!lin) return;
  const U = app.uncertainty;
  byId('mc-trials').value = app.S.trials;
  const body = clear(byId('uncertainty-body'));
  body.append(
    h('p', { class: 'answer' },
      h('span', { class: 'what' }, symbolMathML(sym), ' ='),
      h('output', { class: 'big-number', 'data-testid': 'u-value', 'data-value': full(lin.value) }, fmt(lin.value, 6)),
      h('span', null, ' ± '),
      h('output', { class: 'big-number', 'data-testid': 'u-standard', 'data-value': full(lin.standard) }, fmt(lin.standard, 3)),
      h('span', { class: 'unit' }, U.unit)),
    h('dl', { class: 'facts' },
      fact('Combined standard uncertainty u (law of propagation, JCGM 100:2008 eq. 10)', withUnit(lin.standard, U), { 'data-testid': 'u-combined', title: full(lin.standard) }),
      fact(`Expanded uncertainty U = k·u, coverage factor k = ${fmt(lin.coverageFactor, 3)}`, withUnit(lin.expanded, U), { 'data-testid': 'u-expanded', title: full(lin.expanded) }),
      fact('Value ± U', pair([lin.value - lin.expanded, lin.value + lin.expanded], U))),
  );
  const tb = h('tbody');
  for (const c of lin.contributions) {
    tb.append(h('tr', null,
      h('td', null, symbolMathML(c.input)),
      h('td', { class: 'mono' }, `${fmt(c.standard, 4)}${c.inputUnit ? ` ${prettyUnit(c.inputUnit)}` : ''}${c.distribution === 'rectangular' ? ' (rectangular)' : ''}`),
      h('td', { class: 'mono', title: full(c.contribution) }, withUnit(c.contribution, U, 3))));
  }
  body.append(h('div', { class: 'table-wrap', tabindex: '0', role: 'region', 'aria-label': 'Contributions to the uncertainty (scrolls sideways on a narrow screen)' },
    h('table', { class: 'numbers' },
      h('caption', null, `Each known's share of u(${sym}): |sensitivity| × its standard uncertainty`),
      h('thead', null, h('tr', null, ['Known', 'Standard uncertainty', `Share of u(${sym})`].map((c) => h('th', { scope: 'col' }, c)))),
      tb)));
  runMonteCarlo();
}

export function hideUncertainty() {
  stopRun();
  app.uncertainty = null;
  byId('uncertainty').hidden = true;
  updateAnswerUncertainty();
}

/** The inputs changed: the figures shown belong to the earlier inputs; a run stops. */
export function staleUncertainty() {
  updateAnswerUncertainty();
  const card = byId('uncertainty');
  if (!app.uncertainty || card.hidden || card.classList.contains('stale')) return;
  if (mc.busy) {
    stopRun();
    byId('mc-status').textContent = 'The Monte Carlo check was stopped: the inputs changed. Solve again to check the new ones.';
  }
  card.classList.add('stale');
  byId('uncertainty-body').prepend(h('p', { class: 'stale-note', role: 'status' }, 'Not solved for these inputs: the uncertainty below belongs to the earlier inputs. Press Solve to bring it up to date.'));
}

// ---- the Monte Carlo worker ------------------------------------------------------------

const mc = { worker: null, ready: null, id: 0, busy: false };

function worker() {
  if (mc.worker) return mc.worker;
  const url = URL.createObjectURL(new Blob([byId('page-script').textContent], { type: 'text/javascript' }));
  const w = new Worker(url, { name: 'tacit-uncertainty' });
  URL.revokeObjectURL(url);
  probe.mcWorkerStarts = (probe.mcWorkerStarts ?? 0) + 1;
  mc.ready = new Promise((resolve, reject) => {
    const onMsg = (ev) => {
      if (ev.data.type === 'ready') resolve();
      else if (ev.data.type === 'error' && ev.data.id === null) reject(new Error(ev.data.message));
      else return;
      w.removeEventListener('message', onMsg);
    };
    w.addEventListener('message', onMsg);
  });
  w.addEventListener('error', (ev) => {
    ev.preventDefault();
    if (mc.worker === w) endRun(`The Monte Carlo check stopped: the background solver failed (${ev.message || 'script error'}). Run it again.`);
  });
  w.postMessage({ type: 'init', wasm: app.wasm.slice().buffer });
  mc.worker = w;
  return w;
}

function setBusy(busy) {
  mc.busy = busy;
  byId('mc-run').disabled = busy;
  byId('mc-cancel').disabled = !busy;
  byId('mc-progress').hidden = !busy;
}

/** Ends the worker of a run under way (the only way to stop wasm mid-chunk). */
function stopRun() {
  if (!mc.busy) return;
  mc.id++;
  mc.worker.terminate();
  mc.worker = null;
  setBusy(false);
}

function endRun(words) {
  mc.worker?.terminate();
  mc.worker = null;
  setBusy(false);
  byId('mc-status').textContent = words;
}

function readTrials() {
  const el = byId('mc-trials');
  el.removeAttribute('aria-invalid');
  const n = readNumber(app.S.trials, 'Monte Carlo trials', el) ?? DEFAULT_TRIALS;
  if (!Number.isInteger(n) || n < 100 || n > MAX_TRIALS) {
    el.setAttribute('aria-invalid', 'true');
    throw new FormError(`Monte Carlo trials: a whole number from 100 to ${MAX_TRIALS}, got ${app.S.trials}.`);
  }
  return n;
}

export function runMonteCarlo() {
  const U = app.uncertainty;
  const status = byId('mc-status');
  if (!U || app.S.unsolved) {
    status.textContent = 'Solve first: the Monte Carlo check starts from the answer of these inputs.';
    return;
  }
  let trials;
  try {
    trials = readTrials();
  } catch (e) {
    if (!(e instanceof FormError)) throw e;
    status.textContent = e.message;
    return;
  }
  stopRun();
  clear(byId('mc-body'));
  const id = ++mc.id;
  const opts = { ...U.built.opts, history: false, sensitivities: false, uncertainty: { trials } };
  const w = worker();
  setBusy(true);
  const bar = byId('mc-progress');
  bar.value = 0;
  status.textContent = `Monte Carlo check: starting ${fmt(trials)} trials…`;
  const onMsg = (ev) => {
    const m = ev.data;
    if (m.id !== id || id !== mc.id) return;
    if (m.type === 'progress') {
      bar.value = m.done / m.total;
      U.done = m.done;
      status.textContent = `Monte Carlo check: ${m.done} of ${m.total} trials`;
      return;
    }
    w.removeEventListener('message', onMsg);
    setBusy(false);
    if (m.type === 'result') {
      probe.mcRuns = (probe.mcRuns ?? 0) + 1;
      U.mc = m.result;
      status.textContent = `Monte Carlo check done: ${m.result.monteCarlo.trials} trials in ${(m.ms / 1000).toFixed(1)} s.`;
      showMonteCarlo(U);
    } else {
      endRun(`The Monte Carlo check could not run: ${m.message}`);
    }
  };
  w.addEventListener('message', onMsg);
  mc.ready.then(() => { if (id === mc.id) w.postMessage({ type: 'uncertainty', id, job: { spec: U.built.spec, opts } }); },
    (e) => { if (id === mc.id) endRun(`The Monte Carlo check could not start: ${e.message}`); });
}

export function cancelMonteCarlo() {
  if (!mc.busy) return;
  const U = app.uncertainty;
  stopRun();
  byId('mc-status').textContent = `Monte Carlo check cancelled${U?.done ? ` after ${U.done} trials` : ''}; the law of propagation's result above stands. Press "Run the check" to start it again.`;
}

function showMonteCarlo(U) {
  const m = U.mc.monteCarlo;
  const v = U.mc.validation;
  const body = clear(byId('mc-body'));
  const dl = h('dl', { class: 'facts' },
    fact('95 % coverage interval (probabilistically symmetric)', pair(m.interval, U), { 'data-testid': 'mc-interval', 'data-lo': full(m.interval[0]), 'data-hi': full(m.interval[1]) }),
    fact('Mean and standard deviation of the trials', `${withUnit(m.mean, U, 6)} and ${withUnit(m.standard, U, 3)}`, { 'data-testid': 'mc-standard', 'data-value': full(m.standard) }),
    fact('Trials', `${m.trials} (seed ${m.seed})`),
    fact('Trials in which no root was found', `${m.failed}${m.failed ? ' (left out of the figures)' : ''}`, { 'data-testid': 'mc-failed' }));
  body.append(dl);
  if (v) {
    const words = v.agrees
      ? `The linear result and Monte Carlo agree (JCGM 101:2008 §8): both ends of the 95 % interval from the law of propagation, ${pair(v.gumInterval, U)}, lie within ${withUnit(v.tolerance, U, 2)} of the Monte Carlo interval's (they differ by ${fmt(v.dLow, 2)} and ${withUnit(v.dHigh, U, 2)}). Either may be quoted.`
      : `The linear result and Monte Carlo do not agree (JCGM 101:2008 §8): the ends of the 95 % interval from the law of propagation, ${pair(v.gumInterval, U)}, differ from the Monte Carlo interval's by ${fmt(v.dLow, 2)} and ${withUnit(v.dHigh, U, 2)}, more than the ${withUnit(v.tolerance, U, 2)} allowed. The relation is not close enough to linear over the spread of the inputs: quote the Monte Carlo interval.`;
    body.append(h('p', { class: `verdict ${v.agrees ? 'good' : 'bad'}`, 'data-agrees': String(v.agrees) }, words));
  }
  body.append(histogramSvg(m.histogram, { symbol: U.sym, unit: U.unit, interval: m.interval, value: U.linear.value, trials: m.trials - m.failed }));
}
