/**
 * The versioned model JSON schema ('stochos.model/1'), written with zod 4. Used by the API
 * (422 with the path of every bad field), the browser editor (zod resolver) and the PDF.
 *
 * Structure and per-field rules live in the zod objects; rules that need the whole model
 * (unique ids, names used in formulas, dial targets, correlation matrices) are added by
 * semanticIssues(), attached as a superRefine so that one safeParse reports everything.
 */
import { z } from 'zod';
import { createMarginal } from './distributions';
import { pathText, type ModelIssue } from './errors';
import { RESERVED_NAMES } from './formula';
import { checkFormula } from './formula-parse';
import { checkCorrelation } from './linalg';
import { normalCdfPair, normalCdfPairUpper } from './special';
import { ln } from './det-math';
import { costCorrelationMatrix, resolveDialTarget } from './model-paths';
import type { CheckedModel } from './checked-model';

export { costCorrelationMatrix, DISTRIBUTION_PARAMS, resolveDialTarget, type ResolvedTarget } from './model-paths';
export type { Checked, CheckedModel, CheckedLinearStack, CheckedCostRange, CheckedFormula } from './checked-model';

export const SCHEMA_ID = 'stochos.model/1';
export const MIN_TRIALS = 1_000;
export const MAX_TRIALS = 2_000_000;

const fmt = (v: unknown) => (typeof v === 'number' ? String(v) : JSON.stringify(v));

const num = (what = 'This value') =>
  z.number({ error: (iss) => (iss.input === undefined ? `${what} is required.` : `${what} must be a finite number.`) });

export const idSchema = z
  .string({ error: 'An id is required.' })
  .min(1, 'An id is required.')
  .max(64, 'Ids are at most 64 characters.')
  .regex(/^[A-Za-z_][A-Za-z0-9_]*$/, 'Ids use letters, digits and underscores and start with a letter or underscore (they are names in formulas).')
  .refine((v) => !RESERVED_NAMES.has(v), { error: (iss) => `'${String(iss.input)}' is reserved (a function or constant name); choose another id.` });

const label = (what: string) => z.string({ error: `${what} is required.` }).trim().min(1, `${what} is required.`).max(120, `${what} is at most 120 characters.`);

type Ctx = z.RefinementCtx;

function rangeCheck(ctx: Ctx, lo: number, hi: number, loKey: string, hiKey: string, loName = 'minimum', hiName = 'maximum') {
  if (lo > hi) ctx.addIssue({ code: 'custom', path: [loKey], message: `The ${loName} (${lo}) is above the ${hiName} (${hi}).` });
  else if (lo === hi) ctx.addIssue({ code: 'custom', path: [hiKey], message: `The range has zero width: the ${loName} and ${hiName} are both ${lo}.` });
}

function modeCheck(ctx: Ctx, lo: number, mode: number, hi: number, modeKey = 'mode', modeName = 'most likely value') {
  if (lo < hi && (mode < lo || mode > hi)) {
    ctx.addIssue({ code: 'custom', path: [modeKey], message: `The ${modeName} (${mode}) must lie between the minimum (${lo}) and the maximum (${hi}).` });
  }
}

const positive = (what: string) =>
  num(what).refine((v) => v > 0, { error: (iss) => `${what} must be positive (found ${fmt(iss.input)}).` });

const probability = (what: string) =>
  num(what).refine((v) => v >= 0 && v <= 1, { error: (iss) => `${what} is a probability between 0 and 1 (found ${fmt(iss.input)}).` });

const numberList = (what: string, minLen: number, maxLen: number) =>
  z
    .array(num(`Each ${what} value`), { error: `${what} must be a list of numbers.` })
    .max(maxLen, `At most ${maxLen.toLocaleString('en-US')} ${what} values.`)
    .refine((v) => v.length >= minLen, {
      error: (iss) =>
        (iss.input as unknown[]).length === 0 ? `The ${what} list is empty: enter at least ${minLen} values.` : `Enter at least ${minLen} ${what} values.`,
    });

