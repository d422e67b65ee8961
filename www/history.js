// How a solve was reached: every evaluation in a table, |residual| against the evaluation
// number, and the residual over the visited range with the iterates and secant lines. For
// a system, every step with each unknown and the norm of the residuals.

import { h, clear, byId } from './dom.js';
import { fmt, full } from './format.js';
import { plot, legend } from './plot.js';

/** The residual is the left side minus the right side of the equation. */
export const RESIDUAL = 'residual (left − right)';

const KIND_WORDS = {
  initial: 'starting point',
  secant: 'secant',
  'inverse-quadratic': 'inverse quadratic',
  'inverse-cubic': 'inverse cubic',
  bisection: 'bisection',
  'false-position': 'false position',
  'bracket-search': 'bracket search',
  backtrack: 'back-off',
  scan: 'scan',
  probe: 'probe',
  check: 'check of convergence',
};
export const kindWords = (k) => KIND_WORDS[k] ?? String(k);

function head(cells) {
  const tr = h('tr', null, cells.map((c) => h('th', { scope: 'col' }, c)));
  clear(byId('history-table').tHead).append(tr);
}

/** history rows [{k, x, fx, step, kind}]; curve: [[x, f]] samples or null; xLabel for the axis. */
export function showHistory(rows, curve, xLabel, residualLabel = RESIDUAL) {
  const card = byId('history');
  if (!rows || rows.length === 0) {
    card.hidden = true;
    return;
  }
  card.hidden = false;
  const rowsCount = rows.length;
  head(['k', xLabel, residualLabel, 'step', 'kind of step']);
  byId('plot-residual-caption').textContent = '|residual| at each evaluation (log scale)';
  const tb = clear(byId('history-table').tBodies[0]);
  // A very long history (a large budget) is shown by its two ends, and plotted thinned.
  const LIMIT = 1000;
  const shown = rows.length > 2 * LIMIT ? [...rows.slice(0, LIMIT), null, ...rows.slice(-LIMIT)] : rows;
  if (rows.length > 2 * LIMIT) rows = rows.filter((_, i) => i % Math.ceil(rows.length / 2000) === 0 || i === rows.length - 1);
  for (const r of shown) {
    if (r === null) {
      tb.append(h('tr', null, h('td', { colspan: '5', class: 'kind' }, `… rows ${LIMIT + 1} to ${rowsCount - LIMIT} are not shown …`)));
      continue;
    }
    tb.append(
      h('tr', null,
        h('td', null, String(r.k)),
        h('td', { title: full(r.x) }, fmt(r.x, 12)),
        h('td', { title: full(r.fx) }, fmt(r.fx, 3)),
        h('td', { title: full(r.step) }, r.step === null || Number.isNaN(r.step) ? '—' : fmt(r.step, 3)),
        h('td', { class: 'kind' }, kindWords(r.kind)),
      ),
    );
  }
  // |residual| against evaluation number, log scale. Exact zeros cannot be drawn on a log
  // axis; they are said in words.
  const pos = rows.filter((r) => Math.abs(r.fx) > 0 && Number.isFinite(r.fx));
  const zeros = rows.filter((r) => r.fx === 0).map((r) => r.k).slice(0, 20);
  const resBox = clear(byId('plot-residual'));
  resBox.append(
    plot({
      title: '|residual| against evaluation number',
      xLabel: 'evaluation k',
      yLabel: '|residual|',
      logY: true,
      xRange: [0.5, rowsCount + 0.5],
      integerX: true,
      layers: [{ kind: 'line', cls: 'trace', data: pos.map((r) => [r.k, Math.abs(r.fx)]) }, { kind: 'points', cls: 'trace', data: pos.map((r) => [r.k, Math.abs(r.fx)]) }],
    }),
  );
  if (zeros.length) resBox.append(h('p', { class: 'hint' }, `The residual was exactly zero at evaluation ${zeros.join(', ')} (not drawn on the log scale).`));

  const fnBox = clear(byId('plot-function'));
  const pts = rows.filter((r) => Number.isFinite(r.x) && Number.isFinite(r.fx));
  const secants = [];
  for (let i = 2; i < rows.length && rows.length === rowsCount; i++) {
    if (rows[i].kind !== 'secant') continue;
    const a = rows[i - 2];
    const b = rows[i - 1];
    if (![a.x, a.fx, b.x, b.fx, rows[i].x].every(Number.isFinite)) continue;
    // The secant through the two previous points, drawn across both and to where it
    // crosses zero (the next iterate).
    if (a.x === b.x) continue;
    const slope = (b.fx - a.fx) / (b.x - a.x);
    const xs = [a.x, b.x, rows[i].x];
    const x0 = Math.min(...xs);
    const x1 = Math.max(...xs);
    secants.push([x0, a.fx + slope * (x0 - a.x), x1, a.fx + slope * (x1 - a.x)]);
  }
  const layers = [];
  if (curve && curve.length > 1) layers.push({ kind: 'line', cls: 'curve', data: curve });
  byId('plot-function-caption').textContent = 'The residual over the visited range, with the evaluated points and the secant lines';
  layers.push({ kind: 'segments', cls: 'secants', data: secants });
  layers.push({ kind: 'points', cls: 'iterates', data: pts.map((r) => [r.x, r.fx]), labels: pts.length <= 14 ? pts.map((r) => String(r.k)) : undefined });
  const ys = (curve || []).map((c) => c[1]).concat(pts.map((r) => r.fx)).filter(Number.isFinite);
  let yRange;
  if (ys.length) {
    // Keep the iterates in view; a wide curve is clipped instead of flattening them.
    const ip = pts.map((r) => r.fx);
    let lo = Math.min(0, ...ip);
    let hi = Math.max(0, ...ip);
    if (hi === lo) hi = lo + 1;
    const pad = (hi - lo) * 0.08;
    yRange = [lo - pad, hi + pad];
  }
  fnBox.append(
    plot({ title: 'residual over the visited range', xLabel, yLabel: 'residual', zeroLine: true, yRange, layers }),
    legend([
      ...(curve && curve.length > 1 ? [{ cls: 'curve', text: 'residual' }] : []),
      { cls: 'iterates', text: 'evaluated points (k)' },
      ...(secants.length ? [{ cls: 'secants', text: 'secant lines' }] : []),
    ]),
  );
}


/** A system's steps: rows [{k, x: [..], residualNorm, kind}] with `names` of the unknowns. */
export function showSystemHistory(rows, names, residualLabel) {
  const card = byId('history');
  if (!rows?.length) {
    card.hidden = true;
    return;
  }
  card.hidden = false;
  clear(byId('plot-function'));
  byId('plot-function-caption').textContent = '';
  byId('plot-residual-caption').textContent = 'Norm of the residuals at each step (log scale)';
  head(['step k', ...names, residualLabel, 'kind of step']);
  const tb = clear(byId('history-table').tBodies[0]);
  for (const r of rows) {
    tb.append(h('tr', null, h('td', null, String(r.k)), r.x.map((v) => h('td', { title: full(v) }, fmt(v, 10))), h('td', { title: full(r.residualNorm) }, fmt(r.residualNorm, 3)), h('td', { class: 'kind' }, kindWords(r.kind))));
  }
  const resBox = clear(byId('plot-residual'));
  const pts = rows.filter((r) => r.residualNorm > 0).map((r) => [r.k, r.residualNorm]);
  resBox.append(plot({ title: 'norm of the residuals against step', xLabel: 'step k', yLabel: '‖residual‖', logY: true, integerX: true, layers: [{ kind: 'line', cls: 'trace', data: pts }, { kind: 'points', cls: 'trace', data: pts }] }));
}
