// The offline page: wires the catalogue, the set-up form, solving, results, roots in a
// range, the sweep worker, bookmarks (the URL fragment), the saved list and the
// evaluation-by-hand mode. Plain DOM; text from users, links and storage goes in as text.

import * as tacit from '../dist/pkg/tacit.js';
import { h, clear, byId, download } from './dom.js';
import { fmt, full, parseNumber, prettyUnit } from './format.js';
import { equationToMathML, symbolMathML } from './mathml.js';
import { normalizeTemplate, buildCatalogueNav } from './catalogue.js';
import { defaultState, decodeFragment, encodeFragment, validateState, compactState } from './state.js';
import { loadSaved, writeSaved, exportText, importText, newId, loadExternal, writeExternal } from './storage.js';
import { showResult, showHistory, showSensitivities, hideResults, kindWords } from './results.js';
import { plot } from './plot.js';
import { wasmBytes, wasmModule } from './wasm-bytes.js';
import { runSweepJob } from './sweep-run.js';

const CAUTION = 'Results support, and do not replace, checks by a licensed professional under local codes.';

const app = {
  S: defaultState(),
  templates: [],
  byId: new Map(),
  units: new Map(),
  nav: null,
  wasm: null,
  saved: [],
  lastResult: null,
  lastWritten: '',
  stepper: null,
  sweepResult: null,
};
// For the end-to-end tests and the benchmark: read-only facts about the page's progress.
const probe = { marks: {}, ready: false, solves: 0, firstSolveMs: null, lastSweepMs: null, sweeps: 0, workerStarts: 0 };
globalThis.tacitPage = probe;

// ---- notices --------------------------------------------------------------------------

function notify(text, kind = 'warn') {
  const box = byId('notices');
  const close = h('button', { type: 'button', class: 'quiet', 'aria-label': 'Dismiss this message' }, 'Dismiss');
  const n = h('div', { class: `notice ${kind}`, 'data-kind': kind }, h('p', null, text), close);
  close.addEventListener('click', () => n.remove());
  box.append(n);
  return n;
}

// ---- current calculation ----------------------------------------------------------------

function currentTemplate() {
  return app.S.mode === 'template' ? app.byId.get(app.S.template) ?? null : null;
}

/** The variables of the current calculation: [{ symbol, meaning, units, unit }]. */
function currentVariables() {
  if (app.S.mode === 'template') return currentTemplate()?.variables ?? [];
  if (app.S.mode === 'custom') return (app.customCheck?.ok ? app.customCheck.variables : []).map((s) => ({ symbol: s, meaning: '', units: [], unit: '' }));
  return [];
}

const unknownList = () => app.S.unknown.split(',').filter(Boolean);
const meaningOf = (sym) => currentVariables().find((v) => v.symbol === sym)?.meaning ?? '';

function writeUrl() {
  const frag = encodeFragment(app.S);
  app.lastWritten = frag;
  if (location.hash !== frag) history.replaceState(null, '', frag);
}

// ---- set-up form --------------------------------------------------------------------

function showEquation(text) {
  const box = clear(byId('equation'));
  if (!text.trim()) {
    box.hidden = true;
    return;
  }
  box.hidden = false;
  try {
    box.append(...equationToMathML(text));
  } catch {
    box.append(h('pre', null, text));
  }
}

function renderSetup() {
  const S = app.S;
  const t = currentTemplate();
  byId('setup').hidden = false;
  byId('external').hidden = S.mode !== 'external';
  byId('custom-editor').hidden = S.mode !== 'custom';
  byId('vars-wrap').hidden = S.mode === 'external';
  byId('solve').hidden = S.mode === 'external';
  byId('sweep').hidden = S.mode === 'external';
  byId('roots').hidden = true;
  byId('start-bracket-label').hidden = S.mode === 'template';
  byId('start-default-label').hidden = S.mode === 'external';
  byId('start').hidden = S.mode === 'external' && Boolean(app.stepper);
  app.nav?.select(S.mode === 'template' ? S.template : null);
  const caution = byId('caution');
  const notes = clear(byId('notes'));
  byId('calc-source').textContent = '';
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
    if (byId('custom-text').value !== S.equations) byId('custom-text').value = S.equations;
    runCustomCheck();
    caution.hidden = true;
  } else if (S.mode === 'external') {
    byId('calc-field').textContent = 'Outside model';
    byId('calc-title').textContent = S.external.label || 'Evaluation by hand';
    byId('calc-summary').textContent = '';
    showEquation('');
    caution.hidden = true;
    byId('ext-label').value = S.external.label;
  } else {
    byId('calc-title').textContent = 'Choose a calculation';
  }
  renderVarsTable();
  renderStart();
  byId('method').value = S.method;
  for (const k of Object.keys(S.tol)) byId(`tol-${k}`).value = S.tol[k];
  renderSweepInputs();
  if (S.mode === 'external') renderExternal();
}

