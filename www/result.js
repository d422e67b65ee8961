// The result: the answer (or, when the solve failed, the words "no root found" with the
// last estimate as an estimate), why it can be trusted, the counts and settings, other
// quantities in the user's units, and the notes and caution. Also the mark that the inputs
// changed after the solve.

import { h, clear, byId } from './dom.js';
import { fmt, full, prettyUnit } from './format.js';
import { symbolMathML } from './mathml.js';
import { app, probe, hooks, currentTemplate, unknownList, meaningOf } from './ctx.js';
import { sampleCurve } from './solver.js';
import { settingsFacts } from './request.js';
import { updateAnswerLines } from './setup.js';
import { showHistory, showSystemHistory, RESIDUAL } from './history.js';
import { showSensitivities } from './sensitivity.js';
import { showUncertainty, hideUncertainty, staleUncertainty } from './uncertainty.js';


const CERT_WORDS = {
  bracket: 'The residual changes sign across an interval narrower than the step tolerance, and its size fell as the interval closed.',
  step: 'The last step was smaller than the step tolerance, and the residual fell with the steps.',
  residual: 'The residual is within the residual tolerance you set.',
  'exact-zero': 'The residual is exactly zero here, not merely by underflow: it changes sign around the answer or is non-zero right beside it.',
  touching: 'The residual has a minimum here that falls towards zero at least as fast as at a double root: the curve touches zero without crossing it.',
};

/** The evidence of convergence in plain words. */
export function certificateWords(c) {
  const why = CERT_WORDS[c.kind] ?? c.explanation;
  return c.kind === 'exact-zero' ? why : `${why} At the answer |residual| = ${fmt(c.residual, 2)} (the check allows at most ${fmt(c.bound, 2)} here).`;
}

const FAILURE_WORDS = {
  'budget-spent': 'The evaluation budget ran out before the answer settled.',
  flat: 'The residual had the same value at two points, so the next step could not be found.',
  diverging: 'The estimates ran away while the residual did not shrink.',
  oscillating: 'The estimates jumped back and forth without settling.',
  stagnated: 'The steps stopped making progress.',
  'no-sign-change': 'No sign change was found near the starting points.',
  'non-finite': 'The equation could not be evaluated (a value was undefined or infinite) where the search went.',
  'stuck-at-bound': "The search was stopped by the edge of the unknown's range.",
  discontinuity: 'The residual jumps across zero here (a pole or a step), which is not a root.',
  'large-residual': 'The steps settled, but the residual did not become small.',
  'zero-plateau': 'The residual is zero over a whole stretch, so no single answer is determined.',
};

/** What to try next, true for the case: a bracket is advised only when a sign change is known. */
function advice(r, unit, system) {
  if (system) {
    return 'On this page every unknown of a set starts at 1 (then 1.1), and from there the solver could not go on. Rescale the unknowns so that the answer is nearer 1, or give each unknown its own guesses through the JavaScript API (a problem whose unknowns each carry their guesses).';
  }
  if (r.bracket) {
    const [a, b] = r.bracket;
    return `The residual changes sign between ${fmt(a, 6)} and ${fmt(b, 6)}${unit ? ` ${unit}` : ''}: give these as a bracket under "Where to start the search", or raise the evaluation budget.`;
  }
  const sign = r.residual > 0 ? 'positive' : r.residual < 0 ? 'negative' : null;
  return `No sign change was seen${sign ? `: the residual stayed ${sign} at every point evaluated` : ''}. There may be no real root for these inputs. Scan a range of the unknown for roots to see where the residual comes closest to zero, and check the given values.`;
}

function fact(term, value, title) {
  return h('div', null, h('dt', null, term), h('dd', title ? { title } : null, value));
}

