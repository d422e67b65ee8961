// Shared set-up for the package tests: the built package dist/pkg packed with `npm pack`
// (so only the files its package.json lists are there) and unpacked into a fresh app folder
// as node_modules/tacit, a static server on 127.0.0.1, and Debian's headless Chromium.
import assert from "node:assert/strict";
import { execFileSync } from "node:child_process";
import { createReadStream, existsSync, mkdirSync, mkdtempSync, readdirSync, statSync } from "node:fs";
import { createServer } from "node:http";
import { tmpdir } from "node:os";
import { dirname, extname, join, normalize, resolve, sep } from "node:path";
import { fileURLToPath } from "node:url";

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
export const PKG = join(ROOT, "dist/pkg");

/** A new folder holding node_modules/tacit as `npm install` of the packed package leaves it. */
export function appWithPackage(name) {
  if (!existsSync(join(PKG, "package.json"))) throw new Error(`${PKG} is missing: build it with scripts/build-pkg.sh`);
  const dir = mkdtempSync(join(tmpdir(), `tacit-${name}-`));
  const packed = JSON.parse(
    execFileSync("npm", ["pack", PKG, "--json", "--pack-destination", dir], { encoding: "utf8", stdio: ["ignore", "pipe", "pipe"] }),
  )[0];
  const target = join(dir, "node_modules", "tacit");
  mkdirSync(target, { recursive: true });
  execFileSync("tar", ["-xzf", join(dir, packed.filename), "-C", target, "--strip-components=1"]);
  return { dir, files: packed.files.map((f) => f.path) };
}

const TYPES = {
  ".html": "text/html; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".mjs": "text/javascript; charset=utf-8",
  ".json": "application/json",
  ".wasm": "application/wasm",
  ".css": "text/css",
};

/** Serves `dir` as plain files on 127.0.0.1 (a free port); resolves to { url, close, served }. */
export function serve(dir) {
  const root = resolve(dir);
  const served = [];
  const server = createServer((req, res) => {
    const path = decodeURIComponent(new URL(req.url, "http://127.0.0.1").pathname);
    let file = normalize(join(root, path));
    if (file !== root && !file.startsWith(root + sep)) {
      res.writeHead(403).end();
      return;
    }
    if (existsSync(file) && statSync(file).isDirectory()) file = join(file, "index.html");
    if (!existsSync(file)) {
      served.push(`404 ${path}`);
      res.writeHead(404, { "content-type": "text/plain" }).end("not found");
      return;
    }
    served.push(`200 ${path}`);
    res.writeHead(200, { "content-type": TYPES[extname(file)] ?? "application/octet-stream", "cache-control": "no-store" });
    createReadStream(file).pipe(res);
  });
  return new Promise((ok) =>
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address();
      ok({ url: `http://127.0.0.1:${port}/`, served, close: () => new Promise((done) => server.close(done)) });
    }),
  );
}

/**
 * Opens `url` in a fresh page and waits until the page sets data-result (JSON) or data-error
 * on <html>. Fails on any console error, uncaught exception or failed request.
 */
export async function openAndRead(browser, url) {
  const ctx = await browser.newContext();
  const page = await ctx.newPage();
  const problems = [];
  page.on("console", (m) => {
    if (m.type() === "error") problems.push(`console: ${m.text()}`);
  });
  page.on("pageerror", (e) => problems.push(`pageerror: ${e.message}`));
  page.on("requestfailed", (r) => problems.push(`request failed: ${r.url()}`));
  page.on("response", (r) => {
    if (r.status() >= 400) problems.push(`HTTP ${r.status()}: ${r.url()}`);
  });
  page.on("worker", (w) => w.on("console", (m) => m.type() === "error" && problems.push(`worker: ${m.text()}`)));
  await page.goto(url);
  await page.waitForFunction(() => document.documentElement.dataset.result || document.documentElement.dataset.error, null, {
    timeout: 20000,
  });
  const { result, error } = await page.evaluate(() => ({ ...document.documentElement.dataset }));
  await ctx.close();
  assert.equal(error, undefined, `the page reported an error: ${error}`);
  assert.deepEqual(problems, [], "no console error, uncaught exception or failed request");
  return JSON.parse(result);
}

/** Files under `dir`, relative, recursively. */
export function listFiles(dir, base = dir) {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? listFiles(join(dir, e.name), base) : [join(dir, e.name).slice(base.length + 1)],
  );
}

// The request every set-up solves, and what the page reports of its answer.
export const COLEBROOK = {
  id: "pipes.colebrook",
  values: { Re: 360000, eps: { value: 0.15, unit: "mm" }, D: { value: 300, unit: "mm" } },
  unknown: "f",
};

/** Script text for a page: solve COLEBROOK with the imported `solveTemplate` and report it. */
export const REPORT = `
const r = solveTemplate(${JSON.stringify(COLEBROOK)});
document.documentElement.dataset.result = JSON.stringify({ f: r.value, converged: r.converged, evaluations: r.evaluations, version });
`;

/**
 * Checks a reported friction factor against the Colebrook (1939) equation itself, evaluated
 * here with JS Math, and the Swamee and Jain (1976) explicit form, stated to be within about
 * 1 % of Colebrook.
 */
export function checkColebrook(r) {
  assert.equal(r.converged, true);
  assert.ok(r.evaluations > 0);
  const Re = 360000;
  const eps = 0.15e-3;
  const D = 0.3;
  const f = r.f;
  const residual = 1 / Math.sqrt(f) + 2 * Math.log10(eps / (3.7 * D) + 2.51 / (Re * Math.sqrt(f)));
  assert.ok(Math.abs(residual) < 1e-9, `Colebrook residual ${residual} at f = ${f}`);
  const fSJ = 0.25 / Math.log10(eps / (3.7 * D) + 5.74 / Re ** 0.9) ** 2;
  assert.ok(Math.abs(f - fSJ) <= 0.015 * fSJ, `f = ${f} against Swamee–Jain ${fSJ}`);
}
