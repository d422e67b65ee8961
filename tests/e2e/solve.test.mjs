// Picking a template, entering values, solving, and checking the result and the history
// against published values; solving the same template for another unknown; own equations
// with the live syntax check; all roots in a range.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { join } from 'node:path';
import { launch, openPage, checkClean, pickTemplate, setValue, chooseUnknown, solveAndRead, historyRows, close, shot, ARTIFACTS } from './lib.mjs';

// fluids.friction.Colebrook(Re=1e5, eD=1e-4): the value asserted in the test suite of the
// `fluids` library (PyPI), which evaluates Colebrook–White in closed form with Lambert W;
// `fluids.friction.Colebrook(1e5, 1e-4)` from PyPI's fluids prints the same digits.
const COLEBROOK_RE = 1e5;
const COLEBROOK_ED = 1e-4;
const COLEBROOK_F = 0.018513866077471648;

let browser;
before(async () => { browser = await launch(); });
after(async () => { await browser?.close(); });

async function colebrook(page) {
  await pickTemplate(page, 'pipes.colebrook');
  await chooseUnknown(page, 'f');
  // eps/D = 0.1 mm / 1000 mm = 1e-4.
  await setValue(page, 'Re', COLEBROOK_RE);
  await setValue(page, 'eps', 0.1, 'mm');
  await setValue(page, 'D', 1000, 'mm');
}

test('Colebrook friction factor matches fluids.friction.Colebrook, with an honest history', async () => {
  const { page, log } = await openPage(browser);
  await colebrook(page);
  const f = await solveAndRead(page, 'f');
  close(f, COLEBROOK_F, 1e-10, 'friction factor');
  assert.equal(await page.getAttribute('#result .status', 'data-status').then((s) => s.startsWith('converged') || s === 'exact-zero'), true);
  const rows = await historyRows(page);
  const evals = Number(await page.locator('#result .facts div', { hasText: 'Evaluations' }).first().locator('dd').textContent());
  assert.equal(rows.length, evals, 'one history row per evaluation');
  assert.deepEqual(rows.map((r) => r.k), rows.map((_, i) => i + 1), 'rows numbered 1..n');
  assert.equal(rows[0].kind, 'starting point');
  // The best point of the history is the root, and its residual is tiny.
  const best = rows.reduce((a, b) => (Math.abs(b.fx) < Math.abs(a.fx) ? b : a));
  close(best.x, COLEBROOK_F, 1e-10, 'best iterate');
  assert.ok(Math.abs(best.fx) < 1e-9, `residual at the best iterate is small (${best.fx})`);
  // Both plots are drawn.
  assert.equal(await page.locator('#plot-residual svg').count(), 1);
  assert.ok((await page.locator('#plot-function svg .iterates circle').count()) >= 2);
  assert.ok((await page.locator('#plot-function svg .curve path').count()) === 1);
  assert.ok((await page.locator('#sensitivity tbody tr').count()) >= 2, 'sensitivities listed');
  await shot(page, 'colebrook-laptop');
  checkClean(log);
});

test('the same template solved for the Reynolds number gives back Re = 1e5', async () => {
  const { page, log } = await openPage(browser);
  await colebrook(page);
  await chooseUnknown(page, 'Re');
  await setValue(page, 'f', COLEBROOK_F);
  const re = await solveAndRead(page, 'Re');
  close(re, COLEBROOK_RE, 1e-8, 'Reynolds number');
  // And for the diameter, in metres: eps/D = 1e-4 with eps = 0.1 mm gives D = 1 m.
  await chooseUnknown(page, 'D');
  await setValue(page, 'Re', COLEBROOK_RE);
  await page.selectOption('#unit-D', 'm');
  const d = await solveAndRead(page, 'D');
  close(d, 1, 1e-7, 'diameter in m');
  assert.equal(await page.textContent('#result .answer .unit'), 'm');
  checkClean(log);
});

test('the classic secant method: same root, and its secant lines are drawn', async () => {
  const { page, log } = await openPage(browser);
  await colebrook(page);
  await page.click('#advanced summary');
  await page.selectOption('#method', 'secant');
  const f = await solveAndRead(page, 'f');
  close(f, COLEBROOK_F, 1e-10, 'friction factor by the classic secant method');
  const rows = await historyRows(page);
  assert.ok(rows.some((r) => r.kind === 'secant'), 'secant steps in the history');
  assert.equal(await page.locator('#plot-function .secants line').count(), rows.filter((r, i) => i >= 2 && r.kind === 'secant').length);
  await page.locator('#history .plots').screenshot({ path: join(ARTIFACTS, 'colebrook-secant-plots.png') });
  checkClean(log);
});

