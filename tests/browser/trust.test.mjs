// Real-browser tests of what makes the pages trustworthy: they never die on odd input,
// read links as the command line does, keep the user's case, and say what they show.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { setup, open, fileUrl, outputs, root, fill, settle } from './harness.mjs';

const env = setup({ before, after });
const odd = JSON.parse(readFileSync(path.join(root, 'tests/fixtures/odd_queries.json'), 'utf8'));
const pageOf = { sync: 'index.html', comparator: 'comparator.html' };

test('odd links read on the page exactly as the core (and --from-url) reads them', async () => {
  for (const c of odd.cases) {
    const { context, page, problems } = await open(env.browser, fileUrl(pageOf[c.calculator]) + '?' + c.query);
    const pairs = await page.evaluate(([calc, q]) => wasm_bindgen.read_query(calc, q), [c.calculator, c.query]);
    assert.deepEqual(pairs, c.pairs, c.query);
    // Each field holds the last value the link gave it.
    const last = Object.fromEntries(c.pairs);
    const names = await page.$$eval('#inputs [name]', (els) => els.map((e) => e.name));
    for (const n of names) {
      if (n in last && n !== 'input') assert.equal(await page.inputValue(`[name="${n}"]`), last[n], `${c.query}: ${n}`);
    }
    assert.deepEqual(problems, [], c.query);
    await context.close();
  }
});

test('a flat curve at a huge value loads, draws and leaves the page alive', async () => {
  const q = 'tau=1as&tw=40ps&fclk=1GHz&fdata=100MHz&stages=2&tsu=30ps&tcq=50ps&tr=1&target-years=1e5';
  const { context, page, problems } = await open(env.browser, fileUrl('index.html') + '?' + q);
  const out = await outputs(page);
  assert.match(out.log10_mtbf_years.text, /^10\^\(4\.34e17\) years$/);
  assert.match(out.min_stages.text, /tr given/);
  assert.equal(await page.$eval('#plot-tau', (c) => c.dataset.drawn), 'yes');
  for (const f of ['stages', 'tsu', 'tcq']) {
    assert.equal(await page.$eval(`[name="${f}"]`, (e) => e.closest('.field').dataset.unused), 'yes', f);
  }
  assert.match(await page.textContent('#m-tau'), /far outside the usual/);
  assert.deepEqual(problems, []);
  await context.close();
});

test('a saved case that never finished loading is set aside, not loaded again', async () => {
  const { context, page } = await open(env.browser, env.server.url + 'index.html');
  await fill(page, '[name="tau"]', '23ps');
  // As if the last load of this saved case had died half way.
  await page.evaluate(() => localStorage.setItem('latchwise:sync:loading', localStorage.getItem('latchwise:sync')));
  await page.goto(env.server.url + 'index.html');
  await page.waitForSelector('body[data-ready="yes"]');
  assert.equal(await page.inputValue('[name="tau"]'), '20ps', 'the demo case');
  assert.match(await page.textContent('#ignored'), /did not load and was set aside/);
  assert.match(await page.evaluate(() => localStorage.getItem('latchwise:sync:set-aside')), /tau=23ps/);
  await context.close();
});

for (const [file, field, other] of [['index.html', 'tau', 'fdata'], ['comparator.html', 'input', 'tau']]) {
  test(`the demo button on ${file} sets every control and is one undo away`, async () => {
    const { context, page } = await open(env.browser, fileUrl(file));
    const demo = await page.$$eval('#inputs [name]', (els) => els.map((e) => [e.name, e.value]));
    if (field === 'input') {
      await page.selectOption('[name="input"]', 'gaussian');
      await fill(page, '[name="sigma"]', '3mV');
    } else {
      await fill(page, `[name="${field}"]`, '31ps');
    }
    await fill(page, `[name="${other}"]`, '7');
    const mine = await page.$$eval('#inputs [name]', (els) => els.map((e) => [e.name, e.value]));
    await page.click('#reset');
    await settle(page);
    assert.deepEqual(await page.$$eval('#inputs [name]', (els) => els.map((e) => [e.name, e.value])), demo);
    assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
    assert.equal(await page.isVisible('#undo'), true);
    await page.click('#undo');
    await settle(page);
    assert.deepEqual(await page.$$eval('#inputs [name]', (els) => els.map((e) => [e.name, e.value])), mine);
    assert.equal(await page.isVisible('#undo'), false);
    await context.close();
  });
}

