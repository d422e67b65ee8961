// Runs a sweep job: one unknown solved across a range of one input, each solve starting
// from the previous root, by the compiled problem's own sweep (in chunks, with progress).
// Used by the sweep worker, and by the benchmark on the page thread.
//
// job = { spec, sweep }: spec as for tacit's problem(), sweep as for Problem.sweep().

import { problem } from '../dist/pkg/tacit.js';

export function isTrap(e) {
  return e instanceof WebAssembly.RuntimeError || /unreachable|RuntimeError|internal-panic|instance-aborted/.test(`${e && e.code} ${e && e.message}`);
}

/** Runs the uncertainty of a problem ({ spec, opts }), its Monte Carlo trials in chunks. */
export async function runUncertaintyJob(job, progress = () => {}) {
  const p = problem(job.spec);
  try {
    return await p.uncertainty(job.opts, { onProgress: ({ done, trials }) => progress(done, trials) });
  } finally {
    p.free();
  }
}

/** Runs the job; progress(done, total) is called along the way. */
export async function runSweepJob(job, progress = () => {}) {
  const p = problem(job.spec);
  try {
    return await p.sweep(job.sweep, { onProgress: ({ done, points }) => progress(done, points) });
  } finally {
    p.free();
  }
}
