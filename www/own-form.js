// "Save as my template": a form for an own equation set (title, short name, description,
// equations, each variable's meaning, unit, value, bounds and guesses, validity notes,
// source), prefilled from the page, and the same form to edit one of My templates. The core
// checks the template; a bad field shows its message beside the form, marked, and every
// typed field stays as typed until Save or Cancel.

import { h, clear, byId } from './dom.js';
import { parseNumber } from './format.js';
import { app, hooks, notify, unknownList, FormError, CAUTION } from './ctx.js';
import { checkEquation, checkOwn } from './solver.js';
import { putOwn } from './own-templates.js';

const VAR_FIELDS = [['meaning', 'Meaning'], ['unit', 'Unit'], ['value', 'Value'], ['lo', 'Lower bound'], ['hi', 'Upper bound'], ['g1', 'First guess'], ['g2', 'Second guess']];
// The core's field names (template.variables[1].bounds) → the form's inputs.
const CORE_FIELD = { name: 'meaning', meaning: 'meaning', unit: 'unit', value: 'value', bounds: 'lo', guesses: 'g1' };
const TEXT_FIELDS = ['title', 'id', 'description', 'equations', 'validity', 'source'];

let draft = null; // { editing: old id or null, vars: {name: {meaning, …}}, names: [] , idTyped }
let timer = 0;

const el = (f) => byId(`own-${f}`);
const varEl = (i, f) => document.getElementById(`own-v${i}-${f}`);
const numText = (x) => (x === null || x === undefined ? '' : String(x));
const slug = (title) => `my.${title.toLowerCase().normalize('NFKD').replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 60) || 'template'}`;

function open(fields, vars, editing) {
  draft = { editing, vars, names: [], idTyped: Boolean(editing) };
  for (const f of TEXT_FIELDS) el(f).value = fields[f] ?? '';
  const validity = fields.validity ?? '';
  el('caution').checked = validity.includes(CAUTION);
  el('validity').value = validity.replace(CAUTION, '').trim();
  byId('own-form-h').textContent = editing ? `Edit my template "${fields.title}"` : 'Save as my template';
  byId('own-error').textContent = '';
  for (const x of byId('own-form').querySelectorAll('[aria-invalid]')) x.removeAttribute('aria-invalid');
  renderVars(fields.unknown);
  const card = byId('own-form-card');
  card.hidden = false;
  card.scrollIntoView({ block: 'start' });
  el('title').focus({ preventScroll: true });
}

/** Opens the form from the own equations on the page, with what the page knows. */
export function startFromPage() {
  const S = app.S;
  const unknowns = unknownList();
  const vars = {};
  for (const [name, e] of Object.entries(S.values)) {
    vars[name] = { meaning: '', unit: e.u ?? '', value: unknowns.includes(name) ? '' : e.v ?? '', lo: '', hi: '', g1: '', g2: '' };
  }
  if (unknowns.length === 1 && S.start.kind !== 'default') {
    vars[unknowns[0]] = { ...(vars[unknowns[0]] ?? { meaning: '', unit: '', value: '', lo: '', hi: '' }), g1: S.start.a, g2: S.start.b };
  }
  // A first `#` comment line reads as a title.
  const title = /^\s*#\s*(.+)/.exec(S.equations)?.[1]?.trim() ?? '';
  open({ title, id: title ? slug(title) : '', equations: S.equations, unknown: unknowns[0] ?? '', description: '', validity: '', source: '' }, vars, null);
}

/** Opens the form to edit one of My templates. */
export function editOwn(t) {
  const vars = {};
  for (const v of t.variables) {
    vars[v.name] = { meaning: v.meaning ?? '', unit: v.unit ?? '', value: numText(v.value), lo: numText(v.bounds?.[0]), hi: numText(v.bounds?.[1]), g1: numText(v.guesses?.[0]), g2: numText(v.guesses?.[1]) };
  }
  open(t, vars, t.id);
}

/** Keeps what is typed in the variable rows (by name, so a row that goes and comes back
 *  keeps its entries). */
function keepTyped() {
  draft.names.forEach((name, i) => {
    const row = (draft.vars[name] ??= {});
    for (const [f] of VAR_FIELDS) row[f] = varEl(i, f)?.value ?? row[f] ?? '';
  });
}

function renderVars(unknown) {
  const box = clear(byId('own-vars'));
  const c = checkEquation(el('equations').value);
  const note = byId('own-eq-check');
  note.textContent = c.ok ? '' : `The equations do not read correctly yet: ${c.message}`;
  if (!c.ok) {
    // Keep the rows as they were until the text reads again.
    draft.names.forEach((name, i) => box.append(varRow(name, i)));
  } else draft.names = c.variables;
  const names = c.ok ? c.variables : draft.names;
  if (c.ok) names.forEach((name, i) => box.append(varRow(name, i)));
  const sel = clear(el('unknown'));
  sel.append(h('option', { value: '' }, 'the first without a value'));
  for (const n of names) sel.append(h('option', { value: n }, n));
  sel.value = names.includes(unknown) ? unknown : '';
}

