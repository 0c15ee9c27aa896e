import { describe, expect, it } from 'vitest';
import { exampleCostRange, exampleFormula, exampleLinearStack, runModelSync, type RunResult } from '@/lib/core/engine';
import { normalEstimateNote, headlineFigure } from '@/lib/core/results/headline';
import { HEADLINES } from '@/lib/core/models/widget-options';
import { checked } from '../../support/checked';
import { formatPercent, formatPpm, formatValue } from '@/lib/core/charts/format';

const small = <T extends { settings: object }>(m: T): T => ({ ...m, settings: { ...m.settings, trials: 4000 } });
const stack: RunResult = runModelSync(small(exampleLinearStack));
const cost: RunResult = runModelSync(small(exampleCostRange));
const formula: RunResult = runModelSync(small(exampleFormula));

describe('headline figures', () => {
  it('has a figure for every headline the publishing form offers', () => {
    for (const [template, result] of [
      ['linear-stack', stack],
      ['cost-range', cost],
      ['formula', formula],
    ] as const) {
      for (const option of HEADLINES[template]) {
        const h = headlineFigure(result, option.id);
        expect(h.id).toBe(option.id);
        expect(h.value).not.toBe('—');
        expect(h.label.length).toBeGreaterThan(3);
      }
    }
  });

  it('reads the stack-up figures from the run', () => {
    expect(headlineFigure(stack, 'ppm').value).toBe(formatPpm(stack.stack!.monteCarlo.ppmObserved!));
    expect(headlineFigure(stack, 'ppk').value).toBe(stack.stack!.monteCarlo.ppk!.toFixed(2));
    expect(headlineFigure(stack, 'mean').label).toBe('Mean gap');
    // The mean gets the decimals of the standard deviation (about 0.044 mm: three decimals).
    expect(headlineFigure(stack, 'mean').value).toBe(formatValue(stack.outputs[0].mean!, 'mm', { decimals: 3 }));
  });

  it('reads the cost figures from the run', () => {
    const c = cost.cost!;
    expect(headlineFigure(cost, 'at-confidence')).toMatchObject({ label: 'Cost at P80', value: formatValue(c.atConfidence.value, 'kEUR', { significant: 4 }), term: 'P80' });
    expect(headlineFigure(cost, 'contingency').sub).toMatch(/^over the base estimate €522\u00a0k \(\d+(\.\d)?\u00a0%\)$/);
    expect(headlineFigure(cost, 'exceed-budget')).toMatchObject({ label: 'Chance of exceeding the budget of €600\u00a0k', value: formatPercent(c.exceedBudget!.p) });
    expect(headlineFigure(cost, 'p90').value).toBe(formatValue(c.p90, 'kEUR', { significant: 4 }));
  });

  it('uses the last output of a formula model', () => {
    const o = formula.outputs[formula.outputs.length - 1];
    expect(headlineFigure(formula, 'outside-limits')).toMatchObject({ label: 'Chance the motor input power is outside its limits', value: formatPercent(o.limits!.outside.p) });
    expect(headlineFigure(formula, 'p50').label).toBe('P50 motor input power');
  });

  it('falls back to the template’s first figure for an unknown id', () => {
    expect(headlineFigure(stack, 'nonsense').id).toBe('ppm');
    expect(headlineFigure(cost, 'nonsense').id).toBe('at-confidence');
    expect(headlineFigure(formula, 'nonsense').id).toBe('mean');
  });
});

describe('sample budget of the results preview', () => {
  it('brings sample columns back only for runs small enough to send to the page', async () => {
    const { samplesFor, SAMPLE_BUDGET } = await import('@/components/results/results-preview');
    expect(samplesFor(checked(exampleLinearStack))).toBe('all'); // 50 000 trials × 7 columns
    expect(samplesFor(checked({ ...exampleLinearStack, settings: { ...exampleLinearStack.settings, trials: 2_000_000 } }))).toBe('none');
    // Cost range: 20 000 trials × (10 items + 3 × 4 risks + 1) columns is well inside the budget; 200 000 trials is not.
    expect(samplesFor(checked(exampleCostRange))).toBe('all');
    expect(samplesFor(checked({ ...exampleCostRange, settings: { ...exampleCostRange.settings, trials: 200_000 } }))).toBe('none');
    expect(SAMPLE_BUDGET).toBe(4_000_000);
    expect(samplesFor(null)).toBe('all');
  });

  it('says what the normal estimate assumes and why it differs from the count', () => {
    const h = headlineFigure(stack, 'ppm');
    const mc = stack.stack!.monteCarlo;
    expect(h.sub).toContain(`a normal gap with this mean and standard deviation would give ${formatPpm(mc.ppmNormal!)}`);
    // The figures from the demo report: 8580 counted, 18 900 from a normal curve: bounded contributors.
    expect(normalEstimateNote(8580, 18_900)).toMatch(/the count is lower because the simulated gap’s tails are shorter than a bell curve’s/);
    expect(normalEstimateNote(18_900, 8580)).toMatch(/the count is higher because .* longer/);
    expect(normalEstimateNote(1000, 1100)).toMatch(/close to the count/);
    expect(normalEstimateNote(10, null)).toBeNull();
  });
});

