// The package as a web developer uses it: bundled by esbuild, built by Vite, in a module
// worker, and served unbundled by a plain static server. Each set-up is built from the
// packed package (tests/package/lib.mjs), served on 127.0.0.1, and opened in Debian's
// headless Chromium, which must show a solved Colebrook friction factor.
// Build the package first: scripts/build-pkg.sh. Run: node --test tests/package/
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { chromium } from "playwright-core";
import { appWithPackage, serve, openAndRead, listFiles, checkColebrook, REPORT } from "./lib.mjs";

let browser;
before(async () => {
  browser = await chromium.launch({
    executablePath: process.env.TACIT_CHROMIUM || "/usr/bin/chromium",
    args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
  });
});
after(() => browser?.close());

async function openServed(dir, path = "") {
  const server = await serve(dir);
  try {
    return { result: await openAndRead(browser, server.url + path), served: server.served };
  } finally {
    await server.close();
  }
}

const page = (script) =>
  `<!doctype html><html><head><meta charset="utf-8"><link rel="icon" href="data:,"><title>tacit</title></head><body>` +
  `<script type="module" src="${script}"></script></body></html>`;

test("the packed package holds its README, both licences, both entries and the wasm types", () => {
  const { files } = appWithPackage("files");
  for (const f of ["README.md", "LICENSE-MIT", "LICENSE-APACHE", "package.json", "tacit.js", "tacit-node.js", "tacit.d.ts", "tacit_core.js", "tacit_core_bg.wasm", "tacit_core_bg.wasm.d.ts"]) {
    assert.ok(files.includes(f), `${f} is in the packed package (${files.join(", ")})`);
  }
});