function varRow(name, i) {
  const row = draft.vars[name] ?? {};
  const grid = h('div', { class: 'own-var-grid' });
  for (const [f, label] of VAR_FIELDS) {
    const input = h('input', { type: 'text', id: `own-v${i}-${f}`, autocomplete: 'off', spellcheck: 'false', value: row[f] ?? '' });
    if (f !== 'meaning' && f !== 'unit') input.setAttribute('inputmode', 'decimal');
    grid.append(h('label', { class: `field small own-${f}`, for: input.id }, label, ' ', input));
  }
  return h('fieldset', { class: 'own-var', 'data-name': name }, h('legend', null, `Variable ${name}`), grid);
}

function mark(x) {
  if (!x) return;
  x.setAttribute('aria-invalid', 'true');
  x.focus();
}

/** The form read into an own template (numbers parsed; the core checks the rest). */
function readForm() {
  keepTyped();
  const num = (text, what, i, f) => {
    const r = parseNumber(text ?? '');
    if (r.error) {
      mark(varEl(i, f));
      throw new FormError(`${what}: ${r.error}`);
    }
    return r.empty ? undefined : r.value;
  };
  const variables = draft.names.map((name, i) => {
    const row = draft.vars[name] ?? {};
    const v = { name, meaning: (row.meaning ?? '').trim() };
    if ((row.unit ?? '').trim()) v.unit = row.unit.trim();
    const value = num(row.value, `Value of ${name}`, i, 'value');
    if (value !== undefined) v.value = value;
    const lo = num(row.lo, `Lower bound of ${name}`, i, 'lo');
    const hi = num(row.hi, `Upper bound of ${name}`, i, 'hi');
    if (lo !== undefined || hi !== undefined) v.bounds = [lo ?? null, hi ?? null];
    const g1 = num(row.g1, `First guess of ${name}`, i, 'g1');
    const g2 = num(row.g2, `Second guess of ${name}`, i, 'g2');
    if ((g1 === undefined) !== (g2 === undefined)) {
      mark(varEl(i, g1 === undefined ? 'g1' : 'g2'));
      throw new FormError(`Guesses of ${name}: give both, or neither`);
    }
    if (g1 !== undefined) v.guesses = [g1, g2];
    return v;
  });
  const notes = el('validity').value.trim();
  const t = {
    id: el('id').value.trim(),
    title: el('title').value.trim(),
    description: el('description').value.trim(),
    equations: el('equations').value,
    variables,
    validity: el('caution').checked ? `${notes}${notes ? '\n' : ''}${CAUTION}` : notes,
    source: el('source').value.trim(),
  };
  if (el('unknown').value) t.unknown = el('unknown').value;
  return t;
}

/** Marks the field the core's message names ("template.variables[1].unit: …"). */
function markCoreField(message) {
  const v = /variables\[(\d+)\]\.(\w+)/.exec(message);
  if (v) return mark(varEl(Number(v[1]), CORE_FIELD[v[2]] ?? 'meaning'));
  const f = /template\.(\w+)/.exec(message)?.[1];
  if (f === 'variables') return mark(el('equations'));
  if (f && document.getElementById(`own-${f}`)) mark(el(f));
}

function save(ev) {
  ev.preventDefault();
  const err = byId('own-error');
  err.textContent = '';
  for (const x of byId('own-form').querySelectorAll('[aria-invalid]')) x.removeAttribute('aria-invalid');
  let t;
  try {
    t = checkOwn(readForm());
  } catch (e) {
    err.textContent = e.message;
    if (!(e instanceof FormError)) markCoreField(e.message);
    return;
  }
  const problem = putOwn(t, draft.editing);
  if (problem) {
    err.textContent = `Short name: ${problem}.`;
    mark(el('id'));
    return;
  }
  const was = draft.editing;
  draft = null;
  byId('own-form-card').hidden = true;
  notify(`${was ? 'Changed' : 'Saved'} "${t.title}" in My templates. It opens from the catalogue like any template, and travels in links.`, 'info');
  if (!was || app.S.template === was || app.S.template === t.id) hooks.pickTemplate?.(t.id);
}

export function wireOwnForm() {
  byId('own-save-start').addEventListener('click', startFromPage);
  byId('own-form').addEventListener('submit', save);
  byId('own-cancel').addEventListener('click', () => {
    draft = null;
    byId('own-form-card').hidden = true;
  });
  el('title').addEventListener('input', () => {
    if (!draft.idTyped) el('id').value = el('title').value.trim() ? slug(el('title').value) : '';
  });
  el('id').addEventListener('input', () => { draft.idTyped = true; });
  el('equations').addEventListener('input', () => {
    clearTimeout(timer);
    timer = setTimeout(() => {
      if (!draft) return;
      keepTyped();
      renderVars(el('unknown').value);
    }, 200);
  });
}
