// The uncertainty of the answer on the page: the uncertainty column of the quantities
// table, the law of propagation's result with the solve, the Monte Carlo check in a worker
// (progress, cancel, histogram), out-of-date marking, the link and saved calculations, the
// printed record, and axe at laptop and phone widths.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { join } from 'node:path';
import { launch, openPage, checkClean, pickTemplate, setValue, chooseUnknown, solveAndRead, axeSerious, lookShot, close, ARTIFACTS } from './lib.mjs';

let browser;
before(async () => { browser = await launch(); });
after(async () => { await browser?.close(); });

/** Types a known's standard uncertainty: a number in its unit, or a percentage. */
async function setUnc(page, sym, text, pct = false) {
  await page.fill(`#unc-${sym}`, String(text));
  await page.selectOption(`#unc-kind-${sym}`, pct ? 'pct' : 'abs');
}

async function ownEquation(page, text, knowns, unknown) {
  await page.click('#mode-custom');
  await page.fill('#custom-text', text);
  await page.waitForSelector('#custom-check.ok');
  await page.waitForSelector(`#find-${unknown}`);
  await chooseUnknown(page, unknown);
  for (const [k, v] of Object.entries(knowns)) await setValue(page, k, v);
}

const num = async (page, sel, attr = 'data-value') => Number(await page.getAttribute(sel, attr));

async function monteCarloDone(page, runs) {
  await page.waitForFunction((n) => (globalThis.tacitPage.mcRuns ?? 0) > n, runs, { timeout: 60000 });
}

// y = a·x with x exact: y is linear in a, so the relative standard uncertainty of a passes
// through to y unchanged (closed form): a = 3 ± 0.06 (2 %), y = 6 ± 0.12. With x also
// uncertain (± 2 %), the relative uncertainties of a product add in quadrature
// (JCGM 100:2008 §5.1.6, closed form): u(y) = 6·0.02·√2.
test('a linear relation passes the relative uncertainty through (closed form), with Monte Carlo in agreement', async () => {
  const { page, log } = await openPage(browser);
  await ownEquation(page, 'y = a*x', { a: 3, x: 2 }, 'y');
  await setUnc(page, 'a', '0.06');
  const runs = await page.evaluate(() => globalThis.tacitPage.mcRuns ?? 0);
  const y = await solveAndRead(page, 'y');
  close(y, 6, 1e-12, 'y');
  close(await num(page, '[data-testid=u-standard]'), 0.12, 1e-12, 'u(y) shown');
  close(Number(await page.getAttribute('[data-testid=u-expanded]', 'title')), 0.24, 1e-12, 'U = 2u');
  assert.match(await page.textContent('#uncertainty .facts'), /coverage factor k = 2/);
  assert.equal(await page.textContent('#answer-u-y'), '± 0.12 (u)', 'the answer line carries ± u');
  // Monte Carlo: y is normal, its 95 % interval 6 ± 1.96·0.12 (closed form); 100 000
  // trials put its ends within about 0.001 (the standard error of a 2.5 % quantile), and
  // 0.01 is allowed.
  await monteCarloDone(page, runs);
  const lo = await num(page, '[data-testid=mc-interval]', 'data-lo');
  const hi = await num(page, '[data-testid=mc-interval]', 'data-hi');
  assert.ok(Math.abs(lo - (6 - 1.96 * 0.12)) < 0.01 && Math.abs(hi - (6 + 1.96 * 0.12)) < 0.01, `interval ${lo} to ${hi}`);
  close(await num(page, '[data-testid=mc-standard]'), 0.12, 0.02, 'standard deviation of the trials');
  assert.equal(await page.textContent('[data-testid=mc-failed]'), '0');
  assert.equal(await page.getAttribute('.verdict', 'data-agrees'), 'true');
  assert.match(await page.textContent('.verdict'), /agree \(JCGM 101:2008 §8\)/);
  assert.equal(await page.locator('svg.histogram rect.bin').count(), 40, 'the 40 bins of the core');
  assert.equal(await page.locator('svg.histogram line.interval').count(), 2);
  assert.match(await page.textContent('#mc-status'), /100000 trials/);
  // Both factors uncertain: quadrature.
  await setUnc(page, 'x', '2', true);
  await solveAndRead(page, 'y');
  close(await num(page, '[data-testid=u-standard]'), 6 * 0.02 * Math.SQRT2, 1e-12, 'u(y) of a product');
  const shares = await page.$$eval('#uncertainty-body tbody tr td:last-child', (tds) => tds.map((td) => Number(td.title)));
  assert.equal(shares.length, 2);
  for (const s of shares) close(s, 0.12, 1e-12, 'share of u(y)');
  checkClean(log);
});

