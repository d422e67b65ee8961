// The page as a working record: never stale, honest about a failed solve, readable in the
// user's units, fit to print and file, usable on a phone. One test (or more) per item of
// the page's issue; the numbers checked come from the solver, the words from the page.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { join } from 'node:path';
import { launch, openPage, checkClean, pickTemplate, setValue, chooseUnknown, historyRows, axeSerious, lookShot, ARTIFACTS } from './lib.mjs';

let browser;
before(async () => { browser = await launch(); });
after(async () => { await browser?.close(); });

const PHONE = { width: 390, height: 844 };

/** Presses "Solve for" until exactly `symbols` are chosen (a set of equations). */
async function chooseExactly(page, symbols) {
  const ids = await page.$$eval('#solve-for button', (bs) => bs.map((b) => [b.id.slice(5), b.getAttribute('aria-pressed') === 'true']));
  for (const [sym, pressed] of ids) if (pressed !== symbols.includes(sym)) await page.click(`#find-${sym}`);
}

async function solved(page) {
  const n = await page.evaluate(() => globalThis.tacitPage.solves);
  await page.click('#solve');
  await page.waitForFunction((k) => globalThis.tacitPage.solves > k || document.getElementById('solve-error').textContent, n);
}

test('an edit after a solve marks the result out of date, on screen, in the link and in print', async () => {
  const { page, log } = await openPage(browser);
  await pickTemplate(page, 'structures.secant-column');
  await page.waitForSelector('[data-testid="answer-P"]');
  assert.match(await page.textContent('#answer-line-P'), /^\d/, 'the answer line holds the answer');
  await setValue(page, 'smax', '250');
  await page.selectOption('#unit-Le', 'ft');
  assert.equal(await page.getAttribute('#result', 'class').then((c) => c.includes('stale')), true);
  assert.equal(await page.textContent('#answer-line-P'), 'not solved for these inputs');
  assert.match(await page.textContent('#result .stale-note'), /Not solved for these inputs/);
  // In print, only the words saying so are left of the old result.
  await page.emulateMedia({ media: 'print' });
  assert.equal(await page.isVisible('#result .big-number'), false, 'the old answer is not printed');
  assert.equal(await page.isVisible('#result .stale-note'), true);
  assert.equal(await page.isVisible('#history'), false);
  await page.emulateMedia({ media: 'screen' });
  // The link says so too: opened elsewhere, nothing is solved and the answer line says why.
  const url = page.url();
  const other = await openPage(browser, { hash: url.slice(url.indexOf('#')) });
  assert.equal(await other.page.inputValue('#val-smax'), '250');
  assert.equal(await other.page.textContent('#answer-line-P'), 'not solved for these inputs');
  assert.equal(await other.page.locator('[data-testid="answer-P"]').count(), 0, 'no answer is shown for unsolved inputs');
  // Solving again clears the mark everywhere.
  await solved(page);
  assert.equal(await page.getAttribute('#result', 'class').then((c) => c.includes('stale')), false);
  assert.match(await page.textContent('#answer-line-P'), /^\d/);
  assert.doesNotMatch(page.url(), /unsolved/);
  checkClean(log);
  checkClean(other.log);
});

test('a failed solve reads "no root found", shows an estimate, the smallest residual, and true advice', async () => {
  const { page, log } = await openPage(browser);
  await page.click('#mode-custom');
  await page.fill('#custom-text', 'x^2 + 1 = 0');
  await page.waitForSelector('#find-x');
  await solved(page);
  assert.equal(await page.textContent('#result-h'), 'No root found');
  assert.equal(await page.locator('#result .big-number').count(), 0, 'no estimate in the large type of an answer');
  assert.match(await page.textContent('#result [data-testid="estimate"]'), /Last estimate, not a root/);
  assert.match(await page.textContent('#result-body'), /Smallest \|residual\| reached: /);
  const advice = await page.textContent('#result .status .advice');
  assert.match(advice, /No sign change was seen/);
  assert.doesNotMatch(advice, /bracket/, 'no bracket is advised where no sign change exists');
  assert.equal(await page.textContent('#answer-line-x'), 'no root found');
  await page.click('#go-scan');
  assert.equal(await page.evaluate(() => document.activeElement.id), 'roots-lo', 'the range scan is one press away');
  await lookShot(page, 'failed-solve', { fullPage: false });
  checkClean(log);
});