function renderVarsTable() {
  const tbody = clear(byId('vars').tBodies[0]);
  const reason = byId('unknowns-reason');
  const tt = currentTemplate();
  reason.textContent = tt?.allowedUnknowns && tt.allowedUnknowns.length < tt.variables.length ? tt.unknownsReason : '';
  reason.hidden = !reason.textContent;
  const listBox = byId('list-values');
  listBox.hidden = !tt?.list;
  if (tt?.list) {
    byId('list-label').textContent = `${tt.list.symbol}: ${tt.list.meaning}${tt.list.unit ? ` (${tt.list.unit})` : ''}, separated by commas or spaces`;
    const kept = app.S.values[tt.list.symbol]?.v;
    byId('list-text').value = kept ?? (Array.isArray(tt.list.values) ? tt.list.values.join(', ') : '');
  }
  const vars = currentVariables();
  const S = app.S;
  const custom = S.mode === 'custom';
  const many = custom && (app.customCheck?.equations ?? 1) > 1;
  const unknowns = unknownList();
  for (const v of vars) {
    const isUnknown = unknowns.includes(v.symbol);
    const entry = S.values[v.symbol] ?? { v: '', u: '' };
    const input = h('input', { type: 'text', id: `val-${v.symbol}`, inputmode: 'decimal', autocomplete: 'off', value: entry.v, 'aria-label': `Value of ${v.symbol}${v.meaning ? `, ${v.meaning}` : ''}` });
    input.addEventListener('input', () => {
      S.values[v.symbol] = { v: input.value, u: S.values[v.symbol]?.u ?? '' };
      input.removeAttribute('aria-invalid');
      writeUrl();
    });
    let unitCell;
    if (v.units.length) {
      const sel = h('select', { id: `unit-${v.symbol}`, 'aria-label': `Unit of ${v.symbol}` });
      for (const u of v.units) sel.append(h('option', { value: u }, u === '1' ? '1 (ratio)' : prettyUnit(u)));
      sel.value = entry.u && v.units.includes(entry.u) ? entry.u : v.unit;
      sel.addEventListener('change', () => {
        S.values[v.symbol] = { v: S.values[v.symbol]?.v ?? input.value, u: sel.value };
        if (S.unknown === v.symbol) S.resultUnit = sel.value;
        writeUrl();
      });
      unitCell = sel;
    } else unitCell = h('span', { class: 'hint' }, custom ? '—' : v.unit || '—');
    const pickEl = h('input', {
      type: many ? 'checkbox' : 'radio',
      name: 'unknown',
      value: v.symbol,
      id: `find-${v.symbol}`,
      checked: isUnknown,
      'aria-label': `Find ${v.symbol}`,
    });
    pickEl.addEventListener('change', () => {
      if (many) {
        const set = new Set(unknownList());
        if (pickEl.checked) set.add(v.symbol);
        else set.delete(v.symbol);
        S.unknown = vars.map((x) => x.symbol).filter((s) => set.has(s)).join(',');
      } else {
        S.unknown = v.symbol;
        const sel = document.getElementById(`unit-${v.symbol}`);
        S.resultUnit = sel ? sel.value : '';
      }
      renderVarsTable();
      renderSweepInputs();
      writeUrl();
    });
    const allowed = S.mode !== 'template' || !currentTemplate()?.allowedUnknowns || currentTemplate().allowedUnknowns.includes(v.symbol);
    if (!allowed) {
      pickEl.disabled = true;
      pickEl.setAttribute('aria-describedby', 'unknowns-reason');
    }
    const findCell = h('td', { class: 'find', 'data-print': isUnknown ? 'solved for' : '' }, pickEl);
    tbody.append(
      h('tr', { class: isUnknown ? 'is-unknown' : '', 'data-symbol': v.symbol },
        h('td', { class: 'sym' }, symbolMathML(v.symbol)),
        h('td', null, v.meaning),
        h('td', null, input, h('span', { class: 'cell-error', id: `err-${v.symbol}` })),
        h('td', null, unitCell),
        findCell,
      ),
    );
    input.disabled = isUnknown;
    input.readOnly = false;
    if (isUnknown) input.setAttribute('aria-description', 'This is the unknown; its value is found by the solver');
  }
}

function renderStart() {
  const S = app.S;
  const kind = S.mode === 'template' && S.start.kind === 'bracket' ? 'guesses' : S.start.kind;
  for (const r of document.querySelectorAll('input[name=start-kind]')) r.checked = r.value === kind;
  byId('start-a').value = S.start.a;
  byId('start-b').value = S.start.b;
  const usesPoints = kind !== 'default';
  byId('start-a').disabled = !usesPoints;
  byId('start-b').disabled = !usesPoints;
  byId('start-a-label').textContent = kind === 'bracket' ? 'Lower end' : 'First guess';
  byId('start-b-label').textContent = kind === 'bracket' ? 'Upper end' : 'Second guess';
  let hint = '';
  if (S.mode === 'external') hint = 'Give two starting points (two guesses, or the ends of a bracket where f changes sign).';
  else if (kind === 'default') {
    const v = currentTemplate()?.variables.find((x) => x.symbol === S.unknown);
    const g = v?.guesses;
    hint = Array.isArray(g) && g.length === 2
      ? `The solver starts from ${fmt(Number(g[0]))} and ${fmt(Number(g[1]))}${prettyUnit(v.unit) ? ` ${prettyUnit(v.unit)}` : ''}, the template's default guesses.`
      : S.mode === 'template' ? "The solver starts from the template's default guesses for the unknown." : 'The solver starts from the guesses 1 and 1.1 (in the units of your equations).';
  } else hint = kind === 'bracket' ? 'f must have opposite signs at the two ends.' : `Two different values of the unknown${S.mode === 'template' ? ', in its chosen unit' : ''}; no sign change is needed.`;
  byId('start-hint').textContent = hint;
}

// ---- custom equations -------------------------------------------------------------