// I = n·P·L²/(3·E) for a cantilever with a point load at its end (from δ = P·L³/(3·E·I)
// and δ = L/n): with P = 10 kN ± 0.2 kN and L = 3 m ± 1 %, u(I)/I = √(0.02² + (2·0.01)²)
// (JCGM 100:2008 §5.1.6, power product, closed form); I = 360·10 kN·(3 m)²/(3·200 GPa)
// = 5.4×10⁻⁵ m⁴ = 5.4×10⁷ mm⁴.
test('a template in units: the uncertainty in the unknown\'s chosen unit (closed form)', async () => {
  const { page, log } = await openPage(browser);
  await pickTemplate(page, 'structures.deflection-cantilever-point');
  await chooseUnknown(page, 'I');
  await page.selectOption('#unit-I', 'mm^4');
  await setValue(page, 'P', 10, 'kN');
  await setValue(page, 'L', 3, 'm');
  await setValue(page, 'E', 200, 'GPa');
  await setValue(page, 'n', 360);
  await setUnc(page, 'P', '0.2');
  await setUnc(page, 'L', '1', true);
  assert.equal(await page.textContent('#unc-kind-P option[value=abs]'), 'kN', 'the absolute uncertainty is in the known\'s unit');
  await page.selectOption('#unit-P', 'N');
  assert.equal(await page.textContent('#unc-kind-P option[value=abs]'), 'N', 'and follows its unit');
  await setValue(page, 'P', 10000);
  await setUnc(page, 'P', '200');
  const I = await solveAndRead(page, 'I');
  close(I, 5.4e7, 1e-9, 'I in mm⁴');
  close(await num(page, '[data-testid=u-standard]'), 5.4e7 * Math.hypot(0.02, 0.02), 1e-9, 'u(I) in mm⁴');
  assert.match(await page.textContent('#uncertainty-body .answer'), /mm⁴/);
  assert.match(await page.textContent('#uncertainty-body tbody'), /200 N/);
  checkClean(log);
});

test('the Monte Carlo check runs in a worker with progress, and Cancel stops it', async () => {
  const { page, log } = await openPage(browser);
  await ownEquation(page, 'y = a*x', { a: 3, x: 2 }, 'y');
  await setUnc(page, 'x', '2', true);
  await solveAndRead(page, 'y');
  await page.fill('#mc-trials', '1000000');
  await page.click('#mc-run');
  // The law of propagation is there at once; the trials go on in the background.
  close(await num(page, '[data-testid=u-standard]'), 0.12, 1e-12, 'u(y)');
  await page.waitForFunction(() => /of 1000000 trials/.test(document.getElementById('mc-status').textContent));
  assert.equal(await page.isDisabled('#mc-cancel'), false);
  // The page answers while the trials run: the record's fields take typing.
  await page.fill('#record-project', 'Test rig 4');
  assert.equal(await page.textContent('#head-project'), 'Project: Test rig 4');
  const before = await page.evaluate(() => document.getElementById('mc-progress').value);
  await page.waitForFunction((b) => document.getElementById('mc-progress').value > b, before);
  const starts = await page.evaluate(() => globalThis.tacitPage.mcWorkerStarts);
  await page.click('#mc-cancel');
  assert.match(await page.textContent('#mc-status'), /cancelled after \d+ trials/);
  assert.equal(await page.isDisabled('#mc-cancel'), true);
  assert.equal(await page.isHidden('#mc-progress'), true);
  assert.equal(await page.locator('#mc-body svg').count(), 0, 'no histogram from a cancelled run');
  // Run again with fewer trials: a fresh worker does it.
  const runs = await page.evaluate(() => globalThis.tacitPage.mcRuns ?? 0);
  await page.fill('#mc-trials', '2000');
  await page.click('#mc-run');
  await monteCarloDone(page, runs);
  assert.match(await page.textContent('#mc-status'), /2000 trials/);
  assert.equal(await page.evaluate(() => globalThis.tacitPage.mcWorkerStarts), starts + 1, 'the cancelled worker was ended and a fresh one started');
  checkClean(log);
});

