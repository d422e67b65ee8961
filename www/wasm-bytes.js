// The solver's wasm, inlined by scripts/build-page.mjs as gzip + base64 and inflated here
// with the browser's own DecompressionStream (no network involved).

export async function wasmBytes() {
  const b64 = globalThis.__TACIT_WASM_GZ_B64;
  if (typeof b64 !== 'string' || b64.length === 0) throw new Error('the page was built without the solver (no inlined wasm)');
  const bin = atob(b64);
  const gz = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) gz[i] = bin.charCodeAt(i);
  const stream = new Blob([gz]).stream().pipeThrough(new DecompressionStream('gzip'));
  return new Uint8Array(await new Response(stream).arrayBuffer());
}
