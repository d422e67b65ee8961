// Shows a solve: the answer, the status in plain words, the counts, the history table,
// the two plots and the sensitivities.

import { h, clear, byId } from './dom.js';
import { fmt, full } from './format.js';
import { plot, legend } from './plot.js';
import { symbolMathML } from './mathml.js';

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

function fact(term, value, title) {
  return h('div', null, h('dt', null, term), h('dd', title ? { title } : null, value));
}

/**
 * r: the result of a Problem's solve, or of a stepper.
 * view: { answers: [{ symbol, value, unit }], settings: [[term, text]], notes, caution }
 */
export function showResult(r, view) {
  const body = clear(byId('result-body'));
  byId('result').hidden = false;
  for (const a of view.answers) {
    body.append(
      h('p', { class: 'answer' },
        h('span', { class: 'what' }, symbolMathML(a.symbol), ' ='),
        h('output', { class: 'big-number', 'data-testid': `answer-${a.symbol}`, 'data-value': full(a.value), title: full(a.value) }, fmt(a.value, 10)),
        h('span', { class: 'unit' }, a.unit && a.unit !== '1' ? a.unit : ''),
      ),
    );
  }
  const ok = r.converged === true;
  body.append(
    h('div', { class: `status ${ok ? 'good' : 'bad'}`, 'data-status': r.status },
      h('strong', null, ok ? 'Converged' : 'Not converged'),
      h('span', null, r.message || r.status),
    ),
  );
  const dl = h('dl', { class: 'facts' });
  dl.append(
    fact('Residual', fmt(r.residual, 4), full(r.residual)),
    fact('Evaluations', String(r.evaluations)),
    fact('Iterations', String(r.iterations)),
    fact('Status code', String(r.status)),
  );
  if (r.bracket) dl.append(fact('Final bracket', `[${fmt(r.bracket[0], 8)}, ${fmt(r.bracket[1], 8)}]`));
  const c = r.certificate;
  if (c) {
    const bound = c.kind === 'exact-zero' ? '' : ` (|f| = ${fmt(c.residual, 3)}, at most ${fmt(c.bound, 3)})`;
    dl.append(fact('Evidence of convergence', `${c.explanation}${bound}`));
  }
  if (r.sensitivityEvaluations) dl.append(fact('Evaluations for sensitivities', String(r.sensitivityEvaluations)));
  for (const [term, text] of view.settings) dl.append(fact(term, text));
  body.append(dl);
  if (view.outputs?.length) {
    const tb = h('tbody');
    for (const o of view.outputs) {
      tb.append(h('tr', null, h('td', null, symbolMathML(o.symbol)), h('td', null, o.meaning ?? ''), h('td', { class: 'mono', title: full(o.value) }, fmt(o.value, 8)), h('td', null, o.unit && o.unit !== '1' ? o.unit : '')));
    }
    body.append(h('div', { class: 'table-wrap' }, h('table', { class: 'numbers outputs' }, h('caption', null, 'Other quantities at the solution'), tb)));
  }
  const defs = r.definitions && !view.outputs?.length ? Object.entries(r.definitions) : [];
  if (defs.length) {
    const tb = h('tbody');
    for (const [name, v] of defs) tb.append(h('tr', null, h('td', null, symbolMathML(name)), h('td', { class: 'mono', title: full(v) }, fmt(v, 8))));
    body.append(h('div', { class: 'table-wrap' }, h('table', { class: 'numbers' }, h('caption', null, 'Intermediate quantities at the solution'), tb)));
  }
  if (view.notes?.length) {
    body.append(h('h3', null, 'Notes on this result'), h('ul', { class: 'notes' }, view.notes.map((n) => h('li', null, n))));
  }
  if (view.caution) body.append(h('p', { class: 'caution', role: 'note' }, view.caution));
}

export function hideResults() {
  for (const id of ['result', 'history', 'sensitivity']) byId(id).hidden = true;
}

