// The sweep worker: solves one unknown across a range of one input, reporting progress
// as it goes. The page cancels by ending the worker, and replaces it when the wasm
// instance traps (a trapped instance cannot be used again).
//
// Messages in:  { type: 'init', wasm: ArrayBuffer }
//               { type: 'sweep', id, job }
//   job = { kind: 'equation', request }  request as for tacit's sweep(); run in chunks
//       | { kind: 'template', request, input, from, to, points }  request as for
//         solveTemplate(); the input's value is set at each point
// Messages out: { type: 'ready' } | { type: 'progress', id, done, total }
//               { type: 'result', id, result, ms } | { type: 'error', id, message, code, trapped }

import { init, sweep, solveTemplate } from '../dist/pkg/tacit.js';

let ready = null;
const CHUNK = 100;

function isTrap(e) {
  return e instanceof WebAssembly.RuntimeError || /unreachable|RuntimeError/.test(String(e && e.message));
}

function emptyResult() {
  return { input: [], root: [], status: [], converged: [], evaluations: [], totalEvaluations: 0 };
}

function nextGuesses(r) {
  const d = Math.abs(r) * 1e-3 || 1e-3;
  return [r, r + d];
}

function sweepEquation(id, request) {
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
    postMessage({ type: 'progress', id, done: i, total });
  }
  return out;
}

function sweepTemplate(id, job) {
  const { request, input, from, to, points } = job;
  const out = emptyResult();
  let guesses = request.guesses;
  for (let i = 0; i < points; i++) {
    const v = i === points - 1 ? to : from + ((to - from) * i) / (points - 1);
    const values = { ...request.values, [input]: { ...request.values[input], value: v } };
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
    if ((i + 1) % CHUNK === 0 || i === points - 1) postMessage({ type: 'progress', id, done: i + 1, total: points });
  }
  return out;
}

self.addEventListener('message', async (ev) => {
  const msg = ev.data;
  if (msg.type === 'init') {
    try {
      ready = init(msg.wasm);
      await ready;
      postMessage({ type: 'ready' });
    } catch (e) {
      postMessage({ type: 'error', id: null, message: `the solver could not start in the worker: ${e.message}`, trapped: true });
    }
    return;
  }
  if (msg.type === 'trap-drill') {
    // A fire drill for the page's recovery path: a one-instruction wasm module that traps
    // (a real WebAssembly.RuntimeError), reported exactly as a trap of the solver would be.
    try {
      const bytes = new Uint8Array([0, 97, 115, 109, 1, 0, 0, 0, 1, 4, 1, 96, 0, 0, 3, 2, 1, 0, 7, 5, 1, 1, 116, 0, 0, 10, 5, 1, 3, 0, 0, 11]);
      const { instance } = await WebAssembly.instantiate(bytes);
      instance.exports.t();
      postMessage({ type: 'error', id: msg.id, message: 'the drill did not trap', trapped: false });
    } catch (e) {
      postMessage({ type: 'error', id: msg.id, message: String(e && e.message), trapped: isTrap(e) });
    }
    return;
  }
  if (msg.type === 'sweep') {
    try {
      await ready;
      const started = performance.now();
      const result = msg.job.kind === 'template' ? sweepTemplate(msg.id, msg.job) : sweepEquation(msg.id, msg.job.request);
      postMessage({ type: 'result', id: msg.id, result, ms: performance.now() - started });
    } catch (e) {
      postMessage({ type: 'error', id: msg.id, message: String(e && e.message), code: e && e.code, trapped: isTrap(e) });
    }
  }
});
