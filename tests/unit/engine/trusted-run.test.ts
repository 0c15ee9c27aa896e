// The embed's engine prepares published (server-checked) models without the schema: it must
// give the same numbers, bit for bit, as the validated path, and still refuse bad dial values.
import { describe, expect, it } from 'vitest';
import { ChunkRunner, inputWindow, prepareRunWith } from '@/lib/core/engine/chunks';
import { EXAMPLE_MODELS } from '@/lib/core/engine/examples';
import { mergeParts } from '@/lib/core/engine/merge';
import { prepareRun } from '@/lib/core/engine/prepare-run';
import { validateModel } from '@/lib/core/engine/schema';

function run(prep: ReturnType<typeof prepareRun>) {
  const ks = Array.from({ length: prep.chunkCount }, (_, k) => k);
  const parts = new ChunkRunner().run(prep, ks, { inputWindow: inputWindow(prep) });
  return mergeParts(prep, parts);
}

describe('prepareRunWith(null): published models without the schema', () => {
  for (const [template, example] of Object.entries(EXAMPLE_MODELS)) {
    it(`${template}: same result as the validated path`, () => {
      // What the server stores and sends: the schema's output.
      const checked = validateModel(example);
      expect(checked.ok).toBe(true);
      const published = JSON.parse(JSON.stringify(checked.model)) as unknown;
      const settings = { ...(published as { settings: object }).settings, trials: 20_000 };
      const model = { ...(published as object), settings };
      const a = run(prepareRun(model));
      const b = run(prepareRunWith(null, model));
      a.timing = b.timing;
      expect(JSON.stringify(b)).toBe(JSON.stringify(a));
    });
  }

  it('still refuses a dial value outside its range', () => {
    const checked = validateModel(EXAMPLE_MODELS['linear-stack']);
    if (!checked.ok) throw new Error('example does not validate');
    const dial = checked.model.dials[0];
    expect(dial).toBeDefined();
    expect(() => prepareRunWith(null, checked.model, { [dial.id]: dial.max + 10 * (dial.max - dial.min + 1) })).toThrow(/outside its range/);
  });
});
