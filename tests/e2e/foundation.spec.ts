import { test, expect } from '@playwright/test';

const mailbox = () => process.env.E2E_MAILBOX_URL!;
const stamp = () => Date.now().toString(36);

async function waitForMail(to: string, subject: RegExp): Promise<{ text: string }> {
  for (let i = 0; i < 75; i++) {
    const res = await fetch(`${mailbox()}/messages?to=${encodeURIComponent(to)}`);
    const body = await res.json();
    const list = (Array.isArray(body) ? body : body.messages) as { subject: string; text: string }[];
    const m = list.find((x) => subject.test(x.subject));
    if (m) return m;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no mail to ${to}`);
}

test('sign up, invite an author, accept from the mailbox, sign in as the author', async ({ page, browser }) => {
  const ownerEmail = `owner-${stamp()}@e2e-firm.example`;
  const authorEmail = `author-${stamp()}@e2e-firm.example`;
  const password = 'correct horse battery';

  await page.goto('/');
  await page.getByRole('link', { name: /create your firm/i }).first().click();
  await page.getByLabel(/firm/i).fill('Fenwick Tolerance Studio');
  await page.getByLabel(/your name/i).fill('Ada Fenwick');
  await page.getByLabel(/e-mail/i).fill(ownerEmail);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: /create account/i }).click();
  // Nothing is signed in yet: the address must be proved first.
  await expect(page.getByRole('heading', { name: 'Check your mailbox' })).toBeVisible();
  await expect(page.getByText(ownerEmail)).toBeVisible();
  const confirm = await waitForMail(ownerEmail, /Confirm your e-mail address/);
  await page.goto(confirm.text.match(/http:\/\/localhost:\d+\/sign-up\/confirm\/[A-Za-z0-9_-]+/)![0]);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: /confirm and open the account/i }).click();
  await expect(page).toHaveURL(/\/app\//);
  await expect(page.getByText('Fenwick Tolerance Studio').first()).toBeVisible();

  await page.getByRole('link', { name: 'Team' }).click();
  await page.getByLabel(/e-mail/i).fill(authorEmail);
  await page.getByLabel(/role/i).first().selectOption('author');
  await page.getByRole('button', { name: /send invitation/i }).click();
  await expect(page.getByText(authorEmail)).toBeVisible();

  // The invitation arrives in the local mailbox; the dev mailbox page shows it too.
  const mail = await waitForMail(authorEmail, /invited you/);
  const link = mail.text.match(/http:\/\/localhost:\d+\/invite\/[A-Za-z0-9_-]+/)![0];
  await page.goto('/dev/mailbox');
  await expect(page.getByText(/invited you to Fenwick Tolerance Studio/).first()).toBeVisible();

  const ctx = await browser.newContext();
  const author = await ctx.newPage();
  await author.goto(link);
  await expect(author.getByText('Fenwick Tolerance Studio').first()).toBeVisible();
  await author.getByLabel(/your name/i).fill('Bo Author');
  await author.getByLabel('Password', { exact: true }).fill(password);
  await author.getByRole('button', { name: /accept invitation/i }).click();
  await expect(author).toHaveURL(/\/app\//);
  await expect(author.getByText(/author/i).first()).toBeVisible();

  // Signing out and in again as the author works with the chosen password.
  await author.getByRole('button', { name: /sign out/i }).click();
  await expect(author).toHaveURL(/\/$|\/sign-in/);
  await author.goto('/sign-in');
  await author.getByLabel(/e-mail/i).first().fill(authorEmail);
  await author.getByLabel('Password', { exact: true }).fill(password);
  await author.getByRole('button', { name: /^sign in$/i }).click();
  await expect(author).toHaveURL(/\/app\//);
  // Authors see no Team or Billing navigation.
  await expect(author.getByRole('link', { name: 'Billing' })).toHaveCount(0);
  await ctx.close();
});

test('demo owner signs in with the password from the README', async ({ page }) => {
  await page.goto('/sign-in');
  await page.getByLabel(/e-mail/i).first().fill('owner@orrinvale.example');
  await page.getByLabel('Password', { exact: true }).fill('stochos-demo-2026');
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await expect(page).toHaveURL(/\/app\//);
  await expect(page.getByText('Orrin Vale Consulting Engineers').first()).toBeVisible();
});