function runCustomCheck() {
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
  const c = tacit.checkEquation(text);
  app.customCheck = c;
  if (c.ok) {
    ta.removeAttribute('aria-invalid');
    out.className = 'check ok';
    out.textContent = `Reads correctly: ${c.equations} equation${c.equations === 1 ? '' : 's'}, variables ${c.variables.join(', ') || '(none)'}${c.definitions.length ? `; defined: ${c.definitions.join(', ')}` : ''}.`;
    showEquation(text);
    const vars = c.variables;
    const keep = unknownList().filter((u) => vars.includes(u));
    if (keep.length === 0 && vars.length) app.S.unknown = vars[vars.length - 1];
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

// ---- reading the form ----------------------------------------------------------------

class FormError extends Error {}

function readNumber(text, what, el) {
  const r = parseNumber(text);
  if (r.error) {
    if (el) el.setAttribute('aria-invalid', 'true');
    throw new FormError(`${what}: ${r.error}`);
  }
  return r.empty ? null : r.value;
}

function readTolerances() {
  const t = {};
  const names = { xRel: 'Relative step tolerance', xAbs: 'Absolute step tolerance', fAbs: 'Residual tolerance', maxEvals: 'Evaluation budget' };
  for (const k of Object.keys(names)) {
    const el = byId(`tol-${k}`);
    el.removeAttribute('aria-invalid');
    const v = readNumber(app.S.tol[k], names[k], el);
    if (v === null) continue;
    if (k === 'maxEvals' && !(Number.isInteger(v) && v >= 2)) {
      el.setAttribute('aria-invalid', 'true');
      throw new FormError(`${names[k]}: must be a whole number of at least 2, got ${app.S.tol[k]}`);
    }
    if (k !== 'maxEvals' && v < 0) {
      el.setAttribute('aria-invalid', 'true');
      throw new FormError(`${names[k]}: must be 0 or more, got ${app.S.tol[k]}`);
    }
    t[k] = v;
  }
  return t;
}

function readStart() {
  const S = app.S;
  const kind = S.mode === 'template' && S.start.kind === 'bracket' ? 'guesses' : S.start.kind;
  if (kind === 'default') return {};
  const ea = byId('start-a');
  const eb = byId('start-b');
  ea.removeAttribute('aria-invalid');
  eb.removeAttribute('aria-invalid');
  const a = readNumber(S.start.a, kind === 'bracket' ? 'Lower end of the bracket' : 'First guess', ea);
  const b = readNumber(S.start.b, kind === 'bracket' ? 'Upper end of the bracket' : 'Second guess', eb);
  if (a === null || b === null) throw new FormError(`Give both ${kind === 'bracket' ? 'ends of the bracket' : 'guesses'}, or let the solver choose.`);
  if (a === b) throw new FormError(`The two starting points must differ; both are ${a}.`);
  return kind === 'bracket' ? { bracket: [a, b] } : { guesses: [a, b] };
}

function readKnowns() {
  const out = {};
  const unknowns = unknownList();
  const missing = [];
  for (const v of currentVariables()) {
    if (unknowns.includes(v.symbol)) continue;
    const el = document.getElementById(`val-${v.symbol}`);
    el?.removeAttribute('aria-invalid');
    const entry = app.S.values[v.symbol] ?? { v: '', u: '' };
    const value = readNumber(entry.v, `Value of ${v.symbol}`, el);
    if (value === null) {
      el?.setAttribute('aria-invalid', 'true');
      missing.push(v.symbol);
      continue;
    }
    out[v.symbol] = { value, unit: v.units.length ? (entry.u && v.units.includes(entry.u) ? entry.u : v.unit) : '' };
  }
  if (missing.length) throw new FormError(`Give a value for ${missing.join(', ')}, or mark ${missing.length === 1 ? 'it' : 'one'} as the unknown.`);
  return out;
}


function readList(t) {
  const text = app.S.values[t.list.symbol]?.v ?? byId('list-text').value;
  const parts = text.split(/[\s,;]+/).filter(Boolean);
  const out = [];
  parts.forEach((p, i) => {
    const r = parseNumber(p);
    if (r.error) {
      byId('list-text').setAttribute('aria-invalid', 'true');
      throw new FormError(`${t.list.symbol}, item ${i + 1}: ${r.error}`);
    }
    out.push(r.value);
  });
  if (out.length < 2) throw new FormError(`${t.list.symbol} needs at least two values.`);
  return out;
}

function settingsFacts(req) {
  const t = req.tolerances ?? {};
  const start = req.bracket ? `bracket [${req.bracket.join(', ')}]` : req.guesses ? `guesses ${req.guesses.join(', ')}` : 'default guesses';
  return [
    ['Method', req.method],
    ['Start', start],
    ['Step tolerance', `relative ${t.xRel ?? '1e-12 (default)'}, absolute ${t.xAbs ?? '0 (default)'}`],
    ['Residual tolerance', String(t.fAbs ?? '0 (default)')],
    ['Evaluation budget', String(t.maxEvals ?? '200 (default)')],
  ];
}

/** Builds the request for the current calculation. Throws FormError for bad input. */
function buildRequest() {
  const S = app.S;
  const base = { method: S.method, tolerances: readTolerances(), ...readStart() };
  if (S.mode === 'template') {
    const t = currentTemplate();
    if (!t) throw new FormError('Choose a template from the catalogue first.');
    if (!S.unknown) throw new FormError('Mark which quantity to find.');
    const unitSel = document.getElementById(`unit-${S.unknown}`);
    // Every known with its unit; a list input (cash flows) as a list of numbers in its unit.
    const values = Object.fromEntries(Object.entries(readKnowns()).map(([symbol, { value, unit }]) => [symbol, { value, unit }]));
    if (t.list) values[t.list.symbol] = readList(t);
    const spec = { template: t.id, values, unknown: S.unknown };
    if (unitSel) spec.resultUnit = unitSel.value;
    const opts = { history: true, sensitivities: true, ...base };
    return { kind: 'template', spec, opts, req: { ...spec, ...opts } };
  }
  if (S.mode === 'custom') {
    const c = app.customCheck;
    if (!c) throw new FormError('Write an equation first.');
    if (!c.ok) throw new FormError(`The equations do not read correctly: ${c.message}`);
    const unknowns = unknownList();
    if (unknowns.length === 0) throw new FormError('Mark which variable to find.');
    if (unknowns.length !== c.equations) throw new FormError(`${c.equations} equation${c.equations === 1 ? '' : 's'} need${c.equations === 1 ? 's' : ''} exactly ${c.equations} unknown${c.equations === 1 ? '' : 's'}; ${unknowns.length} ${unknowns.length === 1 ? 'is' : 'are'} marked.`);
    const knowns = Object.fromEntries(Object.entries(readKnowns()).map(([k, v]) => [k, v.value]));
    const { guesses, bracket, ...rest } = base;
    let spec = unknowns;
    if (unknowns.length === 1 && (guesses || bracket)) spec = [{ name: unknowns[0], guesses: guesses ?? bracket }];
    const opts = { history: true, sensitivities: true, ...rest };
    const problemSpec = { equations: S.equations, knowns, unknowns: spec };
    return { kind: 'equation', spec: problemSpec, opts, req: { ...problemSpec, ...opts }, start: { guesses, bracket } };
  }
  throw new FormError('This mode has no Solve button.');
}

// ---- solving -----------------------------------------------------------------------

function solve() {
  const err = byId('solve-error');
  err.textContent = '';
  let built;
  try {
    built = buildRequest();
  } catch (e) {
    if (e instanceof FormError) {
      err.textContent = e.message;
      return null;
    }
    throw e;
  }
  let r;
  let problem = null;
  try {
    problem = tacit.problem(built.spec);
    r = problem.solve(built.opts);
  } catch (e) {
    problem?.free();
    err.textContent = `${e.message}${e.code ? ` (${e.code})` : ''}`;
    hideResults();
    if (e.code === 'internal-panic' || e.code === 'instance-aborted') notify('The solver stopped with an internal error. Reload the page to start it again; your calculation is kept in the link.');
    return null;
  }
  app.lastResult?.problem?.free();
  app.lastResult = { built, r, problem };
  presentResult(built, r);
  return r;
}

function presentResult(built, r) {
  const S = app.S;
  let answers;
  let xLabel = 'x';
  if (built.kind === 'template') {
    answers = [{ symbol: S.unknown, value: r.value, unit: prettyUnit(r.unit) }];
    xLabel = `${S.unknown}${prettyUnit(r.unit) ? ` (${prettyUnit(historyUnit(r))})` : ''}`;
  } else {
    answers = Object.entries(r.unknowns).map(([symbol, value]) => ({ symbol, value, unit: '' }));
    xLabel = unknownList()[0] ?? 'x';
  }
  const t = currentTemplate();
  showResult(r, {
    answers,
    outputs: (r.outputs ?? []).map((o) => ({ ...o, unit: prettyUnit(o.unit) })),
    settings: settingsFacts(built.req),
    notes: r.notes ?? [],
    caution: r.caution || (t?.caution ?? ''),
  });
  byId('announce').textContent = `${answers.map((a) => `${a.symbol} = ${fmt(a.value, 6)} ${a.unit}`).join(', ')}: ${r.converged ? 'converged' : 'not converged'}.`;
  probe.solves++;
  if (probe.firstSolveMs === null) probe.firstSolveMs = performance.now();
  // Every x of the result (history, bracket, roots) is already in the unit chosen.
  const history = r.history ?? [];
  showHistory(history, history.length ? sampleCurve(history) : null, xLabel);
  if (!history.length && r.systemHistory?.length) showSystemHistory(r.systemHistory);
  showSensitivities(r.sensitivities, meaningOf);
  showRootsCard(built, r);
  byId('record-date').textContent = recordDate();
}

function recordDate() {
  const d = new Date();
  const p2 = (n) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p2(d.getMonth() + 1)}-${p2(d.getDate())} ${p2(d.getHours())}:${p2(d.getMinutes())} (local time) · tacit ${tacit.version}`;
}

/** The unit of the history's x values as shown: the result unit. */
function historyUnit(r) {
  return r.unit;
}

function showSystemHistory(rows) {
  const card = byId('history');
  card.hidden = false;
  clear(byId('plot-function'));
  byId('history-x-head').textContent = 'x (all unknowns)';
  const tb = clear(byId('history-table').tBodies[0]);
  for (const r of rows) {
    tb.append(h('tr', null, h('td', null, String(r.k)), h('td', null, r.x.map((v) => fmt(v, 8)).join(', ')), h('td', null, fmt(r.residualNorm, 4)), h('td', null, '—'), h('td', { class: 'kind' }, kindWords(r.kind))));
  }
  const resBox = clear(byId('plot-residual'));
  const pts = rows.filter((r) => r.residualNorm > 0).map((r) => [r.k, r.residualNorm]);
  resBox.append(plot({ title: 'residual norm against step', xLabel: 'step k', yLabel: '‖residual‖', logY: true, layers: [{ kind: 'line', cls: 'trace', data: pts }, { kind: 'points', cls: 'trace', data: pts }] }));
}

/** f over the visited range, from the compiled problem (x in the unknown's unit). */
function sampleCurve(history) {
  const problem = app.lastResult?.problem;
  if (!problem || problem.unknown === null) return null;
  const xs = history.map((r) => r.x).filter(Number.isFinite);
  if (xs.length < 2) return null;
  let lo = xs.reduce((a, b) => Math.min(a, b));
  let hi = xs.reduce((a, b) => Math.max(a, b));
  if (hi === lo) return null;
  const pad = (hi - lo) * 0.05;
  lo -= pad;
  hi += pad;
  try {
    const s = problem.sample(lo, hi, 80);
    return s.x.map((x, i) => [x, s.f[i]]);
  } catch {
    return null;
  }
}

// ---- roots in a range ----------------------------------------------------------------

function showRootsCard(built, r) {
  const card = byId('roots');
  const single = built.kind === 'template' || unknownList().length === 1;
  card.hidden = !single;
  if (!single) return;
  const root = built.kind === 'template' ? r.value : r.root;
  if (!byId('roots-lo').value && !byId('roots-hi').value && Number.isFinite(root)) {
    const span = Math.abs(root) || 1;
    byId('roots-lo').value = full(Number((root - span).toPrecision(3)));
    byId('roots-hi').value = full(Number((root + span).toPrecision(3)));
  }
  const body = clear(byId('roots-body'));
  card.classList.toggle('has-roots', Boolean(r.otherRoots?.length));
  if (r.otherRoots?.length) {
    const labelled = (x, label) => `${fmt(x, 8)} ${r.unit ?? ''}${label ? ` (${label})` : ''}`;
    body.append(h('p', null, `This equation has another branch: the solver also found ${r.otherRoots.map((o) => labelled(o.value, o.label)).join(', ')}.`));
    body.append(rootChoiceList([root, ...r.otherRoots.map((o) => o.value)].map((x) => ({ x, kind: 'sign-change' })), r.unit ?? ''));
  }
}

function rootChoiceList(roots, unit) {
  const ul = h('ul', { class: 'roots-list' });
  roots.forEach((rt, i) => {
    const b = h('button', { type: 'button' }, 'Solve for this one');
    b.addEventListener('click', () => chooseRoot(rt.x));
    ul.append(h('li', null, h('span', { class: 'mono' }, `${i + 1}. ${fmt(rt.x, 10)} ${unit}`), h('span', { class: 'hint' }, rt.kind === 'touching' ? 'touching (no sign change)' : 'sign change'), b));
  });
  return ul;
}

function chooseRoot(x) {
  const d = Math.abs(x) * 1e-6 || 1e-6;
  app.S.start = { kind: 'guesses', a: full(x - d), b: full(x + d) };
  renderStart();
  writeUrl();
  solve();
}

function scanRoots() {
  const body = clear(byId('roots-body'));
  let lo;
  let hi;
  try {
    lo = readNumber(byId('roots-lo').value, 'From', byId('roots-lo'));
    hi = readNumber(byId('roots-hi').value, 'To', byId('roots-hi'));
    if (lo === null || hi === null || !(hi > lo)) throw new FormError('Give a range with From below To.');
  } catch (e) {
    body.append(h('p', { class: 'error-text' }, e.message));
    return;
  }
  const last = app.lastResult;
  if (!last) return;
  let found;
  try {
    found = last.problem.roots(lo, hi);
  } catch (e) {
    body.append(h('p', { class: 'error-text' }, e.message));
    return;
  }
  const unit = last.built.kind === 'template' ? prettyUnit(last.r.unit) : '';
  byId('roots').classList.toggle('has-roots', found.roots.length > 0);
  if (found.roots.length === 0) body.append(h('p', null, `No root between ${fmt(lo)} and ${fmt(hi)} ${unit}.`));
  else {
    body.append(h('p', null, `${found.roots.length} root${found.roots.length === 1 ? '' : 's'} between ${fmt(lo)} and ${fmt(hi)} ${unit} (${found.evaluations} evaluations). Choose the one you mean:`));
    body.append(rootChoiceList(found.roots, unit));
  }
  if (found.limits) body.append(h('p', { class: 'hint' }, found.limits));
}

// ---- sweep ---------------------------------------------------------------------------

const sweeper = { worker: null, ready: null, id: 0, busy: false };

function startWorker() {
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
  sweeper.ready.catch(() => {});
  w.addEventListener('error', (ev) => {
    ev.preventDefault();
    replaceWorker(`the sweep worker failed (${ev.message || 'script error'})`);
  });
  sweeper.ready.then(() => { sweeper.failures = 0; }, () => {});
  w.postMessage({ type: 'init', wasm: app.wasm.slice().buffer });
}

function replaceWorker(why) {
  sweeper.worker?.terminate();
  const wasBusy = sweeper.busy;
  endSweepUi();
  sweeper.failures = (sweeper.failures ?? 0) + 1;
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

function renderSweepInputs() {
  const sel = clear(byId('sweep-input'));
  const unknowns = unknownList();
  for (const v of currentVariables()) {
    if (unknowns.includes(v.symbol)) continue;
    sel.append(h('option', { value: v.symbol }, `${v.symbol}${v.meaning ? ` (${v.meaning})` : ''}`));
  }
  const S = app.S;
  if (S.sweep.input && [...sel.options].some((o) => o.value === S.sweep.input)) sel.value = S.sweep.input;
  byId('sweep-from').value = S.sweep.from;
  byId('sweep-to').value = S.sweep.to;
  byId('sweep-n').value = S.sweep.n;
}

function buildSweepJob() {
  const S = app.S;
  const built = buildRequest();
  const input = byId('sweep-input').value;
  if (!input) throw new FormError('Choose the input to vary.');
  const from = readNumber(S.sweep.from, 'Sweep from', byId('sweep-from'));
  const to = readNumber(S.sweep.to, 'Sweep to', byId('sweep-to'));
  const nRaw = readNumber(S.sweep.n || '50', 'Sweep points', byId('sweep-n'));
  if (from === null || to === null) throw new FormError('Give the range of the sweep (From and To).');
  if (from === to) throw new FormError('The sweep range is empty: From equals To.');
  if (!Number.isInteger(nRaw) || nRaw < 2 || nRaw > 100000) throw new FormError(`Sweep points must be a whole number from 2 to 100000, got ${S.sweep.n}.`);
  if (built.kind !== 'template' && unknownList().length !== 1) throw new FormError('A sweep solves for one unknown.');
  // The problem as solved, and the sweep of one of its knowns (from and to in the unit the
  // input is given in); the core reports every point in the units on the page.
  const sweep = { input, from, to, points: nRaw, method: built.opts.method, tolerances: built.opts.tolerances };
  const g = built.kind === 'template' ? built.opts.guesses : built.start.guesses ?? built.start.bracket;
  if (g) sweep.guesses = g;
  const inputUnit = built.kind === 'template' ? built.spec.values[input]?.unit ?? '' : '';
  return {
    job: { spec: built.spec, sweep },
    input,
    unknown: built.kind === 'template' ? S.unknown : unknownList()[0],
    unit: built.kind === 'template' ? prettyUnit(built.spec.resultUnit) : '',
    inputUnit: prettyUnit(inputUnit),
  };
}

function runSweep() {
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
        app.sweepResult = { ...spec, result: m.result };
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
function drillWorkerTrap() {
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
}
probe.drillWorkerTrap = drillWorkerTrap;

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

function cancelSweep() {
  if (!sweeper.busy) return;
  sweeper.worker.terminate();
  endSweepUi();
  startWorker();
  byId('sweep-status').textContent = 'Sweep cancelled.';
}

function showSweep(sw) {
  const { result, input, unknown, unit, inputUnit } = sw;
  const box = clear(byId('sweep-plot'));
  const ok = [];
  const bad = [];
  result.input.forEach((x, i) => (result.converged[i] ? ok : bad).push([x, result.root[i]]));
  let lo = Infinity;
  let hi = -Infinity;
  for (const x of result.input) {
    if (x < lo) lo = x;
    if (x > hi) hi = x;
  }
  box.append(
    plot({
      logX: lo > 0 && hi / lo >= 100,
      title: `${unknown} against ${input}`,
      xLabel: `${input}${inputUnit ? ` (${inputUnit})` : ''}`,
      yLabel: `${unknown}${unit ? ` (${unit})` : ''}`,
      layers: [{ kind: 'line', cls: 'curve', data: ok }, { kind: 'points', cls: 'failed', data: bad.filter((p) => Number.isFinite(p[1])) }],
    }),
  );
  const table = byId('sweep-table');
  table.hidden = false;
  const head = clear(table.tHead);
  head.append(h('tr', null, h('th', { scope: 'col' }, `${input}${inputUnit ? ` (${inputUnit})` : ''}`), h('th', { scope: 'col' }, `${unknown}${unit ? ` (${unit})` : ''}`), h('th', { scope: 'col' }, 'evaluations'), h('th', { scope: 'col' }, 'status')));
  const tb = clear(table.tBodies[0]);
  const rows = result.input.length;
  const frag = document.createDocumentFragment();
  for (let i = 0; i < rows; i++) {
    frag.append(h('tr', null, h('td', null, fmt(result.input[i], 8)), h('td', null, fmt(result.root[i], 10)), h('td', null, String(result.evaluations[i])), h('td', { class: 'kind' }, result.converged[i] ? 'converged' : `not converged (${result.status[i]})`)));
  }
  tb.append(frag);
}

function sweepCsv() {
  const sw = app.sweepResult;
  if (!sw) return;
  const q = (s) => `"${String(s).replace(/"/g, '""')}"`;
  const lines = [[`${sw.input}${sw.inputUnit ? ` [${sw.inputUnit}]` : ''}`, `${sw.unknown}${sw.unit ? ` [${sw.unit}]` : ''}`, 'evaluations', 'converged', 'status'].map(q).join(',')];
  const r = sw.result;
  for (let i = 0; i < r.input.length; i++) lines.push([full(r.input[i]), full(r.root[i]), r.evaluations[i], r.converged[i], q(r.status[i])].join(','));
  download(`tacit-sweep-${sw.unknown}-vs-${sw.input}.csv`, `${lines.join('\r\n')}\r\n`, 'text/csv');
}

