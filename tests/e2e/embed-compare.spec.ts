import { test, expect, type FrameLocator, type Locator } from '@playwright/test';
import type Database from 'better-sqlite3';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { waitForMessage } from '../support/mailbox';
import { E2E_HOST } from './support/ports';

// A client viewer pins a view, moves a dial and reads both views side by side; "E-mail this view" then sends
// both in one PDF whose figures (read with pdftotext) are the ones on the screen. Reset clears the pin.

const SHOTS = process.env.REVIEW_SHOTS ?? '/tmp/shots/review';
fs.mkdirSync(SHOTS, { recursive: true });
let db: Database.Database;
let firmId: string;
test.beforeAll(() => {
  db = openTestDb(process.env.E2E_DATA_DIR!);
  firmId = firmIdOf(db, 'owner@orrinvale.example');
});
test.afterAll(() => db?.close());

const norm = (s: string) => s.replace(/[\u00a0\u202f\u2009]/g, ' ').replace(/\s+/g, ' ').trim();

function pumpPass(): { passId: string; title: string } {
  return db
    .prepare(
      `select p.id as passId, w.title as title from passes p join clients c on c.id = p.client_id join widgets w on w.id = p.widget_id join models m on m.id = w.model_id
       where p.firm_id = ? and c.name = 'Quillbrook Pumps Ltd' and m.template = 'linear-stack' and p.revoked_at is null`,
    )
    .get(firmId) as { passId: string; title: string };
}

async function settled(box: Locator, before: string | null): Promise<string> {
  let last = '';
  await expect
    .poll(
      async () => {
        const stale = /opacity-60/.test((await box.getAttribute('class')) ?? '');
        const now = stale ? '' : ((await box.locator('p.num').first().textContent()) ?? '');
        const ok = now !== '' && now === last && now !== before;
        last = now;
        return ok;
      },
      { intervals: [1000], timeout: 60_000 },
    )
    .toBe(true);
  return last;
}

