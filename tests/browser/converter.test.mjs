// Real-browser tests of the SAR converter page (dist/converter.html).
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import path from 'node:path';
import { setup, open, fileUrl, outputs, root, cli, inked, WASM_LIBM_REL, fill, settle } from './harness.mjs';

const env = setup({ before, after });

for (const where of ['file', 'served']) {
  test(`converter page loads cleanly ${where === 'file' ? 'from file://' : 'from the server'}`, async () => {
    const url = where === 'file' ? fileUrl('converter.html') : env.server.url + 'converter.html';
    const { context, page, problems, foreign } = await open(env.browser, url);
    assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
    for (const id of ['plot-sizes', 'plot-time', 'plot-steps']) {
      assert.equal(await page.$eval(`#${id}`, (c) => c.dataset.drawn), 'yes', id);
      assert.ok(await inked(page, id) > 1000, `${id} is blank`);
    }
    // The table of error sizes: k = 1 .. 2^(B-1), four columns.
    const rows = await page.$$eval('#results-table tbody tr', (trs) => trs.map((tr) => Array.from(tr.cells, (c) => c.textContent)));
    assert.equal(rows.length, 10);
    assert.deepEqual(rows.map((r) => r[0]), ['1', '2', '4', '8', '16', '32', '64', '128', '256', '512']);
    assert.match(await page.textContent('#caution'), /first-order estimates/);
    if (process.env.UPDATE_SCREENSHOTS && where === 'file') {
      await page.screenshot({ path: path.join(root, 'docs/converter-page.png'), fullPage: true });
    }
    assert.deepEqual(problems, []);
    assert.deepEqual(foreign, []);
    await context.close();
  });
}

test('the page agrees with latchwise converter --json, sync and async, table included', async () => {
  const cases = [
    { bits: '10', timing: 'async', tau: '10ps', vmin: '1', gain: '1', vfs: '1', fs: '100MHz', tconv: '1ns', tfix: '30ps', fill: 'reset', 'sigma-n': '0.48828125mV', static: '512', 'margin-lsb': '2', 'target-ber': '1e-12' },
    { bits: '16', timing: 'async', tau: '12ps', vmin: '0.3', gain: '8', vfs: '1.2', fs: '5MHz', tconv: '2.5ns', tfix: '40ps', fill: 'midpoint', 'target-fit': '10' },
    { bits: '10', timing: 'sync', tau: '20ps', vmin: '0.1', vfs: '1', fs: '100MHz', tbit: '400ps', consume: 'hard', 'target-ber': '1e-9' },
  ];
  for (const c of cases) {
    const { context, page, problems } = await open(env.browser, fileUrl('converter.html') + '?' + new URLSearchParams(c));
    const out = await outputs(page);
    const want = cli('converter', Object.entries(c).flatMap(([k, v]) => [`--${k}`, v]));
    for (const k of ['log10_p_meta', 'log10_errors_per_s', 'mean_square_error_lsb2', 'enob_loss_bits', 'margin_decades']) {
      const got = Number(out[k].value);
      assert.ok(Math.abs(got - want[k]) <= WASM_LIBM_REL * Math.max(1, Math.abs(want[k])), `${k}: page ${got}, CLI ${want[k]} for ${JSON.stringify(c)}`);
    }
    assert.equal(out.meets_target.value === '1', want.meets_target, JSON.stringify(c));
    const rows = await page.$$eval('#results-table tbody tr', (trs) => trs.map((tr) => tr.cells[1].textContent));
    assert.equal(rows.length, want.p_error_at_least.length);
    // Each row as the CLI's JSON has it, to the four digits shown.
    want.p_error_at_least.forEach((s, i) => {
      if (s.log10_p === null) assert.equal(rows[i], 'cannot occur');
      else assert.ok(Math.abs(Number(rows[i]) / 10 ** s.log10_p - 1) < 5e-4, `k=${s.lsb}: ${rows[i]} against ${10 ** s.log10_p}`);
    });
    assert.deepEqual(problems, []);
    await context.close();
  }
});

test('each bad value is named at its field and keeps what was typed', async () => {
  const { context, page } = await open(env.browser, fileUrl('converter.html'));
  const bad = [
    ['bits', '17', /^bits: /],
    ['bits', '0', /^bits: /],
    ['tconv', '200ps', /^tconv: 200 ps is out of range/],
    ['tfix', '-3ps', /^tfix: negative/],
    ['sigma-n', '-1mV', /^sigma-n: negative/],
    ['static', '1024', /^static: /],
    ['margin-lsb', '600', /^margin-lsb: /],
    ['vfs', '1 banana', /^vfs: /],
    ['target-ber', '2', /^target-ber: /],
  ];
  for (const [name, value, re] of bad) {
    const before = await page.inputValue(`[name="${name}"]`);
    await fill(page, `[name="${name}"]`, value);
    assert.match(await page.textContent(`#m-${name}`), re, `${name}=${value}`);
    assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'no', `${name}=${value}`);
    assert.equal(await page.inputValue(`[name="${name}"]`), value);
    await fill(page, `[name="${name}"]`, before);
  }
  // static without sigma-n.
  await fill(page, '[name="static"]', '5');
  assert.match(await page.textContent('#m-static'), /needs sigma-n/);
  await fill(page, '[name="static"]', '');
  // Switching to sync: fill belongs to async, and sync asks for its own inputs.
  await page.selectOption('[name="timing"]', 'sync');
  await settle(page);
  assert.match(await page.textContent('#m-fill'), /applies only with timing = async/);
  assert.equal(await page.textContent('#m-tbit'), 'tbit: a value is required');
  await page.selectOption('[name="fill"]', '');
  await page.selectOption('[name="consume"]', 'hard');
  await fill(page, '[name="tbit"]', '400ps');
  assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
  assert.equal(await page.$eval('[name="tconv"]', (e) => e.closest('.field').dataset.unused), 'yes');
  assert.match(page.url(), /timing=sync/);
  await context.close();
});

test('the comparator opens in the converter with its tau, decision level, gain and rate', async () => {
  const { context, page } = await open(env.browser, fileUrl('comparator.html'));
  await fill(page, '[name="tau"]', '');
  await fill(page, '[name="cl"]', '20f');
  await fill(page, '[name="gm"]', '2m');
  await fill(page, '[name="g0"]', '0.4m');
  await fill(page, '[name="vmin"]', '0.3');
  await fill(page, '[name="gain"]', '6');
  await fill(page, '[name="fs"]', '40MHz');
  await Promise.all([page.waitForNavigation(), page.click('#to-converter')]);
  await page.waitForSelector('body[data-ready="yes"]');
  assert.match(page.url(), /converter\.html/);
  assert.equal(await page.inputValue('[name="tau"]'), '');
  assert.equal(await page.inputValue('[name="cl"]'), '20f');
  assert.equal(await page.inputValue('[name="vmin"]'), '0.3');
  assert.equal(await page.inputValue('[name="gain"]'), '6');
  assert.equal(await page.inputValue('[name="fs"]'), '40MHz');
  // The rest is the converter's own last case (here its demo).
  assert.equal(await page.inputValue('[name="bits"]'), '10');
  assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
  const out = await outputs(page);
  assert.ok(Math.abs(Number(out.tau_s.value) / 12.5e-12 - 1) < 1e-12, out.tau_s.value);
  await context.close();
});
