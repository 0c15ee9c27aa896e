import { randomUUID } from 'node:crypto';
import { test, expect, type Page } from '@playwright/test';
import type Database from 'better-sqlite3';
import { Client } from '../support/http-client';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { insertEmbedWidget } from '../integration/api/matrix/embed.rows';
import { E2E_APP } from './support/ports';
import { validateModel, type CheckedModel } from '@/lib/core/engine/schema';
import { EXAMPLE_MODELS } from '@/lib/core/engine/examples';
import { runCheckedModelSync, type RunResult } from '@/lib/core/engine';
import { decodeRunResult, encodeRunResult } from '@/lib/core/embed/first-figures';

// The embed's first figures in Chromium. A version published without stored first figures (written straight into the
// database, as before they existed) still shows figures, computed in the browser, and its first load queues the
// server's computation; the next load shows the stored figures at once, painted before the page hydrates, with a
// footer saying where they came from until a dial moves. The stored result, the browser's run through the embed and a
// Node run of the same version are equal bit for bit (all but the wall-clock timing).

const APP = E2E_APP;
let db: Database.Database;
let firmId: string;
let author: Client;

test.beforeAll(async () => {
  db = openTestDb(process.env.E2E_DATA_DIR!);
  firmId = firmIdOf(db, 'owner@orrinvale.example');
  author = new Client(APP);
  expect((await author.signIn('author@orrinvale.example', 'stochos-demo-2026')).ok).toBe(true);
});
test.afterAll(() => db?.close());

/** Everything a run reproduces: the wall-clock timing is not part of the result. */
const reproducible = (r: RunResult) => JSON.parse(encodeRunResult({ ...r, timing: { samplingMs: 0, statisticsMs: 0, totalMs: 0 } })) as unknown;

/**
 * Records every RunResult the widget renders, read from React's commits through the developer-tools hook (present
 * in production builds), encoded in the page exactly as the server stores results. Test-only: the product has no hook.
 */
async function recordResults(page: Page): Promise<void> {
  await page.addInitScript(() => {
    const w = window as unknown as { __results: string[]; __earlyPaint: boolean; __violations: string[]; __REACT_DEVTOOLS_GLOBAL_HOOK__?: unknown };
    w.__results = [];
    w.__earlyPaint = false;
    // The early paint runs under the page's nonce policy: any violation is recorded.
    w.__violations = [];
    document.addEventListener('securitypolicyviolation', (e) => w.__violations.push(`${e.violatedDirective} ${e.blockedURI}`));
    const seen = new WeakSet<object>();
    const enc = (r: object) =>
      JSON.stringify({ ...r, samples: null }, (_k, v: unknown) => {
        if (typeof v !== 'number') return v;
        if (Number.isNaN(v)) return { $num: 'NaN' };
        if (v === Infinity) return { $num: 'Infinity' };
        if (v === -Infinity) return { $num: '-Infinity' };
        if (Object.is(v, -0)) return { $num: '-0' };
        return v;
      });
    type Fiber = { memoizedProps?: { result?: { run?: unknown; outputs?: unknown } } | null; child: Fiber | null; sibling: Fiber | null };
    w.__REACT_DEVTOOLS_GLOBAL_HOOK__ = {
      supportsFiber: true,
      isDisabled: false,
      renderers: new Map(),
      inject: () => 1,
      checkDCE: () => undefined,
      onCommitFiberUnmount: () => undefined,
      onPostCommitFiberRoot: () => undefined,
      onCommitFiberRoot: (_id: number, root: { current: Fiber }) => {
        const stack: Fiber[] = [root.current];
        while (stack.length) {
          const f = stack.pop()!;
          const r = f.memoizedProps?.result;
          if (r && typeof r === 'object' && r.run && r.outputs && !seen.has(r)) {
            seen.add(r);
            w.__results.push(enc(r));
          }
          if (f.sibling) stack.push(f.sibling);
          if (f.child) stack.push(f.child);
        }
      },
    };
    // The inline early start paints into #stochos-early before React hydrates.
    new MutationObserver(() => {
      if (document.querySelector('#stochos-early .num')) w.__earlyPaint = true;
    }).observe(document, { childList: true, subtree: true });
  });
}

const results = async (page: Page): Promise<RunResult[]> =>
  (await page.evaluate(() => (window as unknown as { __results: string[] }).__results)).map((t) => decodeRunResult(JSON.parse(t)));

/** Waits until the widget has no run in flight and its last result is complete, and returns that result. */
async function settled(page: Page): Promise<RunResult> {
  await expect(page.getByText('Updating')).toHaveCount(0);
  await expect(page.locator('[aria-busy="true"]')).toHaveCount(0);
  const all = await results(page);
  expect(all.length).toBeGreaterThan(0);
  return all[all.length - 1]!;
}

