// Figures for the offline page, measured in Debian's headless Chromium (no timed tests):
// - the size of dist/tacit.html;
// - the time from navigation to the first solved result (the page solves its opening
//   calculation, the Colebrook friction factor, as soon as the solver is ready);
// - the time for a 1000-point Colebrook sweep (Re from 1e4 to 1e7), in the sweep worker
//   as the page runs it, and with sweep() called directly on the page's thread.
// Goals (issue 6): page <= 400 KB, first result <= 300 ms, 1000-point sweep <= 100 ms.
//
// Usage: node scripts/bench-page.mjs [--runs 5]
import { statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const pagePath = join(root, 'dist/tacit.html');
const args = process.argv.slice(2);
const runs = Number(args[args.indexOf('--runs') + 1]) || 5;

const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const fmt = (xs) => `median ${median(xs).toFixed(1)} ms (min ${Math.min(...xs).toFixed(1)}, max ${Math.max(...xs).toFixed(1)}, ${xs.length} runs)`;

const browser = await chromium.launch({
  executablePath: process.env.TACIT_CHROMIUM || '/usr/bin/chromium',
  args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
});

const firstResult = [];
const sweepWorker = [];
const sweepDirect = [];
for (let i = 0; i < runs; i++) {
  const ctx = await browser.newContext();
  const page = await ctx.newPage();
  await page.goto(pathToFileURL(pagePath).href);
  await page.waitForFunction(() => globalThis.tacitPage?.firstSolveMs !== null && globalThis.tacitPage?.ready, null, { timeout: 20000 });
  // performance.now() counts from the start of navigation.
  firstResult.push(await page.evaluate(() => globalThis.tacitPage.firstSolveMs));

  await page.waitForFunction(() => globalThis.tacitPage.workerStarts >= 1);
  await page.selectOption('#sweep-input', 'Re');
  await page.fill('#sweep-from', '1e4');
  await page.fill('#sweep-to', '1e7');
  await page.fill('#sweep-n', '1000');
  // One warm-up sweep, then the measured one (the time the worker reports for the work).
  for (let k = 0; k < 2; k++) {
    const n = await page.evaluate(() => globalThis.tacitPage.sweeps);
    await page.click('#sweep-run');
    await page.waitForFunction((m) => globalThis.tacitPage.sweeps > m, n, { timeout: 60000 });
  }
  sweepWorker.push(await page.evaluate(() => globalThis.tacitPage.lastSweepMs));
  sweepDirect.push(await page.evaluate(() => globalThis.tacitPage.timeDirectSweep(1000)));
  await ctx.close();
}
await browser.close();

console.log(`page size: ${(statSync(pagePath).size / 1024).toFixed(1)} KB (goal <= 400 KB)`);
console.log(`navigation to first solved result: ${fmt(firstResult)} (goal <= 300 ms)`);
console.log(`1000-point Colebrook sweep in the worker: ${fmt(sweepWorker)} (goal <= 100 ms)`);
console.log(`1000-point Colebrook sweep, sweep() on the page thread: ${fmt(sweepDirect)}`);
