// The solver's WebAssembly file, as the package's "./tacit_core_bg.wasm" subpath.
//
// Imported through a bundler that turns files into URLs (esbuild's `file` loader, webpack's
// `asset/resource`, Vite with `?url`), the default export is the URL the file is served
// from; give it to init:
//
//   import { init } from "tacit";
//   import wasmUrl from "tacit/tacit_core_bg.wasm";
//   await init(fetch(wasmUrl));

/** The URL of the .wasm file, as the bundler emits it. */
declare const wasmUrl: string;
export default wasmUrl;
