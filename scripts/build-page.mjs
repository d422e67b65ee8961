// Builds dist/tacit.html: the offline page as one file that works when opened from disk.
//
// Everything is inlined, because a page opened from file:// can neither import ES modules
// from files nor fetch a .wasm:
// - the page's ES modules (www/*.js) and the package (dist/pkg/tacit.js and the
//   wasm-bindgen glue it imports) are joined by a small module joiner into one inline
//   module script;
// - the sweep worker (www/sweep-worker.js) is joined into the same script: the page gives
//   that script's own text to a Blob-URL worker, where the worker entry runs instead;
// - the wasm goes in gzip-compressed (by zopfli), as 7-bit text in an inert data block;
//   the page inflates it with the browser's DecompressionStream;
// - the CSS is inlined in a <style> element;
// - the script and the CSS are minified by esbuild.
// Without the npm devDependencies (esbuild, @gfx/zopfli) the page still builds, larger.
// A Content-Security-Policy meta tag allows exactly these scripts by their sha256 hash,
// forbids every connection (connect-src 'none') and allows only blob: workers.
//
// Usage: node scripts/build-page.mjs [--out dist/tacit.html]
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync, mkdirSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { spawnSync } from 'node:child_process';
import { dirname, join, resolve, relative } from 'node:path';
import { gzipSync } from 'node:zlib';
import { fileURLToPath, pathToFileURL } from 'node:url';

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

function joinModules(entryPaths) {
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

  const [page, worker] = entryPaths.map(load);
  const order = [...modules.values()].sort((a, b) => a.id - b.id);
  const prelude =
    '"use strict";\nconst __defs = [], __done = [];\n' +
    'const __baseUrl = (typeof location !== "undefined" && location.href) || "file:///";\n' +
    'function __mod(id) { if (!(id in __done)) { __done[id] = null; __done[id] = __defs[id](); } return __done[id]; }\n';
  // One text serves both: the page runs it as its module script, and hands the same text
  // to the sweep worker as a Blob, where there is no document and the worker entry runs.
  return `${prelude}${order.map((m) => m.code).join('\n')}\n__mod(typeof document === "undefined" ? ${worker.id} : ${page.id});\n`;
}

// Drops whole-line comments and leading indentation, outside template literals. The
// result is checked by parsing it (node --check); if that fails the text is kept as is.
function slim(code) {
  let inTemplate = false;
  let inBlock = false;
  const out = [];
  for (const line of code.split('\n')) {
    const t = line.trim();
    if (!inTemplate) {
      // Whole-line block comments (doc comments) go too.
      if (inBlock) {
        if (t.includes('*/')) {
          inBlock = false;
          const rest = t.slice(t.indexOf('*/') + 2).trim();
          if (rest) out.push(rest);
        }
        continue;
      }
      if (t.startsWith('/*') && !t.includes('*/')) {
        inBlock = true;
        continue;
      }
      if (t.startsWith('/*') && t.endsWith('*/') && t.indexOf('*/') === t.length - 2) continue;
      if (t === '' || (t.startsWith('//') && !t.startsWith('//#'))) continue;
      out.push(t);
    } else out.push(line);
    const ticks = (line.replace(/\\`/g, '').match(/`/g) || []).length;
    if (ticks % 2 === 1) inTemplate = !inTemplate;
  }
  return out.join('\n');
}

function parses(code) {
  const dir = mkdtempSync(join(tmpdir(), 'tacit-page-'));
  const file = join(dir, 'bundle.mjs');
  writeFileSync(file, code);
  const r = spawnSync(process.execPath, ['--check', file], { encoding: 'utf8' });
  rmSync(dir, { recursive: true, force: true });
  return r.status === 0 ? null : r.stderr;
}

// ---------------------------------------------------------------------------------------

const sha256 = (text) => createHash('sha256').update(text, 'utf8').digest('base64');
// A closing script tag inside inlined code would end the element early.
const guardScript = (text) => text.replace(/<\/(script)/gi, '<\\/$1').replace(/<!--/g, '<\\!--');

// The gzip-compressed wasm as text in an inert <script type="application/octet-stream">
// block: 7 bits per character, which costs 8/7 of the bytes where base64 costs 4/3. The
// values the HTML parser would alter or that could end the element (NUL, CR and "<") are
// written as one character above U+00FF that carries their index and the next 7 bits.
// decode7 in www/wasm-bytes.js decodes it.
const FORBIDDEN = [0x00, 0x0d, 0x3c];
function encode7(bytes) {
  const groups = [];
  let acc = 0;
  let nbits = 0;
  for (const b of bytes) {
    acc = (acc << 8) | b;
    nbits += 8;
    while (nbits >= 7) {
      nbits -= 7;
      groups.push((acc >> nbits) & 0x7f);
    }
    acc &= (1 << nbits) - 1;
  }
  if (nbits > 0) groups.push((acc << (7 - nbits)) & 0x7f);
  let out = '';
  for (let i = 0; i < groups.length; i++) {
    const idx = FORBIDDEN.indexOf(groups[i]);
    if (idx < 0) out += String.fromCharCode(groups[i]);
    else out += String.fromCharCode(0x100 + ((idx << 7) | (groups[++i] ?? 0)));
  }
  return out;
}
// Zopfli (a devDependency, compiled to wasm) writes an ordinary gzip stream about 6 % smaller
// than zlib's level 9; the page inflates either the same way. Without it, zlib is used.
async function gzipSmallest(bytes) {
  try {
    const { gzipAsync } = await import('@gfx/zopfli');
    return Buffer.from(await gzipAsync(bytes, { numiterations: 15 }));
  } catch (e) {
    if (e?.code !== 'ERR_MODULE_NOT_FOUND') throw e;
    console.error('build-page: note: @gfx/zopfli is not installed (npm ci); using zlib for the wasm');
    return gzipSync(bytes, { level: 9 });
  }
}
const wasmBytes = readFileSync(findWasm());
const wasmGz = await gzipSmallest(wasmBytes);
const wasmText = encode7(wasmGz);

