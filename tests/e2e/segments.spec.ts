import fs from 'node:fs';
import { randomUUID } from 'node:crypto';
import { test, expect, type Page } from '@playwright/test';
import { signInDemo } from './support/demo-sign-in';
import AxeBuilder from '@axe-core/playwright';

// The screens a route segment shows instead of its page: not found (a record that is not there, an address that
// matches nothing) and the error screen (a page that fails while rendering), each with a way on, checked with axe.

const TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];
const SHOTS = process.env.SEGMENTS_SHOTS ?? '/tmp/shots/segments';
fs.mkdirSync(SHOTS, { recursive: true });

async function axe(page: Page, what: string): Promise<void> {
  const r = await new AxeBuilder({ page }).withTags(TAGS).analyze();
  expect(
    r.violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`),
    `axe on ${what}`,
  ).toEqual([]);
}

test('a model, version or dataset that is not there: a 404 inside the dashboard, with the way back', async ({ page }) => {
  await page.setViewportSize({ width: 1280, height: 860 });
  await signInDemo(page, 'owner@orrinvale.example');
  const missing = randomUUID();

  const res = await page.goto(`/app/models/${missing}`);
  expect(res?.status()).toBe(404);
  await expect(page.getByRole('heading', { level: 1, name: 'This model or version is not here' })).toBeVisible();
  // The dashboard stays around it: its navigation is still there.
  await expect(page.getByRole('navigation', { name: 'Dashboard' })).toBeVisible();
  await axe(page, 'a model that is not there');
  await page.screenshot({ path: `${SHOTS}/model-not-found.png` });

  expect((await page.goto(`/app/models/${missing}/versions/1`))?.status()).toBe(404);
  await expect(page.getByRole('heading', { level: 1, name: 'This model or version is not here' })).toBeVisible();
  await page.getByRole('link', { name: 'All models' }).click();
  await expect(page).toHaveURL(/\/app\/models$/);
  await expect(page.getByRole('heading', { level: 1, name: 'Models' })).toBeVisible();

  expect((await page.goto(`/app/datasets/${missing}`))?.status()).toBe(404);
  await expect(page.getByRole('heading', { level: 1, name: 'This dataset is not here' })).toBeVisible();
  await axe(page, 'a dataset that is not there');
  await page.getByRole('link', { name: 'All datasets' }).click();
  await expect(page).toHaveURL(/\/app\/datasets$/);
});

test('loading screens leave the answers alone: a page that sends a member elsewhere still redirects with 307', async ({ page }) => {
  await signInDemo(page, 'author2@orrinvale.example');
  // Billing is the owner's; the page redirects an author to the no-access page before anything streams.
  const billing = await page.request.get('/app/billing', { maxRedirects: 0 });
  expect(billing.status()).toBe(307);
  expect(billing.headers().location).toContain('/app/no-access');
  // The lists have loading screens of their own (app/app/*/(list)/loading.tsx) and still answer 200.
  for (const url of ['/app/models', '/app/datasets', '/app/clients', '/app/settings']) expect((await page.request.get(url)).status(), url).toBe(200);
});

test('an address that matches no page: a 404 in the product’s frame with links on', async ({ page }) => {
  const res = await page.goto('/no-such-page/at-all');
  expect(res?.status()).toBe(404);
  await expect(page.getByRole('heading', { level: 1, name: 'There is no page at this address' })).toBeVisible();
  await axe(page, 'an address that matches nothing');
  await page.screenshot({ path: `${SHOTS}/root-not-found.png` });
  await page.getByRole('link', { name: 'Stochos home' }).first().click();
  await expect(page).toHaveURL(/\/$/);
});

test('a page that fails: the error screen names the logged reference, and Try again renders it afresh', async ({ page }) => {
  const key = `e2e-${Date.now().toString(36)}`;
  const res = await page.goto(`/dev/fail?key=${key}`);
  expect(res?.status()).toBe(500);
  await expect(page.getByRole('heading', { level: 1, name: 'This page could not be shown' })).toBeVisible();
  // The digest Next sends instead of the message: the id the server's log line carries (lib/server/ops/render-errors.ts).
  await expect(page.getByTestId('error-reference')).toHaveText(/^\w{6,}$/);
  await expect(page.getByText('Failure on purpose')).toHaveCount(0);
  await expect(page.getByRole('link', { name: 'Stochos home' }).last()).toHaveAttribute('href', '/');
  await axe(page, 'the error screen');
  await page.screenshot({ path: `${SHOTS}/error-screen.png` });

  await page.getByRole('button', { name: 'Try again' }).click();
  await expect(page.getByRole('heading', { level: 1, name: 'Rendered after 1 failure on purpose' })).toBeVisible();
});
