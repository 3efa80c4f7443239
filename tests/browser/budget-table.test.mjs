// Real-browser tests of the budget page's tables: editing a cell, adding, duplicating,
// deleting and undoing rows, sorting by share, pasting CSV text, reload, a shared link,
// a link cut short, and a 10,000-row design with only the rows in view in the page.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import path from 'node:path';
import fs from 'node:fs';
import os from 'node:os';
import { setup, open, fileUrl, outputs, root, cli, fill, settle, dropFile } from './harness.mjs';

const env = setup({ before, after });
const corners = path.join(root, 'examples/budget-corners.csv');
const demoArgs = ['--corners', corners, '--budget-fit', '10', '--tau-sigma', '0.05', '--tw-sigma', '0.3'];

/** The command line's report for a design given as text. */
function cliFor(design) {
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'latchwise-')), 'design.csv');
  fs.writeFileSync(file, design);
  return cli('budget', [file, ...demoArgs]);
}

const cell = (row, col) => `#grid-design tr[data-row="${row}"] input[data-col="${col}"]`;
// The CSV text behind the table, once the table has written its edits into it (it does
// when typing pauses).
const designText = async (page) => {
  await page.waitForSelector('#grid-design:not([data-pending])', { state: 'attached' });
  return page.inputValue('[name="design"]');
};
const total = async (page) => Number((await outputs(page)).log10_total_fit.value);

test('a cell edited in the table changes its line of the CSV and the results, as the command line reads it', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  const before = await designText(page);
  const header = await page.$$eval('#grid-design thead th', (t) => t.map((x) => x.textContent));
  assert.deepEqual(header.slice(0, 6), ['line', 'name', 'fclk', 'fdata', 'stages', 'count']);
  // The count of the first crossing, core_irq_sync (16 instances), to 160.
  assert.equal(await page.inputValue(cell(0, 0)), 'core_irq_sync');
  assert.equal(await page.inputValue(cell(0, 4)), '16');
  await fill(page, cell(0, 4), '160');
  const after = await designText(page);
  const changed = before.split('\n').map((l, i) => [l, after.split('\n')[i]]).filter(([a, b]) => a !== b);
  assert.deepEqual(changed, [['core_irq_sync,1.2GHz,2MHz,2,16,1,,,,,,,,,', 'core_irq_sync,1.2GHz,2MHz,2,160,1,,,,,,,,,']]);
  const want = cliFor(after);
  assert.equal(await total(page), want.log10_total_fit);
  // Its figures beside it: FIT and share at the worst corner, as the report has them.
  const row = want.rows.find((r) => r.name === 'core_irq_sync');
  const figs = await page.$$eval('#grid-design tr[data-row="0"] td.figure', (t) => t.map((x) => x.textContent));
  assert.equal(figs[1], `${(100 * row.share).toFixed(1)} %`);
  // A bad cell is flagged in the table and beside the field, the rest of the page lives.
  await fill(page, cell(0, 1), 'fast');
  assert.match(await page.textContent('#m-design'), /line 7, column fclk: 'fast' is not a number/);
  assert.equal(await page.getAttribute('#grid-design tr[data-row="0"] td:nth-child(3)', 'class'), 'bad');
  assert.match(await page.getAttribute('#grid-design tr[data-row="0"]', 'class'), /bad/);
  await fill(page, cell(0, 1), '1.2GHz');
  assert.equal(await total(page), want.log10_total_fit);
  // Enter and the arrow keys move between rows, in the same column.
  await page.focus(cell(0, 2));
  await page.keyboard.press('Enter');
  assert.equal(await page.evaluate(() => document.activeElement.closest('tr').dataset.row + ':' + document.activeElement.dataset.col), '1:2');
  await page.keyboard.press('ArrowDown');
  await page.keyboard.press('ArrowUp');
  await page.keyboard.press('ArrowUp');
  assert.equal(await page.evaluate(() => document.activeElement.closest('tr').dataset.row + ':' + document.activeElement.dataset.col), '0:2');
  assert.deepEqual(problems, []);
  await context.close();
});

