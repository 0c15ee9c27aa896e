import { describe, expect, it } from 'vitest';
import { allocateTolerances, sigmaPerTolerance, type AllocationRequest } from '@/lib/core/engine/allocation';
import { runModelSync } from '@/lib/core/engine/simulate';
import { validateModel, type LinearStackModel } from '@/lib/core/engine/schema';

type Law = { type: 'normal'; k: number } | { type: 'uniform' } | { type: 'triangular' };

function stack(tols: number[], laws?: Law[], extra: Partial<LinearStackModel> = {}): LinearStackModel {
  const v = validateModel({
    schema: 'stochos.model/1',
    template: 'linear-stack',
    title: 'Allocation test stack',
    unit: 'mm',
    settings: { trials: 200_000, seed: 'alloc', design: 'monte-carlo', normalMethod: 'box-muller', correlationMethod: 'copula' },
    contributors: tols.map((t, i) => ({
      id: `d${i + 1}`,
      name: `Dimension ${i + 1}`,
      nominal: i === 0 ? 50 : 10,
      plusTol: t,
      minusTol: t,
      direction: i === 0 ? 1 : -1,
      distribution: laws?.[i] ?? { type: 'normal', k: 3 },
      meanShift: 0,
    })),
    // Nominal gap 50 − 10 (n − 1) with a symmetric requirement of ±0.2 around it.
    limits: { lower: 50 - 10 * (tols.length - 1) - 0.2, upper: 50 - 10 * (tols.length - 1) + 0.2 },
    dials: [],
    ...extra,
  });
  if (!v.ok) throw new Error(JSON.stringify(v.issues));
  return v.model as LinearStackModel;
}

const rows = (m: LinearStackModel, cost: (i: number) => { a: number; b: number; k: number }, limits: (i: number) => [number, number] = () => [1e-4, 1]) =>
  m.contributors.map((c, i) => ({ id: c.id, change: true, tightest: limits(i)[0], loosest: limits(i)[1], cost: { form: 'reciprocal-power' as const, ...cost(i) } }));

function ok(m: LinearStackModel, req: AllocationRequest) {
  const r = allocateTolerances(m, req);
  if (!r.ok) throw new Error(r.reason + JSON.stringify(r.issues));
  return r;
}

