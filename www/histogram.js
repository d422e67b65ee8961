// The histogram of the Monte Carlo trials as an SVG figure: the core's counts in equal
// bins from lo to hi, drawn as bars, with the coverage interval marked. Only placing.

import { h } from './dom.js';
import { fmt } from './format.js';
import { ticks } from './plot.js';

const SVG = 'http://www.w3.org/2000/svg';
const W = 560;
const H = 220;
const PAD = { l: 16, r: 16, t: 12, b: 40 };

function s(tag, attrs, text) {
  const el = document.createElementNS(SVG, tag);
  for (const [k, v] of Object.entries(attrs)) el.setAttribute(k, String(v));
  if (text !== undefined) el.textContent = text;
  return el;
}

/** hist = { lo, hi, counts, below, above }; opts = { symbol, unit, interval, value, trials }. */
export function histogramSvg(hist, opts) {
  const { lo, hi, counts } = hist;
  const unit = opts.unit ? ` ${opts.unit}` : '';
  const top = Math.max(1, ...counts);
  const pw = W - PAD.l - PAD.r;
  const ph = H - PAD.t - PAD.b;
  const xOf = (x) => PAD.l + ((x - lo) / (hi - lo)) * pw;
  const svg = s('svg', { viewBox: `0 0 ${W} ${H}`, class: 'plot histogram', role: 'img', 'aria-label': `Histogram of ${opts.trials} Monte Carlo values of ${opts.symbol}, from ${fmt(lo, 4)} to ${fmt(hi, 4)}${unit}` });
  const bw = pw / counts.length;
  counts.forEach((c, i) => {
    const bh = (c / top) * ph;
    svg.append(s('rect', { class: 'bin', x: (PAD.l + i * bw).toFixed(2), y: (PAD.t + ph - bh).toFixed(2), width: (bw - 1).toFixed(2), height: bh.toFixed(2) }));
  });
  svg.append(s('line', { class: 'axis', x1: PAD.l, x2: W - PAD.r, y1: PAD.t + ph, y2: PAD.t + ph }));
  for (const t of hi > lo ? ticks(lo, hi, 5) : []) {
    const x = xOf(t).toFixed(1);
    svg.append(s('line', { class: 'axis', x1: x, x2: x, y1: PAD.t + ph, y2: PAD.t + ph + 5 }));
    svg.append(s('text', { x, y: PAD.t + ph + 18, 'text-anchor': 'middle' }, fmt(Number(t.toPrecision(4)), 4)));
  }
  svg.append(s('text', { x: W / 2, y: H - 4, 'text-anchor': 'middle' }, `${opts.symbol}${unit ? ` (${opts.unit})` : ''}`));
  const mark = (x, cls) => {
    if (!(x >= lo && x <= hi)) return;
    svg.append(s('line', { class: cls, x1: xOf(x).toFixed(1), x2: xOf(x).toFixed(1), y1: PAD.t, y2: PAD.t + ph }));
  };
  mark(opts.interval[0], 'interval');
  mark(opts.interval[1], 'interval');
  mark(opts.value, 'value');
  const outside = hist.below + hist.above;
  return h('figure', { class: 'histogram-fig' }, svg,
    h('figcaption', null,
      `Monte Carlo values of ${opts.symbol}: ${opts.trials} trials in ${counts.length} equal bins from ${fmt(lo, 4)} to ${fmt(hi, 4)}${unit}`,
      outside ? ` (${hist.below} below and ${hist.above} above that range, not drawn)` : '',
      '. Dashed lines: the 95 % coverage interval; solid line: the answer.'));
}
