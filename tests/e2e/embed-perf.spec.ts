import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { test, expect } from '@playwright/test';
import type Database from 'better-sqlite3';
import { Client } from '../support/http-client';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { insertEmbedWidget, STACK_MODEL } from '../integration/api/matrix/embed.rows';

// Measurement, not a timed assertion: through the demo host page in Chromium, (1) the time from a dial change
// to the updated headline for the demo stack-up at 50,000 trials, median of 20 moves, and (2) the JavaScript
// the embed page transfers (compressed, as sent). Figures go to the console and to test-results/embed-perf.json.

const APP = 'http://localhost:3200';
const HOST = 'http://localhost:4300';
const MOVES = 20;

let db: Database.Database;
test.afterAll(() => db?.close());

test('measure dial-to-headline time at 50,000 trials and the embed page’s transferred JavaScript', async ({ page, context }) => {
  test.setTimeout(180_000);
  expect((STACK_MODEL as { settings: { trials: number } }).settings.trials).toBe(50_000);
  db = openTestDb(process.env.E2E_DATA_DIR!);
  const author = new Client(APP);
  expect((await author.signIn('author@orrinvale.example', 'stochos-demo-2026')).ok).toBe(true);
  const client = await author.json<{ client: { id: string } }>('POST', '/api/clients', { name: `Perf client ${Date.now().toString(36)}`, allowedOrigins: [HOST] });
  const widgetId = insertEmbedWidget(db, firmIdOf(db, 'owner@orrinvale.example'), 'Perf: shaft float');
  const pass = await author.json<{ pass: { id: string } }>('POST', '/api/passes', { clientId: client.body.client.id, widgetId });
  expect(pass.status).toBe(201);

  // Every JavaScript file the browser fetched from the app's origin: the page's and the engine worker's.
  const jsUrls = new Set<string>();
  context.on('response', (r) => {
    const url = new URL(r.url());
    if (url.origin === APP && /javascript/.test(r.headers()['content-type'] ?? '')) jsUrls.add(url.pathname);
  });

  await page.goto(`${HOST}/?pass=${pass.body.pass.id}`);
  const f = page.frameLocator('iframe[title="Perf: shaft float"]');
  const headline = f.getByTestId('widget-headline');
  await expect(headline).toBeVisible();
  await expect(headline).not.toHaveText('');
  const frame = page.frames().find((x) => x.url().includes(`/embed/${pass.body.pass.id}`))!;

  // In the frame: the key event's time stamp, then the time the headline's text next changes.
  await frame.evaluate(() => {
    const w = window as unknown as { __perf: { t0: number | null; marks: number[] } };
    w.__perf = { t0: null, marks: [] };
    document.addEventListener('keydown', (e) => (w.__perf.t0 = e.timeStamp), true);
    const h = document.querySelector('[data-testid="widget-headline"]')!;
    let last = h.textContent;
    new MutationObserver(() => {
      if (h.textContent === last || w.__perf.t0 === null) return;
      last = h.textContent;
      w.__perf.marks.push(performance.now() - w.__perf.t0);
      w.__perf.t0 = null;
    }).observe(h, { childList: true, subtree: true, characterData: true });
  });
  const slider = f.getByRole('slider').first();
  await slider.focus();
  await slider.press('Home');
  await expect.poll(() => frame.evaluate(() => (window as unknown as { __perf: { marks: number[] } }).__perf.marks.length)).toBe(1);
  await frame.evaluate(() => ((window as unknown as { __perf: { marks: number[] } }).__perf.marks = []));
  for (let i = 0; i < MOVES; i++) {
    await slider.press(i < MOVES / 2 ? 'ArrowRight' : 'ArrowLeft');
    await expect.poll(() => frame.evaluate(() => (window as unknown as { __perf: { marks: number[] } }).__perf.marks.length), { timeout: 10_000 }).toBe(i + 1);
  }
  const marks = await frame.evaluate(() => (window as unknown as { __perf: { marks: number[] } }).__perf.marks);
  const sorted = [...marks].sort((a, b) => a - b);
  const median = (sorted[MOVES / 2 - 1]! + sorted[MOVES / 2]!) / 2;

  // Sizes as sent on the wire: the body bytes the server sends to a browser that accepts compression (Chromium's
  // own per-response sizes miss worker scripts, so each file is fetched once more, raw, with the browser's header).
  const wire = (p: string) =>
    new Promise<{ url: string; bytes: number; encoding: string }>((resolve, reject) => {
      http
        .get(APP + p, { headers: { 'accept-encoding': 'gzip, deflate, br, zstd' } }, (res) => {
          let bytes = 0;
          res.on('data', (c: Buffer) => (bytes += c.length));
          res.on('end', () => resolve({ url: p, bytes, encoding: String(res.headers['content-encoding'] ?? 'identity') }));
        })
        .on('error', reject);
    });
  const js = await Promise.all([...jsUrls].map(wire));
  const embedJs = js.filter((x) => !x.url.endsWith('/embed/stochos-embed.js'));
  const loader = js.find((x) => x.url.endsWith('/embed/stochos-embed.js'));
  const total = embedJs.reduce((s, x) => s + x.bytes, 0);
  const report = {
    measuredAt: new Date().toISOString(),
    trials: 50_000,
    dialToHeadlineMs: { median: +median.toFixed(1), min: +sorted[0]!.toFixed(1), max: +sorted[MOVES - 1]!.toFixed(1), moves: marks.map((m) => +m.toFixed(1)) },
    embedPageJavaScript: { bytesTransferred: total, kilobytes: +(total / 1024).toFixed(1), files: embedJs.length, byFile: embedJs.sort((a, b) => b.bytes - a.bytes) },
    hostLoaderBytes: loader?.bytes ?? null,
  };
  fs.mkdirSync('test-results', { recursive: true });
  fs.writeFileSync(path.join('test-results', 'embed-perf.json'), JSON.stringify(report, null, 2));
  console.log(`embed perf: dial→headline median ${report.dialToHeadlineMs.median} ms (min ${report.dialToHeadlineMs.min}, max ${report.dialToHeadlineMs.max}) over ${MOVES} moves at 50,000 trials; embed page JavaScript ${report.embedPageJavaScript.kilobytes} KiB compressed in ${embedJs.length} files; loader ${loader ? (loader.bytes / 1024).toFixed(1) : '?'} KiB`);
  expect(marks).toHaveLength(MOVES);
  expect(embedJs.length).toBeGreaterThan(0);
});
