// Accessibility (axe-core), keyboard use, the widths and themes, the safety caution and the
// printed record. Screenshots go to test-artifacts/ for people to look at.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { join } from 'node:path';
import { launch, openPage, checkClean, pickTemplate, solveAndRead, axeSerious, shot, ARTIFACTS } from './lib.mjs';

const CAUTION = 'Results support, and do not replace, checks by a licensed professional under local codes.';

let browser;
before(async () => { browser = await launch(); });
after(async () => { await browser?.close(); });

test('axe-core finds no serious or critical violations (light and dark, with results)', async () => {
  for (const colorScheme of ['light', 'dark']) {
    const { page, log } = await openPage(browser, { colorScheme });
    await page.waitForSelector('[data-testid="answer-f"]');
    await page.click('#advanced summary');
    await page.selectOption('#sweep-input', 'Re');
    await page.fill('#sweep-from', '5000');
    await page.fill('#sweep-to', '1e6');
    await page.fill('#sweep-n', '30');
    await page.click('#sweep-run');
    await page.waitForFunction(() => globalThis.tacitPage.sweeps >= 1);
    const bad = await axeSerious(page);
    assert.deepEqual(bad, [], `${colorScheme}: ${JSON.stringify(bad, null, 1)}`);
    await shot(page, `start-${colorScheme}`);
    checkClean(log);
  }
});

test('safety-related templates show the caution; the footer always does', async () => {
  const { page, log } = await openPage(browser);
  assert.equal(await page.textContent('.foot-caution'), CAUTION);
  await pickTemplate(page, 'structures.secant-column');
  assert.equal(await page.isVisible('#caution'), true);
  assert.match(await page.textContent('#caution'), /licensed professional under local codes/);
  await page.waitForSelector('[data-testid="answer-P"]');
  assert.match(await page.textContent('#result-body .caution'), /licensed professional/);
  await shot(page, 'secant-column-caution');
  await pickTemplate(page, 'pipes.colebrook');
  assert.equal(await page.isVisible('#caution'), false);
  const bad = await axeSerious(page);
  assert.deepEqual(bad, [], JSON.stringify(bad));
  checkClean(log);
});

test('usable by keyboard alone: search, pick, enter, solve', async () => {
  const { page, log } = await openPage(browser);
  await page.focus('#search');
  await page.keyboard.type('manning');
  // Tab to the first visible template button and open it with Enter.
  let picked = false;
  for (let i = 0; i < 40 && !picked; i++) {
    await page.keyboard.press('Tab');
    picked = await page.evaluate(() => document.activeElement?.dataset?.template?.startsWith('channels.') ?? false);
  }
  assert.ok(picked, 'a Manning template is reachable by Tab');
  await page.keyboard.press('Enter');
  await page.waitForFunction(() => document.getElementById('calc-title').textContent.includes('Manning'));
  await page.focus('#solve');
  await page.keyboard.press('Enter');
  await page.waitForSelector('#result:not([hidden])');
  checkClean(log);
});

test('tablet width and the printed record', async () => {
  const { page, log } = await openPage(browser, { viewport: { width: 820, height: 1180 } });
  await page.waitForSelector('[data-testid="answer-f"]');
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  assert.ok(overflow <= 0, `no sideways scrolling at tablet width (overflow ${overflow}px)`);
  await shot(page, 'colebrook-tablet');
  await page.emulateMedia({ media: 'print' });
  await page.evaluate(() => window.dispatchEvent(new Event('beforeprint')));
  const visible = await page.evaluate(() => ({
    side: getComputedStyle(document.querySelector('.side')).display,
    head: getComputedStyle(document.querySelector('.record-head')).display,
    date: document.getElementById('record-date').textContent,
    tool: document.getElementById('record-tool').textContent,
  }));
  assert.equal(visible.side, 'none');
  assert.equal(visible.head, 'block');
  assert.match(visible.date, /^Date: \d{4}-\d\d-\d\d /);
  assert.match(visible.tool, /tacit \d+\.\d+\.\d+/);
  for (const needed of ['#equation math', '#vars tbody tr', '#vars tfoot .answer-line', '#result .big-number', '#history-table tbody tr', '#sensitivity tbody tr', '.foot-caution']) {
    assert.ok(await page.locator(needed).first().isVisible(), `${needed} is in the printed record`);
  }
  await shot(page, 'record-print');
  await page.pdf({ path: join(ARTIFACTS, 'record.pdf'), format: 'A4', printBackground: true });
  checkClean(log);
});