// ---- Distributions -----------------------------------------------------------------------

const constantDist = z.object({ type: z.literal('constant'), value: num('The value') });

const uniformDist = z
  .object({ type: z.literal('uniform'), min: num('The minimum'), max: num('The maximum') })
  .superRefine((d, ctx) => rangeCheck(ctx, d.min, d.max, 'min', 'max'));

const triangularDist = z
  .object({ type: z.literal('triangular'), min: num('The minimum'), mode: num('The most likely value'), max: num('The maximum') })
  .superRefine((d, ctx) => {
    rangeCheck(ctx, d.min, d.max, 'min', 'max');
    modeCheck(ctx, d.min, d.mode, d.max);
  });

const pertDist = z
  .object({ type: z.literal('pert'), min: num('The minimum'), mode: num('The most likely value'), max: num('The maximum') })
  .superRefine((d, ctx) => {
    rangeCheck(ctx, d.min, d.max, 'min', 'max');
    modeCheck(ctx, d.min, d.mode, d.max);
  });

/** Probability mass a normal keeps inside [lo, hi] (for the "range holds nothing" check). */
function normalMass(alpha: number, beta: number): number {
  const pa = normalCdfPair(alpha);
  const qa = normalCdfPairUpper();
  const pb = normalCdfPair(beta);
  const qb = normalCdfPairUpper();
  return alpha > 0 ? qa - qb : beta < 0 ? pb - pa : 1 - pa - qb;
}

const MIN_TRUNCATED_MASS = 1e-9;

const normalDist = z
  .object({
    type: z.literal('normal'),
    mean: num('The mean'),
    sd: num('The standard deviation'),
    min: num('The lower truncation bound').optional(),
    max: num('The upper truncation bound').optional(),
  })
  .superRefine((d, ctx) => {
    if (!(d.sd > 0)) {
      ctx.addIssue({ code: 'custom', path: ['sd'], message: `The standard deviation must be positive (found ${d.sd}).` });
      return;
    }
    if (d.min !== undefined && d.max !== undefined) rangeCheck(ctx, d.min, d.max, 'min', 'max', 'lower bound', 'upper bound');
    if (d.min === undefined || d.max === undefined || d.min < d.max) {
      const a = d.min === undefined ? -Infinity : (d.min - d.mean) / d.sd;
      const b = d.max === undefined ? Infinity : (d.max - d.mean) / d.sd;
      if (normalMass(a, b) < MIN_TRUNCATED_MASS) {
        ctx.addIssue({ code: 'custom', path: [d.min !== undefined ? 'min' : 'max'], message: 'The truncation range holds almost none of this normal distribution (less than one in a billion); move the bounds towards the mean.' });
      }
    }
  });

const lognormalDist = z
  .object({
    type: z.literal('lognormal'),
    mu: num('mu (mean of ln X)'),
    sigma: num('sigma (standard deviation of ln X)'),
    min: num('The lower truncation bound').optional(),
    max: num('The upper truncation bound').optional(),
  })
  .superRefine((d, ctx) => {
    if (!(d.sigma > 0)) {
      ctx.addIssue({ code: 'custom', path: ['sigma'], message: `sigma (the standard deviation of ln X) must be positive (found ${d.sigma}).` });
      return;
    }
    if (d.min !== undefined && d.min < 0) ctx.addIssue({ code: 'custom', path: ['min'], message: `A lognormal value is never negative; the lower bound must be 0 or more (found ${d.min}).` });
    if (d.max !== undefined && !(d.max > 0)) ctx.addIssue({ code: 'custom', path: ['max'], message: `The upper bound must be positive (found ${d.max}).` });
    if (d.min !== undefined && d.max !== undefined) rangeCheck(ctx, d.min, d.max, 'min', 'max', 'lower bound', 'upper bound');
    if ((d.min === undefined || d.min >= 0) && (d.max === undefined || d.max > 0) && (d.min === undefined || d.max === undefined || d.min < d.max)) {
      const a = d.min === undefined || d.min === 0 ? -Infinity : (ln(d.min) - d.mu) / d.sigma;
      const b = d.max === undefined ? Infinity : (ln(d.max) - d.mu) / d.sigma;
      if (normalMass(a, b) < MIN_TRUNCATED_MASS) {
        ctx.addIssue({ code: 'custom', path: [d.min !== undefined ? 'min' : 'max'], message: 'The truncation range holds almost none of this lognormal distribution (less than one in a billion).' });
      }
    }
  });

