// Templates of one's own in the page: made from own equations with "Save as my template",
// kept in storage, opened from "My templates" like a bundled one (any unknown, units),
// carried in links, exported and imported as the core's exchange file, edited and deleted,
// and printed. The example is the invented scenario's booster pump (demo/scenario.md:
// shut-off head 62 m, rated 40 L/s at 48 m) with a pump-curve fit of an invented maker.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { join } from 'node:path';
import { launch, openPage, checkClean, chooseUnknown, solveAndRead, axeSerious, lookShot, fragmentFor, close, ARTIFACTS } from './lib.mjs';

let browser;
before(async () => { browser = await launch(); });
after(async () => { await browser?.close(); });

const ID = 'my.booster-pump-curve-harrow-lane-fit';
const TITLE = 'Booster pump curve, Harrow & Lane fit';
const EQ = `# ${TITLE}\nH = H0*(1 - (Q/Qmax)^2)`;
// The curve rearranged for Q by exact algebra (no source needed): Q = Qmax·sqrt(1 − H/H0).
const qOf = (h, h0, qmax) => qmax * Math.sqrt(1 - h / h0);
const VARS = {
  H: { meaning: 'head at the duty point', unit: 'm', value: '48' },
  H0: { meaning: 'shut-off head', unit: 'm', value: '62' },
  Q: { meaning: 'flow', unit: 'L/s', lo: '0', g1: '20', g2: '60' },
  Qmax: { meaning: 'flow at zero head (fitted)', unit: 'L/s', value: '84.18' },
};
const ownStored = (page) => page.evaluate(() => localStorage.getItem('tacit.own-templates.v1'));
const varInput = (page, name, field) => page.locator(`fieldset[data-name="${name}"] input[id$="-${field}"]`);

/** Own equations typed on the page, then the form filled in; returns before Save. */
async function fillTemplate(page) {
  await page.click('#mode-custom');
  await page.fill('#custom-text', EQ);
  await page.waitForSelector('#find-Qmax');
  await chooseUnknown(page, 'Q');
  await page.fill('#val-H', '48');
  await page.fill('#val-H0', '62');
  await page.fill('#val-Qmax', '84.18');
  await page.click('#own-save-start');
  await page.waitForSelector('#own-form-card:not([hidden])');
  assert.equal(await page.inputValue('#own-title'), TITLE, 'the title comes from the first comment');
  assert.equal(await page.inputValue('#own-id'), ID);
  assert.equal(await varInput(page, 'H', 'value').inputValue(), '48', 'values come from the page');
  assert.equal(await page.inputValue('#own-unknown'), 'Q');
  for (const [name, v] of Object.entries(VARS)) {
    for (const [f, text] of Object.entries(v)) await varInput(page, name, f).fill(text);
  }
  await page.fill('#own-description', 'Head against flow of the BX booster pumps, as fitted by their maker.');
  await page.fill('#own-validity', 'BX range at 1450 rpm, clean water, duty flows 20 to 70 L/s.');
  await page.fill('#own-source', 'Harrow & Lane data sheet BX-200 (an invented firm of the demo scenario)');
  await page.check('#own-caution');
}

async function saveTemplate(page) {
  await page.click('#own-form button[type=submit]');
  await page.waitForSelector('#own-form-card', { state: 'hidden' });
  await page.waitForFunction((t) => document.getElementById('calc-title').textContent.startsWith(t), TITLE);
}

async function makeTemplate(page) {
  await fillTemplate(page);
  await saveTemplate(page);
}

