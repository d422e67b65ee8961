// tacit for Node: everything of the browser entry (tacit.js), with an init that reads the
// .wasm from disk. The package's conditional exports give this file to Node ("node") and
// tacit.js to browsers and bundlers, so no browser bundle ever sees a `node:` import.

import { readFile } from "node:fs/promises";
import { init as initFromSource, TacitError } from "./tacit.js";

export * from "./tacit.js";

const isFilePath = (s) => typeof s === "string" && !/^(https?|data|blob):/i.test(s);

/**
 * Loads the WebAssembly module. With no argument it reads tacit_core_bg.wasm next to this
 * file; a path or a file: URL is read from disk; anything else (bytes, a module, an
 * http(s) URL, a Response or a Promise of one) is handled as in the browser entry.
 */
export async function init(wasm) {
  let source = wasm;
  const url = wasm === undefined ? new URL("./tacit_core_bg.wasm", import.meta.url) : wasm;
  if ((url instanceof URL && url.protocol === "file:") || isFilePath(url)) {
    try {
      source = await readFile(url);
    } catch (e) {
      throw new TacitError("init-failed", `the WebAssembly module did not load: ${e.message}`, undefined, { cause: e });
    }
  }
  return initFromSource(source);
}
