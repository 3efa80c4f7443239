// Real-browser tests of the fit page: the three experiments from their demos, the page
// against the command line, errors with line and column, and the links into the calculators.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import path from 'node:path';
import { setup, open, fileUrl, outputs, root, cli, fill, settle, inked, WASM_LIBM_REL, WASM_DEVIANCE_REL } from './harness.mjs';

const env = setup({ before, after });

for (const where of ['file', 'served']) {
  test(`loads the counting demo ${where === 'file' ? 'from file://' : 'from the server'} and agrees with the command line`, async () => {
    const url = where === 'file' ? fileUrl('characterize.html') : env.server.url + 'characterize.html';
    const { context, page, problems, foreign } = await open(env.browser, url);
    const out = await outputs(page);
    const want = cli('fit', ['counts', path.join(root, 'examples/fit-counts.csv'), '--fclk', '1GHz', '--fdata', '50MHz']);
    // The fit's Newton steps carry the last-bit differences of the wasm build's exp/ln.
    for (const k of ['tau_s', 'tau_s_ci_low', 'tau_s_ci_high', 'tw_s', 'p_value']) {
      const got = Number(out[k].value);
      const tol = k === 'p_value' ? WASM_DEVIANCE_REL : WASM_LIBM_REL;
      assert.ok(Math.abs(got - want[k]) <= tol * Math.abs(want[k]), `${k}: ${got} against ${want[k]}`);
    }
    for (const id of ['plot-fit', 'plot-residuals']) assert.ok(await inked(page, id) > 1500, id);
    assert.deepEqual(problems, []);
    assert.deepEqual(foreign, []);
    await context.close();
  });
}

test('the delay and comparator demos fit, and each result opens its calculator', async () => {
  const { context, page } = await open(env.browser, fileUrl('characterize.html'));
  await page.click('button[data-demo="demo-delay"]');
  await settle(page);
  let out = await outputs(page);
  assert.match(out.tau_s.text, /^16\.\d+ ps$/);
  assert.match(out.points_used.text, /^\d+ of 24$/);
  assert.match(await page.textContent('#facts'), /Left out: line 5/);
  const href = await page.$eval('#links a', (a) => a.getAttribute('href'));
  assert.match(href, /^index\.html\?tau=1\.60\d+e-11&tw=2\.9\d+e-11$/);
  await page.click('button[data-demo="demo-comparator"]');
  await settle(page);
  out = await outputs(page);
  assert.match(out.v0_v.text, /mV$/);
  await Promise.all([page.waitForNavigation(), page.click('#links li:nth-child(2) a')]);
  await page.waitForSelector('body[data-ready="yes"]');
  assert.match(page.url(), /comparator\.html\?tau=/);
  assert.equal(await page.inputValue('[name="gain"]'), '1');
  await context.close();
});

test('bad data are flagged with line and column, and a fixed table recovers', async () => {
  const { context, page } = await open(env.browser, fileUrl('characterize.html'));
  await fill(page, '[name="data"]', 'tr,failures,duration\n100ps,many,1s\n200ps,3,-1s\n');
  const msg = await page.textContent('#m-data');
  assert.match(msg, /line 2, column failures: 'many' is not a number/);
  assert.match(msg, /line 3, column duration/);
  assert.equal(await page.getAttribute('[name="data"]', 'aria-invalid'), 'true');
  await fill(page, '[name="data"]', 'tr,failures,duration\n100ps,0,1s\n200ps,0,1s\n');
  assert.match(await page.textContent('#m-data'), /no failures were counted/);
  await fill(page, '[name="data"]', 'tr,failures,duration\n100ps,400,1s\n200ps,12,10s\n300ps,1,100s\n');
  assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
  await context.close();
});

test('each kind of fit lists only its own results, none as a dash', async () => {
  const { context, page } = await open(env.browser, fileUrl('characterize.html'));
  const visible = () => page.$$eval('output[name]', (els) => els
    .filter((e) => e.offsetParent !== null)
    .map((e) => [e.getAttribute('name'), e.textContent]));
  for (const [demo, own, foreign] of [
    [null, 'tw_s', ['v0_v', 'offset_m_s', 't0_s']],
    ['demo-delay', 'offset_m_s', ['v0_v', 't0_s', 'deviance']],
    ['demo-comparator', 'v0_v', ['tw_s', 'offset_m_s', 't0_s', 'deviance']],
  ]) {
    if (demo) {
      await page.click(`button[data-demo="${demo}"]`);
      await settle(page);
    }
    const shown = await visible();
    const names = shown.map((s) => s[0]);
    assert.ok(names.includes(own), `${demo}: ${names}`);
    for (const f of foreign) assert.ok(!names.includes(f), `${demo}: ${f} shown`);
    for (const [n, t] of shown) assert.ok(t !== '—' && t !== '', `${demo}: ${n} shows '${t}'`);
  }
  await context.close();
});