test('made from own equations: a bad field shows the core message and loses nothing; saved, it solves like a bundled one', async () => {
  const { page, log } = await openPage(browser);
  await fillTemplate(page);
  // A unit the table does not know: the core names the field; the form keeps everything.
  await varInput(page, 'H', 'unit').fill('metres-ish');
  await page.click('#own-form button[type=submit]');
  await page.waitForFunction(() => document.getElementById('own-error').textContent !== '');
  assert.match(await page.textContent('#own-error'), /template\.variables\[\d\]\.unit/);
  assert.equal(await varInput(page, 'H', 'unit').getAttribute('aria-invalid'), 'true');
  assert.equal(await page.inputValue('#own-title'), TITLE);
  assert.equal(await varInput(page, 'Q', 'g2').inputValue(), '60');
  assert.equal(await ownStored(page), null, 'nothing stored yet');
  // A dimension that does not match: Qmax given in metres.
  await varInput(page, 'H', 'unit').fill('m');
  await varInput(page, 'Qmax', 'unit').fill('m');
  await page.click('#own-form button[type=submit]');
  await page.waitForFunction(() => /dimension|volume flow|length/.test(document.getElementById('own-error').textContent));
  assert.equal(await page.getAttribute('#own-equations', 'aria-invalid'), 'true');
  await varInput(page, 'Qmax', 'unit').fill('L/s');
  await saveTemplate(page);

  assert.equal(await page.textContent('#calc-field'), 'My templates');
  assert.equal(await page.isVisible('#caution'), true, 'the caution asked for is shown');
  assert.match(await page.textContent('#notes'), /1450 rpm/);
  assert.match(await page.textContent('#calc-source'), /Harrow & Lane/);
  assert.equal(await page.isVisible(`#template-groups button[data-template="${ID}"]`), true, 'listed under My templates');
  assert.match(await page.textContent('#template-groups details:first-child summary'), /My templates/);
  const q = await solveAndRead(page, 'Q');
  close(q, qOf(48, 62, 84.18), 1e-10, 'Q in L/s');
  assert.match(await page.textContent('#result-body .unit'), /L\/s/);
  // Any unknown, any unit of the dimension: H0 with the duty head given in feet.
  await chooseUnknown(page, 'H0');
  await page.fill('#val-H', '157.480315');
  await page.selectOption('#unit-H', 'ft');
  await page.fill('#val-Q', '40');
  const h0 = await solveAndRead(page, 'H0');
  // 157.480315 ft = 48.0000 m (international foot, 0.3048 m exactly: NIST SP 811, B.8).
  close(h0, (157.480315 * 0.3048) / (1 - (40 / 84.18) ** 2), 1e-9, 'H0 in m');
  const stored = JSON.parse(await ownStored(page));
  assert.equal(stored.format, 'tacit-own-templates');
  assert.equal(stored.templates[0].id, ID);
  checkClean(log);
});

test('kept in storage: a reload lists it, opens it, and solves it', async () => {
  const a = await openPage(browser);
  await makeTemplate(a.page);
  const b = await openPage(browser, { context: a.ctx });
  await b.page.waitForSelector(`#own-list li[data-own="${ID}"]`);
  await b.page.click(`#own-list li[data-own="${ID}"] button[aria-label^="Open"]`);
  await b.page.waitForFunction((t) => document.getElementById('calc-title').textContent === t, TITLE);
  close(await solveAndRead(b.page, 'Q'), qOf(48, 62, 84.18), 1e-10, 'Q after a reload');
  checkClean(a.log);
  checkClean(b.log);
  await a.ctx.close();
});

