import { test, expect } from '@playwright/test';
import { signInDemo } from './support/demo-sign-in';
import fs from 'node:fs';

// The demo firm's two seeded models as its people see them: listed, each published from a signed-off version,
// the pump's later version waiting for the checker. Screenshots of the results at desktop and narrow widths.

const SHOTS = process.env.STUDIO_SHOTS ?? '/tmp/shots/studioA';
fs.mkdirSync(SHOTS, { recursive: true });

test('the demo models are listed as published, and the checker is pointed at the version awaiting a check', async ({ page }) => {
  await page.setViewportSize({ width: 1440, height: 1000 });
  await signInDemo(page, 'checker@orrinvale.example');
  await page.goto('/app/models');
  const pump = page.getByRole('row', { name: /QP-80 pump: impeller front clearance/ });
  const quay = page.getByRole('row', { name: /North Quay wall refurbishment, stage 1/ });
  await expect(pump).toContainText('Published v1');
  await expect(pump).toContainText('v2');
  await expect(pump).toContainText('Awaiting check');
  await expect(quay).toContainText('Published v1');
  await expect(quay).toContainText('Signed off');
  await expect(page.getByText(/awaiting a check/).first()).toBeVisible();

  await pump.getByRole('link', { name: /Check version 2/ }).click();
  await expect(page.getByRole('heading', { name: 'Check version 2 against version 1' })).toBeVisible();
  await expect(page.getByRole('row', { name: /Impeller shroud thickness/ }).first()).toBeVisible();
  await expect(page.getByRole('heading', { name: 'Monte Carlo', exact: true, level: 4 })).toHaveCount(2, { timeout: 30_000 });
  await page.screenshot({ path: `${SHOTS}/demo-check-pump.png`, fullPage: true });
});

test('the quay estimate’s studio shows its results beside the editor, at desktop width and on a narrow screen', async ({ page }) => {
  await page.setViewportSize({ width: 1440, height: 1000 });
  await signInDemo(page, 'author2@orrinvale.example');
  await page.goto('/app/models');
  await page.getByRole('link', { name: 'North Quay wall refurbishment, stage 1', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'North Quay wall refurbishment, stage 1', level: 1 })).toBeVisible();
  const preview = page.getByRole('region', { name: 'Live preview' });
  await expect(preview.getByRole('figure', { name: 'S-curve' })).toBeVisible({ timeout: 30_000 });
  await preview.screenshot({ path: `${SHOTS}/demo-quay-results.png` });
  await page.getByRole('tab', { name: 'Widget' }).click();
  await expect(page.getByText(/Published as “North Quay wall refurbishment, stage 1”, showing version 1/)).toBeVisible();

  await page.setViewportSize({ width: 390, height: 900 });
  await page.reload();
  await expect(preview.getByRole('figure', { name: 'S-curve' })).toBeVisible({ timeout: 30_000 });
  await page.screenshot({ path: `${SHOTS}/demo-quay-narrow.png`, fullPage: true });
  // Nothing wider than the screen except inside its own scrolling box.
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow).toBeLessThanOrEqual(1);
});
