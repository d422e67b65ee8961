// tacit: the public ES module over the WebAssembly core (tacit_core.js, made by wasm-bindgen).
//
// Requests and results cross the boundary as JavaScript objects, read and written by the
// core with serde (numbers stay numbers, NaN and Infinity included; names stay strings).
// A compiled problem is a Problem; the other calls are conveniences over it. Scalar JS
// functions are driven from here over the ask–tell stepper, so the same loop serves
// plain and Promise-returning functions. Every error is a TacitError with a code.

import * as core from "./tacit_core.js";

export const version = "__TACIT_VERSION__";

export class TacitError extends Error {
  constructor(code, message, position, options) {
    super(message, options);
    this.name = "TacitError";
    this.code = code;
    if (position !== undefined && position !== null) this.position = position;
  }
}

let ready = false;
let pending = null;
let aborted = null;

function isThenable(v) {
  try {
    return v !== null && (typeof v === "object" || typeof v === "function") && typeof v.then === "function";
  } catch {
    return false;
  }
}

function describe(v) {
  try {
    return describeUnsafe(v);
  } catch {
    return typeof v;
  }
}

function describeUnsafe(v) {
  if (v === null) return "null";
  if (isThenable(v)) return "a Promise";
  if (Array.isArray(v)) return `a list of ${v.length} items`;
  if (typeof v === "string") return v.length > 40 ? `a string of ${v.length} characters` : `the string ${JSON.stringify(v)}`;
  if (typeof v === "number" || typeof v === "boolean" || typeof v === "bigint") return `${typeof v} ${String(v)}`;
  if (typeof v === "function") return "a function";
  return typeof v === "object" ? "an object" : typeof v;
}

function messageOf(e) {
  if (e instanceof Error) return e.message;
  try {
    return String(e);
  } catch {
    return typeof e;
  }
}

function checkSource(wasm) {
  const ok =
    wasm === undefined ||
    typeof wasm === "string" ||
    wasm instanceof URL ||
    wasm instanceof ArrayBuffer ||
    ArrayBuffer.isView(wasm) ||
    wasm instanceof WebAssembly.Module ||
    (typeof Response !== "undefined" && wasm instanceof Response) ||
    isThenable(wasm);
  if (!ok) {
    throw new TacitError(
      "bad-type",
      `init() takes the .wasm bytes, a WebAssembly.Module, a URL, a Response or a Promise of one (such as fetch(url)); got ${describe(wasm)}`,
    );
  }
}

/**
 * Loads the WebAssembly module. With no argument it fetches tacit_core_bg.wasm next to this
 * file; a URL or a string is fetched; a Response, or a Promise of one such as `fetch(url)`,
 * is compiled as it streams in. Later calls do nothing. This is the browser entry and has
 * no Node import: under Node the package's `node` export (tacit-node.js) reads paths and
 * file: URLs from disk and then calls this.
 */
export async function init(wasm) {
  checkSource(wasm);
  if (ready) return;
  if (pending === null) {
    pending = (async () => {
      const source = (await wasm) ?? new URL("./tacit_core_bg.wasm", import.meta.url);
      if (typeof Response !== "undefined" && source instanceof Response && !source.ok) {
        throw new Error(`${source.url || "the response"} answered HTTP ${source.status} ${source.statusText}`.trim());
      }
      await core.default({ module_or_path: source });
      ready = true;
    })();
  }
  try {
    await pending;
  } catch (e) {
    pending = null;
    throw new TacitError("init-failed", `the WebAssembly module did not load: ${messageOf(e)}`, undefined, {
      cause: e,
    });
  }
}

