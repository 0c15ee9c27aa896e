import { describe, expect, it } from 'vitest';
import { createMarginal, type DistributionSpec } from '@/lib/core/engine/distributions';
import { exampleCostRange, exampleFormula, exampleLinearStack } from '@/lib/core/engine/examples';
import { distributionSchema, validateModel, type StochosModel } from '@/lib/core/engine/schema';
import {
  DISTRIBUTION_KINDS,
  allIds,
  dialTargetOptions,
  distributionKind,
  makeId,
  niceStep,
  removeReferences,
  renameReferences,
  reshapeDistribution,
  suggestDial,
  targetKey,
} from '@/components/editor/model-helpers';
import { formatNumberText, listProblem, parseNumberList, parseNumberText, parseSeedText } from '@/components/editor/numbers';

function model(m: unknown): StochosModel {
  const r = validateModel(m);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.model;
}

describe('number boxes', () => {
  it('reads empty as missing, junk as NaN, the unicode minus and percentages', () => {
    expect(parseNumberText('')).toBeUndefined();
    expect(parseNumberText('  ')).toBeUndefined();
    expect(parseNumberText('abc')).toBeNaN();
    expect(parseNumberText('1,5')).toBeNaN();
    expect(parseNumberText('0x10')).toBeNaN();
    expect(parseNumberText('\u22120.05')).toBe(-0.05);
    expect(parseNumberText('.5')).toBe(0.5);
    expect(parseNumberText('2 000 000')).toBe(2_000_000);
    expect(parseNumberText('50_000')).toBe(50_000);
    expect(parseNumberText('2e-3')).toBe(0.002);
    expect(parseNumberText('7', 100)).toBe(0.07);
    expect(formatNumberText(0.07, 100)).toBe('7');
    expect(formatNumberText(undefined)).toBe('');
  });

  it('reads a pasted column and names what is not a number', () => {
    const parsed = parseNumberList('16.952\n16.941, 16.963;x\t1e1  oops');
    expect(parsed.values).toEqual([16.952, 16.941, 16.963, 10]);
    expect(parsed.bad).toEqual([
      { token: 'x', position: 4 },
      { token: 'oops', position: 6 },
    ]);
    expect(listProblem(parsed)).toContain("'x' (item 4), 'oops' (item 6)");
    expect(listProblem(parseNumberList('1 2 3'))).toBeNull();
  });

  it('stores whole-number seeds as numbers and anything else as text', () => {
    expect(parseSeedText('42')).toBe(42);
    expect(parseSeedText('-7')).toBe(-7);
    expect(parseSeedText('0042')).toBe('0042');
    expect(parseSeedText('run-1')).toBe('run-1');
    expect(parseSeedText('99999999999999999999')).toBe('99999999999999999999');
    expect(parseSeedText('')).toBeUndefined();
  });
});

describe('makeId', () => {
  it('turns names into formula-safe keys that are unique and not reserved', () => {
    expect(makeId('Bearing A width', [])).toBe('bearing_a_width');
    expect(makeId('Bearing A width', ['bearing_a_width'])).toBe('bearing_a_width_2');
    expect(makeId('Café crème', [])).toBe('cafe_creme');
    expect(makeId('3rd plate', [], 'dim')).toBe('dim_3rd_plate');
    expect(makeId('sqrt', [])).toBe('sqrt_1');
    expect(makeId('gap', [])).toBe('gap_1');
    expect(makeId('!!!', [], 'risk')).toBe('risk');
  });

  it('collects every id of a model', () => {
    expect(allIds(exampleCostRange as unknown as Record<string, unknown>)).toContain('surface_works');
    expect(allIds(exampleCostRange as unknown as Record<string, unknown>)).toContain('budget_dial');
  });
});

describe('reshapeDistribution', () => {
  const start = { type: 'normal', mean: 50, sd: 4 } as const;

  it('offers every law and gives parameters the schema accepts', () => {
    for (const { value } of DISTRIBUTION_KINDS) {
      const d = reshapeDistribution(start, value);
      const r = distributionSchema.safeParse(d);
      // An empirical law starts empty: the author pastes data (the schema asks for it).
      if (value === 'empirical') expect(r.success).toBe(false);
      else expect(r.success, `${value}: ${JSON.stringify(r.error?.issues)}`).toBe(true);
      expect(distributionKind(d)).toBe(value);
    }
  });

  it('keeps the centre and spread where the law allows', () => {
    for (const kind of ['uniform', 'triangular', 'pert', 'lognormal', 'normal'] as const) {
      const m = createMarginal(reshapeDistribution(start, kind) as DistributionSpec);
      expect(m.mean, kind).toBeCloseTo(50, 0);
    }
    const u = createMarginal(reshapeDistribution(start, 'uniform') as DistributionSpec);
    expect(Math.sqrt(u.variance)).toBeCloseTo(4, 2);
    const t = createMarginal(reshapeDistribution(start, 'triangular') as DistributionSpec);
    expect(Math.sqrt(t.variance)).toBeCloseTo(4, 2);
  });

  it('falls back to a unit spread when the previous law is unusable', () => {
    expect(reshapeDistribution({ type: 'normal', mean: Number.NaN, sd: -1 }, 'normal')).toEqual({ type: 'normal', mean: 0, sd: 1 });
  });

  it('tells a truncated normal from a plain one', () => {
    expect(distributionKind({ type: 'normal', mean: 0, sd: 1, max: 3 })).toBe('truncated-normal');
    expect(distributionKind({ type: 'normal', mean: 0, sd: 1 })).toBe('normal');
    expect(distributionKind(undefined)).toBeUndefined();
  });
});

