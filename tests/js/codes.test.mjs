// The error and status codes in the types cannot drift from the source: every code the
// Rust core can raise (InputError::new/at and unit_error with a literal code, or a
// `code: "..."` field) and every code tacit.js throws is in the ErrorCode union of
// tacit.d.ts, and the union holds no other; the StatusCode union equals Status::code.
// The README's table of error codes lists every one.
import { test } from "node:test";
import assert from "node:assert/strict";
import { readFile, readdir } from "node:fs/promises";

const root = new URL("../../", import.meta.url);

async function rustFiles(dir) {
  const out = [];
  for (const entry of await readdir(new URL(dir, root), { withFileTypes: true })) {
    const path = `${dir}/${entry.name}`;
    if (entry.isDirectory()) out.push(...(await rustFiles(path)));
    else if (entry.name.endsWith(".rs")) out.push(path);
  }
  return out;
}

function union(dts, name) {
  const m = dts.match(new RegExp(`export type ${name} =([^;]*);`));
  assert.ok(m, `tacit.d.ts has no union ${name}`);
  return new Set([...m[1].matchAll(/"([^"]+)"/g)].map((x) => x[1]));
}

const sorted = (s) => [...s].sort();

test("ErrorCode lists exactly the codes the core and the wrapper raise", async () => {
  const codes = new Set();
  for (const file of await rustFiles("src")) {
    const text = await readFile(new URL(file, root), "utf8");
    for (const m of text.matchAll(/(?:InputError::(?:new|at)|unit_error)\(\s*"([a-z0-9-]+)"/g)) codes.add(m[1]);
    for (const m of text.matchAll(/code:\s*"([a-z0-9-]+)"/g)) codes.add(m[1]);
  }
  const js = await readFile(new URL("js/tacit.js", root), "utf8");
  for (const m of js.matchAll(/TacitError\(\s*"([a-z0-9-]+)"/g)) codes.add(m[1]);
  assert.ok(codes.size > 60, `only ${codes.size} codes found: the patterns no longer match the source`);
  const dts = await readFile(new URL("js/tacit.d.ts", root), "utf8");
  assert.deepEqual(sorted(union(dts, "ErrorCode")), sorted(codes));

  const readme = await readFile(new URL("README.md", root), "utf8");
  const table = readme.slice(readme.indexOf("### Error codes"));
  const missing = sorted(codes).filter((c) => !table.includes(`| \`${c}\` |`));
  assert.deepEqual(missing, [], "codes without a row in the README's table of error codes");
});

test("StatusCode lists exactly the statuses of the core", async () => {
  const outcome = await readFile(new URL("src/outcome.rs", root), "utf8");
  const body = outcome.slice(outcome.indexOf("pub fn code(self)"), outcome.indexOf("pub fn from_code"));
  const statuses = new Set([...body.matchAll(/=> "([a-z-]+)"/g)].map((m) => m[1]));
  assert.ok(statuses.size >= 14);
  const dts = await readFile(new URL("js/tacit.d.ts", root), "utf8");
  assert.deepEqual(sorted(union(dts, "StatusCode")), sorted(statuses));
});
