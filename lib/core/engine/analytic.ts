/**
 * Closed-form parts of the templates: worst case and RSS of a linear stack, expected
 * values of a cost range. These need no sampling and are shown beside the Monte Carlo.
 */
import { createMarginal, type DistributionSpec } from './distributions';
import type { Contributor, CostRangeModel, LinearStackModel, LineItem, RiskEvent } from './schema';
import { costCorrelationMatrix } from './model-paths';
import { capability } from './stats';

export interface StackContributorAnalysis {
  id: string;
  name: string;
  direction: 1 | -1;
  nominal: number;
  plusTol: number;
  minusTol: number;
  meanShift: number;
  /** Distribution as sampled. */
  assumption: string;
  /** Mean of the dimension under its distribution (mid-tolerance + shift for tolerance laws). */
  mean: number;
  /** Half the tolerance band: (plusTol + minusTol) / 2. */
  halfTolerance: number;
  /** Standard deviation under the distribution assumption. */
  sigma: number;
  /** sigma_i^2 / sum of sigma^2 (analytic share of variance). */
  varianceShare: number;
  /** half_i^2 / sum of half^2 (share in the RSS). */
  rssShare: number;
}

export interface StackAnalysis {
  unit: string;
  /** Gap at nominal dimensions. */
  nominalGap: number;
  /** Arithmetic worst case: every dimension at the tolerance limit that shrinks / grows the gap. */
  worstCase: { min: number; max: number };
  /** Root sum of squares: mean gap (mid-tolerances, shifts) +/- sqrt(sum of squared half tolerances). */
  rss: { mean: number; halfWidth: number; min: number; max: number };
  /**
   * Sum of the contributions under the distribution assumptions (normal approximation). With correlated
   * contributors both rss and statistical include the correlation terms; `independent` gives them without.
   */
  statistical: { mean: number; sd: number; ppmNormal: number | null; pp: number | null; ppk: number | null };
  /** True when the stack has a correlation matrix with a nonzero entry. */
  correlated: boolean;
  /** RSS half-width and standard deviation without the correlation terms (equal to rss/statistical when uncorrelated). */
  independent: { rssHalfWidth: number; sd: number; ppmNormal: number | null; ppk: number | null };
  limits: { lower: number | null; upper: number | null };
  worstCaseWithinLimits: boolean;
  rssWithinLimits: boolean;
  contributors: StackContributorAnalysis[];
}

/** The sampling distribution of one contributor's dimension. */
export function contributorDistribution(c: Contributor): DistributionSpec {
  const half = (c.plusTol + c.minusTol) / 2;
  const mid = c.nominal + (c.plusTol - c.minusTol) / 2 + c.meanShift;
  const d = c.distribution;
  switch (d.type) {
    case 'normal':
      return half > 0 ? { type: 'normal', mean: mid, sd: half / d.k } : { type: 'constant', value: mid };
    case 'uniform':
      return half > 0 ? { type: 'uniform', min: mid - half, max: mid + half } : { type: 'constant', value: mid };
    case 'triangular':
      return half > 0 ? { type: 'triangular', min: mid - half, mode: mid, max: mid + half } : { type: 'constant', value: mid };
    case 'empirical':
      return { type: 'empirical', data: d.data.map((x) => x + c.meanShift) };
    case 'normal-fit': {
      const n = d.data.length;
      const mean = d.data.reduce((s, x) => s + x, 0) / n;
      const sd = Math.sqrt(d.data.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1));
      return sd > 0 ? { type: 'normal', mean: mean + c.meanShift, sd } : { type: 'constant', value: mean + c.meanShift };
    }
  }
}

function assumptionText(c: Contributor): string {
  const d = c.distribution;
  switch (d.type) {
    case 'normal':
      return `normal, tolerance = ±${d.k}σ`;
    case 'uniform':
      return 'uniform over the tolerance band';
    case 'triangular':
      return 'triangular over the tolerance band, peak at mid-tolerance';
    case 'empirical':
      return `empirical from ${d.data.length} measurements`;
    case 'normal-fit':
      return `normal fitted to ${d.data.length} measurements`;
  }
}

