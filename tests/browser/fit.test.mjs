// Real-browser tests of the fit page: the three experiments from their demos, the page
// against the command line, errors with line and column, and the links into the calculators.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import path from 'node:path';
import { setup, open, fileUrl, outputs, root, cli, fill, settle, inked, dropFile, WASM_LIBM_REL, WASM_DEVIANCE_REL } from './harness.mjs';

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
  assert.match(await page.textContent('#facts'), /Left out: line 6/);
  const href = await page.$eval('#links a', (a) => a.getAttribute('href'));
  assert.match(href, /^index\.html\?from=characterize&tau=1\.60\d+e-11&tw=2\.9\d+e-11&tr-max=\d\.\d+e-11$/);
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

test('a fit opens the synchronizer over its last case, and joins the budget as a corner beside the stored ones', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('index.html'));
  // The synchronizer's own case: a 800 MHz clock and three stages, kept by the page.
  await fill(page, '[name="fclk"]', '800MHz');
  await fill(page, '[name="stages"]', '3');
  await settle(page);
  await page.goto(fileUrl('characterize.html'));
  await page.waitForSelector('body[data-ready="yes"]');
  const fit = cli('fit', ['counts', path.join(root, 'examples/fit-counts.csv'), '--fclk', '1GHz', '--fdata', '50MHz']);
  const texts = await page.$$eval('#links a', (a) => a.map((x) => x.textContent));
  assert.match(texts[1], /joint 95 % region's worst point for tr = 380 ps/);
  await Promise.all([page.waitForNavigation(), page.click('#links li:nth-child(1) a')]);
  await page.waitForSelector('body[data-ready="yes"]');
  assert.equal(await page.inputValue('[name="fclk"]'), '800MHz');
  assert.equal(await page.inputValue('[name="stages"]'), '3');
  // The link carries nine significant digits: the fitted tau arrives as the fit found it.
  assert.ok(Math.abs(Number(await page.inputValue('[name="tau"]')) - fit.tau_s) <= 1e-8 * fit.tau_s);
  assert.equal(await page.inputValue('[name="tr-max"]'), fit.tr_max_s.toExponential(8));
  assert.equal(await page.getAttribute('body', 'data-valid'), 'yes');
  // Into the budget: its demo corners stay, the fit's corner joins them with the range its
  // data cover, and the uncertainty with its correlation fills the budget's fields.
  await page.goto(fileUrl('characterize.html'));
  await page.waitForSelector('body[data-ready="yes"]');
  await Promise.all([page.waitForNavigation(), page.click('#links li:nth-child(3) a')]);
  await page.waitForSelector('body[data-ready="yes"]');
  const corners = await page.inputValue('[name="corners"]');
  assert.match(corners, /^corner,tau,tw,tsu,tcq,tau@fastsync,tr_max$/m);
  assert.match(corners, /^low_v_cold,24ps,30ps,40ps,70ps,21ps,$/m);
  const lab = ['lab', fit.tau_s.toExponential(8), fit.tw_s.toExponential(8), '', '', '', fit.tr_max_s.toExponential(8)];
  assert.ok(corners.split('\n').includes(lab.join(',')), corners);
  assert.equal(await page.inputValue('[name="tau-tw-corr"]'), fit.corr_ln_tau_ln_tw.toFixed(6));
  assert.ok(Math.abs(Number(await page.inputValue('[name="tau-sigma"]')) - fit.sd_ln_tau) <= 1e-4 * fit.sd_ln_tau);
  assert.match(await page.textContent('#ignored'), /Corner "lab" added from the fit/);
  // The corner lacks the timing the rows need: said once, at its line.
  assert.match(await page.textContent('#m-corners'), /corners, line 8, column tcq: corner lab gives no tcq, which 24 of the design's rows need/);
  assert.deepEqual(problems, []);
  await context.close();
});

test('a fit joins stored corners in their own delimiter, and a quoted name stays one cell', async () => {
  const corners = 'corner;tau;tw;tsu;tcq\ntt;20ps;30ps;30ps;50ps\n"ss; 0.9V";35ps;45ps;45ps;80ps\n';
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  // The engineer's own corners, dropped as a file: the page keeps them as its last case.
  await dropFile(page, '#grid-corners', corners, 'corners.csv');
  await page.waitForFunction(() => document.querySelector('#grid-corners .grid-count').textContent === '2 rows');
  await settle(page);
  assert.equal(await page.inputValue('[name="corners"]'), corners);
  await page.goto(fileUrl('characterize.html'));
  await page.waitForSelector('body[data-ready="yes"]');
  const fit = cli('fit', ['counts', path.join(root, 'examples/fit-counts.csv'), '--fclk', '1GHz', '--fdata', '50MHz']);
  await Promise.all([page.waitForNavigation(), page.click('#links li:nth-child(3) a')]);
  await page.waitForSelector('body[data-ready="yes"]');
  const e = (x) => x.toExponential(8);
  // The table gains the tr_max column; every row keeps its cells, the quoted name its quotes.
  assert.equal(await page.inputValue('[name="corners"]'), [
    'corner;tau;tw;tsu;tcq;tr_max',
    'tt;20ps;30ps;30ps;50ps;',
    '"ss; 0.9V";35ps;45ps;45ps;80ps;',
    `lab;${e(fit.tau_s)};${e(fit.tw_s)};;;${e(fit.tr_max_s)}`,
    '',
  ].join('\n'));
  assert.equal(await page.textContent('#grid-corners .grid-count'), '3 rows');
  assert.deepEqual(problems, []);
  await context.close();
});

test('a link that leaves out a choice the core has a default for shows that default, and a far-out count is named', async () => {
  const data = (await import('node:fs')).readFileSync(path.join(root, 'examples/fit-counts.csv'), 'utf8')
    .replace('\n220ps,50,10s\n', '\n220ps,500,10s\n');
  const q = new URLSearchParams({ kind: 'counts', data, fclk: '1GHz', fdata: '50MHz' });
  const { context, page } = await open(env.browser, fileUrl('characterize.html') + '?' + q);
  // The core reads no window as tw: the choice says so instead of standing blank.
  assert.equal(await page.$eval('#f-window', (s) => s.value), 'tw');
  assert.notEqual(await page.$eval('#f-window', (s) => s.selectedIndex), -1);
  const out = await outputs(page);
  assert.match(out.tw_s.text, / ps$/);
  assert.match(await page.textContent('body'),
    /Line 7 \(500 failures, where the fit without it expects 50\.9\) stands far out of the fit/);
  await context.close();
});
