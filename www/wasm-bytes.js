// The solver's wasm, inlined by scripts/build-page.mjs as gzip compressed bytes written 7
// bits per character in an inert data block, inflated with the browser's own
// DecompressionStream and compiled as it streams out (no network involved). See encode7 in
// build-page.mjs.
//
// startWasm runs first in the page's small classic script, which build-page.mjs places
// right after the data block and which carries the text of decode7 and startWasm from this
// file: inflating and compiling then overlap the parsing and running of the page's module
// script. wasmBytes and wasmModule take what it started (or start it, if it could not).

export function decode7(text, length) {
  const FORBIDDEN = [0x00, 0x0d, 0x3c];
  const out = new Uint8Array(length);
  let acc = 0;
  let nbits = 0;
  let n = 0;
  // One tight loop (it runs once, cold, on every page load): each character gives 7 bits,
  // an escape character gives a forbidden 7-bit value and the next 7 bits.
  for (let i = 0, len = text.length; i < len; i++) {
    let c = text.charCodeAt(i);
    let second = -1;
    if (c >= 0x80) {
      const v = c - 0x100;
      c = FORBIDDEN[v >> 7];
      second = v & 0x7f;
    }
    acc = ((acc << 7) | c) & 0x7fff;
    nbits += 7;
    if (nbits >= 8) {
      nbits -= 8;
      if (n < length) out[n++] = (acc >> nbits) & 0xff;
    }
    if (second >= 0) {
      acc = ((acc << 7) | second) & 0x7fff;
      nbits += 7;
      if (nbits >= 8) {
        nbits -= 8;
        if (n < length) out[n++] = (acc >> nbits) & 0xff;
      }
    }
  }
  if (n !== length) throw new Error(`the inlined solver is damaged (${n} of ${length} bytes)`);
  return out;
}

// Starts inflating the inlined wasm: { bytes: Promise<Uint8Array>, module: Promise<WebAssembly.Module> }.
export function startWasm() {
  const el = document.getElementById('wasm-gz');
  if (!el) throw new Error('the page was built without the solver (no inlined wasm)');
  const gz = decode7(el.textContent, Number(el.dataset.length));
  const [forBytes, forModule] = new Blob([gz]).stream().pipeThrough(new DecompressionStream('gzip')).tee();
  const bytes = new Response(forBytes).arrayBuffer().then((b) => new Uint8Array(b));
  const module = WebAssembly.compileStreaming(new Response(forModule, { headers: { 'content-type': 'application/wasm' } }));
  // Marked as handled here; whoever awaits them still sees a failure.
  bytes.catch(() => {});
  module.catch(() => {});
  return { bytes, module };
}

const started = () => (globalThis.__tacitWasm ??= startWasm());

/** The inflated wasm bytes (for the sweep worker). */
export async function wasmBytes() {
  return started().bytes;
}

/** The compiled wasm module. */
export async function wasmModule() {
  return started().module;
}
