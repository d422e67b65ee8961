// Evaluation by hand: the page asks for f at x, the engineer types it, and the solve
// survives reloads through the link and through storage.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { launch, openPage, checkClean, close, shot } from './lib.mjs';

let browser;
before(async () => { browser = await launch(); });
after(async () => { await browser?.close(); });

// The "outside model": f(x) = x^2 - 2, whose positive root is Math.SQRT2 (ECMAScript).
const model = (x) => x * x - 2;

async function asked(page) {
  return Number(await page.getAttribute('#ext-x', 'data-value'));
}

async function answer(page) {
  const x = await asked(page);
  await page.fill('#ext-fx', String(model(x)));
  await page.click('#ext-form button[type=submit]');
  return x;
}

test('the engineer types f(x); the work survives a reload and a fresh page; it converges', async () => {
  const { page, log, ctx } = await openPage(browser);
  await page.click('#mode-external');
  await page.fill('#ext-label', 'bench rig 2, flow error');
  await page.click('input[name=start-kind][value=bracket]');
  await page.fill('#start-a', '1');
  await page.fill('#start-b', '2');
  await page.click('#ext-begin');
  await page.waitForSelector('#ext-ask:not([hidden])');
  assert.equal(await asked(page), 1, 'the first point asked is the first end');
  await answer(page);
  await answer(page);
  await answer(page);
  const next = await asked(page);
  assert.equal(await page.locator('#history-table tbody tr').count(), 3);
  await page.reload();
  await page.waitForFunction(() => globalThis.tacitPage?.ready === true);
  assert.equal(await asked(page), next, 'the same point is asked after a reload');
  assert.equal(await page.locator('#history-table tbody tr').count(), 3);
  assert.equal(await page.inputValue('#ext-label'), 'bench rig 2, flow error');
  // A fresh page without the link picks the work up from storage.
  const other = await openPage(browser, { context: ctx });
  await other.page.click('#mode-external');
  await other.page.waitForSelector('#ext-ask:not([hidden])');
  assert.equal(await asked(other.page), next);
  await shot(other.page, 'external-midway');
  for (let i = 0; i < 60 && (await other.page.isVisible('#ext-ask')); i++) await answer(other.page);
  await other.page.waitForSelector('#result:not([hidden])');
  const root = Number(await other.page.getAttribute('[data-testid="answer-x"]', 'data-value'));
  // By hand the step tolerance defaults to 1e-4 (relative): a rig resolves no more.
  close(root, Math.SQRT2, 1e-4, 'root of x^2 - 2');
  assert.match(await other.page.textContent('#result .facts'), /relative 0\.0001/);
  assert.match(await other.page.textContent('#result .status strong'), /^Converged/);
  checkClean(log);
  checkClean(other.log);
});

test('a typo in f(x) is refused with a message, and nothing is lost', async () => {
  const { page, log } = await openPage(browser);
  await page.click('#mode-external');
  await page.click('input[name=start-kind][value=guesses]');
  await page.fill('#start-a', '0');
  await page.fill('#start-b', '3');
  await page.click('#ext-begin');
  await answer(page);
  await page.fill('#ext-fx', '1,5');
  await page.click('#ext-form button[type=submit]');
  assert.match(await page.textContent('#ext-error'), /not a number/);
  assert.equal(await asked(page), 3, 'still asking for the second point');
  checkClean(log);
});

test('work in progress is never wiped silently: a new evaluation asks first, and a copy is kept', async () => {
  const { page, log } = await openPage(browser);
  await page.click('#mode-external');
  await page.click('input[name=start-kind][value=bracket]');
  await page.fill('#start-a', '1');
  await page.fill('#start-b', '2');
  await page.click('#ext-begin');
  await answer(page);
  await answer(page);
  const asking = await asked(page);
  // The point is asked to 7 significant digits, the exact value beside it.
  const shown = await page.textContent('#ext-x');
  assert.ok(shown.replace(/[^\d]/g, '').length <= 7, `practical digits (${shown})`);
  assert.match(await page.textContent('#ext-x-full'), /exact value/);
  assert.match(await page.getAttribute('#ext-begin', 'class'), /quiet/, 'Begin is no longer the primary button');
  await page.click('#ext-begin');
  assert.match(await page.textContent('#ext-actions'), /in progress with 2 values recorded/);
  await page.click('#ext-actions button:has-text("Keep the current one")');
  assert.equal(await asked(page), asking, 'keeping changes nothing');
  await page.click('#ext-begin');
  await page.click('#ext-actions button:has-text("Begin a new one")');
  assert.equal(await asked(page), 1, 'a new evaluation starts at its first point');
  const keys = await page.evaluate(() => Object.keys(localStorage));
  assert.ok(keys.some((k) => k.startsWith('tacit.external.v1.damaged.')), 'the earlier evaluation was copied aside first');
  checkClean(log);
});

test('after a damaged link, typing does not delete the stored evaluation', async () => {
  const first = await openPage(browser);
  await first.page.click('#mode-external');
  await first.page.click('input[name=start-kind][value=guesses]');
  await first.page.fill('#start-a', '0');
  await first.page.fill('#start-b', '3');
  await first.page.click('#ext-begin');
  await answer(first.page);
  const kept = await first.page.evaluate(() => localStorage.getItem('tacit.external.v1'));
  assert.ok(kept);
  const hash = `#calc=${Buffer.from(JSON.stringify({ v: 1, mode: 'external', external: { label: 'rig', stepper: '{"broken":' } })).toString('base64url')}`;
  const other = await openPage(browser, { context: first.ctx, hash });
  await other.page.waitForSelector('.notice');
  assert.match(await other.page.textContent('.notice'), /could not be restored.*nothing was deleted/);
  await other.page.fill('#ext-label', 'rig 2');
  assert.equal(await other.page.evaluate(() => localStorage.getItem('tacit.external.v1')), kept, 'the stored evaluation is untouched');
  checkClean(first.log);
  checkClean(other.log);
});