test('bad input names the value and keeps everything', async () => {
  const { page, log } = await openPage(browser);
  await colebrook(page);
  await setValue(page, 'Re', '1e5x');
  await page.click('#solve');
  const err = await page.textContent('#solve-error');
  assert.match(err, /Re/);
  assert.match(err, /not a number/);
  assert.equal(await page.inputValue('#val-Re'), '1e5x', 'the typed text is kept');
  assert.equal(await page.getAttribute('#val-Re', 'aria-invalid'), 'true');
  checkClean(log);
});

test('own equations: live syntax check with a caret, then a solve', async () => {
  const { page, log } = await openPage(browser);
  await page.click('#mode-custom');
  await page.fill('#custom-text', 'x^3 - 2*x = (5');
  await page.waitForFunction(() => document.getElementById('custom-text').getAttribute('aria-invalid') === 'true');
  const caret = await page.textContent('#custom-check pre.caret');
  assert.match(caret, /\^/, 'a caret points at the error');
  await page.fill('#custom-text', 'x^3 - 2*x - 5 = 0');
  await page.waitForSelector('#custom-check.ok');
  await page.waitForSelector('#find-x');
  const x = await solveAndRead(page, 'x');
  // The real root of x^3 - 2x - 5 (a classic test equation; value recalled from memory),
  // checked here also through its residual.
  close(x, 2.0945514815423265, 1e-12, 'root of x^3 - 2x - 5');
  assert.ok(Math.abs(x ** 3 - 2 * x - 5) < 1e-12);
  assert.equal(await page.locator('#equation math').count(), 1, 'the equation is shown in MathML');
  checkClean(log);
});

test('all roots in a range: three roots of (x-1)(x-2)(x-3), and the chosen one is solved', async () => {
  const { page, log } = await openPage(browser);
  await page.click('#mode-custom');
  // (x-1)(x-2)(x-3) multiplied out: roots 1, 2 and 3 exactly (algebra).
  await page.fill('#custom-text', 'x^3 - 6*x^2 + 11*x - 6 = 0');
  await page.waitForSelector('#find-x');
  await solveAndRead(page, 'x');
  await page.fill('#roots-lo', '0');
  await page.fill('#roots-hi', '4');
  await page.click('#roots-scan');
  await page.waitForSelector('#roots-body .roots-list li');
  const items = await page.locator('#roots-body .roots-list li').count();
  assert.equal(items, 3);
  await page.locator('#roots-body .roots-list li').nth(2).locator('button').click();
  await page.waitForFunction(() => Math.abs(Number(document.querySelector('[data-testid="answer-x"]').dataset.value) - 3) < 1e-9);
  checkClean(log);
});

test('proven roots in the page: two roots inside one scan spacing, missed by the scan, proven', async () => {
  const { page, log } = await openPage(browser);
  await page.click('#mode-custom');
  // 1 − 2·exp(−((x − 1.0013)/1e-3)²) = 0 at x = 1.0013 ± 1e-3·sqrt(ln 2) (closed form).
  await page.fill('#custom-text', '1 - 2*exp(-((x - 1.0013)/1e-3)^2) = 0');
  await page.waitForSelector('#find-x');
  await page.click('#solve');
  await page.waitForSelector('#result');
  await page.fill('#roots-lo', '0');
  await page.fill('#roots-hi', '2');
  await page.click('#roots-scan');
  await page.waitForFunction(() => /No root between/.test(document.querySelector('#roots-body').textContent));
  await page.click('#roots-prove');
  await page.waitForSelector('#roots-body .roots-list li');
  const texts = await page.locator('#roots-body .roots-list li .mono').allTextContents();
  assert.equal(texts.length, 2, texts.join(' | '));
  const d = 1e-3 * Math.sqrt(Math.log(2));
  const xs = texts.map((t) => Number(t.replace(/^\d+\.\s*/, '').replace('×10', 'e').replace(/[⁰-⁹⁻]+/g, (m) => m.replace(/[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]/g, (c) => '0123456789-'['⁰¹²³⁴⁵⁶⁷⁸⁹⁻'.indexOf(c)]))));
  close(xs[0], 1.0013 - d, 1e-9, 'lower root');
  close(xs[1], 1.0013 + d, 1e-9, 'upper root');
  assert.match(await page.locator('#roots-body').textContent(), /proven/);
  checkClean(log);
});
