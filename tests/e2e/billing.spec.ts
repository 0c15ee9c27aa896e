import { test, expect, type Page } from '@playwright/test';
import { signUpAndConfirm } from '../support/sign-up';
import { E2E_APP } from './support/ports';

// Seat billing in Chromium: the app's Billing page, the local fake Stripe's hosted checkout and portal pages,
// webhooks back into the app, and the seat limit on the Team page.
const stamp = () => `${Date.now().toString(36)}${Math.floor(performance.now()).toString(36)}`;
const PASSWORD = 'correct horse battery';

async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel(/e-mail/i).first().fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await expect(page).toHaveURL(/\/app\//);
}

async function newOwner(page: Page, firmName: string): Promise<string> {
  const email = `billing-owner-${stamp()}@e2e-firm.example`;
  // Sign-up sends a confirmation link; the local mailbox hands it over.
  await signUpAndConfirm(E2E_APP, process.env.E2E_MAILBOX_URL!, { firmName, name: 'Wren Halvorsen', email, password: PASSWORD });
  await signIn(page, email, PASSWORD);
  return email;
}

async function fillCard(page: Page, number: string): Promise<void> {
  await page.getByLabel('Name on card').fill('Wren Halvorsen');
  await page.getByLabel('Card number').fill(number);
  await page.getByLabel('Expiry (MM / YY)').fill('12 / 34');
  await page.getByLabel('Security code (CVC)').fill('123');
}

async function invite(page: Page, role: 'author' | 'checker'): Promise<string> {
  const email = `${role}-${stamp()}@e2e-firm.example`;
  await page.getByLabel('E-mail', { exact: true }).fill(email);
  await page.getByLabel('Role', { exact: true }).selectOption(role);
  await page.getByRole('button', { name: 'Send invitation' }).click();
  return email;
}

test('owner buys 3 seats, fills them, is refused the next invitation, adds a seat in the portal, then invites', async ({ page }) => {
  await newOwner(page, 'Brackwater Tolerance Works');

  await page.goto('/app/billing');
  await expect(page.getByRole('heading', { name: 'Billing', level: 1 })).toBeVisible();
  await expect(page.getByText('Trial', { exact: true })).toBeVisible();
  await page.getByLabel('Number of seats').fill('3');
  await expect(page.getByText(/3 × €29\.00 = €87\.00 per month/)).toBeVisible();
  await page.getByRole('button', { name: 'Buy seats' }).click();

  // The fake's hosted checkout page.
  await expect(page.getByRole('heading', { name: 'Subscribe' })).toBeVisible();
  await expect(page.getByText('Total: €87.00 per month')).toBeVisible();
  await fillCard(page, '4242 4242 4242 4242');
  await page.getByRole('button', { name: 'Pay €87.00 and subscribe' }).click();

  await expect(page).toHaveURL(/\/app\/billing/);
  await expect(page.getByText(/Payment received: your seats are ready/)).toBeVisible();
  await expect(page.getByTestId('seats-summary')).toHaveText('3 paid · 0 in use');
  await expect(page.getByText('Active', { exact: true })).toBeVisible();
  const invoices = page.getByRole('region', { name: 'Invoices' });
  await expect(invoices.getByText('Paid')).toBeVisible();
  await expect(invoices.getByText('€87.00')).toBeVisible();

  await page.goto('/app/team');
  for (const role of ['author', 'checker', 'author'] as const) {
    // Each invitation appears under the pending invitations before the next is sent.
    await expect(page.getByText(await invite(page, role), { exact: true })).toBeVisible();
  }
  await invite(page, 'checker');
  await expect(page.getByRole('alert').filter({ hasText: 'All seats are taken' })).toHaveText(
    'All seats are taken: 0 of 3 in use and 3 invitations pending (3 seats paid). The owner can add seats on the Billing page (/app/billing).',
  );
  await page.getByRole('link', { name: 'add seats on the Billing page' }).click();
  await expect(page).toHaveURL(/\/app\/billing$/);

  // Add a seat in the fake's billing portal.
  await page.getByRole('button', { name: 'Manage in portal' }).click();
  await expect(page.getByRole('heading', { name: 'Seats', exact: true })).toBeVisible();
  await page.getByLabel('Number of seats', { exact: true }).fill('4');
  await page.getByRole('button', { name: 'Review change' }).click();
  await expect(page.getByRole('heading', { name: 'Change seats from 3 to 4' })).toBeVisible();
  await page.getByRole('button', { name: 'Confirm change' }).click();

  await expect(page).toHaveURL(/\/app\/billing/);
  await expect(page.getByTestId('seats-summary')).toHaveText('4 paid · 0 in use');

  await page.goto('/app/team');
  await expect(page.getByText(await invite(page, 'checker'), { exact: true })).toBeVisible();
  await expect(page.getByText('Invitation sent')).toBeVisible();
});

test('a declined card shows its error on the payment page and nothing changes', async ({ page }) => {
  await newOwner(page, 'Sallowmere Cost Studio');
  await page.goto('/app/billing');
  await page.getByLabel('Number of seats').fill('2');
  await page.getByRole('button', { name: 'Buy seats' }).click();
  await expect(page.getByRole('heading', { name: 'Subscribe' })).toBeVisible();
  await fillCard(page, '4000 0000 0000 0002');
  await page.getByRole('button', { name: 'Pay €58.00 and subscribe' }).click();
  await expect(page.getByRole('alert')).toHaveText('Your card was declined.');
  await expect(page.getByLabel('Card number')).toHaveAttribute('aria-invalid', 'true');

  await page.getByRole('link', { name: 'Cancel and return' }).click();
  await expect(page).toHaveURL(/\/app\/billing/);
  await expect(page.getByText(/Checkout was left without paying\. Nothing was charged/)).toBeVisible();
  await expect(page.getByText('Trial', { exact: true })).toBeVisible();
  await expect(page.getByText('No invoices yet')).toBeVisible();
});

test('authors and checkers see no billing data', async ({ page }) => {
  await signIn(page, 'author@orrinvale.example', 'stochos-demo-2026');
  await expect(page.getByRole('link', { name: 'Billing' })).toHaveCount(0);
  await page.goto('/app/billing');
  await expect(page).toHaveURL(/\/app\/no-access/);
  const api = await page.request.get('/api/billing');
  expect(api.status()).toBe(403);
});
