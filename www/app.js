// The offline page: starts the solver, reads the catalogue, and wires the parts together.
// Each part lives in its own module, by what it shows: setup.js (the set-up), result.js
// (the result), history.js, sensitivity.js, roots.js (roots in a range), sweep.js,
// external.js (evaluation by hand), saved.js (saved calculations), link.js (the link
// state), record.js (the printed record); solver.js holds every call for numbers, and
// request.js reads the form. Text from users, links and storage goes in as text.

import { init, catalogue, units, version } from '../dist/pkg/tacit.js';
import { byId, download } from './dom.js';
import { app, probe, hooks, notify, writeUrl, edited, currentTemplate, currentVariables, unknownList, FormError } from './ctx.js';
import { normalizeTemplate, buildCatalogueNav } from './catalogue.js';
import { defaultState } from './state.js';
import { loadSaved, exportText, loadExternal } from './storage.js';
import { wasmBytes, wasmModule } from './wasm-bytes.js';
import { solveBuilt } from './solver.js';
import { buildRequest } from './request.js';
import { renderSetup, renderVarsTable, renderStart, showEquation } from './setup.js';
import { runCustomCheck } from './custom.js';
import { presentResult, hideResults, markStale } from './result.js';
import { showRootsCard, openRoots, scanRoots } from './roots.js';
import { startWorker, renderSweepInputs, runSweep, cancelSweep, sweepCsv, showSweepPage } from './sweep.js';
import * as external from './external.js';
import { renderSaved, saveCurrent, importSaved } from './saved.js';
import { applyState, templateState, loadFromHash } from './link.js';
import { wireRecord, stampRecord } from './record.js';
import { loadOwn, refreshOwn, exportOwn, importOwn } from './own-templates.js';
import { wireOwnForm, editOwn } from './own-form.js';
import { wireUncertainty } from './uncertainty.js';

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
  let solved;
  try {
    solved = solveBuilt(built);
  } catch (e) {
    err.textContent = e.message;
    hideResults();
    if (e.code === 'internal-panic' || e.code === 'instance-aborted') notify('The solver stopped with an internal error. Reload the page to start it again; your calculation is kept in the link.');
    return null;
  }
  const { r, problem } = solved;
  app.lastResult?.problem?.free();
  app.lastResult = { built, r, problem };
  app.S.unsolved = false;
  writeUrl();
  presentResult(built, r);
  stampRecord();
  return r;
}

/** Solve pressed: solve, then bring the answer into view (far below on a phone). */
function solvePressed() {
  if (solve()) byId('result').scrollIntoView({ block: 'nearest' });
}

function solveIfReady() {
  if (app.S.mode === 'external') return;
  const unknowns = unknownList();
  const ready = currentVariables().every((v) => unknowns.includes(v.symbol) || (app.S.values[v.symbol]?.v ?? '').trim() !== '');
  if (ready && currentVariables().length) solve();
}

function pickTemplate(id) {
  const t = app.byId.get(id);
  if (!t) return;
  applyState(templateState(t), 'template');
  solveIfReady();
  // Move to the calculation (on a phone the catalogue fills the first screen).
  const setup = byId('setup');
  setup.scrollIntoView({ block: 'start' });
  setup.focus({ preventScroll: true });
}

Object.assign(hooks, {
  solve,
  pickTemplate,
  editOwn,
  markStale,
  renderStart,
  renderSweepInputs,
  showRootsCard,
  openRoots,
  openState: (st, source) => {
    applyState(st, source);
    if (!app.S.unsolved) solveIfReady();
  },
});

function onInput(id, fn) {
  byId(id).addEventListener('input', (e) => {
    e.target.removeAttribute('aria-invalid');
    fn(e.target.value);
  });
}

