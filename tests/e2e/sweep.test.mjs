// The sweep: runs in a Blob-URL worker with progress, a plot, a paged table and a CSV download;
// cancel works; a trap in the worker replaces it and the page says so.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { launch, openPage, checkClean, pickTemplate, setValue, chooseUnknown, solveAndRead, close, shot } from './lib.mjs';

// fluids.friction.Colebrook(Re=1e5, eD=1e-4), as asserted in the fluids library's tests.
const COLEBROOK_F = 0.018513866077471648;

let browser;
before(async () => { browser = await launch(); });
after(async () => { await browser?.close(); });

async function colebrook(page) {
  await pickTemplate(page, 'pipes.colebrook');
  await chooseUnknown(page, 'f');
  await setValue(page, 'Re', 1e5);
  await setValue(page, 'eps', 0.1, 'mm');
  await setValue(page, 'D', 1000, 'mm');
  await solveAndRead(page, 'f');
}

async function sweepRe(page, from, to, n) {
  await page.selectOption('#sweep-input', 'Re');
  await page.fill('#sweep-from', String(from));
  await page.fill('#sweep-to', String(to));
  await page.fill('#sweep-n', String(n));
}

test('a 991-point sweep of Re passes through the published Colebrook value, with CSV', async () => {
  const { page, log } = await openPage(browser);
  await colebrook(page);
  // From 1e4 to 1e6 in steps of 1000: point 91 is Re = 1e5 exactly.
  await sweepRe(page, 1e4, 1e6, 991);
  const before = await page.evaluate(() => globalThis.tacitPage.sweeps);
  await page.click('#sweep-run');
  await page.waitForFunction((n) => globalThis.tacitPage.sweeps > n, before);
  // The table shows a page of rows at a time; the CSV holds them all.
  assert.equal(await page.locator('#sweep-table tbody tr').count(), 200);
  assert.equal(await page.textContent('#sweep-page-text'), 'Rows 1–200 of 991');
  assert.equal(await page.locator('#sweep-plot svg .curve path').count(), 1);
  assert.match(await page.textContent('#sweep-status'), /991 points/);
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#sweep-csv')]);
  const lines = readFileSync(await dl.path(), 'utf8').trim().split(/\r\n/);
  assert.equal(lines.length, 992);
  assert.match(lines[0], /^"Re/);
  const [re, f, , converged] = lines[91].split(',');
  assert.equal(Number(re), 1e5);
  assert.equal(converged, 'true');
  close(Number(f), COLEBROOK_F, 1e-10, 'swept friction factor at Re = 1e5');
  await shot(page, 'sweep');
  checkClean(log);
});

test('a long sweep can be cancelled, and the next sweep runs', async () => {
  const { page, log } = await openPage(browser);
  await colebrook(page);
  await sweepRe(page, 5000, 1e8, 100000);
  const starts = await page.evaluate(() => globalThis.tacitPage.workerStarts);
  const sweeps = await page.evaluate(() => globalThis.tacitPage.sweeps);
  // Start, then cancel while the worker is busy (in one turn of the page, so the test does
  // not race the worker to the end of the job).
  await page.evaluate(() => {
    document.getElementById('sweep-run').click();
    document.getElementById('sweep-cancel').click();
  });
  assert.equal(await page.textContent('#sweep-status'), 'Sweep cancelled.');
  assert.equal(await page.evaluate(() => globalThis.tacitPage.workerStarts), starts + 1, 'a fresh worker');
  await page.waitForTimeout(1500);
  assert.equal(await page.evaluate(() => globalThis.tacitPage.sweeps), sweeps, 'the cancelled sweep never reports');
  assert.equal(await page.isDisabled('#sweep-cancel'), true);
  await sweepRe(page, 5000, 1e6, 20);
  const before = await page.evaluate(() => globalThis.tacitPage.sweeps);
  await page.click('#sweep-run');
  await page.waitForFunction((n) => globalThis.tacitPage.sweeps > n, before);
  assert.equal(await page.locator('#sweep-table tbody tr').count(), 20);
  checkClean(log);
});

test('a trap in the worker replaces the worker and says so', async () => {
  const { page, log } = await openPage(browser);
  await colebrook(page);
  await page.waitForFunction(() => globalThis.tacitPage.workerStarts >= 1);
  const starts = await page.evaluate(() => globalThis.tacitPage.workerStarts);
  const trapped = await page.evaluate(() => globalThis.tacitPage.drillWorkerTrap());
  assert.equal(trapped, true);
  assert.equal(await page.evaluate(() => globalThis.tacitPage.workerStarts), starts + 1);
  assert.match(await page.textContent('.notice'), /replaced with a fresh one/);
  await sweepRe(page, 5000, 1e6, 10);
  const before = await page.evaluate(() => globalThis.tacitPage.sweeps);
  await page.click('#sweep-run');
  await page.waitForFunction((n) => globalThis.tacitPage.sweeps > n, before);
  assert.equal(await page.locator('#sweep-table tbody tr').count(), 10);
  checkClean(log);
});
