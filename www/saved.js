// Saved calculations in this browser: save, open, rename, delete (after asking), and the
// list exported to and imported from a JSON file (entries already in the list are not
// added twice).

import { h, clear, byId } from './dom.js';
import { app, hooks, notify, currentTemplate, confirmInPage } from './ctx.js';
import { compactState } from './state.js';
import { writeSaved, importText, newId } from './storage.js';

export function renderSaved() {
  const ul = clear(byId('saved-list'));
  byId('saved-empty').hidden = app.saved.length > 0;
  for (const item of app.saved) {
    const name = h('span', { class: 'saved-name' }, item.name);
    const open = h('button', { type: 'button', 'aria-label': `Open ${item.name}` }, 'Open');
    const rename = h('button', { type: 'button', class: 'quiet', 'aria-label': `Rename ${item.name}` }, 'Rename');
    const del = h('button', { type: 'button', class: 'quiet', 'aria-label': `Delete ${item.name}` }, 'Delete');
    const when = item.saved ? h('span', { class: 'saved-when' }, new Date(item.saved).toLocaleString()) : null;
    const li = h('li', { 'data-id': item.id }, name, open, rename, del, when);
    open.addEventListener('click', () => hooks.openState?.(structuredClone(item.state), `saved calculation "${item.name}"`));
    rename.addEventListener('click', () => startRename(li, item));
    del.addEventListener('click', async () => {
      if (!(await confirmInPage(li, `Delete "${item.name}" from this browser?`, 'Delete', 'Keep'))) {
        li.querySelector('button[aria-label^="Delete"]')?.focus();
        return;
      }
      app.saved = app.saved.filter((x) => x !== item);
      storeSaved();
      notify(`Deleted "${item.name}".`, 'info');
    });
    ul.append(li);
  }
}

function startRename(li, item) {
  const input = h('input', { type: 'text', value: item.name, maxlength: '200', 'aria-label': `New name for ${item.name}` });
  const ok = h('button', { type: 'button' }, 'Keep');
  clear(li).append(h('span', { class: 'row' }, input, ok));
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

export function saveCurrent(ev) {
  ev.preventDefault();
  const nameEl = byId('save-name');
  const t = currentTemplate();
  const name = nameEl.value.trim() || (t ? t.title : app.S.mode === 'custom' ? 'Own equations' : app.S.external.label || 'Evaluation by hand');
  app.saved.unshift({ id: newId(), name, saved: new Date().toISOString(), state: structuredClone(compactState(app.S)) });
  nameEl.value = '';
  storeSaved();
  notify(`Saved as "${name}".`, 'info');
}

/** Two entries are the same when their names and calculations are. */
const sameKey = (item) => `${item.name}\u0000${JSON.stringify(item.state)}`;

export async function importSaved(ev) {
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
  const have = new Set(app.saved.map(sameKey));
  const fresh = r.items.filter((item) => {
    const k = sameKey(item);
    if (have.has(k)) return false;
    have.add(k);
    return true;
  });
  const skipped = r.items.length - fresh.length;
  app.saved = [...fresh, ...app.saved];
  storeSaved();
  const words = `Imported ${fresh.length} calculation${fresh.length === 1 ? '' : 's'}${skipped ? `; ${skipped} already in the list ${skipped === 1 ? 'was' : 'were'} not added again` : ''}.`;
  notify(`${words}${r.problems.length ? ` Some parts could not be used: ${r.problems.join('; ')}` : ''}`, r.problems.length ? 'warn' : 'info');
}