function wire() {
  const S = () => app.S;
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
  onInput('custom-text', (v) => {
    S().equations = v;
    clearTimeout(checkTimer);
    checkTimer = setTimeout(() => {
      runCustomCheck(showEquation);
      renderVarsTable();
      renderStart();
      renderSweepInputs();
      edited();
    }, 150);
  });
  for (const r of document.querySelectorAll('input[name=start-kind]')) {
    r.addEventListener('change', () => {
      S().start.kind = r.value;
      renderStart();
      if (S().mode !== 'external') edited();
      else writeUrl();
    });
  }
  for (const k of ['a', 'b']) onInput(`start-${k}`, (v) => { S().start[k] = v; if (S().mode !== 'external') edited(); else writeUrl(); });
  byId('method').addEventListener('change', (e) => { S().method = e.target.value; if (S().mode !== 'external') edited(); else writeUrl(); });
  for (const k of Object.keys(app.S.tol)) onInput(`tol-${k}`, (v) => { S().tol[k] = v; if (S().mode !== 'external') edited(); else writeUrl(); });
  byId('solve').addEventListener('click', solvePressed);
  byId('setup').addEventListener('keydown', (e) => {
    if (e.key === 'Enter' && e.target.matches('input[type=text]') && !e.target.closest('#record-fields') && app.S.mode !== 'external') solvePressed();
  });
  byId('roots-scan').addEventListener('click', () => scanRoots(false));
  byId('roots-prove').addEventListener('click', () => scanRoots(true));
  onInput('list-text', (v) => {
    const t = currentTemplate();
    if (!t?.list) return;
    S().values[t.list.symbol] = { v, u: '' };
    edited();
  });
  byId('sweep-input').addEventListener('change', (e) => { S().sweep.input = e.target.value; writeUrl(); });
  byId('sweep-spacing').addEventListener('change', (e) => { S().sweep.spacing = e.target.value; writeUrl(); });
  for (const k of ['from', 'to', 'n']) onInput(`sweep-${k}`, (v) => { S().sweep[k] = v; writeUrl(); });
  byId('sweep-run').addEventListener('click', () => { S().sweep.input = byId('sweep-input').value; runSweep(); });
  byId('sweep-cancel').addEventListener('click', cancelSweep);
  byId('sweep-csv').addEventListener('click', sweepCsv);
  byId('sweep-prev').addEventListener('click', () => showSweepPage((app.sweepResult?.page ?? 0) - 1));
  byId('sweep-next').addEventListener('click', () => showSweepPage((app.sweepResult?.page ?? 0) + 1));
  onInput('ext-label', external.setLabel);
  byId('ext-begin').addEventListener('click', external.begin);
  byId('ext-discard').addEventListener('click', external.discard);
  byId('ext-form').addEventListener('submit', external.tell);
  byId('save-form').addEventListener('submit', saveCurrent);
  byId('export-saved').addEventListener('click', () => download('tacit-saved.json', exportText(app.saved), 'application/json'));
  byId('import-saved').addEventListener('change', importSaved);
  byId('copy-link').addEventListener('click', async () => {
    writeUrl();
    const stale = app.S.unsolved ? ' It holds inputs that were not solved yet; the page it opens says so.' : '';
    try {
      await navigator.clipboard.writeText(location.href);
      notify(`The link to this calculation was copied. Bookmark it or send it; it holds the whole set-up.${stale}`, 'info');
    } catch {
      notify(`Copy this link to keep the calculation: ${location.href}${stale}`, 'info');
    }
  });
  wireRecord();
  wireOwnForm();
  byId('export-own').addEventListener('click', exportOwn);
  byId('import-own').addEventListener('change', importOwn);
  wireUncertainty();
  window.addEventListener('hashchange', () => {
    if (location.hash === app.lastWritten) return;
    if (loadFromHash() === 'ready') solveIfReady();
  });
}

async function boot() {
  byId('tool-version').textContent = globalThis.__TACIT_VERSION ?? '';
  try {
    probe.marks.start = performance.now();
    app.wasm = await wasmBytes();
    probe.marks.inflated = performance.now();
    await init(wasmModule());
    probe.marks.instantiated = performance.now();
  } catch (e) {
    byId('calc-title').textContent = 'The solver could not start';
    notify(`The solver could not start in this browser: ${e.message}`);
    return;
  }
  byId('tool-version').textContent = version;
  try {
    app.templates = catalogue().map(normalizeTemplate).filter((t) => t.id);
  } catch (e) {
    app.templates = [];
    notify(`The template catalogue could not be read (${e.message}); your own equations and evaluation by hand still work.`);
  }
  for (const t of app.templates) app.byId.set(t.id, t);
  try {
    for (const d of units()) app.units.set(d.dimension, d.units);
  } catch {
    /* without the table, histories stay in SI units and say so */
  }
  app.nav = buildCatalogueNav(byId('template-groups'), byId('search-empty'), app.templates, pickTemplate);
  loadOwn();
  refreshOwn();
  probe.marks.catalogue = performance.now();
  wire();
  const { items, problems } = loadSaved();
  app.saved = items;
  renderSaved();
  if (problems.length) notify(`Saved calculations: ${problems.join('; ')}. Everything else was kept.`);
  const fromLink = loadFromHash();
  if (fromLink === 'none' || fromLink === 'bad') {
    const first = app.byId.get('pipes.colebrook') ?? app.templates[0];
    if (first) applyState(templateState(first), 'template');
    else {
      const st = defaultState();
      st.mode = 'custom';
      applyState(st, 'own equations');
    }
  }
  probe.marks.setUp = performance.now();
  if (fromLink !== 'unsolved') solveIfReady();
  probe.marks.solvedAndShown = performance.now();
  startWorker();
  probe.ready = true;
  document.documentElement.dataset.ready = 'true';
}

boot();
