// Bookmarks (the whole state in the URL fragment), the saved list in localStorage, and
// what happens to a tampered link or damaged storage.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { launch, openPage, checkClean, pickTemplate, setValue, chooseUnknown, isUnknown, solveAndRead, fragmentFor, b64url, shot } from './lib.mjs';

let browser;
before(async () => { browser = await launch(); });
after(async () => { await browser?.close(); });

async function setUp(page) {
  await pickTemplate(page, 'pipes.colebrook');
  await chooseUnknown(page, 'D');
  await setValue(page, 'f', 0.02);
  await setValue(page, 'Re', 250000);
  await setValue(page, 'eps', 0.046, 'mm');
  await page.selectOption('#unit-D', 'm');
  await page.click('input[name=start-kind][value=guesses]');
  await page.fill('#start-a', '0.05');
  await page.fill('#start-b', '0.5');
  await page.click('#advanced summary');
  await page.selectOption('#method', 'secant');
  await page.fill('#tol-xRel', '1e-13');
  await page.fill('#tol-maxEvals', '60');
}

test('bookmark round trip: the link restores the same state and the same result', async () => {
  const a = await openPage(browser);
  await setUp(a.page);
  const d1 = await solveAndRead(a.page, 'D');
  const url = a.page.url();
  assert.match(url, /#calc=/);
  const b = await openPage(browser, { hash: url.slice(url.indexOf('#')) });
  await b.page.waitForSelector('[data-testid="answer-D"]');
  const d2 = Number(await b.page.getAttribute('[data-testid="answer-D"]', 'data-value'));
  assert.equal(d2, d1, 'same result, to the last bit');
  assert.equal(await b.page.inputValue('#val-Re'), '250000');
  assert.equal(await b.page.inputValue('#val-eps'), '0.046');
  assert.equal(await b.page.inputValue('#unit-D'), 'm');
  assert.equal(await isUnknown(b.page, 'D'), true);
  assert.equal(await b.page.inputValue('#method'), 'secant');
  assert.equal(await b.page.inputValue('#tol-xRel'), '1e-13');
  assert.equal(await b.page.inputValue('#tol-maxEvals'), '60');
  assert.equal(await b.page.inputValue('#start-a'), '0.05');
  assert.equal(await b.page.textContent('#history-table tbody tr:last-child td:nth-child(2)'), await a.page.textContent('#history-table tbody tr:last-child td:nth-child(2)'));
  checkClean(a.log);
  checkClean(b.log);
});

test('own equations travel in the link too', async () => {
  const a = await openPage(browser);
  await a.page.click('#mode-custom');
  await a.page.fill('#custom-text', 'y = x^2 + c');
  await a.page.waitForSelector('#find-x');
  await chooseUnknown(a.page, 'x');
  await a.page.fill('#val-y', '11');
  await a.page.fill('#val-c', '2');
  const x1 = await solveAndRead(a.page, 'x');
  const url = a.page.url();
  const b = await openPage(browser, { hash: url.slice(url.indexOf('#')) });
  await b.page.waitForSelector('[data-testid="answer-x"]');
  assert.equal(await b.page.inputValue('#custom-text'), 'y = x^2 + c');
  assert.equal(Number(await b.page.getAttribute('[data-testid="answer-x"]', 'data-value')), x1);
  checkClean(a.log);
  checkClean(b.log);
});

test('the saved list survives a reload; rename and delete work', async () => {
  const { page, log } = await openPage(browser);
  await setUp(page);
  await solveAndRead(page, 'D');
  await page.fill('#save-name', 'Riser 3 sizing');
  await page.click('#save-form button[type=submit]');
  await page.waitForSelector('#saved-list li');
  await page.goto('about:blank');
  await page.goBack();
  await page.reload();
  await page.waitForFunction(() => globalThis.tacitPage?.ready === true);
  assert.equal(await page.textContent('#saved-list li .saved-name'), 'Riser 3 sizing');
  // Open it from a page showing something else.
  await pickTemplate(page, 'pipes.colebrook');
  await page.click('#saved-list li button:has-text("Open")');
  await page.waitForFunction(() => document.getElementById('val-Re')?.value === '250000');
  assert.equal(await isUnknown(page, 'D'), true);
  await page.click('#saved-list li button:has-text("Rename")');
  await page.fill('#saved-list li input', 'Riser 3, revised');
  await page.click('#saved-list li button:has-text("Keep")');
  await page.reload();
  await page.waitForFunction(() => globalThis.tacitPage?.ready === true);
  assert.equal(await page.textContent('#saved-list li .saved-name'), 'Riser 3, revised');
  await page.click('#saved-list li button:has-text("Delete")');
  await page.click('#saved-list li .confirm button:has-text("Delete")');
  assert.equal(await page.locator('#saved-list li').count(), 0);
  await page.reload();
  await page.waitForFunction(() => globalThis.tacitPage?.ready === true);
  assert.equal(await page.locator('#saved-list li').count(), 0);
  checkClean(log);
});

test('export and import of the saved list as JSON', async () => {
  const { page, log, ctx } = await openPage(browser);
  await setUp(page);
  await page.fill('#save-name', 'Export me');
  await page.click('#save-form button[type=submit]');
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('#export-saved')]);
  const path = await dl.path();
  const { readFileSync } = await import('node:fs');
  const text = readFileSync(path, 'utf8');
  const data = JSON.parse(text);
  assert.equal(data.format, 'tacit-saved-list');
  assert.equal(data.items[0].name, 'Export me');
  const other = await openPage(browser);
  await other.page.setInputFiles('#import-saved', { name: 'list.json', mimeType: 'application/json', buffer: Buffer.from(text) });
  await other.page.waitForSelector('#saved-list li');
  assert.equal(await other.page.textContent('#saved-list li .saved-name'), 'Export me');
  await other.page.setInputFiles('#import-saved', { name: 'bad.json', mimeType: 'application/json', buffer: Buffer.from('{"not":"ours"}') });
  await other.page.waitForSelector('.notice:has-text("not a saved list")');
  assert.equal(await other.page.locator('#saved-list li').count(), 1, 'a bad import changes nothing');
  checkClean(log);
  checkClean(other.log);
  await ctx.close();
});

