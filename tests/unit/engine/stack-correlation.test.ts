import { describe, expect, it } from 'vitest';
import { evaluateStack } from '@/lib/core/engine/analytic';
import { runModelSync } from '@/lib/core/engine/simulate';
import { validateModel, type LinearStackModel } from '@/lib/core/engine/schema';

/** Three normal contributors at ±0.3 (k = 3, σ = 0.1 each). */
function stack(correlation?: { inputs: string[]; matrix: number[][] }, directions: (1 | -1)[] = [1, 1, -1]) {
  return {
    schema: 'stochos.model/1',
    template: 'linear-stack',
    title: 'Three blocks from one batch',
    unit: 'mm',
    settings: { trials: 100_000, seed: 'corr-stack', design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' },
    contributors: ['a', 'b', 'c'].map((id, i) => ({
      id,
      name: `Block ${id.toUpperCase()}`,
      nominal: 10,
      plusTol: 0.3,
      minusTol: 0.3,
      direction: directions[i],
      distribution: { type: 'normal', k: 3 },
      meanShift: 0,
    })),
    limits: { lower: 9.5, upper: 10.5 },
    dials: [],
    ...(correlation ? { correlation } : {}),
  };
}

function parsed(m: unknown): LinearStackModel {
  const v = validateModel(m);
  if (!v.ok) throw new Error(JSON.stringify(v.issues));
  return v.model as LinearStackModel;
}

describe('correlated stack contributors', () => {
  // Var(Σ aᵢXᵢ) = Σ aᵢ²σᵢ² + 2 Σᵢ<ⱼ aᵢaⱼρᵢⱼσᵢσⱼ (variance of a linear combination; Montgomery & Runger, Applied
  // Statistics and Probability for Engineers, §5-4, a standard result).
  const corr = { inputs: ['a', 'b'], matrix: [[1, 0.6], [0.6, 1]] };

  it('RSS and the standard deviation carry the correlation terms, and the independent figures stay beside them', () => {
    const a = evaluateStack(parsed(stack(corr)));
    expect(a.correlated).toBe(true);
    // a and b both add: σ² = 3 (0.1)² + 2·0.6·(0.1)² = 0.042.
    expect(a.statistical.sd).toBeCloseTo(Math.sqrt(0.042), 12);
    expect(a.independent.sd).toBeCloseTo(Math.sqrt(0.03), 12);
    // RSS on the half tolerances: 3·0.09 + 2·0.6·0.09 = 0.378.
    expect(a.rss.halfWidth).toBeCloseTo(Math.sqrt(0.378), 12);
    expect(a.independent.rssHalfWidth).toBeCloseTo(Math.sqrt(0.27), 12);
    expect(a.statistical.ppmNormal!).toBeGreaterThan(a.independent.ppmNormal!);
  });

  it('a positive correlation between dimensions that oppose each other narrows the gap', () => {
    const a = evaluateStack(parsed(stack({ inputs: ['a', 'c'], matrix: [[1, 0.6], [0.6, 1]] })));
    // a adds, c subtracts: σ² = 0.03 − 2·0.6·0.01 = 0.018.
    expect(a.statistical.sd).toBeCloseTo(Math.sqrt(0.018), 12);
  });

  it('without a matrix (or with zeros) nothing changes', () => {
    const plain = evaluateStack(parsed(stack()));
    expect(plain.correlated).toBe(false);
    expect(plain.statistical.sd).toBe(plain.independent.sd);
    const zeros = evaluateStack(parsed(stack({ inputs: ['a', 'b'], matrix: [[1, 0], [0, 1]] })));
    expect(zeros.correlated).toBe(false);
    expect(zeros.statistical.sd).toBeCloseTo(Math.sqrt(0.03), 14);
  });

  it('the Monte Carlo run draws the contributors with the target correlation and matches the analytic spread', () => {
    const r = runModelSync(stack(corr));
    const n = 100_000;
    const sd = r.stack!.monteCarlo.sd!;
    // Standard error of a sample sd of a normal ≈ σ/√(2n); five of them.
    expect(Math.abs(sd - Math.sqrt(0.042))).toBeLessThan(5 * (Math.sqrt(0.042) / Math.sqrt(2 * n)));
    const g = r.correlation[0];
    expect(g.ids).toEqual(['a', 'b']);
    // Sample correlation: standard error (1 − ρ²)/√n for normal data.
    expect(Math.abs(g.pearson[0][1] - 0.6)).toBeLessThan(5 * ((1 - 0.36) / Math.sqrt(g.trials)));
    expect(r.inputs.find((i) => i.id === 'a')!.correlated).toBe('gaussian-copula');
  });

  it('refuses a matrix that is not a correlation matrix, or names a contributor that is not there, with its path', () => {
    const bad = validateModel(stack({ inputs: ['a', 'b', 'c'], matrix: [[1, 0.9, -0.9], [0.9, 1, 0.9], [-0.9, 0.9, 1]] }));
    expect(bad.ok).toBe(false);
    expect(bad.issues.some((i) => i.path.join('.') === 'correlation.matrix' && /not positive semi-definite: its smallest eigenvalue is -/.test(i.message))).toBe(true);
    const unknown = validateModel(stack({ inputs: ['a', 'zz'], matrix: [[1, 0.2], [0.2, 1]] }));
    expect(unknown.issues).toContainEqual({ path: ['correlation', 'inputs', 1], message: "No contributor has the id 'zz'." });
  });

  it('a dial can move a stack correlation', () => {
    const m = { ...stack(corr), dials: [{ id: 'rho_ab', label: 'Batch correlation', unit: '', min: 0, max: 0.9, step: 0.1, default: 0.6, target: { kind: 'correlation', a: 'a', b: 'b' } }] };
    expect(validateModel(m).ok).toBe(true);
    const low = runModelSync({ ...m, settings: { ...m.settings, trials: 5_000 } }, { dialValues: { rho_ab: 0 } });
    expect(low.stack!.analytic.statistical.sd).toBeCloseTo(Math.sqrt(0.03), 12);
  });
});
