import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { randomUUID } from 'node:crypto';
import { runModelSync } from '@/lib/core/engine';
import { validateModel } from '@/lib/core/engine/schema';
import { getDb, closeDb } from '@/db/knex';
import { resetEnvCache } from '@/lib/server/env';
import { pumpClearanceV1, pumpClearanceV2, quayWallV1, seedModels } from '@/lib/dev/seed/models';
import { listModels, listVersions } from '@/db/models';
import { getPublishedWidget, listWidgets } from '@/db/widgets';
import { listFirstFigures } from '@/db/first-figures';
import { engineBuild } from '@/lib/server/embed/first-figures';

// The demo models: valid, telling (the stack misses its limits at worst case but not by RSS), and seeded with a
// signed-off, published version each, written by an author and checked by the demo checker.

let dir: string;
let firmId: string;
const ids = { author: randomUUID(), author2: randomUUID(), checker: randomUUID(), owner: randomUUID() };

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'studio-seed-'));
  process.env.DATABASE_FILE = path.join(dir, 'seed.sqlite');
  resetEnvCache();
  await closeDb();
  const db = getDb();
  // Every migration of the project, loaded by vite (knex's own loader cannot import TypeScript here).
  const modules = import.meta.glob<{ up: (k: unknown) => Promise<void>; down: (k: unknown) => Promise<void> }>('../../../migrations/*.ts', { eager: true });
  const names = Object.keys(modules).sort();
  await db.migrate.latest({
    migrationSource: { getMigrations: async () => names, getMigrationName: (n: string) => path.basename(n), getMigration: async (n: string) => modules[n]! },
  });
  firmId = randomUUID();
  const now = new Date().toISOString();
  await db('firms').insert({ id: firmId, name: 'Seed test firm', created_at: now });
  for (const [key, role, email] of [
    ['owner', 'owner', 'owner@orrinvale.example'],
    ['author', 'author', 'author@orrinvale.example'],
    ['author2', 'author', 'author2@orrinvale.example'],
    ['checker', 'checker', 'checker@orrinvale.example'],
  ] as const) {
    await db('users').insert({ id: ids[key], email, name: key, created_at: now });
    await db('memberships').insert({ id: randomUUID(), firm_id: firmId, user_id: ids[key], role, status: 'active', created_at: now, updated_at: now });
  }
});

afterAll(async () => {
  await closeDb();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe('demo models', () => {
  it('validate against the engine schema', () => {
    for (const m of [pumpClearanceV1, pumpClearanceV2, quayWallV1]) expect(validateModel(m).ok, m.title).toBe(true);
  });

  it('the pump stack fails at worst case, passes by RSS, and Monte Carlo agrees with the statistical figures', () => {
    const r = runModelSync(pumpClearanceV1);
    const s = r.stack!;
    expect(s.analytic.worstCaseWithinLimits).toBe(false);
    expect(s.analytic.rssWithinLimits).toBe(true);
    // Standard error of a sample sd is about sd/sqrt(2n); five of them is a safe band (check-values pitfall 9).
    const n = r.run.trials;
    expect(Math.abs(s.monteCarlo.sd! - s.analytic.statistical.sd)).toBeLessThan((5 * s.analytic.statistical.sd) / Math.sqrt(2 * n));
    expect(Math.abs(s.monteCarlo.mean! - s.analytic.statistical.mean)).toBeLessThan((5 * s.analytic.statistical.sd) / Math.sqrt(n));
    // The cast shroud dominates the variance; machining it (version 2) cuts the parts out of specification.
    expect(s.contributors[0]!.id).toBe('shroud');
    const v2 = runModelSync(pumpClearanceV2).stack!;
    expect(v2.monteCarlo.ppmObserved!).toBeLessThan(s.monteCarlo.ppmObserved!);
  });

  it('the quay estimate needs contingency above the base and may exceed its budget', () => {
    const c = runModelSync(quayWallV1).cost!;
    expect(c.contingency).toBeGreaterThan(0);
    expect(c.exceedBudget!.p).toBeGreaterThan(0);
    expect(c.exceedBudget!.p).toBeLessThan(0.5);
    expect(c.p10).toBeLessThan(c.p50);
    expect(c.p80).toBeLessThan(c.p90);
  });
});

describe('seedModels', () => {
  it('writes two models, each with a signed-off, published version', async () => {
    expect(await seedModels(firmId)).toEqual({ models: 2, widgets: 2 });
    const models = await listModels(firmId);
    expect(models.map((m) => m.title).sort()).toEqual([quayWallV1.title, pumpClearanceV1.title].sort());
    const pump = models.find((m) => m.template === 'linear-stack')!;
    expect(pump.latestVersion).toMatchObject({ number: 2, checkState: 'unchecked' });
    expect(pump.published).toMatchObject({ versionNumber: 1 });
    const versions = await listVersions(firmId, pump.id);
    const v1 = versions.find((v) => v.number === 1)!;
    expect(v1).toMatchObject({ checkState: 'signed_off', authorId: ids.author, checkerId: ids.checker });
    expect(versions.find((v) => v.number === 2)!.authorId).toBe(ids.author2);
    const widgets = await listWidgets(firmId);
    expect(widgets).toHaveLength(2);
    for (const w of widgets) {
      expect(w.versionCheckState).toBe('signed_off');
      const pub = await getPublishedWidget(firmId, w.id);
      expect(pub?.checkerName).toBe('checker');
      expect(pub?.dialIds.length).toBeGreaterThan(0);
      // Queued as publishing queues them, so the demo's first visit gets the server's first figures.
      expect(await listFirstFigures(firmId, w.versionId)).toEqual([expect.objectContaining({ engineBuild: engineBuild(), state: 'queued' })]);
    }
  });

  it('does nothing the second time', async () => {
    expect(await seedModels(firmId)).toEqual({ models: 0, widgets: 0 });
    expect(await listModels(firmId)).toHaveLength(2);
  });
});
