// Markup or script in a link, in saved data or in an imported file is never executed and
// never becomes an element; the page makes no network request; the CSP is in place.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { launch, openPage, checkClean, fragmentFor, PAGE_PATH, pickTemplate, solveAndRead } from './lib.mjs';

let browser;
before(async () => { browser = await launch(); });
after(async () => { await browser?.close(); });

const P = (n) => `<img src=x onerror="window.__xss=${n};alert(${n})"><script>window.__xss=${n};alert(${n})</script><svg onload="alert(${n})"></svg>`;

/** The page's own elements: 4 script elements (two inert data blocks, the loader and the
 * module script it inserted), no img, no element with an on* attribute. */
async function assertNothingInjected(page) {
  const found = await page.evaluate(() => {
    const onAttrs = [...document.querySelectorAll('*')].filter((el) => [...el.attributes].some((a) => a.name.startsWith('on')));
    return {
      imgs: document.querySelectorAll('img').length,
      scripts: document.querySelectorAll('script').length,
      onAttrs: onAttrs.map((e) => e.outerHTML.slice(0, 80)),
      xss: globalThis.__xss ?? null,
      iframes: document.querySelectorAll('iframe, object, embed').length,
    };
  });
  assert.deepEqual(found, { imgs: 0, scripts: 4, onAttrs: [], xss: null, iframes: 0 });
}

test('markup in a link (equations, values, units, labels, ids) stays text', async () => {
  const custom = await openPage(browser, {
    hash: fragmentFor({ v: 1, mode: 'custom', equations: `x = 2 ${P(1)}`, values: { x: { v: P(2).slice(0, 60), u: P(3).slice(0, 40) } }, unknown: 'x' }),
  });
  await custom.page.waitForSelector('#custom-check .error-text');
  assert.match(await custom.page.inputValue('#custom-text'), /<img src=x/);
  await assertNothingInjected(custom.page);
  const tpl = await openPage(browser, {
    hash: fragmentFor({ v: 1, mode: 'template', template: '<svg onload=alert(4)>', values: { Re: { v: '<b>1</b>', u: '<i>' } }, unknown: '<img>' }),
  });
  await tpl.page.waitForSelector('.notice');
  assert.match(await tpl.page.textContent('.notice'), /template/);
  await tpl.page.click('#solve');
  await assertNothingInjected(tpl.page);
  const ext = await openPage(browser, { hash: fragmentFor({ v: 1, mode: 'external', external: { label: P(5), stepper: P(6) } }) });
  await ext.page.waitForSelector('.notice');
  assert.match(await ext.page.textContent('#calc-title'), /<img src=x/);
  await assertNothingInjected(ext.page);
  for (const p of [custom, tpl, ext]) checkClean(p.log);
});

test('markup in saved data and in an imported list stays text', async () => {
  const { page, log } = await openPage(browser);
  await page.evaluate((payload) => {
    localStorage.setItem('tacit.saved.v1', JSON.stringify({
      format: 'tacit-saved-list', version: 1,
      items: [{ id: 'x"><img src=x>', name: payload, saved: payload, state: { v: 1, mode: 'custom', equations: payload, values: { a: { v: payload.slice(0, 60), u: '' } }, unknown: 'a' } }],
    }));
  }, P(7));
  await page.reload();
  await page.waitForFunction(() => globalThis.tacitPage?.ready === true);
  assert.equal(await page.textContent('#saved-list li .saved-name'), P(7));
  await page.click('#saved-list li button:has-text("Open")');
  await page.waitForFunction(() => document.getElementById('custom-text').value.includes('<img'));
  await assertNothingInjected(page);
  const file = JSON.stringify({ format: 'tacit-saved-list', version: 1, items: [{ name: P(8), state: { v: 1, mode: 'external', external: { label: P(9), stepper: '' } } }] });
  await page.setInputFiles('#import-saved', { name: 'list.json', mimeType: 'application/json', buffer: Buffer.from(file) });
  await page.waitForFunction(() => document.querySelectorAll('#saved-list li').length === 2);
  await page.locator('#saved-list li').first().locator('button:has-text("Open")').click();
  await page.waitForFunction(() => document.getElementById('calc-title').textContent.includes('<img'));
  await assertNothingInjected(page);
  checkClean(log);
});

