// Real-browser tests of the synchronizer's models beyond one tau: the section stays out of
// the way until used, every new input reads and refuses as the command line does, and the
// duty and phase plots appear only when they apply.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { setup, open, fileUrl, outputs, cli, fill, settle, inked } from './harness.mjs';

const env = setup({ before, after });
const base = { tw: '40ps', fclk: '500MHz', fdata: '100MHz', stages: '2', tsu: '30ps', tcq: '50ps' };

test('the section is closed on the demo case and opens for a case that uses it', async () => {
  const { context, page } = await open(env.browser, fileUrl('index.html'));
  assert.equal(await page.$eval('#beyond', (d) => d.open), false);
  for (const id of ['plot-duty', 'plot-phase']) assert.equal(await page.isVisible(`#${id}`), false, id);
  await context.close();
  const q = new URLSearchParams({ tau: '20ps', ...base, ratio: '4/5', jitter: '10ps' }).toString();
  const second = await open(env.browser, fileUrl('index.html') + '?' + q);
  assert.equal(await second.page.$eval('#beyond', (d) => d.open), true);
  await second.context.close();
});

test('related clocks: the factor, the worst and best phase, and the phase plot, as the CLI says', async () => {
  const c = { tau: '20ps', ...base, ratio: '4/5', jitter: '10ps', 'target-years': '1e5' };
  const { context, page, problems } = await open(env.browser, fileUrl('index.html') + '?' + new URLSearchParams(c));
  const out = await outputs(page);
  const want = cli('sync', Object.entries(c).flatMap(([k, v]) => [`--${k}`, v]));
  assert.equal(Number(out.log10_clock_factor.value), want.log10_clock_factor);
  assert.equal(Number(out.log10_mtbf_s.value), want.log10_mtbf_s);
  assert.match(out.log10_clock_factor.text, /^19\.9 \(worst phase\)$/);
  assert.equal(out.standard_formula_safe.text, 'no');
  assert.match(out.max_fclk_hz.text, /related clocks/);
  assert.equal(await page.isVisible('#plot-phase'), true);
  assert.ok(await inked(page, 'plot-phase') > 2000);
  assert.equal(await page.isVisible('#plot-duty'), false);
  assert.deepEqual(problems, []);
  await context.close();
});

test('master-slave bound and a tau per hop, as the CLI says', async () => {
  for (const c of [
    { 'tau-master': '20ps', 'tau-slave': '30ps', duty: '0.4', tw: '10ps', tw2: '30ps', fclk: '1GHz', fdata: '100MHz', stages: '3' },
    { tau: '14ps,22ps', ...base, stages: '3', fclk: '1GHz' },
  ]) {
    const { context, page } = await open(env.browser, fileUrl('index.html') + '?' + new URLSearchParams(c));
    const out = await outputs(page);
    const want = cli('sync', Object.entries(c).flatMap(([k, v]) => [`--${k}`, v]));
    assert.equal(Number(out.log10_mtbf_s.value), want.log10_mtbf_s, JSON.stringify(c));
    if (c['tau-master']) {
      assert.equal(Number(out.tau_eff_s.value), want.tau_eff_s);
      assert.equal(await page.isVisible('#plot-duty'), true);
      assert.match(await page.textContent('#facts'), /master-slave lower bound/);
    } else {
      assert.match(await page.textContent('#facts'), /Each hop's share of the margin: hop 1 \(tau 14 ps\)/);
    }
    await context.close();
  }
});

test('every new field refuses a bad value beside itself and recovers', async () => {
  const { context, page } = await open(env.browser, fileUrl('index.html'));
  await page.click('#beyond summary');
  await fill(page, '[name="ratio"]', '0/1');
  await fill(page, '[name="jitter"]', '10ps');
  assert.match(await page.textContent('#m-ratio'), /'0\/1' is not a ratio/);
  await fill(page, '[name="ratio"]', '1.5/2');
  assert.match(await page.textContent('#m-ratio'), /not a ratio/);
  await fill(page, '[name="ratio"]', '4/5');
  await fill(page, '[name="jitter"]', '-3ps');
  assert.match(await page.textContent('#m-jitter'), /negative time/);
  await fill(page, '[name="jitter"]', '');
  await fill(page, '[name="ratio"]', '');
  await fill(page, '[name="tau"]', '14ps,22ps');
  assert.match(await page.textContent('#m-tau'), /2 values given, 1 wanted/);
  await fill(page, '[name="tau"]', '');
  await fill(page, '[name="tau-master"]', '20ps');
  await fill(page, '[name="tau-slave"]', '30ps');
  await fill(page, '[name="duty"]', '1.5');
  assert.match(await page.textContent('#m-duty'), /out of range|too large/);
  await fill(page, '[name="duty"]', '0.5');
  assert.equal(await page.$eval('body', (b) => b.dataset.valid), 'yes');
  await page.selectOption('[name="crossing"]', 'gray');
  await fill(page, '[name="increments"]', '50MHz');
  const out = await outputs(page);
  assert.equal(out.fdata_hz.text, '50 MHz');
  assert.equal(await page.$eval('[name="fdata"]', (e) => e.closest('.field').dataset.unused), 'yes');
  await context.close();
});

test('results of models the case does not use are left out, not dashed', async () => {
  const { context, page } = await open(env.browser, fileUrl('index.html'));
  const shown = () => page.$$eval('output[name]', (els) => els
    .filter((e) => e.offsetParent !== null).map((e) => e.getAttribute('name')));
  let names = await shown();
  for (const n of ['log10_clock_factor', 'tau_eff_s', 'log10_expected_failures']) assert.ok(!names.includes(n), n);
  assert.ok(names.includes('log10_fit'));
  // Related clocks without a phase: K once, at the worst phase.
  await page.evaluate(() => { document.getElementById('beyond').open = true; });
  await page.fill('[name="ratio"]', '4/5');
  await fill(page, '[name="jitter"]', '8ps');
  names = await shown();
  assert.ok(names.includes('log10_clock_factor'));
  assert.ok(!names.includes('log10_clock_factor_worst'));
  assert.match(await page.textContent('output[name="log10_clock_factor"]'), /worst phase/);
  await context.close();
});
