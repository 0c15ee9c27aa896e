/**
 * Engine parts that only some models need: the formula parser (jsep, formula-parse.ts) and the
 * functions only formulas call (det-math-extra.ts) for formula models, and the eigendecomposition (ml-matrix, linalg.ts) for correlated inputs.
 * The run code (compile.ts, chunks.ts, correlation.ts) reaches them through this module, and
 * each registers itself here when it loads. The schema imports both, so every run checked
 * with the schema (studio, server, tests) has them. The embed runs published, server-checked
 * models without the schema: it calls loadPartsFor(model) before preparing a run, so the
 * embed page and its workers fetch these parts only for a model that uses them.
 */
import type * as Linalg from './linalg';
import type * as FormulaParse from './formula-parse';
import type * as DetMathExtra from './det-math-extra';

export type LinalgPart = Pick<typeof Linalg, 'checkCorrelation' | 'symmetricSqrt' | 'inverseSqrt' | 'nearestCorrelation'>;
export type ParserPart = Pick<typeof FormulaParse, 'parseFormula'>;
export type FormulaMathPart = Pick<typeof DetMathExtra, 'acos' | 'atan' | 'atan2' | 'hypotN' | 'log10' | 'tan'>;

let linalg: LinalgPart | null = null;
let parser: ParserPart | null = null;
let formulaMath: FormulaMathPart | null = null;

export function provideLinalg(part: LinalgPart): void {
  linalg = part;
}

export function provideParser(part: ParserPart): void {
  parser = part;
}

export function provideFormulaMath(part: FormulaMathPart): void {
  formulaMath = part;
}

/** Functions only formulas call (det-math-extra.ts, loaded with the parser: a formula is parsed before it is compiled). */
export function formulaMathPart(): FormulaMathPart {
  if (!formulaMath) throw new Error('The formula functions are not loaded: call loadPartsFor(model) before preparing a run of a formula model without the schema.');
  return formulaMath;
}

/** The correlation code (throws if it was not loaded: a programming error, see loadPartsFor). */
export function linalgPart(): LinalgPart {
  if (!linalg) throw new Error('The correlation code is not loaded: call loadPartsFor(model) before preparing a run of a correlated model without the schema.');
  return linalg;
}

/** The formula parser (throws if it was not loaded: a programming error, see loadPartsFor). */
export function parserPart(): ParserPart {
  if (!parser) throw new Error('The formula parser is not loaded: call loadPartsFor(model) before preparing a run of a formula model without the schema.');
  return parser;
}

/** Which optional parts a model's run needs: formulas to parse, correlation groups to factor. */
export function partsFor(model: unknown): { parser: boolean; linalg: boolean } {
  const m = (model && typeof model === 'object' ? model : {}) as { template?: unknown; correlation?: unknown; correlationGroups?: unknown };
  return {
    parser: m.template === 'formula',
    linalg: (m.correlation !== undefined && m.correlation !== null) || (Array.isArray(m.correlationGroups) && m.correlationGroups.length > 0),
  };
}

/** Load the parts `model` needs; null when they are loaded already (or it needs none), so callers can stay synchronous. */
export function loadPartsFor(model: unknown): Promise<void> | null {
  const need = partsFor(model);
  const loads: Promise<unknown>[] = [];
  if (need.parser && !parser) loads.push(import('./formula-parse'));
  if (need.linalg && !linalg) loads.push(import('./linalg'));
  return loads.length ? Promise.all(loads).then(() => undefined) : null;
}
