import { describe, expect, it } from 'vitest';
import { EXAMPLE_MODELS, validateModel } from '@/lib/engine';
import { modelOutline } from '@/components/widget/model-outline';

// The embed widget reads the template and dials from the published JSON without the schema; for a valid model it must
// read exactly what the schema gives.
describe('modelOutline', () => {
  it('reads the same template and dials as the schema, for every example model', () => {
    for (const model of Object.values(EXAMPLE_MODELS)) {
      const checked = validateModel(model);
      if (!checked.ok) throw new Error('example model invalid');
      expect(modelOutline(model)).toEqual({
        ok: true,
        template: checked.model.template,
        dials: checked.model.dials.map((d) => ({ id: d.id, label: d.label, unit: d.unit, min: d.min, max: d.max, step: d.step, default: d.default })),
      });
    }
  });

  it('says what is wrong when the JSON is not a model, and leaves out a dial without a usable range', () => {
    expect(modelOutline(null)).toEqual({ ok: false, problem: 'the model is not a JSON object' });
    expect(modelOutline({ template: 'spreadsheet' })).toEqual({ ok: false, problem: 'the model names no known template' });
    const out = modelOutline({ template: 'formula', dials: [{ id: 'a', label: 'A', unit: '', min: 1, max: 1, step: 0.1, default: 1 }, { id: 'b', min: 0, max: 2, step: 1, default: 1 }] });
    expect(out).toEqual({ ok: true, template: 'formula', dials: [{ id: 'b', label: 'b', unit: '', min: 0, max: 2, step: 1, default: 1 }] });
  });
});