const exponentialDist = z.object({ type: z.literal('exponential'), rate: positive('The rate') });

const weibullDist = z.object({ type: z.literal('weibull'), shape: positive('The shape'), scale: positive('The scale') });

const gammaDist = z.object({ type: z.literal('gamma'), shape: positive('The shape'), scale: positive('The scale') });

const discreteDist = z
  .object({
    type: z.literal('discrete'),
    values: numberList('value', 1, 1000),
    probabilities: z.array(probability('Each probability'), { error: 'Probabilities must be a list of numbers.' }),
  })
  .superRefine((d, ctx) => {
    if (d.values.length !== d.probabilities.length) {
      ctx.addIssue({ code: 'custom', path: ['probabilities'], message: `Give one probability per value (${d.values.length} values, ${d.probabilities.length} probabilities).` });
      return;
    }
    const total = d.probabilities.reduce((s, p) => s + p, 0);
    if (Math.abs(total - 1) > 1e-6) ctx.addIssue({ code: 'custom', path: ['probabilities'], message: `The probabilities must add up to 1 (they add up to ${+total.toPrecision(10)}).` });
  });

const bernoulliDist = z.object({ type: z.literal('bernoulli'), p: probability('The probability') });

const empiricalDist = z.object({ type: z.literal('empirical'), data: numberList('data', 2, 100_000) });

const drawnDist = z
  .object({
    type: z.literal('drawn'),
    points: z
      .array(z.object({ x: num('x'), y: num('The density height') }), { error: 'Points must be a list of {x, y}.' })
      .max(500, 'At most 500 points.')
      .refine((p) => p.length >= 2, { error: 'Draw at least two points.' }),
  })
  .superRefine((d, ctx) => {
    let area = 0;
    for (let i = 0; i < d.points.length; i++) {
      const p = d.points[i];
      if (p.y < 0) ctx.addIssue({ code: 'custom', path: ['points', i, 'y'], message: `A density cannot be negative (found ${p.y}).` });
      if (i > 0) {
        const prev = d.points[i - 1];
        if (!(p.x > prev.x)) ctx.addIssue({ code: 'custom', path: ['points', i, 'x'], message: `Points must go left to right: x = ${p.x} does not follow ${prev.x}.` });
        area += ((p.x - prev.x) * (p.y + prev.y)) / 2;
      }
    }
    if (d.points.length >= 2 && !(area > 0)) ctx.addIssue({ code: 'custom', path: ['points'], message: 'The drawn density encloses no area: raise some points above zero.' });
  });

export const distributionSchema = z.discriminatedUnion(
  'type',
  [constantDist, uniformDist, triangularDist, pertDist, normalDist, lognormalDist, exponentialDist, weibullDist, gammaDist, discreteDist, bernoulliDist, empiricalDist, drawnDist],
  { error: 'Choose a distribution type: constant, uniform, triangular, pert, normal, lognormal, exponential, weibull, gamma, discrete, bernoulli, empirical or drawn.' },
);


// ---- Settings and dials ----------------------------------------------------------------

