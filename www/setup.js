// The set-up: the title and equation, the "Solve for" choice, the inputs table with the
// answer line at its foot, where the search starts, and the check of own equations.

import { h, clear, byId } from './dom.js';
import { fmt, prettyUnit } from './format.js';
import { equationToMathML, symbolMathML } from './mathml.js';
import { app, hooks, currentTemplate, currentVariables, unknownList, variableOf, chosenUnit, edited } from './ctx.js';
import { runCustomCheck } from './custom.js';
import { startKind } from './request.js';
import { uncertaintyCell, answerUncertaintyCell, updateAnswerUncertainty } from './uncertainty.js';

export function showEquation(text) {
  const box = clear(byId('equation'));
  const written = byId('equation-text');
  written.textContent = text;
  // The text as written (with its # comments) goes into the printed record of own equations.
  written.hidden = app.S.mode !== 'custom' || !text.trim();
  box.hidden = !text.trim();
  if (box.hidden) return;
  try {
    box.append(...equationToMathML(text));
  } catch {
    box.append(h('pre', null, text));
  }
}

export function renderSetup() {
  const S = app.S;
  const t = currentTemplate();
  byId('setup').hidden = false;
  byId('external').hidden = S.mode !== 'external';
  byId('custom-editor').hidden = S.mode !== 'custom';
  for (const id of ['vars-wrap', 'solve-for-wrap', 'solve', 'sweep']) byId(id).hidden = S.mode === 'external';
  byId('roots').hidden = true;
  byId('start-bracket-label').hidden = S.mode === 'template';
  byId('start-default-label').hidden = S.mode === 'external';
  byId('start').hidden = S.mode === 'external' && Boolean(app.stepper);
  app.nav?.select(S.mode === 'template' ? S.template : null);
  const caution = byId('caution');
  const notes = clear(byId('notes'));
  delete byId('calc-summary').dataset.screen;
  byId('calc-source').textContent = '';
  caution.hidden = true;
  if (S.mode === 'template' && t) {
    byId('calc-field').textContent = t.field;
    byId('calc-title').textContent = t.title;
    byId('calc-summary').textContent = t.summary;
    showEquation(t.equations);
    for (const n of t.notes) notes.append(h('li', null, n));
    byId('calc-source').textContent = t.source ? `Source: ${t.source}` : '';
    caution.hidden = !t.caution;
    caution.textContent = t.caution;
  } else if (S.mode === 'custom') {
    byId('calc-field').textContent = 'Own equations';
    byId('calc-title').textContent = 'Your equations';
    byId('calc-summary').textContent = 'Write an equation or a set in the equation language; the check below points at any error as you type. Values have no units here: use one consistent set.';
    byId('calc-summary').dataset.screen = 'true';
    if (byId('custom-text').value !== S.equations) byId('custom-text').value = S.equations;
    runCustomCheck(showEquation);
  } else if (S.mode === 'external') {
    byId('calc-field').textContent = 'Outside model';
    byId('calc-title').textContent = S.external.label || 'Evaluation by hand';
    byId('calc-summary').textContent = '';
    showEquation('');
    byId('ext-label').value = S.external.label;
  } else {
    byId('calc-title').textContent = 'Choose a calculation';
  }
  renderVarsTable();
  renderStart();
  byId('method').value = S.method;
  for (const k of Object.keys(S.tol)) byId(`tol-${k}`).value = S.tol[k];
  for (const k of Object.keys(S.record)) byId(`record-${k}`).value = S.record[k];
}

function isAllowed(sym) {
  const t = currentTemplate();
  return app.S.mode !== 'template' || !t?.allowedUnknowns || t.allowedUnknowns.includes(sym);
}

/** "Solve for": one button per quantity, pressed for the unknown (for a set of several
 *  equations, one pressed per equation). The chosen quantity leaves the inputs and becomes
 *  the answer line at the foot of the table. */
