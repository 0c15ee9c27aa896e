import { SCHEMA_ID, type StochosModelInput } from '@/lib/core/engine/schema';
import type { TemplateId } from '@/lib/core/models/types';

// The smallest valid model of each template: one row to overwrite, so the editor and the preview work at once.

export function blankModel(template: TemplateId, title: string, defaults: { unit: string; currency: string }): StochosModelInput {
  const settings = { trials: 20_000, seed: 1, design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' } as const;
  switch (template) {
    case 'linear-stack':
      return {
        schema: SCHEMA_ID,
        template,
        title,
        unit: defaults.unit,
        settings,
        contributors: [{ id: 'dim_1', name: 'Dimension 1', nominal: 10, plusTol: 0.1, minusTol: 0.1, direction: 1, distribution: { type: 'normal', k: 3 }, meanShift: 0 }],
        limits: { lower: 9.8, upper: 10.2 },
        dials: [],
      };
    case 'cost-range':
      return {
        schema: SCHEMA_ID,
        template,
        title,
        currency: defaults.currency,
        settings,
        items: [{ id: 'item_1', name: 'Item 1', low: 90, mostLikely: 100, high: 130, distribution: 'pert' }],
        correlationGroups: [],
        riskEvents: [],
        confidence: 0.8,
        dials: [],
      };
    case 'formula':
      return {
        schema: SCHEMA_ID,
        template,
        title,
        settings,
        inputs: [{ id: 'x', name: 'Input x', unit: '', distribution: { type: 'normal', mean: 10, sd: 1 } }],
        outputs: [{ id: 'y', name: 'Output y', unit: '', formula: '2 * x' }],
        dials: [],
      };
  }
}
