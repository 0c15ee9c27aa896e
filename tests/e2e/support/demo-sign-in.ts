import { expect, type Page } from '@playwright/test';

/** The seeded demo accounts' password (lib/dev/seed). */
export const DEMO_PASSWORD = 'stochos-demo-2026';

/** Signs a seeded demo account in through the sign-in page and waits for the dashboard. */
export async function signInDemo(page: Page, email: string): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel(/e-mail/i).first().fill(email);
  await page.getByLabel(/password/i).fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await expect(page).toHaveURL(/\/app\//);
}

/** As the demo's second author, opens the quay estimate's studio and waits for its preview's S-curve. */
export async function openQuayStudio(page: Page): Promise<void> {
  await signInDemo(page, 'author2@orrinvale.example');
  await page.goto('/app/models');
  await page.getByRole('link', { name: 'North Quay wall refurbishment, stage 1', exact: true }).click();
  const preview = page.getByRole('region', { name: 'Live preview' });
  await expect(preview.getByRole('figure', { name: 'S-curve' })).toBeVisible({ timeout: 30_000 });
}
