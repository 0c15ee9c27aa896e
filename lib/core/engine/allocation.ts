/**
 * Tolerance allocation for a linear stack: given a target for the gap (ppm out of
 * specification, or Ppk) and, for each contributor the author lets change, its process limits
 * (tightest and loosest tolerance it can hold), propose new tolerances.
 *
 * The gap is predicted under the RSS model: each contributor's standard deviation is
 * σᵢ = cᵢTᵢ, with Tᵢ its half tolerance band ((plus + minus) / 2) and cᵢ from its distribution
 * assumption (1/k for a normal at ±kσ, 1/√3 uniform, 1/√6 triangular); the gap's variance is
 * Σ aᵢ²σᵢ² + 2 Σᵢ<ⱼ aᵢaⱼρᵢⱼσᵢσⱼ (aᵢ = ±1, ρ the stack's correlations) and its ppm and Ppk are
 * read from a normal law with that mean and standard deviation.
 *
 * Methods:
 * - Proportional scaling: every changeable tolerance is multiplied by one factor s, each
 *   clamped to its process limits, and s is the largest factor that meets the target
 *   (Chase & Greenwood 1988, "Design issues in mechanical tolerance analysis", Manufacturing
 *   Review 1(1):50–59; the page range from memory).
 * - Least cost: minimise Σ Cᵢ(Tᵢ) with a cost–tolerance curve per contributor, reciprocal
 *   Cᵢ = Aᵢ + Bᵢ/Tᵢ or reciprocal power Cᵢ = Aᵢ + Bᵢ/Tᵢ^kᵢ, subject to the gap's variance,
 *   by Lagrange multipliers (Spotts 1973, "Allocation of tolerances to minimize cost of
 *   assembly", J. Eng. Ind. 95(3):762–764, from memory; Chase, Greenwood, Loosli & Hauglund
 *   1990, "Least cost tolerance allocation for mechanical assemblies with automated process
 *   selection", Manufacturing Review 3(1):49–59, from memory). Setting
 *   ∂/∂Tᵢ [Σ Cⱼ + λ(Σ aⱼ²cⱼ²Tⱼ² − V)] = 0 gives the closed form
 *   Tᵢ(λ) = (kᵢBᵢ / (2λcᵢ²))^(1/(kᵢ+2)). With process limits, the contributors that hit a
 *   bound are clamped there and λ is solved again for the rest; repeated, this converges to
 *   Tᵢ = clamp(Tᵢ(λ)) for a single λ (the Karush–Kuhn–Tucker conditions of this convex
 *   problem), which is what is solved here, by bisection on ln λ, so it ends in one step.
 *   With correlated contributors λ is still found so that the target holds with the
 *   correlation terms, but the proportions are those of the independent optimum (say so).
 *
 * A proposal is rounded towards tighter (four significant figures), so rounding never breaks
 * the target; the caller confirms it with a Monte Carlo run before accepting it.
 */
import { z } from 'zod';
import { evaluateStack } from './analytic';
import { capability } from './stats';
import type { LinearStackModel } from './schema';

export const allocationTargetSchema = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('ppm'),
    value: z.number({ error: 'Enter the most ppm out of specification to allow.' }).refine((v) => v > 0 && v < 1e6, { error: 'The ppm target lies between 0 and 1,000,000 (for example 100).' }),
  }),
  z.object({
    kind: z.literal('ppk'),
    value: z.number({ error: 'Enter the smallest Ppk to accept.' }).refine((v) => v > 0 && v <= 10, { error: 'The Ppk target lies above 0 and at most 10 (for example 1.33).' }),
  }),
]);