// ---- evaluation by hand (external model) ------------------------------------------------

function persistExternal() {
  const S = app.S;
  S.external.stepper = app.stepper ? app.stepper.save() : '';
  writeExternal(app.stepper ? { stepper: S.external.stepper, label: S.external.label } : null);
  writeUrl();
}

function restoreStepper(json, where) {
  try {
    app.stepper = tacit.Stepper.restore(json);
    return true;
  } catch (e) {
    app.stepper = null;
    notify(`The evaluation by hand kept in ${where} could not be restored: ${e.message}. It was left as it was; begin a new one when ready.`);
    return false;
  }
}

function beginExternal() {
  const S = app.S;
  const err = byId('ext-error');
  err.textContent = '';
  let start;
  let tolerances;
  try {
    if (S.start.kind === 'default') throw new FormError('Choose "Two guesses" or "A bracket" under "Where to start the search" and give both points.');
    start = readStart();
    tolerances = readTolerances();
  } catch (e) {
    if (!(e instanceof FormError)) throw e;
    byId('ext-ask').hidden = false;
    byId('ext-x').textContent = '—';
    err.textContent = e.message;
    return;
  }
  try {
    app.stepper?.free();
    app.stepper = tacit.Stepper.create({ ...start, method: S.method, tolerances, history: true });
  } catch (e) {
    err.textContent = e.message;
    return;
  }
  persistExternal();
  renderExternal();
  byId('ext-fx').focus();
}

