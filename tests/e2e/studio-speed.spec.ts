import { test, expect, type Page } from '@playwright/test';
import fs from 'node:fs';
import { runModelSync } from '../../lib/core/engine';
import { decimalsForSignificant, formatValue } from '../../lib/core/charts/format';

// How long an edit takes to reach the figures: a 20-contributor stack at 50,000 trials, edited in the studio.
// Each edit's figures must be the engine's own for the edited model; the times are reported, never asserted
// (speed is measured, not tested). Results go to STUDIO_SPEED_OUT (JSON) and the test's output.

const norm = (s: string) => s.replace(/\u00a0|\u202f/g, ' ').replace(/\s+/g, ' ').trim();

function stack20(nominals: number[]) {
  const kinds = ['normal', 'uniform', 'triangular', 'normal'] as const;
  return {
    schema: 'stochos.model/1',
    template: 'linear-stack',
    title: 'Speed check: twenty-part stack',
    unit: 'mm',
    settings: { trials: 50_000, seed: 'speed-20', design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' },
    contributors: nominals.map((nominal, i) => ({
      id: `part_${i + 1}`,
      name: `Part ${i + 1}`,
      nominal,
      plusTol: 0.02 + (i % 5) * 0.01,
      minusTol: 0.02 + (i % 3) * 0.01,
      direction: i === 0 ? 1 : -1,
      distribution: kinds[i % 4] === 'normal' ? { type: 'normal', k: 3 } : { type: kinds[i % 4] },
      meanShift: 0,
    })),
    limits: { lower: 0.2, upper: 1.0 },
    dials: [],
  };
}

const BASE = [100, ...Array.from({ length: 19 }, () => 5.2)];

function mcRange(model: unknown): string {
  const s = runModelSync(model).stack!;
  const mc = s.monteCarlo;
  const decimals = Math.min(8, decimalsForSignificant(mc.sd!, 2));
  const f = (v: number) => norm(formatValue(v, 'mm', { decimals }));
  return `${f(mc.mean! - 3 * mc.sd!)} to ${f(mc.mean! + 3 * mc.sd!)}`;
}

async function signIn(page: Page) {
  await page.goto('/sign-in');
  await page.getByLabel(/e-mail/i).first().fill('author@orrinvale.example');
  await page.getByLabel(/password/i).fill('stochos-demo-2026');
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await expect(page).toHaveURL(/\/app\//);
}

test('a 20-contributor stack at 50,000 trials: each edit reaches the figures (timed)', async ({ page }) => {
  test.setTimeout(240_000);
  await page.setViewportSize({ width: 1440, height: 1000 });
  await signIn(page);
  const created = await page.request.post('/api/models', { data: { template: 'linear-stack', start: 'import', model: stack20(BASE) } });
  expect(created.status()).toBe(201);
  const id = (await created.json()).model.id as string;
  await page.goto(`/app/models/${id}`);
  const card = page.getByRole('heading', { name: 'Monte Carlo', exact: true, level: 4 }).locator('..');
  await expect.poll(async () => norm(await card.innerText()), { timeout: 60_000 }).toContain(mcRange(stack20(BASE)));

  // Time from the last keystroke of an edit to the moment the Monte Carlo card shows the engine's figures for it.
  // Where the time goes: the page thread's long tasks (50 ms or more: rendering, validation, merging) during each edit.
  await page.evaluate(() => {
    const w = window as unknown as { __lastInput: number; __long: { start: number; end: number }[] };
    w.__long = [];
    document.addEventListener('input', () => (w.__lastInput = performance.now()), true);
    new PerformanceObserver((l) => l.getEntries().forEach((e) => w.__long.push({ start: e.startTime, end: e.startTime + e.duration }))).observe({ type: 'longtask' });
  });
  const longTasks: number[] = [];
  const times: number[] = [];
  const runs: number[] = [];
  const steps: Record<'editValid' | 'runStart' | 'partsIn' | 'headline' | 'done', number | null>[] = [];
  const nominals = [...BASE];
  for (let i = 0; i < 9; i++) {
    const part = 2 + (i % 19);
    nominals[part - 1] = +(nominals[part - 1]! + 0.01 * (i % 2 === 0 ? 1 : -2)).toFixed(3);
    const want = mcRange(stack20(nominals));
    await page.evaluate((expected) => {
      const w = window as unknown as { __doneAt: number | null; __obs?: MutationObserver };
      w.__doneAt = null;
      w.__obs?.disconnect();
      const norm = (s: string) => s.replace(/\u00a0|\u202f/g, ' ').replace(/\s+/g, ' ').trim();
      const h = [...document.querySelectorAll('h4')].find((e) => e.textContent === 'Monte Carlo')!;
      const target = h.parentElement!;
      w.__obs = new MutationObserver(() => {
        if (w.__doneAt === null && norm(target.innerText).includes(expected)) w.__doneAt = performance.now();
      });
      w.__obs.observe(target, { subtree: true, childList: true, characterData: true });
    }, want);
    await page.getByRole('textbox', { name: new RegExp(`^Nominal of Part ${part}\\b`) }).fill(String(nominals[part - 1]));
    await page.waitForFunction(() => (window as unknown as { __doneAt: number | null }).__doneAt !== null, undefined, { timeout: 30_000 });
    const ms = await page.evaluate(() => {
      const w = window as unknown as { __doneAt: number; __lastInput: number };
      return w.__doneAt - w.__lastInput;
    });
    times.push(ms);
    // Where this edit's time went, from the marks the page sets at each step (lib/core/engine/step-marks.ts).
    steps.push(
      await page.evaluate(() => {
        const w = window as unknown as { __doneAt: number; __lastInput: number };
        const at = (name: string) => {
          const m = performance.getEntriesByName(`stochos:${name}`, 'mark').at(-1);
          return m && m.startTime >= w.__lastInput && m.startTime <= w.__doneAt ? m.startTime - w.__lastInput : null;
        };
        return { editValid: at('edit-valid'), runStart: at('run-start'), partsIn: at('parts-in'), headline: at('headline'), done: w.__doneAt - w.__lastInput };
      }),
    );
    longTasks.push(
      await page.evaluate(() => {
        const w = window as unknown as { __doneAt: number; __lastInput: number; __long: { start: number; end: number }[] };
        return w.__long.reduce((sum, t) => sum + Math.max(0, Math.min(t.end, w.__doneAt) - Math.max(t.start, w.__lastInput)), 0);
      }),
    );
    expect(norm(await card.innerText())).toContain(want);
    // The worker's own time for the run, as the page reports it ("Last run: 50 000 trials in 412 ms").
    const status = norm(await page.getByText(/^Last run:/).first().innerText());
    const m = /trials in ([\d.]+) (ms|s)/.exec(status);
    if (m) runs.push(m[2] === 's' ? Number(m[1]) * 1000 : Number(m[1]));
  }
  const sorted = [...times].sort((a, b) => a - b);
  const median = sorted[Math.floor(sorted.length / 2)]!;
  const runSorted = [...runs].sort((a, b) => a - b);
  // Median of each step's duration: keystroke -> valid model -> run started -> workers' parts in -> headline merged -> shown.
  const medianOf = (xs: (number | null)[]) => {
    const v = xs.filter((x): x is number => x !== null).sort((a, b) => a - b);
    return v.length ? Math.round(v[Math.floor(v.length / 2)]! * 10) / 10 : null;
  };
  const gap = (a: keyof (typeof steps)[number] | null, b: keyof (typeof steps)[number]) => medianOf(steps.map((s) => (s[b] === null || (a !== null && s[a] === null) ? null : s[b]! - (a ? s[a]! : 0))));
  const breakdownMs = {
    check: gap(null, 'editValid'),
    render: gap('editValid', 'runStart'),
    workers: gap('runStart', 'partsIn'),
    merge: gap('partsIn', 'headline'),
    paint: gap('headline', 'done'),
  };
  const report = {
    contributors: 20,
    trials: 50_000,
    edits: times.length,
    medianMs: Math.round(median),
    minMs: Math.round(sorted[0]!),
    maxMs: Math.round(sorted[sorted.length - 1]!),
    timesMs: times.map(Math.round),
    workerRunMedianMs: runSorted.length ? Math.round(runSorted[Math.floor(runSorted.length / 2)]!) : null,
    workerRunsMs: runs.map(Math.round),
    // Medians of the steps (ms): the editor's check of the keystroke, the page's render until the run starts, the
    // workers until every part is in, the headline merge, and the render until the figures show.
    breakdownMs,
    // Page-thread long tasks between the keystroke and the figures, per edit.
    pageLongTasksMs: longTasks.map(Math.round),
  };
  console.log(`[studio speed] ${JSON.stringify(report)}`);
  if (process.env.STUDIO_SPEED_OUT) fs.writeFileSync(process.env.STUDIO_SPEED_OUT, JSON.stringify(report, null, 2));
});
