// The embed runs published models without the schema, and fetches the formula parser (jsep) and the correlation
// code (ml-matrix) only for a model that needs them (lib/core/engine/optional-parts.ts). Here a module graph loaded
// without the schema must refuse such a model until loadPartsFor has run, then give the validated path's result
// bit for bit; a model that needs neither must run at once.
import { describe, expect, it, vi } from 'vitest';
import { EXAMPLE_MODELS } from '@/lib/core/engine/examples';
import { partsFor } from '@/lib/core/engine/optional-parts';

type Engine = {
  chunks: typeof import('@/lib/core/engine/chunks');
  merge: typeof import('@/lib/core/engine/merge');
  parts: typeof import('@/lib/core/engine/optional-parts');
};

function runWith(e: Engine, prep: ReturnType<Engine['chunks']['prepareRunWith']>) {
  const ks = Array.from({ length: prep.chunkCount }, (_, k) => k);
  const parts = new e.chunks.ChunkRunner().run(prep, ks, { inputWindow: e.chunks.inputWindow(prep) });
  const r = e.merge.mergeParts(prep, parts);
  return JSON.stringify({ ...r, timing: null });
}

/** Published models (the schema's output, as the server stores them) and their results on the validated path. */
async function published() {
  vi.resetModules();
  const { validateModel } = await import('@/lib/core/engine/schema');
  const { prepareRun } = await import('@/lib/core/engine/prepare-run');
  const e: Engine = { chunks: await import('@/lib/core/engine/chunks'), merge: await import('@/lib/core/engine/merge'), parts: await import('@/lib/core/engine/optional-parts') };
  const stack = EXAMPLE_MODELS['linear-stack'] as { contributors: { id: string }[] };
  const inputs: Record<string, unknown> = {
    ...EXAMPLE_MODELS,
    // The stack example has no correlation: one more with two contributors from one batch.
    'linear-stack, correlated': { ...stack, correlation: { inputs: [stack.contributors[0].id, stack.contributors[1].id], matrix: [[1, 0.6], [0.6, 1]] } },
  };
  return Object.entries(inputs).map(([name, input]) => {
    const checked = validateModel(input);
    if (!checked.ok) throw new Error(`${name} does not validate: ${JSON.stringify(checked.issues)}`);
    const m = JSON.parse(JSON.stringify(checked.model)) as { settings: object };
    const model = { ...m, settings: { ...m.settings, trials: 20_000 } };
    return { name, model, expected: runWith(e, prepareRun(model)) };
  });
}

/** The embed's view: the run code alone, as embed-engine.ts and embed-worker.ts load it. */
async function withoutSchema(): Promise<Engine> {
  vi.resetModules();
  return { chunks: await import('@/lib/core/engine/chunks'), merge: await import('@/lib/core/engine/merge'), parts: await import('@/lib/core/engine/optional-parts') };
}

describe('engine parts loaded on demand (the embed)', () => {
  it('a published model needs the parser only if it is a formula model, the correlation code only if it correlates inputs', async () => {
    const models = await published();
    const needs = Object.fromEntries(models.map(({ name, model }) => [name, partsFor(model)]));
    expect(needs['linear-stack']).toEqual({ parser: false, linalg: false });
    expect(needs['linear-stack, correlated']).toEqual({ parser: false, linalg: true });
    expect(needs.formula.parser).toBe(true);
  });

  it('refuses a model whose parts are not loaded, and after loadPartsFor gives the validated result bit for bit', async () => {
    const models = await published();
    for (const { name, model, expected } of models) {
      const e = await withoutSchema();
      const need = e.parts.partsFor(model);
      if (need.parser || need.linalg) {
        expect(() => e.chunks.prepareRunWith(null, model), name).toThrow(/is not loaded: call loadPartsFor/);
        const loading = e.parts.loadPartsFor(model);
        expect(loading, name).not.toBeNull();
        await loading;
      }
      expect(e.parts.loadPartsFor(model), name).toBeNull();
      expect(runWith(e, e.chunks.prepareRunWith(null, model)), name).toBe(expected);
    }
  });
});
