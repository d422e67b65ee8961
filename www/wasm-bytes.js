// The solver's wasm, inlined by scripts/build-page.mjs as gzip compressed bytes written 7
// bits per character in an inert data block, and inflated here with the browser's own
// DecompressionStream (no network involved). See encode7 in build-page.mjs.

const FORBIDDEN = [0x00, 0x0d, 0x3c];

function decode7(text, length) {
  const out = new Uint8Array(length);
  let acc = 0;
  let nbits = 0;
  let n = 0;
  const push = (g) => {
    acc = ((acc << 7) | g) & 0x7fff;
    nbits += 7;
    if (nbits >= 8) {
      nbits -= 8;
      if (n < length) out[n++] = (acc >> nbits) & 0xff;
    }
  };
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c < 0x80) push(c);
    else {
      const v = c - 0x100;
      push(FORBIDDEN[v >> 7]);
      push(v & 0x7f);
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
