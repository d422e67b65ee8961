// The check of own equations as they are typed: it reads the text with the solver's own
// parser, points at an error with a caret, and keeps the chosen unknowns that still exist.

import { h, clear, byId } from './dom.js';
import { app, unknownList } from './ctx.js';
import { checkEquation } from './solver.js';

/** Called with the text that reads correctly (to show it), or '' (to show nothing). */
export function runCustomCheck(showEquation) {
  const text = app.S.equations;
  const out = clear(byId('custom-check'));
  const ta = byId('custom-text');
  if (!text.trim()) {
    app.customCheck = null;
    out.className = 'check';
    out.textContent = 'Type an equation, for example  x^3 - 2*x = 5  or  q = sqrt(2*g*h)*A';
    ta.removeAttribute('aria-invalid');
    showEquation('');
    return;
  }
  const c = checkEquation(text);
  app.customCheck = c;
  if (c.ok) {
    ta.removeAttribute('aria-invalid');
    out.className = 'check ok';
    out.textContent = `Reads correctly: ${c.equations} equation${c.equations === 1 ? '' : 's'}, variables ${c.variables.join(', ') || '(none)'}${c.definitions.length ? `; defined: ${c.definitions.join(', ')}` : ''}.`;
    showEquation(text);
    const vars = c.variables;
    const keep = unknownList().filter((u) => vars.includes(u));
    // With nothing chosen yet, the last variables, one per equation.
    if (keep.length === 0 && vars.length) app.S.unknown = vars.slice(-Math.max(1, c.equations)).join(',');
    else app.S.unknown = keep.slice(0, Math.max(1, c.equations)).join(',');
  } else {
    ta.setAttribute('aria-invalid', 'true');
    out.className = 'check';
    out.append(h('p', { class: 'error-text' }, c.message));
    if (c.caret) out.append(h('pre', { class: 'caret', 'aria-label': 'Where the problem is' }, c.caret));
    else if (c.position !== null && c.position !== undefined) out.append(h('pre', { class: 'caret' }, caretFor(text, c.position)));
  }
}

function caretFor(text, pos) {
  const chars = [...text];
  let start = pos;
  while (start > 0 && chars[start - 1] !== '\n') start--;
  let end = pos;
  while (end < chars.length && chars[end] !== '\n') end++;
  return `${chars.slice(start, end).join('')}\n${' '.repeat(pos - start)}^`;
}