test('linked: a fresh browser opens the link with its template; Keep stores it; a damaged template is named and changes nothing stored', async () => {
  const a = await openPage(browser);
  await makeTemplate(a.page);
  const q1 = await solveAndRead(a.page, 'Q');
  const url = a.page.url();
  const hash = url.slice(url.indexOf('#'));
  const b = await openPage(browser, { hash });
  await b.page.waitForSelector('[data-testid="answer-Q"]');
  assert.equal(Number(await b.page.getAttribute('[data-testid="answer-Q"]', 'data-value')), q1, 'same answer from the link');
  assert.match(await b.page.textContent('#calc-title'), /from a link/);
  assert.equal(await ownStored(b.page), null, 'not stored until asked');
  await b.page.click(`#own-list li[data-own="${ID}"] button[aria-label^="Keep"]`);
  await b.page.waitForFunction(() => localStorage.getItem('tacit.own-templates.v1') !== null);
  assert.equal(JSON.parse(await ownStored(b.page)).templates[0].id, ID);

  // The template in a link changed by hand: its unit no longer exists.
  const state = JSON.parse(Buffer.from(hash.slice('#calc='.length), 'base64url').toString('utf8'));
  state.own.variables[0].unit = 'cubits-ish';
  const before = await ownStored(b.page);
  const c = await openPage(browser, { context: b.ctx, hash: fragmentFor(state) });
  const notice = await c.page.textContent('#notices');
  assert.match(notice, /own template could not be used/);
  assert.match(notice, /variables\[0\]\.unit/);
  assert.equal(await ownStored(c.page), before, 'storage unchanged');
  assert.equal(await c.page.isVisible(`#own-list li[data-own="${ID}"]`), true);
  // Another version under the same id: used for this visit beside yours, which stays.
  state.own.variables[0].unit = 'm';
  state.own.title = 'Booster pump curve, revised';
  const d = await openPage(browser, { context: b.ctx, hash: fragmentFor(state) });
  await d.page.waitForSelector('[data-testid="answer-Q"]');
  assert.match(await d.page.textContent('#calc-title'), /revised \(from a link\)/);
  assert.equal(await d.page.locator(`#own-list li[data-own="${ID}"], #own-list li[data-own="link:${ID}"]`).count(), 2);
  assert.equal(await ownStored(d.page), before, 'storage unchanged');
  checkClean(d.log);
  checkClean(a.log);
  checkClean(b.log);
  checkClean(c.log);
  await b.ctx.close();
});

test('a saved calculation carries its template: deleted from My templates, it still opens', async () => {
  const { page, log } = await openPage(browser);
  await makeTemplate(page);
  const q1 = await solveAndRead(page, 'Q');
  await page.fill('#save-name', 'Pump duty, hilltop tank');
  await page.click('#save-form button[type=submit]');
  await page.click(`#own-list li[data-own="${ID}"] button[aria-label^="Delete"]`);
  await page.click('#own-list .confirm button.danger');
  assert.equal(await page.locator('#own-list li').count(), 0);
  await page.click('#saved-list button[aria-label^="Open"]');
  await page.waitForFunction(() => /from a saved calculation/.test(document.getElementById('calc-title').textContent));
  await page.waitForSelector('[data-testid="answer-Q"]');
  assert.equal(Number(await page.getAttribute('[data-testid="answer-Q"]', 'data-value')), q1);
  checkClean(log);
});

test('exported and imported: twice adds it once; a bad file gives the core message and changes nothing', async () => {
  const a = await openPage(browser);
  await makeTemplate(a.page);
  const [dl] = await Promise.all([a.page.waitForEvent('download'), a.page.click('#export-own')]);
  const text = await (await dl.createReadStream()).toArray().then((c) => Buffer.concat(c).toString('utf8'));
  assert.equal(JSON.parse(text).format, 'tacit-own-templates');
  const b = await openPage(browser);
  const file = { name: 'mine.json', mimeType: 'application/json', buffer: Buffer.from(text) };
  await b.page.setInputFiles('#import-own', file);
  await b.page.waitForSelector(`#own-list li[data-own="${ID}"]`);
  await b.page.setInputFiles('#import-own', file);
  await b.page.waitForFunction(() => /already in the list/.test(document.getElementById('notices').textContent));
  assert.equal(await b.page.locator('#own-list li').count(), 1, 'not added twice');
  const before = await ownStored(b.page);
  const bad = JSON.parse(text);
  bad.templates[0].equations = 'H = H0*(1 - Q/Qmax) + Q';
  await b.page.setInputFiles('#import-own', { ...file, buffer: Buffer.from(JSON.stringify(bad)) });
  await b.page.waitForFunction(() => /Nothing was changed/.test(document.getElementById('notices').textContent));
  assert.match(await b.page.textContent('#notices'), /templates\[0\]\.equations/);
  await b.page.setInputFiles('#import-own', { ...file, buffer: Buffer.from('{"format":"tacit-own-templates","version":9,"templates":[]}') });
  await b.page.waitForFunction(() => /version/.test(document.getElementById('notices').textContent));
  assert.equal(await ownStored(b.page), before, 'storage unchanged by bad files');
  await b.page.click(`#own-list li[data-own="${ID}"] button[aria-label^="Open"]`);
  close(await solveAndRead(b.page, 'Q'), qOf(48, 62, 84.18), 1e-10, 'Q from the imported template');
  checkClean(a.log);
  checkClean(b.log);
});

