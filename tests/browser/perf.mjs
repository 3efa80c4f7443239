// Browser timing of the pages (run by scripts/bench-pages; not a test: figures only).
import { readdirSync, readFileSync, statSync, writeFileSync, rmSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import path from 'node:path';
import { launch, open, serve, fileUrl, dist, root } from './harness.mjs';

const median = (xs) => { const s = [...xs].sort((a, b) => a - b); return s[Math.floor(s.length / 2)]; };
const firstResult = (page) => page.$eval('body', (b) => Number(b.dataset.firstResultMs));

// The baseline, measured in the same run: a blank page whose only script records when it
// runs, placed beside the pages so that it loads the same way (file:// or served).
const blankHtml = path.join(dist, 'bench-blank.html');
const blankJs = path.join(dist, 'bench-blank.js');
writeFileSync(blankHtml, '<!doctype html><html lang="en"><head><meta charset="utf-8"><title>blank</title></head><body><p>blank page</p><script src="bench-blank.js"></script></body></html>\n');
writeFileSync(blankJs, "document.body.dataset.firstResultMs = performance.now().toFixed(1); document.body.dataset.ready = 'yes';\n");

const browser = await launch();
const server = await serve();
const rows = [];

async function navigation(url) {
  const fresh = [];
  for (let i = 0; i < 15; i++) {
    const { context, page } = await open(browser, url);
    fresh.push(await firstResult(page));
    await context.close();
  }
  const { context, page } = await open(browser, url);
  const again = [];
  for (let i = 0; i < 15; i++) {
    await page.reload();
    await page.waitForSelector('body[data-ready="yes"]');
    again.push(await firstResult(page));
  }
  await context.close();
  return [median(fresh), median(again)];
}

try {
for (const file of ['index.html', 'comparator.html']) {
  for (const [name, at] of [['file://', fileUrl], ['served', (f) => server.url + f]]) {
    // Interleave page and blank baseline so that both see the same machine state.
    const [pf, pr] = await navigation(at(file));
    const [bf, br] = await navigation(at('bench-blank.html'));
    rows.push([`${file}: first result after navigation, ${name}, new tab / reload (medians of 15)`,
      `${pf.toFixed(0)} ms / ${pr.toFixed(0)} ms, blank page ${bf.toFixed(0)} ms / ${br.toFixed(0)} ms: ` +
      `${(pf / bf).toFixed(1)}x / ${(pr / br).toFixed(1)}x, +${(pf - bf).toFixed(0)} ms / +${(pr - br).toFixed(0)} ms`]);
  }
  const { context, page } = await open(browser, fileUrl(file));
  // Each change runs the whole update synchronously: core, readouts and every plot.
  const times = await page.evaluate(() => {
    const el = document.querySelector('[name="tau"]');
    const out = [];
    for (let i = 0; i < 300; i++) {
      el.value = (15 + (i % 20)) + 'ps';
      const t0 = performance.now();
      el.dispatchEvent(new Event('input', { bubbles: true }));
      out.push(performance.now() - t0);
    }
    return out;
  });
  rows.push([`${file}: recompute + redraw per input change (median of 300)`,
    `${median(times).toFixed(1)} ms (${(100 * median(times) / (1000 / 60)).toFixed(0)} % of a 60 Hz frame)`]);
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
const wasmFile = path.join(root, 'target/wasm-bindgen/latchwise_bg.wasm');
const wasm = readFileSync(wasmFile);
rows.push(['wasm module, raw / gzipped', `${(wasm.length / 1024).toFixed(0)} KiB / ${(gzipSync(wasm, { level: 9 }).length / 1024).toFixed(0)} KiB`]);
rows.push(['whole dist/, raw / gzipped (wasm embedded as base64)', `${(raw / 1024).toFixed(0)} KiB / ${(gz / 1024).toFixed(0)} KiB`]);
console.log('| page measurement | figure |\n|---|---|');
for (const [k, v] of rows) console.log(`| ${k} | ${v} |`);
await browser.close();
await server.close();
