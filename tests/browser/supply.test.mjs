// Real-browser tests of the operating-points page (dist/supply.html).
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { setup, open, fileUrl, outputs, root, cli, inked, WASM_LIBM_REL, fill } from './harness.mjs';

const env = setup({ before, after });
const demoArgs = [path.join(root, 'examples/supply-char.csv'), '--points', path.join(root, 'examples/supply-points.csv'),
  '--ss', '62.5mV', '--dvt', '20mV', '--fdata', '20MHz', '--stages', '2', '--target-years', '1e4'];

for (const where of ['file', 'served']) {
  test(`operating-points page loads cleanly ${where === 'file' ? 'from file://' : 'from the server'}`, async () => {
    const url = where === 'file' ? fileUrl('supply.html') : env.server.url + 'supply.html';
    const { context, page, problems, foreign } = await open(env.browser, url);
    assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
    for (const id of ['plot-tau', 'plot-mtbf', 'plot-stages']) {
      assert.equal(await page.$eval(`#${id}`, (c) => c.dataset.drawn), 'yes', id);
      assert.ok(await inked(page, id) > 1000, `${id} is blank`);
    }
    const rows = await page.$$eval('#results-table tbody tr', (trs) => trs.map((tr) => Array.from(tr.cells, (c) => c.textContent)));
    assert.equal(rows.length, 8);
    assert.deepEqual([...new Set(rows.map((r) => r[5]))].sort(), ['bounded', 'characterised', 'held', 'interpolated']);
    assert.match(await page.textContent('#caution'), /first-order estimates/);
    if (process.env.UPDATE_SCREENSHOTS && where === 'file') {
      await page.screenshot({ path: path.join(root, 'docs/supply-page.png'), fullPage: true });
    }
    assert.deepEqual(problems, []);
    assert.deepEqual(foreign, []);
    await context.close();
  });
}

test('the page agrees with latchwise supply --json, and its corners CSV with --corners-out', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('supply.html'));
  await fill(page, '[name="domain"]', 'cpu');
  const out = await outputs(page);
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'latchwise-')), 'corners.csv');
  const want = cli('supply', [...demoArgs, '--domain', 'cpu', '--corners-out', file]);
  assert.equal(out.worst_point.text, want.worst_point);
  for (const k of ['log10_fit_worst', 'log10_mtbf_years_worst', 'log10_fit_weighted', 'ageing_factor', 'margin_decades']) {
    const got = Number(out[k].value);
    assert.ok(Math.abs(got - want[k]) <= WASM_LIBM_REL * Math.max(1, Math.abs(want[k])), `${k}: page ${got}, CLI ${want[k]}`);
  }
  assert.equal(out.meets_target.value === '1', want.meets_target);
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('[data-results]')]);
  assert.equal(dl.suggestedFilename(), 'supply-corners.csv');
  const got = fs.readFileSync(await dl.path(), 'utf8').trim().split('\n');
  const wantCsv = fs.readFileSync(file, 'utf8').trim().split('\n');
  assert.equal(got[1], 'corner,tau,tw,tsu,tcq,fclk@cpu');
  assert.equal(got.length, wantCsv.length);
  for (let i = 2; i < got.length; i++) {
    const [g, w] = [got[i].split(','), wantCsv[i].split(',')];
    assert.equal(g[0], w[0]);
    for (let k = 1; k < g.length; k++) assert.ok(Math.abs(Number(g[k]) / Number(w[k]) - 1) <= WASM_LIBM_REL, `${g[0]} ${k}: ${g[k]} / ${w[k]}`);
  }
  assert.deepEqual(problems, []);
  await context.close();
});

test('each bad value is named at its field or line, and keeps what was typed', async () => {
  const { context, page } = await open(env.browser, fileUrl('supply.html'));
  const bad = [
    ['ss', '-5mV', /^ss: negative/],
    ['ss', '', /^ss: needed for (dvt|point standby at 500 mV)/],
    ['dvt', '2 kV', /^dvt: /],
    ['domain', 'cpu,gpu', /^domain: /],
    ['fdata', 'fast', /^fdata: /],
    ['stages', '0', /^stages: /],
  ];
  for (const [name, value, re] of bad) {
    const before = await page.inputValue(`[name="${name}"]`);
    await fill(page, `[name="${name}"]`, value);
    assert.match(await page.textContent(`#m-${name}`), re, `${name}=${value}`);
    assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'no', `${name}=${value}`);
    assert.equal(await page.inputValue(`[name="${name}"]`), value);
    await fill(page, `[name="${name}"]`, before);
  }
  const points = await page.inputValue('[name="points"]');
  await fill(page, '[name="points"]', points.replace('eco,0.6,350MHz,0.3', 'eco,0,350MHz,0.3'));
  assert.match(await page.textContent('#m-points'), /points, line \d+, column vdd/);
  await fill(page, '[name="points"]', points.replace('eco,0.6,350MHz,0.3', 'eco,0.6,350MHz,0.4'));
  assert.match(await page.textContent('#m-points'), /the residencies sum to 1.1, not 1/);
  await fill(page, '[name="points"]', points);
  const char = await page.inputValue('[name="char"]');
  await fill(page, '[name="char"]', char + '0.9,-40,13ps,19.2ps,24ps,40ps\n');
  assert.match(await page.textContent('#m-char'), /characterised twice at -40 °C with different values/);
  assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'no');
  await context.close();
});