function renderSolveFor(vars, many) {
  const box = clear(byId('solve-for'));
  const unknowns = unknownList();
  for (const v of vars) {
    const pressed = unknowns.includes(v.symbol);
    const allowed = isAllowed(v.symbol);
    const b = h('button', {
      type: 'button',
      class: 'chip',
      id: `find-${v.symbol}`,
      'aria-pressed': pressed ? 'true' : 'false',
      'aria-label': `${v.symbol}${v.meaning ? `, ${v.meaning}` : ''}`,
      title: v.meaning || v.symbol,
      disabled: !allowed,
      'aria-describedby': allowed ? null : 'unknowns-reason',
    }, symbolMathML(v.symbol));
    b.addEventListener('click', () => chooseUnknown(v.symbol, many));
    box.append(b);
  }
  const c = app.customCheck;
  byId('solve-for-hint').textContent = many ? `${c.equations} equations: choose ${c.equations} quantities to find (${unknowns.length} chosen).` : '';
}

export function chooseUnknown(sym, many) {
  const S = app.S;
  if (many) {
    const set = new Set(unknownList());
    if (set.has(sym)) set.delete(sym);
    else set.add(sym);
    S.unknown = currentVariables().map((x) => x.symbol).filter((s) => set.has(s)).join(',');
  } else {
    if (S.unknown === sym) return;
    S.unknown = sym;
    S.resultUnit = '';
    S.resultUnit = chosenUnit(sym);
  }
  renderVarsTable();
  renderStart();
  hooks.renderSweepInputs?.();
  edited();
  byId(`find-${sym}`).focus();
}

function unitPicker(v, onChange) {
  const sel = h('select', { id: `unit-${v.symbol}`, 'aria-label': `Unit of ${v.symbol}` });
  for (const u of v.units) sel.append(h('option', { value: u }, u === '1' ? 'ratio (no unit)' : prettyUnit(u)));
  sel.value = chosenUnit(v.symbol);
  sel.addEventListener('change', () => onChange(sel.value));
  return sel;
}

export function renderVarsTable() {
  const table = byId('vars');
  const tbody = clear(table.tBodies[0]);
  const tfoot = clear(table.tFoot);
  const reason = byId('unknowns-reason');
  const tt = currentTemplate();
  reason.textContent = tt?.allowedUnknowns && tt.allowedUnknowns.length < tt.variables.length ? tt.unknownsReason : '';
  reason.hidden = !reason.textContent;
  const listBox = byId('list-values');
  listBox.hidden = !tt?.list;
  if (tt?.list) {
    byId('list-label').textContent = `${tt.list.symbol}: ${tt.list.meaning}${tt.list.unit ? ` (${prettyUnit(tt.list.unit)})` : ''}, separated by commas or spaces`;
    const kept = app.S.values[tt.list.symbol]?.v;
    byId('list-text').value = kept ?? (Array.isArray(tt.list.values) ? tt.list.values.join(', ') : '');
  }
  const vars = currentVariables();
  const S = app.S;
  const custom = S.mode === 'custom';
  const many = custom && (app.customCheck?.equations ?? 1) > 1;
  renderSolveFor(vars, many);
  const unknowns = unknownList();
  for (const v of vars) {
    const sym = v.symbol;
    const entry = S.values[sym] ?? { v: '', u: '' };
    const noUnit = h('span', { class: 'hint' }, custom ? 'your units' : v.unit === '1' ? 'no unit' : prettyUnit(v.unit) || '—');
    const pick = v.units.length > 1 || (v.units.length === 1 && v.units[0] !== v.unit);
    if (unknowns.includes(sym)) {
      const unitCell = pick
        ? unitPicker(v, (u) => {
          S.values[sym] = { v: S.values[sym]?.v ?? '', u };
          S.resultUnit = u;
          renderStart();
          edited();
        })
        : noUnit;
      tfoot.append(
        h('tr', { class: 'answer-row', 'data-symbol': sym },
          h('th', { scope: 'row', class: 'sym' }, h('span', { class: 'tag' }, 'Answer'), ' ', symbolMathML(sym)),
          h('td', { class: 'meaning' }, v.meaning),
          h('td', { class: 'val' }, h('output', { id: `answer-line-${sym}`, class: 'answer-line', 'aria-live': 'polite' })),
          h('td', { class: 'unit' }, unitCell),
          answerUncertaintyCell(sym),
        ),
      );
      continue;
    }
    const input = h('input', { type: 'text', id: `val-${sym}`, inputmode: 'decimal', autocomplete: 'off', value: entry.v, 'aria-label': `Value of ${sym}${v.meaning ? `, ${v.meaning}` : ''}` });
    input.addEventListener('input', () => {
      S.values[sym] = { v: input.value, u: S.values[sym]?.u ?? '' };
      input.removeAttribute('aria-invalid');
      edited();
    });
    const unitCell = pick
      ? unitPicker(v, (u) => {
        S.values[sym] = { v: S.values[sym]?.v ?? input.value, u };
        edited();
      })
      : noUnit;
    tbody.append(
      h('tr', { 'data-symbol': sym },
        h('th', { scope: 'row', class: 'sym' }, symbolMathML(sym)),
        h('td', { class: 'meaning' }, v.meaning),
        h('td', { class: 'val' }, input, h('span', { class: 'cell-error', id: `err-${sym}` })),
        h('td', { class: 'unit' }, unitCell),
        uncertaintyCell(sym),
      ),
    );
  }
  updateAnswerLines();
}

