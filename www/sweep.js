// Sweeps: one input varied across a range, solved at each point in a background worker,
// shown as a plot first with the table of points behind it, a page of rows at a time.

import { h, clear, byId, download } from './dom.js';
import { fmt, full, prettyUnit } from './format.js';
import { app, probe, notify, currentVariables, unknownList, chosenUnit, FormError, readNumber } from './ctx.js';
import { buildRequest } from './request.js';
import { sweepJob } from './solver.js';
import { plot } from './plot.js';
import { runSweepJob } from './sweep-run.js';

/** Rows of the table drawn at once; the rest are a page away. */
export const PAGE_ROWS = 200;

const sweeper = { worker: null, ready: null, id: 0, busy: false, failures: 0 };

export function startWorker() {
  const src = byId('page-script').textContent;
  const url = URL.createObjectURL(new Blob([src], { type: 'text/javascript' }));
  const w = new Worker(url, { name: 'tacit-sweep' });
  URL.revokeObjectURL(url);
  probe.workerStarts++;
  sweeper.worker = w;
  sweeper.ready = new Promise((resolve, reject) => {
    const onMsg = (ev) => {
      if (ev.data.type === 'ready') { w.removeEventListener('message', onMsg); resolve(); }
      if (ev.data.type === 'error' && ev.data.id === null) { w.removeEventListener('message', onMsg); reject(new Error(ev.data.message)); }
    };
    w.addEventListener('message', onMsg);
  });
  sweeper.ready.then(() => { sweeper.failures = 0; }, () => {});
  w.addEventListener('error', (ev) => {
    ev.preventDefault();
    replaceWorker(`the sweep worker failed (${ev.message || 'script error'})`);
  });
  w.postMessage({ type: 'init', wasm: app.wasm.slice().buffer });
}

function replaceWorker(why) {
  sweeper.worker?.terminate();
  const wasBusy = sweeper.busy;
  endSweepUi();
  sweeper.failures += 1;
  if (sweeper.failures > 2) {
    // Failing again and again at start-up: stop trying rather than loop.
    byId('sweep-run').disabled = true;
    byId('sweep-status').textContent = `Sweeps are not available in this browser: ${why}.`;
    notify(`Sweeps are not available in this browser (${why}); solving is not affected.`);
    return;
  }
  startWorker();
  byId('sweep-status').textContent = `${why}. A fresh worker was started${wasBusy ? '; run the sweep again' : ''}.`;
  notify(`Sweep: ${why}. The background solver was replaced with a fresh one; nothing else is affected.`);
}

function endSweepUi() {
  sweeper.busy = false;
  byId('sweep-run').disabled = false;
  byId('sweep-cancel').disabled = true;
  byId('sweep-progress').hidden = true;
}

export function renderSweepInputs() {
  const sel = clear(byId('sweep-input'));
  const unknowns = unknownList();
  for (const v of currentVariables()) {
    if (unknowns.includes(v.symbol)) continue;
    const u = prettyUnit(chosenUnit(v.symbol));
    sel.append(h('option', { value: v.symbol }, `${v.symbol}${v.meaning ? `, ${v.meaning}` : ''}${u ? ` (${u})` : ''}`));
  }
  const S = app.S;
  if (S.sweep.input && [...sel.options].some((o) => o.value === S.sweep.input)) sel.value = S.sweep.input;
  byId('sweep-from').value = S.sweep.from;
  byId('sweep-to').value = S.sweep.to;
  byId('sweep-n').value = S.sweep.n;
  byId('sweep-spacing').value = S.sweep.spacing === 'log' ? 'log' : 'linear';
}

function buildSweepJob() {
  const S = app.S;
  const built = buildRequest();
  const input = byId('sweep-input').value;
  if (!input) throw new FormError('Choose the input to vary.');
  const from = readNumber(S.sweep.from, 'Sweep from', byId('sweep-from'));
  const to = readNumber(S.sweep.to, 'Sweep to', byId('sweep-to'));
  const n = readNumber(S.sweep.n || '50', 'Sweep points', byId('sweep-n'));
  if (from === null || to === null) throw new FormError('Give the range of the sweep (From and To).');
  if (from === to) throw new FormError('The sweep range is empty: From equals To.');
  if (!Number.isInteger(n) || n < 2 || n > 100000) throw new FormError(`Sweep points must be a whole number from 2 to 100000, got ${S.sweep.n}.`);
  if (built.kind !== 'template' && unknownList().length !== 1) throw new FormError('A sweep solves for one unknown.');
  const spacing = S.sweep.spacing === 'log' ? 'log' : 'linear';
  if (spacing === 'log' && !(from > 0 && to > 0)) throw new FormError('Logarithmic spacing needs From and To above zero.');
  const unknown = unknownList()[0];
  return { ...sweepJob(built, input, from, to, n, spacing), input, unknown, spacing, unit: prettyUnit(chosenUnit(unknown)), inputUnit: prettyUnit(chosenUnit(input)) };
}