test('after Solve the answer is in view on a phone; the unknown has no stale value; the start hint follows it', async () => {
  const { page, log } = await openPage(browser, { viewport: PHONE });
  await pickTemplate(page, 'pipes.colebrook');
  await chooseUnknown(page, 'D');
  assert.equal(await page.locator('#val-D').count(), 0, 'the unknown leaves the inputs');
  await page.selectOption('#unit-D', 'in');
  const hint = await page.textContent('#start-hint');
  assert.match(hint, /guesses for D, 100 and 1000 mm/, `the hint names the unknown's guesses and their unit (${hint})`);
  assert.doesNotMatch(hint, /guesses for (Re|f)\b/);
  await page.click('input[name=start-kind][value=guesses]');
  assert.match(await page.textContent('#start-hint'), /Two different values of D, in in;/);
  await page.click('input[name=start-kind][value=default]');
  await page.fill('#val-f', '0.02');
  await page.evaluate(() => window.scrollTo(0, 0));
  await solved(page);
  const inView = await page.evaluate(() => {
    const r = document.querySelector('#result').getBoundingClientRect();
    return r.top < innerHeight && r.bottom > 0;
  });
  assert.ok(inView, 'the result is brought into view');
  const line = await page.textContent('#answer-line-D');
  assert.match(line, /^\d/, `the answer line shows the answer (${line})`);
  assert.equal(await page.textContent('#result .answer .unit'), 'in');
  // The history is in the unit of the answer: its best point is the answer.
  assert.equal(await page.textContent('#history-table thead th:nth-child(2)'), 'D (in)');
  const rows = await historyRows(page);
  const answerD = Number(await page.getAttribute('[data-testid="answer-D"]', 'data-value'));
  const best = rows.reduce((a, b) => (Math.abs(b.fx) < Math.abs(a.fx) ? b : a));
  assert.ok(Math.abs(best.x - answerD) <= 1e-9 * answerD, `best evaluated D ${best.x} in, answer ${answerD} in`);
  checkClean(log);
});

test('a set of equations: sensitivities name their unknown, and the steps are shown', async () => {
  const { page, log } = await openPage(browser);
  await page.click('#mode-custom');
  // x + y = 3 and x - 2y = 0: x = 2, y = 1 (algebra).
  await page.fill('#custom-text', 'x + y = s\nx - 2*y = d');
  await page.waitForSelector('#find-x');
  await chooseExactly(page, ['x', 'y']);
  await page.fill('#val-s', '3');
  await page.fill('#val-d', '0');
  assert.match(await page.textContent('#start-hint'), /every unknown of the set/);
  await solved(page);
  assert.equal(await page.textContent('#solve-error'), '');
  assert.equal(Number(await page.getAttribute('[data-testid="answer-x"]', 'data-value')).toFixed(9), '2.000000000');
  const heads = await page.$$eval('#sensitivity thead th', (ths) => ths.map((t) => t.textContent));
  assert.equal(heads[0], 'Unknown');
  const unknownsListed = await page.$$eval('#sensitivity tbody tr td:first-child', (tds) => [...new Set(tds.map((t) => t.textContent))]);
  assert.deepEqual(unknownsListed.sort(), ['x', 'y']);
  assert.equal(await page.isVisible('#history'), true, 'a system shows its steps');
  const histHeads = await page.$$eval('#history-table thead th', (ths) => ths.map((t) => t.textContent));
  assert.deepEqual(histHeads.slice(1, 3), ['x', 'y']);
  assert.ok((await page.locator('#history-table tbody tr').count()) >= 2);
  checkClean(log);
});