function discardExternal() {
  app.stepper?.free();
  app.stepper = null;
  persistExternal();
  renderExternal();
  hideResults();
}

function tellExternal(ev) {
  ev.preventDefault();
  const err = byId('ext-error');
  err.textContent = '';
  if (!app.stepper) return;
  const text = byId('ext-fx').value.trim();
  let fx;
  if (/^(nan|undefined|fail(ed)?)$/i.test(text)) fx = NaN;
  else {
    const r = parseNumber(text);
    if (r.empty || r.error) {
      err.textContent = r.empty ? 'Type the value of f at this x (or NaN if the model failed there).' : `Value of f: ${r.error}`;
      return;
    }
    fx = r.value;
  }
  try {
    app.stepper.tell(fx);
  } catch (e) {
    err.textContent = e.message;
    return;
  }
  byId('ext-fx').value = '';
  persistExternal();
  renderExternal();
  byId(app.stepper.done ? 'result' : 'ext-fx').focus?.();
}

function renderExternal() {
  const st = app.stepper;
  byId('start').hidden = Boolean(st);
  const ask = byId('ext-ask');
  const prog = clear(byId('ext-progress'));
  byId('ext-discard').hidden = !st;
  if (!st) {
    ask.hidden = true;
    prog.append(h('p', { class: 'hint' }, 'No evaluation in progress.'));
    return;
  }
  const x = st.next();
  const record = JSON.parse(st.save());
  const points = Array.isArray(record.points) ? record.points : [];
  if (x !== null) {
    ask.hidden = false;
    byId('ext-x').textContent = full(x);
    byId('ext-x').setAttribute('data-value', full(x));
  } else ask.hidden = true;
  prog.append(h('p', null, `${points.length} evaluation${points.length === 1 ? '' : 's'} recorded.`));
  const r = st.result;
  const label = app.S.external.label || 'f';
  if (r) {
    showResult(r, { answers: [{ symbol: 'x', value: r.root, unit: '' }], settings: settingsFacts({ method: record.method, tolerances: { xRel: record.tolerances?.x_rel, xAbs: record.tolerances?.x_abs, fAbs: record.tolerances?.f_abs, maxEvals: record.tolerances?.max_evals }, ...record.start }), notes: [], caution: '' });
    showHistory(r.history, null, 'x');
  } else {
    byId('result').hidden = true;
    showHistory(st.history, null, 'x');
    byId('plot-function-caption').textContent = `${label} at the points evaluated so far`;
  }
}

