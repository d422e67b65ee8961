// All roots in a range: the other branches a template names, a scan of a range the user
// gives, and a button per root that solves again from it.

import { h, clear, byId } from './dom.js';
import { fmt, full, prettyUnit } from './format.js';
import { app, hooks, unknownList, FormError, readNumber, writeUrl } from './ctx.js';
import { rootsIn } from './solver.js';

export function showRootsCard(built, r) {
  const card = byId('roots');
  const single = built.kind === 'template' || unknownList().length === 1;
  card.hidden = !single;
  if (!single) return;
  const root = built.kind === 'template' ? r.value : r.root;
  const unit = prettyUnit(r.unit);
  if (!byId('roots-lo').value && !byId('roots-hi').value && Number.isFinite(root)) {
    // A failed solve's estimate may sit anywhere: offer a wider range around it.
    const span = r.converged ? Math.abs(root) || 1 : Math.max(Math.abs(root), 1);
    byId('roots-lo').value = full(Number((root - span).toPrecision(3)));
    byId('roots-hi').value = full(Number((root + span).toPrecision(3)));
  }
  byId('roots-unit').textContent = unit ? `Range of ${unknownList()[0]}, in ${unit}` : `Range of ${unknownList()[0] ?? 'x'}`;
  const body = clear(byId('roots-body'));
  card.classList.toggle('has-roots', Boolean(r.otherRoots?.length));
  if (r.otherRoots?.length && r.converged) {
    const labelled = (x, label) => `${fmt(x, 6)}${unit ? ` ${unit}` : ''}${label ? ` (${label})` : ''}`;
    body.append(h('p', null, `This equation has another branch: the solver also found ${r.otherRoots.map((o) => labelled(o.value, o.label)).join(', ')}.`));
    body.append(rootChoiceList([root, ...r.otherRoots.map((o) => o.value)].map((x) => ({ x, kind: 'sign-change' })), unit));
  }
}

/** From a failed solve: show the card and put the keyboard in its first field. */
export function openRoots() {
  const card = byId('roots');
  card.hidden = false;
  card.scrollIntoView({ block: 'start' });
  byId('roots-lo').focus();
}

function rootChoiceList(roots, unit) {
  const ul = h('ul', { class: 'roots-list' });
  roots.forEach((rt, i) => {
    const b = h('button', { type: 'button' }, 'Solve for this one');
    b.addEventListener('click', () => chooseRoot(rt.x));
    const kind = rt.kind === 'touching' ? 'touching (no sign change)' : rt.kind === 'proven' ? 'proven the only root in its interval' : 'sign change';
    ul.append(h('li', null, h('span', { class: 'mono' }, `${i + 1}. ${fmt(rt.x, 10)}${unit ? ` ${unit}` : ''}`), h('span', { class: 'hint' }, rt.label ? `${rt.label}, ${kind}` : kind), b));
  });
  return ul;
}

function chooseRoot(x) {
  const d = Math.abs(x) * 1e-6 || 1e-6;
  app.S.start = { kind: 'guesses', a: full(x - d), b: full(x + d) };
  hooks.renderStart?.();
  writeUrl();
  hooks.solve?.();
}

/** Scans the range, or with `proven` proves every root in it (regions unique, none, undecided). */
export function scanRoots(proven = false) {
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
    found = rootsIn(last, lo, hi, proven ? { proven: true } : {});
  } catch (e) {
    body.append(h('p', { class: 'error-text' }, e.message));
    return;
  }
  const unit = prettyUnit(last.r.unit ?? '');
  const u = unit ? ` ${unit}` : '';
  byId('roots').classList.toggle('has-roots', found.roots.length > 0);
  if (found.roots.length === 0) body.append(h('p', null, `No root between ${fmt(lo)} and ${fmt(hi)}${u}.`));
  else {
    body.append(h('p', null, `${found.roots.length} root${found.roots.length === 1 ? '' : 's'} between ${fmt(lo)} and ${fmt(hi)}${u} (${found.evaluations} evaluations). Choose the one you mean:`));
    body.append(rootChoiceList(found.roots, unit));
  }
  if (found.proven) {
    const undecided = found.regions.filter((g) => g.kind === 'undecided');
    for (const g of undecided) {
      body.append(h('p', { class: 'error-text' }, `Undecided from ${fmt(g.lo)} to ${fmt(g.hi)}${u}: ${g.explanation ?? g.why}. A root there is neither proven nor excluded.`));
    }
  }
  if (found.limits) body.append(h('p', { class: 'hint' }, found.limits));
}
