import { describe, it, expect } from 'vitest';
import { diffModels, formatDiffValue, summarise, humanKey, pathWithin } from '@/lib/core/models/diff';
import { editorFieldErrors } from '@/lib/core/models/field-errors';

const base = {
  schema: 'stochos.model/1',
  title: 'Shaft stack',
  settings: { trials: 10000, seed: 1, sampling: 'monte-carlo' },
  contributors: [
    { id: 'c1', name: 'Housing', nominal: 40, plusTol: 0.1, minusTol: 0.1 },
    { id: 'c2', name: 'Bearing', nominal: 12, plusTol: 0.05, minusTol: 0.05 },
    { id: 'c3', name: 'Spacer', nominal: 8, plusTol: 0.02, minusTol: 0.02 },
  ],
  correlation: [
    [1, 0],
    [0, 1],
  ],
  tags: ['a', 'b'],
};
const clone = <T>(v: T): T => JSON.parse(JSON.stringify(v));

describe('diffModels', () => {
  it('finds nothing between identical models, whatever the key order', () => {
    const b = clone(base);
    const reordered = { contributors: b.contributors, tags: b.tags, correlation: b.correlation, settings: { seed: 1, sampling: 'monte-carlo', trials: 10000 }, title: b.title, schema: b.schema };
    expect(diffModels(base, reordered)).toEqual([]);
  });

  it('names a changed field by path and by the row’s name', () => {
    const b = clone(base);
    b.contributors[1]!.plusTol = 0.08;
    expect(diffModels(base, b)).toEqual([
      { kind: 'changed', path: 'contributors.1.plusTol', beforePath: 'contributors.1.plusTol', label: 'contributors › Bearing › plus tol', before: 0.05, after: 0.08 },
    ]);
  });

  it('matches rows by id, so an inserted row does not mark later rows as changed', () => {
    const b = clone(base);
    b.contributors.splice(1, 0, { id: 'c9', name: 'Shim', nominal: 1, plusTol: 0.01, minusTol: 0.01 });
    const d = diffModels(base, b);
    expect(d).toHaveLength(1);
    expect(d[0]).toMatchObject({ kind: 'added', path: 'contributors.1', beforePath: null, label: 'contributors › Shim' });
  });

  it('reports a removed row at its old position, and a changed row that moved under both paths', () => {
    const b = clone(base);
    b.contributors.splice(0, 1);
    b.contributors[1]!.nominal = 8.5; // Spacer, now at index 1, was at 2
    const d = diffModels(base, b);
    expect(d).toContainEqual({ kind: 'removed', path: 'contributors.0', beforePath: 'contributors.0', label: 'contributors › Housing', before: base.contributors[0], after: undefined });
    expect(d).toContainEqual({ kind: 'changed', path: 'contributors.1.nominal', beforePath: 'contributors.2.nominal', label: 'contributors › Spacer › nominal', before: 8, after: 8.5 });
    expect(d.find((e) => e.kind === 'reordered')).toBeUndefined();
  });

  it('reports a reordering once', () => {
    const b = clone(base);
    b.contributors.reverse();
    const d = diffModels(base, b);
    expect(d).toEqual([{ kind: 'reordered', path: 'contributors', beforePath: 'contributors', label: 'contributors', before: ['c1', 'c2', 'c3'], after: ['c3', 'c2', 'c1'] }]);
  });

  it('compares lists of numbers as whole values and matrices cell by row', () => {
    const b = clone(base);
    b.tags = ['a', 'c'];
    b.correlation[0]![1] = 0.4;
    b.correlation[1]![0] = 0.4;
    const d = diffModels(base, b);
    expect(d.map((e) => e.path).sort()).toEqual(['correlation.0', 'correlation.1', 'tags']);
    expect(d.find((e) => e.path === 'tags')).toMatchObject({ before: ['a', 'b'], after: ['a', 'c'] });
  });

  it('reports added and removed keys, and a type change as a change', () => {
    const a = { settings: { trials: 1000, seed: 3 }, units: 'mm' } as Record<string, unknown>;
    const b = { settings: { trials: 1000, latin: true }, units: ['mm'] } as Record<string, unknown>;
    const d = diffModels(a, b);
    expect(d).toContainEqual({ kind: 'removed', path: 'settings.seed', beforePath: 'settings.seed', label: 'settings › seed', before: 3, after: undefined });
    expect(d).toContainEqual({ kind: 'added', path: 'settings.latin', beforePath: null, label: 'settings › latin', before: undefined, after: true });
    expect(d).toContainEqual({ kind: 'changed', path: 'units', beforePath: 'units', label: 'units', before: 'mm', after: ['mm'] });
  });

  it('treats a first version as everything added at the root', () => {
    expect(diffModels(null, base)).toEqual([{ kind: 'changed', path: '', beforePath: '', label: 'model', before: null, after: base }]);
    expect(diffModels(undefined, base)).toEqual([{ kind: 'added', path: '', beforePath: null, label: 'model', before: undefined, after: base }]);
  });

  it('falls back to positions when ids repeat or are missing', () => {
    const a = { rows: [{ id: 'x', v: 1 }, { id: 'x', v: 2 }] };
    const b = { rows: [{ id: 'x', v: 1 }, { id: 'x', v: 3 }] };
    expect(diffModels(a, b)).toEqual([{ kind: 'changed', path: 'rows.1.v', beforePath: 'rows.1.v', label: 'rows › x › v', before: 2, after: 3 }]);
  });

  it('summarises by kind', () => {
    const b = clone(base);
    b.contributors.push({ id: 'c4', name: 'Clip', nominal: 1, plusTol: 0, minusTol: 0 });
    b.title = 'Shaft stack B';
    expect(summarise(diffModels(base, b))).toEqual({ added: 1, removed: 0, changed: 1, reordered: 0 });
  });
});

