import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { test, expect, type Frame } from '@playwright/test';
import type Database from 'better-sqlite3';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { E2E_APP, E2E_HOST } from './support/ports';

// Measurement, not a timed assertion: through the demo host page in Chromium, (1) the time from a dial change
// to the updated headline for the demo stack-up at 50,000 trials, median of 20 moves, and (2) the JavaScript
// the embed page transfers (compressed, as sent). Figures go to the console and to test-results/embed-perf.json.

const APP = E2E_APP;
const HOST = E2E_HOST;
const MOVES = 20;
// The headline figure's live region in the widget.
const HEADLINE = '[aria-live="polite"][aria-atomic="true"]';

let db: Database.Database;
test.afterAll(() => db?.close());

test('measure dial-to-headline time at 50,000 trials and the embed page’s transferred JavaScript', async ({ page, context }) => {
  test.setTimeout(180_000);
  // The demo stack-up, seeded with 50,000 trials, as the seeded client sees it on the demo host page.
  db = openTestDb(process.env.E2E_DATA_DIR!);
  const firmId = firmIdOf(db, 'owner@orrinvale.example');
  const client = db.prepare("select id from clients where firm_id = ? and name = 'Quillbrook Pumps Ltd'").get(firmId) as { id: string };
  const widget = db
    .prepare(
      "select w.title, v.model_json from passes p join widgets w on w.id = p.widget_id join model_versions v on v.id = w.version_id join models m on m.id = w.model_id where p.client_id = ? and m.template = 'linear-stack' and p.revoked_at is null",
    )
    .get(client.id) as { title: string; model_json: string };
  expect(JSON.parse(widget.model_json).settings.trials).toBe(50_000);

  // Every JavaScript file the browser fetched from the app's origin: the page's and the engine worker's.
  const jsUrls = new Set<string>();
  context.on('response', (r) => {
    const url = new URL(r.url());
    if (url.origin === APP && /javascript/.test(r.headers()['content-type'] ?? '')) jsUrls.add(url.pathname);
  });

  await page.goto(`${HOST}/?client=${client.id}`);
  const f = page.frameLocator(`iframe[title="${widget.title}"]`);
  const headline = f.locator(HEADLINE).first();
  await expect(headline).toBeVisible();
  await expect(headline).not.toContainText('Computing');
  let target: Frame | null = null;
  for (const x of page.frames().filter((fr) => fr.url().includes('/embed/'))) if ((await x.locator('h1').first().textContent()) === widget.title) target = x;
  if (!target) throw new Error(`no frame shows ${widget.title}`);

  // In the frame: the key event's time stamp, then the moment the headline shows the new run's figure. The
  // widget dims the headline (opacity-60) while its figure is stale; an update is the figure changing, or the
  // dimming ending, whichever marks the new result.
  await target.evaluate((selector) => {
    const w = window as unknown as { __perf: { t0: number | null; marks: number[] } };
    w.__perf = { t0: null, marks: [] };
    document.addEventListener('keydown', (e) => (w.__perf.t0 = e.timeStamp), true);
    const h = document.querySelector(selector)!;
    let last = h.textContent;
    let sawStale = false;
    new MutationObserver(() => {
      if (w.__perf.t0 === null) return;
      if (h.classList.contains('opacity-60')) {
        sawStale = true;
        return;
      }
      if (h.textContent === last && !sawStale) return;
      last = h.textContent;
      sawStale = false;
      w.__perf.marks.push(performance.now() - w.__perf.t0);
      w.__perf.t0 = null;
    }).observe(h, { attributes: true, attributeFilter: ['class'], childList: true, subtree: true, characterData: true });
  }, HEADLINE);
  const marksLength = () => target!.evaluate(() => (window as unknown as { __perf: { marks: number[] } }).__perf.marks.length);
  const slider = f.getByRole('slider').first();
  await slider.focus();
  await slider.press('Home');
  await expect.poll(marksLength).toBe(1);
  await target.evaluate(() => ((window as unknown as { __perf: { marks: number[] } }).__perf.marks = []));
  for (let i = 0; i < MOVES; i++) {
    await slider.press(i < MOVES / 2 ? 'ArrowRight' : 'ArrowLeft');
    await expect.poll(marksLength, { timeout: 10_000 }).toBe(i + 1);
  }
  const marks = await target.evaluate(() => (window as unknown as { __perf: { marks: number[] } }).__perf.marks);
  const sorted = [...marks].sort((a, b) => a - b);
  const median = (sorted[MOVES / 2 - 1]! + sorted[MOVES / 2]!) / 2;
  const runMs = await f.locator('footer').first().textContent();
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
    widget: widget.title,
    footerAfterLastMove: runMs?.trim() ?? null,
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