export const costCurveSchema = z
  .object({
    form: z.enum(['reciprocal', 'reciprocal-power'], { error: "The cost curve is 'reciprocal' (A + B/T) or 'reciprocal-power' (A + B/T^k)." }),
    a: z.number({ error: 'Enter the fixed cost A (0 if none).' }).refine((v) => v >= 0, { error: 'The fixed cost A cannot be negative.' }),
    b: z.number({ error: 'Enter the cost coefficient B.' }).refine((v) => v > 0, { error: 'The cost coefficient B must be positive: it is what makes a tighter tolerance cost more.' }),
    k: z.number({ error: 'Enter the exponent k.' }).refine((v) => v > 0 && v <= 10, { error: 'The exponent k lies above 0 and at most 10 (1 is the reciprocal curve, 2 the reciprocal square).' }),
  })
  .transform((c) => (c.form === 'reciprocal' ? { ...c, k: 1 } : c));

export const allocationRowSchema = z
  .object({
    id: z.string().min(1),
    change: z.boolean(),
    /** Process limits on the half tolerance band (plus + minus) / 2. */
    tightest: z.number({ error: 'Enter the tightest tolerance the process can hold.' }),
    loosest: z.number({ error: 'Enter the loosest tolerance that is still useful.' }),
    cost: costCurveSchema,
  })
  .superRefine((r, ctx) => {
    if (!r.change) return;
    if (!(r.tightest > 0)) ctx.addIssue({ code: 'custom', path: ['tightest'], message: `The tightest tolerance must be positive (found ${r.tightest}).` });
    if (!(r.loosest > 0)) ctx.addIssue({ code: 'custom', path: ['loosest'], message: `The loosest tolerance must be positive (found ${r.loosest}).` });
    if (r.tightest > r.loosest) ctx.addIssue({ code: 'custom', path: ['tightest'], message: `The tightest tolerance (${r.tightest}) is above the loosest (${r.loosest}).` });
  });

export const allocationRequestSchema = z.object({
  method: z.enum(['proportional', 'least-cost'], { error: "The method is 'proportional' or 'least-cost'." }),
  target: allocationTargetSchema,
  rows: z.array(allocationRowSchema).min(1, 'List the contributors.'),
});

export type AllocationRequest = z.input<typeof allocationRequestSchema>;
export type AllocationTarget = z.output<typeof allocationTargetSchema>;
export type CostCurve = z.output<typeof costCurveSchema>;

export interface AllocationPrediction {
  mean: number;
  sd: number;
  ppm: number | null;
  ppk: number | null;
}

export interface AllocationRowResult {
  id: string;
  name: string;
  change: boolean;
  /** Half tolerance band before and after. */
  before: number;
  after: number;
  plusTol: { before: number; after: number };
  minusTol: { before: number; after: number };
  /** Which process limit holds this contributor, if any. */
  atLimit: 'tightest' | 'loosest' | null;
  /** Cost index Cᵢ(T) before and after (changeable rows only). */
  costBefore: number | null;
  costAfter: number | null;
}

export type AllocationOutcome =
  | {
      ok: true;
      method: 'proportional' | 'least-cost';
      target: AllocationTarget;
      rows: AllocationRowResult[];
      before: AllocationPrediction;
      after: AllocationPrediction;
      costBefore: number;
      costAfter: number;
      /** Scale factor (proportional) or Lagrange multiplier (least cost). */
      parameter: number;
      notes: string[];
      /** The stack with the proposed tolerances (everything else unchanged). */
      model: LinearStackModel;
    }
  | {
      ok: false;
      reason: string;
      /** Contributors that hold the answer back (at their tightest limit, or unable to change). */
      binding: { id: string; name: string; why: string }[];
      best: AllocationPrediction | null;
      issues: { path: (string | number)[]; message: string }[];
    };

/** σ per unit of half tolerance under the contributor's assumption; null when the spread does not come from the tolerance. */
export function sigmaPerTolerance(c: LinearStackModel['contributors'][number]): number | null {
  switch (c.distribution.type) {
    case 'normal':
      return 1 / c.distribution.k;
    case 'uniform':
      return 1 / Math.sqrt(3);
    case 'triangular':
      return 1 / Math.sqrt(6);
    default:
      return null;
  }
}

