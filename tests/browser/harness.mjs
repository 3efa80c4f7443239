// Shared browser harness: Debian's chromium driven by playwright-core, a static server
// for dist/ on 127.0.0.1, and a guard that fails on any request that leaves the page.
import { chromium } from 'playwright-core';
import assert from 'node:assert/strict';
import { execFileSync, spawnSync } from 'node:child_process';
import { createServer } from 'node:http';
import { readFile } from 'node:fs/promises';
import { fileURLToPath, pathToFileURL } from 'node:url';
import path from 'node:path';

// Tolerances of the browser tests, named as tests/tolerance.rs names the Rust ones.
/** The wasm build brings its own asin/exp/ln, which may differ from the native libm in
 * the last bit; the sine model sums thousands of asin terms, and the counts fit takes
 * Newton steps on exp and ln sums: page against CLI, relative. */
export const WASM_LIBM_REL = 1e-13;
/** The counts fit's goodness of fit: its deviance sums terms k (ln k - ln mu) - (k - mu)
 * that cancel to a total about a thousand times smaller than the terms, so those same
 * last-bit differences grow by that much before the chi-squared tail: relative. */
export const WASM_DEVIANCE_REL = 1e-10;
/** A canvas's backing pixels per CSS pixel round to whole pixels: 0.02 at 300 px. */
export const CANVAS_RATIO_ABS = 0.02;

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
export const dist = path.join(root, 'dist');
export const fileUrl = (page) => pathToFileURL(path.join(dist, page)).href;

const types = { '.html': 'text/html', '.js': 'text/javascript', '.css': 'text/css', '.png': 'image/png' };

/** Serves dist/ on a free loopback port; returns { url, close }. */
export async function serve() {
  const server = createServer(async (req, res) => {
    const rel = decodeURIComponent(new URL(req.url, 'http://x').pathname).replace(/^\/+/, '') || 'index.html';
    const file = path.join(dist, path.normalize(rel));
    if (!file.startsWith(dist)) { res.writeHead(403).end(); return; }
    try {
      const body = await readFile(file);
      res.writeHead(200, { 'content-type': types[path.extname(file)] || 'application/octet-stream' });
      res.end(body);
    } catch {
      res.writeHead(404).end();
    }
  });
  await new Promise((ok) => server.listen(0, '127.0.0.1', ok));
  const { port } = server.address();
  return { url: `http://127.0.0.1:${port}/`, close: () => new Promise((ok) => server.close(ok)) };
}

export async function launch() {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking',
      '--disable-component-update', '--disable-sync', '--no-first-run'],
  });
}

/**
 * Opens `url` in a fresh context and records console errors, page errors and every
 * request that is not to the page's own origin (file:// or the loopback server).
 */
export async function open(browser, url, { width = 1280, height = 900, scale = 1 } = {}) {
  const context = await browser.newContext({ viewport: { width, height }, deviceScaleFactor: scale });
  const page = await context.newPage();
  const problems = [];
  const foreign = [];
  page.on('console', (m) => { if (m.type() === 'error') problems.push(m.text()); });
  page.on('pageerror', (e) => problems.push(String(e)));
  const origin = url.startsWith('file:') ? 'file:' : new URL(url).origin;
  page.on('request', (r) => {
    const u = r.url();
    const own = origin === 'file:' ? u.startsWith('file:') : u.startsWith(origin);
    if (!own && !u.startsWith('blob:') && !u.startsWith('data:')) foreign.push(u);
  });
  await page.goto(url);
  await page.waitForSelector('body[data-ready="yes"], #fatal:not([hidden])', { timeout: 15000 });
  return { context, page, problems, foreign };
}

/** Reads every <output>: name -> { text, value }. */
export async function outputs(page) {
  return page.$$eval('output[name]', (els) => Object.fromEntries(els.map((e) =>
    [e.getAttribute('name'), { text: e.textContent, value: e.dataset.value, state: e.dataset.state }])));
}

/** `latchwise <command> --json ...`; exit 1 (target missed) still prints the report. */
export function cli(command, args) {
  const r = spawnSync(path.join(root, 'target/debug/latchwise'), [command, '--json', ...args], { encoding: 'utf8' });
  assert.ok(r.status === 0 || r.status === 1, r.stderr);
  return JSON.parse(r.stdout);
}

/** Counts canvas pixels that are not white: a drawn chart has thousands. */
export async function inked(page, id) {
  return page.$eval(`#${id}`, (c) => {
    const d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;
    let n = 0;
    for (let i = 0; i < d.length; i += 4) if (d[i] < 200 || d[i + 1] < 200 || d[i + 2] < 200) n++;
    return n;
  });
}

/** Registers before/after hooks: builds the CLI, launches the browser, serves dist/. */
export function setup(hooks) {
  const env = {};
  hooks.before(async () => {
    execFileSync('cargo', ['build', '--quiet', '--locked', '--bin', 'latchwise'], { cwd: root, stdio: 'inherit' });
    env.browser = await launch();
    env.server = await serve();
  });
  hooks.after(async () => {
    await env.browser?.close();
    await env.server?.close();
  });
  return env;
}

/** Waits until the page has handled its queued update: numbers in one animation frame,
 * plots in the next (the page coalesces input events to one update per frame). */
export async function settle(page) {
  await page.evaluate(() => new Promise((ok) => {
    let n = 0;
    const tick = () => (++n >= 3 ? ok() : requestAnimationFrame(tick));
    requestAnimationFrame(tick);
  }));
}

/** Fills a field as a person types it, then lets the page update. */
export async function fill(page, selector, value) {
  await page.fill(selector, value);
  await settle(page);
}

/** Drops `text` as a CSV file named `name` on the element at `selector`, as a person drags a file in. */
export async function dropFile(page, selector, text, name = 'dropped.csv') {
  await page.$eval(selector, (box, [t, n]) => {
    const dt = new DataTransfer();
    dt.items.add(new File([t], n, { type: 'text/csv' }));
    box.dispatchEvent(new DragEvent('drop', { dataTransfer: dt, bubbles: true, cancelable: true }));
  }, [text, name]);
}