test('a burst of input events is one update per frame', async () => {
  const { context, page } = await open(env.browser, fileUrl('index.html'));
  const before = Number(await page.$eval('body', (b) => b.dataset.computes));
  await page.evaluate(() => {
    const el = document.querySelector('[name="tau"]');
    for (let i = 0; i < 1000; i++) {
      el.value = (15 + (i % 20)) + 'ps';
      el.dispatchEvent(new Event('input', { bubbles: true }));
    }
  });
  await settle(page);
  const after = Number(await page.$eval('body', (b) => b.dataset.computes));
  assert.ok(after - before >= 1 && after - before <= 2, `${after - before} updates for 1000 events`);
  assert.equal(await page.inputValue('[name="tau"]'), '34ps');
  assert.match(page.url(), /tau=34ps/);
  await context.close();
});

test('both targets: one message, every other result still shown', async () => {
  const { context, page } = await open(env.browser, fileUrl('index.html'));
  await fill(page, '[name="target-fit"]', '10');
  assert.match(await page.textContent('#m-target-years'), /give either target-years or target-fit, not both/);
  const out = await outputs(page);
  assert.ok(Number.isFinite(Number(out.log10_mtbf_s.value)), 'MTBF still shown');
  assert.equal(out.meets_target.value, '');
  await context.close();
});

test('an old link with units fills the devices field', async () => {
  const { context, page } = await open(env.browser, fileUrl('index.html') + '?tau=20ps&tw=40ps&fclk=1GHz&fdata=100MHz&stages=2&tsu=30ps&tcq=50ps&units=5000&service-years=10');
  assert.equal(await page.inputValue('[name="devices"]'), '5000');
  assert.notEqual((await outputs(page)).log10_expected_failures.value, '');
  assert.equal(await page.isVisible('#ignored'), false, 'units is not an unknown key');
  await context.close();
});

test('the comparator verdict counts noise, and PAM4 says symbol error ratio', async () => {
  const q = 'tau=10ps&treg=200ps&vmin=0.4&gain=4&input=nrz&amp=60mV&sigma=10mV&fs=28GHz&target-ber=1e-12';
  const { context, page } = await open(env.browser, fileUrl('comparator.html') + '?' + q);
  const out = await outputs(page);
  assert.match(out.meets_target.text, /^missed/);
  assert.ok(Number(out.metastability_margin_decades.value) > 0);
  assert.match(out.treg_needed_s.text, /noise alone misses/);
  assert.match(await page.textContent('#warnings'), /Noise alone/);
  await page.selectOption('[name="input"]', 'pam4');
  await fill(page, '[name="amp"]', '150mV');
  const label = await page.$eval('output[name="log10_p_total"]', (o) => o.closest('dd').previousElementSibling.textContent);
  assert.equal(label, 'total symbol error ratio');
  assert.match(await page.textContent('#facts'), /PAM4: a decision is one symbol/);
  await context.close();
});

test('text contrast and named plot buttons', async () => {
  for (const file of ['index.html', 'comparator.html']) {
    const { context, page } = await open(env.browser, fileUrl(file));
    const ratios = await page.$$eval('.hint, .msg, .key, .fine, .lbl, .table dt', (els) => els.map((e) => {
      const rgb = (s) => s.match(/\d+/g).slice(0, 3).map(Number);
      const lum = (c) => {
        const [r, g, b] = c.map((v) => { v /= 255; return v <= 0.03928 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4; });
        return 0.2126 * r + 0.7152 * g + 0.0722 * b;
      };
      let bg = null;
      for (let n = e; n && !bg; n = n.parentElement) {
        const c = getComputedStyle(n).backgroundColor;
        if (c && !c.endsWith(', 0)') && c !== 'transparent') bg = c;
      }
      const [a, b] = [lum(rgb(getComputedStyle(e).color)), lum(rgb(bg || 'rgb(255,255,255)'))];
      return [e.className, (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05)];
    }));
    for (const [cls, r] of ratios) assert.ok(r >= 4.5, `${file} .${cls}: contrast ${r.toFixed(2)}`);
    const names = await page.$$eval('.plots button', (bs) => bs.map((b) => b.getAttribute('aria-label')));
    assert.ok(names.length >= 6 && names.every((n) => /^(CSV|PNG) of /.test(n)), names.join('; '));
    assert.equal(new Set(names).size, names.length, 'each button names its own plot');
    await context.close();
  }
});

