// Builds dist/tacit.html: the offline page as one file that works when opened from disk.
//
// Everything is inlined, because a page opened from file:// can neither import ES modules
// from files nor fetch a .wasm:
// - the page's ES modules (www/*.js) and the package (dist/pkg/tacit.js and the
//   wasm-bindgen glue it imports) are joined by a small module joiner into one inline
//   module script;
// - the sweep worker is joined the same way into an inert <script type="text/plain">
//   block that the page turns into a Blob-URL worker;
// - the wasm goes in gzip-compressed and base64-encoded; the page inflates it with the
//   browser's DecompressionStream;
// - the CSS is inlined in a <style> element.
// A Content-Security-Policy meta tag allows exactly these scripts by their sha256 hash,
// forbids every connection (connect-src 'none') and allows only blob: workers.
//
// Usage: node scripts/build-page.mjs [--out dist/tacit.html]
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync, mkdirSync, existsSync } from 'node:fs';
import { dirname, join, resolve, relative } from 'node:path';
import { gzipSync } from 'node:zlib';
import { fileURLToPath } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const args = process.argv.slice(2);
const outArg = args.indexOf('--out');
const outPath = resolve(root, outArg >= 0 ? args[outArg + 1] : 'dist/tacit.html');

const pkgDir = join(root, 'dist/pkg');
const pkgEntry = join(pkgDir, 'tacit.js');
if (!existsSync(pkgEntry)) {
  console.error(`build-page: ${relative(root, pkgEntry)} is missing; run scripts/build-pkg.sh first`);
  process.exit(1);
}

function findWasm() {
  for (const name of ['tacit_core_bg.wasm', 'tacit_bg.wasm', 'tacit.wasm']) {
    const p = join(pkgDir, name);
    if (existsSync(p)) return p;
  }
  console.error('build-page: no tacit_bg.wasm in dist/pkg');
  process.exit(1);
}

// ---------------------------------------------------------------------------------------
// The module joiner. It understands the static import and export forms our modules and
// wasm-bindgen's output use, wraps each module in a function scope and resolves imports
// through a small registry in dependency order. Anything it does not understand is an
// error, so a new form never slips through silently.

