// The solver's wasm, inlined by scripts/build-page.mjs as gzip compressed bytes written one
// byte per character (the page is windows-1252) in an inert data block, inflated with the browser's own
// DecompressionStream and compiled as it streams out (no network involved). See encode8 in
// build-page.mjs.
//
// startWasm runs first in the page's small classic script, which build-page.mjs places
// right after the data block and which carries the text of decode8 and startWasm from this
// file: inflating and compiling then overlap the parsing and running of the page's module
// script. wasmBytes and wasmModule take what it started (or start it, if it could not).

// The page is read as windows-1252 (its meta charset), one byte a character: every byte
// value becomes one character, which the browser's own decoder of that encoding maps back.
// The values the HTML parser would alter or that could end the element (NUL, CR and "<"),
// and the escape byte itself, are written as the escape byte 0x01 and one of "@ABC".
export function decode8(text, length) {
  const FORBIDDEN = [0x00, 0x0d, 0x3c, 0x01];
  const all = new Uint8Array(256);
  for (let i = 0; i < 256; i++) all[i] = i;
  const chars = new TextDecoder('windows-1252').decode(all);
  const back = new Uint8Array(0x10000);
  for (let i = 0; i < 256; i++) back[chars.charCodeAt(i)] = i;
  const out = new Uint8Array(length);
  let n = 0;
  for (let i = 0, len = text.length; i < len && n < length; i++) {
    const b = back[text.charCodeAt(i)];
    out[n++] = b === 0x01 ? FORBIDDEN[back[text.charCodeAt(++i)] - 0x40] : b;
  }
  if (n !== length) throw new Error(`the inlined solver is damaged (${n} of ${length} bytes)`);
  return out;
}

// Starts inflating the inlined wasm: { bytes: Promise<Uint8Array>, module: Promise<WebAssembly.Module> }.
export function startWasm() {
  const el = document.getElementById('wasm-gz');
  if (!el) throw new Error('the page was built without the solver (no inlined wasm)');
  const gz = decode8(el.textContent, Number(el.dataset.length));
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
