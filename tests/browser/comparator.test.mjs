// Real-browser tests of the comparator page (dist/comparator.html).
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import path from 'node:path';
import { setup, open, fileUrl, outputs, root, cli, inked, WASM_LIBM_REL, fill, settle } from './harness.mjs';

const env = setup({ before, after });

for (const where of ['file', 'served']) {
  test(`comparator page loads cleanly ${where === 'file' ? 'from file://' : 'from the server'}`, async () => {
    const url = where === 'file' ? fileUrl('comparator.html') : env.server.url + 'comparator.html';
    const { context, page, problems, foreign } = await open(env.browser, url);
    assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
    for (const id of ['plot-treg', 'plot-ctau', 'plot-spread', 'plot-growth']) {
      assert.equal(await page.$eval(`#${id}`, (c) => c.dataset.drawn), 'yes', id);
      assert.ok(await inked(page, id) > 2000, `${id} is blank`);
    }
    assert.match(await page.textContent('#caution'), /first-order estimates/);
    if (process.env.UPDATE_SCREENSHOTS && where === 'file') {
      await page.screenshot({ path: path.join(root, 'docs/comparator-page.png'), fullPage: true });
    }
    assert.deepEqual(problems, []);
    assert.deepEqual(foreign, []);
    await context.close();
  });
}

test('the page agrees with latchwise comparator --json on every input model', async () => {
  const common = { tau: '15ps', treg: '80ps', vmin: '0.4', gain: '4', fs: '5GHz', 'target-ber': '1e-12' };
  const models = [
    { input: 'uniform', lsb: '1mV' },
    { input: 'gaussian', sigma: '2mV', mean: '-1mV' },
    { input: 'nrz', amp: '40mV', sigma: '4mV' },
    { input: 'pam4', amp: '150mV', sigma: '8mV' },
    { input: 'sine', amp: '0.5', lsb: '3.90625mV' },
    { input: 'nrz', amp: '40mV', sigma: '4mV', treg: '20ns' },
    { cl: '20f', gm: '2m', g0: '0.4m', tau: '', input: 'uniform', lsb: '1mV', 'extra-stages': '3', 'stage-time': '100p' },
  ];
  for (const m of models) {
    const c = Object.fromEntries(Object.entries({ ...common, ...m }).filter(([, v]) => v !== ''));
    const { context, page, problems } = await open(env.browser, fileUrl('comparator.html') + '?' + new URLSearchParams(c));
    const out = await outputs(page);
    const want = cli('comparator', Object.entries(c).flatMap(([k, v]) => [`--${k}`, v]));
    for (const k of ['log10_p_error', 'log10_errors_per_s', 'log10_vcrit_v', 'tau_s', 'log10_p_total']) {
      const got = Number(out[k].value);
      assert.ok(Math.abs(got - want[k]) <= WASM_LIBM_REL * Math.max(1, Math.abs(want[k])), `${k}: page ${got}, CLI ${want[k]} for ${JSON.stringify(c)}`);
    }
    assert.equal(out.meets_target.value === '1', want.meets_target, JSON.stringify(c));
    assert.deepEqual(problems, []);
    await context.close();
  }
});

test('switching the input model asks for its parameters and marks unused ones', async () => {
  const { context, page } = await open(env.browser, fileUrl('comparator.html'));
  await page.selectOption('[name="input"]', 'nrz');
  await settle(page);
  assert.equal(await page.textContent('#m-amp'), 'amp: a value is required');
  assert.equal(await page.textContent('#m-sigma'), 'sigma: a value is required');
  await fill(page, '[name="amp"]', '40mV');
  await fill(page, '[name="sigma"]', '4mV');
  assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
  assert.equal(await page.$eval('[name="lsb"]', (e) => e.closest('.field').dataset.unused), 'yes');
  assert.match(page.url(), /input=nrz/);
  const out = await outputs(page);
  assert.ok(Number.isFinite(Number(out.log10_p_noise.value)));
  await fill(page, '[name="gm"]', '1m');
  await fill(page, '[name="cl"]', '10f');
  await fill(page, '[name="g0"]', '2m');
  await fill(page, '[name="tau"]', '');
  assert.equal(await page.textContent('#m-gm'), 'gm: gm = 1 mS does not exceed g0 = 2 mS: the latch would not regenerate');
  await context.close();
});

test('the link to the synchronizer carries tau and the clock, and back', async () => {
  const { context, page } = await open(env.browser, fileUrl('comparator.html'));
  await fill(page, '[name="tau"]', '27ps');
  await fill(page, '[name="fs"]', '2.5GHz');
  await Promise.all([page.waitForNavigation(), page.click('#to-sync')]);
  await page.waitForSelector('body[data-ready="yes"]');
  assert.equal(await page.inputValue('[name="tau"]'), '27ps');
  assert.equal(await page.inputValue('[name="fclk"]'), '2.5GHz');
  assert.equal(await page.inputValue('[name="tw"]'), '40ps', 'other synchronizer fields keep the demo case');
  assert.doesNotMatch(page.url(), /from=/);
  await fill(page, '[name="tau"]', '31ps');
  await Promise.all([page.waitForNavigation(), page.click('#to-comparator')]);
  await page.waitForSelector('body[data-ready="yes"]');
  assert.equal(await page.inputValue('[name="tau"]'), '31ps');
  assert.equal(await page.inputValue('[name="fs"]'), '2.5GHz');
  await context.close();
});

test('a hostile query executes nothing on the comparator page', async () => {
  const evil = '"><script>window.__owned=1</script>';
  const { context, page } = await open(env.browser, fileUrl('comparator.html') + '?input=' + encodeURIComponent(evil) + '&tau=15p');
  assert.equal(await page.evaluate(() => window.__owned), undefined);
  assert.match(await page.textContent('#m-input'), /is not one of/);
  await context.close();
});
