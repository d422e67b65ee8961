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

// Decodes an LZMA stream in the .lzma ("alone") format of xz-utils: a 13-byte header (the
// lc/lp/pb properties, the dictionary size, the size) and the range-coded data, following
// the reference decoder of the LZMA specification (LzmaSpec.cpp of the LZMA SDK, Igor
// Pavlov, public domain). `size` is the decoded size; the whole output is the dictionary.
export function unlzma(src, size) {
  let d = src[0];
  if (d >= 225) throw new Error('the inlined solver is damaged (LZMA properties)');
  const lc = d % 9;
  d = (d / 9) | 0;
  const lp = d % 5;
  const pb = (d / 5) | 0;
  const out = new Uint8Array(size);
  let ip = 13;
  // The range coder's range and code, kept in a typed array: numbers of 32 bits held in
  // closure variables would be boxed on every write.
  const rc = new Float64Array(2);
  rc[0] = 0xffffffff;
  if (src[ip++] !== 0) throw new Error('the inlined solver is damaged (LZMA stream)');
  for (let i = 0; i < 4; i++) rc[1] = rc[1] * 256 + src[ip++];
  const P = (n) => new Uint16Array(n).fill(1024);
  const bit = (probs, i) => {
    const p = probs[i];
    let range = rc[0];
    let code = rc[1];
    const bound = (range >>> 11) * p;
    let b;
    if (code < bound) {
      range = bound;
      probs[i] = p + ((2048 - p) >> 5);
      b = 0;
    } else {
      range -= bound;
      code -= bound;
      probs[i] = p - (p >> 5);
      b = 1;
    }
    if (range < 16777216) {
      range *= 256;
      code = code * 256 + src[ip++];
    }
    rc[0] = range;
    rc[1] = code;
    return b;
  };
  const tree = (probs, base, n) => {
    let m = 1;
    for (let i = 0; i < n; i++) m = (m << 1) + bit(probs, base + m);
    return m - (1 << n);
  };
  const reverse = (probs, base, n) => {
    let m = 1;
    let sym = 0;
    for (let i = 0; i < n; i++) {
      const b = bit(probs, base + m);
      m = (m << 1) + b;
      sym |= b << i;
    }
    return sym;
  };
  const direct = (n) => {
    let res = 0;
    let range = rc[0];
    let code = rc[1];
    for (let i = 0; i < n; i++) {
      range = range >>> 1;
      let b = 0;
      if (code >= range) {
        code -= range;
        b = 1;
      }
      res = res * 2 + b;
      if (range < 16777216) {
        range *= 256;
        code = code * 256 + src[ip++];
      }
    }
    rc[0] = range;
    rc[1] = code;
    return res;
  };
  const lenCoder = () => ({ choice: P(2), low: P(16 << 3), mid: P(16 << 3), high: P(256) });
  const length = (c, posState) => {
    if (bit(c.choice, 0) === 0) return tree(c.low, posState << 3, 3);
    if (bit(c.choice, 1) === 0) return 8 + tree(c.mid, posState << 3, 3);
    return 16 + tree(c.high, 0, 8);
  };
  const literals = P(0x300 << (lc + lp));
  const isMatch = P(12 << 4);
  const isRep = P(12);
  const isRepG0 = P(12);
  const isRepG1 = P(12);
  const isRepG2 = P(12);
  const isRep0Long = P(12 << 4);
  const posSlot = P(4 << 6);
  const posCoders = P(115);
  const align = P(16);
  const lens = lenCoder();
  const repLens = lenCoder();
  const pbMask = (1 << pb) - 1;
  const lpMask = (1 << lp) - 1;
  let state = 0;
  let rep0 = 0;
  let rep1 = 0;
  let rep2 = 0;
  let rep3 = 0;
  let pos = 0;
  while (pos < size) {
    const posState = pos & pbMask;
    if (bit(isMatch, (state << 4) + posState) === 0) {
      const prev = pos > 0 ? out[pos - 1] : 0;
      const base = 0x300 * (((pos & lpMask) << lc) + (prev >> (8 - lc)));
      let sym = 1;
      if (state >= 7) {
        let matchByte = out[pos - rep0 - 1];
        do {
          const matchBit = (matchByte >> 7) & 1;
          matchByte <<= 1;
          const b = bit(literals, base + ((1 + matchBit) << 8) + sym);
          sym = (sym << 1) | b;
          if (matchBit !== b) break;
        } while (sym < 0x100);
      }
      while (sym < 0x100) sym = (sym << 1) | bit(literals, base + sym);
      out[pos++] = sym & 0xff;
      state = state < 4 ? 0 : state < 10 ? state - 3 : state - 6;
      continue;
    }
    let len;
    if (bit(isRep, state) !== 0) {
      if (pos === 0) throw new Error('the inlined solver is damaged (LZMA match)');
      if (bit(isRepG0, state) === 0) {
        if (bit(isRep0Long, (state << 4) + posState) === 0) {
          state = state < 7 ? 9 : 11;
          out[pos] = out[pos - rep0 - 1];
          pos++;
          continue;
        }
      } else {
        let dist;
        if (bit(isRepG1, state) === 0) dist = rep1;
        else {
          if (bit(isRepG2, state) === 0) dist = rep2;
          else {
            dist = rep3;
            rep3 = rep2;
          }
          rep2 = rep1;
        }
        rep1 = rep0;
        rep0 = dist;
      }
      len = length(repLens, posState);
      state = state < 7 ? 8 : 11;
    } else {
      rep3 = rep2;
      rep2 = rep1;
      rep1 = rep0;
      len = length(lens, posState);
      state = state < 7 ? 7 : 10;
      const slot = tree(posSlot, (len < 3 ? len : 3) << 6, 6);
      if (slot < 4) rep0 = slot;
      else {
        const n = (slot >> 1) - 1;
        let dist = (2 | (slot & 1)) * 2 ** n;
        if (slot < 14) dist += reverse(posCoders, dist - slot, n);
        else dist += direct(n - 4) * 16 + reverse(align, 0, 4);
        if (dist === 0xffffffff) break; // the end marker
        rep0 = dist;
      }
      if (rep0 >= pos) throw new Error('the inlined solver is damaged (LZMA distance)');
    }
    len += 2;
    if (len > size - pos) throw new Error('the inlined solver is damaged (LZMA length)');
    for (; len > 0; len--, pos++) out[pos] = out[pos - rep0 - 1];
  }
  if (pos !== size) throw new Error(`the inlined solver is damaged (${pos} of ${size} bytes)`);
  return out;
}

// Starts decoding the inlined wasm: { bytes: Promise<Uint8Array>, module: Promise<WebAssembly.Module> }.
// data-format "lzma" (decoded here, data-size bytes) or "gzip" (inflated by the browser).
export function startWasm() {
  const el = document.getElementById('wasm-gz');
  if (!el) throw new Error('the page was built without the solver (no inlined wasm)');
  const packed = decode8(el.textContent, Number(el.dataset.length));
  let bytes;
  let module;
  if (el.dataset.format === 'lzma') {
    const wasm = unlzma(packed, Number(el.dataset.size));
    bytes = Promise.resolve(wasm);
    module = WebAssembly.compile(wasm);
  } else {
    const [forBytes, forModule] = new Blob([packed]).stream().pipeThrough(new DecompressionStream('gzip')).tee();
    bytes = new Response(forBytes).arrayBuffer().then((b) => new Uint8Array(b));
    module = WebAssembly.compileStreaming(new Response(forModule, { headers: { 'content-type': 'application/wasm' } }));
  }
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
