/* eslint-disable @typescript-eslint/no-explicit-any -- these tests edit model JSON freely to build variants and bad inputs */
/**
 * The engine on a pool of 1, 2 or 4 real Chromium web workers gives the same numbers, bit
 * for bit, as the engine in Node on one thread (what the server runs): every statistic of
 * the example models and a hash of every sample column. The worker and the page are
 * bundled with esbuild and served from 127.0.0.1.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { build } from 'esbuild';
import { chromium, type Browser } from '@playwright/test';
import { createServer, type Server } from 'node:http';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { EXAMPLE_MODELS } from '@/lib/core/engine/examples';
import { runModelSync } from '@/lib/core/engine/simulate';
import { fingerprint, type Fingerprint } from '@/tests/support/engine-helpers';

const root = path.resolve(__dirname, '../../..');

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x));
function variant(model: object, settings: object, edit?: (m: any) => void) {
  const m = clone(model) as any;
  // 40,000 trials: two full chunks and a short one, so every pool size splits the run.
  m.settings = { ...m.settings, ...settings, trials: 40_000 };
  edit?.(m);
  return m;
}

/** The examples plus the other samplers: Latin hypercube, ziggurat, Iman-Conover, every formula function. */
const MODELS: Record<string, object> = {
  ...EXAMPLE_MODELS,
  'stack, Latin hypercube': variant(EXAMPLE_MODELS['linear-stack'], { design: 'latin-hypercube' }),
  'cost, Iman-Conover, ziggurat': variant(EXAMPLE_MODELS['cost-range'], { correlationMethod: 'iman-conover', normalMethod: 'ziggurat' }),
  'formula, ziggurat, all functions': variant(EXAMPLE_MODELS.formula, { normalMethod: 'ziggurat' }, (m) => {
    m.inputs.push({ id: 'angle', name: 'Angle', distribution: { type: 'weibull', shape: 1.7, scale: 0.6 } });
    m.inputs.push({ id: 'life', name: 'Life', distribution: { type: 'lognormal', mu: 1, sigma: 0.5, max: 9 } });
    m.inputs.push({ id: 'wait', name: 'Wait', distribution: { type: 'exponential', rate: 0.3 } });
    m.outputs.push({
      id: 'mix',
      name: 'Every function',
      formula:
        'sin(angle) + cos(angle) + tan(angle / 3) + asin(angle / 10) + acos(angle / 10) + atan(life) + atan2(life, wait) + ' +
        'exp(-wait) + ln(life) + log10(life) + sqrt(life) + pow(life, 1.37) + life ^ 0.5 + hypot(life, wait, angle) + ' +
        'min(life, wait) + max(life, wait) + abs(angle - 1) + floor(life) + ceil(wait) + round(angle) + if(wait > 2, 1, 0) + mean(life, wait)',
    });
  }),
};
const CHROMIUM_ARGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];

