/**
 * Places in a checked model: where a dial writes, and the cost template's combined correlation
 * matrix. Kept apart from the schema (zod) so the embed's engine can use them without it.
 */
import type { CostRangeModel, DialTarget, StochosModel } from './schema';

/** Numeric parameters a dial may move, per distribution type. */
export const DISTRIBUTION_PARAMS: Record<string, string[]> = {
  constant: ['value'],
  uniform: ['min', 'max'],
  triangular: ['min', 'mode', 'max'],
  pert: ['min', 'mode', 'max'],
  normal: ['mean', 'sd', 'min', 'max'],
  lognormal: ['mu', 'sigma', 'min', 'max'],
  exponential: ['rate'],
  weibull: ['shape', 'scale'],
  gamma: ['shape', 'scale'],
  discrete: [],
  bernoulli: ['p'],
  empirical: [],
  drawn: [],
};

/** A dial target resolved to the place in the model it writes. */
export interface ResolvedTarget {
  path: (string | number)[];
}

/** Which numeric field of the model a dial writes, or an issue explaining why it cannot. */
export function resolveDialTarget(model: StochosModel, target: DialTarget, dialId: string): ResolvedTarget | string {
  switch (target.kind) {
    case 'input-param': {
      if (model.template === 'linear-stack') {
        const i = model.contributors.findIndex((c) => c.id === target.inputId);
        if (i < 0) return `No contributor has the id '${target.inputId}'.`;
        const c = model.contributors[i];
        const allowed = ['nominal', 'plusTol', 'minusTol', 'meanShift', ...(c.distribution.type === 'normal' ? ['k'] : [])];
        if (!allowed.includes(target.param)) return `A dial on contributor '${c.id}' can move ${allowed.join(', ')}; not '${target.param}'.`;
        return { path: target.param === 'k' ? ['contributors', i, 'distribution', 'k'] : ['contributors', i, target.param] };
      }
      if (model.template === 'cost-range') {
        const i = model.items.findIndex((c) => c.id === target.inputId);
        if (i >= 0) {
          if (!['low', 'mostLikely', 'high'].includes(target.param)) return `A dial on item '${target.inputId}' can move low, mostLikely or high; not '${target.param}'.`;
          return { path: ['items', i, target.param] };
        }
        const e = model.riskEvents.findIndex((r) => r.id === target.inputId);
        if (e >= 0) {
          const map: Record<string, (string | number)[]> = {
            probability: ['riskEvents', e, 'probability'],
            'impact.low': ['riskEvents', e, 'impact', 'low'],
            'impact.mostLikely': ['riskEvents', e, 'impact', 'mostLikely'],
            'impact.high': ['riskEvents', e, 'impact', 'high'],
          };
          if (!map[target.param]) return `A dial on risk '${target.inputId}' can move probability, impact.low, impact.mostLikely or impact.high; not '${target.param}'.`;
          return { path: map[target.param] };
        }
        return `No line item or risk event has the id '${target.inputId}'.`;
      }
      const i = model.inputs.findIndex((c) => c.id === target.inputId);
      if (i < 0) return `No input has the id '${target.inputId}'.`;
      const d = model.inputs[i].distribution;
      const allowed = DISTRIBUTION_PARAMS[d.type] ?? [];
      if (!allowed.includes(target.param)) {
        return allowed.length
          ? `A dial on '${target.inputId}' (${d.type}) can move ${allowed.join(', ')}; not '${target.param}'.`
          : `A ${d.type} input has no parameter a dial can move.`;
      }
      if ((target.param === 'min' || target.param === 'max') && (d.type === 'normal' || d.type === 'lognormal') && (d as Record<string, unknown>)[target.param] === undefined) {
        return `'${target.inputId}' has no ${target.param === 'min' ? 'lower' : 'upper'} truncation bound for the dial to move; set one first.`;
      }
      return { path: ['inputs', i, 'distribution', target.param] };
    }
    case 'limit': {
      if (model.template === 'linear-stack') {
        if (model.limits[target.which] === undefined) return `The gap has no ${target.which} limit for the dial to move; set one first.`;
        return { path: ['limits', target.which] };
      }
      if (model.template === 'formula') {
        const id = target.outputId ?? (model.outputs.length === 1 ? model.outputs[0].id : undefined);
        const i = model.outputs.findIndex((o) => o.id === id);
        if (i < 0) return target.outputId ? `No output has the id '${target.outputId}'.` : 'Name the output (outputId) whose limit the dial moves.';
        return { path: ['outputs', i, target.which] };
      }
      return "In a cost range the limit is the budget: use a dial of kind 'budget'.";
    }
    case 'budget':
      return model.template === 'cost-range' ? { path: ['budget'] } : 'Only a cost range has a budget.';
    case 'confidence':
      return model.template === 'cost-range' ? { path: ['confidence'] } : 'Only a cost range has a confidence level.';
    case 'base-estimate':
      return model.template === 'cost-range' ? { path: ['baseEstimate'] } : 'Only a cost range has a base estimate.';
    case 'group-correlation': {
      if (model.template !== 'cost-range') return 'Only a cost range has correlation groups.';
      const g = model.correlationGroups.findIndex((x) => x.id === target.groupId);
      return g < 0 ? `No correlation group has the id '${target.groupId}'.` : { path: ['correlationGroups', g, 'rho'] };
    }
    case 'correlation': {
      if (model.template !== 'formula' && model.template !== 'linear-stack') return 'Only a formula model or a linear stack has a correlation matrix.';
      const ids = model.correlation?.inputs ?? [];
      const a = ids.indexOf(target.a);
      const b = ids.indexOf(target.b);
      if (a < 0 || b < 0) return `Both '${target.a}' and '${target.b}' must be in the correlation matrix.`;
      if (a === b) return 'A correlation dial needs two different inputs.';
      return { path: ['correlation', 'matrix', a, b] };
    }
    case 'variable':
      return model.template === 'formula' ? { path: [] } : `Only a formula model uses variables; '${dialId}' cannot be one here.`;
  }
}

/** The combined correlation matrix of every item that is in some group (pairwise rho). */
export function costCorrelationMatrix(model: CostRangeModel): { ids: string[]; matrix: number[][] } {
  const ids: string[] = [];
  for (const item of model.items) if (model.correlationGroups.some((g) => g.items.includes(item.id))) ids.push(item.id);
  const index = new Map(ids.map((id, i) => [id, i]));
  const matrix: number[][] = ids.map((_, i) => ids.map((__, j) => (i === j ? 1 : 0)));
  for (const g of model.correlationGroups) {
    for (const a of g.items)
      for (const b of g.items) {
        if (a === b) continue;
        const i = index.get(a);
        const j = index.get(b);
        if (i !== undefined && j !== undefined) matrix[i][j] = g.rho;
      }
  }
  return { ids, matrix };
}