async function publishExample(title: string, model: CheckedModel, dialIds: string[] | null): Promise<{ passId: string; token: string; versionId: string }> {
  const widgetId = insertEmbedWidget(db, firmId, title);
  const w = db.prepare('select version_id, model_id from widgets where id = ?').get(widgetId) as { version_id: string; model_id: string };
  let versionId = w.version_id;
  if (dialIds === null || model.template !== 'linear-stack') {
    // Versions are immutable: the example goes in as a second one.
    versionId = randomUUID();
    const at = new Date().toISOString();
    db.prepare("insert into model_versions (id, model_id, firm_id, number, model_json, created_at, check_state, checked_at) values (?,?,?,2,?,?,'signed_off',?)").run(versionId, w.model_id, firmId, JSON.stringify(model), at, at);
    db.prepare('update models set template = ?, draft_json = ? where id = ?').run(model.template, JSON.stringify(model), w.model_id);
    db.prepare('update widgets set version_id = ?, dial_ids = ? where id = ?').run(versionId, JSON.stringify(dialIds ?? []), widgetId);
  }
  const c = await author.json<{ client: { id: string } }>('POST', '/api/clients', { name: `First figures ${randomUUID().slice(0, 8)}`, allowedOrigins: ['http://localhost:4200'], allowedEmailDomains: ['e2e-client.example'] });
  expect(c.status).toBe(201);
  const r = await author.json<{ pass: { id: string; snippet: string } }>('POST', '/api/passes', { clientId: c.body.client.id, widgetId });
  expect(r.status).toBe(201);
  return { passId: r.body.pass.id, token: /data-stochos-token="([^"]+)"/.exec(r.body.pass.snippet)![1]!, versionId };
}

const storedResult = (versionId: string): RunResult | null => {
  const row = db.prepare("select result_json from first_figures where version_id = ? and state = 'done'").get(versionId) as { result_json: string } | undefined;
  return row ? decodeRunResult(JSON.parse(row.result_json)) : null;
};

const checked = (m: unknown): CheckedModel => {
  const r = validateModel(m);
  if (!r.ok) throw new Error('example does not validate');
  return r.model;
};

for (const [name, model, dials] of [
  ['tolerance stack-up with dials', checked(EXAMPLE_MODELS['linear-stack']), true],
  ['correlated cost range', checked(EXAMPLE_MODELS['cost-range']), false],
] as const) {
  test(`first figures of a ${name}: the browser's fallback, the stored result and a Node run agree bit for bit`, async ({ browser }) => {
    test.setTimeout(120_000);
    const p = await publishExample(`First figures: ${name}`, model, dials ? model.dials.map((d) => d.id) : null);
    const link = `${APP}/embed/${p.passId}#pass=${encodeURIComponent(p.token)}`;
    const inNode = reproducible(runCheckedModelSync(model, { samples: 'none' }));

    // 1. Published before first figures existed: the page computes the figures itself, as before.
    const first = await browser.newContext();
    const a = await first.newPage();
    await recordResults(a);
    await a.goto(link);
    await expect(a.locator('footer').first()).toContainText('computed in your browser', { timeout: 30_000 });
    await expect(a.locator('[aria-live="polite"][aria-atomic="true"] .num').first()).toBeVisible();
    const browserRun = await settled(a);
    expect(await a.evaluate(() => (window as unknown as { __earlyPaint: boolean }).__earlyPaint)).toBe(false);
    await first.close();
    expect(reproducible(browserRun)).toEqual(inNode);

    // 2. That load queued the computation (the lazy path); the worker process stores it.
    await expect.poll(() => storedResult(p.versionId) !== null, { timeout: 60_000 }).toBe(true);
    expect(reproducible(storedResult(p.versionId)!)).toEqual(inNode);

    // 3. The next load shows the stored figures at once, painted before hydration, and says where they came from.
    const second = await browser.newContext();
    const b = await second.newPage();
    await recordResults(b);
    await b.goto(link);
    const footer = b.locator('footer').first();
    await expect(footer).toContainText('computed by Stochos for the author’s values on', { timeout: 30_000 });
    expect(await b.evaluate(() => (window as unknown as { __earlyPaint: boolean }).__earlyPaint)).toBe(true);
    expect(await b.evaluate(() => (window as unknown as { __violations: string[] }).__violations)).toEqual([]);
    const shown = await results(b);
    expect(reproducible(shown[0]!)).toEqual(inNode);
    // The cautions are beside the figures (DESIGN.md §12).
    await expect(b.getByRole('note', { name: 'Cautions' })).toContainText(model.template === 'cost-range' ? 'Cost results' : 'Tolerance results');

    if (dials) {
      // 4. A dial move runs in the browser and the footer says so; back at the author's values, the browser's own
      // run equals the stored figures.
      const slider = b.getByRole('slider').first();
      await slider.focus();
      await slider.press('ArrowRight');
      await expect(footer).toContainText('computed in your browser', { timeout: 30_000 });
      await settled(b);
      await b.getByRole('button', { name: 'Reset to the author’s values' }).click();
      await expect(b.getByRole('button', { name: 'Reset to the author’s values' })).toBeDisabled();
      await expect(footer).toContainText('computed in your browser');
      const again = await settled(b);
      expect(again.run.dialValues).toEqual(shown[0]!.run.dialValues);
      expect(reproducible(again)).toEqual(inNode);
    }
    await second.close();
  });
}