export const settingsSchema = z.object({
  trials: z
    .number({ error: 'The number of trials must be a whole number.' })
    .superRefine((v, ctx) => {
      if (!Number.isInteger(v) || v < MIN_TRIALS || v > MAX_TRIALS) {
        ctx.addIssue({ code: 'custom', message: `Trials must be a whole number from 1,000 to 2,000,000 (found ${v}).` });
      }
    }),
  seed: z.union([z.string().min(1, 'The seed is empty.').max(128, 'The seed is at most 128 characters.'), z.number().int().refine(Number.isSafeInteger, 'The seed must be a safe integer.')], {
    error: 'The seed is a text or a whole number.',
  }),
  design: z.enum(['monte-carlo', 'latin-hypercube'], { error: "The design is 'monte-carlo' or 'latin-hypercube'." }).default('monte-carlo'),
  normalMethod: z.enum(['box-muller', 'ziggurat'], { error: "The normal generator is 'box-muller' or 'ziggurat'." }).default('box-muller'),
  correlationMethod: z.enum(['copula', 'iman-conover'], { error: "The correlation method is 'copula' or 'iman-conover'." }).default('copula'),
});

export const dialTargetSchema = z.discriminatedUnion(
  'kind',
  [
    z.object({ kind: z.literal('input-param'), inputId: idSchema, param: z.string().min(1, 'Name the parameter the dial moves.') }),
    z.object({ kind: z.literal('limit'), which: z.enum(['lower', 'upper']), outputId: idSchema.optional() }),
    z.object({ kind: z.literal('budget') }),
    z.object({ kind: z.literal('confidence') }),
    z.object({ kind: z.literal('base-estimate') }),
    z.object({ kind: z.literal('group-correlation'), groupId: idSchema }),
    z.object({ kind: z.literal('correlation'), a: idSchema, b: idSchema }),
    z.object({ kind: z.literal('variable') }),
  ],
  { error: 'Choose what the dial moves: input-param, limit, budget, confidence, base-estimate, group-correlation, correlation or variable.' },
);

export const dialSchema = z
  .object({
    id: idSchema,
    label: label('The dial label'),
    unit: z.string().max(24, 'Units are at most 24 characters.').default(''),
    min: num('The dial minimum'),
    max: num('The dial maximum'),
    step: positive('The dial step'),
    default: num('The dial default'),
    target: dialTargetSchema,
  })
  .superRefine((d, ctx) => {
    rangeCheck(ctx, d.min, d.max, 'min', 'max', 'dial minimum', 'dial maximum');
    if (d.min < d.max) {
      if (d.default < d.min || d.default > d.max) ctx.addIssue({ code: 'custom', path: ['default'], message: `The default (${d.default}) must lie between the dial minimum (${d.min}) and maximum (${d.max}).` });
      if (d.step > d.max - d.min) ctx.addIssue({ code: 'custom', path: ['step'], message: `The step (${d.step}) is larger than the dial's range (${d.max - d.min}).` });
    }
  });

const common = {
  schema: z.literal(SCHEMA_ID, { error: `The schema must be '${SCHEMA_ID}'.` }),
  title: label('The title'),
  description: z.string().max(4000, 'The description is at most 4,000 characters.').optional(),
  settings: settingsSchema,
  dials: z.array(dialSchema).max(50, 'At most 50 dials.').default([]),
};

// ---- Linear stack --------------------------------------------------------------------------

const nonNegTol = (what: string) =>
  num(what).refine((v) => v >= 0, { error: (iss) => `Enter the ${what.toLowerCase()} as a magnitude of 0 or more (found ${fmt(iss.input)}).` });

export const stackDistributionSchema = z.discriminatedUnion(
  'type',
  [
    z.object({ type: z.literal('normal'), k: positive('k (sigmas per tolerance)').default(3) }),
    z.object({ type: z.literal('uniform') }),
    z.object({ type: z.literal('triangular') }),
    z.object({ type: z.literal('empirical'), data: numberList('measured', 2, 100_000) }),
    z.object({ type: z.literal('normal-fit'), data: numberList('measured', 2, 100_000) }),
  ],
  { error: 'Choose normal, uniform, triangular, empirical or normal-fit.' },
);

