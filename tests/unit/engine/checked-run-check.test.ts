// The studio's page and workers run CheckedModels: checkedRunCheck spares them parsing the model again, but a model
// with dial values applied is still checked, and the run is the same bit for bit as the fully validated one.
import { describe, expect, it } from 'vitest';
import { ChunkRunner, inputWindow, prepareRunWith } from '@/lib/core/engine/chunks';
import { EXAMPLE_MODELS } from '@/lib/core/engine/examples';
import { mergeParts } from '@/lib/core/engine/merge';
import { validateModel, type CheckedModel } from '@/lib/core/engine/schema';
import { checkedRunCheck } from '@/lib/core/engine/worker-protocol';
import type { ModelCheck } from '@/lib/core/engine/set-dials';

function checkedExample(template: keyof typeof EXAMPLE_MODELS, patch: (m: CheckedModel) => CheckedModel = (m) => m): CheckedModel {
  const r = validateModel(EXAMPLE_MODELS[template]);
  if (!r.ok) throw new Error('example does not validate');
  const again = validateModel(patch({ ...r.model, settings: { ...r.model.settings, trials: 20_000 } }));
  if (!again.ok) throw new Error('patched example does not validate');
  return again.model;
}

function counting(): { check: NonNullable<ModelCheck>; seen: unknown[] } {
  const seen: unknown[] = [];
  return { seen, check: (input) => (seen.push(input), validateModel(input)) };
}

function run(prep: ReturnType<typeof prepareRunWith>) {
  const ks = Array.from({ length: prep.chunkCount }, (_, k) => k);
  const r = mergeParts(prep, new ChunkRunner().run(prep, ks, { inputWindow: inputWindow(prep) }));
  r.timing = { samplingMs: 0, statisticsMs: 0, totalMs: 0 };
  return JSON.stringify(r);
}

describe('checkedRunCheck', () => {
  it('a model without dials is not parsed again, and runs as the validated path does', () => {
    const model = checkedExample('linear-stack', (m) => ({ ...m, dials: [] }));
    const { check, seen } = counting();
    const prep = prepareRunWith(checkedRunCheck(check, model), model);
    expect(seen).toHaveLength(0);
    expect(run(prep)).toBe(run(prepareRunWith(validateModel, model)));
  });

  it('a model with dials: only the copy with the dial values applied is checked', () => {
    const model = checkedExample('linear-stack');
    const dial = model.dials[0];
    expect(dial).toBeDefined();
    const { check, seen } = counting();
    const prep = prepareRunWith(checkedRunCheck(check, model), model, { [dial.id]: dial.max });
    expect(seen).toHaveLength(1);
    expect(seen[0]).not.toBe(model);
    expect(run(prep)).toBe(run(prepareRunWith(validateModel, model, { [dial.id]: dial.max })));
  });

  it('a dial value that makes the model invalid is still refused', () => {
    const model = checkedExample('linear-stack');
    const dial = model.dials[0];
    // A check that refuses every copy: the refusal must reach the caller, with the dial note.
    const refuse: ModelCheck = () => ({ ok: false, model: null, issues: [{ path: ['contributors', 0, 'nominal'], message: 'Refused.' }] });
    expect(() => prepareRunWith(checkedRunCheck(refuse, model), model, { [dial.id]: dial.min })).toThrow(/Refused\. \(with the dial values applied\)/);
  });

  it('without a check (the embed) it stays without one', () => {
    expect(checkedRunCheck(null, checkedExample('cost-range'))).toBeNull();
  });
});
