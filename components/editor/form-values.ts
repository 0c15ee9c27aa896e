// The editor's form values: the model as the author types it. Any field may be missing (an empty box) or NaN (junk in
// a number box) until the schema has checked it, so every object field is optional, except the template, which an
// edit never changes; lists keep their element types. The shapes are the schema's own input types, so rows read from
// the form need no casts. Only the schema turns a draft into a CheckedModel (resolver.ts).
import type { StochosModelInput, Template } from '@/lib/core/engine/schema';

/** A value as typed: fields of objects optional, all the way down. */
export type Draft<T> = T extends readonly (infer E)[] ? Draft<E>[] : T extends object ? { [K in keyof T]?: Draft<T[K]> } : T;

type DraftOf<T extends Template> = Draft<Extract<StochosModelInput, { template: T }>> & { template: T };
export type LinearStackDraft = DraftOf<'linear-stack'>;
export type CostRangeDraft = DraftOf<'cost-range'>;
export type FormulaDraft = DraftOf<'formula'>;
export type ModelDraft = LinearStackDraft | CostRangeDraft | FormulaDraft;

type Rows<D, K extends keyof D> = NonNullable<D[K]>;
export type ContributorDraft = Rows<LinearStackDraft, 'contributors'>[number];
export type LineItemDraft = Rows<CostRangeDraft, 'items'>[number];
export type CorrelationGroupDraft = Rows<CostRangeDraft, 'correlationGroups'>[number];
export type RiskEventDraft = Rows<CostRangeDraft, 'riskEvents'>[number];
export type FormulaInputDraft = Rows<FormulaDraft, 'inputs'>[number];
export type FormulaOutputDraft = Rows<FormulaDraft, 'outputs'>[number];
export type DialDraft = Rows<ModelDraft, 'dials'>[number];
export type DistributionDraft = NonNullable<FormulaInputDraft['distribution']>;
export type StackDistributionDraft = NonNullable<ContributorDraft['distribution']>;
export type DialTargetDraft = NonNullable<DialDraft['target']>;
