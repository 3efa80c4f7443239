// Real-browser tests of the design budget page: the demo chip against the command line,
// bad values flagged at their field, and names from a pasted design shown as text.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import path from 'node:path';
import fs from 'node:fs';
import os from 'node:os';
import { setup, open, fileUrl, outputs, root, cli, fill, inked, settle } from './harness.mjs';

const env = setup({ before, after });

// The design and corners show as tables; their CSV text is one click away, where a
// person types or pastes it.
async function typeText(page, name, value) {
  const toText = `#grid-${name} [data-view="text"]`;
  if (await page.getAttribute(toText, 'aria-pressed') !== 'true') await page.click(toText);
  await fill(page, `[name="${name}"]`, value);
}

test('the demo chip gives the command line\'s numbers, with its plots', async () => {
  const { context, page, problems, foreign } = await open(env.browser, fileUrl('budget.html'));
  const out = await outputs(page);
  const want = cli('budget', [path.join(root, 'examples/budget-design.csv'), '--corners', path.join(root, 'examples/budget-corners.csv'),
    '--budget-fit', '10', '--tau-sigma', '0.05', '--tw-sigma', '0.3']);
  for (const k of ['log10_total_fit', 'margin_decades', 'log10_total_fit_p95', 'log10_total_fit_after_fix']) {
    assert.equal(Number(out[k].value), want[k], k);
  }
  assert.equal(out.worst_corner.text, want.worst_corner);
  assert.match(out.meets_budget.text, /^missed at the 95th percentile by 6\.91 decades$/);
  for (const id of ['plot-rows', 'plot-corners', 'plot-spread']) assert.ok(await inked(page, id) > 1000, id);
  if (process.env.UPDATE_SCREENSHOTS) {
    await page.selectOption('#grid-design select', 'share');
    await page.screenshot({ path: path.join(root, 'docs/budget-page.png'), fullPage: true });
  }
  assert.deepEqual(problems, []);
  assert.deepEqual(foreign, []);
  await context.close();
});

test('bad values are flagged at their field and hostile names stay text', async () => {
  const { context, page } = await open(env.browser, fileUrl('budget.html'));
  await fill(page, '[name="budget-fit"]', '-1');
  assert.match(await page.textContent('#m-budget-fit'), /budget-fit: negative/);
  await fill(page, '[name="budget-fit"]', '10');
  await fill(page, '[name="tau-sigma"]', 'wide');
  assert.match(await page.textContent('#m-tau-sigma'), /'wide' is not a number/);
  await fill(page, '[name="tau-sigma"]', '0.05');
  await typeText(page, 'corners', 'corner,tau,tw,tsu,tcq\nslow,20ps,30ps,30ps,40ps\nslow,24ps,30ps,30ps,40ps\n');
  assert.match(await page.textContent('#m-corners'), /corners, line 3, column corner: 'slow' is named twice/);
  await typeText(page, 'corners', 'corner,tau,tw,tsu,tcq\nslow,20ps,30ps,30ps,40ps\n');
  const evil = '<img src=x onerror="window.__owned=1">';
  await typeText(page, 'design', `name,fclk,fdata,stages\n"${evil.replace(/"/g, '""')}",1GHz,100MHz,1\n`);
  assert.equal(await page.evaluate(() => window.__owned), undefined);
  assert.match(await page.textContent('output[name="worst_offenders"]'), /<img src=x onerror="window.__owned=1"> \(100 %\)/);
  assert.equal(await page.$$eval('.results img', (e) => e.length), 0);
  // In the table the name is a cell's text, never markup.
  await page.click('#grid-design [data-view="table"]');
  assert.equal(await page.inputValue('#grid-design tr[data-row="0"] input[data-col="0"]'), evil);
  assert.equal(await page.$$eval('#grid-design img, #grid-corners img', (e) => e.length), 0);
  assert.equal(await page.evaluate(() => window.__owned), undefined);
  await context.close();
});