test("the browser entry and the wasm-bindgen glue import nothing from Node", () => {
  const { dir } = appWithPackage("browser-entry");
  for (const f of ["tacit.js", "tacit_core.js"]) {
    const text = readFileSync(join(dir, "node_modules/tacit", f), "utf8");
    assert.doesNotMatch(text, /["']node:/, `${f} names no node: module`);
    assert.doesNotMatch(text, /\bprocess\.versions\b|\brequire\(/, `${f} does not look for Node`);
  }
});

test("esbuild bundles import {init, solveTemplate} from \"tacit\" for the browser", async () => {
  const esbuild = await import("esbuild");
  const { dir } = appWithPackage("esbuild");
  writeFileSync(
    join(dir, "app.js"),
    `import { init, solveTemplate, version } from "tacit";\n` +
      `import wasmUrl from "tacit/tacit_core_bg.wasm";\n` +
      `try {\n  await init(fetch(wasmUrl));\n${REPORT}\n} catch (e) { document.documentElement.dataset.error = e.code + ": " + e.message; }\n`,
  );
  const out = join(dir, "out");
  const built = await esbuild.build({
    absWorkingDir: dir,
    entryPoints: ["app.js"],
    bundle: true,
    format: "esm",
    platform: "browser",
    loader: { ".wasm": "file" },
    outdir: out,
    logLevel: "silent",
    metafile: true,
  });
  assert.deepEqual(built.warnings, []);
  const bundle = readFileSync(join(out, "app.js"), "utf8");
  assert.doesNotMatch(bundle, /["']node:/, "the bundle names no node: module");
  const wasmFiles = listFiles(out).filter((f) => f.endsWith(".wasm"));
  assert.equal(wasmFiles.length, 1, `one .wasm emitted: ${listFiles(out).join(", ")}`);
  writeFileSync(join(out, "index.html"), page("./app.js"));
  const { result, served } = await openServed(out);
  checkColebrook(result);
  assert.ok(served.includes(`200 /${wasmFiles[0]}`), `the bundle fetched its .wasm: ${served.join(", ")}`);
});

test("Vite builds an app that calls init() with no argument", async () => {
  const { build } = await import("vite");
  const { dir } = appWithPackage("vite");
  writeFileSync(join(dir, "index.html"), page("/main.js"));
  writeFileSync(
    join(dir, "main.js"),
    `import { init, solveTemplate, version } from "tacit";\n` +
      `try {\n  await init();\n${REPORT}\n} catch (e) { document.documentElement.dataset.error = e.code + ": " + e.message; }\n`,
  );
  await build({ root: dir, logLevel: "silent", configFile: false, build: { outDir: "dist", target: "es2022" } });
  const out = join(dir, "dist");
  const wasmFiles = listFiles(out).filter((f) => f.endsWith(".wasm"));
  assert.ok(wasmFiles.length >= 1, `vite emitted the .wasm: ${listFiles(out).join(", ")}`);
  const { result, served } = await openServed(out);
  checkColebrook(result);
  assert.ok(served.some((s) => s.startsWith("200 /") && s.endsWith(".wasm")), `the app fetched a .wasm: ${served.join(", ")}`);
});

test("a module worker imports the unbundled package, solves a text equation and posts the answer", async () => {
  const { dir } = appWithPackage("worker");
  writeFileSync(join(dir, "index.html"), page("./main.js"));
  writeFileSync(
    join(dir, "main.js"),
    `const w = new Worker(new URL("./worker.js", import.meta.url), { type: "module" });\n` +
      `w.onmessage = (ev) => { document.documentElement.dataset[ev.data.error ? "error" : "result"] = ev.data.error ?? JSON.stringify(ev.data); };\n` +
      `w.onerror = (ev) => { document.documentElement.dataset.error = "worker error: " + ev.message; };\n` +
      `w.postMessage({ Q: 0.1, V: 2 });\n`,
  );
  writeFileSync(
    join(dir, "worker.js"),
    `import { init, solveEquation } from "./node_modules/tacit/tacit.js";\n` +
      `const ready = init();\n` +
      `self.onmessage = async (ev) => {\n` +
      `  try {\n    await ready;\n` +
      `    const r = solveEquation({ equations: "A := pi*D^2/4\\nQ = V*A", knowns: ev.data, unknowns: [{ name: "D", guesses: [0.1, 0.5], bounds: [0, 10] }] });\n` +
      `    postMessage({ D: r.unknowns.D, converged: r.converged, inWorker: typeof document === "undefined" });\n` +
      `  } catch (e) { postMessage({ error: e.code + ": " + e.message }); }\n};\n`,
  );
  const { result, served } = await openServed(dir);
  assert.equal(result.converged, true);
  assert.equal(result.inWorker, true);
  // Q = V·πD²/4 gives D = √(4Q/(πV)) in closed form (common practice, no source).
  const exact = Math.sqrt((4 * 0.1) / (Math.PI * 2));
  assert.ok(Math.abs(result.D - exact) <= 1e-10 * exact, `D = ${result.D}, closed form ${exact}`);
  assert.ok(served.includes("200 /node_modules/tacit/tacit_core_bg.wasm"), `the worker fetched the .wasm: ${served.join(", ")}`);
});

test("a plain static server serves the unbundled package, imported by name through an import map", async () => {
  const { dir } = appWithPackage("static");
  writeFileSync(
    join(dir, "index.html"),
    `<!doctype html><html><head><meta charset="utf-8"><link rel="icon" href="data:,"><title>tacit</title>` +
      `<script type="importmap">{ "imports": { "tacit": "./node_modules/tacit/tacit.js" } }</script></head><body>` +
      `<script type="module">\nimport { init, solveTemplate, version } from "tacit";\n` +
      `try {\n  await init();\n${REPORT}\n} catch (e) { document.documentElement.dataset.error = e.code + ": " + e.message; }\n</script></body></html>`,
  );
  const { result, served } = await openServed(dir);
  checkColebrook(result);
  const meta = JSON.parse(readFileSync(join(dir, "node_modules/tacit/package.json"), "utf8"));
  assert.equal(result.version, meta.version);
  assert.ok(served.includes("200 /node_modules/tacit/tacit_core_bg.wasm"), served.join(", "));
});

test("init() on a server that lacks the .wasm fails with init-failed and the HTTP status", async () => {
  const { dir } = appWithPackage("missing");
  writeFileSync(
    join(dir, "index.html"),
    `<!doctype html><html><head><meta charset="utf-8"><link rel="icon" href="data:,"><title>tacit</title></head><body>` +
      `<script type="module">\nimport { init } from "./node_modules/tacit/tacit.js";\n` +
      `try { await init(fetch("./nowhere.wasm")); document.documentElement.dataset.result = "{}"; }\n` +
      `catch (e) { document.documentElement.dataset.result = JSON.stringify({ code: e.code, message: e.message }); }\n</script></body></html>`,
  );
  const server = await serve(dir);
  const ctx = await browser.newContext();
  const p = await ctx.newPage();
  await p.goto(server.url);
  await p.waitForFunction(() => document.documentElement.dataset.result);
  const r = JSON.parse(await p.evaluate(() => document.documentElement.dataset.result));
  await ctx.close();
  await server.close();
  assert.equal(r.code, "init-failed");
  assert.match(r.message, /HTTP 404/);
});