export const contributorSchema = z
  .object({
    id: idSchema,
    name: label('The contributor name'),
    nominal: num('The nominal'),
    plusTol: nonNegTol('Plus tolerance'),
    minusTol: nonNegTol('Minus tolerance'),
    direction: z.union([z.literal(1), z.literal(-1)], { error: 'The direction is +1 or -1 (how the dimension adds to the gap).' }),
    distribution: stackDistributionSchema,
    meanShift: num('The mean shift').default(0),
  })
  .superRefine((c, ctx) => {
    const usesTol = c.distribution.type === 'normal' || c.distribution.type === 'uniform' || c.distribution.type === 'triangular';
    if (usesTol && c.plusTol >= 0 && c.minusTol >= 0 && c.plusTol + c.minusTol === 0) {
      ctx.addIssue({ code: 'custom', path: ['plusTol'], message: 'The tolerance band has zero width: enter a plus or minus tolerance.' });
    }
  });

const limitsSchema = z
  .object({ lower: num('The lower limit').optional(), upper: num('The upper limit').optional() })
  .superRefine((l, ctx) => {
    if (l.lower !== undefined && l.upper !== undefined) rangeCheck(ctx, l.lower, l.upper, 'lower', 'upper', 'lower limit', 'upper limit');
  });

/** Correlated inputs (formula) or contributors (stack): the ids in the matrix and the matrix itself. */
export const correlationSpecSchema = z.object({
  inputs: z.array(idSchema).refine((v) => v.length >= 2, { error: 'Correlate at least two inputs.' }),
  matrix: z.array(z.array(num('Each correlation'))),
});

export const linearStackSchema = z.object({
  ...common,
  template: z.literal('linear-stack'),
  unit: z.string().max(24).default('mm'),
  contributors: z.array(contributorSchema).min(1, 'Add at least one contributor.').max(200, 'At most 200 contributors.'),
  /** Contributors made on one machine or from one batch: their correlation matrix (ids are contributor ids). */
  correlation: correlationSpecSchema.optional(),
  limits: limitsSchema.refine((l) => l.lower !== undefined || l.upper !== undefined, { error: 'Give a lower and/or an upper limit for the gap.' }),
});

// ---- Cost range --------------------------------------------------------------------------

const threePoint = z.enum(['pert', 'triangular', 'uniform'], { error: "Choose 'pert', 'triangular' or 'uniform'." });

export const lineItemSchema = z
  .object({
    id: idSchema,
    name: label('The item name'),
    low: num('The low estimate'),
    mostLikely: num('The most likely estimate'),
    high: num('The high estimate'),
    distribution: threePoint.default('pert'),
  })
  .superRefine((d, ctx) => {
    rangeCheck(ctx, d.low, d.high, 'low', 'high', 'low estimate', 'high estimate');
    modeCheck(ctx, d.low, d.mostLikely, d.high, 'mostLikely', 'most likely estimate');
  });

export const correlationGroupSchema = z.object({
  id: idSchema,
  name: z.string().max(120).optional(),
  items: z.array(idSchema).refine((v) => v.length >= 2, { error: 'A correlation group needs at least two items.' }),
  rho: num('The correlation').refine((v) => v >= -1 && v <= 1, { error: (iss) => `A correlation lies between -1 and 1 (found ${fmt(iss.input)}).` }),
});

export const riskEventSchema = z.object({
  id: idSchema,
  name: label('The risk name'),
  probability: probability('The probability of the risk'),
  impact: z
    .object({ low: num('The low impact'), mostLikely: num('The most likely impact'), high: num('The high impact'), distribution: threePoint.default('pert') })
    .superRefine((d, ctx) => {
      rangeCheck(ctx, d.low, d.high, 'low', 'high', 'low impact', 'high impact');
      modeCheck(ctx, d.low, d.mostLikely, d.high, 'mostLikely', 'most likely impact');
    }),
});