describe('tolerance allocation: proportional scaling and least cost', () => {
  it('with equal cost coefficients (and equal starting tolerances, one law) least cost equals proportional scaling', () => {
    const m = stack([0.1, 0.1, 0.1, 0.1]);
    const req = { target: { kind: 'ppk' as const, value: 1.33 }, rows: rows(m, () => ({ a: 2, b: 1, k: 1 })) };
    const p = ok(m, { ...req, method: 'proportional' });
    const c = ok(m, { ...req, method: 'least-cost' });
    p.rows.forEach((r, i) => expect(c.rows[i].after).toBeCloseTo(r.after, 5));
    expect(c.after.ppk!).toBeGreaterThanOrEqual(1.33);
    expect(c.after.ppk!).toBeCloseTo(1.33, 2);
  });

  it('least cost equals proportional scaling whenever Bᵢ ∝ cᵢ²·Tᵢ₀^(k+2) (the Lagrange condition holds at the scaled tolerances)', () => {
    const laws: Law[] = [{ type: 'normal', k: 3 }, { type: 'uniform' }, { type: 'normal', k: 4 }, { type: 'triangular' }];
    const m = stack([0.12, 0.05, 0.08, 0.03], laws);
    const k = 2;
    const cost = (i: number) => ({ a: 0, b: sigmaPerTolerance(m.contributors[i])! ** 2 * ((m.contributors[i].plusTol + m.contributors[i].minusTol) / 2) ** (k + 2), k });
    const req = { target: { kind: 'ppm' as const, value: 500 }, rows: rows(m, cost) };
    const p = ok(m, { ...req, method: 'proportional' });
    const c = ok(m, { ...req, method: 'least-cost' });
    p.rows.forEach((r, i) => expect(c.rows[i].after / r.after).toBeCloseTo(1, 3));
  });

  it('unbounded least cost is the closed form of the Lagrange multiplier method (Spotts 1973; Chase et al. 1990; numbers computed here)', () => {
    // Minimise Σ Bᵢ/Tᵢ^k subject to Σ cᵢ²Tᵢ² = σ² gives Tᵢ = (kBᵢ/(2λcᵢ²))^(1/(k+2)) with
    // λ = (Σ cᵢ²(kBᵢ/(2cᵢ²))^(2/(k+2)) / σ²)^((k+2)/2).
    const m = stack([0.1, 0.06, 0.04]);
    const B = [1, 4, 0.5];
    const k = 1;
    const out = ok(m, { method: 'least-cost', target: { kind: 'ppk', value: 1.5 }, rows: rows(m, (i) => ({ a: 0, b: B[i], k })) });
    const c = 1 / 3;
    const sigma = 0.2 / (3 * 1.5); // centred gap, limits ±0.2
    const sum = B.reduce((s, b) => s + c * c * ((k * b) / (2 * c * c)) ** (2 / (k + 2)), 0);
    const lambda = (sum / sigma ** 2) ** ((k + 2) / 2);
    // The proposal rounds each tolerance down to four significant figures.
    B.forEach((b, i) => expect(out.rows[i].after / ((k * b) / (2 * lambda * c * c)) ** (1 / (k + 2))).toBeCloseTo(1, 2));
    expect(out.parameter / lambda).toBeCloseTo(1, 6);
    // The dearer contributor (B = 4) keeps the widest tolerance.
    expect(out.rows[1].after).toBeGreaterThan(out.rows[0].after);
    expect(out.costAfter).toBeLessThan(ok(m, { method: 'proportional', target: { kind: 'ppk', value: 1.5 }, rows: rows(m, (i) => ({ a: 0, b: B[i], k })) }).costAfter);
  });

  it('equal contributors under the RSS rule: ten parts for an assembly band of ±0.3162 get ±0.1 each', () => {
    // RSS: T_asm = √(Σ Tᵢ²), so n equal tolerances share T_asm/√n each; ten at ±0.1 give ±0.316 (a widely restated
    // illustration of the rule, common practice, no source opened). With the tolerance at ±3σ the band ±T_asm around a
    // centred mean is Ppk 1.
    const base = stack(Array.from({ length: 10 }, () => 0.05));
    const tAsm = Math.sqrt(10) * 0.1;
    const m = { ...base, limits: { lower: -40 - tAsm, upper: -40 + tAsm } };
    for (const method of ['proportional', 'least-cost'] as const) {
      const out = ok(m, { method, target: { kind: 'ppk', value: 1 }, rows: rows(m, () => ({ a: 0, b: 1, k: 1 })) });
      out.rows.forEach((r) => expect(r.after).toBeCloseTo(0.1, 3));
      expect(out.after.ppk!).toBeCloseTo(1, 9);
    }
  });

  it('the reciprocal form is the power form with k = 1', () => {
    const m = stack([0.1, 0.06, 0.04]);
    const base = { method: 'least-cost' as const, target: { kind: 'ppm' as const, value: 100 } };
    const recip = ok(m, { ...base, rows: m.contributors.map((c, i) => ({ id: c.id, change: true, tightest: 1e-4, loosest: 1, cost: { form: 'reciprocal' as const, a: 1, b: i + 1, k: 7 } })) });
    const power = ok(m, { ...base, rows: rows(m, (i) => ({ a: 1, b: i + 1, k: 1 })) });
    recip.rows.forEach((r, i) => expect(r.after).toBe(power.rows[i].after));
  });

  it("the proposal's Monte Carlo ppm meets the target within its 95 % confidence interval", () => {
    const m = stack([0.1, 0.08, 0.05, 0.05], [{ type: 'normal', k: 3 }, { type: 'normal', k: 3 }, { type: 'normal', k: 3 }, { type: 'normal', k: 3 }]);
    const target = 2700;
    const out = ok(m, { method: 'least-cost', target: { kind: 'ppm', value: target }, rows: rows(m, (i) => ({ a: 0, b: [1, 2, 3, 1][i], k: 2 })) });
    expect(out.after.ppm!).toBeLessThanOrEqual(target);
    const r = runModelSync(out.model);
    const ci = r.stack!.monteCarlo.ppmObservedCi!;
    // Normal contributors: the prediction is exact, so the interval holds the target (or lies below it).
    expect(ci.low).toBeLessThanOrEqual(target);
    expect(ci.high).toBeGreaterThanOrEqual(out.after.ppm! * 0.999);
  });

  it('process limits bound the answer: a contributor that hits its tightest or loosest limit stays there', () => {
    const m = stack([0.1, 0.06, 0.04]);
    const out = ok(m, { method: 'least-cost', target: { kind: 'ppk', value: 1.33 }, rows: rows(m, (i) => ({ a: 0, b: [1, 4, 0.5][i], k: 1 }), (i) => (i === 1 ? [0.01, 0.03] : [0.005, 1])) });
    expect(out.rows[1].after).toBeLessThanOrEqual(0.03);
    expect(out.rows[1].atLimit).toBe('loosest');
    expect(out.after.ppk!).toBeGreaterThanOrEqual(1.33);
  });

  it('a target the process limits cannot reach says so and names the binding contributors', () => {
    const m = stack([0.1, 0.06, 0.04]);
    const req = { method: 'least-cost' as const, target: { kind: 'ppk' as const, value: 3 }, rows: rows(m, () => ({ a: 0, b: 1, k: 1 }), () => [0.05, 0.2]) };
    req.rows[2] = { ...req.rows[2], change: false };
    const r = allocateTolerances(m, req);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.reason).toMatch(/cannot be reached within the process limits/);
    expect(r.reason).toMatch(/Binding: Dimension 1, Dimension 2, Dimension 3/);
    expect(r.binding.map((b) => b.why)).toEqual(['at its tightest limit, ±0.05', 'at its tightest limit, ±0.05', 'not allowed to change (±0.04)']);
    // Best reachable: σ² = 2(0.05/3)² + (0.04/3)², Ppk = 0.2/(3σ) ≈ 2.46.
    expect(r.best!.ppk!).toBeCloseTo(0.2 / (3 * Math.sqrt(2 * (0.05 / 3) ** 2 + (0.04 / 3) ** 2)), 10);
  });

  it('a gap whose mean lies beyond a limit is not fixed by tolerances, and says to move a nominal', () => {
    const m = stack([0.1, 0.06], undefined, { limits: { lower: 40.5, upper: 41 } });
    const r = allocateTolerances(m, { method: 'proportional', target: { kind: 'ppm', value: 100 }, rows: rows(m, () => ({ a: 0, b: 1, k: 1 })) });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/mean .* lies outside the limits. Move a nominal first/);
  });

  it('refuses bad settings with their paths: limits the wrong way round, a measured contributor, nothing ticked', () => {
    const m = stack([0.1, 0.06]);
    const bad = allocateTolerances(m, { method: 'least-cost', target: { kind: 'ppm', value: 100 }, rows: rows(m, () => ({ a: 0, b: 1, k: 1 }), () => [0.3, 0.1]) });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.issues).toContainEqual({ path: ['rows', 0, 'tightest'], message: 'The tightest tolerance (0.3) is above the loosest (0.1).' });
    const zeroB = allocateTolerances(m, { method: 'least-cost', target: { kind: 'ppm', value: 100 }, rows: rows(m, () => ({ a: 0, b: 0, k: 1 })) });
    if (!zeroB.ok) expect(zeroB.issues[0]).toMatchObject({ path: ['rows', 0, 'cost', 'b'] });
    const none = allocateTolerances(m, { method: 'proportional', target: { kind: 'ppm', value: 100 }, rows: rows(m, () => ({ a: 0, b: 1, k: 1 })).map((r) => ({ ...r, change: false })) });
    expect(none.ok).toBe(false);
    if (!none.ok) expect(none.reason).toMatch(/at least one contributor/);
    const measured = stack([0.1, 0.06]);
    measured.contributors[1] = { ...measured.contributors[1], distribution: { type: 'empirical', data: [9.98, 10, 10.01, 10.02] } };
    const e = allocateTolerances(measured, { method: 'proportional', target: { kind: 'ppm', value: 100 }, rows: rows(measured, () => ({ a: 0, b: 1, k: 1 })) });
    if (!e.ok) expect(e.issues[0].message).toMatch(/sampled from measured data/);
    expect(e.ok).toBe(false);
  });

  it('correlated contributors: the target holds with the correlation terms', () => {
    const m = stack([0.1, 0.08, 0.05], undefined, { correlation: { inputs: ['d2', 'd3'], matrix: [[1, 0.7], [0.7, 1]] } });
    const out = ok(m, { method: 'least-cost', target: { kind: 'ppk', value: 1.33 }, rows: rows(m, () => ({ a: 0, b: 1, k: 1 })) });
    expect(out.after.ppk!).toBeGreaterThanOrEqual(1.33);
    expect(out.after.ppk!).toBeCloseTo(1.33, 2);
    expect(out.notes.join(' ')).toMatch(/correlated/);
  });
});