test('a tampered link gives a clear message and the page still works', async () => {
  const bad = await openPage(browser, { hash: '#calc=%%%not-base64' });
  await bad.page.waitForSelector('.notice');
  assert.match(await bad.page.textContent('.notice'), /could not be read/);
  await bad.page.waitForSelector('[data-testid="answer-f"]');
  const cut = await openPage(browser, { hash: `#calc=${b64url('{"v":1,"mode":"templ')}` });
  assert.match(await cut.page.textContent('.notice'), /not valid JSON/);
  const wrong = await openPage(browser, {
    hash: fragmentFor({ v: 1, mode: 'template', template: 'pipes.colebrook', method: 'rm -rf /', values: { Re: { v: 5e4, u: '1' }, nosuch: { v: '1', u: '' } }, unknown: 'f', tol: 7 }),
  });
  await wrong.page.waitForSelector('.notice');
  const msg = await wrong.page.textContent('.notice');
  assert.match(msg, /method/);
  assert.match(msg, /values\.Re\.v is not text/);
  assert.match(msg, /nosuch/);
  assert.match(msg, /tol/);
  assert.equal(await wrong.page.inputValue('#method'), 'auto', 'the bad part fell back to its default');
  for (const p of [bad, cut, wrong]) checkClean(p.log);
});

test('damaged storage gives a clear message, keeps the damaged text and everything else', async () => {
  const first = await openPage(browser);
  await first.page.evaluate(() => {
    localStorage.setItem('tacit.saved.v1', '{"format":"tacit-saved-list","items":[{"name":"fine","state":{"v":1,"mode":"template","template":"pipes.colebrook"}},{"nam');
    localStorage.setItem('unrelated.key', 'keep me');
  });
  await first.page.reload();
  await first.page.waitForFunction(() => globalThis.tacitPage?.ready === true);
  await first.page.waitForSelector('.notice');
  assert.match(await first.page.textContent('.notice'), /damaged/);
  const keys = await first.page.evaluate(() => Object.keys(localStorage));
  const backup = keys.find((k) => k.startsWith('tacit.saved.v1.damaged.'));
  assert.ok(backup, 'the damaged text was kept under a backup key');
  assert.match(await first.page.evaluate((k) => localStorage.getItem(k), backup), /"nam$/);
  assert.equal(await first.page.evaluate(() => localStorage.getItem('unrelated.key')), 'keep me');
  // One bad entry among good ones: the good ones stay.
  await first.page.evaluate(() => localStorage.setItem('tacit.saved.v1', JSON.stringify({ format: 'tacit-saved-list', version: 1, items: [{ name: 'good one', state: { v: 1, mode: 'custom', equations: 'x = 2' } }, { name: 42 }] })));
  await first.page.reload();
  await first.page.waitForFunction(() => globalThis.tacitPage?.ready === true);
  assert.equal(await first.page.textContent('#saved-list li .saved-name'), 'good one');
  assert.match(await first.page.textContent('.notice'), /saved entry 2/);
  await shot(first.page, 'damaged-storage-notice', { fullPage: false });
  // The next visit finds only the good entry, and says nothing.
  await first.page.reload();
  await first.page.waitForFunction(() => globalThis.tacitPage?.ready === true);
  assert.equal(await first.page.locator('.notice').count(), 0);
  assert.equal(await first.page.textContent('#saved-list li .saved-name'), 'good one');
  checkClean(first.log);
});
