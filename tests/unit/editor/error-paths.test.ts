import { describe, expect, it } from 'vitest';
import type { ResolverOptions } from 'react-hook-form';
import type { ModelDraft } from '@/components/editor/form-values';
import { exampleCostRange, exampleFormula, exampleLinearStack } from '@/lib/core/engine/examples';
import { modelSchema } from '@/lib/core/engine/schema';
import { fieldsFromZod } from '@/lib/server/http/errors';
import {
  flattenFieldErrors,
  issuesToMessages,
  mergeMessages,
  messagesUnder,
  pathKey,
  readablePath,
  withoutChanged,
} from '@/components/editor/error-paths';
import { createModelResolver } from '@/components/editor/resolver';

const options: ResolverOptions<ModelDraft> = { fields: {}, shouldUseNativeValidation: false, criteriaMode: 'all' };

async function resolve(values: unknown) {
  let parsed: unknown = 'not called';
  const resolver = createModelResolver((m) => {
    parsed = m;
  });
  // Broken drafts on purpose: whatever an author might have typed.
  const result = await resolver(structuredClone(values) as ModelDraft, undefined, options);
  return { messages: flattenFieldErrors(result.errors), parsed, result };
}

describe('pathKey and readablePath', () => {
  it('joins issue paths with dots, "_" for the whole model', () => {
    expect(pathKey(['contributors', 2, 'plusTol'])).toBe('contributors.2.plusTol');
    expect(pathKey([])).toBe('_');
  });

  it('reads as a person would say it', () => {
    expect(readablePath('contributors.2.plusTol')).toBe('Contributor 3 › plus tolerance');
    expect(readablePath('inputs.0.distribution.points.3.y')).toBe('Input 1 › distribution › Point 4 › y');
    expect(readablePath('correlation.matrix.0.1')).toBe('Correlation › Row 1 › #2');
    expect(readablePath('_')).toBe('Model');
  });
});

describe('flattenFieldErrors', () => {
  it('flattens nested errors, array roots and every message of a path', () => {
    const tree = {
      title: { type: 'too_small', message: 'The title is required.' },
      contributors: {
        root: { type: 'custom', message: 'Add at least one contributor.' },
        1: { nominal: { type: 'invalid_type', message: 'The nominal is required.', ref: { name: 'x' } } },
      },
      items: [undefined, { low: { type: 'custom', message: 'A', types: { custom: ['A', 'B'], other: 'C' } } }],
    };
    expect(flattenFieldErrors(tree)).toEqual({
      title: ['The title is required.'],
      contributors: ['Add at least one contributor.'],
      'contributors.1.nominal': ['The nominal is required.'],
      'items.1.low': ['A', 'B', 'C'],
    });
  });
});

describe('the editor resolver (engine schema through react-hook-form)', () => {
  it('accepts each example model and hands back the parsed model', async () => {
    for (const example of [exampleLinearStack, exampleCostRange, exampleFormula]) {
      const { messages, parsed } = await resolve(example);
      expect(messages).toEqual({});
      expect(parsed).toMatchObject({ template: example.template, title: example.title });
    }
  });

  it('puts each bad field at the same dotted key the server 422 uses', async () => {
    const bad = structuredClone(exampleCostRange) as unknown as Record<string, unknown>;
    const items = bad.items as Record<string, unknown>[];
    items[1].mostLikely = 40; // below low (22): three-point values out of order
    items[2].high = 85; // equal to low: zero-width range
    const risks = bad.riskEvents as Record<string, unknown>[];
    risks[0].probability = 1.3; // outside [0, 1]
    const { messages, parsed } = await resolve(bad);
    expect(parsed).toBeNull();
    const server = fieldsFromZod(modelSchema.safeParse(bad).error!);
    expect(Object.keys(messages).sort()).toEqual(Object.keys(server).sort());
    expect(Object.keys(messages).sort()).toEqual(['items.1.mostLikely', 'items.2.high', 'riskEvents.0.probability']);
    for (const k of Object.keys(server)) expect(messages[k]).toEqual(server[k]);
    expect(messages['items.2.high'][0]).toContain('zero width');
    expect(messages['riskEvents.0.probability'][0]).toContain('between 0 and 1');
  });

  it('flags an unknown formula name beside its formula even while another field is wrong', async () => {
    const bad = structuredClone(exampleFormula) as unknown as Record<string, unknown>;
    (bad.outputs as Record<string, unknown>[])[1].formula = 'hydraulic_kw / pump_ef';
    (bad.inputs as Record<string, unknown>[])[2].name = ''; // a structural problem elsewhere
    const { messages } = await resolve(bad);
    expect(messages['inputs.2.name']).toEqual(['The input name is required.']);
    expect(messages['outputs.1.formula']?.[0]).toContain("Unknown name 'pump_ef'");
    expect(messages['outputs.1.formula']?.[0]).toContain("Did you mean 'pump_eff'?");
  });

  it('reports a non-PSD correlation matrix with its smallest eigenvalue at the matrix', async () => {
    const bad = structuredClone(exampleFormula) as unknown as { correlation: { inputs: string[]; matrix: number[][] } };
    bad.correlation = {
      inputs: ['flow', 'head', 'density'],
      matrix: [
        [1, 0.9, 0.9],
        [0.9, 1, -0.9],
        [0.9, -0.9, 1],
      ],
    };
    const { messages } = await resolve(bad);
    expect(Object.keys(messages)).toEqual(['correlation.matrix']);
    expect(messages['correlation.matrix'][0]).toMatch(/smallest eigenvalue is -0\.\d+/);
  });

  it('keeps a negative tolerance beside the tolerance', async () => {
    const bad = structuredClone(exampleLinearStack) as unknown as { contributors: Record<string, unknown>[] };
    bad.contributors[2].minusTol = -0.03;
    const { messages } = await resolve(bad);
    expect(messages).toEqual({ 'contributors.2.minusTol': ['Enter the minus tolerance as a magnitude of 0 or more (found -0.03).'] });
  });
});

describe('server messages', () => {
  const server = {
    'contributors.1.nominal': ['Nominal is off.'],
    'contributors.1': ['Row problem.'],
    'contributors.10.name': ['Other row.'],
    limits: ['Give a limit.'],
  };

  it('are cleared when their field, an ancestor or a descendant changes', () => {
    expect(withoutChanged(server, 'contributors.1.nominal')).toEqual({ 'contributors.10.name': ['Other row.'], limits: ['Give a limit.'] });
    expect(Object.keys(withoutChanged(server, 'contributors'))).toEqual(['limits']);
    expect(Object.keys(withoutChanged(server, 'limits.lower'))).toEqual(['contributors.1.nominal', 'contributors.1', 'contributors.10.name']);
  });

  it('merge with client messages without repeating one', () => {
    const merged = mergeMessages({ a: ['x'] }, { a: ['x', 'y'], b: ['z'] }, null);
    expect(merged).toEqual({ a: ['x', 'y'], b: ['z'] });
    expect(issuesToMessages([{ path: ['a', 0], message: 'm' }, { path: [], message: 'r' }])).toEqual({ 'a.0': ['m'], _: ['r'] });
    expect(messagesUnder(server, 'contributors.1').map((m) => m.key)).toEqual(['contributors.1.nominal', 'contributors.1']);
  });
});
