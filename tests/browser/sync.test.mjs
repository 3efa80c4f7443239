// Real-browser tests of the synchronizer page (dist/index.html), from file:// and served.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import path from 'node:path';
import { setup, open, fileUrl, outputs, root, cli, inked, CANVAS_RATIO_ABS, fill, settle } from './harness.mjs';

const env = setup({ before, after });

for (const where of ['file', 'served']) {
  test(`loads cleanly ${where === 'file' ? 'from file://' : 'from the server'}: results, plots, no errors, no network`, async () => {
    const url = where === 'file' ? fileUrl('index.html') : env.server.url + 'index.html';
    const { context, page, problems, foreign } = await open(env.browser, url);
    const out = await outputs(page);
    assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
    assert.match(out.log10_mtbf_years.text, /years/);
    assert.ok(Number.isFinite(Number(out.log10_mtbf_s.value)));
    for (const id of ['plot-stages', 'plot-fclk', 'plot-tau']) {
      assert.equal(await page.$eval(`#${id}`, (c) => c.dataset.drawn), 'yes', id);
      assert.ok(await inked(page, id) > 2000, `${id} is blank`);
    }
    assert.match(await page.textContent('#caution'), /first-order estimates/);
    assert.deepEqual(problems, []);
    assert.deepEqual(foreign, []);
    await context.close();
  });
}

test('a bookmarked URL gives the same log10_mtbf_s as the command line', async () => {
  const cases = [
    { tau: '20ps', tw: '40ps', fclk: '1GHz', fdata: '100MHz', stages: '2', tsu: '30ps', tcq: '50ps' },
    { tau: '150p', tw: '60p', fclk: '800meg', fdata: '200M', stages: '3', tsu: '40p', tcq: '70p', 'target-fit': '10' },
    { tau: '1ps', tw: '40ps', fclk: '1GHz', fdata: '100MHz', stages: '1000', tsu: '30ps', tcq: '50ps' },
    { tau: '0.5ns', t0: '0.1ns', fclk: '50MHz', fdata: '5MHz', tr: '35ns' },
  ];
  for (const c of cases) {
    const q = new URLSearchParams(c).toString();
    const { context, page } = await open(env.browser, fileUrl('index.html') + '?' + q);
    const out = await outputs(page);
    const want = cli('sync', Object.entries(c).flatMap(([k, v]) => [`--${k}`, v]));
    assert.equal(Number(out.log10_mtbf_s.value), want.log10_mtbf_s, q);
    assert.equal(Number(out.log10_fit.value), want.log10_fit, q);
    assert.equal(Number(out.resolution_time_s.value), want.resolution_time_s, q);
    for (const [k, v] of Object.entries(c)) assert.equal(await page.inputValue(`[name="${k}"]`), v, k);
    await context.close();
  }
});

test('typing updates results, plots and the URL; reload restores the case', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('index.html'));
  const before = await outputs(page);
  const pixels = await page.$eval('#plot-stages', (c) => c.toDataURL());
  const entries = await page.evaluate(() => history.length);
  await fill(page, '[name="stages"]', '3');
  await fill(page, '[name="tsu"]', '31ps');
  await fill(page, '[name="tsu"]', '30ps');
  // The history is replaced, not extended, on each edit.
  assert.equal(await page.evaluate(() => history.length), entries);
  const after = await outputs(page);
  assert.ok(Number(after.log10_mtbf_s.value) > Number(before.log10_mtbf_s.value) + 10);
  assert.notEqual(await page.$eval('#plot-stages', (c) => c.toDataURL()), pixels);
  assert.match(page.url(), /[?&]stages=3(&|$)/);
  assert.match(page.url(), /[?&]tau=20ps(&|$)/);
  await page.reload();
  await page.waitForSelector('body[data-ready="yes"]');
  assert.equal(await page.inputValue('[name="stages"]'), '3');
  assert.equal((await outputs(page)).log10_mtbf_s.value, after.log10_mtbf_s.value);
  assert.deepEqual(problems, []);
  await context.close();
});

