// The saved list and the external-evaluation record in localStorage.
//
// Reading never throws: a damaged entry is reported and left out, and the damaged text is
// copied to a backup key before anything is written over it, so nothing is lost.

import { validateState, compactState } from './state.js';

export const SAVED_KEY = 'tacit.saved.v1';
export const EXTERNAL_KEY = 'tacit.external.v1';
export const OWN_KEY = 'tacit.own-templates.v1';
const FILE_FORMAT = 'tacit-saved-list';

function store() {
  try {
    return window.localStorage;
  } catch {
    return null;
  }
}

function backup(key, text) {
  const s = store();
  if (!s) return null;
  const name = `${key}.damaged.${new Date().toISOString().replace(/[:.]/g, '-')}`;
  try {
    s.setItem(name, text);
    return name;
  } catch {
    return null;
  }
}

function checkEntry(e, place, problems) {
  if (!e || typeof e !== 'object' || Array.isArray(e)) { problems.push(`${place} is not an object`); return null; }
  if (typeof e.name !== 'string' || e.name.length === 0 || e.name.length > 200) { problems.push(`${place} has no usable name`); return null; }
  const { state, problems: sp } = validateState(e.state);
  if (sp.length) problems.push(`${place} ("${e.name.slice(0, 40)}"): ${sp.join('; ')}`);
  return {
    id: typeof e.id === 'string' && /^[a-z0-9-]{1,40}$/.test(e.id) ? e.id : newId(),
    name: e.name,
    saved: typeof e.saved === 'string' && e.saved.length <= 40 ? e.saved : '',
    state: compactState(state),
  };
}

export function newId() {
  return `s-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 8)}`;
}

/** Reads a key; a storage that throws (blocked, or broken by an extension) reads as
 *  `undefined`, which callers treat as "storage is not available". */
function read(s, key) {
  try {
    return s.getItem(key);
  } catch {
    return undefined;
  }
}

function remove(s, key) {
  try {
    s.removeItem(key);
  } catch {
    /* nothing was removed; the text stays where it was */
  }
}

const NO_STORAGE = 'this browser does not allow storage here, so saving is off';

/** Returns { items, problems }. */
export function loadSaved() {
  const s = store();
  if (!s) return { items: [], problems: [NO_STORAGE] };
  const text = read(s, SAVED_KEY);
  if (text === undefined) return { items: [], problems: [NO_STORAGE] };
  if (text === null) return { items: [], problems: [] };
  let data;
  try {
    data = JSON.parse(text);
  } catch {
    const b = backup(SAVED_KEY, text);
    if (b) remove(s, SAVED_KEY);
    return { items: [], problems: [`the saved list in this browser was damaged and could not be read${b ? `; its text was kept under the storage key ${b}` : ''}`] };
  }
  const list = data && Array.isArray(data.items) ? data.items : null;
  if (!list) {
    const b = backup(SAVED_KEY, text);
    if (b) remove(s, SAVED_KEY);
    return { items: [], problems: [`the saved list in this browser has an unknown shape${b ? `; its text was kept under the storage key ${b}` : ''}`] };
  }
  const problems = [];
  const items = [];
  list.forEach((e, i) => {
    const item = checkEntry(e, `saved entry ${i + 1}`, problems);
    if (item) items.push(item);
  });
  if (problems.length) {
    const b = backup(SAVED_KEY, text);
    if (b) {
      problems.push(`the original text was kept under the storage key ${b}`);
      // With the original safe in the backup, keep only what could be read, so the same
      // message does not come back (and another backup is not made) on every visit.
      writeSaved(items);
    }
  }
  return { items, problems };
}

/** Returns an error message, or null. */
export function writeSaved(items) {
  const s = store();
  if (!s) return 'storage is not available in this browser';
  try {
    s.setItem(SAVED_KEY, JSON.stringify({ format: FILE_FORMAT, version: 1, items }));
    return null;
  } catch (e) {
    return `the saved list could not be written (${e.name}); storage may be full`;
  }
}

export function exportText(items) {
  return JSON.stringify({ format: FILE_FORMAT, version: 1, exported: new Date().toISOString(), items }, null, 2);
}

/** Reads an exported file. Returns { items, problems } or { error }. */
export function importText(text) {
  let data;
  try {
    data = JSON.parse(text);
  } catch {
    return { error: 'the file is not JSON' };
  }
  if (!data || data.format !== FILE_FORMAT || !Array.isArray(data.items)) {
    return { error: `the file is not a saved list from this page (its "format" should be "${FILE_FORMAT}")` };
  }
  if (data.items.length > 5000) return { error: 'the file has more than 5000 entries' };
  const problems = [];
  const items = [];
  data.items.forEach((e, i) => {
    const item = checkEntry(e, `entry ${i + 1}`, problems);
    if (item) items.push(item);
  });
  return { items, problems };
}

export function loadExternal() {
  const s = store();
  if (!s) return null;
  const text = read(s, EXTERNAL_KEY);
  if (text === null || text === undefined) return null;
  try {
    const data = JSON.parse(text);
    if (!data || typeof data.stepper !== 'string' || data.stepper.length > 100000) throw new Error('shape');
    return { stepper: data.stepper, label: typeof data.label === 'string' ? data.label.slice(0, 200) : '' };
  } catch {
    const b = backup(EXTERNAL_KEY, text);
    if (b) remove(s, EXTERNAL_KEY);
    return { error: `the stored external evaluation was damaged${b ? `; its text was kept under the storage key ${b}` : ''}` };
  }
}

/** Copies the kept evaluation by hand to a backup key; returns the key, or null when
 *  there is nothing kept (or storage refuses). */
export function backupExternal() {
  const s = store();
  if (!s) return null;
  const text = read(s, EXTERNAL_KEY);
  return typeof text === 'string' ? backup(EXTERNAL_KEY, text) : null;
}

/** Writes the evaluation by hand; `null` removes it, after a copy is put aside (and not at
 *  all when the copy cannot be made). Returns the backup key when one was made. */
export function writeExternal(record) {
  const s = store();
  if (!s) return null;
  try {
    if (record) {
      s.setItem(EXTERNAL_KEY, JSON.stringify(record));
      return null;
    }
    const text = read(s, EXTERNAL_KEY);
    if (typeof text !== 'string') return null;
    const key = backup(EXTERNAL_KEY, text);
    if (key) remove(s, EXTERNAL_KEY);
    return key;
  } catch {
    /* storage full: the fragment still holds the record */
    return null;
  }
}

/** The stored text of My templates: null when none, undefined when storage is off. */
export function readOwnStored() {
  const s = store();
  return s ? read(s, OWN_KEY) : undefined;
}

/** Copies the stored text of My templates aside; returns the backup key or null. */
export const backupOwnStored = (text) => backup(OWN_KEY, text);

/** Writes My templates (the exchange file's text); returns an error message, or null. */
export function writeOwnStored(text) {
  const s = store();
  if (!s) return 'storage is not available in this browser, so My templates last only while this page is open';
  try {
    s.setItem(OWN_KEY, text);
    return null;
  } catch (e) {
    return `My templates could not be stored (${e.name}: ${e.name === 'QuotaExceededError' ? 'storage is full' : 'this browser refuses storage here'}), so changes last only while this page is open`;
  }
}
