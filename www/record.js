// The printed record: project, prepared by and checked by (typed on the page, kept in the
// link), the date and the tool's version at its head; the rest is the page itself under
// the print styles (page numbers, headings kept with what follows them).

import { byId } from './dom.js';
import { app, writeUrl } from './ctx.js';
import { version } from './solver.js';

const FIELDS = { project: 'Project', preparedBy: 'Prepared by', checkedBy: 'Checked by' };

function stamp() {
  const d = new Date();
  const p2 = (n) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p2(d.getMonth() + 1)}-${p2(d.getDate())} ${p2(d.getHours())}:${p2(d.getMinutes())} (local time)`;
}

/** Fills the record's head from the page. */
export function stampRecord() {
  for (const [k, label] of Object.entries(FIELDS)) {
    const v = app.S.record[k].trim();
    byId(`head-${k}`).textContent = `${label}: ${v || '________________'}`;
  }
  byId('record-date').textContent = `Date: ${stamp()}`;
  byId('record-tool').textContent = `tacit ${version()}`;
}

export function wireRecord() {
  for (const k of Object.keys(FIELDS)) {
    byId(`record-${k}`).addEventListener('input', (e) => {
      app.S.record[k] = e.target.value;
      stampRecord();
      writeUrl();
    });
  }
  byId('print-record').addEventListener('click', () => window.print());
  window.addEventListener('beforeprint', stampRecord);
}
