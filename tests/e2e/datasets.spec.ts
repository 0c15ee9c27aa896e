import { test, expect, type Browser, type Page } from '@playwright/test';
import fs from 'node:fs';
import sharp from 'sharp';
import { dataCapability } from '../../lib/core/datasets/summary';
import { fitAll, LAW_LABELS, type FitOk } from '../../lib/core/datasets/fit';

// Measured data in Chromium: an author uploads 60 measured lengths, sees the fits ranked, opens the plots of a law,
// copies it, and sees Pp/Ppk of the parts against a tolerance; bad files are refused before anything is stored;
// the owner uploads the firm's logo.

const PASSWORD = 'stochos-demo-2026';
const SHOTS = process.env.DATASETS_SHOTS ?? '/tmp/shots/datasets';
fs.mkdirSync(SHOTS, { recursive: true });

async function newPage(browser: Browser, email: string): Promise<Page> {
  const ctx = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  const page = await ctx.newPage();
  await page.goto('/sign-in');
  await page.getByLabel(/e-mail/i).first().fill(email);
  await page.getByLabel(/password/i).fill(PASSWORD);
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await expect(page).toHaveURL(/\/app\//);
  return page;
}

// 60 invented cover spigot heights (mm, nominal 4.00 ± 0.03 in the example stack) from a fixed stream.
function lengths(): number[] {
  let s = 99;
  const u = () => ((s = (s * 1103515245 + 12345) % 2147483648) + 0.5) / 2147483648;
  return Array.from({ length: 60 }, () => +(4.004 + 0.009 * Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u())).toFixed(4));
}

test('an author uploads 60 measured lengths, picks the best law and sees the parts’ Ppk', async ({ browser }) => {
  const page = await newPage(browser, 'author@orrinvale.example');
  const values = lengths();
  await page.goto('/app/datasets');
  await expect(page.getByRole('heading', { name: 'Datasets', level: 1 })).toBeVisible();

  // A bad file first: refused with the file and row named, and nothing can be stored.
  await page.getByLabel('CSV file').setInputFiles({ name: 'tampered.csv', mimeType: 'text/csv', buffer: Buffer.from('length\n12.01\n@SUM(A1:A9)\n') });
  await expect(page.getByText(/tampered\.csv, row 3, column 1/)).toBeVisible();
  await expect(page.getByRole('button', { name: 'Store dataset' })).toBeDisabled();

  const csv = 'part,length\n' + values.map((v, i) => `P${i + 1},${v}`).join('\n') + '\nP61,gauge fault\n';
  await page.getByLabel('CSV file').setInputFiles({ name: 'spacer-lengths.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
  await expect(page.getByRole('combobox', { name: 'Column' })).toHaveValue('1');
  await expect(page.getByText(/Row\s*62: not a number/)).toBeVisible();
  await expect(page.getByRole('button', { name: 'Store dataset' })).toBeDisabled();
  await page.getByRole('checkbox', { name: /Row\s*62/ }).check();
  await page.getByRole('textbox', { name: 'Name' }).fill('Spacer lengths, e2e');
  await page.getByRole('textbox', { name: /^Unit/ }).fill('mm');
  await page.screenshot({ path: `${SHOTS}/upload.png`, fullPage: true });
  await page.getByRole('button', { name: 'Store dataset' }).click();
  await expect(page).toHaveURL(/\/app\/datasets\/[0-9a-f-]{36}$/);
  await expect(page.getByRole('heading', { name: 'Spacer lengths, e2e' })).toBeVisible();

  // The ranked table shows the law the library ranks first.
  const best = fitAll(values).filter((f): f is FitOk => f.ok)[0];
  const firstRow = page.getByRole('table', { name: /Candidate laws ranked/ }).getByRole('row').nth(1);
  await expect(firstRow).toContainText(LAW_LABELS[best.law]);
  await expect(page.getByText(/critical values .* do not hold/)).toBeVisible();
  await expect(page.getByRole('img', { name: new RegExp(`Q–Q plot: sorted data against ${LAW_LABELS[best.law]}`) })).toBeVisible();
  await expect(page.getByRole('img', { name: new RegExp(`${LAW_LABELS[best.law]} density drawn over the histogram`) })).toBeVisible();
  await expect(page.getByRole('button', { name: new RegExp(`Use this law \\(${LAW_LABELS[best.law]}\\)`) })).toBeVisible();

  // Capability of the parts against the contributor's tolerance, then a tighter one: Ppk moves as computed.
  await page.getByRole('spinbutton', { name: 'Contributor nominal' }).fill('4');
  await page.getByRole('spinbutton', { name: 'Plus tolerance' }).fill('0.03');
  await page.getByRole('spinbutton', { name: 'Minus tolerance' }).fill('0.03');
  await expect(page.getByTestId('data-ppk')).toHaveText(dataCapability(values, 4, 0.03, 0.03).ppk!.toFixed(2));
  await page.getByRole('spinbutton', { name: 'Plus tolerance' }).fill('0.02');
  await expect(page.getByTestId('data-ppk')).toHaveText(dataCapability(values, 4, 0.02, 0.03).ppk!.toFixed(2));
  await page.screenshot({ path: `${SHOTS}/detail.png`, fullPage: true });

  // Use it in a stack: the contributor's Ppk from the data, and the gap's Ppk before and after.
  const created = await page.request.post('/api/models', { data: { title: 'E2E spigot stack', template: 'linear-stack', start: 'example' } });
  expect(created.status()).toBe(201);
  await page.reload();
  await page.getByRole('combobox', { name: 'Stack model' }).selectOption({ label: 'E2E spigot stack' });
  await page.getByRole('combobox', { name: 'Contributor' }).selectOption({ label: 'Cover spigot height (4 +0.03/−0.03)' });
  await expect(page.getByTestId('contributor-ppk')).toHaveText(dataCapability(values, 4, 0.03, 0.03).ppk!.toFixed(2));
  const before = await page.getByTestId('stack-ppk-before').textContent();
  await expect(page.getByTestId('stack-ppk-after')).not.toHaveText(before!);
  await page.getByRole('button', { name: 'Save as a new version' }).click();
  await expect(page.getByText(/Saved as version 1; its note records the dataset and its sha256/)).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/use-in-stack.png`, fullPage: true });

  // The library lists it with its use.
  await page.goto('/app/datasets');
  const row = page.getByRole('row', { name: /Spacer lengths, e2e/ });
  await expect(row).toContainText('1 model');
});

test('the owner uploads a logo; an SVG is refused', async ({ browser }) => {
  const page = await newPage(browser, 'owner@orrinvale.example');
  await page.goto('/app/settings');
  await page.getByLabel('Logo file').setInputFiles({ name: 'mark.svg', mimeType: 'image/svg+xml', buffer: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"></svg>') });
  await page.getByRole('button', { name: 'Upload logo' }).click();
  await expect(page.getByText(/mark\.svg is an SVG .* refused/)).toBeVisible();
  const png = await sharp({ create: { width: 240, height: 80, channels: 3, background: '#1f887b' } }).png().toBuffer();
  await page.getByLabel('Logo file').setInputFiles({ name: 'mark.png', mimeType: 'image/png', buffer: png });
  await page.getByRole('button', { name: 'Upload logo' }).click();
  await expect(page.getByText('Logo saved. Widgets, embeds and PDFs now show it.')).toBeVisible();
  await expect(page.getByRole('img', { name: 'Current firm logo' })).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/logo.png`, fullPage: true });
});