/** view: { answers: [{symbol, value, unit}], settings, notes, caution, outputs, residualLabel } */
export function showResult(r, view) {
  const body = clear(byId('result-body'));
  const card = byId('result');
  card.hidden = false;
  card.classList.remove('stale');
  const ok = r.converged === true;
  byId('result-h').textContent = ok ? 'Result' : 'No root found';
  if (ok) {
    for (const a of view.answers) {
      body.append(
        h('p', { class: 'answer' },
          h('span', { class: 'what' }, symbolMathML(a.symbol), ' ='),
          h('output', { class: 'big-number', 'data-testid': `answer-${a.symbol}`, 'data-value': full(a.value), title: `Full precision: ${full(a.value)}` }, fmt(a.value, 6)),
          h('span', { class: 'unit' }, a.unit),
          h('span', { class: 'full hint' }, `full precision ${full(a.value)}`),
        ),
      );
    }
  } else {
    const a = view.answers[0];
    body.append(
      h('p', { class: 'estimate', 'data-testid': 'estimate' },
        'Last estimate, not a root: ', symbolMathML(a?.symbol ?? 'x'), ` ≈ ${fmt(a?.value, 6)}${a?.unit ? ` ${a.unit}` : ''}`,
        view.answers.length > 1 ? `, ${view.answers.slice(1).map((b) => `${b.symbol} ≈ ${fmt(b.value, 6)}`).join(', ')}` : ''),
      h('p', null, `Smallest |residual| reached: ${fmt(Math.abs(r.residual), 3)}.`),
    );
  }
  const status = h('div', { class: `status ${ok ? 'good' : 'bad'}`, 'data-status': r.status }, h('strong', null, ok ? 'Converged' : 'No root found'));
  if (ok && r.certificate) status.append(h('span', { class: 'why' }, `Why it is a root: ${certificateWords(r.certificate)}`));
  if (!ok) {
    const system = view.answers.length > 1;
    const words = system && r.status === 'flat' ? 'The equations of the set did not change independently at the starting point (a singular Jacobian), so no step could be found.' : FAILURE_WORDS[r.status] ?? r.message;
    status.append(h('span', null, words));
    status.append(h('span', { class: 'advice' }, `What to try: ${advice(r, view.answers[0]?.unit, system)}`));
    if (!system) {
      const scan = h('button', { type: 'button', id: 'go-scan' }, 'Scan a range for roots');
      scan.addEventListener('click', () => hooks.openRoots?.());
      status.append(scan);
    }
  }
  body.append(status);
  const dl = h('dl', { class: 'facts' });
  dl.append(
    fact(view.residualLabel ?? RESIDUAL, fmt(r.residual, 3), full(r.residual)),
    fact('Evaluations', String(r.evaluations)),
    fact('Iterations', String(r.iterations)),
  );
  if (r.sensitivityEvaluations) dl.append(fact('Extra evaluations to find the sensitivities', String(r.sensitivityEvaluations)));
  for (const [term, text] of view.settings) dl.append(fact(term, text));
  body.append(dl);
  if (view.outputs?.length) body.append(outputsTable(view.outputs));
  const defs = r.definitions && !view.outputs?.length ? Object.entries(r.definitions) : [];
  if (defs.length) {
    const tb = h('tbody');
    for (const [name, v] of defs) tb.append(h('tr', null, h('td', null, symbolMathML(name)), h('td', { class: 'mono', title: full(v) }, fmt(v, 6))));
    body.append(h('div', { class: 'table-wrap', tabindex: '0', role: 'region', 'aria-label': 'Intermediate quantities (scrolls sideways on a narrow screen)' }, h('table', { class: 'numbers' }, h('caption', null, 'Intermediate quantities at the solution, in the units of your equations'), tb)));
  }
  if (view.notes?.length) body.append(h('h3', null, 'Notes on this result'), h('ul', { class: 'notes' }, view.notes.map((n) => h('li', null, n))));
  if (view.caution) body.append(h('p', { class: 'caution', role: 'note' }, view.caution));
}

function outputsTable(outputs) {
  const tb = h('tbody');
  for (const o of outputs) {
    tb.append(h('tr', null, h('td', null, symbolMathML(o.symbol)), h('td', null, o.meaning ?? ''), h('td', { class: 'mono', title: full(o.value) }, fmt(o.value, 6)), h('td', null, prettyUnit(o.unit))));
  }
  return h('div', { class: 'table-wrap', tabindex: '0', role: 'region', 'aria-label': 'Other quantities (scrolls sideways on a narrow screen)' }, h('table', { class: 'numbers outputs' }, h('caption', null, 'Other quantities at the solution'), tb));
}

/** Shows a solve of the built request: result, history, sensitivities, roots. */
export function presentResult(built, r) {
  const S = app.S;
  const t = currentTemplate();
  let answers;
  let xLabel;
  const unit = prettyUnit(r.unit ?? '');
  if (built.kind === 'template') {
    answers = [{ symbol: S.unknown, value: r.value, unit }];
    xLabel = `${S.unknown}${unit ? ` (${unit})` : ''}`;
  } else {
    answers = Object.entries(r.unknowns).map(([symbol, value]) => ({ symbol, value, unit: prettyUnit(r.units?.[symbol] ?? '') }));
    xLabel = `${unknownList()[0] ?? 'x'}${unit ? ` (${unit})` : ''}`;
  }
  const residualLabel = built.kind === 'template' || built.own ? 'Residual (left − right side of the equation, SI units)' : 'Residual (left − right side, in your units)';
  showResult(r, {
    answers,
    outputs: r.outputs ?? [],
    residualLabel,
    settings: settingsFacts({ ...built.req, ...built.start }, unit),
    notes: r.notes ?? [],
    caution: r.caution || (t?.caution ?? ''),
  });
  byId('announce').textContent = r.converged
    ? `${answers.map((a) => `${a.symbol} = ${fmt(a.value, 6)} ${a.unit}`).join(', ')}: converged.`
    : 'No root found.';
  probe.solves++;
  if (probe.firstSolveMs === null) probe.firstSolveMs = performance.now();
  // Every x of the result (history, bracket, roots) is already in the unit chosen.
  const history = r.history ?? [];
  const shortLabel = built.kind === 'template' || built.own ? 'residual (left − right, SI)' : RESIDUAL;
  if (history.length) showHistory(history, sampleCurve(app.lastResult?.problem, history), xLabel, shortLabel);
  else showSystemHistory(r.systemHistory, Object.keys(r.unknowns ?? {}), '‖residual‖');
  showSensitivities(r.sensitivities, meaningOf);
  hooks.showRootsCard?.(built, r);
  showUncertainty(built, r, S.unknown.split(',')[0]);
  for (const id of ['history', 'sensitivity', 'roots']) byId(id).classList.remove('stale');
  updateAnswerLines();
}

export function hideResults() {
  for (const id of ['result', 'history', 'sensitivity']) byId(id).hidden = true;
  hideUncertainty();
}

/** The inputs changed after the last solve: every result shown says so until the next. */
export function markStale() {
  updateAnswerLines();
  staleUncertainty();
  if (!app.lastResult || !app.S.unsolved) return;
  const card = byId('result');
  if (card.classList.contains('stale')) return;
  for (const id of ['result', 'history', 'sensitivity', 'roots']) byId(id).classList.add('stale');
  byId('result-h').textContent = 'Result: not solved for these inputs';
  const note = h('p', { class: 'stale-note', role: 'status' }, 'Not solved for these inputs. The inputs changed after this result was found; press Solve to bring it up to date. The figures below belong to the earlier inputs.');
  byId('result-body').prepend(note);
}

