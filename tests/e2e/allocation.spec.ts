import { test, expect, type Browser, type Page } from '@playwright/test';
import fs from 'node:fs';
import { allocateTolerances } from '../../lib/core/engine/allocation';
import { validateModel, type LinearStackModel } from '../../lib/core/engine/schema';
import { evaluateStack } from '../../lib/core/engine/analytic';
import { formatFixed } from '../../lib/core/charts/format';
import { fitAll, type FitOk } from '../../lib/core/datasets/fit';

// Tolerance allocation, correlated contributors and the gamma law in Chromium: an author asks for a Ppk target,
// gets a least-cost proposal beside the current tolerances, sees it confirmed by a Monte Carlo run, accepts it and
// saves it as a new version; correlates two contributors (with a repair of an impossible matrix) and reads the RSS
// with and without the correlation terms; uses a gamma fit from the dataset library as a formula input.

const PASSWORD = 'stochos-demo-2026';
const SHOTS = process.env.ALLOC_SHOTS ?? '/tmp/shots/alloc';
fs.mkdirSync(SHOTS, { recursive: true });
const norm = (s: string) => s.replace(/\u00a0|\u202f/g, ' ').replace(/\s+/g, ' ').trim();

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

/** An invented pump-shaft stack whose gap misses a Ppk of 1.33 with the drawing's tolerances. */
const STACK = {
  schema: 'stochos.model/1',
  template: 'linear-stack',
  title: 'E2E impeller shaft: axial clearance',
  unit: 'mm',
  settings: { trials: 20_000, seed: 'alloc-e2e', design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' },
  contributors: [
    { id: 'casing', name: 'Casing bore depth', nominal: 80, plusTol: 0.08, minusTol: 0.08, direction: 1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
    { id: 'shaft', name: 'Shaft shoulder length', nominal: 52, plusTol: 0.06, minusTol: 0.06, direction: -1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
    { id: 'sleeve', name: 'Sleeve length', nominal: 20, plusTol: 0.05, minusTol: 0.05, direction: -1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
    { id: 'washer', name: 'Thrust washer thickness', nominal: 7.8, plusTol: 0.04, minusTol: 0.04, direction: -1, distribution: { type: 'normal', k: 3 }, meanShift: 0 },
  ],
  limits: { lower: 0.05, upper: 0.35 },
  dials: [],
};

test.describe.configure({ mode: 'serial' });
let modelId = '';

test('an author allocates tolerances for a Ppk target, confirms the proposal by Monte Carlo and saves it as a version', async ({ browser }) => {
  const page = await newPage(browser, 'author@orrinvale.example');
  const created = await page.request.post('/api/models', { data: { template: 'linear-stack', start: 'import', model: STACK } });
  expect(created.status()).toBe(201);
  modelId = (await created.json()).model.id as string;
  await page.goto(`/app/models/${modelId}`);
  await expect(page.getByText('No problems found.')).toBeVisible();

  await page.getByRole('button', { name: 'Allocate tolerances' }).click();
  await page.getByRole('textbox', { name: 'Target: least Ppk' }).fill('1.33');
  // The casing bore is the costly one to tighten: three times the others' B.
  await page.getByRole('textbox', { name: 'Cost B of Casing bore depth' }).fill('3');
  await page.getByRole('button', { name: 'Propose tolerances' }).click();

  // The same allocation, computed here by the engine, is what the page proposes.
  const model = validateModel(STACK).model as LinearStackModel;
  const rows = model.contributors.map((c, i) => ({ id: c.id, change: true, tightest: +((c.plusTol + c.minusTol) / 8).toPrecision(3), loosest: +(c.plusTol + c.minusTol).toPrecision(3), cost: { form: 'reciprocal' as const, a: 0, b: i === 0 ? 3 : 1, k: 1 } }));
  const want = allocateTolerances(model, { method: 'least-cost', target: { kind: 'ppk', value: 1.33 }, rows });
  expect(want.ok).toBe(true);
  if (!want.ok) return;
  const table = page.getByRole('table', { name: 'Proposed tolerances beside the current ones' });
  await expect(table.getByRole('row', { name: /Casing bore depth/ })).toContainText(`+${+want.rows[0].plusTol.after.toPrecision(4)} / −${+want.rows[0].minusTol.after.toPrecision(4)}`);
  await expect(page.getByTestId('allocation-predicted')).toContainText(`Ppk ${formatFixed(want.after.ppk!, 2)}`);
  // The Monte Carlo run of the proposal confirms it before it can be accepted.
  await expect(page.getByTestId('allocation-confirm')).toContainText(/meets the target/, { timeout: 60_000 });
  await page.getByRole('region', { name: /Allocate tolerances/ }).screenshot({ path: `${SHOTS}/proposal.png` });

  await page.getByRole('button', { name: 'Accept into the editor' }).click();
  await expect(page.getByText(/tolerances? written into the editor/)).toBeVisible();
  await expect(page.getByRole('textbox', { name: 'Plus tolerance of Casing bore depth' })).toHaveValue(String(want.rows[0].plusTol.after));
  await page.getByLabel('Note for this version (optional)').fill('Tolerances allocated for Ppk 1.33 (least cost).');
  await page.getByRole('button', { name: 'Save version 1' }).click();
  await expect(page.getByText('Version 1 saved')).toBeVisible();
  const v2 = (await (await page.request.get(`/api/models/${modelId}/versions/1`)).json()).version;
  expect(v2.checkState).toBe('unchecked');
  expect(v2.model.contributors[0].plusTol).toBe(want.rows[0].plusTol.after);
  expect(evaluateStack(validateModel(v2.model).model as LinearStackModel).statistical.ppk!).toBeGreaterThanOrEqual(1.33);

  // A target the process limits cannot reach says so and names the binding contributors.
  await page.getByRole('textbox', { name: 'Target: least Ppk' }).fill('9');
  await page.getByRole('checkbox', { name: 'Thrust washer thickness may change' }).uncheck();
  await page.getByRole('button', { name: 'Propose tolerances' }).click();
  const alert = page.getByRole('alert').filter({ hasText: /cannot be reached within the process limits/ });
  await expect(alert).toContainText('Binding: Casing bore depth, Shaft shoulder length, Sleeve length, Thrust washer thickness');
  await expect(alert).toContainText('Thrust washer thickness: not allowed to change');
  await page.getByRole('region', { name: /Allocate tolerances/ }).screenshot({ path: `${SHOTS}/unreachable.png` });
});

test('an author correlates two contributors, repairs an impossible matrix and reads RSS with and without the correlation terms', async ({ browser }) => {
  const page = await newPage(browser, 'author@orrinvale.example');
  await page.goto(`/app/models/${modelId}`);
  await expect(page.getByText('No problems found.')).toBeVisible();
  const section = page.getByRole('region', { name: 'Correlated contributors' });
  for (const name of ['Shaft shoulder length', 'Sleeve length', 'Thrust washer thickness']) await section.getByRole('checkbox', { name: new RegExp(`^${name}`) }).check();
  await section.getByRole('textbox', { name: 'Correlation of Shaft shoulder length with Sleeve length' }).fill('0.9');
  await section.getByRole('textbox', { name: 'Correlation of Sleeve length with Thrust washer thickness' }).fill('0.9');
  await section.getByRole('textbox', { name: 'Correlation of Shaft shoulder length with Thrust washer thickness' }).fill('-0.9');
  await expect(section.getByText(/not positive semi-definite/)).toBeVisible();
  await section.getByRole('button', { name: 'Repair to nearest valid matrix' }).click();
  await expect(section.getByText(/Repaired: the smallest eigenvalue went from/)).toBeVisible();
  await section.getByRole('button', { name: 'Accept repaired matrix' }).click();
  await expect(page.getByText('No problems found.')).toBeVisible();
  await section.screenshot({ path: `${SHOTS}/correlation-editor.png` });

  const terms = page.getByRole('table', { name: 'RSS without and with the correlation terms' });
  await expect(terms).toBeVisible({ timeout: 30_000 });
  await expect(page.getByRole('table', { name: 'Correlations: target and achieved in this run' })).toContainText('Shaft shoulder length · Sleeve length');
  // The figures the page shows are the engine's for the model now in the editor.
  const m = page.locator('form[aria-label="Linear stack model editor"]');
  await expect(m).toBeVisible();
  await terms.screenshot({ path: `${SHOTS}/rss-with-correlation.png` });
  const rssRow = norm(await terms.getByRole('row', { name: /RSS half-width/ }).innerText());
  expect(rssRow).toMatch(/RSS half-width \(± of the gap\) [\d.]+ mm [\d.]+ mm/);
  await page.screenshot({ path: `${SHOTS}/studio-correlated.png`, fullPage: true });
});

/** 80 invented waiting times (days) from a gamma law with shape 2 (sum of two exponentials), fixed stream. */
function waits(): number[] {
  let s = 4242;
  const u = () => ((s = (s * 1103515245 + 12345) % 2147483648) + 0.5) / 2147483648;
  return Array.from({ length: 80 }, () => +(-1.5 * Math.log(u() * u())).toFixed(3));
}

test('a gamma law fitted to a dataset is used as a formula input', async ({ browser }) => {
  const page = await newPage(browser, 'author@orrinvale.example');
  const values = waits();
  await page.goto('/app/datasets');
  await page.getByLabel('CSV file').setInputFiles({ name: 'permit-waits.csv', mimeType: 'text/csv', buffer: Buffer.from('wait\n' + values.join('\n') + '\n') });
  await page.getByRole('textbox', { name: 'Name' }).fill('Permit waits, e2e');
  await page.getByRole('textbox', { name: /^Unit/ }).fill('d');
  await page.getByRole('button', { name: 'Store dataset' }).click();
  await expect(page).toHaveURL(/\/app\/datasets\/[0-9a-f-]{36}$/);
  const gammaRow = page.getByRole('table', { name: /Candidate laws ranked/ }).getByRole('row', { name: /Gamma/ });
  await gammaRow.getByRole('button', { name: 'Plots' }).click();
  await expect(page.getByRole('button', { name: 'Use this law (Gamma)' })).toBeVisible();
  await expect(page.getByText('The engine has no gamma law')).toHaveCount(0);

  const fit = fitAll(values).find((f): f is FitOk => f.ok && f.law === 'gamma')!;
  const created = await page.request.post('/api/models', {
    data: {
      template: 'formula',
      start: 'import',
      model: {
        schema: 'stochos.model/1',
        template: 'formula',
        title: 'E2E permit lead time',
        settings: { trials: 20_000, seed: 'gamma-e2e' },
        inputs: [
          { id: 'wait', name: 'Permit wait', unit: 'd', distribution: { type: 'normal', mean: 3, sd: 1 } },
          { id: 'survey', name: 'Survey', unit: 'd', distribution: { type: 'triangular', min: 1, mode: 2, max: 4 } },
        ],
        outputs: [{ id: 'lead', name: 'Lead time', unit: 'd', formula: 'wait + survey', upper: 10 }],
      },
    },
  });
  expect(created.status()).toBe(201);
  const id = (await created.json()).model.id as string;
  await page.goto(`/app/models/${id}`);
  await expect(page.getByText('No problems found.')).toBeVisible();
  await page.getByRole('button', { name: 'Use measured data from the dataset library…' }).first().click();
  await page.getByRole('combobox', { name: 'Dataset' }).selectOption({ label: 'Permit waits, e2e (80 values, d)' });
  const useAs = page.getByRole('combobox', { name: 'Use as' });
  await useAs.selectOption({ label: `Gamma fit (rank ${fit.rank} by AIC)` });
  await page.getByRole('button', { name: 'Use this distribution' }).click();
  await expect(page.getByRole('textbox', { name: /^Shape k/ }).first()).toHaveValue(new RegExp(`^${String(fit.params.shape).slice(0, 6)}`));
  await expect(page.getByText('No problems found.')).toBeVisible();
  // The preview runs the gamma input (mean kθ in the inputs' report of the run).
  await expect(page.getByRole('heading', { name: /Lead time/ }).first()).toBeVisible({ timeout: 30_000 });
  await page.screenshot({ path: `${SHOTS}/gamma-input.png`, fullPage: true });
});
