// The sweep worker: solves one unknown across a range of one input, reporting progress
// as it goes. The page cancels by ending the worker, and replaces it when the wasm
// instance traps (a trapped instance cannot be used again).
//
// Messages in:  { type: 'init', wasm: ArrayBuffer }
//               { type: 'sweep', id, job }   job as for runSweepJob (sweep-run.js)
//               { type: 'uncertainty', id, job }   job as for runUncertaintyJob
//               { type: 'trap-drill', id }
// Messages out: { type: 'ready' } | { type: 'progress', id, done, total }
//               { type: 'result', id, result, ms } | { type: 'error', id, message, code, trapped }

import { init } from '../dist/pkg/tacit.js';
import { runSweepJob, runUncertaintyJob, isTrap } from './sweep-run.js';

let ready = null;

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
  if (msg.type === 'sweep' || msg.type === 'uncertainty') {
    try {
      await ready;
      const started = performance.now();
      const result = await (msg.type === 'sweep' ? runSweepJob : runUncertaintyJob)(msg.job, (done, total) => postMessage({ type: 'progress', id: msg.id, done, total }));
      postMessage({ type: 'result', id: msg.id, result, ms: performance.now() - started });
    } catch (e) {
      postMessage({ type: 'error', id: msg.id, message: String(e && e.message), code: e && e.code, trapped: isTrap(e) });
    }
  }
});