export function evaluateStack(model: LinearStackModel): StackAnalysis {
  const lower = model.limits.lower ?? null;
  const upper = model.limits.upper ?? null;
  let nominalGap = 0;
  let wcMin = 0;
  let wcMax = 0;
  let rssMean = 0;
  let sumHalf2 = 0;
  let statMean = 0;
  let sumVar = 0;
  const rows = model.contributors.map((c) => {
    const dir = c.direction;
    const lo = c.nominal - c.minusTol;
    const hi = c.nominal + c.plusTol;
    nominalGap += dir * c.nominal;
    if (dir === 1) {
      wcMin += lo;
      wcMax += hi;
    } else {
      wcMin -= hi;
      wcMax -= lo;
    }
    const half = (c.plusTol + c.minusTol) / 2;
    const mid = c.nominal + (c.plusTol - c.minusTol) / 2 + c.meanShift;
    rssMean += dir * mid;
    sumHalf2 += half * half;
    const m = createMarginal(contributorDistribution(c));
    statMean += dir * m.mean;
    sumVar += m.variance;
    return { c, half, mean: m.mean, sigma: Math.sqrt(m.variance) };
  });
  // Correlation terms: Var(Σ aᵢXᵢ) = Σ aᵢ²σᵢ² + 2 Σᵢ<ⱼ aᵢaⱼρᵢⱼσᵢσⱼ, the variance of a linear combination
  // (e.g. Montgomery & Runger, Applied Statistics and Probability for Engineers, §5-4); the same weights on the
  // half tolerances give the correlated RSS.
  let crossVar = 0;
  let crossHalf2 = 0;
  let correlated = false;
  const corr = model.correlation;
  if (corr) {
    const at = new Map(model.contributors.map((c, i) => [c.id, i]));
    for (let a = 0; a < corr.inputs.length; a++)
      for (let b = a + 1; b < corr.inputs.length; b++) {
        const i = at.get(corr.inputs[a]);
        const j = at.get(corr.inputs[b]);
        const rho = corr.matrix[a]?.[b] ?? 0;
        if (i === undefined || j === undefined || rho === 0) continue;
        correlated = true;
        const ri = rows[i];
        const rj = rows[j];
        const sign = ri.c.direction * rj.c.direction;
        crossVar += 2 * sign * rho * ri.sigma * rj.sigma;
        crossHalf2 += 2 * sign * rho * ri.half * rj.half;
      }
  }
  const indepHalfWidth = Math.sqrt(sumHalf2);
  const indepSd = Math.sqrt(sumVar);
  const indepCap = capability(statMean, indepSd, lower, upper);
  const halfWidth = Math.sqrt(Math.max(0, sumHalf2 + crossHalf2));
  const totalVar = Math.max(0, sumVar + crossVar);
  const sd = Math.sqrt(totalVar);
  const cap = capability(statMean, sd, lower, upper);
  const within = (a: number, b: number) => (lower === null || a >= lower) && (upper === null || b <= upper);
  return {
    unit: model.unit,
    nominalGap,
    worstCase: { min: wcMin, max: wcMax },
    rss: { mean: rssMean, halfWidth, min: rssMean - halfWidth, max: rssMean + halfWidth },
    statistical: { mean: statMean, sd, ppmNormal: cap.ppmNormal, pp: cap.pp, ppk: cap.ppk },
    correlated,
    independent: { rssHalfWidth: indepHalfWidth, sd: indepSd, ppmNormal: indepCap.ppmNormal, ppk: indepCap.ppk },
    limits: { lower, upper },
    worstCaseWithinLimits: within(wcMin, wcMax),
    rssWithinLimits: within(rssMean - halfWidth, rssMean + halfWidth),
    contributors: rows.map(({ c, half, mean, sigma }) => ({
      id: c.id,
      name: c.name,
      direction: c.direction,
      nominal: c.nominal,
      plusTol: c.plusTol,
      minusTol: c.minusTol,
      meanShift: c.meanShift,
      assumption: assumptionText(c),
      mean,
      halfTolerance: half,
      sigma,
      varianceShare: sumVar > 0 ? (sigma * sigma) / sumVar : 0,
      rssShare: sumHalf2 > 0 ? (half * half) / sumHalf2 : 0,
    })),
  };
}