/** Synchronous initialisation from the .wasm bytes or a compiled module. */
export function initSync(wasm) {
  if (ready) return;
  if (!(wasm instanceof ArrayBuffer || ArrayBuffer.isView(wasm) || wasm instanceof WebAssembly.Module)) {
    throw new TacitError("bad-type", `initSync() takes the .wasm bytes or a WebAssembly.Module; got ${describe(wasm)}`);
  }
  try {
    core.initSync({ module: wasm });
  } catch (e) {
    throw new TacitError("init-failed", `the WebAssembly module did not load: ${messageOf(e)}`, undefined, {
      cause: e,
    });
  }
  ready = true;
}

function ensureReady() {
  if (aborted !== null) {
    throw new TacitError(
      "instance-aborted",
      `the solver stopped after an internal error and cannot be used until the page or process is reloaded: ${aborted}`,
    );
  }
  if (!ready) throw new TacitError("not-initialised", "call (and await) init() before using tacit");
}

/** Turns anything thrown by the core into a TacitError. */
function toTacitError(e) {
  if (e instanceof TacitError) return e;
  if (e instanceof WebAssembly.RuntimeError) {
    let detail = null;
    try {
      detail = core.lastPanic() ?? null;
    } catch {
      detail = null;
    }
    aborted = detail ?? e.message;
    return new TacitError("internal-panic", `the solver stopped with an internal error: ${aborted}`, undefined, {
      cause: e,
    });
  }
  if (e instanceof Error && typeof e.code === "string") {
    return new TacitError(e.code, e.message, e.position, e.cause === undefined ? undefined : { cause: e.cause });
  }
  return new TacitError("internal", messageOf(e), undefined, { cause: e });
}

function guarded(run) {
  ensureReady();
  try {
    return run();
  } catch (e) {
    throw toTacitError(e);
  }
}

function requireFunction(f, name) {
  if (typeof f !== "function") {
    throw new TacitError("bad-type", `${name} must be a function, got ${describe(f)}`);
  }
}

function checkValue(fx, x, name) {
  if (typeof fx === "number") return fx;
  const hint = isThenable(fx) ? "; for a Promise-returning function use solveFunctionAsync" : "";
  throw new TacitError("callback-bad-value", `${name}(${x}) must return a number, got ${describe(fx)}${hint}`);
}

function callbackThrew(e, call) {
  // A nested solve refused for its depth keeps its own error, so the caller learns why.
  if (e instanceof TacitError && e.code === "nesting-too-deep") return e;
  return new TacitError("callback-threw", `${call} threw: ${messageOf(e)}`, undefined, { cause: e });
}

// Synchronous solves running now, one inside another's callback when above 1. Each
// level holds frames on the JavaScript and WebAssembly stacks; the core refuses more
// than this many levels too.
export const MAX_NESTING = 32;
let depth = 0;

function nested(run) {
  if (depth >= MAX_NESTING) {
    throw new TacitError(
      "nesting-too-deep",
      `solves nested ${MAX_NESTING} deep (a callback that starts a solve, whose callback starts another…); at most ${MAX_NESTING} levels are allowed`,
    );
  }
  depth += 1;
  try {
    return run();
  } finally {
    depth -= 1;
  }
}

function evaluate(f, x) {
  let fx;
  try {
    fx = f(x);
  } catch (e) {
    throw callbackThrew(e, `f(${x})`);
  }
  return checkValue(fx, x, "f");
}

async function evaluateAsync(f, x) {
  let fx;
  try {
    fx = await f(x);
  } catch (e) {
    throw callbackThrew(e, `f(${x})`);
  }
  return checkValue(fx, x, "f");
}

// ---------------------------------------------------------------------------------------
// A compiled problem

const PROBLEM = Symbol("tacit.Problem");

/** Points of a sweep solved between two yields to the event loop, when not given. */
const SWEEP_CHUNK = 64;
/** The time one chunk of a sweep aims at, in milliseconds, when no chunk is given. */
const SWEEP_SLICE_MS = 12;
/** The largest chunk of a sweep (the core's limit too). */
const MAX_SWEEP_CHUNK = 100_000;

