import { describe, expect, it } from 'vitest';
import { createMarginal, type DistributionSpec, type RejectionEnvelope } from '@/lib/core/engine/distributions';
import { SamplingError } from '@/lib/core/engine/errors';
import { Stream } from '@/lib/core/engine/rng';
import { MIN_ACCEPTANCE, RejectionSampler } from '@/lib/core/engine/samplers';
import { runModelSync } from '@/lib/core/engine/simulate';
import { betaPdf } from '@/lib/core/engine/special';

function observed(env: RejectionEnvelope, n: number) {
  const s = new RejectionSampler(env, Stream.forInput('rej', 'x'));
  s.fill(new Float64Array(n), 0, n);
  return s.report();
}

describe('rejection sampling under a box (von Neumann 1951)', () => {
  it.each([
    ['PERT(0, 5, 10): alpha = beta = 3', { type: 'pert', min: 0, mode: 5, max: 10 } as const, 1 / 1.875],
    ['PERT(2, 3, 10)', { type: 'pert', min: 2, mode: 3, max: 10 } as const, null],
    ['PERT(1, 1, 11): density peaks at the minimum', { type: 'pert', min: 1, mode: 1, max: 11 } as const, 1 / 5],
  ])('%s: acceptance within 4 binomial standard errors of 1 / (M (b - a))', (_n, spec, exact) => {
    const env = createMarginal(spec).envelope as RejectionEnvelope;
    if (exact !== null) expect(env.expectedAcceptance).toBeCloseTo(exact, 12);
    const r = observed(env, 100_000);
    const p = env.expectedAcceptance;
    const se = Math.sqrt((p * (1 - p)) / (r.attempts as number));
    expect(Math.abs((r.acceptanceRate as number) - p)).toBeLessThan(4 * se);
    expect(r.accepted).toBe(100_000);
  });

  it('author-drawn triangle density: acceptance 1/2', () => {
    const env = createMarginal({ type: 'drawn', points: [{ x: 0, y: 0 }, { x: 1, y: 2 }, { x: 2, y: 0 }] }).envelope as RejectionEnvelope;
    expect(env.expectedAcceptance).toBeCloseTo(0.5, 12);
    const r = observed(env, 50_000);
    const se = Math.sqrt(0.25 / (r.attempts as number));
    expect(Math.abs((r.acceptanceRate as number) - 0.5)).toBeLessThan(4 * se);
  });

  it('the squeeze table only skips density evaluations: samples and counts are unchanged', () => {
    const specs: DistributionSpec[] = [
      { type: 'pert', min: 90, mode: 100, max: 130 },
      { type: 'pert', min: 0, mode: 1, max: 10 },
      { type: 'drawn', points: [{ x: 0, y: 0 }, { x: 1, y: 2 }, { x: 3, y: 1 }, { x: 4, y: 0 }] },
    ];
    for (const spec of specs) {
      const env = createMarginal(spec).envelope as RejectionEnvelope;
      expect(env.turningPoints?.length).toBeGreaterThan(0);
      const plain: RejectionEnvelope = { ...env, turningPoints: undefined };
      const a = new RejectionSampler(env, Stream.forInput('squeeze', 'x'));
      const b = new RejectionSampler(plain, Stream.forInput('squeeze', 'x'));
      const xa = new Float64Array(50_000);
      const xb = new Float64Array(50_000);
      a.fill(xa, 0, 50_000);
      b.fill(xb, 0, 50_000);
      expect(Buffer.from(xa.buffer).equals(Buffer.from(xb.buffer))).toBe(true);
      expect(a.report()).toEqual(b.report());
    }
  });

  it('refuses a box lower than the density instead of sampling with a bias', () => {
    const density = (x: number) => betaPdf(x, 3, 3);
    const env: RejectionEnvelope = { a: 0, b: 1, M: 1.5, density, expectedAcceptance: 1 / 1.5 };
    const s = new RejectionSampler(env, Stream.forInput('rej', 'low'), 'k');
    expect(() => s.fill(new Float64Array(10_000), 0, 10_000)).toThrowError(/above the box height/);
    try {
      s.fill(new Float64Array(10), 0, 10);
    } catch (err) {
      expect(err).toBeInstanceOf(SamplingError);
      expect((err as SamplingError).code).toBe('envelope-too-low');
    }
  });

  it('stops a run whose acceptance collapses, with a clear error', () => {
    // An envelope that claims 50 % acceptance but whose density is almost everywhere 0.
    const env: RejectionEnvelope = { a: 0, b: 1, M: 2, density: (x) => (x > 0.99995 ? 2 : 0), expectedAcceptance: 0.5 };
    const s = new RejectionSampler(env, Stream.forInput('rej', 'collapse'), 'spike');
    let caught: unknown = null;
    try {
      s.fill(new Float64Array(100), 0, 100);
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(SamplingError);
    expect((caught as SamplingError).code).toBe('acceptance-collapsed');
    expect((caught as Error).message).toMatch(/Input 'spike': rejection sampling stopped: \d+ of \d+ candidates accepted/);
  });

  it('refuses up front a drawn density whose box would accept almost nothing', () => {
    const model = {
      schema: 'stochos.model/1',
      template: 'formula',
      title: 'Spike',
      settings: { trials: 1000, seed: 1 },
      inputs: [{ id: 'spike', name: 'Spike', distribution: { type: 'drawn', points: [{ x: 0, y: 0 }, { x: 0.0001, y: 1 }, { x: 0.0002, y: 0 }, { x: 100, y: 0 }] } }],
      outputs: [{ id: 'y', name: 'Y', formula: 'spike' }],
    };
    expect(() => runModelSync(model)).toThrowError("Input 'spike': the box envelope would accept only 1 in 1,000,000 candidates (the minimum is 1 in 1,000)");
    expect(MIN_ACCEPTANCE).toBe(0.001);
  });
});