/** The answer line(s) at the foot of the inputs table: the answer of the last solve while
 *  it holds for the inputs shown, and otherwise words saying why there is none. */
export function updateAnswerLines() {
  const last = app.lastResult;
  for (const sym of unknownList()) {
    const out = document.getElementById(`answer-line-${sym}`);
    if (!out) continue;
    const row = out.closest('tr');
    let text = 'not solved yet: press Solve';
    let state = 'none';
    if (app.S.unsolved) {
      text = 'not solved for these inputs';
      state = 'stale';
    } else if (last) {
      const r = last.r;
      const value = last.built.kind === 'template' ? r.value : r.unknowns?.[sym];
      if (r.converged && Number.isFinite(value)) {
        text = fmt(value, 6);
        state = 'solved';
        out.setAttribute('data-value', String(value));
      } else {
        text = 'no root found';
        state = 'failed';
      }
    }
    if (state !== 'solved') out.removeAttribute('data-value');
    out.textContent = text;
    row.dataset.state = state;
  }
  updateAnswerUncertainty();
}

export function renderStart() {
  const S = app.S;
  const kind = startKind();
  for (const r of document.querySelectorAll('input[name=start-kind]')) r.checked = r.value === kind;
  byId('start-a').value = S.start.a;
  byId('start-b').value = S.start.b;
  const usesPoints = kind !== 'default';
  byId('start-a').disabled = !usesPoints;
  byId('start-b').disabled = !usesPoints;
  byId('start-a-label').textContent = kind === 'bracket' ? 'Lower end' : 'First guess';
  byId('start-b-label').textContent = kind === 'bracket' ? 'Upper end' : 'Second guess';
  const sym = unknownList()[0] ?? 'x';
  // A set's unknowns all start from the solver's defaults: no points to give here.
  const system = unknownList().length > 1;
  byId('start').classList.toggle('system', system);
  const unit = prettyUnit(chosenUnit(sym));
  const inUnit = unit ? ` ${unit}` : '';
  let hint;
  if (S.mode === 'external') hint = 'Give two starting points (two guesses, or the ends of a bracket where f changes sign).';
  else if (kind === 'default' && S.mode === 'template') {
    const v = variableOf(sym);
    const starter = v?.raw?.starter;
    // The template's guesses are in the variable's own unit; say which.
    const g = Array.isArray(v?.guesses) && v.guesses.length === 2 ? v.guesses : null;
    const gu = prettyUnit(v?.unit);
    const fallback = g ? `the template's guesses for ${sym}, ${fmt(Number(g[0]))} and ${fmt(Number(g[1]))}${gu ? ` ${gu}` : ''}` : `the template's guesses for ${sym}`;
    // An own template's guesses go with the answer only in the template's unit.
    if (v?.raw?.name !== undefined && !(g && chosenUnit(sym) === v.unit)) hint = `The solver starts ${sym} from its own default points; give two guesses${inUnit ? ` in${inUnit}` : ''} if it finds no root.`;
    else hint = starter
      ? `The solver starts from ${starter.label}, an explicit approximation of ${sym} (${starter.source}), and from a point just beside it; where that is undefined it starts from ${fallback}.`
      : `The solver starts from ${fallback}.`;
  } else if (system) hint = 'The solver starts every unknown of the set from 1 (then 1.1), in the units of your equations.';
  else if (kind === 'default') hint = `The solver starts ${sym} from 1 and 1.1, in the units of your equations.`;
  else if (kind === 'bracket') hint = `Two values of ${sym} where f has opposite signs.`;
  else hint = `Two different values of ${sym}${inUnit ? `, in${inUnit}` : ''}; no sign change is needed.`;
  byId('start-hint').textContent = hint;
}