test('units and numbers: other quantities follow US inputs, typeset units, labelled residuals, one number format', async () => {
  const { page, log } = await openPage(browser);
  await pickTemplate(page, 'pipes.darcy-colebrook');
  await page.selectOption('#unit-Q', 'gpm').catch(() => page.selectOption('#unit-Q', { index: 2 }));
  await setValue(page, 'D', 12, 'in');
  await setValue(page, 'L', 8000, 'ft');
  await setValue(page, 'eps', 0.006, 'in');
  await solved(page);
  // Other quantities come in the unit the core reports them in, typeset and named.
  const outputs = await page.$$eval('#result table.outputs tr', (trs) => trs.map((tr) => [tr.children[0].textContent, tr.children[3].textContent]));
  assert.deepEqual(outputs.find(([s]) => s === 'V'), ['V', 'm/s']);
  assert.equal(outputs.find(([s]) => s === 'Re')[1], '', 'no "1" on a dimensionless quantity');

  const body = await page.textContent('main');
  assert.doesNotMatch(body, /\de\+\d|\de-\d/, 'one number format (×10ⁿ), no e+ notation');
  assert.doesNotMatch(body, /SI units\.\)/);
  const heads = await page.$$eval('#history-table thead th', (ths) => ths.map((t) => t.textContent));
  assert.ok(!heads.includes('f(x)') && !heads.includes('f'), `no bare f or f(x) columns (${heads})`);
  assert.match(heads[2], /residual \(left − right/);
  assert.match(await page.textContent('#result .facts'), /Residual \(left − right side of the equation, SI units\)/);
  // Typeset units and no stray "1" on a dimensionless answer.
  await pickTemplate(page, 'thermo.peng-robinson');
  const units = await page.$$eval('#vars select option', (os) => os.map((o) => o.textContent));
  assert.ok(units.includes('cm³/mol'), `cm³/mol offered (${units.slice(0, 8)})`);
  assert.ok(!units.some((u) => /\^|\bum\b/.test(u)), 'no raw unit text');
  await pickTemplate(page, 'pipes.colebrook');
  await page.waitForSelector('[data-testid="answer-f"]');
  assert.equal(await page.textContent('#result .answer .unit'), '');
  const shown = await page.textContent('[data-testid="answer-f"]');
  assert.ok(shown.replace(/[^\d]/g, '').replace(/^0+/, '').length <= 6, `six significant digits (${shown})`);
  const examples = await page.$$eval('#vars tbody input', (is) => is.map((i) => i.value));
  assert.ok(examples.every((x) => x.replace(/[^\d]/g, '').replace(/^0+/, '').length <= 7), `example values are short (${examples})`);
  checkClean(log);
});

test('the printed record: answer in the table, certificate in words, record fields, page numbers, comments', async () => {
  const { page, log } = await openPage(browser);
  await page.click('#mode-custom');
  const text = '# pump loop B: the operating head\nh = a - b*q^2   # pump curve\nh = c + k*q^2   # system curve';
  await page.fill('#custom-text', text);
  await page.waitForSelector('#find-q');
  await chooseExactly(page, ['q', 'h']);
  for (const [s, v] of [['a', 40], ['b', 0.002], ['c', 12], ['k', 0.0015]]) await page.fill(`#val-${s}`, String(v));
  await page.fill('#record-project', 'Loop B upgrade');
  await page.fill('#record-preparedBy', 'R. Osei');
  await page.fill('#record-checkedBy', 'M. Lindqvist');
  await solved(page);
  assert.equal(await page.textContent('#solve-error'), '');
  await page.emulateMedia({ media: 'print' });
  await page.evaluate(() => window.dispatchEvent(new Event('beforeprint')));
  const head = await page.textContent('.record-head');
  for (const w of ['Project: Loop B upgrade', 'Prepared by: R. Osei', 'Checked by: M. Lindqvist', 'Date: ']) assert.ok(head.includes(w), `${w} in the head`);
  assert.equal(await page.isVisible('#vars tfoot .answer-line'), true, 'the answer is in the inputs table');
  assert.equal(await page.isVisible('#equation-text'), true);
  assert.equal(await page.textContent('#equation-text'), text, 'every comment of the equations is printed');
  const printed = await page.evaluate(() => document.body.innerText);
  assert.match(printed, /Why it is a root: /);
  assert.doesNotMatch(printed, /Status code|converged-step|Evaluations for sensitivities/);
  const css = await page.evaluate(() => [...document.styleSheets].flatMap((s) => [...s.cssRules].map((r) => r.cssText)).join('\n'));
  assert.match(css, /counter\(pages?\)/, 'page numbers');
  assert.match(css, /break-after: avoid/, 'headings kept with what follows');
  const pdf = join(process.env.TACIT_SHOTS || ARTIFACTS, 'record-own-equations.pdf');
  await page.pdf({ path: pdf, format: 'A4', printBackground: true });
  checkClean(log);
});

