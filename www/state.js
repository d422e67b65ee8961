// The whole calculation state as plain data: validated when it comes back from a URL
// fragment, storage or an imported file. Nothing read back is ever executed or put in the
// page as markup; anything that does not fit the shape is dropped and named.

export const STATE_VERSION = 1;
export const FRAGMENT_KEY = 'calc=';
const MAX_FRAGMENT = 200_000;

export const METHODS = ['auto', 'secant', 'hybrid', 'bisection', 'illinois'];
export const MODES = ['template', 'custom', 'external'];
export const START_KINDS = ['default', 'guesses', 'bracket'];

const SYMBOL_RE = /^[A-Za-z_][A-Za-z0-9_]{0,63}$/;
const ID_RE = /^[A-Za-z0-9_.:-]{1,80}$/;

export function defaultState() {
  return {
    mode: 'template',
    template: '',
    equations: '',
    values: {},
    // Standard uncertainties of knowns as typed: { symbol: { v: text, pct: true when a percentage } }.
    unc: {},
    // Monte Carlo trials of the uncertainty ('' for the default).
    trials: '',
    unknown: '',
    resultUnit: '',
    start: { kind: 'default', a: '', b: '' },
    method: 'auto',
    tol: { xRel: '', xAbs: '', fAbs: '', maxEvals: '' },
    sweep: { input: '', from: '', to: '', n: '', spacing: 'linear' },
    external: { label: '', stepper: '' },
    // For the printed record: who it is for, who prepared it and who checked it.
    record: { project: '', preparedBy: '', checkedBy: '' },
    // True when the inputs changed after the last solve: the page then shows no answer as
    // current, and a link made now opens without solving, saying so.
    unsolved: false,
  };
}

function str(v, max, field, problems) {
  if (v === undefined) return undefined;
  if (typeof v !== 'string') { problems.push(`${field} is not text`); return undefined; }
  if (v.length > max) { problems.push(`${field} is longer than ${max} characters`); return undefined; }
  return v;
}

/** Checks data against the state shape. Returns { state, problems }: state holds every part
 *  that fits (the rest keeps its default), problems names every part that did not. */
export function validateState(data) {
  const problems = [];
  const st = defaultState();
  if (!data || typeof data !== 'object' || Array.isArray(data)) {
    return { state: st, problems: ['the data is not an object'] };
  }
  if (data.v !== STATE_VERSION) problems.push(`version is ${JSON.stringify(data.v)?.slice(0, 20)}, expected ${STATE_VERSION}`);
  if (data.mode !== undefined) {
    if (MODES.includes(data.mode)) st.mode = data.mode;
    else problems.push('mode is not one of template, custom, external');
  }
  const t = str(data.template, 80, 'template', problems);
  if (t !== undefined) {
    if (t === '' || ID_RE.test(t)) st.template = t;
    else problems.push('template is not a template id');
  }
  const eq = str(data.equations, 20000, 'equations', problems);
  if (eq !== undefined) st.equations = eq;
  if (data.values !== undefined) {
    if (!data.values || typeof data.values !== 'object' || Array.isArray(data.values)) problems.push('values is not a table');
    else {
      let n = 0;
      for (const [sym, entry] of Object.entries(data.values)) {
        if (++n > 200) { problems.push('values has more than 200 entries'); break; }
        if (!SYMBOL_RE.test(sym)) { problems.push(`values has an entry whose name is not a symbol`); continue; }
        if (!entry || typeof entry !== 'object') { problems.push(`values.${sym} is not a value with a unit`); continue; }
        const v = str(entry.v ?? '', 4000, `values.${sym}.v`, problems);
        const u = str(entry.u ?? '', 40, `values.${sym}.u`, problems);
        if (v === undefined || u === undefined) continue;
        st.values[sym] = { v, u };
      }
    }
  }
  if (data.unc !== undefined) {
    if (!data.unc || typeof data.unc !== 'object' || Array.isArray(data.unc)) problems.push('unc is not a table');
    else {
      for (const [sym, e] of Object.entries(data.unc).slice(0, 200)) {
        const v = SYMBOL_RE.test(sym) && e && typeof e === 'object' ? str(e.v ?? '', 64, `unc.${sym}.v`, problems) : undefined;
        if (v === undefined || (e.pct !== undefined && typeof e.pct !== 'boolean')) { problems.push(`unc has an entry that is not an uncertainty`); continue; }
        st.unc[sym] = { v, pct: e.pct === true };
      }
    }
  }
  const tr = str(data.trials, 16, 'trials', problems);
  if (tr !== undefined) st.trials = tr;
  const unk = str(data.unknown, 2000, 'unknown', problems);
  if (unk !== undefined) {
    if (unk === '' || unk.split(',').every((u) => SYMBOL_RE.test(u))) st.unknown = unk;
    else problems.push('unknown is not a symbol (or a comma-separated list of symbols)');
  }
  const ru = str(data.resultUnit, 40, 'resultUnit', problems);
  if (ru !== undefined) st.resultUnit = ru;
  if (data.start !== undefined) {
    const s = data.start;
    if (!s || typeof s !== 'object') problems.push('start is not an object');
    else {
      if (START_KINDS.includes(s.kind)) st.start.kind = s.kind;
      else problems.push('start.kind is not default, guesses or bracket');
      for (const k of ['a', 'b']) {
        const v = str(s[k] ?? '', 64, `start.${k}`, problems);
        if (v !== undefined) st.start[k] = v;
      }
    }
  }
  if (data.method !== undefined) {
    if (METHODS.includes(data.method)) st.method = data.method;
    else problems.push(`method is not one of ${METHODS.join(', ')}`);
  }
  if (data.tol !== undefined) {
    if (!data.tol || typeof data.tol !== 'object') problems.push('tol is not an object');
    else {
      for (const k of Object.keys(st.tol)) {
        const v = str(data.tol[k] ?? '', 32, `tol.${k}`, problems);
        if (v !== undefined) st.tol[k] = v;
      }
    }
  }
  if (data.sweep !== undefined) {
    if (!data.sweep || typeof data.sweep !== 'object') problems.push('sweep is not an object');
    else {
      const inp = str(data.sweep.input ?? '', 64, 'sweep.input', problems);
      if (inp !== undefined && (inp === '' || SYMBOL_RE.test(inp))) st.sweep.input = inp;
      for (const k of ['from', 'to', 'n']) {
        const v = str(data.sweep[k] ?? '', 32, `sweep.${k}`, problems);
        if (v !== undefined) st.sweep[k] = v;
      }
      if (data.sweep.spacing !== undefined) {
        if (data.sweep.spacing === 'linear' || data.sweep.spacing === 'log') st.sweep.spacing = data.sweep.spacing;
        else problems.push('sweep.spacing is not linear or log');
      }
    }
  }
  if (data.external !== undefined) {
    if (!data.external || typeof data.external !== 'object') problems.push('external is not an object');
    else {
      const l = str(data.external.label ?? '', 200, 'external.label', problems);
      if (l !== undefined) st.external.label = l;
      const s = str(data.external.stepper ?? '', 100000, 'external.stepper', problems);
      if (s !== undefined) st.external.stepper = s;
    }
  }
  if (data.record !== undefined) {
    if (!data.record || typeof data.record !== 'object') problems.push('record is not an object');
    else {
      for (const k of Object.keys(st.record)) {
        const v = str(data.record[k] ?? '', 200, `record.${k}`, problems);
        if (v !== undefined) st.record[k] = v;
      }
    }
  }
  // An own template carried with the calculation: kept as data here, read through the
  // core's check before it is used (own-templates.js).
  if (data.own !== undefined) {
    if (data.own && typeof data.own === 'object' && !Array.isArray(data.own)) st.own = data.own;
    else problems.push('own is not a template');
  }
  if (data.unsolved !== undefined) {
    if (typeof data.unsolved === 'boolean') st.unsolved = data.unsolved;
    else problems.push('unsolved is not true or false');
  }
  return { state: st, problems };
}

