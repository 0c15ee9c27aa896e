import { describe, expect, it } from 'vitest';
import { EXAMPLE_MODELS, validateModel } from '@/lib/core/engine';
import { modelOutline } from '@/lib/core/widget/model-outline';

// The embed widget reads the template and dials from the checked model without the schema; it must read exactly
// what the schema gives (a dial's unit defaults to '').
describe('modelOutline', () => {
  it('reads the same template and dials as the schema, for every example model', () => {
    for (const model of Object.values(EXAMPLE_MODELS)) {
      const checked = validateModel(model);
      if (!checked.ok) throw new Error('example model invalid');
      expect(modelOutline(checked.model)).toEqual({
        template: model.template,
        dials: (model.dials ?? []).map((d) => ({ id: d.id, label: d.label, unit: d.unit ?? '', min: d.min, max: d.max, step: d.step, default: d.default })),
      });
    }
  });
});
