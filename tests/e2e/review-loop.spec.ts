import { test, expect, type Browser, type Page } from '@playwright/test';
import fs from 'node:fs';
import { exampleLinearStack } from '../../lib/core/engine/examples';
import { newFirm, addMember, PASSWORD } from '../support/firms';
import { listMessages, waitForMessage, firstLink } from '../support/mailbox';
import { E2E_APP } from './support/ports';
import { openTestDb } from '../support/db-direct';

// The review loop told by e-mail, in a fresh firm: the author saves a version, the checker gets an e-mail with
// the author's note and a link to the comparison, sees the count in the header, signs off with a note; the
// author gets the decision; the owner hears of the publishing. Each person's own switch stops their kind.

const APP = E2E_APP;
const MAILBOX = () => process.env.E2E_MAILBOX_URL!;
const SHOTS = process.env.REVIEW_SHOTS ?? '/tmp/shots/review';
fs.mkdirSync(SHOTS, { recursive: true });

async function signedIn(browser: Browser, email: string): Promise<Page> {
  const ctx = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  const page = await ctx.newPage();
  await page.goto('/sign-in');
  await page.getByLabel(/e-mail/i).first().fill(email);
  await page.getByLabel(/password/i).fill(PASSWORD);
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await expect(page).toHaveURL(/\/app\//);
  return page;
}

test('version saved → checker mailed with note and comparison link, count in header; sign-off → author mailed; publish → owner mailed', async ({ browser }) => {
  const { owner, email: ownerEmail } = await newFirm(APP, 'review-owner', MAILBOX());
  const author = await addMember(APP, MAILBOX(), owner, 'author');
  const checker = await addMember(APP, MAILBOX(), owner, 'checker');
  const created = await author.client.json<{ model: { id: string } }>('POST', '/api/models', { title: 'Gearbox end float', template: 'linear-stack', start: 'example' });
  expect(created.status).toBe(201);
  const modelId = created.body.model.id;
  const saved = await author.client.json<{ version: { id: string; number: number } }>('POST', `/api/models/${modelId}/versions`, {
    model: { ...exampleLinearStack, title: 'Gearbox end float' },
    baseVersion: 0,
    note: 'Spacer from the revised drawing GB-12 rev D.',
  });
  expect(saved.status).toBe(201);

  // The checker's mail: the author's note and the link to the comparison. The author gets none.
  const ask = await waitForMessage(MAILBOX(), checker.email, /Check requested: Gearbox end float, version 1/);
  expect(ask.text).toContain('Spacer from the revised drawing GB-12 rev D.');
  const link = firstLink(ask.text, /http:\/\/localhost:\d+\/app\/models\/[0-9a-f-]+\/versions\/1\/check/);
  expect((await listMessages(MAILBOX(), author.email)).filter((m) => /Check requested/.test(m.subject))).toHaveLength(0);

  // The same mail in the development mailbox page.
  const anyone = await browser.newPage();
  await anyone.goto('/dev/mailbox');
  await expect(anyone.getByText('Check requested: Gearbox end float, version 1').first()).toBeVisible();
  await anyone.close();

  const page = await signedIn(browser, checker.email);
  const count = page.getByTestId('review-count');
  await expect(count).toHaveAccessibleName('1 version waits for your check');
  await page.screenshot({ path: `${SHOTS}/checker-header-count.png` });
  await count.click();
  await expect(page.getByRole('heading', { name: 'To check' })).toBeVisible();
  await expect(page.getByRole('link', { name: 'Gearbox end float, version 1' })).toBeVisible();
  await page.goto(link);
  await expect(page.getByRole('heading', { name: /Check version 1/ })).toBeVisible();
  await page.getByLabel('Note').fill('Loop checked against GB-12 rev D.');
  await page.getByRole('button', { name: /^Sign off/ }).click();
  await expect(page.getByText(/signed off/i).first()).toBeVisible();
  await expect(page.getByTestId('review-count')).toHaveCount(0);

  const decided = await waitForMessage(MAILBOX(), author.email, /Version 1 of Gearbox end float was signed off/);
  expect(decided.text).toContain('Loop checked against GB-12 rev D.');
  expect(decided.text).toContain(`/app/models/${modelId}/versions/1`);

  const published = await author.client.json('POST', '/api/widgets', { modelId, versionId: saved.body.version.id, title: 'Gearbox end float for the client', panels: ['headline', 'spread'], headline: 'ppm', dialIds: [] });
  expect(published.status).toBe(201);
  const told = await waitForMessage(MAILBOX(), ownerEmail, /Published: Gearbox end float for the client/);
  expect(told.text).toContain('Test author published the widget');
  // Exactly once each.
  expect((await listMessages(MAILBOX(), checker.email)).filter((m) => /Check requested: Gearbox end float/.test(m.subject))).toHaveLength(1);
  expect((await listMessages(MAILBOX(), author.email)).filter((m) => /Gearbox end float was signed off/.test(m.subject))).toHaveLength(1);
});

test('a checker who turns the check request off in Settings gets no mail, but still sees the count', async ({ browser }) => {
  const { owner } = await newFirm(APP, 'review-prefs', MAILBOX());
  const author = await addMember(APP, MAILBOX(), owner, 'author');
  const checker = await addMember(APP, MAILBOX(), owner, 'checker');
  const page = await signedIn(browser, checker.email);
  await page.goto('/app/settings');
  const box = page.getByRole('checkbox', { name: 'A version waits for my check' });
  await expect(box).toBeChecked();
  await box.uncheck();
  await expect(page.getByRole('status').filter({ hasText: 'is off' })).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/settings-notifications.png`, fullPage: true });

  const created = await author.client.json<{ model: { id: string } }>('POST', '/api/models', { title: 'Quiet float', template: 'linear-stack', start: 'example' });
  const saved = await author.client.json('POST', `/api/models/${created.body.model.id}/versions`, { model: { ...exampleLinearStack, title: 'Quiet float' }, baseVersion: 0, note: '' });
  expect(saved.status).toBe(201);
  // Mails are queued in the save's own transaction: none exists for this checker, the author's firm has no other.
  const db = openTestDb(process.env.E2E_DATA_DIR!);
  try {
    expect(db.prepare('select count(*) as n from mail_jobs where recipient = ?').get(checker.email)).toEqual({ n: 0 });
  } finally {
    db.close();
  }
  expect((await listMessages(MAILBOX(), checker.email)).filter((m) => /Check requested: Quiet float/.test(m.subject))).toHaveLength(0);
  await page.reload();
  await expect(page.getByTestId('review-count')).toHaveAccessibleName('1 version waits for your check');
});