test('design and corners round-trip through CSV files; the JSON export is the command line\'s', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  const before = await outputs(page);
  const design = await page.inputValue('[name="design"]');
  const [saved] = await Promise.all([page.waitForEvent('download'), page.click('[data-save="design"]')]);
  assert.equal(saved.suggestedFilename(), 'budget-design.csv');
  const savedPath = await saved.path();
  assert.equal(fs.readFileSync(savedPath, 'utf8'), design);
  // Replace the design, then open the saved file: the same results come back.
  await typeText(page, 'design', 'name,fclk,fdata,stages\nonly,1GHz,100MHz,3\n');
  assert.notEqual((await outputs(page)).log10_total_fit.value, before.log10_total_fit.value);
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.click('[data-open="design"]')]);
  await chooser.setFiles(savedPath);
  await page.waitForFunction((d) => document.querySelector('[name="design"]').value === d, design);
  await settle(page); // the results follow in the next frame
  const after = await outputs(page);
  for (const k of Object.keys(before)) assert.equal(after[k].value, before[k].value, k);
  // The JSON export carries the same report as `latchwise budget --json`.
  const [json] = await Promise.all([page.waitForEvent('download'), page.click('[data-report]')]);
  assert.equal(json.suggestedFilename(), 'budget-report.json');
  const doc = JSON.parse(fs.readFileSync(await json.path(), 'utf8'));
  const want = cli('budget', [path.join(root, 'examples/budget-design.csv'), '--corners', path.join(root, 'examples/budget-corners.csv'),
    '--budget-fit', '10', '--tau-sigma', '0.05', '--tw-sigma', '0.3']);
  // Same keys, same text; numbers to 1e-12 relative (the page's exp and log are the
  // WebAssembly build's, which may differ from the native ones in the last bit).
  // The command's audit stamp stands beside its report; the page's export has the
  // version beside its report too, and the link in place of the files' digest.
  assert.equal(doc.version, want.version);
  assert.match(want.input_sha256, /^[0-9a-f]{64}$/);
  delete want.version;
  delete want.input_sha256;
  assertClose(doc.report, want, 'report');
  assert.equal(doc.calculator, 'budget');
  assert.match(doc.link, /budget\.html\?/);
  // With a bad input there is no report: a note says why, nothing is downloaded.
  await fill(page, '[name="budget-fit"]', 'lots');
  await page.click('[data-report]');
  assert.match(await page.textContent('#ignored'), /no report to export/);
  assert.deepEqual(problems, []);
  await context.close();
});

function assertClose(got, want, where) {
  if (typeof want === 'number' && typeof got === 'number') {
    assert.ok(Math.abs(got - want) <= 1e-12 * Math.max(Math.abs(want), Math.abs(got)), `${where}: ${got} vs ${want}`);
  } else if (want !== null && typeof want === 'object') {
    assert.equal(typeof got, 'object', where);
    assert.deepEqual(Object.keys(got).sort(), Object.keys(want).sort(), where);
    for (const k of Object.keys(want)) assertClose(got[k], want[k], `${where}.${k}`);
  } else {
    assert.equal(got, want, where);
  }
}

