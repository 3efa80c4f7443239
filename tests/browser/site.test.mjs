// Real-browser tests of what every page shares: the assembled navigation, and each
// calculator opening on its own last case from it.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { readdirSync } from 'node:fs';
import path from 'node:path';
import { setup, open, fileUrl, fill, settle, root } from './harness.mjs';

const env = setup({ before, after });
// Every calculator's page, as www/ holds them (the tidy test ties them to the registry).
const pages = readdirSync(path.join(root, 'www')).filter((f) => f.endsWith('.html'));

test('every page lists every calculator in its navigation and marks itself', async () => {
  for (const p of pages) {
    const { context, page, problems } = await open(env.browser, fileUrl(p));
    const links = await page.$$eval('header nav a', (as) => as.map((a) => [a.getAttribute('href'), a.getAttribute('aria-current')]));
    assert.deepEqual(links.map((l) => l[0]).sort(), [...pages].sort(), p);
    assert.deepEqual(links.filter((l) => l[1] === 'page').map((l) => l[0]), [p]);
    assert.match(await page.textContent('footer'), /latchwise (sync|comparator|fit|budget|converter|supply)/);
    assert.equal(await page.$$eval('#caution', (e) => e.length), 1);
    assert.deepEqual(problems, []);
    await context.close();
  }
});

test('the navigation opens each calculator on its own last case, carrying nothing', async () => {
  const { context, page } = await open(env.browser, env.server.url + 'index.html');
  await fill(page, '[name="tau"]', '33ps');
  await Promise.all([page.waitForNavigation(), page.click('header nav a[href="comparator.html"]')]);
  await page.waitForSelector('body[data-ready="yes"]');
  assert.equal(await page.inputValue('[name="tau"]'), '15ps', 'the comparator keeps its own tau');
  await fill(page, '[name="tau"]', '17ps');
  await fill(page, '[name="fs"]', '28GHz');
  await Promise.all([page.waitForNavigation(), page.click('header nav a[href="index.html"]')]);
  await page.waitForSelector('body[data-ready="yes"]');
  assert.equal(await page.inputValue('[name="tau"]'), '33ps');
  assert.equal(await page.inputValue('[name="fclk"]'), '1GHz', 'no slicer clock lands in the synchronizer');
  await context.close();
});

test('every page prints on A4 and Letter with no input value, result or note clipped', async () => {
  // A long value carried in from a fit (tau to nine digits) once printed as "1.7012e-1".
  for (const file of ['index.html', 'comparator.html?tau=1.70123456e-11&treg=80ps&vmin=0.4&gain=4&input=uniform&lsb=1mV&fs=5GHz', 'characterize.html', 'budget.html']) {
    for (const [paper, width] of [['A4', 794 - 2 * 45], ['Letter', 816 - 2 * 45]]) {
      const [name, query] = file.split('?');
      const { context, page } = await open(env.browser, fileUrl(name) + (query ? '?' + query : ''), { width });
      await page.pdf({ format: paper }); // runs the page's print preparation
      await page.emulateMedia({ media: 'print' });
      const clipped = await page.$$eval('input[name], output[name], .print-choice, .print-value, .results dd, .results dt, #print-stamp', (els) => els
        .filter((e) => e.offsetParent !== null && e.scrollWidth > e.clientWidth + 1)
        .map((e) => `${e.tagName.toLowerCase()}[${e.getAttribute('name') || e.className || e.id}] ${e.scrollWidth} > ${e.clientWidth}: ${e.value || e.textContent}`));
      assert.deepEqual(clipped, [], `${file} on ${paper}`);
      await context.close();
    }
  }
});

test('each page loads its own calculator alone, and its first paint already shows the results', async () => {
  const names = { 'index.html': 'sync', 'comparator.html': 'comparator', 'characterize.html': 'fit', 'budget.html': 'budget', 'converter.html': 'converter', 'supply.html': 'supply' };
  assert.deepEqual(Object.keys(names).sort(), [...pages].sort(), 'every page is named here');
  for (const p of pages) {
    const { context, page, problems } = await open(env.browser, fileUrl(p));
    const scripts = await page.$$eval('script[src]', (s) => s.map((e) => e.getAttribute('src')));
    assert.deepEqual(scripts.filter((s) => s.startsWith('latchwise-')), [`latchwise-${names[p]}.js`], p);
    // The other calculators are not in this page's module: the core says it has none of them.
    const others = await page.evaluate((own) => ['sync', 'comparator', 'fit', 'budget', 'converter', 'supply']
      .filter((n) => n !== own)
      .map((n) => { try { wasm_bindgen.page(n, ''); return `${n}: answered`; } catch (e) { return String(e); } }), names[p]);
    assert.equal(others.length, 5);
    for (const o of others) assert.match(o, /no calculator is called '\w+' in this page's core/, `${p}: ${o}`);
    // The page's first paint waits for the first results (the scripts block rendering),
    // so nobody sees placeholders where numbers belong.
    await page.waitForFunction(() => performance.getEntriesByName('first-contentful-paint').length > 0);
    const [first, paint] = await page.evaluate(() => [Number(document.body.dataset.firstResultMs),
      performance.getEntriesByName('first-contentful-paint')[0].startTime]);
    assert.ok(paint >= first, `${p}: first paint at ${paint} ms, first result at ${first} ms`);
    assert.deepEqual(problems, []);
    await context.close();
  }
});