test('editing an uncertainty marks the result out of date; a run under way stops', async () => {
  const { page, log } = await openPage(browser);
  await ownEquation(page, 'y = a*x', { a: 3, x: 2 }, 'y');
  await setUnc(page, 'x', '2', true);
  await solveAndRead(page, 'y');
  await page.fill('#mc-trials', '1000000');
  assert.doesNotMatch(await page.getAttribute('#uncertainty', 'class'), /stale/, 'the trials do not change the answer');
  await page.click('#mc-run');
  await page.waitForFunction(() => /of 1000000 trials/.test(document.getElementById('mc-status').textContent));
  await page.fill('#unc-x', '3');
  assert.equal(await page.getAttribute('#result', 'class'), 'card stale');
  assert.match(await page.getAttribute('#uncertainty', 'class'), /stale/);
  assert.match(await page.textContent('#uncertainty .stale-note'), /Not solved for these inputs/);
  assert.match(await page.textContent('#mc-status'), /stopped: the inputs changed/);
  assert.equal(await page.textContent('#answer-u-y'), '');
  assert.equal(await page.evaluate(() => JSON.parse(atob(location.hash.slice(6).replace(/-/g, '+').replace(/_/g, '/'))).unsolved), true);
  // Solving again brings it up to date with the new value: u(y) = 6·3 %.
  await solveAndRead(page, 'y');
  assert.doesNotMatch(await page.getAttribute('#uncertainty', 'class'), /stale/);
  close(await num(page, '[data-testid=u-standard]'), 0.18, 1e-12, 'u(y) after the edit');
  checkClean(log);
});

test('the uncertainties go into the link and saved calculations, and come back', async () => {
  const first = await openPage(browser);
  await ownEquation(first.page, 'y = a*x', { a: 3, x: 2 }, 'y');
  await setUnc(first.page, 'a', '0.06');
  await setUnc(first.page, 'x', '2', true);
  await solveAndRead(first.page, 'y');
  await first.page.fill('#mc-trials', '5000');
  await first.page.fill('#save-name', 'Product with uncertainty');
  await first.page.click('#save-form button[type=submit]');
  await first.page.waitForSelector('#saved-list li');
  const hash = await first.page.evaluate(() => location.hash);
  const state = JSON.parse(Buffer.from(hash.slice(6), 'base64url').toString('utf8'));
  assert.deepEqual(state.unc, { a: { v: '0.06', pct: false }, x: { v: '2', pct: true } });
  assert.equal(state.trials, '5000');
  checkClean(first.log);
  await first.ctx.close();

  const second = await openPage(browser, { hash });
  const { page } = second;
  assert.equal(await page.inputValue('#unc-a'), '0.06');
  assert.equal(await page.inputValue('#unc-kind-a'), 'abs');
  assert.equal(await page.inputValue('#unc-x'), '2');
  assert.equal(await page.inputValue('#unc-kind-x'), 'pct');
  assert.equal(await page.inputValue('#mc-trials'), '5000');
  close(await num(page, '[data-testid=u-standard]'), 6 * 0.02 * Math.SQRT2, 1e-12, 'u(y) from the link');
  await monteCarloDone(page, 0);
  assert.match(await page.textContent('#mc-status'), /5000 trials/);
  checkClean(second.log);
  await second.ctx.close();
});

