// The page's size and first paint against the cost of its wasm alone, measured in one run
// in Debian's headless Chromium (figures, never asserted):
//   - the size of dist/tacit.html (goal <= 400,000 bytes);
//   - first paint: from the start of navigation to dist/tacit.html, opened from disk, to
//     the first frame drawn after the page shows its opening result (the Colebrook friction
//     factor, solved as soon as the solver is ready);
//   - wasm alone: in the same browser, on a blank page, the time to compile and
//     instantiate the page's wasm from its bytes (WebAssembly.instantiate; the imports are
//     stubs, which instantiation does not call);
//   - their ratio (goal <= 1.5), and the page's own marks (inflated, instantiated, set up);
//   - the floor for any page carrying this wasm: the page cut to its inlined wasm and its
//     loader, from navigation to the module instantiated, and the ratio against it.
// V8 compiles wasm functions lazily, on first call, so "compile + instantiate" alone is a few
// milliseconds: navigation, parsing the page and the first calls are most of the rest.
// Runs alternate between the two measurements; medians are printed.
//
// Usage: node scripts/bench-first-paint.mjs [--runs 7] [--page dist/tacit.html]
import { mkdtempSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { chromium } from "playwright-core";

const root = resolve(dirname(fileURLToPath(import.meta.url)), "..");
const pagePath = resolve(root, process.argv.includes("--page") ? process.argv[process.argv.indexOf("--page") + 1] : "dist/tacit.html");
const wasmPath = join(root, "dist/pkg/tacit_core_bg.wasm");
const args = process.argv.slice(2);
const runs = Number(args[args.indexOf("--runs") + 1]) || 7;

const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const spread = (xs) => `median ${median(xs).toFixed(1)} ms (min ${Math.min(...xs).toFixed(1)}, max ${Math.max(...xs).toFixed(1)})`;

const browser = await chromium.launch({
  executablePath: process.env.TACIT_CHROMIUM || "/usr/bin/chromium",
  args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
});

// In the page before its scripts: note the first animation frame after the opening result
// is on the page, then the end of that frame's task (the paint follows the frame's rAF
// callbacks; a message posted from rAF runs after it).
const PAINT_PROBE = `(() => {
  const tick = () => {
    if (globalThis.tacitPage && globalThis.tacitPage.firstSolveMs != null) {
      const ch = new MessageChannel();
      ch.port1.onmessage = () => { globalThis.__firstPaintMs = performance.now(); };
      ch.port2.postMessage(0);
      return;
    }
    requestAnimationFrame(tick);
  };
  requestAnimationFrame(tick);
})();`;

const wasmBytes = readFileSync(wasmPath);
const wasmB64 = wasmBytes.toString("base64");

async function firstPaint() {
  const ctx = await browser.newContext();
  const page = await ctx.newPage();
  await page.addInitScript(PAINT_PROBE);
  await page.goto(pathToFileURL(pagePath).href);
  await page.waitForFunction(() => globalThis.__firstPaintMs != null, null, { timeout: 30000 });
  const r = await page.evaluate(() => ({ paint: globalThis.__firstPaintMs, solved: globalThis.tacitPage.firstSolveMs, marks: globalThis.tacitPage.marks }));
  await ctx.close();
  return r;
}

async function wasmAlone() {
  const ctx = await browser.newContext();
  const page = await ctx.newPage();
  await page.goto("about:blank");
  const ms = await page.evaluate(async (b64) => {
    const bin = atob(b64);
    const bytes = new Uint8Array(bin.length);
    for (let i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
    const probe = await WebAssembly.compile(bytes.slice()); // to list the imports only
    const imports = {};
    for (const { module, name, kind } of WebAssembly.Module.imports(probe)) {
      imports[module] ??= {};
      if (kind === "function") imports[module][name] = () => { throw new Error("stub"); };
      else throw new Error(`unexpected import kind ${kind}`);
    }
    // A fresh copy, so that nothing compiled above is reused.
    const fresh = bytes.slice();
    const t0 = performance.now();
    await WebAssembly.instantiate(fresh, imports);
    return performance.now() - t0;
  }, wasmB64);
  await ctx.close();
  return ms;
}

// The floor for any page that carries this wasm: dist/tacit.html cut down to its inlined
// wasm and its classic loader script, opened from disk; it records when the module is
// compiled and instantiated (stub imports), counted from the start of navigation.
// Read byte for byte (latin1): the inlined data of a windows-1252 page is not UTF-8.
const html = readFileSync(pagePath, "latin1");
// Pages built before the classic loader started the wasm have no floor to cut out.
const hasLoader = html.includes("__tacitWasm");
const dataBlock = html.match(/<script type="application\/octet-stream" id="wasm-gz"[^>]*>[^<]*<\/script>/)[0];
const loader = html.match(/<script>([\s\S]*?)<\/script>/)[0];
const floorPath = join(mkdtempSync(join(tmpdir(), "tacit-floor-")), "wasm-only.html");
writeFileSync(
  floorPath,
  `<!doctype html><html><head><meta charset="${/<meta charset="windows-1252">/.test(html) ? "windows-1252" : "utf-8"}"><title>wasm only</title></head><body><p>wasm only</p>\n${dataBlock}\n${loader}\n` +
    `<script type="module">const m = await globalThis.__tacitWasm.module; const imports = {};\n` +
    `for (const { module, name } of WebAssembly.Module.imports(m)) (imports[module] ??= {})[name] = () => { throw new Error("stub"); };\n` +
    `await WebAssembly.instantiate(m, imports); globalThis.__readyMs = performance.now();</script></body></html>`,
  "latin1",
);

async function wasmOnlyPage() {
  const ctx = await browser.newContext();
  const page = await ctx.newPage();
  await page.goto(pathToFileURL(floorPath).href);
  await page.waitForFunction(() => globalThis.__readyMs != null, null, { timeout: 30000 });
  const ms = await page.evaluate(() => globalThis.__readyMs);
  await ctx.close();
  return ms;
}

const paints = [];
const floors = [];
const solved = [];
const alone = [];
const marks = { inflated: [], instantiated: [], setUp: [] };
for (let i = 0; i < runs; i++) {
  const r = await firstPaint();
  paints.push(r.paint);
  solved.push(r.solved);
  for (const k of Object.keys(marks)) if (r.marks[k] != null) marks[k].push(r.marks[k]);
  alone.push(await wasmAlone());
  if (hasLoader) floors.push(await wasmOnlyPage());
}
await browser.close();

const size = statSync(pagePath).size;
console.log(`page size: ${size.toLocaleString("en-US")} bytes (goal <= 400,000: ${size <= 400_000 ? "met" : "not met"}); wasm ${wasmBytes.length.toLocaleString("en-US")} bytes`);
console.log(`first result painted, from navigation (file://): ${spread(paints)}`);
console.log(`  of which: wasm inflated at ${spread(marks.inflated)}; instantiated at ${spread(marks.instantiated)}; result shown at ${spread(solved)}`);
console.log(`wasm alone, compile + instantiate from bytes in the same browser: ${spread(alone)}`);
console.log(`ratio first paint / wasm alone (medians): ${(median(paints) / median(alone)).toFixed(2)} (goal <= 1.5); ${runs} alternating runs`);
if (hasLoader) {
  console.log(`the same page cut to its inlined wasm and loader, from navigation to instantiated: ${spread(floors)}`);
  console.log(`ratio first paint / that wasm-only page (medians): ${(median(paints) / median(floors)).toFixed(2)}`);
}