// ---- saved list --------------------------------------------------------------------

function renderSaved() {
  const ul = clear(byId('saved-list'));
  byId('saved-empty').hidden = app.saved.length > 0;
  for (const item of app.saved) {
    const name = h('span', { class: 'saved-name' }, item.name);
    const open = h('button', { type: 'button', 'aria-label': `Open ${item.name}` }, 'Open');
    const rename = h('button', { type: 'button', class: 'quiet', 'aria-label': `Rename ${item.name}` }, 'Rename');
    const del = h('button', { type: 'button', class: 'quiet', 'aria-label': `Delete ${item.name}` }, 'Delete');
    open.addEventListener('click', () => {
      applyState(structuredClone(item.state), `saved calculation "${item.name}"`);
      solveIfReady();
    });
    rename.addEventListener('click', () => startRename(li, item));
    del.addEventListener('click', () => {
      app.saved = app.saved.filter((x) => x !== item);
      storeSaved();
      notify(`Deleted "${item.name}".`, 'info');
    });
    const when = item.saved ? h('span', { class: 'saved-when' }, new Date(item.saved).toLocaleString()) : null;
    const li = h('li', { 'data-id': item.id }, name, open, rename, del, when);
    ul.append(li);
  }
}

function startRename(li, item) {
  const input = h('input', { type: 'text', value: item.name, maxlength: '200', 'aria-label': `New name for ${item.name}` });
  const ok = h('button', { type: 'button' }, 'Keep');
  const form = h('span', { class: 'row' }, input, ok);
  clear(li).append(form);
  input.focus();
  const finish = () => {
    const v = input.value.trim();
    if (v) item.name = v;
    storeSaved();
  };
  ok.addEventListener('click', finish);
  input.addEventListener('keydown', (e) => {
    if (e.key === 'Enter') finish();
    if (e.key === 'Escape') renderSaved();
  });
}