export function runSweep() {
  const status = byId('sweep-status');
  let spec;
  try {
    spec = buildSweepJob();
  } catch (e) {
    if (!(e instanceof FormError)) throw e;
    status.textContent = e.message;
    return null;
  }
  const id = ++sweeper.id;
  sweeper.busy = true;
  byId('sweep-run').disabled = true;
  byId('sweep-cancel').disabled = false;
  byId('sweep-csv').disabled = true;
  const bar = byId('sweep-progress');
  bar.hidden = false;
  bar.value = 0;
  status.textContent = 'Starting…';
  const w = sweeper.worker;
  return new Promise((resolve) => {
    const onMsg = (ev) => {
      const m = ev.data;
      if (m.id !== id) return;
      if (m.type === 'progress') {
        bar.value = m.done / m.total;
        status.textContent = `${m.done} of ${m.total} points`;
        return;
      }
      w.removeEventListener('message', onMsg);
      endSweepUi();
      if (m.type === 'result') {
        probe.sweeps++;
        probe.lastSweepMs = m.ms;
        app.sweepResult = { ...spec, result: m.result, page: 0 };
        showSweep(app.sweepResult);
        const failed = m.result.converged.filter((c) => !c).length;
        status.textContent = `${m.result.input.length} points in ${m.ms.toFixed(0)} ms, ${m.result.totalEvaluations} evaluations${failed ? `; ${failed} did not converge (marked)` : ''}.`;
        byId('sweep-csv').disabled = false;
      } else if (m.trapped) {
        sweeper.failures = 0;
        replaceWorker(`the background solver stopped with an internal error (${m.message})`);
      } else {
        status.textContent = `The sweep could not run: ${m.message}`;
      }
      resolve(m);
    };
    w.addEventListener('message', onMsg);
    sweeper.ready.then(() => w.postMessage({ type: 'sweep', id, job: spec.job }), (e) => {
      w.removeEventListener('message', onMsg);
      replaceWorker(`the background solver could not start (${e.message})`);
      resolve(null);
    });
  });
}

/** Makes the worker trap on purpose (a real wasm trap in a tiny module) and handles it as
 *  any trap: the worker is replaced and the page says so. Used by the end-to-end tests. */
probe.drillWorkerTrap = () => {
  const id = ++sweeper.id;
  const w = sweeper.worker;
  return new Promise((resolve) => {
    const onMsg = (ev) => {
      if (ev.data.id !== id) return;
      w.removeEventListener('message', onMsg);
      sweeper.failures = 0;
      if (ev.data.trapped) replaceWorker(`the background solver stopped with an internal error (${ev.data.message})`);
      resolve(ev.data.trapped);
    };
    w.addEventListener('message', onMsg);
    w.postMessage({ type: 'trap-drill', id });
  });
};

/** For the benchmark: the current sweep set-up with n points, run on the page thread. */
probe.timeDirectSweep = async (n) => {
  const saved = app.S.sweep.n;
  app.S.sweep.n = String(n);
  try {
    const spec = buildSweepJob();
    const t0 = performance.now();
    await runSweepJob(spec.job);
    return performance.now() - t0;
  } finally {
    app.S.sweep.n = saved;
  }
};

export function cancelSweep() {
  if (!sweeper.busy) return;
  sweeper.worker.terminate();
  endSweepUi();
  startWorker();
  byId('sweep-status').textContent = 'Sweep cancelled.';
}

export function clearSweep() {
  byId('sweep-plot').textContent = '';
  byId('sweep-table-box').hidden = true;
}

function showSweep(sw) {
  const { result, input, unknown, unit, inputUnit } = sw;
  const ok = [];
  const bad = [];
  result.input.forEach((x, i) => (result.converged[i] ? ok : bad).push([x, result.root[i]]));
  const xLabel = `${input}${inputUnit ? ` (${inputUnit})` : ''}`;
  const yLabel = `${unknown}${unit ? ` (${unit})` : ''}`;
  // A logarithmic axis exactly when the points are spaced logarithmically.
  clear(byId('sweep-plot')).append(
    plot({ logX: sw.spacing === 'log', title: `${unknown} against ${input}`, xLabel, yLabel, layers: [{ kind: 'line', cls: 'curve', data: ok }, { kind: 'points', cls: 'failed', data: bad.filter((p) => Number.isFinite(p[1])) }] }),
  );
  byId('sweep-table-box').hidden = false;
  const head = clear(byId('sweep-table').tHead);
  head.append(h('tr', null, [xLabel, yLabel, 'evaluations', 'status'].map((c) => h('th', { scope: 'col' }, c))));
  showSweepPage(0);
}

export function showSweepPage(page) {
  const sw = app.sweepResult;
  if (!sw) return;
  const r = sw.result;
  const total = r.input.length;
  const pages = Math.ceil(total / PAGE_ROWS);
  sw.page = Math.max(0, Math.min(pages - 1, page));
  const first = sw.page * PAGE_ROWS;
  const last = Math.min(total, first + PAGE_ROWS);
  const frag = document.createDocumentFragment();
  for (let i = first; i < last; i++) {
    frag.append(h('tr', null, h('td', { title: full(r.input[i]) }, fmt(r.input[i], 6)), h('td', { title: full(r.root[i]) }, fmt(r.root[i], 6)), h('td', null, String(r.evaluations[i])), h('td', { class: 'kind' }, r.converged[i] ? 'converged' : 'no root found')));
  }
  clear(byId('sweep-table').tBodies[0]).append(frag);
  byId('sweep-page-text').textContent = `Rows ${first + 1}–${last} of ${total}`;
  byId('sweep-prev').disabled = sw.page === 0;
  byId('sweep-next').disabled = sw.page >= pages - 1;
  byId('sweep-pager').hidden = pages <= 1;
}

export function sweepCsv() {
  const sw = app.sweepResult;
  if (!sw) return;
  const q = (s) => `"${String(s).replace(/"/g, '""')}"`;
  const lines = [[`${sw.input}${sw.inputUnit ? ` [${sw.inputUnit}]` : ''}`, `${sw.unknown}${sw.unit ? ` [${sw.unit}]` : ''}`, 'evaluations', 'converged', 'status'].map(q).join(',')];
  const r = sw.result;
  for (let i = 0; i < r.input.length; i++) lines.push([full(r.input[i]), full(r.root[i]), r.evaluations[i], r.converged[i], q(r.status[i])].join(','));
  download(`tacit-sweep-${sw.unknown}-vs-${sw.input}.csv`, `${lines.join('\r\n')}\r\n`, 'text/csv');
}
