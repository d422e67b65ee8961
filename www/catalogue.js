// The template catalogue as the page uses it, read from tacit's catalogue() and grouped
// by field, with the search.

import { h, clear } from './dom.js';

const pick = (o, ...keys) => {
  for (const k of keys) if (o && o[k] !== undefined && o[k] !== null) return o[k];
  return undefined;
};
const asText = (v) => (v === undefined || v === null ? '' : String(v));
const capitalize = (s) => s.charAt(0).toUpperCase() + s.slice(1);
const asList = (v) => (Array.isArray(v) ? v.map(asText) : v ? [asText(v)] : []);

function normalizeVariable(v) {
  const unit = asText(pick(v, 'unit', 'defaultUnit', 'default_unit'));
  let units = pick(v, 'units', 'unitChoices', 'unit_choices');
  units = Array.isArray(units) ? units.map(asText) : [];
  if (unit && !units.includes(unit)) units.unshift(unit);
  const example = pick(v, 'example', 'default', 'value', 'sample');
  return {
    symbol: asText(v.symbol),
    meaning: asText(pick(v, 'meaning', 'description', 'name', 'label')),
    dimension: asText(pick(v, 'dimension', 'quantity')),
    unit,
    units,
    example: typeof example === 'number' ? example : example !== undefined && example !== '' ? Number(example) : undefined,
    guesses: pick(v, 'guesses'),
    bounds: pick(v, 'bounds'),
    raw: v,
  };
}

/** The page's view of one template, whatever the exact field names of the catalogue. */
export function normalizeTemplate(t) {
  const vars = (pick(t, 'variables', 'vars', 'quantities') || []).map(normalizeVariable);
  return {
    id: asText(t.id),
    title: asText(pick(t, 'title', 'name', 'label')) || asText(t.id),
    field: capitalize(asText(pick(t, 'field', 'group', 'category', 'area')) || 'other'),
    summary: asText(pick(t, 'summary', 'description', 'purpose')),
    equations: asText(pick(t, 'equations', 'equation', 'text', 'source')),
    variables: vars,
    defaultUnknown: asText(pick(t, 'defaultUnknown', 'default_unknown', 'unknown', 'solveFor')) || vars[0]?.symbol || '',
    notes: asList(pick(t, 'notes', 'validity', 'validityNotes')),
    caution: pick(t, 'caution') ? asText(t.caution) : '',
    allowedUnknowns: Array.isArray(t.unknowns) && t.unknowns.length ? t.unknowns.map(asText) : null,
    unknownsReason: asText(pick(t, 'unknowns_reason', 'unknownsReason')),
    source: asText(t.source),
    list: t.list && typeof t.list === 'object' ? t.list : null,
    keywords: asList(pick(t, 'keywords', 'tags')),
    raw: t,
  };
}

/** The catalogue's group of one's own templates (own-templates.js), listed first. */
export const OWN_FIELD = 'My templates';

export function groupByField(templates) {
  const groups = new Map();
  for (const t of templates) {
    if (!groups.has(t.field)) groups.set(t.field, []);
    groups.get(t.field).push(t);
  }
  return [...groups.entries()].sort((a, b) => (b[0] === OWN_FIELD) - (a[0] === OWN_FIELD) || a[0].localeCompare(b[0]));
}

function matches(t, words) {
  const hay = [t.title, t.field, t.summary, t.id, ...t.keywords, ...t.variables.map((v) => `${v.symbol} ${v.meaning}`)]
    .join(' ')
    .toLowerCase();
  return words.every((w) => hay.includes(w));
}

/** Builds the grouped list; onPick(id) is called when one is chosen. Returns { select(id), filter(text) }. */
export function buildCatalogueNav(container, emptyNote, templates, onPick) {
  clear(container);
  const buttons = new Map();
  const groupEls = [];
  for (const [field, list] of groupByField(templates)) {
    const ul = h('ul');
    const items = [];
    for (const t of list) {
      const b = h('button', { type: 'button', 'data-template': t.id }, t.title);
      b.addEventListener('click', () => onPick(t.id));
      const li = h('li', null, b);
      ul.append(li);
      buttons.set(t.id, b);
      items.push({ t, li });
    }
    const count = h('span', { class: 'count' }, ` (${list.length})`);
    const det = h('details', null, h('summary', null, field, count), ul);
    container.append(det);
    groupEls.push({ det, items, count });
  }
  let current = null;
  const openCurrent = () => {
    for (const g of groupEls) if (g.items.some(({ t }) => t.id === current)) g.det.open = true;
  };
  return {
    select(id) {
      current = id;
      for (const [tid, b] of buttons) b.setAttribute('aria-current', tid === id ? 'true' : 'false');
      openCurrent();
    },
    filter(text) {
      const words = text.toLowerCase().split(/\s+/).filter(Boolean);
      let any = false;
      for (const g of groupEls) {
        let n = 0;
        for (const { t, li } of g.items) {
          const ok = words.length === 0 || matches(t, words);
          li.hidden = !ok;
          if (ok) n++;
        }
        g.det.hidden = n === 0;
        g.det.open = words.length > 0 && n > 0;
        g.count.textContent = ` (${n})`;
        any ||= n > 0;
      }
      emptyNote.hidden = any;
      if (words.length === 0) openCurrent();
    },
  };
}
