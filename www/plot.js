// Small SVG plots built with createElementNS: axes with tidy ticks, lines, points, segments.

import { fmt } from './format.js';

const SVG = 'http://www.w3.org/2000/svg';
const W = 560;
const H = 300;
const PAD = { l: 64, r: 16, t: 14, b: 44 };

function s(tag, attrs, text) {
  const el = document.createElementNS(SVG, tag);
  for (const [k, v] of Object.entries(attrs || {})) el.setAttribute(k, String(v));
  if (text !== undefined) el.textContent = text;
  return el;
}

/** Tidy tick values covering [lo, hi]. */
export function ticks(lo, hi, count = 5) {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((f) => f * mag).find((st) => raw <= st) ?? 10 * mag;
  const out = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

// Tick labels in the page's one number format (×10ⁿ for very large or small values).
function label(v) {
  return fmt(Number(v.toPrecision(4)), 4);
}

function extent(values) {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (lo === Infinity) return [0, 1];
  if (lo === hi) {
    const d = lo === 0 ? 1 : Math.abs(lo) * 0.1;
    return [lo - d, hi + d];
  }
  const pad = (hi - lo) * 0.05;
  return [lo - pad, hi + pad];
}

/**
 * Draws a plot into a fresh <svg>.
 * spec = { title, xLabel, yLabel, logY, xRange?, yRange?, zeroLine?,
 *          layers: [{ kind: 'line'|'points'|'segments', cls, data, labels? }] }
 * 'line' and 'points' data are [x, y] pairs, 'segments' data are [x1, y1, x2, y2].
 * With logY the y values must be positive; others are dropped.
 */
export function plot(spec) {
  const ty = spec.logY ? (y) => (y > 0 ? Math.log10(y) : NaN) : (y) => y;
  if (spec.logX) {
    // Plot log10(x) on a linear axis, labelled in decades.
    const lx = (x) => (x > 0 ? Math.log10(x) : NaN);
    const layers = spec.layers.map((l) => ({
      ...l,
      data: l.data.map((d) => (l.kind === 'segments' ? [lx(d[0]), d[1], lx(d[2]), d[3]] : [lx(d[0]), d[1]])),
    }));
    return plot({ ...spec, logX: false, decadesX: true, layers, xRange: spec.xRange?.map(lx) });
  }
  const xs = [];
  const ys = [];
  for (const layer of spec.layers) {
    for (const d of layer.data) {
      if (layer.kind === 'segments') {
        if (layer.fitsRange === false) continue;
        xs.push(d[0], d[2]);
        ys.push(ty(d[1]), ty(d[3]));
      } else {
        xs.push(d[0]);
        ys.push(ty(d[1]));
      }
    }
  }
  const [x0, x1] = spec.xRange ?? extent(xs);
  let [y0, y1] = spec.yRange ?? extent(ys);
  if (spec.logY) {
    y0 = Math.floor(y0);
    y1 = Math.ceil(y1);
    if (y1 === y0) y1 = y0 + 1;
  }
  const px = (x) => PAD.l + ((x - x0) / (x1 - x0)) * (W - PAD.l - PAD.r);
  const py = (y) => H - PAD.b - ((y - y0) / (y1 - y0)) * (H - PAD.t - PAD.b);
  const clampY = (y) => Math.max(PAD.t - 4, Math.min(H - PAD.b + 4, y));

  const svg = s('svg', { viewBox: `0 0 ${W} ${H}`, class: 'plot', role: 'img', 'aria-label': spec.title });
  svg.append(s('title', {}, spec.title));
  const frame = s('g', { class: 'axes' });
  frame.append(s('rect', { x: PAD.l, y: PAD.t, width: W - PAD.l - PAD.r, height: H - PAD.t - PAD.b, class: 'frame' }));
  const xt = spec.integerX || spec.decadesX ? ticks(x0, x1, 6).filter((v) => Number.isInteger(v)) : ticks(x0, x1, 6);
  for (const t of xt) {
    const x = px(t);
    frame.append(s('line', { x1: x, x2: x, y1: PAD.t, y2: H - PAD.b, class: 'grid' }));
    const txt = s('text', { x, y: H - PAD.b + 16, class: 'tick', 'text-anchor': 'middle' });
    if (spec.decadesX) {
      txt.append(document.createTextNode('10'));
      txt.append(s('tspan', { dy: -6, class: 'sup' }, String(t).replace('-', '\u2212')));
    } else txt.textContent = label(t);
    frame.append(txt);
  }
  const yt = spec.logY ? ticks(y0, y1, Math.min(6, Math.max(1, y1 - y0))).filter((v) => Number.isInteger(v)) : ticks(y0, y1, 5);
  for (const t of yt) {
    const y = py(t);
    frame.append(s('line', { x1: PAD.l, x2: W - PAD.r, y1: y, y2: y, class: 'grid' }));
    const txt = s('text', { x: PAD.l - 6, y: y + 4, class: 'tick', 'text-anchor': 'end' });
    if (spec.logY) {
      txt.append(document.createTextNode('10'));
      const sup = s('tspan', { dy: -6, class: 'sup' }, String(t).replace('-', '\u2212'));
      txt.append(sup);
    } else txt.textContent = label(t);
    frame.append(txt);
  }
  if (spec.zeroLine && y0 < 0 && y1 > 0) frame.append(s('line', { x1: PAD.l, x2: W - PAD.r, y1: py(0), y2: py(0), class: 'zero' }));
  frame.append(s('text', { x: (PAD.l + W - PAD.r) / 2, y: H - 6, class: 'axis-label', 'text-anchor': 'middle' }, spec.xLabel));
  frame.append(s('text', { x: 14, y: (PAD.t + H - PAD.b) / 2, class: 'axis-label', 'text-anchor': 'middle', transform: `rotate(-90 14 ${(PAD.t + H - PAD.b) / 2})` }, spec.yLabel));
  svg.append(frame);

  const clip = `clip${Math.random().toString(36).slice(2, 8)}`;
  const defs = s('defs');
  const cp = s('clipPath', { id: clip });
  cp.append(s('rect', { x: PAD.l, y: PAD.t, width: W - PAD.l - PAD.r, height: H - PAD.t - PAD.b }));
  defs.append(cp);
  svg.append(defs);
  const body = s('g', { 'clip-path': `url(#${clip})` });
  for (const layer of spec.layers) {
    const g = s('g', { class: layer.cls });
    if (layer.kind === 'line') {
      let d = '';
      let pen = false;
      for (const [x, y] of layer.data) {
        const yy = ty(y);
        if (!Number.isFinite(yy) || !Number.isFinite(x)) { pen = false; continue; }
        d += `${pen ? 'L' : 'M'}${px(x).toFixed(1)},${clampY(py(yy)).toFixed(1)}`;
        pen = true;
      }
      g.append(s('path', { d }));
    } else if (layer.kind === 'points') {
      layer.data.forEach(([x, y], i) => {
        const yy = ty(y);
        if (!Number.isFinite(yy) || !Number.isFinite(x)) return;
        g.append(s('circle', { cx: px(x).toFixed(1), cy: clampY(py(yy)).toFixed(1), r: 3.5 }));
        if (layer.labels) g.append(s('text', { x: (px(x) + 5).toFixed(1), y: (clampY(py(yy)) - 5).toFixed(1), class: 'pt-label' }, layer.labels[i]));
      });
    } else if (layer.kind === 'segments') {
      for (const [xa, ya, xb, yb] of layer.data) {
        const a = ty(ya);
        const b = ty(yb);
        if (![xa, xb, a, b].every(Number.isFinite)) continue;
        g.append(s('line', { x1: px(xa).toFixed(1), y1: py(a).toFixed(1), x2: px(xb).toFixed(1), y2: py(b).toFixed(1) }));
      }
    }
    body.append(g);
  }
  svg.append(body);
  return svg;
}

/** A legend list (HTML) for a plot. items = [{ cls, text }]. */
export function legend(items) {
  const ul = document.createElement('ul');
  ul.className = 'legend';
  for (const it of items) {
    const li = document.createElement('li');
    const sw = document.createElement('span');
    sw.className = `swatch ${it.cls}`;
    sw.setAttribute('aria-hidden', 'true');
    li.append(sw, document.createTextNode(it.text));
    ul.append(li);
  }
  return ul;
}
