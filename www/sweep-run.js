// Runs a sweep job: one unknown solved across a range of one input, each solve starting
// from the previous root. Used by the sweep worker, and by the benchmark on the page thread.
//
// job = { kind: 'equation', request }  request as for tacit's sweep(); run in chunks
//     | { kind: 'template', request, input, from, to, points }  request as for
//       solveTemplate(); the input's value is set at each point

import { sweep, solveTemplate } from '../dist/pkg/tacit.js';

const CHUNK = 100;

export function isTrap(e) {
  return e instanceof WebAssembly.RuntimeError || /unreachable|RuntimeError|internal-panic|instance-aborted/.test(`${e && e.code} ${e && e.message}`);
}
function emptyResult() {
  return { input: [], root: [], status: [], converged: [], evaluations: [], totalEvaluations: 0 };
}

function nextGuesses(r) {
  const d = Math.abs(r) * 1e-3 || 1e-3;
  return [r, r + d];
}

function sweepEquation(request, progress) {
  const total = request.points;
  const out = emptyResult();
  const step = (request.to - request.from) / (total - 1);
  let guesses = request.guesses;
  let i = 0;
  while (i < total) {
    // Chunks of at least two points, since a sweep has at least two.
    let n = Math.min(CHUNK, total - i);
    if (total - i - n === 1) n += 1;
    const from = request.from + step * i;
    const to = i + n === total ? request.to : request.from + step * (i + n - 1);
    const part = sweep({ ...request, from, to, points: n, ...(guesses ? { guesses } : {}) });
    for (let j = 0; j < part.input.length; j++) {
      out.input.push(part.input[j]);
      out.root.push(part.root[j]);
      out.status.push(part.status[j]);
      out.converged.push(part.converged[j]);
      out.evaluations.push(part.evaluations[j]);
      out.totalEvaluations += part.evaluations[j];
    }
    for (let j = part.input.length - 1; j >= 0; j--) {
      if (part.converged[j] && Number.isFinite(part.root[j])) { guesses = nextGuesses(part.root[j]); break; }
    }
    i += n;
    progress(i, total);
  }
  return out;
}

function sweepTemplate(job, progress) {
  const { request, input, from, to, points } = job;
  const out = emptyResult();
  let guesses = request.guesses;
  for (let i = 0; i < points; i++) {
    const v = i === points - 1 ? to : from + ((to - from) * i) / (points - 1);
    const values = request.values.map((e) => (e.symbol === input ? { ...e, value: v } : e));
    let r;
    try {
      r = solveTemplate({ ...request, values, ...(guesses ? { guesses } : {}) });
    } catch (e) {
      if (isTrap(e)) throw e;
      r = { value: NaN, status: e.code || 'error', converged: false, evaluations: 0 };
    }
    out.input.push(v);
    out.root.push(r.value);
    out.status.push(r.status);
    out.converged.push(r.converged);
    out.evaluations.push(r.evaluations);
    out.totalEvaluations += r.evaluations;
    if (r.converged && Number.isFinite(r.value)) guesses = nextGuesses(r.value);
    if ((i + 1) % CHUNK === 0 || i === points - 1) progress(i + 1, points);
  }
  return out;
}


/** Runs the job; progress(done, total) is called along the way. */
export function runSweepJob(job, progress = () => {}) {
  return job.kind === 'template' ? sweepTemplate(job, progress) : sweepEquation(job.request, progress);
}
