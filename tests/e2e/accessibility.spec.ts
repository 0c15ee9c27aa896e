import { test, expect, type Browser, type Page } from '@playwright/test';
import AxeBuilder from '@axe-core/playwright';
import type Database from 'better-sqlite3';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { E2E_HOST } from './support/ports';

// axe (WCAG 2.1 A and AA) on every screen a user reaches: signed out, as each role, the client's embed with a
// pinned comparison, the docs and the development mailbox. A new screen gets a line here.

const TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];
// Many screens per test: each loads, settles and is read by axe.
test.describe.configure({ timeout: 300_000 });
let db: Database.Database;
let firmId: string;
test.beforeAll(() => {
  db = openTestDb(process.env.E2E_DATA_DIR!);
  firmId = firmIdOf(db, 'owner@orrinvale.example');
});
test.afterAll(() => db?.close());

async function signedIn(browser: Browser, email: string): Promise<Page> {
  const ctx = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  const page = await ctx.newPage();
  await page.goto('/sign-in');
  await page.getByLabel(/e-mail/i).first().fill(email);
  await page.getByLabel(/password/i).fill('stochos-demo-2026');
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await expect(page).toHaveURL(/\/app\//);
  return page;
}

/** Opens a screen, waits until nothing is loading, and expects no violation. */
async function check(page: Page, url: string, ready?: (page: Page) => Promise<void>): Promise<void> {
  await page.goto(url);
  await page.waitForLoadState('networkidle');
  await expect(page.getByText(/^Loading/)).toHaveCount(0, { timeout: 30_000 });
  if (ready) await ready(page);
  const r = await new AxeBuilder({ page }).withTags(TAGS).analyze();
  expect(
    r.violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`),
    `axe on ${url}`,
  ).toEqual([]);
}

const one = (sql: string, ...args: unknown[]) => db.prepare(sql).get(...args) as Record<string, string>;

test('signed-out screens, the docs and the development mailbox', async ({ page }) => {
  for (const url of ['/', '/sign-in', '/sign-up', '/sign-in/check-email', '/invite/not-a-real-token', '/docs/model-json', '/dev/mailbox']) await check(page, url);
  // The docs' scrolling code blocks take keyboard focus and carry a name.
  await page.goto('/docs/model-json');
  const block = page.getByRole('region', { name: /complete example model JSON/ }).first();
  await block.focus();
  await expect(block).toBeFocused();
});

test('every screen of the owner', async ({ browser }) => {
  const page = await signedIn(browser, 'owner@orrinvale.example');
  const model = one(`select id from models where firm_id = ? and template = 'linear-stack'`, firmId);
  const dataset = one('select id from datasets where firm_id = ?', firmId);
  const pass = one(`select p.id, p.client_id from passes p join clients c on c.id = p.client_id where p.firm_id = ? and c.name = 'Quillbrook Pumps Ltd'`, firmId);
  for (const url of [
    '/app/models',
    `/app/models/${model.id}`,
    `/app/models/${model.id}/versions/1`,
    '/app/datasets',
    `/app/datasets/${dataset.id}`,
    '/app/clients',
    `/app/clients/${pass.client_id}`,
    `/app/clients/${pass.client_id}/passes/${pass.id}`,
    '/app/snapshots',
    '/app/team',
    '/app/billing',
    '/app/settings',
    '/app/audit',
    '/app/reviews', // not a checker: the no-access page
  ])
    await check(page, url);
});

test('every screen of the checker and the author, with the count of versions to check', async ({ browser }) => {
  const checker = await signedIn(browser, 'checker@orrinvale.example');
  const model = one(`select id from models where firm_id = ? and template = 'linear-stack'`, firmId);
  const quay = one(`select id from models where firm_id = ? and template = 'cost-range'`, firmId);
  await check(checker, '/app/reviews', async (p) => {
    await expect(p.getByTestId('review-count')).toBeVisible();
  });
  await check(checker, `/app/models/${model.id}/versions/2/check`);
  await check(checker, '/app/settings');
  const author = await signedIn(browser, 'author2@orrinvale.example');
  await check(author, `/app/models/${quay.id}`, async (p) => {
    // The live preview has run once: its status line reads "Last run: 20 000 trials in 2.48 s" (the small print
    // below the figures names trials and seed as glossary buttons, so its text is split across elements).
    await expect(p.getByRole('region', { name: 'Live preview' }).getByText(/^Last run: .+ trials in /)).toBeVisible({ timeout: 60_000 });
  });
  await check(author, '/app/settings');
});

test('the client viewer’s embed, with a pinned view beside the current one', async ({ page }) => {
  const pass = one(
    `select p.id from passes p join clients c on c.id = p.client_id join widgets w on w.id = p.widget_id join models m on m.id = w.model_id where p.firm_id = ? and c.name = 'Quillbrook Pumps Ltd' and m.template = 'linear-stack'`,
    firmId,
  );
  // The frame as the client's portal shows it: the loader on the host page hands the pass over by postMessage
  // (lib/dev/host-page.ts), so the frame's own address carries no pass and cannot be opened on its own.
  await page.setViewportSize({ width: 1440, height: 1000 });
  await page.goto(`${E2E_HOST}/?pass=${pass.id}`);
  const f = page.frameLocator('iframe').first();
  await expect(f.getByRole('button', { name: 'Pin this view' })).toBeEnabled({ timeout: 60_000 });
  await f.getByRole('button', { name: 'Pin this view' }).click();
  const slider = f.locator('input[type="range"]').first();
  await slider.focus();
  await slider.press('End');
  await expect(f.getByRole('region', { name: 'Pinned view and current view' })).toBeVisible();
  await expect(f.getByText(/^Loading/)).toHaveCount(0, { timeout: 30_000 });
  await page.waitForTimeout(1500);
  // axe reads the portal page and the frame inside it.
  const framed = await new AxeBuilder({ page }).withTags(TAGS).analyze();
  expect(
    framed.violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`),
    'axe on the portal page with the pinned view in its frame',
  ).toEqual([]);
  // It did read inside the frame: checks that passed there name the iframe first, then the element in it.
  expect(framed.passes.some((r) => r.nodes.some((n) => n.target.length > 1))).toBe(true);
  await page.goto(`${E2E_HOST}/`);
  const r = await new AxeBuilder({ page }).withTags(TAGS).analyze();
  expect(r.violations.map((v) => v.id), 'the demo portal index').toEqual([]);
});