export const costRangeSchema = z.object({
  ...common,
  template: z.literal('cost-range'),
  currency: z.string().trim().min(1, 'The currency is required.').max(8, 'The currency is at most 8 characters.'),
  items: z.array(lineItemSchema).min(1, 'Add at least one line item.').max(500, 'At most 500 line items.'),
  correlationGroups: z.array(correlationGroupSchema).max(50).default([]),
  riskEvents: z.array(riskEventSchema).max(200).default([]),
  baseEstimate: num('The base estimate').optional(),
  budget: num('The budget').optional(),
  confidence: num('The confidence level')
    .refine((v) => v > 0 && v < 1, { error: (iss) => `The confidence level is a probability strictly between 0 and 1, e.g. 0.8 for P80 (found ${fmt(iss.input)}).` })
    .default(0.8),
});

// ---- Formula -------------------------------------------------------------------------------

export const formulaInputSchema = z.object({
  id: idSchema,
  name: label('The input name'),
  unit: z.string().max(24).default(''),
  distribution: distributionSchema,
});

export const formulaOutputSchema = z
  .object({
    id: idSchema,
    name: label('The output name'),
    unit: z.string().max(24).default(''),
    formula: z.string({ error: 'The formula is required.' }).min(1, 'The formula is empty.').max(5000, 'The formula is at most 5,000 characters.'),
    lower: num('The lower limit').optional(),
    upper: num('The upper limit').optional(),
  })
  .superRefine((o, ctx) => {
    if (o.lower !== undefined && o.upper !== undefined) rangeCheck(ctx, o.lower, o.upper, 'lower', 'upper', 'lower limit', 'upper limit');
  });

export const formulaModelSchema = z.object({
  ...common,
  template: z.literal('formula'),
  inputs: z.array(formulaInputSchema).min(1, 'Add at least one input.').max(100, 'At most 100 inputs.'),
  correlation: correlationSpecSchema.optional(),
  outputs: z.array(formulaOutputSchema).min(1, 'Add at least one output formula.').max(20, 'At most 20 outputs.'),
});

// ---- Whole model ------------------------------------------------------------------------

const baseModelSchema = z.discriminatedUnion('template', [linearStackSchema, costRangeSchema, formulaModelSchema], {
  error: "The template is 'linear-stack', 'cost-range' or 'formula'.",
});

export type StochosModel = z.output<typeof baseModelSchema>;
export type StochosModelInput = z.input<typeof baseModelSchema>;
export type LinearStackModel = z.output<typeof linearStackSchema>;
export type CostRangeModel = z.output<typeof costRangeSchema>;
export type FormulaModel = z.output<typeof formulaModelSchema>;
export type ModelSettings = z.output<typeof settingsSchema>;
export type Dial = z.output<typeof dialSchema>;
export type DialTarget = z.output<typeof dialTargetSchema>;
export type Distribution = z.output<typeof distributionSchema>;
export type Contributor = z.output<typeof contributorSchema>;
export type StackDistribution = z.output<typeof stackDistributionSchema>;
export type LineItem = z.output<typeof lineItemSchema>;
export type CorrelationGroup = z.output<typeof correlationGroupSchema>;
export type RiskEvent = z.output<typeof riskEventSchema>;
export type FormulaInput = z.output<typeof formulaInputSchema>;
export type FormulaOutput = z.output<typeof formulaOutputSchema>;
export type Template = StochosModel['template'];


/** Every id the model defines, with its path (for uniqueness and formula scope). */
function definedIds(model: StochosModel): { id: string; path: (string | number)[] }[] {
  const out: { id: string; path: (string | number)[] }[] = [];
  const add = (list: { id: string }[] | undefined, key: string) => {
    if (Array.isArray(list)) list.forEach((x, i) => x && out.push({ id: x.id, path: [key, i, 'id'] }));
  };
  if (model.template === 'linear-stack') add(model.contributors, 'contributors');
  if (model.template === 'cost-range') {
    add(model.items, 'items');
    add(model.riskEvents, 'riskEvents');
    add(model.correlationGroups, 'correlationGroups');
  }
  if (model.template === 'formula') {
    add(model.inputs, 'inputs');
    add(model.outputs, 'outputs');
  }
  add(model.dials, 'dials');
  return out;
}

