import { describe, expect, it } from 'vitest';
import { exampleCostRange, exampleFormula, exampleLinearStack } from '@/lib/core/engine';
import { workOf } from '@/lib/server/simulate/budget';
import { checkUpFront, simulateRequestSchema } from '@/lib/server/simulate/run';
import { AppError } from '@/lib/server/http/errors';

// Refusals made on the request thread before a run is queued (default limits: 20,000,000 draws, 2,000,000 sample values).

const refusal = (body: unknown): AppError | null => {
  try {
    checkUpFront(simulateRequestSchema.parse(body));
    return null;
  } catch (err) {
    if (err instanceof AppError) return err;
    throw err;
  }
};
const withTrials = <T extends { settings: object }>(m: T, trials: number) => ({ ...m, settings: { ...m.settings, trials } });

describe('checks before a server run', () => {
  it('counts sampled columns per template as the engine plans them', () => {
    expect(workOf(exampleLinearStack)?.columns).toBe(exampleLinearStack.contributors.length);
    expect(workOf(exampleCostRange)?.columns).toBe(exampleCostRange.items.length + 2 * exampleCostRange.riskEvents.length);
    expect(workOf(exampleFormula)?.columns).toBe(exampleFormula.inputs.length);
    expect(workOf({ template: 'linear-stack' })).toBeNull();
  });

  it('refuses a model over the work budget with a 422 on model.settings.trials, and passes one at the budget', () => {
    const cols = exampleLinearStack.contributors.length;
    const at = Math.floor(20_000_000 / cols);
    expect(refusal({ model: withTrials(exampleLinearStack, at) })).toBeNull();
    const e = refusal({ model: withTrials(exampleLinearStack, at + 1) });
    expect(e).toMatchObject({ status: 422, fields: { 'model.settings.trials': [expect.stringContaining(`set model.settings.trials to ${at.toLocaleString('en')} or fewer`)] } });
  });

  it('refuses more sample values than one answer carries, counting every column asked for', () => {
    // Cost range, 'all': items + 2 per risk event + 1 per risk event's cost + the total.
    const cols = exampleCostRange.items.length + 3 * exampleCostRange.riskEvents.length + 1;
    const most = Math.floor(2_000_000 / cols);
    expect(refusal({ model: exampleCostRange, samples: { which: 'all', limit: Math.min(most, 100_000) } })).toBeNull();
    if (most < 100_000) {
      const e = refusal({ model: exampleCostRange, samples: { which: 'all', limit: most + 1 } });
      expect(e).toMatchObject({ status: 422, fields: { 'samples.limit': [expect.stringContaining(`Set samples.limit to ${most.toLocaleString('en')} or fewer`)] } });
    }
    const many = { ...exampleFormula, inputs: Array.from({ length: 40 }, (_, i) => ({ ...exampleFormula.inputs[0]!, id: `in_${i}` })), correlation: undefined };
    const e = refusal({ model: many, samples: { which: 'all', limit: 100_000 } });
    expect(e?.fields?.['samples.limit']?.[0]).toMatch(/That asks for 4,300,000 sample values \(43 columns × 100,000\)/);
  });
});