function storeSaved() {
  const err = writeSaved(app.saved);
  if (err) notify(err);
  renderSaved();
}

function saveCurrent(ev) {
  ev.preventDefault();
  const nameEl = byId('save-name');
  const t = currentTemplate();
  const name = nameEl.value.trim() || (t ? t.title : app.S.mode === 'custom' ? 'Own equations' : app.S.external.label || 'Evaluation by hand');
  app.saved.unshift({ id: newId(), name, saved: new Date().toISOString(), state: structuredClone(compactState(app.S)) });
  nameEl.value = '';
  storeSaved();
  notify(`Saved as "${name}".`, 'info');
}

async function importSaved(ev) {
  const file = ev.target.files?.[0];
  ev.target.value = '';
  if (!file) return;
  let text;
  try {
    text = await file.text();
  } catch (e) {
    notify(`The file could not be read: ${e.message}`);
    return;
  }
  const r = importText(text);
  if (r.error) {
    notify(`Import: ${r.error}. The saved list was not changed.`);
    return;
  }
  app.saved = [...r.items, ...app.saved];
  storeSaved();
  notify(`Imported ${r.items.length} calculation${r.items.length === 1 ? '' : 's'}.${r.problems.length ? ` Some parts could not be used: ${r.problems.join('; ')}` : ''}`, r.problems.length ? 'warn' : 'info');
}

// ---- state in and out --------------------------------------------------------------

/** Applies a validated state; anything that does not fit the current catalogue is named. */
function applyState(st, source, earlier = []) {
  const { state, problems: found } = validateState(st.v === undefined ? { ...st, v: 1 } : st);
  const problems = [...earlier, ...found];
  if (state.mode === 'template') {
    const t = app.byId.get(state.template);
    if (!t) {
      if (state.template) problems.push(`the template "${state.template.slice(0, 80)}" is not in this catalogue`);
      state.template = app.templates[0]?.id ?? '';
    }
    const tt = app.byId.get(state.template);
    if (tt) {
      const symbols = new Set(tt.variables.map((v) => v.symbol));
      for (const [sym, e] of Object.entries(state.values)) {
        if (!symbols.has(sym)) { delete state.values[sym]; problems.push(`"${sym}" is not a quantity of this template`); continue; }
        const v = tt.variables.find((x) => x.symbol === sym);
        if (e.u && !v.units.includes(e.u)) { problems.push(`the unit "${e.u}" of ${sym} is not offered for it; ${v.unit} is used`); e.u = v.unit; }
      }
      if (!symbols.has(state.unknown)) {
        if (state.unknown) problems.push(`"${state.unknown}" is not a quantity of this template`);
        state.unknown = tt.defaultUnknown;
      }
    }
  }
  if (state.mode === 'external' && state.start.kind === 'default') state.start.kind = 'guesses';
  app.S = state;
  if (state.mode === 'external') {
    app.stepper?.free();
    app.stepper = null;
    if (state.external.stepper) restoreStepper(state.external.stepper, source);
  }
  hideResults();
  byId('roots-lo').value = '';
  byId('roots-hi').value = '';
  clear(byId('roots-body'));
  byId('sweep-plot').textContent = '';
  byId('sweep-table').hidden = true;
  renderSetup();
  writeUrl();
  if (problems.length) notify(`Parts of the ${source} could not be used and were left at their defaults: ${problems.join('; ')}.`);
}

function templateState(t) {
  const st = defaultState();
  st.template = t.id;
  st.unknown = t.defaultUnknown;
  for (const v of t.variables) {
    st.values[v.symbol] = { v: v.symbol !== t.defaultUnknown && Number.isFinite(v.example) ? full(v.example) : '', u: v.unit };
  }
  const uv = t.variables.find((v) => v.symbol === t.defaultUnknown);
  st.resultUnit = uv?.unit ?? '';
  return st;
}

function pickTemplate(id) {
  const t = app.byId.get(id);
  if (!t) return;
  applyState(templateState(t), 'template');
  solveIfReady();
  byId('setup').focus();
}

function solveIfReady() {
  if (app.S.mode === 'external') return;
  const unknowns = unknownList();
  const ready = currentVariables().every((v) => unknowns.includes(v.symbol) || (app.S.values[v.symbol]?.v ?? '').trim() !== '');
  if (ready && currentVariables().length) solve();
}

function loadFromHash() {
  const d = decodeFragment(location.hash);
  if (d === null) return false;
  if (d.error) {
    notify(`This link's calculation could not be read: ${d.error}. Nothing from it was used; the page shows its starting calculation instead.`);
    return false;
  }
  applyState(d.state, 'link', d.problems);
  return true;
}

// ---- wiring ------------------------------------------------------------------------