test('an edit draws its plots from the evaluation that gave its numbers, without handing the core the tables again', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  await page.evaluate(() => {
    window.calls = { draw_with: 0, draw: 0, draw_evaluation: 0 };
    for (const name of Object.keys(window.calls)) {
      const real = wasm_bindgen[name];
      wasm_bindgen[name] = function () { window.calls[name]++; return real.apply(this, arguments); };
    }
  });
  const drawnAt = await page.evaluate(() => document.body.dataset.drawnAt);
  await fill(page, cell(0, 4), '160');
  await page.waitForFunction((t) => document.body.dataset.drawnAt !== t, drawnAt);
  const calls = await page.evaluate(() => window.calls);
  assert.ok(calls.draw_evaluation >= 1, JSON.stringify(calls));
  assert.equal(calls.draw_with + calls.draw, 0, JSON.stringify(calls));
  const drawn = await page.$$eval('.plots canvas[data-drawn="yes"]', (c) => c.map((x) => x.id).sort());
  assert.ok(drawn.length >= 2, drawn.join());
  // The evaluation's number is the page state's; another number draws nothing, and the
  // page then draws from the query's parts.
  const id = Number(await page.evaluate(() => document.body.dataset.evaluation));
  assert.ok(id >= 2, String(id));
  assert.deepEqual((await page.evaluate((n) => wasm_bindgen.draw_evaluation('budget', n, 1), id)).sort(), drawn);
  assert.equal(await page.evaluate((n) => wasm_bindgen.draw_evaluation('budget', n + 1, 1), id), undefined);
  assert.equal(await page.evaluate((n) => wasm_bindgen.draw_evaluation('budget', n - 1, 1), id), undefined);
  // Once the core has evaluated another case (the JSON export's), the next draw of the
  // same numbers goes by the query's parts, and the plots are the same.
  await page.evaluate(() => wasm_bindgen.report('budget', 'design=name,fclk,fdata,stages%0Aa,1GHz,1MHz,2&tau=20ps&tw=40ps&tsu=30ps&tcq=50ps'));
  await page.evaluate(() => { window.calls.draw_with = 0; window.calls.draw = 0; });
  const again = await page.evaluate(() => document.body.dataset.drawnAt);
  await page.evaluate(() => window.dispatchEvent(new Event('resize')));
  await page.waitForFunction((t) => document.body.dataset.drawnAt !== t, again);
  const after = await page.evaluate(() => window.calls);
  assert.ok(after.draw_with + after.draw >= 1, JSON.stringify(after));
  assert.deepEqual(await page.$$eval('.plots canvas[data-drawn="yes"]', (c) => c.map((x) => x.id).sort()), drawn);
  assert.deepEqual(problems, []);
  await context.close();
});

test('the first paint has the results and the tables at their full size; the rows follow without moving anything', async () => {
  const context = await env.browser.newContext({ viewport: { width: 1280, height: 900 } });
  const page = await context.newPage();
  // What the page holds when its first task ends (the state its first paint shows): read
  // as the first result is recorded, in a microtask of that same task.
  await page.addInitScript(() => {
    new MutationObserver((changes, seen) => {
      if (!changes.some((c) => c.attributeName === 'data-first-result-ms')) return;
      seen.disconnect();
      const grid = document.querySelector('#grid-design .grid-scroll');
      window.atFirstResult = {
        verdict: document.querySelector('output[name="log10_total_fit"]').textContent,
        rows: document.querySelectorAll('#grid-design tbody tr:not(.spacer)').length,
        height: grid.getBoundingClientRect().height,
        below: document.querySelector('.plots').getBoundingClientRect().top,
      };
    }).observe(document, { attributes: true, subtree: true, attributeFilter: ['data-first-result-ms'] });
  });
  await page.goto(fileUrl('budget.html'));
  await page.waitForSelector('body[data-ready="yes"]');
  const first = await page.evaluate(() => window.atFirstResult);
  const grid = await page.$eval('#grid-design .grid-scroll', (g) => g.getBoundingClientRect().height);
  const below = await page.$eval('.plots', (p) => p.getBoundingClientRect().top);
  const rows = await page.$$eval('#grid-design tbody tr:not(.spacer)', (t) => t.length);
  assert.notEqual(first.verdict, '', 'the results are in before the first paint');
  assert.equal(first.rows, 0, 'the rows are drawn after the first paint');
  assert.ok(rows > 0);
  // The table's box had its full height already, so nothing below it moves when the rows
  // come (its scrolled content may differ by a border's pixel).
  assert.equal(first.height, grid);
  assert.equal(first.below, below);
  await context.close();
});