test('without a query the last case comes back from local storage', async () => {
  const { context, page } = await open(env.browser, env.server.url + 'index.html');
  await fill(page, '[name="fdata"]', '37MHz');
  await page.goto(env.server.url + 'index.html');
  await page.waitForSelector('body[data-ready="yes"]');
  assert.equal(await page.inputValue('[name="fdata"]'), '37MHz');
  await context.close();
});

test('bad values are flagged beside the field, kept as typed, and recover', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('index.html'));
  const cases = [
    ['fclk', '5ns', "fclk: '5ns' is a time, expected a frequency"],
    ['tau', '-3p', 'tau: negative time'],
    ['tau', 'NaN', "tau: 'NaN' is not a finite number"],
    ['stages', '2.5', "stages: '2.5' is not a whole number"],
    ['tau', '1e999', "tau: '1e999' is too large to represent"],
    ['fclk', '20GHz', 'fclk: clock period 50 ps is not longer than tsu + tcq = 80 ps: no time is left to resolve'],
    ['tau', '', 'tau: a value is required'],
  ];
  for (const [name, value, msg] of cases) {
    const good = await page.inputValue(`[name="${name}"]`);
    await fill(page, `[name="${name}"]`, value);
    assert.equal(await page.textContent(`#m-${name}`), msg);
    assert.equal(await page.getAttribute(`[name="${name}"]`, 'aria-invalid'), 'true');
    assert.equal(await page.inputValue(`[name="${name}"]`), value);
    assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'no');
    assert.equal((await outputs(page)).log10_mtbf_s.value, '');
    assert.equal(await page.$eval('#plot-tau', (c) => c.parentNode.dataset.stale), 'yes');
    await fill(page, `[name="${name}"]`, good);
    assert.equal(await page.getAttribute(`[name="${name}"]`, 'aria-invalid'), null);
    assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
  }
  assert.deepEqual(problems, []);
  await context.close();
});

test('invalid values in a link stay in their field; unknown keys are noted', async () => {
  const { context, page } = await open(env.browser, fileUrl('index.html') + '?tau=fast&tw=40ps&fclk=1GHz&fdata=100MHz&stages=2&tsu=30ps&tcq=50ps&colour=teal');
  assert.equal(await page.inputValue('[name="tau"]'), 'fast');
  assert.match(await page.textContent('#m-tau'), /'fast' is not a number/);
  assert.match(await page.textContent('#ignored'), /colour/);
  assert.equal(await page.isVisible('#ignored'), true);
  await context.close();
});

test('a hostile query executes nothing and is shown as text', async () => {
  const evil = '<img src=x onerror="window.__owned=1">';
  const q = new URLSearchParams({ tau: evil, tw: '40ps', fclk: '1GHz', fdata: '100MHz', stages: '2', tsu: '30ps', tcq: '50ps', [evil]: '1' });
  const { context, page, foreign } = await open(env.browser, fileUrl('index.html') + '?' + q);
  await page.waitForTimeout(200);
  assert.equal(await page.evaluate(() => window.__owned), undefined);
  assert.equal(await page.$$eval('img', (x) => x.length), 0);
  assert.equal(await page.inputValue('[name="tau"]'), evil);
  assert.ok((await page.textContent('#m-tau')).includes(evil));
  assert.deepEqual(foreign, []);
  await context.close();
});

test('readable at 320 px and on a large monitor; a high-DPI canvas is crisp', async () => {
  for (const [width, scale] of [[320, 1], [2560, 1], [1280, 2], [1280, 1]]) {
    const { context, page, problems } = await open(env.browser, fileUrl('index.html'), { width, scale });
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    assert.ok(overflow <= 0, `${width}px: page is ${overflow}px too wide`);
    const ratio = await page.$eval('#plot-stages', (c) => c.width / c.clientWidth);
    assert.ok(Math.abs(ratio - scale) < CANVAS_RATIO_ABS, `canvas backing ratio ${ratio} at dpr ${scale}`);
    if (process.env.UPDATE_SCREENSHOTS && width === 1280 && scale === 1) {
      await page.screenshot({ path: path.join(root, 'docs/sync-page.png'), fullPage: true });
    }
    assert.deepEqual(problems, []);
    await context.close();
  }
});