function wire() {
  byId('search').addEventListener('input', (e) => app.nav.filter(e.target.value));
  byId('mode-custom').addEventListener('click', () => {
    const st = defaultState();
    st.mode = 'custom';
    st.equations = app.S.mode === 'custom' ? app.S.equations : '';
    applyState(st, 'own equations');
    byId('custom-text').focus();
  });
  byId('mode-external').addEventListener('click', () => {
    const st = defaultState();
    st.mode = 'external';
    const kept = loadExternal();
    if (kept && !kept.error) st.external = { label: kept.label, stepper: kept.stepper };
    else if (kept?.error) notify(kept.error);
    applyState(st, 'stored evaluation');
    byId('ext-label').focus();
  });
  let checkTimer = 0;
  byId('custom-text').addEventListener('input', (e) => {
    app.S.equations = e.target.value;
    clearTimeout(checkTimer);
    checkTimer = setTimeout(() => {
      runCustomCheck();
      renderVarsTable();
      renderSweepInputs();
      writeUrl();
    }, 150);
  });
  for (const r of document.querySelectorAll('input[name=start-kind]')) {
    r.addEventListener('change', () => {
      app.S.start.kind = r.value;
      renderStart();
      writeUrl();
    });
  }
  for (const k of ['a', 'b']) {
    byId(`start-${k}`).addEventListener('input', (e) => {
      app.S.start[k] = e.target.value;
      e.target.removeAttribute('aria-invalid');
      writeUrl();
    });
  }
  byId('method').addEventListener('change', (e) => {
    app.S.method = e.target.value;
    writeUrl();
  });
  for (const k of Object.keys(app.S.tol)) {
    byId(`tol-${k}`).addEventListener('input', (e) => {
      app.S.tol[k] = e.target.value;
      e.target.removeAttribute('aria-invalid');
      writeUrl();
    });
  }
  byId('solve').addEventListener('click', solve);
  byId('setup').addEventListener('keydown', (e) => {
    if (e.key === 'Enter' && e.target.matches('input[type=text]') && app.S.mode !== 'external') solve();
  });
  byId('roots-scan').addEventListener('click', scanRoots);
  byId('list-text').addEventListener('input', (e) => {
    const t = currentTemplate();
    if (!t?.list) return;
    app.S.values[t.list.symbol] = { v: e.target.value, u: '' };
    e.target.removeAttribute('aria-invalid');
    writeUrl();
  });
  byId('sweep-input').addEventListener('change', (e) => { app.S.sweep.input = e.target.value; writeUrl(); });
  for (const k of ['from', 'to', 'n']) byId(`sweep-${k}`).addEventListener('input', (e) => { app.S.sweep[k] = e.target.value; writeUrl(); });
  byId('sweep-run').addEventListener('click', () => { app.S.sweep.input = byId('sweep-input').value; runSweep(); });
  byId('sweep-cancel').addEventListener('click', cancelSweep);
  byId('sweep-csv').addEventListener('click', sweepCsv);
  byId('ext-label').addEventListener('input', (e) => {
    app.S.external.label = e.target.value;
    byId('calc-title').textContent = e.target.value || 'Evaluation by hand';
    persistExternal();
  });
  byId('ext-begin').addEventListener('click', beginExternal);
  byId('ext-discard').addEventListener('click', discardExternal);
  byId('ext-form').addEventListener('submit', tellExternal);
  byId('save-form').addEventListener('submit', saveCurrent);
  byId('export-saved').addEventListener('click', () => download('tacit-saved.json', exportText(app.saved), 'application/json'));
  byId('import-saved').addEventListener('change', importSaved);
  byId('copy-link').addEventListener('click', async () => {
    writeUrl();
    try {
      await navigator.clipboard.writeText(location.href);
      notify('The link to this calculation was copied. Bookmark it or send it; it holds the whole set-up.', 'info');
    } catch {
      notify(`Copy this link to keep the calculation: ${location.href}`, 'info');
    }
  });
  byId('print-record').addEventListener('click', () => window.print());
  let openedForPrint = false;
  window.addEventListener('beforeprint', () => {
    byId('record-date').textContent = recordDate();
    openedForPrint = !byId('advanced').open;
  });
  window.addEventListener('afterprint', () => { if (openedForPrint) byId('advanced').open = false; });
  window.addEventListener('hashchange', () => {
    if (location.hash === app.lastWritten) return;
    if (loadFromHash()) solveIfReady();
  });
}

async function boot() {
  byId('tool-version').textContent = globalThis.__TACIT_VERSION ?? '';
  try {
    probe.marks.start = performance.now();
    app.wasm = await wasmBytes();
    probe.marks.inflated = performance.now();
    await tacit.init(wasmModule());
    probe.marks.instantiated = performance.now();
  } catch (e) {
    byId('calc-title').textContent = 'The solver could not start';
    notify(`The solver could not start in this browser: ${e.message}`);
    return;
  }
  byId('tool-version').textContent = tacit.version;
  try {
    app.templates = tacit.catalogue().map(normalizeTemplate).filter((t) => t.id);
  } catch (e) {
    app.templates = [];
    notify(`The template catalogue could not be read (${e.message}); your own equations and evaluation by hand still work.`);
  }
  for (const t of app.templates) app.byId.set(t.id, t);
  app.units = new Map();
  try {
    for (const d of tacit.units()) app.units.set(d.dimension, d.units);
  } catch {
    /* without the table, histories stay in SI units and say so */
  }
  app.nav = buildCatalogueNav(byId('template-groups'), byId('search-empty'), app.templates, pickTemplate);
  probe.marks.catalogue = performance.now();
  wire();
  const { items, problems } = loadSaved();
  app.saved = items;
  renderSaved();
  if (problems.length) notify(`Saved calculations: ${problems.join('; ')}. Everything else was kept.`);
  if (!loadFromHash()) {
    const first = app.byId.get('pipes.colebrook') ?? app.templates[0];
    if (first) applyState(templateState(first), 'template');
    else {
      const st = defaultState();
      st.mode = 'custom';
      applyState(st, 'own equations');
    }
  }
  probe.marks.setUp = performance.now();
  solveIfReady();
  probe.marks.solvedAndShown = performance.now();
  startWorker();
  probe.ready = true;
  document.documentElement.dataset.ready = 'true';
}

boot();