describe('dial targets', () => {
  it('lists what a stack dial may move; k only for normal contributors, limits only when set', () => {
    const m = model(exampleLinearStack);
    const keys = dialTargetOptions(m).map((o) => o.key);
    expect(keys).toContain('input-param:spacer:nominal');
    expect(keys).toContain('input-param:housing_depth:k');
    expect(keys).not.toContain('input-param:spacer:k'); // uniform: no k
    expect(keys).toContain('limit:upper:');
    const noUpper = model({ ...exampleLinearStack, limits: { lower: 0.05 }, dials: [] });
    expect(dialTargetOptions(noUpper).map((o) => o.key)).not.toContain('limit:upper:');
  });

  it('every offered target is one the engine resolves, and carries the current value', () => {
    for (const example of [exampleLinearStack, exampleCostRange, exampleFormula]) {
      const m = model(example);
      const options = dialTargetOptions(m);
      expect(options.length).toBeGreaterThan(3);
      for (const o of options) {
        // A dial built from the suggestion must pass the schema's dial rules.
        const s = suggestDial(o);
        const copy = structuredClone(example) as { dials: unknown[] };
        const withDial = { ...copy, dials: [...copy.dials, { id: 'd_test', label: 'Test', unit: '', ...s, target: o.target }] };
        const r = validateModel(withDial);
        expect(r.ok, `${o.key}: ${JSON.stringify(r.issues)}`).toBe(true);
        // A formula output's limit may be put on a dial before it is set; every other target has a value now.
        const unsetLimit = o.target.kind === 'limit' && example.template === 'formula';
        if (o.target.kind !== 'variable' && !unsetLimit) expect(typeof o.current, o.key).toBe('number');
      }
    }
  });

  it('formula targets follow the distribution parameters and the correlation pairs', () => {
    const keys = dialTargetOptions(model(exampleFormula)).map((o) => o.key);
    expect(keys).toContain('input-param:head:mode');
    expect(keys).toContain('input-param:flow:min'); // truncated normal with a bound
    expect(keys).not.toContain('input-param:motor_eff:x'); // drawn: nothing to move
    expect(keys).toContain('correlation:flow:head');
    expect(keys).toContain('variable');
    expect(targetKey({ kind: 'limit', which: 'upper', outputId: 'motor_kw' })).toBe('limit:upper:motor_kw');
  });

  it('suggests a range around the current value with a 1-2-5 step, inside hard bounds', () => {
    expect(niceStep(20)).toBe(1);
    expect(niceStep(0.4)).toBe(0.02);
    expect(niceStep(8)).toBe(0.5);
    const m = model(exampleCostRange);
    const budget = dialTargetOptions(m).find((o) => o.key === 'budget')!;
    expect(suggestDial(budget)).toEqual({ min: 480, max: 720, step: 10, default: 600 });
    const p = dialTargetOptions(m).find((o) => o.key === 'input-param:lead_paint:probability')!;
    const s = suggestDial(p);
    expect(s.min).toBeGreaterThanOrEqual(0);
    expect(s.max).toBeLessThanOrEqual(1);
    expect(s.default).toBe(0.3);
    const conf = dialTargetOptions(m).find((o) => o.key === 'confidence')!;
    expect(suggestDial(conf)).toEqual({ min: 0.5, max: 0.95, step: 0.05, default: 0.8 });
  });
});

describe('references between rows', () => {
  it('a renamed key follows into correlation lists, group members and dial targets', () => {
    const f = structuredClone(exampleFormula) as unknown as Record<string, unknown>;
    expect(renameReferences(f, 'flow', 'duty_flow')).toEqual([
      { path: 'correlation.inputs', value: ['duty_flow', 'head'] },
      { path: 'dials.1.target', value: { kind: 'input-param', inputId: 'duty_flow', param: 'mean' } },
    ]);
    const c = structuredClone(exampleCostRange) as unknown as Record<string, unknown>;
    expect(renameReferences(c, 'surface_works', 'surface')).toEqual([{ path: 'dials.3.target', value: { kind: 'group-correlation', groupId: 'surface' } }]);
    expect(renameReferences(c, 'blast', 'blasting')).toEqual([{ path: 'correlationGroups.0.items', value: ['scaffold', 'blasting', 'steel_repair', 'coating'] }]);
    expect(renameReferences(c, 'blast', 'blast')).toEqual([]);
  });

  it('a removed row leaves the matrix (row and column) and its groups', () => {
    const f = structuredClone(exampleFormula) as unknown as Record<string, unknown>;
    f.correlation = { inputs: ['flow', 'head', 'pump_eff'], matrix: [[1, 0.2, 0.3], [0.2, 1, 0.4], [0.3, 0.4, 1]] };
    expect(removeReferences(f, 'head')).toEqual([{ path: 'correlation', value: { inputs: ['flow', 'pump_eff'], matrix: [[1, 0.3], [0.3, 1]] } }]);
    f.correlation = { inputs: ['flow'], matrix: [[1]] };
    expect(removeReferences(f, 'flow')).toEqual([{ path: 'correlation', value: undefined }]);
    const c = structuredClone(exampleCostRange) as unknown as Record<string, unknown>;
    expect(removeReferences(c, 'site_setup')).toEqual([{ path: 'correlationGroups.1.items', value: ['traffic_mgmt'] }]);
  });
});
