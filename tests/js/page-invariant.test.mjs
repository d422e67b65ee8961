// The invariant of DEVELOPERS.md: the page holds no numerical logic. Everything it shows
// comes from a compiled Problem (solve, sample, roots, sweep, in the units on the page) or
// the ask–tell Stepper; it calls no other solver entry, converts no units, and runs no
// scans or solves of its own.
import { test } from "node:test";
import assert from "node:assert/strict";
import { readFile, readdir } from "node:fs/promises";

const www = new URL("../../www/", import.meta.url);
const files = (await readdir(www)).filter((f) => f.endsWith(".js"));

// What the page may use of the package: loading, the catalogue and units tables for the
// form, the text check for the editor, the Problem, the Stepper, the version, and the
// check, reading and writing of own templates (data, no numbers).
const ALLOWED = new Set(["init", "version", "catalogue", "units", "checkEquation", "problem", "Stepper", "checkOwnTemplate", "readOwnTemplates", "writeOwnTemplates"]);

// Signs of numerics done in the page: solver entries that bypass the Problem, unit
// conversion, solves with a budget of two used as function evaluations, sign-change scans.
const FORBIDDEN = [
  /\bconvertUnit\b/,
  /\bsolveTemplate\b/,
  /\bsolveEquation\b/,
  /\bfindRoots\b/,
  /\bsweep\s*\(\s*\{/,
  /maxEvals\s*:\s*2\b/,
  /Math\.sign\s*\(/,
  /\bscanTemplate\b|\btemplateAsEquation\b|\bsiToResultUnit\b/,
];

test("the page uses only the Problem, the Stepper and the tables of the package", async () => {
  assert.ok(files.includes("app.js"));
  for (const f of files) {
    const text = await readFile(new URL(f, www), "utf8");
    for (const m of text.matchAll(/(?<![/\w'"])tacit\.([A-Za-z_]\w*)/g)) {
      assert.ok(ALLOWED.has(m[1]), `${f} uses tacit.${m[1]}`);
    }
    for (const m of text.matchAll(/import\s*\{([^}]*)\}\s*from\s*'[^']*tacit\.js'/g)) {
      for (const name of m[1].split(",").map((s) => s.trim().split(/\s+as\s+/)[0]).filter(Boolean)) {
        assert.ok(ALLOWED.has(name), `${f} imports ${name}`);
      }
    }
    for (const re of FORBIDDEN) assert.doesNotMatch(text, re, `${f} has numerical logic (${re})`);
  }
});
