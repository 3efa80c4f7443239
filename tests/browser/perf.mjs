// Browser timing of the pages (run by scripts/bench-pages; not a test: figures only).
import { readdirSync, readFileSync, statSync, writeFileSync, rmSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import path from 'node:path';
import { launch, open, serve, fileUrl, dist, root } from './harness.mjs';

const median = (xs) => { const s = [...xs].sort((a, b) => a - b); return s[Math.floor(s.length / 2)]; };
const firstResult = (page) => page.$eval('body', (b) => Number(b.dataset.firstResultMs));
// The first paint with content: on the pages, the paint that shows the first results.
const firstPaint = async (page) => {
  await page.waitForFunction(() => performance.getEntriesByName('first-contentful-paint').length > 0);
  return page.evaluate(() => performance.getEntriesByName('first-contentful-paint')[0].startTime);
};

// The baseline, measured in the same run: a blank page whose only script records when it
// runs, placed beside the pages so that it loads the same way (file:// or served).
const blankHtml = path.join(dist, 'bench-blank.html');
const blankJs = path.join(dist, 'bench-blank.js');
writeFileSync(blankHtml, '<!doctype html><html lang="en"><head><meta charset="utf-8"><title>blank</title></head><body><p>blank page</p><script src="bench-blank.js"></script></body></html>\n');
writeFileSync(blankJs, "document.body.dataset.firstResultMs = performance.now().toFixed(1); document.body.dataset.ready = 'yes';\n");

const browser = await launch();
const server = await serve();
const rows = [];

const marks = (page) => page.evaluate(() => Object.fromEntries(
  performance.getEntriesByType('mark').map((e) => [e.name.replace('latchwise:', ''), e.startTime])));

// One new tab per sample, page and blank baseline interleaved so that both see the same
// machine state; then reloads of one tab each, interleaved the same way.
async function navigation(url, blankUrl, steps) {
  const fresh = [], freshBlank = [], again = [], againBlank = [];
  for (let i = 0; i < 15; i++) {
    for (const [u, out] of [[url, fresh], [blankUrl, freshBlank]]) {
      const { context, page } = await open(browser, u);
      out.push(await firstResult(page));
      const paint = await firstPaint(page);
      if (u === url) steps.push({ ...(await marks(page)), first: out[out.length - 1], paint });
      else steps[steps.length - 1].blankPaint = paint;
      await context.close();
    }
  }
  const tabs = [await open(browser, url), await open(browser, blankUrl)];
  for (let i = 0; i < 15; i++) {
    for (const [{ page }, out] of [[tabs[0], again], [tabs[1], againBlank]]) {
      await page.reload();
      await page.waitForSelector('body[data-ready="yes"]');
      out.push(await firstResult(page));
    }
  }
  for (const t of tabs) await t.context.close();
  return [median(fresh), median(again), median(freshBlank), median(againBlank)];
}

// What a page loads before its first result: its own HTML, the stylesheet and scripts it
// names (its calculator's module among them), raw and gzipped.
function pageBytes(file) {
  const html = readFileSync(path.join(dist, file), 'utf8');
  const names = [file, ...[...html.matchAll(/(?:src|href)="([\w.-]+\.(?:js|css))"/g)].map((m) => m[1])];
  let raw = 0, gz = 0;
  for (const n of names) {
    const b = readFileSync(path.join(dist, n));
    raw += b.length;
    gz += gzipSync(b, { level: 9 }).length;
  }
  const page = (html.match(/data-page="(\w+)"/) || [])[1];
  const wasm = readFileSync(path.join(root, `target/wasm-bindgen/${page}/latchwise_bg.wasm`));
  return { raw, gz, wasm: wasm.length, wasmGz: gzipSync(wasm, { level: 9 }).length };
}

try {
// BENCH_ONLY=first measures the first results alone, BENCH_ONLY=budget the budget page
// alone, BENCH_ONLY=fit the Characterise page, BENCH_ONLY=converter the SAR converter page.
const only = process.env.BENCH_ONLY || '';
const pages = readdirSync(dist).filter((f) => f.endsWith('.html') && f !== 'bench-blank.html').sort();
for (const file of only === '' || only === 'first' ? pages : []) {
  for (const [name, at] of [['file://', fileUrl], ['served', (f) => server.url + f]]) {
    const steps = [];
    const [pf, pr, bf, br] = await navigation(at(file), at('bench-blank.html'), steps);
    const m = (k) => median(steps.map((x) => x[k]));
    rows.push([`${file}: first result, ${name}, new tab / reload (medians of 15, blank page interleaved)`,
      `${pf.toFixed(0)} ms / ${pr.toFixed(0)} ms, blank page ${bf.toFixed(0)} ms / ${br.toFixed(0)} ms: ` +
      `**+${(pf - bf).toFixed(0)} ms** / +${(pr - br).toFixed(0)} ms; new tab: page script starts ${m('script').toFixed(0)} ms, ` +
      `core decoded +${(m('decoded') - m('script')).toFixed(1)} ms, compiled +${(m('instantiated') - m('decoded')).toFixed(0)} ms, ` +
      `first result +${(m('first') - m('instantiated')).toFixed(0)} ms; ` +
      `first paint (with the results) ${m('paint').toFixed(0)} ms, blank page's ${m('blankPaint').toFixed(0)} ms: +${(m('paint') - m('blankPaint')).toFixed(0)} ms`]);
  }
  const b = pageBytes(file);
  rows.push([`${file}: what it loads, raw / gzipped (its wasm module alone)`,
    `${(b.raw / 1024).toFixed(0)} KiB / ${(b.gz / 1024).toFixed(0)} KiB (${(b.wasm / 1024).toFixed(0)} KiB / ${(b.wasmGz / 1024).toFixed(0)} KiB)`]);
}
for (const file of only !== '' ? [] : ['index.html', 'comparator.html']) {
  const { context, page } = await open(browser, fileUrl(file));
  // The work of one change, timed call by call as the page makes them: the numbers
  // (core and readouts), then the plots in the next frame.
  const work = await page.evaluate((name) => {
    const el = document.querySelector('[name="tau"]');
    const form = document.getElementById('inputs');
    const q = () => new URLSearchParams(new FormData(form)).toString();
    const numbers = [];
    const plots = [];
    for (let i = 0; i < 200; i++) {
      el.value = (15 + (i % 20)) + 'ps';
      const t0 = performance.now();
      wasm_bindgen.page(name, q());
      const t1 = performance.now();
      wasm_bindgen.draw(name, q(), window.devicePixelRatio || 1);
      plots.push(performance.now() - t1);
      numbers.push(t1 - t0);
    }
    return { numbers, plots };
  }, file === 'index.html' ? 'sync' : 'comparator');
  // A burst of 1,000 input events: from the first event to the plots of the last.
  const burst = await page.evaluate(() => new Promise((done) => {
    const el = document.querySelector('[name="tau"]');
    const before = document.body.dataset.drawnAt;
    const t0 = performance.now();
    for (let i = 0; i < 1000; i++) {
      el.value = (15 + (i % 20)) + 'ps';
      el.dispatchEvent(new Event('input', { bubbles: true }));
    }
    const wait = () => (document.body.dataset.drawnAt !== before ? done(performance.now() - t0) : requestAnimationFrame(wait));
    requestAnimationFrame(wait);
  }));
  rows.push([`${file}: one change, numbers / plots (medians of 200)`,
    `${median(work.numbers).toFixed(2)} ms / ${median(work.plots).toFixed(1)} ms ` +
    `(${(100 * (median(work.numbers) + median(work.plots)) / (1000 / 60)).toFixed(0)} % of a 60 Hz frame)`]);
  rows.push([`${file}: 1,000 input events in a burst, to the last plots drawn`, `${burst.toFixed(0)} ms`]);
  await context.close();
}
// The SAR converter page: one change of tau at 10 and 16 bits, asynchronous (2^16
// thresholds summed), numbers and plots, against the comparator page's change measured
// in the same run as the baseline.
if (only === '' || only === 'converter') {
  const change = async (file, name, query) => {
    const { context, page } = await open(browser, fileUrl(file) + (query ? '?' + query : ''));
    const times = await page.evaluate((name) => {
      const el = document.querySelector('[name="tau"]');
      const form = document.getElementById('inputs');
      const q = () => new URLSearchParams(new FormData(form)).toString();
      const out = [];
      for (let i = 0; i < 41; i++) {
        el.value = (10 + (i % 7)) + 'ps';
        const t0 = performance.now();
        wasm_bindgen.page(name, q());
        wasm_bindgen.draw(name, q(), window.devicePixelRatio || 1);
        if (i > 0) out.push(performance.now() - t0);
      }
      return out;
    }, name);
    await context.close();
    return median(times);
  };
  const base = await change('comparator.html', 'comparator', '');
  for (const bits of [10, 16]) {
    const q = `bits=${bits}&timing=async&tau=10ps&vmin=1&gain=1&vfs=1&fs=100MHz&tconv=1.2ns&tfix=30ps&fill=reset&target-ber=1e-12`;
    const t = await change('converter.html', 'converter', q);
    rows.push([`converter.html, ${bits}-bit asynchronous: one change, numbers and plots (medians of 40)`,
      `${t.toFixed(1)} ms, ${(t / base).toFixed(1)}x the comparator page's change (${base.toFixed(2)} ms) in the same run`]);
  }
}
// The design budget with designs of 1,000 and 10,000 rows (three clock domains, three
// corners, the demo's budget and uncertainty): editing one cell of the table, the work of
// the edit (the table writing the row back), of the recompute (numbers, table, results)
// and of the redraw (plots), each as the page times it; and the same edit to the plots on
// screen.
// The Characterise page with 3,000 rows of failure counts, every tr distinct (the worst
// case for the fit, which merges rows of equal tr): one count edited in the data, the
// recompute (the fit with its profile intervals) and the redraw, as the page times them.
for (const size of only === '' || only === 'fit' ? [3000] : []) {
  const { context, page } = await open(browser, fileUrl('characterize.html'));
  await page.evaluate((size) => {
    let t = 'tr,failures,duration\n';
    for (let i = 0; i < size; i++) {
      const tr = 100 + 400 * i / size;
      t += `${tr.toFixed(4)}ps,${Math.round(1e-3 * 1e9 * 5e7 * 22e-12 * Math.exp(-tr / 18))},1ms\n`;
    }
    const area = document.querySelector('[name=data]');
    area.value = t;
    area.dispatchEvent(new Event('input', { bubbles: true }));
  }, size);
  await page.waitForFunction(() => document.querySelector('output[name=tau_s]').dataset.value !== '');
  await page.waitForTimeout(500);
  const edits = await page.evaluate(async () => {
    const frame = () => new Promise((r) => requestAnimationFrame(() => r()));
    const out = { compute: [], draw: [] };
    const area = document.querySelector('[name=data]');
    const lines = area.value.split('\n');
    for (let i = 0; i < 42; i++) {
      const before = document.body.dataset.drawnAt;
      const cells = lines[5].split(',');
      cells[1] = String(Number(cells[1]) + (i % 2 === 0 ? 1 : -1));
      lines[5] = cells.join(',');
      area.value = lines.join('\n');
      area.dispatchEvent(new Event('input', { bubbles: true }));
      while (document.body.dataset.drawnAt === before) await frame();
      if (i < 2) continue;
      out.compute.push(Number(document.body.dataset.computeMs));
      out.draw.push(Number(document.body.dataset.drawMs));
      await frame();
    }
    return out;
  });
  const work = edits.compute.map((c, i) => c + edits.draw[i]);
  rows.push([`characterize.html, ${size.toLocaleString('en-US')} rows of counts (every tr distinct): one edit, recompute / redraw (medians of 40)`,
    `${median(edits.compute).toFixed(1)} ms / ${median(edits.draw).toFixed(1)} ms: ${median(work).toFixed(1)} ms of work, ` +
    `${(100 * median(work) / (1000 / 60)).toFixed(0)} % of a 60 Hz frame`]);
  await context.close();
}
// Pasting 3.2 MB of design (100,000 rows) into the budget page: from the paste to the
// results and the table on screen.
for (const size of only === '' || only === 'budget' ? [100000] : []) {
  // Five new tabs, the median: the first paste of a run is often the slowest.
  const samples = [];
  let chars = 0;
  for (let k = 0; k < 5; k++) {
    const { context, page } = await open(browser, fileUrl('budget.html'));
    const took = await page.evaluate(async (size) => {
      const clocks = ['1.2GHz', '400MHz', '125MHz'];
      const rates = ['1kHz', '1MHz', '20MHz', '100MHz'];
      let t = 'name,fclk,fdata,stages,count\n';
      for (let i = 0; i < size; i++) t += `crossing_${i},${clocks[i % 3]},${rates[i % 4]},${[2, 2, 2, 3][i % 4]},${[1, 1, 8, 32][i % 4]}\n`;
      const area = document.querySelector('[name=design]');
      const before = document.body.dataset.drawnAt;
      const t0 = performance.now();
      area.value = t;
      area.dispatchEvent(new Event('input', { bubbles: true }));
      const frame = () => new Promise((r) => requestAnimationFrame(() => r()));
      while (document.body.dataset.drawnAt === before) await frame();
      return { ms: performance.now() - t0, chars: t.length };
    }, size);
    samples.push(took.ms);
    chars = took.chars;
    await context.close();
  }
  rows.push([`budget.html, pasting ${(chars / 1e6).toFixed(1)} MB (${size.toLocaleString('en-US')} rows) to results and plots on screen (median of 5 new tabs)`,
    `${median(samples).toFixed(0)} ms (${samples.map((x) => x.toFixed(0)).join(', ')})`]);
}
for (const size of only === '' || only === 'budget' ? [1000, 10000] : []) {
  const label = `budget.html, ${size.toLocaleString('en-US')}-row design`;
  const { context, page } = await open(browser, fileUrl('budget.html'));
  await page.evaluate((size) => {
    const clocks = ['1.2GHz', '400MHz', '125MHz'];
    const rates = ['1kHz', '1MHz', '20MHz', '100MHz'];
    let t = 'name,fclk,fdata,stages,count\n';
    for (let i = 0; i < size; i++) t += `x${i},${clocks[i % 3]},${rates[i % 4]},${[2, 2, 2, 3][i % 4]},${[1, 1, 8, 32][i % 4]}\n`;
    const area = document.querySelector('[name=design]');
    area.value = t;
    area.dispatchEvent(new Event('input', { bubbles: true }));
  }, size);
  await page.waitForFunction((n) => document.querySelector('#grid-design').textContent.includes(`${n} rows`) &&
    document.querySelector('output[name=log10_total_fit]').dataset.value !== '', size.toLocaleString('en-US'));
  await page.waitForTimeout(800);
  const edits = await page.evaluate(async () => {
    const frame = () => new Promise((r) => requestAnimationFrame(() => r()));
    const out = { edit: [], compute: [], draw: [], screen: [], fresh: [] };
    // The same edits with every line read afresh, interleaved with the page's own way
    // (lines read once, remembered), so that both see the same machine.
    for (let i = 0; i < 82; i++) {
      const fresh = i % 2 === 1;
      wasm_bindgen.remember_table_rows(!fresh);
      const cell = document.querySelector('#grid-design tr[data-row="3"] input[data-col="4"]');
      cell.focus();
      const before = document.body.dataset.drawnAt;
      const t0 = performance.now();
      cell.value = String(1 + (i % 13));
      cell.dispatchEvent(new Event('input', { bubbles: true }));
      const t1 = performance.now();
      while (document.body.dataset.drawnAt === before) await frame();
      const t2 = performance.now();
      if (i < 2) continue; // the first edits' undo snapshot and caches
      if (fresh) { out.fresh.push(Number(document.body.dataset.computeMs)); await frame(); continue; }
      out.edit.push(t1 - t0);
      out.compute.push(Number(document.body.dataset.computeMs));
      out.draw.push(Number(document.body.dataset.drawMs));
      out.screen.push(t2 - t0);
      await frame();
    }
    wasm_bindgen.remember_table_rows(true);
    const area = document.querySelector('[name=design]');
    const q = new URLSearchParams({ design: area.value }).toString();
    const t3 = performance.now();
    const packed = wasm_bindgen.compact_query('budget', q);
    out.pack = performance.now() - t3;
    out.plainChars = q.length;
    out.packedChars = packed.length;
    // Scrolling to the middle of the table: rows in the page stay a few dozen.
    const scroller = document.querySelector('#grid-design .grid-scroll');
    scroller.scrollTop = scroller.scrollHeight / 2;
    await new Promise((r) => setTimeout(r, 100));
    await frame(); await frame();
    out.rowsInPage = document.querySelectorAll('#grid-design tbody tr[data-row]').length;
    return out;
  });
  const work = edits.edit.map((e, i) => e + edits.compute[i] + edits.draw[i]);
  rows.push([`${label}: one cell edit, table / recompute / redraw (medians of 40)`,
    `${median(edits.edit).toFixed(1)} ms / ${median(edits.compute).toFixed(1)} ms / ${median(edits.draw).toFixed(1)} ms: ` +
    `${median(work).toFixed(1)} ms of work, ${(100 * median(work) / (1000 / 60)).toFixed(0)} % of a 60 Hz frame; ` +
    `edit to plots on screen ${median(edits.screen).toFixed(0)} ms (numbers and plots are drawn in successive frames); ` +
    `the recompute reading every line afresh, same run: ${median(edits.fresh).toFixed(1)} ms`]);
  rows.push([`${label}: the link once typing pauses, and rows in the page`,
    `packing ${edits.pack.toFixed(0)} ms, ${edits.plainChars.toLocaleString('en-US')} characters plain, ` +
    `${edits.packedChars.toLocaleString('en-US')} packed; ${edits.rowsInPage} table rows in the page`]);
  await context.close();
}
} finally {
  rmSync(blankHtml, { force: true });
  rmSync(blankJs, { force: true });
}
let raw = 0;
let gz = 0;
for (const f of readdirSync(dist)) {
  const p = path.join(dist, f);
  if (!statSync(p).isFile()) continue;
  raw += statSync(p).size;
  gz += gzipSync(readFileSync(p), { level: 9 }).length;
}
rows.push(['whole dist/, raw / gzipped (one wasm module per page, embedded as base64)', `${(raw / 1024).toFixed(0)} KiB / ${(gz / 1024).toFixed(0)} KiB`]);
console.log('| page measurement | figure |\n|---|---|');
for (const [k, v] of rows) console.log(`| ${k} | ${v} |`);
await browser.close();
await server.close();
