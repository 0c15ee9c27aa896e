/* eslint-disable @typescript-eslint/no-explicit-any -- these tests edit model JSON freely to build variants and bad inputs */
import { describe, expect, it } from 'vitest';
import { runModelSync } from '@/lib/core/engine/simulate';
import { pearson, spearman } from '@/lib/core/engine/stats';

const matrix = [
  [1, 0.5, 0.25],
  [0.5, 1, 0.8],
  [0.25, 0.8, 1],
];

function model(method: 'copula' | 'iman-conover', trials = 100_000, correlated = true, tweak?: (m: any) => void) {
  const m: any = {
    schema: 'stochos.model/1',
    template: 'formula',
    title: 'Correlated trio',
    settings: { trials, seed: 'corr-tests', correlationMethod: method },
    inputs: [
      { id: 'a', name: 'A', distribution: { type: 'normal', mean: 10, sd: 2 } },
      { id: 'b', name: 'B', distribution: { type: 'triangular', min: 0, mode: 3, max: 10 } },
      { id: 'c', name: 'C', distribution: { type: 'pert', min: 90, mode: 100, max: 130 } },
      { id: 'd', name: 'D', distribution: { type: 'normal', mean: 0, sd: 1 } },
      { id: 'g', name: 'G', distribution: { type: 'normal', mean: 5, sd: 3 } },
    ],
    outputs: [{ id: 'y', name: 'Y', formula: 'a + b + c + d + g' }],
  };
  if (correlated) {
    m.correlation = {
      inputs: ['a', 'b', 'c', 'd', 'g'],
      matrix: [
        [...matrix[0], 0, 0],
        [...matrix[1], 0, 0],
        [...matrix[2], 0, 0],
        [0, 0, 0, 1, 0.6],
        [0, 0, 0, 0.6, 1],
      ],
    };
  }
  tweak?.(m);
  return m;
}

// Rank correlation implied by a Gaussian copula: rho_S = (6/pi) asin(rho/2)
// (check-values.md: 0.25 -> 0.239359, 0.5 -> 0.482584, 0.8 -> 0.785939; formula from memory, values computed).
const implied: Record<string, number> = { '0.25': 0.239359, '0.5': 0.482584, '0.8': 0.785939 };
// Band for an achieved correlation at n = 100,000: the SE of a sample Spearman is below 1/sqrt(n) = 0.0032;
// 0.012 is about four of them.
const BAND = 0.012;

describe('Gaussian copula', () => {
  const r = runModelSync(model('copula'), { samples: 'all' });
  const col = (id: string) => r.samples!.inputs[id];

  it('gives the rank correlations the arcsin formula predicts, for non-normal marginals too', () => {
    expect(Math.abs(spearman(col('a'), col('b')) - implied['0.5'])).toBeLessThan(BAND);
    expect(Math.abs(spearman(col('a'), col('c')) - implied['0.25'])).toBeLessThan(BAND);
    expect(Math.abs(spearman(col('b'), col('c')) - implied['0.8'])).toBeLessThan(BAND);
    expect(Math.abs(spearman(col('a'), col('d')))).toBeLessThan(BAND);
  });

  it('gives normal inputs exactly the target Pearson correlation (X = mu + sigma (S Z))', () => {
    expect(Math.abs(pearson(col('d'), col('g')) - 0.6)).toBeLessThan(BAND);
  });

  it('reports achieved Pearson and Spearman beside the targets', () => {
    const c = r.correlation[0];
    expect(c.ids).toEqual(['a', 'b', 'c', 'd', 'g']);
    expect(c.target[1][2]).toBe(0.8);
    expect(c.expectedSpearman[1][2]).toBeCloseTo(implied['0.8'], 6);
    expect(Math.abs(c.spearman[1][2] - c.expectedSpearman[1][2])).toBeLessThan(BAND);
    expect(c.pearson[3][4]).toBeCloseTo(pearson(col('d'), col('g')), 12);
    expect(c.trials).toBe(100_000);
    expect(r.inputs.find((i) => i.id === 'c')?.sampling).toEqual({ method: 'gaussian-copula', scores: 'box-muller' });
  });

  it('keeps the marginals (KS-level check on the PERT member through the copula)', () => {
    const c = col('c');
    const m = c.reduce((s, v) => s + v, 0) / c.length;
    // PERT(90, 100, 130): mean (a + 4m + b) / 6 = 103.333, sd sqrt((mu - a)(b - mu)/7) = 5.5277 (check-values.md).
    expect(Math.abs(m - 103.3333333)).toBeLessThan((5 * 5.5277) / Math.sqrt(c.length));
  });

  it('moving one input\'s parameters leaves every other correlated column bit-identical', () => {
    const r2 = runModelSync(
      model('copula', 20_000, true, (m) => (m.inputs[1].distribution = { type: 'triangular', min: 1, mode: 5, max: 12 })),
      { samples: 'all' },
    );
    const r1 = runModelSync(model('copula', 20_000), { samples: 'all' });
    for (const id of ['a', 'c', 'd', 'g']) expect(Buffer.from(r2.samples!.inputs[id].buffer).equals(Buffer.from(r1.samples!.inputs[id].buffer))).toBe(true);
    expect(Buffer.from(r2.samples!.inputs.b.buffer).equals(Buffer.from(r1.samples!.inputs.b.buffer))).toBe(false);
  });
});

describe('Iman-Conover (1982) rank correlation', () => {
  const ic = runModelSync(model('iman-conover'), { samples: 'all' });
  const free = runModelSync(model('iman-conover', 100_000, false), { samples: 'all' });

  it('only reorders: every sorted column is bit-identical to the uncorrelated sample', () => {
    for (const id of ['a', 'b', 'c', 'd', 'g']) {
      const x = Float64Array.from(ic.samples!.inputs[id]).sort();
      const y = Float64Array.from(free.samples!.inputs[id]).sort();
      expect(Buffer.from(x.buffer).equals(Buffer.from(y.buffer))).toBe(true);
    }
    // ...and the order did change.
    expect(Buffer.from(ic.samples!.inputs.b.buffer).equals(Buffer.from(free.samples!.inputs.b.buffer))).toBe(false);
  });

  it('reaches the target rank correlations', () => {
    const col = (id: string) => ic.samples!.inputs[id];
    expect(Math.abs(spearman(col('a'), col('b')) - 0.5)).toBeLessThan(BAND);
    expect(Math.abs(spearman(col('a'), col('c')) - 0.25)).toBeLessThan(BAND);
    expect(Math.abs(spearman(col('b'), col('c')) - 0.8)).toBeLessThan(BAND);
    expect(Math.abs(spearman(col('d'), col('g')) - 0.6)).toBeLessThan(BAND);
    expect(ic.correlation[0].expectedSpearman[1][2]).toBe(0.8);
    // Rejection sampling stays in use for the PERT member.
    expect(ic.inputs.find((i) => i.id === 'c')?.sampling.method).toBe('rejection');
  });

  it('reproduces itself exactly for the same seed', () => {
    const again = runModelSync(model('iman-conover'), { samples: 'all' });
    expect(Buffer.from(again.samples!.inputs.c.buffer).equals(Buffer.from(ic.samples!.inputs.c.buffer))).toBe(true);
  });
});