/** Lets the event loop run (input, painting, timers) before the next chunk. */
function yieldToEventLoop() {
  if (typeof MessageChannel === "function") {
    return new Promise((resolve) => {
      const channel = new MessageChannel();
      channel.port1.onmessage = () => {
        channel.port1.close();
        resolve();
      };
      channel.port2.postMessage(null);
    });
  }
  return new Promise((resolve) => setTimeout(resolve, 0));
}

function readControl(control) {
  if (control === undefined || control === null) return {};
  if (typeof control !== "object") {
    throw new TacitError("bad-type", `the sweep's control must be an object {signal, onProgress, chunk}, got ${describe(control)}`);
  }
  let signal, onProgress, chunk;
  try {
    ({ signal, onProgress, chunk } = control);
  } catch (e) {
    throw new TacitError("bad-request", `the sweep's control cannot be read: ${messageOf(e)}`, undefined, { cause: e });
  }
  if (signal !== undefined && !(typeof signal === "object" && signal !== null && "aborted" in signal)) {
    throw new TacitError("bad-type", `signal must be an AbortSignal, got ${describe(signal)}`);
  }
  if (onProgress !== undefined) requireFunction(onProgress, "onProgress");
  if (chunk !== undefined && !(Number.isInteger(chunk) && chunk >= 1 && chunk <= MAX_SWEEP_CHUNK)) {
    throw new TacitError("bad-request", `chunk must be a whole number from 1 to ${MAX_SWEEP_CHUNK}, got ${describe(chunk)}`);
  }
  return { signal, onProgress, chunk };
}

function abortError(signal, partial, what = "sweep") {
  const err = new TacitError(
    "aborted",
    what === "sweep"
      ? `the sweep was stopped after ${partial === null ? 0 : partial.done} of its points; the points done are in error.partial`
      : "the Monte Carlo trials were stopped; the law of propagation's result is in error.partial",
    undefined,
    signal.reason === undefined ? undefined : { cause: signal.reason },
  );
  err.partial = partial;
  return err;
}

/**
 * Runs a chunked job of the core (a sweep, Monte Carlo trials): `step(size)` advances it
 * and says {finished, progress}; onProgress gets the progress after every chunk; the event
 * loop runs between chunks, whose size aims at about SWEEP_SLICE_MS unless `chunk` is
 * given; an aborted signal throws abortError with `partial()`. The core's handle is freed
 * at the end either way.
 */
async function inChunks(run, { signal, onProgress, chunk }, first, what, partial, step) {
  let size = chunk ?? first;
  try {
    for (;;) {
      const started = Date.now();
      const { finished, progress } = step(size);
      if (onProgress !== undefined) {
        try {
          onProgress(progress);
        } catch (e) {
          throw callbackThrew(e, "onProgress");
        }
      }
      if (finished) return;
      if (chunk === undefined) {
        const took = Math.max(Date.now() - started, 0.5);
        size = Math.min(MAX_SWEEP_CHUNK, Math.max(1, Math.round((size * SWEEP_SLICE_MS) / took)));
      }
      await yieldToEventLoop();
      if (signal?.aborted) throw abortError(signal, partial(), what);
    }
  } finally {
    try {
      run.free();
    } catch {
      // An instance that stopped on an internal error cannot free; nothing is lost.
    }
  }
}

/** Appends a chunk's points to the sweep so far. */
function appendSweep(sofar, part) {
  if (sofar === null) return part;
  for (const k of ["input", "root", "status", "converged", "evaluations"]) {
    for (const v of part[k]) sofar[k].push(v);
  }
  sofar.totalEvaluations += part.totalEvaluations;
  sofar.done = part.done;
  return sofar;
}

/**
 * A problem compiled once (a bundled template or equations of one's own), to be solved,
 * evaluated, sampled, scanned and swept as often as wanted. Every x it reports is in the
 * unit the caller chose; SI values only under names that say so (rootSi).
 */
export class Problem {
  #h;

