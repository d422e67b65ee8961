// tacit: the public ES module over the WebAssembly core (tacit_core.js, made by wasm-bindgen).
//
// Requests cross the boundary as JSON text. Non-finite numbers travel as the strings
// "NaN", "Infinity" and "-Infinity" (JSON has none) and are turned back into numbers here.
// Scalar JS functions are driven from here over the ask–tell stepper, so the same loop
// serves plain and Promise-returning functions. Every error is a TacitError with a code.

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

function replacer(_key, v) {
  if (typeof v === "number" && !Number.isFinite(v)) return String(v);
  if (typeof v === "function") return "[function]";
  return v;
}

function reviver(_key, v) {
  if (v === "NaN") return NaN;
  if (v === "Infinity") return Infinity;
  if (v === "-Infinity") return -Infinity;
  return v;
}

function encode(value, what) {
  if (value === null || typeof value !== "object" || Array.isArray(value)) {
    throw new TacitError("bad-request", `${what} must be an object, got ${describe(value)}`);
  }
  try {
    return JSON.stringify(value, replacer);
  } catch (e) {
    throw new TacitError("bad-request", `${what} cannot be read as JSON: ${messageOf(e)}`, undefined, { cause: e });
  }
}

// The reviver is only needed when a non-finite number was written as a string.
const decode = (text) =>
  text.includes('"NaN"') || text.includes('Infinity"') ? JSON.parse(text, reviver) : JSON.parse(text);

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

/** Solves a text equation or set for its unknowns. */
export function solveEquation(req) {
  const json = encode(req, "the request");
  return decode(guarded(() => core.solveEquation(json)));
}

/** Solves a bundled template for one of its symbols, with values in chosen units. */
export function solveTemplate(req) {
  const json = encode(req, "the request");
  return decode(guarded(() => core.solveTemplate(json)));
}

/** Parses an equation text without solving it; never throws for bad text. */
export function checkEquation(text) {
  if (typeof text !== "string") throw new TacitError("bad-type", `the equation text must be a string, got ${describe(text)}`);
  return JSON.parse(guarded(() => core.checkEquation(text)));
}

let catalogueText = null;
/** Every bundled template with its full metadata. */
export function catalogue() {
  if (catalogueText === null) catalogueText = guarded(() => core.catalogue());
  return JSON.parse(catalogueText);
}

/** Every dimension with its units, SI unit first. */
export function units() {
  return JSON.parse(guarded(() => core.unitsCatalogue()));
}

export function convertUnit(value, from, to) {
  if (typeof value !== "number") throw new TacitError("bad-type", `value must be a number, got ${describe(value)}`);
  if (typeof from !== "string") throw new TacitError("bad-type", `from must be a unit string, got ${describe(from)}`);
  if (typeof to !== "string") throw new TacitError("bad-type", `to must be a unit string, got ${describe(to)}`);
  return guarded(() => core.convertUnit(value, from, to));
}

/** Solves one unknown across a range of one known, continuing from the previous root. */
export function sweep(req) {
  const json = encode(req, "the request");
  return decode(guarded(() => core.sweep(json)));
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
    const json = encode(rest, "the request");
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
    let text;
    try {
      text = nested(() => guarded(() => core.findRootsFunction(adapted, json)));
    } catch (e) {
      throw failure ?? e;
    }
    if (failure !== null) throw failure;
    return decode(text);
  }
  const json = encode(req, "the request");
  return decode(guarded(() => core.findRoots(json)));
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
    const json = encode(opts, "the stepper options");
    return new Stepper(
      guarded(() => core.StepperHandle.create(json)),
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
    const text = guarded(() => h.result());
    return text === undefined ? null : decode(text);
  }

  /** The history rows so far (empty unless created with history: true). */
  get history() {
    const h = this.#handle();
    return decode(guarded(() => h.history()));
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
  const json = encode(opts, "the options");
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
  let text;
  try {
    text = nested(() => guarded(() => core.solveSystemFunction(adapted, json)));
  } catch (e) {
    throw failure ?? e;
  }
  if (failure !== null) throw failure;
  return decode(text);
}
