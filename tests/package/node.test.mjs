// The package imported by name from Node, as `npm install` leaves it: the "node" export
// condition gives tacit-node.js, whose init reads the .wasm from disk. Each case runs in its
// own Node process, since a module initialises once.
// Build the package first: scripts/build-pkg.sh. Run: node --test tests/package/
import { test } from "node:test";
import assert from "node:assert/strict";
import { execFileSync } from "node:child_process";
import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { appWithPackage, checkColebrook, COLEBROOK, serve } from "./lib.mjs";

const app = appWithPackage("node");

/**
 * Runs `body` as an ES module in the app folder (after the import statements `imports`) and
 * returns what it printed last, as JSON.
 */
function run(body, imports = "") {
  const file = join(app.dir, `case-${Math.random().toString(36).slice(2)}.mjs`);
  writeFileSync(
    file,
    `${imports}import * as tacit from "tacit";\nconst { init, solveTemplate, version } = tacit;\n` +
      `try {\n${body}\n} catch (e) { console.log(JSON.stringify({ code: e.code, message: e.message, isTacit: e instanceof tacit.TacitError })); }\n`,
  );
  return JSON.parse(execFileSync(process.execPath, [file], { cwd: app.dir, encoding: "utf8" }).trim().split("\n").pop());
}

const solveAndPrint = `const r = solveTemplate(${JSON.stringify(COLEBROOK)});
console.log(JSON.stringify({ f: r.value, converged: r.converged, evaluations: r.evaluations, version }));`;

test("import \"tacit\" in Node resolves to the Node entry, and init() reads the .wasm from disk", () => {
  const resolved = run(`console.log(JSON.stringify({ url: import.meta.resolve("tacit") }));`);
  assert.match(resolved.url, /\/node_modules\/tacit\/tacit-node\.js$/);
  checkColebrook(run(`await init();\n${solveAndPrint}`));
});

test("init(path) and init(file URL) read from disk in Node", () => {
  checkColebrook(run(`await init("node_modules/tacit/tacit_core_bg.wasm");\n${solveAndPrint}`));
  checkColebrook(run(`await init(new URL("./node_modules/tacit/tacit_core_bg.wasm", import.meta.url));\n${solveAndPrint}`));
});

test("init(Promise<Response>) compiles the module as it streams in", () => {
  checkColebrook(
    run(
      `const bytes = await readFile("node_modules/tacit/tacit_core_bg.wasm");\n` +
        `await init(Promise.resolve(new Response(bytes, { headers: { "content-type": "application/wasm" } })));\n${solveAndPrint}`,
      `import { readFile } from "node:fs/promises";\n`,
    ),
  );
});

test("init(fetch(url)) over HTTP, and an HTTP error is init-failed with the status", async () => {
  const server = await serve(app.dir);
  try {
    // execFileSync would block this process's server: run the child asynchronously.
    const { execFile } = await import("node:child_process");
    const runAsync = (body) => {
      const file = join(app.dir, `case-${Math.random().toString(36).slice(2)}.mjs`);
      writeFileSync(
        file,
        `import * as tacit from "tacit";\nconst { init, solveTemplate, version } = tacit;\n` +
          `try {\n${body}\n} catch (e) { console.log(JSON.stringify({ code: e.code, message: e.message })); }\n`,
      );
      return new Promise((ok, fail) =>
        execFile(process.execPath, [file], { cwd: app.dir, encoding: "utf8" }, (err, out) =>
          err ? fail(err) : ok(JSON.parse(out.trim().split("\n").pop())),
        ),
      );
    };
    checkColebrook(await runAsync(`await init(fetch("${server.url}node_modules/tacit/tacit_core_bg.wasm"));\n${solveAndPrint}`));
    const missing = await runAsync(`await init(fetch("${server.url}nowhere.wasm"));\nconsole.log("{}");`);
    assert.equal(missing.code, "init-failed");
    assert.match(missing.message, /HTTP 404/);
  } finally {
    await server.close();
  }
});

test("init refuses what it cannot load, with a TacitError naming the argument", () => {
  const wrong = run(`await init(42);\nconsole.log("{}");`);
  assert.equal(wrong.code, "bad-type");
  assert.equal(wrong.isTacit, true);
  assert.match(wrong.message, /number 42/);
  const absent = run(`await init("no/such/file.wasm");\nconsole.log("{}");`);
  assert.equal(absent.code, "init-failed");
  assert.match(absent.message, /no\/such\/file\.wasm/);
});

test("package.json is exported, and its version is the module's", () => {
  const meta = run(
    `console.log(JSON.stringify({ version: meta.version, mine: version }));`,
    `import meta from "tacit/package.json" with { type: "json" };\n`,
  );
  assert.equal(meta.version, meta.mine);
  const own = JSON.parse(readFileSync(join(app.dir, "node_modules/tacit/package.json"), "utf8"));
  assert.equal(own.license, "MIT OR Apache-2.0");
  assert.equal(own.exports["."].node, "./tacit-node.js");
  assert.equal(own.exports["."].browser, "./tacit.js");
});