const IMPORT_RE = /^\s*import\s+([^'"]*?)\s*from\s*['"]([^'"]+)['"]\s*;?\s*$/;
const IMPORT_BARE_RE = /^\s*import\s*['"]([^'"]+)['"]\s*;?\s*$/;

function parseImportClause(clause, where) {
  // Forms: X | { a, b as c } | X, { a } | * as ns
  const parts = [];
  let rest = clause.trim();
  let ns = null;
  const star = rest.match(/^\*\s+as\s+([A-Za-z_$][\w$]*)$/);
  if (star) return { ns: star[1], names: [] };
  const braceAt = rest.indexOf('{');
  if (braceAt >= 0) {
    const before = rest.slice(0, braceAt).replace(/,\s*$/, '').trim();
    if (before) parts.push(['default', before]);
    const inner = rest.slice(braceAt + 1, rest.lastIndexOf('}'));
    for (const item of inner.split(',').map((s) => s.trim()).filter(Boolean)) {
      const m = item.match(/^([A-Za-z_$][\w$]*)(?:\s+as\s+([A-Za-z_$][\w$]*))?$/);
      if (!m) throw new Error(`${where}: cannot read import item "${item}"`);
      parts.push([m[1], m[2] || m[1]]);
    }
  } else if (/^[A-Za-z_$][\w$]*$/.test(rest)) {
    parts.push(['default', rest]);
  } else {
    throw new Error(`${where}: cannot read import clause "${clause}"`);
  }
  return { ns, names: parts };
}

function joinModules(entryPath) {
  const modules = new Map(); // path -> { id, code, deps }
  let nextId = 0;

  function load(path) {
    if (modules.has(path)) return modules.get(path);
    const text = readFileSync(path, 'utf8');
    const rec = { id: nextId++, path, code: '', deps: [] };
    modules.set(path, rec);
    const exportsList = []; // [exportedName, localName]
    const out = [];
    const lines = text.split('\n');
    for (let i = 0; i < lines.length; i++) {
      let line = lines[i];
      const where = `${relative(root, path)}:${i + 1}`;
      // Multi-line import/export lists: join until the closing brace.
      if (/^\s*(import|export)\s*\{[^}]*$/.test(line) || /^\s*import\s+[\w$]+\s*,\s*\{[^}]*$/.test(line)) {
        while (!line.includes('}') && i + 1 < lines.length) line += ' ' + lines[++i].trim();
      }
      let m;
      if ((m = line.match(IMPORT_RE))) {
        const dep = load(resolve(dirname(path), m[2]));
        rec.deps.push(dep);
        const { ns, names } = parseImportClause(m[1], where);
        if (ns) out.push(`const ${ns} = __mod(${dep.id});`);
        else out.push(`const { ${names.map(([a, b]) => (a === b ? a : `${a}: ${b}`)).join(', ')} } = __mod(${dep.id});`);
        continue;
      }
      if ((m = line.match(IMPORT_BARE_RE))) {
        const dep = load(resolve(dirname(path), m[1]));
        rec.deps.push(dep);
        out.push(`__mod(${dep.id});`);
        continue;
      }
      // Node-only dynamic imports (the package reads the .wasm from disk under Node) can
      // never run in the page; any other dynamic import is an error.
      line = line.replace(/\bimport\s*\(\s*(['"])node:[^'"]+\1\s*\)/g, 'Promise.reject(new Error("not available in the page"))');
      if (/\bimport\s*\(/.test(line.replace(/\/\/.*$/, ''))) {
        throw new Error(`${where}: dynamic import is not supported in the page`);
      }
      if (/^\s*import\s/.test(line)) throw new Error(`${where}: cannot read import "${line.trim()}"`);
      if ((m = line.match(/^(\s*)export\s+default\s+(async\s+function|function|class)\s+([A-Za-z_$][\w$]*)/))) {
        exportsList.push(['default', m[3]]);
        out.push(line.replace(/export\s+default\s+/, ''));
        continue;
      }
      if ((m = line.match(/^(\s*)export\s+default\s+(.*)$/))) {
        exportsList.push(['default', '__default']);
        out.push(`${m[1]}const __default = ${m[2]}`);
        continue;
      }
      if ((m = line.match(/^(\s*)export\s+(async\s+function\*?|function\*?|class|const|let|var)\s+([A-Za-z_$][\w$]*)/))) {
        exportsList.push([m[3], m[3]]);
        out.push(line.replace(/export\s+/, ''));
        continue;
      }
      if ((m = line.match(/^\s*export\s*\{([^}]*)\}\s*(from\s*['"]([^'"]+)['"])?\s*;?\s*$/))) {
        let depId = null;
        if (m[3]) {
          const dep = load(resolve(dirname(path), m[3]));
          rec.deps.push(dep);
          depId = dep.id;
        }
        for (const item of m[1].split(',').map((s) => s.trim()).filter(Boolean)) {
          const im = item.match(/^([A-Za-z_$][\w$]*)(?:\s+as\s+([A-Za-z_$][\w$]*))?$/);
          if (!im) throw new Error(`${where}: cannot read export item "${item}"`);
          if (depId === null) exportsList.push([im[2] || im[1], im[1]]);
          else {
            const local = `__re${depId}_${im[1]}`;
            out.push(`const ${local} = __mod(${depId}).${im[1]};`);
            exportsList.push([im[2] || im[1], local]);
          }
        }
        continue;
      }
      if (/^\s*export\s/.test(line)) throw new Error(`${where}: cannot read export "${line.trim()}"`);
      out.push(line);
    }
    const body = out.join('\n').replace(/\bimport\.meta\.url\b/g, '__baseUrl');
    const getters = exportsList.map(([name, local]) => `get ${JSON.stringify(name)}() { return ${local}; }`);
    rec.code = `// ${relative(root, path)}\n__defs[${rec.id}] = function () {\n${body}\nreturn { ${getters.join(', ')} };\n};`;
    return rec;
  }

  const entry = load(entryPath);
  const order = [...modules.values()].sort((a, b) => a.id - b.id);
  const prelude =
    'const __defs = [], __done = [];\n' +
    'const __baseUrl = (typeof location !== "undefined" && location.href) || "file:///";\n' +
    'function __mod(id) { if (!(id in __done)) { __done[id] = null; __done[id] = __defs[id](); } return __done[id]; }\n';
  return `${prelude}${order.map((m) => m.code).join('\n')}\n__mod(${entry.id});\n`;
}

// ---------------------------------------------------------------------------------------

const sha256 = (text) => createHash('sha256').update(text, 'utf8').digest('base64');
// A closing script tag inside inlined code would end the element early.
const guardScript = (text) => text.replace(/<\/(script)/gi, '<\\/$1').replace(/<!--/g, '<\\!--');

const wasmBytes = readFileSync(findWasm());
const wasmGz = gzipSync(wasmBytes, { level: 9 });
const wasmB64 = wasmGz.toString('base64');

let version = 'unknown';
try {
  const cargo = readFileSync(join(root, 'Cargo.toml'), 'utf8');
  version = cargo.match(/^version\s*=\s*"([^"]+)"/m)[1];
} catch {
  /* the page says "unknown" */
}

const pageJs = joinModules(join(root, 'www/app.js'));
const workerJs = joinModules(join(root, 'www/sweep-worker.js'));
const css = readFileSync(join(root, 'www/style.css'), 'utf8');
const template = readFileSync(join(root, 'www/index.html'), 'utf8');

// The data script sets two globals read by app.js; it is a classic script so it runs first.
const dataJs =
  `globalThis.__TACIT_WASM_GZ_B64 = "${wasmB64}";\n` +
  `globalThis.__TACIT_VERSION = ${JSON.stringify(version)};\n` +
  `globalThis.__TACIT_BUILT = ${JSON.stringify(new Date().toISOString().slice(0, 10))};\n`;
const pageScript = guardScript(pageJs);
const dataScript = guardScript(dataJs);

const csp = [
  "default-src 'none'",
  `script-src 'sha256-${sha256(dataScript)}' 'sha256-${sha256(pageScript)}' 'wasm-unsafe-eval'`,
  "style-src 'unsafe-inline'",
  "img-src data: blob:",
  "connect-src 'none'",
  "worker-src blob:",
  "font-src 'none'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
].join('; ');

const marker = (name) => {
  const tag = `<!--@${name}@-->`;
  if (!template.includes(tag)) throw new Error(`www/index.html lacks the marker ${tag}`);
  return tag;
};
let html = template;
html = html.replace(marker('csp'), () => `<meta http-equiv="Content-Security-Policy" content="${csp}">`);
html = html.replace(marker('style'), () => `<style>\n${css}</style>`);
html = html.replace(
  marker('scripts'),
  () =>
    `<script type="text/plain" id="sweep-worker-source">${guardScript(workerJs)}</script>\n` +
    `<script>${dataScript}</script>\n` +
    `<script type="module">${pageScript}</script>`,
);

mkdirSync(dirname(outPath), { recursive: true });
writeFileSync(outPath, html);
const kb = (n) => (n / 1024).toFixed(1);
console.log(
  `${relative(root, outPath)}: ${kb(Buffer.byteLength(html))} KB ` +
    `(wasm ${kb(wasmBytes.length)} KB, gzip ${kb(wasmGz.length)} KB, base64 ${kb(wasmB64.length)} KB; ` +
    `page script ${kb(pageJs.length)} KB, worker ${kb(workerJs.length)} KB, css ${kb(css.length)} KB)`,
);
