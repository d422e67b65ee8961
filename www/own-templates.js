// Templates of one's own in the page: kept in this browser (as the core's exchange file),
// listed under "My templates" in the catalogue and opened like a bundled one, carried in
// links and saved calculations, exported and imported as a file. Every template is read
// through the core's check (solver.js); nothing in one runs, and its text goes into the
// page as text. A template met in a link is used for that visit and kept only on request.

import { h, clear, byId, download } from './dom.js';
import { app, hooks, notify, confirmInPage, CAUTION } from './ctx.js';
import { buildCatalogueNav, OWN_FIELD } from './catalogue.js';
import { checkOwn, readOwn, writeOwn } from './solver.js';
import { readOwnStored, writeOwnStored, backupOwnStored } from './storage.js';

app.own = [];
// Templates from links and saved calculations for this visit: { t, id, from } (id is
// `link:…` when one of My templates has the same id and other content).
app.ownLinked = [];

const sameTemplate = (a, b) => JSON.stringify(a) === JSON.stringify(b);

/** The units offered for a variable: its own first, then the others of its dimension. */
function unitsLike(u) {
  if (!u) return [];
  for (const list of app.units.values()) {
    const names = list.map((x) => (typeof x === 'string' ? x : x.unit ?? x.symbol ?? x.name));
    if (names.includes(u)) return [u, ...names.filter((x) => x && x !== u)];
  }
  return [u];
}

/** The page's view of an own template (the shape normalizeTemplate gives a bundled one). */
export function ownToPage(t, id = t.id, from = '') {
  const vars = t.variables.map((v) => ({
    symbol: v.name, meaning: v.meaning ?? '', dimension: '', unit: v.unit ?? '', units: unitsLike(v.unit),
    example: v.value ?? undefined, guesses: v.guesses ?? undefined, bounds: v.bounds ?? undefined, raw: v,
  }));
  const validity = t.validity ?? '';
  const note = validity.replace(CAUTION, '').trim();
  return {
    id, own: true, linked: Boolean(from), raw: t,
    title: from ? `${t.title} (from ${from})` : t.title,
    field: OWN_FIELD,
    summary: t.description ?? '',
    equations: t.equations,
    variables: vars,
    defaultUnknown: t.unknown ?? vars.find((v) => v.example === undefined)?.symbol ?? vars[0]?.symbol ?? '',
    notes: note ? [note] : [],
    caution: validity.includes(CAUTION) ? CAUTION : '',
    allowedUnknowns: null,
    unknownsReason: '',
    source: t.source ?? '',
    list: null,
    keywords: ['my', 'own'],
  };
}

/** Reads My templates from storage; a damaged entry is named and put aside, the rest kept. */
export function loadOwn() {
  const text = readOwnStored();
  if (typeof text !== 'string') return;
  try {
    app.own = readOwn(text);
    return;
  } catch (e) {
    // One bad entry must not cost the others: check them one by one.
    const problems = [];
    let list = null;
    try {
      list = JSON.parse(text)?.templates;
    } catch { /* named below */ }
    if (!Array.isArray(list)) problems.push(e.message);
    else {
      list.forEach((t, i) => {
        try {
          const ok = checkOwn(t);
          if (!app.own.some((o) => o.id === ok.id)) app.own.push(ok);
        } catch (err) {
          problems.push(`entry ${i + 1}: ${err.message}`);
        }
      });
    }
    const b = backupOwnStored(text);
    if (b) storeOwn();
    notify(`My templates in this browser: ${problems.join('; ')}.${b ? ` The stored text was kept under the storage key ${b}.` : ''} Everything else was kept.`);
  }
}

function storeOwn() {
  let text;
  try {
    text = writeOwn(app.own);
  } catch (e) {
    notify(`My templates could not be written: ${e.message}`);
    return;
  }
  const err = writeOwnStored(text);
  if (err) notify(err);
}

/** Puts My templates (and those from links) in the catalogue and the list beside it. */
export function refreshOwn() {
  for (const [id, t] of app.byId) if (t.own) app.byId.delete(id);
  const pages = [...app.own.map((t) => ownToPage(t)), ...app.ownLinked.map((l) => ownToPage(l.t, l.id, l.from))];
  for (const t of pages) app.byId.set(t.id, t);
  app.nav = buildCatalogueNav(byId('template-groups'), byId('search-empty'), [...app.templates, ...pages], (id) => hooks.pickTemplate?.(id));
  app.nav.select(app.S.mode === 'template' ? app.S.template : null);
  if (byId('search').value) app.nav.filter(byId('search').value);
  renderOwnList(pages);
}

/** A calculation that carries an own template: the template read through the core's
 *  check and registered for this visit. Returns the catalogue id to open, or null (the
 *  reason pushed to problems; nothing stored changes). */