test('edited and deleted (after asking, with undo); a storage that throws does not stop it', async () => {
  const { page, log } = await openPage(browser);
  await makeTemplate(page);
  await page.click(`#own-list li[data-own="${ID}"] button[aria-label^="Edit"]`);
  await page.waitForSelector('#own-form-card:not([hidden])');
  assert.equal(await varInput(page, 'Qmax', 'value').inputValue(), '84.18', 'the form holds the template');
  assert.equal(await page.isChecked('#own-caution'), true);
  await varInput(page, 'Qmax', 'value').fill('85');
  await saveTemplate(page);
  assert.equal(JSON.parse(await ownStored(page)).templates[0].variables.find((v) => v.name === 'Qmax').value, 85);
  await page.click(`#own-list li[data-own="${ID}"] button[aria-label^="Delete"]`);
  await page.click('#own-list .confirm button.danger');
  assert.equal(await page.locator('#own-list li').count(), 0);
  assert.equal(JSON.parse(await ownStored(page)).templates.length, 0);
  await page.click('#notices .notice:last-child button:text("Undo")');
  await page.waitForSelector(`#own-list li[data-own="${ID}"]`);
  assert.equal(JSON.parse(await ownStored(page)).templates.length, 1, 'undo puts it back');
  checkClean(log);

  const ctx = await browser.newContext();
  await ctx.addInitScript(() => {
    const boom = () => { throw new DOMException('blocked', 'SecurityError'); };
    Storage.prototype.getItem = boom;
    Storage.prototype.setItem = boom;
  });
  const blocked = await openPage(browser, { context: ctx });
  await makeTemplate(blocked.page);
  assert.match(await blocked.page.textContent('#notices'), /last only while this page is open/);
  close(await solveAndRead(blocked.page, 'Q'), qOf(48, 62, 84.18), 1e-10, 'Q without storage');
  checkClean(blocked.log);
  await ctx.close();
});

test('looked at: made, saved, linked and printed at laptop and phone widths, axe clean', async () => {
  for (const [name, viewport] of [['laptop', { width: 1280, height: 900 }], ['phone', { width: 390, height: 844 }]]) {
    const { page, log, ctx } = await openPage(browser, { viewport });
    await fillTemplate(page);
    assert.deepEqual(await axeSerious(page), [], `axe on the form (${name})`);
    await lookShot(page, `own-form-${name}`);
    await saveTemplate(page);
    await solveAndRead(page, 'Q');
    assert.deepEqual(await axeSerious(page), [], `axe with the template solved (${name})`);
    await lookShot(page, `own-saved-${name}`);
    const url = page.url();
    const linked = await openPage(browser, { viewport, hash: url.slice(url.indexOf('#')) });
    await linked.page.waitForSelector('[data-testid="answer-Q"]');
    await lookShot(linked.page, `own-linked-${name}`);
    checkClean(linked.log);
    await linked.ctx.close();
    if (name === 'laptop') {
      await page.emulateMedia({ media: 'print' });
      assert.equal(await page.isVisible('#own-form-card'), false);
      assert.equal(await page.isVisible('#caution'), true, 'the caution is printed');
      await page.pdf({ path: join(process.env.TACIT_SHOTS || ARTIFACTS, 'own-template-print.pdf'), format: 'A4', printBackground: true });
      await page.setViewportSize({ width: 794, height: 1123 });
      await lookShot(page, 'own-print');
    }
    checkClean(log);
    await ctx.close();
  }
});
