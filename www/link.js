// The link state: the whole calculation lives in the address (#calc=…). A state from a
// link, a saved entry or a template is checked, whatever does not fit the catalogue is
// named, and the page is drawn from it.

import { byId, clear } from './dom.js';
import { full } from './format.js';
import { app, notify, writeUrl } from './ctx.js';
import { defaultState, decodeFragment, validateState } from './state.js';
import { renderSetup } from './setup.js';
import { hideResults } from './result.js';
import { clearSweep, renderSweepInputs } from './sweep.js';
import { restoreKept, renderExternal } from './external.js';
import { adoptOwn } from './own-templates.js';

/** Applies a state; anything that does not fit the current catalogue is named. */
export function applyState(st, source, earlier = []) {
  const { state, problems: found } = validateState(st.v === undefined ? { ...st, v: 1 } : st);
  const problems = [...earlier, ...found];
  if (state.mode === 'template') {
    // A calculation with an own template carries it: read through the core's check first.
    if (state.own) state.template = adoptOwn(state.own, problems, source) ?? state.template;
    if (!app.byId.get(state.template)) {
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
    if (tt?.own) state.own = tt.raw;
    else delete state.own;
  }
  if (state.mode === 'external' && state.start.kind === 'default') state.start.kind = 'guesses';
  // Who prepares and checks records stays from one calculation to the next.
  for (const k of ['preparedBy', 'checkedBy']) if (!state.record[k]) state.record[k] = app.S.record?.[k] ?? '';
  app.S = state;
  app.lastResult?.problem?.free();
  app.lastResult = null;
  if (state.mode === 'external') {
    app.stepper?.free();
    app.stepper = null;
    if (state.external.stepper) restoreKept(state.external.stepper, source);
  }
  hideResults();
  byId('roots-lo').value = '';
  byId('roots-hi').value = '';
  clear(byId('roots-body'));
  clearSweep();
  renderSetup();
  renderSweepInputs();
  if (state.mode === 'external') renderExternal();
  writeUrl();
  if (problems.length) notify(`Parts of the ${source} could not be used and were left at their defaults: ${problems.join('; ')}.`);
}

/** A template's starting state: its scenario values, to six significant digits. */
export function templateState(t) {
  const st = defaultState();
  st.template = t.id;
  st.unknown = t.defaultUnknown;
  for (const v of t.variables) {
    const shown = Number.isFinite(v.example) ? full(Number(v.example.toPrecision(6))) : '';
    st.values[v.symbol] = { v: v.symbol !== t.defaultUnknown ? shown : '', u: v.unit };
  }
  st.resultUnit = t.variables.find((v) => v.symbol === t.defaultUnknown)?.unit ?? '';
  return st;
}

/** Reads the address. Returns 'none', 'bad', 'unsolved' (a link made before solving:
 *  shown, not solved) or 'ready'. */
export function loadFromHash() {
  const d = decodeFragment(location.hash);
  if (d === null) return 'none';
  if (d.error) {
    notify(`This link's calculation could not be read: ${d.error}. Nothing from it was used; the page shows its starting calculation instead.`);
    return 'bad';
  }
  applyState(d.state, 'link', d.problems);
  return app.S.unsolved ? 'unsolved' : 'ready';
}