describe('helpers', () => {
  it('turns keys into words', () => {
    expect(humanKey('plusTol')).toBe('plus tol');
    expect(humanKey('sampling_design')).toBe('sampling design');
    expect(humanKey('p80')).toBe('p80');
  });
  it('tests path containment on segment boundaries', () => {
    expect(pathWithin('inputs.2.low', 'inputs.2')).toBe(true);
    expect(pathWithin('inputs.20.low', 'inputs.2')).toBe(false);
    expect(pathWithin('inputs', 'inputs')).toBe(true);
    expect(pathWithin('anything', '')).toBe(true);
  });
});

describe('formatDiffValue', () => {
  it('shows each kind of value exactly and briefly', () => {
    expect(formatDiffValue(undefined)).toBe('—');
    expect(formatDiffValue(null)).toBe('null');
    expect(formatDiffValue(0.1 + 0.2)).toBe('0.30000000000000004');
    expect(formatDiffValue('pert')).toBe('“pert”');
    expect(formatDiffValue(true)).toBe('yes');
    expect(formatDiffValue([1, 2, 3])).toBe('[1, 2, 3]');
    expect(formatDiffValue({ type: 'normal', k: 3 })).toBe('{"type":"normal","k":3}');
  });
  it('shortens long lists and records', () => {
    const data = Array.from({ length: 100 }, (_, i) => 16.9 + i / 1000);
    expect(formatDiffValue(data)).toMatch(/^100 values: 16\.9, 16\.901, .*…$/);
    expect(formatDiffValue({ data }).length).toBe(191);
  });
});

describe('editorFieldErrors', () => {
  it('strips the request’s "model." prefix and sends whole-model messages to "_"', () => {
    expect(editorFieldErrors({ 'model.items.0.low': ['a'], model: ['b'], baseVersion: ['c'], 'model.settings.trials': ['d'] })).toEqual({
      'items.0.low': ['a'],
      _: ['b'],
      'settings.trials': ['d'],
    });
  });
});