test('phone: quantities as cards, nothing cut off, the calculation comes into view, scroll areas by keyboard, axe', async () => {
  const { page, log } = await openPage(browser, { viewport: PHONE });
  await page.evaluate(() => window.scrollTo(0, 0));
  await pickTemplate(page, 'pipes.darcy-colebrook');
  const top = await page.evaluate(() => document.getElementById('setup').getBoundingClientRect().top);
  assert.ok(Math.abs(top) < 40, `the calculation is brought to the top after picking (${top})`);
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  assert.ok(overflow <= 0, `no sideways scrolling at 390 px (${overflow}px)`);
  const cut = await page.$$eval('#vars tr', (trs) => trs.filter((tr) => tr.getBoundingClientRect().right > document.documentElement.clientWidth + 1).length);
  assert.equal(cut, 0, 'no quantity card is cut off');
  assert.equal(await page.$eval('#vars tbody tr', (tr) => getComputedStyle(tr).display), 'grid', 'each quantity is a card');
  assert.equal(await page.getAttribute('#history .history-scroll', 'tabindex'), '0');
  const bad = await axeSerious(page);
  assert.deepEqual(bad, [], JSON.stringify(bad, null, 1));
  checkClean(log);
});

test('sweeps: the plot first on a linear axis, the table behind it a page at a time', async () => {
  const { page, log } = await openPage(browser);
  await page.waitForSelector('[data-testid="answer-f"]');
  await page.selectOption('#sweep-input', 'Re');
  await page.fill('#sweep-from', '10000');
  await page.fill('#sweep-to', '1000000');
  await page.fill('#sweep-n', '20000');
  const n = await page.evaluate(() => globalThis.tacitPage.sweeps);
  await page.click('#sweep-run');
  await page.waitForFunction((k) => globalThis.tacitPage.sweeps > k, n, { timeout: 60000 });
  assert.equal(await page.locator('#sweep-table tbody tr').count(), 200, 'one page of rows');
  assert.equal(await page.textContent('#sweep-page-text'), 'Rows 1–200 of 20000');
  assert.equal(await page.locator('#sweep-plot .tick tspan.sup').count(), 0, 'evenly spaced points on a linear axis');
  const order = await page.evaluate(() => document.getElementById('sweep-plot').compareDocumentPosition(document.getElementById('sweep-table-box')) & Node.DOCUMENT_POSITION_FOLLOWING);
  assert.ok(order, 'the plot comes before the table');
  await page.click('#sweep-table-box summary');
  await page.click('#sweep-next');
  assert.equal(await page.textContent('#sweep-page-text'), 'Rows 201–400 of 20000');
  // Logarithmically spaced points over decades: a logarithmic axis.
  await page.selectOption('#sweep-spacing', 'log');
  await page.fill('#sweep-from', '5000');
  await page.fill('#sweep-to', '10000000');
  await page.fill('#sweep-n', '60');
  const m = await page.evaluate(() => globalThis.tacitPage.sweeps);
  await page.click('#sweep-run');
  await page.waitForFunction((k) => globalThis.tacitPage.sweeps > k, m);
  assert.ok((await page.locator('#sweep-plot .tick tspan.sup').count()) >= 3, 'decades on the x-axis');
  const firstTwo = await page.$$eval('#sweep-table tbody tr td:first-child', (tds) => tds.slice(0, 2).map((t) => Number(t.title)));
  assert.ok(firstTwo[1] / firstTwo[0] > 1.1, `the points are spaced by ratio (${firstTwo})`);
  checkClean(log);
});

