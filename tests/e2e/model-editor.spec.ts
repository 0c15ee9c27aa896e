import { test, expect, type Locator, type Page } from '@playwright/test';
import AxeBuilder from '@axe-core/playwright';

// The model editor on its development page (/dev/editor, present in demo installations): bad input is caught
// beside the field at fault, the correlation repair shows what it changed, import never replaces the model with
// a bad file, and narrow screens scroll tables inside their own box.

async function openEditor(page: Page, template: 'linear-stack' | 'cost-range' | 'formula') {
  await page.goto(`/dev/editor?t=${template}`);
  await expect(page.getByText('No problems found.')).toBeVisible();
}

/** The message an input points at through aria-describedby. */
async function describedText(page: Page, input: Locator): Promise<string> {
  const ids = (await input.getAttribute('aria-describedby')) ?? '';
  const texts = await Promise.all(ids.split(/\s+/).filter(Boolean).map((id) => page.locator(`[id="${id}"]`).innerText()));
  return texts.join(' ');
}

const state = (page: Page) => page.getByTestId('editor-state');

test('linear stack: a negative tolerance is caught beside its field, listed at the top, and cleared when fixed', async ({ page }) => {
  await openEditor(page, 'linear-stack');
  const minus = page.getByRole('textbox', { name: /^Minus tolerance of Housing bore depth/ });
  await minus.fill('-0.05');
  await expect(minus).toHaveAttribute('aria-invalid', 'true');
  await expect.poll(() => describedText(page, minus)).toContain('Enter the minus tolerance as a magnitude of 0 or more (found -0.05).');
  await expect(page.getByRole('link', { name: 'Contributor 1 › minus tolerance' })).toBeVisible();
  await expect(state(page)).toContainText('last: invalid');

  // The problem list moves focus to the field.
  await page.getByRole('link', { name: 'Contributor 1 › minus tolerance' }).click();
  await expect(minus).toBeFocused();

  await minus.fill('0.05');
  await expect(minus).not.toHaveAttribute('aria-invalid', 'true');
  await expect(state(page)).toContainText('last: valid');
  await expect(page.getByText('No problems found.')).toBeVisible();
});

test('linear stack: rows can be added, reordered and removed from the keyboard', async ({ page }) => {
  await openEditor(page, 'linear-stack');
  const names = page.getByRole('textbox', { name: /^Name of contributor \d+$/ });
  await expect(names).toHaveCount(6);
  await page.getByRole('button', { name: 'Add contributor' }).press('Enter');
  await expect(names).toHaveCount(7);
  await expect(names.nth(6)).toHaveValue('Dimension 7');
  await page.getByRole('button', { name: 'Move Dimension 7 up' }).press('Enter');
  await expect(names.nth(5)).toHaveValue('Dimension 7');
  await expect(names.nth(6)).toHaveValue('Spacer sleeve length');
  await page.getByRole('button', { name: 'Remove Dimension 7' }).press('Enter');
  await expect(names).toHaveCount(6);
  await expect(state(page)).toContainText('last: valid');
});

test('cost range: three-point order, zero width and a probability above 1 are caught beside their fields', async ({ page }) => {
  await openEditor(page, 'cost-range');
  const ml = page.getByRole('textbox', { name: 'Most likely estimate of Traffic and pedestrian management' });
  await ml.fill('40');
  await expect.poll(() => describedText(page, ml)).toContain('The most likely estimate (40) must lie between the minimum (22) and the maximum (34).');

  const high = page.getByRole('textbox', { name: 'High estimate of Scaffolding and encapsulation' });
  await high.fill('85');
  await expect.poll(() => describedText(page, high)).toContain('The range has zero width');

  const p = page.getByRole('textbox', { name: /^Probability of Lead found in the existing paint/ });
  await p.fill('1.3');
  await expect.poll(() => describedText(page, p)).toContain('between 0 and 1 (found 1.3)');
  await expect(page.getByText('3 problems to fix')).toBeVisible();

  // The same probability entered as a percentage.
  await page.getByRole('button', { name: 'Probabilities as %' }).click();
  const pct = page.getByRole('textbox', { name: /^Probability of Lead found in the existing paint, in per cent/ });
  await expect(pct).toHaveValue('130');
  await pct.fill('30');
  await expect(pct).not.toHaveAttribute('aria-invalid', 'true');
  await expect(page.getByText('2 problems to fix')).toBeVisible();
});

