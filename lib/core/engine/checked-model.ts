/**
 * A model that passed the schema and the whole-model rules: the one type every module after an entry point
 * takes. Only validateModel (schema.ts) makes one from outside data; the brand exists in types only, so an
 * unparsed object cannot pass for it, while the runtime value stays plain JSON (it crosses postMessage, worker
 * threads and the embed payload as it is). Type-only: the embed page may import it without loading zod.
 */
import type { CostRangeModel, FormulaModel, LinearStackModel, StochosModel } from './schema';

declare const checked: unique symbol;

/** A checked model of one template (or any, by default). */
export type Checked<M extends StochosModel = StochosModel> = M & { readonly [checked]: true };

export type CheckedModel = Checked<StochosModel>;
export type CheckedLinearStack = Checked<LinearStackModel>;
export type CheckedCostRange = Checked<CostRangeModel>;
export type CheckedFormula = Checked<FormulaModel>;
