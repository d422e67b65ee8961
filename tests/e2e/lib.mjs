// Shared set-up for the end-to-end tests of dist/tacit.html in Debian's headless Chromium.
//
// Every page opened through openPage() records console errors, uncaught exceptions,
// dialogs and every request; checkClean() asserts there were none of the first three and
// that no request left the machine (only file:, blob: and data: URLs are allowed).
import assert from 'node:assert/strict';
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
export const PAGE_PATH = join(ROOT, 'dist/tacit.html');
export const PAGE_URL = pathToFileURL(PAGE_PATH).href;
export const ARTIFACTS = join(ROOT, 'test-artifacts');
mkdirSync(ARTIFACTS, { recursive: true });

const CHROMIUM = process.env.TACIT_CHROMIUM || '/usr/bin/chromium';
const ARGS = ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

export async function launch() {
  if (!existsSync(PAGE_PATH)) throw new Error(`${PAGE_PATH} is missing: build it with node scripts/build-page.mjs`);
  return chromium.launch({ executablePath: CHROMIUM, args: ARGS, headless: true });
}

/** Opens the page in a fresh context (its own storage unless storageFrom is given). */
export async function openPage(browser, { hash = '', viewport = { width: 1280, height: 900 }, colorScheme = 'light', context } = {}) {
  const ctx = context ?? (await browser.newContext({ viewport, colorScheme, acceptDownloads: true }));
  const page = await ctx.newPage();
  const log = { errors: [], requests: [], dialogs: [] };
  page.on('console', (m) => {
    if (m.type() === 'error') log.errors.push(`console: ${m.text()}`);
  });
  page.on('pageerror', (e) => log.errors.push(`pageerror: ${e.message}`));
  page.on('request', (r) => log.requests.push(r.url()));
  page.on('dialog', async (d) => {
    log.dialogs.push(`${d.type()}: ${d.message()}`);
    await d.dismiss();
  });
  page.on('worker', (w) => w.on('console', (m) => { if (m.type() === 'error') log.errors.push(`worker console: ${m.text()}`); }));
  await page.goto(PAGE_URL + hash);
  await page.waitForFunction(() => globalThis.tacitPage?.ready === true, null, { timeout: 15000 });
  return { page, ctx, log };
}

export function checkClean(log, { allowErrors = [] } = {}) {
  const errors = log.errors.filter((e) => !allowErrors.some((re) => re.test(e)));
  assert.deepEqual(errors, [], 'no console errors or uncaught exceptions');
  assert.deepEqual(log.dialogs, [], 'no dialog opened');
  const outside = log.requests.filter((u) => !/^(file|blob|data):/.test(u));
  assert.deepEqual(outside, [], 'no request left the machine');
}

export async function shot(page, name, opts = {}) {
  await page.screenshot({ path: join(ARTIFACTS, `${name}.png`), fullPage: true, ...opts });
}

/** Clicks a template in the catalogue by its id. */
export async function pickTemplate(page, id) {
  const button = page.locator(`button[data-template="${id}"]`);
  // Open the template's field group first, as a person would, when it is folded.
  if (!(await button.isVisible())) await page.locator('#template-groups details', { has: button }).locator('summary').click();
  await button.click();
  await page.waitForSelector(`#vars tfoot tr`);
}

export async function setValue(page, symbol, value, unit) {
  await page.fill(`#val-${symbol}`, String(value));
  if (unit) await page.selectOption(`#unit-${symbol}`, unit);
}

/** Chooses the quantity to find with the "Solve for" buttons above the inputs. */
export async function chooseUnknown(page, symbol) {
  const b = page.locator(`#find-${symbol}`);
  if ((await b.getAttribute('aria-pressed')) !== 'true') await b.click();
}

export async function isUnknown(page, symbol) {
  return (await page.getAttribute(`#find-${symbol}`, 'aria-pressed')) === 'true';
}

/** Screenshots people look at, kept outside the repository when TACIT_SHOTS names a folder. */
export async function lookShot(page, name, opts = {}) {
  const dir = process.env.TACIT_SHOTS || ARTIFACTS;
  mkdirSync(dir, { recursive: true });
  await page.screenshot({ path: join(dir, `${name}.png`), fullPage: true, ...opts });
  return join(dir, `${name}.png`);
}

export async function solveAndRead(page, symbol) {
  const before = await page.evaluate(() => globalThis.tacitPage.solves);
  await page.click('#solve');
  await page.waitForFunction((n) => globalThis.tacitPage.solves > n || document.getElementById('solve-error').textContent !== '', before);
  const err = await page.textContent('#solve-error');
  assert.equal(err, '', `no input error (got "${err}")`);
  return Number(await page.getAttribute(`[data-testid="answer-${symbol}"]`, 'data-value'));
}

export async function historyRows(page) {
  return page.$$eval('#history-table tbody tr', (trs) =>
    trs.map((tr) => {
      const td = [...tr.children];
      return { k: Number(td[0].textContent), x: Number(td[1].title), fx: Number(td[2].title), kind: td[4].textContent };
    }),
  );
}

export const axeSource = () => readFileSync(join(ROOT, 'node_modules/axe-core/axe.min.js'), 'utf8');

/** Runs axe-core in the page (through the DevTools protocol, so the page's CSP stays on). */
export async function axeSerious(page) {
  await page.evaluate(axeSource());
  const res = await page.evaluate(async () => {
    const r = await globalThis.axe.run(document, { resultTypes: ['violations'] });
    return r.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.slice(0, 3).map((n) => n.target.join(' ')) }));
  });
  return res.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

export function b64url(text) {
  return Buffer.from(text, 'utf8').toString('base64').replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

export function fragmentFor(state) {
  return `#calc=${b64url(JSON.stringify(state))}`;
}

/** Relative closeness. */
export function close(actual, expected, rel, what) {
  const err = Math.abs(actual - expected) / Math.abs(expected);
  assert.ok(err <= rel, `${what}: ${actual} differs from ${expected} by ${err.toExponential(2)} (allowed ${rel})`);
}