test('rows are added, duplicated, deleted and undone; the table sorts by share', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  const demo = await designText(page);
  const demoTotal = await total(page);
  const rows = () => page.textContent('#grid-design .grid-count');
  assert.equal(await rows(), '24 rows');
  // Add: a named row below the selected one, its empty cells flagged until filled.
  await page.click(cell(2, 0));
  await page.click('#grid-design [data-act="add"]');
  await settle(page);
  assert.equal(await rows(), '25 rows');
  assert.equal(await page.inputValue(cell(3, 0)), 'new-25');
  assert.match(await page.textContent('#m-design'), /line 10, column fclk: a value is required/);
  await fill(page, cell(3, 1), '1.2GHz');
  await fill(page, cell(3, 2), '50MHz');
  await fill(page, cell(3, 3), '2');
  await fill(page, cell(3, 4), '4');
  assert.equal((await designText(page)).split('\n')[9], 'new-25,1.2GHz,50MHz,2,4,,,,,,,,,,');
  assert.equal(await total(page), cliFor(await designText(page)).log10_total_fit);
  // Duplicate, then delete the copy.
  await page.click('#grid-design [data-act="duplicate"]');
  await settle(page);
  assert.equal(await rows(), '26 rows');
  assert.equal(await page.inputValue(cell(4, 0)), 'new-25-copy');
  await page.click('#grid-design [data-act="delete"]');
  await settle(page);
  assert.equal(await rows(), '25 rows');
  // Undo, step by step, back to the demo: delete, duplicate, four cells, add.
  for (let i = 0; i < 7; i++) await page.click('#grid-design [data-act="undo"]');
  await settle(page);
  assert.equal(await designText(page), demo);
  assert.equal(await total(page), demoTotal);
  assert.equal(await page.isDisabled('#grid-design [data-act="undo"]'), true);
  // Largest share first: the report's order.
  await page.selectOption('#grid-design select', 'share');
  await settle(page);
  const want = cliFor(demo).rows.slice().sort((a, b) => b.share - a.share).slice(0, 5).map((r) => r.name);
  const shown = await page.$$eval('#grid-design tbody tr[data-row] td:nth-child(2) input', (i) => i.slice(0, 5).map((x) => x.value));
  assert.deepEqual(shown, want);
  // The largest row edited down to nothing (six stages) holds its place while its cell
  // has the focus, then takes its new place when the focus leaves the table.
  const first = () => page.$eval('#grid-design tbody tr[data-row]', (t) => t.querySelector('input').value);
  const topRow = await page.$eval('#grid-design tbody tr[data-row]', (t) => t.dataset.row);
  await fill(page, cell(topRow, 3), '6');
  assert.equal(await first(), want[0]);
  await page.click('#results-h');
  await settle(page);
  assert.equal(await first(), want[1]);
  assert.deepEqual(problems, []);
  await context.close();
});

test('CSV pasted as text shows in the table; reload and a shared link bring the design back', async () => {
  const server = env.server.url + 'budget.html';
  for (const url of [fileUrl('budget.html'), server]) {
    const { context, page, problems } = await open(env.browser, url);
    await page.click('#grid-design [data-view="text"]');
    // Long enough for the link to pack it (a short table stays readable in the link).
    let design = 'name;fclk;fdata;stages;count\n# our bus\nrx_bus;1.2GHz;80MHz;2;32\n\ntx_ack;400MHz;1kHz;3;1\n';
    for (let i = 0; i < 8; i++) design += `lane_${i};1.2GHz;${10 + i}MHz;2;4\n`;
    await fill(page, '[name="design"]', design);
    await page.click('#grid-design [data-view="table"]');
    assert.equal(await page.textContent('#grid-design .grid-count'), '10 rows');
    assert.deepEqual(await page.$$eval('#grid-design td.line', (t) => t.slice(0, 3).map((x) => x.textContent)), ['3', '5', '6']);
    assert.equal(await page.inputValue(cell(1, 2)), '1kHz');
    // Editing keeps the comment, the blank line and the semicolons.
    await fill(page, cell(1, 2), '2kHz');
    assert.equal(await designText(page), design.replace('1kHz', '2kHz'));
    const shown = await outputs(page);
    // The link is compact and reads back as it was, here and in a fresh browser.
    assert.match(page.url(), /[?&]design=~1[A-Za-z0-9_-]+(&|$)/);
    await page.reload();
    await page.waitForSelector('body[data-ready="yes"]');
    assert.equal(await designText(page), design.replace('1kHz', '2kHz'));
    assert.equal((await outputs(page)).log10_total_fit.value, shown.log10_total_fit.value);
    const link = page.url();
    const other = await open(env.browser, link);
    assert.equal(await other.page.inputValue('[name="design"]'), design.replace('1kHz', '2kHz'));
    assert.equal((await outputs(other.page)).log10_total_fit.value, shown.log10_total_fit.value);
    await other.context.close();
    // The command line reads the same link.
    const fromLink = cli('budget', ['--from-url', link]);
    assert.equal(fromLink.log10_total_fit, Number(shown.log10_total_fit.value));
    assert.deepEqual(problems, []);
    await context.close();
  }
});

