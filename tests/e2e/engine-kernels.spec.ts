import { test, expect, type Page, type Worker } from '@playwright/test';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { KERNELS_WASM_BASE64 } from '../../lib/core/engine/kernels-wasm';
import { E2E_APP, E2E_HOST } from './support/ports';
import { openQuayStudio } from './support/demo-sign-in';

// The engine's WebAssembly SIMD kernels (lib/core/engine/kernels.wat) can run where the engine runs in Chromium:
// in the web workers of the embed page and of the studio, under the app's Content-Security-Policy (the workers'
// scripts come from /_next/static and carry no policy of their own, so 'wasm-unsafe-eval' is not needed in the
// pages' script-src). Without them the engine would fall back to its JavaScript twins: same figures, slower.


/** In the worker's own global scope: compile and instantiate the kernels, and run the copula product on 8 trials. */
async function kernelsRunIn(worker: Worker): Promise<{ ok: boolean; error?: string; acc?: number[] }> {
  return worker.evaluate((b64) => {
    try {
      const bin = atob(b64);
      const bytes = new Uint8Array(bin.length);
      for (let i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
      const inst = new WebAssembly.Instance(new WebAssembly.Module(bytes), {});
      const e = inst.exports as { memory: WebAssembly.Memory; affine: (acc: number, a: number, coef: number, off: number, terms: number, count: number) => void };
      // acc at 0, one score block z at 1024 (z[t] = t), coefficient 2 at 2048, the block's address at 2056.
      const mem = e.memory.buffer;
      new Float64Array(mem, 1024, 8).set([0, 1, 2, 3, 4, 5, 6, 7]);
      new Float64Array(mem, 2048, 1).set([2]);
      new Int32Array(mem, 2056, 1).set([1024]);
      e.affine(0, 10, 2048, 2056, 1, 8);
      return { ok: true, acc: Array.from(new Float64Array(mem, 0, 8)) };
    } catch (err) {
      return { ok: false, error: String(err) };
    }
  }, KERNELS_WASM_BASE64);
}

async function engineWorkers(page: Page): Promise<Worker[]> {
  await expect.poll(() => page.workers().filter((w) => w.url().startsWith(E2E_APP)).length, { timeout: 30_000 }).toBeGreaterThan(0);
  return page.workers().filter((w) => w.url().startsWith(E2E_APP));
}

function watchViolations(page: Page): string[] {
  const seen: string[] = [];
  page.on('console', (m) => {
    if (/Content Security Policy|Refused to|wasm-unsafe-eval/i.test(m.text())) seen.push(m.text());
  });
  return seen;
}

test('the embed page’s engine workers may compile and run the SIMD kernels', async ({ page }) => {
  const violations = watchViolations(page);
  const db = openTestDb(process.env.E2E_DATA_DIR!);
  const firmId = firmIdOf(db, 'owner@orrinvale.example');
  const client = db.prepare("select id from clients where firm_id = ? and name = 'Quillbrook Pumps Ltd'").get(firmId) as { id: string };
  db.close();
  await page.goto(`${E2E_HOST}/?client=${client.id}`);
  const headline = page.frameLocator('iframe').first().locator('[aria-live="polite"][aria-atomic="true"]').first();
  await expect(headline).not.toContainText('Computing', { timeout: 30_000 });
  const workers = await engineWorkers(page);
  for (const w of workers) {
    const r = await kernelsRunIn(w);
    expect(r, w.url()).toEqual({ ok: true, acc: [10, 12, 14, 16, 18, 20, 22, 24] });
  }
  expect(violations).toEqual([]);
  // The check can fail: the embed document itself refuses WebAssembly (its script-src has no
  // 'wasm-unsafe-eval', and needs none, as the engine runs in workers only).
  const frame = page.frames().find((f) => f.url().startsWith(`${E2E_APP}/embed/`));
  if (!frame) throw new Error('no embed frame');
  const inDocument = await frame.evaluate(() => {
    try {
      new WebAssembly.Module(new Uint8Array([0, 97, 115, 109, 1, 0, 0, 0]));
      return 'compiled';
    } catch (err) {
      return String(err);
    }
  });
  expect(inDocument).toMatch(/CompileError.*Content Security/);
});

test('the studio’s engine workers may compile and run the SIMD kernels', async ({ page }) => {
  const violations = watchViolations(page);
  await openQuayStudio(page);
  const workers = await engineWorkers(page);
  for (const w of workers) {
    const r = await kernelsRunIn(w);
    expect(r, w.url()).toEqual({ ok: true, acc: [10, 12, 14, 16, 18, 20, 22, 24] });
  }
  expect(violations).toEqual([]);
});
