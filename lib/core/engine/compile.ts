/**
 * Turn a validated model (dials applied) into a plan the simulator runs: sampled inputs
 * (each with its own stream id), correlation groups, derived columns and outputs.
 */
import { contributorDistribution, threePointDistribution } from './analytic';
import type { DistributionSpec } from './distributions';
import type { FormulaNode } from './formula';
import { parserPart } from './optional-parts';
import { costCorrelationMatrix } from './model-paths';
import type { StochosModel } from './schema';

export interface PlanInput {
  /** Column name (the input's id, or id#occurs / id#impact for a risk event). */
  id: string;
  label: string;
  unit: string;
  /** Key of the input's random sub-stream: the stable id. */
  streamId: string;
  spec: DistributionSpec;
}

export interface PlanDerived {
  id: string;
  label: string;
  ast: FormulaNode;
}

export interface PlanGroup {
  ids: string[];
  matrix: number[][];
}

export interface PlanOutput {
  id: string;
  label: string;
  unit: string;
  ast: FormulaNode;
  lower: number | null;
  upper: number | null;
}

export interface Plan {
  inputs: PlanInput[];
  derived: PlanDerived[];
  groups: PlanGroup[];
  outputs: PlanOutput[];
  /** Columns ranked as drivers of the outputs (what a viewer recognises as an input). */
  drivers: { id: string; label: string }[];
  /** Dial variables (formula template). */
  scalars: Record<string, number>;
}

export function compilePlan(model: StochosModel, variables: Record<string, number> = {}): Plan {
  switch (model.template) {
    case 'linear-stack': {
      const inputs: PlanInput[] = model.contributors.map((c) => ({
        id: c.id,
        label: c.name,
        unit: model.unit,
        streamId: c.id,
        spec: contributorDistribution(c),
      }));
      // Correlated contributors go through the same Gaussian copula (or Iman–Conover) as formula inputs.
      const groups: PlanGroup[] = model.correlation ? [{ ids: model.correlation.inputs, matrix: model.correlation.matrix }] : [];
      return {
        inputs,
        derived: [],
        groups,
        outputs: [
          {
            id: 'gap',
            label: 'Gap',
            unit: model.unit,
            ast: { kind: 'lin', terms: model.contributors.map((c) => ({ name: c.id, coef: c.direction })), constant: 0 },
            lower: model.limits.lower ?? null,
            upper: model.limits.upper ?? null,
          },
        ],
        drivers: inputs.map((i) => ({ id: i.id, label: i.label })),
        scalars: {},
      };
    }
    case 'cost-range': {
      const inputs: PlanInput[] = model.items.map((i) => ({
        id: i.id,
        label: i.name,
        unit: model.currency,
        streamId: i.id,
        spec: threePointDistribution(i.low, i.mostLikely, i.high, i.distribution),
      }));
      const derived: PlanDerived[] = [];
      for (const r of model.riskEvents) {
        // Separate streams for occurrence and impact: moving the probability dial keeps the impacts.
        inputs.push({ id: `${r.id}#occurs`, label: `${r.name} (occurs)`, unit: '', streamId: `${r.id}#occurs`, spec: { type: 'bernoulli', p: r.probability } });
        inputs.push({
          id: `${r.id}#impact`,
          label: `${r.name} (impact if it occurs)`,
          unit: model.currency,
          streamId: `${r.id}#impact`,
          spec: threePointDistribution(r.impact.low, r.impact.mostLikely, r.impact.high, r.impact.distribution),
        });
        derived.push({
          id: r.id,
          label: r.name,
          ast: { kind: 'bin', op: '*', left: { kind: 'name', name: `${r.id}#occurs` }, right: { kind: 'name', name: `${r.id}#impact` } },
        });
      }
      const groups: PlanGroup[] = [];
      if (model.correlationGroups.length) {
        const { ids, matrix } = costCorrelationMatrix(model);
        groups.push({ ids, matrix });
      }
      return {
        inputs,
        derived,
        groups,
        outputs: [
          {
            id: 'total',
            label: 'Total cost',
            unit: model.currency,
            ast: {
              kind: 'lin',
              terms: [...model.items.map((i) => ({ name: i.id, coef: 1 })), ...model.riskEvents.map((r) => ({ name: r.id, coef: 1 }))],
              constant: 0,
            },
            lower: null,
            upper: model.budget ?? null,
          },
        ],
        drivers: [...model.items.map((i) => ({ id: i.id, label: i.name })), ...model.riskEvents.map((r) => ({ id: r.id, label: r.name }))],
        scalars: {},
      };
    }
    case 'formula': {
      const inputs: PlanInput[] = model.inputs.map((i) => ({ id: i.id, label: i.name, unit: i.unit, streamId: i.id, spec: i.distribution }));
      const scalars: Record<string, number> = {};
      for (const d of model.dials) if (d.target.kind === 'variable') scalars[d.id] = variables[d.id] ?? d.default;
      const earlier: string[] = [];
      const outputs: PlanOutput[] = model.outputs.map((o) => {
        const { ast } = parserPart().parseFormula(o.formula, { columns: [...inputs.map((i) => i.id), ...earlier], scalars: Object.keys(scalars) });
        earlier.push(o.id);
        return { id: o.id, label: o.name, unit: o.unit, ast, lower: o.lower ?? null, upper: o.upper ?? null };
      });
      const groups: PlanGroup[] = model.correlation ? [{ ids: model.correlation.inputs, matrix: model.correlation.matrix }] : [];
      return { inputs, derived: [], groups, outputs, drivers: inputs.map((i) => ({ id: i.id, label: i.label })), scalars };
    }
  }
}