let dir = '';
let server: Server;
let browser: Browser;
let base = '';

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'stochos-engine-parity-'));
  const common = { bundle: true, platform: 'browser' as const, target: 'es2022', absWorkingDir: root, tsconfig: path.join(root, 'tsconfig.json'), logLevel: 'silent' as const };
  await build({ ...common, entryPoints: [path.join(root, 'lib/core/engine/worker.ts')], outfile: path.join(dir, 'worker.js'), format: 'iife' });
  await build({ ...common, entryPoints: [path.join(root, 'tests/support/engine-worker-page.ts')], outfile: path.join(dir, 'page.js'), format: 'esm' });
  writeFileSync(path.join(dir, 'index.html'), '<!doctype html><meta charset="utf-8"><title>engine parity</title><script type="module" src="/page.js"></script>');
  const types: Record<string, string> = { '.html': 'text/html', '.js': 'text/javascript' };
  server = createServer((req, res) => {
    const name = req.url === '/' ? 'index.html' : (req.url ?? '').replace(/^\//, '').replace(/\?.*$/, '');
    if (!['index.html', 'page.js', 'worker.js'].includes(name)) {
      res.writeHead(404).end();
      return;
    }
    res.writeHead(200, { 'content-type': types[path.extname(name)] ?? 'application/octet-stream' });
    res.end(readFileSync(path.join(dir, name)));
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
  if (dir) rmSync(dir, { recursive: true, force: true });
});

const nodeRuns: Record<string, Fingerprint> = {};

describe('engine worker pool in Chromium', () => {
  beforeAll(() => {
    for (const [name, model] of Object.entries(MODELS)) nodeRuns[name] = fingerprint(runModelSync(model, { samples: 'all' }));
  });

  it.each([1, 2, 4])('%i workers match the Node run bit for bit for every example model and sampler', async (workers) => {
    const page = await browser.newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await page.goto(base);
    await page.waitForFunction(() => 'engineParity' in window);
    const inBrowser = (await page.evaluate(([models, w]) => window.engineParity.run(models, w), [MODELS, workers] as const)) as Record<string, Fingerprint>;
    expect(errors).toEqual([]);
    for (const name of Object.keys(MODELS)) {
      const node = nodeRuns[name];
      expect(inBrowser[name].sampleKinds.every((k) => k === '[object Float64Array]')).toBe(true);
      expect({ model: name, columns: inBrowser[name].columns }).toEqual({ model: name, columns: node.columns });
      expect(inBrowser[name].samples).toBe(node.samples);
      // Compare parsed JSON so a failure shows the differing statistic; equality is exact.
      expect(JSON.parse(inBrowser[name].stats)).toEqual(JSON.parse(node.stats));
      expect(inBrowser[name].stats).toBe(node.stats);
    }
    await page.close();
  });

  it.each([
    ['linear-stack', [{}, { spacer_length: 24.19 }, { spacer_length: 24.19, housing_k: 2.5 }, { spacer_length: 24.07 }, {}], 'all'],
    ['cost-range', [{}, { lead_paint_p: 0.55 }, { lead_paint_p: 0.55, surface_rho: 0.7 }, { budget_dial: 650 }], 'none'],
    ['formula', [{}, { flow_mean: 0.055 }, { flow_mean: 0.055, service_factor: 1.2 }], 'all'],
  ] as const)('%s: dial moves on a pool that keeps unchanged columns give a fresh Node run bit for bit, headline step first', async (name, moves, samples) => {
    const model = EXAMPLE_MODELS[name];
    const page = await browser.newPage();
    await page.goto(base);
    await page.waitForFunction(() => 'engineParity' in window);
    for (const workers of [1, 3]) {
      const r = await page.evaluate(([m, mv, w, s]) => window.engineParity.dialMoves(m, mv, w, s), [model, [...moves] as Record<string, number>[], workers, samples] as const);
      moves.forEach((dialValues, i) => {
        const node = fingerprint(runModelSync(model, { dialValues, samples }));
        expect(r.stages[i]).toEqual(['headline', 'charts', 'done']);
        // The headline step's figures are the final result's, not a preview.
        expect(r.headlines[i]).toBe('same');
        expect(r.final[i].columns).toEqual(node.columns);
        expect(r.final[i].samples).toBe(node.samples);
        expect(JSON.parse(r.final[i].stats)).toEqual(JSON.parse(node.stats));
        expect(r.final[i].stats).toBe(node.stats);
      });
    }
    await page.close();
  });

  it('a new run cancels the one in progress; progress is posted while it runs', async () => {
    const page = await browser.newPage();
    await page.goto(base);
    await page.waitForFunction(() => 'engineParity' in window);
    const r = await page.evaluate(() => window.engineParity.supersede());
    expect(r.first).toBe('RunCancelledError');
    expect(r.second).toBe('finished gap');
    expect(r.progressEvents).toBeGreaterThan(1);
    await page.close();
  });
});
