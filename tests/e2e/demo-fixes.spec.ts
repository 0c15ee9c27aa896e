import { test, expect, type Browser, type Page } from '@playwright/test';
import type Database from 'better-sqlite3';
import fs from 'node:fs';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { E2E_HOST } from './support/ports';

// What a user met in the demo: each client's own portal page, the stack headline's normal estimate explained,
// names and dial rows with room in the studio, a "Unicode text" CSV read, and a dataset histogram that counts
// measurements, not trials.

const SHOTS = process.env.REVIEW_SHOTS ?? '/tmp/shots/review';
fs.mkdirSync(SHOTS, { recursive: true });
let db: Database.Database;
let firmId: string;
test.beforeAll(() => {
  db = openTestDb(process.env.E2E_DATA_DIR!);
  firmId = firmIdOf(db, 'owner@orrinvale.example');
});
test.afterAll(() => db?.close());

async function signedIn(browser: Browser, email: string, width = 1440): Promise<Page> {
  const ctx = await browser.newContext({ viewport: { width, height: 1000 } });
  const page = await ctx.newPage();
  await page.goto('/sign-in');
  await page.getByLabel(/e-mail/i).first().fill(email);
  await page.getByLabel(/password/i).fill('stochos-demo-2026');
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await expect(page).toHaveURL(/\/app\//);
  return page;
}

const clientId = (name: string) => (db.prepare('select id from clients where firm_id = ? and name = ?').get(firmId, name) as { id: string }).id;

test('each demo client has its own portal page with only its own widgets; the stack headline says what the normal estimate assumes', async ({ page }) => {
  await page.goto(`${E2E_HOST}/`);
  await expect(page.getByRole('heading', { name: 'Demo client portals' })).toBeVisible();
  await expect(page.getByRole('link', { name: 'Quillbrook Pumps Ltd' })).toBeVisible();
  await expect(page.getByRole('link', { name: 'Saltmere Harbour Trust' })).toBeVisible();
  await expect(page.locator('iframe')).toHaveCount(0);

  await page.getByRole('link', { name: 'Quillbrook Pumps Ltd' }).click();
  await expect(page).toHaveURL(new RegExp(`client=${clientId('Quillbrook Pumps Ltd')}`));
  await expect(page.locator('header .brand')).toHaveText('Quillbrook Pumps Ltd');
  await expect(page.locator('iframe[title^="QP-80"]')).toHaveCount(1);
  await expect(page.locator('iframe[title*="Quay"]')).toHaveCount(0);
  const f = page.frameLocator('iframe[title^="QP-80"]');
  const headline = f.locator('[aria-live="polite"][aria-atomic="true"]').first();
  await expect(headline).toContainText('a normal gap with this mean and standard deviation would give', { timeout: 60_000 });
  await expect(headline).toContainText(/the count is (lower|higher) because|close to the count/);
  await page.screenshot({ path: `${SHOTS}/portal-quillbrook.png`, fullPage: true });

  await page.goto(`${E2E_HOST}/?client=${clientId('Saltmere Harbour Trust')}`);
  await expect(page.locator('header .brand')).toHaveText('Saltmere Harbour Trust');
  await expect(page.locator('iframe[title*="Quay"]')).toHaveCount(1);
  await expect(page.locator('iframe[title^="QP-80"]')).toHaveCount(0);
  // The harbour model's passes (and so its PDFs' "Prepared for") belong to the harbour trust alone.
  const holders = db
    .prepare(`select distinct c.name from passes p join clients c on c.id = p.client_id join widgets w on w.id = p.widget_id join models m on m.id = w.model_id where p.firm_id = ? and m.template = 'cost-range' and c.name in ('Quillbrook Pumps Ltd', 'Saltmere Harbour Trust')`)
    .all(firmId) as { name: string }[];
  expect(holders.map((h) => h.name)).toEqual(['Saltmere Harbour Trust']);
});

for (const width of [1440, 390]) {
  test(`the studio gives contributor names and dial rows the room they need at ${width} px`, async ({ browser }) => {
    const page = await signedIn(browser, 'author@orrinvale.example', width);
    const modelId = (db.prepare(`select id from models where firm_id = ? and template = 'linear-stack' and title like 'QP-80%'`).get(firmId) as { id: string }).id;
    await page.goto(`/app/models/${modelId}`);
    const names = page.getByRole('textbox', { name: /^Name of contributor \d+$/ });
    await expect(names.first()).toBeVisible();
    expect(await names.count()).toBeGreaterThanOrEqual(5);
    for (const n of await names.all()) {
      // The whole name is on screen: nothing scrolls inside the field, sideways or down.
      const cut = await n.evaluate((el) => ({ x: el.scrollWidth - el.clientWidth, y: el.scrollHeight - el.clientHeight, value: (el as HTMLTextAreaElement).value }));
      expect(cut.x, cut.value).toBeLessThanOrEqual(1);
      expect(cut.y, cut.value).toBeLessThanOrEqual(1);
    }
    const dials = page.getByRole('region', { name: 'Dials table' });
    await dials.scrollIntoViewIfNeeded();
    for (const input of await dials.locator('input[inputmode], input[type="text"]').all()) {
      const cut = await input.evaluate((el) => ({ x: el.scrollWidth - el.clientWidth, value: (el as HTMLInputElement).value }));
      expect(cut.x, `dial field ${cut.value}`).toBeLessThanOrEqual(1);
    }
    for (const label of await page.getByRole('textbox', { name: /^Label of dial \d+$/ }).all()) {
      expect(await label.evaluate((el) => el.scrollHeight - el.clientHeight)).toBeLessThanOrEqual(1);
    }
    if (width >= 1440) {
      // At desktop width the dial rows fit the editor column without a sideways scroll.
      expect(await dials.evaluate((el) => el.scrollWidth - el.clientWidth)).toBeLessThanOrEqual(1);
    }
    await page.screenshot({ path: `${SHOTS}/studio-${width}.png`, fullPage: true });
    await dials.screenshot({ path: `${SHOTS}/studio-dials-${width}.png` });
  });
}

test('a sheet saved as "Unicode text" (UTF-16, tabs, decimal commas) is read, and its histogram counts measurements', async ({ browser }) => {
  const page = await signedIn(browser, 'author@orrinvale.example');
  await page.goto('/app/datasets');
  const rows = ['Part\tBore, mm', ...Array.from({ length: 40 }, (_, i) => `B${i + 1}\t${(12 + ((i * 7) % 11) / 1000 - 0.005).toFixed(3).replace('.', ',')}`)];
  const text = rows.join('\r\n') + '\r\n';
  const buf = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]);
  await page.getByLabel('CSV file').setInputFiles({ name: 'bores-unicode.txt', mimeType: 'text/plain', buffer: buf });
  await expect(page.getByText(/not a CSV text file/)).toHaveCount(0);
  const column = page.getByRole('combobox', { name: 'Column' });
  await expect(column).toContainText('Bore, mm');
  await column.selectOption({ label: 'Bore, mm' });
  await page.getByRole('textbox', { name: 'Name' }).fill('Bores, Unicode text');
  await page.getByRole('textbox', { name: /^Unit/ }).fill('mm');
  await page.getByRole('button', { name: 'Store dataset' }).click();
  await expect(page).toHaveURL(/\/app\/datasets\/[0-9a-f-]{36}$/);
  await expect(page.getByRole('heading', { name: 'Bores, Unicode text' })).toBeVisible();
  const hist = page.getByRole('img', { name: /Spread of Bores, Unicode text/ });
  await expect(hist).toBeVisible();
  await expect(hist.locator('text').filter({ hasText: 'Share of measurements' })).toHaveCount(1);
  await expect(hist.locator('text').filter({ hasText: /trials/ })).toHaveCount(0);
  expect(await hist.evaluate((el) => el.querySelector('desc')?.textContent ?? '')).toMatch(/of measurements\./);
  await expect(page.locator('figure').filter({ has: hist }).locator('figcaption')).toContainText('of measurements');
  await page.screenshot({ path: `${SHOTS}/dataset-unicode.png`, fullPage: true });
});