test('keyboard: every input is labelled and reachable with Tab', async () => {
  const { context, page } = await open(env.browser, fileUrl('index.html'));
  const unlabeled = await page.$$eval('input[name]', (els) => els.filter((e) => !e.labels || e.labels.length === 0).map((e) => e.name));
  assert.deepEqual(unlabeled, []);
  await page.focus('[name="tau"]');
  await page.keyboard.press('Tab');
  assert.equal(await page.evaluate(() => document.activeElement.name), 'tw');
  await context.close();
});

test('CSV and PNG downloads carry the plot data', async () => {
  const { context, page } = await open(env.browser, env.server.url + 'index.html');
  const [csv] = await Promise.all([page.waitForEvent('download'), page.click('[data-csv="plot-stages"]')]);
  const text = await (await csv.createReadStream()).toArray();
  const lines = Buffer.concat(text).toString('utf8').trim().split('\n');
  // The case first: what was plotted, every input with its unit, and the link.
  assert.equal(lines[0], '# latchwise sync: MTBF against synchronizer depth');
  assert.ok(lines.includes('# tau = 20 ps'), lines.join('\n'));
  assert.ok(lines.some((l) => l.startsWith('# link: http://127.0.0.1:') && l.includes('tau=20ps')), lines.join('\n'));
  const header = lines.findIndex((l) => !l.startsWith('#'));
  assert.equal(lines[header], 'stages,log10_mtbf_years');
  assert.match(lines[header + 1], /^1,-?\d(\.\d+)?e-?\d+$/);
  assert.ok(lines.length - header >= 7);
  const [png] = await Promise.all([page.waitForEvent('download'), page.click('[data-png="plot-tau"]')]);
  assert.equal(png.suggestedFilename(), 'plot-tau.png');
  // The whole report as JSON, the figures of the outputs on the page.
  const [json] = await Promise.all([page.waitForEvent('download'), page.click('[data-report]')]);
  assert.equal(json.suggestedFilename(), 'sync-report.json');
  const doc = JSON.parse(Buffer.concat(await (await json.createReadStream()).toArray()).toString('utf8'));
  assert.equal(doc.calculator, 'sync');
  const out = await outputs(page);
  assert.equal(doc.report.log10_mtbf_years, Number(out.log10_mtbf_years.value));
  await context.close();
});

test('both pages print as one-page reports with inputs, results and plots', async () => {
  for (const file of ['index.html', 'comparator.html']) {
    const { context, page } = await open(env.browser, fileUrl(file));
    await page.emulateMedia({ media: 'print' });
    assert.equal(await page.isVisible('.plots canvas'), true);
    assert.equal(await page.isVisible('.results'), true);
    assert.equal(await page.isVisible('#copy-link'), false);
    const pdf = (await page.pdf({ format: 'A4' })).toString('latin1');
    const pages = (pdf.match(/\/Type\s*\/Page[^s]/g) || []).length;
    assert.equal(pages, 1, `${file} prints on ${pages} pages`);
    await context.close();
  }
});

test('copy link gives the full case, through the clipboard or a selectable box', async () => {
  const { context, page } = await open(env.browser, env.server.url + 'index.html');
  await context.grantPermissions(['clipboard-read', 'clipboard-write'], { origin: env.server.url.replace(/\/$/, '') });
  await fill(page, '[name="stages"]', '4');
  await page.click('#copy-link');
  await page.waitForFunction(() => document.getElementById('copy-status').textContent !== '');
  const link = await page.inputValue('#link-text');
  assert.match(link, /^http:\/\/127\.0\.0\.1:\d+\/index\.html\?.*stages=4/);
  const status = await page.textContent('#copy-status');
  if (status === 'Link copied.') {
    assert.equal(await page.evaluate(() => navigator.clipboard.readText()), link);
  } else {
    assert.equal(await page.isVisible('#link-text'), true);
  }
  await context.close();
});
