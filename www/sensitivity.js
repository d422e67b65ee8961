// Which input matters most: the percent change of each unknown per percent change of each
// input, at the solution. A set with several unknowns gets a column naming the unknown.

import { h, clear, byId } from './dom.js';
import { fmt, full } from './format.js';
import { symbolMathML } from './mathml.js';

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
  const unknowns = [...new Set(rows.map((s) => s.unknown))];
  const several = unknowns.length > 1;
  for (const u of unknowns) {
    const mine = rows.filter((s) => s.unknown === u).sort((a, b) => Math.abs(b.relative) - Math.abs(a.relative));
    const top = mine[0];
    body.append(
      h('p', null,
        several ? [symbolMathML(u), ': the input that matters most is '] : 'The input that matters most is ', symbolMathML(top.input), meaning(top.input) ? ` (${meaning(top.input)})` : '',
        ': a 1 % change in it changes ', symbolMathML(u), ` by about ${fmt(Math.abs(top.relative), 2)} %.`),
    );
  }
  const maxAbs = Math.max(...rows.map((s) => Math.abs(s.relative))) || 1;
  const tb = h('tbody');
  const ordered = unknowns.flatMap((u) => rows.filter((s) => s.unknown === u).sort((a, b) => Math.abs(b.relative) - Math.abs(a.relative)));
  for (const s of ordered) {
    tb.append(
      h('tr', null,
        several ? h('td', null, symbolMathML(s.unknown)) : null,
        h('td', null, symbolMathML(s.input)),
        h('td', null, meaning(s.input) || ''),
        h('td', { class: 'mono', title: full(s.relative) }, `${s.relative >= 0 ? '+' : ''}${fmt(s.relative, 3)} %`),
        h('td', { class: 'bar-cell' }, bar(Math.abs(s.relative) / maxAbs)),
      ),
    );
  }
  const caption = several
    ? `Change of each unknown in percent per 1 % change of each input, at the solution`
    : `Change of ${unknowns[0]} in percent per 1 % change of each input, at the solution`;
  body.append(
    h('div', { class: 'table-wrap', tabindex: '0', role: 'region', 'aria-label': 'Sensitivities (scrolls sideways on a narrow screen)' },
      h('table', { class: 'sens' },
        h('caption', null, caption),
        h('thead', null, h('tr', null,
          several ? h('th', { scope: 'col' }, 'Unknown') : null,
          h('th', { scope: 'col' }, 'Input'), h('th', { scope: 'col' }, 'Meaning'), h('th', { scope: 'col' }, '% per %'),
          h('th', { scope: 'col' }, h('span', { class: 'sr-only' }, 'Relative size')))),
        tb)),
  );
}