test('PNG exports are twice the size, with a caption; print carries date, version and link', async () => {
  const { context, page } = await open(env.browser, env.server.url + 'index.html');
  const css = await page.$eval('#plot-tau', (c) => [c.clientWidth, c.clientHeight]);
  const [png] = await Promise.all([page.waitForEvent('download'), page.click('[data-png="plot-tau"]')]);
  const bytes = Buffer.concat(await (await png.createReadStream()).toArray());
  const [w, h] = [bytes.readUInt32BE(16), bytes.readUInt32BE(20)];
  assert.equal(w, css[0] * 2);
  assert.ok(h > css[1] * 2, 'a caption strip below the plot');
  await page.pdf({ format: 'A4' });
  const stamp = await page.textContent('#print-stamp');
  assert.match(stamp, /^latchwise \d+\.\d+\.\d+ · printed \d{4}-\d\d-\d\d \d\d:\d\d UTC · http:\/\/127\.0\.0\.1:\d+\/index\.html\?tau=20ps/);
  await context.close();
});

test('thirty thousand unknown link keys: the page loads and counts them', async () => {
  const q = Array.from({ length: 30000 }, (_, i) => `k${i}=1`).join('&');
  const { context, page, problems } = await open(env.browser, fileUrl('index.html') + '?tau=20ps&tw=40ps&fclk=1GHz&fdata=100MHz&stages=2&tsu=30ps&tcq=50ps&' + q);
  assert.match(await page.textContent('#ignored'), /^Ignored unknown parameters in the link: k0, k1, .* and 29990 more$/);
  assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
  assert.deepEqual(problems, []);
  await context.close();
});

test('an ambiguous unit is refused at its field with both readings', async () => {
  const { context, page } = await open(env.browser, fileUrl('index.html'));
  await fill(page, '[name="fclk"]', '400mhz');
  assert.equal(await page.textContent('#m-fclk'), "fclk: '400mhz' is ambiguous: write 400MHz for megahertz or 400mHz for millihertz");
  await context.close();
});

test('a case the browser cannot store is never lost without a word', async () => {
  const { context, page } = await open(env.browser, env.server.url + 'index.html');
  // The storage quota is full for this page's case (as with a large design).
  await page.evaluate(() => {
    const set = Storage.prototype.setItem;
    Storage.prototype.setItem = function (k, v) {
      if (k === 'latchwise:sync') throw new DOMException('quota', 'QuotaExceededError');
      return set.call(this, k, v);
    };
  });
  await fill(page, '[name="tau"]', '23ps');
  assert.equal(await page.isVisible('#unsaved'), true);
  assert.match(await page.textContent('#unsaved'), /not kept: this browser's storage did not take it .*Its link still brings it back/);
  assert.equal(await page.evaluate(() => localStorage.getItem('latchwise:sync')), null, 'no older case left to come back');
  // The link still holds it.
  assert.match(page.url(), /tau=23ps/);
  // Opened again without the link: it says why the case is not there.
  await page.goto(env.server.url + 'index.html');
  await page.waitForSelector('body[data-ready="yes"]');
  assert.equal(await page.inputValue('[name="tau"]'), '20ps', 'the demo case');
  assert.match(await page.textContent('#ignored'), /The last case on this page was not kept \(.*storage did not take it.*\); the demo case is shown/);
  // Once stored again, the notice goes.
  await fill(page, '[name="tau"]', '21ps');
  assert.equal(await page.isVisible('#unsaved'), false);
  assert.match(await page.evaluate(() => localStorage.getItem('latchwise:sync')), /tau=21ps/);
  await context.close();
});