/** Names the engine uses for its own columns; a model id may not take them. */
const ENGINE_NAMES = new Set(['gap', 'total']);

/** Whole-model rules. Written defensively: it also runs when parts failed to parse. */
export function semanticIssues(model: StochosModel): ModelIssue[] {
  const issues: ModelIssue[] = [];
  const seen = new Map<string, string>();
  for (const { id, path } of definedIds(model)) {
    if (typeof id !== 'string') continue;
    if (seen.has(id)) issues.push({ path, message: `The id '${id}' is already used (${seen.get(id)}); ids must be unique across the model.` });
    else seen.set(id, pathText(path));
    if (model.template !== 'formula' && ENGINE_NAMES.has(id)) issues.push({ path, message: `'${id}' is the name of the model's output; choose another id.` });
  }

  if (model.template === 'cost-range') costIssues(model, issues);
  if (model.template === 'formula') formulaIssues(model, issues);
  if (model.template === 'linear-stack') correlationIssues((model.contributors ?? []).map((x) => x?.id).filter((x): x is string => typeof x === 'string'), model.correlation, issues, 'contributor');

  (model.dials ?? []).forEach((dial, i) => {
    if (!dial || !dial.target) return;
    const r = resolveDialTarget(model, dial.target, dial.id);
    if (typeof r === 'string') {
      issues.push({ path: ['dials', i, 'target'], message: r });
      return;
    }
    if (dial.target.kind === 'confidence' && (dial.min <= 0 || dial.max >= 1)) {
      issues.push({ path: ['dials', i, dial.min <= 0 ? 'min' : 'max'], message: 'A confidence dial must stay strictly between 0 and 1.' });
    }
    if ((dial.target.kind === 'group-correlation' || dial.target.kind === 'correlation') && (dial.min < -1 || dial.max > 1)) {
      issues.push({ path: ['dials', i, dial.min < -1 ? 'min' : 'max'], message: 'A correlation dial must stay between -1 and 1.' });
    }
  });
  return issues;
}

function costIssues(model: CostRangeModel, issues: ModelIssue[]): void {
  const itemIds = new Set((model.items ?? []).map((x) => x?.id));
  const pairRho = new Map<string, { rho: number; group: number }>();
  (model.correlationGroups ?? []).forEach((g, gi) => {
    if (!g || !Array.isArray(g.items)) return;
    const inGroup = new Set<string>();
    g.items.forEach((id, j) => {
      if (!itemIds.has(id)) issues.push({ path: ['correlationGroups', gi, 'items', j], message: `No line item has the id '${id}'.` });
      if (inGroup.has(id)) issues.push({ path: ['correlationGroups', gi, 'items', j], message: `'${id}' is listed twice in this group.` });
      inGroup.add(id);
    });
    const ids = [...inGroup];
    for (let a = 0; a < ids.length; a++)
      for (let b = a + 1; b < ids.length; b++) {
        const key = [ids[a], ids[b]].sort().join('|');
        const prev = pairRho.get(key);
        if (prev && prev.rho !== g.rho) {
          issues.push({ path: ['correlationGroups', gi, 'rho'], message: `Items '${ids[a]}' and '${ids[b]}' are also in group ${prev.group + 1} with a different correlation (${prev.rho}).` });
        } else pairRho.set(key, { rho: g.rho, group: gi });
      }
  });
  if (issues.length === 0 && (model.correlationGroups ?? []).length > 0) {
    const { ids, matrix } = costCorrelationMatrix(model);
    const check = checkCorrelation(matrix);
    if (!check.positiveSemiDefinite && check.smallestEigenvalue !== null) {
      issues.push({
        path: ['correlationGroups'],
        message: `Together the correlation groups over ${ids.length} items are not a valid correlation matrix: its smallest eigenvalue is ${check.smallestEigenvalue.toPrecision(6)}. Lower the correlations or split the overlapping groups.`,
      });
    }
  }
}