export function costAt(c: CostCurve, t: number): number {
  return c.a + c.b / t ** c.k;
}

/** Relative slack for rounding in the last bits (a target met exactly must not fail by 1e-16). */
const SLACK = 1e-9;

function meets(target: AllocationTarget, p: AllocationPrediction): boolean {
  if (target.kind === 'ppm') return p.ppm !== null && p.ppm <= target.value * (1 + SLACK);
  return p.ppk !== null && p.ppk >= target.value * (1 - SLACK);
}

/** Round towards zero to four significant figures (tighter never breaks the target). */
function roundDown(v: number): number {
  if (!(v > 0)) return v;
  const e = Math.floor(Math.log10(v)) - 3;
  const f = 10 ** e;
  const r = Math.floor(v / f + 1e-9) * f;
  return +r.toPrecision(4);
}

const fmt = (v: number) => String(+v.toPrecision(4));

export function allocateTolerances(model: LinearStackModel, request: AllocationRequest): AllocationOutcome {
  const parsed = allocationRequestSchema.safeParse(request);
  if (!parsed.success) {
    return { ok: false, reason: 'Some allocation settings need fixing.', binding: [], best: null, issues: parsed.error.issues.map((i) => ({ path: i.path as (string | number)[], message: i.message })) };
  }
  const req = parsed.data;
  const { lower, upper } = { lower: model.limits.lower ?? null, upper: model.limits.upper ?? null };
  const base = evaluateStack(model);
  const byId = new Map(req.rows.map((r) => [r.id, r]));
  const n = model.contributors.length;
  const a = model.contributors.map((c) => c.direction);
  const T0 = model.contributors.map((c) => (c.plusTol + c.minusTol) / 2);
  const cs = model.contributors.map(sigmaPerTolerance);
  const sigma0 = base.contributors.map((c) => c.sigma);
  const mean0 = base.contributors.map((c) => c.mean);
  const offset = model.contributors.map((c) => (c.plusTol - c.minusTol) / 2);
  const change = model.contributors.map((c, i) => {
    const r = byId.get(c.id);
    return Boolean(r?.change) && cs[i] !== null && T0[i] > 0;
  });
  const issues: { path: (string | number)[]; message: string }[] = [];
  model.contributors.forEach((c, i) => {
    const r = byId.get(c.id);
    if (r?.change && cs[i] === null) issues.push({ path: ['rows', req.rows.indexOf(r), 'change'], message: `${c.name} is sampled from measured data, so its spread does not follow its tolerance; it cannot be allocated.` });
    else if (r?.change && !(T0[i] > 0)) issues.push({ path: ['rows', req.rows.indexOf(r), 'change'], message: `${c.name} has no tolerance band to scale.` });
  });
  if (issues.length) return { ok: false, reason: 'Some contributors cannot be allocated.', binding: [], best: null, issues };
  if (!change.some(Boolean)) return { ok: false, reason: 'Choose at least one contributor that may change.', binding: [], best: null, issues: [{ path: ['rows'], message: 'Tick at least one contributor that may change.' }] };
  if (lower === null && upper === null) return { ok: false, reason: 'The gap has no limits, so there is nothing to meet.', binding: [], best: null, issues: [] };

  const rowOf = (i: number) => byId.get(model.contributors[i].id)!;
  const tight = model.contributors.map((_, i) => (change[i] ? rowOf(i).tightest : T0[i]));
  const loose = model.contributors.map((_, i) => (change[i] ? rowOf(i).loosest : T0[i]));

  // Correlation pairs (contributor indices) with their ρ.
  const pairs: { i: number; j: number; rho: number }[] = [];
  if (model.correlation) {
    const at = new Map(model.contributors.map((c, i) => [c.id, i]));
    const ids = model.correlation.inputs;
    for (let p = 0; p < ids.length; p++)
      for (let q = p + 1; q < ids.length; q++) {
        const rho = model.correlation.matrix[p]?.[q] ?? 0;
        const i = at.get(ids[p]);
        const j = at.get(ids[q]);
        if (rho !== 0 && i !== undefined && j !== undefined) pairs.push({ i, j, rho });
      }
  }

  /** Prediction for half tolerances T (changeable ones scale their plus and minus by T/T0). */
  const predict = (T: number[]): AllocationPrediction => {
    let mean = 0;
    let v = 0;
    const s = new Array<number>(n);
    for (let i = 0; i < n; i++) {
      const r = change[i] ? T[i] / T0[i] : 1;
      mean += a[i] * (mean0[i] + (r - 1) * offset[i]);
      s[i] = sigma0[i] * r;
      v += s[i] * s[i];
    }
    for (const { i, j, rho } of pairs) v += 2 * a[i] * a[j] * rho * s[i] * s[j];
    const sd = Math.sqrt(Math.max(0, v));
    const cap = capability(mean, sd, lower, upper);
    return { mean, sd, ppm: cap.ppmNormal, ppk: cap.ppk };
  };
  const clamp = (i: number, t: number) => Math.min(loose[i], Math.max(tight[i], t));

  /** T as a function of the method's parameter; larger parameter = looser (scale) or tighter (λ). */
  let family: (x: number) => number[];
  let lo: number;
  let hi: number;
  const looserUp = req.method === 'proportional';
  if (req.method === 'proportional') {
    family = (s) => T0.map((t, i) => (change[i] ? clamp(i, s * t) : t));
    lo = Math.min(...T0.map((t, i) => (change[i] ? tight[i] / t : Infinity)));
    hi = Math.max(...T0.map((t, i) => (change[i] ? loose[i] / t : 0)));
  } else {
    // Tᵢ(λ) = (kᵢBᵢ / (2λcᵢ²))^(1/(kᵢ+2)), clamped to the process limits.
    const free = (i: number, lambda: number) => {
      const c = rowOf(i).cost;
      const ci = cs[i] as number;
      return ((c.k * c.b) / (2 * lambda * ci * ci)) ** (1 / (c.k + 2));
    };
    const lambdaFor = (i: number, t: number) => {
      const c = rowOf(i).cost;
      const ci = cs[i] as number;
      return (c.k * c.b) / (2 * ci * ci * t ** (c.k + 2));
    };
    family = (lambda) => T0.map((t, i) => (change[i] ? clamp(i, free(i, lambda)) : t));
    // λ small → every tolerance at its loosest; λ large → every one at its tightest.
    lo = Math.min(...T0.map((_, i) => (change[i] ? lambdaFor(i, loose[i]) : Infinity)));
    hi = Math.max(...T0.map((_, i) => (change[i] ? lambdaFor(i, tight[i]) : 0)));
  }
  const tightestEnd = looserUp ? lo : hi;
  const loosestEnd = looserUp ? hi : lo;

  const atTightest = family(tightestEnd);
  const bestPrediction = predict(atTightest);
  if (!meets(req.target, bestPrediction)) {
    const binding = model.contributors.flatMap((c, i) =>
      change[i]
        ? [{ id: c.id, name: c.name, why: `at its tightest limit, ±${fmt(tight[i])}` }]
        : sigma0[i] > 0
          ? [{ id: c.id, name: c.name, why: cs[i] === null ? 'sampled from measured data, cannot change' : `not allowed to change (±${fmt(T0[i])})` }]
          : [],
    );
    const meanOut = (lower !== null && bestPrediction.mean <= lower) || (upper !== null && bestPrediction.mean >= upper);
    const what = req.target.kind === 'ppm' ? `${fmt(req.target.value)} ppm` : `a Ppk of ${fmt(req.target.value)}`;
    const reached = req.target.kind === 'ppm' ? `${bestPrediction.ppm === null ? '—' : fmt(bestPrediction.ppm)} ppm` : `a Ppk of ${bestPrediction.ppk === null ? '—' : fmt(bestPrediction.ppk)}`;
    return {
      ok: false,
      reason: meanOut
        ? `The target of ${what} cannot be reached by tolerances alone: the gap's mean (${fmt(bestPrediction.mean)}) lies outside the limits. Move a nominal first.`
        : `The target of ${what} cannot be reached within the process limits: with every changeable contributor at its tightest limit the gap reaches only ${reached}. Binding: ${binding.map((b) => b.name).join(', ')}.`,
      binding,
      best: bestPrediction,
      issues: [],
    };
  }

  const notes: string[] = [];
  let parameter: number;
  if (meets(req.target, predict(family(loosestEnd)))) {
    parameter = loosestEnd;
    notes.push('The target holds even with every changeable contributor at its loosest limit; the proposal opens them all to that limit.');
  } else {
    // Bisection on the log of the parameter between a point that meets the target and one that does not.
    let good = Math.log(tightestEnd);
    let bad = Math.log(loosestEnd);
    for (let it = 0; it < 200 && Math.abs(bad - good) > 1e-13; it++) {
      const mid = (good + bad) / 2;
      if (meets(req.target, predict(family(Math.exp(mid))))) good = mid;
      else bad = mid;
    }
    parameter = Math.exp(good);
  }
  if (pairs.length && req.method === 'least-cost') notes.push('The contributors are correlated: the proportions are those of the independent least-cost answer, scaled so the target holds with the correlation terms.');
  if (offset.some((o, i) => change[i] && o !== 0)) notes.push('Unequal plus and minus tolerances keep their proportion, so the band centre (and the gap mean) moves with the band.');

  const raw = family(parameter);
  const rows: AllocationRowResult[] = [];
  const next = structuredClone(model);
  let costBefore = 0;
  let costAfter = 0;
  model.contributors.forEach((c, i) => {
    let plus = c.plusTol;
    let minus = c.minusTol;
    let after = T0[i];
    let atLimit: AllocationRowResult['atLimit'] = null;
    let cb: number | null = null;
    let ca: number | null = null;
    if (change[i]) {
      const r = raw[i] / T0[i];
      plus = roundDown(c.plusTol * r);
      minus = roundDown(c.minusTol * r);
      after = (plus + minus) / 2;
      if (raw[i] <= tight[i] * (1 + 1e-9)) atLimit = 'tightest';
      else if (raw[i] >= loose[i] * (1 - 1e-9)) atLimit = 'loosest';
      // Rounding down may step just past the tightest limit; keep the limit then.
      if (after < tight[i]) {
        const k = tight[i] / after;
        plus = c.plusTol === 0 ? 0 : +(plus * k).toPrecision(12);
        minus = c.minusTol === 0 ? 0 : +(minus * k).toPrecision(12);
        after = (plus + minus) / 2;
      }
      const cost = rowOf(i).cost;
      cb = costAt(cost, T0[i]);
      ca = costAt(cost, after);
      costBefore += cb;
      costAfter += ca;
      next.contributors[i] = { ...next.contributors[i], plusTol: plus, minusTol: minus };
    }
    rows.push({ id: c.id, name: c.name, change: change[i], before: T0[i], after, plusTol: { before: c.plusTol, after: plus }, minusTol: { before: c.minusTol, after: minus }, atLimit, costBefore: cb, costAfter: ca });
  });
  const afterEval = evaluateStack(next);
  return {
    ok: true,
    method: req.method,
    target: req.target,
    rows,
    before: { mean: base.statistical.mean, sd: base.statistical.sd, ppm: base.statistical.ppmNormal, ppk: base.statistical.ppk },
    after: { mean: afterEval.statistical.mean, sd: afterEval.statistical.sd, ppm: afterEval.statistical.ppmNormal, ppk: afterEval.statistical.ppk },
    costBefore,
    costAfter,
    parameter,
    notes,
    model: next,
  };
}
