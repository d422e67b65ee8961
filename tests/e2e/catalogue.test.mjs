// Every template of the catalogue, picked from the page with its own example values,
// solves, shows its equation in MathML and logs no error. (A smoke test of the page over
// the template data; the published check values are in solve.test.mjs and the core's tests.)
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { launch, openPage, checkClean, pickTemplate, shot } from './lib.mjs';

let browser;
before(async () => { browser = await launch(); });
after(async () => { await browser?.close(); });

test('every template solves from the page with its example values', async () => {
  const { page, log } = await openPage(browser);
  const ids = await page.$$eval('button[data-template]', (bs) => bs.map((b) => b.dataset.template));
  assert.ok(ids.length >= 10, `the catalogue lists templates (${ids.length})`);
  for (const id of ids) {
    const before = await page.evaluate(() => globalThis.tacitPage.solves);
    await pickTemplate(page, id);
    await page.waitForFunction((n) => globalThis.tacitPage.solves > n || document.getElementById('solve-error').textContent, before);
    const r = await page.evaluate(() => ({
      err: document.getElementById('solve-error').textContent,
      converged: document.querySelector('#result .status strong')?.textContent,
      math: document.querySelectorAll('#equation math').length,
    }));
    assert.equal(r.err, '', `${id}: no input error`);
    assert.equal(r.converged, 'Converged', `${id}: converged`);
    assert.ok(r.math >= 1, `${id}: equation shown in MathML`);
    if (id === 'thermal.hx-effectiveness-ntu' || id === 'finance.irr') await shot(page, `template-${id}`, { fullPage: false });
  }
  checkClean(log);
});