test('a link cut short says so at the design and keeps the page alive', async () => {
  const { context, page } = await open(env.browser, fileUrl('budget.html'));
  await fill(page, cell(0, 4), '17');
  const link = page.url();
  const at = link.indexOf('design=~1') + 60;
  const cut = link.slice(0, at) + link.slice(link.indexOf('&', at));
  const other = await open(env.browser, cut);
  assert.match(await other.page.textContent('#m-design'),
    /design: the packed value in the link cannot be read: its compressed data is cut short or altered; ask for a fresh link or the CSV file/);
  assert.equal(await other.page.isVisible('#fatal'), false);
  // The demo button brings a working case back.
  await other.page.click('#reset');
  await settle(other.page);
  assert.equal((await outputs(other.page)).worst_corner.text, 'low_v_cold');
  assert.deepEqual(other.problems, []);
  await other.context.close();
  await context.close();
});

test('a 10,000-row design: only the rows in view are in the page, and the end of the table is reachable', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  let design = 'name,fclk,fdata,stages,count\n';
  for (let i = 0; i < 10000; i++) design += `x${i},${['1.2GHz', '400MHz', '125MHz'][i % 3]},1MHz,2,1\n`;
  // Into the text view as a paste puts it (typing 300 kB through the browser's
  // automation protocol takes minutes).
  await page.click('#grid-design [data-view="text"]');
  await page.$eval('[name="design"]', (t, d) => {
    t.value = d;
    t.dispatchEvent(new InputEvent('input', { bubbles: true, inputType: 'insertFromPaste' }));
  }, design);
  await page.click('#grid-design [data-view="table"]');
  await page.waitForFunction(() => document.querySelector('#grid-design .grid-count').textContent === '10,000 rows');
  const inPage = () => page.$$eval('#grid-design tbody tr[data-row]', (t) => t.length);
  assert.ok(await inPage() < 60, `${await inPage()} rows in the page`);
  await page.$eval('#grid-design .grid-scroll', (s) => { s.scrollTop = s.scrollHeight; });
  await page.waitForFunction(() => Array.from(document.querySelectorAll('#grid-design td.line')).some((t) => t.textContent === '10001'));
  assert.ok(await inPage() < 60);
  // The last row edits like the first.
  await fill(page, '#grid-design tr[data-row="9999"] input[data-col="4"]', '5');
  assert.equal((await designText(page)).split('\n')[10000], 'x9999,1.2GHz,1MHz,2,5');
  assert.deepEqual(problems, []);
  await context.close();
});