/** The state as it is written: only what differs from the defaults, plus the version. */
export function compactState(st) {
  const d = defaultState();
  const out = { v: STATE_VERSION, mode: st.mode };
  if (st.mode === 'template') out.template = st.template;
  if (st.mode === 'template' && st.own) out.own = st.own;
  if (st.mode === 'custom') out.equations = st.equations;
  if (st.mode !== 'external') {
    out.values = st.values;
    out.unknown = st.unknown;
    const unc = Object.entries(st.unc).filter(([, e]) => e.v.trim());
    if (unc.length) out.unc = Object.fromEntries(unc);
    if (st.trials) out.trials = st.trials;
    if (st.resultUnit) out.resultUnit = st.resultUnit;
    if (st.sweep.input) out.sweep = st.sweep;
  }
  if (st.start.kind !== 'default' || st.start.a || st.start.b) out.start = st.start;
  if (st.method !== d.method) out.method = st.method;
  if (Object.values(st.tol).some(Boolean)) out.tol = st.tol;
  if (st.mode === 'external') out.external = st.external;
  if (Object.values(st.record).some(Boolean)) out.record = st.record;
  if (st.unsolved && st.mode !== 'external') out.unsolved = true;
  return out;
}

// ---- URL fragment ---------------------------------------------------------------------

function toBase64Url(text) {
  const bytes = new TextEncoder().encode(text);
  let bin = '';
  for (let i = 0; i < bytes.length; i += 0x8000) bin += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return btoa(bin).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

function fromBase64Url(b64) {
  if (!/^[A-Za-z0-9_-]*$/.test(b64)) throw new Error('it contains characters that are not base64url');
  const bin = atob(b64.replace(/-/g, '+').replace(/_/g, '/') + '==='.slice((b64.length + 3) % 4));
  const bytes = Uint8Array.from(bin, (c) => c.charCodeAt(0));
  return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
}

export function encodeFragment(st) {
  return `#${FRAGMENT_KEY}${toBase64Url(JSON.stringify(compactState(st)))}`;
}

/** Reads a location.hash. Returns null when there is no calculation in it, else
 *  { state, problems } or { error } when it cannot be read at all. */
export function decodeFragment(hash) {
  if (!hash || hash === '#') return null;
  const body = hash.startsWith('#') ? hash.slice(1) : hash;
  if (!body.startsWith(FRAGMENT_KEY)) return { error: 'the link does not hold a calculation this page knows (it should start with #calc=)' };
  if (body.length > MAX_FRAGMENT) return { error: `the link is longer than ${MAX_FRAGMENT} characters` };
  let text;
  try {
    text = fromBase64Url(body.slice(FRAGMENT_KEY.length));
  } catch {
    // The browser's own words ("Failed to execute 'decode' on 'TextDecoder'") mean
    // nothing to the reader; say what probably happened.
    return { error: 'the link was cut short or changed after it was made, so its data cannot be read (copy the whole link again from where it came from)' };
  }
  let data;
  try {
    data = JSON.parse(text);
  } catch {
    return { error: 'the link\'s data is not valid JSON; it was probably cut short or edited' };
  }
  return validateState(data);
}