test('saved list: no duplicates on import, delete asks first; a damaged link in plain words', async () => {
  const { page, log } = await openPage(browser);
  await page.fill('#save-name', 'Loop A');
  await page.click('#save-form button[type=submit]');
  const list = await page.evaluate(() => localStorage.getItem('tacit.saved.v1'));
  const file = { name: 'list.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify({ ...JSON.parse(list), format: 'tacit-saved-list' })) };
  await page.setInputFiles('#import-saved', file);
  await page.waitForSelector('.notice:has-text("already in the list")');
  assert.equal(await page.locator('#saved-list li').count(), 1, 'importing the same list adds nothing');
  await page.click('#saved-list li button:has-text("Delete")');
  assert.match(await page.textContent('#saved-list li'), /Delete "Loop A" from this browser\?/);
  await page.click('#saved-list li button:has-text("Keep")');
  assert.equal(await page.locator('#saved-list li .saved-name').count(), 1, 'Keep keeps it');
  await page.click('#saved-list li button:has-text("Delete")');
  await page.click('#saved-list li .confirm button:has-text("Delete")');
  assert.equal(await page.locator('#saved-list li').count(), 0);
  const bad = await openPage(browser, { hash: '#calc=eyJ2IjoxLCJtb2RlIjoidGVtcGxhd' + '%FF' });
  const msg = await bad.page.textContent('.notice');
  assert.doesNotMatch(msg, /TextDecoder|Failed to execute/);
  assert.match(msg, /cut short or changed/);
  checkClean(log);
  checkClean(bad.log);
});

test('a storage that throws does not stop the page', async () => {
  const ctx = await browser.newContext();
  await ctx.addInitScript(() => {
    const boom = () => { throw new DOMException('blocked', 'SecurityError'); };
    Storage.prototype.getItem = boom;
    Storage.prototype.setItem = boom;
  });
  const { page, log } = await openPage(browser, { context: ctx });
  await page.waitForSelector('[data-testid="answer-f"]');
  assert.match(await page.textContent('#notices'), /saving is off/);
  checkClean(log);
  await ctx.close();
});

test('the editor label stays on a line or two, and the Import button shows its focus', async () => {
  const { page, log } = await openPage(browser);
  await page.click('#mode-custom');
  const lines = await page.$eval('label[for=custom-text]', (l) => Math.round(l.getBoundingClientRect().height / parseFloat(getComputedStyle(l).lineHeight)));
  assert.ok(lines <= 2, `label lines: ${lines}`);
  await page.focus('#export-saved');
  await page.keyboard.press('Tab');
  assert.equal(await page.evaluate(() => document.activeElement.id), 'import-saved');
  const ring = await page.$eval('label[for=import-saved]', (l) => getComputedStyle(l).outlineStyle);
  assert.equal(ring, 'solid', 'the focus ring shows on the Import button');
  checkClean(log);
});

test('the look: the unknown is chosen above the table and shown as the answer line, not a column of radio buttons', async () => {
  const { page, log } = await openPage(browser);
  await page.waitForSelector('[data-testid="answer-f"]');
  assert.equal(await page.locator('#vars input[type=radio], #vars input[type=checkbox]').count(), 0);
  // Symbol, meaning, value, unit, and the standard uncertainty (issue 13).
  assert.equal(await page.locator('#vars thead th').count(), 5);
  assert.equal(await page.getAttribute('#find-f', 'aria-pressed'), 'true');
  assert.equal(await page.locator('#vars tfoot tr[data-symbol="f"]').count(), 1);
  await chooseUnknown(page, 'Re');
  assert.equal(await page.locator('#vars tfoot tr[data-symbol="Re"]').count(), 1);
  assert.equal(await page.locator('#val-f').count(), 1, 'the old unknown is an input again');
  checkClean(log);
});

test('screenshots at laptop, phone, dark and print, for people to look at', async () => {
  for (const [name, opts] of [['laptop', {}], ['phone', { viewport: PHONE }], ['dark', { colorScheme: 'dark' }]]) {
    const { page, log } = await openPage(browser, opts);
    await pickTemplate(page, 'structures.secant-column');
    await page.waitForSelector('[data-testid="answer-P"]');
    await page.selectOption('#unit-Le', 'ft');
    await lookShot(page, `look-${name}-stale`, { fullPage: false });
    await solved(page);
    await lookShot(page, `look-${name}`);
    const bad = await axeSerious(page);
    assert.deepEqual(bad, [], `${name}: ${JSON.stringify(bad, null, 1)}`);
    if (name === 'laptop') {
      await page.fill('#record-project', 'Mezzanine columns, block C');
      await page.fill('#record-preparedBy', 'A. Engineer');
      await page.emulateMedia({ media: 'print' });
      await page.evaluate(() => window.dispatchEvent(new Event('beforeprint')));
      await page.pdf({ path: join(process.env.TACIT_SHOTS || ARTIFACTS, 'look-print.pdf'), format: 'A4', printBackground: true });
      await lookShot(page, 'look-print');
    }
    checkClean(log);
  }
});