  constructor(handle, token) {
    if (token !== PROBLEM) throw new TacitError("bad-call", "make a Problem with problem(spec)");
    this.#h = handle;
  }

  #handle() {
    if (this.#h === null) throw new TacitError("problem-freed", "this problem was freed");
    return this.#h;
  }

  /** The one unknown's name, or null when there are several. */
  get unknown() {
    const h = this.#handle();
    return guarded(() => h.unknown) ?? null;
  }

  /** The unit of the one unknown's values, or null when it has none. */
  get unit() {
    const h = this.#handle();
    return guarded(() => h.unit) ?? null;
  }

  /** Solves it: {method, tolerances, guesses, history, sensitivities}, all optional. */
  solve(opts = {}) {
    const h = this.#handle();
    return guarded(() => h.solve(opts));
  }

  /** The residual at x (in the unknown's unit); NaN where it is not defined. */
  residual(x) {
    const h = this.#handle();
    return guarded(() => h.residual(x));
  }

  /** f at n evenly spaced points from lo to hi (the unknown's unit): {unit, x, f}. */
  sample(lo, hi, n) {
    const h = this.#handle();
    return guarded(() => h.sample(lo, hi, n));
  }

  /** Every root from lo to hi (the unknown's unit), certified, with branch labels. */
  roots(lo, hi, opts = {}) {
    const h = this.#handle();
    return guarded(() => h.roots(lo, hi, opts));
  }

  /** How the answer moves with each input: {converged, root, unit, sensitivities, evaluations}. */
  sensitivities(opts = {}) {
    const h = this.#handle();
    return guarded(() => h.sensitivities(opts));
  }

  /**
   * Solves the unknown at evenly spaced values of one known ({input, from, to, points,
   * spacing?, guesses?, method?, tolerances?}), each from the previous root, in chunks
   * with the event loop let run between them. control: {signal, onProgress, chunk}.
   * An aborted signal rejects with a TacitError of code "aborted" whose `partial`
   * holds the points done (or null).
   */
  async sweep(spec, control) {
    const ctl = readControl(control);
    const h = this.#handle();
    if (ctl.signal?.aborted) throw abortError(ctl.signal, null);
    const run = guarded(() => h.startSweep(spec));
    let sofar = null;
    await inChunks(run, ctl, SWEEP_CHUNK, "sweep", () => sofar, (size) => {
      sofar = appendSweep(sofar, guarded(() => run.advance(size)));
      return { finished: sofar.done >= sofar.points, progress: { done: sofar.done, points: sofar.points } };
    });
    return sofar;
  }

  /**
   * The uncertainty of the answer from the knowns' `uncertainties` (given in the spec):
   * the law of propagation at once, then the Monte Carlo trials in chunks with the event
   * loop let run between them. opts: SolveOptions with `uncertainty: {trials, seed,
   * coverageFactor}`; control: {signal, onProgress, chunk}. An aborted signal rejects
   * with a TacitError of code "aborted" whose `partial` holds the law of propagation's
   * result (without the Monte Carlo part).
   */
  async uncertainty(opts = {}, control) {
    const ctl = readControl(control);
    const h = this.#handle();
    if (ctl.signal?.aborted) throw abortError(ctl.signal, null, "uncertainty");
    const run = guarded(() => h.startUncertainty(opts));
    let report = null;
    await inChunks(run, ctl, 200, "uncertainty", () => guarded(() => run.report()), (size) => {
      const done = guarded(() => run.advance(size));
      const finished = guarded(() => run.finished);
      if (finished) report = guarded(() => run.report());
      return { finished, progress: { done, trials: guarded(() => run.trials) } };
    });
    return report;
  }

  /** Releases the compiled problem now (optional; a sweep under way keeps its own). */
  free() {
    if (this.#h !== null) {
      const h = this.#h;
      this.#h = null;
      try {
        h.free();
      } catch {
        // An instance that stopped on an internal error cannot free; nothing is lost.
      }
    }
  }
}