test('pin a view, move a dial, compare side by side; the e-mailed PDF carries both views with the screen’s figures; reset clears the pin', async ({ page }) => {
  await page.setViewportSize({ width: 1440, height: 1000 });
  const { passId, title } = pumpPass();
  await page.goto(`${E2E_HOST}/?pass=${passId}`);
  const f: FrameLocator = page.frameLocator(`iframe[title="${title}"]`);
  const box = f.locator('[aria-live="polite"][aria-atomic="true"]').first();
  await expect(box).not.toContainText('Computing');
  const first = await settled(box, null);

  await f.getByRole('button', { name: 'Pin this view' }).click();
  await expect(f.getByRole('status').filter({ hasText: 'A view is pinned' })).toBeVisible();
  const slider = f.locator('input[type="range"]').first();
  await slider.focus();
  await slider.press('End');
  const now = await settled(box, first);

  const compare = f.getByRole('region', { name: 'Pinned view and current view' });
  await expect(compare).toBeVisible();
  const figures = compare.getByRole('table', { name: /Figures of the pinned and the current view/ });
  const headRow = figures.getByRole('row').nth(1);
  const cells = headRow.getByRole('cell');
  await expect(cells.nth(0)).toHaveText(first);
  await expect(cells.nth(1)).toHaveText(now);
  const diff = norm((await cells.nth(2).textContent())!);
  expect(diff).toMatch(/^[+\u2212±]/);
  // Both charts are named images with a legend in words, and each has a table a keyboard reaches.
  await expect(compare.getByRole('img', { name: /S-curves of Gap: current view and pinned view/ })).toBeVisible();
  await expect(compare.getByRole('img', { name: /Spreads of Gap: current view and pinned view/ })).toBeVisible();
  await expect(compare.locator('svg text').filter({ hasText: 'Pinned view (dashed line)' }).first()).toBeVisible();
  await expect(compare.locator('svg text').filter({ hasText: 'Current view (solid line)' }).first()).toBeVisible();
  const dashed = await compare.locator('svg path[stroke-dasharray]').count();
  expect(dashed).toBeGreaterThanOrEqual(2);
  const tableButton = compare.getByRole('button', { name: 'Show as table' }).first();
  await tableButton.focus();
  await page.keyboard.press('Enter');
  await expect(compare.getByRole('table', { name: 'Percentiles of both views' })).toBeVisible();
  await page.keyboard.press('Enter');
  await page.screenshot({ path: `${SHOTS}/embed-compare-1440.png`, fullPage: true });

  // What the screen shows, row by row, for the PDF check.
  const rows: string[][] = [];
  for (const r of await figures.getByRole('row').all()) {
    const texts = (await r.locator('th, td').allTextContents()).map(norm);
    if (texts[0] !== 'Figure') rows.push(texts);
  }

  const to = `compare+${Date.now().toString(36)}@quillbrook-pumps.example`;
  await f.getByRole('button', { name: 'E-mail this view' }).click();
  await f.getByLabel('Send a PDF of both views (pinned and current) to').fill(to);
  const posted = page.waitForResponse((r) => r.url().includes(`/api/embed/passes/${passId}/snapshots`));
  await f.getByRole('button', { name: 'Send PDF' }).click();
  const res = await posted;
  expect(res.status()).toBe(202);
  expect(JSON.parse(res.request().postData() ?? '{}')).toHaveProperty('pinnedDialValues');

  const mailbox = process.env.E2E_MAILBOX_URL!;
  const m = await waitForMessage(mailbox, to, /QP-80|clearance|Gap|ppm/i, 90_000);
  expect(m.text).toContain('both views side by side');
  const bytes = Buffer.from(await (await fetch(`${mailbox}/messages/${m.id}/attachments/0`)).arrayBuffer());
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'compare-pdf-')), 'two-views.pdf');
  fs.writeFileSync(file, bytes);
  const text = norm(execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }));
  expect(text).toContain('Two views side by side');
  expect(text).toContain('Pinned view (dashed line)');
  for (const r of rows.filter((x) => x[0]!.startsWith('Dial: '))) {
    // Dial rows: both values appear in the PDF's table of dial values.
    for (const v of r.slice(1, 3)) expect(text).toContain(v);
  }
  const tableAt = text.indexOf('Figures of both views');
  expect(tableAt).toBeGreaterThan(0);
  for (const r of rows.filter((x) => !x[0]!.startsWith('Dial: '))) {
    const at = text.indexOf(r[0]!, tableAt);
    expect(at, `row ${r[0]} in the PDF`).toBeGreaterThanOrEqual(0);
    const line = text.slice(at, at + r[0]!.length + 120);
    for (const v of r.slice(1, 3)) expect(line, `${r[0]}: ${v}`).toContain(v);
  }

  await f.getByRole('button', { name: 'Reset to the author’s values' }).first().click();
  await expect(compare).toHaveCount(0);
  await expect(f.getByRole('button', { name: 'Pin this view' })).toBeVisible();
});

test('the comparison fits a narrow embed', async ({ page }) => {
  await page.setViewportSize({ width: 390, height: 900 });
  const { passId, title } = pumpPass();
  await page.goto(`${E2E_HOST}/?pass=${passId}`);
  const f = page.frameLocator(`iframe[title="${title}"]`);
  const box = f.locator('[aria-live="polite"][aria-atomic="true"]').first();
  const first = await settled(box, null);
  await f.getByRole('button', { name: 'Pin this view' }).click();
  const slider = f.locator('input[type="range"]').nth(1);
  await slider.focus();
  await slider.press('Home');
  await settled(box, first);
  const compare = f.getByRole('region', { name: 'Pinned view and current view' });
  await expect(compare).toBeVisible();
  const overflow = await compare.evaluate((el) => el.scrollWidth - el.clientWidth);
  expect(overflow).toBeLessThanOrEqual(1);
  await page.screenshot({ path: `${SHOTS}/embed-compare-390.png`, fullPage: true });
});