/** history rows [{k, x, fx, step, kind}]; curve: [[x, f]] samples or null; xLabel for the axis. */
export function showHistory(rows, curve, xLabel) {
  const card = byId('history');
  if (!rows || rows.length === 0) {
    card.hidden = true;
    return;
  }
  card.hidden = false;
  const rowsCount = rows.length;
  byId('history-x-head').textContent = xLabel;
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
        h('td', { title: full(r.x) }, fmt(r.x, 15)),
        h('td', { title: full(r.fx) }, fmt(r.fx, 6)),
        h('td', { title: full(r.step) }, r.step === null || Number.isNaN(r.step) ? '—' : fmt(r.step, 4)),
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
      yLabel: '|f(x)|',
      logY: true,
      xRange: [0.5, rowsCount + 0.5],
      integerX: true,
      layers: [{ kind: 'line', cls: 'trace', data: pos.map((r) => [r.k, Math.abs(r.fx)]) }, { kind: 'points', cls: 'trace', data: pos.map((r) => [r.k, Math.abs(r.fx)]) }],
    }),
  );
  if (zeros.length) resBox.append(h('p', { class: 'hint' }, `f(x) was exactly zero at evaluation ${zeros.join(', ')} (not drawn on the log scale).`));

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
    plot({ title: 'f over the visited range', xLabel, yLabel: 'f(x)', zeroLine: true, yRange, layers }),
    legend([
      ...(curve && curve.length > 1 ? [{ cls: 'curve', text: 'f(x)' }] : []),
      { cls: 'iterates', text: 'evaluated points (k)' },
      ...(secants.length ? [{ cls: 'secants', text: 'secant lines' }] : []),
    ]),
  );
}

// Set through the CSSOM, which the page's style policy allows (style attributes it does not).
function bar(fraction) {
  const el = h('div', { class: 'sens-bar' });
  el.style.width = `${(fraction * 100).toFixed(1)}%`;
  return el;
}

/** sens: [{unknown, input, derivative, relative}]; meaning(symbol) gives a description. */
export function showSensitivities(sens, meaning) {
  const card = byId('sensitivity');
  const body = clear(byId('sensitivity-body'));
  const rows = (sens || []).filter((s) => Number.isFinite(s.relative));
  if (rows.length === 0) {
    card.hidden = true;
    return;
  }
  card.hidden = false;
  rows.sort((a, b) => Math.abs(b.relative) - Math.abs(a.relative));
  const top = rows[0];
  const maxAbs = Math.abs(top.relative) || 1;
  body.append(
    h('p', null,
      'The input that matters most is ', symbolMathML(top.input), meaning(top.input) ? ` (${meaning(top.input)})` : '',
      `: a 1 % change in it changes `, symbolMathML(top.unknown), ` by about ${fmt(Math.abs(top.relative), 3)} %.`),
  );
  const tb = h('tbody');
  for (const s of rows) {
    tb.append(
      h('tr', null,
        h('td', null, symbolMathML(s.input)),
        h('td', null, meaning(s.input) || ''),
        h('td', { class: 'mono', title: full(s.relative) }, `${s.relative >= 0 ? '+' : ''}${fmt(s.relative, 4)} %`),
        h('td', { class: 'bar-cell' }, bar(Math.abs(s.relative) / maxAbs)),
      ),
    );
  }
  body.append(
    h('div', { class: 'table-wrap' },
      h('table', { class: 'sens' },
        h('caption', null, `Change of ${top.unknown} in percent per 1 % change of each input, at the solution`),
        h('thead', null, h('tr', null, h('th', { scope: 'col' }, 'Input'), h('th', { scope: 'col' }, 'Meaning'), h('th', { scope: 'col' }, '% per %'), h('th', { scope: 'col' }, h('span', { class: 'sr-only' }, 'Relative size')))),
        tb)),
  );
}
