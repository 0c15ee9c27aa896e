import { test, expect } from '@playwright/test';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { E2E_HOST } from './support/ports';

// Temporary: screenshots of the embed's first figures (not committed).
test('shots', async ({ browser }) => {
  test.setTimeout(120_000);
  const db = openTestDb(process.env.E2E_DATA_DIR!);
  const firmId = firmIdOf(db, 'owner@orrinvale.example');
  const client = db.prepare("select id from clients where firm_id = ? and name = 'Quillbrook Pumps Ltd'").get(firmId) as { id: string };
  const w = db.prepare("select w.title, w.version_id from passes p join widgets w on w.id = p.widget_id join models m on m.id = w.model_id where p.client_id = ? and m.template = 'linear-stack' and p.revoked_at is null").get(client.id) as { title: string; version_id: string };
  // Warm: queue and store the first figures.
  {
    const c = await browser.newContext();
    const p = await c.newPage();
    await p.goto(`${E2E_HOST}/?client=${client.id}`);
    await expect(p.frameLocator(`iframe[title="${w.title}"]`).locator('.num').first()).toBeVisible({ timeout: 30_000 });
    await p.screenshot({ path: '/tmp/first/shots/0-browser-fallback.png', fullPage: true });
    await c.close();
  }
  await expect.poll(() => (db.prepare("select count(*) as n from first_figures where version_id = ? and state = 'done'").get(w.version_id) as { n: number }).n, { timeout: 60_000 }).toBe(1);
  // Early paint: hold the page's JavaScript chunks back so the state before hydration stays on screen.
  const c = await browser.newContext({ viewport: { width: 1200, height: 1000 } });
  let release: () => void = () => undefined;
  const held = new Promise<void>((r) => (release = r));
  await c.route(/\/_next\/static\/chunks\/.*\.js/, async (route) => {
    await held;
    await route.continue();
  });
  const p = await c.newPage();
  await p.goto(`${E2E_HOST}/?client=${client.id}`, { waitUntil: 'commit' });
  const f = p.frameLocator(`iframe[title="${w.title}"]`);
  await expect(f.locator('#stochos-early .num')).toBeVisible({ timeout: 30_000 });
  await p.screenshot({ path: '/tmp/first/shots/1-early-paint.png', fullPage: true });
  release();
  await expect(f.locator('footer').first()).toContainText('computed by Stochos', { timeout: 30_000 });
  await p.screenshot({ path: '/tmp/first/shots/2-server-figures.png', fullPage: true });
  const slider = f.getByRole('slider').first();
  await slider.focus();
  await slider.press('ArrowRight');
  await expect(f.locator('footer').first()).toContainText('computed in your browser', { timeout: 30_000 });
  await p.waitForTimeout(500);
  await p.screenshot({ path: '/tmp/first/shots/3-after-dial.png', fullPage: true });
  await c.close();
  db.close();
});