test('no request leaves the machine during a full session', async () => {
  const { page, log } = await openPage(browser);
  await pickTemplate(page, 'pipes.colebrook');
  await solveAndRead(page, 'f');
  await page.selectOption('#sweep-input', 'Re');
  await page.fill('#sweep-from', '5000');
  await page.fill('#sweep-to', '1e7');
  await page.fill('#sweep-n', '200');
  await page.click('#sweep-run');
  await page.waitForFunction(() => globalThis.tacitPage.sweeps >= 1);
  await page.click('#mode-custom');
  await page.fill('#custom-text', 'x^2 = 2');
  await page.waitForSelector('#find-x');
  await solveAndRead(page, 'x');
  assert.ok(log.requests.length >= 1, 'the requests were observed');
  checkClean(log);
});

test('the page carries a strict Content-Security-Policy with script hashes', async () => {
  const html = readFileSync(PAGE_PATH, 'utf8');
  const m = html.match(/<meta http-equiv="Content-Security-Policy" content="([^"]+)">/);
  assert.ok(m, 'a CSP meta tag');
  const csp = m[1];
  assert.match(csp, /connect-src 'none'/);
  assert.match(csp, /worker-src blob:/);
  assert.match(csp, /'wasm-unsafe-eval'/);
  assert.doesNotMatch(csp, /'unsafe-inline'/);
  assert.doesNotMatch(csp, /'unsafe-eval'/);
  // Every executable inline script, and the style element, is allowed by its own hash.
  const directive = (name) => csp.split(';').map((d) => d.trim()).find((d) => d.startsWith(`${name} `)) ?? '';
  const hash = (text) => `'sha256-${createHash('sha256').update(text, 'utf8').digest('base64')}'`;
  // The file holds one executable inline script (the classic loader); the module script is
  // carried compressed in an inert block, and the loader inserts it inline as #page-script.
  const inFile = [...html.matchAll(/<script(?: type="module"[^>]*)?>([\s\S]*?)<\/script>/g)].map((m) => m[1]);
  assert.equal(inFile.length, 1, 'one executable inline script in the file');
  const inert = [...html.matchAll(/<script type="([^"]*)"/g)].map((m) => m[1]).filter((t) => t !== 'module');
  assert.deepEqual(inert, ['application/octet-stream', 'application/octet-stream'], 'the other blocks are inert data');
  assert.doesNotMatch(directive('script-src'), /'unsafe-inline'|'unsafe-eval'|'strict-dynamic'|blob:|data:|\*/);
  const style = html.match(/<style>([\s\S]*?)<\/style>/)[1];
  assert.ok(directive('style-src').includes(hash(style)), 'the style hash is in style-src');
  assert.doesNotMatch(html, /<script[^>]+src=/, 'no external script');
  assert.doesNotMatch(html, /<link[^>]+href=/, 'no external stylesheet or font');
  const { page, log } = await openPage(browser);
  // The live page runs exactly two inline scripts: the loader and the module it inserted,
  // each allowed by its own hash and by nothing else.
  const live = await page.evaluate(() => [...document.scripts].filter((s) => !s.src && (s.type === '' || s.type === 'module')).map((s) => ({ id: s.id, type: s.type, text: s.textContent })));
  assert.equal(live.length, 2, 'two executable inline scripts run');
  assert.equal(live[0].text, inFile[0], 'the first is the loader of the file');
  assert.deepEqual([live[1].id, live[1].type], ['page-script', 'module'], 'the second is the inserted module script');
  for (const { text } of live) assert.ok(directive('script-src').includes(hash(text)), 'the script hash is in script-src');
  assert.equal((directive('script-src').match(/'sha256-/g) || []).length, 2, 'no other script is allowed');
  assert.deepEqual(log.errors, [], 'no violation of the policy while the page started');
  // An injected inline script does not run under the policy (the violation is expected).
  await page.evaluate(() => {
    const s = document.createElement('script');
    s.textContent = 'window.__ran = true';
    document.body.append(s);
  });
  assert.equal(await page.evaluate(() => globalThis.__ran ?? false), false);
  checkClean(log, { allowErrors: [/Content Security Policy/] });
});