test('formula: an unknown name is flagged beside the formula; a non-PSD matrix is repaired, undone and accepted', async ({ page }) => {
  await openEditor(page, 'formula');
  const formula = page.getByRole('textbox', { name: 'Formula for Pump shaft power' });
  await formula.fill('hydraulic_kw / pump_ef');
  await expect.poll(() => describedText(page, formula)).toContain("Unknown name 'pump_ef'. Did you mean 'pump_eff'?");
  await formula.fill('hydraulic_kw / pump_eff');
  await expect(formula).not.toHaveAttribute('aria-invalid', 'true');

  await page.getByRole('checkbox', { name: /Pump efficiency/ }).check();
  const cell = (a: string, b: string) => page.getByRole('textbox', { name: `Correlation of ${a} with ${b}` });
  await cell('Duty flow', 'Total head').fill('0.9');
  await expect(cell('Total head', 'Duty flow')).toHaveValue('0.9'); // symmetric editing
  await cell('Duty flow', 'Pump efficiency').fill('0.8');
  await cell('Total head', 'Pump efficiency').fill('-0.6');
  const status = page.locator('[id$="-correlation-matrix-status"]');
  await expect(status).toContainText('not positive semi-definite');
  await expect(status).toContainText(/smallest eigenvalue\s*-0\.\d+/);
  await expect(state(page)).toContainText('last: invalid');

  await page.getByRole('button', { name: 'Repair to nearest valid matrix' }).click();
  await expect(page.getByText(/Repaired: the smallest eigenvalue went from -0\.\d+/)).toBeVisible();
  const changed = page.getByRole('table', { name: 'Cells changed by the repair' }).locator('tbody tr');
  await expect(changed).toHaveCount(3);
  await expect(changed.first()).toContainText('0.9');
  await expect(status).toContainText('Valid correlation matrix');
  await expect(state(page)).toContainText('last: valid');

  await page.getByRole('button', { name: 'Undo repair' }).click();
  await expect(cell('Duty flow', 'Total head')).toHaveValue('0.9');
  await expect(status).toContainText('not positive semi-definite');

  await page.getByRole('button', { name: 'Repair to nearest valid matrix' }).click();
  await page.getByRole('button', { name: 'Accept repaired matrix' }).click();
  await expect(page.getByText(/Repaired: the smallest/)).toHaveCount(0);
  await expect(status).toContainText('Valid correlation matrix');
  await expect(state(page)).toContainText('last: valid');
});

test('import refuses a malformed file and keeps the model; an exported file imports again', async ({ page }) => {
  await openEditor(page, 'linear-stack');
  const title = page.getByRole('textbox', { name: 'Title' });
  const before = await title.inputValue();
  const input = page.locator('input[type="file"]');

  await input.setInputFiles({ name: 'broken.stochos.json', mimeType: 'application/json', buffer: Buffer.from('{\n  "schema": "stochos.model/1"\n  "template": "linear-stack"\n}') });
  const alert = page.getByRole('alert').filter({ hasText: 'not imported' });
  await expect(alert).toContainText('broken.stochos.json was not imported; the model is unchanged.');
  await expect(alert).toContainText('line 3, column 3');
  await expect(title).toHaveValue(before);

  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Export JSON' }).click()]);
  expect(download.suggestedFilename()).toBe('Gearbox output shaft - bearing axial float.stochos.json');
  const stream = await download.createReadStream();
  const chunks: Buffer[] = [];
  for await (const c of stream) chunks.push(c as Buffer);
  const doc = JSON.parse(Buffer.concat(chunks).toString('utf8'));
  expect(doc.schema).toBe('stochos.model/1');

  // Invalid fields: listed with their place in the file, nothing replaced.
  const bad = structuredClone(doc);
  bad.contributors[1].plusTol = -1;
  await input.setInputFiles({ name: 'bad-fields.stochos.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(bad, null, 2)) });
  await expect(alert).toContainText('Contributor 2 › plus tolerance');
  await expect(alert).toContainText(/line \d+, column \d+/);
  await expect(title).toHaveValue(before);

  doc.title = 'Gearbox output shaft, revised';
  await input.setInputFiles({ name: 'revised.stochos.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(doc, null, 2)) });
  await expect(title).toHaveValue('Gearbox output shaft, revised');
  await expect(page.getByRole('alert').filter({ hasText: 'not imported' })).toHaveCount(0);
  await expect(state(page)).toContainText('last: valid');
});

test('at 360 px the page does not scroll sideways; wide tables scroll inside their own box', async ({ page }) => {
  await page.setViewportSize({ width: 360, height: 800 });
  for (const t of ['linear-stack', 'cost-range', 'formula'] as const) {
    await openEditor(page, t);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    const region = page.getByRole('region', { name: t === 'formula' ? 'Dials table' : t === 'linear-stack' ? 'Contributors to the gap table' : 'Line items table' });
    const { scroll, client } = await region.evaluate((el) => ({ scroll: el.scrollWidth, client: el.clientWidth }));
    expect(scroll).toBeGreaterThan(client);
  }
});

test('keyboard focus is visible on the editor controls', async ({ page }) => {
  await openEditor(page, 'cost-range');
  await page.getByRole('textbox', { name: 'Title' }).focus();
  for (let k = 0; k < 6; k++) {
    await page.keyboard.press('Tab');
    const outline = await page.evaluate(() => {
      const el = document.activeElement as HTMLElement;
      const s = getComputedStyle(el);
      return { tag: el.tagName, style: s.outlineStyle, width: parseFloat(s.outlineWidth) };
    });
    expect(outline.style, outline.tag).not.toBe('none');
    expect(outline.width).toBeGreaterThanOrEqual(2);
  }
});

test('axe finds no accessibility violations in the editor, with and without problems shown', async ({ page }) => {
  for (const t of ['linear-stack', 'cost-range', 'formula'] as const) {
    await openEditor(page, t);
    expect((await new AxeBuilder({ page }).include('form').analyze()).violations, t).toEqual([]);
    await page.getByRole('button', { name: 'Load a broken copy' }).click();
    await expect(page.getByText(/problems? to fix/)).toBeVisible();
    expect((await new AxeBuilder({ page }).include('form').analyze()).violations, `${t} with problems`).toEqual([]);
  }
});
