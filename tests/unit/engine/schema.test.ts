/* eslint-disable @typescript-eslint/no-explicit-any -- these tests edit model JSON freely to build variants and bad inputs */
import { describe, expect, it } from 'vitest';
import { applyDials } from '@/lib/core/engine/dials';
import { ModelValidationError, pathText } from '@/lib/core/engine/errors';
import { EXAMPLE_MODELS, exampleCostRange, exampleFormula, exampleLinearStack } from '@/lib/core/engine/examples';
import { modelSchema, validateModel, type StochosModel } from '@/lib/core/engine/schema';
import { runModelSync } from '@/lib/core/engine/simulate';

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x));

/** Validate a mutated copy of a model and return its issues as "path: message". */
function issuesOf(base: object, mutate: (m: any) => void): string[] {
  const m = clone(base);
  mutate(m);
  const r = validateModel(m);
  return r.ok ? [] : r.issues.map((i) => `${pathText(i.path)}: ${i.message}`);
}

describe('example models', () => {
  it.each(Object.entries(EXAMPLE_MODELS))('%s validates', (_t, model) => {
    const r = validateModel(model);
    expect(r.issues).toEqual([]);
    expect(r.ok).toBe(true);
  });
  it('fill defaults for optional settings', () => {
    const m = clone(exampleFormula) as any;
    delete m.settings.design;
    delete m.settings.normalMethod;
    delete m.settings.correlationMethod;
    const r = validateModel(m);
    expect(r.ok && r.model.settings).toMatchObject({ design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' });
  });
});

describe('every bad input is refused with its path and a plain message', () => {
  it('low above high and a most likely value outside the range', () => {
    expect(issuesOf(exampleCostRange, (m) => (m.items[0].low = 60))).toContain('items[0].low: The low estimate (60) is above the high estimate (55).');
    expect(issuesOf(exampleCostRange, (m) => (m.items[1].mostLikely = 40))).toContain(
      'items[1].mostLikely: The most likely estimate (40) must lie between the minimum (22) and the maximum (34).',
    );
  });
  it('zero-width range', () => {
    expect(issuesOf(exampleFormula, (m) => (m.inputs[3].distribution = { type: 'uniform', min: 5, max: 5 }))).toContain(
      'inputs[3].distribution.max: The range has zero width: the minimum and maximum are both 5.',
    );
  });
  it('negative standard deviation and negative tolerance', () => {
    expect(issuesOf(exampleFormula, (m) => (m.inputs[0].distribution.sd = -0.004))).toContain(
      'inputs[0].distribution.sd: The standard deviation must be positive (found -0.004).',
    );
    expect(issuesOf(exampleLinearStack, (m) => (m.contributors[2].minusTol = -0.03))).toContain(
      'contributors[2].minusTol: Enter the minus tolerance as a magnitude of 0 or more (found -0.03).',
    );
    expect(issuesOf(exampleLinearStack, (m) => (m.contributors[0].plusTol = m.contributors[0].minusTol = 0))).toContain(
      'contributors[0].plusTol: The tolerance band has zero width: enter a plus or minus tolerance.',
    );
  });
  it('probability outside [0, 1]', () => {
    expect(issuesOf(exampleCostRange, (m) => (m.riskEvents[0].probability = 1.2))).toContain(
      'riskEvents[0].probability: The probability of the risk is a probability between 0 and 1 (found 1.2).',
    );
    expect(issuesOf(exampleFormula, (m) => (m.inputs[3].distribution = { type: 'bernoulli', p: -0.1 }))).toContain(
      'inputs[3].distribution.p: The probability is a probability between 0 and 1 (found -0.1).',
    );
    expect(issuesOf(exampleFormula, (m) => (m.inputs[3].distribution = { type: 'discrete', values: [1, 2], probabilities: [0.5, 0.4] }))).toContain(
      'inputs[3].distribution.probabilities: The probabilities must add up to 1 (they add up to 0.9).',
    );
  });
  it('empty data', () => {
    expect(issuesOf(exampleFormula, (m) => (m.inputs[3].distribution = { type: 'empirical', data: [] }))).toContain(
      'inputs[3].distribution.data: The data list is empty: enter at least 2 values.',
    );
    expect(issuesOf(exampleLinearStack, (m) => (m.contributors[4].distribution.data = []))).toContain(
      'contributors[4].distribution.data: The measured list is empty: enter at least 2 values.',
    );
  });
  it('unknown input or function in a formula', () => {
    const a = issuesOf(exampleFormula, (m) => (m.outputs[0].formula = 'densty * 9.81 * flow * head / 1000'));
    expect(a).toHaveLength(1);
    expect(a[0]).toMatch(/^outputs\[0\]\.formula: Unknown name 'densty'\. Did you mean 'density'\?/);
    expect(issuesOf(exampleFormula, (m) => (m.outputs[1].formula = 'cube(hydraulic_kw)'))[0]).toMatch(/^outputs\[1\]\.formula: Unknown function 'cube'/);
    expect(issuesOf(exampleFormula, (m) => (m.outputs[0].formula = 'shaft_kw * 2'))[0]).toMatch(
      /^outputs\[0\]\.formula: Unknown name 'shaft_kw'.*An output can only use outputs listed before it\./,
    );
  });
  it('a correlation matrix that is not positive semi-definite names its smallest eigenvalue', () => {
    const issues = issuesOf(exampleFormula, (m) => {
      m.correlation = {
        inputs: ['flow', 'head', 'density'],
        matrix: [
          [1, 1, 0],
          [1, 1, 1],
          [0, 1, 1],
        ],
      };
    });
    expect(issues).toEqual([expect.stringMatching(/^correlation\.matrix: The correlation matrix is not positive semi-definite: its smallest eigenvalue is -0\.414214\./)]);
    expect(issuesOf(exampleFormula, (m) => (m.correlation.matrix[0][1] = 0.9))[0]).toMatch(/^correlation\.matrix\[1\]\[0\]: The matrix must be symmetric/);
  });
  it('overlapping cost correlation groups that cannot hold together', () => {
    const issues = issuesOf(exampleCostRange, (m) => {
      m.correlationGroups = [
        { id: 'g1', items: ['scaffold', 'blast'], rho: 0.9 },
        { id: 'g2', items: ['blast', 'coating'], rho: 0.9 },
        { id: 'g3', items: ['scaffold', 'coating'], rho: -0.9 },
      ];
      m.dials = m.dials.filter((d: any) => d.target.kind !== 'group-correlation');
    });
    expect(issues).toEqual([expect.stringMatching(/^correlationGroups: Together the correlation groups .* smallest eigenvalue is -/)]);
    expect(issuesOf(exampleCostRange, (m) => (m.correlationGroups[0].items[1] = 'blasting'))).toContain("correlationGroups[0].items[1]: No line item has the id 'blasting'.");
  });
  it('trial count out of range (1,000 to 2,000,000)', () => {
    expect(issuesOf(exampleFormula, (m) => (m.settings.trials = 500))).toEqual(['settings.trials: Trials must be a whole number from 1,000 to 2,000,000 (found 500).']);
    expect(issuesOf(exampleFormula, (m) => (m.settings.trials = 2_000_001))).toEqual([
      'settings.trials: Trials must be a whole number from 1,000 to 2,000,000 (found 2000001).',
    ]);
    expect(issuesOf(exampleFormula, (m) => (m.settings.trials = 1500.5))[0]).toMatch(/^settings\.trials: Trials must be a whole number/);
  });
  it('ids: duplicates, reserved words and names unsafe as object keys', () => {
    expect(issuesOf(exampleFormula, (m) => (m.inputs[1].id = 'flow'))).toContain("inputs[1].id: The id 'flow' is already used (inputs[0].id); ids must be unique across the model.");
    expect(issuesOf(exampleFormula, (m) => (m.inputs[1].id = 'sqrt'))[0]).toMatch(/^inputs\[1\]\.id: 'sqrt' is reserved/);
    expect(issuesOf(exampleFormula, (m) => (m.inputs[1].id = '__proto__'))[0]).toMatch(/^inputs\[1\]\.id: '__proto__' is reserved/);
    expect(issuesOf(exampleFormula, (m) => (m.inputs[1].id = '2nd'))[0]).toMatch(/^inputs\[1\]\.id: Ids use letters/);
  });
  it('dials must target something that exists and stay in range', () => {
    expect(issuesOf(exampleFormula, (m) => (m.dials[1].target.inputId = 'flw'))).toContain("dials[1].target: No input has the id 'flw'.");
    expect(issuesOf(exampleFormula, (m) => (m.dials[1].target.param = 'mode'))).toContain("dials[1].target: A dial on 'flow' (normal) can move mean, sd, min, max; not 'mode'.");
    expect(issuesOf(exampleFormula, (m) => (m.dials[0].default = 2))).toContain('dials[0].default: The default (2) must lie between the dial minimum (1) and maximum (1.25).');
    expect(issuesOf(exampleLinearStack, (m) => (m.dials[0].target = { kind: 'budget' }))).toContain('dials[0].target: Only a cost range has a budget.');
  });
  it('other numeric corner cases: truncation holding nothing, drawn density, unknown type', () => {
    expect(issuesOf(exampleFormula, (m) => (m.inputs[0].distribution = { type: 'normal', mean: 0, sd: 1, min: 7, max: 9 }))[0]).toMatch(
      /^inputs\[0\]\.distribution\.min: The truncation range holds almost none/,
    );
    expect(issuesOf(exampleFormula, (m) => (m.inputs[4].distribution.points[1].y = -1))).toContain('inputs[4].distribution.points[1].y: A density cannot be negative (found -1).');
    expect(issuesOf(exampleFormula, (m) => (m.inputs[4].distribution.points[2].x = 0.9))[0]).toMatch(/^inputs\[4\]\.distribution\.points\[2\]\.x: Points must go left to right/);
    expect(issuesOf(exampleFormula, (m) => (m.inputs[0].distribution = { type: 'beta', shape: 2 }))[0]).toMatch(/^inputs\[0\]\.distribution\.type: Choose a distribution type/);
    expect(issuesOf(exampleFormula, (m) => (m.inputs[0].distribution.mean = 'abc'))).toContain('inputs[0].distribution.mean: The mean must be a finite number.');
    expect(issuesOf(exampleFormula, (m) => (m.template = 'spreadsheet'))[0]).toMatch(/^template: The template is/);
  });
  it('reports every problem at once', () => {
    const issues = issuesOf(exampleCostRange, (m) => {
      m.items[0].low = 60;
      m.riskEvents[1].probability = -1;
      m.settings.trials = 10;
    });
    expect(issues.length).toBeGreaterThanOrEqual(3);
  });
});

describe('runs refuse invalid models and dial values with a clear error, never a hang or NaN', () => {
  it('runModelSync throws ModelValidationError with the issues', () => {
    const m = clone(exampleFormula) as any;
    m.inputs[0].distribution.sd = -1;
    let err: unknown;
    try {
      runModelSync(m);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ModelValidationError);
    expect((err as ModelValidationError).issues[0].path).toEqual(['inputs', 0, 'distribution', 'sd']);
    expect((err as Error).message).toBe('Invalid model: inputs[0].distribution.sd: The standard deviation must be positive (found -1).');
  });
  it('dial values outside the dial range or unknown dials', () => {
    const model = validateModel(exampleCostRange);
    if (!model.ok) throw new Error('example invalid');
    expect(() => applyDials(model.model, { budget_dial: 900 })).toThrowError(/dialValues\.budget_dial: The value 900 for dial 'Budget' is outside its range 540 to 720/);
    expect(() => applyDials(model.model, { nope: 1 })).toThrowError(/dialValues\.nope: No dial has the id 'nope'/);
    expect(() => applyDials(model.model, { budget_dial: Number.NaN })).toThrowError(/must be a finite number/);
  });
  it('a dial that makes the model invalid names the field it broke', () => {
    const m = clone(exampleCostRange) as any;
    m.dials.push({ id: 'scaffold_low', label: 'Scaffold low', min: 80, max: 140, step: 1, default: 85, target: { kind: 'input-param', inputId: 'scaffold', param: 'low' } });
    const v = validateModel(m);
    if (!v.ok) throw new Error('invalid');
    expect(() => applyDials(v.model, { scaffold_low: 135 })).toThrowError(/items\[2\]\.low: The low estimate \(135\) is above the high estimate \(130\)\. \(with the dial values applied\)/);
  });
  it('the schema itself carries the whole-model rules for form resolvers', () => {
    const m = clone(exampleFormula) as any;
    m.outputs[0].formula = 'nope + 1';
    const r = modelSchema.safeParse(m);
    expect(r.success).toBe(false);
    expect(r.error?.issues.map((i) => i.path.join('.'))).toContain('outputs.0.formula');
  });
  it('types: the inferred model type carries the template union', () => {
    const v = validateModel(exampleLinearStack);
    if (!v.ok) throw new Error('invalid');
    const m: StochosModel = v.model;
    expect(m.template === 'linear-stack' && m.contributors.length).toBe(6);
  });
});