function formulaIssues(model: FormulaModel, issues: ModelIssue[]): void {
  const inputIds = (model.inputs ?? []).map((x) => x?.id).filter((x): x is string => typeof x === 'string');
  const variables = (model.dials ?? []).filter((d) => d?.target?.kind === 'variable').map((d) => d.id);
  const earlier: string[] = [];
  (model.outputs ?? []).forEach((o, i) => {
    if (!o || typeof o.formula !== 'string') return;
    const message = checkFormula(o.formula, { columns: [...inputIds, ...earlier], scalars: variables });
    if (message) {
      const later = (model.outputs ?? []).slice(i + 1).map((x) => x?.id);
      const hint = later.some((id) => id && new RegExp(`\\b${id}\\b`).test(o.formula)) ? ' An output can only use outputs listed before it.' : '';
      issues.push({ path: ['outputs', i, 'formula'], message: message + hint });
    }
    if (typeof o.id === 'string') earlier.push(o.id);
  });
  correlationIssues(inputIds, model.correlation, issues, 'input');
}

/** The correlation matrix's rules: listed ids exist once each, the matrix is square, a valid correlation matrix. */
function correlationIssues(ids: string[], corr: { inputs?: unknown; matrix?: unknown } | undefined, issues: ModelIssue[], noun: 'input' | 'contributor'): void {
  if (!corr || !Array.isArray(corr.inputs) || !Array.isArray(corr.matrix)) return;
  const listed = corr.inputs as string[];
  const matrix = corr.matrix as number[][];
  const seen = new Set<string>();
  listed.forEach((id, j) => {
    if (!ids.includes(id)) issues.push({ path: ['correlation', 'inputs', j], message: `No ${noun} has the id '${id}'.` });
    if (seen.has(id)) issues.push({ path: ['correlation', 'inputs', j], message: `'${id}' is listed twice.` });
    seen.add(id);
  });
  const n = listed.length;
  if (matrix.length !== n || matrix.some((r) => !Array.isArray(r) || r.length !== n)) {
    issues.push({ path: ['correlation', 'matrix'], message: `The correlation matrix must be ${n} by ${n}, one row and column per listed ${noun}.` });
  } else {
    const check = checkCorrelation(matrix);
    for (const iss of check.issues) issues.push({ path: ['correlation', 'matrix', ...iss.path], message: iss.message });
  }
}

/** The model schema with whole-model rules: the one to use at every boundary. */
export const modelSchema = baseModelSchema.superRefine((m, ctx) => {
  let found: ModelIssue[];
  try {
    found = semanticIssues(m as StochosModel);
  } catch {
    // Parts of the model failed to parse; their own issues are already reported.
    return;
  }
  for (const issue of found) ctx.addIssue({ code: 'custom', path: issue.path, message: issue.message });
});

export type ValidationResult = { ok: true; model: CheckedModel; issues: [] } | { ok: false; model: null; issues: ModelIssue[] };

/** Validate anything against the model schema; every problem comes back with its path. */
export function validateModel(input: unknown): ValidationResult {
  const r = modelSchema.safeParse(input);
  if (r.success) {
    // Building each marginal once catches numeric corner cases the field rules cannot see.
    const extra: ModelIssue[] = [];
    if (r.data.template === 'formula') {
      r.data.inputs.forEach((inp, i) => {
        try {
          const m = createMarginal(inp.distribution);
          if (!Number.isFinite(m.inv(0.5, 0.5))) extra.push({ path: ['inputs', i, 'distribution'], message: 'This distribution cannot be sampled with these parameters.' });
        } catch (err) {
          extra.push({ path: ['inputs', i, 'distribution'], message: (err as Error).message });
        }
      });
    }
    if (extra.length) return { ok: false, model: null, issues: extra };
    // The one place a model becomes a CheckedModel.
    return { ok: true, model: r.data as CheckedModel, issues: [] };
  }
  return {
    ok: false,
    model: null,
    issues: r.error.issues.map((iss) => ({ path: iss.path.map((p) => (typeof p === 'symbol' ? String(p) : p)) as (string | number)[], message: iss.message })),
  };
}