test('a design too large for a link says so and points to the CSV files', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  await page.click('#copy-link');
  assert.doesNotMatch(await page.textContent('#copy-status'), /too long/);
  // Printed, the design and corners are text in full (a text area prints its view only).
  const demo = (await page.inputValue('[name="design"]')).trim();
  await page.pdf({ format: 'A4' });
  assert.equal((await page.textContent('pre.print-text')).trim(), demo);
  // A link under 8,000 characters is printed in full.
  assert.match(await page.textContent('#print-stamp'), /budget\.html\?[^ ]*design=~1[-\w]+/);
  // Packed, 400 alike rows make a short link; a design of 2,000 rows with names and
  // rates that do not repeat does not fit in one.
  let design = 'name,fclk,fdata,stages,count\n';
  for (let i = 0; i < 400; i++) design += `bus_${i},1.2GHz,20MHz,2,8\n`;
  await typeText(page, 'design', design);
  assert.equal(await page.textContent('output[name="worst_corner"]'), 'low_v_cold');
  // The fix plan names the first changes and counts the rest, rather than 400 of them.
  assert.match(await page.textContent('#facts'), /Fix plan \(400 crossings\): bus_0 to 3 stages, .* and 388 more; the JSON report lists every change\./);
  await page.click('#copy-link');
  assert.doesNotMatch(await page.textContent('#copy-status'), /too long/);
  let lcg = 12345;
  const next = () => (lcg = (lcg * 1103515245 + 12345) % 2147483648);
  design = 'name,fclk,fdata,stages,count\n';
  for (let i = 0; i < 2000; i++) design += `n${next().toString(36)},1.2GHz,${next() % 99991}Hz,2,${1 + next() % 64}\n`;
  await typeText(page, 'design', design);
  await page.click('#copy-link');
  assert.match(await page.textContent('#copy-status'), /link of \d+ characters, too long to share reliably.*Save CSV/);
  assert.equal(await page.isVisible('#link-text'), false);
  await page.pdf({ format: 'A4' });
  assert.match(await page.textContent('pre.print-text'), /\n… and 1881 more lines \(Save CSV has them all\)$/);
  // Beyond 8,000 characters the print carries the case's digest and the way to keep it.
  assert.match(await page.textContent('#print-stamp'),
    /budget\.html \(the link would have [\d,]+ characters; SHA-256 of the case [0-9a-f]{64}; keep the design and corners as CSV files: Save CSV\)$/);
  assert.match(await page.textContent(".reviewed"), /^Reviewed by _+\s+Date _+$/);
  assert.deepEqual(problems, []);
  await context.close();
});

test('the headline follows the signed-off statistic: the 95th percentile with sigmas, or nominal by choice', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  await fill(page, '[name="budget-fit"]', '1e7');
  let out = await outputs(page);
  assert.match(out.meets_budget.text, /^missed at the 95th percentile by 0\.91 decades$/);
  assert.equal(out.meets_budget.state, 'bad');
  await page.selectOption('[name="signoff"]', 'nominal');
  await settle(page);
  out = await outputs(page);
  assert.match(out.meets_budget.text, /^met by 0\.15 decades$/);
  assert.match(await page.textContent('#warnings'), /signoff=nominal was chosen/);
  // The same as the command line says.
  const want = cli('budget', [path.join(root, 'examples/budget-design.csv'), '--corners', path.join(root, 'examples/budget-corners.csv'),
    '--budget-fit', '1e7', '--tau-sigma', '0.05', '--tw-sigma', '0.3', '--signoff', 'nominal', '--devices', '1e6', '--service-years', '10']);
  assert.equal(Number(out.margin_decades.value), want.margin_decades);
  assert.deepEqual(problems, []);
  await context.close();
});

test('Results CSV: every crossing at every corner, as the command line writes it', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click('[data-results]')]);
  assert.equal(dl.suggestedFilename(), 'budget-results.csv');
  const got = fs.readFileSync(await dl.path(), 'utf8').trim().split('\n');
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'latchwise-')), 'results.csv');
  cli('budget', [path.join(root, 'examples/budget-design.csv'), '--corners', path.join(root, 'examples/budget-corners.csv'),
    '--budget-fit', '10', '--tau-sigma', '0.05', '--tw-sigma', '0.3', '--devices', '1e6', '--service-years', '10', '--results', file]);
  const want = fs.readFileSync(file, 'utf8').trim().split('\n');
  assert.equal(got.length, want.length);
  assert.equal(got[0], 'name,"note",corner,log10_fit,fit,share,stages,stages_after_fix,flip_flops_added');
  // The demo's notes (second column, no commas in them) aside, cell by cell.
  const cells = (l) => l.split(',').filter((_, k) => k !== 1);
  for (let i = 1; i < want.length; i++) {
    const [g, w] = [cells(got[i]), cells(want[i])];
    assert.equal(got[i].split(',')[1], want[i].split(',')[1]);
    assert.deepEqual([g[0], g[1], g[5], g[6], g[7]], [w[0], w[1], w[5], w[6], w[7]], want[i]);
    for (const c of [2, 4]) {
      assert.ok(Math.abs(Number(g[c]) - Number(w[c])) <= 1e-12 * Math.max(1, Math.abs(Number(w[c]))), `${got[i]} against ${want[i]}`);
    }
  }
  assert.deepEqual(problems, []);
  await context.close();
});