test('the printed report is a sign-off: verdict, inputs, corners, offenders, fix plan, uncertainty, cautions, date', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  await fill(page, '[name="devices"]', '1000000');
  await fill(page, '[name="service-years"]', '10');
  await page.pdf({ format: 'A4' });
  const text = await page.textContent('#signoff');
  const want = cli('budget', [path.join(root, 'examples/budget-design.csv'), ...demoArgs, '--devices', '1000000', '--service-years', '10']);
  assert.match(text, /printed \d{4}-\d\d-\d\d \d\d:\d\d UTC/);
  assert.match(text, /MISSES the budget/);
  assert.match(text, /NOT within the budget/);
  const headings = await page.$$eval('#signoff h3', (h) => h.map((x) => x.textContent.replace(/ \(.*/, '')));
  assert.deepEqual(headings, ['Verdict', 'Inputs as understood', 'Corners and their totals', 'Largest shares at the worst corner',
    'Fix plan', 'Uncertainty', 'Fleet', 'Warnings', 'Cautions', 'The design as given']);
  // The largest share first, as the report has it, and every change of the fix plan.
  const top = want.rows.slice().sort((a, b) => b.share - a.share)[0].name;
  const firstOffender = await page.$$eval('#signoff h3', (h) => {
    const at = h.find((x) => x.textContent.startsWith('Largest shares'));
    return at.nextElementSibling.querySelector('tbody td').textContent;
  });
  assert.equal(firstOffender, top);
  for (const f of want.fix) assert.ok(text.includes(f.name), f.name);
  assert.ok(text.includes('low_v_cold'));
  assert.deepEqual(problems, []);
  await context.close();
});

test('an edit still waiting to be written reaches Save CSV and the link, and gives way to the demo', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  const demo = await designText(page);
  // Edited and the demo pressed at once: the demo wins.
  await fill(page, cell(0, 4), '55');
  await page.click('#reset');
  await page.waitForTimeout(600);
  assert.equal(await designText(page), demo);
  await fill(page, cell(0, 4), '99');
  // Saved at once, before typing pauses: the file has the edit.
  const [saved] = await Promise.all([page.waitForEvent('download'), page.click('[data-save="design"]')]);
  assert.match(fs.readFileSync(await saved.path(), 'utf8'), /^core_irq_sync,1\.2GHz,2MHz,2,99,1,,,,,,,,,$/m);
  await fill(page, cell(0, 4), '77');
  assert.ok(await page.$('#grid-design[data-pending]'), 'the write waits for a pause');
  // The link and the results already have it.
  const link = cli('budget', ['--from-url', page.url()]);
  assert.equal(link.rows.find((r) => r.name === 'core_irq_sync').count, 77);
  // The demo, pressed before the pause, wins: the waiting write is dropped.
  await page.click('#reset');
  await page.waitForTimeout(600);
  assert.equal(await designText(page), demo);
  assert.equal(await page.inputValue(cell(0, 4)), '16');
  assert.deepEqual(problems, []);
  await context.close();
});

test('a CSV file dropped on a table fills it', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  const design = 'name,fclk,fdata,stages,count\nsensor_sync,500MHz,50MHz,2,1\n"cfg, shadow",200MHz,100kHz,3,32\n';
  const corners = 'corner;tau;tw;tsu;tcq\ntt;20ps;30ps;30ps;50ps\nss;35ps;45ps;45ps;80ps\n';
  for (const [id, text] of [['#grid-design', design], ['#grid-corners', corners]]) await dropFile(page, id, text);
  await page.waitForFunction(() => document.querySelector('#grid-corners .grid-count').textContent === '2 rows');
  await settle(page);
  assert.equal(await designText(page), design);
  assert.equal(await page.inputValue('[name="corners"]'), corners);
  assert.equal(await page.inputValue(cell(1, 0)), 'cfg, shadow');
  const want = cli('budget', ['--from-url', page.url()]);
  assert.equal(want.worst_corner, 'ss');
  assert.equal((await outputs(page)).worst_corner.text, 'ss');
  assert.deepEqual(problems, []);
  await context.close();
});

test('undo keeps every edit of the session: 150 added rows undo back to the demo', async () => {
  const { context, page, problems } = await open(env.browser, fileUrl('budget.html'));
  const demo = await designText(page);
  await page.click(cell(2, 0));
  for (let i = 0; i < 150; i++) await page.click('#grid-design [data-act="add"]');
  await settle(page);
  assert.equal(await page.textContent('#grid-design .grid-count'), '174 rows');
  for (let i = 0; i < 150; i++) await page.click('#grid-design [data-act="undo"]');
  await settle(page);
  assert.equal(await designText(page), demo);
  assert.equal(await page.isDisabled('#grid-design [data-act="undo"]'), true);
  assert.equal(await page.$eval('#grid-design [data-act="undo"]', (b) => b.dataset.cut), 'no');
  assert.deepEqual(problems, []);
  await context.close();
});

