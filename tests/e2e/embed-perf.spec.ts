import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { createHash, randomUUID } from 'node:crypto';
import { test, expect, type Frame } from '@playwright/test';
import type Database from 'better-sqlite3';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { E2E_APP, E2E_HOST } from './support/ports';
import { insertEmbedWidget, insertPassRow } from '../integration/api/matrix/embed.rows';

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

// Measurement, not a timed assertion: the first figures after the frame loads. Each load is a fresh browser
// context (nothing cached), through the demo host page, for the demo stack-up at 50,000 trials. In the frame,
// times are from its navigation start: the HTML received, the pass handed over, the widget payload received (with the
// token exchange, or by GET …/widget on the page's own path), the engine worker's first script fetched, and a headline
// showing its first figure (the inline early paint's, before hydration, or the widget's); the widget's footer says
// where that figure came from (the server's stored first figures, or a run in the browser). The demo version was
// published before first figures existed: one unmeasured load queues them (the lazy path), and the measured loads
// start once the worker process has stored them. As a reference measured in the same run, each load alternates with
// one of the same model published as another widget without stored first figures (computed in the browser).
// Figures go to the console and to test-results/embed-first-figures.json.
const LOADS = 7;

test('measure the embed’s first figures after the frame loads (demo stack-up, 50,000 trials)', async ({ browser }) => {
  test.setTimeout(240_000);
  const fdb = openTestDb(process.env.E2E_DATA_DIR!);
  const firmId = firmIdOf(fdb, 'owner@orrinvale.example');
  const client = fdb.prepare("select id from clients where firm_id = ? and name = 'Quillbrook Pumps Ltd'").get(firmId) as { id: string };
  const widget = fdb
    .prepare(
      "select p.id as pass_id, w.title, w.version_id, v.model_json from passes p join widgets w on w.id = p.widget_id join model_versions v on v.id = w.version_id join models m on m.id = w.model_id where p.client_id = ? and m.template = 'linear-stack' and p.revoked_at is null",
    )
    .get(client.id) as { pass_id: string; title: string; version_id: string; model_json: string };
  expect(JSON.parse(widget.model_json).settings.trials).toBe(50_000);
  {
    const context = await browser.newContext();
    const page = await context.newPage();
    await page.goto(`${HOST}/?client=${client.id}`);
    await expect(page.frameLocator(`iframe[title="${widget.title}"]`).locator(HEADLINE).first().locator('.num')).toBeVisible({ timeout: 30_000 });
    await context.close();
  }
  const stored = () => (fdb.prepare("select count(*) as n from first_figures where version_id = ? and state = 'done'").get(widget.version_id) as { n: number }).n;
  await expect.poll(stored, { timeout: 60_000 }).toBeGreaterThan(0);

  // The reference, measured in the same run, interleaved: the same model published as another widget whose first
  // figures are marked failed for this engine build, so its page computes them in the browser (the path every page
  // took before first figures, with the one-request exchange).
  const demo = fdb.prepare('select panels, headline, dial_ids, brand_color from widgets where version_id = ?').get(widget.version_id) as { panels: string; headline: string; dial_ids: string; brand_color: string };
  // Its own title, not the demo model's: later specs find the demo's models by their titles.
  const refTitle = 'First-figures reference, computed in the browser';
  const refWidget = insertEmbedWidget(fdb, firmId, refTitle);
  const refRow = fdb.prepare('select model_id from widgets where id = ?').get(refWidget) as { model_id: string };
  const refVersion = randomUUID();
  const at = new Date().toISOString();
  fdb.prepare("insert into model_versions (id, model_id, firm_id, number, model_json, created_at, check_state, checked_at) values (?,?,?,2,?,?,'signed_off',?)").run(refVersion, refRow.model_id, firmId, widget.model_json, at, at);
  fdb.prepare('update widgets set version_id = ?, panels = ?, headline = ?, dial_ids = ?, brand_color = ? where id = ?').run(refVersion, demo.panels, demo.headline, demo.dial_ids, demo.brand_color, refWidget);
  const build = createHash('sha256').update(fs.readFileSync('.next/workers/simulate-worker.mjs')).digest('hex').slice(0, 32);
  fdb.prepare("insert into first_figures (id, firm_id, version_id, engine_build, state, attempts, next_attempt_at, created_at, updated_at) values (?,?,?,?,'failed',1,?,?,?)").run(randomUUID(), firmId, refVersion, build, at, at, at);
  const refPass = await insertPassRow(fdb, firmId, { clientId: client.id, widgetId: refWidget });

  type Marks = { figure: number | null; html: number; pass: number | null; session: number | null; payload: number | null; worker: number | null; footer: string | null; early: boolean };
  const measure = async (url: string, title: string): Promise<Marks> => {
    const context = await browser.newContext();
    // Runs in every frame before its own scripts; only the embed frame records anything.
    await context.addInitScript((selector: string) => {
      if (!location.pathname.startsWith('/embed/')) return;
      const w = window as unknown as { __first: { figure: number | null; pass: number | null; footer: string | null; early: boolean } };
      w.__first = { figure: null, pass: null, footer: null, early: false };
      window.addEventListener('message', (e) => {
        const d = e.data as { type?: string } | null;
        if (d && d.type === 'stochos:pass' && w.__first.pass === null) w.__first.pass = performance.now();
      });
      const seen = new MutationObserver(() => {
        const h = document.querySelector(selector);
        if (!h || !h.querySelector('.num')) return;
        w.__first.figure = performance.now();
        // Painted by the inline early start (before React), or by the widget itself.
        w.__first.early = Boolean(h.closest('#stochos-early'));
        w.__first.footer = document.querySelector('footer')?.textContent ?? null;
        seen.disconnect();
      });
      seen.observe(document, { childList: true, subtree: true, characterData: true });
    }, HEADLINE);
    const page = await context.newPage();
    await page.goto(url);
    const f = page.frameLocator(`iframe[title="${title}"]`);
    await expect(f.locator(HEADLINE).first().locator('.num')).toBeVisible({ timeout: 30_000 });
    let frame: Frame | null = null;
    for (const x of page.frames().filter((fr) => fr.url().includes('/embed/'))) if ((await x.locator('h1').first().textContent()) === title) frame = x;
    if (!frame) throw new Error(`no frame shows ${title}`);
    await frame.waitForFunction(() => (window as unknown as { __first: { figure: number | null } }).__first.figure !== null);
    // The widget's own footer says where the figures on screen came from (the early paint has none).
    const widgetFooter = await f.locator('footer').first().textContent();
    const marks = await frame.evaluate((widgetFooter) => {
        const w = window as unknown as { __first: { figure: number; pass: number | null; footer: string | null; early: boolean } };
        const nav = performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming;
        const res = performance.getEntriesByType('resource') as PerformanceResourceTiming[];
        const end = (re: RegExp) => res.find((r) => re.test(r.name))?.responseEnd ?? null;
        const start = (re: RegExp) => res.find((r) => re.test(r.name))?.startTime ?? null;
        // The widget payload comes with the token exchange (early start) or, on the page's own path, by GET …/widget.
        const session = end(/\/api\/embed\/session/);
        return { figure: w.__first.figure, html: nav.responseEnd, pass: w.__first.pass, session, payload: end(/\/widget$/) ?? session, worker: start(/turbopack-worker/), footer: w.__first.footer ?? widgetFooter, early: w.__first.early };
    }, widgetFooter);
    await context.close();
    return marks;
  };
  const loads: Marks[] = [];
  const reference: Marks[] = [];
  try {
    for (let i = 0; i < LOADS; i++) {
      loads.push(await measure(`${HOST}/?pass=${widget.pass_id}`, widget.title));
      reference.push(await measure(`${HOST}/?pass=${refPass.passId}`, refTitle));
    }
  } finally {
    // The reference pass leaves the client's portal page to the demo's own widgets for the tests that follow.
    fdb.prepare("update passes set revoked_at = ?, revoke_reason = 'revoked' where id = ?").run(new Date().toISOString(), refPass.passId);
    fdb.close();
  }
  const stats = (xs: number[]) => {
    if (!xs.length) return { median: NaN, min: NaN, max: NaN };
    const s = [...xs].sort((a, b) => a - b);
    const mid = s.length % 2 ? s[(s.length - 1) / 2]! : (s[s.length / 2 - 1]! + s[s.length / 2]!) / 2;
    return { median: +mid.toFixed(1), min: +s[0]!.toFixed(1), max: +s[s.length - 1]!.toFixed(1) };
  };
  const col = (k: keyof Marks, of = loads) => of.map((l) => l[k]).filter((v): v is number => typeof v === 'number');
  const report = {
    measuredAt: new Date().toISOString(),
    trials: 50_000,
    widget: widget.title,
    loads: LOADS,
    fromFrameNavigationStartMs: { firstFigure: stats(col('figure')), htmlReceived: stats(col('html')), passReceived: stats(col('pass')), sessionAnswered: stats(col('session')), payloadReceived: stats(col('payload')), workerScriptRequested: stats(col('worker')) },
    afterPayloadToFirstFigureMs: stats(loads.filter((l) => l.payload !== null).map((l) => l.figure! - l.payload!)),
    footers: loads.map((l) => l.footer?.replace(/\s+/g, ' ').trim() ?? null),
    firstFigureSource: loads.map((l) => (/computed by Stochos/.test(l.footer ?? '') ? 'server' : /computed in your browser/.test(l.footer ?? '') ? 'browser' : 'unknown') + (l.early ? ' (painted before hydration)' : '')),
    raw: loads,
    reference: {
      what: 'the same model as another widget whose first figures are not stored: computed in the browser, loads interleaved with the ones above',
      fromFrameNavigationStartMs: { firstFigure: stats(col('figure', reference)), htmlReceived: stats(col('html', reference)), passReceived: stats(col('pass', reference)), payloadReceived: stats(col('payload', reference)) },
      footers: reference.map((l) => l.footer?.replace(/\s+/g, ' ').trim() ?? null),
      raw: reference,
    },
  };
  fs.mkdirSync('test-results', { recursive: true });
  fs.writeFileSync(path.join('test-results', 'embed-first-figures.json'), JSON.stringify(report, null, 2));
  const ff = report.fromFrameNavigationStartMs;
  console.log(
    `embed first figures: headline after ${ff.firstFigure.median} ms median (min ${ff.firstFigure.min}, max ${ff.firstFigure.max}) from the frame's navigation start over ${LOADS} cold loads at 50,000 trials; HTML ${ff.htmlReceived.median} ms, pass ${ff.passReceived.median} ms, payload ${ff.payloadReceived.median} ms, worker script requested ${ff.workerScriptRequested.median} ms, payload→figure ${report.afterPayloadToFirstFigureMs.median} ms; first figure from ${report.firstFigureSource.join(', ')}; first footers: ${report.footers.slice(0, 3).join(' | ')}`,
  );
  const rf = report.reference.fromFrameNavigationStartMs;
  console.log(
    `embed first figures, reference in the same run (no stored first figures, computed in the browser): headline after ${rf.firstFigure.median} ms median (min ${rf.firstFigure.min}, max ${rf.firstFigure.max}); HTML ${rf.htmlReceived.median} ms, pass ${rf.passReceived.median} ms, payload ${rf.payloadReceived.median} ms; first footers: ${report.reference.footers.slice(0, 2).join(' | ')}`,
  );
  expect(loads).toHaveLength(LOADS);
  expect(reference).toHaveLength(LOADS);
});