let version = 'unknown';
try {
  const cargo = readFileSync(join(root, 'Cargo.toml'), 'utf8');
  version = cargo.match(/^version\s*=\s*"([^"]+)"/m)[1];
} catch {
  /* the page says "unknown" */
}

const joined = joinModules([join(root, 'www/app.js'), join(root, 'www/sweep-worker.js')]);
const fault = parses(joined);
if (fault) {
  console.error(`build-page: the joined script does not parse:\n${fault}`);
  process.exit(1);
}
// esbuild (an exact-version devDependency) minifies the script and the CSS. The script is
// left in no module format: the same text runs as the page's module script and as a classic
// worker script, so it must stay valid as both. Without esbuild the comment slimmer is used.
let esbuild = null;
try {
  esbuild = await import('esbuild');
} catch (e) {
  if (e?.code !== 'ERR_MODULE_NOT_FOUND') throw e;
  console.error('build-page: note: esbuild is not installed (npm ci); the script and CSS are not minified');
}
let pageJs;
if (esbuild) {
  pageJs = esbuild.transformSync(joined, { minify: true, target: 'es2022', charset: 'utf8', legalComments: 'none' }).code;
  const bad = parses(pageJs);
  if (bad) {
    console.error(`build-page: the minified script does not parse:\n${bad}`);
    process.exit(1);
  }
} else {
  pageJs = slim(joined);
  if (parses(pageJs)) {
    console.error('build-page: note: the slimmed script did not parse; using the full text');
    pageJs = joined;
  }
}
const cssSource = readFileSync(join(root, 'www/style.css'), 'utf8');
const css = esbuild ? esbuild.transformSync(cssSource, { loader: 'css', minify: true, charset: 'utf8' }).code : cssSource;
const template = readFileSync(join(root, 'www/index.html'), 'utf8');

// The data script sets two globals read by app.js, and starts inflating and compiling the
// wasm (startWasm of www/wasm-bytes.js, whose text it carries) while the module script below
// is parsed and run. It is a classic script so it runs first; a failure here is left for the
// page's module to meet and report.
const wasmLoader = await import(pathToFileURL(join(root, 'www/wasm-bytes.js')).href);
const dataJs =
  `globalThis.__TACIT_VERSION = ${JSON.stringify(version)};\n` +
  `globalThis.__TACIT_BUILT = ${JSON.stringify(new Date().toISOString().slice(0, 10))};\n` +
  `(() => {\n${wasmLoader.decode7}\n${wasmLoader.startWasm}\ntry { globalThis.__tacitWasm = startWasm(); } catch { /* reported by the page */ }\n})();\n`;
const pageScript = guardScript(pageJs);
const dataScript = guardScript(esbuild ? esbuild.transformSync(dataJs, { minify: true, target: 'es2022', charset: 'utf8', legalComments: 'none' }).code : dataJs);

const styleText = `\n${css}`;
const csp = [
  "default-src 'none'",
  `script-src 'sha256-${sha256(dataScript)}' 'sha256-${sha256(pageScript)}' 'wasm-unsafe-eval'`,
  `style-src 'sha256-${sha256(styleText)}'`,
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
html = html.replace(marker('style'), () => `<style>${styleText}</style>`);
html = html.replace(
  marker('scripts'),
  () =>
    `<script type="application/octet-stream" id="wasm-gz" data-length="${wasmGz.length}">${wasmText}</script>\n` +
    `<script>${dataScript}</script>\n<script type="module" id="page-script">${pageScript}</script>`,
);

mkdirSync(dirname(outPath), { recursive: true });
writeFileSync(outPath, html);
const kb = (n) => (n / 1024).toFixed(1);
console.log(
  `${relative(root, outPath)}: ${kb(Buffer.byteLength(html))} KB ` +
    `(wasm ${kb(wasmBytes.length)} KB, gzip ${kb(wasmGz.length)} KB, as text ${kb(Buffer.byteLength(wasmText))} KB; ` +
    `page and worker script ${kb(pageJs.length)} KB, css ${kb(css.length)} KB)`,
);