test('where undo history was let go, the table says where it ends', async () => {
  const context = await env.browser.newContext({ viewport: { width: 1280, height: 900 } });
  // A small history (as a 10,000-row design's would be, in snapshots).
  await context.addInitScript(() => { window.LATCHWISE_UNDO_CHARS_MOST = 12000; });
  const page = await context.newPage();
  await page.goto(fileUrl('budget.html'));
  await page.waitForSelector('body[data-ready="yes"]');
  await page.click(cell(2, 0));
  for (let i = 0; i < 20; i++) await page.click('#grid-design [data-act="add"]');
  await settle(page);
  const title = await page.$eval('#grid-design [data-act="undo"]', (b) => b.title);
  assert.match(title, /oldest changes were let go/);
  for (let i = 0; i < 20; i++) {
    if (await page.isDisabled('#grid-design [data-act="undo"]')) break;
    await page.click('#grid-design [data-act="undo"]');
  }
  await settle(page);
  assert.match(await page.textContent('#grid-design .grid-count'), /undo history ends here: \d+ older changes were let go/);
  assert.equal(await page.$eval('#grid-design [data-act="undo"]', (b) => b.dataset.cut), 'yes');
  await context.close();
});

test('a design of crossing kinds shows its implied rates, clock factors and flip-flops; a plain one does not; cells are marked from the structured problems', async () => {
  for (const url of [fileUrl('budget.html'), env.server.url + 'budget.html']) {
    const { context, page, problems } = await open(env.browser, url);
    const heads = () => page.$$eval('#grid-design thead th.figure', (t) => t.map((x) => x.textContent));
    assert.deepEqual(await heads(), ['FIT at low_v_cold', 'share', 'fdata (implied)', 'clock factor K', 'flip-flops', 'fix: stages']);
    // The Gray write pointer (row 2): its increments are its rate; five flip-flops a stage.
    const want = cliFor(await designText(page)).rows.find((r) => r.name === 'core_fifo_wptr');
    assert.equal(want.fdata_hz, 200e6);
    assert.equal(want.flip_flops, 10);
    const figs = await page.$$eval('#grid-design tr[data-row="2"] td.figure', (t) => t.map((x) => x.textContent));
    // No clock factor applies to it: its K cell is blank (NaN in the figures' array).
    assert.deepEqual([figs[2], figs[3], figs[4]], ['200 MHz', '', '10']);
    // The related crossing's K, as the report has it.
    const spi = cliFor(await designText(page)).rows.find((r) => r.name === 'periph_spi_ack');
    const spiRow = await page.$$eval('#grid-design tbody tr[data-row]', (t) => t.find((r) => r.querySelector('input').value === 'periph_spi_ack').dataset.row);
    const k = await page.$eval(`#grid-design tr[data-row="${spiRow}"] td.figure:nth-last-child(3)`, (t) => t.textContent);
    assert.ok(Math.abs(Number(k) - spi.clock_factor) <= 1e-3 * spi.clock_factor, `${k} against ${spi.clock_factor}`);
    // A kind without its rate: the core names the row's increments cell, and the table
    // marks that cell (column 7 of the demo's header) from the structured problem.
    await fill(page, cell(0, 6), 'gray');
    assert.match(await page.textContent('#m-design'), /design, line 7, column increments: a value is required/);
    assert.equal(await page.getAttribute('#grid-design tr[data-row="0"] td:nth-child(9)', 'class'), 'bad');
    assert.equal(await page.getAttribute('#grid-design tr[data-row="0"] td:nth-child(8)', 'class'), '');
    await fill(page, cell(0, 6), '');
    // A plain design: none of those columns.
    await page.click('#grid-design [data-view="text"]');
    await fill(page, '[name="design"]', 'name,fclk,fdata,stages,count\nrx,1.2GHz,80MHz,2,32\ntx,400MHz,1kHz,3,1\n');
    await page.click('#grid-design [data-view="table"]');
    await settle(page);
    assert.deepEqual(await heads(), ['FIT at low_v_cold', 'share', 'fix: stages']);
    assert.deepEqual(problems, []);
    await context.close();
  }
});
