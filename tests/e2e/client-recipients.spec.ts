import { test, expect } from '@playwright/test';
import fs from 'node:fs';

// A client's snapshot recipients: no domains means nobody; "any address" is a separate box with a warning,
// and the client page says so. Screenshots of the form and the page.

const SHOTS = process.env.HARDEN_SHOTS ?? '/tmp/shots/harden';
fs.mkdirSync(SHOTS, { recursive: true });

test('choosing "any address" for a client shows a warning in the form and on the client page', async ({ page }) => {
  await page.setViewportSize({ width: 1280, height: 1000 });
  await page.goto('/sign-in');
  await page.getByLabel(/e-mail/i).first().fill('author@orrinvale.example');
  await page.getByLabel(/password/i).fill('stochos-demo-2026');
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await expect(page).toHaveURL(/\/app\//);
  await page.goto('/app/clients');
  await page.getByRole('button', { name: 'New client' }).click();
  const name = `Open recipients ${Date.now().toString(36)}`;
  await page.getByLabel('Client name').fill(name);
  await page.getByLabel('Allowed origins').fill('https://portal.open-recipients.example');
  const box = page.getByLabel('Send snapshots to any e-mail address');
  await expect(box).not.toBeChecked();
  await expect(page.getByRole('alert').filter({ hasText: /any address a viewer types/ })).toHaveCount(0);
  await box.check();
  await expect(page.getByRole('alert').filter({ hasText: /any address a viewer types/ })).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/client-form-any-address.png`, fullPage: true });
  await page.getByRole('button', { name: 'Add client' }).click();
  await page.getByRole('link', { name: 'Grant a widget' }).click();
  await expect(page.getByText(/Any address: snapshots go wherever a viewer asks \(not recommended\)/)).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/client-detail-any-address.png`, fullPage: true });
});
