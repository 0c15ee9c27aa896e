import { test, expect, type Browser, type Page } from '@playwright/test';
import { signUpAndConfirm } from '../support/sign-up';
import { E2E_APP } from './support/ports';
import fs from 'node:fs';
import { runModelSync } from '../../lib/core/engine';
import { decimalsForSignificant, formatPpm, formatValue } from '../../lib/core/charts/format';

// The studio in Chromium: an author builds a linear stack from nothing, sees worst case, RSS and Monte Carlo as the
// engine computes them, saves two versions; a checker compares and signs off; the author publishes. An author
// cannot sign off a version, and a member of another firm cannot open the model at all.

const PASSWORD = 'stochos-demo-2026';
const SHOTS = process.env.STUDIO_SHOTS ?? '/tmp/shots/studioA';
fs.mkdirSync(SHOTS, { recursive: true });

const norm = (s: string) => s.replace(/\u00a0|\u202f/g, ' ').replace(/\s+/g, ' ').trim();

async function signIn(page: Page, email: string, password = PASSWORD) {
  await page.goto('/sign-in');
  await page.getByLabel(/e-mail/i).first().fill(email);
  await page.getByLabel(/password/i).fill(password);
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await expect(page).toHaveURL(/\/app\//);
}

async function newPage(browser: Browser, email: string): Promise<Page> {
  const ctx = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  const page = await ctx.newPage();
  await signIn(page, email);
  return page;
}

const box = (page: Page, name: string | RegExp) => page.getByRole('textbox', { name });

/** Fills one contributor row, addressing each field by its accessible name. */
async function fillContributor(page: Page, i: number, c: { name: string; nominal: string; plus: string; minus: string; direction: '1' | '-1'; assumption?: string }) {
  await box(page, `Name of contributor ${i}`).fill(c.name);
  await box(page, new RegExp(`^Nominal of ${c.name}`)).fill(c.nominal);
  await box(page, new RegExp(`^Plus tolerance of ${c.name}`)).fill(c.plus);
  await box(page, new RegExp(`^Minus tolerance of ${c.name}`)).fill(c.minus);
  await page.getByRole('combobox', { name: `Direction of ${c.name} in the loop` }).selectOption({ label: c.direction === '1' ? '+ adds' : '− subtracts' });
  if (c.assumption) await page.getByRole('combobox', { name: new RegExp(`^Distribution assumption of ${c.name}`) }).selectOption({ label: c.assumption });
}

/** The figures the results view must show for a model, formatted as the view formats them. */
function expectedFigures(model: unknown) {
  const r = runModelSync(model);
  const s = r.stack!;
  const unit = s.analytic.unit;
  const decimals = Math.min(8, decimalsForSignificant(s.monteCarlo.sd!, 2));
  const f = (v: number) => norm(formatValue(v, unit, { decimals }));
  const mc = s.monteCarlo;
  return {
    worstCase: `${f(s.analytic.worstCase.min)} to ${f(s.analytic.worstCase.max)}`,
    rss: `${f(s.analytic.rss.min)} to ${f(s.analytic.rss.max)}`,
    monteCarlo: `${f(mc.mean! - 3 * mc.sd!)} to ${f(mc.mean! + 3 * mc.sd!)}`,
    ppm: norm(formatPpm(mc.ppmObserved!)),
  };
}

const methodCard = (page: Page, title: string) => page.getByRole('heading', { name: title, exact: true, level: 4 }).locator('..');

let modelId = '';
let v1Id = '';

test.describe.configure({ mode: 'serial' });

test('an author builds a linear stack from scratch; worst case, RSS and Monte Carlo match the engine; two versions are saved', async ({ browser }) => {
  const page = await newPage(browser, 'author@orrinvale.example');
  await page.goto('/app/models');
  await page.getByRole('button', { name: 'New model' }).click();
  await page.getByRole('radio', { name: /^Linear stack/ }).check();
  await page.getByRole('radio', { name: /^Blank/ }).check();
  await page.getByRole('textbox', { name: 'Title', exact: true }).fill('E2E spindle cartridge: end float');
  await page.getByRole('button', { name: 'Create and open' }).click();
  await expect(page).toHaveURL(/\/app\/models\/[0-9a-f-]{36}$/);
  modelId = page.url().split('/').pop()!;

  await fillContributor(page, 1, { name: 'Cartridge bore depth', nominal: '50', plus: '0.05', minus: '0.05', direction: '1' });
  for (const c of [
    { name: 'Spindle shoulder length', nominal: '30', plus: '0.04', minus: '0.04', direction: '-1' as const },
    { name: 'Bearing pair width', nominal: '15', plus: '0', minus: '0.1', direction: '-1' as const },
    { name: 'Retaining ring position', nominal: '4.6', plus: '0.05', minus: '0.05', direction: '-1' as const, assumption: 'Uniform over the band' },
  ]) {
    const n = await page.getByRole('textbox', { name: /^Name of contributor \d+$/ }).count();
    await page.getByRole('button', { name: 'Add contributor' }).click();
    await fillContributor(page, n + 1, c);
  }
  await page.getByRole('textbox', { name: /^Lower limit/ }).fill('0.1');
  await page.getByRole('textbox', { name: /^Upper limit/ }).fill('0.5');
  await expect(page.getByText('No problems found.')).toBeVisible();

  await page.getByLabel('Note for this version (optional)').fill('First cut from the cartridge drawing.');
  await page.getByRole('button', { name: 'Save version 1' }).click();
  await expect(page.getByText('Version 1 saved')).toBeVisible();

  // The saved version, run by the engine here, gives the figures the page shows (same seed, same trials).
  const v1 = (await (await page.request.get(`/api/models/${modelId}/versions/1`)).json()).version;
  v1Id = v1.id;
  expect(v1.model.contributors).toHaveLength(4);
  const want = expectedFigures(v1.model);
  await expect.poll(async () => norm(await methodCard(page, 'Monte Carlo').innerText()), { timeout: 30_000 }).toContain(want.monteCarlo);
  expect(norm(await methodCard(page, 'Worst case').innerText())).toContain(want.worstCase);
  expect(norm(await methodCard(page, 'RSS').innerText())).toContain(want.rss);
  expect(norm(await page.getByRole('group', { name: 'Headline figures' }).or(page.getByLabel('Headline figures')).first().innerText())).toContain(want.ppm);

  await page.screenshot({ path: `${SHOTS}/studio-editor.png`, fullPage: true });
  const figures = page.getByRole('figure');
  const count = await figures.count();
  expect(count).toBeGreaterThanOrEqual(4);
  for (let i = 0; i < count; i++) {
    const f = figures.nth(i);
    const name = ((await f.getAttribute('aria-labelledby')) ? await f.locator('h1,h2,h3,h4,h5').first().innerText() : `figure-${i}`).toLowerCase().replace(/[^a-z0-9]+/g, '-').slice(0, 40);
    await f.scrollIntoViewIfNeeded();
    await f.screenshot({ path: `${SHOTS}/chart-${i}-${name}.png` });
  }

  // Version 2: the retaining ring's tolerance tightened.
  await box(page, /^Plus tolerance of Retaining ring position/).fill('0.03');
  await box(page, /^Minus tolerance of Retaining ring position/).fill('0.03');
  await page.getByLabel('Note for this version (optional)').fill('Ring groove ground after hardening: ±0.03.');
  await page.getByRole('button', { name: 'Save version 2' }).click();
  await expect(page.getByText('Version 2 saved')).toBeVisible();
  const v2 = (await (await page.request.get(`/api/models/${modelId}/versions/2`)).json()).version;
  const want2 = expectedFigures(v2.model);
  await expect.poll(async () => norm(await methodCard(page, 'Monte Carlo').innerText()), { timeout: 30_000 }).toContain(want2.monteCarlo);
  expect(norm(await methodCard(page, 'RSS').innerText())).toContain(want2.rss);
  await page.context().close();
});

test('the later of two editors is told a newer version exists', async ({ browser }) => {
  const a = await newPage(browser, 'author@orrinvale.example');
  const b = await newPage(browser, 'author2@orrinvale.example');
  await a.goto(`/app/models/${modelId}`);
  await b.goto(`/app/models/${modelId}`);
  await box(b, /^Nominal of Cartridge bore depth/).fill('50.02');
  await b.getByRole('button', { name: 'Save version 3' }).click();
  await expect(b.getByText('Version 3 saved')).toBeVisible();
  await box(a, /^Nominal of Cartridge bore depth/).fill('49.98');
  await a.getByRole('button', { name: 'Save version 3' }).click();
  await expect(a.getByText(/Version 3 was saved by Priya Raman at .* UTC; reload to see it/)).toBeVisible();
  await a.screenshot({ path: `${SHOTS}/studio-conflict.png` });
  const versions = (await (await a.request.get(`/api/models/${modelId}/versions`)).json()).versions;
  expect(versions).toHaveLength(3);
  await a.getByRole('button', { name: /Load the newer version/ }).click();
  await expect(box(a, /^Nominal of Cartridge bore depth/)).toHaveValue('50.02');
  await a.context().close();
  await b.context().close();
});

test('a checker compares version 2 with version 1 and signs it off', async ({ browser }) => {
  const page = await newPage(browser, 'checker@orrinvale.example');
  await page.goto('/app/models');
  await expect(page.getByRole('link', { name: 'E2E spindle cartridge: end float', exact: true })).toBeVisible();
  await expect(page.getByRole('link', { name: 'Check version 3 of E2E spindle cartridge: end float' })).toBeVisible();
  await page.goto(`/app/models/${modelId}/versions/2/check`);
  await expect(page.getByRole('heading', { name: 'Check version 2 against version 1' })).toBeVisible();
  const rows = page.getByRole('row', { name: /Retaining ring position/ });
  await expect(rows).toHaveCount(2);
  await expect(rows.first()).toContainText('0.05');
  await expect(rows.first()).toContainText('0.03');
  // Both versions' results, side by side.
  await expect(page.getByRole('heading', { name: 'Version 1', exact: true, level: 3 })).toBeVisible();
  await expect(page.getByRole('heading', { name: 'Version 2', exact: true, level: 3 })).toBeVisible();
  await expect(page.getByRole('heading', { name: 'Monte Carlo', exact: true, level: 4 })).toHaveCount(2, { timeout: 30_000 });
  await page.getByRole('button', { name: /Comment on contributors › Retaining ring position › plus tol/ }).click();
  await page.getByLabel(/Comment on contributors › Retaining ring position › plus tol/).fill('Matches the grinding spec on sheet 3.');
  await page.getByLabel('Note').fill('Loop checked against drawing SC-204 rev C.');
  await page.screenshot({ path: `${SHOTS}/check-page.png`, fullPage: true });
  await page.getByRole('button', { name: 'Sign off version 2' }).click();
  await expect(page.getByText('Signed off by Jonah Beck')).toBeVisible();
  await page.context().close();
});

test('the author cannot sign off a version; the author publishes the signed-off version', async ({ browser }) => {
  const page = await newPage(browser, 'author@orrinvale.example');
  await page.goto(`/app/models/${modelId}/versions/1/check`);
  await expect(page.getByRole('heading', { name: 'Check version 1' })).toBeVisible();
  await expect(page.getByRole('button', { name: /Sign off/ })).toHaveCount(0);
  const refused = await page.request.post(`/api/versions/${v1Id}/check`, { data: { decision: 'sign_off', note: 'my own' } });
  expect(refused.status()).toBe(403);

  await page.goto(`/app/models/${modelId}`);
  await page.getByRole('tab', { name: 'Publish' }).click();
  const version = page.getByRole('combobox', { name: 'Version to publish' });
  await expect(version).toHaveValue('2');
  await page.getByLabel('Widget title').fill('Spindle end float for the client');
  await page.getByRole('tabpanel').screenshot({ path: `${SHOTS}/publish-panel.png` });
  await page.getByRole('button', { name: 'Publish version 2' }).click();
  await expect(page.getByText('Published as “Spindle end float for the client”, showing version 2')).toBeVisible();
  await page.goto('/app/models');
  await expect(page.getByRole('row', { name: /E2E spindle cartridge/ })).toContainText('Published v2');
  await page.screenshot({ path: `${SHOTS}/models-list.png`, fullPage: true });

  await page.goto(`/app/models/${modelId}`);
  await page.getByRole('button', { name: 'Preview as client' }).click();
  await expect(page.getByRole('heading', { name: 'Preview as client' })).toBeVisible();
  await page.waitForTimeout(1500);
  await page.screenshot({ path: `${SHOTS}/preview-as-client.png`, fullPage: true });
  await page.context().close();
});

test('a member whose role changed from author to checker cannot sign off the version they wrote', async ({ browser }) => {
  const owner = await newPage(browser, 'owner@orrinvale.example');
  const team = (await (await owner.request.get('/api/team')).json()) as { members: { id: string; email: string }[] };
  const priya = team.members.find((m) => m.email === 'author2@orrinvale.example')!;
  expect((await owner.request.patch(`/api/team/members/${priya.id}`, { data: { role: 'checker' } })).status()).toBe(200);
  try {
    const page = await newPage(browser, 'author2@orrinvale.example');
    await page.goto(`/app/models/${modelId}/versions/3/check`);
    await expect(page.getByText('You wrote this version')).toBeVisible();
    await expect(page.getByRole('button', { name: /Sign off/ })).toHaveCount(0);
    const v3 = (await (await page.request.get(`/api/models/${modelId}/versions/3`)).json()).version;
    const refused = await page.request.post(`/api/versions/${v3.id}/check`, { data: { decision: 'sign_off', note: 'mine' } });
    expect(refused.status()).toBe(403);
    expect((await refused.json()).error.message).toMatch(/You wrote version 3, so you cannot check it/);
    await page.screenshot({ path: `${SHOTS}/check-own-version.png` });
    await page.context().close();
  } finally {
    expect((await owner.request.patch(`/api/team/members/${priya.id}`, { data: { role: 'author' } })).status()).toBe(200);
    await owner.context().close();
  }
});

test('a member of another firm cannot open the model', async ({ browser }) => {
  // Another firm, created through the API and signed in through the page.
  const ctx = await browser.newContext();
  const page = await ctx.newPage();
  const email = `studio-outsider-${Date.now().toString(36)}@other-firm.example`;
  await signUpAndConfirm(E2E_APP, process.env.E2E_MAILBOX_URL!, { firmName: 'Other firm', name: 'Otto Outsider', email, password: 'correct horse battery' });
  await signIn(page, email, 'correct horse battery');
  const visit = await page.goto(`/app/models/${modelId}`);
  expect(visit?.status()).toBe(404);
  expect((await page.request.get(`/api/models/${modelId}`)).status()).toBe(404);
  expect((await page.goto(`/app/models/${modelId}/versions/2/check`))?.status()).toBe(404);
  await page.goto('/app/models');
  await expect(page.getByText('E2E spindle cartridge')).toHaveCount(0);
  await ctx.close();
});

test('a cost range from the worked example is saved, signed off as a first version and published', async ({ browser }) => {
  const author = await newPage(browser, 'author2@orrinvale.example');
  await author.goto('/app/models');
  await author.getByRole('button', { name: 'New model' }).click();
  await author.getByRole('radio', { name: /^Cost range/ }).check();
  await author.getByRole('radio', { name: /^Worked example/ }).check();
  await author.getByRole('textbox', { name: 'Title', exact: true }).fill('E2E depot roof renewal');
  await author.getByRole('button', { name: 'Create and open' }).click();
  await expect(author).toHaveURL(/\/app\/models\/[0-9a-f-]{36}$/);
  const id = author.url().split('/').pop()!;
  await expect(author.getByText('No problems found.')).toBeVisible();
  await author.getByRole('button', { name: 'Save version 1' }).click();
  await expect(author.getByText('Version 1 saved')).toBeVisible();
  const v1 = (await (await author.request.get(`/api/models/${id}/versions/1`)).json()).version;
  const cost = runModelSync(v1.model).cost!;
  // The percentiles shown are the engine's own for the saved version (same seed, same trials).
  const unit = v1.model.currency as string;
  const percentiles = author.getByLabel('Percentiles', { exact: true });
  await expect.poll(async () => norm(await percentiles.innerText()), { timeout: 30_000 }).toContain(norm(formatValue(cost.p80, unit, { significant: 4 })));
  expect(norm(await percentiles.innerText())).toContain(norm(formatValue(cost.p50, unit, { significant: 4 })));
  await expect(author.getByRole('figure', { name: 'S-curve' })).toBeVisible();
  await author.screenshot({ path: `${SHOTS}/studio-cost-range.png`, fullPage: true });
  const figures = author.getByRole('figure');
  for (let i = 0; i < (await figures.count()); i++) await figures.nth(i).screenshot({ path: `${SHOTS}/cost-chart-${i}.png` });
  expect(cost.p80).toBeGreaterThan(cost.p50);

  const checker = await newPage(browser, 'checker@orrinvale.example');
  await checker.goto(`/app/models/${id}/versions/1/check`);
  await expect(checker.getByRole('heading', { name: 'Check version 1' })).toBeVisible();
  await checker.getByLabel('Note').fill('Rates checked against the framework schedule.');
  await checker.getByRole('button', { name: 'Sign off version 1' }).click();
  await expect(checker.getByText('Signed off by Jonah Beck')).toBeVisible();
  await checker.context().close();

  await author.reload();
  await author.getByRole('tab', { name: 'Publish' }).click();
  await author.getByRole('combobox', { name: 'Headline figure' }).selectOption({ label: 'Chance of exceeding the budget' });
  await author.getByRole('button', { name: 'Publish version 1' }).click();
  await expect(author.getByText(/Published as “E2E depot roof renewal”, showing version 1/)).toBeVisible();
  const widgets = (await (await author.request.get('/api/widgets')).json()).widgets as { modelId: string; headline: string; dialIds: string[] }[];
  const w = widgets.find((x) => x.modelId === id)!;
  expect(w.headline).toBe('exceed-budget');
  expect(w.dialIds).toEqual(v1.model.dials.map((d: { id: string }) => d.id));
  await author.context().close();
});