// ---- Cost range -------------------------------------------------------------------------

/** Three-point estimate as a distribution. */
export function threePointDistribution(low: number, mostLikely: number, high: number, kind: 'pert' | 'triangular' | 'uniform'): DistributionSpec {
  if (kind === 'uniform') return { type: 'uniform', min: low, max: high };
  return { type: kind, min: low, mode: mostLikely, max: high };
}

export interface CostItemAnalysis {
  id: string;
  name: string;
  mostLikely: number;
  mean: number;
  sd: number;
}

export interface CostRiskAnalysis {
  id: string;
  name: string;
  probability: number;
  meanImpact: number;
  /** probability * mean impact. */
  expectedValue: number;
  sd: number;
}

export interface CostAnalysis {
  currency: string;
  sumLow: number;
  sumMostLikely: number;
  sumHigh: number;
  /** The base estimate given, else the sum of most-likely values. */
  baseEstimate: number;
  budget: number | null;
  confidence: number;
  expectedItems: number;
  expectedRisk: number;
  expectedTotal: number;
  /** Standard deviation of the total treating the group correlations as Pearson correlations (an approximation). */
  sdApprox: number;
  items: CostItemAnalysis[];
  risks: CostRiskAnalysis[];
}

function itemMarginal(i: LineItem) {
  return createMarginal(threePointDistribution(i.low, i.mostLikely, i.high, i.distribution));
}

function riskMoments(r: RiskEvent) {
  const m = createMarginal(threePointDistribution(r.impact.low, r.impact.mostLikely, r.impact.high, r.impact.distribution));
  const p = r.probability;
  const e = p * m.mean;
  const e2 = p * (m.variance + m.mean * m.mean);
  return { meanImpact: m.mean, expectedValue: e, variance: Math.max(0, e2 - e * e) };
}

export function evaluateCost(model: CostRangeModel): CostAnalysis {
  const items = model.items.map((i) => {
    const m = itemMarginal(i);
    return { id: i.id, name: i.name, mostLikely: i.mostLikely, mean: m.mean, sd: Math.sqrt(m.variance) };
  });
  const risks = model.riskEvents.map((r) => {
    const mm = riskMoments(r);
    return { id: r.id, name: r.name, probability: r.probability, meanImpact: mm.meanImpact, expectedValue: mm.expectedValue, sd: Math.sqrt(mm.variance) };
  });
  const sumLow = model.items.reduce((s, i) => s + i.low, 0);
  const sumMostLikely = model.items.reduce((s, i) => s + i.mostLikely, 0);
  const sumHigh = model.items.reduce((s, i) => s + i.high, 0);
  const expectedItems = items.reduce((s, i) => s + i.mean, 0);
  const expectedRisk = risks.reduce((s, r) => s + r.expectedValue, 0);
  let variance = items.reduce((s, i) => s + i.sd * i.sd, 0) + risks.reduce((s, r) => s + r.sd * r.sd, 0);
  if (model.correlationGroups.length) {
    const { ids, matrix } = costCorrelationMatrix(model);
    const sd = new Map(items.map((i) => [i.id, i.sd]));
    for (let a = 0; a < ids.length; a++)
      for (let b = 0; b < ids.length; b++) if (a !== b) variance += matrix[a][b] * (sd.get(ids[a]) ?? 0) * (sd.get(ids[b]) ?? 0);
  }
  return {
    currency: model.currency,
    sumLow,
    sumMostLikely,
    sumHigh,
    baseEstimate: model.baseEstimate ?? sumMostLikely,
    budget: model.budget ?? null,
    confidence: model.confidence,
    expectedItems,
    expectedRisk,
    expectedTotal: expectedItems + expectedRisk,
    sdApprox: Math.sqrt(Math.max(0, variance)),
    items,
    risks,
  };
}