/** Compiles a problem: {template, values, unknown, resultUnit?, branch?, useScenarioDefaults?} or {equations, knowns?, units?, unknown? | unknowns?}. */
export function problem(spec) {
  return new Problem(
    guarded(() => core.ProblemHandle.compile(spec)),
    PROBLEM,
  );
}

// ---------------------------------------------------------------------------------------
// Conveniences: one call, one compiled problem

/** Solves a text equation or set for its unknowns. */
export function solveEquation(req) {
  return guarded(() => core.solveEquation(req));
}

/** Solves a bundled template for one of its symbols, with values in chosen units. */
export function solveTemplate(req) {
  return guarded(() => core.solveTemplate(req));
}

/** Parses an equation text without solving it; never throws for bad text. */
export function checkEquation(text) {
  if (typeof text !== "string") throw new TacitError("bad-type", `the equation text must be a string, got ${describe(text)}`);
  return guarded(() => core.checkEquation(text));
}

let catalogueValue = null;
/** Every bundled template with its full metadata (a fresh copy each call). */
export function catalogue() {
  if (catalogueValue === null) catalogueValue = guarded(() => core.catalogue());
  return structuredClone(catalogueValue);
}

/**
 * Reads and checks a file of own templates (its text, format "tacit-own-templates");
 * the templates. A bad field is a TacitError naming it (templates[2].variables[0].unit).
 */
export function readOwnTemplates(text) {
  if (typeof text !== "string") throw new TacitError("bad-type", `the own-template file must be text, got ${describe(text)}`);
  return guarded(() => core.readOwnTemplates(text));
}

/** Checks one own template; gives it back as read, or throws a TacitError naming the bad field. */
export function checkOwnTemplate(template) {
  return guarded(() => core.checkOwnTemplate(template));
}

/** Writes own templates as the text of an exchange file (after checking them). */
export function writeOwnTemplates(templates) {
  return guarded(() => core.writeOwnTemplates({ templates }));
}

/** Every dimension with its units, SI unit first. */
export function units() {
  return guarded(() => core.unitsCatalogue());
}

export function convertUnit(value, from, to) {
  if (typeof value !== "number") throw new TacitError("bad-type", `value must be a number, got ${describe(value)}`);
  if (typeof from !== "string") throw new TacitError("bad-type", `from must be a unit string, got ${describe(from)}`);
  if (typeof to !== "string") throw new TacitError("bad-type", `to must be a unit string, got ${describe(to)}`);
  return guarded(() => core.convertUnit(value, from, to));
}

/** Solves one unknown across a range of one known, continuing from the previous root, in one go. */
export function sweep(req) {
  return guarded(() => core.sweep(req));
}

/** All roots in a range, of a text equation with one unknown or of a JS function `f`. */
export function findRoots(req) {
  let f;
  try {
    f = req !== null && typeof req === "object" ? req.f : undefined;
  } catch (e) {
    throw new TacitError("bad-request", `the request cannot be read: ${messageOf(e)}`, undefined, { cause: e });
  }
  if (typeof f === "function") {
    const { f: _f, ...rest } = req;
    let failure = null;
    const adapted = (x) => {
      if (failure !== null) return NaN;
      try {
        return checkValue(f(x), x, "f");
      } catch (e) {
        failure = e instanceof TacitError ? e : callbackThrew(e, `f(${x})`);
        return NaN;
      }
    };
    let result;
    try {
      result = nested(() => guarded(() => core.findRootsFunction(adapted, rest)));
    } catch (e) {
      throw failure ?? e;
    }
    if (failure !== null) throw failure;
    return result;
  }
  return guarded(() => core.findRoots(req));
}

// ---------------------------------------------------------------------------------------

const TOKEN = Symbol("tacit.Stepper");

/** An ask–tell solve: it says where to evaluate and waits, as long as it takes. */
export class Stepper {
  #h;

