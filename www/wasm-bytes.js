// The solver's wasm, inlined by scripts/build-page.mjs as gzip compressed bytes written 7
// bits per character in an inert data block, and inflated here with the browser's own
// DecompressionStream (no network involved). See encode7 in build-page.mjs.

const FORBIDDEN = [0x00, 0x0d, 0x3c];

function decode7(text, length) {
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

export async function wasmBytes() {
  const el = document.getElementById('wasm-gz');
  if (!el) throw new Error('the page was built without the solver (no inlined wasm)');
  const gz = decode7(el.textContent, Number(el.dataset.length));
  const stream = new Blob([gz]).stream().pipeThrough(new DecompressionStream('gzip'));
  return new Uint8Array(await new Response(stream).arrayBuffer());
}