export function adoptOwn(data, problems, source = 'link') {
  let t;
  try {
    t = checkOwn(data);
  } catch (e) {
    problems.push(`its own template could not be used (${e.message})`);
    return null;
  }
  const mine = app.own.find((o) => o.id === t.id);
  if (mine && sameTemplate(mine, t)) return t.id;
  const known = app.ownLinked.find((l) => sameTemplate(l.t, t));
  if (known) return known.id;
  const id = mine ? `link:${t.id}` : t.id;
  app.ownLinked = [...app.ownLinked.filter((l) => l.id !== id), { t, id, from: source.startsWith('saved') ? 'a saved calculation' : 'a link' }];
  refreshOwn();
  return id;
}

/** Adds or replaces one of My templates (replacing `oldId` when editing). Returns an error
 *  message, or null. */
export function putOwn(t, oldId = null) {
  const clash = app.own.find((o) => o.id === t.id && o.id !== oldId);
  if (clash) return `the short name "${t.id}" is already used by your template "${clash.title}"; choose another`;
  const i = oldId === null ? -1 : app.own.findIndex((o) => o.id === oldId);
  if (i >= 0) app.own[i] = t;
  else app.own.push(t);
  // A template from a link under the same id steps aside (or goes, when it is the same).
  app.ownLinked = app.ownLinked.filter((l) => l.id !== t.id || !sameTemplate(l.t, t)).map((l) => (l.id === t.id ? { ...l, id: `link:${t.id}` } : l));
  storeOwn();
  refreshOwn();
  return null;
}

function keepLinked(l) {
  let t = l.t;
  if (app.own.some((o) => o.id === t.id)) {
    let n = 2;
    while (app.own.some((o) => o.id === `${l.t.id}-${n}`)) n++;
    t = { ...t, id: `${l.t.id}-${n}`.slice(-64) };
  }
  app.ownLinked = app.ownLinked.filter((x) => x !== l);
  const err = putOwn(t);
  notify(err ?? `Kept "${t.title}" in My templates${t.id !== l.t.id ? ` under the short name ${t.id} (yours keeps ${l.t.id})` : ''}.`, err ? 'warn' : 'info');
}

function renderOwnList(pages) {
  const ul = clear(byId('own-list'));
  byId('own-empty').hidden = pages.length > 0;
  for (const p of pages) {
    const title = p.title;
    const li = h('li', { 'data-own': p.id }, h('span', { class: 'saved-name' }, title));
    const button = (label, fn, cls) => {
      const b = h('button', { type: 'button', class: cls, 'aria-label': `${label} ${title}` }, label);
      b.addEventListener('click', fn);
      li.append(b);
    };
    button('Open', () => hooks.pickTemplate?.(p.id));
    if (p.linked) {
      button('Keep', () => keepLinked(app.ownLinked.find((l) => l.id === p.id)), 'quiet');
    } else {
      button('Edit', () => hooks.editOwn?.(p.raw), 'quiet');
      button('Delete', () => deleteOwn(li, p.raw), 'quiet');
    }
    ul.append(li);
  }
}

async function deleteOwn(li, t) {
  if (!(await confirmInPage(li, `Delete your template "${t.title}" from this browser?`, 'Delete', 'Keep'))) {
    li.querySelector('button[aria-label^="Delete"]')?.focus();
    return;
  }
  const i = app.own.indexOf(t);
  if (i < 0) return;
  app.own.splice(i, 1);
  storeOwn();
  refreshOwn();
  const n = notify(`Deleted your template "${t.title}". Links and saved calculations that use it still carry it.`, 'info');
  const undo = h('button', { type: 'button' }, 'Undo');
  undo.addEventListener('click', () => {
    n.remove();
    const err = putOwn(t);
    notify(err ?? `"${t.title}" is back in My templates.`, err ? 'warn' : 'info');
  });
  n.querySelector('p').after(undo);
}

export function exportOwn() {
  if (!app.own.length) {
    notify('There are none of My templates to export yet.', 'info');
    return;
  }
  try {
    download('tacit-my-templates.json', writeOwn(app.own), 'application/json');
  } catch (e) {
    notify(`My templates could not be exported: ${e.message}`);
  }
}

/** Imports a file of own templates: the whole file is checked first (a bad one changes
 *  nothing); a template already in the list is not added twice. */
export async function importOwn(ev) {
  const file = ev.target.files?.[0];
  ev.target.value = '';
  if (!file) return;
  let list;
  try {
    list = readOwn(await file.text());
  } catch (e) {
    notify(`Import of My templates: ${e.message}. Nothing was changed.`);
    return;
  }
  let added = 0;
  let twice = 0;
  const clashes = [];
  for (const t of list) {
    const mine = app.own.find((o) => o.id === t.id);
    if (!mine) {
      app.own.push(t);
      added++;
    } else if (sameTemplate(mine, t)) twice++;
    else clashes.push(t.id);
  }
  if (added) {
    storeOwn();
    refreshOwn();
  }
  const words = [`Imported ${added} template${added === 1 ? '' : 's'} into My templates.`];
  if (twice) words.push(`${twice} already in the list ${twice === 1 ? 'was' : 'were'} not added again.`);
  if (clashes.length) words.push(`Not imported, because one of yours has the same short name and other content: ${clashes.join(', ')} (edit yours to rename it, then import again).`);
  notify(words.join(' '), clashes.length ? 'warn' : 'info');
}
