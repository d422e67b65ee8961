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
  close(root, Math.SQRT2, 1e-12, 'root of x^2 - 2');
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