test('saved calculations keep the uncertainties', async () => {
  const { page, log } = await openPage(browser);
  await ownEquation(page, 'y = a*x', { a: 3, x: 2 }, 'y');
  await setUnc(page, 'x', '4', true);
  await solveAndRead(page, 'y');
  await page.fill('#save-name', 'Four percent');
  await page.click('#save-form button[type=submit]');
  await page.waitForSelector('#saved-list li');
  await page.click('#mode-custom');
  await page.fill('#custom-text', 'z = 2*w');
  await page.click('#saved-list li button:has-text("Open")');
  await page.waitForSelector('#unc-x');
  assert.equal(await page.inputValue('#unc-x'), '4');
  assert.equal(await page.inputValue('#unc-kind-x'), 'pct');
  checkClean(log);
});

test('bad uncertainties are named, and several unknowns are refused with the reason', async () => {
  const { page, log } = await openPage(browser);
  await ownEquation(page, 'y = a*x', { a: 3, x: 2 }, 'y');
  await setUnc(page, 'x', '-1');
  await page.click('#solve');
  assert.match(await page.textContent('#solve-error'), /Uncertainty of x: a standard uncertainty is 0 or more, got -1/);
  assert.equal(await page.getAttribute('#unc-x', 'aria-invalid'), 'true');
  await setUnc(page, 'x', 'two');
  await page.click('#solve');
  assert.match(await page.textContent('#solve-error'), /Uncertainty of x: "two" is not a number/);
  assert.equal(await page.inputValue('#unc-x'), 'two', 'nothing typed is lost');
  await page.fill('#custom-text', 'x + y = s\nx - 2*y = d');
  await page.waitForSelector('#find-s');
  await chooseUnknown(page, 'x');
  await chooseUnknown(page, 'y');
  await setValue(page, 's', 3);
  await setValue(page, 'd', 0);
  await setUnc(page, 's', '0.1');
  await page.click('#solve');
  assert.match(await page.textContent('#solve-error'), /found for one unknown/);
  checkClean(log);
});

test('the printed record and the look: uncertainty column, ± and interval, histogram; axe at laptop, phone and dark', async () => {
  for (const [name, viewport, colorScheme] of [['laptop', { width: 1280, height: 900 }, 'light'], ['phone', { width: 390, height: 844 }, 'light'], ['dark', { width: 1280, height: 900 }, 'dark']]) {
    const { page, log, ctx } = await openPage(browser, { viewport, colorScheme });
    await pickTemplate(page, 'structures.deflection-cantilever-point');
    await chooseUnknown(page, 'I');
    await setValue(page, 'P', 10, 'kN');
    await setValue(page, 'L', 3, 'm');
    await setValue(page, 'E', 200, 'GPa');
    await setValue(page, 'n', 360);
    await setUnc(page, 'P', '0.5');
    await setUnc(page, 'L', '1', true);
    await setUnc(page, 'E', '5', true);
    await solveAndRead(page, 'I');
    await monteCarloDone(page, 0);
    assert.deepEqual(await axeSerious(page), [], `axe at ${name}`);
    await page.locator('#uncertainty').scrollIntoViewIfNeeded();
    await lookShot(page, `uncertainty-${name}`, { fullPage: false });
    await page.locator('#vars').scrollIntoViewIfNeeded();
    await lookShot(page, `uncertainty-${name}-inputs`, { fullPage: false });
    if (name === 'laptop') {
      await page.emulateMedia({ media: 'print' });
      assert.equal(await page.isVisible('#uncertainty svg.histogram'), true, 'the histogram is printed');
      assert.equal(await page.isVisible('#mc-run'), false, 'the controls are not');
      assert.equal(await page.isVisible('#unc-P'), true, 'the known\'s uncertainty is printed');
      assert.equal(await page.isVisible('#unc-n'), false, 'an exact known shows no uncertainty');
      const pdf = join(process.env.TACIT_SHOTS || ARTIFACTS, 'uncertainty-record.pdf');
      await page.pdf({ path: pdf, format: 'A4', printBackground: true });
      await lookShot(page, 'uncertainty-print');
      await page.emulateMedia({ media: 'screen' });
    }
    checkClean(log);
    await ctx.close();
  }
});