  constructor(handle, token) {
    if (token !== TOKEN) {
      throw new TacitError("bad-call", "make a Stepper with Stepper.create(options) or Stepper.restore(json)");
    }
    this.#h = handle;
  }

  static create(opts) {
    return new Stepper(
      guarded(() => core.StepperHandle.create(opts)),
      TOKEN,
    );
  }

  /** Rebuilds a stepper from save() output; a changed record is a TacitError. */
  static restore(json) {
    if (typeof json !== "string") {
      throw new TacitError("bad-saved-stepper", `the saved stepper must be a string, got ${describe(json)}`);
    }
    return new Stepper(
      guarded(() => core.StepperHandle.restore(json)),
      TOKEN,
    );
  }

  #handle() {
    if (this.#h === null) throw new TacitError("stepper-freed", "this stepper was freed");
    return this.#h;
  }

  /** The x to evaluate next, or null when done. */
  next() {
    const h = this.#handle();
    return guarded(() => h.next()) ?? null;
  }

  /** Records f at the x from next(). */
  tell(fx) {
    if (typeof fx !== "number") {
      throw new TacitError("bad-type", `tell() takes the number f(x), got ${describe(fx)}`);
    }
    const h = this.#handle();
    guarded(() => h.tell(fx));
  }

  get done() {
    const h = this.#handle();
    return guarded(() => h.done);
  }

  get evaluations() {
    const h = this.#handle();
    return guarded(() => h.evaluations);
  }

  get result() {
    const h = this.#handle();
    return guarded(() => h.result()) ?? null;
  }

  /** The history rows so far (empty unless created with history: true). */
  get history() {
    const h = this.#handle();
    return guarded(() => h.history());
  }

  save() {
    const h = this.#handle();
    return guarded(() => h.save());
  }

  free() {
    if (this.#h !== null) {
      const h = this.#h;
      this.#h = null;
      try {
        h.free();
      } catch {
        // An instance that stopped on an internal error cannot free; nothing is lost.
      }
    }
  }
}

/** Solves f(x) = 0 for a JS function, with guesses or a bracket, bounds and tolerances. */
export function solveFunction(f, opts) {
  requireFunction(f, "f");
  return nested(() => {
    const stepper = Stepper.create(opts);
    try {
      for (let x = stepper.next(); x !== null; x = stepper.next()) {
        stepper.tell(evaluate(f, x));
      }
      return stepper.result;
    } finally {
      stepper.free();
    }
  });
}

/** As solveFunction, for a function that may return a Promise. */
export async function solveFunctionAsync(f, opts) {
  requireFunction(f, "f");
  const stepper = Stepper.create(opts);
  try {
    for (let x = stepper.next(); x !== null; x = stepper.next()) {
      stepper.tell(await evaluateAsync(f, x));
    }
    return stepper.result;
  } finally {
    stepper.free();
  }
}

/** Solves F(x) = 0 for n unknowns (Broyden's method); F takes and returns n numbers. */
export function solveSystemFunction(F, opts) {
  requireFunction(F, "F");
  let failure = null;
  const adapted = (xs) => {
    if (failure !== null) return null;
    const x = Array.from(xs);
    let r;
    try {
      r = F(x);
    } catch (e) {
      failure = callbackThrew(e, `F([${x.join(", ")}])`);
      return null;
    }
    const n = xs.length;
    const isList = Array.isArray(r) || r instanceof Float64Array || r instanceof Float32Array;
    if (!isList || r.length !== n || !Array.prototype.every.call(r, (v) => typeof v === "number")) {
      failure = new TacitError(
        "callback-bad-value",
        `F([${x.join(", ")}]) must return a list of ${n} numbers, got ${describe(r)}`,
      );
      return null;
    }
    return Float64Array.from(r);
  };
  let result;
  try {
    result = nested(() => guarded(() => core.solveSystemFunction(adapted, opts)));
  } catch (e) {
    throw failure ?? e;
  }
  if (failure !== null) throw failure;
  return result;
}
